"""Discrete steepest descent over (stages, feed stage), each configuration an NLP in (R, D).

From the shortcut's configuration the search evaluates the eight neighbours
(N +- 1, NF +- 1 and combinations), moves to the best one if it lowers the TAC and keeps
going in that direction while the TAC keeps falling (a line search), then looks at the
neighbours again. It stops at a configuration none of whose neighbours is cheaper: a
local optimum in the discrete sense of logic-based discrete steepest descent (Bernal et
al., 2018). Each configuration is solved from its own start profile, so a configuration's
TAC does not depend on the order of visits.

References
----------
1. Bernal, D.E., Ovalle, D., Liñán, D.A., Ricardez-Sandoval, L.A., Gómez, J.M., Grossmann,
   I.E. "Process superstructure optimization through discrete steepest descent optimization:
   a GDP analysis and applications in process intensification", Computer Aided Chemical
   Engineering 49, 1279-1284 (2022).
"""

from __future__ import annotations

import math
import time
from dataclasses import dataclass, field

import pyomo.environ as pyo

from .._base.errors import ConvergenceError, InfeasibleSpecError, SolverError
from ..stages.correlations import kirkbride_feed_stage, kirkbride_ratio
from .given import check_stage_bound
from .basis import CostBasis, SeparationProblem, check_problem
from .options import first_strategy, model_options
from .results import OptimumDesign, SearchStep, SolverReport
from .start import Shortcut, shortcut
from .solve import certify, configuration_tac, read_design, solved_model

# The search's stage bound when none is given: the optimum usually lies near 2-2.5 x the
# Fenske minimum, so 4.5 x leaves room on the expensive-energy side (common practice, no
# source); never below the 60 stages that were the fixed bound before, so small columns keep
# the room they had.
STAGE_BOUND_FACTOR = 4.5
STAGE_BOUND_FLOOR = 60

DIRECTIONS = tuple((dn, df) for dn in (-1, 0, 1) for df in (-1, 0, 1) if (dn, df) != (0, 0))
IMPROVEMENT = 1e-7  # relative TAC drop that counts as a move


@dataclass
class Evaluator:
    """Solves configurations once each and remembers the outcome."""

    problem: SeparationProblem
    basis: CostBasis
    config: object
    deadline: float
    designs: dict = field(default_factory=dict)
    steps: list = field(default_factory=list)
    failures: dict = field(default_factory=dict)  # (N, NF) -> why the solve failed (not infeasibility)
    profiles: dict = field(default_factory=dict)  # (N, NF) -> its solved profile, to restart it from
    strategies: tuple = ()  # barrier strategies, the one that last worked first

    low: int = 3

    def allowed(self, stages: int, feed_stage: int) -> bool:
        return self.low <= stages <= self.config.max_stages and 2 <= feed_stage <= stages - 1

    def tac(self, stages: int, feed_stage: int) -> float:
        """TAC of a configuration [currency/yr]; infinity when it has no feasible design."""
        key = (stages, feed_stage)
        if key not in self.designs:
            self.designs[key] = self._solve(stages, feed_stage)
        return self.designs[key]

    def _solve(self, stages: int, feed_stage: int) -> float:
        remaining = self.deadline - time.perf_counter()
        if remaining <= 0.0:
            raise TimeoutError
        try:
            tac, profile, report = configuration_tac(self.problem, self.basis, stages, feed_stage, self.config,
                                               time_limit=min(remaining, self.config.configuration_time_limit),
                                               strategies=self.strategies or None)
        except InfeasibleSpecError as exc:
            self.steps.append(SearchStep(stages, feed_stage, None, f"{type(exc).__name__}: {exc}"))
            return float("inf")
        except (SolverError, ConvergenceError) as exc:
            # Not scored as infeasible: recorded so the result can say the neighbourhood is incomplete.
            # The search cannot price it, so it moves on as if it were dearer than any design.
            reason = f"did not solve: {type(exc).__name__}: {exc}"
            self.failures[(stages, feed_stage)] = reason
            self.steps.append(SearchStep(stages, feed_stage, None, reason))
            return float("inf")
        self.steps.append(SearchStep(stages, feed_stage, tac, report.status))
        self.profiles[(stages, feed_stage)] = profile
        if report.barrier:
            self.strategies = first_strategy(report.barrier, self.strategies or self.config.barrier_strategies)
        return tac

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


