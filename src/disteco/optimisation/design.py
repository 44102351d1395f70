"""Case-level entry points: optimise a column, or price a given design, from a case.

Both build the separation problem (fitted forms over the column's range), the cost basis
(from the sizing and costing layers at a reference design), solve with the one equation
model, and price the result again through the sequential sizing and costing path.

The model holds some quantities constant: tray efficiency, shell pressure factor, exchanger
coefficients, utility levels, height allowances and the pressure profile (a drop per
equilibrium stage). They are first taken at a reference design, then re-evaluated at the
answer and the solve repeated, starting from the previous answer, until the configuration
and the TAC no longer change (:data:`TAC_TOLERANCE`) and the pressure profile agrees with
the real trays (:data:`DROP_TOLERANCE`), at most :data:`ROUNDS` times (one more for each
when the tray spacing changes at the first optimum: it moves the trays' pressure drop).
"""

from __future__ import annotations

import math
from dataclasses import replace

from .._base.errors import InfeasibleSpecError, SolverError, UtilityTemperatureError
from ..case import Case
from ..costing.data import CostData
from ..properties import FeedState, Mixture
from ..sizing.exchangers import offered_levels
from ..sizing.options import SizingOptions
from .basis import CostBasis, SeparationProblem
from .options import barrier_order, first_strategy, model_options
from .pricing import cost_basis_from_data, price_design, reference_profile, size_reference
from .results import DesignEvaluation, OptimumDesign
from .given import check_given_design, explain_failure
from .layout import MORE_STAGES, ONE_SHELL, SPACING_TOLERANCE, STAGE_BOUND_STEP, TWO_SHELLS, best_spacing, \
    choose_layout, layout_option, percent_apart, spacing_prices, swaged_design, unconstrained_tac, \
    widened_by_slenderness
from .problem import resolved_problem, separation_problem
from .search import DIRECTIONS, optimise, start_of
from .solve import RANGE_NOTE, size_factor, solve_configuration
from .start import purer_product_starts, shortcut
from .first_round import DROP_TOLERANCE, NO_MORE_SHELLS, ROUNDS, HeightLimitError, check_height_limit, \
    cheapest_spacing, close_enough, keyed, next_drop, record_drop, shells_hold, first_reference, settled_reference, \
    stage_pressure_drop

SPACING_ROUNDS = 1  # one more round allowed when the spacing changes at the first optimum
CONFIRMING_ROUNDS = 1  # one more round allowed where the last moved only the TAC, at a settled configuration
TAC_TOLERANCE = 1e-3  # relative TAC change between rounds that counts as settled [-]
SPEC_SHORTFALL = 1e-4  # relative shortfall below which a given design is said to meet its specifications [-]
# A neighbouring tray spacing is re-optimised when its TAC at the chosen optimum's configuration
# lies within this fraction of the chosen spacing's (measured: re-optimising gained 0.8 % on
# ethanol-water; spacings 2 % dearer at a fixed design are taken as no better).
SPACING_SCREEN = 0.02
GIVEN_SHORTFALL = 0.05  # relative shortfall of a specification a given design is priced at, with a warning [-]


def model_cost_basis(problem: SeparationProblem, mixture: Mixture, data: CostData, sizing: SizingOptions,
                     scenario: str | None, cost_year: int | None, config) -> tuple[CostBasis, list[str]]:
    """Cost basis frozen at the search's starting configuration (Gilliland reflux, CMO profile)."""
    return cost_basis_from_data(data, mixture, reference_profile(problem, config), keyed(sizing, problem),
                                scenario, cost_year)


def _unsettled(rounds: int, tac_change: float, moving: tuple[str, ...] = ()) -> tuple[str, ...]:
    """The warning of rounds that ended unsettled; ``moving`` names what still moved in the last one."""
    what = f": {', '.join(moving)}" if moving else ""
    return (f"the model's constants (efficiency, factors, coefficients, pressure profile) had not settled after "
            f"{rounds} rounds of re-evaluation at the optimum (last TAC change {100 * tac_change:.2g} %){what}",)


