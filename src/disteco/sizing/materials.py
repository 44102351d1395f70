"""Allowable stress and density of shell materials, from ``cost_data/allowable_stress.csv``.

The table is read once (cached) through ``importlib.resources`` so that it is found in an
installed wheel too. A malformed row raises ``CostDataError`` naming file, row and column.
"""

from __future__ import annotations

import csv
from bisect import bisect_left
from dataclasses import dataclass
from functools import lru_cache
from importlib.resources import files

from .._base.errors import CaseError, CostDataError
from .._base.units import PSI

FILE = "allowable_stress.csv"
KSI = 1e3 * PSI  # Pa
TEMPERATURE_UNITS = {"degF": (5.0 / 9.0, 273.15 - 32.0 * 5.0 / 9.0), "degC": (1.0, 273.15), "K": (1.0, 0.0)}
STRESS_UNITS = {"ksi": KSI, "MPa": 1e6, "Pa": 1.0}
DENSITY_UNITS = {"kg/m^3": 1.0}
COLUMNS = ("material", "material_class", "temperature", "temperature_unit", "allowable_stress",
           "min_tensile_strength", "min_yield_strength", "stress_unit", "density", "density_unit", "source")


@dataclass(frozen=True)
class Material:
    """A shell material: allowable stress against temperature, density and cost class.

    ``temperatures`` [K] rise strictly; ``allowable_stresses`` [Pa] match them.
    """

    name: str
    material_class: str  # cost-data vocabulary: "CS", "LA", "SS"
    temperatures: tuple[float, ...]
    allowable_stresses: tuple[float, ...]
    tensile_strength: float  # Pa, specified minimum
    yield_strength: float  # Pa, specified minimum
    density: float  # kg/m^3
    sources: tuple[str, ...]

    def allowable_stress(self, temperature: float) -> float:
        """Allowable stress at ``temperature`` [K] by linear interpolation in the table [Pa].

        Outside the table's temperatures raises ``CaseError``: below the lowest the code's
        low-temperature (impact test) rules apply, above the highest no value is given.
        """
        low, high = self.temperatures[0], self.temperatures[-1]
        if not low <= temperature <= high:
            raise CaseError("sizing.shell_material",
                            f"design temperature {temperature - 273.15:.1f} degC is outside the "
                            f"allowable-stress table of {self.name}",
                            f"{low - 273.15:.1f} to {high - 273.15:.1f} degC, or another material")
        i = max(1, bisect_left(self.temperatures, temperature))
        t0, t1 = self.temperatures[i - 1], self.temperatures[i]
        s0, s1 = self.allowable_stresses[i - 1], self.allowable_stresses[i]
        return s0 + (s1 - s0) * (temperature - t0) / (t1 - t0)


def low_temperature_warning(steel: Material, temperatures: dict[str, float]) -> str | None:
    """A warning naming the items whose lowest operating metal temperature [K] (by item name)
    lies below the material's allowable-stress table; None where none does.

    The code's low-temperature rules then decide the material (ASME Section VIII Division 1:
    impact testing of carbon and low-alloy steels under UCS-66, of high-alloy steels under
    UHA-51; from memory). Costs stay those of the tabulated material.
    """
    lowest = steel.temperatures[0]
    cold = ", ".join(f"{where} {T - 273.15:.1f} degC" for where, T in temperatures.items() if T < lowest)
    if not cold:
        return None
    return (f"lowest operating metal temperatures below {lowest - 273.15:.1f} degC, the lowest temperature of "
            f"{steel.name}'s allowable-stress table: {cold}; the code's low-temperature rules decide the "
            "material (ASME Section VIII Division 1: impact testing under UCS-66 for carbon and low-alloy "
            "steels, UHA-51 for high-alloy steels; from memory) and depressuring can chill the metal further; "
            "costed as the tabulated material")


def _number(row: dict, column: str, line: int) -> float:
    text = (row.get(column) or "").strip()
    try:
        value = float(text)
    except ValueError:
        raise CostDataError(FILE, f"{text!r} is not a number", line, column) from None
    return value


def _unit(row: dict, column: str, table: dict, line: int):
    name = (row.get(column) or "").strip()
    if name not in table:
        raise CostDataError(FILE, f"unknown unit {name!r} (allowed: {', '.join(table)})", line, column)
    return table[name]


def _parse_row(row: dict, line: int) -> tuple:
    for column in ("material", "material_class", "source"):
        if not (row.get(column) or "").strip():
            raise CostDataError(FILE, "empty", line, column)
    factor, offset = _unit(row, "temperature_unit", TEMPERATURE_UNITS, line)
    stress = _unit(row, "stress_unit", STRESS_UNITS, line)
    density = _unit(row, "density_unit", DENSITY_UNITS, line) * _number(row, "density", line)
    values = [_number(row, c, line) * stress
              for c in ("allowable_stress", "min_tensile_strength", "min_yield_strength")]
    if min(values) <= 0.0 or density <= 0.0:
        raise CostDataError(FILE, "stresses and density must be positive", line)
    return (row["material"].strip(), row["material_class"].strip(),
            factor * _number(row, "temperature", line) + offset, *values, density, row["source"].strip())


@lru_cache(maxsize=1)
def load_materials() -> dict[str, Material]:
    """All materials of ``cost_data/allowable_stress.csv`` by name (read once)."""
    return parse_materials((files("disteco.cost_data") / FILE).read_text(encoding="utf-8"))


def parse_materials(text: str) -> dict[str, Material]:
    """Materials from the text of an allowable-stress table; ``CostDataError`` on a bad row."""
    reader = csv.DictReader(text.splitlines())
    missing = [c for c in COLUMNS if c not in (reader.fieldnames or ())]
    if missing:
        raise CostDataError(FILE, f"missing columns {', '.join(missing)}")
    rows: dict[str, list[tuple]] = {}
    for line, row in enumerate(reader, start=2):
        parsed = _parse_row(row, line)
        rows.setdefault(parsed[0], []).append((line, *parsed[1:]))
    return {name: _material(name, entries) for name, entries in rows.items()}


def _material(name: str, entries: list[tuple]) -> Material:
    first = entries[0]
    for line, cls, T, S, uts, ys, rho, _ in entries[1:]:
        if (cls, uts, ys, rho) != (first[1], first[4], first[5], first[6]):
            raise CostDataError(FILE, f"class, strengths and density of {name} differ from row {first[0]}", line)
    temperatures = tuple(e[2] for e in entries)
    if any(b <= a for a, b in zip(temperatures, temperatures[1:])):
        raise CostDataError(FILE, f"temperatures of {name} must rise strictly", entries[-1][0], "temperature")
    return Material(name, first[1], temperatures, tuple(e[3] for e in entries), first[4], first[5],
                    first[6], tuple(dict.fromkeys(e[7] for e in entries)))


def material(name: str) -> Material:
    """The material called ``name``; ``CaseError`` listing the known names otherwise."""
    table = load_materials()
    if name not in table:
        raise CaseError("sizing.shell_material", f"unknown material {name!r}", ", ".join(table))
    return table[name]
