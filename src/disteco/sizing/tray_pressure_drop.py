"""Pressure drop of a sieve tray: dry plate plus liquid head (Sinnott's sieve-plate method).

The total drop of one tray in head of clear liquid is the dry-plate (orifice) head, the
weir height, the crest over the weir (Francis' form) and a residual head,
h_t = h_d + (h_w + h_ow) + h_r, turned into pressure by the liquid's hydrostatic head
(Sinnott, Coulson and Richardson's Chemical Engineering Vol. 6, 4th ed., 2005, Section
11.13, eqs. 11.85 and 11.87-11.90; equation numbers from memory).

Geometry not chosen elsewhere in disteco is taken at the source's usual values (stated
defaults, common practice as the source recommends it): hole area 10 % of the active area,
plate thickness equal to the hole diameter (orifice coefficient 0.84 read from the source's
Fig. 11.34 at these two, from memory), weir height 50 mm at or above atmospheric pressure
and 10 mm under vacuum, the active area the cross-section less two downcomers.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .._base.units import ATMOSPHERE
from .trays import TrayHydraulics

MILLIMETRE = 1e-3  # m
GRAVITY = 9.81  # m/s^2, as the source rounds it
HOLE_AREA_FRACTION = 0.10  # hole area / active area [-]; Sinnott Section 11.13, common practice
ORIFICE_COEFFICIENT = 0.84  # C0 [-] at plate thickness / hole diameter 1 and A_h/A_p 0.1, Sinnott Fig. 11.34
WEIR_HEIGHT = 50 * MILLIMETRE  # m, above atmospheric: 40-90 mm, 40-50 recommended (Sinnott 11.13)
VACUUM_WEIR_HEIGHT = 10 * MILLIMETRE  # m, under vacuum: 6-12 mm recommended (Sinnott 11.13)


def dry_plate_head(hole_velocity, vapour_density, liquid_density, orifice_coefficient=ORIFICE_COEFFICIENT):
    r"""Dry-plate pressure drop of a sieve tray as head of clear liquid, Sinnott eq. 11.88.

    .. math::
        h_d = 51\left(\frac{u_h}{C_0}\right)^2 \frac{\rho_V}{\rho_L}\ \text{[mm liquid]}

    the orifice equation Delta P = rho_V u_h^2 / (2 C_0^2) over rho_L g (51 = 1000 / (2 g)).

    Parameters
    ----------
    hole_velocity : float
        Vapour velocity through the holes [m/s]
    vapour_density : float
        Vapour density [kg/m^3]
    liquid_density : float
        Liquid density [kg/m^3]
    orifice_coefficient : float
        Orifice (discharge) coefficient C0 of the perforations [-]

    Returns
    -------
    float
        Dry-plate head of clear liquid [m]

    Notes
    -----
    C0 depends on the plate-thickness to hole-diameter ratio and the hole to perforated area
    ratio (Sinnott Fig. 11.34, about 0.65-0.90); the default 0.84 is read at thickness equal
    to the hole diameter and 10 % holes. Source unit of the head: mm of liquid.

    Examples
    --------
    >>> round(dry_plate_head(12.0, 3.0, 800.0) * 1e3, 1)
    39.0

    References
    ----------
    1. Sinnott, R. K., Coulson and Richardson's Chemical Engineering Vol. 6, 4th ed.,
       Elsevier (2005), Section 11.13, eq. 11.88.
    """
    return 51.0 * MILLIMETRE * (hole_velocity / orifice_coefficient) ** 2 * vapour_density / liquid_density


def weir_crest_francis(liquid_mass_flow, liquid_density, weir_length):
    r"""Height of liquid crest over a segmental weir, Francis' weir formula as given by Sinnott, eq. 11.85.

    .. math::
        h_{ow} = 750\left(\frac{L_w}{\rho_L l_w}\right)^{2/3}\ \text{[mm liquid]}

    Parameters
    ----------
    liquid_mass_flow : float
        Liquid mass flow over the weir [kg/s]
    liquid_density : float
        Liquid density [kg/m^3]
    weir_length : float
        Weir length [m]

    Returns
    -------
    float
        Crest height over the weir [m]

    Notes
    -----
    Straight segmental weir, clear liquid; source units kg/s, kg/m^3, m and mm.

    Examples
    --------
    >>> round(weir_crest_francis(5.0, 800.0, 1.0) * 1e3, 1)
    25.4

    References
    ----------
    1. Francis, J. B., Lowell Hydraulic Experiments, 4th ed., Van Nostrand (1883).
    2. Sinnott, R. K., Coulson and Richardson's Chemical Engineering Vol. 6, 4th ed.,
       Elsevier (2005), Section 11.13, eq. 11.85.
    """
    return 750.0 * MILLIMETRE * (liquid_mass_flow / (liquid_density * weir_length)) ** (2.0 / 3.0)


def residual_head(liquid_density):
    r"""Residual head of a sieve tray (surface tension, froth), Sinnott eq. 11.89 (after Hunt et al.).

    .. math::
        h_r = \frac{12.5\times 10^3}{\rho_L}\ \text{[mm liquid]}

    Parameters
    ----------
    liquid_density : float
        Liquid density [kg/m^3]

    Returns
    -------
    float
        Residual head of clear liquid [m]

    Notes
    -----
    A simple empirical form; the source puts its uncertainty below that of the other terms.
    Source units: kg/m^3 and mm.

    Examples
    --------
    >>> round(residual_head(954.0) * 1e3, 1)
    13.1

    References
    ----------
    1. Sinnott, R. K., Coulson and Richardson's Chemical Engineering Vol. 6, 4th ed.,
       Elsevier (2005), Section 11.13, eq. 11.89.
    2. Hunt, C. d'A., Hanson, D. N., Wilke, C. R., AIChE J. 1, 441 (1955).
    """
    return 12.5e3 * MILLIMETRE / liquid_density


def head_to_pressure(head, liquid_density):
    r"""Pressure of a head of clear liquid, Sinnott eq. 11.87.

    .. math::
        \Delta P_t = 9.81\times 10^{-3}\, h_t\, \rho_L\ \text{[Pa, h in mm]}

    Parameters
    ----------
    head : float
        Head of clear liquid [m]
    liquid_density : float
        Liquid density [kg/m^3]

    Returns
    -------
    float
        Pressure difference [Pa]

    Notes
    -----
    Hydrostatic head with g = 9.81 m/s^2.

    Examples
    --------
    >>> round(head_to_pressure(0.1, 800.0), 1)
    784.8

    References
    ----------
    1. Sinnott, R. K., Coulson and Richardson's Chemical Engineering Vol. 6, 4th ed.,
       Elsevier (2005), Section 11.13, eq. 11.87.
    """
    return GRAVITY * head * liquid_density


def weir_length(diameter, downcomer_fraction):
    r"""Chord length of a segmental downcomer occupying ``downcomer_fraction`` of the cross-section.

    .. math::
        \frac{A_d}{A_c} = \frac{\theta - \sin\theta}{2\pi},\qquad l_w = D \sin\frac{\theta}{2}

    with theta the segment's central angle, found by bisection.

    Parameters
    ----------
    diameter : float
        Column inside diameter [m]
    downcomer_fraction : float
        Downcomer area over the column cross-section [-]

    Returns
    -------
    float
        Weir (chord) length [m]

    Notes
    -----
    Plane geometry; for 0 < A_d/A_c < 0.5. Sinnott's Fig. 11.31 reads l_w/D = 0.76 at
    A_d/A_c = 0.12 (from memory).

    Examples
    --------
    >>> round(weir_length(1.0, 0.12), 3)
    0.764

    References
    ----------
    1. Sinnott, R. K., Coulson and Richardson's Chemical Engineering Vol. 6, 4th ed.,
       Elsevier (2005), Fig. 11.31.
    """
    low, high = 0.0, math.pi
    target = 2.0 * math.pi * downcomer_fraction
    for _ in range(60):
        mid = 0.5 * (low + high)
        if mid - math.sin(mid) < target:
            low = mid
        else:
            high = mid
    return diameter * math.sin(0.25 * (low + high))


@dataclass(frozen=True)
class TrayPressureDrop:
    """Pressure drop of one sieve tray and its parts (heads of clear liquid) [m, Pa]."""

    stage: int
    hole_velocity: float  # m/s
    dry_head: float  # m
    weir_height: float  # m
    crest_head: float  # m
    residual_head: float  # m
    total_head: float  # m
    pressure_drop: float  # Pa


def weir_height_for(top_pressure: float) -> float:
    """Default weir height [m]: 50 mm at or above atmospheric pressure, 10 mm under vacuum (Sinnott 11.13)."""
    return VACUUM_WEIR_HEIGHT if top_pressure < ATMOSPHERE else WEIR_HEIGHT


def sieve_tray_pressure_drop(tray: TrayHydraulics, diameter: float, weir_height: float,
                             hole_fraction: float = HOLE_AREA_FRACTION,
                             orifice_coefficient: float = ORIFICE_COEFFICIENT) -> TrayPressureDrop:
    """Dry plus liquid-head drop of ``tray`` in a shell of ``diameter`` [m] (Sinnott eq. 11.90).

    The liquid mass flow follows from the tray's flow parameter; the active area is the
    cross-section less two downcomers; holes are ``hole_fraction`` of the active area.
    """
    section = math.pi * diameter ** 2 / 4.0
    active = section * (1.0 - 2.0 * tray.downcomer_fraction)
    hole_velocity = tray.vapour_volume_flow / (hole_fraction * active)
    vapour_mass = tray.vapour_volume_flow * tray.vapour_density
    liquid_mass = tray.flow_parameter * vapour_mass * math.sqrt(tray.liquid_density / tray.vapour_density)
    dry = dry_plate_head(hole_velocity, tray.vapour_density, tray.liquid_density, orifice_coefficient)
    crest = weir_crest_francis(liquid_mass, tray.liquid_density, weir_length(diameter, tray.downcomer_fraction))
    residual = residual_head(tray.liquid_density)
    total = dry + weir_height + crest + residual
    return TrayPressureDrop(tray.stage, hole_velocity, dry, weir_height, crest, residual, total,
                            head_to_pressure(total, tray.liquid_density))
