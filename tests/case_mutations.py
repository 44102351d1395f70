"""Hypothesis strategies that get the example cases wrong the way a person would.

Used by tests/test_case_mutations.py (a fixed small budget) and bench/bench_case_mutations.py
(a large run). A mutated case is a TOML text; each mutation is one of: a value of the wrong
type, another unit, a number scaled out of range, NaN or infinity, a missing key, an unknown
key, an odd string, or a method table with random interaction parameters.
"""

from __future__ import annotations

import copy
import json
import math
import tomllib
from pathlib import Path

from hypothesis import strategies as st

EXAMPLES = Path(__file__).resolve().parents[1] / "examples"
EXAMPLE_NAMES = ("aromatics_binary", "depentaniser", "ethanol_water")
UNITS = ("K", "degC", "degF", "R", "bar", "barg", "kPa", "mbar", "psig", "atm", "mmHg", "Pa", "kmol/h", "mol/s",
         "kg/h", "t/h", "m3/h", "L/min", "lbmol/h", "furlongs", "", "degc", "KMOL/H", "%")
ODD_STRINGS = ("", " ", "\x00", "\t", "100", "nan", "inf", "1e999 K", "-273.15 degC", "nan kmol/h",
               "-1 bar", "0 kmol/h", "$x^2$", "\u00fcn\u00efcode", "benzene", "toluene", "auto", "nrtl",
               "partial", "..", ".", "/", "~", "C:\\temp", "x" * 300, "1,5 bar", "1.2.3 bar", "85 deg C",
               "\u200b", "\U0001f600", "[1, 2]", "true")
NUMBERS = (0, 1, -1, 2, 0.5, 1.5, -0.01, 1e-320, 1e308, 2 ** 63 - 1, -(2 ** 63), 1e-9, 0.999999999999,
           math.nan, math.inf, -math.inf, 5, 1e6)
SCALES = (-1.0, 0.0, 1e-9, 1e-3, 0.5, 2.0, 10.0, 1e3, 1e9, 1e300)


def load_example(name: str) -> dict:
    return tomllib.loads((EXAMPLES / f"{name}.toml").read_text())


def leaf_paths(data, prefix=()):
    """Paths (tuples of keys and indices) to every value below ``data``, tables and lists included."""
    items = data.items() if isinstance(data, dict) else enumerate(data) if isinstance(data, list) else ()
    for key, value in items:
        yield prefix + (key,)
        yield from leaf_paths(value, prefix + (key,))


def _parent(data, path):
    for key in path[:-1]:
        data = data[key]
    return data


def odd_values():
    return st.one_of(
        st.sampled_from(ODD_STRINGS), st.sampled_from(NUMBERS), st.booleans(),
        st.text(max_size=12),
        st.floats(allow_nan=True, allow_infinity=True),
        st.integers(min_value=-(2 ** 63), max_value=2 ** 63 - 1),
        st.lists(st.sampled_from(NUMBERS), max_size=6),
        st.lists(st.sampled_from(ODD_STRINGS), max_size=3),
        st.dictionaries(st.sampled_from(("a", "benzene", "", "flow")), st.sampled_from(NUMBERS), max_size=3),
        st.sampled_from(([], {}, [[0, 1], [1, 0]], [[]])),
    )


def _quantity(value: str, draw) -> str | None:
    parts = value.split(maxsplit=1)
    if len(parts) != 2:
        return None
    number, unit = parts
    try:
        float(number)
    except ValueError:
        return None  # text, not a quantity
    choice = draw(st.integers(0, 2))
    if choice == 0:
        return f"{number} {draw(st.sampled_from(UNITS))}"
    if choice == 1:
        scaled = float(number) * draw(st.sampled_from(SCALES))
        return f"{scaled!r} {unit}"
    return f"{draw(st.sampled_from(('nan', 'inf', '-inf', '1e999', '-0', '1e-320', '+5', '.5', '5.')))} {unit}"


