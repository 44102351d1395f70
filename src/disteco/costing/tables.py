"""Reading cost-data files (CSV and TOML) against a declared schema.

Every problem becomes a ``CostDataError`` naming the file, the row and the column. Rows
are numbered as lines in the file: the header is row 1, the first data row is row 2, so
the number is the line an editor shows.
"""

from __future__ import annotations

import csv
import io
import math
import tomllib
from dataclasses import dataclass
from importlib.resources import files
from importlib.resources.abc import Traversable
from pathlib import Path

from .._base.errors import CostDataError

BUNDLED_PACKAGE = "disteco.cost_data"


@dataclass(frozen=True)
class Field:
    """One column of a cost-data table.

    ``kind`` is "str", "float" or "int". ``required`` means the cell may not be empty.
    ``minimum`` (inclusive) and ``positive`` (strictly above zero) check numbers.
    """

    name: str
    kind: str = "float"
    required: bool = True
    minimum: float | None = None
    positive: bool = False


@dataclass(frozen=True)
class Folder:
    """Where cost data is read from: the bundled package data or a user folder."""

    root: Traversable
    label: str  # shown in error messages

    def name_of(self, filename: str) -> str:
        return f"{self.label}/{filename}"

    def read_text(self, filename: str) -> str:
        entry = self.root.joinpath(filename)
        if not entry.is_file():
            raise CostDataError(self.name_of(filename), "file not found")
        try:
            return entry.read_text(encoding="utf-8-sig")
        except UnicodeDecodeError:
            raise CostDataError(self.name_of(filename), "not UTF-8 text") from None


def bundled_folder() -> Folder:
    """The cost data shipped with disteco (works from an installed wheel too)."""
    return Folder(files(BUNDLED_PACKAGE), "cost_data (bundled)")


def user_folder(path: str | Path) -> Folder:
    """A user's cost-data folder with the same file names as the bundled one."""
    path = Path(path)
    if not path.is_dir():
        raise CostDataError(str(path), "economics.cost_data: folder not found")
    return Folder(path, str(path))


def read_csv(folder: Folder, filename: str, fields: tuple[Field, ...]) -> list[tuple[int, dict]]:
    """Read one CSV table; return ``(row number, {column: typed value})`` pairs.

    Extra columns are kept as text; missing columns, empty required cells, text where a
    number belongs, values below a minimum and a missing ``source`` raise CostDataError.
    """
    name = folder.name_of(filename)
    text = folder.read_text(filename)
    reader = csv.reader(io.StringIO(text))
    try:
        header = [h.strip() for h in next(reader)]
    except StopIteration:
        raise CostDataError(name, "empty file", row=1) from None
    for f in fields:
        if f.name not in header:
            raise CostDataError(name, f"missing column '{f.name}' (columns found: {', '.join(header)})",
                                row=1, column=f.name)
    rows = []
    for line, cells in enumerate(reader, start=2):
        if not cells or all(not c.strip() for c in cells):
            continue
        if len(cells) != len(header):
            raise CostDataError(name, f"{len(cells)} cells for {len(header)} columns", row=line)
        raw = dict(zip(header, (c.strip() for c in cells)))
        rows.append((line, {f.name: _convert(name, line, f, raw[f.name]) for f in fields}))
    if not rows:
        raise CostDataError(name, "no data rows", row=2)
    return rows


def _convert(name: str, line: int | None, f: Field, text: str):
    if not text:
        if f.required:
            raise CostDataError(name, "empty cell" + (" (every row needs a source)" if f.name == "source" else ""),
                                row=line, column=f.name)
        return None
    if f.kind == "str":
        return text
    try:
        value = int(text) if f.kind == "int" else float(text)
    except ValueError:
        raise CostDataError(name, f"{text!r} is not {'an integer' if f.kind == 'int' else 'a number'}",
                            row=line, column=f.name) from None
    if f.kind == "float" and not math.isfinite(value):
        raise CostDataError(name, f"{text!r} is not a finite number", row=line, column=f.name)
    if f.positive and value <= 0:
        raise CostDataError(name, f"{text} must be above zero", row=line, column=f.name)
    if f.minimum is not None and value < f.minimum:
        problem = "is negative" if f.minimum == 0.0 else f"is below the allowed minimum {f.minimum:g}"
        raise CostDataError(name, f"{text} {problem}", row=line, column=f.name)
    return value


def unique(folder: Folder, filename: str, rows: list[tuple[int, dict]], *keys: str) -> None:
    """Raise CostDataError on the second row that repeats the key columns."""
    seen = {}
    for line, row in rows:
        key = tuple(row[k] for k in keys)
        if key in seen:
            raise CostDataError(folder.name_of(filename),
                                f"{' / '.join(map(str, key))} repeats row {seen[key]}", row=line, column=keys[-1])
        seen[key] = line


def read_toml(folder: Folder, filename: str, fields: tuple[Field, ...]) -> dict:
    """Read a flat TOML settings file; check the declared keys like CSV columns."""
    name = folder.name_of(filename)
    try:
        data = tomllib.loads(folder.read_text(filename))
    except tomllib.TOMLDecodeError as exc:
        raise CostDataError(name, f"not valid TOML: {exc}") from None
    out = dict(data)
    for f in fields:
        if f.name not in data:
            if f.required:
                raise CostDataError(name, f"missing key '{f.name}'", column=f.name)
            out[f.name] = None
            continue
        value = data[f.name]
        kinds = {"str": (str,), "float": (int, float), "int": (int,)}[f.kind]
        if isinstance(value, bool) or not isinstance(value, kinds):
            raise CostDataError(name, f"{value!r} is not {'text' if f.kind == 'str' else 'a number'}", column=f.name)
        if f.kind != "str":
            _convert(name, None, Field(f.name, f.kind, True, f.minimum, f.positive), str(value))
        out[f.name] = float(value) if f.kind == "float" else value
    return out
