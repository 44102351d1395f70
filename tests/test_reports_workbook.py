"""The design workbook, opened as an estimator would: sheets, units, numbers, charts, no formulas."""

from __future__ import annotations

import re
import zipfile
from xml.etree import ElementTree

import openpyxl
import pytest

from disteco.case import load_case
from disteco.properties import build_mixture, feed_state, summarise_mixture
from disteco.reports.design_result import DesignResult
from disteco.reports.json_result import result_json
from disteco.reports.tables_design import ReportParts
from disteco.reports.workbook import (CHART_SHEET, DATA_SHEET, save_workbook, workbook_content,
                                      write_workbook)
from disteco.reports.workbook_cells import HEADER_FILL
from disteco.stages.rigorous import ColumnSpec, solve_cmo

from conftest import EXAMPLES

from test_reports_tables import HOSTILE_TITLE, HOSTILE_WARNINGS, design_parts

UNIT = re.compile(r"\[[^\]]+\]$")
CHART = "{http://schemas.openxmlformats.org/drawingml/2006/chart}"
# The file keeps about 16 significant digits (openpyxl writes floats with "%.16g").
DIGITS = 1e-15


@pytest.fixture(scope="module")
def workbook_path(tmp_path_factory):
    result, parts = design_parts()
    return write_workbook(result, tmp_path_factory.mktemp("wb") / "design.xlsx", parts)


@pytest.fixture(scope="module")
def book(workbook_path):
    return openpyxl.load_workbook(workbook_path)


def _headers(ws):
    """(row, column, text) of every header cell (recognised by its fill)."""
    return [(c.row, c.column, c.value) for row in ws.iter_rows() for c in row
            if c.value is not None and c.fill.fgColor.rgb == HEADER_FILL.fgColor.rgb]


def _column_below(ws, row, column):
    cells = []
    for r in range(row + 1, ws.max_row + 1):
        cell = ws.cell(r, column)
        if cell.value is None and ws.cell(r, 1).value is None:
            break
        cells.append(cell)
    return cells


def _quantities(ws, title: str) -> dict:
    """The labelled values of a two-column table, by label."""
    start = next(r for r in range(1, ws.max_row + 1) if ws.cell(r, 1).value == title)
    return {c.value: ws.cell(c.row, 2).value for c in _column_below(ws, start + 1, 1)}


def test_expected_sheets(book):
    assert book.sheetnames == ["Summary", "Inputs", "Stages", "Equipment", "Capital", "Utilities", "Warnings",
                               DATA_SHEET, CHART_SHEET]


def test_units_in_headers_and_numbers_stored_as_numbers(book):
    checked = 0
    for ws in book.worksheets:
        if ws.title in (DATA_SHEET, CHART_SHEET):
            continue
        for row, column, header in _headers(ws):
            cells = _column_below(ws, row, column)
            numbers = [c for c in cells if c.data_type == "n" and c.value is not None]
            if header == "Value":  # labelled values: the unit sits in the label on the left
                assert all(UNIT.search(ws.cell(c.row, column - 1).value) for c in numbers), ws.title
            elif numbers:
                assert UNIT.search(header), (ws.title, header)
                assert all(c.number_format != "General" for c in numbers), (ws.title, header)
            checked += len(numbers)
    assert checked > 100
    stages = book["Stages"]
    temperatures = _column_below(stages, 2, 3)
    assert stages.cell(2, 3).value == "Temperature [degC]"
    assert all(isinstance(c.value, float) for c in temperatures)


def test_frozen_headers_column_widths_and_page_setup(book):
    for ws in book.worksheets:
        if ws.title == CHART_SHEET:
            continue
        assert ws.freeze_panes in ("A3", "A4"), ws.title
        assert (ws.column_dimensions["A"].width or 0) >= 6.0, ws.title
    stages = book["Stages"]
    assert stages.print_title_rows == "$2:$2"
    assert stages.page_setup.orientation == "landscape" and stages.sheet_properties.pageSetUpPr.fitToPage


def test_text_too_long_for_a_cell_is_cut_and_marked(tmp_path):
    from openpyxl import Workbook

    from disteco.reports.workbook_cells import MAX_TEXT, put_text

    ws = Workbook().active
    cell = put_text(ws, 1, 1, "=" + "x" * (2 * MAX_TEXT) + "\x07")
    assert len(cell.value) == MAX_TEXT and cell.value.endswith("[truncated]") and cell.data_type == "s"


