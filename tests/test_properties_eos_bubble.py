"""Bubble points of non-polar Peng-Robinson mixtures by Newton's method (``properties/eos_bubble.py``).

The reference is thermo's own flash at a vapour fraction of zero (``Mixture.flash_pvf``, thermo's
bubble-point algorithms with Michelsen's stability test), on the same equation of state.
"""

import numpy as np
import pytest

from disteco.case import Thermo
from disteco.properties import build_mixture
from disteco.properties.eos_bubble import newton_bubble_point
from disteco.properties.fitted import _k_fit_liquids

ALKANES = ("n-butane", "isopentane", "n-pentane", "n-hexane", "n-heptane")


@pytest.mark.parametrize("P", [4e5, 12e5, 25e5])
def test_newton_bubble_points_against_thermo_flash(P):
    """Five alkanes at 4, 12 and 25 bar on the liquids the equilibrium fit samples (the feed, each
    component at 0.98, ten random liquids): temperatures within 1e-5 K and vapour mole fractions
    within 1e-5 of thermo's flash (its own tolerance is the looser; 1.6e-6 seen)."""
    mixture = build_mixture(ALKANES, Thermo("peng-robinson"), P)
    assert mixture._regular_eos_liquid
    for x in _k_fit_liquids(np.full(5, 0.2), 5):
        own = mixture.bubble_point(P, x)
        reference = mixture.flash_pvf(P, 0.0, x)
        assert own.T == pytest.approx(reference.T, abs=1e-5)
        assert own.y == pytest.approx(reference.y, abs=1e-5)
        assert own.x == pytest.approx(tuple(x), abs=1e-12)


def test_the_trivial_solution_is_left_to_thermo():
    """Ethane at 50 bar lies above its critical pressure (48.7 bar): from Wilson's start the iteration
    heads for the trivial solution (ln K of ethane 9e-6, then 9e-8, ...), the liquid's own vapour;
    Newton's route returns None there, leaving the state to thermo's flash and its second route."""
    mixture = build_mixture(("ethane", "propane"), Thermo("peng-robinson"), 50e5)
    flasher, c = mixture._flasher, mixture._constants
    assert newton_bubble_point(flasher.liquid, flasher.gas, 50e5, [0.999, 0.001], c.Tcs, c.Pcs, c.omegas) is None


def test_liquids_that_can_split_keep_thermo_stability_test():
    """A polar component, or a pair with a large kij (carbon dioxide/ethane at 0.13, whose liquids can
    split), keeps thermo's flash with its stability test."""
    assert not build_mixture(("methanol", "n-hexane"), Thermo("peng-robinson"), 12e5)._regular_eos_liquid
    kij = ((0.0, 0.13), (0.13, 0.0))
    assert not build_mixture(("carbon dioxide", "ethane"), Thermo("peng-robinson", kij=kij), 20e5)._regular_eos_liquid
    assert build_mixture(("ethane", "propane"), Thermo("peng-robinson"), 20e5)._regular_eos_liquid


def test_a_failure_inside_thermo_leaves_the_state_to_its_flash():
    """thermo's phases raise more than arithmetic errors (fluids' UnconvergedError, a plain Exception, where
    the cubic's volume iteration stalls): Newton's route then returns None, which leaves the state to thermo's
    flash (Mixture.bubble_point), instead of ending the run with an internal error."""
    from fluids.numerics import UnconvergedError

    class Stalling:
        def to(self, **state):
            raise UnconvergedError("volume iteration did not converge (simulated)")

    mixture = build_mixture(("ethane", "propane"), Thermo("peng-robinson"), 20e5)
    c = mixture._constants
    assert newton_bubble_point(Stalling(), mixture._flasher.gas, 20e5, [0.5, 0.5], c.Tcs, c.Pcs, c.omegas) is None
