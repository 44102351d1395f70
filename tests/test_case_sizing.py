"""The case file's [sizing] table and control margin: units, misspelt keys, ranges, and each value
reaching the design.

Each option is checked where it acts: the benzene-toluene profile of test_sizing_column sized with
the options the case gives (as the design path builds them, ``sizing_options(case)``), costed where
the option is a cost choice; one priced given design checks the whole path from the case file.
"""

import json
import tomllib

import pytest
from openpyxl import load_workbook

from disteco._base.errors import InfeasibleSpecError
from disteco.api import cost_data_of
from disteco.case import MIN_REFLUX_RATIO_FACTOR, parse_case
from disteco.cli import main
from disteco.costing import cost_column
from disteco.costing.from_sizing import cost_input
from disteco.optimisation.margin import hold_margin
from disteco.sizing import size_column
from disteco.sizing.options import INCH, sizing_options

from conftest import EXAMPLES
from test_sizing_column import UTILITIES, make_profile

BASE = (EXAMPLES / "aromatics_binary.toml").read_text()


def case_with(sizing: str = "", column: str = ""):
    text = BASE.replace("condenser = \"total\"", "condenser = \"total\"\n" + column)
    return parse_case(tomllib.loads(text + "\n[sizing]\n" + sizing))


@pytest.fixture(scope="module")
def default_sized(benzene_toluene):
    return size_column(make_profile(benzene_toluene), benzene_toluene, UTILITIES, 850.0, 1000.0,
                       sizing_options(case_with()), round_diameter=False)


def sized_with(mixture, line: str):
    options = sizing_options(case_with(line))
    return options, size_column(make_profile(mixture), mixture, UTILITIES, 850.0, 1000.0, options,
                                round_diameter=False)


def _gauge_bottom_of_profile() -> float:
    return 101325.0 + 700.0 * 11 - 101325.0  # Pa; make_profile's bottom stage, gauge


# (line of the [sizing] table, check of (options, sized, default sized))
EFFECTS = {
    "tray_spacing": ('tray_spacing = "18 in"',
                     lambda o, s, d: s.height.tray_spacing == pytest.approx(18 * INCH)
                     and d.height.tray_spacing == pytest.approx(24 * INCH)
                     and s.diameter > d.diameter  # closer trays flood at a lower vapour velocity
                     and o.tray_spacings == pytest.approx((18 * INCH,))),  # given alone: not searched over
    "flood_fraction": ("flood_fraction = 0.6",
                       lambda o, s, d: s.flood_fraction == 0.6 and all(
                           h.design_velocity == pytest.approx(0.6 * h.flooding_velocity) for h in s.hydraulics)),
    "downcomer_area_fraction": ("downcomer_area_fraction = 0.15",
                                lambda o, s, d: all(h.downcomer_fraction == 0.15 for h in s.hydraulics)),
    "system_factor": ("system_factor = 0.75",
                      lambda o, s, d: all(a.capacity_factor == pytest.approx(0.75 * b.capacity_factor)
                                          for a, b in zip(s.hydraulics, d.hydraulics))),
    "tray_efficiency": ("tray_efficiency = 0.65", lambda o, s, d: s.efficiency.value == 0.65),
    "shell_material": ('shell_material = "A240 Type 304"',
                       lambda o, s, d: (s.vessel.material, s.vessel.material_class) == ("A240 Type 304", "SS")),
    "pressure_margin_fraction": ('pressure_margin_fraction = 0.5\npressure_margin_minimum = "1 kPa"',
                                 lambda o, s, d: s.vessel.design_pressure == pytest.approx(
                                     1.5 * _gauge_bottom_of_profile())),
    "pressure_margin_minimum": ('pressure_margin_minimum = "2 bar"',
                                lambda o, s, d: s.vessel.design_pressure == pytest.approx(
                                    _gauge_bottom_of_profile() + 2e5)),
    "temperature_margin": ('temperature_margin = "40 K"',
                           lambda o, s, d: s.vessel.design_temperature - d.vessel.design_temperature
                           == pytest.approx(40.0 - 25.0)),
    # the condenser at 81.1 degC keeps cooling water (30 to 45 degC) at a 30 K approach; at 40 K
    # it has none (test_min_approach_reaches_the_choice_of_utility)
    "min_approach": ('min_approach = "30 K"', lambda o, s, d: o.min_approach == 30.0
                     and s.condenser.utility.name == d.condenser.utility.name == "cooling water"),
    "max_height": ('max_height = "10 m"',
                   lambda o, s, d: any("exceeds 10 m" in w for w in s.warnings)
                   and not any("exceeds 50 m" in w for w in d.warnings)),
    # the limit sets a least diameter (the shell is widened until its height is 5 diameters at most)
    "max_height_to_diameter": ("max_height_to_diameter = 5",
                               lambda o, s, d: s.diameter_basis == "height-to-diameter limit"
                               and s.height.tangent_length / s.diameter <= 5.0 + 1e-9 < d.height.tangent_length / d.diameter),
    "tray_spacings": ('tray_spacings = ["0.45 m", "24 in", "750 mm"]',
                      lambda o, s, d: o.tray_spacings == pytest.approx((0.45, 24 * INCH, 0.75))),
}


