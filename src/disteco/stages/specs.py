"""Distillate flow and reflux ratio that make a column of given size meet the key specifications.

For a fixed number of stages and feed stage the two end specifications of the case
(``case.Products``) are met by adjusting D and R: Newton's method on
(ln R, D), with the stage solution (CMO or energy balances) warm-started from the
previous one; the specifications' Jacobian from the column moved along the stage
equations' own sensitivities (``linearised_moves``), not from two more column solves.
The start comes from the shortcut design (its D, and R from Gilliland). The least reflux of a binary
with two product fractions (the energy-balance minimum) holds D at the mass balance and searches ln R.
"""

from __future__ import annotations

import math
import time
from dataclasses import replace

import numpy as np
from scipy.optimize import brentq

from .._base.errors import ConvergenceError, InfeasibleSpecError
from ..case import Column, EndSpec, Products
from ..properties import FeedState, Mixture
from .results import StageProfile
from .rigorous import ColumnSpec, PredictedStart, linearised_moves, solve_cmo, solve_rigorous
from .shortcut import ShortcutDesign

TOLERANCE = 1e-7  # on the log residuals of the specifications
MAX_ITERATIONS = 30
MAX_LOG_REFLUX_STEP = 0.5
DIFFERENCE = 1e-6  # step in ln R and in D / F of the specifications' Jacobian (columns moved linearly)
OVERSHOOT_FLOOR = 1e-3  # log residual within which a specification that changed sign is not past a pinch
FLOOR_RESOLUTION = 1e-5  # ln R: a column this close above a failed trial forgets that trial's floor


def spec_residuals(profile: StageProfile, products: Products, feed: FeedState) -> np.ndarray:
    """Log-mismatch of the two end specifications [-]; zero when both are met."""
    F, z = feed.molar_flow, np.asarray(feed.z)
    light, heavy = products.light_key, products.heavy_key
    d = profile.distillate_flow * np.asarray(profile.distillate_composition)
    b = profile.bottoms_flow * np.asarray(profile.bottoms_composition)
    return np.array([
        _residual(products.light_key_spec, b[light] / (F * z[light]), profile.bottoms_composition[light]),
        _residual(products.heavy_key_spec, d[heavy] / (F * z[heavy]), profile.distillate_composition[heavy]),
    ])


def _residual(spec: EndSpec, loss: float, fraction: float) -> float:
    """A recovery is met through the loss (1 - recovery), a fraction directly; both in logs."""
    if spec.kind == "recovery":
        return math.log(max(loss, 1e-300) / (1.0 - spec.value))
    return math.log(max(fraction, 1e-300) / spec.value)


def _overshot(r: np.ndarray, change: np.ndarray, new_r: np.ndarray) -> bool:
    """Whether a step whose linear model moves the residuals ``r`` by ``change`` crossed a residual's zero by
    more than that change: the step went past a pinch, where the impurity grows without bound on the
    other side (a 1 ppm benzene bottoms: predicted -13.8 -> -10.6, landed at +9.3, and Newton then
    crept back in ever smaller steps until its time limit); the step is halved instead.

    >>> _overshot(np.array([-13.8, -0.02]), np.array([3.2, 0.003]), np.array([9.3, 5.7]))
    True
    >>> _overshot(np.array([-1e-3, 1e-4]), np.array([1e-3, -1e-4]), np.array([1e-6, -1e-7]))
    False

    A residual that lands within :data:`OVERSHOOT_FLOOR` of zero has not crossed a pinch, whatever its
    sign: a demethaniser's methane recovery, met to 1e-7 while Newton moved the reflux and the distillate
    to meet the ethylene's, flipped to +5e-7 at each step, and each such step was refused as a crossing
    until the time limit.

    >>> _overshot(np.array([-1e-7, -6.4]), np.array([1e-7, 0.04]), np.array([5.6e-7, -6.36]))
    False
    """
    flipped = np.sign(new_r) != np.sign(r)
    return bool(np.any(flipped & (np.abs(new_r) > np.abs(change)) & (np.abs(new_r) > OVERSHOOT_FLOOR)))


