"""A second flash route on the equation of state's fugacities, used when thermo's flash fails.

thermo's flash stops on some valid states (near-pure liquids of a cubic equation of state,
"cannot access local variable ..."). This route solves the same equilibrium directly:
K_i = phi_i^L(T, P, x) / phi_i^V(T, P, y), with x and y from the Rachford-Rice balance at
vapour fraction beta, and the temperature from

    f(T) = sum_i z_i (K_i - 1) / (1 + beta (K_i - 1)) = 0,

which is sum K x = 1 at beta = 0 (bubble point) and sum y / K = 1 at beta = 1 (dew point).
x and y are found by successive substitution at each T; T by ``brentq`` on a bracket grown
from a starting estimate. Where every K equals one (one fluid phase: the trivial solution)
or no bracket exists, there is no vapour-liquid split at that pressure, which the caller
reports in engineering words.

Reference: Michelsen, M. L., Mollerup, J. M., Thermodynamic Models: Fundamentals and
Computational Aspects, 2nd ed., Tie-Line (2007), chapter 10 (successive substitution for
saturation points).
"""

from __future__ import annotations

from typing import Callable

import numpy as np
from scipy.optimize import brentq

from .._base.errors import PropertyError

KFunction = Callable[[float, np.ndarray, np.ndarray], np.ndarray]  # (T, x, y) -> K [-]

TRIVIAL_LN_K = 1e-4  # [-]; all |ln K| below this: both phases are the same fluid
INNER_ITERATIONS = 200
INNER_TOLERANCE = 1e-11
BRACKET_STEP = 5.0  # K
BRACKET_STEPS = 80
GAP_RESOLUTION = 1e-6  # K; a gap of no split narrower than this ends the search


class NoSplit(Exception):
    """No vapour-liquid split at this pressure and composition."""


def _phases(k: np.ndarray, z: np.ndarray, beta: float) -> tuple[np.ndarray, np.ndarray]:
    x = z / (1.0 + beta * (k - 1.0))
    x = x / x.sum()
    y = k * x
    return x, y / y.sum()


def residual(k_values: KFunction, T: float, z: np.ndarray, beta: float, k0: np.ndarray) -> tuple[float, np.ndarray]:
    """Rachford-Rice residual at T [K] with x, y converged by successive substitution; and K."""
    k = k0
    for _ in range(INNER_ITERATIONS):
        x, y = _phases(k, z, beta)
        try:
            k_new = k_values(T, x, y)
        except PropertyError:  # a state thermo cannot evaluate (a bracket step below 0 K): no split there
            raise NoSplit from None
        if not np.all(np.isfinite(k_new)) or np.any(k_new <= 0.0):
            raise NoSplit
        if np.max(np.abs(np.log(k_new / k))) < INNER_TOLERANCE:
            k = k_new
            break
        k = k_new
    if np.max(np.abs(np.log(k))) < TRIVIAL_LN_K:
        raise NoSplit
    return float(np.sum(z * (k - 1.0) / (1.0 + beta * (k - 1.0)))), k


def saturation_point(k_values: KFunction, z, beta: float, T_start: float, k_start: np.ndarray
                     ) -> tuple[float, np.ndarray, np.ndarray]:
    """Temperature [K], liquid x and vapour y [-] of ``z`` at vapour fraction ``beta`` [-].

    ``k_start`` are K estimates at ``T_start`` (for example from vapour pressures). Raises
    :class:`NoSplit` when no two-phase state is found within 200 K of the start.
    """
    z = np.asarray(z, dtype=float)
    state = {"k": np.asarray(k_start, dtype=float)}

    def f(T: float) -> float:
        value, state["k"] = residual(k_values, T, z, beta, state["k"])
        return value

    with np.errstate(all="ignore"):
        low, high = _bracket(f, T_start)
        T = brentq(f, low, high, xtol=1e-9)
        _, k = residual(k_values, T, z, beta, state["k"])
        x, y = _phases(k, z, beta)
    return float(T), x, y


