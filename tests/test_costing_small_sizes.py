"""Purchased cost of equipment beyond a cost curve's range (costing.curves.held_to_tangents).

The bundled curves are Turton et al., Analysis, Synthesis and Design of Chemical Processes, 4th ed.,
Table A.1 (from memory, as cost_data/purchased_cost_correlations.csv says): log10 C = K1 + K2 u + K3 u^2.
With K3 > 0 the quadratic rises again below its lowest point, so that a pilot column's 0.05 m2
condenser cost six times a 10 m2 one and the optimiser drove the reflux to its bound to buy larger,
cheaper exchangers. Below the range (or the curve's lowest point) the cost follows the tangent: never
dearer for a smaller unit (common practice, no source), unchanged where the published curve rises. Above
the range (rows that are not split into parallel units: vessels, trays) the tangent too, a power law
instead of the quadratic's ever steeper rise.
"""

import numpy as np
import pytest

from disteco._base.validity import OutOfRange
from disteco.costing.curves import turton_purchased_cost
from disteco.costing.data import load_cost_data

CURVES = load_cost_data().curves


@pytest.mark.parametrize("curve", CURVES, ids=[c.item for c in CURVES])
def test_a_smaller_unit_never_costs_more(curve):
    sizes = np.geomspace(curve.size_min / 1e3, curve.size_max, 400) * curve.si_per_unit
    costs = np.array([curve.purchased_cost(size, OutOfRange.WARN, []) for size in sizes])
    assert np.all(np.diff(costs) >= -1e-9 * costs[1:])


@pytest.mark.parametrize("curve", CURVES, ids=[c.item for c in CURVES])
def test_the_published_curve_where_it_rises_with_size(curve):
    sizes = np.geomspace(curve.held_below * 1.01, curve.size_max / 1.01, 50)
    for size in sizes:
        published = turton_purchased_cost(size, curve.k1, curve.k2, curve.k3)
        assert curve.expression(size * curve.si_per_unit) == pytest.approx(published, rel=1e-8)


def test_where_the_curves_are_held():
    by_item = {c.item: c for c in CURVES}
    # the quadratic's lowest point, 10**(-K2 / (2 K3)), above the range's lower end
    assert by_item["floating_head_exchanger"].held_below == pytest.approx(21.6, rel=1e-2)
    assert by_item["sieve_tray"].held_below == pytest.approx(0.273, rel=1e-2)
    # else the range's lower end
    assert by_item["fixed_tube_sheet_exchanger"].held_below == 10.0
    assert by_item["centrifugal_pump"].held_below == 1.0
    fixed = by_item["fixed_tube_sheet_exchanger"]
    at_ten = turton_purchased_cost(10.0, fixed.k1, fixed.k2, fixed.k3)
    # tangent slope K2 + 2 K3 = 0.0238 in log-log: 0.05 m2 costs 0.88 x the 10 m2 unit (the curve itself: 6.5 x)
    assert fixed.expression(0.05) / at_ten == pytest.approx(10 ** (0.0238 * np.log10(0.05 / 10.0)), rel=1e-3)



def test_a_tray_above_the_range_follows_the_power_law_of_the_tangent():
    """Sieve tray, Turton Table A.1 (from memory: K1 2.9949, K2 0.4465, K3 0.3961, 0.07-12.3 m2): at 12.3 m2
    the tangent's slope is K2 + 2 K3 log10 12.3 = 1.31; 93.3 m2 (a 10.9 m column) costs 12.3 m2's price
    x (93.3 / 12.3)**1.31, 127 000 USD (2001) a tray, where the quadratic read 258 000."""
    tray = {c.item: c for c in CURVES}["sieve_tray"]
    slope = tray.k2 + 2.0 * tray.k3 * np.log10(tray.size_max)
    at_top = turton_purchased_cost(tray.size_max, tray.k1, tray.k2, tray.k3)
    assert tray.expression(93.3) == pytest.approx(at_top * (93.3 / tray.size_max) ** slope, rel=1e-6)
    assert tray.expression(93.3) == pytest.approx(127_000, rel=0.01)
    assert turton_purchased_cost(93.3, tray.k1, tray.k2, tray.k3) == pytest.approx(258_000, rel=0.01)
