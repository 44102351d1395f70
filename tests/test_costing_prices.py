"""Utility prices set by the user (--price, [prices]) and one cost year for capital and utilities."""

import csv
import shutil
import tomllib
from importlib.resources import files
from pathlib import Path

import pytest

from disteco._base.errors import CaseError, CostDataError
from disteco._base.prices import parse_price, parse_price_option, parse_price_table
from disteco.case import parse_case
from disteco.costing.column import ColumnCostInput, cost_column
from disteco.costing.data import load_cost_data, resolve_scenarios
from disteco.costing.prices import apply_prices

BUNDLED = Path(str(files("disteco.cost_data")))
ROOT = Path(__file__).resolve().parents[1]
DATA = load_cost_data()
INPUT = ColumnCostInput(shell_diameter=1.5, shell_height=20.0, design_pressure_gauge=1e5, trays=30,
                        condenser_area=80.0, condenser_duty=2e6, condenser_utility="cooling_water",
                        reboiler_area=60.0, reboiler_duty=2.2e6, reboiler_utility="lp_steam",
                        drum_volume=4.0, drum_diameter=1.2, pump_shaft_power=1.5e3)
SECONDS = 8000 * 3600.0  # operating hours of annualisation.toml, in seconds


def _index(name, year):
    """A value of utility_price_index.csv, read from the file (not from the loader under test)."""
    with open(BUNDLED / "utility_price_index.csv", newline="", encoding="utf-8") as handle:
        for row in csv.DictReader(handle):
            if row["index_name"] == name and int(row["year"]) == year:
                return float(row["value"])
    raise KeyError((name, year))


def test_reference_prices_are_moved_to_the_cost_year():
    """The reference steam price (13.28 USD/GJ of 2006) in a 2023 estimate is 13.28 x gas(2023)/gas(2006);
    electricity follows the electricity index; capital and utilities carry one year."""
    summary = cost_column(DATA, INPUT, "reference", 2023)
    by_item = {u.item: u for u in summary.utilities}
    gas = _index("industrial_natural_gas", 2023) / _index("industrial_natural_gas", 2006)
    power = _index("industrial_electricity", 2023) / _index("industrial_electricity", 2006)
    steam = by_item["reboiler"]
    assert (steam.given_price, steam.given_year, steam.price_year) == (13.28, 2006, 2023)
    assert steam.escalation_factor == pytest.approx(gas, rel=1e-12)
    assert steam.cost_per_year == pytest.approx(2.2e6 * SECONDS * 13.28e-9 * gas, rel=1e-9)
    assert by_item["reflux pump"].price == pytest.approx(0.0605 * power, rel=1e-12)
    assert by_item["condenser"].price == pytest.approx(0.354 * power, rel=1e-12)
    assert summary.cost_year == 2023 and {u.price_year for u in summary.utilities} == {2023}
    assert not [w for w in summary.warnings if "kept as given" in w]


def test_demo_prices_of_the_cost_year_are_not_escalated():
    summary = cost_column(DATA, INPUT, "cheap-steam-demo", 2023)
    assert {u.escalation_factor for u in summary.utilities} == {1.0}
    assert {u.given_year for u in summary.utilities} == {2023}


@pytest.fixture
def folder(tmp_path):
    target = tmp_path / "costs"
    shutil.copytree(BUNDLED, target, ignore=shutil.ignore_patterns("__init__.py", "__pycache__"))
    return target


def test_price_without_an_index_is_kept_as_given_with_a_warning_naming_both_years(folder):
    path = folder / "utility_prices.csv"
    text = path.read_text(encoding="utf-8")
    path.write_text(text.replace("reference,lp_steam,13.28,USD,GJ,2006,industrial_natural_gas,",
                                 "reference,lp_steam,13.28,USD,GJ,2006,none,"), encoding="utf-8")
    summary = cost_column(load_cost_data(folder), INPUT, "reference", 2023)
    steam = next(u for u in summary.utilities if u.item == "reboiler")
    assert (steam.price, steam.price_year, steam.escalation_factor) == (13.28, 2006, 1.0)
    (note,) = [w for w in summary.warnings if "kept as given" in w]
    assert "2006" in note and "2023" in note and "lp_steam" in note