def optimise_design(case: Case, mixture: Mixture, feed: FeedState, data: CostData, options=None,
                    sizing: SizingOptions = SizingOptions(), scenario: str | None = None,
                    warm: OptimumDesign | None = None, start: tuple[int, int] | None = None) -> OptimumDesign:
    """Lowest-TAC reflux ratio, stages, feed stage, tray spacing and shells of ``case``, and its sequential price.

    ``options``: optimiser options (see :mod:`disteco.optimisation.options`); ``scenario``:
    utility-price scenario of the cost data (None: the data's default). One shell within the
    height limit is optimised first; where the limit cuts its stage range, two shells in series
    are optimised too, and where the chosen optimum sits on the search's default stage bound (no
    ``max_stages`` option: a bound given holds), a search with more stages. The cheapest is
    returned with :attr:`OptimumDesign.layout` saying what was compared and why (see
    :mod:`disteco.optimisation.layout`). ``warm``: an optimum of the same case under other options
    (a reflux bound), whose pressure profile, reference profile, tray spacing and configuration the
    one-shell search starts from; ``start`` (stages, feed stage): the configuration it starts from
    instead.
    """
    config = model_options(options)
    bound_given = config.max_stages is not None  # a bound the user set holds: no search beyond it
    resolved_problem(case, mixture, feed, config)  # sets the stage bound
    year = case.economics.cost_year
    optima: dict[str, tuple[int, OptimumDesign | None, Exception | None]] = {}

    def attempt(label: str, shells: int, run_config, start=None, warm=None) -> OptimumDesign | None:
        layout = replace(sizing, shells=shells)
        try:
            result = _optimise_rounds(case, mixture, feed, data, run_config, layout, scenario, start, warm)
        except InfeasibleSpecError as failure:
            optima[label] = (shells, None, failure)
            return None
        if warm is None:  # a warm start's spacing was chosen by its own descent
            result = _spacing_descent(result, layout, lambda at, warm, rounds=None: _optimise_rounds(
                case, mixture, feed, data, run_config, at, scenario, None, warm, rounds), mixture, data, scenario,
                year)
        optima[label] = (shells, result, None)
        return result

    single = attempt(ONE_SHELL, 1, config, start, warm=warm)
    if single is None and not isinstance(optima[ONE_SHELL][2], HeightLimitError):
        raise optima[ONE_SHELL][2]
    if single is None or (single.stage_limit is not None and single.best.stages >= single.stage_limit):
        attempt(TWO_SHELLS, 2, config, None if single is None else (single.best.stages + 1, single.best.feed_stage))
    elif widened_by_slenderness(single.sequential.sizing):
        attempt(TWO_SHELLS, 2, config, (single.best.stages, single.best.feed_stage))
    found = [(label, r) for label, (_, r, _) in optima.items() if r is not None]
    if not found:
        failures = [failure for _, _, failure in optima.values()]
        if all(isinstance(failure, HeightLimitError) for failure in failures):
            raise HeightLimitError(f"{'; '.join(map(str, failures))}: {NO_MORE_SHELLS}")
        raise optima[ONE_SHELL][2]
    label, best = min(found, key=lambda item: item[1].sequential.cost.tac_per_year)
    if best.best.stages >= config.max_stages and not bound_given:  # the default bound, not a height, stopped it
        # (a --max-stages of 70 on the butane splitter reported 78 stages, searched beyond it)
        wider = model_options(config)
        wider.max_stages = math.ceil(STAGE_BOUND_STEP * config.max_stages)
        more = attempt(MORE_STAGES, optima[label][0], wider, (best.best.stages, best.best.feed_stage))
        if more is not None and more.sequential.cost.tac_per_year < best.sequential.cost.tac_per_year:
            label, best = MORE_STAGES, more
    searched_spacing = best.sizing_options.tray_spacing
    best, sections = swaged_design(best, mixture, data, scenario, year)
    best = _height_limit_at_final_spacing(best, searched_spacing, config.max_stages)
    optima[label] = (optima[label][0], best, None)
    # after the swage: the limits' cost compares like with like (a swaged depropaniser at 0.60 m against
    # its one-diameter self at 0.75 m unlimited read as limits costing -15,558 USD a year)
    free = unconstrained_tac([r for _, r, _ in optima.values()], mixture, data, best.sizing_options, scenario, year)
    records = [layout_option(name, shells, result, failure) for name, (shells, result, failure) in optima.items()]
    return replace(best, layout=choose_layout(records, sizing, best.sequential.sizing, best.spacings, free,
                                              sections))


