"""Tables of the sized and priced column: equipment list, capital breakdown, utilities, TAC, provenance.

The inputs are the sizing layer's :class:`ColumnSizing` and the costing layer's
:class:`CostSummary` (and, for provenance, the :class:`CostData` they were priced with).
Money is in the cost data's currency, named in every header.
"""

from __future__ import annotations

from .._base.units import to_degC
from ..costing import CostData, CostSummary, HeatTransferCoefficient, PressureFactorCurve
from ..costing.validation import FILES
from ..sizing import ColumnSizing, ExchangerSizing
from .tables import KPA, KW, MIXED, MONEY, Cell, Column, Table, quantity_table, text

MM = 1e3  # mm per m
FACTOR = "0.000"
# Display unit and factor from the SI size units the lower layers use.
SIZE_DISPLAY = {"W": ("kW", 1e-3), "m^2": ("m^2", 1.0), "m2": ("m^2", 1.0), "m^3": ("m^3", 1.0),
                "m3": ("m^3", 1.0), "kg": ("kg", 1.0), "m": ("m", 1.0)}


def _size(value: float, unit: str) -> tuple[float, str]:
    display, factor = SIZE_DISPLAY.get(unit, (unit, 1.0))
    return value * factor, display


def _money(label: str, currency: str, per_year: bool = False) -> Column:
    return Column(label, f"{currency}/year" if per_year else currency, MONEY, 16.0)


def _gauge_kpa(pressure_gauge: float) -> float:
    return pressure_gauge / KPA


def column_table(sizing: ColumnSizing) -> Table:
    """The column's main dimensions, trays, efficiency and mechanical design basis."""
    v, h, e = sizing.vessel, sizing.height, sizing.efficiency
    items: list[tuple[str, Cell]] = [
        ("Diameter (inside, built) [m]", sizing.diameter),
        ("Rectifying-section diameter required [m]", sizing.rectifying_diameter),
        ("Stripping-section diameter required [m]", sizing.stripping_diameter),
        ("Design fraction of flooding [-]", sizing.flood_fraction),
        ("Overall tray efficiency [-]", e.value),
        ("Tray efficiency method", e.method),
        ("Real trays [-]", sizing.real_trays),
        ("Real trays above the feed [-]", sizing.rectifying_real_trays),
        ("Tray spacing [m]", h.tray_spacing),
        ("Tangent-to-tangent length [m]", h.tangent_length),
        ("Overall height with skirt [m]", h.overall),
        ("Height to diameter [-]", h.height_to_diameter),
        ("Shell material", v.material),
        ("Design pressure [kPa gauge]", _gauge_kpa(v.design_pressure)),
        ("Design temperature [degC]", to_degC(v.design_temperature)),
        ("Joint efficiency [-]", v.joint_efficiency),
        ("Corrosion allowance [mm]", v.corrosion_allowance * MM),
        ("Shell thickness, nominal [mm]", v.shell_thickness * MM),
        ("Head thickness, nominal [mm]", v.head_thickness * MM),
        ("Shell and heads mass [kg]", v.mass),
    ]
    return quantity_table("Column", items)


def equipment_table(sizing: ColumnSizing) -> Table:
    """The equipment list: one row per item with size, dimensions, material and design conditions."""
    columns = (text("Tag", 18.0), text("Equipment", 30.0), Column("Quantity", "-", "0", 10.0),
               Column("Size", "unit in next column", MIXED, 16.0), text("Size unit", 10.0),
               text("Size measures", 24.0), Column("Diameter", "m", "0.000"), Column("Length", "m", "0.000"),
               text("Material", 18.0), Column("Design pressure", "kPa gauge", "0.0", 16.0),
               Column("Design temperature", "degC", "0.0", 16.0),
               Column("Lowest operating temperature", "degC", "0.0", 16.0),
               Column("Overall coefficient U", "W/(m^2 K)", "0", 14.0), text("U basis and source", 60.0))
    rows = []
    for item in sizing.equipment:
        size, unit = _size(item.size, item.size_unit)
        rows.append((item.tag, item.kind, item.quantity, size, unit, item.size_basis, item.diameter, item.length,
                     item.material, _gauge_kpa(item.design_pressure), to_degC(item.design_temperature),
                     None if item.minimum_temperature is None else to_degC(item.minimum_temperature),
                     item.overall_coefficient, item.coefficient_basis or ""))
    return Table("Equipment list", columns, tuple(rows))


