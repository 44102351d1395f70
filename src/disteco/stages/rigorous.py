"""Stage-by-stage column solution for a given design: constant molar overflow or energy balances.

What is fixed in a solve (``ColumnSpec``): the number of equilibrium stages N (reboiler
included, condenser not counted), the feed stage, the reflux ratio L0/D, the distillate
flow D, the top pressure and the pressure drop per stage. Everything else follows:
temperatures, flows, compositions, the product purities and both duties.

Stage j (1..N) sits at P_top + (j - 1) dP; the condenser at P_top. A total condenser
returns reflux and distillate at their bubble point less the subcooling; a partial
condenser is an equilibrium contact giving a vapour distillate.

The feed (both phases of a partly vaporised feed) enters the feed stage with its
enthalpy from the properties layer, so q acts through the energy balances; under
constant molar overflow q splits it between the sections.

Solution method, and why: Newton's method on all stage equations at once with
component flows as unknowns (``mesh``), because it converges quadratically and a
warm start from a nearby design (what an optimiser asks for) needs two to four steps.
From a cold start it is not robust alone: from a linear profile the five-alkane column
of the tests failed to converge in 60 steps, and a 40-stage benzene-toluene column
took 30. So the start is the constant-molar-overflow column solved by Newton's method
on the stage temperatures only (``cmo``), from which the full equations converge in
three to five steps. Measured on two cores (ideal method): benzene-toluene 20 stages,
CMO 13 ms and energy balances 33 ms; 40 stages, 29 and 64 ms; five alkanes, 30 stages,
30 and 144 ms; ethanol-water (UNIFAC) 25 stages, 208 and 260 ms. A warm start after a
1 % change of reflux: 18, 33 and 71 ms.
"""

from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np

from .._base.errors import CaseError, ConvergenceError, InfeasibleSpecError
from ..case import Column
from ..properties import FeedState, Mixture
from .cmo import cmo_unknowns
from .mesh import MAX_TEMPERATURE_STEP, ColumnProblem, Stages
from .results import StageProfile

@dataclass(frozen=True)
class ColumnSpec:
    """The fixed quantities of one solve. N counts the reboiler; stages numbered from the top."""

    stages: int
    feed_stage: int
    reflux_ratio: float  # L0/D [-]
    distillate_flow: float  # mol/s
    top_pressure: float  # Pa
    pressure_drop_per_stage: float = 0.0  # Pa
    partial_condenser: bool = False
    subcooling: float = 0.0  # K

    @classmethod
    def from_column(cls, column: Column, stages: int, feed_stage: int, reflux_ratio: float,
                    distillate_flow: float) -> "ColumnSpec":
        """Spec from the case's column table and the design variables."""
        return cls(stages, feed_stage, reflux_ratio, distillate_flow, column.top_pressure,
                   column.pressure_drop_per_stage, column.condenser == "partial", column.subcooling)


def _check(spec: ColumnSpec, feed: FeedState) -> None:
    if spec.stages < 2:
        raise CaseError("stages", f"{spec.stages} equilibrium stages", "at least 2 (one stage and the reboiler)")
    if not 1 <= spec.feed_stage <= spec.stages:
        raise CaseError("feed_stage", f"feed stage {spec.feed_stage} with {spec.stages} stages",
                        f"1 to {spec.stages}, counted from the top")
    if spec.reflux_ratio <= 0.0:
        raise InfeasibleSpecError(f"reflux ratio {spec.reflux_ratio:.4g} is not positive; a rectifying column "
                                  "needs reflux")
    if not 0.0 < spec.distillate_flow < feed.molar_flow:
        raise InfeasibleSpecError(f"distillate flow {spec.distillate_flow:.6g} mol/s must lie between zero and "
                                  f"the feed flow {feed.molar_flow:.6g} mol/s")
    if spec.partial_condenser and spec.subcooling > 0.0:
        raise CaseError("subcooling", "a partial condenser has no subcooling", "0 K with a partial condenser")