def _height_limit_at_final_spacing(optimum: OptimumDesign, searched_spacing: float, bound: int) -> OptimumDesign:
    """``optimum`` without its height limit where the swaged shell's tray spacing, chosen after the
    search, holds one stage more within the limit; a note says what the search was held to, and the
    stage bound is the search's own ``bound`` again.

    A depropaniser at 28 bar was searched at 0.75 m (one diameter: the widest spacing gave the
    narrowest column) up to the 54 stages one shell of it holds; the swaged shell priced afterwards
    at 0.50 m put those stages in 34.4 m, yet the console said "Limited by the 54 stages one shell ...
    holds" and priced the limit at -54,095 USD a year (swaged against one diameter). Searched again
    at 0.50 m, the optimum was the same 54 stages within 0.03 % of TAC.
    """
    limit, sized = optimum.stage_limit, optimum.sequential.sizing
    options = optimum.sizing_options
    if limit is None or optimum.best.stages < limit or options is None or sized.split is not None or \
            options.tray_spacing == searched_spacing:
        return optimum
    height = sized.height
    per_stage = math.ceil(1.0 / max(sized.efficiency.value, 1e-3)) * height.tray_spacing  # trays of one stage more
    if height.tangent_length + per_stage > options.max_height:
        return optimum  # the limit binds at the final spacing too
    note = (f"the search ran at {searched_spacing:.2f} m tray spacing, where one shell within the height limit of "
            f"{options.max_height:g} m holds {limit} stages, and its optimum lies there; the swaged shell chosen "
            f"afterwards has {height.tray_spacing:.2f} m spacing and holds them in {height.tangent_length:.1f} m, so "
            "the limit does not bind the reported design; to search more stages at that spacing, set [sizing] "
            f"tray_spacing = \"{height.tray_spacing:g} m\"")
    return replace(optimum, stage_limit=None, stage_bound=bound, warnings=optimum.warnings + (note,))


