"""Starting points for the equation model: shortcut estimates and a constant-molar-overflow profile.

The profile comes from the bubble-point method (Wang and Henke) on the fitted forms: with
the flows fixed by constant molar overflow, each component's balances are a tridiagonal
linear system in the liquid mole fractions; stage temperatures follow from bubble points.
It satisfies every equality of the model's constant-molar-overflow form, so the solver
starts on the model's equality manifold.

References
----------
1. Wang, J.C., Henke, G.E. "Tridiagonal matrix for distillation", Hydrocarbon Processing
   45(8), 155-163 (1966).
2. Eduljee, H.E. "Equations replace Gilliland plot", Hydrocarbon Processing 54(9), 120 (1975).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache

import numpy as np
from scipy.linalg import solve_banded
from scipy.optimize import brentq

from ..stages.binary import EquilibriumCurve, binary_grid, minimum_reflux, tabulated_curve, total_reflux_stages
from ..stages.correlations import fenske_minimum_stages, kirkbride_feed_stage, kirkbride_ratio
from ..stages.shortcut import minimum_reflux_underwood
from ..stages.splits import product_split

from .._base.errors import ConvergenceError, InfeasibleSpecError
from .basis import SeparationProblem
from .results import minimum_method

PROFILE_TOLERANCE = 1e-6  # K, largest stage temperature change at convergence
PROFILE_ITERATIONS = 300
MAX_START_REFLUX_FACTOR = 20.0  # near the minimum stages Gilliland's reflux runs away; a start needs less
MIN_START_REFLUX = 1e-3  # smallest minimum reflux a start works from [-]
DAMPING = 0.5  # share of the new compositions taken each pass; undamped passes cycle on non-ideal liquids


@dataclass(frozen=True)
class Shortcut:
    """Shortcut estimates on the fitted forms at the feed bubble point."""

    alpha: tuple[float, ...]  # volatility relative to the heavy key [-]
    distillate: tuple[float, ...]  # component flows in the distillate [mol/s]
    minimum_reflux: float  # [-]
    minimum_stages: float  # reboiler included [-]
    method: str = "Fenske-Underwood"  # or "McCabe-Thiele" (a binary, stepped on the fitted curve)

    def minimum_by(self, quantity: str) -> str:
        """The method that gave the minimum ``quantity`` ("reflux" or "stages")."""
        return minimum_method(self.method, quantity)


@dataclass(frozen=True)
class Profile:
    """A converged constant-molar-overflow column on the fitted forms (arrays stage by stage)."""

    reflux_ratio: float
    distillate_flow: float  # mol/s
    T: np.ndarray  # K, shape (N,)
    x: np.ndarray  # shape (N, C)
    y: np.ndarray
    L: np.ndarray  # mol/s, liquid leaving each stage
    V: np.ndarray  # mol/s, vapour leaving each stage


def _section_rows(rows: np.ndarray, count: int) -> np.ndarray:
    """``rows`` (one per stage of a column section) stretched or shrunk to ``count`` rows by linear interpolation."""
    if count == len(rows):
        return rows.copy()
    if len(rows) == 1 or count == 1:
        return np.repeat(rows[:1] if count == 1 else rows, count, axis=0)[:count]
    where = np.linspace(0.0, len(rows) - 1.0, count)
    low = np.minimum(np.floor(where).astype(int), len(rows) - 2)
    share = (where - low).reshape((-1,) + (1,) * (rows.ndim - 1))
    return (1.0 - share) * rows[low] + share * rows[low + 1]


def moved_profile(profile: Profile, feed_stage: int, stages: int, new_feed_stage: int) -> Profile:
    """A solved column's profile (feed on ``feed_stage``) mapped onto ``stages`` with the feed on ``new_feed_stage``.

    Each section (the stages above the feed, and the feed stage down to the reboiler) is
    stretched or shrunk on its own, so stages inserted or removed and a moved feed keep the
    feed's conditions at the feed and the products' at the ends. The start of a neighbouring
    configuration (see :class:`disteco.optimisation.search.Evaluator`).
    """
    def mapped(values: np.ndarray) -> np.ndarray:
        values = np.asarray(values, dtype=float)
        return np.concatenate([_section_rows(values[:feed_stage - 1], new_feed_stage - 1),
                               _section_rows(values[feed_stage - 1:], stages - new_feed_stage + 1)])

    x, y = mapped(profile.x), mapped(profile.y)
    return Profile(profile.reflux_ratio, profile.distillate_flow, mapped(profile.T),
                   x / x.sum(axis=1, keepdims=True), y / y.sum(axis=1, keepdims=True), mapped(profile.L),
                   mapped(profile.V))


@lru_cache(maxsize=32)
def shortcut(problem: SeparationProblem) -> Shortcut:
    """Fenske minimum stages and Underwood minimum reflux on the fitted forms (cached per problem).

    The split is the stages layer's: keys by the specifications, non-keys by Fenske's
    distribution. A sharp split of the non-keys started a column with a component between
    the keys wrongly: on a twenty-component debutaniser (isopentane between n-butane and
    n-pentane) every isopentane molecule went to the bottoms, the start profile at that
    distillate recovered 95.8 % of the light key instead of 98 %, and Underwood's root was
    sought across isopentane's pole. The minimum reflux is Underwood's with distributing
    components (:func:`minimum_reflux_underwood`); where that refuses the split (no reflux
    needed), a start takes ``MIN_START_REFLUX``.
    """
    f = problem.fitted
    z = np.asarray(problem.z)
    P = problem.pressure(1)
    T = f.bubble_temperature(P, z)
    k = f.k_values(T, P, z)
    lk, hk = problem.light_key, problem.heavy_key
    alpha = k / k[hk]
    if alpha[lk] <= 1.0:
        raise InfeasibleSpecError(f"light key {f.names[lk]} is not more volatile than heavy key {f.names[hk]} "
                                  f"at the feed bubble point ({T - 273.15:.1f} degC)")
    split = product_split(problem, z, problem.feed_flow, alpha)
    d, b = np.asarray(split.distillate), np.asarray(split.bottoms)
    stepped = _binary_minima(problem, d, b) if f.size == 2 else None
    if stepped is not None:
        return Shortcut(tuple(alpha), tuple(d), max(stepped[0], MIN_START_REFLUX), stepped[1], "McCabe-Thiele")
    n_min = fenske_minimum_stages(d[lk], b[lk], d[hk], b[hk], alpha[lk])
    try:
        r_min, _ = minimum_reflux_underwood(alpha, z, problem.q, split)
    except InfeasibleSpecError:
        r_min = MIN_START_REFLUX
    return Shortcut(tuple(alpha), tuple(d), max(r_min, MIN_START_REFLUX), n_min)


def fitted_equilibrium_curve(problem: SeparationProblem) -> EquilibriumCurve:
    """The light key's y(x) of a binary on the fitted forms at top pressure (the model's own equilibrium)."""
    lk, hk = problem.light_key, problem.heavy_key
    x_light = np.asarray(binary_grid())
    x = np.zeros((x_light.size, 2))
    x[:, lk], x[:, hk] = x_light, 1.0 - x_light
    P = np.full(x_light.size, problem.top_pressure)
    f = problem.fitted
    T = _bubble_temperatures(problem, P, x, np.full(x_light.size, f.bubble_temperature(problem.top_pressure,
                                                                                       np.asarray(problem.z))))
    k = np.exp(np.asarray(f.ln_k(T, P, [x[:, 0], x[:, 1]], exp=np.exp, log=np.log)))
    return tabulated_curve(x_light, k[lk] * x[:, lk] / (k[lk] * x[:, lk] + k[hk] * x[:, hk]), problem.top_pressure)


def _binary_minima(problem: SeparationProblem, d: np.ndarray, b: np.ndarray) -> tuple[float, float] | None:
    """(minimum reflux, minimum stages) of a binary by McCabe-Thiele on the fitted curve, or None.

    Fenske and Underwood take one relative volatility, the feed bubble point's; a curve whose
    volatility changes along it (a tangent pinch near a pure end, acetone-water or
    ethanol-water) needs far more stages and reflux than that volatility says: on an
    acetone-water column to 0.99 acetone Fenske gave 4.6 stages against 22.6 stepped, and the
    search started at 10 stages, where no reflux meets the distillate, and ran out of time.
    None where the curve cannot be stepped (not monotone, an azeotrope between the products,
    no reflux needed): then Fenske and Underwood's estimates stand.
    """
    lk, hk = problem.light_key, problem.heavy_key
    x_d, x_b = d[lk] / (d[lk] + d[hk]), b[lk] / (b[lk] + b[hk])
    try:
        curve = fitted_equilibrium_curve(problem)
        if not np.all(np.isfinite(curve.y)):  # a bubble point the Newton steps did not reach
            return None
        stages = total_reflux_stages(curve, x_d, x_b).stages
        reflux = minimum_reflux(curve, x_d, x_b, float(problem.z[lk]), problem.q).reflux_ratio
    except (InfeasibleSpecError, ConvergenceError, ValueError):  # ValueError: no root in a bracket
        return None
    return (reflux, stages) if math.isfinite(stages) and math.isfinite(reflux) else None


def gilliland_reflux(stages: int, estimate: Shortcut) -> float:
    """Reflux ratio [-] that gives ``stages`` by Eduljee's form of Gilliland's correlation."""
    Y = (stages - estimate.minimum_stages) / (stages + 1.0)
    if Y <= 0.0:
        return 10.0 * estimate.minimum_reflux + 1.0
    X = (1.0 - min(Y, 0.74) / 0.75) ** (1.0 / 0.5668)
    return min((X + estimate.minimum_reflux) / (1.0 - X), MAX_START_REFLUX_FACTOR * estimate.minimum_reflux + 1.0)


def cmo_flows(problem: SeparationProblem, stages: int, feed_stage: int, R: float, D: float):
    """Liquid and vapour flows leaving each stage by constant molar overflow [mol/s]."""
    F, q = problem.feed_flow, problem.q
    j = np.arange(1, stages + 1)
    L = np.where(j < feed_stage, R * D, R * D + q * F)
    L[-1] = F - D
    V = np.where(j <= feed_stage, (R + 1.0) * D, (R + 1.0) * D - (1.0 - q) * F)
    return L.astype(float), V.astype(float)


def _bubble_temperatures(problem: SeparationProblem, P: np.ndarray, x: np.ndarray, T: np.ndarray) -> np.ndarray:
    """Bubble temperatures of every stage at once by Newton's method on ln(sum K x)."""
    f = problem.fitted
    cols = [x[:, i] for i in range(f.size)]

    def g(T):
        lnk = f.ln_k(T, P, cols, exp=np.exp, log=np.log)
        return np.log(sum(np.exp(lnk[i]) * cols[i] for i in range(f.size)))

    for _ in range(50):
        value = g(T)
        slope = (g(T + 1e-3) - value) / 1e-3
        step = np.clip(-value / slope, -20.0, 20.0)
        T = T + step
        if np.max(np.abs(step)) < 1e-9:
            break
    return T


