"""The model's cost basis from the sizing and costing layers, and the sequential price of a design.

``cost_basis_from_data`` sizes a reference design with the sizing layer and freezes what
the equation model treats as constants: the utility levels and their prices, overall
coefficients, tray efficiency (O'Connell), downcomer fraction, the height allowances, the
material and pressure factors, the cost-index ratio and the capital charge. Everything
that moves with the decisions (diameter from flooding at every tray, exchanger areas
from duties, shell volume, cost curves, utilities) stays in the model.

``price_design`` runs the sequential path (sizing layer, then costing layer) on a solved
design, so the reported breakdown is the one the rest of disteco produces.
"""

from __future__ import annotations

from dataclasses import dataclass, replace

from .._base.units import ATMOSPHERE
from ..costing.column import REBOILER_TYPES, TRAY_TYPES, cost_column, resolve_cost_year
from ..costing.curves import bare_module_factor
from ..costing.data import CostData, HeatTransferCoefficient
from ..costing.equipment import pressure_factor_of
from ..costing.operating import ELECTRICITY
from ..costing.from_sizing import cost_input
from ..sizing.column import ColumnSizing, size_column
from ..sizing.exchanger_service import ExchangerService, exchanger_service
from ..sizing.exchangers import OverallCoefficient, choose_utility
from ..sizing.utilities import UtilityLevel
from ..sizing.flooding import lygeros_magoulas_constants
from ..sizing.options import SizingOptions
from ..stages.results import StageProfile
from .basis import CondensateBasis, CostBasis, CostCurve, ExchangerBasis, SeparationProblem, TrayBasis
from .results import DesignEvaluation, SequentialPrice
from .start import Profile, partial_condenser_split

SHELL, DRUM, PUMP = "vertical_vessel", "horizontal_vessel", "centrifugal_pump"
CONDENSER = "fixed_tube_sheet_exchanger"
EXCHANGER_MATERIAL = "CS/CS"


def stage_profile(problem: SeparationProblem, profile: Profile, feed_stage: int) -> StageProfile:
    """A :class:`StageProfile` of a start profile, duties from the fitted enthalpies."""
    f = problem.fitted
    N = len(profile.T)
    R, D = profile.reflux_ratio, profile.distillate_flow
    if problem.partial_condenser:
        T_d, x_d, y_d = partial_condenser_split(problem, profile.y[0], R)
        h_reflux, h_distillate = f.liquid_enthalpy_of(T_d, x_d), f.vapour_enthalpy_of(T_d, y_d)
    else:
        T_d, y_d = f.bubble_temperature(problem.top_pressure, profile.y[0]) - problem.subcooling, profile.y[0]
        h_reflux = h_distillate = f.liquid_enthalpy_of(T_d, profile.y[0])
    q_c = profile.V[0] * f.vapour_enthalpy_of(profile.T[0], profile.y[0]) - R * D * h_reflux - D * h_distillate
    q_r = profile.V[-1] * (f.vapour_enthalpy_of(profile.T[-1], profile.y[-1])
                           - f.liquid_enthalpy_of(profile.T[-1], profile.x[-1]))
    return StageProfile(
        T=tuple(map(float, profile.T)), P=tuple(problem.pressure(j) for j in range(1, N + 1)),
        L=tuple(map(float, profile.L)), V=tuple(map(float, profile.V)),
        x=tuple(tuple(map(float, r)) for r in profile.x), y=tuple(tuple(map(float, r)) for r in profile.y),
        feed_stage=feed_stage, reflux_ratio=R, distillate_flow=D,
        bottoms_flow=float(profile.L[-1]), distillate_composition=tuple(map(float, y_d)),
        bottoms_composition=tuple(map(float, profile.x[-1])), condenser_duty=float(q_c), reboiler_duty=float(q_r),
        condenser_temperature=float(T_d), partial_condenser=problem.partial_condenser, model="cmo")


@dataclass(frozen=True)
class ExchangerData:
    """Utility levels, overall coefficients (with their cost-data rows) and reboiler type of a design."""

    condenser_level: UtilityLevel
    reboiler_level: UtilityLevel
    condenser_U: OverallCoefficient
    reboiler_U: OverallCoefficient
    rows: tuple[HeatTransferCoefficient, ...]  # the condenser's and the reboiler's rows
    service: ExchangerService
    notes: tuple[str, ...]  # coefficient rows replaced for want of a matching process side


