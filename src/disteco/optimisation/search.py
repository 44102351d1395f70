"""Discrete steepest descent over (stages, feed stage), each configuration an NLP in (R, D).

From the shortcut's configuration the search evaluates the eight neighbours
(N +- 1, NF +- 1 and combinations), moves to the best one if it lowers the TAC and keeps
going in that direction while the TAC keeps falling (a line search), then looks at the
neighbours again. It stops at a configuration none of whose neighbours is cheaper: a
local optimum in the discrete sense of logic-based discrete steepest descent (Bernal et
al., 2018). Each configuration starts from the solved profile of the nearest configuration
already solved, mapped onto its stages, and from its own constant-molar-overflow profile
only when that start fails; its TAC depends on the order of visits only within the solver's
tolerance. Configurations that do not depend on each other (the neighbours) are solved as
one batch, side by side in worker processes when there are cores for them.

References
----------
1. Bernal, D.E., Ovalle, D., Liñán, D.A., Ricardez-Sandoval, L.A., Gómez, J.M., Grossmann,
   I.E. "Process superstructure optimization through discrete steepest descent optimization:
   a GDP analysis and applications in process intensification", Computer Aided Chemical
   Engineering 49, 1279-1284 (2022).
"""

from __future__ import annotations

import math
import multiprocessing
import os
import time
from concurrent.futures import ProcessPoolExecutor
from contextlib import contextmanager
from dataclasses import dataclass, field

import numpy as np
import pyomo.environ as pyo

from .._base.cores import usable_cores
from .._base.errors import ConvergenceError, InfeasibleSpecError, SearchTimeLimitError, SolverError, \
    UtilityTemperatureError
from .given import check_stage_bound
from .problem import default_max_stages
from .basis import CostBasis, SeparationProblem, check_problem
from .options import barrier_order, first_strategy, model_options
from .results import OptimumDesign, SearchStep, SolverReport
from .start import Profile, Shortcut, feed_stage_of, moved_profile, shortcut, stage_floor, starting_configuration
from .solve import certify, configuration_design, size_factor, solved_model


DIRECTIONS = tuple((dn, df) for dn in (-1, 0, 1) for df in (-1, 0, 1) if (dn, df) != (0, 0))
IMPROVEMENT = 1e-7  # relative TAC drop that counts as a move