def _problem(spec: ColumnSpec, feed: FeedState, energy: bool) -> ColumnProblem:
    pressures = (spec.top_pressure,) + tuple(spec.top_pressure + j * spec.pressure_drop_per_stage
                                             for j in range(spec.stages))
    return ColumnProblem(spec.stages, spec.feed_stage, spec.reflux_ratio, spec.distillate_flow,
                         feed.molar_flow, tuple(feed.z), feed.enthalpy, feed.q, pressures,
                         spec.partial_condenser, spec.subcooling, energy)


def _unknowns_from_profile(profile: StageProfile) -> np.ndarray:
    D, R = profile.distillate_flow, profile.reflux_ratio
    d = D * np.asarray(profile.distillate_composition)
    reflux = profile.V[0] * np.asarray(profile.y[0]) - d if profile.partial_condenser else R * d
    top = np.concatenate([reflux, d, [profile.condenser_temperature]])
    rows = [np.concatenate([L * np.asarray(x), V * np.asarray(y), [T]])
            for L, V, x, y, T in zip(profile.L, profile.V, profile.x, profile.y, profile.T)]
    return np.vstack([top] + rows)


def _profile(stages: Stages, U: np.ndarray, props: np.ndarray, feed: FeedState) -> StageProfile:
    p, C = stages.p, stages.C
    l, v = U[:, :C], U[:, C:2 * C]
    L, V = l.sum(axis=1), v.sum(axis=1)
    hL, hV = props[:, C], props[:, C + 1]
    if not p.energy:  # enthalpies of the converged CMO profile, for the duties
        m = stages.mixture
        hL = np.array([hL[0]] + [m.liquid_enthalpy(U[j, -1], p.pressures[j], l[j] / L[j]) for j in range(1, p.N + 1)])
        hV = np.array([hV[0]] + [m.vapour_enthalpy(U[j, -1], p.pressures[j], v[j] / V[j]) for j in range(1, p.N + 1)])
        if not p.partial_condenser:
            hL[0] = m.liquid_enthalpy(U[0, -1] - p.subcooling, p.pressures[0], v[0] / V[0])
        else:
            hL[0] = m.liquid_enthalpy(U[0, -1], p.pressures[0], l[0] / L[0])
            hV[0] = m.vapour_enthalpy(U[0, -1], p.pressures[0], v[0] / V[0])
    D = V[0]
    h_distillate = hV[0] if p.partial_condenser else hL[0]
    q_condenser = V[1] * hV[1] - L[0] * hL[0] - D * h_distillate
    B = L[-1]
    if p.energy:
        feed_in = feed.molar_flow * feed.enthalpy if p.feed_stage == p.N else 0.0
        q_reboiler = L[-1] * hL[-1] + V[-1] * hV[-1] - L[-2] * hL[-2] - feed_in
    else:  # overall balance, so that the CMO profile still closes its energy balance
        q_reboiler = D * h_distillate + B * hL[-1] + q_condenser - feed.molar_flow * feed.enthalpy
    x = l[1:] / L[1:, None]
    y = v[1:] / V[1:, None]
    return StageProfile(
        T=tuple(map(float, U[1:, -1])), P=tuple(map(float, p.pressures[1:])),
        L=tuple(map(float, L[1:])), V=tuple(map(float, V[1:])),
        x=tuple(tuple(map(float, row)) for row in x), y=tuple(tuple(map(float, row)) for row in y),
        feed_stage=p.feed_stage, reflux_ratio=p.reflux_ratio, distillate_flow=float(D), bottoms_flow=float(B),
        distillate_composition=tuple(map(float, v[0] / D)), bottoms_composition=tuple(map(float, x[-1])),
        condenser_duty=float(q_condenser), reboiler_duty=float(q_reboiler),
        condenser_temperature=float(U[0, -1] - (0.0 if p.partial_condenser else p.subcooling)),
        partial_condenser=p.partial_condenser, model="rigorous" if p.energy else "cmo")


def _resampled(U: np.ndarray, old_feed: int, spec: ColumnSpec) -> np.ndarray:
    """Stage rows of U stretched section by section onto spec's stage count and feed stage."""
    old_N = U.shape[0] - 1
    anchors_new, anchors_old = [1.0], [1.0]
    if 1 < spec.feed_stage < spec.stages and 1 < old_feed < old_N:
        anchors_new.append(float(spec.feed_stage))
        anchors_old.append(float(old_feed))
    anchors_new.append(float(spec.stages))
    anchors_old.append(float(old_N))
    where = np.interp(np.arange(1, spec.stages + 1), anchors_new, anchors_old)
    rows = np.array([np.interp(where, np.arange(1, old_N + 1), U[1:, k]) for k in range(U.shape[1])]).T
    return np.vstack([U[:1], rows])


