"""Total annualised cost of a distillation column from its sizes and duties.

TAC = capital charge factor x installed capital + yearly utilities. The input is a
small dataclass of plain numbers so that costing does not depend on the sizing
result types; the caller fills it from the sizing results.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .._base.errors import CaseError
from .._base.units import ATMOSPHERE
from .._base.validity import OutOfRange
from .annual import AccuracyBand, total_annualised_cost
from .data import CostData
from .equipment import EquipmentCost, cost_equipment, cost_trays
from .operating import ELECTRICITY, UtilityCost, utility_cost

TRAY_TYPES = {"sieve": "sieve_tray", "valve": "valve_tray"}
CONDENSER_TYPES = {"fixed_tube_sheet": "fixed_tube_sheet_exchanger", "floating_head": "floating_head_exchanger",
                   "u_tube": "u_tube_exchanger"}
REBOILER_TYPES = {"kettle": "kettle_reboiler", "thermosiphon": "thermosiphon_reboiler"}


@dataclass(frozen=True)
class ColumnCostInput:
    """Sizes, pressures and duties of one column, in SI units.

    Pressures are design pressures above atmospheric. Utilities are level names of the
    cost data (``utility_levels.csv``). The pump's electric power defaults to its shaft
    power (motor losses then ignored, with a warning).
    """

    shell_diameter: float  # m, inside
    shell_height: float  # m, tangent to tangent
    design_pressure_gauge: float  # Pa
    trays: int  # real trays [-]
    condenser_area: float  # m2
    condenser_duty: float  # W
    condenser_utility: str
    reboiler_area: float  # m2
    reboiler_duty: float  # W
    reboiler_utility: str
    drum_volume: float  # m3
    drum_diameter: float  # m
    pump_shaft_power: float  # W
    pump_electric_power: float | None = None  # W
    tray_diameter: float | None = None  # m; None means the shell diameter
    tray_type: str = "sieve"  # one of TRAY_TYPES
    condenser_type: str = "fixed_tube_sheet"  # one of CONDENSER_TYPES
    reboiler_type: str = "kettle"  # one of REBOILER_TYPES
    shell_material: str = "CS"
    tray_material: str = "CS"
    exchanger_material: str = "CS/CS"  # shell/tube
    drum_material: str = "CS"
    pump_material: str = "CS"
    # A second shell in series (None: one shell): its tangent length and design pressure, the
    # transfer pump between the shells and the vapour line's pipe surface (pi D L).
    # A swaged shell (one shell, two diameters): (diameter m, tangent length m, real trays) of each
    # section, top first; empty: one diameter, shell_diameter, over shell_height.
    sections: tuple[tuple[float, float, int], ...] = ()
    second_shell_height: float | None = None  # m, same diameter as the first
    second_shell_pressure_gauge: float = 0.0  # Pa
    transfer_pump_shaft_power: float = 0.0  # W
    vapour_line_surface: float = 0.0  # m2


@dataclass(frozen=True)
class TacLine:
    """One line of the TAC breakdown [currency/year]."""

    item: str
    kind: str  # "capital" or "utility"
    installed: float  # currency; 0 for utilities
    per_year: float  # currency/year


@dataclass(frozen=True)
class CostSummary:
    """Capital, utilities and total annualised cost of one column in one price scenario."""

    capital_installed: float  # currency
    utilities_per_year: float  # currency/year
    capital_charge_factor: float  # 1/year
    annualised_capital: float  # currency/year
    tac_per_year: float  # currency/year
    currency: str
    cost_year: int
    cost_index: float  # [-]
    index_name: str
    scenario: str
    annualisation: str  # the basis in words
    operating_hours_per_year: float  # h
    items: tuple[EquipmentCost, ...]
    utilities: tuple[UtilityCost, ...]
    warnings: tuple[str, ...]
    accuracy_band: AccuracyBand

    @property
    def breakdown(self) -> tuple[TacLine, ...]:
        """TAC by item: annualised capital of each item, then each utility."""
        capital = tuple(TacLine(e.item, "capital", e.installed, e.installed * self.capital_charge_factor)
                        for e in self.items)
        return capital + tuple(TacLine(u.item, "utility", 0.0, u.cost_per_year) for u in self.utilities)

    @property
    def tac_range(self) -> tuple[float, float]:
        """TAC at the widest ends of the accuracy band [currency/year]."""
        return self.accuracy_band.range_of(self.tac_per_year)


def resolve_cost_year(data: CostData, cost_year: int | None) -> tuple[int, float]:
    """(year, index): the requested year or the newest in the table; CaseError on economics.cost_year."""
    year = data.cost_index.newest_year if cost_year is None else cost_year
    return year, data.cost_index.index(year)


def check_currency(data: CostData, currency: str | None) -> str:
    """The data's currency; CaseError on economics.currency when the case asks for another one."""
    if currency is not None and currency != data.settings.currency:
        raise CaseError("economics.currency", f"{currency!r} differs from the cost data's currency",
                        f"{data.settings.currency} (no exchange rates are applied)", currency)
    return data.settings.currency


