"""The sizing layer's result as the costing layer's input."""

from __future__ import annotations

from .._base.errors import CaseError
from ..sizing.column import ColumnSizing
from ..sizing.options import SizingOptions
from .column import TRAY_TYPES, ColumnCostInput
from .data import CostData


def swaged(sizing: ColumnSizing) -> bool:
    """Whether the shell is priced with two diameters: separate sections asked for, one shell, diameters differ."""
    return sizing.separate_sections and sizing.split is None and sizing.rectifying_diameter != sizing.stripping_diameter


def cost_input(sizing: ColumnSizing, options: SizingOptions = SizingOptions()) -> ColumnCostInput:
    """Map a ``ColumnSizing`` onto ``ColumnCostInput`` (shell costed at its largest diameter).

    The reboiler is costed on the curve of the type the sizing chose (kettle when none was).
    With two shells the first is the upper one and the second the lower (the sizing's own
    ``height`` and ``vessel``); trays are priced together. With separate sections (one shell) the
    shell is swaged: the rectifying trays and the top space at their diameter, the rest at the
    stripping diameter, each section's trays at its own area. Tray type and material are the
    designer's ``options``.
    """
    split = sizing.split
    second = {}
    if split is not None:
        second = dict(second_shell_height=sizing.height.tangent_length,
                      second_shell_pressure_gauge=sizing.vessel.design_pressure,
                      transfer_pump_shaft_power=split.transfer_pump.shaft_power,
                      vapour_line_surface=split.vapour_line.surface)
    if swaged(sizing):
        h = sizing.height
        top = sizing.rectifying_real_trays * h.tray_spacing + h.top_space
        second["sections"] = ((sizing.rectifying_diameter, top, sizing.rectifying_real_trays),
                              (sizing.stripping_diameter, h.tangent_length - top,
                               sizing.real_trays - sizing.rectifying_real_trays))
    first = sizing.vessel if split is None else split.upper_vessel
    return ColumnCostInput(
        shell_diameter=sizing.diameter,
        shell_height=first.tangent_length,
        design_pressure_gauge=sizing.vessel.design_pressure,
        trays=sizing.real_trays,
        condenser_area=sizing.condenser.area,
        condenser_duty=sizing.condenser.duty,
        condenser_utility=sizing.condenser.utility.name,
        reboiler_area=sizing.reboiler.area,
        reboiler_duty=sizing.reboiler.duty,
        reboiler_utility=sizing.reboiler.utility.name,
        drum_volume=sizing.reflux_drum.volume,
        drum_diameter=sizing.reflux_drum.diameter,
        pump_shaft_power=sizing.reflux_pump.shaft_power,
        tray_type=options.tray_type,
        tray_material=options.tray_material,
        reboiler_type=sizing.reboiler.exchanger_type or "kettle",
        shell_material=sizing.vessel.material_class,
        **second,
    )


def check_tray_material(data: CostData, options: SizingOptions) -> None:
    """``CaseError`` on ``sizing.tray_material`` when the cost data has no factor for it."""
    group = data.curve(TRAY_TYPES[options.tray_type]).material_group
    known = [row.material for row in data.material_factors if row.material_group == group]
    if options.tray_material not in known:
        raise CaseError("sizing.tray_material", f"no material factor for {options.tray_material!r} trays",
                        ", ".join(known), options.tray_material)
