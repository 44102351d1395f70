"""Loading and validating the whole cost-data folder into one frozen ``CostData``.

The bundled folder is read through ``importlib.resources`` so it works from a wheel;
a user folder (``economics.cost_data``) must hold the same file names. Loads are
cached; a user folder is reloaded when one of its files changes.
"""

from __future__ import annotations

import functools
from dataclasses import dataclass, replace
from pathlib import Path

from .._base.errors import CaseError, CostDataError
from .._base.units import ATMOSPHERE
from ..sizing.utilities import UtilityLevel
from .annual import AccuracyBand, AnnualisationSettings
from .curves import (BAR, BareModuleFactor, CostCurve, MaterialFactor, PressureFactorCurve, TrayQuantityFactor,
                     VesselPressureFactor)
from .indices import CostIndexTable, PriceIndexTable, price_on_year
from .operating import ELECTRICITY, UtilityPrice, price_per_joule
from .tables import Folder, bundled_folder, user_folder
from .validation import (FILES, check_curves, check_levels, check_prices, read_accuracy,
                         read_annualisation, read_bare_module, read_curves, read_heat_transfer, read_index,
                         read_levels, read_material, read_pressure, read_price_index, read_prices, read_scenarios,
                         read_tray_factor, read_vessel_pressure)

KILO = 1e3
CASE_BASIS = "case file"  # Scenario.basis of a scenario defined in the case's [prices] table


@dataclass(frozen=True)
class HeatTransferCoefficient:
    """Typical overall heat-transfer coefficient (``heat_transfer_coefficients.csv``) [W/(m^2 K)]."""

    service: str  # "condenser" or "reboiler"
    process_side: str
    utility_kind: str
    u_low: float
    u_typical: float
    u_high: float
    source: str


@dataclass(frozen=True)
class Scenario:
    name: str
    basis: str  # "published" or "demo" (or the user's own word)
    description: str
    source: str