def _within_floor(u: np.ndarray, step: np.ndarray, floor: float) -> np.ndarray:
    """``step`` from ``u`` (ln R, D), shortened to land halfway to ``floor`` where it would reach it.

    A trial below the current reflux that crossed a pinch or failed marks a floor the minimum lies
    above; later steps that would reach it bisect towards it instead (measured on a methanol/ethanol
    column's energy-balance minimum: Newton's steps went below such a trial twice, two column
    solves of 1.5 s wasted).

    >>> _within_floor(np.array([0.0, 1.0]), np.array([-0.1, 0.2]), -0.05).tolist()
    [-0.025, 0.05]
    >>> _within_floor(np.array([0.0, 1.0]), np.array([-0.01, 0.2]), -0.05).tolist()
    [-0.01, 0.2]
    """
    if u[0] + step[0] > floor or step[0] >= 0.0:
        return step
    return step * (0.5 * (floor - u[0]) / step[0])


def fixes_distillate(products: Products, feed: FeedState) -> bool:
    """Whether the specifications fix the distillate flow by the mass balance alone: a binary with both
    product fractions, D = F (z - x_B) / (x_D - x_B) (the shortcut design's distillate, ``product_split``)."""
    return len(feed.z) == 2 and products.light_key_spec.kind == products.heavy_key_spec.kind == "fraction"


def _least_reflux_at(run, predicted, in_time, log_r: float, distillate: float, start: StageProfile | None,
                     max_step: float, resolution: float, stages: int, feed_stage: int,
                     start_meets: bool = False) -> StageProfile:
    """The profile at the least reflux meeting both specifications with the distillate held where the mass
    balance fixes it (:func:`fixes_distillate`): one unknown, ln R, bracketed, then narrowed by false position.

    With D held there, the two residuals share their sign (a purer distillate leaves a purer bottoms
    by the mass balance), both falling as R rises: one monotone equation. Newton on (ln R, D) instead
    met the distillate's residual's insensitivity to D in an over-staged column and crept (a propylene
    splitter given R 13 on 190 stages: 30 iterations, 40 s, failed; benzene given R 4 on 100 stages:
    cut off at 100 s). Steps before a bracket are at most ``max_step`` in ln R; a column whose solve
    fails counts as missing (below a pinch). Each trial starts from ``predicted(profile, ln R, trial)``,
    the last solved column extrapolated to the trial's reflux. The search ends on |residual| <
    TOLERANCE, or with the meeting end once the bracket is narrower than ``resolution``; ``in_time()``
    raises once the time limit has passed.

    ``start_meets``: the starting reflux is known to meet both specifications (a design met them at
    it on fewer stages). Until some column has solved, a failed solve then steps down, not up: above
    a reflux that meets, a failure comes from too much reflux, not too little, and the step down
    doubles with each failure (acetone/water with a partial condenser, 76 stages: from R 13.3, the
    design's, every column failed to converge, 5 s each, and each failure stepped up, to R 27 and
    the time limit; stepping down, 13.3, 12.1 and 9.9 failed, R 6.6 solved and the minimum 7.006
    followed from warm starts, 17 s in all).
    """
    meets = misses = None  # (ln R, residual sum) of the least reflux meeting both, of the most missing
    last = None  # (ln R, profile) of the last column solved
    best, trial, met_before, down = None, log_r, None, max_step
    for _ in range(2 * MAX_ITERATIONS):
        in_time()  # outside the try below: the time limit is not a trial that missed
        guess = start if last is None else predicted(last[1], last[0], trial)
        try:
            profile, r = run(trial, distillate, guess)
            total = float(r.sum())
        except ConvergenceError:
            if start_meets and last is None:  # no column solved yet, all of them at or below a meeting reflux
                trial -= down
                down *= 2.0  # each failure costs a full Newton budget: the pinch's warm starts need one column
                continue
            profile, r, total = None, None, math.inf
        except InfeasibleSpecError:
            profile, r, total = None, None, math.inf
        if profile is not None and np.abs(r).max() < TOLERANCE:
            return profile
        met = profile is not None and bool(np.all(r <= 0.0))
        if met:
            meets, best = (trial, total), profile
        else:
            misses = (trial, total)
        if meets and misses and met == met_before:
            # the same end moved twice running: the Illinois step halves the other end's residual (a residual
            # curved near a pinch otherwise moves one end only, by ever smaller steps)
            if met:
                misses = (misses[0], 0.5 * misses[1])
            else:
                meets = (meets[0], 0.5 * meets[1])
        last = (trial, profile) if profile is not None else last
        if meets and misses and meets[0] - misses[0] < resolution:
            return best
        if meets and misses:
            # false position (Illinois), bisection beside a column that did not solve
            width = meets[0] - misses[0]
            weight = 0.5 if math.isinf(misses[1]) else meets[1] / (meets[1] - misses[1])
            trial = meets[0] - min(max(weight, 0.02), 0.98) * width
        else:
            trial += -max_step if meets else max_step
        met_before = met
    raise ConvergenceError(
        f"could not meet the key specifications with {stages} stages and feed on stage {feed_stage} at the "
        f"distillate of the mass balance ({distillate:.6g} mol/s)")