@dataclass(frozen=True)
class PredictedStart:
    """A start extrapolated from a solved profile along measured sensitivities (an Euler predictor).

    Its unknowns are those of ``base`` plus, for each ``(moved, weight)``, ``weight`` times the
    difference between the unknowns of ``moved`` (the same column solved at a slightly different
    specification) and those of ``base``. A flow the extrapolation would make negative takes a
    tenth of its base value. Used where Newton on the specifications steps the reflux: near a
    pinch the base profile alone took a column solve up to 17 Newton steps.
    """

    base: StageProfile
    moves: tuple[tuple[StageProfile, float], ...]


def _predicted_unknowns(start: PredictedStart, spec: ColumnSpec) -> np.ndarray | None:
    """The extrapolated unknowns of ``start``, or None when its profiles do not fit ``spec``."""
    shaped = [start.base] + [moved for moved, _ in start.moves]
    if any(p.stages != spec.stages or p.feed_stage != spec.feed_stage
           or p.partial_condenser != spec.partial_condenser for p in shaped):
        return None
    base = _unknowns_from_profile(start.base)
    U = base.copy()
    for moved, weight in start.moves:
        U += weight * (_unknowns_from_profile(moved) - base)
    flows = U[:, :-1]
    flows[:] = np.where(flows > 0.0, flows, 0.1 * base[:, :-1])
    # the column's temperatures stay between its products' boiling points, which a step in R and D
    # hardly moves: an extrapolation far past the base column's range (methanol/water on Peng-Robinson
    # at 12 bar reached a negative temperature) is cut back to it, one Newton temperature step wide
    T = base[:, -1]
    U[:, -1] = np.clip(U[:, -1], T.min() - MAX_TEMPERATURE_STEP, T.max() + MAX_TEMPERATURE_STEP)
    return U


# Near a present component's critical pressure (top pressure above this share of the lowest), a cold start
# that fails is approached from lower pressures instead (see _from_lower_pressure).
NEAR_CRITICAL_PRESSURE = 0.6
CONTINUATION_PRESSURES = (0.85, 0.9, 0.95)  # shares of the top pressure the approach passes through


def _solve(mixture: Mixture, feed: FeedState, spec: ColumnSpec, energy: bool,
           guess: StageProfile | PredictedStart | None, deadline: float | None = None,
           continuation: bool = True) -> StageProfile:
    _check(spec, feed)
    stages = Stages(mixture, _problem(spec, feed, energy))
    if isinstance(guess, PredictedStart):
        U0 = _predicted_unknowns(guess, spec)
        if U0 is not None and len(guess.base.x[0]) == len(feed.z):
            if not guess.base.partial_condenser:
                U0[0, -1] += spec.subcooling
            try:
                U, props, _ = stages.solve(U0, deadline)
                return _profile(stages, U, props, feed)
            except ConvergenceError:
                pass  # the extrapolation went too far: start from the base profile itself
        guess = guess.base
    if guess is not None and len(guess.x[0]) == len(feed.z) and guess.partial_condenser == spec.partial_condenser:
        U0 = _unknowns_from_profile(guess)
        if not guess.partial_condenser:
            U0[0, -1] += spec.subcooling
        if guess.stages != spec.stages or guess.feed_stage != spec.feed_stage:
            U0 = _resampled(U0, guess.feed_stage, spec)
        try:
            U, props, _ = stages.solve(U0, deadline)
            return _profile(stages, U, props, feed)
        except ConvergenceError:
            pass  # a start too far from this spec: begin again from the CMO column
    try:
        U, props, _ = stages.solve(cmo_unknowns(mixture, _problem(spec, feed, energy=False)), deadline)
    except ConvergenceError:
        if not (continuation and _near_critical(mixture, feed, spec)):
            raise
        return _from_lower_pressure(mixture, feed, spec, energy, deadline)
    return _profile(stages, U, props, feed)


