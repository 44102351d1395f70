"""Case-level entry points: optimise a column, or price a given design, from a case.

Both build the separation problem (fitted forms over the column's range), the cost basis
(from the sizing and costing layers at a reference design), solve with the one equation
model, and price the result again through the sequential sizing and costing path.
"""

from __future__ import annotations

from dataclasses import replace

from .._base.errors import SolverError
from ..case import Case
from ..costing.data import CostData
from ..properties import FeedState, Mixture
from ..properties.fitted import fit_mixture
from ..sizing.options import SizingOptions
from .basis import CostBasis, SeparationProblem, check_problem
from .options import model_options
from .pricing import cost_basis_from_data, price_design, stage_profile
from .results import DesignEvaluation, OptimumDesign
from .given import check_given_design, explain_failure
from .search import STAGE_BOUND_FLOOR, default_max_stages, optimise, starting_configuration
from .solve import solve_configuration, start_profile
from .start import shortcut


def separation_problem(case: Case, mixture: Mixture, feed: FeedState, max_stages: int) -> SeparationProblem:
    """The process side of ``case``, with forms fitted from the top pressure to ``max_stages`` stages down."""
    column = case.column
    P_top = column.top_pressure
    P_bottom = P_top + max_stages * column.pressure_drop_per_stage
    problem = SeparationProblem(
        fit_mixture(mixture, P_top, P_bottom, z=feed.z), feed.molar_flow, tuple(feed.z), feed.q, P_top,
        column.pressure_drop_per_stage, case.products.light_key, case.products.heavy_key,
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


def model_cost_basis(problem: SeparationProblem, mixture: Mixture, data: CostData, sizing: SizingOptions,
                     scenario: str | None, cost_year: int | None, config) -> tuple[CostBasis, list[str]]:
    """Cost basis frozen at the search's starting configuration (Gilliland reflux, CMO profile)."""
    stages, feed_stage = starting_configuration(problem, shortcut(problem), config)
    reference = stage_profile(problem, start_profile(problem, stages, feed_stage), feed_stage)
    options = replace(sizing, light_key=problem.light_key, heavy_key=problem.heavy_key)
    return cost_basis_from_data(data, mixture, reference, options, scenario, cost_year)


def optimise_design(case: Case, mixture: Mixture, feed: FeedState, data: CostData, options=None,
                    sizing: SizingOptions = SizingOptions(), scenario: str | None = None) -> OptimumDesign:
    """Lowest-TAC reflux ratio, stages and feed stage of ``case`` and its sequential price.

    ``options``: optimiser options (see :mod:`disteco.optimisation.options`); ``scenario``:
    utility-price scenario of the cost data (None: the data's default).
    """
    config = model_options(options)
    problem = resolved_problem(case, mixture, feed, config)
    # The reference design only freezes the model's constants; its sizing warnings would describe
    # a column nobody asked about, and the sequential price repeats those that hold for the result.
    basis, _ = model_cost_basis(problem, mixture, data, sizing, scenario, case.economics.cost_year, config)
    result = optimise(problem, basis, config)
    priced = price_design(result.best, mixture, data, replace(sizing, light_key=problem.light_key,
                                                               heavy_key=problem.heavy_key),
                          scenario, case.economics.cost_year)
    return replace(result, sequential=priced)


def evaluate_design(case: Case, mixture: Mixture, feed: FeedState, data: CostData, reflux_ratio: float,
                    stages: int, feed_stage: int, options=None, sizing: SizingOptions = SizingOptions(),
                    scenario: str | None = None) -> DesignEvaluation:
    """Sizes and costs of a given design (reflux ratio [-], stages incl. reboiler, feed stage from the top).

    The distillate flow is chosen by the model to meet the specifications at least cost.
    Before any solve, :func:`check_given_design` refuses (``InfeasibleDesignError``, naming the
    decision) fewer stages than Fenske's minimum, a reflux at or below Underwood's minimum or
    above the model's range, and a feed stage off the column; a design that passes and still
    cannot meet the specifications raises :class:`InfeasibleSpecError`.
    """
    config = model_options(options)
    problem = resolved_problem(case, mixture, feed, config, at_least=stages)
    estimate = shortcut(problem)
    check_given_design(estimate, reflux_ratio, stages, feed_stage, config.reflux_max)
    # reference-design warnings dropped as in optimise_design
    basis, _ = model_cost_basis(problem, mixture, data, sizing, scenario, case.economics.cost_year, config)
    try:
        design = solve_configuration(problem, basis, stages, feed_stage, config, fixed_reflux=reflux_ratio)
    except SolverError as failure:
        raise explain_failure(estimate, reflux_ratio, stages, failure) from failure
    priced = price_design(design, mixture, data, replace(sizing, light_key=problem.light_key,
                                                         heavy_key=problem.heavy_key),
                          scenario, case.economics.cost_year)
    return replace(design, sequential=priced)
