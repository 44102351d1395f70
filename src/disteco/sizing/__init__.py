"""Sizing layer: trays and diameter, efficiency, shell, condenser, reboiler, reflux drum and pump.

Public entry point: :func:`size_column` with :class:`SizingOptions`; the correlations are
small functions in the modules ``flooding``, ``efficiency``, ``vessel``, ``exchangers`` and
``auxiliaries``.
"""

from .auxiliaries import DrumSizing, PumpSizing
from .column import ColumnSizing, EquipmentItem, SizingProperties, size_column
from .efficiency import OCONNELL_RANGE, TrayEfficiency, oconnell_efficiency_lockett, real_trays
from .exchangers import ExchangerSizing, choose_utility, log_mean_temperature_difference, size_exchanger
from .flooding import (FLOODING_METHODS, FLOW_PARAMETER_RANGE, TRAY_SPACING_RANGE, capacity_factor_kessler_wankat,
                       capacity_factor_lygeros_magoulas, lygeros_magoulas_constants, required_tray_area)
from .materials import Material, load_materials, material
from .options import SizingOptions
from .trays import TrayHydraulics
from .utilities import UtilityLevel
from .vessel import CAUTION, ColumnHeight, VesselDesign

__all__ = ["CAUTION", "ColumnHeight", "ColumnSizing", "DrumSizing", "EquipmentItem", "ExchangerSizing",
           "FLOODING_METHODS", "FLOW_PARAMETER_RANGE", "Material", "OCONNELL_RANGE", "PumpSizing",
           "SizingOptions", "SizingProperties", "TRAY_SPACING_RANGE", "TrayEfficiency", "TrayHydraulics",
           "UtilityLevel", "VesselDesign", "capacity_factor_kessler_wankat",
           "capacity_factor_lygeros_magoulas", "choose_utility", "load_materials",
           "log_mean_temperature_difference", "lygeros_magoulas_constants", "material",
           "oconnell_efficiency_lockett", "real_trays", "required_tray_area", "size_column", "size_exchanger"]
