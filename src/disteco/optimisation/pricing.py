"""The model's cost basis from the sizing and costing layers, and the sequential price of a design.

``cost_basis_from_data`` sizes and costs a reference design with the sizing and costing
layers and freezes what the equation model treats as constants: the utility levels and
their prices, overall coefficients, tray efficiency (O'Connell), the height allowances, the
condensate's properties and, per item, the numbers that turn a size into an installed cost
(:class:`~disteco.costing.equipment.InstalledCost`: cost-index ratio, bare-module factor with
its material and pressure factors, parallel units). Everything that moves with the decisions
(diameter from flooding at every tray, exchanger areas from duties, shell volume, drum and
pump, cost curves, utilities) stays in the model, built from the same functions.

``price_design`` runs the sequential path (sizing layer, then costing layer) on a solved
design, so the reported breakdown is the one the rest of disteco produces.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

from .._base.errors import InfeasibleSpecError, PropertyError
from ..costing.column import CostSummary, cost_column
from ..costing.data import CostData, HeatTransferCoefficient
from ..costing.from_sizing import cost_input
from ..costing.operating import ELECTRICITY
from ..sizing.column import ColumnSizing, size_column
from ..sizing.exchanger_service import ExchangerService, exchanger_service
from ..sizing.exchangers import OverallCoefficient, profile_utilities
from ..sizing.options import SizingOptions
from ..sizing.utilities import UtilityLevel
from ..stages.results import StageProfile
from .basis import DIAMETER_MAX, CondensateBasis, CostBasis, ExchangerBasis, SeparationProblem, TrayBasis
from .results import DesignEvaluation, ModelCheck, SequentialPrice
from .start import Profile, partial_condenser_split, shortcut, start_profile, starting_configuration


# a needed diameter this far above the model's largest is refused before the search (the estimate's margin)
CAPACITY_MARGIN = 1.05


def total_condensate_temperature(problem: SeparationProblem, y) -> float:
    """Bubble point [K] of the top vapour ``y`` condensed totally at the top pressure.

    Raises :class:`InfeasibleSpecError` when the fitted forms find none within the column's
    range: light components that a total condenser cannot hold at this pressure.
    """
    f = problem.fitted
    try:
        return f.bubble_temperature(problem.top_pressure, y)
    except PropertyError:
        light = ", ".join(f"{f.names[i]} {y[i]:.3g}" for i in sorted(range(f.size), key=lambda i: -y[i])[:3]
                          if y[i] > 1e-3)
        raise InfeasibleSpecError(
            f"the distillate (largest fractions: {light}) cannot be condensed totally at the top pressure of "
            f"{problem.top_pressure / 1e3:.4g} kPa (no bubble point between {f.search_range[0]:.0f} and "
            f"{f.search_range[1]:.0f} K on the column's fitted forms); use "
            "column.condenser = \"partial\" or a higher column.top_pressure") from None


def stage_profile(problem: SeparationProblem, profile: Profile, feed_stage: int) -> StageProfile:
    """A :class:`StageProfile` of a start profile, duties from the fitted enthalpies."""
    f = problem.fitted
    N = len(profile.T)
    R, D = profile.reflux_ratio, profile.distillate_flow
    if problem.partial_condenser:
        T_d, x_d, y_d = partial_condenser_split(problem, profile.y[0], R, profile.x[0])
        h_reflux, h_distillate = f.liquid_enthalpy_of(T_d, x_d), f.vapour_enthalpy_of(T_d, y_d)
    else:
        T_d, y_d = total_condensate_temperature(problem, profile.y[0]) - problem.subcooling, profile.y[0]
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
    service = exchanger_service(profile, mixture)
    condenser, reboiler = (ends.utility for ends in profile_utilities(profile, data.levels, options.min_approach))
    row_c, note_c = data.coefficient_row("condenser", condenser.kind, service.condenser_side)
    row_r, note_r = data.coefficient_row("reboiler", reboiler.kind, service.reboiler_side)
    return ExchangerData(condenser, reboiler, _coefficient(row_c), _coefficient(row_r), (row_c, row_r), service,
                         tuple(note for note in (note_c, note_r) if note))


def _coefficient(row: HeatTransferCoefficient) -> OverallCoefficient:
    return OverallCoefficient(row.u_typical, row.process_side, row.source)


def _size(mixture, data: CostData, profile: StageProfile, options: SizingOptions, exchangers: ExchangerData,
          round_diameter: bool) -> ColumnSizing:
    sizing = size_column(profile, mixture, data.levels, exchangers.condenser_U, exchangers.reboiler_U, options,
                         exchangers.service.reboiler_type, round_diameter)
    return replace(sizing, warnings=sizing.warnings + exchangers.notes)


def check_capacity(reference: StageProfile, sized: ColumnSizing, reflux_floor: float,
                   diameter_max: float = DIAMETER_MAX) -> None:
    """Refuse a column that needs a wider shell than the model allows even at ``reflux_floor`` [-].

    The top vapour is (R + 1) D, and the flooding area grows with the vapour's volume flow, so the
    rectifying section of the ``reference`` (sized as ``sized``) needs at least its diameter times
    sqrt((R_floor + 1) / (R_ref + 1)) at the floor (the minimum reflux, or a given design's reflux;
    the allowable velocity moving a little with the flow parameter). Beyond
    :data:`CAPACITY_MARGIN` x ``diameter_max`` [m] every configuration is infeasible in the model,
    and the search would only spend its time limit on stalled solves (benzene/toluene at
    20,000 kmol/h: 120 s, then "time limit passed before any configuration gave a design").
    """
    needed = sized.rectifying_diameter * math.sqrt((reflux_floor + 1.0) / (reference.reflux_ratio + 1.0))
    if needed > CAPACITY_MARGIN * diameter_max:
        raise InfeasibleSpecError(
            f"the column needs a shell of about {needed:.1f} m diameter at a reflux ratio of {reflux_floor:.4g} "
            f"(flooding, rectifying section), above the {diameter_max:g} m the optimiser allows: split the feed "
            "between parallel columns, or raise column.top_pressure for a denser vapour")


def size_reference(mixture, data: CostData, profile: StageProfile, options: SizingOptions) -> ColumnSizing:
    """Size ``profile`` with the utilities and exchanger data the cost data gives it (sizing layer)."""
    return _size(mixture, data, profile, options, exchanger_data(data, mixture, profile, options),
                 round_diameter=False)


def condensate_basis(ref: ColumnSizing, profile: StageProfile, costs: dict, electricity_price: float) -> CondensateBasis:
    """Reflux drum and pump numbers frozen at the reference sizing ``ref`` of ``profile``."""
    drum, pump = ref.reflux_drum, ref.reflux_pump
    # the condensate: reflux and liquid distillate, or the reflux alone after a partial condenser
    molar_flow = (profile.reflux_ratio + (0.0 if profile.partial_condenser else 1.0)) * profile.distillate_flow
    return CondensateBasis(
        liquid_molar_volume=drum.liquid_volume_flow / molar_flow, liquid_density=pump.density,
        holdup_time=drum.holdup_time, fill_fraction=drum.fill_fraction, pump_efficiency=pump.efficiency,
        head_beyond_shell=pump.head - ref.height.tangent_length, drum=costs["reflux drum"],
        pump=costs["reflux pump"], electricity_price=electricity_price)


def tray_basis(ref: ColumnSizing, options: SizingOptions) -> TrayBasis:
    """The model's tray numbers frozen at the reference sizing ``ref`` (efficiency, allowances) and ``options``."""
    height = ref.height
    return TrayBasis(
        tray_spacing=options.tray_spacing, flooding_fraction=options.flood_fraction,
        efficiency=ref.efficiency.value, extra_height=height.top_space + height.bottom_space + height.sump_liquid,
        flooding_method=options.flooding_method, system_factor=options.system_factor,
        downcomer_fraction=options.downcomer_area_fraction, shells=options.shells,
        max_height_to_diameter=options.max_height_to_diameter)


