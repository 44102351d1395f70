"""Yearly utility cost from a duty, its utility level and the scenario's price."""

from __future__ import annotations

from dataclasses import dataclass

from .._base.prices import PRICE_UNITS
from .._base.units import HOUR
from ..sizing.utilities import UtilityLevel

GIGAJOULE = 1e9  # J
KILOWATT_HOUR = 3.6e6  # J
TONNE = 1e3  # kg
PRICE_BASES = PRICE_UNITS  # what a price is per
ELECTRICITY = "electricity"
NO_PRICE_INDEX = "none"  # utility_prices.csv: a price kept as given in every cost year


def price_units(electricity: bool, carries_energy: bool = True, density_known: bool = True) -> tuple[str, ...]:
    """What a price of a utility may be per: electricity per GJ or kWh; a level per t when the
    energy of a kilogram is known (latent heat or heat capacity), per m3 when its density is too."""
    if electricity:
        return ("GJ", "kWh")
    return ("GJ", "kWh") + (("t",) if carries_energy else ()) + (("m3",) if carries_energy and density_known else ())


def energy_per_mass(level: UtilityLevel) -> float:
    """Heat one kilogram of the utility carries at its level [J/kg].

    Condensing steam and evaporating refrigerant carry their latent heat; cooling water,
    chilled water and hot oil carry c_p |T_return - T_supply|.
    """
    if level.latent_heat is not None:
        return level.latent_heat
    if level.heat_capacity is None:
        raise ValueError(f"utility level {level.name!r} has neither a latent heat nor a heat capacity")
    return level.heat_capacity * abs(level.return_temperature - level.supply_temperature)


def price_per_joule(price: float, per: str, level: UtilityLevel | None = None,
                    density: float | None = None) -> float:
    """Price of one joule of duty from a price per GJ, kWh, tonne or m3 of utility.

    .. math::
        p_J = \\frac{p}{10^9} \\;(\\text{per GJ}), \\quad
        p_J = \\frac{p}{3.6 \\times 10^6} \\;(\\text{per kWh}), \\quad
        p_J = \\frac{p}{1000 \\, e} \\;(\\text{per t}), \\quad
        p_J = \\frac{p}{\\rho \\, e} \\;(\\text{per m}^3)

    with e the energy per kilogram of utility: the latent heat, or c_p times the
    temperature change between supply and return.

    Parameters
    ----------
    price : float
        Price per unit of utility [currency per `per`]
    per : str
        What the price is per: "GJ", "kWh", "t" or "m3" [-]
    level : UtilityLevel, optional
        Utility level, needed for prices per t or m3 [-]
    density : float, optional
        Density of the utility, needed for prices per m3 [kg/m^3]

    Returns
    -------
    float
        Price per joule of duty [currency/J]

    Notes
    -----
    The duty is what the utility gives up or takes up; losses and condensate return
    are not credited.

    Examples
    --------
    Steam at 2086 kJ/kg and 20 USD/t:

    >>> steam = UtilityLevel("lp_steam", "heating", "steam", 432.05, 432.05, latent_heat=2.086e6)
    >>> round(price_per_joule(20.0, "t", steam) * 1e9, 4)
    9.5877

    References
    ----------
    1. Turton et al., Analysis, Synthesis and Design of Chemical Processes, 4th ed.,
       2012, Section 8.6 (utility costs, per GJ and per unit of utility).
    """
    if per == "GJ":
        return price / GIGAJOULE
    if per == "kWh":
        return price / KILOWATT_HOUR
    if level is None:
        raise ValueError(f"a price per {per} needs the utility level")
    if per == "t":
        return price / (TONNE * energy_per_mass(level))
    if per == "m3":
        if density is None:
            raise ValueError(f"a price per m3 of {level.name} needs its density")
        return price / (density * energy_per_mass(level))
    raise ValueError(f"unknown price basis {per!r}; allowed: {', '.join(PRICE_BASES)}")


