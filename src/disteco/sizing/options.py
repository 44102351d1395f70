"""Options of the sizing layer, validated on construction with field-named errors.

Defaults are common practice, no source, unless a field's comment names one.
"""

from __future__ import annotations

from dataclasses import dataclass, fields

from .._base.errors import CaseError
from .._base.validity import OutOfRange
from ..case import Case
from .flooding import FLOODING_METHODS, TRAY_SPACING_RANGE
from .materials import material

INCH = 0.0254  # m
TRAY_TYPES = ("sieve", "valve")  # tray cost curves of the costing layer (sieve_tray, valve_tray)
# Candidate tray spacings the optimiser chooses from by TAC (common practice, no source) [m]
STANDARD_TRAY_SPACINGS = (0.45, 0.50, 0.60, 0.75)
SHELL_COUNTS = (1, 2)  # one shell, or two in series split where their heights balance

# Fields that must be strictly positive, and fractions in (0, 1].
_POSITIVE = ("diameter_increment", "system_factor", "sump_residence_time", "max_height",
             "max_height_to_diameter", "joint_efficiency", "min_approach", "operating_hours",
             "drum_holdup_time", "drum_fill_fraction", "drum_length_to_diameter", "pressure_margin_minimum")
_NON_NEGATIVE = ("top_space", "bottom_space", "skirt_height", "corrosion_allowance",
                 "pressure_margin_fraction", "temperature_margin", "pump_head_allowance")
_FRACTIONS = ("flood_fraction", "joint_efficiency", "drum_fill_fraction", "system_factor")