def test_chart_parts_present(workbook_path):
    with zipfile.ZipFile(workbook_path) as archive:
        charts = sorted(n for n in archive.namelist() if re.fullmatch(r"xl/charts/chart\d+\.xml", n))
        assert len(charts) == 3
        trees = [ElementTree.fromstring(archive.read(name)) for name in charts]
    assert all(len(tree.findall(f".//{CHART}scatterChart")) == 1 for tree in trees)
    series = [len(tree.findall(f".//{CHART}ser")) for tree in trees]
    # profiles: their lines and the feed stage; the x-y diagram: curve, diagonal, two operating lines,
    # feed line, constant-molar-overflow steps, the design's stages, products and feed
    assert series == [2, 3, 9]
    orientation = trees[0].findall(f".//{CHART}valAx/{CHART}scaling/{CHART}orientation")
    assert "maxMin" in [o.get("val") for o in orientation]  # stage 1 at the top


def test_charts_have_titles_and_sit_in_a_grid(book):
    result, parts = design_parts()
    plots = workbook_content(result, parts).plots
    charts = book[CHART_SHEET]._charts
    assert len(charts) == len(plots) == 3
    titles = ["".join(run.t for p in chart.title.tx.rich.p for run in (p.r or [])) for chart in charts]
    assert titles == [plot.title for plot in plots]
    anchors = [(chart.anchor._from.row, chart.anchor._from.col) for chart in charts]
    assert anchors[0][0] == anchors[1][0] and anchors[0][1] < anchors[1][1]  # side by side
    assert anchors[2][0] > anchors[0][0] and anchors[2][1] == anchors[0][1]  # the next row of the grid


def test_no_cell_is_a_formula(book, workbook_path):
    for ws in book.worksheets:
        for row in ws.iter_rows():
            for cell in row:
                assert cell.data_type != "f", (ws.title, cell.coordinate, cell.value)
    with zipfile.ZipFile(workbook_path) as archive:
        for name in archive.namelist():
            if name.startswith("xl/worksheets/sheet"):
                assert "<f>" not in archive.read(name).decode(), name
    inputs = _quantities(book["Inputs"], "Case")
    assert inputs["Case title"] == HOSTILE_TITLE
    assert book["Summary"]["B3"].value == HOSTILE_TITLE and book["Summary"]["B3"].quotePrefix
    warnings = [c.value for c in _column_below(book["Warnings"], 2, 2)]
    assert tuple(warnings[:len(HOSTILE_WARNINGS)]) == HOSTILE_WARNINGS
    components = [c.value for c in _column_below(book["Inputs"], _header_row(book["Inputs"], "Components"), 1)]
    assert components == ["71-43-2", "toluene"]


def _header_row(ws, title: str) -> int:
    return next(r for r in range(1, ws.max_row + 1) if ws.cell(r, 1).value == title) + 1


def _same(a, b):
    return a == pytest.approx(b, rel=DIGITS, abs=0.0)


def test_numbers_equal_result_json(book):
    result, _ = design_parts()
    data = result_json(result)
    feed = _quantities(book["Inputs"], "Feed")
    assert _same(feed["Molar flow [kmol/h]"], data["feed"]["molar_flow_kmol_per_h"])
    assert _same(feed["Pressure [kPa]"], data["feed"]["pressure_kPa"])
    assert _same(feed["Temperature [degC]"], data["feed"]["temperature_degC"])
    assert _same(feed["Thermal condition q [-]"], data["feed"]["q"])
    assert _same(feed["Vapour fraction on entry [-]"], data["feed"]["vapour_fraction"])
    assert _same([feed[f"Mole fraction {n} [-]"] for n in result.case.components], data["feed"]["mole_fractions"])
    mixture = _quantities(book["Inputs"], "Mixture")
    assert _same(mixture["Top pressure [kPa]"], data["mixture"]["top_pressure_kPa"])
    assert _same(mixture["Key relative volatility, lowest [-]"], data["mixture"]["key_relative_volatility_min"])
    assert _same(mixture["Feed bubble point at top pressure [degC]"], data["mixture"]["feed_bubble_point_degC"])
    ws = book["Inputs"]
    top = _header_row(ws, "Components")
    for i, component in enumerate(data["mixture"]["components"]):
        assert ws.cell(top + 1 + i, 2).value == component["databank_name"]
        assert ws.cell(top + 1 + i, 3).value == component["cas"]
        assert _same(ws.cell(top + 1 + i, 4).value, component["molar_mass_g_per_mol"])
        assert _same(ws.cell(top + 1 + i, 5).value, component["normal_boiling_point_degC"])
    cautions = [c.value for c in _column_below(book["Summary"], _header_row(book["Summary"], "Cautions"), 1)]
    assert cautions[:len(data["cautions"])] == data["cautions"]
    assert cautions[len(data["cautions"]):] == list(design_parts()[1].cost.accuracy_band.cautions)