def exchanger_data(data: CostData, mixture, profile: StageProfile, options: SizingOptions) -> ExchangerData:
    """Utility levels, then the U rows looked up by service, process side and utility kind."""
    n = profile.stages
    service = exchanger_service(profile, mixture)
    condenser = choose_utility(data.levels, "cooling", profile.T[0], profile.condenser_temperature,
                               options.min_approach, "condenser")
    reboiler = choose_utility(data.levels, "heating", profile.T[n - 2], profile.T[n - 1],
                              options.min_approach, "reboiler")
    row_c, note_c = data.coefficient_row("condenser", condenser.kind, service.condenser_side)
    row_r, note_r = data.coefficient_row("reboiler", reboiler.kind, service.reboiler_side)
    return ExchangerData(condenser, reboiler, _coefficient(row_c), _coefficient(row_r), (row_c, row_r), service,
                         tuple(note for note in (note_c, note_r) if note))


def _coefficient(row: HeatTransferCoefficient) -> OverallCoefficient:
    return OverallCoefficient(row.u_typical, row.process_side, row.source)


def size_reference(mixture, data: CostData, profile: StageProfile, options: SizingOptions,
                   round_diameter: bool = True) -> ColumnSizing:
    """Size ``profile`` with the utilities and coefficients the cost data offers (sizing layer)."""
    exchangers = exchanger_data(data, mixture, profile, options)
    return _size(mixture, data, profile, options, exchangers, round_diameter)


def _size(mixture, data: CostData, profile: StageProfile, options: SizingOptions, exchangers: ExchangerData,
          round_diameter: bool) -> ColumnSizing:
    sizing = size_column(profile, mixture, data.levels, exchangers.condenser_U, exchangers.reboiler_U, options,
                         exchangers.service.reboiler_type, round_diameter)
    return replace(sizing, warnings=sizing.warnings + exchangers.notes)


def _curve(data: CostData, item: str, name: str, index: float, installed_factor: float) -> CostCurve:
    c = data.curve(item)
    return CostCurve(name, c.k1, c.k2, c.k3, c.size_unit.replace("m3", "m^3").replace("m2", "m^2"), c.size_min,
                     c.size_max, index / c.base_index, installed_factor, c.source)


def _installed_factor(data: CostData, item: str, material: str, pressure_gauge: float, warnings: list[str],
                      diameter: float | None = None, label: str | None = None) -> float:
    """Bare-module factor F_BM = B1 + B2 F_M F_P of ``item`` as the costing layer computes it [-]."""
    c = data.curve(item)
    f_p = pressure_factor_of(data, c.pressure_group, pressure_gauge, diameter, label or item, warnings)
    bare = data.bare_module(c.bare_module_group)
    return bare_module_factor(bare.b1, bare.b2, data.material_factor(c.material_group, material).factor, f_p)


def condensate_basis(data: CostData, ref: ColumnSizing, profile: StageProfile, scenario: str, index: float,
                     warnings: list[str]) -> CondensateBasis:
    """Reflux drum and pump numbers frozen at the reference sizing ``ref`` of ``profile``."""
    drum, pump = ref.reflux_drum, ref.reflux_pump
    gauge = ref.vessel.design_pressure
    inputs = cost_input(ref)
    # the condensate: reflux and liquid distillate, or the reflux alone after a partial condenser
    molar_flow = (profile.reflux_ratio + (0.0 if profile.partial_condenser else 1.0)) * profile.distillate_flow
    return CondensateBasis(
        liquid_molar_volume=drum.liquid_volume_flow / molar_flow, liquid_density=pump.density,
        holdup_time=drum.holdup_time, fill_fraction=drum.fill_fraction, pump_efficiency=pump.efficiency,
        head_beyond_shell=pump.head - ref.height.tangent_length,
        drum=_curve(data, DRUM, "reflux drum", index,
                    _installed_factor(data, DRUM, inputs.drum_material, gauge, warnings, drum.diameter, "reflux drum")),
        pump=_curve(data, PUMP, "reflux pump", index,
                    _installed_factor(data, PUMP, inputs.pump_material, gauge, warnings, label="reflux pump")),
        electricity_price=data.price_per_joule(scenario, ELECTRICITY))


