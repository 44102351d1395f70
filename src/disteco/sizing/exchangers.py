"""Condenser and reboiler: choice of utility level, log-mean temperature difference, area, utility flow."""

from __future__ import annotations

from dataclasses import dataclass

from ht import LMTD

from .._base.errors import CaseError, InfeasibleSpecError
from .._base.units import HOUR
from .utilities import UtilityLevel

UTILITY_KINDS = {"cooling": ("cooling_water", "chilled_water", "refrigerant"),
                 "heating": ("steam", "hot_oil")}


def log_mean_temperature_difference(hot_in, hot_out, cold_in, cold_out):
    r"""Log-mean temperature difference of a counter-current exchanger (via ``ht``).

    .. math::
        \Delta T_{lm} = \frac{\Delta T_1 - \Delta T_2}{\ln(\Delta T_1/\Delta T_2)},\quad
        \Delta T_1 = T_{h,in} - T_{c,out},\ \Delta T_2 = T_{h,out} - T_{c,in}

    Parameters
    ----------
    hot_in : float
        Hot-side inlet temperature [K]
    hot_out : float
        Hot-side outlet temperature [K]
    cold_in : float
        Cold-side inlet temperature [K]
    cold_out : float
        Cold-side outlet temperature [K]

    Returns
    -------
    float
        Log-mean temperature difference [K]

    Notes
    -----
    Both terminal differences must be positive (``InfeasibleSpecError`` otherwise: ``ht``
    would return the first difference for a temperature cross). Equal differences give
    that difference. End temperatures only: with a condensing range the true mean can
    be lower.

    Examples
    --------
    >>> round(log_mean_temperature_difference(373.15, 333.15, 303.15, 313.35), 1)
    43.2

    References
    ----------
    1. Bergman, T. L., A. S. Lavine, F. P. Incropera and D. P. DeWitt, Introduction to Heat
       Transfer, 6th ed., Wiley (2011), Example 11.1.
    2. Bell, C., ht library, ``ht.core.LMTD``.
    """
    if hot_in - cold_out <= 0.0 or hot_out - cold_in <= 0.0:
        raise InfeasibleSpecError(
            f"temperature cross: hot {hot_in - 273.15:.1f} -> {hot_out - 273.15:.1f} degC, "
            f"cold {cold_in - 273.15:.1f} -> {cold_out - 273.15:.1f} degC; both terminal "
            "differences must be positive")
    return LMTD(hot_in, hot_out, cold_in, cold_out, counterflow=True)


def exchanger_area(duty, overall_coefficient, lmtd):
    r"""Heat-transfer area from the rate equation.

    .. math::
        A = \frac{Q}{U\,\Delta T_{lm}}

    Parameters
    ----------
    duty : float
        Heat duty [W]
    overall_coefficient : float
        Overall heat-transfer coefficient [W/(m^2 K)]
    lmtd : float
        Log-mean temperature difference [K]

    Returns
    -------
    float
        Area [m^2]

    Notes
    -----
    Pure counter-current; a multipass shell-and-tube exchanger needs the F-factor, taken
    as 1 here (condensing or boiling on one side gives F = 1).

    Examples
    --------
    >>> round(exchanger_area(8524.0, 38.1, 43.2), 2)
    5.18

    References
    ----------
    1. Bergman, T. L., A. S. Lavine, F. P. Incropera and D. P. DeWitt, Introduction to Heat
       Transfer, 6th ed., Wiley (2011), Section 11.3.
    """
    return duty / (overall_coefficient * lmtd)


def utility_mass_flow(duty: float, level: UtilityLevel) -> float | None:
    """Utility mass flow [kg/s]: Q/latent heat, or Q/(cp |T_return - T_supply|).

    ``None`` when the level carries neither (a utility priced per energy, e.g. refrigeration).
    """
    if level.latent_heat:
        return duty / level.latent_heat
    span = abs(level.return_temperature - level.supply_temperature)
    if level.heat_capacity and span > 0.0:
        return duty / (level.heat_capacity * span)
    return None