def _optimise_rounds(case: Case, mixture: Mixture, feed: FeedState, data: CostData, config,
                     sizing: SizingOptions, scenario: str | None,
                     start: tuple[int, int] | None = None, warm: OptimumDesign | None = None,
                     most_rounds: int | None = None) -> OptimumDesign:
    """The optimum of one shell layout (``sizing.shells``), constants and tray spacing re-evaluated per round.

    Each round's search stops at the most stages whose shells stay within ``sizing.max_height``
    (:meth:`TrayBasis.stage_limit`); the tray spacing is the cheapest candidate at the reference,
    then at each round's optimum, and a change of spacing counts as an unsettled round.
    ``most_rounds``: stop after this many rounds (a screening run), else :data:`ROUNDS`.
    """
    year = case.economics.cost_year
    if warm is not None and warm.problem is not None and warm.sizing_options is not None:
        if warm.sizing_options.tray_spacing in sizing.spacing_candidates:
            sizing = replace(sizing, tray_spacing=warm.sizing_options.tray_spacing)
        problem, reference = warm.problem, warm.best.profile
        start = start or (warm.best.stages, warm.best.feed_stage)
        problem, reference, sizing, spacings = cheapest_spacing(case, mixture, feed, data, config, sizing, scenario,
                                                                 problem, reference)
    else:
        problem, reference, sizing, spacings = first_reference(case, mixture, feed, data, config, sizing, scenario)
    previous, kept, previous_at_limit, two_back, drops, searched = None, (), False, None, [], None
    previous_drop = math.nan  # the pressure drop per stage the previous round's trays gave [Pa]
    visited, wall, solved = (), 0.0, 0  # over all rounds
    allowed = most_rounds or ROUNDS
    confirming = False  # whether the confirming round was granted
    for rounds in range(1, allowed + SPACING_ROUNDS + CONFIRMING_ROUNDS + 1):
        # Reference-design warnings would describe a column nobody asked about; the sequential
        # price repeats those that hold for the result.
        basis, _ = cost_basis_from_data(data, mixture, reference, keyed(sizing, problem), scenario, year)
        run = model_options(config)
        run.max_stages = basis.trays.stage_limit(sizing.max_height, config.max_stages)
        limit = run.max_stages if run.max_stages < config.max_stages else None
        try:
            if limit is not None:
                check_height_limit(problem, basis.trays, sizing, run.max_stages, run.reflux_max)
            same_trays = bool(kept) and kept[3].tray_spacing == sizing.tray_spacing and kept[4] == limit
            # measured from the last round that searched, so that confirmations cannot drift in steps
            confirmed = _confirmed(searched, problem, basis, run) if same_trays and searched is not None and \
                start == (searched.best.stages, searched.best.feed_stage) else None
            # the previous round's solved profiles start this round's solves (a vapour-fed toluene column's
            # rounds solved their first configurations cold: 2-9 s each against about 0.3 s)
            seeds = previous.solved if previous is not None else (warm.solved if warm is not None else ())
            if confirmed is None:
                result, basis = _search_within_reach(
                    problem, basis, run, start, seeds, data,
                    lambda offered: cost_basis_from_data(offered, mixture, reference, keyed(sizing, problem), scenario,
                                                         year)[0])
            else:
                result = confirmed
            searched = searched if confirmed is not None else result
        except (InfeasibleSpecError, SolverError) as failure:
            if previous is None and limit is not None and type(failure) is InfeasibleSpecError:
                # the height limit cut the stage range: more shells may hold the stages needed
                raise HeightLimitError(
                    f"{shells_hold(sizing, basis.trays, limit)}, and no design within them meets the product "
                    "specifications") from failure
            if previous is None:
                raise
            # keep the last round that found a design rather than lose the run
            searched_drop = problem.stage_pressure_drop
            result, priced, problem, basis, sizing, limit = previous, *kept
            result = replace(result, warnings=result.warnings + (
                f"re-evaluation round {rounds} at the re-evaluated constants found no design ({failure}); "
                f"the optimum of round {rounds - 1} is reported" + _drop_moved(searched_drop, problem, rounds),))
            break
        visited += result.visited
        wall += result.solver.wall_time
        solved += result.solver.configurations_solved
        best = result.best
        priced = price_design(best, mixture, data, keyed(sizing, problem), scenario, year)
        if result.solver.status.startswith("time limit"):
            break  # the time limit holds for each round; a stopped search is reported as it stands
        drop = stage_pressure_drop(case, priced.sizing)
        change = abs(best.tac / previous.best.tac - 1.0) if previous else float("inf")
        at_limit = limit is not None and best.stages >= limit  # the limit moves with the efficiency
        same = previous is not None and ((best.stages, best.feed_stage) == (previous.best.stages,
                                                                            previous.best.feed_stage)
                                         or (at_limit and previous_at_limit))
        previous_at_limit = at_limit
        drop_settled = close_enough(drop, problem.stage_pressure_drop, DROP_TOLERANCE)
        spacings = spacing_prices(best.profile, mixture, data, keyed(sizing, problem), scenario, year)
        # chosen again at the first optimum only: a spacing moves the diameter and so the trays'
        # pressure drop, and later swaps kept the vacuum example from settling
        spacing = best_spacing(spacings, sizing.tray_spacing) if rounds == 1 else sizing.tray_spacing
        if same and change <= TAC_TOLERANCE and drop_settled and spacing == sizing.tray_spacing:
            break
        here = (best.stages, best.feed_stage)
        if (here == two_back and change <= TAC_TOLERANCE and drop_settled and spacing == sizing.tray_spacing):
            # a flat optimum: the rounds alternate between two configurations within the tolerance
            result = replace(result, warnings=result.warnings + (
                f"the rounds alternated between N={previous.best.stages} NF={previous.best.feed_stage} and "
                f"N={best.stages} NF={best.feed_stage}, {100 * change:.2g} % apart in TAC: either is the "
                f"optimum within the tolerance of {100 * TAC_TOLERANCE:g} %; the last is reported",))
            break
        if here == two_back and not same and not drop_settled and spacing == sizing.tray_spacing:
            # A cycle through the pressure drop: each configuration's trays give a drop at which the other is
            # the optimum (octanol/decanol at 8 kPa: 19 stages give 1313 Pa per stage, where 18 are optimal,
            # and 18 give 1344 Pa, where 19 are; four rounds ended "not settled"). More rounds repeat it; the
            # cheaper of the two as priced is reported.
            other, other_tac, tac = previous.best, kept[0].cost.tac_per_year, priced.cost.tac_per_year
            words = (f"the model's pressure profile has not settled: the rounds alternated between N={other.stages} "
                     f"NF={other.feed_stage} and N={best.stages} NF={best.feed_stage}, the trays of each giving a "
                     f"pressure drop per stage ({previous_drop:.0f} and {drop:.0f} Pa) at which the other is the "
                     f"optimum; costed, they come to {other_tac:,.0f} and {tac:,.0f} a year "
                     f"({percent_apart(other_tac, tac)} apart), and the cheaper is reported")
            if other_tac < tac:
                result, priced, problem, basis, sizing, limit = previous, *kept
            result = replace(result, warnings=result.warnings + (words,), settled=False)
            break
        if rounds >= allowed and same and drop_settled and spacing == sizing.tray_spacing and not confirming:
            # only the TAC moved, at the same configuration and a settled drop: one more round confirms it
            # with one solve (an acetone/methanol column's fourth round moved 0.5 % after the drop settled)
            allowed, confirming = rounds + CONFIRMING_ROUNDS, True
        if rounds >= allowed:
            moving = (() if same else (f"the configuration moved from N={previous.best.stages} "
                                       f"NF={previous.best.feed_stage} to N={best.stages} NF={best.feed_stage}",)
                      if previous is not None else ())
            moving += () if drop_settled else (f"the pressure drop per stage moved "
                                               f"{100 * abs(drop / problem.stage_pressure_drop - 1.0):.2g} %",)
            result = replace(result, warnings=result.warnings + _unsettled(rounds, change, moving), settled=False)
            break
        two_back = (previous.best.stages, previous.best.feed_stage) if previous is not None else None
        previous, start, reference, previous_drop = result, (best.stages, best.feed_stage), best.profile, drop
        kept = (priced, problem, basis, sizing, limit)
        if spacing != sizing.tray_spacing:  # a new spacing restarts the pressure drop's settling
            allowed = min(allowed + 1, (most_rounds or ROUNDS) + SPACING_ROUNDS)
            drops = []  # the trays' hydraulics changed: earlier rounds say nothing of the slope
        sizing = replace(sizing, tray_spacing=spacing)
        if not drop_settled:
            problem = separation_problem(case, mixture, feed, config.max_stages,
                                         record_drop(drops, here, problem.stage_pressure_drop, drop))
    solver = replace(result.solver, wall_time=wall, configurations_solved=solved)
    # the model's cost-curve range notes: the sequential price reports the curves' ranges for the reported
    # sizes (the chosen configuration's were printed twice; an earlier round's optimum's beside them, with
    # other sizes, a pilot column's drum and pump noted twice more)
    warnings = tuple(w for w in result.warnings if w not in result.best.warnings and RANGE_NOTE not in w)
    if limit is not None:  # the search's "raise max_stages" does not apply to a height limit
        warnings = tuple(w for w in warnings if "raise max_stages" not in w)
    return replace(result, sequential=priced, rounds=rounds, warnings=case.column.warnings + warnings,
                   problem=problem, basis=basis, visited=visited, solver=solver, stage_limit=limit,
                   sizing_options=keyed(sizing, problem), spacings=spacings)


