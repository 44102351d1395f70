"""Fair flooding: the two published fits, the surface-tension correction, a worked example, the Pyomo twin."""

import itertools
import math

import pyomo.environ as pyo
import pytest
from fluids.separator import v_Souders_Brown

from disteco._base.errors import CorrelationRangeError
from disteco._base.operations import Operations
from disteco.sizing.flooding import (FLOODING_METHODS, INCH, capacity_factor_kessler_wankat,
                                     capacity_factor_lygeros_magoulas, downcomer_area_fraction, flooding_velocity,
                                     lygeros_magoulas_constants, required_tray_area, surface_tension_correction)
from disteco.sizing.trays import round_up, tray_hydraulics

CHART_SPACINGS = [6, 9, 12, 18, 24, 36]  # in, the curves of Fair's chart
CHART_FLV = [0.02, 0.05, 0.1, 0.2, 0.5, 1.0]


# ---------------------------------------------------------------- validation


def test_two_published_fits_agree_within_their_spread():
    """Lygeros and Magoulas (1986) against Kessler and Wankat (1988, as given in Wankat,
    Separation Process Engineering, 3rd ed., Ch. 10), two fits of Fair's chart.

    Measured spread over the chart for F_LV 0.02-1.0: -13 % to +10 %; the module docstring
    quotes these numbers, so the tolerance is 14 %.
    """
    for spacing, flv in itertools.product(CHART_SPACINGS, CHART_FLV):
        closed = capacity_factor_lygeros_magoulas(flv, spacing * INCH)
        per_curve = capacity_factor_kessler_wankat(flv, spacing * INCH)
        assert closed == pytest.approx(per_curve, rel=0.14), (spacing, flv)


def test_fits_at_lowest_flow_parameter_differ_by_at_most_15_percent():
    """Same two fits at F_LV = 0.01, where the per-curve quadratic turns over (15 % measured)."""
    for spacing in CHART_SPACINGS:
        ratio = capacity_factor_lygeros_magoulas(0.01, spacing * INCH) / capacity_factor_kessler_wankat(
            0.01, spacing * INCH)
        assert 0.98 < ratio < 1.16


def test_chart_readings_of_sieve_plate_worked_example():
    """Sinnott, Coulson and Richardson's Chemical Engineering Vol. 6, 4th ed. (2005),
    Example 11.11 (values from memory): plate spacing 0.5 m; read from Fig. 11.27
    K1 = 7.5e-2 m/s at F_LV = 0.14 (base) and 9.0e-2 m/s at F_LV = 0.05 (top).
    Chart-reading tolerance 10 %.
    """
    for method in FLOODING_METHODS.values():
        assert method(0.14, 0.5) == pytest.approx(7.5e-2, rel=0.10)
        assert method(0.05, 0.5) == pytest.approx(9.0e-2, rel=0.10)


def test_surface_tension_correction_of_worked_example():
    """Sinnott, Vol. 6, 4th ed., Example 11.11 (from memory): (57/20)^0.2 x 7.5e-2 = 9.3e-2 m/s
    and (23/20)^0.2 x 9.0e-2 = 9.3e-2 m/s; the source rounds to two figures (9.25 -> 9.3)."""
    assert surface_tension_correction(0.057) * 7.5e-2 == pytest.approx(9.3e-2, abs=0.06e-2)
    assert surface_tension_correction(0.023) * 9.0e-2 == pytest.approx(9.3e-2, abs=0.06e-2)


@pytest.mark.parametrize("method", sorted(FLOODING_METHODS))
def test_column_diameter_worked_example(method):
    """Sinnott, Vol. 6, 4th ed., Example 11.11 (from memory): 85 % of flood, downcomer 12 % of
    the cross-section, spacing 0.5 m. Base: rho_L 954, rho_V 0.72 kg/m^3, sigma 57 mN/m,
    F_LV 0.14, vapour 4.19 m^3/s -> D = 1.45 m. Top: rho_L 753, rho_V 2.05 kg/m^3,
    sigma 23 mN/m, F_LV 0.05, vapour 2.70 m^3/s -> D = 1.61 m. Tolerance 5 % (chart reading).
    """
    for rho_l, rho_v, sigma, flv, q, expected in ((954.0, 0.72, 0.057, 0.14, 4.19, 1.45),
                                                   (753.0, 2.05, 0.023, 0.05, 2.70, 1.61)):
        vapour = q * rho_v
        liquid = flv * vapour / math.sqrt(rho_v / rho_l)
        tray = tray_hydraulics(1, liquid, vapour, rho_l, rho_v, sigma, 0.5, 0.85, method, 1.0, 0.12)
        assert tray.flow_parameter == pytest.approx(flv)
        assert tray.diameter == pytest.approx(expected, rel=0.05)


def test_downcomer_rule_points():
    """Seader, Henley and Roper, Separation Process Principles, 3rd ed., Section 6.6 (from
    memory): 0.1 up to F_LV 0.1, 0.2 from F_LV 1.0, linear between."""
    # smooth corners (width 1e-4): within 1e-6 of the sharp rule away from them
    assert downcomer_area_fraction(0.05) == pytest.approx(0.1, abs=1e-6)
    assert downcomer_area_fraction(0.55) == pytest.approx(0.15)
    assert downcomer_area_fraction(2.0) == pytest.approx(0.2, abs=1e-6)


