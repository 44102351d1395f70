"""`check` exits 2 on every input `design` refuses before optimising: both commands run the one
validation (`api.check`), so exit 0 from `check` means `design` will not refuse the input.

The bad case files of tests/test_case_errors.py and tests/test_case_limits.py are run through
`check` there; here the given designs and options of tests/test_cli_refusals.py, and the
cases `check` once passed."""

from pathlib import Path

import pytest

from disteco.cli import main

from conftest import EXAMPLES
from test_cli_refusals import REFUSALS

BENZENE = (EXAMPLES / "aromatics_binary.toml").read_text()
ETHANOL = (EXAMPLES / "ethanol_water.toml").read_text()
DEPENTANISER = (EXAMPLES / "depentaniser.toml").read_text()
DEMETHANISER = (Path(__file__).parent / "cases" / "demethaniser_partial.toml").read_text()

# Cases `check` once passed and `design` refused (text, fragment of the message): design is run
# on these too, and both must print the same error line.
BEFORE_OPTIMISING = [
    (BENZENE.replace("distillate_light_key_fraction = 0.985", "distillate_light_key_fraction = 0.3"),
     "products.distillate_light_key_fraction: distillate light-key mole fraction 0.3 is at or below the feed's 0.42"),
    (BENZENE.replace("distillate_light_key_fraction = 0.985",
                     'light_key = "toluene"\ndistillate_light_key_fraction = 0.985'),
     "the light key toluene (products.light_key; in a binary case without it, the first of mixture.components) "
     "is not more volatile than the heavy key benzene at column conditions"),
    # a binary case names no key: the first component listed is the light one (xylenes listed the
    # wrong way round were told to swap products.light_key, a field the case did not have)
    (BENZENE.replace('components = ["benzene", "toluene"]', 'components = ["toluene", "benzene"]'),
     "swap the keys (or the order of mixture.components)"),
    # a multicomponent case names its keys: no word of a binary's component order
    (DEPENTANISER.replace('light_key = "n-pentane"\nheavy_key = "n-hexane"',
                          'light_key = "n-hexane"\nheavy_key = "n-pentane"'),
     "the light key n-hexane (products.light_key) is not more volatile than the heavy key n-pentane at column "
     "conditions (relative volatility 0."),
    (ETHANOL.replace("distillate_light_key_fraction = 0.80", "distillate_light_key_fraction = 0.95"),
     "beyond the minimum-boiling azeotrope of ethanol and water"),
    (BENZENE.replace("cost_year = 2023", "cost_year = 2030"), "economics.cost_year: 2030"),
    (BENZENE.replace("cost_year = 2023", 'cost_year = 2023\ncurrency = "EUR"'), "economics.currency"),
    # a partial condenser near -78 degC at 28 bar with the bundled levels (coldest -50 degC): the
    # first column design sizes takes no utility (check passed it until the utilities were checked)
    (DEMETHANISER, "condenser: no cooling utility is cold enough for the process side"),
    # ethyl acetate/ethanol with water: the keys' relative volatility is 1.33 at the feed and 0.74 at the
    # distillate's bubble point (UNIFAC); Fenske's generic refusal named neither key nor field
    ('title = "t"\n[mixture]\ncomponents = ["ethyl acetate", "ethanol", "water"]\n[feed]\nflow = "50 kmol/h"\n'
     'composition = { "ethyl acetate" = 0.4, ethanol = 0.4, water = 0.2 }\nq = 1.0\n[column]\n'
     'top_pressure = "1.05 bar"\n[products]\nlight_key = "ethyl acetate"\nheavy_key = "ethanol"\n'
     'light_key_recovery = 0.9\nheavy_key_recovery = 0.9\n',
     "the light key ethyl acetate (products.light_key) is more volatile than the heavy key ethanol "
     "(products.heavy_key) at the feed (relative volatility 1.328) but not on average through the column"),
    # 200 times the example's feed: a shell well over 12 m wide even at the minimum reflux
    # (design spent its 120 s time limit on stalled solves before, and blamed the time limit)
    (BENZENE.replace('flow = "180 kmol/h"', 'flow = "36000 kmol/h"'),
     "m diameter at a reflux ratio of 1.59 (flooding, rectifying section), above the 12 m the optimiser allows"),
    # ethylbenzene/p-xylene (relative volatility about 1.06): 104 stages at total reflux, 156 at the highest
    # reflux searched, which two 50 m shells cannot hold; check passed it ("Stage bound 470")
    ('title = "t"\n[mixture]\ncomponents = ["ethylbenzene", "p-xylene"]\n[feed]\nflow = "100 kmol/h"\n'
     'composition = [0.5, 0.5]\nq = 1.0\n[column]\ntop_pressure = "1.2 bar"\n[products]\n'
     'distillate_light_key_fraction = 0.95\nbottoms_light_key_fraction = 0.05\n',
     # judged at the closest spacing offered, where no spacing fits (at the default 0.61 m, which no
     # candidate offers, it read "hold at most 110 stages")
     "2 shells of at most 50 m hold at most 151 stages at 0.45 m tray spacing and 73 % tray efficiency, fewer "
     "than the 156.0 stages Gilliland's correlation asks at the highest reflux ratio searched (50): two shells "
     "in series are the most disteco builds"),
    # shells too short for their own allowances: "holds at most 3 stages" was said of a 5 m shell whose
    # sump, top space and nozzles alone took 5.8 m (3 is the least stage count searched)
    (BENZENE.replace("[economics]", '[sizing]\nmax_height = "5 m"\n[economics]'),
     "one shell of at most 5 m holds fewer than 3 stages at 0.45 m tray spacing"),
    # p-xylene/m-xylene (relative volatility about 1.02): several hundred stages at total reflux, more
    # than two 50 m shells hold at any efficiency; check spent 15 s on a 584-stage column on thermo
    # before saying that it did not converge (no textbook value: Fenske's count is the program's own)
    ('title = "t"\n[mixture]\ncomponents = ["p-xylene", "m-xylene"]\n[feed]\nflow = "100 kmol/h"\n'
     'composition = [0.5, 0.5]\nq = 1.0\n[column]\ntop_pressure = "1.2 bar"\n[products]\n'
     'distillate_light_key_fraction = 0.95\nbottoms_light_key_fraction = 0.05\n',
     "equilibrium stages even at total reflux (Fenske, the keys' relative volatility 1.0"),
    # ethanol/water at 15 kPa, its distillate 0.93 just below the azeotrope there (0.936): on the stage design's
    # 53 stages (pressures 15 to 84 kPa) Newton met no specification and check exited 1 (internal error)
    (ETHANOL.replace('top_pressure = "1.05 bar"', 'top_pressure = "15 kPa"').replace(
        "distillate_light_key_fraction = 0.80", "distillate_light_key_fraction = 0.93"),
     "the key pair has a minimum-boiling azeotrope at 0.936 ethanol at 15 kPa, which pinches the equilibrium "
     "curve near it"),
]