def test_unknown_price_index_names_file_row_and_column(folder):
    path = folder / "utility_prices.csv"
    path.write_text(path.read_text(encoding="utf-8").replace(",2006,industrial_natural_gas,", ",2006,gas,", 1),
                    encoding="utf-8")
    with pytest.raises(CostDataError, match=r"utility_prices.csv, row 7, column 'price_index': 'gas' is not one of"):
        load_cost_data(folder)


# ---------------------------------------------------------------- user prices


@pytest.mark.parametrize("text, price, per", [("20 USD/GJ", 20.0, "GJ"), ("20USD/GJ", 20.0, "GJ"),
                                              ("0.08 USD/kWh", 0.08, "kWh"), ("15 usd / t", 15.0, "t"),
                                              ("0.05 USD/m³", 0.05, "m3")])
def test_price_text_is_read(text, price, per):
    assert parse_price(text, "f") == (price, "USD", per)


@pytest.mark.parametrize("text, message", [
    ("20", r"f: a unit is missing in '20' \(allowed: e.g. \"20 USD/GJ\"; per GJ, kWh, t, m3\)"),
    ("20 USD/MJ", r"f: unknown price unit 'MJ' \(allowed: e.g. \"20 USD/GJ\"; per GJ, kWh, t, m3\)"),
    ("-3 USD/GJ", r"f: '-3 USD/GJ' is not a finite price of zero or more"),
    ("cheap", r"f: cannot read 'cheap' as a number followed by a unit"),
    (20, r"f: expected a price written as text with its unit"),
])
def test_bad_price_text_names_the_field_and_the_units(text, message):
    with pytest.raises(CaseError, match=message):
        parse_price(text, "f")


def _apply(*options, tables=None):
    settings = tuple(parse_price_option(o, "--price") for o in options)
    return apply_prices(DATA, parse_price_table(tables or {}), settings, 2023)


def test_price_option_reaches_the_utility_cost():
    """--price lp_steam=20USD/GJ: the reboiler's steam costs duty x hours x 20 USD/GJ in every scenario, not escalated."""
    data = _apply("lp_steam=20USD/GJ")
    for scenario in ("reference", "expensive-power-demo"):
        steam = next(u for u in cost_column(data, INPUT, scenario, 2023).utilities if u.item == "reboiler")
        assert steam.cost_per_year == pytest.approx(2.2e6 * SECONDS * 20e-9, rel=1e-12)
        assert (steam.set_by, steam.escalation_factor, steam.price_unit) == ("--price", 1.0, "USD/GJ")


def test_price_per_tonne_of_steam_uses_its_latent_heat():
    """12 USD/t of steam at 2086 kJ/kg (utility_levels.csv) is 12/2.086 USD/GJ."""
    data = _apply("reference.lp_steam=12 USD/t")
    assert data.price_per_joule("reference", "lp_steam", 2023) == pytest.approx(12.0 / 2.086e9, rel=1e-12)
    assert data.price("cheap-steam-demo", "lp_steam").set_by is None  # another scenario keeps its price


def test_case_prices_override_a_scenario_and_define_one():
    """[prices.reference] replaces a price; [prices.high_gas] is a new scenario on reference; --price comes last."""
    tables = {"reference": {"electricity": "0.10 USD/kWh"},
              "high_gas": {"based_on": "reference", "lp_steam": {"price": "25 USD/GJ", "year": 2022}}}
    data = _apply("high_gas.cooling_water=0.5USD/GJ", tables=tables)
    assert data.price("reference", "electricity", 2023).price == 0.10
    assert data.price("high_gas", "electricity", 2023).price == 0.10  # based on reference as the case has it
    steam = data.price("high_gas", "lp_steam", 2023)
    gas = _index("industrial_natural_gas", 2023) / _index("industrial_natural_gas", 2022)
    assert steam.price == pytest.approx(25.0 * gas) and steam.set_by == "prices.high_gas.lp_steam"
    assert data.price("high_gas", "cooling_water", 2023).price == 0.5
    assert resolve_scenarios(data) == ("reference", "high_gas")  # a scenario defined in the case is run


