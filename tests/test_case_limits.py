"""Case files that used to pass `check` or end in an internal error: each is refused with exit 2,
the field named and what is allowed, and no traceback."""

import math

import pytest

from disteco._base.errors import CaseError
from disteco._base.interaction import (LN_GAMMA_INF_RANGE, nrtl_ln_gamma_infinite, nrtl_outside,
                                       wilson_ln_gamma_infinite)
from disteco.cli import main

from conftest import EXAMPLES

BASE = (EXAMPLES / "aromatics_binary.toml").read_text()
IDEAL = 'method = "ideal"'


def method(name: str, table: str) -> tuple[str, str]:
    return IDEAL, f'method = "{name}"\n{table}'


NRTL = "[mixture.nrtl]\na = {a}\nb = [[0, 0], [0, 0]]\nalpha = [[0, 0.3], [0.3, 0]]"
WILSON = "[mixture.wilson]\na = {a}\nb = [[0, 0], [0, 0]]"
PR = "[mixture.peng_robinson]\nkij = {k}"
CASES = [
    # (edit of the benzene-toluene example, field named, fragment of the message)
    (("{ benzene = 0.42, toluene = 0.58 }", "100"), "feed.composition", "expected a list or a table, got 100"),
    (method("wilson", WILSON.format(a="[[0, 1e300], [1e300, 0]]")), "mixture.wilson", "infinitely diluted"),
    (method("peng-robinson", PR.format(k="[[0, 1e300], [1e300, 0]]")), "mixture.peng_robinson.kij", "-0.5 to 0.6"),
    (method("nrtl", NRTL.format(a="[[0, -50], [-50, 0]]")), "mixture.nrtl", "-5 to 30"),
    (method("nrtl", NRTL.format(a="[[0, nan], [1, 0]]")), "mixture.nrtl.a", "not a finite number"),
    (method("nrtl", NRTL.format(a="[[1, 1], [1, 0]]")), "mixture.nrtl.a", "diagonal"),
    (method("nrtl", NRTL.format(a="[[0, 1], [1, 0]]").replace("0.3]", "1.5]")), "mixture.nrtl.alpha", "0 to 1"),
    (method("peng-robinson", PR.format(k="[[0, 0.1], [0.2, 0]]")), "mixture.peng_robinson.kij", "symmetric"),
    ((IDEAL, IDEAL + "\n" + WILSON.format(a="[[0, 1], [1, 0]]")), "mixture.wilson", "mixture.method is 'ideal'"),
    (("q = 1.0", 'temperature = "-273.14 degC"'), "feed.temperature", "50 to 1000 K"),
    (("q = 1.0", 'temperature = "1e999 K"'), "feed.temperature", "not a finite number"),
    (("q = 1.0", 'temperature = "5000 K"'), "feed.temperature", "50 to 1000 K"),
    (("q = 1.0", 'temperature = "1 K"'), "feed.temperature", "50 to 1000 K"),
    (("q = 1.0", "q = nan"), "feed.q", "not a finite number"),
    (("q = 1.0", "q = inf"), "feed.q", "not a finite number"),
    (("180 kmol/h", "1e999 kmol/h"), "feed.flow", "not a finite number"),
    (("180 kmol/h", "1e-320 kmol/h"), "feed.flow", "0.001 to 100000 mol/s"),
    (("180 kmol/h", "1e9 t/h"), "feed.flow", "0.0001 to 10000 kg/s"),
    (("1.15 bar", "1e999 bar"), "column.top_pressure", "not a finite number"),
    (("cost_year = 2023", 'cost_year = 2023\ncost_data = "\\u0000"'), "economics.cost_data", "control character"),
    (("cost_year = 2023", 'cost_year = 2023\ncost_data = "."'), "economics.cost_data", "annualisation.toml"),
    (("cost_year = 2023", 'cost_year = 2023\ncost_data = "no-such-folder"'), "economics.cost_data",
     "is not a folder"),
    (("cost_year = 2023", 'cost_year = 2023\ncurrency = ""'), "economics.currency", "empty"),
    (('["reference"]', '["no-such-scenario"]'), "scenario", "no-such-scenario"),
    (("cost_year = 2023", "cost_year = 1951"), "economics.cost_year", "not in the cost-index table"),
    (("title = \"", "title = \"a\\u0007"), "title", "control character"),
    (("bottoms_light_key_fraction = 0.015", "bottoms_light_key_fraction = 0.015\nheavy_key_recovery = -0.01"),
     "products.heavy_key_recovery", "not used with distillate_light_key_fraction"),
    (("bottoms_light_key_fraction = 0.015", "bottoms_light_key_fraction = 0.015\nlight_key_in_bottoms = 0.01"),
     "products.light_key_in_bottoms", "not used with distillate_light_key_fraction"),
    (("bottoms_light_key_fraction = 0.015", "bottoms_light_key_fraction = 0.015\nheavy_key = \"benzene\""),
     "products.heavy_key", "same component as the light key"),
    (("q = 1.0", "q = 1.0\n\"\" = 3"), "feed.''", "unknown field"),
    (("title =", "\"\" = 1\ntitle ="), "''", "unknown field"),
    (("[column]", "[column]\n\"odd key\" = 1"), "column.'odd key'", "unknown field"),
]


