"""Capital cost of one equipment item: purchased at the base index, escalated, installed.

C_BM = N_units N_q F_q C_p^0(size per unit) (I / I_base) (B_1 + B_2 F_M F_P)

A size above a correlation's range is split into identical parallel units where the
data row says ``above_range = parallel``, and costed along the curve's tangent otherwise;
a size below the range (or below the curve's lowest point where that lies inside it,
``CostCurve.held_below``) along its tangent there too. Each adds a warning.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

from .._base.errors import CorrelationRangeError
from .._base.operations import FLOAT, Operations
from .._base.validity import OutOfRange
from .curves import CostCurve, VesselPressureFactor, bare_module_factor
from .data import CostData


@dataclass(frozen=True)
class InstalledCost:
    """Everything but the size that turns one item's size into its installed cost.

    C_BM = n N F_q C_p^0(S / n) (I / I_base) F_BM, with n parallel units of one piece and N
    identical pieces (trays) sharing the quantity factor F_q. The costing layer builds it for
    every item; the optimisation model takes it, built at a reference design, and evaluates
    the same :meth:`installed` on its size expressions.
    """

    item: str
    curve: CostCurve
    index_ratio: float  # I / I_base [-]
    bare_module_factor: float  # F_BM [-]
    parallel_units: int = 1
    count: int = 1
    quantity_factor: float = 1.0  # F_q [-]

    def purchased_base(self, size, ops: Operations = FLOAT):
        """Purchased cost at the curve's base index [currency]; ``size`` per piece in SI units."""
        n = self.parallel_units
        return n * self.count * self.quantity_factor * self.curve.expression(size / n, ops)

    def installed(self, size, ops: Operations = FLOAT):
        """Installed (bare-module) cost at the cost year [currency]; ``size`` per piece in SI units."""
        return self.purchased_base(size, ops) * self.index_ratio * self.bare_module_factor

    def with_count(self, count: int, quantity_factor: float) -> "InstalledCost":
        """The same item with another number of pieces (trays) and their quantity factor."""
        return replace(self, count=count, quantity_factor=quantity_factor)


@dataclass(frozen=True)
class EquipmentCost:
    """Capital cost of one item, each step shown. Costs in the data's currency."""

    item: str  # e.g. "column shell"
    equipment: str  # cost-curve key, e.g. "vertical_vessel"
    size: float  # total size in SI (m3, m2 or W)
    size_unit: str  # SI unit of size
    parallel_units: int  # identical units the size is split into [-]
    count: int  # number of identical pieces costed together, e.g. trays [-]
    quantity_factor: float  # F_q, 1 except for trays [-]
    purchased_base: float  # at the curve's base index
    base_index: float  # [-]
    cost_index: float  # index of the cost year [-]
    purchased_escalated: float  # at the cost year
    material: str
    material_factor: float  # F_M [-]
    pressure_factor: float  # F_P [-]
    bare_module_factor: float  # F_BM [-]
    installed: float  # bare-module cost at the cost year
    source: str
    warnings: tuple[str, ...]
    pricing: InstalledCost | None = None  # the numbers that give ``installed`` from the size


