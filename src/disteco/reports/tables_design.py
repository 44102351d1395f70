"""The parts of one design run that the reports draw on, the summary table and the list of plots."""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

from ..costing import CostData, CostSummary, HeatTransferCoefficient
from ..optimisation.results import DesignEvaluation, OptimumDesign
from ..properties import BinaryDiagram, MixtureSummary
from ..sizing import ColumnSizing
from ..stages.binary import EquilibriumCurve, SteppedColumn
from ..stages.results import StageProfile
from .choices import margin_items
from .plots import composition_profile_plot, stages_duty_plot, tac_curve_plot, temperature_profile_plot, xy_plot
from .tables import MONEY, Cell, Column, Plot, Table, design_items, quantity_table, text
from .tables_scenarios import CrossTable

if TYPE_CHECKING:  # annotations only; importing them would pull in the solver interfaces
    from ..optimisation.margin import ControlMargin
    from ..optimisation.thermo_checks import ThermoChecks


def _extra_tac(optimum: OptimumDesign | None, tac: float) -> float | None:
    """A given design's TAC ``tac`` above ``optimum``'s [currency/yr]; both are the sequential prices."""
    if optimum is None or optimum.sequential is None:
        return None
    return tac - optimum.sequential.cost.tac_per_year


@dataclass(frozen=True)
class GivenUnderPrices:
    """A given design, its column as sized, priced under one scenario's utility prices, and the optimum
    under the same prices (None when no comparison was asked for)."""

    scenario: str
    cost: CostSummary
    optimum: OptimumDesign | None = None

    @property
    def extra_tac(self) -> float | None:
        """The given design's TAC above the optimum's [currency/yr]."""
        return _extra_tac(self.optimum, self.cost.tac_per_year)


@dataclass(frozen=True)
class GivenDesignReport:
    """A priced given design: the decisions held and the optimum under the same prices to compare with.

    The reflux ratio, stages and feed stage are held; the distillate flow is the model's choice
    that meets both specifications at least cost. ``optimum`` is None when no comparison was asked for.
    ``scenarios``: with more than one price scenario, the design under each (the first the headline's).
    """

    reflux_ratio: float  # [-]
    stages: int  # equilibrium stages, reboiler included
    feed_stage: int  # from the top
    optimum: OptimumDesign | None = None
    scenarios: tuple[GivenUnderPrices, ...] = ()

    def extra_tac(self, tac: float) -> float | None:
        """The given design's TAC ``tac`` above the optimum's [currency/yr]; both are the sequential prices."""
        return _extra_tac(self.optimum, tac)


def given_scenarios_table(given: GivenDesignReport) -> Table:
    """The given design under each price scenario's prices beside that scenario's optimum (one row each)."""
    currency = given.scenarios[0].cost.currency
    columns = (text("Scenario", 22.0), Column("Utilities", f"{currency}/year", MONEY, 16.0),
               Column("TAC", f"{currency}/year", MONEY, 16.0), Column("Optimum's reflux ratio", "-", "0.000"),
               Column("Optimum's stages", "-", "0", 10.0), Column("Optimum's feed stage", "-", "0", 10.0),
               Column("Optimum's TAC", f"{currency}/year", MONEY, 16.0),
               Column("Given design's extra TAC", f"{currency}/year", MONEY, 16.0))
    rows = []
    for under in given.scenarios:
        best, extra = (under.optimum.best, under.extra_tac) if under.extra_tac is not None else (None, None)
        rows.append((under.scenario, under.cost.utilities_per_year, under.cost.tac_per_year)
                    + ((best.reflux_ratio, best.stages, best.feed_stage, under.cost.tac_per_year - extra, extra)
                       if best is not None else (None,) * 5))  # empty: not compared (--no-compare)
    return Table("Given design under each price scenario", columns, tuple(rows))


@dataclass(frozen=True)
class ReportParts:
    """The typed results the reports draw on; a part that is None (or empty) leaves its sheet or chart out.

    ``profile``: converged stage profile of the chosen design; ``curve``, ``stepped``: the
    binary (key-pair) equilibrium curve and McCabe-Thiele construction; ``sizing``,
    ``cost``: the sized and priced column, ``cost_data`` the data it was priced with and
    ``coefficients`` the heat-transfer coefficient rows the exchangers were sized with;
    ``optimum``: the optimiser's result; ``scenarios``: (name, optimum) per price scenario;
    ``cross``: each scenario's design under every scenario's prices; ``tac_curves``:
    (scenario, designs along the reflux ratio with stages and feed re-optimised); ``checks``:
    the reported design on thermo (verification, energy-balance minimum reflux, fit check),
    ``scenario_checks`` (scenario, checks) of every scenario's optimum; ``margins`` (scenario,
    control margin: the least R/Rmin and, where it binds, the optimum without it); ``given``:
    what a priced given design held and the optimum it is compared with.
    """

    profile: StageProfile | None = None
    curve: EquilibriumCurve | BinaryDiagram | None = None
    stepped: SteppedColumn | None = None
    sizing: ColumnSizing | None = None
    cost: CostSummary | None = None
    cost_data: CostData | None = None
    coefficients: tuple[HeatTransferCoefficient, ...] = ()
    optimum: OptimumDesign | None = None
    scenarios: tuple[tuple[str, OptimumDesign], ...] = ()
    cross: CrossTable | None = None
    tac_curves: tuple[tuple[str, tuple[DesignEvaluation, ...]], ...] = ()
    checks: ThermoChecks | None = None
    scenario_checks: tuple[tuple[str, ThermoChecks], ...] = ()
    margins: tuple[tuple[str, ControlMargin], ...] = ()
    given: GivenDesignReport | None = None  # set when a given design was priced

    @property
    def margin(self) -> ControlMargin | None:
        """The control margin of the reported (first) scenario."""
        return self.margins[0][1] if self.margins else None

    @property
    def scenarios_run(self) -> tuple[str, ...]:
        """The scenarios the run priced: every optimised one, or those a given design was priced in."""
        if self.scenarios:
            return tuple(name for name, _ in self.scenarios)
        if self.given is not None and self.given.scenarios:
            return tuple(under.scenario for under in self.given.scenarios)
        return (self.cost.scenario,) if self.cost is not None else ()


