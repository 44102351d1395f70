"""McCabe-Thiele stepping on tabulated and on real equilibrium curves."""

import math

import numpy as np
import pytest

from disteco._base.errors import InfeasibleSpecError
from disteco.stages.binary import (EquilibriumCurve, equilibrium_curve, minimum_reflux, step_stages,
                                   total_reflux_stages)

# Benzene-toluene at 101.3 kPa, mole fraction of benzene (Geankoplis, Transport Processes and
# Separation Process Principles, 4th ed., 2003, Table 11.1-1; values from memory).
GEANKOPLIS_X = (0.0, 0.130, 0.258, 0.411, 0.581, 0.780, 1.0)
GEANKOPLIS_Y = (0.0, 0.261, 0.456, 0.632, 0.777, 0.900, 1.0)


@pytest.fixture(scope="module")
def table_curve():
    return EquilibriumCurve(GEANKOPLIS_X, GEANKOPLIS_Y, 101325.0)


def constant_alpha_curve(alpha, points=2001):
    x = np.linspace(0.0, 1.0, points)
    return EquilibriumCurve(tuple(x), tuple(alpha * x / (1.0 + (alpha - 1.0) * x)), 101325.0)


def test_geankoplis_example_stepping(table_curve):
    """Geankoplis, 4th ed., Example 11.4-1 (from memory): x_F = 0.45 fed at q = 1.195, x_D = 0.95,
    x_W = 0.10, R = 4: 7.6 theoretical steps read off the graph, feed on the 5th tray from the top.
    Tolerance 0.3 step for the graphical reading and the 7-point table."""
    column = step_stages(table_curve, 0.95, 0.10, 0.45, 1.195, 4.0)
    assert column.stages == pytest.approx(7.6, abs=0.3)
    assert column.feed_stage == 5
    assert column.steps[0] == (0.95, 0.95)


def test_geankoplis_example_minimum_reflux(table_curve):
    """Geankoplis, 4th ed., Example 11.4-2 (from memory): Rm = 1.17 for the feed of Example
    11.4-1, read from the graph; tolerance 5 %."""
    r_min = minimum_reflux(table_curve, 0.95, 0.10, 0.45, 1.195)
    assert r_min.reflux_ratio == pytest.approx(1.17, rel=0.05)
    assert r_min.kind == "feed pinch"


def test_real_benzene_toluene_curve_matches_example(benzene_toluene):
    """The ideal-solution curve from thermo reproduces Geankoplis Example 11.4-1 within half a stage."""
    curve = equilibrium_curve(benzene_toluene, 101325.0)
    column = step_stages(curve, 0.95, 0.10, 0.45, 1.195, 4.0)
    assert column.stages == pytest.approx(7.6, abs=0.5)
    assert column.feed_stage in (4, 5)


def test_constant_alpha_minimum_reflux_equals_underwood():
    """For constant alpha and a saturated-liquid feed the feed pinch gives the closed form
    Rmin = [x_D/z - alpha (1 - x_D)/(1 - z)]/(alpha - 1) (King, Separation Processes,
    2nd ed., 1980, section 9.4)."""
    alpha, z, x_d = 2.5, 0.45, 0.95
    r_min = minimum_reflux(constant_alpha_curve(alpha), x_d, 0.05, z, 1.0)
    closed = (x_d / z - alpha * (1.0 - x_d) / (1.0 - z)) / (alpha - 1.0)
    assert r_min.reflux_ratio == pytest.approx(closed, rel=1e-4)


@pytest.mark.parametrize("q", [1.3, 0.5, 0.0, -0.2, -0.5])
def test_constant_alpha_minimum_reflux_at_any_feed_condition_equals_underwood(q):
    """Underwood's equations for a binary at constant alpha with the feed pinch, any q:
    1 - q = alpha z/(alpha - theta) + (1 - z)/(1 - theta) for theta between 1 and alpha, then
    Rmin + 1 = alpha x_D/(alpha - theta) + (1 - x_D)/(1 - theta) (Underwood, Chem. Eng. Prog. 44
    (1948) 603; King, Separation Processes, 2nd ed., 1980, section 9.4). A superheated vapour feed
    (q < 0) had been said to need no reflux."""
    from scipy.optimize import brentq

    alpha, z, x_d, x_b = 2.45, 0.4, 0.99, 0.01
    theta = brentq(lambda t: alpha * z / (alpha - t) + (1.0 - z) / (1.0 - t) - (1.0 - q), 1.0 + 1e-9, alpha - 1e-9)
    underwood = alpha * x_d / (alpha - theta) + (1.0 - x_d) / (1.0 - theta) - 1.0
    found = minimum_reflux(constant_alpha_curve(alpha), x_d, x_b, z, q)
    assert found.kind == "feed pinch"
    assert found.reflux_ratio == pytest.approx(underwood, rel=1e-4)


