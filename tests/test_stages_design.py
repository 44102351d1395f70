"""The one-call design of the stages layer: consistent minimum values, table and profile."""

import pytest

from disteco.case import Column, EndSpec, Feed, FeedFlow, Products, ThermalCondition, Thermo
from disteco.properties import build_mixture, feed_state
from disteco.stages import design_stages, spec_residuals

P_ATM = 101325.0


def test_binary_design_uses_the_real_curve(ethanol_water):
    """Ethanol-water: the minimum reflux is the tangent pinch of the curve (above Underwood's
    constant-volatility value), the profile meets both purities at about 1.3 x that minimum."""
    feed = feed_state(Feed(FeedFlow("molar", 1.0), (0.2, 0.8), ThermalCondition("q", 1.0), None),
                      ethanol_water, P_ATM)
    products = Products(0, 1, EndSpec("fraction", 0.01), EndSpec("fraction", 0.2))
    design = design_stages(ethanol_water, feed, products, Column(P_ATM, 0.0, "total", 0.0))
    assert design.basis.startswith("McCabe-Thiele")
    assert design.binary.minimum_reflux.kind == "tangent pinch"
    assert design.minimum_reflux > design.shortcut.minimum_reflux
    assert [p.reflux_factor for p in design.table][0] == 1.05
    assert all(a.stages > b.stages for a, b in zip(design.table, design.table[1:]))
    assert abs(spec_residuals(design.profile, products, feed)).max() < 1e-6
    assert design.profile.reflux_ratio == pytest.approx(1.3 * design.minimum_reflux, rel=0.15)
    assert design.profile.condenser_duty > 0.0 and design.profile.reboiler_duty > 0.0


def test_multicomponent_design_partial_condenser():
    """Five alkanes with a partial condenser: Fenske-Underwood-Gilliland-Kirkbride basis; the
    profile at the Gilliland stage count meets both recoveries."""
    names = ("n-butane", "n-pentane", "n-hexane", "n-heptane", "n-octane")
    mixture = build_mixture(names, Thermo("ideal"), 3e5)
    feed = feed_state(Feed(FeedFlow("molar", 1.0), (0.1, 0.3, 0.3, 0.2, 0.1), ThermalCondition("q", 1.0), None),
                      mixture, 3e5)
    products = Products(1, 2, EndSpec("recovery", 0.98), EndSpec("recovery", 0.98))
    design = design_stages(mixture, feed, products, Column(3e5, 700.0, "partial", 0.0))
    assert design.basis.startswith("Fenske")
    assert design.binary is None and design.profile.partial_condenser
    assert design.profile.stages == design.shortcut.point(1.3).whole_stages
    assert abs(spec_residuals(design.profile, products, feed)).max() < 1e-6
