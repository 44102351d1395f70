"""A near-critical demethaniser: a product out of reach of the condenser's utility (refused in words,
or designed on a colder level) and the energy-balance minimum of a given design.

An invented demethaniser (methane over ethylene and ethane at 32 bar, partial condenser): its
distillate, 99 % of the methane with at most 0.5 % of the ethylene, condenses near -92 degC, so a
refrigeration level must lie below about -102 degC with the 10 K minimum approach. The levels
added to a copy of the bundled cost data are invented (demo only).
"""

import json
import shutil
from importlib.resources import files
from pathlib import Path

import pytest

from disteco.cli import main

CASE = """title = "Harrow Flats demethaniser"
[mixture]
components = ["methane", "ethylene", "ethane"]
[feed]
flow = "600 kmol/h"
composition = { methane = 0.30, ethylene = 0.50, ethane = 0.20 }
q = 1.0
[column]
top_pressure = "32 bar"
condenser = "partial"
[products]
light_key = "methane"
heavy_key = "ethylene"
light_key_recovery = 0.99
heavy_key_recovery = 0.995
[economics]
cost_year = 2023
scenarios = ["reference"]
"""


def refrigerated(tmp_path: Path, name: str, levels: dict[str, float]) -> Path:
    """The case on a copy of the bundled cost data with refrigeration ``levels`` (name -> degC) added."""
    data = tmp_path / f"{name}_data"
    shutil.copytree(Path(str(files("disteco.cost_data"))), data, ignore=shutil.ignore_patterns("__pycache__",
                                                                                              "__init__.py"))
    with open(data / "utility_levels.csv", "a", encoding="utf-8") as rows:
        for level, temperature in levels.items():
            rows.write(f'{level},cooling,refrigerant,{temperature},{temperature},,,,,"demo, invented"\n')
    with open(data / "utility_prices.csv", "a", encoding="utf-8") as rows:
        for scenario in ("reference", "cheap-steam-demo", "expensive-power-demo"):
            for level in levels:
                rows.write(f'{scenario},{level},30.0,USD,GJ,2023,industrial_electricity,"demo, invented"\n')
    case = tmp_path / f"{name}.toml"
    case.write_text(CASE.replace("cost_year = 2023", f"cost_year = 2023\ncost_data = {str(data)!r}"))
    return case


def test_the_distillate_condenses_colder_than_the_level_allows():
    """The refusal below is physical, checked on thermo's own flash (Peng-Robinson, as the case's
    automatic method chooses at 32 bar): the dew point of a vapour of 99.5 % methane and 0.5 %
    ethylene at 32 bar lies below -90 degC."""
    from thermo import CEOSGas, CEOSLiquid, ChemicalConstantsPackage, FlashVL, PRMIX

    constants, correlations = ChemicalConstantsPackage.from_IDs(["methane", "ethylene"])
    eos = dict(Tcs=constants.Tcs, Pcs=constants.Pcs, omegas=constants.omegas)
    gas = CEOSGas(PRMIX, eos, HeatCapacityGases=correlations.HeatCapacityGases)
    liquid = CEOSLiquid(PRMIX, eos, HeatCapacityGases=correlations.HeatCapacityGases)
    dew = FlashVL(constants, correlations, liquid=liquid, gas=gas).flash(P=32e5, VF=1.0, zs=[0.995, 0.005]).T
    assert dew - 273.15 < -90.0


def test_a_level_too_warm_for_the_product_is_refused_in_words(tmp_path, capsys):
    """With -100 degC the coldest level, the condenser can run no colder than -90 degC: exit 2, the
    condenser, its level and the bound named, and what would help; the search stops at its first
    configuration (before, it tried 32 configurations in about 45 s and blamed the shell's height)."""
    case = refrigerated(tmp_path, "warm", {"refrigerant_minus_100": -100})
    assert main(["design", str(case), "-o", str(tmp_path / "out"), "-q", "--no-figures"]) == 2
    err = capsys.readouterr().err
    assert ("the condenser on refrigerant_minus_100 (-100.0 degC at that end) with the minimum approach of 10 K "
            "holds its process side at -90.0 degC or warmer, and a distillate that meets the specifications "
            "condenses colder at this pressure; raise column.top_pressure") in err
    assert "Traceback" not in err and "shell" not in err
    assert not (tmp_path / "out").exists()


@pytest.fixture(scope="module")
def colder_only(tmp_path_factory):
    """result.json of the design with -115 degC the only level below -50 degC."""
    tmp = tmp_path_factory.mktemp("colder")
    case = refrigerated(tmp, "colder", {"refrigerant_minus_115": -115})
    assert main(["design", str(case), "-o", str(tmp / "out"), "-q", "--no-figures"]) == 0
    return json.loads((tmp / "out" / "result.json").read_text())


