"""Flooding, net and total area of each tray at the design fraction of flood."""

from __future__ import annotations

import math
from dataclasses import dataclass

from .flooding import (FLOODING_METHODS, diameter_of, downcomer_area_fraction, flooding_velocity, flow_parameter,
                       required_tray_area, surface_tension_correction)


@dataclass(frozen=True)
class TrayHydraulics:
    """Flooding and area of one tray at the design fraction of flood (SI)."""

    stage: int  # counted from the top
    liquid_density: float  # kg/m^3
    vapour_density: float  # kg/m^3
    surface_tension: float  # N/m
    vapour_volume_flow: float  # m^3/s
    flow_parameter: float  # -
    capacity_factor: float  # m/s, at flood, surface-tension and system factor applied
    flooding_velocity: float  # m/s, on the net area
    design_velocity: float  # m/s, on the net area
    downcomer_fraction: float  # -
    net_area: float  # m^2
    total_area: float  # m^2
    diameter: float  # m, not rounded


def tray_hydraulics(stage: int, liquid_mass_flow: float, vapour_mass_flow: float, liquid_density: float,
                    vapour_density: float, surface_tension: float, tray_spacing: float,
                    flood_fraction: float, method: str = "lygeros-magoulas", system_factor: float = 1.0,
                    downcomer_fraction: float | None = None) -> TrayHydraulics:
    """Flooding, net and total area and diameter of one tray (ranges are checked by the caller).

    The total area is :func:`~disteco.sizing.flooding.required_tray_area`, the function the
    optimisation model's flooding constraints are built from.
    """
    flv = flow_parameter(liquid_mass_flow, vapour_mass_flow, liquid_density, vapour_density)
    c = FLOODING_METHODS[method](flv, tray_spacing) * surface_tension_correction(surface_tension) * system_factor
    u_flood = flooding_velocity(c, liquid_density, vapour_density)
    fraction = downcomer_area_fraction(flv) if downcomer_fraction is None else downcomer_fraction
    volume_flow = vapour_mass_flow / vapour_density
    total = required_tray_area(vapour_mass_flow, liquid_mass_flow, liquid_density, vapour_density, surface_tension,
                               tray_spacing, flood_fraction, method, system_factor, downcomer_fraction)
    return TrayHydraulics(stage, liquid_density, vapour_density, surface_tension, volume_flow, flv, c,
                          u_flood, flood_fraction * u_flood, fraction, total * (1.0 - fraction), total,
                          diameter_of(total))


def round_up(value: float, increment: float) -> float:
    """``value`` rounded up to a whole multiple of ``increment`` (same unit)."""
    steps = math.ceil(value / increment - 1e-9)
    return round(steps * increment, 10)