def exchangers_table(sizing: ColumnSizing) -> Table:
    """Condenser and reboiler: duty, utility, temperatures, LMTD, U and area."""
    columns = (text("Exchanger", 12.0), text("Utility", 22.0), Column("Duty", "kW", "#,##0"),
               Column("Process in", "degC", "0.0"), Column("Process out", "degC", "0.0"),
               Column("Utility in", "degC", "0.0"), Column("Utility out", "degC", "0.0"),
               Column("LMTD", "K", "0.00"), Column("Overall coefficient U", "W/(m^2 K)", "0", 20.0),
               Column("Area", "m^2", "0.00"), Column("Utility flow", "kg/s", "0.000"),
               Column("Utility energy", "GJ/year", "#,##0", 16.0))

    def row(x: ExchangerSizing):
        return (x.name, x.utility.name, x.duty / KW, to_degC(x.process_in), to_degC(x.process_out),
                to_degC(x.utility_in), to_degC(x.utility_out), x.lmtd, x.overall_coefficient, x.area,
                x.utility_mass_flow, x.utility_energy_per_year / 1e9)

    return Table("Condenser and reboiler", columns, (row(sizing.condenser), row(sizing.reboiler)))


def capital_table(cost: CostSummary) -> Table:
    """Capital by item on one screen: size, pieces, purchased cost, material, bare-module factor,
    installed cost. The factors and the cost-curve basis are in :func:`capital_factors_table`
    and :func:`capital_sources_table`."""
    c = cost.currency
    columns = (text("Item", 18.0), Column("Size", "unit in next column", MIXED, 12.0), text("Size unit", 9.0),
               Column("Pieces", "-", "0", 8.0), _money(f"Purchased cost, {cost.cost_year}", c), text("Material", 14.0),
               Column("Bare-module factor F_BM", "-", FACTOR, 12.0), _money("Installed cost", c),
               Column("Share of capital", "-", "0%", 10.0))
    rows = []
    for e in cost.items:
        size, unit = _size(e.size, e.size_unit)
        rows.append((e.item, size, unit, e.parallel_units * e.count, e.purchased_escalated, e.material,
                     e.bare_module_factor, e.installed, e.installed / cost.capital_installed))
    total = ("total", None, "", None, sum(e.purchased_escalated for e in cost.items), "", None,
             cost.capital_installed, 1.0)
    return Table(f"Capital cost ({c} {cost.cost_year})", columns, tuple(rows) + (total,))


def capital_factors_table(cost: CostSummary) -> Table:
    """The factors from purchased to installed cost of each item: quantity, material, pressure, bare module."""
    columns = (text("Item", 18.0), text("Cost curve", 20.0), Column("Parallel units", "-", "0", 10.0),
               Column("Pieces per unit", "-", "0", 10.0), Column("Quantity factor F_q", "-", FACTOR, 12.0),
               Column("Material factor F_M", "-", FACTOR, 12.0), Column("Pressure factor F_P", "-", FACTOR, 12.0),
               Column("Bare-module factor F_BM", "-", FACTOR, 12.0))
    rows = tuple((e.item, e.equipment, e.parallel_units, e.count, e.quantity_factor, e.material_factor,
                  e.pressure_factor, e.bare_module_factor) for e in cost.items)
    return Table("Capital cost factors", columns, rows)


def capital_sources_table(cost: CostSummary) -> Table:
    """Where each purchased cost comes from: the curve's cost at its base index, the escalation, the source."""
    c = cost.currency
    columns = (text("Item", 18.0), text("Cost curve", 20.0), _money("Purchased cost at base index", c),
               Column("Base index", "-", "0.0", 10.0), Column(f"Index {cost.cost_year}", "-", "0.0", 10.0),
               _money(f"Purchased cost, {cost.cost_year}", c), text("Source", 80.0))
    rows = tuple((e.item, e.equipment, e.purchased_base, e.base_index, e.cost_index, e.purchased_escalated,
                  e.source) for e in cost.items)
    return Table(f"Capital cost sources ({cost.index_name}, cost year {cost.cost_year})", columns, rows)


def utilities_table(cost: CostSummary) -> Table:
    """Yearly utilities: duty, amount, price (with its year and source) and cost per year."""
    c = cost.currency
    columns = (text("Item", 14.0), text("Utility", 22.0), Column("Duty or power", "kW", "#,##0.0"),
               Column("Amount", "per year, unit in next column", "#,##0", 18.0), text("Amount unit", 10.0),
               Column("Price", "unit in next column", "0.000", 12.0), text("Price unit", 12.0),
               Column("Price year", "year", "0", 10.0), _money("Cost", c, per_year=True), text("Source", 80.0))
    rows = tuple((u.item, u.utility, u.duty / KW, u.amount_per_year, u.amount_unit, u.price, u.price_unit,
                  u.price_year, u.cost_per_year, u.source) for u in cost.utilities)
    total = ("total", "", None, None, "", None, "", None, cost.utilities_per_year, "")
    return Table(f"Utilities ({cost.scenario}, {cost.operating_hours_per_year:g} h/year)", columns, rows + (total,))


