"""Costing layer: cost data from files, equipment capital, utilities and total annualised cost.

Data flow: ``load_cost_data`` (validated, cached) -> ``cost_equipment`` / ``cost_trays``
per item, ``utility_cost`` per duty -> ``cost_column`` for a whole column -> ``CostSummary``.
"""

from .._base.lazy import lazy_names

__getattr__, __dir__, __all__ = lazy_names(__name__, {
    "annual": ("AccuracyBand", "AnnualisationSettings", "capital_recovery_factor"),
    "column": ("ColumnCostInput", "CostSummary", "TacLine", "check_currency", "column_capital", "column_utilities",
        "cost_column", "resolve_cost_year"),
    "curves": ("BareModuleFactor", "CostCurve", "MaterialFactor", "PressureFactorCurve", "TrayQuantityFactor",
        "VesselPressureFactor", "bare_module_factor", "pressure_factor_polynomial", "tray_quantity_factor",
        "turton_purchased_cost", "vessel_pressure_factor"),
    "data": ("CostData", "HeatTransferCoefficient", "Scenario", "load_cost_data", "resolve_scenarios"),
    "equipment": ("EquipmentCost", "cost_equipment", "cost_trays"),
    "indices": ("CostIndexTable", "escalate"),
    "operating": ("UtilityCost", "UtilityPrice", "energy_per_mass", "price_per_joule", "utility_cost"),
})