@dataclass(frozen=True)
class UtilityPrice:
    """One price of one utility in one scenario (``utility_prices.csv``)."""

    scenario: str
    utility: str  # a level name, or "electricity"
    price: float  # [currency per `per`]
    currency: str
    per: str  # "GJ", "kWh", "t" or "m3"
    year: int  # of the money `price` is in
    source: str
    price_index: str = NO_PRICE_INDEX  # the utility price index that escalates it, or "none"
    given_price: float | None = None  # before escalation (None: not moved to a cost year yet)
    given_year: int | None = None
    escalation_factor: float = 1.0  # price / given_price [-]
    set_by: str | None = None  # the case field or option that set it; None: the cost data
    note: str | None = None  # a price kept as given in an estimate of another year
    # a set price over the cost data's price it replaced, per joule of duty, each in its own year's money [-]
    cost_data_ratio: float | None = None

    @property
    def unit(self) -> str:
        return f"{self.currency}/{self.per}"


@dataclass(frozen=True)
class UtilityCost:
    """Yearly cost of one utility use."""

    item: str  # "condenser", "reboiler", "reflux pump"
    utility: str  # level name or "electricity"
    kind: str  # level kind, or "electricity"
    duty: float  # W (heat duty, or electric power)
    amount_per_year: float  # in amount_unit per year
    amount_unit: str  # "GJ", "kWh", "t" or "m3"
    price: float
    price_unit: str  # e.g. "USD/t"
    price_year: int
    cost_per_year: float  # currency/year
    source: str
    given_price: float | None = None  # the price before escalation to price_year, in price_unit
    given_year: int | None = None
    escalation_factor: float = 1.0  # [-]
    price_index: str = NO_PRICE_INDEX
    set_by: str | None = None  # case field or option that set the price; None: the cost data


def yearly_cost(duty, per_joule: float, hours_per_year: float):
    """Yearly cost of a steady duty or power ``duty`` [W] at ``per_joule`` [currency/J] [currency/year].

    The one form the costing layer and the optimisation model both evaluate (floats or Pyomo).
    """
    return duty * hours_per_year * HOUR * per_joule


def utility_cost(item: str, duty: float, price: UtilityPrice, hours_per_year: float,
                 level: UtilityLevel | None = None, density: float | None = None) -> UtilityCost:
    """Yearly cost of a steady duty [currency/year] at a utility price.

    .. math::
        C = Q \\, t_{op} \\, p_J

    Parameters
    ----------
    item : str
        Name of the consumer (condenser, reboiler, reflux pump) [-]
    duty : float
        Heat duty or electric power drawn, a positive magnitude [W]
    price : UtilityPrice
        Price of the utility in the scenario [-]
    hours_per_year : float
        Operating hours per year [h]
    level : UtilityLevel, optional
        Utility level (None for electricity) [-]
    density : float, optional
        Utility density, needed for prices per m3 [kg/m^3]

    Returns
    -------
    UtilityCost
        Amount of utility and its cost per year [-]

    Notes
    -----
    Steady operation at the design duty for every operating hour.

    Examples
    --------
    1 MW of reboiler duty from steam at 13.28 USD/GJ for 8000 h:

    >>> p = UtilityPrice("reference", "lp_steam", 13.28, "USD", "GJ", 2006, "example")
    >>> round(utility_cost("reboiler", 1e6, p, 8000.0).cost_per_year)
    382464

    References
    ----------
    1. Turton et al., Analysis, Synthesis and Design of Chemical Processes, 4th ed.,
       2012, Section 8.6 (utility costs).
    """
    if duty < 0.0:
        raise ValueError(f"{item}: duty {duty:g} W is negative; give its magnitude")
    per_joule = price_per_joule(price.price, price.per, level, density)
    energy = duty * hours_per_year * HOUR  # J/year
    cost = yearly_cost(duty, per_joule, hours_per_year)
    amount = energy * price_per_joule(1.0, price.per, level, density)  # price 1 per unit gives units
    return UtilityCost(item, price.utility, level.kind if level else ELECTRICITY, duty, amount, price.per,
                       price.price, price.unit, price.year, cost, price.source,
                       price.price if price.given_price is None else price.given_price,
                       price.year if price.given_year is None else price.given_year,
                       price.escalation_factor, price.price_index, price.set_by)

