"""Constant-molar-overflow column by Newton's method on the stage temperatures alone.

With the liquid and vapour flows fixed per section, the component balances at given
K-values are linear (one tridiagonal system per component, stripping factors
S_ij = K_ij V_j / L_j). What remains is the bubble-point condition of every stage,
g_j(T) = ln(sum_i K_ij l_ij / L_j) = 0 (the vapour flows add up), an N-by-N system in
the temperatures whose Jacobian follows analytically from dK/dT and the inverse of each
tridiagonal matrix. The composition dependence of K (activity coefficients) is updated
between Newton steps. A partial condenser is one more contact at the top (liquid R D
down, vapour D out); a total condenser returns the share R/(R + 1) of the top vapour.

The result is the unknown array of the full stage equations (see ``mesh``), which
confirm it to their tolerance, or finish it where this Newton stalls (composition-
dependent K near a pinch, partial condensers, tall columns with trace components).
Measured on 160 random specifications of four mixtures: one failed to converge.
"""

from __future__ import annotations

import numpy as np

from .._base.errors import ConvergenceError
from ..properties import Mixture
from .initial import bubble_temperature, cmo_flows, first_guess
from .mesh import ColumnProblem

TOLERANCE = 1e-7  # the full stage equations polish the last digits (one or two Newton steps)
MAX_ITERATIONS = 40
HANDOVER = 5.0  # log residual below which the full stage equations take over (stalls seen: below 2)
MAX_STEP = 10.0  # K per Newton step
DT = 1e-3  # K, step of the dK/dT difference


