"""TAC against reflux ratio with the stage count and feed stage re-optimised at each reflux.

At a fixed reflux ratio the utilities are nearly fixed and every extra stage adds capital,
so the search at each reflux looks for the fewest stages that meet the specifications,
then moves the feed stage while the TAC falls. The same points give the trade-off of
ideal stages against reboiler duty. Each configuration is the optimiser's own model with
the reflux ratio fixed, so the curve and the optimum share one set of equations.
"""

from __future__ import annotations

import math
from dataclasses import replace

from .._base.errors import ConvergenceError, InfeasibleSpecError, SolverError
from ..case import Case
from ..costing.data import CostData
from ..properties import FeedState, Mixture
from ..sizing.options import SizingOptions
from ..stages.correlations import stages_from_gilliland
from .design import model_cost_basis, separation_problem
from .options import model_options
from .results import DesignEvaluation, OptimumDesign
from .search import feed_stage_of, kirkbride
from .solve import solve_configuration
from .start import shortcut

REFLUX_FACTORS = (1.1, 1.25, 1.5, 2.0)  # R / Rmin along the curve
MAX_EXTRA_STAGES = 12  # stages added above the Gilliland estimate before a reflux is given up


def reflux_curve(case: Case, mixture: Mixture, feed: FeedState, data: CostData, optimum: OptimumDesign,
                 options=None, sizing: SizingOptions = SizingOptions(), scenario: str | None = None,
                 factors: tuple[float, ...] = REFLUX_FACTORS) -> tuple[DesignEvaluation, ...]:
    """Designs along the reflux ratio (``factors`` x the model's minimum), plus the optimum itself.

    Points where no column within the stage limit meets the specifications are left out.
    The result is sorted by reflux ratio.
    """
    config = model_options(options)
    problem = separation_problem(case, mixture, feed, config.max_stages)
    basis, _ = model_cost_basis(problem, mixture, data, replace(sizing, light_key=problem.light_key,
                                                                heavy_key=problem.heavy_key),
                                scenario, case.economics.cost_year, config)
    estimate = shortcut(problem)
    ratio = kirkbride(problem, estimate)
    points = [optimum.best]
    for factor in factors:
        reflux = factor * estimate.minimum_reflux
        if abs(reflux - optimum.best.reflux_ratio) < 1e-3 * reflux:
            continue
        design = _best_at_reflux(problem, basis, config, reflux, estimate, ratio)
        if design is not None:
            points.append(design)
    return tuple(sorted(points, key=lambda d: d.reflux_ratio))


def _best_at_reflux(problem, basis, config, reflux: float, estimate, ratio: float) -> DesignEvaluation | None:
    """Fewest feasible stages at ``reflux``, then the feed stage with the lowest TAC."""
    guess = stages_from_gilliland(estimate.minimum_stages, estimate.minimum_reflux, reflux)
    if not math.isfinite(guess):
        return None
    stages = min(max(math.ceil(guess), 3), config.max_stages)

    def solve(n: int, f: int) -> DesignEvaluation | None:
        if not (3 <= n <= config.max_stages and 2 <= f <= n - 1):
            return None
        try:
            return solve_configuration(problem, basis, n, f, config, fixed_reflux=reflux,
                                       time_limit=config.configuration_time_limit)
        except (InfeasibleSpecError, SolverError, ConvergenceError):
            return None

    def feasible(n: int) -> DesignEvaluation | None:
        # Near a pinch only feed stages close to the best one work: try a few around Kirkbride's.
        middle = feed_stage_of(n, ratio)
        for f in (middle, middle - 1, middle + 1):
            if (found := solve(n, f)) is not None:
                return found
        return None

    design = None
    for n in range(stages, min(stages + MAX_EXTRA_STAGES, config.max_stages) + 1):
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