def optimum_parts(optimum: OptimumDesign, **others) -> ReportParts:
    """ReportParts of an optimiser result: the best design's profile and, where the optimum was
    priced by the sizing and costing layers, its sizing and cost; ``others`` fill the other fields."""
    sequential = optimum.sequential
    return ReportParts(profile=optimum.best.profile, sizing=sequential.sizing if sequential else None,
                       cost=sequential.cost if sequential else None, optimum=optimum,
                       coefficients=sequential.coefficients if sequential else (), **others)


def summary_table(title: str, parts: ReportParts, minimum_reflux: float | None = None) -> Table:
    """The chosen design in one table: case title, then the headline numbers that are present.

    ``minimum_reflux`` [-]: the stage design's constant-molar-overflow minimum on thermo, the one the
    console gives (else the optimiser's own on its fitted forms); the ratio is the reported reflux
    ratio's (ethanol-water's Summary gave 1.204, the model's reflux over the model's minimum, two rows
    below a reported reflux ratio of 1.282 and beside the console's 1.23).
    """
    items: list[tuple[str, Cell]] = [("Case title", title)]
    if parts.profile is not None:
        items += design_items(parts.profile)[:7]
    if parts.optimum is not None:
        o = parts.optimum
        minimum = minimum_reflux or o.minimum_reflux_ratio
        reflux = parts.profile.reflux_ratio if parts.profile is not None else o.best.reflux_ratio
        items += [("Minimum reflux ratio, constant molar overflow [-]", minimum),
                  ("Reflux ratio / minimum [-]", reflux / minimum),
                  ("Optimiser status", o.solver.status)]
        items += margin_items(parts.margin, o.best.cost.currency)
    if parts.sizing is not None:
        s = parts.sizing
        items += [("Column diameter [m]", s.diameter), ("Real trays [-]", s.real_trays),
                  ("Tangent-to-tangent length [m]", s.height.tangent_length),
                  ("Condenser area [m^2]", s.condenser.area), ("Reboiler area [m^2]", s.reboiler.area)]
    if parts.cost is not None:
        c = parts.cost
        items += [("Price scenario", c.scenario), (f"Installed capital [{c.currency}]", c.capital_installed),
                  (f"Utilities [{c.currency}/year]", c.utilities_per_year),
                  (f"Total annualised cost [{c.currency}/year]", c.tac_per_year)]
        extra = parts.given.extra_tac(c.tac_per_year) if parts.given is not None else None
        if extra is not None:
            best = parts.given.optimum.best
            items += [(f"Optimum's TAC, same prices [{c.currency}/year]", c.tac_per_year - extra),
                      ("Optimum's reflux ratio [-]", best.reflux_ratio), ("Optimum's stages [-]", best.stages),
                      (f"Given design's extra TAC [{c.currency}/year]", extra)]
    return quantity_table("Given design" if parts.given is not None else "Chosen design", items)


def run_table(parts: ReportParts, options: tuple[tuple[str, object], ...],
              given: DesignEvaluation | None = None) -> Table:
    """What was run: the mode (with the ``given`` design priced), the price scenarios run, the cost
    year and the optimiser options set."""
    scenarios = ", ".join(parts.scenarios_run) or "none priced"
    items: list[tuple[str, Cell]] = [
        ("Mode", "a given design priced" if given is not None else "lowest-TAC design searched for each price scenario"),
        ("Price scenarios run", scenarios)]
    if parts.cost is not None:
        items.append(("Cost year of capital and utilities [year]", parts.cost.cost_year))
    if given is not None:
        items += [("Given reflux ratio [-]", given.reflux_ratio), ("Given stages, reboiler included [-]", given.stages),
                  ("Given feed stage, from the top [-]", given.feed_stage)]
    items += [(f"Optimiser option {name}", value if isinstance(value, (int, float)) and not isinstance(value, bool)
               else str(value)) for name, value in options]
    if not options:
        items.append(("Optimiser options", "defaults"))
    return quantity_table("Run", items)


def design_plots(mixture: MixtureSummary, parts: ReportParts) -> tuple[Plot, ...]:
    """Every plot whose data is present, in a fixed order, with distinct names."""
    names = tuple(c.name for c in mixture.components)
    plots: list[Plot] = []
    if parts.profile is not None:
        plots += [temperature_profile_plot(parts.profile), composition_profile_plot(parts.profile, names)]
    if parts.curve is not None:
        plots.append(xy_plot(parts.curve, mixture, parts.stepped, parts.profile))
    if parts.optimum is not None and any(designs for _, designs in parts.tac_curves):
        minimum = parts.checks.minimum if parts.checks is not None else None
        energy_balance = minimum.reflux_ratio if minimum is not None else None
        plots += [tac_curve_plot(parts.tac_curves, parts.optimum, energy_balance),
                  stages_duty_plot(parts.tac_curves, parts.optimum, energy_balance)]
    return tuple(plots)
