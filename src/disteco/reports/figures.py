"""PNG figures of the design for reports and slides (matplotlib, no display needed).

The figures draw the same :class:`Plot` data as the workbook's charts, so a number read
off a figure is the number in the workbook and in result.json.
"""

from __future__ import annotations

import math
import multiprocessing
import os
from pathlib import Path

import matplotlib

matplotlib.use("Agg")  # files only; never open a window

from matplotlib.figure import Figure  # noqa: E402  (after the backend is chosen)
from matplotlib.ticker import MaxNLocator, StrMethodFormatter  # noqa: E402

from .._base.cores import can_fork, usable_cores  # noqa: E402
from .files import write_atomically  # noqa: E402
from ..properties import MixtureSummary  # noqa: E402
from .tables import Note, Plot, Series  # noqa: E402
from .tables_design import ReportParts, design_plots  # noqa: E402

FIGURE_SIZE = (6.4, 4.6)  # inch, without a legend below the axes
LEGEND_INSIDE = 6  # series a legend inside the axes holds; a longer one goes below
LEGEND_ROW = 0.17  # inch of figure height per legend row below the axes
NOTE_GAP = 0.025  # least distance between two notes of one series, as a fraction of the x range
DPI = 150


def literal(text: str) -> str:
    """``text`` with every dollar sign escaped, so matplotlib draws it as written and never reads
    a pair of them (in a scenario name or a currency, say) as mathematical text."""
    return text.replace("$", r"\$")


def readable_notes(plot: Plot, gap: float = NOTE_GAP) -> list[Note]:
    """The notes that do not crowd one another: along each colour, a note closer than ``gap``
    (a fraction of the x range) to the last one kept is left out; the data table holds them all."""
    if not plot.notes:
        return []
    low, high = plot.x_limits or (min(n.x for n in plot.notes), max(n.x for n in plot.notes))
    span = (high - low) or 1.0
    kept: list[Note] = []
    last: dict[str | None, float] = {}
    for note in sorted(plot.notes, key=lambda n: (n.colour or "", n.x)):
        if note.colour in last and (note.x - last[note.colour]) / span < gap:
            continue
        kept.append(note)
        last[note.colour] = note.x
    return kept


def _draw_series(axes, series: Series, colour: str, dots: bool) -> None:
    label = literal(series.name)
    if series.style == "markers":
        axes.plot(series.x, series.y, linestyle="", marker="o", markersize=4.5, color=colour, label=label)
    elif series.style == "open_markers":
        axes.plot(series.x, series.y, linestyle="", marker="o", markersize=7, markerfacecolor="none",
                  markeredgewidth=1.2, color=colour, label=label)
    elif series.style == "highlight":
        axes.plot(series.x, series.y, linestyle="", marker="D", markersize=8, markerfacecolor=colour,
                  markeredgecolor="#222222", markeredgewidth=0.8, color=colour, label=label, zorder=5)
    elif series.style == "guide":
        axes.plot(series.x, series.y, linestyle=":", linewidth=1.2, color=colour, label=label)
    elif series.style == "dashed":
        axes.plot(series.x, series.y, linestyle="--", linewidth=1.0, color=colour, label=label)
    else:
        dotted = series.style == "line_markers" or dots
        axes.plot(series.x, series.y, linestyle="-", linewidth=1.5, marker="o" if dotted else "",
                  markersize=3, color=colour, label=label)


