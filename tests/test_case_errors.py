"""Bad case files: each error names the field, says what is wrong, and exits with code 2."""

import pytest

from disteco._base.errors import CaseError
from disteco._base.units import parse_quantity
from disteco.case import load_case
from disteco.cli import main

from conftest import EXAMPLES

BASE = (EXAMPLES / "aromatics_binary.toml").read_text()


def run_cli(tmp_path, text, capsys, command="check"):
    case = tmp_path / "case.toml"
    case.write_text(text)
    code = main([command, str(case)] + (["-o", str(tmp_path / "out")] if command == "design" else []))
    return code, capsys.readouterr().err


@pytest.mark.parametrize("edit, field, fragment", [
    (("toluene\"]", "tolunee\"]"), "feed.composition", "not in mixture.components"),
    (("0.58 }", "0.68 }"), "feed.composition", "sum to 1.1"),
    (('"toluene"]', '"toluene", "Benzene"]'), "mixture.components", "'benzene' listed twice"),
    (("180 kmol/h", "-180 kmol/h"), "feed.flow", "not positive"),
    (("flow = \"180 kmol/h\"\n", ""), "flow", "missing field"),
    (("method = \"ideal\"", "method = \"magic\""), "mixture.method", "unknown method 'magic'"),
    (("1.15 bar", "900 bar"), "column.top_pressure", "900 bar absolute"),
    (("1.15 bar", "0.001 bar"), "column.top_pressure", "allowed: 0.01 to 50 bar"),
    (("1.15 bar", "1.15 furlongs"), "column.top_pressure", "unknown pressure unit"),
    (('"180 kmol/h"', '"100"'), "feed.flow", "a unit is missing in '100' (allowed: the number followed by a flow "
                                             "unit, e.g. \"120 kmol/h\"; units: mol/s, kmol/s"),
    (('"180 kmol/h"', "100"), "feed.flow", "a unit is missing: 100 is a bare number"),
    (('"1.15 bar"', '"1.15"'), "column.top_pressure", "a unit is missing in '1.15'"),
    (("q = 1.0", "q = 1.0\ntemperature = \"90 degC\""), "feed", "2 thermal conditions"),
    (("q = 1.0  ", "# "), "feed", "no thermal condition given (allowed: exactly one of temperature"),
    (("0.985", "1.5"), "products.distillate_light_key_fraction", "not a fraction"),
    (("cost_year = 2023", 'cost_year = "2023"'), "economics.cost_year",
     "expected a whole number, got '2023' (allowed: the number without quotes, e.g. 2023)"),
    (('scenarios = ["reference"]', 'scenarios = "reference"'), "economics.scenarios",
     'expected a list, got \'reference\' (allowed: a list in brackets, e.g. ["reference"])'),
    (("q = 1.0", 'q = "one"'), "feed.q", "expected a number, got 'one'"),
    (("[products]", '[products]\nfraction_basis = "volume"'), "products.fraction_basis",
     "'volume' (allowed: mole or mass)"),
    (("q = 1.0", 'q = 1.0\ncomposition_basis = "weight"'), "feed.composition_basis", "'weight' (allowed: mole or mass)"),
    (("0.58 }", '0.68 }\ncomposition_basis = "mass"'), "feed.composition", "mass fractions sum to 1.1"),
    (('"auto"', '"9 kPa"'), "column.pressure_drop_per_tray", "0 to 5 kPa per real tray"),
    (('pressure_drop_per_tray = "auto"', 'pressure_drop_per_tray = "auto"\npressure_drop_per_stage = "1 kPa"'),
     "column.pressure_drop_per_stage", "given together with pressure_drop_per_tray"),
])
def test_bad_field_named_with_exit_code_2(tmp_path, capsys, edit, field, fragment):
    """Every user mistake is named by its field and exits with code 2 without a traceback."""
    text = BASE.replace(*edit)
    assert text != BASE
    code, err = run_cli(tmp_path, text, capsys)
    assert code == 2
    assert f"{field}" in err and fragment in err
    assert "Traceback" not in err


def test_misspelled_component_lists_close_matches(tmp_path, capsys):
    """An unknown component name is reported with close matches from the databank."""
    text = BASE.replace('["benzene", "toluene"]', '["benzene", "tolunee"]').replace(
        "{ benzene = 0.42, toluene = 0.58 }", "[0.42, 0.58]")
    code, err = run_cli(tmp_path, text, capsys)
    assert code == 2
    assert "mixture.components[1]: unknown component 'tolunee'" in err
    assert "toluene" in err.split("close matches")[1]


def test_design_with_bad_input_writes_no_file(tmp_path, capsys):
    """A failed run leaves no result file behind."""
    code, _ = run_cli(tmp_path, BASE.replace('["benzene", "toluene"]', '["benzene", "tolunee"]').replace(
        "{ benzene = 0.42, toluene = 0.58 }", "[0.42, 0.58]"), capsys, command="design")
    assert code == 2
    assert not (tmp_path / "out" / "result.json").exists()