def cost_basis_from_data(data: CostData, mixture, profile: StageProfile, options: SizingOptions = SizingOptions(),
                         scenario: str | None = None, cost_year: int | None = None) -> tuple[CostBasis, list[str]]:
    """The model's cost basis, with constants frozen at the reference design ``profile``.

    The reference is sized with the diameter flooding requires (not rounded up, as the
    model's) and costed by the costing layer; its items' installed-cost numbers become the
    model's. Returns the basis and the warnings of sizing and costing the reference design.
    """
    scenario = data.settings.default_scenario if scenario is None else data.scenario(scenario).name
    exchangers = exchanger_data(data, mixture, profile, options)
    condenser, reboiler = exchangers.condenser_level, exchangers.reboiler_level
    ref = _size(mixture, data, profile, options, exchangers, round_diameter=False)
    cost = cost_column(data, cost_input(ref, options), scenario, cost_year)
    warnings = list(ref.warnings) + list(cost.warnings)
    costs = {e.item: e.pricing for e in cost.items}
    basis = CostBasis(
        trays=tray_basis(ref, options), shell=costs["column shell"], tray_cost=costs["trays"],
        condenser=ExchangerBasis(exchangers.condenser_U.value, condenser.supply_temperature,
                                 condenser.return_temperature, options.min_approach,
                                 data.price_per_joule(scenario, condenser.name, cost.cost_year), costs["condenser"], "cooling",
                                 condenser.name),
        reboiler=ExchangerBasis(exchangers.reboiler_U.value, reboiler.supply_temperature,
                                reboiler.return_temperature, options.min_approach,
                                data.price_per_joule(scenario, reboiler.name, cost.cost_year), costs["reboiler"], "heating",
                                reboiler.name),
        annualisation=cost.capital_charge_factor, operating_hours=cost.operating_hours_per_year,
        currency=cost.currency, cost_year=cost.cost_year, tray_quantity=data.tray_quantity,
        condensate=condensate_basis(ref, profile, costs, data.price_per_joule(scenario, ELECTRICITY, cost.cost_year)))
    return basis, warnings