def default_max_stages(minimum_stages: float) -> int:
    """Largest stage count searched when the options give none [-]: ``STAGE_BOUND_FACTOR`` x Fenske's minimum."""
    return max(STAGE_BOUND_FLOOR, math.ceil(STAGE_BOUND_FACTOR * minimum_stages))


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


def line_minimum(value, start: int, low: int, high: int) -> int:
    """Integer minimiser of ``value`` on [low, high] near ``start``: doubling steps downhill, then ternary.

    ``value`` may return infinity (no feasible design). Along the lines searched here the
    TAC is close to unimodal; the neighbourhood descent that follows corrects small departures.
    """
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
        if value(one) <= value(two):
            right = two
        else:
            left = one
    return min(range(left, right + 1), key=value)


def stage_search(evaluator: Evaluator, stages: int, feed_of) -> tuple[int, int]:
    """Best stage count with the feed stage tied to it by ``feed_of``."""
    def value(n: int) -> float:
        return evaluator.tac(n, feed_of(n))

    best = line_minimum(value, stages, evaluator.low, evaluator.config.max_stages)
    return best, feed_of(best)


def feed_search(evaluator: Evaluator, stages: int, feed: int) -> int:
    """Best feed stage for ``stages``, starting from ``feed``."""
    return line_minimum(lambda f: evaluator.tac(stages, f), feed, 2, stages - 1)


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
        values = {feed: evaluator.tac(stages, feed) for feed in dict.fromkeys(feeds) if evaluator.allowed(stages, feed)}
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
        values = {move: evaluator.tac(*move) for move in moves}
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
    if timed_out:
        return SolverError(f"time limit of {config.time_limit:g} s reached before any feasible design ({tried})")
    if evaluator.failures and len(evaluator.failures) == len(evaluator.designs):
        return SolverError(f"the solver failed on every configuration tried ({len(evaluator.failures)}); "
                           f"none was shown infeasible ({tried})")
    failed = f"; {len(evaluator.failures)} of the {len(evaluator.designs)} tried did not solve" \
        if evaluator.failures else ""
    return InfeasibleSpecError(
        f"no column with {config.min_stages} to {config.max_stages} stages meets the product specifications "
        f"(minimum stages by Fenske about {estimate.minimum_stages:.1f}){failed}; tried {tried}")


def final_solve(evaluator: Evaluator, chosen: tuple[int, int]):
    """Solve the chosen configuration again for the full read-back, from its own solved profile.

    Restarting from the solution takes a few iterations; a cold re-solve can stall where the
    search's solve did not (measured: a 25-bar deethaniser with a partial condenser, whose
    chosen configuration needed the constant-molar-overflow homotopy).
    """
    problem, basis, config = evaluator.problem, evaluator.basis, evaluator.config
    strategies = evaluator.strategies or None
    start = evaluator.profiles.get(chosen)
    if start is not None:
        try:
            return solved_model(problem, basis, *chosen, config, start=start, strategies=strategies)
        except (SolverError, InfeasibleSpecError):
            pass
    return solved_model(problem, basis, *chosen, config, strategies=strategies)


def optimise(problem: SeparationProblem, basis: CostBasis, options=None,
             start: tuple[int, int] | None = None) -> OptimumDesign:
    """Lowest-TAC design: discrete descent over (N, NF), NLP in (R, D) for each configuration.

    ``start`` (stages, feed stage): descend from this configuration (a previous optimum)
    instead of the shortcut's start and its line searches.

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
    evaluator = Evaluator(problem, basis, config, clock + config.time_limit, low=stage_floor(estimate, config))
    timed_out = False
    try:
        if start is not None and evaluator.allowed(*start):
            descend(evaluator, start)
        else:
            stages, feed = first_feasible(evaluator, *starting_configuration(problem, estimate, config))
            feed = feed_search(evaluator, stages, feed)
            ratio = (feed - 1) / (stages - feed + 1)  # the best feed stage found recalibrates Kirkbride's ratio
            descend(evaluator, stage_search(evaluator, stages, lambda n: feed_stage_of(n, ratio)))
    except TimeoutError:
        timed_out = True
    chosen = evaluator.best()
    if chosen is None:
        raise _nothing_found(evaluator, estimate, config, timed_out)
    model, local = final_solve(evaluator, chosen)
    best = read_design(model, local)
    gap, message = None, ""
    if config.certify:
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
                         reflux_range=(config.reflux_min, config.reflux_max))