@dataclass
class Evaluator:
    """Solves configurations once each and remembers the outcome.

    With ``warm_starts`` a configuration starts from the solved profile of the nearest
    configuration already solved (:func:`moved_profile`), and from its own constant-molar-
    overflow profile only if that fails (measured, see DEVELOPERS.md: fewer iterations and no
    start profile to build). The enumeration turns them off, so that it stays a reference
    independent of the order of visits.
    """

    problem: SeparationProblem
    basis: CostBasis
    config: object
    deadline: float
    designs: dict = field(default_factory=dict)
    steps: list = field(default_factory=list)
    failures: dict = field(default_factory=dict)  # (N, NF) -> why the solve failed (not infeasibility)
    profiles: dict = field(default_factory=dict)  # (N, NF) -> its solved profile, to restart it from
    evaluations: dict = field(default_factory=dict)  # (N, NF) -> its lowest-TAC DesignEvaluation
    strategies: tuple = ()  # barrier strategies, the one that last worked first
    warm_starts: bool = True
    pool: object | None = None  # an executor whose workers solve the configurations of a batch
    held: tuple | None = None  # (why, level, service) of a configuration held short by a utility's temperature
    held_stops_from: float = math.inf  # stages from which such a configuration stops a search without a design

    low: int = 3

    def allowed(self, stages: int, feed_stage: int) -> bool:
        return self.low <= stages <= self.config.max_stages and 2 <= feed_stage <= stages - 1

    def tac(self, stages: int, feed_stage: int) -> float:
        """TAC of a configuration [currency/yr]; infinity when it has no feasible design."""
        return self.tac_all([(stages, feed_stage)])[(stages, feed_stage)]

    def tac_all(self, keys) -> dict[tuple[int, int], float]:
        """TAC of each configuration in ``keys`` [currency/yr], those not yet solved solved as one batch.

        Every configuration of a batch starts from the profiles and barrier strategies known
        before the batch, so a batch gives the same results whether its solves run one after
        the other or side by side in the ``pool``'s worker processes.
        """
        todo = [key for key in dict.fromkeys(keys) if key not in self.designs]
        if todo:
            limit = self._limit(max(n for n, _ in todo))
            values, strategies = self.config.value(), self.strategies or None
            jobs = [(self.problem, self.basis, values, n, f, self._start(n, f), limit, strategies) for n, f in todo]
            outcomes = self.pool.map(solve_job, jobs) if self.pool is not None and len(jobs) > 1 \
                else map(solve_job, jobs)
            for key, outcome in zip(todo, list(outcomes)):
                self.designs[key] = self._record(key, outcome)
        return {key: self.designs[key] for key in keys}

    def seed(self, designs) -> None:
        """Take ``designs`` (DesignEvaluation, solved on this problem and basis) as solved configurations."""
        for design in designs:
            key = (design.stages, design.feed_stage)
            self.designs[key], self.evaluations[key] = design.tac, design
            self.profiles[key] = start_of(design)

    def _start(self, stages: int, feed_stage: int) -> Profile | None:
        near = self.nearest(stages, feed_stage) if self.warm_starts else None
        return None if near is None else moved_profile(self.profiles[near], near[1], stages, feed_stage)

    def _record(self, key: tuple[int, int], outcome) -> float:
        """Record a solve's outcome (see :func:`solve_job`); return the configuration's TAC."""
        kind, found = outcome
        if kind == "held":
            self.held, found = self.held or found, found[0]
            if self.best() is None and key[0] >= self.held_stops_from:
                # with stages to spare, the product's own condensing (boiling) temperature is out of the
                # utility's reach: no other stages or feed stage can help, so the search stops here (a
                # demethaniser on a level 3 K too warm tried 32 configurations in 45 s to say the same); a
                # column short of stages may over-purify one product towards the bound to meet the other
                self.steps.append(SearchStep(*key, None, found))
                raise UtilityHeld
        if kind in ("infeasible", "held"):
            self.steps.append(SearchStep(*key, None, found))
            return float("inf")
        if kind == "failed":
            # Not scored as infeasible: recorded so the result can say the neighbourhood is incomplete.
            # The search cannot price it, so it moves on as if it were dearer than any design.
            reason = f"did not solve: {found}"
            self.failures[key] = reason
            self.steps.append(SearchStep(*key, None, reason))
            return float("inf")
        design, profile = found
        report = design.solver
        self.steps.append(SearchStep(*key, design.tac, report.status))
        self.profiles[key], self.evaluations[key] = profile, design
        if report.barrier:
            self.strategies = first_strategy(report.barrier, self.strategies
                                             or barrier_order(self.config, len(self.problem.z)))
        return design.tac

    def _limit(self, stages: int) -> float:
        remaining = self.deadline - time.perf_counter()
        if remaining <= 0.0:
            raise TimeoutError
        return min(remaining, self.config.configuration_time_limit * size_factor(self.problem, stages))

    def nearest(self, stages: int, feed_stage: int) -> tuple[int, int] | None:
        """The solved configuration closest to (N, NF): fewest stage and feed moves, stage moves first."""
        if not self.profiles:
            return None
        return min(self.profiles, key=lambda k: (abs(k[0] - stages) + abs(k[1] - feed_stage), abs(k[0] - stages)))

    def neighbours(self, stages: int, feed_stage: int) -> list[tuple[int, int]]:
        """The configurations next to (N, NF) within the stage range."""
        return [(stages + dn, feed_stage + df) for dn, df in DIRECTIONS if self.allowed(stages + dn, feed_stage + df)]

    def unsolved(self) -> tuple[SearchStep, ...]:
        """The configurations whose solve failed, in the order tried."""
        return tuple(SearchStep(n, f, None, why) for (n, f), why in self.failures.items())

    def best(self) -> tuple[int, int] | None:
        """The cheapest feasible configuration seen."""
        feasible = {k: v for k, v in self.designs.items() if v < float("inf")}
        return min(feasible, key=feasible.get) if feasible else None

    def unsolvable(self, stages: int, feed_stage: int, failure: Exception) -> None:
        """Count a configuration solved before as unsolved after all (its final solve failed)."""
        reason = f"did not solve again: {type(failure).__name__}: {failure}"
        self.designs[(stages, feed_stage)] = float("inf")
        self.failures[(stages, feed_stage)] = reason
        self.steps.append(SearchStep(stages, feed_stage, None, reason))


