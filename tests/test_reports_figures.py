"""PNG figures: written, not blank, axes with units, and drawing exactly the result's data."""

from __future__ import annotations

import re

import numpy as np
import pytest
from matplotlib.image import imread

from disteco.reports.figures import draw, write_design_figures, write_figures
from disteco.reports.tables_design import design_plots, optimum_parts

from test_reports_scenarios import scenario_study
from test_reports_tables import design_parts

UNIT = re.compile(r"\[[^\]]+\]$")


@pytest.fixture(scope="module")
def plots():
    result, parts = design_parts()
    return design_plots(result.mixture, parts)


@pytest.fixture(scope="module")
def scenario_plots():
    """Every plot of a run under two price scenarios (the reflux grid of ``scenario_study``)."""
    result, parts = design_parts()
    optima, cross, curves = scenario_study()
    full = optimum_parts(optima[0][1], curve=parts.curve, stepped=parts.stepped, scenarios=optima, cross=cross,
                         tac_curves=curves)
    return {plot.name: plot for plot in design_plots(result.mixture, full)}, optima, curves


def test_pngs_exist_and_are_not_blank(plots, tmp_path):
    paths = write_figures(plots, tmp_path)
    assert [p.name for p in paths] == ["temperature_profile.png", "composition_profile.png", "xy_diagram.png"]
    for path in paths:
        assert path.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
        pixels = imread(path)
        assert pixels.shape[0] > 400 and pixels.shape[1] > 600
        assert float(np.var(pixels[..., :3])) > 1e-3, path.name
    assert sorted(p.name for p in tmp_path.iterdir()) == sorted(p.name for p in paths)  # no leftovers


def test_figures_drawn_beside_are_the_figures_drawn_here(plots, tmp_path, monkeypatch):
    """Every other plot drawn by a forked child gives the same bytes as all drawn in this process; a
    child that fails has its plots drawn here."""
    import disteco.reports.figures as figures

    beside = write_figures(plots, tmp_path / "beside")
    monkeypatch.setattr(figures, "usable_cores", lambda: 1)
    here = write_figures(plots, tmp_path / "here")
    assert [p.name for p in beside] == [p.name for p in here]
    assert all(a.read_bytes() == b.read_bytes() for a, b in zip(beside, here))
    monkeypatch.setattr(figures, "usable_cores", lambda: 2)
    monkeypatch.setattr(figures, "_draw_child", lambda plots, folder: figures.os._exit(1))
    again = write_figures(plots, tmp_path / "again")
    assert all(a.read_bytes() == b.read_bytes() for a, b in zip(again, here))


def test_every_axis_carries_its_unit(plots, scenario_plots):
    for plot in list(plots) + list(scenario_plots[0].values()):
        figure = draw(plot)
        axes = figure.axes[0]
        assert UNIT.search(axes.get_xlabel()) and UNIT.search(axes.get_ylabel()), plot.name
        for extra in axes.child_axes:  # the R/R_min scale along the top
            assert UNIT.search(extra.get_xlabel()), plot.name


def test_plotted_lines_equal_result_data(plots):
    _, parts = design_parts()
    for plot in plots:
        lines = draw(plot).axes[0].get_lines()
        assert [line.get_label() for line in lines] == [s.name for s in plot.series]
        for line, series in zip(lines, plot.series):
            assert tuple(line.get_xdata()) == series.x
            assert tuple(line.get_ydata()) == series.y
    temperature = draw(plots[0]).axes[0]
    assert tuple(temperature.get_lines()[0].get_xdata()) == pytest.approx([t - 273.15 for t in parts.profile.T],
                                                                          rel=1e-15)
    assert temperature.yaxis_inverted()
    feed = temperature.get_lines()[1]
    assert feed.get_label() == f"Feed stage {parts.profile.feed_stage}"
    assert tuple(feed.get_ydata()) == (parts.profile.feed_stage,) * 2


