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
from .._base.units import ATMOSPHERE
from .._base.validity import OutOfRange, ValidityRange
from ..stages.results import StageProfile
from .auxiliaries import DrumSizing, PumpSizing, size_drum, size_pump
from .boiling import reboiler_flux_warning, zuber_peak_heat_flux
from .efficiency import CENTIPOISE, OCONNELL_RANGE, TrayEfficiency, oconnell_efficiency_lockett, real_trays
from .exchanger_service import REBOILER_KINDS
from .exchangers import ExchangerSizing, OverallCoefficient, condensate_freezing_warning, exchanger_ends, size_exchanger
from .materials import low_temperature_warning, material
from .flooding import FLOW_PARAMETER_RANGE
from .tray_pressure_drop import TrayPressureDrop, sieve_tray_pressure_drop, weir_height_for
from .trays import TrayHydraulics, round_up, tray_hydraulics
from .options import SizingOptions
from .shells import ShellSplit, shell_trays, split_stage, vapour_line
from .utilities import UtilityLevel
from .vessel import ColumnHeight, VesselDesign, column_height, design_pressure, design_vessel, least_diameter

# bottom over top pressure of a vacuum column above which its trays' drop is pointed out [-]
# (common practice, no source: packing's drop per stage is a fraction of a tray's)
VACUUM_DROP_RATIO = 3.0
# the same for a column at or above atmospheric pressure, whose trays more than double it [-] (common practice,
# no source)
PRESSURE_DROP_RATIO = 2.0
WIDE_COLUMN = 8.0  # m, above which a single column is rare (common practice, no source)


class SizingProperties(Protocol):
    """What sizing needs of a mixture (``disteco.properties.Mixture`` provides it); SI units."""

    def liquid_density(self, T: float, P: float, x) -> float: ...
    def vapour_density(self, T: float, P: float, y) -> float: ...
    def surface_tension(self, T: float, x) -> float: ...
    def liquid_viscosity(self, T: float, P: float, x) -> float: ...
    def molar_mass(self, z) -> float: ...
    def relative_volatility(self, T: float, P: float, x, light: int, heavy: int, y=None) -> float: ...
    def liquidus(self, x): ...  # where liquid x starts to freeze (properties.solid_liquid.Liquidus) or None


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
    minimum_temperature: float | None = None  # K, lowest operating metal temperature (process or utility side)


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
    diameter_basis: str = "flooding"  # what set the diameter: "flooding" or "height-to-diameter limit"
    flooding_diameter: float = 0.0  # m, largest tray's by flooding alone, not rounded
    split: ShellSplit | None = None  # the upper shell and its connections when there are two shells

    @property
    def shells(self) -> int:
        """Shells in series [-]; with two, ``height`` and ``vessel`` are the lower shell's."""
        return 1 if self.split is None else 2

    @property
    def tallest_shell(self) -> ColumnHeight:
        """Heights of the tallest shell."""
        if self.split is None:
            return self.height
        return max(self.height, self.split.upper_height, key=lambda h: h.tangent_length)

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
                   warnings: list[str], where: str | None = None) -> None:
    """One warning (or the first error) for all stages whose value lies outside ``record``.

    ``where`` names the place of a single column-wide value instead of the stages.
    """
    outside = {stage: v for stage, v in values.items() if not record.contains(v)}
    if not outside:
        return
    if policy is OutOfRange.RAISE:
        stage, value = next(iter(outside.items()))
        raise CorrelationRangeError(f"{record.correlation} ({where or f'stage {stage}'})", record.variable,
                                    value, record.low, record.high, record.unit, record.source)
    place = where or f"stage(s) {', '.join(map(str, outside))}"
    span = (f"{min(outside.values()):.4g}" if len(outside) == 1
            else f"from {min(outside.values()):.4g} to {max(outside.values()):.4g}")
    warnings.append(f"extrapolated: {record.correlation}: {record.variable} outside {record.low:g} to "
                    f"{record.high:g} {record.unit} at {place} ({span})")


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