HELD_STAGES = 2.0  # multiple of the minimum stages from which a held configuration stops the search


class UtilityHeld(Exception):
    """Stops a search whose first configurations are held short of the specifications by a utility's temperature."""


def solve_job(job) -> tuple[str, object]:
    """Solve one configuration (in a worker process or not): ("ok", (design, profile)), ("infeasible",
    why), ("held", (why, level, service)) for a shortfall a utility's temperature holds, or ("failed", why).

    From the given start first when there is one (a solved neighbour's profile), then from the
    configuration's own start if that fails: a start can mislead a nonconvex solve.
    """
    problem, basis, values, stages, feed_stage, start, limit, strategies = job
    config = model_options(values)
    full = config.configuration_time_limit * size_factor(problem, stages) if limit is None else limit
    # A neighbour's start gets the quick limit only: a try from it either converges quickly or
    # stalls, and the configuration's own start behind it is the surer one (measured on the
    # 25-bar deethaniser: from neighbours' starts 9 of 15 tries stalled for 4-5 s each, from its
    # own start 13 of 15 solved in 0.4-1.6 s).
    quick = min(full, config.quick_time_limit * size_factor(problem, stages))
    for begin, budget in (((start, quick), (None, full)) if start is not None else ((None, full),)):
        try:
            return "ok", configuration_design(problem, basis, stages, feed_stage, config, time_limit=budget,
                                              strategies=strategies, start=begin)
        except UtilityTemperatureError as exc:
            outcome = "held", (f"{type(exc).__name__}: {exc}", exc.level, exc.service)
        except InfeasibleSpecError as exc:
            outcome = "infeasible", f"{type(exc).__name__}: {exc}"
        except (SolverError, ConvergenceError) as exc:
            outcome = "failed", f"{type(exc).__name__}: {exc}"
    return outcome


MAX_WORKERS = 4  # the default's cap: a neighbourhood holds 8 configurations, a line search 1


def free_cores() -> int:
    """Cores not busy with other work, at least one: the usable cores less the processes ready to run now
    besides this one (:func:`runnable_others`), else less the one-minute load average with this process's
    own share counted back.

    The load average lags a minute: after a design it still counts that design's own work, and the next
    design searched with one worker on an idle machine (a five-component LPG splitter 45 s against 40 s
    with two; DEVELOPERS.md, Speed).
    """
    others = runnable_others()
    if others is not None:
        return max(1, usable_cores() - others)
    try:
        load = os.getloadavg()[0]
    except (AttributeError, OSError):  # not on every platform
        load = 0.0
    return max(1, usable_cores() - round(load) + 1)


LOADAVG = "/proc/loadavg"
SNAPSHOTS = 5  # reads of the run queue; the least counts, so that a passing process is not taken for load


def runnable_others() -> int | None:
    """Processes ready to run now besides this one: the least of a few reads of the run queue in
    ``/proc/loadavg`` (its fourth field, running/all); None where there is no such file."""
    try:
        counts = []
        for _ in range(SNAPSHOTS):
            with open(LOADAVG, encoding="ascii") as stream:
                counts.append(int(stream.read().split()[3].split("/")[0]))
    except (OSError, ValueError, IndexError):
        return None
    return max(0, min(counts) - 1)


@contextmanager
def worker_pool(config):
    """Worker processes for the batches of an :class:`Evaluator`, or None for one worker.

    By default as many as there are free cores (at most :data:`MAX_WORKERS`): on a busy
    machine the workers only add their overhead (measured: the benzene example at a load of
    4 on 2 cores, 8.6 and 8.8 s wall with 2 workers against 7.8 and 9.0 s with one, and 25 %
    more CPU). Forked where the platform allows it (the workers inherit the imported modules
    and the problem), else started afresh.
    """
    workers = config.workers if config.workers is not None else min(free_cores(), MAX_WORKERS)
    if workers <= 1:
        yield None
        return
    methods = multiprocessing.get_all_start_methods()
    context = multiprocessing.get_context("fork" if "fork" in methods else None)
    with ProcessPoolExecutor(max_workers=workers, mp_context=context) as pool:
        yield pool


