"""Every bundled example passes the check command."""

import pytest

from disteco.cli import main

from conftest import EXAMPLES


@pytest.mark.parametrize("path", sorted(EXAMPLES.glob("*.toml")), ids=lambda p: p.name)
def test_example_checks(path, capsys):
    assert main(["check", str(path)]) == 0
    assert "Case file is valid." in capsys.readouterr().out


def test_version(capsys):
    with pytest.raises(SystemExit) as stop:
        main(["--version"])
    assert stop.value.code == 0
    assert capsys.readouterr().out.startswith("disteco ")
