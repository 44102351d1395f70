"""Exhaustive enumeration of configurations: the checking tool for the optimiser.

Solves every (stages, feed stage) in range with the same model, solver and start as the
search, and optionally a fine reflux grid at the best configuration, so that the
optimiser's TAC can be compared with the true best of the same physics and costs.
"""

from __future__ import annotations

import time
from dataclasses import dataclass

import numpy as np

from .._base.errors import ConvergenceError, InfeasibleSpecError, SolverError
from .basis import CostBasis, SeparationProblem
from .options import model_options
from .results import DesignEvaluation, SearchStep
from .search import stage_floor
from .solve import configuration_tac, solve_configuration
from .start import shortcut


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
    low, high = stage_range or (stage_floor(shortcut(problem), config), config.max_stages)
    start = time.perf_counter()
    visited, chosen, lowest = [], None, float("inf")
    for stages in range(low, high + 1):
        for feed_stage in range(2, stages):
            try:
                tac, _, report = configuration_tac(problem, basis, stages, feed_stage, config)
            except (InfeasibleSpecError, SolverError, ConvergenceError) as exc:
                visited.append(SearchStep(stages, feed_stage, None, type(exc).__name__))
                continue
            visited.append(SearchStep(stages, feed_stage, tac, report.status))
            if tac < lowest:
                chosen, lowest = (stages, feed_stage), tac
    if chosen is None:
        raise InfeasibleSpecError(f"no configuration with {low} to {high} stages meets the specifications")
    best = solve_configuration(problem, basis, *chosen, config)
    grid = reflux_grid(problem, basis, best, config, reflux_points) if reflux_points else ()
    return Enumeration(best, tuple(visited), grid, time.perf_counter() - start)


def reflux_grid(problem: SeparationProblem, basis: CostBasis, best: DesignEvaluation, config,
                points: int, span: float = 0.05) -> tuple[tuple[float, float], ...]:
    """TAC on a grid of fixed reflux ratios within +-``span`` (relative) of the best one."""
    grid = []
    for R in np.linspace(best.reflux_ratio * (1.0 - span), best.reflux_ratio * (1.0 + span), points):
        try:
            design = solve_configuration(problem, basis, best.stages, best.feed_stage, config,
                                         fixed_reflux=float(R))
        except (InfeasibleSpecError, SolverError, ConvergenceError):
            continue
        grid.append((float(R), design.tac))
    return tuple(grid)