def test_price_option_with_a_year_is_moved_to_the_cost_year_as_a_table_price_is():
    """--price lp_steam=25USD/GJ@2022 equals the case table's { price = "25 USD/GJ", year = 2022 }: both
    moved to 2023 by the industrial natural gas index (utility_price_index.csv)."""
    option = _apply("lp_steam=25USD/GJ@2022").price("reference", "lp_steam", 2023)
    table = _apply(tables={"reference": {"lp_steam": {"price": "25 USD/GJ", "year": 2022}}}).price(
        "reference", "lp_steam", 2023)
    gas = _index("industrial_natural_gas", 2023) / _index("industrial_natural_gas", 2022)
    assert option.price == pytest.approx(25.0 * gas, rel=1e-12) and option.price == pytest.approx(table.price)
    assert option.set_by == "--price"


@pytest.mark.parametrize("option, message", [
    ("lp_steam=20USD/GJ@1850", r"--price: '1850' after '@' is not a year \(allowed: a year from 1900 to 2100\)"),
    ("lp_steam=20USD/GJ@last", r"--price: 'last' after '@' is not a year"),
    ("lp_stem=20USD/GJ", r"--price: unknown utility 'lp_stem'; did you mean 'lp_steam'\? \(allowed: cooling_water"),
    ("electricity=20USD/t", r"--price: electricity cannot be priced per t .*\(allowed: per GJ, kWh\)"),
    ("refrigerant_minus_20=2USD/t", r"--price: refrigerant_minus_20 cannot be priced per t .*\(allowed: per GJ, kWh\)"),
    ("lp_steam=20EUR/GJ", r"--price: currency EUR differs from the cost data's \(allowed: USD"),
    ("nowhere.lp_steam=20USD/GJ", r"--price: unknown scenario 'nowhere' \(allowed: reference, cheap-steam-demo"),
    ("lp_steam", r"--price: 'lp_steam' has no '=' \(allowed: \[SCENARIO.\]UTILITY=PRICE"),
])
def test_bad_price_option_names_the_option_and_what_is_allowed(option, message):
    with pytest.raises(CaseError, match=message):
        _apply(option)


@pytest.mark.parametrize("tables, message", [
    ({"reference": {"lp_steam": "20"}}, r"prices.reference.lp_steam: a unit is missing"),
    ({"reference": {"steam": "20 USD/GJ"}}, r"prices.reference.steam: unknown utility 'steam'"),
    ({"reference": {"based_on": "cheap-steam-demo"}}, r"prices.reference.based_on: 'reference' is a scenario of "
                                                       r"the cost data"),
    ({"mine": {"based_on": "nowhere", "lp_steam": "20 USD/GJ"}}, r"prices.mine.based_on: unknown scenario 'nowhere'"),
    ({"mine": {"lp_steam": {"price": "20 USD/GJ", "year": 1850}}}, r"prices.mine.lp_steam.year: 1850"),
    ({"reference": "20 USD/GJ"}, r"prices.reference: must be a table of utility prices"),
])
def test_bad_price_table_names_the_field(tables, message):
    with pytest.raises(CaseError, match=message):
        _apply(tables=tables)


def test_prices_table_is_a_case_field():
    """The case file accepts [prices]; its settings keep their field names."""
    text = (ROOT / "examples" / "aromatics_binary.toml").read_text(encoding="utf-8")
    case = parse_case(tomllib.loads(text + '\n[prices.reference]\nlp_steam = "20 USD/GJ"\n'))
    (table,) = case.prices
    assert (table.name, table.settings[0].origin, table.settings[0].price) == \
        ("reference", "prices.reference.lp_steam", 20.0)


# ---------------------------------------------------------------- the economic trend of the steam price

STEAM_PRICES = (3.0, 5.0, 8.0, 13.0, 20.0)  # USD/GJ, set as --price lp_steam=...
SWEEP_MAX = 30  # a small stage bound keeps each search near two seconds


def test_steam_price_sweep_moves_reflux_down_and_tac_up():
    """Over five steam prices set with --price (benzene-toluene, 95 %/5 % split, up to 30 stages):
    a dearer steam never raises the optimum reflux ratio, a cheaper one never lowers it, and
    the TAC rises with every step. Each price reaches the model's reboiler coefficient."""
    from disteco.optimisation.design import model_cost_basis
    from disteco.optimisation.options import model_options
    from disteco.optimisation.search import optimise
    from disteco.sizing.options import SizingOptions
    from test_optimisation_support import EASY_SPLIT, example, example_problem

    _, mixture, _ = example("aromatics_binary")
    problem = example_problem("aromatics_binary", SWEEP_MAX, *EASY_SPLIT)
    options = {"max_stages": SWEEP_MAX}
    best = []
    for price in STEAM_PRICES:
        data = _apply(f"lp_steam={price:g}USD/GJ")
        basis, _ = model_cost_basis(problem, mixture, data, SizingOptions(), "reference", 2023,
                                    model_options(options))
        assert basis.reboiler.price == pytest.approx(price * 1e-9, rel=1e-12)
        best.append(optimise(problem, basis, options).best)
    refluxes = [b.reflux_ratio for b in best]
    tacs = [b.tac for b in best]
    for cheaper, dearer in zip(refluxes, refluxes[1:]):
        assert dearer <= cheaper * (1 + 1e-6)
    assert refluxes[-1] < refluxes[0] * 0.99  # the sweep does move the optimum
    assert all(b > a for a, b in zip(tacs, tacs[1:]))