def partial_condenser_split(problem: SeparationProblem, y_top, R: float,
                            liquid) -> tuple[float, np.ndarray, np.ndarray]:
    """(T [K], reflux x [-], distillate y [-]) of a partial condenser fed the top vapour ``y_top``.

    Per mole of distillate the condenser takes in R + 1 of vapour and returns R of liquid:
    x_i = (R + 1) y_top,i / (R + K_i), with T such that sum x = 1. The K-values are taken at
    ``liquid``, the top stage's liquid, which the reflux resembles and which lies where the forms
    were fitted: iterated at the reflux itself they ran away on a condensate stabiliser at 12 bar
    (methane's fitted K fell to 0.007 at 48 degC as the reflux took up methane beyond any column
    liquid the forms had seen). A start only has to be close; the model solves the condenser itself.
    """
    f, P = problem.fitted, problem.top_pressure
    y_top = np.asarray(y_top, dtype=float)
    liquid = np.asarray(liquid, dtype=float)
    low, high = f.search_range

    def excess(T):
        return float(np.sum((R + 1.0) * y_top / (R + f.k_values(T, P, liquid)))) - 1.0

    # sum x falls as T rises; beyond the search range the nearer end stands in
    at_low, at_high = excess(low), excess(high)
    T = brentq(excess, low, high) if at_low * at_high < 0.0 else (low if at_low < 0.0 else high)
    k = f.k_values(T, P, liquid)
    x = (R + 1.0) * y_top / (R + k)
    x /= x.sum()
    y = k * x
    return T, x, y / y.sum()


