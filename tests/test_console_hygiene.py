"""The console stays readable: a long title is shortened, numpy never prints a raw RuntimeWarning."""

import warnings

import pytest

from disteco import api
from disteco.case import Thermo
from disteco.cli import main
from disteco.properties import build_mixture
from disteco.reports.text import console_title, product_streams_lines
from disteco.reports.text_checks import fraction_text
from disteco.stages.binary import _operating_lines
from disteco.stages.rigorous import ColumnSpec, solve_cmo, solve_rigorous

from conftest import EXAMPLES
from test_stages_rigorous import P_ATM, assert_balances, feed_of


def test_a_long_title_is_shortened_on_the_console_only(tmp_path, capsys):
    title = "Column " + "x" * 1_000_000
    text = (EXAMPLES / "aromatics_binary.toml").read_text().replace("Kestrel Point benzene column", title)
    case = tmp_path / "case.toml"
    case.write_text(text)
    assert main(["check", str(case)]) == 0
    line = next(line for line in capsys.readouterr().out.splitlines() if line.startswith("Case: "))
    assert line == "Case: " + console_title(title)
    assert len(console_title(title)) == 100 and console_title(title).endswith("...")
    assert console_title("  two\n lines  ") == "two lines"
    assert api.load_case(case).title == title  # the files get it whole


def test_vertical_stripping_line_gives_no_numpy_warning():
    """A vapour feed at low reflux puts the q-line intersection at the bottoms: the stripping line
    is vertical and y_op(x_B) is taken from the rectifying line without a RuntimeWarning."""
    x_int, y_op = _operating_lines(0.985, 0.015, 0.42, 1e-12, 0.1)
    assert x_int == 0.015
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        assert float(y_op(0.015)) == pytest.approx((0.1 * 0.015 + 0.985) / 1.1)


@pytest.mark.parametrize("solve", [solve_cmo, solve_rigorous])
def test_a_component_without_feed_gives_no_numpy_warning(solve):
    """A component absent from the feed keeps zero flows through the damped Newton steps: no
    division warning, no NaN, and the balances close."""
    mixture = build_mixture(("n-pentane", "n-hexane", "n-heptane"), Thermo("ideal"), P_ATM)
    feed = feed_of(mixture, (0.5, 0.5, 0.0))
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        profile = solve(mixture, feed, ColumnSpec(14, 7, 1.9, 0.5, P_ATM, 500.0))
    assert profile.distillate_composition[2] == 0.0
    assert profile.bottoms_composition[2] < 1e-20
    assert profile.distillate_composition[0] > 0.98
    assert_balances(mixture, feed, profile)


def test_a_multicomponent_design_names_both_products_and_the_distributing_component():
    """Benzene / toluene / p-xylene split between benzene and p-xylene: toluene boils between the
    keys and splits; the console names its share of the feed to the distillate, which the
    component balances fix once the keys' splits are known, and a binary prints no such lines."""
    names = ("benzene", "toluene", "p-xylene")
    mixture = build_mixture(names, Thermo("ideal"), P_ATM)
    feed = feed_of(mixture, (0.3, 0.4, 0.3))
    profile = solve_rigorous(mixture, feed, ColumnSpec(24, 9, 0.9, 0.45, P_ATM, 500.0))
    lines = product_streams_lines(profile, feed, names, (0, 2))
    d, xd = profile.distillate_flow, profile.distillate_composition
    benzene_up, xylene_up = d * xd[0], d * xd[2]
    assert benzene_up > 0.98 * 0.3 and xylene_up < 0.02 * 0.3  # the keys split sharply
    toluene_share = (d - benzene_up - xylene_up) / 0.4  # the balance leaves toluene the rest of D
    assert 0.3 < toluene_share < 0.5
    assert lines[0].startswith(f"Products (mole fractions): distillate {d * 3.6:,.2f} kmol/h (benzene ")
    assert lines[1] == ("Non-key components that distribute, fraction of the feed to the distillate: "
                        f"toluene {toluene_share:.3f} [-]")
    # the keys are listed in both products however little of them is there (a ppm specification's
    # component), the other traces counted
    top, bottom = lines[0].split("bottoms")
    assert profile.bottoms_composition[0] < 1e-3  # benzene, a key, below the trace threshold: still listed
    assert f"benzene {fraction_text(profile.bottoms_composition[0], 4)}" in bottom
    assert f"p-xylene {fraction_text(profile.distillate_composition[2], 4)}" in top
    assert "more below" not in lines[0]
    assert product_streams_lines(profile, feed, names[:2], (0, 1)) == []
