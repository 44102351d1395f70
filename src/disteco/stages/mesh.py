"""The stage equations (material, equilibrium, summation, enthalpy) and their Newton solution.

Unknowns are grouped in blocks of 2C + 1, one per contact, numbered from the top:
block 0 is the condenser (reflux flows l_0, distillate flows d, temperature T_0), block
j = 1..N is stage j (liquid flows l_j, vapour flows v_j, temperature T_j). Equations of a
block involve only its own and its neighbours' unknowns, so the Jacobian is block
tridiagonal: it is built by finite differences with three groups of blocks perturbed at
once, and the mixture's K-values and enthalpies are re-evaluated only for the blocks that
moved (Naphtali-Sandholm arrangement; component flows keep the material balances linear).

With ``energy=False`` the stage enthalpy balances are replaced by constant molar overflow
(liquid flows fixed per section) and no enthalpy is evaluated during the iteration.
"""

from __future__ import annotations

import time
from dataclasses import dataclass

import numpy as np
from scipy.linalg import solve_banded

from .._base.errors import ConvergenceError, PropertyError
from ..properties import Mixture

TOLERANCE = 1e-10  # max scaled residual at convergence
# ... or this, once Newton has stalled (no tenfold fall over STALL_STEPS steps) on the round-off of the
# property evaluations: the deethaniser example given 90 stages at R 6 (Peng-Robinson) stalled at
# 2.1-2.9e-8 on one stage's equilibrium over 45 steps and was reported "not converged" (exit 1)
ACCEPTABLE = 1e-7
STALL_STEPS = 10
MAX_ITERATIONS = 60
MAX_TEMPERATURE_STEP = 10.0  # K per Newton step
ENTHALPY_SCALE = 3.0e4  # J/mol; a typical latent heat, to scale the enthalpy balances
RELATIVE_STEP = 1e-7  # finite-difference step relative to the variable's scale
KEEP_JACOBIAN = 0.25  # a step that cuts the largest residual to this share or less keeps its Jacobian


@dataclass(frozen=True)
class ColumnProblem:
    """Everything fixed in one solve; SI units. Flows in mol/s, pressures in Pa."""

    N: int
    feed_stage: int
    reflux_ratio: float
    distillate_flow: float
    feed_flow: float
    z: tuple[float, ...]
    feed_enthalpy: float  # J/mol
    feed_q: float
    pressures: tuple[float, ...]  # condenser, stage 1 .. N
    partial_condenser: bool
    subcooling: float  # K
    energy: bool  # False: constant molar overflow

    @property
    def cmo_liquid(self) -> np.ndarray:
        """Liquid leaving stages 1..N under constant molar overflow [mol/s]."""
        L = np.full(self.N, self.reflux_ratio * self.distillate_flow)
        L[self.feed_stage - 1:] += self.feed_q * self.feed_flow
        L[-1] = self.feed_flow - self.distillate_flow
        return L


