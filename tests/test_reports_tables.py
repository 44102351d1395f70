"""Report tables and plot data: units in every header, numbers as numbers, geometry of the x-y diagram.

``design_parts`` builds a real benzene-toluene result (ideal, thermo) and a constant-molar-
overflow stage profile read off the McCabe-Thiele staircase; the workbook and figure tests
import it. The case title and a warning are hostile spreadsheet text on purpose.
"""

from __future__ import annotations

import math
import re
import tomllib
from functools import lru_cache

import numpy as np
import pytest

from disteco.case import parse_case
from disteco.properties import build_mixture, feed_state, summarise_mixture
from disteco.reports.design_result import DesignResult
from disteco.reports.tables import (Column, ReportParts, Series, Table, case_table, components_table,
                                    design_plots, feed_table, operating_series, stage_profile_table, text)
from disteco.stages.binary import equilibrium_curve, step_stages
from disteco.stages.results import StageProfile

from conftest import EXAMPLES

HOSTILE_TITLE = '=HYPERLINK("http://example.invalid","click")'
HOSTILE_WARNINGS = ("=1+1", "+SUM(A1:A2)", "-2+3", "@SUM(A1)", "plain warning")
REFLUX = 2.0
X_D, X_B, Z = 0.985, 0.015, 0.42
UNIT = re.compile(r"\[[^\]]+\]$")


def profile_from_steps(mixture, feed, stepped, top_pressure: float, drop: float) -> StageProfile:
    """A constant-molar-overflow profile whose stage liquids are the staircase's points on the curve.

    Test input only: the last (fractional) step counts as a whole stage.
    """
    on_curve = stepped.steps[1::2]
    F, q, R = feed.molar_flow, feed.q, stepped.reflux_ratio
    D = F * (Z - X_B) / (X_D - X_B)
    B = F - D
    N = len(on_curve)
    P = tuple(top_pressure + j * drop for j in range(N))
    T = tuple(mixture.bubble_point(p, (x, 1.0 - x)).T for p, (x, _) in zip(P, on_curve))
    L = tuple(R * D if n < stepped.feed_stage else (R * D + q * F if n < N else B) for n in range(1, N + 1))
    V = tuple((R + 1.0) * D if n < stepped.feed_stage else (R + 1.0) * D - (1.0 - q) * F
              for n in range(1, N + 1))
    latent = mixture.heat_of_vaporisation(top_pressure, feed.z)
    return StageProfile(
        T=T, P=P, L=L, V=V, x=tuple((x, 1.0 - x) for x, _ in on_curve), y=tuple((y, 1.0 - y) for _, y in on_curve),
        feed_stage=stepped.feed_stage, reflux_ratio=R, distillate_flow=D, bottoms_flow=B,
        distillate_composition=(X_D, 1.0 - X_D), bottoms_composition=(X_B, 1.0 - X_B),
        condenser_duty=(R + 1.0) * D * latent, reboiler_duty=V[-1] * latent,
        condenser_temperature=mixture.bubble_point(top_pressure, (X_D, 1.0 - X_D)).T, model="cmo")


@lru_cache(maxsize=1)
def design_parts() -> tuple[DesignResult, ReportParts]:
    """The aromatics example with benzene given by its CAS number and a formula-like title."""
    data = tomllib.loads((EXAMPLES / "aromatics_binary.toml").read_text())
    data["title"] = HOSTILE_TITLE
    data["mixture"]["components"] = ["71-43-2", "toluene"]
    data["feed"]["composition"] = [Z, 1.0 - Z]
    case = parse_case(data)
    P = case.column.top_pressure
    mixture = build_mixture(case.components, case.thermo, P)
    summary = summarise_mixture(mixture, case.feed.composition, P, case.products.light_key,
                                case.products.heavy_key)
    feed = feed_state(case.feed, mixture, P)
    result = DesignResult(case=case, mixture=summary, feed=feed, warnings=HOSTILE_WARNINGS)
    curve = equilibrium_curve(mixture, P)
    stepped = step_stages(curve, X_D, X_B, Z, feed.q, REFLUX)
    profile = profile_from_steps(mixture, feed, stepped, P, case.column.pressure_drop_per_stage)
    return result, ReportParts(profile=profile, curve=curve, stepped=stepped)


