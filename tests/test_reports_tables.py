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
from disteco.costing import cost_column, load_cost_data
from disteco.costing.from_sizing import cost_input
from disteco.properties import build_mixture, feed_state, summarise_mixture
from disteco.reports.design_result import DesignResult
from disteco.reports.plots import operating_series
from disteco.reports.tables import (Column, Series, Table, case_table, components_table, feed_table,
                                    mixture_table, stage_profile_table, text)
from disteco.reports.tables_costs import (capital_factors_table, capital_sources_table, capital_table, column_table,
                                          equipment_table, exchangers_table, provenance_table, tac_breakdown_table,
                                          tac_table, utilities_table)
from disteco.reports.tables_design import ReportParts, design_plots, summary_table
from disteco.sizing import size_column
from disteco.stages.binary import equilibrium_curve, step_stages
from disteco.stages.results import StageProfile

from conftest import EXAMPLES

HOSTILE_TITLE = '=HYPERLINK("http://example.invalid","click")'
HOSTILE_WARNINGS = ("=1+1", "+SUM(A1:A2)", "-2+3", "@SUM(A1)", "plain warning")
REFLUX = 2.0
X_D, X_B, Z = 0.985, 0.015, 0.42
GRID_STAGE_DROP = 700.0  # Pa per equilibrium stage of the stepped profiles (invented; reports only)
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
    profile = profile_from_steps(mixture, feed, stepped, P, GRID_STAGE_DROP)
    data = load_cost_data()
    coefficients = (data.heat_transfer_coefficient("condenser", "cooling_water", "organic vapours"),
                    data.heat_transfer_coefficient("reboiler", "steam", "light organics"))
    sizing = size_column(profile, mixture, data.levels, coefficients[0].u_typical, coefficients[1].u_typical)
    cost = cost_column(data, cost_input(sizing), "reference")
    return result, ReportParts(profile=profile, curve=curve, stepped=stepped, sizing=sizing, cost=cost,
                               cost_data=data, coefficients=coefficients)



def _tables():
    result, parts = design_parts()
    names = result.case.components
    cost = parts.cost
    return [case_table(result.case), components_table(result.mixture), feed_table(result.feed, names),
            stage_profile_table(parts.profile, names), summary_table(result.case.title, parts),
            column_table(parts.sizing), equipment_table(parts.sizing), exchangers_table(parts.sizing),
            capital_table(cost), capital_factors_table(cost), capital_sources_table(cost), utilities_table(cost),
            tac_table(cost), tac_breakdown_table(cost),
            provenance_table(parts.cost_data, cost, parts.coefficients)]


def test_every_number_column_names_its_unit():
    for table in _tables():
        for j, column in enumerate(table.columns):
            if column.is_text:
                continue
            if column.is_mixed and column.unit == "unit in next column":  # sizes in several units
                assert all(isinstance(row[j + 1], str) for row in table.rows), table.title
            elif column.is_mixed:  # labelled values: the label on the left of every number carries the unit
                for row in table.rows:
                    if not isinstance(row[j], str) and row[j] is not None:
                        assert UNIT.search(row[j - 1]), (table.title, row[j - 1])
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


def test_cost_tables_add_up_to_the_cost_summary():
    """Regression pin: the tables show the costing layer's numbers unchanged, totals included."""
    _, parts = design_parts()
    cost = parts.cost
    capital = capital_table(cost)
    assert len(capital.columns) <= 9  # one screen wide
    installed = capital.column("Installed cost [USD]")
    assert installed[:-1] == tuple(e.installed for e in cost.items)
    assert installed[-1] == pytest.approx(sum(installed[:-1]), rel=1e-12) == cost.capital_installed
    assert sum(capital.column("Share of capital [-]")[:-1]) == pytest.approx(1.0, rel=1e-12)
    factors = capital_factors_table(cost)
    assert factors.column("Bare-module factor F_BM [-]") == tuple(e.bare_module_factor for e in cost.items)
    sources = capital_sources_table(cost)
    assert all(sources.column("Source"))
    assert sources.column(f"Index {cost.cost_year} [-]") == tuple(e.cost_index for e in cost.items)
    assert sources.column(f"Purchased cost, {cost.cost_year} [USD]") == capital.column(
        f"Purchased cost, {cost.cost_year} [USD]")[:-1]
    utilities = utilities_table(cost)
    assert utilities.column("Cost [USD/year]")[-1] == cost.utilities_per_year
    shares = tac_breakdown_table(cost).column("Share of TAC [USD/year]")
    assert sum(shares) == pytest.approx(cost.tac_per_year, rel=1e-12)