def _run(tmp_path, capsys, command, text, *arguments):
    case = tmp_path / "case.toml"
    case.write_text(text)
    out = ["-o", str(tmp_path / "out"), "-q"] if command == "design" else []
    code = main([command, str(case), *out, *arguments])
    return code, capsys.readouterr().err.strip().splitlines()


@pytest.mark.parametrize("text, fragment", BEFORE_OPTIMISING, ids=range(len(BEFORE_OPTIMISING)))
def test_check_refuses_what_design_refuses_with_the_same_line(tmp_path, capsys, text, fragment):
    design_code, design_err = _run(tmp_path, capsys, "design", text)
    check_code, check_err = _run(tmp_path, capsys, "check", text)
    assert design_code == check_code == 2
    assert check_err == design_err and len(check_err) == 1
    assert fragment in check_err[0]


@pytest.mark.parametrize("arguments, option, fragment", REFUSALS)
def test_check_takes_designs_options_and_names_them(tmp_path, capsys, arguments, option, fragment):
    """The given designs and optimiser options that design refuses (tests/test_cli_refusals.py)."""
    code, err = _run(tmp_path, capsys, "check", BENZENE, *arguments.split())
    assert code == 2
    assert len(err) == 1 and err[0].startswith(f"error: {option}: ") and fragment in err[0]


def test_a_valid_case_and_design_pass_check(tmp_path, capsys):
    """Exit 0 with the minima, the stage bound and the given design against the fitted minima
    (regression values of the benzene example that guard against change: 9.53 stages and reflux
    ratio 1.59, McCabe-Thiele on the fitted forms)."""
    code = main(["check", str(EXAMPLES / "aromatics_binary.toml"), "--reflux", "2", "--stages", "25",
                 "--feed-stage", "12", "--scenario", "reference"])
    out = capsys.readouterr().out
    assert code == 0
    assert "Given design: reflux ratio 2 [-], 25 stages, feed on stage 12" in out
    assert "(1.59, 9.53 stages, McCabe-Thiele)" in out
    assert "Utilities of the given design (25 stages, constant molar overflow on the fitted forms): condenser" in out
    assert "degC on cooling_water; reboiler" in out and out.count("degC on lp_steam") == 1 and "Note:" not in out
    assert "Case file is valid. design with these options will not refuse it before optimising." in out


def test_most_stages_two_shells_hold_at_best():
    """Hand arithmetic on the default sizing options: (50 m - 1.2 m top space - 1.0 m bottom space) /
    0.45 m closest spacing = 106.2 trays a shell, 106 whole; two shells 212 trays, each an equilibrium
    stage at best, plus the reboiler and a partial condenser: 214. A 30 m limit: 27.8 m of trays at
    0.45 m, 61.8, 61 a shell, 124."""
    from dataclasses import replace

    from disteco.optimisation.first_round import most_stages_held
    from disteco.sizing.options import SizingOptions

    assert most_stages_held(SizingOptions()) == 214
    assert most_stages_held(replace(SizingOptions(), max_height=30.0)) == 124