@pytest.mark.parametrize("key", sorted(EFFECTS))
def test_each_sizing_option_reaches_the_sizing(benzene_toluene, default_sized, key):
    line, effect = EFFECTS[key]
    options, sized = sized_with(benzene_toluene, line)
    assert key in dict(case_with(line).sizing.given)
    assert effect(options, sized, default_sized)


def test_min_approach_reaches_the_choice_of_utility(benzene_toluene):
    """With a 40 K minimum approach no level of the test's utilities fits the benzene condenser
    (81.1 degC against cooling water returning at 45 degC): refused, naming the approach and the
    option to lower."""
    with pytest.raises(InfeasibleSpecError, match=r"minimum approach of 40.0 K; .*lower sizing.min_approach"):
        sized_with(benzene_toluene, 'min_approach = "40 K"')


@pytest.mark.parametrize("line, equipment, material", [
    ('tray_type = "valve"', "valve_tray", "CS"),
    ('tray_material = "SS"', "sieve_tray", "SS"),
])
def test_tray_type_and_material_reach_the_cost(benzene_toluene, line, equipment, material):
    case = case_with(line)
    data, options = cost_data_of(case), sizing_options(case)
    sized = size_column(make_profile(benzene_toluene), benzene_toluene, data.levels, 850.0, 1000.0, options)
    trays = next(e for e in cost_column(data, cost_input(sized, options), "reference").items if e.item == "trays")
    assert (trays.equipment, trays.material) == (equipment, material)


def test_misspelt_sizing_key_names_the_right_one(tmp_path, capsys):
    case = tmp_path / "case.toml"
    case.write_text(BASE + "\n[sizing]\nflood_fracton = 0.7\n")
    assert main(["check", str(case)]) == 2
    err = capsys.readouterr().err
    assert "sizing.flood_fracton: unknown field; did you mean sizing.flood_fraction?" in err
    assert "Traceback" not in err


@pytest.mark.parametrize("sizing, column, field, fragment", [
    ("flood_fraction = 1.2", "", "sizing.flood_fraction", "not a fraction"),
    ('flood_fraction = "0.8"', "", "sizing.flood_fraction", "expected a number"),
    ('tray_spacing = "3 in"', "", "sizing.tray_spacing", "outside the range of the flooding correlations"),
    ('tray_spacing = "0.6"', "", "sizing.tray_spacing", "a unit is missing"),
    ("tray_spacing = 0.6", "", "sizing.tray_spacing", 'a unit is missing: 0.6 is a bare number (allowed: text with '
                                                      'a length unit, e.g. "0.6 m"'),
    ("min_approach = 5", "", "sizing.min_approach", "a unit is missing: 5 is a bare number"),
    ("max_height = true", "", "sizing.max_height", "expected a quantity with its unit, as text, got True"),
    ("tray_spacings = []", "", "sizing.tray_spacings", "empty list"),
    ('tray_spacings = ["0.5 m", "50 cm"]', "", "sizing.tray_spacings", "one or more different spacings"),
    ('tray_spacings = ["0.5 m", "2 m"]', "", "sizing.tray_spacings", "outside the range"),
    ("downcomer_area_fraction = 0.6", "", "sizing.downcomer_area_fraction", "0 to 0.5"),
    ("system_factor = 0", "", "sizing.system_factor", "above zero"),
    ("tray_efficiency = 1.5", "", "sizing.tray_efficiency", "at most 1"),
    ('tray_type = "bubble-cap"', "", "sizing.tray_type", "unknown tray type"),
    ('shell_material = "wood"', "", "sizing.shell_material", "unknown material 'wood'"),
    ('tray_material = "gold"', "", "sizing.tray_material", "no material factor for 'gold' trays"),
    ("pressure_margin_fraction = -0.1", "", "sizing.pressure_margin_fraction", "zero or above"),
    ('pressure_margin_minimum = "0 bar"', "", "sizing.pressure_margin_minimum", "above zero"),
    ('temperature_margin = "-5 K"', "", "sizing.temperature_margin", "zero or above"),
    ('min_approach = "0 K"', "", "sizing.min_approach", "above zero"),
    ('min_approach = "5"', "", "sizing.min_approach", "a unit is missing"),
    ('max_height = "0 m"', "", "sizing.max_height", "above zero"),
    ("max_height_to_diameter = -3", "", "sizing.max_height_to_diameter", "above zero"),
    ("", "min_reflux_ratio_factor = 0.95", "column.min_reflux_ratio_factor", "1 to 5 times"),
    ("", "min_reflux_ratio_factor = 6", "column.min_reflux_ratio_factor", "1 to 5 times"),
])
def test_out_of_range_choices_exit_2_naming_the_field(tmp_path, capsys, sizing, column, field, fragment):
    case = tmp_path / "case.toml"
    case.write_text(BASE.replace("condenser = \"total\"", "condenser = \"total\"\n" + column)
                    + "\n[sizing]\n" + sizing + "\n")
    assert main(["check", str(case)]) == 2
    err = capsys.readouterr().err
    assert f"{field}:" in err and fragment in err, err
    assert "Traceback" not in err


