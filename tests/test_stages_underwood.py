"""Underwood's minimum reflux with non-key components that distribute (Class 2 separations).

Property checks of the linear system and an end-to-end case with components boiling between
the keys; regression pins say that they only guard against change.
"""

import numpy as np
import pytest

from disteco._base.errors import InfeasibleSpecError
from disteco.api import load_case, mixture_of
from disteco.cli import main
from disteco.properties import feed_state
from disteco.stages import design_stages, spec_residuals
from disteco.stages.correlations import underwood_minimum_vapour, underwood_roots

# Invented volatilities (heavy key = 1) and feed: a light non-key close to the light key,
# one component between the keys, a heavy non-key far below the heavy key.
ALPHA = np.array([2.1, 2.0, 1.4, 1.0, 0.2])
Z = np.array([0.10, 0.25, 0.30, 0.25, 0.10])
F = 100.0 * Z
LIGHT, HEAVY = 1, 3
D_KEYS = np.array([0.0, 0.90 * F[1], 0.0, 0.10 * F[3], 0.0])


def residuals(alpha, d, v_min, roots):
    """Underwood's second equation at every root, V_min subtracted [mol/s]."""
    return [float(np.sum(alpha * d / (alpha - phi)) - v_min) for phi in roots]


@pytest.mark.parametrize("q", [1.0, 0.5, 0.0])
def test_every_root_satisfies_the_second_equation(q):
    """The square system holds at each root used, one root per distributing component pair:
    the component between the keys distributes, the light non-key close to the light key
    distributes too (its root lies between it and the light key), the far heavy one does not."""
    v_min, d, roots = underwood_minimum_vapour(ALPHA, Z, q, D_KEYS, LIGHT, HEAVY, F)
    assert 0.0 < d[2] < F[2]
    assert 0.0 < d[0] < F[0]
    assert d[4] == 0.0
    assert len(roots) == 3 and ALPHA[3] < roots[0] < ALPHA[2] < roots[1] < ALPHA[1] < roots[2] < ALPHA[0]
    assert max(abs(r) for r in residuals(ALPHA, d, v_min, roots)) < 1e-9 * v_min
    # the roots are those of the feed equation
    for phi in roots:
        assert np.sum(ALPHA * Z / (ALPHA - phi)) == pytest.approx(1.0 - q, abs=1e-9)
    # the keys keep the flows their specifications fixed
    assert (d[LIGHT], d[HEAVY]) == (D_KEYS[LIGHT], D_KEYS[HEAVY])


def test_non_distributing_light_non_key_is_fixed_at_its_feed():
    """A very volatile light non-key comes out above its feed when taken as distributing; it is
    fixed at its feed and the system solved again over the roots between the keys only."""
    alpha = ALPHA.copy()
    alpha[0] = 40.0
    v_min, d, roots = underwood_minimum_vapour(alpha, Z, 1.0, D_KEYS, LIGHT, HEAVY, F)
    assert d[0] == F[0] and d[4] == 0.0
    assert roots == tuple(underwood_roots(alpha, Z, 1.0, alpha[HEAVY], alpha[LIGHT]))
    assert max(abs(r) for r in residuals(alpha, d, v_min, roots)) < 1e-9 * v_min


def test_equal_volatilities_of_distributing_components_are_explained():
    """Two distributing components of one volatility leave the system one root short: refused in words."""
    alpha = np.array([2.1, 2.1, 2.0, 1.0])
    z = np.array([0.2, 0.2, 0.3, 0.3])
    with pytest.raises(InfeasibleSpecError, match="same relative volatility"):
        underwood_minimum_vapour(alpha, z, 1.0, np.array([0.0, 0.0, 27.0, 3.0]), 2, 3, 100.0 * z)


def test_without_feed_flows_non_keys_outside_keep_their_flows():
    """Regression guard (only against change): without feed flows the non-keys outside the keys
    keep the flows passed in, as before distributing non-keys were handled."""
    given = D_KEYS.copy()
    given[0] = 9.0
    _, d, roots = underwood_minimum_vapour(ALPHA, Z, 1.0, given, LIGHT, HEAVY)
    assert d[0] == 9.0 and d[4] == 0.0 and len(roots) == 2


# n-butane / isopentane / n-pentane / n-hexane with keys n-butane and n-hexane: two components
# between the keys. Invented feed. Before the distributing non-keys were handled the minimum
# reflux came out at -0.055 (0.98) and -0.030 (0.999) and the case was refused. Raoult's law is
# pinned: the pins below were taken with it (the automatic choice at 2.5 bar is Peng-Robinson).
WIDE_CASE = """title = "Butane-hexane split with two pentanes between the keys"
[mixture]
components = ["n-butane", "isopentane", "n-pentane", "n-hexane"]
method = "ideal"
[feed]
flow = "95 kmol/h"
composition = [0.15, 0.15, 0.40, 0.30]
vapour_fraction = 0.0
[column]
top_pressure = "2.5 bar"
pressure_drop_per_tray = "0.7 kPa"
[products]
light_key = "n-butane"
heavy_key = "n-hexane"
light_key_recovery = {recovery}
heavy_key_recovery = {recovery}
[economics]
cost_year = 2023
"""