def column_capital(data: CostData, inp: ColumnCostInput, cost_index: float,
                   policy: OutOfRange = OutOfRange.WARN) -> tuple[EquipmentCost, ...]:
    """Installed cost of shell, trays, condenser, reboiler, reflux drum and reflux pump."""
    p = inp.design_pressure_gauge
    tray_diameter = inp.tray_diameter if inp.tray_diameter is not None else inp.shell_diameter
    tray_kind = _choose("tray_type", inp.tray_type, TRAY_TYPES)
    sections = inp.sections or ((tray_diameter, inp.shell_height, inp.trays),)
    # a swaged shell is priced on its volume, the pressure factor at its larger diameter
    volume = sum(0.25 * math.pi * d ** 2 * h for d, h, _ in sections) if inp.sections else \
        0.25 * math.pi * inp.shell_diameter ** 2 * inp.shell_height
    trays = tuple(cost_trays(data, name, tray_kind, 0.25 * math.pi * d ** 2, count, cost_index,
                             material=inp.tray_material, policy=policy)
                  for name, (d, _, count) in zip(("trays", "trays, lower section"), sections) if count > 0)
    condenser_p = max(p, _utility_gauge(data, inp.condenser_utility))
    reboiler_p = max(p, _utility_gauge(data, inp.reboiler_utility))
    return (
        cost_equipment(data, "column shell", "vertical_vessel", volume, cost_index, material=inp.shell_material,
                       pressure_gauge=p, diameter=inp.shell_diameter, policy=policy),
        *trays,
        cost_equipment(data, "condenser", _choose("condenser_type", inp.condenser_type, CONDENSER_TYPES),
                       inp.condenser_area, cost_index, material=inp.exchanger_material, pressure_gauge=condenser_p,
                       policy=policy),
        cost_equipment(data, "reboiler", _choose("reboiler_type", inp.reboiler_type, REBOILER_TYPES),
                       inp.reboiler_area, cost_index, material=inp.exchanger_material, pressure_gauge=reboiler_p,
                       policy=policy),
        cost_equipment(data, "reflux drum", "horizontal_vessel", inp.drum_volume, cost_index,
                       material=inp.drum_material, pressure_gauge=p, diameter=inp.drum_diameter, policy=policy),
        cost_equipment(data, "reflux pump", "centrifugal_pump", inp.pump_shaft_power, cost_index,
                       material=inp.pump_material, pressure_gauge=p, policy=policy),
    ) + second_shell_capital(data, inp, cost_index, policy)