def test_stage_sheet_equals_profile(book):
    result, parts = design_parts()
    p = parts.profile
    ws = book["Stages"]
    headers = {ws.cell(2, j).value: j for j in range(1, ws.max_column + 1)}
    rows = range(3, 3 + p.stages)
    assert _same([ws.cell(r, headers["Temperature [degC]"]).value for r in rows], [t - 273.15 for t in p.T])
    assert _same([ws.cell(r, headers["Vapour flow [kmol/h]"]).value for r in rows], [v * 3.6 for v in p.V])
    assert _same([ws.cell(r, headers["x 71-43-2 [-]"]).value for r in rows], [x[0] for x in p.x])
    products = _quantities(ws, "Products")
    assert _same(products["Reboiler duty [kW]"], p.reboiler_duty / 1e3)
    assert products["Feed stage, from the top [-]"] == p.feed_stage


def test_cost_sheets_equal_the_cost_summary(book):
    _, parts = design_parts()
    cost = parts.cost
    summary = _quantities(book["Summary"], "Chosen design")
    assert _same(summary["Total annualised cost [USD/year]"], cost.tac_per_year)
    assert _same(summary["Column diameter [m]"], parts.sizing.diameter)
    ws = book["Capital"]
    headers = {ws.cell(2, j).value: j for j in range(1, ws.max_column + 1)}
    installed = [c.value for c in _column_below(ws, 2, headers["Installed cost [USD]"])]
    assert _same(installed, [e.installed for e in cost.items] + [cost.capital_installed])
    assert ws.cell(3, headers["Installed cost [USD]"]).number_format == "#,##0"
    tac = _quantities(book["Summary"], "Total annualised cost")
    assert _same(tac["Utilities [USD/year]"], cost.utilities_per_year)
    provenance = _header_row(book["Inputs"], f"Cost data used ({parts.cost_data.folder})")
    assert len(_column_below(book["Inputs"], provenance, 1)) >= len(cost.items) + len(cost.utilities)


def test_inputs_list_the_prices_on_the_cost_year(book):
    """The Inputs sheet lists every price of the scenario run as given and on the cost year, with
    the factor and its index: the reference steam of 2006 moved to 2023 by the gas index."""
    _, parts = design_parts()
    ws = book["Inputs"]
    header = _header_row(ws, f"Utility prices (USD of {parts.cost.cost_year})")
    columns = {ws.cell(header, j).value: j for j in range(1, ws.max_column + 1)}
    rows = {ws.cell(c.row, 2).value: c.row for c in _column_below(ws, header, 1)}
    assert set(rows) == {p.utility for p in parts.cost_data.prices if p.scenario == parts.cost.scenario}
    steam = parts.cost_data.price(parts.cost.scenario, "lp_steam", parts.cost.cost_year)
    row = rows["lp_steam"]
    assert ws.cell(row, columns["Year given [year]"]).value == 2006
    assert _same(ws.cell(row, columns["Price in cost year [unit in Unit]"]).value, steam.price)
    assert _same(ws.cell(row, columns["Escalation factor [-]"]).value * 13.28, steam.price)
    assert ws.cell(row, columns["Set by"]).value == "cost data"