@dataclass(frozen=True)
class CostData:
    """Everything in one cost-data folder, validated."""

    folder: str
    curves: tuple[CostCurve, ...]
    material_factors: tuple[MaterialFactor, ...]
    bare_module_factors: tuple[BareModuleFactor, ...]
    pressure_factors: tuple[PressureFactorCurve, ...]
    vessel_pressure_factors: tuple[VesselPressureFactor, ...]
    tray_quantity: TrayQuantityFactor
    cost_index: CostIndexTable
    heat_transfer: tuple[HeatTransferCoefficient, ...]
    levels: tuple[UtilityLevel, ...]
    level_densities: tuple[float | None, ...]  # kg/m3, same order as levels
    scenarios: tuple[Scenario, ...]
    prices: tuple[UtilityPrice, ...]
    settings: AnnualisationSettings
    accuracy: AccuracyBand
    price_indices: tuple[PriceIndexTable, ...] = ()

    def curve(self, item: str) -> CostCurve:
        """The cost curve of ``item`` (a key of ``purchased_cost_correlations.csv``)."""
        for curve in self.curves:
            if curve.item == item:
                return curve
        raise CostDataError(self._file("purchased_cost_correlations.csv"),
                            f"no row for item '{item}' (items: {', '.join(c.item for c in self.curves)})",
                            column="item")

    def material_factor(self, group: str, material: str | None) -> MaterialFactor:
        """Material factor row; ``material`` None gives the group's base material (F_M = 1)."""
        for row in self.material_factors:
            if row.material_group == group and (row.material == material or material is None and row.factor == 1.0):
                return row
        known = [r.material for r in self.material_factors if r.material_group == group]
        raise CostDataError(self._file("material_factors.csv"),
                            f"no material '{material}' for group '{group}'"
                            + (" with factor 1" if material is None else "") + f" (materials: {', '.join(known)})",
                            column="material")

    def bare_module(self, group: str) -> BareModuleFactor:
        return next(r for r in self.bare_module_factors if r.bare_module_group == group)

    def pressure_curve(self, group: str) -> PressureFactorCurve | VesselPressureFactor | None:
        """The pressure-factor record of a group; None for group "none" (F_P = 1)."""
        for row in self.pressure_factors + self.vessel_pressure_factors:
            if row.pressure_group == group:
                return row
        return None

    def level(self, name: str) -> UtilityLevel:
        for level in self.levels:
            if level.name == name:
                return level
        raise CaseError("utility level", f"unknown level {name!r} in {self._file('utility_levels.csv')}",
                        ", ".join(lv.name for lv in self.levels))

    def without_levels(self, names) -> "CostData":
        """These data with the utility levels ``names`` no longer offered (their prices kept, unused)."""
        kept = [i for i, level in enumerate(self.levels) if level.name not in names]
        return replace(self, levels=tuple(self.levels[i] for i in kept),
                       level_densities=tuple(self.level_densities[i] for i in kept))

    def density(self, name: str) -> float | None:
        """Density of a level's utility [kg/m^3], None where not given."""
        return self.level_densities[self.levels.index(self.level(name))]

    def scenario(self, name: str, field: str = "economics.scenarios") -> Scenario:
        """The scenario ``name``; CaseError on ``field`` naming the scenarios there are."""
        for scenario in self.scenarios:
            if scenario.name == name:
                return scenario
        inline = [s.name for s in self.scenarios if s.basis == CASE_BASIS]
        where = self._file("scenarios.csv") + (" or the case's [prices] tables" if inline else "")
        raise CaseError(field, f"unknown scenario {name!r} in {where}", ", ".join(s.name for s in self.scenarios),
                        name)

    def price(self, scenario: str, utility: str, year: int | None = None) -> UtilityPrice:
        """The price of ``utility`` in ``scenario``; with ``year``, moved to money of that year
        (:func:`~disteco.costing.indices.price_on_year`)."""
        self.scenario(scenario)
        for price in self.prices:
            if price.scenario == scenario and price.utility == utility:
                return price if year is None else price_on_year(price, year, self.price_indices)
        raise CostDataError(self._file("utility_prices.csv"), f"scenario '{scenario}' has no price for '{utility}'",
                            column="utility")

    def price_per_joule(self, scenario: str, utility: str, year: int | None = None) -> float:
        """Price of one joule of duty of a level (or of electricity) in a scenario [currency/J],
        in money of ``year`` (None: the price's own year).

        The linear coefficient of a utility's yearly cost: cost = duty x hours x 3600 x this.
        """
        return self.joule_price(self.price(scenario, utility, year))

    def joule_price(self, price: UtilityPrice) -> float:
        """``price`` per joule of duty of its utility [currency/J], in its own year's money."""
        if price.utility == ELECTRICITY:
            return price_per_joule(price.price, price.per)
        return price_per_joule(price.price, price.per, self.level(price.utility), self.density(price.utility))

    def heat_transfer_coefficient(self, service: str, utility_kind: str,
                                  process_side: str | None = None) -> HeatTransferCoefficient:
        """Typical U of a condenser or reboiler against a utility kind; first row if no side given."""
        for row in self.heat_transfer:
            if (row.service == service and row.utility_kind == utility_kind
                    and (process_side is None or row.process_side == process_side)):
                return row
        raise CostDataError(self._file("heat_transfer_coefficients.csv"),
                            f"no row for {service} against {utility_kind}"
                            + (f" with process side '{process_side}'" if process_side else ""))

    def coefficient_row(self, service: str, utility_kind: str,
                        process_side: str) -> tuple[HeatTransferCoefficient, str | None]:
        """The U row of a service, utility kind and process side, and a note when it had to be replaced.

        Without a row for ``process_side``, the row of the same service and utility kind with
        the lowest typical U is used (the larger, safer exchanger; common practice, no source)
        and the note says so.
        """
        rows = [r for r in self.heat_transfer if r.service == service and r.utility_kind == utility_kind]
        for row in rows:
            if row.process_side == process_side:
                return row, None
        if not rows:
            self.heat_transfer_coefficient(service, utility_kind)  # raises, naming the file
        row = min(rows, key=lambda r: r.u_typical)
        return row, (f"{service}: no overall coefficient for '{process_side}' against {utility_kind} in "
                     f"{self._file('heat_transfer_coefficients.csv')}; the lowest row of that utility "
                     f"('{row.process_side}', {row.u_typical:g} W/(m^2 K)) is used")

    def _file(self, filename: str) -> str:
        return f"{self.folder}/{filename}"


def resolve_scenarios(data: CostData, requested: tuple[str, ...] = (),
                      field: str = "economics.scenarios") -> tuple[str, ...]:
    """Scenario names to cost: the requested ones (checked; errors name ``field``), or the
    data's default followed by the scenarios the case's [prices] table defines."""
    if not requested:
        inline = tuple(s.name for s in data.scenarios if s.basis == CASE_BASIS)
        return tuple(dict.fromkeys((data.settings.default_scenario,) + inline))
    for name in requested:
        data.scenario(name, field)
    twice = next((name for i, name in enumerate(requested) if name in requested[:i]), None)
    if twice is not None:
        raise CaseError(field, f"scenario {twice!r} named twice", "each scenario once")
    return tuple(requested)


def load_cost_data(folder: str | Path | None = None) -> CostData:
    """Load and validate a cost-data folder; None means the bundled data. Cached."""
    if folder is None:
        return _load_bundled()
    path = Path(folder).resolve()
    stamp = tuple(sorted((p.name, p.stat().st_mtime_ns) for p in path.glob("*") if p.is_file())) \
        if path.is_dir() else ()
    return _load_user(str(path), stamp)