def test_xy_diagram_tells_the_design_from_the_construction(plots):
    """The design's own stages (rigorous profile) and the constant-molar-overflow steps are two
    series; the staircase of the design has a corner on every stage of the profile."""
    _, parts = design_parts()
    p = parts.profile
    axes = draw(plots[2]).axes[0]
    lines = {line.get_label(): line for line in axes.get_lines()}
    steps = lines[f"Constant-molar-overflow steps ({parts.stepped.stages:.1f})"]
    assert list(zip(steps.get_xdata(), steps.get_ydata())) == list(parts.stepped.steps)
    design = lines[f"Design stages, rigorous profile ({p.stages})"]
    corners = list(zip(design.get_xdata(), design.get_ydata()))
    assert len(corners) == 2 * p.stages + 1
    assert [c for c in corners if c in {(x[0], y[0]) for x, y in zip(p.x, p.y)}] == [(x[0], y[0]) for x, y in
                                                                                      zip(p.x, p.y)]
    assert design.get_color() != steps.get_color()
    products = lines["Distillate and bottoms"]
    assert tuple(products.get_xdata()) == (p.distillate_composition[0], p.bottoms_composition[0])
    assert tuple(lines["Feed"].get_xdata()) == (parts.stepped.z,)
    assert f"R = {p.reflux_ratio:.3f}, N = {p.stages}" in axes.get_title()


def test_xy_diagram_marks_an_azeotrope():
    from dataclasses import replace

    from disteco.properties.binary import Azeotrope
    from disteco.reports.plots import xy_plot

    result, parts = design_parts()
    mixture = replace(result.mixture, azeotropes=(
        Azeotrope(result.mixture.heavy_key, result.mixture.light_key, 101325.0, 0.3, 350.0, "minimum-boiling"),))
    plot = xy_plot(parts.curve, mixture, parts.stepped, parts.profile)
    azeotrope = plot.series[-1]
    assert azeotrope.name == "Azeotrope (minimum-boiling)" and azeotrope.x == azeotrope.y == (0.7,)


def test_tac_figure_overlays_the_scenarios(scenario_plots):
    named, optima, curves = scenario_plots
    plot = named["tac_vs_reflux"]
    figure = draw(plot)
    axes = figure.axes[0]
    lines = {line.get_label(): line for line in axes.get_lines()}
    for (name, designs), (_, optimum) in zip(curves, optima):
        tac = lines[f"TAC, {name}"]
        assert tuple(tac.get_ydata()) == tuple(d.tac for d in sorted(designs, key=lambda d: d.reflux_ratio))
        best = optimum.best
        assert lines[f"Lowest TAC, {name}: R = {best.reflux_ratio:.3f}, N = {best.stages}"].get_xdata()[0] \
            == best.reflux_ratio
    r_min = optima[0][1].minimum_reflux_ratio
    assert optima[0][1].minimum_by("reflux") == "McCabe-Thiele"  # the study's minima are stepped
    assert tuple(lines[f"Minimum reflux, McCabe-Thiele ({r_min:.3f})"].get_xdata()) == (r_min, r_min)
    assert [(n.x, n.y, n.text) for n in plot.notes] == [(d.reflux_ratio, d.cost.tac_per_year, str(d.stages))
                                                     for _, designs in curves
                                                     for d in sorted(designs, key=lambda d: d.reflux_ratio)]
    drawn = [(t.xy, t.get_text()) for t in axes.texts]  # crowded labels are left out, none invented
    assert drawn and set(drawn) <= {((n.x, n.y), n.text) for n in plot.notes}
    (top,) = axes.child_axes
    assert top.get_xlabel() == "R / R_min, McCabe-Thiele [-]"
    forward, inverse = top._functions  # R -> R/R_min and back (matplotlib keeps them on the secondary axis)
    assert forward(np.array([r_min, 2.0 * r_min])) == pytest.approx([1.0, 2.0], rel=1e-12)
    assert inverse(np.array([1.5])) == pytest.approx([1.5 * r_min], rel=1e-12)