def test_a_power_price_that_the_design_s_power_following_utilities_do_not_follow_is_noted():
    """A scenario whose electricity price the case sets, run on a design cooled by cooling water (priced
    by the cost data, escalated by an electricity index), gets a note naming that utility; a scenario
    that sets the cooling water as well, or leaves the power price alone, gets none."""
    from disteco.reports.tables_design import ReportParts
    from disteco.reports.tables_prices import power_price_notes

    tables = {"dear_power": {"based_on": "reference", "electricity": "0.15 USD/kWh"},
              "dear_both": {"based_on": "reference", "electricity": "0.15 USD/kWh", "cooling_water": "0.8 USD/GJ"}}
    data = _apply(tables=tables)
    cost = cost_column(data, INPUT, "reference", 2023)
    assert data.price("reference", "cooling_water", 2023).price_index.endswith("electricity")

    def notes(*scenarios):
        return power_price_notes(ReportParts(cost_data=data, cost=cost,
                                             scenarios=tuple((name, None) for name in scenarios)))
    (note,) = notes("reference", "dear_power", "dear_both")
    assert note.startswith("scenario 'dear_power': electricity is set to 0.15 USD/kWh (prices.dear_power.electricity)")
    assert "cooling_water" in note and "lp_steam" not in note  # steam follows a gas index
    assert notes("reference") == ()


def test_a_price_far_from_the_cost_data_s_own_is_noted_as_a_likely_unit_mistake():
    """20 USD/kWh of low-pressure steam (meant per GJ) is 5,556 USD/GJ, 418 x the bundled reference's
    13.28 USD/GJ of 2006 (cost_data/utility_prices.csv): a note asks to check the number and its unit;
    20 USD/GJ (1.5 x) gets none, nor does a utility the design does not use."""
    from disteco.reports.tables_design import ReportParts
    from disteco.reports.tables_prices import price_notes

    def notes(*options):
        data = _apply(*options)
        cost = cost_column(data, INPUT, "reference", 2023)
        return price_notes(ReportParts(cost_data=data, cost=cost, scenarios=(("reference", None),)))

    (note,) = notes("reference.lp_steam=20USD/kWh")
    assert note.startswith("scenario 'reference': lp_steam is set to 20 USD/kWh (--price), 418 x the cost data's own")
    assert "check the number and its unit (per GJ, kWh, t or m3)" in note
    assert notes("reference.lp_steam=20USD/GJ") == ()
    assert notes("reference.hot_oil=20USD/kWh") == ()  # not a utility of this design
    assert _apply("lp_steam=20USD/kWh").price("reference", "lp_steam").cost_data_ratio == pytest.approx(
        20.0 / 3.6e-3 / 13.28, rel=1e-3)


def test_check_gives_the_far_price_note_before_a_design_runs_on_it(capsys):
    """`check` names the same likely unit mistake for the utilities of the search's first column, so that
    a design of minutes is not run on it first (a cooling-water price of 1e9 USD/GJ designed for 137 s)."""
    from disteco.cli import main

    from conftest import EXAMPLES

    assert main(["check", str(EXAMPLES / "aromatics_binary.toml"), "--price", "lp_steam=20USD/kWh"]) == 0
    out = capsys.readouterr().out
    assert "Note: scenario 'reference': lp_steam is set to 20 USD/kWh (--price), 418 x the cost data's own" in out
    assert main(["check", str(EXAMPLES / "aromatics_binary.toml"), "--price", "lp_steam=20USD/GJ"]) == 0
    assert "check the number and its unit" not in capsys.readouterr().out