def start_of(design) -> Profile:
    """A solved design's stage profile as a start :class:`Profile` for the model."""
    p = design.profile
    return Profile(p.reflux_ratio, p.distillate_flow, np.array(p.T), np.array(p.x), np.array(p.y), np.array(p.L),
                   np.array(p.V))


def line_minimum(value, start: int, low: int, high: int, batch=None) -> int:
    """Integer minimiser of ``value`` on [low, high] near ``start``: doubling steps downhill, then ternary.

    ``value`` may return infinity (no feasible design). Along the lines searched here the
    TAC is close to unimodal; the neighbourhood descent that follows corrects small departures.
    ``batch(points)``, where given, evaluates several points as one batch (side by side where
    workers are free) before ``value`` reads them: the two first steps, the two points of each
    ternary step and the last bracket, all needed whatever their values, at the cost of at most
    one point the first step may not need (measured on the benzene example: the stage line
    search's nine solves in six batches instead of nine one after the other).
    """
    batch = batch or (lambda points: [value(n) for n in points])
    batch([n for n in (start, start + 1, start - 1) if low <= n <= high])
    here = value(start)
    if start < high and value(start + 1) < here:
        direction = 1
    elif start > low and value(start - 1) < here:
        direction = -1
    else:
        return start
    behind, best, step = start, start, 1
    while True:
        ahead = min(max(best + direction * step, low), high)
        if ahead == best or value(ahead) >= value(best):
            break
        behind, best, step = best, ahead, 2 * step
    left, right = sorted((behind, ahead))
    while right - left > 2:
        one, two = left + (right - left) // 3, right - (right - left) // 3
        batch([one, two])
        if value(one) <= value(two):
            right = two
        else:
            left = one
    batch(list(range(left, right + 1)))
    return min(range(left, right + 1), key=value)


def stage_search(evaluator: Evaluator, stages: int, feed_of) -> tuple[int, int]:
    """Best stage count with the feed stage tied to it by ``feed_of``."""
    def value(n: int) -> float:
        return evaluator.tac(n, feed_of(n))

    def batch(points) -> None:
        evaluator.tac_all([(n, feed_of(n)) for n in points if evaluator.allowed(n, feed_of(n))])

    best = line_minimum(value, stages, evaluator.low, evaluator.config.max_stages, batch)
    return best, feed_of(best)


def feed_search(evaluator: Evaluator, stages: int, feed: int) -> int:
    """Best feed stage for ``stages``, starting from ``feed``."""
    return line_minimum(lambda f: evaluator.tac(stages, f), feed, 2, stages - 1,
                        lambda points: evaluator.tac_all([(stages, f) for f in points]))


FEED_TRIALS = (0.25, 0.5, 0.75)  # fractions of the column tried when Kirkbride's feed stage fails


def first_feasible(evaluator: Evaluator, stages: int, kirkbride_feed: int) -> tuple[int, int]:
    """A feasible configuration from the start: Kirkbride's feed stage, else a few others, else more stages.

    Fenske's minimum and Kirkbride's ratio from the feed's volatility can be far off for a
    non-ideal mixture whose volatility collapses towards an azeotrope (ethanol-water: the
    best feed stage lies near the bottom, Kirkbride puts it near the top).
    """
    step = 1
    while True:
        feeds = [kirkbride_feed] + [min(max(round(f * stages), 2), stages - 1) for f in FEED_TRIALS]
        values = evaluator.tac_all([(stages, feed) for feed in dict.fromkeys(feeds) if evaluator.allowed(stages, feed)])
        values = {feed: v for (_, feed), v in values.items()}
        feasible = {feed: v for feed, v in values.items() if v < float("inf")}
        if feasible or stages >= evaluator.config.max_stages:
            return stages, min(feasible, key=feasible.get) if feasible else kirkbride_feed
        stages = min(stages + step, evaluator.config.max_stages)
        kirkbride_feed = min(kirkbride_feed, stages - 1)
        step *= 2