def test_crowded_notes_are_thinned_per_series():
    from disteco.reports.figures import readable_notes
    from disteco.reports.tables import Note, Plot, Series

    notes = (Note(1.0, 5.0, "30", "aaaaaa"), Note(1.01, 5.0, "29", "aaaaaa"), Note(1.5, 5.0, "20", "aaaaaa"),
             Note(1.01, 3.0, "29", "bbbbbb"))
    plot = Plot("p", "t", "R [-]", "TAC [USD/year]", (Series("s", (1.0, 2.0), (1.0, 2.0)),), x_limits=(1.0, 2.0),
                notes=notes)
    assert [n.text for n in readable_notes(plot)] == ["30", "20", "29"]  # 1.01 is 1 % of the range from 1.0


def test_tac_figure_takes_the_energy_balance_minimum_for_its_top_scale(scenario_plots):
    from disteco.reports.plots import tac_curve_plot

    _, optima, curves = scenario_plots
    plot = tac_curve_plot(curves, optima[0][1], energy_balance_minimum=1.62)
    assert plot.top_axis.divisor == 1.62 and "energy balances" in plot.top_axis.label
    r_min = optima[0][1].minimum_reflux_ratio
    assert [s.name for s in plot.series if s.style == "guide"] == [f"Minimum reflux, McCabe-Thiele ({r_min:.3f})",
                                                                  "Minimum reflux, energy balances (1.620)"]


def test_stages_against_duty_has_both_asymptotes_and_the_chosen_design(scenario_plots):
    """Duty at minimum reflux: boil-up (R + 1) D - (1 - q) F is linear in R, so the straight line
    through the curve's (R, duty) points, carried to R_min, is the vertical asymptote."""
    from disteco.reports.plots import duty_at_reflux

    named, optima, curves = scenario_plots
    plot = named["stages_vs_duty"]
    series = {s.name.split(" (")[0].split(":")[0]: s for s in plot.series}
    optimum = optima[0][1]
    assert series["Minimum stages, McCabe-Thiele"].y == (optimum.minimum_stages,) * 2
    duty = duty_at_reflux(curves[0][1], optimum.minimum_reflux_ratio) / 1e3
    assert series["Duty at minimum reflux, McCabe-Thiele"].x == (duty, duty)
    designs = curves[0][1]
    lowest_duty = min(d.sizes.reboiler_duty for d in designs) / 1e3
    assert 0.9 * lowest_duty < duty < lowest_duty  # a little below the duty of the design nearest R_min
    chosen = series["Chosen design"]
    assert chosen.x == (optimum.best.sizes.reboiler_duty / 1e3,) and chosen.y == (optimum.best.stages,)
    assert duty_at_reflux(designs[:1], 1.0) is None
    lines = {line.get_label(): line for line in draw(plot).axes[0].get_lines()}
    first, second = curves[0][0], curves[1][0]
    assert lines[f"Designs, {first}"].get_markerfacecolor() != "none"
    assert lines[f"Designs, {second}"].get_markerfacecolor() == "none"  # rings: the first set stays visible


def test_scenario_figures_are_not_blank(scenario_plots, tmp_path):
    named, _, _ = scenario_plots
    for path in write_figures([named["tac_vs_reflux"], named["stages_vs_duty"]], tmp_path):
        assert float(np.var(imread(path)[..., :3])) > 1e-3, path.name


def test_notes_and_the_second_scale_are_drawn_literally():
    """Dollar signs in notes and in the top axis's label are drawn as written, never as mathematics
    (titles and series names: tests/test_output_set.py)."""
    from disteco.reports.tables import Note, Plot, SecondAxis, Series

    plot = Plot("p", "t", "a [-]", "b [-]", (Series("s", (0.0, 1.0), (0.0, 1.0)),), notes=(Note(0.5, 0.5, "$3$"),),
                top_axis=SecondAxis("$R$ / $R_min$ [-]", 2.0))
    axes = draw(plot).axes[0]
    assert axes.texts[0].get_text() == r"\$3\$"
    assert axes.child_axes[0].get_xlabel() == r"\$R\$ / \$R_min\$ [-]"


def test_design_figures_follow_the_parts(tmp_path):
    result, parts = design_parts()
    paths = write_design_figures(result.mixture, parts, tmp_path)
    assert [p.stem for p in paths] == [plot.name for plot in design_plots(result.mixture, parts)]
