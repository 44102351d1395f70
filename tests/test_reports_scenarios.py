"""Scenario comparison, cross table, TAC-against-reflux and stages-against-duty reports.

The designs are computed, not invented: the benzene-toluene column of ``design_parts`` is
stepped, sized and priced on a grid of reflux ratios under each bundled price scenario;
each scenario's optimum is the lowest TAC of the grid. Only the report is under test.
"""

from __future__ import annotations

from functools import lru_cache

import openpyxl
import pytest

from disteco.costing import cost_column, load_cost_data
from disteco.optimisation.results import (ColumnSizes, CostBreakdown, CostItem, DesignEvaluation, OptimumDesign,
                                          SearchStep, SequentialPrice, SolverReport)
from disteco.properties import build_mixture
from disteco.reports.figures import draw
from disteco.reports.tables_design import design_plots, optimum_parts
from disteco.reports.plots import tac_curve_plot
from disteco.reports.tables_scenarios import (CrossTable, cross_tables, optimum_table, scenario_table,
                                              search_table, tac_curve_table)
from disteco.reports.workbook import write_workbook
from disteco.sizing import size_column
from disteco.stages.binary import minimum_reflux, step_stages, total_reflux_stages

from test_reports_tables import GRID_STAGE_DROP, X_B, X_D, Z, cost_input, design_parts, profile_from_steps

# Steam at 14.4 and 5.8 USD/GJ: far enough apart that the grid's optima differ (the reference
# steam in 2023 money, 7.7 USD/GJ, lies too near the cheap one for this coarse grid).
SCENARIOS = ("expensive-power-demo", "cheap-steam-demo")
REFLUX_FACTORS = (1.01, 1.02, 1.03, 1.05, 1.08, 1.12, 1.2, 1.4)
TOLERANCE = 1e-9  # relative; the grid's optimum is exact on the grid


def _evaluation(sizing, cost, profile) -> DesignEvaluation:
    """The sequential layers' results in the optimiser's result shape."""
    sizes = ColumnSizes(sizing.diameter, sizing.height.overall, sizing.real_trays, sizing.efficiency.value,
                        sizing.condenser.area, sizing.reboiler.area, sizing.condenser.duty, sizing.reboiler.duty,
                        max(sizing.hydraulics, key=lambda t: t.diameter).stage)
    by_item = {u.item: u.cost_per_year for u in cost.utilities}
    breakdown = CostBreakdown(tuple(CostItem(e.item, e.size, e.size_unit, e.purchased_escalated, e.installed)
                                    for e in cost.items), cost.capital_installed, by_item["condenser"],
                              by_item["reboiler"], cost.utilities_per_year, cost.annualised_capital,
                              cost.tac_per_year, cost.currency, cost.cost_year)
    return DesignEvaluation(profile.stages, profile.feed_stage, profile.reflux_ratio, profile, sizes, breakdown,
                            SolverReport("reflux grid", "optimal", "grid", None, 0.0),
                            sequential=SequentialPrice(sizing, cost))


@lru_cache(maxsize=1)
def scenario_study():
    """(names, optima, cross table, curves) over the reflux grid for each scenario."""
    result, parts = design_parts()
    case = result.case
    P = case.column.top_pressure
    mixture = build_mixture(case.components, case.thermo, P)
    data = load_cost_data()
    r_min = minimum_reflux(parts.curve, X_D, X_B, Z, result.feed.q).reflux_ratio
    n_min = total_reflux_stages(parts.curve, X_D, X_B).stages
    inputs, profiles = [], []
    for factor in REFLUX_FACTORS:
        stepped = step_stages(parts.curve, X_D, X_B, Z, result.feed.q, factor * r_min)
        profile = profile_from_steps(mixture, result.feed, stepped, P, GRID_STAGE_DROP)
        sizing = size_column(profile, mixture, data.levels, parts.sizing.condenser.overall_coefficient,
                             parts.sizing.reboiler.overall_coefficient)
        inputs.append(cost_input(sizing))
        profiles.append((profile, sizing))
    curves, optima, chosen = [], [], []
    for name in SCENARIOS:
        designs = tuple(_evaluation(s, cost_column(data, inp, name), p) for inp, (p, s) in zip(inputs, profiles))
        best = min(range(len(designs)), key=lambda i: designs[i].tac)
        visited = tuple(SearchStep(d.stages, d.feed_stage, d.tac, "optimal") for d in designs)
        optima.append((name, OptimumDesign(designs[best], r_min, n_min, designs[best].solver, visited,
                                           sequential=designs[best].sequential, minima_method="McCabe-Thiele")))
        curves.append((name, designs))
        chosen.append(inputs[best])
    tac = tuple(tuple(cost_column(data, inp, prices).tac_per_year for prices in SCENARIOS) for inp in chosen)
    return tuple(optima), CrossTable(SCENARIOS, tac, "USD"), tuple(curves)