@dataclass(frozen=True)
class SizingOptions:
    """Choices of the designer; SI units (m, s, K, Pa, h/yr for operating hours)."""

    tray_spacing: float = 24 * INCH  # m; 24 in is usual above about 1.5 m diameter
    tray_spacings: tuple[float, ...] | None = None  # m; candidates the optimiser chooses from (None: standard list)
    flood_fraction: float = 0.80  # - of flooding velocity
    flooding_method: str = "lygeros-magoulas"  # key of FLOODING_METHODS
    tray_type: str = "sieve"  # one of TRAY_TYPES: which tray cost curve prices the trays
    system_factor: float = 1.0  # - ; below 1 for foaming systems
    downcomer_area_fraction: float | None = None  # - ; None: rule from the flow parameter
    diameter_increment: float = 0.05  # m; the diameter is rounded up to a multiple of it
    separate_sections: bool = False  # True: own diameters above and below the feed
    tray_efficiency: float | None = None  # - ; None: O'Connell
    light_key: int = 0  # component index, for the relative volatility of O'Connell
    heavy_key: int = 1
    top_space: float = 1.2  # m above the top tray
    bottom_space: float = 1.0  # m between sump liquid level and bottom tray
    sump_residence_time: float = 300.0  # s of reboiler feed held in the sump
    skirt_height: float = 3.0  # m
    max_height: float = 50.0  # m, largest tangent length of one shell: a limit of the optimisation
    max_height_to_diameter: float = 30.0  # - largest tangent length over diameter of a shell: sets a least diameter
    shells: int = 1  # shells in series (SHELL_COUNTS), split at the tray that balances their heights
    shell_material: str = "SA-516 Grade 70"  # a row name of cost_data/allowable_stress.csv
    tray_material: str = "CS"  # a material of the trays' group in cost_data/material_factors.csv
    joint_efficiency: float = 0.85  # - ; spot-radiographed double-welded butt joint (UW-12)
    corrosion_allowance: float = 3e-3  # m
    pressure_margin_fraction: float = 0.10  # - above the highest operating gauge pressure
    pressure_margin_minimum: float = 1.0e5  # Pa, at least this above it
    temperature_margin: float = 25.0  # K above the highest operating temperature
    min_approach: float = 10.0  # K between process and utility, both ends
    operating_hours: float = 8000.0  # h/yr
    drum_holdup_time: float = 300.0  # s at the working level
    drum_fill_fraction: float = 0.5  # -
    drum_length_to_diameter: float = 3.0  # -
    pump_head_allowance: float = 15.0  # m added to the column height (valve and line losses)
    pump_efficiency: float | None = None  # - ; None: Corripio
    out_of_range: OutOfRange = OutOfRange.WARN  # stage conditions outside a correlation's range

    def __post_init__(self):
        for f in fields(self):
            value = getattr(self, f.name)
            if isinstance(value, bool) or value is None or not isinstance(value, (int, float)):
                continue
            if f.name in _POSITIVE and not value > 0.0:
                raise CaseError(f"sizing.{f.name}", f"{value!r}", "a value above zero", value)
            if f.name in _NON_NEGATIVE and not value >= 0.0:
                raise CaseError(f"sizing.{f.name}", f"{value!r}", "zero or above", value)
            if f.name in _FRACTIONS and not 0.0 < value <= 1.0:
                raise CaseError(f"sizing.{f.name}", f"{value!r} is not a fraction", "above 0 and at most 1", value)
        _spacing_in_range("sizing.tray_spacing", self.tray_spacing)
        if self.tray_spacings is not None:
            if not self.tray_spacings or len(set(self.tray_spacings)) != len(self.tray_spacings):
                raise CaseError("sizing.tray_spacings", ", ".join(f"{s:.4g} m" for s in self.tray_spacings) or "none",
                                "one or more different spacings, e.g. [\"0.45 m\", \"0.6 m\"]")
            for spacing in self.tray_spacings:
                _spacing_in_range("sizing.tray_spacings", spacing)
        if self.shells not in SHELL_COUNTS:
            raise CaseError("sizing.shells", f"{self.shells!r}", " or ".join(map(str, SHELL_COUNTS)))
        if self.flooding_method not in FLOODING_METHODS:
            raise CaseError("sizing.flooding_method", f"unknown method {self.flooding_method!r}",
                            ", ".join(FLOODING_METHODS))
        if self.tray_type not in TRAY_TYPES:
            raise CaseError("sizing.tray_type", f"unknown tray type {self.tray_type!r}", ", ".join(TRAY_TYPES))
        if self.downcomer_area_fraction is not None and not 0.0 <= self.downcomer_area_fraction < 0.5:
            raise CaseError("sizing.downcomer_area_fraction", f"{self.downcomer_area_fraction!r}",
                            "0 to 0.5 of the cross-section")
        if self.tray_efficiency is not None and not 0.0 < self.tray_efficiency <= 1.0:
            raise CaseError("sizing.tray_efficiency", f"{self.tray_efficiency!r}", "above 0 and at most 1")
        if self.pump_efficiency is not None and not 0.0 < self.pump_efficiency <= 1.0:
            raise CaseError("sizing.pump_efficiency", f"{self.pump_efficiency!r}", "above 0 and at most 1")
        if self.light_key == self.heavy_key or min(self.light_key, self.heavy_key) < 0:
            raise CaseError("sizing.heavy_key", f"keys {self.light_key} and {self.heavy_key}",
                            "two different component indices")
        material(self.shell_material)
        if not isinstance(self.tray_material, str) or not self.tray_material.strip():
            raise CaseError("sizing.tray_material", f"{self.tray_material!r}", "a material name of the cost data")

    @property
    def spacing_candidates(self) -> tuple[float, ...]:
        """The tray spacings the optimiser compares [m]: the given list, else the standard one."""
        return self.tray_spacings if self.tray_spacings is not None else STANDARD_TRAY_SPACINGS


def _spacing_in_range(field: str, spacing) -> None:
    if isinstance(spacing, bool) or not isinstance(spacing, (int, float)) or not TRAY_SPACING_RANGE.contains(spacing):
        raise CaseError(field, f"{spacing!r} m is outside the range of the flooding correlations",
                        f"{TRAY_SPACING_RANGE.low:.4g} to {TRAY_SPACING_RANGE.high:.4g} m (6 to 36 in)", spacing)


def sizing_options(case: Case) -> SizingOptions:
    """The case's [sizing] choices over the defaults, with the case's key components.

    Raises :class:`CaseError` naming the ``sizing.`` field of a value out of range.
    """
    given = case.sizing.as_dict()
    if "tray_spacing" in given and "tray_spacings" not in given:
        given["tray_spacings"] = (given["tray_spacing"],)  # a spacing the designer fixed is not searched over
    return SizingOptions(**given, light_key=case.products.light_key, heavy_key=case.products.heavy_key)