def test_byte_order_mark_and_crlf_read(tmp_path):
    """A case saved by a Windows editor (UTF-8 with a byte-order mark, CRLF line ends) reads as the same case."""
    path = tmp_path / "case.toml"
    path.write_bytes(b"\xef\xbb\xbf" + BASE.replace("\n", "\r\n").encode("utf-8"))
    assert load_case(path).feed.flow == pytest.approx(load_case(_plain(tmp_path)).feed.flow)
    assert load_case(path).components == ("benzene", "toluene")


def _plain(tmp_path):
    path = tmp_path / "plain.toml"
    path.write_text(BASE, encoding="utf-8")
    return path


def test_not_toml(tmp_path):
    path = tmp_path / "case.toml"
    path.write_text("title = \n")
    with pytest.raises(CaseError, match="not valid TOML"):
        load_case(path)


@pytest.mark.parametrize("text, kind, expected", [
    ("120 kmol/h", "flow", 120e3 / 3600),
    ("12 t/h", "flow", 12e3 / 3600),
    ("1.2 bar", "pressure", 1.2e5),
    ("1.2 bara", "pressure", 1.2e5),
    ("2 barg", "pressure", 2e5 + 101325.0),
    ("14.696 psia", "pressure", 101325.0),
    ("85 degC", "temperature", 358.15),
    ("212 degF", "temperature", 373.15),
    ("212 F", "temperature", 373.15),
    ("18 F", "temperature difference", 10.0),
    ("0.7 kPa", "pressure difference", 700.0),
    # "hr" and "day" as engineers write them
    ("200 kmol/hr", "flow", 200e3 / 3600),
    ("25000 lb/hr", "flow", 25000 * 0.45359237 / 3600),
    ("240 t/day", "flow", 240e3 / 86400),
    ("5 min", "time", 300.0),
    ("0.5 hr", "time", 1800.0),
])
def test_units_to_si(text, kind, expected):
    """Unit conversions against the defining values (1 psi = 6894.757 Pa, NIST SP 811 appendix B)."""
    value, _ = parse_quantity(text, kind, "field")
    assert value == pytest.approx(expected, rel=1e-5)


def test_pressure_drop_per_tray_auto_value_and_deprecated_name():
    """``auto`` (or absent) leaves the per-tray drop to the hydraulics; a figure is per real tray;
    the old per-stage name is read as the per-tray figure with a deprecation warning."""
    from disteco.case import PRELIMINARY_TRAY_DROP, parse_case
    import tomllib

    data = tomllib.loads(BASE)
    assert parse_case(data).column.pressure_drop_per_tray is None
    del data["column"]["pressure_drop_per_tray"]
    assert parse_case(data).column.pressure_drop_per_tray is None
    data["column"]["pressure_drop_per_tray"] = "0.9 kPa"
    column = parse_case(data).column
    assert column.pressure_drop_per_tray == pytest.approx(900.0) and column.warnings == ()
    assert column.stage_pressure_drop(0.5) == pytest.approx(1800.0)  # per tray over the efficiency
    del data["column"]["pressure_drop_per_tray"]
    data["column"]["pressure_drop_per_stage"] = "0.9 kPa"
    old = parse_case(data).column
    assert old.pressure_drop_per_tray == pytest.approx(900.0)
    assert "deprecated" in old.warnings[0] and "pressure_drop_per_tray" in old.warnings[0]
    data["column"]["pressure_drop_per_stage"] = "auto"
    auto = parse_case(data).column
    assert auto.stage_pressure_drop(0.5) == pytest.approx(PRELIMINARY_TRAY_DROP / 0.5)
    assert auto.stage_pressure_drop(0.5, tray_drop=650.0) == pytest.approx(1300.0)


def test_check_shows_a_mass_basis_feed_beside_its_mole_fractions(tmp_path, capsys):
    """The benzene example's feed written as 38 % benzene by mass: `check` shows w as written and z, the
    mole fractions used. By hand with 78.11 and 92.14 g/mol (from memory: CRC Handbook of Chemistry and
    Physics): z = (0.38/78.11) / (0.38/78.11 + 0.62/92.14) = 0.4196."""
    text = BASE.replace("{ benzene = 0.42, toluene = 0.58 }", '{ benzene = 0.38, toluene = 0.62 }\n'
                        'composition_basis = "mass"')
    case = tmp_path / "case.toml"
    case.write_text(text)
    assert main(["check", str(case)]) == 0
    out = capsys.readouterr().out
    (benzene,) = [line.split() for line in out.splitlines() if line.startswith("benzene ")]
    assert float(benzene[-2]) == pytest.approx(0.4196, abs=2e-4) and benzene[-1] == "0.3800"
    assert "Feed written as mass fractions w" in out and "w feed [-]" in out


