"""Given designs and optimiser options the command line must refuse: exit 2, one line naming the option.

Each refusal happens before any solver call (checks on the decisions, then Fenske's and
Underwood's minima on the column's fitted forms), so these tests are fast.
"""

import math

import pytest

from disteco._base.errors import CaseError, InfeasibleDesignError, SolverError
from disteco.api import GivenDesign
from disteco.cli import main
from disteco.optimisation.given import check_given_design, explain_failure
from disteco.optimisation.options import model_options
from disteco.optimisation.start import Shortcut

from conftest import EXAMPLES

CASE = str(EXAMPLES / "aromatics_binary.toml")


REFUSALS = [  # (arguments of design and check on the benzene example, option named, fragment of the message)
    ("--time-limit 0", "--time-limit", "a finite number above 0 s"),
    ("--time-limit -1", "--time-limit", "a finite number above 0 s"),
    ("--time-limit nan", "--time-limit", "a finite number above 0 s"),
    ("--gap -1", "--gap", "a finite number at least 0"),
    ("--gap nan", "--gap", "a finite number at least 0"),
    ("--max-stages 0", "--max-stages", "a whole number at least 3"),
    ("--max-stages 2", "--max-stages", "a whole number at least 3"),
    ("--max-stages 5", "--max-stages", "not above the minimum of 9.53 stages"),
    ("--reflux inf --stages 30 --feed-stage 15", "--reflux", "a finite number above 0"),
    ("--reflux nan --stages 30 --feed-stage 15", "--reflux", "a finite number above 0"),
    ("--reflux -1 --stages 30 --feed-stage 15", "--reflux", "a finite number above 0"),
    ("--reflux 1e9 --stages 30 --feed-stage 15", "--reflux", "above the highest the model allows (50"),
    ("--reflux 1.0 --stages 30 --feed-stage 15", "--reflux", "below the minimum reflux ratio 1.59"),
    ("--reflux 2 --stages 25 --feed-stage 25", "--feed-stage", "a stage from 2 to 24"),
    ("--reflux 2 --stages 25 --feed-stage 1", "--feed-stage", "a stage from 2 to 24"),
    ("--reflux 2 --stages 2 --feed-stage 1", "--stages", "a whole number of at least 3"),
    ("--reflux 2 --stages 5 --feed-stage 3", "--stages", "fewer than the minimum of 9.53 (McCabe-Thiele at total reflux"),
    ("--reflux 100 --stages 6 --feed-stage 3", "--stages", "fewer than the minimum of 9.53"),
    ("--reflux 2 --stages 30", "--reflux/--stages/--feed-stage", "only some of the three"),
    ("--scenario nope", "--scenario", "(allowed: reference, cheap-steam-demo, expensive-power-demo)"),
    ("--price lp_stem=20USD/GJ", "--price", "unknown utility 'lp_stem'; did you mean 'lp_steam'?"),
    ("--price lp_steam=20", "--price", "a unit is missing in '20'"),
    ("--price lp_steam=20USD/MJ", "--price", "per GJ, kWh, t, m3"),
    ("--scenario no-such-prices", "--scenario", "unknown scenario 'no-such-prices'"),
    ("--scenario reference --scenario cheap-steam-demo --scenario reference", "--scenario",
     "scenario 'reference' named twice (allowed: each scenario once)"),
]


@pytest.mark.parametrize("arguments, option, fragment", REFUSALS)
def test_refused_with_exit_2_and_the_option_named(tmp_path, capsys, arguments, option, fragment):
    """Benzene-toluene example (minimum stages 9.53 and minimum reflux 1.59 by McCabe-Thiele on
    the fitted forms; regression values that only guard against change): each bad option or given design
    exits 2 with one line that starts with the option and says what is allowed; nothing is written."""
    code = main(["design", CASE, "-o", str(tmp_path / "out"), "-q", *arguments.split()])
    err = capsys.readouterr().err
    assert code == 2
    lines = err.strip().splitlines()
    assert len(lines) == 1, err
    assert lines[0].startswith(f"error: {option}: ")
    assert fragment in lines[0]
    assert not (tmp_path / "out").exists()


def test_options_name_the_field_from_the_api():
    """The Python API names the option itself (the command line renames it)."""
    with pytest.raises(CaseError, match="time_limit: nan is not allowed"):
        model_options({"time_limit": math.nan})
    with pytest.raises(CaseError, match="no_such_option: unknown optimiser option"):
        model_options({"no_such_option": 1})
    assert model_options({"max_stages": 40.0}).max_stages == 40


def test_given_design_fields_from_the_api():
    with pytest.raises(CaseError, match="feed_stage: feed on stage 10 of a 10-stage column"):
        GivenDesign(2.0, 10, 10)


ESTIMATE = Shortcut(alpha=(2.4, 1.0), distillate=(0.5, 0.01), minimum_reflux=1.5, minimum_stages=9.4)


def test_minimum_stages_checked_before_reflux():
    """Fewer stages than the minimum is named first, whatever the reflux (a reflux of 100 too)."""
    with pytest.raises(InfeasibleDesignError, match="9 stages is fewer than the minimum of 9.40") as caught:
        check_given_design(ESTIMATE, 100.0, 9, 5, reflux_max=50.0)
    assert caught.value.field == "stages"


