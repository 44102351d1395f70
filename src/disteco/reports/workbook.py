"""The workbook an estimator can use without disteco: tables with units, charts, cautions.

Sheets (in this order, each only when its data exists): Summary, Inputs, Stages,
Equipment, Capital, Utilities, Optimiser, Scenarios, Warnings, Chart data, Charts. Every
table has a title row and a header row with units; numbers are stored as numbers with a
number format; header rows are frozen; column widths are set. Text from the user's files
is written as text and never as a formula.

The file is written through :func:`write_atomically`: a failed run leaves no partial
workbook, and an existing file is replaced only when the new one is complete.
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

from openpyxl import Workbook

from .choices import sizing_table
from .design_result import DesignResult
from .files import write_atomically
from .notes import ordered_warnings
from .tables import (Plot, Table, cautions_table, case_table, components_table, feed_table, mixture_table,
                     products_table, stage_profile_table, warnings_table)
from .tables_checks import checks_table
from .tables_costs import (capital_factors_table, capital_sources_table, capital_table, column_table,
                           equipment_table, exchangers_table, provenance_table, tac_breakdown_table, tac_table,
                           utilities_table)
from .tables_design import ReportParts, design_plots, given_scenarios_table, run_table, summary_table
from .tables_prices import prices_table
from .tables_scenarios import cross_tables, optimum_table, scenario_table, search_table, tac_curve_table
from .workbook_cells import write_tables
from .workbook_charts import write_charts

WORKBOOK_FILE = "design.xlsx"
DATA_SHEET = "Chart data"
CHART_SHEET = "Charts"


@dataclass(frozen=True)
class Sheet:
    """One worksheet: a name of our own and the tables stacked on it."""

    name: str
    tables: tuple[Table, ...]


@dataclass(frozen=True)
class WorkbookContent:
    """Everything the workbook shows: sheets of tables and the plots drawn as native charts."""

    sheets: tuple[Sheet, ...]
    plots: tuple[Plot, ...] = ()


def workbook_content(result: DesignResult, parts: ReportParts = ReportParts()) -> WorkbookContent:
    """Sheets and plots for ``result``; sheets whose data is absent are left out."""
    names = result.case.components
    minimum = result.stages.minimum_reflux if result.stages is not None else None
    summary = [summary_table(result.case.title, parts, minimum)]
    if parts.cost is not None:
        summary.append(tac_table(parts.cost))
    if parts.checks is not None and parts.profile is not None:
        summary.append(checks_table(parts.checks, parts.profile.reflux_ratio, minimum))
    inputs = [run_table(parts, result.options, result.evaluation), case_table(result.case), sizing_table(result.case),
              mixture_table(result.mixture), components_table(result.mixture), feed_table(result.feed, names)]
    if parts.cost is not None and parts.cost_data is not None:
        inputs.append(provenance_table(parts.cost_data, parts.cost, parts.coefficients))
        inputs.append(prices_table(parts))
    cautions = cautions_table(parts.cost.accuracy_band.cautions if parts.cost is not None else ())
    sheets = [Sheet("Summary", tuple(summary) + (cautions,)), Sheet("Inputs", tuple(inputs))]
    if parts.profile is not None:
        sheets.append(Sheet("Stages", (stage_profile_table(parts.profile, names),
                                       products_table(parts.profile, names))))
    if parts.sizing is not None:
        sheets.append(Sheet("Equipment", (equipment_table(parts.sizing), column_table(parts.sizing),
                                          exchangers_table(parts.sizing))))
    if parts.cost is not None:
        sheets.append(Sheet("Capital", (capital_table(parts.cost), tac_breakdown_table(parts.cost),
                                        capital_factors_table(parts.cost), capital_sources_table(parts.cost))))
        sheets.append(Sheet("Utilities", (utilities_table(parts.cost),)))
    if parts.optimum is not None:
        sheets.append(Sheet("Optimiser", (optimum_table(parts.optimum), search_table(parts.optimum))))
    scenarios = _scenario_tables(parts)
    if scenarios:
        sheets.append(Sheet("Scenarios", scenarios))
    sheets.append(Sheet("Warnings", (warnings_table(_all_warnings(result, parts)), cautions)))
    return WorkbookContent(tuple(sheets), design_plots(result.mixture, parts))


def _scenario_tables(parts: ReportParts) -> tuple[Table, ...]:
    tables: list[Table] = []
    if parts.scenarios:
        tables.append(scenario_table(parts.scenarios, parts.scenario_checks))
    if parts.cross is not None:
        tables += cross_tables(parts.cross)
    if parts.given is not None and parts.given.scenarios:
        tables.append(given_scenarios_table(parts.given))
    limits = {name: optimum.stage_limit for name, optimum in parts.scenarios}
    tables += [tac_curve_table(designs, name, limits.get(name)) for name, designs in parts.tac_curves if designs]
    return tuple(tables)


def _all_warnings(result: DesignResult, parts: ReportParts) -> tuple[str, ...]:
    """The run's warnings, then those of sizing, costing, the optimiser and the cross table not yet listed."""
    extra = []
    for more in (parts.sizing.warnings if parts.sizing else (), parts.cost.warnings if parts.cost else (),
                 parts.optimum.warnings if parts.optimum else (), parts.cross.below_zero() if parts.cross else ()):
        extra += more
    # the run's own texts come last, so where one differs from an extra only in its numbers, the run's is kept
    return ordered_warnings(extra + list(result.warnings), bound=bool(parts.optimum and parts.optimum.limits))


def build_workbook(content: WorkbookContent) -> Workbook:
    """An openpyxl workbook holding ``content`` (not yet saved)."""
    book = Workbook()
    book.remove(book.active)
    for sheet in content.sheets:
        write_tables(book.create_sheet(sheet.name), sheet.tables)
    if content.plots:
        data_ws = book.create_sheet(DATA_SHEET)
        chart_ws = book.create_sheet(CHART_SHEET)
        write_charts(data_ws, chart_ws, content.plots)
    book.properties.title = "disteco design workbook"
    book.properties.creator = "disteco"
    return book


def save_workbook(content: WorkbookContent, path: str | Path) -> Path:
    """Write ``content`` to ``path`` atomically; return the path."""
    path = Path(path)
    book = build_workbook(content)
    write_atomically(path, lambda tmp: book.save(tmp))
    return path


def write_workbook(result: DesignResult, path: str | Path, parts: ReportParts = ReportParts()) -> Path:
    """Build and write the design workbook of ``result`` to ``path`` (an .xlsx file)."""
    return save_workbook(workbook_content(result, parts), path)
