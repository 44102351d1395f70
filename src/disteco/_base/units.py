"""Quantities as a person writes them ("120 kmol/h", "1.2 bar", "85 degC") into SI.

SI inside disteco: K, Pa (absolute), mol/s, kg/s, m^3/s, J, W, m, s.
Gauge pressures must be written with a gauge unit (``barg``, ``kPag``, ``psig``);
every other pressure unit is absolute. Gauge values are referred to 101325 Pa.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass

from .errors import CaseError

ATMOSPHERE = 101325.0  # Pa
HOUR = 3600.0  # s
POUND = 0.45359237  # kg
PSI = 6894.757293168  # Pa
FOOT = 0.3048  # m


@dataclass(frozen=True)
class Unit:
    """A unit: SI value = factor * value + offset."""

    factor: float
    offset: float = 0.0
    basis: str = ""  # for flows: "molar", "mass" or "volume"; for pressure: "abs" or "gauge"


TEMPERATURE = {
    "K": Unit(1.0),
    "degC": Unit(1.0, 273.15), "°C": Unit(1.0, 273.15), "C": Unit(1.0, 273.15),
    "degF": Unit(5.0 / 9.0, 273.15 - 32.0 * 5.0 / 9.0), "°F": Unit(5.0 / 9.0, 273.15 - 32.0 * 5.0 / 9.0),
    "F": Unit(5.0 / 9.0, 273.15 - 32.0 * 5.0 / 9.0),
    "R": Unit(5.0 / 9.0),
}

TEMPERATURE_DIFFERENCE = {"K": Unit(1.0), "degC": Unit(1.0), "°C": Unit(1.0), "C": Unit(1.0),
                          "degF": Unit(5.0 / 9.0), "°F": Unit(5.0 / 9.0), "F": Unit(5.0 / 9.0)}

_PRESSURE_ABS = {"Pa": 1.0, "kPa": 1e3, "MPa": 1e6, "bar": 1e5, "mbar": 1e2, "atm": ATMOSPHERE,
                 "psi": PSI, "mmHg": 133.322387415, "torr": ATMOSPHERE / 760.0}
PRESSURE = {name: Unit(f, 0.0, "abs") for name, f in _PRESSURE_ABS.items()}
PRESSURE.update({name + "a": Unit(f, 0.0, "abs") for name, f in _PRESSURE_ABS.items()
                 if name in ("bar", "kPa", "MPa", "psi")})
PRESSURE.update({name + "g": Unit(f, ATMOSPHERE, "gauge") for name, f in _PRESSURE_ABS.items()
                 if name in ("bar", "kPa", "MPa", "psi", "mbar")})
PRESSURE_DIFFERENCE = {name: Unit(f) for name, f in _PRESSURE_ABS.items()}

FLOW = {
    "mol/s": Unit(1.0, 0.0, "molar"), "kmol/s": Unit(1e3, 0.0, "molar"),
    "mol/h": Unit(1.0 / HOUR, 0.0, "molar"), "kmol/h": Unit(1e3 / HOUR, 0.0, "molar"),
    "lbmol/h": Unit(1e3 * POUND / HOUR, 0.0, "molar"),
    "kg/s": Unit(1.0, 0.0, "mass"), "kg/h": Unit(1.0 / HOUR, 0.0, "mass"),
    "t/h": Unit(1e3 / HOUR, 0.0, "mass"), "lb/h": Unit(POUND / HOUR, 0.0, "mass"),
    "t/d": Unit(1e3 / (24 * HOUR), 0.0, "mass"),
    "m3/s": Unit(1.0, 0.0, "volume"), "m3/h": Unit(1.0 / HOUR, 0.0, "volume"),
    "L/s": Unit(1e-3, 0.0, "volume"), "L/min": Unit(1e-3 / 60.0, 0.0, "volume"),
}

LENGTH = {"m": Unit(1.0), "mm": Unit(1e-3), "cm": Unit(1e-2), "in": Unit(0.0254), "ft": Unit(FOOT)}
TIME = {"s": Unit(1.0), "min": Unit(60.0), "h": Unit(HOUR)}

KINDS = {
    "temperature": TEMPERATURE,
    "temperature difference": TEMPERATURE_DIFFERENCE,
    "pressure": PRESSURE,
    "pressure difference": PRESSURE_DIFFERENCE,
    "flow": FLOW,
    "length": LENGTH,
    "time": TIME,
}

_NUMBER = r"[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?"
_QUANTITY = re.compile(rf"^\s*({_NUMBER})\s*(\S.*?)\s*$")
_BARE_NUMBER = re.compile(rf"^\s*{_NUMBER}\s*$")


def _normalise_unit(text: str) -> str:
    text = text.replace("³", "3").replace(" ", "")
    # "hr" and "day" as engineers often write them ("200 kmol/hr", "5 t/day")
    text = {"hr": "h"}.get(text, text)
    for long, short in (("/hr", "/h"), ("/day", "/d")):
        if text.endswith(long):
            text = text[:-len(long)] + short
    return {"bar(a)": "bara", "bar(g)": "barg", "kPa(a)": "kPaa", "kPa(g)": "kPag",
            "psi(a)": "psia", "psi(g)": "psig"}.get(text, text)


def parse_quantity(text, kind: str, field: str) -> tuple[float, Unit]:
    """Parse ``"<number> <unit>"`` of a given kind; return (SI value, unit).

    Raises CaseError naming ``field`` when the text is not a number with a known unit.
    """
    table = KINDS[kind]
    allowed = ", ".join(table)
    if isinstance(text, (int, float)) and not isinstance(text, bool):
        raise CaseError(field, f"a unit is missing: {text!r} is a bare number",
                        f"text with a {kind} unit, e.g. \"{_example(kind)}\"; units: {allowed}", text)
    if isinstance(text, bool) or not isinstance(text, str):
        raise CaseError(field, f"expected a {kind} written as text with its unit, got {text!r}",
                        f"e.g. \"{_example(kind)}\"; units: {allowed}", text)
    if _BARE_NUMBER.match(text):  # else "100" reads as 10 in a unit "0"
        raise CaseError(field, f"a unit is missing in {text!r}",
                        f"the number followed by a {kind} unit, e.g. \"{_example(kind)}\"; units: {allowed}", text)
    match = _QUANTITY.match(text)
    if not match:
        raise CaseError(field, f"cannot read {text!r} as a number followed by a unit",
                        f"e.g. \"{_example(kind)}\"; units: {allowed}", text)
    value = float(match.group(1))
    if not math.isfinite(value):  # "1e999" reads as infinity
        raise CaseError(field, f"{text!r} is not a finite number", f"e.g. \"{_example(kind)}\"", text)
    unit_name = _normalise_unit(match.group(2))
    unit = table.get(unit_name)
    if unit is None:
        raise CaseError(field, f"unknown {kind} unit {match.group(2)!r}", allowed, text)
    return unit.factor * value + unit.offset, unit


def _example(kind: str) -> str:
    return {"temperature": "85 degC", "temperature difference": "10 K", "pressure": "1.2 bar",
            "pressure difference": "0.7 kPa", "flow": "120 kmol/h", "length": "0.6 m",
            "time": "5 min"}[kind]


def to_degC(kelvin: float) -> float:
    """Convert K to degC."""
    return kelvin - 273.15
