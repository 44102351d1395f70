"""Reflux drum from a liquid hold-up time and reflux pump power from flow and head."""

from __future__ import annotations

import math
from dataclasses import dataclass

from fluids.constants import g
from fluids.pump import Corripio_pump_efficiency

from .._base.validity import OutOfRange, ValidityRange

US_GALLON_PER_MINUTE = 3.785411784e-3 / 60.0  # m^3/s

CORRIPIO_RANGE = ValidityRange("Corripio pump efficiency", "volumetric flow", 50.0 * US_GALLON_PER_MINUTE,
                               5000.0 * US_GALLON_PER_MINUTE, "m^3/s",
                               "Corripio, Chrien and Evans (1982): 50 to 5000 US gal/min")


def drum_volume(liquid_volume_flow, holdup_time, fill_fraction):
    r"""Vessel volume that holds a liquid flow for a hold-up time at a working fill.

    .. math::
        V = \frac{Q_L\,t_h}{\phi}

    Parameters
    ----------
    liquid_volume_flow : float
        Liquid entering the drum [m^3/s]
    holdup_time : float
        Hold-up time of the liquid at the working level [s]
    fill_fraction : float
        Fraction of the drum volume filled at the working level [-]

    Returns
    -------
    float
        Drum volume [m^3]

    Notes
    -----
    Common practice, no source: 5 min hold-up at half full for a reflux drum.

    Examples
    --------
    >>> round(drum_volume(0.01, 300.0, 0.5), 2)
    6.0

    References
    ----------
    1. Volume balance; defaults common practice, no source.
    """
    return liquid_volume_flow * holdup_time / fill_fraction


def pump_shaft_power(volume_flow, density, head, efficiency):
    r"""Shaft power of a pump from flow, head and efficiency.

    .. math::
        P = \frac{\rho g Q H}{\eta}

    Parameters
    ----------
    volume_flow : float
        Liquid volumetric flow [m^3/s]
    density : float
        Liquid density [kg/m^3]
    head : float
        Differential head [m]
    efficiency : float
        Pump efficiency [-]

    Returns
    -------
    float
        Shaft power [W]

    Notes
    -----
    Hydraulic power over efficiency; motor losses are not included.

    Examples
    --------
    >>> round(pump_shaft_power(0.01, 800.0, 40.0, 0.6))
    5230

    References
    ----------
    1. Bell, C., fluids library, ``fluids.pump`` (efficiency by Corripio et al.).
    """
    return density * g * volume_flow * head / efficiency


@dataclass(frozen=True)
class DrumSizing:
    """Horizontal reflux drum (SI)."""

    liquid_volume_flow: float  # m^3/s
    holdup_time: float  # s
    fill_fraction: float  # -
    volume: float  # m^3
    diameter: float  # m
    length: float  # m, tangent to tangent
    design_pressure: float  # Pa, gauge
    design_temperature: float  # K


def size_drum(liquid_volume_flow: float, holdup_time: float, fill_fraction: float, length_to_diameter: float,
              design_pressure: float, design_temperature: float) -> DrumSizing:
    """Volume, diameter and length of a horizontal drum of given length-to-diameter ratio."""
    volume = drum_volume(liquid_volume_flow, holdup_time, fill_fraction)
    diameter = (4.0 * volume / (math.pi * length_to_diameter)) ** (1.0 / 3.0)
    return DrumSizing(liquid_volume_flow, holdup_time, fill_fraction, volume, diameter,
                      length_to_diameter * diameter, design_pressure, design_temperature)


@dataclass(frozen=True)
class PumpSizing:
    """Reflux pump (SI)."""

    volume_flow: float  # m^3/s
    density: float  # kg/m^3
    head: float  # m
    efficiency: float  # -
    efficiency_method: str
    shaft_power: float  # W
    design_pressure: float  # Pa, gauge, discharge side
    design_temperature: float  # K
    warnings: tuple[str, ...]


def size_pump(volume_flow: float, density: float, head: float, efficiency: float | None,
              suction_design_pressure: float, design_temperature: float,
              policy: OutOfRange = OutOfRange.WARN) -> PumpSizing:
    """Reflux pump: efficiency (Corripio via ``fluids`` unless given), shaft power, design pressure.

    Below 50 US gal/min the Corripio fit falls steeply; outside its range the efficiency at
    the nearer end of the range is used and a warning says so.
    """
    warnings: list[str] = []
    method = "user value"
    if efficiency is None:
        method = "Corripio (1982) via fluids"
        flow = volume_flow
        if not CORRIPIO_RANGE.contains(volume_flow):
            CORRIPIO_RANGE.check(volume_flow, policy, warnings)
            flow = min(max(volume_flow, CORRIPIO_RANGE.low), CORRIPIO_RANGE.high)
            # one warning for one condition: the range and what was done about it
            warnings[-1] += f"; the efficiency is taken at {flow:.4g} m^3/s, the nearer end of the range"
        efficiency = Corripio_pump_efficiency(flow)
    power = pump_shaft_power(volume_flow, density, head, efficiency)
    return PumpSizing(volume_flow, density, head, efficiency, method, power,
                      suction_design_pressure + density * g * head, design_temperature, tuple(warnings))