def _fits(level: UtilityLevel, service: str, process_in: float, process_out: float, approach: float) -> bool:
    if service == "cooling":  # process is the hot side
        return (process_out - level.supply_temperature >= approach
                and process_in - level.return_temperature >= approach)
    return (level.supply_temperature - process_out >= approach
            and level.return_temperature - process_in >= approach)


def choose_utility(levels, service: str, process_in: float, process_out: float, min_approach: float,
                   exchanger: str) -> UtilityLevel:
    """The least extreme offered level that keeps ``min_approach`` [K] at both ends.

    Cooling: the warmest level (cooling water before chilled water before refrigerant);
    heating: the coolest (low- before medium- before high-pressure steam). Temperature order
    stands in for price order. ``InfeasibleSpecError`` names the process temperatures, the
    levels offered and the approach when none fits.
    """
    offered = [u for u in levels if u.service == service and u.kind in UTILITY_KINDS[service]]
    fitting = [u for u in offered if _fits(u, service, process_in, process_out, min_approach)]
    if fitting:
        if service == "cooling":
            return max(fitting, key=lambda u: u.supply_temperature)
        return min(fitting, key=lambda u: u.supply_temperature)
    listed = "; ".join(f"{u.name} {u.supply_temperature - 273.15:.1f} -> {u.return_temperature - 273.15:.1f} degC"
                       for u in offered) or "none"
    word = "cold" if service == "cooling" else "hot"
    raise InfeasibleSpecError(
        f"{exchanger}: no {service} utility is {word} enough for the process side "
        f"{process_in - 273.15:.1f} -> {process_out - 273.15:.1f} degC with a minimum approach of "
        f"{min_approach:.1f} K; {service} levels offered: {listed}")


@dataclass(frozen=True)
class ExchangerSizing:
    """A condenser or reboiler sized against one utility level (SI)."""

    name: str  # "condenser" or "reboiler"
    duty: float  # W
    utility: UtilityLevel
    process_in: float  # K
    process_out: float  # K
    utility_in: float  # K
    utility_out: float  # K
    lmtd: float  # K
    overall_coefficient: float  # W/(m^2 K)
    area: float  # m^2
    utility_mass_flow: float | None  # kg/s; None for a utility priced per energy
    utility_mass_per_year: float | None  # kg/yr
    utility_energy_per_year: float  # J/yr
    operating_hours: float  # h/yr


def size_exchanger(name: str, service: str, duty: float, process_in: float, process_out: float, levels,
                   overall_coefficient: float, min_approach: float, operating_hours: float) -> ExchangerSizing:
    """Choose the utility, then LMTD, area and utility flow of one exchanger.

    ``service`` is the utility's: "cooling" for a condenser, "heating" for a reboiler.
    """
    if overall_coefficient <= 0.0:
        raise CaseError(f"sizing.U_{name}", f"{overall_coefficient:.4g} W/(m^2 K)", "a positive coefficient")
    if duty <= 0.0:
        raise CaseError(f"{name} duty", f"{duty:.4g} W", "a positive heat duty")
    level = choose_utility(levels, service, process_in, process_out, min_approach, name)
    if service == "cooling":
        lmtd = log_mean_temperature_difference(process_in, process_out, level.supply_temperature,
                                               level.return_temperature)
    else:
        lmtd = log_mean_temperature_difference(level.supply_temperature, level.return_temperature,
                                               process_in, process_out)
    flow = utility_mass_flow(duty, level)
    seconds = operating_hours * HOUR
    return ExchangerSizing(name, duty, level, process_in, process_out, level.supply_temperature,
                           level.return_temperature, lmtd, overall_coefficient,
                           exchanger_area(duty, overall_coefficient, lmtd), flow,
                           None if flow is None else flow * seconds, duty * seconds, operating_hours)