def test_result_json_gives_a_mass_basis_feed_as_written():
    from disteco.case import Feed, FeedFlow, ThermalCondition
    from disteco.properties import FeedState
    from disteco.reports.json_result import feed_json

    state = FeedState(0.05, (0.4196, 0.5804), 115e3, 1.0, -30e3, 370.0, 375.0, 370.0)
    written = Feed(FeedFlow("mass", 1.0), (0.38, 0.62), ThermalCondition("q", 1.0), None, "mass")
    assert feed_json(state, written)["mass_fractions_as_written"] == [0.38, 0.62]
    assert "mass_fractions_as_written" not in feed_json(state, Feed(FeedFlow("molar", 0.05), (0.4196, 0.5804),
                                                                     ThermalCondition("q", 1.0), None))


def test_product_fractions_by_mass_are_used_as_mole_fractions(tmp_path, capsys):
    """The benzene example's specifications written by mass (0.985 benzene in the distillate, 0.015 in the
    bottoms) are the mole fractions 0.98725 and 0.017646 by hand with 78.11 and 92.14 g/mol (from memory:
    CRC Handbook of Chemistry and Physics); `check` of the mass case finds the minimum reflux of the case
    written with those mole fractions (the same conversion everywhere), and says what it used."""
    from dataclasses import replace

    from disteco import api
    from disteco.case import EndSpec

    mass = tmp_path / "mass.toml"
    mass.write_text(BASE.replace("[products]", '[products]\nfraction_basis = "mass"'))
    case = api.load_case(mass)
    converted = api.on_mole_basis(case).products
    assert 1.0 - converted.heavy_key_spec.value == pytest.approx(0.98725, abs=2e-5)
    assert converted.light_key_spec.value == pytest.approx(0.017646, abs=2e-5)
    assert converted.written == (case.products.light_key_spec, case.products.heavy_key_spec)
    mole = replace(case, products=replace(case.products, fraction_basis="mole",
                                          light_key_spec=EndSpec("fraction", converted.light_key_spec.value),
                                          heavy_key_spec=EndSpec("fraction", converted.heavy_key_spec.value)))
    assert api.check(case).stages.minimum_reflux == pytest.approx(api.check(mole).stages.minimum_reflux, rel=1e-12)
    assert main(["check", str(mass)]) == 0
    out = capsys.readouterr().out
    assert ("Product specifications written by mass, used as mole fractions: benzene in the bottoms 0.015 -> 0.0176"
            in out) and "benzene in the distillate 0.985 -> 0.987" in out


def test_a_given_design_reaches_mass_specifications_shown_as_written(tmp_path, capsys):
    """Priced as a given design, the products reached stand beside the mole fraction used and the mass
    fraction as written, and the workbook's Inputs give both."""
    from openpyxl import load_workbook

    mass = tmp_path / "mass.toml"
    mass.write_text(BASE.replace("[products]", '[products]\nfraction_basis = "mass"'))
    assert main(["design", str(mass), "-o", str(tmp_path / "out"), "-q", "--no-figures", "--no-compare",
                 "--reflux", "2.2", "--stages", "24", "--feed-stage", "12"]) == 0
    out = capsys.readouterr().out
    assert "(specification at most 0.01765; 0.015 by mass as written)" in out
    assert "(specification at least 0.9873; 0.985 by mass as written)" in out
    inputs = {r[0]: r[1] for r in load_workbook(tmp_path / "out" / "design.xlsx")["Inputs"].iter_rows(values_only=True)}
    assert inputs["Light-key specification"] == ("benzene: mole fraction 0.017646 in the bottoms [-] (mass fraction "
                                                  "0.015 as written)")


def test_product_fractions_by_mass_need_two_components(tmp_path, capsys):
    text = (EXAMPLES / "depentaniser.toml").read_text().replace("[products]", '[products]\nfraction_basis = "mass"')
    code, err = run_cli(tmp_path, text, capsys)
    assert code == 2
    assert "products.fraction_basis: 'mass' with" in err and "give recoveries (the same on either basis)" in err


def test_mass_fractions_never_reach_the_layers_unconverted(tmp_path):
    """A case with product fractions by mass, handed to the stages layer or the optimisation without
    api.on_mole_basis, is stopped there instead of being read as mole fractions."""
    from disteco import api
    from disteco.optimisation.options import model_options
    from disteco.optimisation.problem import resolved_problem
    from disteco.properties import feed_state
    from disteco.stages.splits import check_end_specs

    mass = tmp_path / "mass.toml"
    mass.write_text(BASE.replace("[products]", '[products]\nfraction_basis = "mass"'))
    case = api.load_case(mass)
    with pytest.raises(ValueError, match="api.on_mole_basis"):
        check_end_specs(case.products, case.feed.composition)
    mixture = api.mixture_of(case)
    with pytest.raises(ValueError, match="api.on_mole_basis"):
        resolved_problem(case, mixture, feed_state(case.feed, mixture, case.column.top_pressure), model_options(None))
