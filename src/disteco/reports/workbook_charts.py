"""Native spreadsheet charts (scatter charts) from :class:`Plot` data.

Each plot's series are written as pairs of columns on a data sheet; the chart on the
charts sheet refers to those cells, so an estimator can see and reuse the numbers.
"""

from __future__ import annotations

from openpyxl.chart import Reference, ScatterChart
from openpyxl.chart import Series as ChartSeries
from openpyxl.chart.layout import Layout, ManualLayout
from openpyxl.utils import get_column_letter
from openpyxl.worksheet.worksheet import Worksheet

from .tables import MIXED, Plot, Series
from .workbook_cells import LABEL_UNIT, MONEY_UNIT, TITLE_FONT, put_text, put_value

CHART_WIDTH = 17.0  # cm
CHART_HEIGHT = 11.0  # cm
GRID_COLUMNS = 2  # charts side by side on the charts sheet
ROWS_PER_CHART = 24  # spreadsheet rows (0.53 cm each) a chart of CHART_HEIGHT covers, with a gap
COLUMNS_PER_CHART = 11  # spreadsheet columns (1.69 cm each at the default width) a 17 cm chart covers, with a gap


def write_plot_data(ws: Worksheet, plot: Plot, left: int) -> list[tuple[Reference, Reference]]:
    """Write the series of ``plot`` from column ``left``; return (x, y) references per series."""
    put_text(ws, 1, left, plot.title).font = TITLE_FONT
    refs = []
    column = left
    for series in plot.series:
        put_text(ws, 2, column, series.name)
        put_text(ws, 3, column, plot.x_label)
        put_text(ws, 3, column + 1, plot.y_label)
        for i, (x, y) in enumerate(zip(series.x, series.y)):
            put_value(ws, 4 + i, column, x, MIXED, axis_unit(plot.x_label))
            put_value(ws, 4 + i, column + 1, y, MIXED, axis_unit(plot.y_label))
        last = 3 + max(len(series.x), 1)
        refs.append((Reference(ws, min_col=column, min_row=4, max_row=last),
                     Reference(ws, min_col=column + 1, min_row=4, max_row=last)))
        ws.column_dimensions[get_column_letter(column)].width = 16.0
        ws.column_dimensions[get_column_letter(column + 1)].width = 16.0
        column += 2
    return refs


def axis_unit(label: str) -> str | None:
    """The unit in brackets at the end of an axis label."""
    found = LABEL_UNIT.search(label)
    return found.group(1) if found else None


def axis_format(label: str) -> str:
    """Axis numbers: money and duties with thousands separators, others as the spreadsheet sees fit."""
    unit = axis_unit(label)
    return "#,##0" if unit is not None and (MONEY_UNIT.fullmatch(unit) or unit == "kW") else "General"


def scatter_chart(plot: Plot, refs: list[tuple[Reference, Reference]]) -> ScatterChart:
    """A scatter chart with straight lines (or markers only) for each series of ``plot``."""
    chart = ScatterChart()
    chart.title = plot.title
    chart.style = 2
    chart.scatterStyle = "lineMarker"
    chart.width, chart.height = CHART_WIDTH, CHART_HEIGHT
    if plot.x_limits == (0.0, 1.0) and plot.y_limits == (0.0, 1.0):
        chart.width = CHART_HEIGHT * 1.15  # about square plot area for an x-y diagram
    chart.x_axis.title = plot.x_label
    chart.y_axis.title = plot.y_label
    # Recent spreadsheet versions hide axes that are not explicitly kept.
    chart.x_axis.delete = False
    chart.y_axis.delete = False
    chart.x_axis.majorGridlines = None
    # Axis labels in a general format, not the four decimals of the data cells.
    chart.x_axis.number_format = axis_format(plot.x_label)
    chart.y_axis.number_format = axis_format(plot.y_label)
    chart.x_axis.axPos = "b"
    if plot.x_limits:
        chart.x_axis.scaling.min, chart.x_axis.scaling.max = plot.x_limits
    if plot.y_limits:
        chart.y_axis.scaling.min, chart.y_axis.scaling.max = plot.y_limits
    if plot.stage_axis:
        chart.y_axis.scaling.orientation = "maxMin"  # stage 1 at the top, as in the column
        chart.y_axis.scaling.min = 1.0
        chart.x_axis.crosses = "max"  # keep the horizontal axis at the bottom (the last stage)
    chart.legend.position = "b"
    chart.layout = Layout(manualLayout=ManualLayout(x=0.02, y=0.1, w=0.95, h=0.62))
    for k, (series, (x_ref, y_ref)) in enumerate(zip(plot.series, refs)):
        chart.series.append(_chart_series(series, plot.colour_of(k), x_ref, y_ref))
    return chart


def _chart_series(series: Series, colour: str, x_ref: Reference, y_ref: Reference) -> ChartSeries:
    """One series drawn in its style: line, markers, both, dashed, a dotted guide or one large marker."""
    line = ChartSeries(y_ref, x_ref, title=series.name)
    line.smooth = False
    if series.style in ("markers", "open_markers", "line_markers", "highlight"):
        line.marker.symbol = "diamond" if series.style == "highlight" else "circle"
        line.marker.size = {"markers": 6, "open_markers": 8, "line_markers": 4, "highlight": 9}[series.style]
        if series.style == "open_markers":
            line.marker.graphicalProperties.noFill = True
        else:
            line.marker.graphicalProperties.solidFill = colour
        line.marker.graphicalProperties.line.solidFill = colour
    else:
        line.marker.symbol = "none"
    if series.style in ("markers", "open_markers", "highlight"):
        line.graphicalProperties.line.noFill = True
    else:
        line.graphicalProperties.line.solidFill = colour
        line.graphicalProperties.line.width = 12700 if series.style == "guide" else 22000  # EMU: 1 pt, 1.7 pt
        if series.style in ("dashed", "guide"):
            line.graphicalProperties.line.dashStyle = "dash" if series.style == "dashed" else "sysDot"
    return line


def chart_anchor(index: int) -> str:
    """Top-left cell of chart ``index`` in a grid of ``GRID_COLUMNS`` charts a row."""
    row, column = divmod(index, GRID_COLUMNS)
    return f"{get_column_letter(1 + column * COLUMNS_PER_CHART)}{1 + row * ROWS_PER_CHART}"


def write_charts(data_ws: Worksheet, chart_ws: Worksheet, plots: tuple[Plot, ...] | list[Plot]) -> None:
    """Write every plot's data on ``data_ws`` (side by side) and its chart on ``chart_ws``, in a grid."""
    left = 1
    for k, plot in enumerate(plots):
        refs = write_plot_data(data_ws, plot, left)
        left += 2 * len(plot.series) + 1
        chart_ws.add_chart(scatter_chart(plot, refs), chart_anchor(k))
    data_ws.freeze_panes = "A4"