def _drop_moved(searched_drop: float, kept: SeparationProblem, rounds: int) -> str:
    """Where the round that found no design searched at another pressure drop per stage (set from the kept
    optimum's own trays), the two drops, and where the kept design is verified (acetone/water at 1.2 bar:
    2367 against 2111 Pa per stage, its 172 trays raising the pressure 130 % above the top's)."""
    if close_enough(searched_drop, kept.stage_pressure_drop, DROP_TOLERANCE):
        return ""
    return (f"; that round searched at {searched_drop:.0f} Pa per equilibrium stage, set from the reported design's "
            f"own trays, against {kept.stage_pressure_drop:.0f} Pa in round {rounds - 1}: the model's pressure "
            "profile is not the design's, which is verified and, where it falls short, corrected on thermo at its "
            "trays' pressures (packing's lower pressure drop would ease the column)")


def _search_within_reach(problem: SeparationProblem, basis: CostBasis, run, start, seeds, data: CostData,
                         basis_on) -> tuple[OptimumDesign, CostBasis]:
    """The search's optimum and the basis it was found on: ``basis``, or where the search stops on a
    utility level whose temperature holds the products short of their specifications, a basis
    (``basis_on(data)``) on the next more extreme level of that service that ``data`` offers (the
    held level and the milder ones no longer offered).

    The level is chosen at the reference column, which need not meet the specifications: a
    purer distillate condenses colder than the reference's, and may be out of reach of the level
    that suits the reference; the searches' optima choose their own levels in later rounds.
    """
    while True:
        try:
            return optimise(problem, basis, run, start=start, starts=seeds), basis
        except UtilityTemperatureError as held:
            milder = [level.name for level in offered_levels(data.levels, held.service)]  # least extreme first
            if held.level not in milder or milder[-1] == held.level:
                raise
            data = data.without_levels(milder[:milder.index(held.level) + 1])
            basis = basis_on(data)


def _confirmed(previous: OptimumDesign, problem: SeparationProblem, basis: CostBasis, run) -> OptimumDesign | None:
    """``previous``'s optimum (the last round that searched) solved again alone at the re-evaluated
    constants, where that confirms it; else None, and the round searches its neighbourhood again.

    A round at the same tray spacing and height limit changes the cost constants (efficiency,
    exchanger coefficients, factors) and the pressure profile a little, which move every
    configuration's TAC about alike. Where the previous optimum was a local optimum of its round
    (every neighbour solved and none cheaper) and its own TAC moves by at most half of
    :data:`TAC_TOLERANCE`, no neighbour can have become cheaper by more than the tolerance, within
    which designs count as equally good: the neighbourhood is not solved again (measured on the
    benzene example: the confirming round of the search and the one of the control margin's second
    search, 9 solves each, 0.36 and 0.73 s, became one solve each). The curve's seeds are the
    previous round's neighbours (as a searching round leaves its neighbourhood; the whole of an
    earlier round's configurations thinned the curve), their TACs within about the same half tolerance.
    """
    if previous is None or not previous.solver.status.startswith("locally optimal"):
        return None
    best = previous.best
    barrier = best.solver.barrier
    strategies = first_strategy(barrier, barrier_order(run, len(problem.z))) if barrier else None
    try:
        centre = solve_configuration(problem, basis, best.stages, best.feed_stage, run, strategies=strategies,
                                     start=start_of(best))
    except (InfeasibleSpecError, SolverError):
        return None
    if abs(centre.tac / best.tac - 1.0) > 0.5 * TAC_TOLERANCE:
        return None
    here = (best.stages, best.feed_stage)
    near = {(here[0] + dn, here[1] + df) for dn, df in DIRECTIONS}  # what a searching round would leave
    seeds = (centre,) + tuple(d for d in previous.solved if (d.stages, d.feed_stage) in near)
    return replace(previous, best=centre, visited=(), solved=seeds,
                   solver=replace(previous.solver, wall_time=centre.solver.wall_time, configurations_solved=1))