def cmo_profile(problem: SeparationProblem, stages: int, feed_stage: int, R: float, D: float) -> Profile:
    """Stage temperatures and compositions for fixed R [-] and D [mol/s] (bubble-point method).

    Near a pinch the passes creep; after ``PROFILE_ITERATIONS`` the last pass is returned,
    since a start only has to be close, not converged.
    """
    f = problem.fitted
    nc = f.size
    F, z = problem.feed_flow, np.asarray(problem.z)
    L, V = cmo_flows(problem, stages, feed_stage, R, D)
    if np.any(L <= 0.0) or np.any(V <= 0.0):
        raise InfeasibleSpecError(f"reflux ratio {R:.4g} with distillate {D:.4g} mol/s gives a negative flow")
    P = np.array([problem.pressure(j) for j in range(1, stages + 1)])
    T = np.full(stages, f.bubble_temperature(P[0], z))
    x = np.tile(z, (stages, 1))
    for _ in range(PROFILE_ITERATIONS):
        lnk = f.ln_k(T, P, [x[:, i] for i in range(nc)], exp=np.exp, log=np.log)
        K = np.exp(np.array(lnk)).T  # (N, C)
        # Reflux per unit of the top vapour's component flow: 1 - D/V1 for a total condenser
        # (reflux of composition y_1); R/(R + K_c) for a partial one at its current split.
        kept = np.full(nc, R / (R + 1.0))
        if problem.partial_condenser:
            y_top = K[0] * x[0] / np.sum(K[0] * x[0])
            T_c, _, _ = partial_condenser_split(problem, y_top, R, x[0])
            kept = R / (R + f.k_values(T_c, P[0], x[0]))  # the split's own K-values
        x_new = np.empty_like(x)
        for i in range(nc):
            band = np.zeros((3, stages))
            band[1] = -(L + V * K[:, i])
            band[1, 0] = -(L[0] + V[0] * K[0, i] * (1.0 - kept[i]))  # the reflux returns to stage 1
            band[0, 1:] = V[1:] * K[1:, i]
            band[2, :-1] = L[:-1]
            rhs = np.zeros(stages)
            rhs[feed_stage - 1] = -F * z[i]
            x_new[:, i] = np.maximum(solve_banded((1, 1), band, rhs), 0.0)
        x_new = DAMPING * x_new / x_new.sum(axis=1, keepdims=True) + (1.0 - DAMPING) * x
        T_new = _bubble_temperatures(problem, P, x_new, T.copy())
        change = np.max(np.abs(T_new - T))
        x, T = x_new, T_new
        if change < PROFILE_TOLERANCE:
            break
    if not np.all(np.isfinite(T)):
        raise ConvergenceError(f"start profile diverged ({stages} stages, feed stage {feed_stage}, R = {R:.4g})")
    lnk = f.ln_k(T, P, [x[:, i] for i in range(nc)], exp=np.exp, log=np.log)
    y = np.exp(np.array(lnk)).T * x
    y /= y.sum(axis=1, keepdims=True)
    return Profile(R, D, T, x, y, L, V)


