"""Condenser and reboiler: choice of utility level, mean temperature difference, area, utility flow.

:func:`mean_temperature_difference` and :func:`exchanger_area` are the one copy used by the
sizing layer and by the optimisation model (plain arithmetic: they take floats or Pyomo
expressions alike).
"""

from __future__ import annotations

from dataclasses import dataclass

from ht import LMTD

from .._base.errors import CaseError, InfeasibleSpecError
from .._base.units import HOUR
from .utilities import UtilityLevel

UTILITY_KINDS = {"cooling": ("cooling_water", "chilled_water", "refrigerant"),
                 "heating": ("warm_water", "steam", "hot_oil")}


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


def mean_temperature_difference(dt_one, dt_two):
    r"""Underwood's cube-root mean of two terminal temperature differences, the log mean's smooth stand-in.

    .. math:: \Delta T_m = \left(\frac{\Delta T_1^{1/3} + \Delta T_2^{1/3}}{2}\right)^3

    Parameters
    ----------
    dt_one : float
        Temperature difference at one end [K]
    dt_two : float
        Temperature difference at the other end [K]

    Returns
    -------
    float
        Mean temperature difference [K]

    Notes
    -----
    Smooth, and exact where the ends are equal (the log mean is 0/0 there): an equation
    model needs that, since the process ends (top vapour and reflux, last tray and
    reboiler) can coincide. Against the true log mean (``ht.LMTD``): within 0.03 % for end
    ratios up to 3 and 0.4 % up to 10, always slightly above it
    (tests/test_sizing_exchangers.py). Both ends must be positive.

    Examples
    --------
    >>> round(mean_temperature_difference(30.0, 20.0), 3)
    24.663

    References
    ----------
    1. Underwood, A. J. V., Chemical Engineering 77(12), 192 (1970), from memory.
    2. Bell, C., ht library, ``ht.core.LMTD`` (the log mean it is checked against).
    """
    return ((dt_one ** (1.0 / 3.0) + dt_two ** (1.0 / 3.0)) / 2.0) ** 3


def terminal_pairs(service: str, process_in, process_out, utility_in, utility_out):
    """((process, utility) at end 1, (process, utility) at end 2) of a counter-current condenser
    (``service`` "cooling") or reboiler ("heating"): the temperatures that face each other.

    Cooling: the process inlet meets the utility outlet, the process outlet the utility inlet;
    heating: the process outlet meets the utility inlet, the process inlet the utility outlet.
    """
    if service == "cooling":
        return (process_in, utility_out), (process_out, utility_in)
    return (process_out, utility_in), (process_in, utility_out)


def terminal_differences(service: str, process_in, process_out, utility_in, utility_out):
    """(dT_1, dT_2) [K] of a counter-current condenser (``service`` "cooling") or reboiler ("heating")
    at the ends of :func:`terminal_pairs`: the hot side less the cold side (the process is the hot
    side of a condenser)."""
    cooling = service == "cooling"
    return tuple(process - utility if cooling else utility - process
                 for process, utility in terminal_pairs(service, process_in, process_out, utility_in, utility_out))


@dataclass(frozen=True)
class OverallCoefficient:
    """An overall heat-transfer coefficient with the cost-data row it came from."""

    value: float  # W/(m^2 K)
    process_side: str = ""  # e.g. "organic vapours"
    source: str = ""


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


def offered_levels(levels, service: str) -> list[UtilityLevel]:
    """The levels of ``service`` offered, least extreme first: warmest cooling, coolest heating
    (temperature order standing in for price order)."""
    offered = [u for u in levels if u.service == service and u.kind in UTILITY_KINDS[service]]
    return sorted(offered, key=lambda u: -u.supply_temperature if service == "cooling" else u.supply_temperature)


def exchanger_ends(profile) -> tuple[tuple[str, str, float, float], tuple[str, str, float, float]]:
    """(name, service, process inlet, process outlet [K]) of the condenser and the reboiler of ``profile``:
    the top stage's vapour to the condenser temperature, the last tray's liquid to the reboiler's."""
    n = profile.stages
    return (("condenser", "cooling", profile.T[0], profile.condenser_temperature),
            ("reboiler", "heating", profile.T[n - 2], profile.T[n - 1]))


@dataclass(frozen=True)
class ExchangerEnds:
    """An exchanger's utility level and process temperatures [K], before it is sized."""

    name: str  # "condenser" or "reboiler"
    utility: UtilityLevel
    process_in: float
    process_out: float


def profile_utilities(profile, levels, min_approach: float) -> tuple[ExchangerEnds, ExchangerEnds]:
    """The condenser's and the reboiler's levels for ``profile`` (:func:`choose_utility` at :func:`exchanger_ends`).

    Raises ``InfeasibleSpecError`` (naming the levels offered) where none fits.
    """
    condenser, reboiler = (ExchangerEnds(name, choose_utility(levels, service, t_in, t_out, min_approach, name),
                                         t_in, t_out) for name, service, t_in, t_out in exchanger_ends(profile))
    return condenser, reboiler