@functools.lru_cache(maxsize=1)
def _load_bundled() -> CostData:
    return _load(bundled_folder())


@functools.lru_cache(maxsize=8)
def _load_user(path: str, stamp: tuple) -> CostData:
    return _load(user_folder(path))


def _load(folder: Folder) -> CostData:
    settings = read_annualisation(folder)
    material = read_material(folder)
    bare = read_bare_module(folder)
    pressure = read_pressure(folder)
    vessel = read_vessel_pressure(folder)
    index = read_index(folder)
    curves = read_curves(folder)
    check_curves(folder, curves, material, bare, pressure, vessel, index, settings)
    levels = read_levels(folder)
    check_levels(folder, levels)
    scenarios = read_scenarios(folder)
    prices = read_prices(folder)
    indices = read_price_index(folder)
    check_prices(folder, prices, levels, scenarios, settings, indices)
    return CostData(
        folder=folder.label,
        curves=tuple(CostCurve(**{k: row[k] for k in _fields(CostCurve)}) for _, row in curves),
        material_factors=tuple(MaterialFactor(r["material_group"], r["material"], r["material_factor"], r["source"])
                               for _, r in material),
        bare_module_factors=tuple(BareModuleFactor(r["bare_module_group"], r["b1"], r["b2"], r["source"])
                                  for _, r in bare),
        pressure_factors=tuple(PressureFactorCurve(r["pressure_group"], r["c1"], r["c2"], r["c3"],
                                                   r["pressure_min_barg"] * BAR, r["pressure_max_barg"] * BAR,
                                                   r["source"]) for _, r in pressure),
        vessel_pressure_factors=tuple(
            VesselPressureFactor(r["pressure_group"], r["allowable_stress_bar"] * BAR, r["pressure_coefficient"],
                                 r["corrosion_allowance_m"], r["minimum_thickness_m"], r["vacuum_limit_barg"] * BAR,
                                 r["vacuum_factor"], r["pressure_max_barg"] * BAR, r["source"]) for _, r in vessel),
        tray_quantity=read_tray_factor(folder),
        cost_index=CostIndexTable(index[0][1]["index_name"], tuple(r["year"] for _, r in index),
                                  tuple(r["index"] for _, r in index), folder.name_of(FILES["index"])),
        heat_transfer=tuple(HeatTransferCoefficient(r["service"], r["process_side"], r["utility_kind"], r["u_low"],
                                                    r["u_typical"], r["u_high"], r["source"])
                            for _, r in read_heat_transfer(folder)),
        levels=tuple(_level(r) for _, r in levels),
        level_densities=tuple(r["density_kg_per_m3"] for _, r in levels),
        scenarios=tuple(Scenario(r["scenario"], r["basis"], r["description"], r["source"]) for _, r in scenarios),
        prices=tuple(UtilityPrice(r["scenario"], r["utility"], r["price"], r["currency"], r["per"], r["year"],
                                  r["source"], r["price_index"]) for _, r in prices),
        settings=AnnualisationSettings(**{k: settings[k] for k in _fields(AnnualisationSettings)}),
        accuracy=read_accuracy(folder),
        price_indices=_price_indices(indices),
    )


def _price_indices(rows) -> tuple[PriceIndexTable, ...]:
    """One table per index name (rows sorted by name and year)."""
    names = dict.fromkeys(r["index_name"] for _, r in rows)
    tables = []
    for name in names:
        own = [r for _, r in rows if r["index_name"] == name]
        tables.append(PriceIndexTable(name, own[0]["unit"], tuple(r["year"] for r in own),
                                      tuple(r["value"] for r in own), own[0]["source"]))
    return tuple(tables)


def _fields(cls) -> tuple[str, ...]:
    return tuple(cls.__dataclass_fields__)


def _level(r: dict) -> UtilityLevel:
    celsius = 273.15
    latent = r["latent_heat_kJ_per_kg"]
    cp = r["heat_capacity_kJ_per_kg_K"]
    barg = r["pressure_barg"]
    return UtilityLevel(r["name"], r["service"], r["kind"], r["supply_temperature_degC"] + celsius,
                        r["return_temperature_degC"] + celsius,
                        latent_heat=latent * KILO if latent is not None else None,
                        heat_capacity=cp * KILO if cp is not None else None,
                        pressure=barg * BAR + ATMOSPHERE if barg is not None else None)


__all__ = ["CASE_BASIS", "CostData", "HeatTransferCoefficient", "Scenario", "load_cost_data", "resolve_scenarios"]