def stage_floor(estimate: Shortcut, config) -> int:
    """Fewest stages worth solving: the options' minimum, raised to the Fenske minimum (rounded down).

    Below the minimum stages no reflux meets the specification; the solver would spend its
    whole time limit proving that.
    """
    return max(config.min_stages, math.floor(estimate.minimum_stages), 3)


def kirkbride(problem: SeparationProblem, estimate: Shortcut) -> float:
    """Kirkbride's ratio of stages above to stages below the feed for the shortcut split [-]."""
    F, z = problem.feed_flow, problem.z
    lk, hk = problem.light_key, problem.heavy_key
    d = estimate.distillate
    D = sum(d)
    B = F - D
    x_lk_b = (F * z[lk] - d[lk]) / B
    x_hk_d = d[hk] / D
    return kirkbride_ratio(z[lk], z[hk], x_lk_b, x_hk_d, B, D)


def feed_stage_of(stages: int, ratio: float) -> int:
    """Kirkbride's feed stage for ``stages``, kept off the condenser side and the reboiler."""
    return min(max(kirkbride_feed_stage(stages, ratio), 2), stages - 1)


def starting_configuration(problem: SeparationProblem, estimate: Shortcut, config) -> tuple[int, int]:
    """Twice the Fenske minimum (a common rule, no source) and Kirkbride's feed stage."""
    stages = int(min(max(round(2.0 * estimate.minimum_stages) + 1, stage_floor(estimate, config) + 1),
                     config.max_stages))
    return stages, feed_stage_of(stages, kirkbride(problem, estimate))