def test_cross_table_diagonal_is_zero_and_no_entry_below_zero():
    """The extra TAC of building for the wrong prices is zero on the diagonal and never negative."""
    _, cross, _ = scenario_study()
    extra = cross.extra
    table = cross_tables(cross)[1]
    for i, name in enumerate(SCENARIOS):
        assert extra[i][i] == 0.0
        assert table.rows[i][0] == name and table.rows[i][1 + i] == 0.0
        for j in range(len(SCENARIOS)):
            assert extra[i][j] >= -TOLERANCE * cross.tac[j][j]
    assert cross.below_zero() == ()
    assert any(value > 0.0 for row in extra for value in row)  # cheap steam favours another reflux


def test_cross_entry_below_zero_is_reported():
    cross = CrossTable(("low", "high"), ((100.0, 210.0), (99.0, 200.0)), "USD")
    warnings = cross.below_zero()
    assert len(warnings) == 1
    assert "'high' costs 1 USD/year less under the prices of 'low'" in warnings[0]
    assert CrossTable(("a",), ((5.0,),), "USD").below_zero() == ()


def test_a_scenario_beaten_beyond_the_search_tolerance_is_named_with_the_design_that_beats_it():
    """Scenario 'high' (column 1): its own design costs 200,000, the 'low' design 199,500 under its prices
    (0.25 %, beyond the 0.1 % tolerance): searched again from 'low'. Scenario 'low' (column 0): beaten by
    0.05 %, within the tolerance: a note, no search, no warning."""
    cross = CrossTable(("low", "high"), ((100_000.0, 199_500.0), (99_950.0, 200_000.0)), "USD")
    assert cross.beaten() == ((1, 0),)
    warnings = cross.below_zero()
    assert len(warnings) == 1 and "'low' costs 500 USD/year less under the prices of 'high'" in warnings[0]
    notes = cross.close_notes()
    assert len(notes) == 1 and "1 extra TAC value below zero, by at most 0.05 % of the scenario's own TAC" in notes[0]
    assert CrossTable(("a", "b"), ((100.0, 210.0), (101.0, 200.0)), "USD").beaten() == ()
    assert CrossTable(("a", "b"), ((100.0, 210.0), (101.0, 200.0)), "USD").close_notes() == ()


def test_a_scenario_whose_model_ranks_its_own_design_cheaper_is_told_why():
    """Where the search again from the beating design ends on a design the optimiser's model prices lower
    (measured: a vapour-fed toluene column under cheap steam, 28 stages 796 USD/year below 29 in the
    model, 476 USD/year above it as priced), the warning names the model's resolution, not a local
    optimum."""
    cross = CrossTable(("low", "high"), ((100_000.0, 199_500.0), (99_950.0, 200_000.0)), "USD",
                       model_ranked=((0, 1, 796.0),))
    warnings = cross.below_zero()
    assert len(warnings) == 1
    assert "'low' costs 500 USD/year less under the prices of 'high' than that scenario's own optimum (0.25 %)" \
        in warnings[0]
    assert "the optimiser's model ranks the scenario's own design 796 USD/year cheaper" in warnings[0]
    assert "local optimum" not in warnings[0]


def test_cross_table_must_be_square():
    with pytest.raises(ValueError, match="2 scenarios need a 2 x 2 matrix"):
        CrossTable(("a", "b"), ((1.0, 2.0),), "USD")


def test_scenario_table_holds_each_optimum():
    optima, _, _ = scenario_study()
    table = scenario_table(optima)
    assert table.column("Scenario") == SCENARIOS
    for (name, opt), tac, ratio in zip(optima, table.column("TAC [USD/year]"), table.column("R / R_min [-]")):
        assert tac == opt.best.tac
        assert ratio == pytest.approx(opt.best.reflux_ratio / opt.minimum_reflux_ratio, rel=1e-15)
    assert table.column("Reboiler duty [kW]")[0] == pytest.approx(optima[0][1].best.sizes.reboiler_duty / 1e3)
    steam = optima[0][1].sequential.cost.utilities[1]
    assert table.rows[0][-3:] == (steam.utility, steam.amount_per_year, steam.amount_unit)


