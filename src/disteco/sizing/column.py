"""Size a whole column from a stage solution: trays, shell, condenser, reboiler, drum, pump.

Stages are numbered from the top as in :class:`~disteco.stages.results.StageProfile`;
stages 1 .. N-1 are trays and stage N is the reboiler. Each tray is checked for flooding
with the liquid and vapour leaving it.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Protocol, Sequence

from .._base.errors import CaseError, CorrelationRangeError
from .._base.validity import OutOfRange, ValidityRange
from ..stages.results import StageProfile
from .auxiliaries import DrumSizing, PumpSizing, size_drum, size_pump
from .efficiency import OCONNELL_RANGE, TrayEfficiency, oconnell_efficiency_lockett, real_trays
from .exchanger_service import REBOILER_KINDS
from .exchangers import ExchangerSizing, OverallCoefficient, size_exchanger
from .flooding import FLOW_PARAMETER_RANGE
from .tray_pressure_drop import TrayPressureDrop, sieve_tray_pressure_drop, weir_height_for
from .trays import TrayHydraulics, round_up, tray_hydraulics
from .options import SizingOptions
from .utilities import UtilityLevel
from .vessel import ColumnHeight, VesselDesign, column_height, design_pressure, design_vessel


class SizingProperties(Protocol):
    """What sizing needs of a mixture (``disteco.properties.Mixture`` provides it); SI units."""

    def liquid_density(self, T: float, P: float, x) -> float: ...
    def vapour_density(self, T: float, P: float, y) -> float: ...
    def surface_tension(self, T: float, x) -> float: ...
    def liquid_viscosity(self, T: float, P: float, x) -> float: ...
    def molar_mass(self, z) -> float: ...
    def relative_volatility(self, T: float, P: float, x, light: int, heavy: int, y=None) -> float: ...


@dataclass(frozen=True)
class EquipmentItem:
    """One line of the equipment list. ``size`` is in ``size_unit`` (SI), described by ``size_basis``."""

    tag: str  # "column", "trays", "condenser", "reboiler", "reflux_drum", "reflux_pump"
    kind: str  # e.g. "vertical pressure vessel", "sieve tray"
    size: float
    size_unit: str  # "kg", "m", "m^2", "m^3", "W"
    size_basis: str  # what the size measures, e.g. "shell and heads mass"
    material: str
    material_class: str  # cost-data vocabulary: "CS", "LA", "SS"
    design_pressure: float  # Pa, gauge
    design_temperature: float  # K
    quantity: int = 1
    diameter: float | None = None  # m, where meaningful
    length: float | None = None  # m, where meaningful
    overall_coefficient: float | None = None  # W/(m^2 K), exchangers only
    coefficient_basis: str | None = None  # process side and source of the coefficient, exchangers only


@dataclass(frozen=True)
class ColumnSizing:
    """Everything the sizing layer found for one column (SI)."""

    hydraulics: tuple[TrayHydraulics, ...]  # one per tray, top first
    flood_fraction: float  # -
    diameter: float  # m, largest tray, rounded up
    rectifying_diameter: float  # m, trays above the feed, rounded up
    stripping_diameter: float  # m, feed tray and below, rounded up
    separate_sections: bool
    efficiency: TrayEfficiency
    real_trays: int
    rectifying_real_trays: int
    height: ColumnHeight
    vessel: VesselDesign
    condenser: ExchangerSizing
    reboiler: ExchangerSizing
    reflux_drum: DrumSizing
    reflux_pump: PumpSizing
    equipment: tuple[EquipmentItem, ...]
    warnings: tuple[str, ...]
    pressure_drops: tuple[TrayPressureDrop, ...] = ()  # one per tray at the shell diameter, top first

    @property
    def tray_pressure_drop(self) -> float:
        """Mean pressure drop per real tray from the sieve-tray hydraulics [Pa]."""
        return sum(t.pressure_drop for t in self.pressure_drops) / len(self.pressure_drops)


def _check_profile(profile: StageProfile) -> None:
    n = profile.stages
    if n < 2:
        raise CaseError("stages", f"{n} equilibrium stage(s)", "at least 2 (one tray and the reboiler)")
    for name in ("P", "L", "V", "x", "y"):
        if len(getattr(profile, name)) != n:
            raise CaseError(f"profile.{name}", f"{len(getattr(profile, name))} entries for {n} stages",
                            "one entry per stage")
    if not 1 <= profile.feed_stage <= n:
        raise CaseError("profile.feed_stage", f"{profile.feed_stage}", f"1 to {n}")
    if min(profile.V[:-1]) <= 0.0 or min(profile.L[:-1]) <= 0.0:
        raise CaseError("profile", "a tray has no liquid or no vapour flow", "positive L and V on every tray")


def _range_warning(record: ValidityRange, values: dict[int, float], policy: OutOfRange,
                   warnings: list[str]) -> None:
    """One warning (or the first error) for all stages whose value lies outside ``record``."""
    outside = {stage: v for stage, v in values.items() if not record.contains(v)}
    if not outside:
        return
    if policy is OutOfRange.RAISE:
        stage, value = next(iter(outside.items()))
        raise CorrelationRangeError(f"{record.correlation} (stage {stage})", record.variable, value,
                                    record.low, record.high, record.unit, record.source)
    warnings.append(f"extrapolated: {record.correlation}: {record.variable} outside {record.low:g} to "
                    f"{record.high:g} {record.unit} at stage(s) {', '.join(map(str, outside))} "
                    f"(from {min(outside.values()):.4g} to {max(outside.values()):.4g})")


def _hydraulics(profile: StageProfile, mixture: SizingProperties, options: SizingOptions,
                warnings: list[str]) -> tuple[TrayHydraulics, ...]:
    trays = []
    for i in range(profile.stages - 1):
        T, P, x, y = profile.T[i], profile.P[i], profile.x[i], profile.y[i]
        trays.append(tray_hydraulics(
            i + 1, profile.L[i] * mixture.molar_mass(x), profile.V[i] * mixture.molar_mass(y),
            mixture.liquid_density(T, P, x), mixture.vapour_density(T, P, y), mixture.surface_tension(T, x),
            options.tray_spacing, options.flood_fraction, options.flooding_method, options.system_factor,
            options.downcomer_area_fraction))
    _range_warning(FLOW_PARAMETER_RANGE, {t.stage: t.flow_parameter for t in trays}, options.out_of_range,
                   warnings)
    return tuple(trays)


def _efficiency(profile: StageProfile, mixture: SizingProperties, options: SizingOptions,
                warnings: list[str]) -> TrayEfficiency:
    if options.tray_efficiency is not None:
        return TrayEfficiency(options.tray_efficiency, "user value", None, None)
    ends = (0, profile.stages - 1)  # top tray and reboiler: the average of the two ends
    mu = sum(mixture.liquid_viscosity(profile.T[i], profile.P[i], profile.x[i]) for i in ends) / 2.0
    alpha = sum(mixture.relative_volatility(profile.T[i], profile.P[i], profile.x[i], options.light_key,
                                            options.heavy_key) for i in ends) / 2.0
    _range_warning(OCONNELL_RANGE, {0: mu * 1e3 * alpha}, options.out_of_range, warnings)
    value = oconnell_efficiency_lockett(mu, alpha)
    if value > 1.0:
        warnings.append(f"O'Connell efficiency {value:.3f} above 1 outside its range: 1.0 used")
        value = 1.0
    return TrayEfficiency(value, "O'Connell (Lockett fit)", mu, alpha)


def _condenser_liquid(profile: StageProfile, mixture: SizingProperties) -> tuple[float, float]:
    """Liquid from the condenser to the drum: volume flow [m^3/s] and density [kg/m^3].

    Reflux and liquid distillate for a total condenser; reflux alone (taken at the top
    tray's liquid composition) for a partial one.
    """
    molar = profile.reflux_ratio * profile.distillate_flow
    x = profile.x[0] if profile.partial_condenser else profile.distillate_composition
    if not profile.partial_condenser:
        molar += profile.distillate_flow
    density = mixture.liquid_density(profile.condenser_temperature, profile.P[0], x)
    return molar * mixture.molar_mass(x) / density, density


def size_column(profile: StageProfile, mixture: SizingProperties, utilities: Sequence[UtilityLevel],
                U_condenser: float | OverallCoefficient, U_reboiler: float | OverallCoefficient,
                options: SizingOptions | None = None, reboiler_type: str = "kettle",
                round_diameter: bool = True) -> ColumnSizing:
    """Size trays, shell, condenser, reboiler, reflux drum and pump for a converged column.

    ``U_condenser`` and ``U_reboiler`` are overall heat-transfer coefficients [W/(m^2 K)], bare
    or with the cost-data row they came from; ``reboiler_type`` is "kettle" or "thermosiphon"
    (see :mod:`disteco.sizing.exchanger_service`). ``round_diameter`` False keeps the diameters
    as flooding requires them (the optimisation model's continuous diameter);
    ``utilities`` are the levels the scenario offers. Raises ``CaseError`` for bad options or
    profile, ``CorrelationRangeError`` when a range is passed under the RAISE policy, and
    ``InfeasibleSpecError`` when no utility level fits. Other range excursions are listed
    in ``warnings``. ``options`` defaults to ``SizingOptions()``.
    """
    options = SizingOptions() if options is None else options
    _check_profile(profile)
    warnings: list[str] = []
    n = profile.stages
    trays = _hydraulics(profile, mixture, options, warnings)
    step = options.diameter_increment

    def rounded(value: float) -> float:
        return round_up(value, step) if round_diameter else value

    diameter = rounded(max(t.diameter for t in trays))
    rectifying = [t.diameter for t in trays if t.stage < profile.feed_stage]
    stripping = [t.diameter for t in trays if t.stage >= profile.feed_stage]
    d_rect = rounded(max(rectifying or stripping))
    d_strip = rounded(max(stripping or rectifying))
    if diameter < 0.6:
        warnings.append(f"column diameter {diameter:.2f} m is below 0.6 m (common practice, no source): "
                        "trays are hard to install; consider packing")

    efficiency = _efficiency(profile, mixture, options, warnings)
    n_real = real_trays(n, efficiency.value)
    n_rect = min(n_real, math.ceil((profile.feed_stage - 1) / efficiency.value - 1e-9))
    bottom = trays[-1]
    sump_flow = profile.L[n - 2] * mixture.molar_mass(profile.x[n - 2]) / bottom.liquid_density
    height = column_height(n_real, options.tray_spacing, diameter, sump_flow, options.sump_residence_time,
                           options.top_space, options.bottom_space, options.skirt_height, options.max_height,
                           options.max_height_to_diameter)
    warnings.extend(height.warnings)
    vessel = design_vessel(diameter, height.tangent_length, max(profile.P), max(profile.T), options.shell_material,
                           options.joint_efficiency, options.corrosion_allowance,
                           options.pressure_margin_fraction, options.pressure_margin_minimum,
                           options.temperature_margin, min(profile.P))
    warnings.extend(vessel.warnings)

    condenser = size_exchanger("condenser", "cooling", profile.condenser_duty, profile.T[0],
                               profile.condenser_temperature, utilities, U_condenser, options.min_approach,
                               options.operating_hours, "fixed_tube_sheet")
    reboiler = size_exchanger("reboiler", "heating", profile.reboiler_duty, profile.T[n - 2], profile.T[n - 1],
                              utilities, U_reboiler, options.min_approach, options.operating_hours, reboiler_type)

    top_design_p = design_pressure(profile.P[0], options.pressure_margin_fraction, options.pressure_margin_minimum)
    top_design_t = max(profile.T[0], profile.condenser_temperature) + options.temperature_margin
    volume_flow, density = _condenser_liquid(profile, mixture)
    drum = size_drum(volume_flow, options.drum_holdup_time, options.drum_fill_fraction,
                     options.drum_length_to_diameter, top_design_p, top_design_t)
    pump = size_pump(volume_flow, density, height.overall + options.pump_head_allowance, options.pump_efficiency,
                     top_design_p, top_design_t, options.out_of_range)
    warnings.extend(pump.warnings)
    if options.separate_sections and d_rect != d_strip:
        warnings.append("separate section diameters: trays sized per section; the shell is taken at the "
                        "larger diameter (a two-diameter shell is not modelled)")

    equipment = _equipment(vessel, diameter, d_rect, d_strip, n_real, n_rect, options, condenser, reboiler,
                           drum, pump, top_design_p, top_design_t)
    weir = weir_height_for(profile.P[0])
    drops = tuple(sieve_tray_pressure_drop(t, diameter, weir) for t in trays)
    return ColumnSizing(trays, options.flood_fraction, diameter, d_rect, d_strip, options.separate_sections,
                        efficiency, n_real, n_rect, height, vessel, condenser, reboiler, drum, pump, equipment,
                        tuple(warnings), drops)


def _equipment(vessel: VesselDesign, diameter: float, d_rect: float, d_strip: float, n_real: int, n_rect: int,
               options: SizingOptions, condenser: ExchangerSizing, reboiler: ExchangerSizing,
               drum: DrumSizing, pump: PumpSizing, top_p: float, top_t: float) -> tuple[EquipmentItem, ...]:
    common = dict(material=vessel.material, material_class=vessel.material_class)
    column_design = dict(design_pressure=vessel.design_pressure, design_temperature=vessel.design_temperature)
    items = [EquipmentItem("column", "vertical pressure vessel", vessel.mass, "kg", "shell and heads mass",
                           **common, **column_design, diameter=diameter, length=vessel.tangent_length)]
    if options.separate_sections and d_rect != d_strip:
        sections = (("trays_rectifying", d_rect, n_rect), ("trays_stripping", d_strip, n_real - n_rect))
    else:
        sections = (("trays", diameter, n_real),)
    items += [EquipmentItem(tag, "sieve tray", d, "m", "tray diameter", **common, **column_design, quantity=count,
                            diameter=d) for tag, d, count in sections if count > 0]
    items += [
        EquipmentItem("condenser", "shell-and-tube heat exchanger", condenser.area, "m^2", "heat-transfer area",
                      **common, design_pressure=top_p, design_temperature=top_t, **_coefficient(condenser)),
        EquipmentItem("reboiler", REBOILER_KINDS.get(reboiler.exchanger_type, "shell-and-tube heat exchanger"),
                      reboiler.area, "m^2", "heat-transfer area", **common, **column_design,
                      **_coefficient(reboiler)),
        EquipmentItem("reflux_drum", "horizontal pressure vessel", drum.volume, "m^3", "volume", **common,
                      design_pressure=drum.design_pressure, design_temperature=drum.design_temperature,
                      diameter=drum.diameter, length=drum.length),
        EquipmentItem("reflux_pump", "centrifugal pump", pump.shaft_power, "W", "shaft power", **common,
                      design_pressure=pump.design_pressure, design_temperature=pump.design_temperature),
    ]
    return tuple(items)


def _coefficient(exchanger: ExchangerSizing) -> dict:
    basis = "; ".join(part for part in (exchanger.process_side, exchanger.coefficient_source) if part)
    return dict(overall_coefficient=exchanger.overall_coefficient, coefficient_basis=basis or "given value")