def _near_critical(mixture: Mixture, feed: FeedState, spec: ColumnSpec) -> bool:
    """Whether an equation of state's column runs above :data:`NEAR_CRITICAL_PRESSURE` of the lowest critical
    pressure of the components in the feed."""
    present = [pc for pc, z in zip(mixture.critical_pressures, feed.z) if z > 0.0]
    return not mixture.ideal_gas_vapour and spec.top_pressure > NEAR_CRITICAL_PRESSURE * min(present)


def _from_lower_pressure(mixture: Mixture, feed: FeedState, spec: ColumnSpec, energy: bool,
                         deadline: float | None) -> StageProfile:
    """The column solved cold at the first of :data:`CONTINUATION_PRESSURES` times its top pressure, then at
    each of the others and its own, every solve from the one before (the pressure drop per stage kept).

    Within a few kelvin of a component's critical temperature the constant-molar-overflow start can
    be too poor for the full equations: a methane/ethylene/ethane demethaniser at 36 to 39 bar (methane's
    critical pressure 46 bar) failed from it at every reflux `check` tried, and converged in about 1 s
    from the same column at 85 % of its pressure, raised in steps of 5 %.
    """
    profile = _solve(mixture, feed, replace(spec, top_pressure=CONTINUATION_PRESSURES[0] * spec.top_pressure),
                     energy, None, deadline, continuation=False)
    for share in CONTINUATION_PRESSURES[1:] + (1.0,):
        profile = _solve(mixture, feed, replace(spec, top_pressure=share * spec.top_pressure), energy, profile,
                         deadline, continuation=False)
    return profile


def solve_cmo(mixture: Mixture, feed: FeedState, spec: ColumnSpec,
              guess: StageProfile | PredictedStart | None = None, deadline: float | None = None) -> StageProfile:
    """Stage profile under constant molar overflow (no stage energy balances).

    Duties: condenser from its energy balance on the converged vapour, reboiler from the
    overall energy balance. ``guess`` (any earlier profile of the same mixture and
    condenser type; stretched onto this N and feed stage) warm-starts Newton, with a cold
    start if that fails.
    """
    return _solve(mixture, feed, spec, False, guess, deadline)


def solve_rigorous(mixture: Mixture, feed: FeedState, spec: ColumnSpec,
                   guess: StageProfile | PredictedStart | None = None, deadline: float | None = None) -> StageProfile:
    """Stage profile with energy balances on every stage (MESH equations).

    Starts from ``guess`` when given (as in :func:`solve_cmo`), else from the
    constant-molar-overflow solution of the same spec.
    """
    return _solve(mixture, feed, spec, True, guess, deadline)


def linearised_moves(mixture: Mixture, feed: FeedState, spec: ColumnSpec, energy: bool, profile: StageProfile,
                     moved_specs: tuple[ColumnSpec, ...]) -> tuple[StageProfile, ...]:
    """The converged ``profile`` of ``spec`` moved to each of ``moved_specs`` (the same column at a
    slightly different reflux ratio or distillate flow) along the stage equations' own sensitivities:
    U + dU with J dU = -(R(U; moved) - R(U; spec)), J the Jacobian at the solution (implicit function
    theorem), instead of solving each moved column.

    One Jacobian in place of a Newton solve per move. Measured on acetone/water's energy-balance
    minimum (46 stages, UNIFAC): the distillate-flow move took 48 to 49 Newton steps (2.3 s) each
    time it was solved, as a pinched column's response to D is poorly conditioned for a fresh
    solve; a linear response costs one Jacobian. Raises ConvergenceError where J is singular.
    """
    stages = Stages(mixture, _problem(spec, feed, energy))
    U = _unknowns_from_profile(profile)
    if not spec.partial_condenser:
        U[0, -1] += spec.subcooling
    props = stages.all_properties(U)
    R0 = stages.residuals(U, props)
    J = stages.jacobian(U, props, R0)
    moved = []
    for other in moved_specs:
        shifted = Stages(mixture, _problem(other, feed, energy))
        U1 = U + stages.linear_response(J, shifted.residuals(U, props) - R0)
        moved.append(_profile(shifted, U1, shifted.all_properties(U1), feed))
    return tuple(moved)

