"""PNG figures: written, not blank, and drawing exactly the result's data."""

from __future__ import annotations

import numpy as np
import pytest
from matplotlib.image import imread

from disteco.reports.figures import draw, write_design_figures, write_figures
from disteco.reports.tables_design import design_plots

from test_reports_tables import design_parts


@pytest.fixture(scope="module")
def plots():
    result, parts = design_parts()
    return design_plots(result.mixture, parts)


def test_pngs_exist_and_are_not_blank(plots, tmp_path):
    paths = write_figures(plots, tmp_path)
    assert [p.name for p in paths] == ["temperature_profile.png", "composition_profile.png", "xy_diagram.png"]
    for path in paths:
        assert path.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
        pixels = imread(path)
        assert pixels.shape[0] > 400 and pixels.shape[1] > 600
        assert float(np.var(pixels[..., :3])) > 1e-3, path.name
    assert sorted(p.name for p in tmp_path.iterdir()) == sorted(p.name for p in paths)  # no leftovers


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
    xy = draw(plots[2]).axes[0]
    steps = xy.get_lines()[-1]
    assert list(zip(steps.get_xdata(), steps.get_ydata())) == list(parts.stepped.steps)
    assert tuple(xy.get_lines()[0].get_ydata()) == parts.curve.y


def test_design_figures_follow_the_parts(tmp_path):
    result, parts = design_parts()
    paths = write_design_figures(result.mixture, parts, tmp_path)
    assert [p.stem for p in paths] == [plot.name for plot in design_plots(result.mixture, parts)]
