"""The Python API: load a case, check it, run the design, write the results.

Engineers use this from notebooks and scripts; the command line is a thin layer over it.
"""

from __future__ import annotations

import gc
import importlib
import sys
from contextlib import AbstractContextManager, contextmanager
from dataclasses import dataclass, replace
from pathlib import Path
from typing import TYPE_CHECKING

from ._base.errors import CaseError, ConvergenceError, CostDataError, InfeasibleSpecError, PropertyError
from ._base.prices import PriceSetting, parse_price_option
from .case import Case, load_case
from .costing import CostData, check_currency, load_cost_data, resolve_cost_year, resolve_scenarios
from .costing.prices import apply_prices
from .properties import Mixture, build_mixture, feed_state, mole_fractions, products_on_mole_basis, summarise_mixture
from .reports.files import ClaimedFolder, claim_folder, write_json

if TYPE_CHECKING:  # the solver interfaces, plotting and the workbook are imported where used (quick `check`)
    from .optimisation.margin import ControlMargin
    from .optimisation.results import DesignEvaluation, OptimumDesign
    from .optimisation.thermo_checks import ThermoChecks
    from .reports.check_result import CaseCheck
    from .reports.design_result import DesignResult
    from .reports.tables_design import ReportParts
    from .reports.tables_scenarios import CrossTable
    from .reports.progress import Progress, ProgressPlan
    from .stages import StageDesign

RESULT_FILE = "result.json"
WORKBOOK_FILE = "design.xlsx"
FIGURE_FOLDER = "figures"
OUTPUT_SET = (RESULT_FILE, WORKBOOK_FILE, FIGURE_FOLDER)  # what a run owns in its output folder
YOUNG_OBJECTS_COLLECTED = 20_000  # net allocations between young-generation collections in a design process


@dataclass(frozen=True)
class GivenDesign:
    """A design to price instead of optimising: reflux ratio [-], stages (reboiler included), feed stage."""

    reflux_ratio: float
    stages: int
    feed_stage: int

    def __post_init__(self):
        # What needs no mixture is checked here; the minima when the design is priced (before any solve).
        from .optimisation.given import check_decisions

        check_decisions(self.reflux_ratio, self.stages, self.feed_stage)


def mixture_of(case: Case) -> Mixture:
    """The case's mixture (built once and cached)."""
    return build_mixture(case.components, case.thermo, case.column.top_pressure)


def check(case: Case, given: GivenDesign | None = None, scenarios: tuple[str, ...] = (),
          options: dict | None = None, compare: bool = True, prices: tuple[PriceSetting | str, ...] = ()) -> CaseCheck:
    """Every check :func:`design` runs before it optimises, with the same arguments.

    Cost data, scenarios, cost year and currency; the components and a mixture summary at the
    top pressure; the specifications against the feed and any azeotrope, the key order and
    volatility (the stages layer's minimum reflux, minimum stages and stage profile); the
    optimiser options, the stage bound or a given design against the minima on the fitted
    forms. Raises what ``design`` would raise before optimising; returns what it found.
    """
    return _prepare(on_mole_basis(case), given, scenarios, options, compare, prices, utility_notes=True).check


def on_mole_basis(case: Case) -> Case:
    """``case`` with product fractions written by mass turned into the mole fractions every layer works in
    (the specifications as written kept beside them for the reports); as it is otherwise."""
    if case.products.fraction_basis == "mole":
        return case
    return replace(case, products=products_on_mole_basis(case.products, mixture_of(case)))


@dataclass(frozen=True)
class ScenarioRun:
    """One scenario's optimum (held to the control margin), its checks on thermo, margin and curve."""

    searched: OptimumDesign  # the search's optimum, before the control margin
    optimum: OptimumDesign
    checks: ThermoChecks
    margin: ControlMargin
    curve: tuple[DesignEvaluation, ...]  # the TAC-against-reflux curve's designs
    curve_notes: tuple[str, ...]


@dataclass(frozen=True)
class _Prepared:
    """A case that passed :func:`check`: the report, and the mixture and cost data a design goes on with."""

    check: CaseCheck
    mixture: Mixture
    data: CostData


