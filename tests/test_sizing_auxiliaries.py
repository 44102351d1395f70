"""Reflux drum and reflux pump."""

import pytest
from fluids.pump import Corripio_pump_efficiency

from disteco.sizing.auxiliaries import CORRIPIO_RANGE, drum_volume, pump_shaft_power, size_drum, size_pump

GPM = 3.785411784e-3 / 60.0  # m^3/s per US gal/min


def test_drum_volume_and_shape():
    """Volume balance: 0.01 m^3/s for 5 min at half full is 6 m^3; L/D = 3 gives D = (4V/(3 pi))^(1/3)."""
    assert drum_volume(0.01, 300.0, 0.5) == pytest.approx(6.0)
    drum = size_drum(0.01, 300.0, 0.5, 3.0, 2e5, 350.0)
    assert drum.diameter == pytest.approx((4 * 6.0 / (3 * 3.141592653589793)) ** (1 / 3))
    assert drum.length == pytest.approx(3 * drum.diameter)


def test_pump_power_by_hand():
    """By hand: rho g Q H / eta = 800 x 9.80665 x 0.01 x 40 / 0.6 = 5230 W."""
    assert pump_shaft_power(0.01, 800.0, 40.0, 0.6) == pytest.approx(5230.2, abs=0.1)


def test_corripio_efficiency_of_textbook_example():
    """Seider, Seader and Lewin, Product and Process Design Principles, 2nd ed., Example 16.5 as
    given in fluids: 461 gal/min -> efficiency 0.706."""
    pump = size_pump(461.0 * GPM, 800.0, 40.0, None, 2e5, 350.0)
    assert pump.efficiency == pytest.approx(0.706, abs=0.001)
    assert pump.warnings == ()


def test_small_flow_uses_range_end_with_one_warning():
    pump = size_pump(10.0 * GPM, 800.0, 40.0, None, 2e5, 350.0)
    assert pump.efficiency == pytest.approx(Corripio_pump_efficiency(CORRIPIO_RANGE.low))
    (warning,) = pump.warnings
    assert warning.startswith("extrapolated: ") and f"taken at {CORRIPIO_RANGE.low:.4g} m^3/s, the nearer end" in warning


def test_user_efficiency_and_discharge_design_pressure():
    pump = size_pump(0.01, 800.0, 40.0, 0.5, 2e5, 350.0)
    assert pump.efficiency == 0.5 and pump.efficiency_method == "user value"
    assert pump.design_pressure == pytest.approx(2e5 + 800.0 * 9.80665 * 40.0)
