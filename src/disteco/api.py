"""The Python API: load a case, check it, run the design, write the results.

Engineers use this from notebooks and scripts; the command line is a thin layer over it.
"""

from __future__ import annotations

from contextlib import AbstractContextManager
from dataclasses import dataclass, replace
from pathlib import Path

from ._base.errors import CaseError, CostDataError
from .case import Case, load_case
from .costing import CostData, load_cost_data, resolve_cost_year, resolve_scenarios
from .optimisation.curves import reflux_curve
from .optimisation.design import evaluate_design, optimise_design
from .optimisation.given import check_decisions
from .optimisation.options import OPTIONS
from .optimisation.results import DesignEvaluation, OptimumDesign
from .optimisation.thermo_checks import ThermoChecks, thermo_checks
from .properties import Mixture, MixtureSummary, build_mixture, feed_state, summarise_mixture
from .reports.design_result import DesignResult
from .reports.figures import write_design_figures
from .reports.files import ClaimedFolder, claim_folder, write_json
from .reports.json_result import result_json
from .reports.progress import Progress, ProgressPlan, run_steps
from .reports.tables_design import ReportParts, optimum_parts
from .reports.tables_scenarios import CrossTable
from .reports.workbook import write_workbook
from .sizing.options import SizingOptions
from .stages import StageDesign, design_stages, step_stages

RESULT_FILE = "result.json"
WORKBOOK_FILE = "design.xlsx"
FIGURE_FOLDER = "figures"
OUTPUT_SET = (RESULT_FILE, WORKBOOK_FILE, FIGURE_FOLDER)  # what a run owns in its output folder


@dataclass(frozen=True)
class GivenDesign:
    """A design to price instead of optimising: reflux ratio [-], stages (reboiler included), feed stage."""

    reflux_ratio: float
    stages: int
    feed_stage: int

    def __post_init__(self):
        # What needs no mixture is checked here; the minima when the design is priced (before any solve).
        check_decisions(self.reflux_ratio, self.stages, self.feed_stage)


def mixture_of(case: Case) -> Mixture:
    """The case's mixture (built once and cached)."""
    return build_mixture(case.components, case.thermo, case.column.top_pressure)


def check(case: Case) -> MixtureSummary:
    """Load the case's cost data and scenarios, resolve the components and summarise the
    mixture at the column's top pressure."""
    data = cost_data_of(case)
    resolve_scenarios(data, case.economics.scenarios)
    resolve_cost_year(data, case.economics.cost_year)
    mixture = mixture_of(case)
    return summarise_mixture(mixture, case.feed.composition, case.column.top_pressure,
                             case.products.light_key, case.products.heavy_key)


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


def design(case: Case, given: GivenDesign | None = None, scenarios: tuple[str, ...] = (),
           options: dict | None = None, progress: Progress | None = None) -> DesignResult:
    """Design ``case``: stages, then the lowest-TAC design for every price scenario (or price ``given``).

    ``scenarios`` overrides the case's scenario names; ``options`` are optimiser options
    (see :mod:`disteco.optimisation.options`); ``progress`` is called with a
    :class:`~disteco.reports.progress.ProgressStep` as each step of work starts, and once at the end.
    """
    mixture = mixture_of(case)
    mixture.clear_warnings()  # the mixture is cached across runs; its notes are this run's
    data = cost_data_of(case)
    names = resolve_scenarios(data, scenarios or case.economics.scenarios)
    summary = check(case)
    feed = feed_state(case.feed, mixture, case.column.top_pressure)
    plan = ProgressPlan(run_steps(len(names), given is not None), progress)
    plan.start("shortcut design and stage profile")
    stages = design_stages(mixture, feed, case.products, case.column)
    plan.finish()
    sizing = SizingOptions(light_key=case.products.light_key, heavy_key=case.products.heavy_key)
    if given is not None:
        plan.start(f"pricing the given design under '{names[0]}'")
        evaluation = evaluate_design(case, mixture, feed, data, given.reflux_ratio, given.stages,
                                     given.feed_stage, options, sizing, names[0])
        plan.finish()
        plan.start("checking the design on thermo (energy balances, minimum reflux)")
        checks = thermo_checks(case, mixture, feed, data, evaluation, stages, options, sizing, names[0])
        plan.finish()
        plan.end()
        parts = _checked(_evaluation_parts(evaluation, data), checks)
        return DesignResult(case, summary, feed, stages=stages, parts=parts, evaluation=evaluation,
                            warnings=_warnings(stages.shortcut.warnings + checks.warnings + evaluation.warnings
                                               + mixture.warnings, parts), options=_given_options(options))
    optima, curves, checked = [], [], []
    for k, name in enumerate(names):
        plan.start(f"searching stages, feed stage and reflux under '{name}' ({k + 1} of {len(names)})")
        optimum = optimise_design(case, mixture, feed, data, options, sizing, name)
        plan.finish(optimum.solver.configurations_solved)
        optima.append((name, optimum))
        plan.start(f"checking the '{name}' optimum on thermo" + (" (with minimum reflux and fit)" if k == 0 else ""))
        checked.append((name, thermo_checks(case, mixture, feed, data, optimum.best, stages, options, sizing, name,
                                            full=k == 0, fitted=optimum.problem.fitted if optimum.problem else None)))
        plan.finish()
        plan.start(f"TAC against reflux ratio under '{name}'")
        curves.append((name, reflux_curve(case, mixture, feed, data, optimum, stages.table, options,
                                                 sizing, name)))
        plan.finish()
    cross = _cross_table(case, mixture, feed, data, options, sizing, optima, plan)
    plan.end()
    best = optima[0][1]
    checks = checked[0][1]
    parts = optimum_parts(best, cost_data=data, scenarios=tuple(optima), cross=cross, tac_curves=tuple(curves),
                          scenario_checks=tuple(checked), **_binary_parts(stages, checks.reflux_ratio, case))
    extra = tuple(cross.below_zero()) if cross is not None else ()
    extra += tuple(w if k == 0 else f"scenario '{name}': {w}" for k, (name, c) in enumerate(checked)
                   for w in c.warnings)
    extra += mixture.warnings
    parts = _checked(parts, checks)
    return DesignResult(case, summary, feed, stages=stages, parts=parts,
                        warnings=_warnings(stages.shortcut.warnings + best.warnings + extra, parts),
                        options=_given_options(options))


