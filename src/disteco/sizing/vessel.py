"""Column shell: height, design conditions, wall and head thickness (ASME VIII-1), mass.

A preliminary estimate for costing: wind, seismic loads, nozzles, supports and fabrication
tolerances are not included (see :data:`CAUTION`). A shell operating below atmospheric
pressure is also designed for full vacuum by the elastic buckling pressure of von Mises
(:func:`collapse_pressure_von_mises`) with a design factor of 3, without stiffening rings;
the heads are not checked for external pressure.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from fluids.geometry import SA_ellipsoidal_head
from scipy.optimize import brentq

from .._base.errors import CorrelationRangeError
from .._base.units import ATMOSPHERE
from .materials import material

MILLIMETRE = 1e-3  # m
UG16_MINIMUM = 1.5 * MILLIMETRE  # m, 1/16 in, exclusive of corrosion allowance (ASME VIII-1 UG-16(b))
THIN_WALL_LIMIT = 0.385  # P <= 0.385 S E for the UG-27(c)(1) formula

CAUTION = ("Preliminary sizes for cost estimation only. The vessel must be designed to the "
           "applicable pressure-vessel code (e.g. ASME Section VIII Division 1), including wind, "
           "seismic, external-pressure and support loads, and checked by a qualified engineer.")

ELASTIC_MODULUS = 200e9  # Pa, carbon and low-alloy steel near ambient temperature (from memory)
POISSON_RATIO = 0.3  # [-], steel
BUCKLING_DESIGN_FACTOR = 3.0  # collapse over allowable external pressure, as in ASME VIII-1 UG-28 (from memory)
FULL_VACUUM = ATMOSPHERE  # Pa, external design pressure of a vacuum shell (common practice, no source)

# Minimum practical wall thickness for rigidity, including 2 mm corrosion allowance:
# (largest inside diameter [m], thickness [m]). Towler and Sinnott, Chemical Engineering
# Design, 2nd ed. (2013), Section 14.5 (from memory).
_RIGIDITY = ((1.0, 5e-3), (2.0, 7e-3), (2.5, 9e-3), (3.0, 10e-3), (math.inf, 12e-3))
_RIGIDITY_ALLOWANCE = 2e-3  # m, the corrosion allowance included in that table


def shell_thickness_ug27(pressure, inside_radius, allowable_stress, joint_efficiency):
    r"""Cylindrical shell thickness under internal pressure, ASME VIII-1 UG-27(c)(1).

    .. math::
        t = \frac{P R}{S E - 0.6 P}

    Parameters
    ----------
    pressure : float
        Internal design pressure, gauge [Pa]
    inside_radius : float
        Inside radius, corroded [m]
    allowable_stress : float
        Maximum allowable stress at the design temperature [Pa]
    joint_efficiency : float
        Longitudinal weld joint efficiency (UW-12) [-]

    Returns
    -------
    float
        Required thickness without corrosion allowance [m]

    Notes
    -----
    Circumferential stress; valid for P <= 0.385 S E (raises CorrelationRangeError
    otherwise: thick-wall rules of Appendix 1-2 apply). Any consistent units in the code.

    Examples
    --------
    >>> round(shell_thickness_ug27(0.5e6, 0.75, 88.9e6, 0.85) * 1e3, 2)
    4.98

    References
    ----------
    1. ASME Boiler and Pressure Vessel Code, Section VIII Division 1, UG-27.
    """
    _check_thin_wall("UG-27 cylindrical shell", pressure, allowable_stress, joint_efficiency)
    return pressure * inside_radius / (allowable_stress * joint_efficiency - 0.6 * pressure)


def head_thickness_ug32(pressure, inside_diameter, allowable_stress, joint_efficiency):
    r"""2:1 ellipsoidal head thickness under internal pressure, ASME VIII-1 UG-32(d).

    .. math::
        t = \frac{P D}{2 S E - 0.2 P}

    Parameters
    ----------
    pressure : float
        Internal design pressure, gauge [Pa]
    inside_diameter : float
        Inside diameter of the head skirt, corroded [m]
    allowable_stress : float
        Maximum allowable stress at the design temperature [Pa]
    joint_efficiency : float
        Weld joint efficiency (UW-12) [-]

    Returns
    -------
    float
        Required thickness without corrosion allowance [m]

    Notes
    -----
    For heads whose half minor axis is one quarter of the inside diameter. Any consistent
    units in the code.

    Examples
    --------
    >>> round(head_thickness_ug32(0.5e6, 1.5, 88.9e6, 0.85) * 1e3, 2)
    4.97

    References
    ----------
    1. ASME Boiler and Pressure Vessel Code, Section VIII Division 1, UG-32(d).
    """
    _check_thin_wall("UG-32 ellipsoidal head", pressure, allowable_stress, joint_efficiency)
    return pressure * inside_diameter / (2.0 * allowable_stress * joint_efficiency - 0.2 * pressure)


def collapse_pressure_von_mises(thickness, outside_diameter, length, elastic_modulus, poisson_ratio):
    r"""Elastic buckling pressure of a cylinder under uniform radial external pressure, von Mises.

    .. math::
        p_c = \min_{n \ge 2} \frac{E t / R}{n^2 - 1 + \tfrac12 a}\left[\frac{1}{(n^2/a + 1)^2}
              + \frac{t^2}{12 R^2 (1-\nu^2)}\,(n^2 - 1 + a)^2\right],\quad a = (\pi R / L)^2

    with n the number of circumferential lobes and R the mean radius (taken as outside radius).

    Parameters
    ----------
    thickness : float
        Shell thickness, corroded [m]
    outside_diameter : float
        Outside diameter [m]
    length : float
        Unsupported length between stiffeners or heads (simply supported ends) [m]
    elastic_modulus : float
        Young's modulus at the design temperature [Pa]
    poisson_ratio : float
        Poisson's ratio [-]

    Returns
    -------
    float
        Elastic collapse pressure [Pa]

    Notes
    -----
    Elastic, perfect cylinder; thin shells (D/t above about 20) where buckling governs
    before yield. For long cylinders it tends to the ring value 2 E/(1 - nu^2) (t/D)^3 (n = 2);
    Windenburg and Trilling's closed form approximates it for short cylinders. Real shells
    with out-of-roundness collapse lower: a design factor (3 here) covers that.

    Examples
    --------
    >>> round(collapse_pressure_von_mises(0.008, 1.5, 3.0, 200e9, 0.3) / 1e3)
    546

    References
    ----------
    1. von Mises, R., Z. Ver. Dtsch. Ing. 58, 750 (1914).
    2. Windenburg, D. F., Trilling, C., Trans. ASME 56, 819 (1934).
    3. Timoshenko, S. P., Gere, J. M., Theory of Elastic Stability, 2nd ed., McGraw-Hill (1961), Ch. 11.
    """
    R = outside_diameter / 2.0
    a = (math.pi * R / length) ** 2
    shell = thickness ** 2 / (12.0 * R ** 2 * (1.0 - poisson_ratio ** 2))

    def lobes(n: int) -> float:
        m = n * n
        return elastic_modulus * thickness / R / (m - 1.0 + 0.5 * a) * (1.0 / (m / a + 1.0) ** 2
                                                                       + shell * (m - 1.0 + a) ** 2)

    return min(lobes(n) for n in range(2, 200))


def external_pressure_thickness(external_pressure: float, inside_diameter: float, length: float,
                                elastic_modulus: float = ELASTIC_MODULUS, poisson_ratio: float = POISSON_RATIO,
                                design_factor: float = BUCKLING_DESIGN_FACTOR) -> float:
    """Thinnest shell [m] whose von Mises collapse pressure is ``design_factor`` x ``external_pressure`` [Pa].

    The outside diameter is the inside diameter plus twice the thickness; found by bisection.
    """
    def margin(t: float) -> float:
        return collapse_pressure_von_mises(t, inside_diameter + 2.0 * t, length, elastic_modulus,
                                           poisson_ratio) - design_factor * external_pressure

    low, high = 1e-5, 0.25 * inside_diameter
    for _ in range(80):
        mid = 0.5 * (low + high)
        low, high = (mid, high) if margin(mid) < 0.0 else (low, mid)
    return high


def _check_thin_wall(rule: str, pressure: float, stress: float, efficiency: float) -> None:
    limit = THIN_WALL_LIMIT * stress * efficiency
    if pressure > limit:
        raise CorrelationRangeError(rule, "design pressure", pressure, 0.0, limit, "Pa",
                                    "ASME VIII-1: P <= 0.385 S E, thick-wall rules beyond")


def minimum_thickness(inside_diameter: float, corrosion_allowance: float) -> float:
    """Smallest nominal wall [m]: UG-16(b) 1.5 mm and the rigidity table, with corrosion allowance."""
    rigidity = next(t for d, t in _RIGIDITY if inside_diameter <= d)
    return max(UG16_MINIMUM + corrosion_allowance, rigidity - _RIGIDITY_ALLOWANCE + corrosion_allowance)


def shell_mass(inside_diameter, tangent_length, shell_thickness, head_thickness, density):
    r"""Mass of a cylindrical shell with two 2:1 ellipsoidal heads, from mid-wall areas.

    .. math::
        m = \rho\,[\pi D_m L t_s + 2 A_{head}(D_m) t_h],\quad D_m = D_i + t

    Parameters
    ----------
    inside_diameter : float
        Inside diameter [m]
    tangent_length : float
        Tangent-to-tangent length of the cylinder [m]
    shell_thickness : float
        Nominal shell thickness [m]
    head_thickness : float
        Nominal head thickness [m]
    density : float
        Density of the plate material [kg/m^3]

    Returns
    -------
    float
        Mass of shell and heads, without nozzles, internals, supports or skirt [kg]

    Notes
    -----
    Head area by ``fluids.geometry.SA_ellipsoidal_head`` (depth D/4); straight flanges of the
    heads are neglected.

    Examples
    --------
    >>> round(shell_mass(1.5, 20.0, 0.008, 0.008, 7850.0))
    6260

    References
    ----------
    1. Bell, C., fluids library, ``fluids.geometry.SA_ellipsoidal_head``.
    """
    d_shell = inside_diameter + shell_thickness
    d_head = inside_diameter + head_thickness
    head_area = SA_ellipsoidal_head(d_head, d_head / 4.0)
    return density * (math.pi * d_shell * tangent_length * shell_thickness + 2.0 * head_area * head_thickness)


def design_pressure(operating_pressure: float, margin_fraction: float, margin_minimum: float) -> float:
    """Internal design pressure, gauge [Pa]: the larger of (1 + f) P_g and P_g + minimum margin.

    Common practice, no source. ``operating_pressure`` is the highest absolute pressure [Pa].
    """
    gauge = operating_pressure - ATMOSPHERE
    return max(gauge * (1.0 + margin_fraction), gauge + margin_minimum)


def _round_up(value: float, step: float) -> float:
    return round(math.ceil(value / step - 1e-9) * step, 9)


@dataclass(frozen=True)
class VesselDesign:
    """Shell and heads of the column (SI; pressures gauge)."""

    material: str
    material_class: str  # cost-data vocabulary: "CS", "LA", "SS"
    design_pressure: float  # Pa, gauge
    design_temperature: float  # K
    allowable_stress: float  # Pa
    joint_efficiency: float  # -
    corrosion_allowance: float  # m
    inside_diameter: float  # m
    tangent_length: float  # m
    shell_thickness_pressure: float  # m, UG-27 without corrosion allowance
    head_thickness_pressure: float  # m, UG-32 without corrosion allowance
    shell_thickness: float  # m, nominal: corrosion allowance, minimum thickness, rounded up to 1 mm
    head_thickness: float  # m, nominal
    mass: float  # kg, shell and heads
    warnings: tuple[str, ...]
    caution: str = CAUTION
    external_pressure: float = 0.0  # Pa, external design pressure (full vacuum below atmospheric, else 0)
    shell_thickness_external: float = 0.0  # m, von Mises buckling with the design factor, without corrosion allowance
    minimum_temperature: float | None = None  # K, lowest operating temperature (None: not given)


def design_vessel(inside_diameter: float, tangent_length: float, max_pressure: float, max_temperature: float,
                  material_name: str, joint_efficiency: float, corrosion_allowance: float,
                  pressure_margin_fraction: float, pressure_margin_minimum: float,
                  temperature_margin: float, min_pressure: float | None = None,
                  min_temperature: float | None = None) -> VesselDesign:
    """Design conditions, thicknesses and mass of a column shell with 2:1 ellipsoidal heads.

    ``max_pressure`` [Pa, absolute] and ``max_temperature`` [K] are operating maxima;
    ``min_pressure`` [Pa, absolute] the lowest operating pressure (None: ``max_pressure``);
    ``min_temperature`` [K] the lowest operating temperature, carried for the equipment list.
    Below atmospheric the shell is also designed for full vacuum (:func:`external_pressure_thickness`)
    over its tangent length plus a third of each head's depth (D/4), without stiffening rings.
    """
    warnings = []
    lowest = max_pressure if min_pressure is None else min_pressure
    external, t_external = 0.0, 0.0
    if lowest < ATMOSPHERE:
        external = FULL_VACUUM
        t_external = external_pressure_thickness(external, inside_diameter + 2.0 * corrosion_allowance,
                                                 tangent_length + inside_diameter / 6.0)
        warnings.append(f"operating pressure {lowest / 1e3:.3g} kPa is below atmospheric: the shell is designed "
                        f"for full vacuum by von Mises' elastic buckling pressure with a design factor of "
                        f"{BUCKLING_DESIGN_FACTOR:g} and no stiffening rings ({t_external * 1e3:.1f} mm plus "
                        "corrosion allowance); heads, stiffening rings and the code check for external pressure "
                        "(ASME VIII-1 UG-28, UG-33) are not done")
    p_design = design_pressure(max_pressure, pressure_margin_fraction, pressure_margin_minimum)
    t_design = max_temperature + temperature_margin
    steel = material(material_name)
    stress = steel.allowable_stress(t_design)
    corroded = inside_diameter + 2.0 * corrosion_allowance
    t_shell = shell_thickness_ug27(p_design, corroded / 2.0, stress, joint_efficiency)
    t_head = head_thickness_ug32(p_design, corroded, stress, joint_efficiency)
    floor = minimum_thickness(inside_diameter, corrosion_allowance)
    nominal_shell = _round_up(max(max(t_shell, t_external) + corrosion_allowance, floor), MILLIMETRE)
    nominal_head = _round_up(max(t_head + corrosion_allowance, floor), MILLIMETRE)
    mass = shell_mass(inside_diameter, tangent_length, nominal_shell, nominal_head, steel.density)
    return VesselDesign(steel.name, steel.material_class, p_design, t_design, stress, joint_efficiency,
                        corrosion_allowance, inside_diameter, tangent_length, t_shell, t_head,
                        nominal_shell, nominal_head, mass, tuple(warnings), external_pressure=external,
                        shell_thickness_external=t_external, minimum_temperature=min_temperature)


@dataclass(frozen=True)
class ColumnHeight:
    """Heights of the column [m] and the ratio to its diameter."""

    real_trays: int
    tray_spacing: float
    tray_section: float  # trays x spacing
    top_space: float  # disengagement above the top tray
    sump_liquid: float  # liquid level for the residence time
    bottom_space: float  # vapour space between liquid level and bottom tray
    tangent_length: float  # tray section + top + sump + bottom space
    skirt: float
    overall: float  # tangent length + skirt
    height_to_diameter: float  # tangent length / diameter [-]
    warnings: tuple[str, ...]


def least_diameter(tray_section: float, top_space: float, bottom_space: float, sump_liquid_flow: float,
                   residence_time: float, max_height_to_diameter: float) -> float:
    """Least shell diameter [m] whose tangent length over diameter is at most ``max_height_to_diameter``.

    Tangent length L(D) = tray section + top space + bottom space + 4 Q t / (pi D^2) (the sump of
    :func:`column_height`, shorter on a wider shell); L(D)/D falls with D, so the limit holds from
    the root of r D = L(D) up. The limit itself is common practice, no source (slender shells
    need wind and seismic design that a screening estimate does not make).

    Examples
    --------
    >>> round(least_diameter(45.0, 1.2, 1.0, 0.0, 300.0, 30.0), 4)  # (45 + 2.2) / 30 without a sump
    1.5733
    """
    if math.isinf(max_height_to_diameter):
        return 0.0
    fixed = tray_section + top_space + bottom_space
    sump = sump_liquid_flow * residence_time * 4.0 / math.pi  # sump height x D^2 [m^3]
    low = fixed / max_height_to_diameter
    if sump <= 0.0:
        return low
    high = low + (sump / max_height_to_diameter) ** (1.0 / 3.0)
    return brentq(lambda d: max_height_to_diameter * d - fixed - sump / d ** 2, low, high, xtol=1e-9)


def column_height(real_trays: int, tray_spacing: float, diameter: float, sump_liquid_flow: float,
                  residence_time: float, top_space: float, bottom_space: float, skirt: float,
                  max_height: float, max_height_to_diameter: float, shell_name: str = "") -> ColumnHeight:
    """Tangent and overall height; warnings when common-practice limits are passed.

    ``sump_liquid_flow`` [m^3/s] is the liquid leaving the bottom tray to the reboiler;
    ``residence_time`` [s] of it is held in the sump of the column's cross-section.
    ``shell_name`` names one of two shells in series ("upper shell", "lower shell"), whose
    warnings cannot advise the two shells they already are; empty for a column of one shell.
    """
    tray_section = real_trays * tray_spacing
    sump = sump_liquid_flow * residence_time / (math.pi * diameter ** 2 / 4.0)
    tangent = tray_section + top_space + sump + bottom_space
    ratio = tangent / diameter
    warnings = []
    if tangent > max_height:
        advice = ("two shells in series are the most disteco builds: consider packing, a third shell, or fewer "
                  "stages at a higher reflux" if shell_name else "consider two shells or packing")
        warnings.append(f"{shell_name or 'column'} tangent height {tangent:.1f} m exceeds {max_height:.0f} m "
                        f"(common practice, no source): {advice}")
    if ratio > max_height_to_diameter:
        named = f"{shell_name} " if shell_name else ""
        warnings.append(f"{named}height-to-diameter ratio {ratio:.0f} exceeds {max_height_to_diameter:.0f} "
                        "(common practice, no source): wind and seismic loads may govern the shell")
    return ColumnHeight(real_trays, tray_spacing, tray_section, top_space, sump, bottom_space, tangent,
                        skirt, tangent + skirt, ratio, tuple(warnings))