def _matrix(draw, n: int):
    entry = st.one_of(st.sampled_from((0.0, 0.3, -0.5, 1.0, 5.0, -5.0, 50.0, -50.0, 1e300)),
                      st.floats(-20, 20), st.floats(allow_nan=True, allow_infinity=True))
    rows = [[0.0 if i == j and draw(st.booleans()) else draw(entry) for j in range(n)] for i in range(n)]
    return rows


@st.composite
def mutate(draw, data: dict) -> dict:
    """One mutation of ``data`` (a case as read from TOML), on a copy."""
    data = copy.deepcopy(data)
    paths = list(leaf_paths(data))
    kind = draw(st.sampled_from(("replace", "quantity", "scale", "delete", "unknown", "rename", "method")))
    path = draw(st.sampled_from(paths))
    parent, key = _parent(data, path), path[-1]
    value = parent[key]
    if kind == "quantity" and isinstance(value, str) and (changed := _quantity(value, draw)) is not None:
        parent[key] = changed
    elif kind == "scale" and isinstance(value, (int, float)) and not isinstance(value, bool):
        parent[key] = value * draw(st.sampled_from(SCALES + (math.nan, math.inf)))
    elif kind == "delete":
        del parent[key]
    elif kind == "unknown":
        table = parent if isinstance(parent, dict) else data
        table[draw(st.sampled_from(("", "Flow", "flows", "light_key_recovery", "heavy_key_recovery",
                                    "light_key_in_bottoms", "nrtl", "wilson", "peng_robinson", "x.y",
                                    "temperature", "q", "pressure", "extra")))] = draw(odd_values())
    elif kind == "rename" and isinstance(parent, dict):
        parent[str(key).upper() if draw(st.booleans()) else f"{key}s"] = parent.pop(key)
    elif kind == "method":
        mixture = data.get("mixture")
        if not isinstance(mixture, dict):
            return data  # no table to give a method to
        components = mixture.get("components")
        n = len(components) if isinstance(components, list) and components else 2
        method = draw(st.sampled_from(("nrtl", "wilson", "peng-robinson", "ideal", "unifac-dortmund")))
        mixture["method"] = method
        if method == "nrtl":
            mixture["nrtl"] = {"a": _matrix(draw, n), "b": _matrix(draw, n), "alpha": _matrix(draw, n)}
        elif method == "wilson":
            mixture["wilson"] = {"a": _matrix(draw, n), "b": _matrix(draw, n)}
        elif method == "peng-robinson":
            mixture["peng_robinson"] = {"kij": _matrix(draw, n)}
    else:
        parent[key] = draw(odd_values())
    return data


@st.composite
def mutated_cases(draw, most: int = 3, names: tuple[str, ...] = EXAMPLE_NAMES) -> str:
    """TOML text of one of the examples ``names`` with one to ``most`` mutations."""
    data = load_example(draw(st.sampled_from(names)))
    for _ in range(draw(st.integers(1, most))):
        data = draw(mutate(data))
    return to_toml(data)


def _value(value) -> str:
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, int):
        return str(value)
    if isinstance(value, float):
        if math.isnan(value):
            return "nan"
        if math.isinf(value):
            return "inf" if value > 0 else "-inf"
        return repr(value)
    if isinstance(value, str):
        # A TOML basic string: JSON's escapes are a subset of TOML's; TOML also escapes DEL.
        return json.dumps(value, ensure_ascii=False).replace("\x7f", "\\u007f")
    if isinstance(value, list):
        return "[" + ", ".join(_value(v) for v in value) + "]"
    return "{" + ", ".join(f"{_value(str(k))} = {_value(v)}" for k, v in value.items()) + "}"


def to_toml(data: dict) -> str:
    """TOML text of ``data``: one ``key = value`` line per top-level key, tables inline."""
    return "".join(f"{_value(str(key))} = {_value(value)}\n" for key, value in data.items())