@pytest.mark.parametrize("recovery, pinned_minimum_reflux", [(0.98, 0.36056), (0.999, 0.44985)])
def test_case_with_components_between_the_keys_designs(tmp_path, recovery, pinned_minimum_reflux):
    """`disteco check` accepts the case and the stages layer designs it: the pentanes distribute
    at minimum reflux, the stage profile meets both key specifications. The minimum reflux is a
    regression pin (guards against change only)."""
    path = tmp_path / "wide.toml"
    path.write_text(WIDE_CASE.format(recovery=recovery))
    assert main(["check", str(path)]) == 0
    case = load_case(path)
    mixture = mixture_of(case)
    feed = feed_state(case.feed, mixture, case.column.top_pressure)
    design = design_stages(mixture, feed, case.products, case.column)
    shortcut = design.shortcut
    assert design.minimum_reflux == pytest.approx(pinned_minimum_reflux, abs=1e-4)
    assert len(shortcut.underwood_roots) == 3
    f = np.asarray(shortcut.split.distillate) + np.asarray(shortcut.split.bottoms)
    alpha = np.asarray(shortcut.alpha_feed)
    v_min, d, roots = underwood_minimum_vapour(alpha, np.asarray(feed.z), feed.q,
                                               np.asarray(shortcut.split.distillate), 0, 3, f)
    assert all(0.0 < d[i] < f[i] for i in (1, 2))
    assert v_min / d.sum() - 1.0 == pytest.approx(shortcut.minimum_reflux, rel=1e-12)
    assert design.meets_specs
    assert np.abs(spec_residuals(design.profile, case.products, feed)).max() < 1e-6
    assert design.profile.reflux_ratio > design.minimum_reflux


# A textbook-style data set (invented numbers; no published worked example is used here): a
# light non-key far above the light key, one component between the keys, a heavy non-key far
# below the heavy key; 95 % of each key to its product.
REF_ALPHA = np.array([8.0, 2.5, 1.6, 1.0, 0.2])
REF_Z = np.array([0.05, 0.30, 0.20, 0.30, 0.15])
REF_F = 100.0 * REF_Z
REF_D = np.array([REF_F[0], 0.95 * REF_F[1], 0.0, 0.05 * REF_F[3], 0.0])


def reference_underwood(alpha, z, q, d_fixed, middle, low, high):
    """Underwood's Class 2 minimum vapour solved from scratch: (V_min, d_middle, roots).

    Independent of the function under test: the roots of the feed equation are the
    eigenvalue roots of its polynomial form (denominators cleared, numpy.roots), the two
    second-kind equations are solved by scipy's fsolve from a crude guess.
    """
    from numpy.polynomial import polynomial as P
    from scipy.optimize import fsolve

    # sum_i alpha_i z_i prod_{j != i} (alpha_j - t) - (1 - q) prod_j (alpha_j - t) = 0
    poly = np.zeros(1)
    for i in range(len(alpha)):
        term = np.array([alpha[i] * z[i]])
        for j in range(len(alpha)):
            if j != i:
                term = P.polymul(term, [alpha[j], -1.0])
        poly = P.polyadd(poly, term)
    whole = np.array([1.0])
    for a in alpha:
        whole = P.polymul(whole, [a, -1.0])
    poly = P.polysub(poly, (1.0 - q) * whole)
    roots = sorted(r.real for r in P.polyroots(poly) if abs(r.imag) < 1e-12 and low < r.real < high)

    def equations(unknown):
        v, dm = unknown
        d = d_fixed.copy()
        d[middle] = dm
        return [np.sum(alpha * d / (alpha - phi)) - v for phi in roots]

    v, dm = fsolve(equations, [np.sum(d_fixed), 0.5 * z[middle] * 100.0], xtol=1e-13)
    return float(v), float(dm), roots


@pytest.mark.parametrize("q", [1.0, 0.6])
def test_class_2_minimum_reflux_against_an_independent_solution(q):
    """V_min, the intermediate component's distillate flow and R_min = V_min/D - 1 agree with
    Underwood's equations solved from scratch (reference_underwood) to 1e-8 relative; the
    non-keys outside the keys are fixed at their bounds (all of the light one up, none of the
    heavy one). No published multicomponent worked example is checked here."""
    v_min, d, roots = underwood_minimum_vapour(REF_ALPHA, REF_Z, q, REF_D, 1, 3, REF_F)
    v_ref, dm_ref, roots_ref = reference_underwood(REF_ALPHA, REF_Z, q, REF_D.copy(), 2, REF_ALPHA[3], REF_ALPHA[1])
    assert len(roots_ref) == 2
    assert np.allclose(roots, roots_ref, rtol=1e-10)
    assert d[0] == REF_F[0] and d[4] == 0.0
    assert 0.0 < dm_ref < REF_F[2]
    assert d[2] == pytest.approx(dm_ref, rel=1e-8)
    assert v_min == pytest.approx(v_ref, rel=1e-8)
    d_ref = REF_D.copy()
    d_ref[2] = dm_ref
    assert v_min / d.sum() - 1.0 == pytest.approx(v_ref / d_ref.sum() - 1.0, rel=1e-8)