def _spacing_descent(result: OptimumDesign, sizing: SizingOptions, optimise_at, mixture: Mixture, data: CostData,
                     scenario: str | None, year: int | None) -> OptimumDesign:
    """``result`` or a cheaper optimum re-optimised at a neighbouring candidate tray spacing.

    The rounds choose the spacing by pricing a fixed design, but a spacing also moves the
    stages, feed and reflux that are cheapest (a taller spacing makes each stage dearer): on the
    ethanol-water example the fixed-design choice was 0.50 m while the optimum re-optimised at
    0.45 m was 0.8 % cheaper. So the optimum is re-optimised, warm-started, at the neighbouring
    spacings of the sorted list whose fixed-design TAC lies within :data:`SPACING_SCREEN` of the
    chosen one, moving on while a neighbour is cheaper. Each neighbour is screened with one
    round of the search (its constants at the neighbour's spacing, warm-started); only a cheaper
    one is optimised to settled constants. ``optimise_at(sizing, warm, rounds)``: the rounds at
    one fixed spacing.
    """
    candidates = sorted(sizing.spacing_candidates)
    if len(candidates) < 2 or result.solver.status.startswith("time limit") or result.sizing_options is None:
        return result
    best, tried = result, {result.sizing_options.tray_spacing}
    while True:
        here = best.sizing_options.tray_spacing
        # priced at every candidate: an optimum found at a neighbour's spacing holds that spacing alone
        every = replace(best.sizing_options, tray_spacings=sizing.tray_spacings)
        fixed = {p.spacing: p.tac for p in spacing_prices(best.best.profile, mixture, data, every, scenario, year)
                 if p.tac is not None}
        if here not in fixed:
            break
        index = candidates.index(here) if here in candidates else None
        neighbours = [] if index is None else [candidates[i] for i in (index - 1, index + 1)
                                               if 0 <= i < len(candidates) and candidates[i] not in tried]
        found = []
        for spacing in neighbours:
            tried.add(spacing)
            if spacing not in fixed or fixed[spacing] > fixed[here] * (1.0 + SPACING_SCREEN):
                continue
            at = replace(sizing, tray_spacing=spacing, tray_spacings=(spacing,))
            try:
                screened = optimise_at(at, best, 1)
                if _cheaper(screened, best):
                    found.append(optimise_at(at, screened))
            except (InfeasibleSpecError, SolverError):
                continue
        cheaper = [r for r in found if _cheaper(r, best)]
        if not cheaper:
            break
        best = min(cheaper, key=lambda r: r.sequential.cost.tac_per_year)
    if best is result:
        return result
    options = replace(best.sizing_options, tray_spacings=sizing.tray_spacings)
    return replace(best, sizing_options=options,
                   spacings=spacing_prices(best.best.profile, mixture, data, options, scenario, year))


def _cheaper(one: OptimumDesign, other: OptimumDesign) -> bool:
    """Whether ``one`` saves more than :data:`SPACING_TOLERANCE` of ``other``'s reported TAC."""
    return one.sequential.cost.tac_per_year < other.sequential.cost.tac_per_year * (1.0 - SPACING_TOLERANCE)


def _final_spacing(design: DesignEvaluation, priced, mixture: Mixture, data: CostData, sizing: SizingOptions,
                   scenario: str | None, year: int | None):
    """(sizing, sequential price, spacing prices) with the cheapest spacing at ``design`` (re-priced if it moved)."""
    spacings = spacing_prices(design.profile, mixture, data, sizing, scenario, year)
    spacing = best_spacing(spacings, sizing.tray_spacing)
    if spacing != sizing.tray_spacing:
        sizing = replace(sizing, tray_spacing=spacing)
        priced = price_design(design, mixture, data, sizing, scenario, year)
    return sizing, priced, spacings