def test_tac_curve_is_capital_plus_utilities():
    optima, _, curves = scenario_study()
    name, designs = curves[0]
    plot = tac_curve_plot(curves[:1], optima[0][1])
    capital, utilities, total, lowest = plot.series[:4]
    assert capital.x == tuple(sorted(d.reflux_ratio for d in designs))
    assert [c + u for c, u in zip(capital.y, utilities.y)] == pytest.approx(total.y, rel=1e-12)
    assert lowest.y == (min(total.y),) and lowest.x == (total.x[total.y.index(min(total.y))],)
    assert plot.title == f"Total annualised cost against reflux ratio ({name})"
    table = tac_curve_table(designs, name)
    assert table.column("TAC [USD/year]") == total.y
    lines = draw(plot).axes[0].get_lines()
    assert tuple(lines[2].get_ydata()) == total.y


def test_tac_curve_marks_the_points_beyond_the_shell_height_limit():
    """Where the shell height limit cut the search (OptimumDesign.stage_limit), the curve's points
    with more stages are drawn apart, a line marks the least reflux within the limit, and the
    workbook's curve table says which points lie beyond it."""
    from dataclasses import replace

    optima, _, curves = scenario_study()
    name, designs = curves[0]
    stages = sorted({d.stages for d in designs})
    limit = stages[len(stages) // 2]
    plot = tac_curve_plot(curves[:1], replace(optima[0][1], stage_limit=limit))
    beyond = next(s for s in plot.series if s.name.startswith("Beyond the height limit"))
    assert sorted(beyond.x) == sorted(d.reflux_ratio for d in designs if d.stages > limit)
    line = next(s for s in plot.series if s.name.startswith("Height limit"))
    assert line.x[0] == min(d.reflux_ratio for d in designs if d.stages <= limit)
    table = tac_curve_table(designs, name, limit)
    marks = dict(zip(table.column("Stages [-]"), table.column("Shell height limit [-]")))
    assert marks == {n: "beyond" if n > limit else "within" for n in marks}
    unlimited = tac_curve_plot(curves[:1], optima[0][1])
    assert not any(s.name.startswith(("Beyond", "Height limit")) for s in unlimited.series)


def test_optimum_and_search_tables():
    optima, _, _ = scenario_study()
    opt = optima[0][1]
    rows = dict(optimum_table(opt).rows)
    assert rows["Total annualised cost, optimisation model [USD/year]"] == opt.best.tac
    assert rows["Relative optimality gap [-]"] == "no bound"
    assert search_table(opt).column("TAC [USD/year]") == tuple(v.tac for v in opt.visited)


def test_workbook_and_plots_carry_the_scenarios(tmp_path):
    result, parts = design_parts()
    optima, cross, curves = scenario_study()
    full = optimum_parts(optima[0][1], curve=parts.curve, cost_data=parts.cost_data, scenarios=optima,
                         cross=cross, tac_curves=curves)
    assert full.cost is optima[0][1].sequential.cost and full.profile is optima[0][1].best.profile
    names = [plot.name for plot in design_plots(result.mixture, full)]
    assert names[3:] == ["tac_vs_reflux", "stages_vs_duty"]  # every scenario on one figure
    book = openpyxl.load_workbook(write_workbook(result, tmp_path / "design.xlsx", full))
    assert {"Optimiser", "Scenarios"} <= set(book.sheetnames)
    ws = book["Scenarios"]
    titles = [c.value for c in ws["A"] if isinstance(c.value, str) and c.font.bold and c.font.size == 12]
    assert titles[:3] == ["Optimum design of each price scenario",
                          "TAC of each scenario's design under each scenario's prices",
                          "Extra TAC of building for the wrong prices"]


def test_console_shows_each_optimum_and_the_cross_table():
    from disteco.reports.text_scenarios import cross_lines, scenario_lines

    optima, cross, _ = scenario_study()
    lines = scenario_lines(optimum_parts(optima[0][1], scenarios=optima, cross=cross))
    optimum_rows = lines[3:3 + len(SCENARIOS)]
    rows = {line.split()[0]: line.split() for line in optimum_rows}
    for name, o in optima:
        assert float(rows[name][1]) == pytest.approx(o.best.reflux_ratio, abs=5e-4)
        assert int(rows[name][3]) == o.best.stages
    assert lines[lines.index(next(l for l in lines if l.startswith("Extra TAC"))) + 2].split()[1] == "0"
    tac_rows = cross_lines(cross)[3:3 + len(SCENARIOS)]
    assert [float(v.replace(",", "")) for v in tac_rows[1].split()[1:]] == pytest.approx(cross.tac[1], abs=0.5)
    assert scenario_lines(optimum_parts(optima[0][1], scenarios=optima[:1])) == []
    assert "-0" not in "".join(cross_lines(CrossTable(("a", "b"), ((100.0, 200.0), (99.9999, 200.0)), "USD")))