# O'Connell's mu x alpha over the top of its data from which the console says so [-]; common practice, no source
FAR_BEYOND = 2.0


def _efficiency(profile: StageProfile, mixture: SizingProperties, options: SizingOptions,
                warnings: list[str]) -> TrayEfficiency:
    if options.tray_efficiency is not None:
        return TrayEfficiency(options.tray_efficiency, "user value", None, None)
    ends = (0, profile.stages - 1)  # top tray and reboiler: the average of the two ends
    mu = sum(mixture.liquid_viscosity(profile.T[i], profile.P[i], profile.x[i]) for i in ends) / 2.0
    alpha = sum(mixture.relative_volatility(profile.T[i], profile.P[i], profile.x[i], options.light_key,
                                            options.heavy_key, profile.y[i]) for i in ends) / 2.0
    mu_alpha = mu / CENTIPOISE * alpha  # cP
    _range_warning(OCONNELL_RANGE, {0: mu_alpha}, options.out_of_range, warnings,
                   "the column's mean of top tray and reboiler")
    value = oconnell_efficiency_lockett(mu, alpha)
    beyond = mu_alpha / OCONNELL_RANGE.high
    if beyond >= FAR_BEYOND:
        # said where the console shows it: the efficiency sets the real trays, the height and their cost
        warnings.append(
            f"tray efficiency {value:.2f} from O'Connell's correlation at {beyond:.3g} times the top of its data "
            f"(viscosity x relative volatility {mu_alpha:.3g} cP at the column's mean, data to "
            f"{OCONNELL_RANGE.high:g} cP): the real trays, the column's height and their cost are that uncertain; "
            "set [sizing] tray_efficiency from experience with the service")
    if value > 1.0:
        warnings.append(f"O'Connell efficiency {value:.3f} above 1 outside its range: 1.0 used")
        value = 1.0
    return TrayEfficiency(value, "O'Connell (Lockett fit)", mu, alpha)


def condensate(profile: StageProfile):
    """Mole fractions [-] of the liquid the condenser makes: the distillate for a total condenser, the
    reflux (taken at the top tray's liquid composition) for a partial one."""
    return profile.x[0] if profile.partial_condenser else profile.distillate_composition