def _tables():
    result, parts = design_parts()
    names = result.case.components
    return [case_table(result.case), components_table(result.mixture), feed_table(result.feed, names),
            stage_profile_table(parts.profile, names)]


def test_every_number_column_names_its_unit():
    for table in _tables():
        for column in table.columns:
            if column.is_text:
                continue
            if column.is_mixed:  # labelled values: the label of every number carries the unit
                for label, value in table.rows:
                    if not isinstance(value, str) and value is not None:
                        assert UNIT.search(label), (table.title, label)
            else:
                assert UNIT.search(column.header), (table.title, column.header)


def test_stage_table_holds_profile_in_display_units():
    """Regression pin of the unit conversions (K -> degC, Pa -> kPa, mol/s -> kmol/h)."""
    result, parts = design_parts()
    table = stage_profile_table(parts.profile, result.case.components)
    p = parts.profile
    assert table.column("Stage [-]") == tuple(range(1, p.stages + 1))
    assert table.column("Temperature [degC]") == pytest.approx([t - 273.15 for t in p.T], abs=1e-12)
    assert table.column("Pressure [kPa]") == pytest.approx([v / 1e3 for v in p.P], rel=1e-15)
    assert table.column("Liquid flow [kmol/h]") == pytest.approx([v * 3.6 for v in p.L], rel=1e-15)
    assert table.column("x 71-43-2 [-]") == pytest.approx([row[0] for row in p.x], rel=1e-15)
    assert table.column("y toluene [-]") == pytest.approx([row[1] for row in p.y], rel=1e-15)
    roles = table.column("Role")
    assert roles[p.feed_stage - 1] == "feed" and roles[-1] == "reboiler"


def test_table_rejects_text_in_number_column_and_short_rows():
    with pytest.raises(ValueError, match="is not a finite number"):
        Table("t", (Column("Temperature", "degC"),), ((math.nan,),))
    with pytest.raises(ValueError, match="is not a finite number"):
        Table("t", (Column("Temperature", "degC"),), (("hot",),))
    with pytest.raises(ValueError, match="1 cells for 2 columns"):
        Table("t", (text("Name"), Column("Flow", "kmol/h")), (("a",),))
    with pytest.raises(ValueError, match="3 x values for 2 y values"):
        Series("s", (1.0, 2.0, 3.0), (1.0, 2.0))


def test_operating_lines_meet_on_the_feed_line():
    """McCabe-Thiele geometry: the two operating lines and the q-line meet in one point; for a
    saturated-liquid feed (q = 1) that point lies at x = z_F, and the rectifying line has slope
    R/(R+1) and passes through (x_D, x_D). (W. L. McCabe, J. C. Smith, P. Harriott, Unit
    Operations of Chemical Engineering, 7th ed., chapter 21, operating and feed lines; from memory.)
    """
    _, parts = design_parts()
    rect, strip, feed_line, steps = operating_series(parts.stepped)
    assert (rect.x[0], rect.y[0]) == (X_D, X_D)
    slope = (rect.y[1] - rect.y[0]) / (rect.x[1] - rect.x[0])
    assert slope == pytest.approx(REFLUX / (REFLUX + 1.0), rel=1e-12)
    assert (rect.x[1], rect.y[1]) == (strip.x[0], strip.y[0]) == (feed_line.x[1], feed_line.y[1])
    assert (strip.x[1], strip.y[1]) == (X_B, X_B)
    assert parts.stepped.q == pytest.approx(1.0)
    assert rect.x[1] == pytest.approx(Z, abs=1e-12)
    assert list(zip(steps.x, steps.y)) == list(parts.stepped.steps)


def test_plots_carry_units_and_the_result_data():
    result, parts = design_parts()
    plots = {plot.name: plot for plot in design_plots(result.mixture, parts)}
    assert set(plots) == {"temperature_profile", "composition_profile", "xy_diagram"}
    for plot in plots.values():
        assert UNIT.search(plot.x_label) and UNIT.search(plot.y_label)
    temperature = plots["temperature_profile"].series[0]
    assert temperature.x == pytest.approx([t - 273.15 for t in parts.profile.T])
    assert plots["xy_diagram"].series[0].x == parts.curve.x
    assert np.all(np.diff(plots["xy_diagram"].series[0].y) >= 0.0)


def test_missing_parts_leave_plots_out():
    result, _ = design_parts()
    assert design_plots(result.mixture, ReportParts()) == ()