def cost_equipment(data: CostData, item: str, equipment: str, size: float, cost_index: float, *,
                   material: str | None = None, pressure_gauge: float = 0.0, diameter: float | None = None,
                   count: int = 1, quantity_factor: float = 1.0,
                   policy: OutOfRange = OutOfRange.WARN) -> EquipmentCost:
    """Installed (bare-module) cost of one item from its size.

    ``size`` in SI units of the curve's size variable (m3, m2 or W) for one piece;
    ``count`` identical pieces share the ``quantity_factor`` (trays). ``material`` None
    means the correlation's base material (F_M = 1). ``pressure_gauge`` [Pa] is the
    design pressure above atmospheric; ``diameter`` [m] is needed for vessels, whose
    pressure factor follows from the wall thickness. With ``policy=OutOfRange.RAISE`` a
    size outside the range raises instead of warning.
    """
    curve = data.curve(equipment)
    validity = curve.validity()
    if not size > 0.0:
        raise CorrelationRangeError(validity.correlation, validity.variable, size, validity.low, validity.high,
                                    validity.unit, curve.source)
    warnings: list[str] = []
    units = 1
    if size > validity.high and curve.above_range == "parallel" and policy is OutOfRange.WARN:
        units = math.ceil(size / validity.high)
        warnings.append(f"{item}: {curve.size_variable} {size:.4g} {validity.unit} is above the "
                        f"{validity.high:.4g} {validity.unit} of {equipment}; split into {units} parallel units "
                        f"of {size / units:.4g} {validity.unit}")
    per_unit, held = size / units, curve.held_below * curve.si_per_unit
    if policy is OutOfRange.WARN and not held <= per_unit <= validity.high:
        where = (f"above {validity.high:.4g} {validity.unit}, where the {equipment} cost curve ends" if per_unit > held
                 else f"below {held:.4g} {validity.unit}, where the {equipment} cost curve " + (
                     "begins" if curve.held_below == curve.size_min else
                     f"is lowest (its range is {validity.low:g} to {validity.high:g} {validity.unit})"))
        warnings.append(f"{curve.size_variable} {per_unit:.4g} {validity.unit} is {where}: costed along the curve's "
                        f"tangent there ({curve.source}; the tangent is common practice, no source)")
    else:
        validity.check(per_unit, policy, warnings)
    warnings = [w if w.startswith(item) else f"{item}: {w}" for w in warnings]
    material_row = data.material_factor(curve.material_group, material)
    pressure_factor = pressure_factor_of(data, curve.pressure_group, pressure_gauge, diameter, item, warnings)
    bare = data.bare_module(curve.bare_module_group)
    f_bm = bare_module_factor(bare.b1, bare.b2, material_row.factor, pressure_factor)
    pricing = InstalledCost(item, curve, cost_index / curve.base_index, f_bm, units, count, quantity_factor)
    purchased = pricing.purchased_base(size)
    escalated = purchased * pricing.index_ratio
    source = "; ".join(dict.fromkeys((curve.source, material_row.source, bare.source)))
    return EquipmentCost(item, equipment, size * count, validity.unit, units, count, quantity_factor, purchased,
                         curve.base_index, cost_index, escalated, material_row.material, material_row.factor,
                         pressure_factor, f_bm, pricing.installed(size), source, tuple(warnings), pricing)


def cost_trays(data: CostData, item: str, equipment: str, tray_area: float, trays: int, cost_index: float, *,
               material: str | None = None, policy: OutOfRange = OutOfRange.WARN) -> EquipmentCost:
    """Installed cost of ``trays`` identical trays of ``tray_area`` [m^2], quantity factor included."""
    if trays < 1:
        raise ValueError(f"{item}: {trays} trays; at least one tray is needed to cost a tray column")
    return cost_equipment(data, item, equipment, tray_area, cost_index, material=material, count=trays,
                          quantity_factor=data.tray_quantity.factor(trays), policy=policy)


def pressure_factor_of(data: CostData, group: str, pressure_gauge: float, diameter: float | None, item: str,
                       warnings: list[str]) -> float:
    """F_P [-] of a pressure group; vessels need their ``diameter`` [m]; warnings are prefixed by ``item``."""
    record = data.pressure_curve(group)
    if record is None:
        return 1.0
    local: list[str] = []
    if isinstance(record, VesselPressureFactor):
        if diameter is None:
            raise ValueError(f"{item}: a vessel's pressure factor needs its diameter")
        factor = record.factor(pressure_gauge, diameter, local)
    else:
        factor = record.factor(pressure_gauge, local)
    warnings.extend(f"{item}: {w}" for w in local)
    return factor