def second_shell_capital(data: CostData, inp: ColumnCostInput, cost_index: float,
                         policy: OutOfRange = OutOfRange.WARN) -> tuple[EquipmentCost, ...]:
    """Installed cost of a second shell (its own heads and nozzles: the vessel curve prices a whole
    vessel), the transfer pump between the shells and the vapour line; none for one shell."""
    if inp.second_shell_height is None:
        return ()
    p = inp.second_shell_pressure_gauge
    volume = 0.25 * math.pi * inp.shell_diameter ** 2 * inp.second_shell_height
    return (
        cost_equipment(data, "second column shell", "vertical_vessel", volume, cost_index,
                       material=inp.shell_material, pressure_gauge=p, diameter=inp.shell_diameter, policy=policy),
        cost_equipment(data, "transfer pump", "centrifugal_pump", inp.transfer_pump_shaft_power, cost_index,
                       material=inp.pump_material, pressure_gauge=p, policy=policy),
        cost_equipment(data, "vapour line", "vapour_line", inp.vapour_line_surface, cost_index, policy=policy),
    )


def column_utilities(data: CostData, inp: ColumnCostInput, scenario: str,
                     year: int | None = None) -> tuple[tuple[UtilityCost, ...], list[str]]:
    """Yearly cost of condenser coolant, reboiler heating medium and pump electricity, at prices
    moved to money of ``year`` (None: the prices' own years)."""
    hours = data.settings.operating_hours_per_year
    warnings = []
    costs = []
    prices = {}

    def price(name: str):
        prices[name] = data.price(scenario, name, year)
        return prices[name]

    for item, duty, name, service in (("condenser", inp.condenser_duty, inp.condenser_utility, "cooling"),
                                      ("reboiler", inp.reboiler_duty, inp.reboiler_utility, "heating")):
        level = data.level(name)
        if level.service != service:
            raise CaseError(f"{item} utility", f"{name!r} is a {level.service} utility", f"a {service} level")
        costs.append(utility_cost(item, duty, price(name), hours, level, data.density(name)))
    power = inp.pump_electric_power
    if power is None:
        power = inp.pump_shaft_power
        warnings.append("reflux pump: electricity taken at the shaft power (motor and drive losses ignored)")
    costs.append(utility_cost("reflux pump", power, price(ELECTRICITY), hours))
    if inp.second_shell_height is not None:  # transfer pump at its shaft power, as the reflux pump
        costs.append(utility_cost("transfer pump", inp.transfer_pump_shaft_power, price(ELECTRICITY), hours))
    return tuple(costs), warnings + [p.note for p in prices.values() if p.note]


def cost_column(data: CostData, inp: ColumnCostInput, scenario: str | None = None, cost_year: int | None = None,
                currency: str | None = None, policy: OutOfRange = OutOfRange.WARN) -> CostSummary:
    """Capital, yearly utilities and TAC of one column in one price scenario.

    ``scenario`` None means the data's default; ``cost_year`` None the newest year of the
    index table; ``currency`` (from the case) must match the data's. Capital and utility
    prices are both in money of the cost year (prices escalated with their price index).
    """
    scenario = data.settings.default_scenario if scenario is None else data.scenario(scenario).name
    currency = check_currency(data, currency)
    year, index = resolve_cost_year(data, cost_year)
    items = column_capital(data, inp, index, policy)
    utilities, warnings = column_utilities(data, inp, scenario, year)
    capital = sum(e.installed for e in items)
    yearly = sum(u.cost_per_year for u in utilities)
    factor = data.settings.capital_charge_factor()
    warnings = [w for e in items for w in e.warnings] + warnings
    return CostSummary(capital, yearly, factor, capital * factor, total_annualised_cost(capital, yearly, factor),
                       currency, year, index,
                       data.cost_index.name, scenario, data.settings.describe(),
                       data.settings.operating_hours_per_year, items, utilities, tuple(warnings), data.accuracy)


def _choose(field: str, value: str, options: dict[str, str]) -> str:
    if value not in options:
        raise CaseError(field, f"unknown type {value!r}", ", ".join(options))
    return options[value]


def _utility_gauge(data: CostData, name: str) -> float:
    level = data.level(name)
    return level.pressure - ATMOSPHERE if level.pressure is not None else 0.0
