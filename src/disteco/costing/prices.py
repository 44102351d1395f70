"""The user's utility prices on top of the cost data: the case's [prices] tables and --price.

Order: the cost data, then each ``[prices.NAME]`` table of the case (a cost-data scenario's
prices replaced, or a new scenario built on ``based_on`` as the case has it so far), then the
command line's ``--price`` (on the scenario it names, or on every scenario). A price the user
sets is in money of the run's cost year unless it says its year.
"""

from __future__ import annotations

import difflib
from dataclasses import replace

from .._base.errors import CaseError
from .._base.prices import PriceSetting, ScenarioPrices
from .data import CASE_BASIS, CostData, Scenario
from .operating import ELECTRICITY, UtilityPrice, price_units


def apply_prices(data: CostData, tables: tuple[ScenarioPrices, ...] = (), settings: tuple[PriceSetting, ...] = (),
                 cost_year: int | None = None) -> CostData:
    """``data`` with the case's ``[prices]`` tables and the ``settings`` (``--price``) applied.

    Raises CaseError naming the field or option (``PriceSetting.origin``) for an unknown
    scenario or utility, another currency, or a unit the utility cannot be priced in.
    """
    if not tables and not settings:
        return data
    year = data.cost_index.newest_year if cost_year is None else cost_year
    scenarios, prices = list(data.scenarios), list(data.prices)
    cost_data_names = {s.name for s in data.scenarios}
    for table in tables:
        field = f"prices.{table.name}"
        if table.name in cost_data_names:
            if table.based_on is not None or table.description is not None:
                key = "based_on" if table.based_on is not None else "description"
                raise CaseError(f"{field}.{key}", f"'{table.name}' is a scenario of the cost data; {key} is for "
                                "a new scenario", f"leave {key} out to change prices of '{table.name}', or give "
                                "the new scenario a name of its own")
        else:
            base = table.based_on or data.settings.default_scenario
            if base not in {s.name for s in scenarios}:
                raise CaseError(f"{field}.based_on", f"unknown scenario {base!r}",
                                ", ".join(s.name for s in scenarios), base)
            scenarios.append(Scenario(table.name, CASE_BASIS, table.description or f"'{base}' with the prices of "
                                      f"[{field}]", f"case file, [{field}] based on '{base}'"))
            prices += [replace(p, scenario=table.name) for p in prices if p.scenario == base]
        for setting in table.settings:
            prices = _set(data, prices, table.name, setting, year)
    names = [s.name for s in scenarios]
    for setting in settings:
        if setting.scenario is not None and setting.scenario not in names:
            raise CaseError(setting.origin, f"unknown scenario {setting.scenario!r}", ", ".join(names),
                            setting.scenario)
        for name in [setting.scenario] if setting.scenario is not None else names:
            prices = _set(data, prices, name, setting, year)
    return replace(data, scenarios=tuple(scenarios), prices=tuple(prices))


def _set(data: CostData, prices: list[UtilityPrice], scenario: str, setting: PriceSetting,
         year: int) -> list[UtilityPrice]:
    """``prices`` with the price of ``setting.utility`` in ``scenario`` replaced by the setting."""
    _check(data, setting)
    where = "command line" if setting.origin.startswith("-") else "case file"
    found = False
    out = []
    for price in prices:
        if price.scenario == scenario and price.utility == setting.utility:
            found = True
            replaced = data.joule_price(price) if price.set_by is None else None
            price = UtilityPrice(scenario, setting.utility, setting.price, setting.currency, setting.per,
                                 setting.year if setting.year is not None else year, f"{where}, {setting.origin}",
                                 price.price_index, set_by=setting.origin)
            if replaced:
                price = replace(price, cost_data_ratio=data.joule_price(price) / replaced)
        out.append(price)
    if not found:  # the cost data prices every utility in every scenario (checked on loading)
        raise CaseError(setting.origin, f"scenario '{scenario}' has no price for '{setting.utility}'")
    return out


def _check(data: CostData, setting: PriceSetting) -> None:
    """The setting's utility, currency and unit against the cost data."""
    utilities = [level.name for level in data.levels] + [ELECTRICITY]
    if setting.utility not in utilities:
        close = difflib.get_close_matches(setting.utility, utilities, n=1)
        hint = f"; did you mean '{close[0]}'?" if close else ""
        raise CaseError(setting.origin, f"unknown utility {setting.utility!r}{hint}", ", ".join(utilities),
                        setting.utility)
    if setting.currency != data.settings.currency:
        raise CaseError(setting.origin, f"currency {setting.currency} differs from the cost data's",
                        f"{data.settings.currency} (no exchange rates are applied)", setting.currency)
    if setting.utility == ELECTRICITY:
        allowed = price_units(True)
    else:
        level = data.level(setting.utility)
        carries = level.latent_heat is not None or level.heat_capacity is not None
        allowed = price_units(False, carries, data.density(setting.utility) is not None)
    if setting.per not in allowed:
        raise CaseError(setting.origin, f"{setting.utility} cannot be priced per {setting.per} with the cost data's "
                        "utility levels", "per " + ", ".join(allowed), setting.per)


__all__ = ["apply_prices"]