def descend(evaluator: Evaluator, start: tuple[int, int]) -> tuple[int, int]:
    """Discrete steepest descent with line search from ``start``; returns the local optimum."""
    current = start
    value = evaluator.tac(*current)
    while True:
        moves = evaluator.neighbours(*current)
        values = evaluator.tac_all(moves)
        best = min(values, key=values.get) if values else current
        if not values or values[best] >= value * (1.0 - IMPROVEMENT) or values[best] == float("inf"):
            if value < float("inf"):
                return current
            # start infeasible and no feasible neighbour: step towards more stages
            if not evaluator.allowed(current[0] + 1, current[1]):
                return current
            best = (current[0] + 1, current[1])
            values[best] = evaluator.tac(*best)
        direction = (best[0] - current[0], best[1] - current[1])
        current, value = best, values[best]
        while True:
            ahead = (current[0] + direction[0], current[1] + direction[1])
            if not evaluator.allowed(*ahead) or evaluator.tac(*ahead) >= value * (1.0 - IMPROVEMENT):
                break
            current, value = ahead, evaluator.tac(*ahead)


def _search_status(evaluator: Evaluator, chosen: tuple[int, int], neighbours: list, missing: list,
                   timed_out: bool, config) -> tuple[str, str, tuple[str, ...]]:
    """(status, termination or "" for the chosen NLP's, warnings) of a finished or stopped search.

    "locally optimal" only when every neighbour of the chosen configuration was solved; a
    search stopped by its time limit says so in both status and termination.
    """
    where = f"N={chosen[0]} NF={chosen[1]}"
    failed = [n for n in missing if n in evaluator.failures]
    named = "; ".join(f"N={n} NF={f}: {evaluator.failures[(n, f)]}" for n, f in failed[:3])
    warnings = ()
    if failed:
        warnings += (f"{len(failed)} of the {len(neighbours)} neighbours of the chosen configuration ({where}) did "
                     f"not solve ({named}{'; ...' if len(failed) > 3 else ''}); they were not counted as "
                     "infeasible, and the design is the best found, not shown to be a local optimum",)
    if timed_out:
        feasible = sum(1 for v in evaluator.designs.values() if v < float("inf"))
        warnings += (f"the search was stopped by its time limit of {config.time_limit:g} s after "
                     f"{len(evaluator.designs)} configurations ({feasible} feasible); the design is the best "
                     f"of those ({where}), and {len(missing)} of its {len(neighbours)} neighbours were not solved: "
                     "raise the time limit for a local optimum",)
        return f"time limit; {len(missing)} of {len(neighbours)} neighbours not solved", "maxTimeLimit", warnings
    if missing:
        return f"best found; {len(missing)} of {len(neighbours)} neighbours did not solve", "", warnings
    return "locally optimal (discrete neighbourhood)", "", warnings


def _nothing_found(evaluator: Evaluator, estimate: Shortcut, config, timed_out: bool) -> Exception:
    """The error when no configuration gave a design: time, solver failures or infeasibility."""
    tried = "; ".join(f"N={s.stages} NF={s.feed_stage}: {s.status}" for s in evaluator.steps[:4])
    if evaluator.held is not None:
        why, level, service = evaluator.held
        return UtilityTemperatureError(why.removeprefix(f"{UtilityTemperatureError.__name__}: "), level, service)
    if timed_out:
        return SearchTimeLimitError(
            "time_limit", f"the search's time limit of {config.time_limit:g} s passed before any configuration gave "
            f"a design ({tried})", "a longer limit, e.g. several times the time one configuration takes")
    if evaluator.failures and len(evaluator.failures) == len(evaluator.designs):
        return SolverError(f"the solver failed on every configuration tried ({len(evaluator.failures)}); "
                           f"none was shown infeasible ({tried})")
    failed = f"; {len(evaluator.failures)} of the {len(evaluator.designs)} tried did not solve" \
        if evaluator.failures else ""
    return InfeasibleSpecError(
        f"no column with {config.min_stages} to {config.max_stages} stages meets the product specifications "
        f"(minimum stages about {estimate.minimum_stages:.1f}, {estimate.method}){failed}; tried {tried}")


