"""Writing typed tables into openpyxl worksheets: numbers as numbers, text never as a formula."""

from __future__ import annotations

from openpyxl.cell.cell import ILLEGAL_CHARACTERS_RE
from openpyxl.styles import Alignment, Font, PatternFill
from openpyxl.utils import get_column_letter
from openpyxl.worksheet.worksheet import Worksheet

from .tables import MIXED, TEXT, Cell, Table, is_number

# A spreadsheet treats text starting with one of these as the start of a formula when the
# cell is edited or the data re-imported (formula injection).
FORMULA_LEADS = ("=", "+", "-", "@", "\t", "\r")
MAX_TEXT = 32767  # characters a spreadsheet cell holds
TITLE_FONT = Font(bold=True, size=12, color="1F3B57")
HEADER_FONT = Font(bold=True, color="FFFFFF")
HEADER_FILL = PatternFill("solid", fgColor="2E6A80")
WRAP = Alignment(wrap_text=True, vertical="top")


def put_text(ws: Worksheet, row: int, column: int, value: str):
    """Write ``value`` as a text cell, whatever it starts with.

    openpyxl turns a string starting with "=" into a formula; the data type is forced back
    to text here, and a quote prefix is set on text that a spreadsheet would read as a
    formula when the cell is edited, so the text shows exactly as written and never runs.
    Control characters that the file format cannot hold are dropped; text longer than a
    cell holds is cut and marked.
    """
    clean = ILLEGAL_CHARACTERS_RE.sub("", value)
    if len(clean) > MAX_TEXT:
        clean = clean[:MAX_TEXT - 12] + " [truncated]"
    cell = ws.cell(row=row, column=column)
    cell.value = clean
    cell.data_type = "s"
    if clean.startswith(FORMULA_LEADS):
        cell.quotePrefix = True
    return cell


def number_format_of(value: float | int) -> str:
    """A readable format for a labelled value of any size (columns of mixed quantities)."""
    size = abs(value)
    if isinstance(value, int):
        return "0"
    if size >= 1e4:
        return "#,##0"
    if size >= 1.0 or size == 0.0:
        return "0.000"
    if size >= 1e-3:
        return "0.00000"
    return "0.000E+00"


def put_value(ws: Worksheet, row: int, column: int, value: Cell, number_format: str):
    """Write a number with its format, text as text, None as an empty cell.

    ``number_format`` "General" (a column of mixed quantities) picks a format per value.
    """
    if isinstance(value, str):
        return put_text(ws, row, column, value)
    cell = ws.cell(row=row, column=column)
    if value is None:
        return cell
    if not is_number(value):
        raise ValueError(f"cell {cell.coordinate}: {value!r} is not a finite number")
    cell.value = value
    cell.number_format = number_format_of(value) if number_format == MIXED else number_format
    return cell


def write_table(ws: Worksheet, table: Table, top: int, left: int = 1) -> int:
    """Write ``table`` with its title at row ``top``; return the first free row below it.

    Layout: title row, header row (units in brackets), then one row per table row.
    """
    put_text(ws, top, left, table.title).font = TITLE_FONT
    for j, column in enumerate(table.columns):
        cell = put_text(ws, top + 1, left + j, column.header)
        cell.font = HEADER_FONT
        cell.fill = HEADER_FILL
        cell.alignment = Alignment(wrap_text=True, vertical="center")
        letter = get_column_letter(left + j)
        ws.column_dimensions[letter].width = max(ws.column_dimensions[letter].width or 0.0, column.width)
    for i, row in enumerate(table.rows):
        for j, (column, value) in enumerate(zip(table.columns, row)):
            cell = put_value(ws, top + 2 + i, left + j, value, column.number_format)
            if column.is_text:
                cell.number_format = TEXT  # an edit of the cell stays text too
                if column.width >= 60.0:
                    cell.alignment = WRAP
    return top + 2 + len(table.rows)


def write_tables(ws: Worksheet, tables: tuple[Table, ...] | list[Table]) -> list[int]:
    """Stack ``tables`` down the sheet, one blank row apart; freeze the first header row.

    Returns the row of each table's title.
    """
    tops, row = [], 1
    for table in tables:
        tops.append(row)
        row = write_table(ws, table, row) + 1
    if tables:
        ws.freeze_panes = ws.cell(row=tops[0] + 2, column=1)
        ws.print_title_rows = f"{tops[0] + 1}:{tops[0] + 1}"
    ws.page_setup.orientation = "landscape"
    ws.page_setup.fitToWidth = 1
    ws.page_setup.fitToHeight = 0  # as many pages down as needed
    ws.sheet_properties.pageSetUpPr.fitToPage = True
    return tops
