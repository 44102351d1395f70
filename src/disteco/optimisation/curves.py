"""TAC against reflux ratio with the stage count and feed stage re-optimised at each reflux.

At a fixed reflux ratio the utilities are nearly fixed and every extra stage adds capital,
so the search at each reflux looks for the fewest stages that meet the specifications,
then moves the feed stage while the TAC falls. The same points give the trade-off of
ideal stages against reboiler duty. Each configuration is the optimiser's own model with
the reflux ratio fixed, so the curve and the optimum share one set of equations.
"""

from __future__ import annotations

import time
from collections.abc import Sequence
from dataclasses import replace

from .._base.errors import ConvergenceError, InfeasibleSpecError, SolverError
from ..case import Case
from ..costing.data import CostData
from ..properties import FeedState, Mixture
from ..sizing.options import SizingOptions
from ..stages.shortcut import ShortcutPoint
from .design import model_cost_basis, resolved_problem
from .options import barrier_order, first_strategy, model_options
from .results import DesignEvaluation, OptimumDesign
from .solve import solve_configuration

CURVE_FACTORS = (1.1, 1.3, 1.5, 2.0)  # R / Rmin of the stages layer's table rows used as curve points
# Relative steps below the optimum's reflux. The table's minimum reflux assumes constant molar
# overflow; under energy balances the true minimum can lie above its 1.1 x row (benzene-toluene:
# optimum 1.763, energy-balance minimum about 1.74), so the left branch is spaced from the optimum.
BELOW_OPTIMUM = (0.005, 0.01, 0.02)
MAX_STAGES_TRIED = 4  # stage counts tried upwards from the first guess before a reflux is given up


def reflux_curve(case: Case, mixture: Mixture, feed: FeedState, data: CostData, optimum: OptimumDesign,
                 table: Sequence[ShortcutPoint], options=None, sizing: SizingOptions = SizingOptions(),
                 scenario: str | None = None, factors: tuple[float, ...] = CURVE_FACTORS
                 ) -> tuple[DesignEvaluation, ...]:
    """Designs along the reflux ratio, plus the optimum itself, sorted by reflux ratio.

    Below the optimum: refluxes ``BELOW_OPTIMUM`` (relative) under it. Above: ``table`` is
    the stages layer's reflux-stages trade-off (McCabe-Thiele on the real curve for a
    binary, Gilliland and Kirkbride otherwise); its rows at ``factors`` x the minimum
    reflux give each point's reflux and the first guess of stages and feed stage. Points
    where no column within the stage limit meets the specifications are left out, and so
    are the points not reached within the options' ``time_limit`` (measured: on a
    twenty-component debutaniser the curve's stalled fixed-reflux solves took over 7 minutes).
    """
    config = model_options(options)
    deadline = time.perf_counter() + config.time_limit
    problem = resolved_problem(case, mixture, feed, config)  # also sets the stage bound
    basis = optimum.basis  # the optimum's settled basis, so that the curve passes through it
    if basis is None:
        basis, _ = model_cost_basis(problem, mixture, data, replace(sizing, light_key=problem.light_key,
                                                                    heavy_key=problem.heavy_key),
                                    scenario, case.economics.cost_year, config)
    else:
        problem = optimum.problem
    best = optimum.best
    if best.solver.barrier:  # try first the barrier strategy that solved the optimum
        config.barrier_strategies = first_strategy(best.solver.barrier, barrier_order(config, len(problem.z)))
    points = [best]
    for step in BELOW_OPTIMUM:
        left = points[-1]  # each step down needs at least the stages of the one before
        design = _best_at_reflux(problem, basis, config, best.reflux_ratio * (1.0 - step), left.stages + 1,
                                 left.feed_stage / left.stages, deadline)
        if design is None:
            break  # no column within a few more stages; lower refluxes need still more
        points.append(design)
    for row in table:
        if not any(abs(row.reflux_factor - f) < 1e-9 for f in factors):
            continue
        if row.reflux_ratio <= best.reflux_ratio * (1.0 + 1e-3):
            continue  # the branch below the optimum is covered above; such rows may lie under the true minimum
        design = _best_at_reflux(problem, basis, config, row.reflux_ratio, row.whole_stages,
                                 row.feed_stage / row.whole_stages, deadline)
        if design is not None:
            points.append(design)
    return tuple(sorted(points, key=lambda d: d.reflux_ratio))


def _best_at_reflux(problem, basis, config, reflux: float, stages: int, feed_ratio: float,
                    deadline: float = float("inf")) -> DesignEvaluation | None:
    """Fewest feasible stages at ``reflux`` from a first guess, then the feed stage with the lowest TAC.

    Near a pinch only feed stages close to the best one work, so each stage count is tried
    with the guess's feed position and its two neighbours.
    """
    stages = min(max(stages, 3), config.max_stages)

    def solve(n: int, f: int) -> DesignEvaluation | None:
        if not (3 <= n <= config.max_stages and 2 <= f <= n - 1) or time.perf_counter() > deadline:
            return None
        try:
            # the unscaled limit: a curve point is worth less time than a search's configuration
            return solve_configuration(problem, basis, n, f, config, fixed_reflux=reflux,
                                       time_limit=config.configuration_time_limit)
        except (InfeasibleSpecError, SolverError, ConvergenceError):
            return None

    def feasible(n: int) -> DesignEvaluation | None:
        middle = min(max(round(feed_ratio * n), 2), n - 1)
        for f in (middle, middle - 1, middle + 1):
            if (found := solve(n, f)) is not None:
                return found
        return None

    design = None
    for n in range(stages, min(stages + MAX_STAGES_TRIED, config.max_stages + 1)):
        if (design := feasible(n)) is not None:
            break
    if design is None:
        return None
    while (fewer := feasible(design.stages - 1)) is not None:
        design = fewer
    for step in (-1, 1):
        while (moved := solve(design.stages, design.feed_stage + step)) is not None and moved.tac < design.tac:
            design = moved
    return design