def test_reflux_below_the_minimum_is_left_to_the_model_within_the_allowance():
    """Energy balances can lower the minimum reflux below the constant-molar-overflow one (water/acetic
    acid at 1.05 bar: 0.483 against 0.546, measured), so a reflux up to 25 % below that minimum passes the
    check and is left to the model; one further below is refused, naming the floor."""
    check_given_design(ESTIMATE, 0.80 * 1.5, 30, 15, reflux_max=50.0)
    with pytest.raises(InfeasibleDesignError, match=r"below the minimum reflux ratio 1.5 .*\(allowed: above 1.125\)") \
            as caught:
        check_given_design(ESTIMATE, 0.74 * 1.5, 30, 15, reflux_max=50.0)
    assert caught.value.field == "reflux_ratio"


def test_solver_failure_short_of_gilliland_stages_is_explained():
    """A failed solve on a design with fewer stages than Gilliland's estimate (Molokanov form) is
    explained as short of stages; one with more stages keeps the solver's own error."""
    failure = SolverError("stalled")
    explained = explain_failure(ESTIMATE, 1.8, 12, failure)
    assert isinstance(explained, InfeasibleDesignError) and explained.field == "stages"
    assert "Gilliland's correlation asks for about" in str(explained)
    assert explain_failure(ESTIMATE, 2.0, 80, failure) is failure


def test_solver_failure_near_the_minimum_reflux_is_put_down_to_it():
    """A failed solve at a reflux within 25 % above the constant-molar-overflow minimum, on stages enough
    by Gilliland's correlation, names the reflux (exit 2): the energy balances and the pressure drop can
    raise the column's minimum above it (the benzene example at R = 1.6 on 60 stages ended in exit 1)."""
    failure = SolverError("iteration limit")
    explained = explain_failure(ESTIMATE, 1.6, 80, failure)
    assert isinstance(explained, InfeasibleDesignError) and explained.field == "reflux_ratio"
    assert "reflux ratio 1.6 is 1.07 x the minimum reflux ratio 1.5" in str(explained)
    assert "(allowed: a reflux ratio of at least 1.875 (1.25 x the minimum)" in str(explained)
    assert explain_failure(ESTIMATE, 1.49, 80, failure).field == "reflux_ratio"  # below it: the same words


def test_a_reader_that_stops_reading_does_not_end_the_run(tmp_path):
    """`disteco design case.toml | head -1` printed "internal error: BrokenPipeError" (exit 1) and wrote no
    files: the reader left before the result was printed. The run now goes on quietly, writes its files
    and exits 0."""
    import subprocess
    import sys

    command = [sys.executable, "-c", "import sys; from disteco.cli import main; sys.exit(main(sys.argv[1:]))",
               "design", str(EXAMPLES / "aromatics_binary.toml"), "-o", str(tmp_path / "out"), "--no-figures",
               "--reflux", "2", "--stages", "30", "--feed-stage", "15", "--no-compare"]
    run = subprocess.Popen(command, stdout=subprocess.PIPE, stderr=subprocess.PIPE)
    assert run.stdout.readline().startswith(b"Case: ")
    run.stdout.close()  # as head does after its first line
    _, errors = run.communicate(timeout=300)
    assert run.returncode == 0, errors.decode()
    assert b"internal error" not in errors and b"Traceback" not in errors
    assert (tmp_path / "out" / "result.json").is_file() and (tmp_path / "out" / "design.xlsx").is_file()


def test_a_price_written_with_a_space_is_explained(capsys):
    """`--price lp_steam=20 USD/GJ` unquoted reaches the program as two arguments; the message names
    both and the two ways to write it, and a stray argument of another kind keeps the parser's words."""
    case = str(EXAMPLES / "aromatics_binary.toml")
    assert main(["check", case, "--price", "lp_steam=20", "USD/GJ"]) == 2
    assert capsys.readouterr().err.strip() == (
        "error: --price: 'lp_steam=20' and 'USD/GJ' came as two arguments (allowed: the price without a space, "
        "lp_steam=20USD/GJ, or quoted: --price 'lp_steam=20 USD/GJ')")
    with pytest.raises(SystemExit) as stopped:
        main(["check", case, "--price", "lp_steam=20USD/GJ", "other.toml"])
    assert stopped.value.code == 2 and "unrecognized arguments: other.toml" in capsys.readouterr().err


def test_a_component_without_unifac_groups_is_refused_with_the_methods_that_can_take_it(tmp_path, capsys):
    """Ammonia has no UNIFAC (Dortmund) groups in thermo's data: the refusal names the field and the
    methods that can describe the pair from the case's own parameters, Peng-Robinson with kij among them."""
    text = (EXAMPLES / "methanol_water.toml").read_text().replace('"methanol", "water"', '"ammonia", "water"')
    text = text.replace("methanol = 0.35", "ammonia = 0.35")
    case = tmp_path / "nh3.toml"
    case.write_text(text)
    assert main(["check", str(case)]) == 2
    assert capsys.readouterr().err.strip() == (
        "error: mixture.method: no UNIFAC (Dortmund) groups for ammonia (allowed: nrtl or wilson with parameters "
        "in the case file, or peng-robinson with the pairs' kij in the case file)")
