"""The separation problem of a case: fitted forms down to the search's stage bound.

Kept apart from the search and the model so that ``check`` builds it without the solver
interfaces (Pyomo's modelling layer is a quarter of a second to import).
"""

from __future__ import annotations

import math

from ..case import Case
from ..properties import FeedState, Mixture
from ..properties.fitted import fit_mixture
from .basis import SeparationProblem, check_problem
from .start import shortcut

# The search's stage bound when none is given: the optimum usually lies near 2-2.5 x the
# Fenske minimum, so 4.5 x leaves room on the expensive-energy side (common practice, no
# source); never below the 60 stages that were the fixed bound before, so small columns keep
# the room they had.
STAGE_BOUND_FACTOR = 4.5
STAGE_BOUND_FLOOR = 60


def default_max_stages(minimum_stages: float) -> int:
    """Largest stage count searched when the options give none [-]: ``STAGE_BOUND_FACTOR`` x Fenske's minimum."""
    return max(STAGE_BOUND_FLOOR, math.ceil(STAGE_BOUND_FACTOR * minimum_stages))


def separation_problem(case: Case, mixture: Mixture, feed: FeedState, max_stages: int,
                       stage_pressure_drop: float | None = None) -> SeparationProblem:
    """The process side of ``case``, with forms fitted from the top pressure to ``max_stages`` stages down.

    ``stage_pressure_drop`` [Pa per equilibrium stage]: None takes the case's preliminary
    figure (per-tray drop over a preliminary efficiency, see :meth:`disteco.case.Column.stage_pressure_drop`).
    """
    column = case.column
    drop = column.pressure_drop_per_stage if stage_pressure_drop is None else stage_pressure_drop
    P_top = column.top_pressure
    P_bottom = P_top + max_stages * drop
    problem = SeparationProblem(
        fit_mixture(mixture, P_top, P_bottom, z=feed.z), feed.molar_flow, tuple(feed.z), feed.q, P_top,
        drop, case.products.light_key, case.products.heavy_key,
        case.products.light_key_spec, case.products.heavy_key_spec, column.subcooling,
        column.condenser == "partial")
    check_problem(problem)
    return problem


def resolved_problem(case: Case, mixture: Mixture, feed: FeedState, config, at_least: int = 0) -> SeparationProblem:
    """The separation problem fitted down to the search's stage bound, which this sets in ``config``.

    Without a ``max_stages`` option the bound is :func:`default_max_stages` of Fenske's minimum
    on forms fitted to ``STAGE_BOUND_FLOOR`` stages (refitted only when the bound is larger);
    ``at_least`` raises it to a given design's stages.
    """
    if config.max_stages is None:
        probe = separation_problem(case, mixture, feed, STAGE_BOUND_FLOOR)
        config.max_stages = default_max_stages(shortcut(probe).minimum_stages)
        if max(config.max_stages, at_least) == STAGE_BOUND_FLOOR:
            return probe
    config.max_stages = max(config.max_stages, at_least)
    return separation_problem(case, mixture, feed, config.max_stages)