def choose_utility(levels, service: str, process_in: float, process_out: float, min_approach: float,
                   exchanger: str) -> UtilityLevel:
    """The least extreme offered level that keeps ``min_approach`` [K] at both ends.

    Cooling: the warmest level (cooling water before chilled water before refrigerant);
    heating: the coolest (low- before medium- before high-pressure steam). Temperature order
    stands in for price order. ``InfeasibleSpecError`` names the process temperatures, the
    levels offered and the approach when none fits.
    """
    offered = offered_levels(levels, service)
    fitting = [u for u in offered if _fits(u, service, process_in, process_out, min_approach)]
    if fitting:
        return fitting[0]
    listed = "; ".join(f"{u.name} {u.supply_temperature - 273.15:.1f} -> {u.return_temperature - 273.15:.1f} degC"
                       for u in offered) or "none"
    word, further, pressure = ("cold", "colder", "raise") if service == "cooling" else ("hot", "hotter", "lower")
    raise InfeasibleSpecError(
        f"{exchanger}: no {service} utility is {word} enough for the process side "
        f"{process_in - 273.15:.1f} -> {process_out - 273.15:.1f} degC with a minimum approach of "
        f"{min_approach:.1f} K; {service} levels offered: {listed}; {pressure} column.top_pressure, lower "
        f"sizing.min_approach, or offer a {further} level in your own cost data (economics.cost_data: "
        "utility_levels.csv and utility_prices.csv)")


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
    lmtd: float  # K, mean temperature difference (Underwood's cube-root mean of the ends)
    overall_coefficient: float  # W/(m^2 K)
    area: float  # m^2
    utility_mass_flow: float | None  # kg/s; None for a utility priced per energy
    utility_mass_per_year: float | None  # kg/yr
    utility_energy_per_year: float  # J/yr
    operating_hours: float  # h/yr
    process_side: str = ""  # row of heat_transfer_coefficients.csv the coefficient came from
    coefficient_source: str = ""
    exchanger_type: str = ""  # "fixed_tube_sheet" condenser; "kettle" or "thermosiphon" reboiler


def size_exchanger(name: str, service: str, duty: float, process_in: float, process_out: float, levels,
                   overall_coefficient: float | OverallCoefficient, min_approach: float, operating_hours: float,
                   exchanger_type: str = "") -> ExchangerSizing:
    """Choose the utility, then mean temperature difference, area and utility flow of one exchanger.

    ``service`` is the utility's: "cooling" for a condenser, "heating" for a reboiler.
    """
    coefficient = overall_coefficient if isinstance(overall_coefficient, OverallCoefficient) \
        else OverallCoefficient(overall_coefficient)
    if coefficient.value <= 0.0:
        raise CaseError(f"sizing.U_{name}", f"{coefficient.value:.4g} W/(m^2 K)", "a positive coefficient")
    if duty <= 0.0:
        raise CaseError(f"{name} duty", f"{duty:.4g} W", "a positive heat duty")
    level = choose_utility(levels, service, process_in, process_out, min_approach, name)
    ends = terminal_differences(service, process_in, process_out, level.supply_temperature,
                                level.return_temperature)
    dtm = mean_temperature_difference(*ends)
    flow = utility_mass_flow(duty, level)
    seconds = operating_hours * HOUR
    return ExchangerSizing(name, duty, level, process_in, process_out, level.supply_temperature,
                           level.return_temperature, dtm, coefficient.value,
                           exchanger_area(duty, coefficient.value, dtm), flow,
                           None if flow is None else flow * seconds, duty * seconds, operating_hours,
                           coefficient.process_side, coefficient.source, exchanger_type)


def condensate_freezing_warning(found, level: UtilityLevel) -> str | None:
    """A warning where the condensate starts to freeze (``found``, a ``Liquidus`` or None) above the
    cooling level's supply temperature: the tube walls at the cold end, near the coolant's temperature,
    would foul with solid (a naphthalene distillate melting near 80 degC on cooling water at 30 degC)."""
    if found is None or level.supply_temperature >= found.temperature:
        return None
    return (f"condenser: the condensate starts to freeze at about {found.temperature - 273.15:.1f} degC "
            f"({found.component} comes out as solid; ideal solubility from its melting point "
            f"{found.melting_point - 273.15:.1f} degC and heat of fusion), above the {level.name} supply at "
            f"{level.supply_temperature - 273.15:.1f} degC: the tubes at the cold end would foul with solid; cool it "
            "with a level supplied above that temperature (tempered water, or raising steam: add one to the cost "
            "data's utility_levels.csv)")