@pytest.mark.parametrize("edit, field, fragment", CASES, ids=[f"{c[1]}-{i}" for i, c in enumerate(CASES)])
def test_refused_by_check_with_the_field_named(tmp_path, capsys, edit, field, fragment):
    text = BASE.replace(*edit)
    assert text != BASE
    case = tmp_path / "case.toml"
    case.write_text(text)
    code = main(["check", str(case)])
    err = capsys.readouterr().err
    assert code == 2, err
    assert err.startswith("error: ") and field in err.splitlines()[0]
    assert fragment in err
    assert "Traceback" not in err and "error: :" not in err


def test_depentaniser_with_a_binary_fraction_is_refused(tmp_path, capsys):
    text = (EXAMPLES / "depentaniser.toml").read_text().replace(
        "heavy_key_recovery = 0.98", "heavy_key_recovery = 0.98\ndistillate_light_key_fraction = 0.9")
    case = tmp_path / "case.toml"
    case.write_text(text)
    assert main(["check", str(case)]) == 2
    assert "products.distillate_light_key_fraction: binary specification given for 5" in capsys.readouterr().err


def test_nrtl_infinite_dilution_matches_thermo():
    """ln gamma_inf of the NRTL limit against thermo's NRTL (reference library) at x_i = 1e-10,
    for an asymmetric pair with temperature-dependent tau."""
    from thermo import NRTL

    a, b, alpha = [[0.0, 1.2], [-0.4, 0.0]], [[0.0, 150.0], [80.0, 0.0]], [[0.0, 0.35], [0.35, 0.0]]
    T = 340.0
    model = NRTL(T=T, xs=[1e-10, 1.0 - 1e-10], tau_as=a, tau_bs=b, alpha_cs=alpha)
    tau = [[a[i][j] + b[i][j] / T for j in range(2)] for i in range(2)]
    assert nrtl_ln_gamma_infinite(tau[0][1], tau[1][0], alpha[0][1]) == pytest.approx(
        math.log(model.gammas()[0]), rel=1e-7)


def test_wilson_infinite_dilution_matches_thermo():
    """ln gamma_inf of the Wilson limit against thermo's Wilson (reference library) at x_i = 1e-10."""
    from thermo import Wilson

    a, b = [[0.0, -0.3], [0.5, 0.0]], [[0.0, -120.0], [60.0, 0.0]]
    T = 360.0
    model = Wilson(T=T, xs=[1e-10, 1.0 - 1e-10], lambda_as=a, lambda_bs=b)
    ln_lambda = [[a[i][j] + b[i][j] / T for j in range(2)] for i in range(2)]
    assert wilson_ln_gamma_infinite(ln_lambda[0][1], ln_lambda[1][0]) == pytest.approx(
        math.log(model.gammas()[0]), rel=1e-7)


def test_nrtl_limits_scan_every_temperature_and_pair():
    """tau = a + b/T can be harmless at 600 K and out of range at 200 K: the scan finds it."""
    a, alpha = [[0.0, 0.0], [0.0, 0.0]], [[0.0, 0.3], [0.3, 0.0]]
    b = [[0.0, 0.0], [-1500.0, 0.0]]  # tau_21 = -2.5 at 600 K, -7.5 at 200 K
    value, i, j, T = nrtl_outside(a, b, alpha)
    assert (i, j, T) == (0, 1, 200.0)
    assert value == pytest.approx(-7.5)
    assert value < LN_GAMMA_INF_RANGE[0]
    assert nrtl_outside(a, [[0.0, 0.0], [-300.0, 0.0]], alpha) is None


def test_parse_case_names_the_field_of_a_parameter_out_of_range():
    import tomllib

    from disteco.case import parse_case

    text = BASE.replace(*method("wilson", WILSON.format(a="[[0, 3], [3, 0]]")))
    with pytest.raises(CaseError, match=r"mixture.wilson: these parameters give ln\(gamma\) = -2[0-9.]+ for benzene"):
        parse_case(tomllib.loads(text))


def test_ordinary_interaction_parameters_pass_check(tmp_path, capsys):
    """Parameters of the size published fits have (an invented NRTL set for ethanol-water with
    tau from about -0.3 to 3.4 over 200-600 K, and a Wilson set with Lambda from 0.13 to 1.3)
    pass the limits and check; the limits refuse only what breaks the calculation."""
    ethanol_water = (EXAMPLES / "ethanol_water.toml").read_text()
    tables = {
        "nrtl": "[mixture.nrtl]\na = [[0, 0.0], [0, 0]]\nb = [[0, -55.0], [670.0, 0]]\nalpha = [[0, 0.3], [0.3, 0]]",
        "wilson": "[mixture.wilson]\na = [[0, -1.5], [0, 0]]\nb = [[0, -100.0], [50.0, 0]]",
    }
    for name, table in tables.items():
        case = tmp_path / f"{name}.toml"
        case.write_text(ethanol_water.replace('method = "unifac-dortmund"', f'method = "{name}"\n{table}'))
        assert main(["check", str(case)]) == 0, capsys.readouterr().err
        assert f"Thermodynamic method: {name}" in capsys.readouterr().out