def tac_table(cost: CostSummary) -> Table:
    """Total annualised cost: the basis, capital and utilities, and the accuracy band."""
    c = cost.currency
    low, high = cost.tac_range
    items: list[tuple[str, Cell]] = [
        ("Price scenario", cost.scenario),
        ("Cost year [year]", cost.cost_year),
        (f"Cost index ({cost.index_name}) [-]", cost.cost_index),
        ("Annualisation basis", cost.annualisation),
        ("Capital charge factor [1/year]", cost.capital_charge_factor),
        ("Operating hours [h/year]", cost.operating_hours_per_year),
        (f"Installed capital [{c}]", cost.capital_installed),
        (f"Annualised capital [{c}/year]", cost.annualised_capital),
        (f"Utilities [{c}/year]", cost.utilities_per_year),
        (f"Total annualised cost [{c}/year]", cost.tac_per_year),
        (f"Total annualised cost, low end of the accuracy band [{c}/year]", low),
        (f"Total annualised cost, high end of the accuracy band [{c}/year]", high),
        ("Estimate accuracy", cost.accuracy_band.describe()),
    ]
    return quantity_table("Total annualised cost", items)


def tac_breakdown_table(cost: CostSummary) -> Table:
    """TAC by item: annualised capital of each item, then each utility."""
    c = cost.currency
    columns = (text("Item", 16.0), text("Kind", 10.0), _money("Installed cost", c),
               _money("Share of TAC", c, per_year=True), Column("Fraction of TAC", "-", "0.0%", 14.0))
    rows = tuple((line.item, line.kind, line.installed, line.per_year, line.per_year / cost.tac_per_year)
                 for line in cost.breakdown)
    return Table("TAC by item", columns, rows)


def provenance_table(data: CostData, cost: CostSummary,
                     coefficients: tuple[HeatTransferCoefficient, ...] = ()) -> Table:
    """Every cost-data row the estimate used: file, row key, value and source.

    ``coefficients`` are the heat-transfer coefficient rows the condenser and reboiler
    were sized with (the sizing result holds the value, not the row).
    """
    columns = (text("File", 32.0), text("Row", 36.0), Column("Value", "unit as in Row", MIXED, 14.0),
               text("Source", 100.0))
    rows: list[tuple[Cell, ...]] = []
    seen: set[tuple[str, str]] = set()

    def add(file: str, key: str, value: Cell, source: str) -> None:
        if (file, key) not in seen:
            seen.add((file, key))
            rows.append((file, key, value, source))

    for e in cost.items:
        curve = data.curve(e.equipment)
        add(FILES["curves"], f"{curve.item}: k1, k2, k3 (size in {curve.size_unit}, {curve.size_min:g} to "
            f"{curve.size_max:g}; {curve.index_name} {curve.base_year})",
            f"{curve.k1:g}, {curve.k2:g}, {curve.k3:g}", curve.source)
        material = data.material_factor(curve.material_group, e.material)
        add(FILES["material"], f"{material.material_group} / {material.material}: F_M [-]", material.factor,
            material.source)
        bare = data.bare_module(curve.bare_module_group)
        add(FILES["bare_module"], f"{bare.bare_module_group}: B1, B2", f"{bare.b1:g}, {bare.b2:g}", bare.source)
        pressure = data.pressure_curve(curve.pressure_group)
        if pressure is not None:
            if isinstance(pressure, PressureFactorCurve):
                add(FILES["pressure"], f"{pressure.pressure_group}: C1, C2, C3",
                    f"{pressure.c1:g}, {pressure.c2:g}, {pressure.c3:g}", pressure.source)
            else:
                add(FILES["vessel_pressure"], f"{pressure.pressure_group}: vessel pressure factor", None,
                    pressure.source)
        if e.count > 1:
            add(FILES["tray_factor"], "tray quantity factor F_q [-]", e.quantity_factor, data.tray_quantity.source)
    for row in coefficients:
        add(FILES["heat_transfer"], f"{row.service} / {row.process_side} / {row.utility_kind}: typical U "
            "[W/(m^2 K)]", row.u_typical, row.source)
    add(FILES["index"], f"{cost.index_name} {cost.cost_year} [-]", cost.cost_index, data.cost_index.file)
    for u in cost.utilities:
        add(FILES["prices"], f"{cost.scenario} / {u.utility} [{u.price_unit}]", u.price, u.source)
    add(FILES["scenarios"], cost.scenario, None, data.scenario(cost.scenario).source)
    add(FILES["annualisation"], f"{cost.annualisation}: capital charge factor [1/year]",
        cost.capital_charge_factor, data.settings.source)
    add(FILES["accuracy"], f"AACE class {cost.accuracy_band.estimate_class}", None, cost.accuracy_band.source)
    return Table(f"Cost data used ({data.folder})", columns, tuple(rows))