def _prepare(case: Case, given: GivenDesign | None, scenarios: tuple[str, ...], options: dict | None,
             compare: bool, prices: tuple[PriceSetting | str, ...] = (), utility_notes: bool = False) -> _Prepared:
    """The one copy of the checks before optimising, shared by :func:`check` and :func:`design`.

    ``utility_notes``: also the notes on a cheaper utility level for the first column (what
    `check` prints; a design gives them for the design it reports).
    """
    from .costing.from_sizing import check_tray_material
    from .optimisation.pricing import check_capacity, reference_profile, size_reference, tray_basis
    from .optimisation.problem import remember_column_profile, resolved_problem
    from .optimisation.utility_notes import utility_level_notes
    from .sizing.column import condensate
    from .sizing.exchangers import condensate_freezing_warning, profile_utilities
    from .optimisation.first_round import check_layouts_hold, check_stages_fit
    from .optimisation.given import check_given_design, check_stage_bound
    from .optimisation.options import model_options
    from .optimisation.start import shortcut
    from .reports.check_result import CaseCheck
    from .reports.tables_prices import far_price_notes, scenario_prices
    from .sizing.options import sizing_options
    from .stages import design_stages

    config = model_options(options)
    asked_bound = config.max_stages  # a given design raises the bound of its own pricing to its stages
    data = priced_cost_data(case, prices)
    names = _scenario_names(data, scenarios, case)
    year, _ = resolve_cost_year(data, case.economics.cost_year)
    currency = check_currency(data, case.economics.currency)
    check_tray_material(data, sizing_options(case))
    mixture = mixture_of(case)
    mixture.clear_warnings()  # the mixture is cached across runs; its notes are this run's
    products = case.products
    summary = summarise_mixture(mixture, mole_fractions(case.feed, mixture), case.column.top_pressure,
                                products.light_key, products.heavy_key)
    feed = feed_state(case.feed, mixture, case.column.top_pressure)
    stages = design_stages(mixture, feed, products, case.column,
                           before_profile=lambda shortcut: check_stages_fit(shortcut, sizing_options(case)))
    remember_column_profile(case, mixture, feed, stages.profile)
    problem = resolved_problem(case, mixture, feed, config, at_least=given.stages if given else 0)
    estimate = shortcut(problem)
    if given is None or compare:  # the optimum is searched for within the bound asked for
        check_stage_bound(estimate, config.max_stages if given is None or asked_bound is None else asked_bound)
    if given is not None:
        check_given_design(estimate, given.reflux_ratio, given.stages, given.feed_stage, config.reflux_max)
    # the utility levels of the column design sizes first (the search's start, or the given design),
    # which refuses a case no offered level can serve before any optimisation
    min_approach = sizing_options(case).min_approach
    try:
        reference = reference_profile(problem, config, None if given is None else (given.stages, given.feed_stage),
                                      None if given is None else given.reflux_ratio)
    except (ConvergenceError, PropertyError):
        reference, ends, notes = None, (), ()  # design's own start then says what failed, in its words
    else:
        keyed = replace(sizing_options(case), light_key=problem.light_key, heavy_key=problem.heavy_key)
        sized = size_reference(mixture, data, reference, keyed)
        check_capacity(reference, sized, given.reflux_ratio if given else estimate.minimum_reflux)
        if given is None:  # the height limit's refusal of every layout, as the search's first round gives it
            check_layouts_hold(case, mixture, feed, data, config, sizing_options(case), names[0], problem,
                               tray_basis(sized, keyed))
        ends = profile_utilities(reference, data.levels, min_approach)
        notes = utility_level_notes(mixture, reference, *ends, data.levels, min_approach,
                                    _utility_pricing(data, names[0], year, currency)) if utility_notes else ()
        if utility_notes:
            freezing = condensate_freezing_warning(mixture.liquidus(condensate(reference)), ends[0].utility)
            notes += (freezing,) if freezing else ()
            # a price set far from the cost data's, said before a design runs on it (20 USD/kWh meant per GJ)
            notes += far_price_notes(scenario_prices(data, names, year), {end.utility.name for end in ends})
    found = CaseCheck(case, summary, feed, stages, names, year, currency, config.max_stages,
                      estimate.minimum_stages, estimate.minimum_reflux,
                      None if given is None else (given.reflux_ratio, given.stages, given.feed_stage),
                      estimate.method, reference.stages if reference else 0, ends, notes)
    return _Prepared(found, mixture, data)


