"""Constant-molar-overflow column by Newton's method on the stage temperatures alone.

With the liquid and vapour flows fixed per section, the component balances at given
K-values are linear (one tridiagonal system per component, stripping factors
S_ij = K_ij V_j / L_j). What remains is the bubble-point condition of every stage,
g_j(T) = sum_i K_ij x_ij - 1 = 0, an N-by-N system in the temperatures whose Jacobian
follows analytically from dK/dT and the inverse of each tridiagonal matrix. The
composition dependence of K (activity coefficients) is updated between Newton steps.

The result is the unknown array of the full stage equations (see ``mesh``), which then
confirms it to their tolerance.
"""

from __future__ import annotations

import numpy as np
from scipy.optimize import brentq

from .._base.errors import ConvergenceError
from ..properties import Mixture
from .initial import bubble_temperature, cmo_flows, first_guess
from .mesh import ColumnProblem

TOLERANCE = 1e-7  # the full stage equations polish the last digits (one or two Newton steps)
MAX_ITERATIONS = 80
MAX_STEP = 10.0  # K per Newton step
DT = 1e-3  # K, step of the dK/dT difference


class TemperatureNewton:
    """Bubble-point residuals of a CMO column and their Jacobian in the stage temperatures."""

    def __init__(self, mixture: Mixture, problem: ColumnProblem):
        self.m, self.p = mixture, problem
        self.L, self.V = cmo_flows(problem)
        self.P = np.asarray(problem.pressures[1:])
        N, C = problem.N, len(problem.z)
        self.f = np.zeros((N, C))
        self.f[problem.feed_stage - 1] = problem.feed_flow * np.asarray(problem.z)
        # E: dA/dS_k pattern, column k holds -(1 - r) e_k + e_{k-1}; reflux share r enters at (0, 0)
        self.base = -np.eye(N) + np.eye(N, k=1)

    def k_values(self, T: np.ndarray, x: np.ndarray) -> np.ndarray:
        return np.array([self.m.k_values(T[j], self.P[j], x[j]) for j in range(self.p.N)])

    def liquid_flows(self, K: np.ndarray, reflux_share: np.ndarray) -> tuple[np.ndarray, list]:
        """Component liquid flows (N, C) at fixed K, and the inverse matrices per component."""
        N, C = K.shape
        S = K * (self.V / self.L)[:, None]
        l = np.empty((N, C))
        inverses = []
        for i in range(C):
            A = -np.diag(1.0 + S[:, i]) + np.diag(np.ones(N - 1), k=-1) + np.diag(S[1:, i], k=1)
            A[0, 0] += reflux_share[i] * S[0, i]
            inverse = np.linalg.inv(A)
            l[:, i] = inverse @ -self.f[:, i]
            inverses.append(inverse)
        return l, inverses

    def residual_and_jacobian(self, T, x, reflux_share):
        K = self.k_values(T, x)
        dK = (self.k_values(T + DT, x) - K) / DT
        l, inverses = self.liquid_flows(K, reflux_share)
        g = (K * l).sum(axis=1) / self.L - 1.0
        dS = dK * (self.V / self.L)[:, None]
        J = np.diag((dK * l).sum(axis=1) / self.L)
        for i, inverse in enumerate(inverses):
            E = self.base.copy()
            E[0, 0] += reflux_share[i]
            dl = -(inverse @ E) * (dS[:, i] * l[:, i])[None, :]  # dl_i / dT_k in column k
            J += K[:, i][:, None] * dl / self.L[:, None]
        return g, J, K, l


def _reflux_share(mixture: Mixture, problem: ColumnProblem, T0: float, x0: np.ndarray) -> np.ndarray:
    """Share of the top vapour of each component returned as reflux: R/(R+1), or R/(R+K0) when partial."""
    R = problem.reflux_ratio
    if not problem.partial_condenser:
        return np.full(len(problem.z), R / (R + 1.0))
    return R / (R + mixture.k_values(T0, problem.pressures[0], x0))


def _condenser(mixture: Mixture, problem: ColumnProblem, v1: np.ndarray, T0: float):
    """Condenser temperature, reflux and distillate flows from the top vapour v1 [mol/s]."""
    R, P0 = problem.reflux_ratio, problem.pressures[0]
    if not problem.partial_condenser:
        d = v1 / (R + 1.0)
        T0 = bubble_temperature(mixture, P0, d / d.sum(), T0)
        return T0, R * d, d
    V1 = v1.sum()

    def reflux_balance(T):  # sum_i v1 R/(R + K0) - R V1/(R + 1) = 0, K0 at the reflux composition
        x0 = v1 / (R + mixture.k_values(T, P0, v1 / V1))
        x0 /= x0.sum()
        share = R / (R + mixture.k_values(T, P0, x0))
        return float(np.dot(v1, share) - R * V1 / (R + 1.0))

    T0 = brentq(reflux_balance, T0 - 60.0, T0 + 60.0, xtol=1e-10)
    x0 = v1 / (R + mixture.k_values(T0, P0, v1 / V1))
    share = R / (R + mixture.k_values(T0, P0, x0 / x0.sum()))
    return T0, share * v1, (1.0 - share) * v1


def cmo_unknowns(mixture: Mixture, problem: ColumnProblem) -> np.ndarray:
    """Converged CMO profile as the unknown array (N + 1, 2C + 1) of the stage equations."""
    x, T = first_guess(mixture, problem)
    newton = TemperatureNewton(mixture, problem)
    T0, Ts = T[0], T[1:].copy()
    x0 = x[0]
    share = _reflux_share(mixture, problem, T0, x0)
    g, J, K, l = newton.residual_and_jacobian(Ts, x, share)
    for _ in range(MAX_ITERATIONS):
        step = np.linalg.solve(J, -g)
        step *= min(1.0, MAX_STEP / np.abs(step).max())
        norm = np.abs(g).max()
        for _ in range(10):
            trial = Ts + step
            g_new, J_new, K_new, l_new = newton.residual_and_jacobian(trial, x, share)
            if np.all(np.isfinite(g_new)) and np.abs(g_new).max() < max(norm, 1e-14) * 1.0001 + 1e-13:
                break
            step *= 0.5
        Ts, g, J, K, l = trial, g_new, J_new, K_new, l_new
        x_new = l / l.sum(axis=1, keepdims=True)
        change = np.abs(x_new - x).max()
        x = x_new
        if problem.partial_condenser:
            v1 = K[0] * l[0] * newton.V[0] / newton.L[0]
            T0, l0, _ = _condenser(mixture, problem, v1, T0)
            share_new = _reflux_share(mixture, problem, T0, l0 / l0.sum())
            change = max(change, np.abs(share_new - share).max())
            share = share_new
        if change > 0.0:
            g, J, K, l = newton.residual_and_jacobian(Ts, x, share)
        if np.abs(g).max() < TOLERANCE and change < TOLERANCE:
            break
    else:
        raise ConvergenceError(f"constant-molar-overflow profile not converged in {MAX_ITERATIONS} steps "
                               f"(largest bubble-point residual {np.abs(g).max():.3g})")
    v = K * l * (newton.V / newton.L)[:, None]
    T0, l0, d = _condenser(mixture, problem, v[0], T0)
    top = np.concatenate([l0, d, [T0]])
    return np.vstack([top, np.hstack([l, v, Ts[:, None]])])