def cost_basis_from_data(data: CostData, mixture, profile: StageProfile, options: SizingOptions = SizingOptions(),
                         scenario: str | None = None, cost_year: int | None = None) -> tuple[CostBasis, list[str]]:
    """The model's cost basis, with constants frozen at the reference design ``profile``.

    Returns the basis and the warnings of sizing the reference design.
    """
    warnings: list[str] = []
    scenario = data.settings.default_scenario if scenario is None else data.scenario(scenario).name
    year, index = resolve_cost_year(data, cost_year)
    exchangers = exchanger_data(data, mixture, profile, options)
    condenser, reboiler = exchangers.condenser_level, exchangers.reboiler_level
    u_c, u_r = exchangers.condenser_U.value, exchangers.reboiler_U.value
    ref = _size(mixture, data, profile, options, exchangers, True)
    warnings.extend(ref.warnings)
    vessel = ref.vessel
    height = ref.height
    trays = TrayBasis(
        tray_spacing=options.tray_spacing, flooding_fraction=options.flood_fraction,
        downcomer_fraction=max(t.downcomer_fraction for t in ref.hydraulics),
        efficiency=ref.efficiency.value, extra_height=height.top_space + height.bottom_space + height.sump_liquid,
        capacity=tuple(c * options.system_factor if k < 2 else c
                       for k, c in enumerate(lygeros_magoulas_constants(options.tray_spacing))))
    top_gauge = max(profile.P[0] - ATMOSPHERE, 0.0)
    cond_gauge = max(top_gauge, (condenser.pressure or ATMOSPHERE) - ATMOSPHERE)
    reb_gauge = max(vessel.design_pressure, (reboiler.pressure or ATMOSPHERE) - ATMOSPHERE)
    basis = CostBasis(
        trays=trays,
        shell=_curve(data, SHELL, "column shell", index,
                     _installed_factor(data, SHELL, vessel.material_class, vessel.design_pressure, warnings,
                                       ref.diameter, "column shell")),
        tray_cost=_curve(data, TRAY_TYPES[options.tray_type], "trays", index,
                         _installed_factor(data, TRAY_TYPES[options.tray_type], vessel.material_class, 0.0, warnings,
                                           label="trays")),
        condenser=ExchangerBasis(u_c, condenser.supply_temperature, condenser.return_temperature,
                                 options.min_approach, data.price_per_joule(scenario, condenser.name),
                                 _curve(data, CONDENSER, "condenser", index,
                                        _installed_factor(data, CONDENSER, EXCHANGER_MATERIAL, cond_gauge, warnings))),
        reboiler=ExchangerBasis(u_r, reboiler.supply_temperature, reboiler.return_temperature,
                                options.min_approach, data.price_per_joule(scenario, reboiler.name),
                                _curve(data, REBOILER_TYPES[exchangers.service.reboiler_type], "reboiler", index,
                                       _installed_factor(data, REBOILER_TYPES[exchangers.service.reboiler_type],
                                                         EXCHANGER_MATERIAL, reb_gauge, warnings))),
        annualisation=data.settings.capital_charge_factor(),
        operating_hours=data.settings.operating_hours_per_year,
        currency=data.settings.currency, cost_year=year, tray_quantity=data.tray_quantity,
        condensate=condensate_basis(data, ref, profile, scenario, index, warnings))
    return basis, warnings


def price_design(design: DesignEvaluation, mixture, data: CostData, options: SizingOptions = SizingOptions(),
                 scenario: str | None = None, cost_year: int | None = None) -> SequentialPrice:
    """Size and cost a solved design with the sizing and costing layers (drum and pump included)."""
    exchangers = exchanger_data(data, mixture, design.profile, options)
    sizing = _size(mixture, data, design.profile, options, exchangers, True)
    cost = cost_column(data, cost_input(sizing, options.tray_type), scenario, cost_year)
    return SequentialPrice(sizing, cost, exchangers.rows)

