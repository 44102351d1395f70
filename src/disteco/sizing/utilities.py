"""Utility levels offered to the condenser and reboiler (filled from cost_data by the costing loader)."""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class UtilityLevel:
    """One utility level.

    ``service`` is "cooling" or "heating". ``kind`` is one of "cooling_water",
    "chilled_water", "refrigerant", "steam", "hot_oil", "warm_water" (cooling water used to
    heat a reboiler below ambient), "electricity".
    Condensing steam and evaporating refrigerant have supply = return temperature and a
    latent heat; cooling water, chilled water, warm water and hot oil heat or cool sensibly
    with a heat capacity.
    """

    name: str  # e.g. "low-pressure steam"
    service: str  # "cooling" or "heating"
    kind: str
    supply_temperature: float  # K
    return_temperature: float  # K
    latent_heat: float | None = None  # J/kg, condensing or evaporating utilities
    heat_capacity: float | None = None  # J/(kg K), sensible utilities
    pressure: float | None = None  # Pa, for steam levels (informative)