def test_provenance_lists_every_cost_curve_and_price_used():
    _, parts = design_parts()
    table = provenance_table(parts.cost_data, parts.cost, parts.coefficients)
    keys = " | ".join(table.column("Row"))
    assert "condenser / organic vapours / cooling_water: typical U [W/(m^2 K)]" in keys
    assert "reboiler / light organics / steam: typical U [W/(m^2 K)]" in keys
    for item in parts.cost.items:
        assert f"{item.equipment}: k1, k2, k3" in keys
    for utility in parts.cost.utilities:
        assert f"reference / {utility.utility} [" in keys
    assert all(source for source in table.column("Source"))


def test_equipment_table_in_display_units():
    """Regression pin of the conversions: W -> kW, Pa gauge -> kPa gauge, K -> degC."""
    _, parts = design_parts()
    table = equipment_table(parts.sizing)
    pump = next(row for row in table.rows if row[0] == "reflux_pump")
    item = next(e for e in parts.sizing.equipment if e.tag == "reflux_pump")
    assert pump[3:5] == (pytest.approx(item.size / 1e3, rel=1e-15), "kW")
    assert pump[9] == pytest.approx(item.design_pressure / 1e3, rel=1e-15)
    assert pump[10] == pytest.approx(item.design_temperature - 273.15, abs=1e-12)


def test_mixture_table_names_the_azeotrope(ethanol_water):
    """Ethanol-water (UNIFAC Dortmund) forms a minimum-boiling azeotrope near 0.89 mole fraction
    ethanol at 1 atm (J. Gmehling et al., Azeotropic Data, 2nd ed., 2004; from memory): the
    report gives its composition and temperature as numbers with units (loose bounds: only the
    report is under test)."""
    summary = summarise_mixture(ethanol_water, (0.2, 0.8), 101325.0, 0, 1)
    rows = dict(mixture_table(summary).rows)
    assert 0.85 < rows["Azeotrope ethanol/water (minimum-boiling): mole fraction ethanol [-]"] < 0.92
    assert 77.5 < rows["Azeotrope ethanol/water (minimum-boiling): temperature [degC]"] < 79.0


@pytest.mark.parametrize("value, shown", [(0.5, "0.00000"), (1e-6, "0.000E+00"), (0.99995, "0.000000"),
                                          (0.9999998, "0.00000000"), (0.0, "0.00000")])
def test_a_mole_fraction_keeps_the_digits_that_tell_it_from_zero_or_one(value, shown):
    """A 1 ppm bottoms specification met on thermo was written as 0.00000 in the workbook and on the
    console; a small fraction is shown in scientific notation, one near 1 to its first differing digit."""
    from disteco.reports.workbook_cells import number_format_of

    assert number_format_of(value, "mole fraction") == shown == number_format_of(value, "fraction")  # a recovery


@pytest.mark.parametrize("value, unit, shown", [(0.0036, "m^2", "0.00000"), (0.14, "kW", "0.00000"),
                                                (12.3, "m^2", "0.0"), (5.0, "kW", "0.0"), (1860.0, "kW", "#,##0"),
                                                (0.0, "kW", "0.0"), (0.16, "1/year", "0.0000")])
def test_a_pilot_column_s_sizes_keep_two_figures_in_the_workbook_and_on_the_console(value, unit, shown):
    """A 10 mol/h column's 0.0036 m2 condenser and 0.14 kW duty read 0.0 in the workbook and 0 on the console;
    a value the unit's format would show with fewer than two figures takes the format by size."""
    from disteco.reports.tables import size_text
    from disteco.reports.workbook_cells import number_format_of

    assert number_format_of(value, unit) == shown
    assert size_text(value) == {0.0036: "0.0036", 0.14: "0.14", 12.3: "12", 5.0: "5", 1860.0: "1,860", 0.0: "0",
                                0.16: "0.16"}[value]