def _scenario_names(data: CostData, scenarios: tuple[str, ...], case: Case) -> tuple[str, ...]:
    """The scenarios to run: ``scenarios`` (named as the field ``scenario`` when wrong) or the case's."""
    if not scenarios:
        return resolve_scenarios(data, case.economics.scenarios)
    try:
        return resolve_scenarios(data, scenarios)
    except CaseError as exc:
        raise CaseError("scenario", exc.problem, exc.allowed, exc.value) from None


def cost_data_of(case: Case) -> CostData:
    """The case's cost data: its own folder if it names one, else the bundled data."""
    folder = case.economics.cost_data
    try:
        return load_cost_data(folder)
    except CostDataError as exc:
        if folder is None:
            raise
        raise CaseError("economics.cost_data", f"the folder {str(folder)!r} does not hold usable cost data: {exc}",
                        "a copy of the bundled cost_data folder, edited") from None


def priced_cost_data(case: Case, prices: tuple[PriceSetting | str, ...] = ()) -> CostData:
    """The case's cost data with its ``[prices]`` tables and then ``prices`` applied.

    ``prices`` are :class:`PriceSetting` records or texts ``"[SCENARIO.]UTILITY=PRICE"``
    (``"lp_steam=20 USD/GJ"``); errors on a text name the argument ``prices``.
    """
    data = cost_data_of(case)
    year, _ = resolve_cost_year(data, case.economics.cost_year)
    settings = tuple(p if isinstance(p, PriceSetting) else parse_price_option(p) for p in prices)
    return apply_prices(data, case.prices, settings, year)


def ready_to_design() -> None:
    """Import what :func:`design` uses and move every object alive now out of the cyclic garbage
    collector's reach (``gc.freeze``, after one collection so that no garbage is kept), for a process
    that runs one design and ends, as the command line does.

    Building and solving a configuration's model allocates many small objects, and each full
    collection walked the whole heap (pyomo, thermo's data, pandas) again; forked workers inherit the
    frozen objects. Measured on the benzene example's design command (2 cores, two runs each): 5.73 and
    5.76 s wall (7.8 s CPU) -> 5.16 and 5.27 s (6.9 s CPU); a configuration's model built in 7-8 ms
    instead of 13. The collection before freezing takes about 0.04 s. The young generation is then
    collected every ``YOUNG_OBJECTS_COLLECTED`` allocations instead of 700: 790 collections in 0.26 s
    of the benzene design's own process -> 28 in 0.15 s, the cycles still collected.
    """
    for module in ("curves", "design", "margin", "thermo_checks"):  # what design imports
        importlib.import_module(f".optimisation.{module}", __package__)
    gc.collect()
    gc.freeze()
    gc.set_threshold(YOUNG_OBJECTS_COLLECTED, *gc.get_threshold()[1:])