class TemperatureNewton:
    """Bubble-point residuals of a CMO column and their Jacobian in the contact temperatures.

    Contacts are the stages 1..N, preceded by the condenser when it is partial.
    """

    def __init__(self, mixture: Mixture, problem: ColumnProblem):
        self.m, self.p = mixture, problem
        L, V = cmo_flows(problem)
        self.top = 1 if problem.partial_condenser else 0  # index of stage 1
        D, R = problem.distillate_flow, problem.reflux_ratio
        self.L = np.concatenate([[R * D], L]) if self.top else L
        self.V = np.concatenate([[D], V]) if self.top else V
        self.P = np.asarray(problem.pressures[1 - self.top:])
        n, C = len(self.L), len(problem.z)
        self.f = np.zeros((n, C))
        self.f[problem.feed_stage - 1 + self.top] = problem.feed_flow * np.asarray(problem.z)
        # total condenser: the reflux share R/(R+1) of the stage-1 vapour returns to stage 1
        self.share = 0.0 if self.top else R / (R + 1.0)
        # dA/dS_k: column k holds -(1 - share) e_k + e_{k-1}
        self.pattern = -np.eye(n) + np.eye(n, k=1)
        self.pattern[0, 0] += self.share
        # Vapour compositions K is evaluated at, per contact; NaN: at the liquid's own (an ideal-gas
        # vapour's K do not depend on it; an equation of state's nearly so away from its critical
        # region). There a liquid-like composition can have no vapour root, K at y = x would all
        # be one, and such a contact takes its bubble point's vapour (see _two_phase_evaluation).
        self.y = np.full((n, C), np.nan)

    def k_values(self, T: np.ndarray, x: np.ndarray) -> np.ndarray:
        y = np.where(np.isnan(self.y), x, self.y)
        return np.array([self.m.k_values(T[j], self.P[j], x[j], y[j]) for j in range(len(T))])

    def follow_vapour(self, K: np.ndarray, x: np.ndarray) -> float:
        """Move the vapour a contact on its bubble point's vapour is evaluated at (see
        :func:`_two_phase_evaluation`) to the one its last K give, y = K x / sum(K x); return the largest
        change of such a vapour mole fraction [-] (0 for an ideal-gas vapour).

        Near the critical region a liquid-like composition has no vapour root at y = x; such a contact
        keeps a vapour of its own, and one held at its first bubble point's while its liquid moved let
        Newton's steps in T land it on the one-fluid side, where the bubble condition holds trivially:
        a demethaniser at 35 bar converged with trays at 437 and 586 K between trays near 190 K, and its
        full stage equations then failed from that start. Contacts at y = x keep it (their K hardly
        depend on y; following it everywhere kept an ethylene/ethane column at 45 bar from converging).
        """
        if self.m.ideal_gas_vapour:
            return 0.0
        with np.errstate(divide="ignore", invalid="ignore"):
            y = K * x / (K * x).sum(axis=1, keepdims=True)
        usable = np.all(np.isfinite(y), axis=1) & ~_one_fluid(K) & ~np.isnan(self.y).any(axis=1)
        before = np.where(np.isnan(self.y), x, self.y)
        self.y[usable] = y[usable]
        return float(np.abs(self.y[usable] - before[usable]).max(initial=0.0))

    def liquid_flows(self, K: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """Component liquid flows (contacts, C) at fixed K, and the inverse matrix per component."""
        n, C = K.shape
        S = K * (self.V / self.L)[:, None]
        A = np.zeros((C, n, n))
        rows = np.arange(n)
        A[:, rows, rows] = -(1.0 + S.T)
        A[:, rows[1:], rows[:-1]] = 1.0
        A[:, rows[:-1], rows[1:]] = S.T[:, 1:]
        A[:, 0, 0] += self.share * S[0]
        inverses = np.linalg.inv(A)
        l = np.einsum("ijk,ki->ji", inverses, -self.f)
        return l, inverses

    def residual_and_jacobian(self, T, x):
        K = self.k_values(T, x)
        dK = (self.k_values(T + DT, x) - K) / DT
        l, inverses = self.liquid_flows(K)
        total = (K * l).sum(axis=1)  # sum_i v_ij x L_j / V_j
        g = np.log(total / self.L)  # logarithm: tames the sums of a poor start by orders of magnitude
        dS = dK * (self.V / self.L)[:, None]
        J = np.diag((dK * l).sum(axis=1))
        for i in range(K.shape[1]):
            dl = -(inverses[i] @ self.pattern) * (dS[:, i] * l[:, i])[None, :]  # dl_i/dT_k in column k
            J += K[:, i][:, None] * dl
        return g, J / total[:, None], K, l


def _one_fluid(K: np.ndarray) -> np.ndarray:
    """Per contact: its K all equal one. Near the critical region the equation of state has only one
    root there, K carries no temperature slope and the Newton matrix would be singular."""
    return np.all(np.abs(np.log(K)) < 1e-12, axis=1)


def _two_phase_evaluation(newton: TemperatureNewton, Ts: np.ndarray, x: np.ndarray):
    """(Ts, residual, Jacobian, K, l) with every one-fluid contact first moved to the bubble
    temperature of its liquid, and one still one fluid there evaluated at that bubble point's vapour.

    A near-critical start (a bottoms of nearly pure ethane at 45 bar) interpolates
    temperatures a fraction of a kelvin above where the liquid root ends; at its bubble
    temperature the liquid's own composition then has a vapour root. A liquid-like bottoms
    under pressure (ethane, propane and butane at 28 bar) has none even there. The K of the
    evaluation itself tell, so an ordinary column pays nothing for the check.
    """
    g, J, K, l = newton.residual_and_jacobian(Ts, x)
    flat = _one_fluid(K)
    if not flat.any():
        return Ts, g, J, K, l
    Ts = Ts.copy()
    bubbles = {j: newton.m.bubble_point(newton.P[j], x[j]) for j in np.flatnonzero(flat)}
    for j, bubble in bubbles.items():
        Ts[j] = bubble.T
    g, J, K, l = newton.residual_and_jacobian(Ts, x)
    still = [j for j in np.flatnonzero(_one_fluid(K)) if j in bubbles]
    if not still:
        return Ts, g, J, K, l
    for j in still:
        newton.y[j] = bubbles[j].y
    return (Ts, *newton.residual_and_jacobian(Ts, x))


def cmo_unknowns(mixture: Mixture, problem: ColumnProblem) -> np.ndarray:
    """Converged CMO profile as the unknown array (N + 1, 2C + 1) of the stage equations."""
    x, T = first_guess(mixture, problem)
    newton = TemperatureNewton(mixture, problem)
    if newton.top:
        x = np.vstack([x[:1], x])
        Ts = T.copy()
    else:
        Ts = T[1:].copy()
    Ts, g, J, K, l = _two_phase_evaluation(newton, Ts, x)
    for _ in range(MAX_ITERATIONS):
        try:
            step = np.linalg.solve(J, -g)
        except np.linalg.LinAlgError:  # a contact whose K lost their temperature slope (one fluid)
            raise ConvergenceError("constant-molar-overflow profile: the bubble-point equations became singular "
                                   "(a stage's liquid and vapour alike, near the critical region)") from None
        step *= min(1.0, MAX_STEP / np.abs(step).max())
        norm = np.linalg.norm(g)  # Newton steps descend the 2-norm, not necessarily the max-norm
        for _ in range(10):
            trial = Ts + step
            g_new, J_new, K_new, l_new = newton.residual_and_jacobian(trial, x)
            if np.all(np.isfinite(g_new)) and not _one_fluid(K_new).any() \
                    and np.linalg.norm(g_new) < norm * (1.0 + 1e-9) + 1e-13:
                break
            step *= 0.5
        Ts, g, J, K, l = trial, g_new, J_new, K_new, l_new
        x_new = l / l.sum(axis=1, keepdims=True)
        change = max(np.abs(x_new - x).max(), newton.follow_vapour(K, x_new))
        x = x_new
        if change > 0.0:
            Ts, g, J, K, l = _two_phase_evaluation(newton, Ts, x)
        if np.abs(g).max() < TOLERANCE and change < TOLERANCE:
            break
    else:
        # composition-dependent K can make the update of x cycle near a pinch; the full stage
        # equations (with their composition derivatives) finish from a close enough start
        if not np.abs(g).max() < HANDOVER:
            raise ConvergenceError(f"constant-molar-overflow profile not converged in {MAX_ITERATIONS} steps "
                                   f"(largest bubble-point residual {np.abs(g).max():.3g}); check that the "
                                   "distillate flow suits the stage count and feed stage")
    v = K * l * (newton.V / newton.L)[:, None]
    if newton.top:
        top = np.concatenate([l[0], v[0], [Ts[0]]])
        l, v, Ts = l[1:], v[1:], Ts[1:]
    else:
        d = v[0] / (problem.reflux_ratio + 1.0)
        T0 = bubble_temperature(mixture, problem.pressures[0], d / d.sum(), T[0])
        top = np.concatenate([problem.reflux_ratio * d, d, [T0]])
    return np.vstack([top, np.hstack([l, v, Ts[:, None]])])
