"""Costing layer: cost data from files, equipment capital, utilities and total annualised cost.

Data flow: ``load_cost_data`` (validated, cached) -> ``cost_equipment`` / ``cost_trays``
per item, ``utility_cost`` per duty -> ``cost_column`` for a whole column -> ``CostSummary``.
"""

from .annual import AccuracyBand, AnnualisationSettings, capital_recovery_factor
from .column import (ColumnCostInput, CostSummary, TacLine, check_currency, column_capital, column_utilities,
                     cost_column, resolve_cost_year)
from .curves import (BareModuleFactor, CostCurve, MaterialFactor, PressureFactorCurve, TrayQuantityFactor,
                     VesselPressureFactor, bare_module_factor, pressure_factor_polynomial, tray_quantity_factor,
                     turton_purchased_cost, vessel_pressure_factor)
from .data import CostData, HeatTransferCoefficient, Scenario, load_cost_data, resolve_scenarios
from .equipment import EquipmentCost, cost_equipment, cost_trays
from .indices import CostIndexTable, escalate
from .operating import UtilityCost, UtilityPrice, energy_per_mass, price_per_joule, utility_cost

__all__ = [
    "AccuracyBand", "AnnualisationSettings", "BareModuleFactor", "ColumnCostInput", "CostCurve", "CostData",
    "CostIndexTable", "CostSummary", "EquipmentCost", "HeatTransferCoefficient", "MaterialFactor",
    "PressureFactorCurve", "Scenario", "TacLine", "TrayQuantityFactor", "UtilityCost", "UtilityPrice",
    "VesselPressureFactor", "bare_module_factor", "capital_recovery_factor", "check_currency", "column_capital",
    "column_utilities", "cost_column", "cost_equipment", "cost_trays", "energy_per_mass", "escalate",
    "load_cost_data", "pressure_factor_polynomial", "price_per_joule", "resolve_cost_year", "resolve_scenarios",
    "tray_quantity_factor", "turton_purchased_cost", "utility_cost", "vessel_pressure_factor",
]