def test_chart_data_equal_plot_data(book):
    result, parts = design_parts()
    plots = workbook_content(result, parts).plots
    ws = book[DATA_SHEET]
    column = 1
    for plot in plots:
        assert ws.cell(1, column).value == plot.title
        for series in plot.series:
            assert ws.cell(2, column).value == series.name
            xs = [ws.cell(4 + i, column).value for i in range(len(series.x))]
            ys = [ws.cell(4 + i, column + 1).value for i in range(len(series.y))]
            assert _same(xs, series.x) and _same(ys, series.y)
            column += 2
        column += 1


def test_sheets_without_data_are_left_out(tmp_path):
    result, _ = design_parts()
    path = write_workbook(result, tmp_path / "short.xlsx", ReportParts())
    assert openpyxl.load_workbook(path).sheetnames == ["Summary", "Inputs", "Warnings"]


def test_failed_write_keeps_the_old_file(tmp_path, monkeypatch):
    result, parts = design_parts()
    path = tmp_path / "design.xlsx"
    path.write_bytes(b"previous run")

    def broken_save(self, filename):
        with open(filename, "wb") as handle:
            handle.write(b"PK half a workbook")
        raise OSError("disk full")

    monkeypatch.setattr(openpyxl.Workbook, "save", broken_save)
    with pytest.raises(OSError, match="disk full"):
        save_workbook(workbook_content(result, parts), path)
    assert path.read_bytes() == b"previous run"
    assert [p.name for p in tmp_path.iterdir()] == ["design.xlsx"]


def test_five_component_column_has_a_column_per_component_and_no_xy_chart(tmp_path):
    """A depentaniser (example file) solved by constant molar overflow: only the report is checked."""
    case = load_case(EXAMPLES / "depentaniser.toml")
    P = case.column.top_pressure
    mixture = build_mixture(case.components, case.thermo, P)
    feed = feed_state(case.feed, mixture, P)
    z = feed.z
    distillate = feed.molar_flow * (z[0] + z[1] + 0.98 * z[2] + 0.02 * z[3])
    profile = solve_cmo(mixture, feed, ColumnSpec.from_column(case.column, 24, 12, 2.5, distillate))
    summary = summarise_mixture(mixture, case.feed.composition, P, case.products.light_key, case.products.heavy_key)
    result = DesignResult(case=case, mixture=summary, feed=feed)
    path = write_workbook(result, tmp_path / "design.xlsx", ReportParts(profile=profile))
    book = openpyxl.load_workbook(path)
    headers = [c.value for c in book["Stages"][2]]
    for name in case.components:
        assert f"x {name} [-]" in headers and f"y {name} [-]" in headers
    with zipfile.ZipFile(path) as archive:
        charts = [ElementTree.fromstring(archive.read(n)) for n in sorted(archive.namelist())
                  if re.fullmatch(r"xl/charts/chart\d+\.xml", n)]
    assert [len(tree.findall(f".//{CHART}ser")) for tree in charts] == [2, 6]  # each with its feed stage line


def _format_of(ws, title: str, label: str) -> str:
    start = next(r for r in range(1, ws.max_row + 1) if ws.cell(r, 1).value == title)
    cell = next(c for c in _column_below(ws, start + 1, 1) if c.value == label)
    return ws.cell(cell.row, 2).number_format


def test_number_formats_follow_each_quantity(book):
    """Duties in whole kW, money with thousands separators, hours and years as whole numbers."""
    summary = book["Summary"]
    assert _format_of(summary, "Chosen design", "Reboiler duty [kW]") == "#,##0"
    assert _format_of(summary, "Chosen design", "Total annualised cost [USD/year]") == "#,##0"
    assert _format_of(summary, "Total annualised cost", "Operating hours [h/year]") == "#,##0"
    assert _format_of(summary, "Total annualised cost", "Cost year [year]") == "0"
    assert _format_of(summary, "Chosen design", "Reflux ratio [-]") == "0.000"
    expected = {"Capital": {"Installed cost [USD]": "#,##0", "Bare-module factor F_BM [-]": "0.000",
                            "Pieces [-]": "0", "Share of capital [-]": "0%"},
                "Utilities": {"Duty or power [kW]": "#,##0.0", "Cost [USD/year]": "#,##0",
                              "Price year [year]": "0"},
                "Equipment": {"Duty [kW]": "#,##0"}}
    for sheet, columns in expected.items():
        ws = book[sheet]
        for row, column, header in _headers(ws):
            if header in columns:
                numbers = [c for c in _column_below(ws, row, column) if c.data_type == "n" and c.value is not None]
                assert numbers and {c.number_format for c in numbers} == {columns[header]}, (sheet, header)
    equipment = book["Equipment"]
    headers = {ws_header: col for _, col, ws_header in _headers(equipment)}
    sizes = {equipment.cell(c.row, headers["Size unit"]).value: c.number_format
             for c in _column_below(equipment, 2, headers["Size [unit in next column]"]) if c.value is not None}
    assert sizes["kW"] == "0.0" and sizes["m^2"] == "0.0"  # the reflux pump's few kW keep their tenth