def design(case: Case, given: GivenDesign | None = None, scenarios: tuple[str, ...] = (),
           options: dict | None = None, progress: Progress | None = None, compare: bool = True,
           prices: tuple[PriceSetting | str, ...] = (), files_next: bool = False) -> DesignResult:
    """Design ``case``: stages, then the lowest-TAC design for every price scenario (or price ``given``).

    ``scenarios`` overrides the case's scenario names; ``options`` are optimiser options
    (see :mod:`disteco.optimisation.options`); ``progress`` is called with a
    :class:`~disteco.reports.progress.ProgressStep` as each step of work starts, and once at the
    end. The sizing options are the case's ``[sizing]`` choices; an optimum below the case's
    control margin (``column.min_reflux_ratio_factor``) is searched again above it
    (:mod:`.optimisation.margin`); ``prices`` set utility prices on top of the case's (see
    :func:`priced_cost_data`); ``compare``: with ``given``, also find the optimum under the same
    prices to compare with; ``files_next``: the caller writes the result's files next
    (:func:`write_results`), so their writers are imported while the first curve's child
    process finishes, where it is still running (matplotlib and openpyxl, about 0.35 s of a
    6.5-s benzene design otherwise spent after it).
    """
    from .optimisation.curves import start_curve
    from .optimisation.design import evaluate_design, optimise_design
    from .optimisation.margin import hold_margin, search_above_floor
    from .optimisation.thermo_checks import thermo_checks
    from .reports.design_result import DesignResult
    from .reports.progress import CHECKS, PRICING, SEARCH, ProgressPlan, run_steps
    from .reports.tables_design import GivenDesignReport, optimum_parts
    from .reports.tables_prices import price_notes
    from .sizing.options import sizing_options

    case = on_mole_basis(case)
    prepared = _prepare(case, given, scenarios, options, compare, prices)
    mixture, data, found = prepared.mixture, prepared.data, prepared.check
    names, summary, feed, stages = found.scenarios, found.mixture, found.feed, found.stages
    plan = ProgressPlan(run_steps(len(names), given is not None, compare), progress)
    plan.start("shortcut design and stage profile")
    plan.finish()  # the stage design ran in the checks above
    sizing = sizing_options(case)
    if given is not None:
        plan.start(f"pricing the given design under '{names[0]}'")
        evaluation = evaluate_design(case, mixture, feed, data, given.reflux_ratio, given.stages,
                                     given.feed_stage, options, sizing, names[0], choose_spacing=True)
        if evaluation.sequential is not None:  # the tray spacing and shells chosen for it, kept when re-priced
            chosen = evaluation.sequential.sizing
            sizing = replace(sizing, tray_spacing=chosen.height.tray_spacing, shells=chosen.shells)
        plan.finish()
        plan.start("checking the design on thermo (energy balances, minimum reflux)")
        checks = thermo_checks(case, mixture, feed, data, evaluation, stages, options, sizing, names[0],
                               hold_reflux=True)
        plan.finish()
        parts = _checked(_evaluation_parts(evaluation, data), checks)
        optima: list[OptimumDesign] = []
        before = None  # a later scenario's search descends from the one before's optimum, as when optimising
        minimum = None  # the first optimum's own energy-balance minimum, as an optimising run finds it
        for k, name in enumerate(names if compare else ()):
            plan.start(f"the optimum under '{name}' to compare with")
            with _thermo_met(stages):
                optimum = optimise_design(case, mixture, feed, data, options, sizing_options(case), name,
                                          start=_configuration(before))
            before = optimum.best
            # the optimum an optimising run would report: checked on thermo and held to the control margin as
            # there, on its own minimum (the given design's, at its own pressures, is another column's: the
            # benzene example given 80 stages up to 240 kPa held the optimum to 1.1 x 1.7778, not 1.1 x 1.7385)
            own = thermo_checks(case, mixture, feed, data, optimum.best, stages, options,
                                optimum.sizing_options or sizing_options(case), name, full=k == 0,
                                fitted=optimum.problem.fitted if optimum.problem else None,
                                priced=optimum.sequential)
            minimum = own.minimum if k == 0 else minimum
            optimum, _ = hold_margin(case, mixture, feed, data, optimum, own.reflux_ratio,
                                     minimum.reflux_ratio if minimum else None, options, sizing_options(case), name)
            optima.append(optimum)
            plan.finish(optimum.solver.configurations_solved)
        plan.end()
        under = _given_under_prices(case, mixture, data, sizing, names, parts, optima)
        held = GivenDesignReport(given.reflux_ratio, given.stages, given.feed_stage, optima[0] if optima else None,
                                 under)
        diagram, diagram_notes = _binary_parts(stages, checks.reflux_ratio, case)
        parts = replace(parts, given=held, **diagram)
        return DesignResult(case, summary, feed, stages=stages, parts=parts, evaluation=evaluation,
                            warnings=_warnings(stages.shortcut.warnings + checks.warnings + evaluation.warnings
                                               + mixture.warnings + _utility_notes(mixture, parts, data, sizing)
                                               + diagram_notes, parts), options=_given_options(options))
    runs: list[ScenarioRun] = []
    minimum = None  # energy-balance minimum reflux, found on the first scenario's optimum

    def margin_checks(k: int, name: str, optimum, margin):
        """The checks on thermo of a design searched above the margin's floor, reported against the minimum
        reflux the floor was set on (the design's without the margin)."""
        return thermo_checks(case, mixture, feed, data, optimum.best, stages, options, optimum.sizing_options or sizing,
                             name, full=k == 0, fitted=optimum.problem.fitted if optimum.problem else None,
                             minimum_near=minimum, reflux_floor=margin.reflux_floor, priced=optimum.sequential)

    def checked_run(k: int, name: str, optimum) -> ScenarioRun:
        """The scenario's optimum checked on thermo, held to the control margin, with its curve."""
        nonlocal minimum
        searched, chosen = optimum, optimum.sizing_options or sizing  # the tray spacing and shells the optimiser chose
        notes: list[str] = []
        # the curve around the economic optimum (which the margin's floor lies to the right of), drawn
        # meanwhile where a second core is free: nothing below changes it
        with start_curve(case, mixture, feed, data, optimum, stages.table, options, chosen, name) as curve:
            plan.start(f"checking the '{name}' optimum on thermo" + (" (with minimum reflux and fit)" if k == 0 else ""))
            checks = thermo_checks(case, mixture, feed, data, optimum.best, stages, options, chosen, name,
                                   full=k == 0, fitted=optimum.problem.fitted if optimum.problem else None,
                                   priced=optimum.sequential)
            minimum = checks.minimum if k == 0 else minimum
            optimum, margin = hold_margin(case, mixture, feed, data, optimum, checks.reflux_ratio,
                                          minimum.reflux_ratio if minimum else None, options, sizing, name)
            if margin.binds:  # the reported design's own verification and fit check
                checks = margin_checks(k, name, optimum, margin)
            plan.finish()
            plan.start(f"TAC against reflux ratio under '{name}'")
            if files_next and curve.beside:
                _writers()
            designs = curve.designs(notes)
            plan.finish()
        return ScenarioRun(searched, optimum, checks, margin, designs, tuple(notes))

    for k, name in enumerate(names):
        plan.start(f"searching stages, feed stage and reflux under '{name}' ({k + 1} of {len(names)})")
        # a later scenario's search descends from the one before's optimum instead of the shortcut's start and
        # line searches: price scenarios move the optimum a few stages at most
        before = runs[-1].searched.best if runs else None
        with _thermo_met(stages):
            optimum = optimise_design(case, mixture, feed, data, options, sizing, name, start=_configuration(before))
        plan.finish(optimum.solver.configurations_solved)
        runs.append(checked_run(k, name, optimum))
    cross = _cross_table(case, mixture, data, sizing, names, runs, plan)
    if cross is not None and cross.beaten():
        # a design built for other prices is cheaper under a scenario's own prices than the optimum its
        # search found (a local optimum: the tray spacing's descent stopped one candidate short): the
        # scenario is searched again from that design, and kept where the search ends cheaper
        # (held to the same control margin; the curve, drawn around the economic optimum, stays)
        ranked = []
        for j, i in cross.beaten():
            run, name = runs[j], names[j]
            plan.kinds += [SEARCH, CHECKS]
            plan.start(f"searching again under '{name}' from the '{names[i]}' design, cheaper under its prices")
            floor = run.margin.reflux_floor if run.margin.factor > 1.0 else None
            again = search_above_floor(case, mixture, feed, data, floor, runs[i].optimum, options, sizing, name)
            plan.finish(again.solver.configurations_solved)
            if again.reported_tac < run.optimum.reported_tac:
                plan.start(f"checking the '{name}' optimum on thermo")
                runs[j] = replace(run, optimum=again, checks=margin_checks(j, name, again, run.margin))
                plan.finish()
            else:
                plan.kinds.pop()
            ranked += _model_ranked(again, runs[i].optimum, i, j)
        plan.kinds += [PRICING] * (len(names) * (len(names) - 1))
        cross = _cross_table(case, mixture, data, sizing, names, runs, plan)
        cross = replace(cross, model_ranked=tuple(ranked))
    optima = [(name, run.optimum) for name, run in zip(names, runs)]
    checked = [(name, run.checks) for name, run in zip(names, runs)]
    margins = [(name, run.margin) for name, run in zip(names, runs)]
    curves = [(name, run.curve) for name, run in zip(names, runs)]
    curve_notes = [note for run in runs for note in run.curve_notes]
    plan.end()
    best = optima[0][1]
    checks = checked[0][1]
    diagram, diagram_notes = _binary_parts(stages, checks.reflux_ratio, case)
    parts = optimum_parts(best, cost_data=data, scenarios=tuple(optima), cross=cross, tac_curves=tuple(curves),
                          scenario_checks=tuple(checked), margins=tuple(margins), **diagram)
    extra = cross.below_zero() + cross.close_notes() if cross is not None else ()
    extra += diagram_notes
    extra += tuple(w if k == 0 else f"scenario '{name}': {w}" for k, (name, c) in enumerate(checked)
                   for w in c.warnings)
    extra += mixture.warnings + tuple(curve_notes)
    parts = _checked(parts, checks)
    extra += _utility_notes(mixture, parts, data, sizing) + price_notes(parts)
    extra += tuple(w for _, margin in margins[:1] for w in margin.warnings + margin.below_floor(
        parts.profile.reflux_ratio))
    return DesignResult(case, summary, feed, stages=stages, parts=parts,
                        warnings=_warnings(stages.shortcut.warnings + best.warnings + extra, parts),
                        options=_given_options(options))


