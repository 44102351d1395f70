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


def test_a_first_column_that_does_not_converge_is_solved_again_at_more_reflux(ethanol_water, monkeypatch):
    """Newton on the specifications starts from a column at the table row's reflux; where that first column
    does not converge (acetone-water with a partial condenser at 1.5 bar, near its azeotrope, did or did not
    by a last-bit change of its equilibrium curve, and `check` exited 2), it is solved at 1.5, 2 and 3 times
    that reflux until one converges, and Newton moves the reflux back to what the specifications need: the
    same profile as without the failure, to 1e-6 in R."""
    import disteco.stages.specs as specs
    from disteco._base.errors import ConvergenceError, InfeasibleSpecError

    feed = feed_state(Feed(FeedFlow("molar", 1.0), (0.2, 0.8), ThermalCondition("q", 1.0), None),
                      ethanol_water, P_ATM)
    products = Products(0, 1, EndSpec("fraction", 0.01), EndSpec("fraction", 0.2))
    column = Column(P_ATM, 0.0, "total", 0.0)
    plain = design_stages(ethanol_water, feed, products, column).profile
    real, seen = specs.solve_rigorous, []

    def first_fails(mixture, feed, spec, *args):
        seen.append(spec.reflux_ratio)
        if len(seen) == 1:
            raise ConvergenceError("stage equations not converged (simulated)")
        return real(mixture, feed, spec, *args)

    monkeypatch.setattr(specs, "solve_rigorous", first_fails)
    again = design_stages(ethanol_water, feed, products, column).profile
    assert seen[1] == pytest.approx(1.5 * seen[0])
    assert again.reflux_ratio == pytest.approx(plain.reflux_ratio, rel=1e-6)
    assert abs(spec_residuals(again, products, feed)).max() < 1e-6

    monkeypatch.setattr(specs, "solve_rigorous", lambda *a: (_ for _ in ()).throw(ConvergenceError("never")))
    with pytest.raises(InfeasibleSpecError, match="never"):  # every reflux failing: the first failure, in words
        design_stages(ethanol_water, feed, products, column)