# ---------------------------------------------------------------- shape of the fits


def test_lygeros_magoulas_falls_with_flow_parameter_everywhere():
    """The closed form is monotone in F_LV (the chart's curves fall or level off)."""
    for spacing in CHART_SPACINGS:
        values = [capacity_factor_lygeros_magoulas(10 ** (k / 20 - 2), spacing * INCH) for k in range(41)]
        assert all(b < a for a, b in zip(values, values[1:]))


def test_kessler_wankat_turns_over_at_low_flow_parameter():
    """The per-curve quadratic rises with F_LV below about 0.02-0.04: the wrong-sign slope."""
    for spacing in CHART_SPACINGS:
        assert capacity_factor_kessler_wankat(0.01, spacing * INCH) < capacity_factor_kessler_wankat(
            0.03, spacing * INCH)


def test_kessler_wankat_is_continuous_across_charted_spacings():
    for spacing in CHART_SPACINGS[1:-1]:
        below = capacity_factor_kessler_wankat(0.1, spacing * INCH * (1 - 1e-9))
        above = capacity_factor_kessler_wankat(0.1, spacing * INCH * (1 + 1e-9))
        assert below == pytest.approx(above, rel=1e-6)


def test_registry_names_call_the_functions_named_after_them():
    for name, function in FLOODING_METHODS.items():
        assert function.__name__ == "capacity_factor_" + name.replace("-", "_")


def test_constants_at_24_inch_spacing():
    """Lygeros and Magoulas (1986): c1 = 8.127e-4 TS[mm]^0.755; at 609.6 mm, c1 = 0.1030 m/s."""
    c0, c1, c2, c3 = lygeros_magoulas_constants(0.6096)
    assert (c0, c2, c3) == (0.0105, 1.463, 0.842)
    assert c1 == pytest.approx(0.1030, abs=0.0001)


def test_spacing_outside_chart_raises():
    with pytest.raises(CorrelationRangeError, match="tray spacing"):
        capacity_factor_kessler_wankat(0.1, 40 * INCH)


# ---------------------------------------------------------------- Pyomo twin

DESIGN_POINTS = [  # vapour kg/s, liquid kg/s, rho_L, rho_V, sigma, spacing m, flood, downcomer
    (3.0, 2.4, 800.0, 2.8, 0.020, 0.6096, 0.80, 0.10),
    (12.0, 30.0, 650.0, 25.0, 0.008, 0.4572, 0.85, 0.15),
    (1.0, 1.5, 950.0, 0.6, 0.060, 0.3048, 0.75, 0.12),
]


PYOMO = Operations(pyo.exp, pyo.log, pyo.sqrt)


@pytest.mark.parametrize("method", sorted(FLOODING_METHODS))
@pytest.mark.parametrize("downcomer_rule", [False, True])
def test_one_area_function_for_floats_and_pyomo_at_design_points(method, downcomer_rule):
    """The area function over Pyomo's operations on Pyomo variables evaluates to the float one,
    for every flooding fit, with a given downcomer fraction and with the flow-parameter rule."""
    for point in DESIGN_POINTS:
        *head, downcomer = point
        downcomer = None if downcomer_rule else downcomer
        model = pyo.ConcreteModel()
        model.v = pyo.Var(initialize=point[0])
        model.l = pyo.Var(initialize=point[1])
        expression = required_tray_area(model.v, model.l, *head[2:], method=method, downcomer_fraction=downcomer,
                                        ops=PYOMO)
        assert pyo.value(expression) == pytest.approx(
            required_tray_area(*head, method=method, downcomer_fraction=downcomer), rel=1e-12)


@pytest.mark.parametrize("method", sorted(FLOODING_METHODS))
def test_area_function_equals_stage_calculation_at_design_points(method):
    """The area function and the tray calculation give one diameter for each fit (regression guard)."""
    for v, l, rho_l, rho_v, sigma, spacing, flood, downcomer in DESIGN_POINTS:
        tray = tray_hydraulics(1, l, v, rho_l, rho_v, sigma, spacing, flood, method, 1.0, downcomer)
        area = required_tray_area(v, l, rho_l, rho_v, sigma, spacing, flood, method, 1.0, downcomer)
        assert math.sqrt(4.0 * area / math.pi) == pytest.approx(tray.diameter, rel=1e-12)


def test_flooding_velocity_equals_the_souders_brown_function_of_fluids():
    """Souders-Brown velocity against ``fluids.separator.v_Souders_Brown`` (Bell, fluids library)."""
    for c, rho_l, rho_v in ((0.093, 954.0, 0.72), (0.05, 650.0, 25.0)):
        assert flooding_velocity(c, rho_l, rho_v) == pytest.approx(v_Souders_Brown(c, rho_l, rho_v), rel=1e-14)


def test_round_up_to_increment():
    assert round_up(1.2, 0.05) == 1.2
    assert round_up(1.2001, 0.05) == 1.25
    assert round_up(0.31, 0.15) == pytest.approx(0.45)