def _utility_notes(mixture, parts: ReportParts, data: CostData, sizing) -> tuple[str, ...]:
    """The reported design's notes on a condenser or reboiler kept off the cheapest utility level."""
    from .optimisation.utility_notes import utility_level_notes

    if parts.sizing is None:
        return ()
    return utility_level_notes(mixture, parts.profile, parts.sizing.condenser, parts.sizing.reboiler, data.levels,
                               sizing.min_approach, None if parts.cost is None else _utility_pricing(
                                   data, parts.cost.scenario, parts.cost.cost_year, parts.cost.currency))


def _utility_pricing(data: CostData, scenario: str, year: int | None, currency: str):
    """The yearly cost of a duty on a level under ``scenario``'s prices, in ``currency`` of ``year``."""
    from .optimisation.utility_notes import UtilityPricing

    seconds = data.settings.operating_hours_per_year * 3600.0
    return UtilityPricing(lambda name, duty: duty * seconds * data.price_per_joule(scenario, name, year), currency)


def _given_options(options) -> tuple[tuple[str, object], ...]:
    """The optimiser options the caller set, for the reports (the others kept their defaults)."""
    from .optimisation.options import OPTIONS

    if not options:
        return ()
    if isinstance(options, dict):
        return tuple(sorted(options.items()))
    return tuple(sorted((name, value) for name, value in options.value().items() if value != OPTIONS[name]))