def draw(plot: Plot) -> Figure:
    """A matplotlib Figure of ``plot``: one line per series in the series' order, then the notes."""
    long_legend = len(plot.series) > LEGEND_INSIDE
    legend_rows = math.ceil(len(plot.series) / 2) if long_legend else 0
    figure = Figure(figsize=(FIGURE_SIZE[0], FIGURE_SIZE[1] + LEGEND_ROW * legend_rows), dpi=DPI,
                    layout="constrained")
    axes = figure.add_subplot()
    for k, series in enumerate(plot.series):
        _draw_series(axes, series, "#" + plot.colour_of(k), plot.stage_axis)
    for note in readable_notes(plot):
        # upright text above the point: neighbouring points close in x keep their labels apart
        axes.annotate(literal(note.text), (note.x, note.y), xytext=(0, 6), textcoords="offset points",
                      ha="center", va="bottom", rotation=90, fontsize=6.5, color="#" + (note.colour or "333333"))
    axes.set_title(literal(plot.title), fontsize=10)
    axes.set_xlabel(literal(plot.x_label))
    axes.set_ylabel(literal(plot.y_label))
    if plot.x_limits:
        axes.set_xlim(*plot.x_limits)
    if plot.y_limits:
        axes.set_ylim(*plot.y_limits)
    if plot.stage_axis:
        axes.invert_yaxis()  # stage 1 at the top, as in the column
    for axis, values in ((axes.xaxis, [v for s in plot.series for v in s.x]),
                         (axes.yaxis, [v for s in plot.series for v in s.y])):
        if values and all(float(v).is_integer() for v in values):
            axis.set_major_locator(MaxNLocator(integer=True))
        if values and max(abs(v) for v in values) >= 1e4:
            axis.set_major_formatter(StrMethodFormatter("{x:,.0f}"))  # money and duties with separators
    if plot.x_limits == (0.0, 1.0) and plot.y_limits == (0.0, 1.0):
        axes.set_aspect("equal")
    axes.grid(True, color="#DDDDDD", linewidth=0.6)
    axes.set_axisbelow(True)
    axes.spines["right"].set_visible(False)
    if plot.top_axis is not None:
        divisor = plot.top_axis.divisor
        top = axes.secondary_xaxis("top", functions=(lambda r: r / divisor, lambda f: f * divisor))
        top.set_xlabel(literal(plot.top_axis.label))
    else:
        axes.spines["top"].set_visible(False)
    if long_legend:  # below the axes, where it hides no data
        figure.legend(fontsize=7, frameon=False, loc="outside lower center", ncols=2)
    else:
        axes.legend(fontsize=8, frameon=False, loc="best")
    return figure


def write_figure(plot: Plot, folder: str | Path) -> Path:
    """Draw ``plot`` into ``folder``/<plot.name>.png atomically; return the path."""
    path = Path(folder) / f"{plot.name}.png"
    figure = draw(plot)
    write_atomically(path, lambda tmp: figure.savefig(tmp, format="png"))
    return path


def write_figures(plots: tuple[Plot, ...] | list[Plot], folder: str | Path) -> list[Path]:
    """Write one PNG per plot into ``folder``; return the paths in the plots' order.

    Where a second core is free and processes fork, every other plot is drawn by a forked child
    beside this process (the same files; measured on the benzene example's five figures, four
    times each way on an idle 2-core machine: 0.60-0.72 s drawn here, 0.35-0.46 s with the
    child). Where the child fails, its plots are drawn here, which meets the failure in this
    process.
    """
    plots = list(plots)
    theirs = plots[1::2]
    child = _draw_beside(theirs, folder) if theirs else None
    try:
        mine = [write_figure(plot, folder) for plot in plots[0::2]]
        if child is not None:
            child.join()
        drawn = [Path(folder) / f"{plot.name}.png" for plot in theirs] if child is not None and \
            child.exitcode == 0 else [write_figure(plot, folder) for plot in theirs]
    finally:
        if child is not None and child.is_alive():  # this process was interrupted
            child.terminate()
            child.join()
    ordered = [None] * len(plots)
    ordered[0::2], ordered[1::2] = mine, drawn
    return ordered


def _draw_beside(plots: list[Plot], folder: str | Path):
    """A started child process drawing ``plots`` into ``folder``, or None where none can run beside."""
    if usable_cores() < 2 or not can_fork():
        return None
    child = multiprocessing.get_context("fork").Process(target=_draw_child, args=(plots, folder),
                                                       name="disteco-figures", daemon=True)
    child.start()
    return child


def _draw_child(plots: list[Plot], folder: str | Path) -> None:
    try:
        for plot in plots:
            write_figure(plot, folder)
    except BaseException:  # no traceback from the child: the parent draws these plots again and reports
        os._exit(1)


def write_design_figures(mixture: MixtureSummary, parts: ReportParts, folder: str | Path) -> list[Path]:
    """Write every plot whose data ``parts`` holds into ``folder``; return the paths."""
    return write_figures(design_plots(mixture, parts), folder)
