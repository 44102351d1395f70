"""Writing typed tables into openpyxl worksheets: numbers as numbers, text never as a formula."""

from __future__ import annotations

import re

from openpyxl.cell.cell import ILLEGAL_CHARACTERS_RE
from openpyxl.styles import Alignment, Font, PatternFill
from openpyxl.utils import get_column_letter
from openpyxl.worksheet.worksheet import Worksheet

from .tables import MIXED, TEXT, Cell, Table, fraction_decimals, is_number

# A spreadsheet treats text starting with one of these as the start of a formula when the
# cell is edited or the data re-imported (formula injection).
FORMULA_LEADS = ("=", "+", "-", "@", "\t", "\r")
MAX_TEXT = 32767  # characters a spreadsheet cell holds
TITLE_FONT = Font(bold=True, size=12, color="1F3B57")
HEADER_FONT = Font(bold=True, color="FFFFFF")
HEADER_FILL = PatternFill("solid", fgColor="2E6A80")
WRAP = Alignment(wrap_text=True, vertical="top")
LABEL_UNIT = re.compile(r"\[([^\]]+)\]$")
MONEY_UNIT = re.compile(r"[A-Z]{3}(/year)?")  # a currency code, per year for running costs
SMALL_POWER = 100.0  # kW; below it a power or duty is shown to a tenth
# Precision of labelled values by unit: what the quantity is known to, not what the float holds.
UNIT_FORMATS = {"kW": "#,##0", "MW": "#,##0.00", "h/year": "#,##0", "year": "0", "kPa": "0.00",
                "kPa gauge": "0.0", "degC": "0.0", "kmol/h": "0.00", "m": "0.00", "m^2": "0.0", "m^3": "0.00",
                "kg": "#,##0", "mm": "0.0", "kg/s": "0.000", "GJ/year": "#,##0", "s": "0.0", "W/(m^2 K)": "0",
                "g/mol": "0.00", "1/year": "0.0000"}


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


def number_format_of(value: float | int, unit: str | None = None) -> str:
    """The format of a labelled value: by its unit where that fixes the precision (kW without
    decimals, money with thousands separators, hours and years as whole numbers), else by size."""
    if isinstance(value, int):
        return "#,##0" if abs(value) >= 1e4 else "0"
    if unit is not None:
        if MONEY_UNIT.fullmatch(unit):
            return "#,##0"
        if unit in ("mole fraction", "fraction"):  # a ppm impurity or a recovery near 1 keeps its digits
            places = fraction_decimals(value, 5)
            return "0.000E+00" if places is None else "0." + "0" * places
        # a pump's few kW keep their tenth
        fixed = "0.0" if unit == "kW" and abs(value) < SMALL_POWER else UNIT_FORMATS.get(unit)
        # a value the unit's format would show with fewer than two figures (a pilot column's 0.0036 m2
        # condenser read 0.0) takes the format by size, as the console's two figures
        if fixed is not None and not 0.0 < abs(value) < 10.0 ** (1 - decimals_shown(fixed)):
            return fixed
    size = abs(value)
    if size >= 1e4:
        return "#,##0"
    if size >= 1.0 or size == 0.0:
        return "0.000"
    if size >= 1e-3:
        return "0.00000"
    return "0.000E+00"


def decimals_shown(number_format: str) -> int | None:
    """Decimal places a fixed-point format shows (a percentage counts two more); None for others.

    >>> decimals_shown("#,##0"), decimals_shown("0.000"), decimals_shown("0.0%"), decimals_shown("0.0E+00")
    (0, 3, 3, None)
    """
    if "E" in number_format or "@" in number_format or number_format == MIXED:
        return None
    digits = number_format.split(".", 1)[1] if "." in number_format else ""
    return len(digits.rstrip("%")) + (2 if number_format.endswith("%") else 0)


def without_negative_zero(value: float | int, number_format: str) -> float | int:
    """0 for a negative value the format would show as "-0" (a tiny negative cost, say)."""
    decimals = decimals_shown(number_format)
    if value < 0 and decimals is not None and round(value, decimals) == 0:
        return 0 if isinstance(value, int) else 0.0
    return value


def put_value(ws: Worksheet, row: int, column: int, value: Cell, number_format: str, unit: str | None = None):
    """Write a number with its format, text as text, None as an empty cell.

    ``number_format`` "General" (a column of mixed quantities) picks a format per value from
    its ``unit`` (or its size). A value the format would show as "-0" is written as 0.
    """
    if isinstance(value, str):
        return put_text(ws, row, column, value)
    cell = ws.cell(row=row, column=column)
    if value is None:
        return cell
    if not is_number(value):
        raise ValueError(f"cell {cell.coordinate}: {value!r} is not a finite number")
    fmt = number_format_of(value, unit) if number_format == MIXED else number_format
    cell.value = without_negative_zero(value, fmt)
    cell.number_format = fmt
    return cell


def unit_beside(row: tuple[Cell, ...], j: int) -> str | None:
    """The unit of a number in a column of mixed quantities: in brackets at the end of the label on
    its left (a labelled value), else the text in the next column (a size and its unit)."""
    if j > 0 and isinstance(row[j - 1], str) and (found := LABEL_UNIT.search(row[j - 1])):
        return found.group(1)
    if j + 1 < len(row) and isinstance(row[j + 1], str):
        return row[j + 1]
    return None


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
            unit = unit_beside(row, j) if column.is_mixed else None
            cell = put_value(ws, top + 2 + i, left + j, value, column.number_format, unit)
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