def _condenser_liquid(profile: StageProfile, mixture: SizingProperties) -> tuple[float, float]:
    """Liquid from the condenser to the drum: volume flow [m^3/s] and density [kg/m^3].

    Reflux and liquid distillate for a total condenser; reflux alone for a partial one.
    """
    molar = profile.reflux_ratio * profile.distillate_flow
    x = condensate(profile)
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

    efficiency = _efficiency(profile, mixture, options, warnings)
    n_real = real_trays(n, efficiency.value)
    n_rect = min(n_real, math.ceil((profile.feed_stage - 1) / efficiency.value - 1e-9))
    if options.shells == 2 and n_real < 4:
        raise CaseError("sizing.shells", f"{options.shells} shells for {n_real} real trays",
                        "one shell, or two for a column of at least four trays")
    counts = shell_trays(n_real, options.shells)
    split = split_stage(counts[0], efficiency.value, n) if len(counts) == 2 else n - 1
    # liquid held in each shell's bottom: the split tray's (upper shell) and the reboiler feed
    sump_flows = tuple(profile.L[i - 1] * mixture.molar_mass(profile.x[i - 1]) / trays[i - 1].liquid_density
                       for i in ((split, n - 1) if len(counts) == 2 else (n - 1,)))
    slender = max(least_diameter(k * options.tray_spacing, options.top_space, options.bottom_space, flow,
                                 options.sump_residence_time, options.max_height_to_diameter)
                  for k, flow in zip(counts, sump_flows))
    flooding = max(t.diameter for t in trays)
    diameter = rounded(max(flooding, slender))
    basis = "flooding" if flooding >= slender else "height-to-diameter limit"
    rectifying = [t.diameter for t in trays if t.stage < profile.feed_stage]
    stripping = [t.diameter for t in trays if t.stage >= profile.feed_stage]
    d_rect = rounded(max(max(rectifying or stripping), slender))
    d_strip = rounded(max(max(stripping or rectifying), slender))
    if diameter < 0.6:
        warnings.append(f"column diameter {diameter:.2f} m is below 0.6 m (common practice, no source): "
                        "trays are hard to install; consider packing")
    elif diameter > WIDE_COLUMN:
        # a depropaniser at 15,000 kmol/h came out 10.9 m wide in one shell, 88 % of its capital in a vessel
        # whose pressure factor was 20, without a word
        warnings.append(f"column diameter {diameter:.2f} m is above {WIDE_COLUMN:g} m (common practice, no "
                        "source): few columns are built wider (transport, tray support, the shell's wall under "
                        "pressure); consider two columns in parallel, which disteco does not price")
    top, bottom = profile.P[0], profile.P[-1]
    if top < ATMOSPHERE and bottom > VACUUM_DROP_RATIO * top:
        # a glycol column at 2 kPa reached 21.6 kPa in its sump through 37 trays, with no word about it
        warnings.append(f"the trays' pressure drop takes the bottom of this vacuum column to {bottom / 1e3:.3g} kPa, "
                        f"{bottom / top:.1f} x the top's {top / 1e3:.3g} kPa, and its temperature up with it (a "
                        "dearer heating level, a heat-sensitive bottoms); vacuum columns are usually packed, with "
                        "a fraction of a tray's drop per stage (common practice, no source); disteco designs trays "
                        "only")
    elif top >= ATMOSPHERE and bottom > PRESSURE_DROP_RATIO * top:
        # an acetone/water column at 1.2 bar went to 282 kPa through 170 trays, which raised its reflux from
        # R 37.5 to 79 on thermo, with no word on the drop
        warnings.append(f"the trays' pressure drop takes the bottom of this column to {bottom / 1e3:.4g} kPa, "
                        f"{bottom / top:.1f} x the top's {top / 1e3:.4g} kPa, and its temperatures up with it (a "
                        "dearer heating level; for most mixtures a lower relative volatility, which asks for more "
                        "reflux); packing takes a fraction of a tray's drop per stage (common practice, no source); "
                        "disteco designs trays only")

    def shell(trays_in: int, sump_flow: float, first: int, last: int) -> tuple[ColumnHeight, VesselDesign]:
        name = "" if len(counts) == 1 else "upper shell" if first == 0 else "lower shell"
        height = column_height(trays_in, options.tray_spacing, diameter, sump_flow, options.sump_residence_time,
                               options.top_space, options.bottom_space, options.skirt_height, options.max_height,
                               options.max_height_to_diameter, name)
        warnings.extend(height.warnings)
        P, T = profile.P[first:last], profile.T[first:last]
        vessel = design_vessel(diameter, height.tangent_length, max(P), max(T), options.shell_material,
                               options.joint_efficiency, options.corrosion_allowance,
                               options.pressure_margin_fraction, options.pressure_margin_minimum,
                               options.temperature_margin, min(P), min(T))
        warnings.extend(vessel.warnings)
        return height, vessel

    height, vessel = shell(counts[-1], sump_flows[-1], split if len(counts) == 2 else 0, n)
    top_height = height
    if len(counts) == 2:
        top_height, top_vessel = shell(counts[0], sump_flows[0], 0, split)

    (c_name, c_service, c_in, c_out), (r_name, r_service, r_in, r_out) = exchanger_ends(profile)
    condenser = size_exchanger(c_name, c_service, profile.condenser_duty, c_in, c_out, utilities, U_condenser,
                               options.min_approach, options.operating_hours, "fixed_tube_sheet")
    reboiler = size_exchanger(r_name, r_service, profile.reboiler_duty, r_in, r_out, utilities, U_reboiler,
                              options.min_approach, options.operating_hours, reboiler_type)

    freezing = condensate_freezing_warning(mixture.liquidus(condensate(profile)), condenser.utility)
    warnings.extend([freezing] if freezing else [])

    boiling = trays[-1]  # the liquid the reboiler boils and the vapour above it
    latent = profile.reboiler_duty / (profile.V[n - 1] * mixture.molar_mass(profile.y[n - 1]))
    peak = zuber_peak_heat_flux(latent, boiling.liquid_density, boiling.vapour_density, boiling.surface_tension)
    flux = reboiler_flux_warning(profile.reboiler_duty, reboiler.area, peak, reboiler.utility.name)
    warnings.extend([flux] if flux else [])

    top_design_p = design_pressure(profile.P[0], options.pressure_margin_fraction, options.pressure_margin_minimum)
    top_design_t = max(profile.T[0], profile.condenser_temperature) + options.temperature_margin
    volume_flow, density = _condenser_liquid(profile, mixture)
    drum = size_drum(volume_flow, options.drum_holdup_time, options.drum_fill_fraction,
                     options.drum_length_to_diameter, top_design_p, top_design_t)
    pump = size_pump(volume_flow, density, top_height.overall + options.pump_head_allowance,
                     options.pump_efficiency, top_design_p, top_design_t, options.out_of_range)
    warnings.extend(pump.warnings)
    shells = None
    if len(counts) == 2:
        shells = _split(profile, mixture, options, trays, counts, split, sump_flows[0], top_height, top_vessel,
                        height)
        warnings.extend(shells.transfer_pump.warnings)
    if options.separate_sections and d_rect != d_strip and options.shells == 2:
        warnings.append("separate section diameters: trays sized per section; two shells are taken at the "
                        "larger diameter (a swaged shell is priced for one shell only)")

    equipment = _equipment(vessel, diameter, d_rect, d_strip, n_real, n_rect, options, condenser, reboiler,
                           drum, pump, top_design_p, top_design_t, shells)
    cold = low_temperature_warning(material(vessel.material), {
        item.tag.replace("_", " "): item.minimum_temperature for item in equipment
        if item.minimum_temperature is not None and item.kind != "sieve tray"})
    warnings.extend([cold] if cold else [])
    weir = weir_height_for(profile.P[0])
    drops = tuple(sieve_tray_pressure_drop(t, diameter, weir) for t in trays)
    return ColumnSizing(trays, options.flood_fraction, diameter, d_rect, d_strip, options.separate_sections,
                        efficiency, n_real, n_rect, height, vessel, condenser, reboiler, drum, pump, equipment,
                        tuple(warnings), drops, basis, flooding, shells)