def _checked(parts: ReportParts, checks: ThermoChecks) -> ReportParts:
    """``parts`` with the thermo checks, and the corrected design in place of the model's where there is one."""
    v = checks.verification
    if v.corrected is None or v.corrected_price is None:
        return replace(parts, checks=checks)
    return replace(parts, checks=checks, profile=v.corrected, sizing=v.corrected_price.sizing,
                   cost=v.corrected_price.cost)


def _binary_parts(stages: StageDesign, reflux_ratio: float, case: Case) -> tuple[dict, tuple[str, ...]]:
    """The McCabe-Thiele construction at the chosen reflux, for the diagrams of a binary, and a note
    where it cannot be stepped there."""
    from .stages import step_stages

    if stages.binary is None:
        return {}, ()
    column = stages.binary.column
    try:
        stepped = step_stages(stages.binary.curve, column.x_distillate, column.x_bottoms, column.z, column.q,
                              reflux_ratio, case.column.condenser == "partial")
    except (InfeasibleSpecError, ConvergenceError):
        # energy balances can let the column run at or below the constant-molar-overflow minimum
        # (water/acetic acid at 1 bar: R 0.531 against 0.546); the diagram then shows the design's stages only
        return {"curve": stages.binary.curve}, (
            f"x-y diagram without the constant-molar-overflow construction: the design's reflux ratio "
            f"{reflux_ratio:.4g} [-] lies at or too near that construction's minimum {stages.minimum_reflux:.4g} [-] "
            "to step it off; the design's own stages are drawn",)
    return {"curve": stages.binary.curve, "stepped": stepped}, ()


