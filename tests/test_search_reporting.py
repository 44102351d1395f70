"""A search stopped by its time limit is reported as such on the console and in result.json."""

import json

from disteco.cli import main

from conftest import EXAMPLES

CASE = str(EXAMPLES / "aromatics_binary.toml")


def test_time_limit_reported_honestly(tmp_path, capsys):
    """--time-limit 0.01 on the benzene example: exit 0 with the first configuration's design;
    status and termination agree, a warning line on the console and in result.json says the
    time limit stopped the search and how far it got, and the heading does not call it the lowest TAC."""
    code = main(["design", CASE, "-o", str(tmp_path), "-q", "--no-figures", "--time-limit", "0.01"])
    out = capsys.readouterr().out
    assert code == 0
    data = json.loads((tmp_path / "result.json").read_text())
    solver = data["solver"]
    assert solver["status"].startswith("time limit; ")
    assert solver["termination"] == "maxTimeLimit"
    unsolved = solver["unsolved"]
    assert unsolved["neighbours_of_chosen"] == 8
    assert 0 < unsolved["neighbours_of_chosen_unsolved"] <= 8
    (warning,) = [w for w in data["warnings"] if "stopped by its time limit of 0.01 s" in w]
    assert f"after {solver['configurations_solved']} configurations" in warning
    assert f"Warning: {warning}" in out
    assert "Best design found (search incomplete" in out and "Lowest-TAC design" not in out
    # the rounds did not settle anything: the optimiser line says the time limit stopped the last one
    assert "1 round, the last stopped by its time limit before the model's constants settled" in out