def evaluate_design(case: Case, mixture: Mixture, feed: FeedState, data: CostData, reflux_ratio: float,
                    stages: int, feed_stage: int, options=None, sizing: SizingOptions = SizingOptions(),
                    scenario: str | None = None, problem: SeparationProblem | None = None,
                    choose_spacing: bool = False) -> DesignEvaluation:
    """Sizes and costs of a given design (reflux ratio [-], stages incl. reboiler, feed stage from the top).

    The distillate flow is chosen by the model to meet the specifications at least cost.
    Before any solve, :func:`check_given_design` refuses (``InfeasibleDesignError``, naming the
    decision) fewer stages than Fenske's minimum, a reflux at or below Underwood's minimum or
    above the model's range, and a feed stage off the column; a design that passes and still
    cannot meet the specifications raises :class:`InfeasibleSpecError`.
    The model's constants are taken at the given configuration and re-evaluated at the
    solution until the TAC and the pressure profile settle, as in :func:`optimise_design`.
    ``problem``: the separation problem of an optimum (:attr:`OptimumDesign.problem`) to price
    that same column, pressure profile included, under other prices; None iterates the
    pressure profile from the design's own trays. A reflux that just meets the specifications
    under one pressure profile can miss them under a slightly higher one. ``choose_spacing``:
    the tray spacing is the cheapest of ``sizing.spacing_candidates`` at the reference and at
    the priced design, as the optimiser chooses it; otherwise ``sizing.tray_spacing``.
    """
    config = model_options(options)
    # A reported optimum sits on its specifications; priced again on its own pressure profile it
    # can fall just short (measured: the benzene optimum 1.6 % short). It is priced with a warning
    # instead of refused, and the verification on thermo then corrects reflux and distillate.
    config.shortfall_tolerance = max(config.shortfall_tolerance, GIVEN_SHORTFALL)
    year = case.economics.cost_year
    given, fixed_pressures = problem, problem is not None
    problem = resolved_problem(case, mixture, feed, config, at_least=stages)
    estimate = shortcut(problem)
    check_given_design(estimate, reflux_ratio, stages, feed_stage, config.reflux_max)
    if fixed_pressures:
        problem = given
        reference = reference_profile(problem, config, (stages, feed_stage), reflux_ratio)
    else:
        problem, reference = settled_reference(case, mixture, feed, data, sizing, config, (stages, feed_stage),
                                               reflux_ratio)
    if choose_spacing:
        prices = spacing_prices(reference, mixture, data, keyed(sizing, problem), scenario, year)
        sizing = replace(sizing, tray_spacing=best_spacing(prices, sizing.tray_spacing))
    # the spacing of the model's solve stays the one-shell choice; the final spacing is chosen again
    # for the shells below
    sizing, split = _given_shells(reference, mixture, data, keyed(sizing, problem), stages)
    previous, drops = None, []

    def one_shell_basis(profile) -> CostBasis:
        # The model's basis stays one shell (with the reflux and stages held only the distillate is
        # free); the sequential price below prices the shells chosen.
        return cost_basis_from_data(data, mixture, profile, keyed(replace(sizing, shells=1), problem),
                                    scenario, year)[0]

    for rounds in range(1, ROUNDS + 1):
        basis = one_shell_basis(reference)
        try:  # a later round warm only: where that fails, the basis is most likely what changed (below)
            design = _given_solve(problem, basis, stages, feed_stage, config, reflux_ratio, previous,
                                  cold=previous is None)
        except SolverError as failure:
            if previous is None:
                raise explain_failure(estimate, reflux_ratio, stages, failure) from failure
            # The previous round's profile lies at the old pressures: its temperatures can choose a utility
            # the new pressure profile puts out of reach (measured: benzene-toluene at R 2 on 120 stages, the
            # drop per stage 1070 -> 1422 Pa took the reboiler from 143 to 151 degC, inside the 10 K
            # approach to low-pressure steam, and every solve stalled, exit 1). The basis is taken again
            # from a reference profile at the new pressures.
            basis = one_shell_basis(reference_profile(problem, config, (stages, feed_stage), reflux_ratio))
            try:
                design = _given_solve(problem, basis, stages, feed_stage, config, reflux_ratio, previous)
            except SolverError as again:
                raise explain_failure(estimate, reflux_ratio, stages, again) from again
        priced = price_design(design, mixture, data, keyed(sizing, problem), scenario, year)
        drop = stage_pressure_drop(case, priced.sizing)
        change = abs(design.tac / previous.tac - 1.0) if previous else float("inf")
        drop_settled = fixed_pressures or close_enough(drop, problem.stage_pressure_drop, DROP_TOLERANCE)
        if change <= TAC_TOLERANCE and drop_settled:
            break
        if rounds == ROUNDS:
            design = replace(design, warnings=design.warnings + _unsettled(ROUNDS, change))
            break
        previous, reference = design, design.profile
        if not drop_settled:
            drops.append((problem.stage_pressure_drop, drop))
            problem = separation_problem(case, mixture, feed, config.max_stages, next_drop(drops))
    if choose_spacing:
        sizing, priced, _ = _final_spacing(design, priced, mixture, data, keyed(sizing, problem), scenario, year)
    short = ()
    if design.shortfall > SPEC_SHORTFALL:
        short = (f"the given design falls {100 * design.shortfall:.2g} % short of a product specification on the "
                 "optimiser's fitted forms at its own pressure profile; see the verification on thermo, which "
                 "corrects reflux and distillate at these stages",)
    # with two shells the model's one-shell cost-curve ranges describe a shell nobody prices
    model = tuple(w for w in design.warnings if not (split and w.startswith("extrapolated:")))
    return replace(design, sequential=priced, warnings=case.column.warnings + model + split + short)


