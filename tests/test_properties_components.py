"""Component names resolve only when they match the databank exactly; a misspelling is refused."""

import pytest

from disteco._base.errors import CaseError
from disteco.cli import main
from disteco.properties.components import resolve_component, resolve_components

from conftest import EXAMPLES

BASE = (EXAMPLES / "aromatics_binary.toml").read_text()


@pytest.mark.parametrize("text, cas", [
    ("benzene", "71-43-2"),  # databank name
    ("BENZENE", "71-43-2"),  # any case
    ("benzol", "71-43-2"),  # a current synonym
    ("71-43-2", "71-43-2"),  # CAS number
    ("C6H6", "71-43-2"),  # formula
    ("n-butane", "106-97-8"),  # synonym of "butane"
])
def test_exact_names_resolve(text, cas):
    """Name, synonym, CAS number and formula as listed in the chemicals databank."""
    assert resolve_component(text).cas == cas


def test_misspelling_is_refused_not_substituted():
    """'benzine' (a petroleum cut; listed only as an obsolete synonym of benzene) is refused."""
    with pytest.raises(CaseError, match=r"mixture.components\[0\]: unknown component 'benzine'.*benzene"):
        resolve_components(("benzine", "toluene"))


def test_misspelling_exits_2_naming_the_field(tmp_path, capsys):
    case = tmp_path / "case.toml"
    case.write_text(BASE.replace('["benzene", "toluene"]', '["benzine", "toluene"]').replace(
        "{ benzene = 0.42, toluene = 0.58 }", "[0.42, 0.58]"))
    code = main(["check", str(case)])
    err = capsys.readouterr().err
    assert code == 2
    assert "mixture.components[0]: unknown component 'benzine'" in err
    assert "benzene" in err.split("close matches")[1]
    assert "Traceback" not in err
