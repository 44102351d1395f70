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


# Treybal, R.E., Mass-Transfer Operations, 3rd ed., McGraw-Hill, 1980, Illustration 9.13 (p. 436):
# methane/ethane/propane/n-butane/n-pentane/n-hexane, propane the light key (98 % to the distillate),
# n-pentane the heavy key (1 % to the distillate), the feed flashed to 66.7 % liquid, volatilities at
# an average 80 degC; n-butane lies between the keys. The book's m = y/x table (30, 60, 90, 120 degC)
# and answers as transcribed in a public worked-solution script of the illustration; the book's
# own volatilities at 80 degC were not available, so they are interpolated here with ln m linear in
# 1/T (Clausius-Clapeyron's form).
TREYBAL_Z = np.array([0.03, 0.07, 0.15, 0.33, 0.30, 0.12])
TREYBAL_T = np.array([30.0, 60.0, 90.0, 120.0])  # [degC]
TREYBAL_M = np.array([[16.1, 19.3, 21.8, 24.0], [3.45, 4.90, 6.25, 8.15], [1.10, 2.00, 2.90, 4.00],
                      [0.35, 0.70, 1.16, 1.78], [0.085, 0.26, 0.50, 0.84], [0.030, 0.130, 0.239, 0.448]])
TREYBAL_MINIMUM_REFLUX = 0.58
TREYBAL_BUTANE_AT_MINIMUM = 0.1306  # kmol per kmol of feed in the distillate (0.1255 at total reflux)


def test_class_2_minimum_reflux_against_treybal_illustration_9_13():
    """The published Class 2 example: n-butane distributes, methane and ethane go wholly to the
    distillate and n-hexane wholly to the bottoms (as the book assumes), one root between each pair
    of distributing volatilities. The book's answers are met within the reading of its volatilities:
    R_min 0.600 against 0.58 (the linear interpolation in T gives 0.614, a cubic 0.604), n-butane
    0.1331 against 0.1306 kmol, above its 0.1255 at total reflux as in the book."""
    inverse_t = -1.0 / (TREYBAL_T + 273.15)
    m80 = np.array([np.exp(np.interp(-1.0 / (80.0 + 273.15), inverse_t, np.log(row))) for row in TREYBAL_M])
    alpha = m80 / m80[4]
    keys = np.array([0.0, 0.0, 0.98 * TREYBAL_Z[2], 0.0, 0.01 * TREYBAL_Z[4], 0.0])
    v_min, d, roots = underwood_minimum_vapour(alpha, TREYBAL_Z, 0.667, keys, 2, 4, TREYBAL_Z)
    assert (d[0], d[1], d[5]) == (TREYBAL_Z[0], TREYBAL_Z[1], 0.0)
    assert len(roots) == 2 and alpha[4] < roots[0] < alpha[3] < roots[1] < alpha[2]
    assert d[3] == pytest.approx(TREYBAL_BUTANE_AT_MINIMUM, rel=0.02)
    assert d[3] > 0.1255
    assert v_min / d.sum() - 1.0 == pytest.approx(TREYBAL_MINIMUM_REFLUX, rel=0.04)


def constant_volatility_column(alpha, z, q, n_top, n_bottom, light, heavy, recovery, start):
    """Reflux ratio and distillate flows of a column with constant relative volatilities and
    constant molar overflow that gives each key ``recovery`` to its product: n_top stages above
    the feed stage, n_bottom from it down to the partial reboiler, a total condenser, 100 mol/s
    of feed. Written here from the stage balances alone (y = alpha x / sum(alpha x)) and solved
    by Newton's method with a finite-difference Jacobian, independent of disteco's stages layer.
    ``start``: (stage liquid fractions, R, D). Returns (x, R, D, d)."""
    from scipy.sparse import csc_matrix
    from scipy.sparse.linalg import spsolve

    C, N, f_flow = len(alpha), n_top + n_bottom, 100.0 * np.asarray(z)
    stage = np.arange(N)

    def residual(u):
        x, R, D = u[:-2].reshape(N, C), u[-2], u[-1]
        V = (R + 1.0) * D
        liquid = np.where(stage < n_top, R * D, R * D + q * 100.0)
        liquid[-1] = 100.0 - D
        vapour = np.where(stage <= n_top, V, V - (1.0 - q) * 100.0)
        y = alpha * x / (x @ alpha)[:, None]
        balance = -liquid[:, None] * x - vapour[:, None] * y
        balance[0] += R * D * y[0]
        balance[1:] += liquid[:-1, None] * x[:-1]
        balance[:-1] += vapour[1:, None] * y[1:]
        balance[n_top] += f_flow
        specs = [D * y[0, light] - recovery * f_flow[light], D * y[0, heavy] - (1.0 - recovery) * f_flow[heavy]]
        return np.concatenate([balance.ravel(), specs])

    def jacobian(u, r0):
        # a stage's balance involves only its neighbours: perturb every third stage at once
        rows, cols, values, m = [], [], [], len(u)
        for first in range(3):
            for i in range(C):
                columns = np.arange(first, N, 3) * C + i
                step = 1e-7 * np.maximum(1e-3, np.abs(u[columns]))
                du = np.zeros(m)
                du[columns] = step
                change = residual(u + du) - r0
                for column, h in zip(columns, step):
                    n = column // C
                    near = np.arange(max(0, n - 1) * C, min(N, n + 2) * C)
                    near = np.concatenate([near, [m - 2, m - 1]]) if n == 0 else near
                    rows.append(near), cols.append(np.full(len(near), column)), values.append(change[near] / h)
        for column in (m - 2, m - 1):
            du = np.zeros(m)
            du[column] = 1e-7 * abs(u[column])
            change = (residual(u + du) - r0) / du[column]
            rows.append(np.arange(m)), cols.append(np.full(m, column)), values.append(change)
        return csc_matrix((np.concatenate(values), (np.concatenate(rows), np.concatenate(cols))), shape=(m, m))

    x0, R0, D0 = start
    u = np.concatenate([np.asarray(x0).ravel(), [R0, D0]])
    for _ in range(50):
        r = residual(u)
        if np.abs(r).max() < 1e-10:
            x, R, D = u[:-2].reshape(N, C), u[-2], u[-1]
            return x, R, D, D * alpha * x[0] / (x[0] @ alpha)
        step, t = spsolve(jacobian(u, r), -r), 1.0
        while True:
            trial = u + t * step
            trial[:-2] = np.maximum(trial[:-2], 1e-300)
            if np.abs(residual(trial)).max() < np.abs(r).max() or t < 1e-4:
                break
            t *= 0.5
        u = trial
    raise AssertionError("the reference column did not converge")


