"""First estimates for the stage equations: constant-molar-overflow flows, a product split
ordered by volatility, and bubble temperatures."""

from __future__ import annotations

import numpy as np

from .._base.errors import InfeasibleSpecError
from ..properties import Mixture
from .mesh import ColumnProblem

GUESS_BLEND = 0.05  # share of feed composition mixed into the sharp product guess (keeps all flows > 0)
BUBBLE_TOLERANCE = 1e-9
MAX_BUBBLE_STEP = 20.0  # K


def cmo_flows(problem: ColumnProblem) -> tuple[np.ndarray, np.ndarray]:
    """Liquid and vapour leaving stages 1..N under constant molar overflow [mol/s]."""
    p = problem
    V = np.full(p.N, (p.reflux_ratio + 1.0) * p.distillate_flow)
    V[p.feed_stage:] -= (1.0 - p.feed_q) * p.feed_flow
    if V.min() <= 0.0:
        raise InfeasibleSpecError(
            f"with reflux ratio {p.reflux_ratio:.4g} the vapour feed ({(1.0 - p.feed_q) * p.feed_flow:.4g} mol/s) "
            f"exceeds the vapour the top needs ({V[0]:.4g} mol/s): no boil-up is left below the feed; "
            "raise the reflux ratio or the distillate flow")
    return p.cmo_liquid, V


def bubble_temperature(mixture: Mixture, P: float, x: np.ndarray, T: float) -> float:
    """Bubble temperature of liquid x at P [Pa] by Newton's method from T [K] (K at y = x: an
    ideal-gas vapour's K do not depend on y; an equation of state's bubble point is a flash)."""
    if not mixture.ideal_gas_vapour:
        return mixture.bubble_point(P, x).T
    for _ in range(30):
        g = np.log(np.dot(mixture.k_values(T, P, x), x))
        if abs(g) < BUBBLE_TOLERANCE:
            return T
        slope = (np.log(np.dot(mixture.k_values(T + 0.01, P, x), x)) - g) / 0.01
        if not slope > 0.0:
            break
        T -= float(np.clip(g / slope, -MAX_BUBBLE_STEP, MAX_BUBBLE_STEP))
    return mixture.bubble_point(P, x).T


def _sharp_split(mixture: Mixture, problem: ColumnProblem) -> np.ndarray:
    """Distillate flows filled by volatility order, blended with the feed composition [mol/s]."""
    z = np.asarray(problem.z)
    P = problem.pressures[problem.feed_stage]
    point = mixture.bubble_point(P, z)
    k = mixture.k_values(point.T, P, z, point.y)
    f = z * problem.feed_flow
    d = np.zeros_like(f)
    room = problem.distillate_flow
    for i in np.argsort(-k):
        d[i] = min(f[i], room)
        room -= d[i]
    return (1.0 - GUESS_BLEND) * d + GUESS_BLEND * problem.distillate_flow * z


def first_guess(mixture: Mixture, problem: ColumnProblem) -> tuple[np.ndarray, np.ndarray]:
    """Stage liquid compositions (N, C) and temperatures (N + 1, condenser first).

    Compositions run piecewise linearly from a volatility-ordered distillate over the feed
    to the bottoms; temperatures are their bubble points, interpolated the same way.
    """
    p, N = problem, problem.N
    z = np.asarray(p.z)
    d = _sharp_split(mixture, p)
    x_d, x_b = d / d.sum(), (z * p.feed_flow - d) / (p.feed_flow - d.sum())
    anchors = [1.0, float(p.feed_stage), float(N)] if 1 < p.feed_stage < N else [1.0, float(N)]
    ends = [x_d, z, x_b] if 1 < p.feed_stage < N else [x_d, x_b]
    x = np.array([[np.interp(j, anchors, [e[i] for e in ends]) for i in range(len(z))]
                  for j in range(1, N + 1)])
    x /= x.sum(axis=1, keepdims=True)
    P = p.pressures
    T = np.empty(N + 1)
    T[0] = mixture.bubble_point(P[0], x_d).T
    T_ends = [mixture.bubble_point(P[int(a)], e).T for a, e in zip(anchors, ends)]
    T[1:] = np.interp(np.arange(1, N + 1), anchors, T_ends)
    return x, T