def _given_options(options) -> tuple[tuple[str, object], ...]:
    """The optimiser options the caller set, for the reports (the others kept their defaults)."""
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


def _binary_parts(stages: StageDesign, reflux_ratio: float, case: Case) -> dict:
    """The McCabe-Thiele construction at the chosen reflux, for the diagrams of a binary."""
    if stages.binary is None:
        return {}
    column = stages.binary.column
    stepped = step_stages(stages.binary.curve, column.x_distillate, column.x_bottoms, column.z, column.q,
                          reflux_ratio, case.column.condenser == "partial")
    return {"curve": stages.binary.curve, "stepped": stepped}


def _evaluation_parts(evaluation: DesignEvaluation, data: CostData) -> ReportParts:
    sequential = evaluation.sequential
    return ReportParts(profile=evaluation.profile, sizing=sequential.sizing if sequential else None,
                       cost=sequential.cost if sequential else None, cost_data=data,
                       coefficients=sequential.coefficients if sequential else ())


def _cross_table(case, mixture, feed, data, options, sizing, optima, plan: ProgressPlan) -> CrossTable | None:
    """Each scenario's optimum priced by the model under every other scenario's prices."""
    if len(optima) < 2:
        return None
    names = tuple(name for name, _ in optima)
    rows = []
    for i, (name_i, optimum_i) in enumerate(optima):
        row = []
        best = optimum_i.best
        for j, name_j in enumerate(names):
            if i == j:
                row.append(best.tac)
                continue
            plan.start(f"pricing the '{name_i}' design under the prices of '{name_j}'")
            evaluation = evaluate_design(case, mixture, feed, data, best.reflux_ratio, best.stages,
                                         best.feed_stage, options, sizing, name_j, problem=optimum_i.problem)
            plan.finish()
            row.append(evaluation.tac)
        rows.append(tuple(row))
    return CrossTable(names, tuple(rows), optima[0][1].best.cost.currency)


def _warnings(own: tuple[str, ...], parts: ReportParts) -> tuple[str, ...]:
    found = list(own)
    if parts.sizing is not None:
        found += parts.sizing.warnings
    if parts.cost is not None:
        found += parts.cost.warnings
    return tuple(dict.fromkeys(found))  # in order, without repeats


def claim_output(folder: str | Path, label: str = "output folder",
                 case: Case | None = None) -> AbstractContextManager[ClaimedFolder]:
    """Create, check and lock an output folder before any computation; use it with ``with``.

    Raises :class:`~disteco._base.errors.OutputFolderError` naming ``label`` when the folder
    cannot be written or another run holds it. Pass the claimed folder to :func:`write_results`.
    """
    owner = f"case {case.source}" if case is not None and case.source is not None else ""
    return claim_folder(folder, label, owner)


def write_results(result: DesignResult, folder: str | Path | ClaimedFolder, figures: bool = True) -> list[Path]:
    """Write result.json, the workbook and (optionally) the figures into ``folder`` as one set.

    The files are written beside the folder's old set and replace it together (an old
    ``figures`` folder goes too when ``figures`` is false). Returns the paths written.
    """
    if not isinstance(folder, ClaimedFolder):
        with claim_output(folder, case=result.case) as claimed:
            return write_results(result, claimed, figures)
    drawn: list[Path] = []
    writers = {WORKBOOK_FILE: lambda path: write_workbook(result, path, result.parts),
               RESULT_FILE: lambda path: write_json(path, result_json(result))}
    if figures:
        writers[FIGURE_FOLDER] = lambda path: drawn.extend(write_design_figures(result.mixture, result.parts, path))
    folder.write_set(writers, OUTPUT_SET)
    return [folder.path / RESULT_FILE, folder.path / WORKBOOK_FILE] + [
        folder.path / FIGURE_FOLDER / p.name for p in drawn]


__all__ = ["GivenDesign", "OptimumDesign", "check", "claim_output", "cost_data_of", "design", "load_case",
           "mixture_of", "write_results"]