def test_capital_fits_one_screen_and_keeps_its_sources_apart(book):
    ws = book["Capital"]
    titles = [c.value for c in ws["A"] if isinstance(c.value, str) and c.font.bold and c.font.size == 12]
    assert titles[0].startswith("Capital cost (USD") and titles[-1].startswith("Capital cost sources")
    first_headers = [c.value for c in ws[2] if c.value is not None]
    assert len(first_headers) <= 9 and "Source" not in first_headers


def test_chart_data_formats_follow_the_axis_units(tmp_path):
    from disteco.reports.tables import Plot, Series
    from disteco.reports.workbook import WorkbookContent

    plot = Plot("tac", "TAC", "Reflux ratio R [-]", "Cost [USD/year]", (Series("TAC", (1.6, 1.8), (873048.4, -0.3)),))
    path = save_workbook(WorkbookContent((), (plot,)), tmp_path / "charts.xlsx")
    ws = openpyxl.load_workbook(path)[DATA_SHEET]
    assert [ws.cell(r, 1).number_format for r in (4, 5)] == ["0.000", "0.000"]
    assert [ws.cell(r, 2).number_format for r in (4, 5)] == ["#,##0", "#,##0"]
    assert ws.cell(5, 2).value == 0.0  # no "-0"


def test_a_tiny_negative_is_written_as_zero(tmp_path):
    from disteco.reports.tables import Column, Table
    from disteco.reports.workbook import Sheet, WorkbookContent
    from disteco.reports.workbook_cells import without_negative_zero

    table = Table("Extra TAC", (Column("Extra", "USD/year", "#,##0"), Column("Share", "-", "0.0%")),
                  ((-0.4, -0.0004), (-0.6, 0.5)))
    path = save_workbook(WorkbookContent((Sheet("S", (table,)),)), tmp_path / "zero.xlsx")
    ws = openpyxl.load_workbook(path)["S"]
    assert [(ws.cell(r, 1).value, ws.cell(r, 2).value) for r in (3, 4)] == [(0.0, 0.0), (-0.6, 0.5)]
    assert without_negative_zero(-0.004, "0.00") == 0.0 and without_negative_zero(-0.006, "0.00") == -0.006


def test_inputs_show_what_was_run(tmp_path):
    from dataclasses import replace

    result, parts = design_parts()
    ran = replace(result, options=(("max_stages", 40), ("time_limit", 30.0)))
    book = openpyxl.load_workbook(write_workbook(ran, tmp_path / "run.xlsx", parts))
    run = _quantities(book["Inputs"], "Run")
    assert run["Price scenarios run"] == "reference"
    assert run["Optimiser option max_stages"] == 40 and run["Optimiser option time_limit"] == 30.0
    assert run["Cost year of capital and utilities [year]"] == parts.cost.cost_year
    assert _quantities(book["Inputs"], "Case")["Scenarios named in the case file"] == "reference"


def test_inputs_of_a_priced_design_show_the_design_given():
    from dataclasses import replace

    from disteco.reports.tables_design import run_table

    from test_reports_scenarios import scenario_study

    _, parts = design_parts()
    given = scenario_study()[2][0][1][0]  # a design of the reflux grid, as if given on the command line
    rows = dict(run_table(replace(parts, scenarios=()), (), given).rows)
    assert rows["Mode"] == "a given design priced" and rows["Price scenarios run"] == "reference"
    assert (rows["Given reflux ratio [-]"], rows["Given stages, reboiler included [-]"],
            rows["Given feed stage, from the top [-]"]) == (given.reflux_ratio, given.stages, given.feed_stage)
    assert rows["Optimiser options"] == "defaults"