def gilliland_reflux(design: ShortcutDesign, stages: int) -> float:
    """Reflux ratio at which Gilliland's correlation gives ``stages`` [-]."""
    if stages <= design.minimum_stages + 1e-6:
        raise InfeasibleSpecError(
            f"{stages} equilibrium stages are not more than the minimum {design.minimum_stages:.2f} "
            "(Fenske, total reflux): no reflux ratio meets the specification; add stages")
    low = design.minimum_reflux * (1.0 + 1e-6)
    high = max(design.minimum_reflux * 1e3, 1e3)
    return brentq(lambda r: design.stages(r) - stages, low, high, xtol=1e-12, rtol=1e-12)


# Multiples of the starting reflux ratio a first column that did not converge is solved at instead; Newton
# then moves the reflux down to what the specifications need (common practice, no source).
FIRST_COLUMN_REFLUX_FACTORS = (1.5, 2.0, 3.0)


def _first_column(run, u: np.ndarray, start: StageProfile | None, retries: bool = True):
    """(profile, residuals, unknowns) of Newton's first column: at ``u`` (ln R, D), or where that column does
    not converge, at the first of :data:`FIRST_COLUMN_REFLUX_FACTORS` times its reflux that does.

    The first column starts from nothing near its solution. Acetone-water with a partial condenser at
    1.5 bar (0.98 acetone in the vapour, near the 0.9945 azeotrope) needs R 8.27 on 47 stages; its first
    column at the 1.3 x minimum row's R 5.005 converged or not by a last-bit change of the equilibrium
    curve it was stepped on (5.6e-16 in y), and `check` exited 2 where it did not.
    """
    try:
        return (*run(u[0], u[1], start), u)
    except ConvergenceError as failure:
        for factor in FIRST_COLUMN_REFLUX_FACTORS if retries else ():
            higher = u + np.array([math.log(factor), 0.0])
            try:
                return (*run(higher[0], higher[1], start), higher)
            except ConvergenceError:
                continue
        raise failure


