"""Sizing layer: trays and diameter, efficiency, shell, condenser, reboiler, reflux drum and pump.

Public entry point: :func:`size_column` with :class:`SizingOptions`; the correlations are
small functions in the modules ``flooding``, ``efficiency``, ``vessel``, ``exchangers`` and
``auxiliaries``.
"""

from .._base.lazy import lazy_names

__getattr__, __dir__, __all__ = lazy_names(__name__, {
    "auxiliaries": ("DrumSizing", "PumpSizing"),
    "column": ("ColumnSizing", "EquipmentItem", "SizingProperties", "size_column"),
    "efficiency": ("OCONNELL_RANGE", "TrayEfficiency", "oconnell_efficiency_lockett", "real_trays"),
    "exchangers": ("ExchangerSizing", "choose_utility", "log_mean_temperature_difference", "size_exchanger"),
    "flooding": ("FLOODING_METHODS", "FLOW_PARAMETER_RANGE", "TRAY_SPACING_RANGE", "capacity_factor_kessler_wankat",
        "capacity_factor_lygeros_magoulas", "lygeros_magoulas_constants", "required_tray_area"),
    "materials": ("Material", "load_materials", "material"),
    "options": ("SizingOptions",),
    "trays": ("TrayHydraulics",),
    "utilities": ("UtilityLevel",),
    "vessel": ("CAUTION", "ColumnHeight", "VesselDesign"),
})