def _split(profile: StageProfile, mixture: SizingProperties, options: SizingOptions, trays, counts, split: int,
           liquid_flow: float, upper_height: ColumnHeight, upper_vessel: VesselDesign,
           lower_height: ColumnHeight) -> ShellSplit:
    """The upper shell, the transfer pump (upper bottom to lower top) and the vapour line of two shells."""
    liquid = trays[split - 1]
    pump = size_pump(liquid_flow, liquid.liquid_density, lower_height.overall + options.pump_head_allowance,
                     options.pump_efficiency, upper_vessel.design_pressure,
                     upper_vessel.design_temperature, options.out_of_range)
    line = vapour_line(trays[split].vapour_volume_flow, lower_height.overall)
    return ShellSplit(counts[0], counts[1], split, upper_height, upper_vessel, pump, line)


def _equipment(vessel: VesselDesign, diameter: float, d_rect: float, d_strip: float, n_real: int, n_rect: int,
               options: SizingOptions, condenser: ExchangerSizing, reboiler: ExchangerSizing,
               drum: DrumSizing, pump: PumpSizing, top_p: float, top_t: float,
               split: ShellSplit | None) -> tuple[EquipmentItem, ...]:
    common = dict(material=vessel.material, material_class=vessel.material_class)
    coldest_shell = min(vessel.minimum_temperature, split.upper_vessel.minimum_temperature) if split \
        else vessel.minimum_temperature
    column_design = dict(design_pressure=vessel.design_pressure, design_temperature=vessel.design_temperature,
                         minimum_temperature=coldest_shell)
    # the condensate leaves the condenser at its own temperature; the exchangers' metal also meets the utility
    condensate = min(condenser.process_in, condenser.process_out)
    cold_condenser = min(condensate, condenser.utility_in, condenser.utility_out)
    cold_reboiler = min(reboiler.process_in, reboiler.process_out, reboiler.utility_in, reboiler.utility_out)
    shells = [("column", vessel)] if split is None else [("column", split.upper_vessel), ("column_lower", vessel)]
    items = [EquipmentItem(tag, "vertical pressure vessel", v.mass, "kg", "shell and heads mass", **common,
                           design_pressure=v.design_pressure, design_temperature=v.design_temperature,
                           minimum_temperature=v.minimum_temperature, diameter=diameter, length=v.tangent_length)
             for tag, v in shells]
    if options.separate_sections and d_rect != d_strip:
        sections = (("trays_rectifying", d_rect, n_rect), ("trays_stripping", d_strip, n_real - n_rect))
    else:
        sections = (("trays", diameter, n_real),)
    items += [EquipmentItem(tag, "sieve tray", d, "m", "tray diameter", **common, **column_design, quantity=count,
                            diameter=d) for tag, d, count in sections if count > 0]
    items += [
        EquipmentItem("condenser", "shell-and-tube heat exchanger", condenser.area, "m^2", "heat-transfer area",
                      **common, design_pressure=top_p, design_temperature=top_t, minimum_temperature=cold_condenser,
                      **_coefficient(condenser)),
        EquipmentItem("reboiler", REBOILER_KINDS.get(reboiler.exchanger_type, "shell-and-tube heat exchanger"),
                      reboiler.area, "m^2", "heat-transfer area", **common,
                      **(column_design | dict(minimum_temperature=cold_reboiler)), **_coefficient(reboiler)),
        EquipmentItem("reflux_drum", "horizontal pressure vessel", drum.volume, "m^3", "volume", **common,
                      design_pressure=drum.design_pressure, design_temperature=drum.design_temperature,
                      minimum_temperature=condensate, diameter=drum.diameter, length=drum.length),
        EquipmentItem("reflux_pump", "centrifugal pump", pump.shaft_power, "W", "shaft power", **common,
                      design_pressure=pump.design_pressure, design_temperature=pump.design_temperature,
                      minimum_temperature=condensate),
    ]
    if split is not None:
        transfer, line = split.transfer_pump, split.vapour_line
        upper = split.upper_vessel
        items += [
            EquipmentItem("transfer_pump", "centrifugal pump", transfer.shaft_power, "W", "shaft power", **common,
                          design_pressure=transfer.design_pressure, design_temperature=transfer.design_temperature,
                          minimum_temperature=column_design["minimum_temperature"]),
            EquipmentItem("vapour_line", "process pipe", line.surface, "m^2", "pipe surface (pi D L)", **common,
                          design_pressure=upper.design_pressure, design_temperature=vessel.design_temperature,
                          minimum_temperature=column_design["minimum_temperature"], diameter=line.diameter,
                          length=line.length),
        ]
    return tuple(items)


def _coefficient(exchanger: ExchangerSizing) -> dict:
    basis = "; ".join(part for part in (exchanger.process_side, exchanger.coefficient_source) if part)
    return dict(overall_coefficient=exchanger.overall_coefficient, coefficient_basis=basis or "given value")