def solve_to_specs(mixture: Mixture, feed: FeedState, products: Products, column: Column,
                   design: ShortcutDesign, stages: int, feed_stage: int, energy: bool = True,
                   start_reflux: float | None = None, start: StageProfile | None = None,
                   pressure_drop_per_stage: float | None = None,
                   max_log_reflux_step: float = MAX_LOG_REFLUX_STEP,
                   time_limit: float | None = None, reflux_resolution: float | None = None,
                   start_meets: bool = False, first_retries: bool = True) -> StageProfile:
    """Profile of a column with ``stages`` and ``feed_stage`` that meets both key specifications.

    ``energy`` chooses the stage model (energy balances, or constant molar overflow);
    ``start_reflux`` replaces the Gilliland estimate of R as the starting point.
    ``start``: an earlier profile of the same mixture (any stage count): Newton starts from
    its D (and its R unless ``start_reflux`` is given), and the first solve is warm-started
    from it. ``pressure_drop_per_stage`` [Pa] replaces the column's; ``max_log_reflux_step``
    caps each Newton step in ln R (small steps keep warm starts good near a pinch);
    ``time_limit`` [s] ends the Newton iterations with ConvergenceError once exceeded (checked
    before each column solve). ``reflux_resolution`` [-]: where given, a column that meets both
    specifications with room to spare ends the iterations once Newton's next step in ln R is
    smaller than this (near a pinch a ppm specification's residual jumps by several units over
    1e-5 in ln R, and the tolerance on the residuals cannot be reached; the reflux ratio is then
    known to that resolution); with it, ``start_meets`` says the starting reflux meets both
    specifications on these stages (see :func:`_least_reflux_at`). ``first_retries``: a first column
    that does not converge is tried again at more reflux (:func:`_first_column`); off where the caller
    has another start to fall back on.
    Raises InfeasibleSpecError when the stages are too few, ConvergenceError when Newton
    fails (usually: too close to the minimum number of stages).
    """
    solve = solve_rigorous if energy else solve_cmo
    F = feed.molar_flow
    began = time.monotonic()

    def run(log_r: float, D: float, guess: StageProfile | None):
        # checked before every column solve, not only between Newton steps: one step of a
        # 278-stage column (two Jacobian solves and a line search) took longer than the limit
        in_time()
        profile = solve(mixture, feed, column_spec(log_r, D), guess,
                        None if time_limit is None else began + time_limit)
        return profile, spec_residuals(profile, products, feed)

    def in_time():
        if time_limit is not None and time.monotonic() - began > time_limit:
            raise ConvergenceError(f"time limit of {time_limit:g} s passed")

    def column_spec(log_r: float, D: float) -> ColumnSpec:
        spec = ColumnSpec.from_column(column, stages, feed_stage, math.exp(log_r), D)
        if pressure_drop_per_stage is not None:
            spec = replace(spec, pressure_drop_per_stage=pressure_drop_per_stage)
        return spec

    if start_reflux is not None:
        reflux = start_reflux
    else:
        reflux = start.reflux_ratio if start is not None else gilliland_reflux(design, stages)
    if reflux_resolution is not None and fixes_distillate(products, feed):
        held = design.distillate_flow
        def predicted(profile: StageProfile, log_r: float, new_log_r: float):
            # the column extrapolated along its own sensitivity to ln R (as Newton's trials below)
            try:
                moved, = linearised_moves(mixture, feed, column_spec(log_r, held), energy, profile,
                                          (column_spec(log_r + DIFFERENCE, held),))
            except ConvergenceError:
                return profile
            return PredictedStart(profile, ((moved, (new_log_r - log_r) / DIFFERENCE),))

        return _least_reflux_at(run, predicted, in_time, math.log(reflux), held, start, max_log_reflux_step,
                                reflux_resolution, stages, feed_stage, start_meets)
    u = np.array([math.log(reflux), start.distillate_flow if start is not None else design.distillate_flow])
    profile, r, u = _first_column(run, u, start, first_retries)
    floor = -math.inf  # ln R of a trial below the current one that crossed a pinch or failed
    for _ in range(MAX_ITERATIONS):
        if np.abs(r).max() < TOLERANCE:
            return profile
        in_time()
        J = np.empty((2, 2))
        moved = []
        differences = (DIFFERENCE, DIFFERENCE * F)
        moved_specs = tuple(column_spec(*(u + h * unit)) for h, unit in zip(differences, np.eye(2)))
        for k, (h, moved_profile) in enumerate(zip(differences, linearised_moves(
                mixture, feed, column_spec(*u), energy, profile, moved_specs))):
            J[:, k] = (spec_residuals(moved_profile, products, feed) - r) / h
            moved.append((moved_profile, h))
        step = np.linalg.solve(J, -r)
        if reflux_resolution is not None and abs(step[0]) < reflux_resolution and np.all(r <= 0.0):
            return profile
        step *= min(1.0, max_log_reflux_step / max(abs(step[0]), 1e-30))
        if u[0] - floor < FLOOR_RESOLUTION:
            floor = -math.inf  # crept up to it: the failure there was not the pinch after all
        for _ in range(12):
            step = _within_floor(u, step, floor)
            trial = u + step
            if 0.0 < trial[1] < F:
                # the trial column starts from the profile extrapolated along the Jacobian's own
                # columns (measured: ethanol-water's energy-balance minimum, 22 column solves, took
                # 10.9 s from the last profile, 2.4 s from the extrapolated one)
                predicted = PredictedStart(profile, tuple((p, s / h) for (p, h), s in zip(moved, step)))
                in_time()  # raised here, not taken for a failed trial below
                try:
                    new_profile, new_r = run(trial[0], trial[1], predicted)
                    crossed = _overshot(r, J @ step, new_r)
                    if np.abs(new_r).max() < np.abs(r).max() and not crossed:
                        break
                except (ConvergenceError, InfeasibleSpecError):
                    crossed = True
                if crossed and step[0] < 0.0:
                    floor = max(floor, trial[0])
            step *= 0.5
        else:
            break
        u, profile, r = trial, new_profile, new_r
    raise ConvergenceError(
        f"could not meet the key specifications with {stages} stages and feed on stage {feed_stage} "
        f"(remaining log-mismatch {np.abs(r).max():.3g}); add stages or move the feed stage")