def _given_solve(problem: SeparationProblem, basis: CostBasis, stages: int, feed_stage: int, config,
                 reflux_ratio: float, previous: DesignEvaluation | None, cold: bool = True) -> DesignEvaluation:
    """A given design's solve in one round: from the previous round's solution where there is one (its
    pressure profile and constants moved a little), then (``cold``) from the model's own starts.

    Measured: benzene-toluene at R 2 on 120 stages, second round (new basis, see the caller): 0.3 s
    from the first round's solution; its first round's cold starts took 4 s, two of them stalling.
    """
    def solve(**settings) -> DesignEvaluation:
        return solve_configuration(problem, basis, stages, feed_stage, config, fixed_reflux=reflux_ratio, **settings)

    if previous is not None:
        try:
            return solve(start=start_of(previous))
        except SolverError:
            if not cold:
                raise
    # The model's own starts and starts with one product purer than its specification, within the quick limit,
    # the cheapest that solves kept; then the same starts with the full limits (ethanol-water on 100
    # stages at R 3: 33 s of stalled tries from its own start before a purer start solved in 0.3 s). A column
    # with stages to spare has more than one solution at its reflux: the same design's own start once solved
    # to both products purer than asked (bottoms 8e-12 ethanol, distillate 18.30 mol/s), where the purer
    # distillate's start reaches the bottoms on its specification with less distillate and vapour.
    quick = config.quick_time_limit * size_factor(problem, stages)
    purer = [{"start": start} for start in purer_product_starts(problem, stages, feed_stage, reflux_ratio)]
    solved, failure = [], None
    for settings in [{}] + purer:
        try:
            solved.append(solve(time_limit=quick, **settings))
        except (SolverError, InfeasibleSpecError) as error:
            failure = failure or error
    if solved:
        return min(solved, key=lambda design: design.tac)
    if isinstance(failure, InfeasibleSpecError):
        raise failure
    for settings in purer + [{}]:  # the full limits
        try:
            return solve(**settings)
        except SolverError:
            continue
    raise failure


def _given_shells(reference, mixture: Mixture, data: CostData, sizing: SizingOptions,
                  stages: int) -> tuple[SizingOptions, tuple[str, ...]]:
    """A given design's shells: one, or two in series where one shell would be taller than the limit.

    An optimum keeps the height limit inside its search (:func:`optimise_design`); a given
    design's stages are fixed, so the layout an estimator would build is priced instead of a
    shell nobody would erect, and a note says so. Where no candidate spacing brings two shells
    within the limit either, the spacing of the lowest shells is taken (two shells are the most
    disteco builds), and the note says how far above the limit they stay.
    """
    if sizing.shells != 1:
        return sizing, ()
    tall = size_reference(mixture, data, reference, sizing).tallest_shell.tangent_length
    if tall <= sizing.max_height:
        return sizing, ()
    two = replace(sizing, shells=2)
    note = (f"the given {stages} stages need one shell of {tall:.1f} m at {sizing.tray_spacing:.2f} m tray "
            f"spacing, above the {sizing.max_height:g} m limit (sizing.max_height): the column is laid out and "
            "costed as two shells in series")
    heights = {spacing: size_reference(mixture, data, reference, replace(two, tray_spacing=spacing)
                                       ).tallest_shell.tangent_length for spacing in two.spacing_candidates}
    lowest = min(heights, key=heights.get)
    if heights[lowest] <= sizing.max_height:
        return two, (note,)  # the final spacing choice takes the cheapest spacing that fits
    return replace(two, tray_spacing=lowest), (
        f"{note}; even two shells are {heights[lowest]:.1f} m tall at the closest tray spacing of the candidates "
        f"({lowest:.2f} m, taken), above the limit: two shells are the most disteco builds, so they are costed at "
        "that height; packing, a third shell or fewer stages at a higher reflux would bring the column within it",)