def price_design(design: DesignEvaluation, mixture, data: CostData, options: SizingOptions = SizingOptions(),
                 scenario: str | None = None, cost_year: int | None = None,
                 round_diameter: bool = True) -> SequentialPrice:
    """Size and cost a solved design with the sizing and costing layers (drum and pump included).

    ``round_diameter`` False keeps the diameter flooding requires, as the model does. With
    rounding, the result carries a :class:`ModelCheck` of the model's TAC against it.
    """
    exchangers = exchanger_data(data, mixture, design.profile, options)

    def priced(rounded: bool):
        return price_profile(design.profile, mixture, data, options, scenario, cost_year, rounded, exchangers)

    sizing, cost = priced(round_diameter)
    check = None
    if round_diameter and design.cost is not None:
        exact_sizing, exact_cost = priced(False)
        check = ModelCheck(design.tac, cost.tac_per_year, exact_cost.tac_per_year, design.sizes.diameter,
                           sizing.diameter, exact_sizing.diameter)
    return SequentialPrice(sizing, cost, exchangers.rows, check)


def price_profile(profile: StageProfile, mixture, data: CostData, options: SizingOptions,
                  scenario: str | None = None, cost_year: int | None = None, round_diameter: bool = True,
                  exchangers: ExchangerData | None = None) -> tuple[ColumnSizing, CostSummary]:
    """Sizing and cost of a stage profile by the sizing and costing layers (``exchangers`` None: looked up)."""
    exchangers = exchanger_data(data, mixture, profile, options) if exchangers is None else exchangers
    sizing = _size(mixture, data, profile, options, exchangers, round_diameter)
    return sizing, cost_column(data, cost_input(sizing, options), scenario, cost_year)

def reference_profile(problem: SeparationProblem, config, configuration: tuple[int, int] | None = None,
                      reflux: float | None = None):
    """Stage profile of the reference design: ``configuration`` or the search's start, CMO at ``reflux``.

    ``reflux`` None: Gilliland's reflux for the stages.
    """
    stages, feed_stage = configuration or starting_configuration(problem, shortcut(problem), config)
    return stage_profile(problem, start_profile(problem, stages, feed_stage, reflux), feed_stage)