def _evaluation_parts(evaluation: DesignEvaluation, data: CostData) -> ReportParts:
    from .reports.tables_design import ReportParts

    sequential = evaluation.sequential
    return ReportParts(profile=evaluation.profile, sizing=sequential.sizing if sequential else None,
                       cost=sequential.cost if sequential else None, cost_data=data,
                       coefficients=sequential.coefficients if sequential else ())


@contextmanager
def _thermo_met(stages: StageDesign):
    """A search that found no column meeting the specifications, where thermo's own stage profile of the
    checks met both, says so: the model's fitted equilibrium is not thermo's there, and the refusal is
    the tool's limit, not the specification's (a carbon dioxide/ethane column's fitted range once stopped
    above its top temperature)."""
    try:
        yield
    except InfeasibleSpecError as failure:
        if type(failure) is not InfeasibleSpecError or not stages.meets_specs:
            raise
        p = stages.profile
        raise InfeasibleSpecError(
            f"{failure}; yet thermo's own column of the checks meets both specifications with {p.stages} stages, "
            f"feed on stage {p.feed_stage}, at reflux ratio {p.reflux_ratio:.4g}: the optimisation model's fitted "
            "equilibrium is not what thermo gives for this case (a limit of this tool; please report the case)"
        ) from None


def _configuration(design) -> tuple[int, int] | None:
    """(stages, feed stage) of a solved ``design``, where a search starts from it; None: no design."""
    return None if design is None else (design.stages, design.feed_stage)


def _given_under_prices(case, mixture, data, sizing, names, parts: ReportParts, optima) -> tuple:
    """With more than one scenario, the given design as reported (its column as sized) priced under each
    scenario's prices, the first the headline's own, beside each scenario's optimum (``optima``, empty when
    not compared)."""
    from .optimisation.pricing import price_profile
    from .reports.tables_design import GivenUnderPrices

    if len(names) < 2 or parts.cost is None:
        return ()
    chosen = replace(sizing, light_key=case.products.light_key, heavy_key=case.products.heavy_key)
    costs = [parts.cost] + [price_profile(parts.profile, mixture, data, chosen, name, case.economics.cost_year)[1]
                            for name in names[1:]]
    return tuple(GivenUnderPrices(name, cost, optima[k] if optima else None)
                 for k, (name, cost) in enumerate(zip(names, costs)))


def _cross_table(case, mixture, data, sizing, names, runs, plan: ProgressPlan) -> CrossTable | None:
    """Each scenario's reported design (``reports.tables_scenarios.reported``: its column fixed, stages, feed,
    reflux, distillate) priced by the sizing and costing layers under every scenario's prices; the diagonal
    is each one's reported TAC."""
    from .optimisation.pricing import price_profile
    from .reports.tables_scenarios import CrossTable, reported

    if len(runs) < 2:
        return None
    rows = []
    for name_i, run in zip(names, runs):
        shown = reported(run.optimum, run.checks)
        chosen = replace(run.optimum.sizing_options or sizing, light_key=case.products.light_key,
                         heavy_key=case.products.heavy_key)
        row = []
        for name_j in names:
            if name_j == name_i:
                row.append(shown.tac)
                continue
            plan.start(f"pricing the '{name_i}' design under the prices of '{name_j}'")
            _, cost = price_profile(shown.profile, mixture, data, chosen, name_j, case.economics.cost_year)
            row.append(cost.tac_per_year)
            plan.finish()
        rows.append(tuple(row))
    return CrossTable(tuple(names), tuple(rows), runs[0].optimum.best.cost.currency)


