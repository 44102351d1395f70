"""Utility prices as a person writes them ("20 USD/GJ"), from the case file or the command line.

Only the text is read here; whether the utility, the currency and the unit fit the cost
data is checked by the costing layer (``costing.prices``), which knows the utility names.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass

from .errors import CaseError

PRICE_UNITS = ("GJ", "kWh", "t", "m3")  # what a utility price is per, as in utility_prices.csv
PRICE_EXAMPLE = "20 USD/GJ"
_PRICE = re.compile(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(.*?)\s*$")
_UNIT = re.compile(r"^([A-Za-z]{3})\s*/\s*(\S+)$")
_NAME = re.compile(r"^[A-Za-z0-9_-]+$")  # utility and scenario names as in cost_data/


YEARS = (1900, 2100)  # the years a price may be stated in (the index table decides which it can move)


@dataclass(frozen=True)
class PriceSetting:
    """One utility price set by the user.

    ``scenario`` None means every scenario the run prices (a ``--price`` without a scenario);
    ``year`` None means the run's cost year. ``origin`` is the case field or option that set
    it, used in messages and reports.
    """

    utility: str
    price: float  # [currency per `per`]
    currency: str
    per: str  # one of PRICE_UNITS
    origin: str
    scenario: str | None = None
    year: int | None = None

    @property
    def unit(self) -> str:
        return f"{self.currency}/{self.per}"


@dataclass(frozen=True)
class ScenarioPrices:
    """One ``[prices.NAME]`` table: overrides of a cost-data scenario, or a new scenario.

    A name not in the cost data defines a new scenario holding the prices of ``based_on``
    (None: the cost data's default scenario) with ``settings`` replacing some of them.
    """

    name: str
    settings: tuple[PriceSetting, ...]
    based_on: str | None = None
    description: str | None = None


def parse_price(text, field: str) -> tuple[float, str, str]:
    """Read ``"<number> <currency>/<unit>"`` into (price, currency, unit); CaseError on ``field``.

    >>> parse_price("20 USD/GJ", "prices.reference.lp_steam")
    (20.0, 'USD', 'GJ')
    >>> parse_price("0.08USD/kWh", "--price")
    (0.08, 'USD', 'kWh')
    """
    allowed = f"e.g. \"{PRICE_EXAMPLE}\"; per {', '.join(PRICE_UNITS)}"
    if isinstance(text, bool) or not isinstance(text, str):
        raise CaseError(field, f"expected a price written as text with its unit, got {text!r}", allowed, text)
    match = _PRICE.match(text)
    if not match:
        raise CaseError(field, f"cannot read {text!r} as a number followed by a unit", allowed, text)
    value = float(match.group(1))
    if not math.isfinite(value) or value < 0.0:
        raise CaseError(field, f"{text!r} is not a finite price of zero or more", allowed, text)
    if not match.group(2):
        raise CaseError(field, f"a unit is missing in {text!r}", allowed, text)
    unit = _UNIT.match(match.group(2).replace("³", "3"))
    if not unit:
        raise CaseError(field, f"cannot read {match.group(2)!r} as a currency per unit", allowed, text)
    currency, per = unit.group(1).upper(), unit.group(2)
    if per not in PRICE_UNITS:
        raise CaseError(field, f"unknown price unit {per!r}", allowed, text)
    return value, currency, per


def parse_price_option(text: str, option: str = "prices") -> PriceSetting:
    """Read ``[SCENARIO.]UTILITY=PRICE[@YEAR]`` (the ``--price`` option); CaseError naming ``option``.

    ``@YEAR``: the price is money of that year (moved to the run's cost year by the price
    index, as a ``year`` in a ``[prices]`` table); without it, money of the run's cost year.

    >>> parse_price_option("lp_steam=20USD/GJ", "--price").price
    20.0
    >>> parse_price_option("reference.electricity=0.08 USD/kWh", "--price").scenario
    'reference'
    >>> parse_price_option("lp_steam=20USD/GJ@2019", "--price").year
    2019
    """
    form = "[SCENARIO.]UTILITY=PRICE[@YEAR], e.g. lp_steam=20USD/GJ or lp_steam=20USD/GJ@2019"
    name, sep, value = str(text).partition("=")
    if not sep:
        raise CaseError(option, f"{text!r} has no '='", form, text)
    scenario, dot, utility = name.strip().rpartition(".")
    for part in (scenario, utility) if dot else (utility,):
        if not _NAME.match(part):
            raise CaseError(option, f"{name.strip()!r} is not a utility name (or scenario.utility)", form, text)
    value, at, year_text = value.partition("@")
    year = None
    if at:
        year_text = year_text.strip()
        if not year_text.isdigit() or not YEARS[0] <= int(year_text) <= YEARS[1]:
            raise CaseError(option, f"{year_text!r} after '@' is not a year",
                            f"a year from {YEARS[0]} to {YEARS[1]}", text)
        year = int(year_text)
    price, currency, per = parse_price(value, option)
    return PriceSetting(utility, price, currency, per, option, scenario or None, year)


def parse_price_table(table) -> tuple[ScenarioPrices, ...]:
    """The case file's ``[prices]`` table: one sub-table per scenario.

    Each key of ``[prices.NAME]`` is a utility name with a price (``"20 USD/GJ"``, money
    of the run's cost year) or a table ``{ price = "20 USD/GJ", year = 2019 }``; the keys
    ``based_on`` and ``description`` describe a new scenario.
    """
    if not isinstance(table, dict):
        raise CaseError("prices", "must be a table", "[prices.SCENARIO] tables of utility = \"price\"")
    found = []
    for name, scenario in table.items():
        field = f"prices.{name}"
        if not isinstance(scenario, dict):
            raise CaseError(field, "must be a table of utility prices",
                            f"[{field}] with lines such as lp_steam = \"{PRICE_EXAMPLE}\"")
        if not _NAME.match(name):
            raise CaseError(field, f"{name!r} is not a scenario name", "letters, digits, '_' and '-'")
        based_on = _optional_text(scenario, "based_on", field)
        description = _optional_text(scenario, "description", field)
        settings = tuple(_setting(utility, value, name, f"{field}.{utility}")
                         for utility, value in scenario.items() if utility not in ("based_on", "description"))
        found.append(ScenarioPrices(name, settings, based_on, description))
    return tuple(found)


def _optional_text(table: dict, key: str, field: str) -> str | None:
    value = table.get(key)
    if value is not None and (not isinstance(value, str) or not value.strip()):
        raise CaseError(f"{field}.{key}", "must be non-empty text", "a scenario name" if key == "based_on"
                        else "a line of text")
    return value


def _setting(utility: str, value, scenario: str, field: str) -> PriceSetting:
    if not _NAME.match(utility):
        raise CaseError(field, f"{utility!r} is not a utility name", "the utility names of the cost data")
    year = None
    if isinstance(value, dict):
        unknown = set(value) - {"price", "year"}
        if unknown or "price" not in value:
            raise CaseError(field, "a price table holds 'price' and optionally 'year'",
                            f"{{ price = \"{PRICE_EXAMPLE}\", year = 2019 }}")
        year = value.get("year")
        if year is not None and (isinstance(year, bool) or not isinstance(year, int)
                                 or not YEARS[0] <= year <= YEARS[1]):
            raise CaseError(f"{field}.year", f"{year!r}", f"a year from {YEARS[0]} to {YEARS[1]}", year)
        value = value["price"]
        field = f"{field}.price"
    price, currency, per = parse_price(value, field)
    return PriceSetting(utility, price, currency, per, field.removesuffix(".price"), scenario, year)


__all__ = ["PRICE_UNITS", "PriceSetting", "ScenarioPrices", "parse_price", "parse_price_option",
           "parse_price_table"]