def test_a_level_that_suits_the_reference_only_gives_way_to_a_colder_one(tmp_path, colder_only):
    """A -85 degC level suits the search's reference column (its top near -70 degC, short of the
    specifications) and not the product: the search on it stops held by the condenser, and the
    design is searched again on the next colder level offered, -115 degC. The design is the one
    found when -85 degC is not offered at all (same configuration, TAC within 1e-6). Before, the
    start profiles' tops below -75 degC gave negative temperature differences (exit 1)."""
    case = refrigerated(tmp_path, "both", {"refrigerant_minus_85": -85, "refrigerant_minus_115": -115})
    out = tmp_path / "out"
    assert main(["design", str(case), "-o", str(out), "-q", "--no-figures"]) == 0
    result = json.loads((out / "result.json").read_text())
    assert result["design"]["condenser_utility"] == colder_only["design"]["condenser_utility"] == \
        "refrigerant_minus_115"
    for key in ("stages", "feed_stage"):
        assert result["design"][key] == colder_only["design"][key]
    assert result["cost"]["tac_per_year"] == pytest.approx(colder_only["cost"]["tac_per_year"], rel=1e-6)


def test_the_energy_balance_minimum_of_a_given_design_is_found_near_the_critical_point(tmp_path, capsys,
                                                                                      colder_only):
    """Given 22 stages, the feed on 11 and R 3.5 (ethylene over-purified: 0.99999 kept against 0.995
    asked), the minimum's column of 44 stages meets the methane recovery to 1e-7 while Newton moves
    the reflux and the distillate to meet the ethylene's; that residual flipped to +5e-7 at each step,
    each step was refused as a pinch crossing, and the minimum was "not found" after its 33-s limit.
    Now it is found (2.169), within 1 % of the minimum on the optimum's own column (2.1655 on 52 stages,
    the feed on 15): with stages to spare in both sections the feed stage moves the minimum little."""
    case = refrigerated(tmp_path, "given", {"refrigerant_minus_115": -115})
    out = tmp_path / "out"
    assert main(["design", str(case), "--reflux", "3.5", "--stages", "22", "--feed-stage", "11", "--no-compare",
                 "-o", str(out), "-q", "--no-figures"]) == 0
    minimum = json.loads((out / "result.json").read_text())["minimum_reflux_energy_balance"]
    assert minimum["reflux_ratio"] == pytest.approx(
        colder_only["minimum_reflux_energy_balance"]["reflux_ratio"], rel=0.01)
    assert "not found" not in capsys.readouterr().out


@pytest.mark.parametrize("bar", [33, 35, 38])
def test_the_stage_design_holds_closer_to_methane_s_critical_pressure(tmp_path, capsys, bar):
    """At 33 to 38 bar (methane's critical pressure 46 bar; the top 5 K or less under its critical
    temperature) the liquids of the rectifying trays have no vapour root at their own composition. The
    constant-molar-overflow start held such a tray at its first bubble point's vapour while its liquid
    moved: at 35 bar it converged with trays at 437 and 586 K between trays near 190 K (a trivial bubble
    condition), and thermo's column failed from it (exit 2, "no stage profile", from 33 bar up; at 38 bar
    a Newton step took a tray below 0 K, exit 1). Such a tray's vapour now follows its K, and where the
    start still fails (36-39 bar) the column is solved at 85 % of its pressure and raised in steps of 5 %:
    `check` finds the stage profile meeting both specifications."""
    case = refrigerated(tmp_path, f"at_{bar}", {"refrigerant_minus_115": -115})
    case.write_text(case.read_text().replace('top_pressure = "32 bar"', f'top_pressure = "{bar} bar"'))
    assert main(["check", str(case)]) == 0
    assert "Stage profile meeting both specifications" in capsys.readouterr().out


def test_at_44_bar_the_refusal_names_the_critical_region(tmp_path, capsys):
    """At 44 bar neither thermo's flash nor the fallback route finds the dew point of the top vapour
    (99 % methane; its pseudo-critical pressure 46 bar): thermo's own failure was an internal error
    (exit 1), and the fallback's bracket then stepped below 0 K. Now exit 2 in words."""
    case = refrigerated(tmp_path, "at_44", {"refrigerant_minus_115": -115})
    case.write_text(case.read_text().replace('top_pressure = "32 bar"', 'top_pressure = "44 bar"'))
    assert main(["check", str(case)]) == 2
    err = capsys.readouterr().err
    assert "lies within 10 % of its pseudo-critical pressure (46.03 bar" in err and "lower the column pressure" in err


def test_a_held_column_short_of_stages_does_not_stop_the_search():
    """A configuration held short by its condenser's utility stops a search without a design only with
    stages to spare (at least twice the minimum stages): a shorter column may over-purify one product up
    to the utility's bound while it falls short of the other, which more stages would meet."""
    from disteco.optimisation.search import Evaluator, UtilityHeld

    evaluator = Evaluator(problem=None, basis=None, config=None, deadline=0.0, held_stops_from=14.4)
    held = ("held", ("UtilityTemperatureError: held", "refrigerant_minus_100", "cooling"))
    assert evaluator._record((12, 6), held) == float("inf")
    assert evaluator.held[1] == "refrigerant_minus_100"
    with pytest.raises(UtilityHeld):
        evaluator._record((15, 9), held)