def _model_ranked(again, other, i: int, j: int) -> list[tuple[int, int, float]]:
    """[(i, j, difference)] where scenario j's search again from design i (``other``) ended on a design its
    model prices ``difference`` [currency/year] below design i's configuration under j's prices; else []."""
    key = (other.best.stages, other.best.feed_stage)
    at_other = next((d for d in again.solved if (d.stages, d.feed_stage) == key), None)
    if at_other is None or again.best.tac >= at_other.tac:
        return []
    return [(i, j, at_other.tac - again.best.tac)]


def _warnings(own: tuple[str, ...], parts: ReportParts) -> tuple[str, ...]:
    from .reports.notes import ordered_warnings

    found = list(own)
    if parts.sizing is not None:
        found += parts.sizing.warnings
    if parts.cost is not None:
        found += parts.cost.warnings
    return ordered_warnings(found, bound=bool(parts.optimum and parts.optimum.limits))


def claim_output(folder: str | Path, label: str = "output folder",
                 case: Case | None = None) -> AbstractContextManager[ClaimedFolder]:
    """Create, check and lock an output folder before any computation; use it with ``with``.

    Raises :class:`~disteco._base.errors.OutputFolderError` naming ``label`` when the folder
    cannot be written or another run holds it. Pass the claimed folder to :func:`write_results`.
    """
    owner = f"case {case.source}" if case is not None and case.source is not None else ""
    return claim_folder(folder, label, owner, OUTPUT_SET)


def _writers() -> tuple:
    """The workbook, figure and result-file writers (imported on first use: see ``__getattr__``)."""
    this = sys.modules[__name__]
    return tuple(getattr(this, name) for name in ("write_workbook", "write_design_figures", "result_json"))


def write_results(result: DesignResult, folder: str | Path | ClaimedFolder, figures: bool = True) -> list[Path]:
    """Write result.json, the workbook and (optionally) the figures into ``folder`` as one set.

    The files are written beside the folder's old set and replace it together (an old
    ``figures`` folder goes too when ``figures`` is false). Returns the paths written.
    """
    if not isinstance(folder, ClaimedFolder):
        with claim_output(folder, case=result.case) as claimed:
            return write_results(result, claimed, figures)
    write_workbook, write_design_figures, result_json = _writers()
    drawn: list[Path] = []
    writers = {WORKBOOK_FILE: lambda path: write_workbook(result, path, result.parts),
               RESULT_FILE: lambda path: write_json(path, result_json(result))}
    if figures:
        writers[FIGURE_FOLDER] = lambda path: drawn.extend(write_design_figures(result.mixture, result.parts, path))
    folder.write_set(writers, OUTPUT_SET)
    return [folder.path / RESULT_FILE, folder.path / WORKBOOK_FILE] + [
        folder.path / FIGURE_FOLDER / p.name for p in drawn]


# Offered here but imported on first use (see ``__getattr__``): the writers pull in openpyxl and
# matplotlib. ``write_results`` looks them up on this module, so replacing one here takes effect.
_LAZY = {"OptimumDesign": ".optimisation.results", "CaseCheck": ".reports.check_result",
         "DesignResult": ".reports.design_result", "write_workbook": ".reports.workbook",
         "write_design_figures": ".reports.figures", "result_json": ".reports.json_result"}


def __getattr__(name: str):
    if name not in _LAZY:
        raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
    value = getattr(importlib.import_module(_LAZY[name], __package__), name)
    globals()[name] = value
    return value


__all__ = ["CaseCheck", "DesignResult", "GivenDesign", "OptimumDesign", "PriceSetting", "check", "claim_output", "cost_data_of", "design", "load_case",
           "mixture_of", "on_mole_basis", "priced_cost_data", "ready_to_design", "write_results"]
