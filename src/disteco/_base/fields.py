"""Reading one field of a case file's tables: its kind, its unit-free checks and the field-named error.

The case layer (``case.py``) builds its dataclasses from these; a value that is not of the kind asked for is
named with what was found and, where a common slip is recognised, what to write instead.
"""

from __future__ import annotations

import difflib
import math
import unicodedata

from .errors import CaseError


def only_keys(table: dict, prefix: str, allowed: set[str]) -> None:
    for key in table:
        if key not in allowed:
            close = difflib.get_close_matches(str(key), sorted(allowed), n=1)
            problem = f"unknown field; did you mean {prefix}{close[0]}?" if close else "unknown field"
            raise CaseError(key_name(prefix, key), problem, ", ".join(sorted(allowed)))


def key_name(prefix: str, key: str) -> str:
    """Dotted field name; a key that is empty or not a plain word is quoted, as TOML writes it."""
    plain = key and all(c.isalnum() or c in "_-" for c in key)
    return prefix + (key if plain else repr(key))


def table(data: dict, name: str, prefix: str = "") -> dict:
    if name not in data:
        raise CaseError(f"{prefix}{name}", "missing table", f"a [{prefix}{name}] table")
    value = data[name]
    if not isinstance(value, dict):
        raise CaseError(f"{prefix}{name}", "must be a table", f"[{prefix}{name}]")
    return value


MISSING = object()
KIND_NAMES = {str: "text", float: "a number", int: "a whole number", list: "a list", dict: "a table",
              bool: "true or false"}


def kind_name(kind) -> str:
    if kind == QUANTITY:
        return "a quantity with its unit, as text"
    kinds = kind if isinstance(kind, tuple) else (kind,)
    return " or ".join(KIND_NAMES.get(k, k.__name__) for k in kinds)


# A quantity is text with its unit; a bare number is let through to be told that its unit is missing.
QUANTITY = (str, int, float)


def get(table: dict, key: str, kind, prefix: str = "", default=MISSING):
    if key not in table:
        if default is MISSING:
            raise CaseError(f"{prefix}{key}", "missing field")
        return default
    value = table[key]
    if kind is float and isinstance(value, int) and not isinstance(value, bool):
        value = float(value)
    if not isinstance(value, kind) or isinstance(value, bool) and kind is not bool:
        raise CaseError(f"{prefix}{key}", f"expected {kind_name(kind)}, got {shown(value)}", kind_hint(kind, value))
    if kind is float and not math.isfinite(value):
        raise CaseError(f"{prefix}{key}", f"{value!r} is not a finite number", "a finite number")
    return value


def kind_hint(kind, value) -> str | None:
    """What to write instead, where a common slip is recognised: a number in quotes, one name not in a list."""
    if kind in (int, float) and isinstance(value, str):
        try:
            number = float(value)
        except ValueError:
            return None
        return f"the number without quotes, e.g. {value.strip()}" if math.isfinite(number) else None
    if kind is list and isinstance(value, str):
        return f'a list in brackets, e.g. ["{value if len(value) <= 60 else value[:60] + "..."}"]'
    return None


def shown(value, limit: int = 60) -> str:
    text = repr(value)
    return text if len(text) <= limit else text[:limit] + "..."


def text(table: dict, key: str, prefix: str, default=MISSING) -> str:
    """A text field without control characters (they break the workbook and the console)."""
    value = get(table, key, str, prefix, default)
    printable(value, prefix + key)
    return value


def printable(value, field: str) -> None:
    if isinstance(value, str) and any(unicodedata.category(c) == "Cc" for c in value):
        raise CaseError(field, f"{shown(value)} contains a control character",
                        "printable text (no NUL, tab, newline or other control characters)")


def fraction(table: dict, key: str, prefix: str, open_ends: bool = True) -> float:
    value = get(table, key, float, prefix)
    ok = 0.0 < value < 1.0 if open_ends else 0.0 <= value <= 1.0
    if not ok:
        raise CaseError(f"{prefix}{key}", f"{value} is not a fraction",
                        "strictly between 0 and 1" if open_ends else "0 to 1", value)
    return value


def matrix(table: dict, key: str, n: int, prefix: str, zero_diagonal: bool = True):
    if key not in table:
        raise CaseError(prefix + key, "missing field", f"a {n} x {n} list of numbers")
    value = table[key]
    if (not isinstance(value, list) or len(value) != n
            or any(not isinstance(row, list) or len(row) != n for row in value)
            or any(isinstance(x, bool) or not isinstance(x, (int, float)) for row in value for x in row)):
        raise CaseError(prefix + key, f"not a {n} x {n} matrix of numbers", f"a {n} x {n} list of lists")
    rows = tuple(tuple(float(x) for x in row) for row in value)
    if not all(math.isfinite(x) for row in rows for x in row):
        raise CaseError(prefix + key, "holds a value that is not a finite number", "finite numbers")
    if zero_diagonal and any(rows[i][i] != 0.0 for i in range(n)):
        raise CaseError(prefix + key, "a diagonal entry is not zero",
                        "0 on the diagonal: a component does not interact with itself")
    return rows


__all__ = ["KIND_NAMES", "MISSING", "QUANTITY", "fraction", "get", "key_name", "kind_hint", "kind_name", "matrix",
           "only_keys", "printable", "shown", "table", "text"]