# Share of the heavy key's distillate flow (light key's bottoms flow) that a given design's second starts
# take off (add to) the shortcut's distillate, so that one product starts purer than its specification.
PURER_SHARE = 0.8


def purer_product_starts(problem: SeparationProblem, stages: int, feed_stage: int, reflux: float) -> tuple:
    """Start profiles at ``reflux`` with the distillate purer, then the bottoms purer, than the specifications.

    A given design with stages to spare over-purifies one product, and the distillate that meets both
    specifications exactly (the shortcut's) can start it far from its solution. Measured: ethanol-water on
    100 stages, feed on 80, R 3: every try from the shortcut's distillate (19.8 mol/s) stalled (exit 1);
    from 16.7 mol/s (the heavy key's share taken off) it solved in 0.3 s to 18.1 mol/s, distillate
    pinched near the azeotrope at 0.8715.
    """
    estimate = shortcut(problem)
    D = float(sum(estimate.distillate))
    light_in_bottoms = problem.feed_flow * problem.z[problem.light_key] - estimate.distillate[problem.light_key]
    starts = []
    for flow in (D - PURER_SHARE * estimate.distillate[problem.heavy_key], D + PURER_SHARE * light_in_bottoms):
        try:
            starts.append(start_profile(problem, stages, feed_stage, reflux, distillate=flow))
        except ConvergenceError:
            continue  # no profile at that distillate: the other start is tried
    return tuple(starts)


def start_profile(problem: SeparationProblem, stages: int, feed_stage: int, reflux: float | None = None,
                  distillate: float | None = None, factor: float = 1.0) -> Profile:
    """Constant-molar-overflow profile at the shortcut's distillate and ``factor`` times Gilliland's reflux."""
    estimate = shortcut(problem)
    R = reflux if reflux is not None else factor * gilliland_reflux(stages, estimate)
    D = distillate if distillate is not None else float(sum(estimate.distillate))
    for factor in (1.0, 1.5, 3.0):
        try:
            return cmo_profile(problem, stages, feed_stage, R * factor, D)
        except (ConvergenceError, InfeasibleSpecError):
            continue
    raise ConvergenceError(f"no start profile for {stages} stages, feed stage {feed_stage}")