def _bracket(f: Callable[[float], float], T_start: float) -> tuple[float, float]:
    """Temperatures [K] with f < 0 at the first and f >= 0 at the second (f rises with T).

    Steps of ``BRACKET_STEP`` outward from ``T_start``; where a step lands on one fluid
    phase (no split) beyond a temperature that still splits, the gap is bisected instead:
    near a component's critical point the equation of state keeps a liquid root only a
    little above the saturation temperature, less than one step (near-pure ethane at
    45 bar saturates at 301.4 K, 3.9 K below its critical temperature). Raises
    :class:`NoSplit` when no bracket is found.
    """
    points: dict[float, float | None] = {T_start: _safe(f, T_start)}
    for _ in range(BRACKET_STEPS):
        negative = [T for T, v in points.items() if v is not None and v < 0.0]
        positive = [T for T, v in points.items() if v is not None and v >= 0.0]
        if negative and positive:
            return max(negative), min(positive)
        tried = []
        if not positive:
            tried.append(_next_probe(points, negative, max, 1.0))
        if not negative:
            tried.append(_next_probe(points, positive, min, -1.0))
        tried = [T for T in tried if T is not None]
        if not tried:
            break
        for T in tried:
            points[T] = _safe(f, T)
    raise NoSplit


def _next_probe(points: dict, valid: list[float], nearest, direction: float) -> float | None:
    """Next temperature to try beyond ``valid`` in ``direction``: into a gap of no split, or one step on."""
    if not valid:
        edge = max(points) if direction > 0.0 else min(points)
        return edge + direction * BRACKET_STEP
    start = nearest(valid)
    gap = [T for T, v in points.items() if v is None and (T - start) * direction > 0.0]
    if not gap:
        return start + direction * BRACKET_STEP
    end = min(gap, key=lambda T: abs(T - start))
    if abs(end - start) < GAP_RESOLUTION:
        return None
    return 0.5 * (start + end)


def _safe(f, T):
    try:
        return f(T)
    except NoSplit:
        return None


def wilson_k(T: float, P: float, Tcs, Pcs, omegas) -> np.ndarray:
    """Wilson's estimate K_i = (Pc_i/P) exp(5.373 (1 + omega_i)(1 - Tc_i/T)) [-], a starting value only.

    Wilson, G. M., "A modified Redlich-Kwong equation of state, application to general
    physical data calculations", AIChE 65th National Meeting, Cleveland (1969), paper 15C.
    """
    Tcs, Pcs, omegas = (np.asarray(v, dtype=float) for v in (Tcs, Pcs, omegas))
    return Pcs / P * np.exp(5.373 * (1.0 + omegas) * (1.0 - Tcs / T))


def wilson_start(P: float, z, beta: float, Tcs, Pcs, omegas) -> tuple[float, np.ndarray]:
    """Starting temperature [K] and K [-] where Wilson's K satisfy the balance at ``beta``."""
    z = np.asarray(z, dtype=float)

    def f(T):
        k = wilson_k(T, P, Tcs, Pcs, omegas)
        return float(np.sum(z * (k - 1.0) / (1.0 + beta * (k - 1.0))))

    with np.errstate(all="ignore"):
        T = brentq(f, 20.0, 3000.0, xtol=1e-6)
    return T, wilson_k(T, P, Tcs, Pcs, omegas)


def rachford_rice(z: np.ndarray, k: np.ndarray) -> float:
    """Vapour fraction beta [-] solving sum z (K - 1)/(1 + beta (K - 1)) = 0, limited to 0..1."""
    def f(beta):
        return float(np.sum(z * (k - 1.0) / (1.0 + beta * (k - 1.0))))

    if f(0.0) <= 0.0:
        return 0.0  # below the bubble point
    if f(1.0) >= 0.0:
        return 1.0  # above the dew point
    return brentq(f, 0.0, 1.0, xtol=1e-13)


def isothermal_split(k_values: KFunction, T: float, z, k_start: np.ndarray
                     ) -> tuple[float, np.ndarray, np.ndarray]:
    """Vapour fraction [-], x and y [-] of ``z`` at ``T`` [K]: Rachford-Rice with successive substitution."""
    z = np.asarray(z, dtype=float)
    k = np.asarray(k_start, dtype=float)
    with np.errstate(all="ignore"):
        for _ in range(INNER_ITERATIONS):
            beta = rachford_rice(z, k)
            x, y = _phases(k, z, beta)
            k_new = k_values(T, x, y)
            if not np.all(np.isfinite(k_new)) or np.any(k_new <= 0.0):
                raise NoSplit
            done = np.max(np.abs(np.log(k_new / k))) < INNER_TOLERANCE
            k = k_new
            if done:
                break
        if np.max(np.abs(np.log(k))) < TRIVIAL_LN_K:
            raise NoSplit
        beta = rachford_rice(z, k)
        x, y = _phases(k, z, beta) if 0.0 < beta < 1.0 else (z, z)  # one phase: both read as the feed
    return beta, x, y
