"""Cost indices and utility price indices by year, and escalation from one year to another."""

from __future__ import annotations

from dataclasses import dataclass, replace

from .._base.errors import CaseError
from .operating import NO_PRICE_INDEX, UtilityPrice


def escalate(cost: float, index_from: float, index_to: float) -> float:
    """Move a cost from one cost-index value to another, as in Turton et al. Chapter 7.

    .. math::
        C_2 = C_1 \\frac{I_2}{I_1}

    Parameters
    ----------
    cost : float
        Cost at the first index [currency]
    index_from : float
        Cost index the cost refers to, e.g. 397 for the base of Turton's Appendix A [-]
    index_to : float
        Cost index of the year wanted [-]

    Returns
    -------
    float
        Cost at the second index [currency]

    Notes
    -----
    Escalation over more than about ten years adds error of its own; the estimate's
    cautions say so.

    Examples
    --------
    >>> round(escalate(10000.0, 397.0, 596.2), 1)
    15017.6

    References
    ----------
    1. Turton et al., Analysis, Synthesis and Design of Chemical Processes, 4th ed.,
       2012, Section 7.2 (effect of time on purchased equipment cost).
    """
    return cost * index_to / index_from


@dataclass(frozen=True)
class CostIndexTable:
    """A plant cost index by year (``cost_index.csv``)."""

    name: str  # e.g. "CEPCI"
    years: tuple[int, ...]  # ascending
    values: tuple[float, ...]  # [-]
    file: str  # shown in error messages

    @property
    def newest_year(self) -> int:
        return self.years[-1]

    def allowed_years(self) -> str:
        """The years in the table, written compactly for an error message."""
        years = self.years
        if years == tuple(range(years[0], years[-1] + 1)):
            return f"years {years[0]} to {years[-1]} (extend {self.file} for others)"
        return "years " + ", ".join(map(str, years))

    def index(self, year: int) -> float:
        """Index of ``year``; a year not in the table raises CaseError on ``economics.cost_year``."""
        if year not in self.years:
            raise CaseError("economics.cost_year", f"{year} is not in the cost-index table {self.file}",
                            self.allowed_years(), year)
        return self.values[self.years.index(year)]


@dataclass(frozen=True)
class PriceIndexTable:
    """One utility price index by year (``utility_price_index.csv``)."""

    name: str  # e.g. "industrial_natural_gas"
    unit: str  # of the values, e.g. "USD per thousand cubic feet"
    years: tuple[int, ...]  # ascending
    values: tuple[float, ...]
    source: str

    def value(self, year: int) -> float | None:
        """The index in ``year``; None when the table has no value for it."""
        return self.values[self.years.index(year)] if year in self.years else None


def price_on_year(price: UtilityPrice, year: int, indices: tuple[PriceIndexTable, ...]) -> UtilityPrice:
    """``price`` moved to money of ``year`` with its price index (``price.price_index``).

    .. math::
        p_{year} = p_{given} \\frac{I(year)}{I(year_{given})}

    The result keeps the price as given (``given_price``, ``given_year``) and the factor
    applied. Where no index fits (the price names none, or the index lacks one of the two
    years) the price is kept as given and ``note`` says so, naming both years.

    >>> gas = PriceIndexTable("gas", "USD/unit", (2006, 2023), (8.0, 4.0), "example")
    >>> p = UtilityPrice("reference", "lp_steam", 13.0, "USD", "GJ", 2006, "example", price_index="gas")
    >>> price_on_year(p, 2023, (gas,)).price
    6.5
    >>> price_on_year(p, 2010, (gas,)).note
    "reference / lp_steam: price 13 USD/GJ of 2006 kept as given in the 2010 estimate (the price index 'gas' has no value for 2010)"
    """
    given = replace(price, given_price=price.price, given_year=price.year, escalation_factor=1.0, note=None) \
        if price.given_year is None else price
    if given.given_year == year:
        return replace(given, price=given.given_price, year=year, escalation_factor=1.0, note=None)
    index = next((table for table in indices if table.name == given.price_index), None)
    if index is None:
        reason = f"no price index for it in utility_prices.csv ({NO_PRICE_INDEX})"
    else:
        start, end = index.value(given.given_year), index.value(year)
        if start is not None and end is not None:
            factor = end / start
            return replace(given, price=given.given_price * factor, year=year, escalation_factor=factor, note=None)
        missing = " and ".join(str(y) for y, v in ((given.given_year, start), (year, end)) if v is None)
        reason = f"the price index '{index.name}' has no value for {missing}"
    return replace(given, price=given.given_price, year=given.given_year, escalation_factor=1.0,
                   note=f"{given.scenario} / {given.utility}: price {given.given_price:g} {given.unit} of "
                        f"{given.given_year} kept as given in the {year} estimate ({reason})")