class Stages:
    """Residuals, properties and Newton iteration for one ColumnProblem."""

    def __init__(self, mixture: Mixture, problem: ColumnProblem):
        self.mixture = mixture
        self.p = problem
        self.C = len(problem.z)
        self.width = 2 * self.C + 1
        self.f = np.zeros((problem.N + 1, self.C))
        self.f[problem.feed_stage] = problem.feed_flow * np.asarray(problem.z)
        self.scale_flow = problem.feed_flow
        # a component absent from the feed has no flow anywhere: its flows are not stepped, so
        # they stay exactly zero (elimination round-off left 1e-25 after steps on a kept Jacobian)
        absent = np.asarray(problem.z) == 0.0
        self.frozen = np.concatenate([absent, absent, [False]])

    # ------------------------------------------------------------ properties of one block
    def block_properties(self, j: int, u: np.ndarray, base: np.ndarray | None = None,
                         moved: str = "all") -> np.ndarray:
        """[K (C), h_L, h_V, phi_L (C), phi_V (C)] of block j at its unknowns u (length 2C + 1).

        With ``base`` (the properties before a change) and ``moved`` = "liquid" or "vapour", the
        phase that did not move keeps its fugacity coefficients and enthalpy from ``base``, and
        K_i = phi_i^L / phi_i^V is formed with the moved phase's new ones. Enthalpies are 0
        without the energy balances.
        """
        C, m, P, energy = self.C, self.mixture, self.p.pressures[j], self.p.energy
        l, v, T = u[:C], u[C:2 * C], u[-1]
        if j == 0 and not self.p.partial_condenser:
            if moved == "liquid":
                return base  # the reflux's flows do not enter the distillate's bubble point
            y = _fractions(v)
            k = m.k_values(T, P, y)  # bubble point of the distillate
            h_l = m.liquid_enthalpy(T - self.p.subcooling, P, y) if energy else 0.0
            return np.concatenate([k, [h_l, h_l], np.zeros(2 * C)])
        if moved == "vapour":
            phi_l, h_l = base[C + 2:2 * C + 2], base[C]
        else:
            phi_l, h_l = m.liquid_state(T, P, _fractions(l), energy)
        if moved == "liquid":
            phi_v, h_v = base[2 * C + 2:], base[C + 1]
        else:
            phi_v, h_v = m.vapour_state(T, P, _fractions(v), energy)
        with np.errstate(divide="ignore", invalid="ignore"):  # a state thermo cannot evaluate: the step is halved
            k = phi_l / phi_v
        return np.concatenate([k, [h_l, h_v], phi_l, phi_v])

    def all_properties(self, U: np.ndarray) -> np.ndarray:
        return np.array([self.block_properties(j, U[j]) for j in range(self.p.N + 1)])

    # ------------------------------------------------------------ residuals
    def residuals(self, U: np.ndarray, props: np.ndarray) -> np.ndarray:
        """Scaled residuals, shape (N + 1, 2C + 1)."""
        C, p = self.C, self.p
        l, v = U[:, :C], U[:, C:2 * C]
        L, V = l.sum(axis=1), v.sum(axis=1)
        K, hL, hV = props[:, :C], props[:, C], props[:, C + 1]
        R = np.empty_like(U)
        # condenser: v[0] holds the distillate flows d
        R[0, :C] = (v[1] - l[0] - v[0]) / self.scale_flow
        x0, d0 = l[0] / L[0], v[0] / V[0]
        if p.partial_condenser:
            R[0, C:2 * C] = K[0] * x0 - d0
            R[0, -1] = (L[0] - p.reflux_ratio * V[0]) / self.scale_flow
        else:
            R[0, C:2 * C] = (l[0] - p.reflux_ratio * v[0]) / self.scale_flow
            R[0, -1] = np.log(np.dot(K[0], d0))
        # stages 1..N
        liquid_in = l[:-1]
        vapour_in = np.vstack([v[2:], np.zeros((1, C))])
        R[1:, :C] = (liquid_in + vapour_in + self.f[1:] - l[1:] - v[1:]) / self.scale_flow
        R[1:, C:2 * C] = K[1:] * l[1:] / L[1:, None] - v[1:] / V[1:, None]
        if p.energy:
            h_in = L[:-1] * hL[:-1] + np.append(V[2:] * hV[2:], 0.0)
            h_in[p.feed_stage - 1] += p.feed_flow * p.feed_enthalpy
            R[1:, -1] = (h_in - L[1:] * hL[1:] - V[1:] * hV[1:]) / (self.scale_flow * ENTHALPY_SCALE)
        else:
            R[1:, -1] = (L[1:] - p.cmo_liquid) / self.scale_flow
        R[-1, -1] = (L[-1] - (p.feed_flow - p.distillate_flow)) / self.scale_flow
        return R

    # ------------------------------------------------------------ Jacobian
    def jacobian(self, U: np.ndarray, props: np.ndarray, R0: np.ndarray) -> np.ndarray:
        """Block-tridiagonal Jacobian by grouped forward differences, in banded storage."""
        n_blocks, w = self.p.N + 1, self.width
        bands = 2 * w - 1  # block tridiagonal: every block row reaches one block either side
        J = np.zeros((2 * bands + 1, n_blocks * w))  # banded storage of scipy.linalg.solve_banded
        typical = np.concatenate([np.full(2 * self.C, 1e-3 * self.scale_flow), [100.0]])
        for group in range(3):
            blocks = range(group, n_blocks, 3)
            for k in range(w):
                moved = "liquid" if k < self.C else "vapour" if k < 2 * self.C else "all"
                Up, Pp = U.copy(), props.copy()
                steps = {}
                for j in blocks:
                    h = RELATIVE_STEP * max(abs(U[j, k]), typical[k])
                    Up[j, k] += h
                    steps[j] = h
                    Pp[j] = self.block_properties(j, Up[j], props[j], moved)
                dR = self.residuals(Up, Pp) - R0
                for j, h in steps.items():
                    lo, hi = max(j - 1, 0), min(j + 2, n_blocks)
                    column = j * w + k
                    rows = np.arange(lo * w, hi * w)
                    J[bands + rows - column, column] = dR[lo:hi].ravel() / h
        return J

    # ------------------------------------------------------------ Newton
    def solve(self, U: np.ndarray, deadline: float | None = None) -> tuple[np.ndarray, np.ndarray, int]:
        """Newton iteration from U; returns the solution, its properties and the iteration count.

        ``deadline`` (a ``time.monotonic()`` value): past it the iteration stops with ConvergenceError
        before its next step (a step of an 88-stage, five-component column took seconds, and whole
        solves overran a 125 s limit of the caller's to 180 s).

        A Jacobian is kept for the next step while its last full step cut the largest residual
        to :data:`KEEP_JACOBIAN` of it or less (a chord step costs one property sweep instead of
        the 2C + 1 sweeps of a new Jacobian); a kept Jacobian whose full step does not lower the
        residuals' 2-norm is replaced at the same point before a step is taken.
        """
        U = U.copy()
        props = self.all_properties(U)
        R = self.residuals(U, props)
        norm = np.abs(R).max()
        J = None
        norms = [norm]
        for iteration in range(1, MAX_ITERATIONS + 1):
            if norm < TOLERANCE or _stalled_acceptably(norms):
                return U, props, iteration - 1
            if deadline is not None and time.monotonic() > deadline:
                raise ConvergenceError("the caller's time limit passed during the stage equations' Newton steps")
            fresh = J is None
            if fresh:
                J = self.jacobian(U, props, R)
            trial = self._damped_update(U, self._newton_step(J, R), R)
            if not fresh and not trial[4]:  # the kept Jacobian's step failed: a new one at this point
                J = self.jacobian(U, props, R)
                trial = self._damped_update(U, self._newton_step(J, R), R)
            U, props, R, new_norm, full = trial
            if not (full and new_norm <= KEEP_JACOBIAN * norm):
                J = None
            norm = new_norm
            norms.append(norm)
        if _stalled_acceptably(norms):
            return U, props, MAX_ITERATIONS
        raise ConvergenceError(f"stage equations not converged in {MAX_ITERATIONS} Newton steps "
                               f"(largest scaled residual {norm:.3g}); the specification may be near "
                               "minimum reflux or the distillate flow may be impossible for the stage count")

    def linear_response(self, J: np.ndarray, dR: np.ndarray) -> np.ndarray:
        """dU with J dU = -dR: the unknowns' first-order response to a change dR of the residuals."""
        return self._newton_step(J, dR)

    def _newton_step(self, J: np.ndarray, R: np.ndarray) -> np.ndarray:
        try:
            bands = 2 * self.width - 1
            step = solve_banded((bands, bands), J, -R.ravel()).reshape(R.shape)
        except (np.linalg.LinAlgError, ValueError):
            raise ConvergenceError("the stage equations became singular; check the feed stage and "
                                   "that the distillate flow is between zero and the feed flow") from None
        step[:, self.frozen] = 0.0
        return step

    def _damped_update(self, U, step, R0):
        """(U, properties, residuals, largest residual, whether the full step lowered the residual's 2-norm)
        after the longest step along ``step`` (halved up to 8 times) that lowers the 2-norm."""
        norm_2 = np.linalg.norm(R0)
        alpha = first = min(1.0, MAX_TEMPERATURE_STEP / max(np.abs(step[:, -1]).max(), 1e-30))
        props = None
        for _ in range(8):
            trial = U + alpha * step
            flows = trial[:, :-1]
            old = U[:, :-1]
            # a flow that would turn negative shrinks by a factor instead (keeps positivity)
            shrink = flows <= 0.0
            before = old[shrink]
            with np.errstate(divide="ignore", invalid="ignore"):  # a zero flow (no feed of it) stays zero
                ratio = np.where(before > 0.0, alpha * step[:, :-1][shrink] / before, -5.0)
            flows[shrink] = before * np.exp(np.maximum(ratio, -5.0))
            try:
                props = self.all_properties(trial)
            except PropertyError:
                alpha *= 0.5
                continue
            R = self.residuals(trial, props)
            new_norm = np.abs(R).max()
            # the Newton step is a descent direction of the 2-norm, not of the max-norm
            lower = np.isfinite(new_norm) and np.linalg.norm(R) < norm_2
            if lower or (np.isfinite(new_norm) and alpha < 0.05):
                return trial, props, R, new_norm, lower and alpha == first
            alpha *= 0.5
        if props is None:  # no step along the direction could be evaluated
            raise ConvergenceError("the stage equations' Newton step left the states thermo can evaluate")
        return trial, props, R, new_norm, False


def _stalled_acceptably(norms: list[float]) -> bool:
    """Whether the last largest residual is within :data:`ACCEPTABLE` and has not fallen tenfold over the
    last :data:`STALL_STEPS` Newton steps (``norms``: the largest scaled residual before each step)."""
    return len(norms) > STALL_STEPS and norms[-1] <= ACCEPTABLE and norms[-1] > 0.1 * norms[-1 - STALL_STEPS]


def _fractions(flows: np.ndarray) -> np.ndarray:
    return flows / flows.sum()