def stretched(x, n_top, n_new):
    """A stage profile with n_top stages above the feed stage resampled to n_new in each section."""
    def section(block):
        old, new = np.linspace(0.0, 1.0, len(block)), np.linspace(0.0, 1.0, n_new)
        return np.exp(np.array([np.interp(new, old, np.log(c)) for c in block.T]).T)
    return np.vstack([section(x[:n_top]), section(x[n_top:])])


@pytest.mark.parametrize("alpha, z, q, recovery", [(REF_ALPHA, REF_Z, 1.0, 0.95), (REF_ALPHA, REF_Z, 0.6, 0.95),
                                                 (ALPHA, Z, 1.0, 0.90)],
                         ids=["far-non-keys", "part-vapour-feed", "light-non-key-distributes"])
def test_class_2_minimum_reflux_is_the_limit_of_ever_taller_columns(alpha, z, q, recovery):
    """Underwood's equations are exact for constant relative volatilities and constant molar
    overflow (Underwood, Chem. Eng. Prog. 44 (1948) 603-614): the reflux ratio a column needs
    for the key recoveries tends, as its stages grow, to the Class 2 minimum reflux ratio, and
    its distillate flows to the distribution at minimum reflux, the component between the keys
    (and in the third case a light non-key close to the light key) distributing. Checked on
    columns solved stage by stage (constant_volatility_column), 10 to 320 stages per section,
    feed in the middle. The approach need not be from above: a short column may leave some of
    a distributing light non-key below and so need a little less reflux than the limit."""
    f_flow = 100.0 * z
    d_keys = np.zeros(len(alpha))
    d_keys[1] = recovery * f_flow[1]
    d_keys[3] = (1.0 - recovery) * f_flow[3]
    v_min, d_min, _ = underwood_minimum_vapour(alpha, z, q, d_keys, 1, 3, f_flow)
    r_min = v_min / d_min.sum() - 1.0
    x_d, x_b = d_min / d_min.sum(), (f_flow - d_min) / (100.0 - d_min.sum())
    n = 10
    x = np.maximum([x_d + (x_b - x_d) * k / (2 * n - 1) for k in range(2 * n)], 1e-12)
    start = (x / x.sum(axis=1)[:, None], 1.3 * r_min, d_min.sum())
    excess = []
    for stages in (10, 20, 40, 80, 160, 320):
        if stages != n:
            start = (stretched(start[0], n, stages), start[1], start[2])
            n = stages
        x, R, D, d = constant_volatility_column(alpha, z, q, n, n, 1, 3, recovery, start)
        start = (x, R, D)
        excess.append(R / r_min - 1.0)
    assert excess[0] > 1e-2
    assert abs(excess[-1]) < 1e-5 and abs(excess[-1]) < 0.01 * abs(excess[1])
    assert d == pytest.approx(d_min, rel=1e-4, abs=1e-9)
    # distributing: a share of the feed in each product beyond round-off (a non-key held wholly in the
    # distillate comes out as its feed flow to a few units in the last place, differently on other machines)
    def distributes(j):
        return 1e-9 * f_flow[j] < d[j] < (1.0 - 1e-9) * f_flow[j]
    assert distributes(2)
    assert distributes(0) == (alpha is ALPHA)