def test_constant_alpha_total_reflux_equals_fenske():
    """At total reflux with constant alpha, stepping gives Fenske's Nmin (Fenske 1932). The
    bottoms is chosen so that Fenske gives exactly 8 stages and no fractional stage is needed."""
    alpha, x_d = 2.5, 0.98
    ratio = x_d / (1.0 - x_d) / alpha ** 8
    x_b = ratio / (1.0 + ratio)
    fenske = math.log(x_d / (1 - x_d) * (1 - x_b) / x_b) / math.log(alpha)
    assert fenske == pytest.approx(8.0, rel=1e-12)
    assert total_reflux_stages(constant_alpha_curve(alpha), x_d, x_b).stages == pytest.approx(8.0, abs=1e-3)


def test_tangent_pinch_ethanol_water(ethanol_water):
    """Ethanol-water (UNIFAC Dortmund) pinches on a tangent in the rectifying section, above
    the feed-line intersection; the minimum from the curve exceeds the feed-pinch value."""
    curve = equilibrium_curve(ethanol_water, 101325.0)
    x_d, x_b, z = 0.80, 0.01, 0.20
    r_min = minimum_reflux(curve, x_d, x_b, z, 1.0)
    y_feed = float(curve.y_of(z))
    feed_pinch = (x_d - y_feed) / (y_feed - z)
    assert r_min.kind == "tangent pinch"
    assert r_min.pinch_x > z + 0.1
    assert r_min.reflux_ratio > 1.2 * feed_pinch
    column = step_stages(curve, x_d, x_b, z, 1.0, 1.3 * r_min.reflux_ratio)
    assert 5 < column.stages < 60
    with pytest.raises(InfeasibleSpecError, match=f"minimum reflux {r_min.reflux_ratio:.4g}"):
        step_stages(curve, x_d, x_b, z, 1.0, 0.99 * r_min.reflux_ratio)


def test_reflux_at_minimum_raises(table_curve):
    r_min = minimum_reflux(table_curve, 0.95, 0.10, 0.45, 1.0).reflux_ratio
    with pytest.raises(InfeasibleSpecError, match="at or below the minimum reflux"):
        step_stages(table_curve, 0.95, 0.10, 0.45, 1.0, r_min)


def test_azeotrope_between_products_raises(ethanol_water):
    """A distillate beyond the ethanol-water azeotrope (x ~ 0.89 at 1 atm) cannot be reached."""
    curve = equilibrium_curve(ethanol_water, 101325.0)
    with pytest.raises(InfeasibleSpecError, match="azeotrope"):
        total_reflux_stages(curve, 0.95, 0.01)


def test_liquid_liquid_split_is_refused_with_its_range():
    """Water/1-butanol (UNIFAC, 1 atm) splits into two liquids: the refusal names the water fractions
    where the one-liquid curve turns back, which lie inside the two-liquid region (about 0.5 to 0.98
    water at the heterogeneous azeotrope's 93 degC, from memory: the butanol-rich layer near 20 % water
    by mass, the water-rich one near 7 % butanol)."""
    import re

    from disteco.case import Thermo
    from disteco.properties import build_mixture

    curve = equilibrium_curve(build_mixture(("water", "1-butanol"), Thermo("unifac-dortmund"), 101325.0),
                              101325.0)
    with pytest.raises(InfeasibleSpecError, match="heterogeneous azeotrope") as refused:
        total_reflux_stages(curve, 0.7, 0.005)
    low, high = map(float, re.search(r"fractions of about ([\d.]+) and ([\d.]+)", str(refused.value)).groups())
    assert 0.45 < low < high < 0.99


def test_partial_condenser_counts_one_stage_less(table_curve):
    total = step_stages(table_curve, 0.95, 0.10, 0.45, 1.0, 3.0)
    partial = step_stages(table_curve, 0.95, 0.10, 0.45, 1.0, 3.0, partial_condenser=True)
    assert partial.stages == pytest.approx(total.stages - 1.0, abs=1e-12)