def final_model(evaluator: Evaluator, chosen: tuple[int, int]):
    """The chosen configuration's model solved again from its own profile (for the certifying solver)."""
    problem, basis, config = evaluator.problem, evaluator.basis, evaluator.config
    return solved_model(problem, basis, *chosen, config, start=evaluator.profiles[chosen],
                        strategies=evaluator.strategies or None)


def optimise(problem: SeparationProblem, basis: CostBasis, options=None,
             start: tuple[int, int] | None = None, starts=()) -> OptimumDesign:
    """Lowest-TAC design: discrete descent over (N, NF), NLP in (R, D) for each configuration.

    ``start`` (stages, feed stage): descend from this configuration (a previous optimum)
    instead of the shortcut's start and its line searches. ``starts``: designs solved before
    (a previous round's, on other constants) whose profiles start the configurations nearest
    them; their TACs are not taken.

    Raises :class:`InfeasibleSpecError` when no configuration in the stage range meets the
    specifications and :class:`SolverError` when the time limit passes before any design is
    found; a time-out after a design was found returns that design with status "time limit".
    """
    config = model_options(options)
    check_problem(problem)
    estimate = shortcut(problem)
    if config.max_stages is None:
        config.max_stages = default_max_stages(estimate.minimum_stages)
    check_stage_bound(estimate, config.max_stages)
    clock = time.perf_counter()
    timed_out = False
    with worker_pool(config) as pool:
        evaluator = Evaluator(problem, basis, config, clock + config.time_limit, low=stage_floor(estimate, config),
                              pool=pool, held_stops_from=HELD_STAGES * estimate.minimum_stages)
        evaluator.profiles.update({(d.stages, d.feed_stage): start_of(d) for d in starts})
        try:
            if start is not None and evaluator.allowed(*start):
                # along the stage count first, the feed in proportion: a round whose constants moved its
                # optimum far (an NGL debutaniser, 23 -> 33 stages) walked there one stage per solve
                ratio = (start[1] - 1) / (start[0] - start[1] + 1)
                descend(evaluator, stage_search(evaluator, start[0], lambda n: feed_stage_of(n, ratio)))
            else:
                stages, feed = first_feasible(evaluator, *starting_configuration(problem, estimate, config))
                feed = feed_search(evaluator, stages, feed)
                ratio = (feed - 1) / (stages - feed + 1)  # the best feed stage found recalibrates Kirkbride's ratio
                descend(evaluator, stage_search(evaluator, stages, lambda n: feed_stage_of(n, ratio)))
        except TimeoutError:
            timed_out = True
        except UtilityHeld:
            pass
        evaluator.pool = None  # closed with the block
    chosen = evaluator.best()
    if chosen is None:
        raise _nothing_found(evaluator, estimate, config, timed_out)
    best = evaluator.evaluations[chosen]  # read back when solved: no second solve
    gap, message = None, ""
    if config.certify:
        model, _ = final_model(evaluator, chosen)
        bound = certify(model, config, pyo.value(model.objective))
        gap = bound.gap
        message = (f"{bound.solver} on the best configuration: {bound.status}, gap "
                   f"{'unknown' if gap is None else f'{100 * gap:.3g} %'} after {bound.wall_time:.1f} s")
    wall = time.perf_counter() - clock
    neighbours = evaluator.neighbours(*chosen)
    missing = [n for n in neighbours if n in evaluator.failures or n not in evaluator.designs]
    status, termination, warnings = _search_status(evaluator, chosen, neighbours, missing, timed_out, config)
    report = SolverReport(config.solver, status, termination or best.solver.termination, gap, wall,
                          len(evaluator.designs), message, unsolved=evaluator.unsolved(),
                          neighbours=len(neighbours), neighbours_unsolved=len(missing))
    # A bound the optimum sits on is reported in its headline (OptimumDesign.limits), not as a warning.
    return OptimumDesign(best, estimate.minimum_reflux, estimate.minimum_stages, report,
                         tuple(evaluator.steps), best.warnings + warnings, stage_bound=config.max_stages,
                         reflux_range=(config.reflux_min, config.reflux_max), minima_method=estimate.method,
                         solved=tuple(evaluator.evaluations.values()))
