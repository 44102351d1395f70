"""Exhaustive enumeration of configurations: the checking tool for the optimiser.

Solves every (stages, feed stage) in range with the same model, solver, start and
evaluator (including its memory of the barrier strategy that last worked) as the search,
and optionally a fine reflux grid at the best configuration, so that the
optimiser's TAC can be compared with the true best of the same physics and costs.
"""

from __future__ import annotations

import math
import time
from dataclasses import dataclass

import numpy as np

from .._base.errors import ConvergenceError, InfeasibleSpecError, SolverError
from .basis import CostBasis, SeparationProblem
from .options import model_options
from .results import DesignEvaluation, SearchStep
from .problem import default_max_stages
from .search import Evaluator
from .solve import solve_configuration
from .start import shortcut, stage_floor


@dataclass(frozen=True)
class Enumeration:
    """Every configuration tried, the best one, and the reflux-grid check around it."""

    best: DesignEvaluation
    visited: tuple[SearchStep, ...]
    reflux_grid: tuple[tuple[float, float], ...]  # (R [-], TAC [currency/yr]) at the best configuration
    wall_time: float  # s


def enumerate_designs(problem: SeparationProblem, basis: CostBasis, options=None,
                      stage_range: tuple[int, int] | None = None, reflux_points: int = 0) -> Enumeration:
    """Solve every configuration in ``stage_range`` (default: the options' min/max stages)."""
    config = model_options(options)
    if config.max_stages is None:
        config.max_stages = default_max_stages(shortcut(problem).minimum_stages)
    low, high = stage_range or (stage_floor(shortcut(problem), config), config.max_stages)
    start = time.perf_counter()
    evaluator = Evaluator(problem, basis, config, deadline=math.inf, low=low, warm_starts=False)
    for stages in range(low, high + 1):
        for feed_stage in range(2, stages):
            evaluator.tac(stages, feed_stage)
    chosen = evaluator.best()
    if chosen is None:
        raise InfeasibleSpecError(f"no configuration with {low} to {high} stages meets the specifications")
    best = solve_configuration(problem, basis, *chosen, config, strategies=evaluator.strategies or None)
    grid = reflux_grid(problem, basis, best, config, reflux_points, strategies=evaluator.strategies or None) \
        if reflux_points else ()
    return Enumeration(best, tuple(evaluator.steps), grid, time.perf_counter() - start)


def reflux_grid(problem: SeparationProblem, basis: CostBasis, best: DesignEvaluation, config,
                points: int, span: float = 0.05,
                strategies: tuple[str, ...] | None = None) -> tuple[tuple[float, float], ...]:
    """TAC on a grid of fixed reflux ratios within +-``span`` (relative) of the best one."""
    grid = []
    for R in np.linspace(best.reflux_ratio * (1.0 - span), best.reflux_ratio * (1.0 + span), points):
        try:
            design = solve_configuration(problem, basis, best.stages, best.feed_stage, config,
                                         fixed_reflux=float(R), strategies=strategies)
        except (InfeasibleSpecError, SolverError, ConvergenceError):
            continue
        grid.append((float(R), design.tac))
    return tuple(grid)