def test_margin_defaults_and_keeps_a_design_above_its_floor():
    """Without a [column] entry the common-practice factor holds; a design above the floor (or a
    minimum that was not found) is returned as it is, with nothing re-optimised."""
    case = case_with()
    assert case.column.min_reflux_ratio_factor == MIN_REFLUX_RATIO_FACTOR == 1.1
    assert case_with(column="min_reflux_ratio_factor = 1.25").column.min_reflux_ratio_factor == 1.25
    optimum = object()  # a search would fail on it: proves none is run
    kept, margin = hold_margin(case, None, None, None, optimum, reflux_ratio=2.0, minimum_reflux=1.8)
    assert kept is optimum and not margin.binds and margin.reflux_floor == pytest.approx(1.98)
    assert margin.warnings == ()
    kept, margin = hold_margin(case, None, None, None, optimum, reflux_ratio=1.0, minimum_reflux=None)
    assert kept is optimum and margin.reflux_floor is None
    assert "column.min_reflux_ratio_factor" in margin.warnings[0]  # said, not silently dropped
    off = case_with(column="min_reflux_ratio_factor = 1")
    kept, margin = hold_margin(off, None, None, None, optimum, reflux_ratio=1.0, minimum_reflux=1.8)
    assert kept is optimum and not margin.binds and margin.warnings == ()


def test_sizing_table_reaches_a_priced_design(tmp_path, capsys):
    """The whole path: a case with a [sizing] table, priced as a given design, shows the choices in
    the equipment, result.json inputs and the workbook's Inputs sheet."""
    case = tmp_path / "case.toml"
    case.write_text(BASE + '\n[sizing]\ntray_type = "valve"\ntray_material = "SS"\ntray_spacing = "0.5 m"\n'
                    'tray_efficiency = 0.7\nshell_material = "A240 Type 304"\nmin_approach = "8 K"\n')
    out = tmp_path / "out"
    assert main(["design", str(case), "-o", str(out), "-q", "--no-figures", "--reflux", "2.2", "--stages", "26",
                 "--feed-stage", "13"]) == 0
    data = json.loads((out / "result.json").read_text())
    sizing = data["inputs"]["sizing"]
    assert (sizing["tray_type"], sizing["tray_material"], sizing["shell_material"]) == ("valve", "SS", "A240 Type 304")
    assert sizing["tray_spacing_m"] == 0.5 and sizing["tray_efficiency"] == 0.7
    assert sizing["flood_fraction"] == 0.8  # not set: the default
    assert sizing["min_approach_K"] == 8.0
    assert set(sizing["set_in_case"]) == {"tray_type", "tray_material", "tray_spacing", "tray_efficiency",
                                          "shell_material", "min_approach"}
    assert "least process-utility temperature approach 8 K" in capsys.readouterr().out
    assert data["design"]["real_trays"] == 36  # 25 trays at efficiency 0.7, rounded up
    items = {i["item"]: i for i in data["cost"]["items"]}
    assert items["trays"]["material"] == "SS" and items["column shell"]["material"] == "SS"
    book = load_workbook(out / "design.xlsx")
    values = {row[0]: row[1] for row in book["Inputs"].iter_rows(values_only=True) if row and row[0]}
    assert values["Tray spacing [m]"] == 0.5 and values["Tray type"] == "valve"
    assert values["Fraction of flooding velocity (default) [-]"] == 0.8
    assert values["Least process-utility temperature approach [K]"] == 8.0


def test_every_sizing_key_is_reported():
    """Each [sizing] key a case may set has its row in the reports (console, result.json, workbook):
    a key without one ended the run with an internal error after the optimisation."""
    from disteco.case import SIZING_KEYS
    from disteco.reports.choices import SIZING_SHOWN

    assert set(SIZING_KEYS) <= set(SIZING_SHOWN)
