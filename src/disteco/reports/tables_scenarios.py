"""Tables and plots of the optimiser's results: the optimum, scenario comparison, cross table, curves.

Inputs are the optimisation layer's :class:`OptimumDesign` and :class:`DesignEvaluation`,
and :class:`CrossTable`, the TAC of each scenario's optimum design under every
scenario's prices.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

from ..optimisation.layout import SEARCH_AGAIN_TOLERANCE
from ..optimisation.results import DesignEvaluation, OptimumDesign, SequentialPrice
from ..stages.results import StageProfile
from .tables import KW, MONEY, TEXT, Cell, Column, Table, quantity_table, stages_counted, text

# what moves a design's reported TAC from the model's: the sizing layer's standard sizes
ROUNDED_SIZES = "the reported price rounds the diameter and the shell's plate up to standard sizes"


def _money(label: str, currency: str) -> Column:
    return Column(label, f"{currency}/year", MONEY, 16.0)


@dataclass(frozen=True)
class CrossTable:
    """TAC [currency/year] of the design optimal for scenario i (row) under the prices of scenario j (column)."""

    scenarios: tuple[str, ...]
    tac: tuple[tuple[float, ...], ...]
    currency: str
    # (i, j, difference): scenario j, searched again from design i, whose optimiser's model ranks j's own design
    # ``difference`` [currency/year] cheaper than design i under j's prices
    model_ranked: tuple[tuple[int, int, float], ...] = ()

    def __post_init__(self):
        n = len(self.scenarios)
        if len(self.tac) != n or any(len(row) != n for row in self.tac):
            raise ValueError(f"cross table: {n} scenarios need a {n} x {n} matrix of TAC values")

    @property
    def extra(self) -> tuple[tuple[float, ...], ...]:
        """Extra TAC of building for scenario i when the prices of j apply: TAC[i][j] - TAC[j][j]."""
        return tuple(tuple(row[j] - self.tac[j][j] for j in range(len(row))) for row in self.tac)

    def close_notes(self, tolerance: float = SEARCH_AGAIN_TOLERANCE) -> tuple[str, ...]:
        """A note on the extra TAC values below zero within ``tolerance`` x the column's own optimum, if any."""
        close = [-value / self.tac[j][j] for row in self.extra for j, value in enumerate(row)
                 if -tolerance * abs(self.tac[j][j]) <= value < 0.0 and -value >= 0.5]
        if not close:
            return ()
        return (f"cross table: {len(close)} extra TAC value{'s' if len(close) > 1 else ''} below zero, by at most "
                f"{100.0 * max(close):.2g} % of the scenario's own TAC, within the search's tolerance of "
                f"{100.0 * tolerance:g} %: designs that close are equally good at the model's resolution (the "
                f"search ranks designs by the model's TAC; {ROUNDED_SIZES})",)

    def beaten(self, tolerance: float = SEARCH_AGAIN_TOLERANCE) -> tuple[tuple[int, int], ...]:
        """(j, i) for each scenario j whose own optimum another scenario's design i, the cheapest under
        j's prices, beats by more than ``tolerance`` x its TAC."""
        found = []
        for j in range(len(self.scenarios)):
            i = min(range(len(self.scenarios)), key=lambda k: self.tac[k][j])
            if self.tac[i][j] < self.tac[j][j] * (1.0 - tolerance):
                found.append((j, i))
        return tuple(found)

    def below_zero(self, tolerance: float = SEARCH_AGAIN_TOLERANCE) -> tuple[str, ...]:
        """Warnings for every extra TAC below -``tolerance`` x the column's own optimum.

        A design built for other prices should not beat a scenario's own optimum by more than the
        search's tolerance; if it does after the scenario was searched again from that design, the
        optimum is a local one.
        """
        found = []
        ranked = {(i, j): difference for i, j, difference in self.model_ranked}
        for i, row in enumerate(self.extra):
            for j, value in enumerate(row):
                if value >= -tolerance * abs(self.tac[j][j]):
                    continue
                beaten = (f"cross table: the design optimal for '{self.scenarios[i]}' costs {-value:,.0f} "
                          f"{self.currency}/year less under the prices of '{self.scenarios[j]}' than that scenario's "
                          f"own optimum ({100.0 * -value / self.tac[j][j]:.2g} %)")
                if (i, j) in ranked:
                    found.append(
                        f"{beaten}; searched again from that design, the optimiser's model ranks the scenario's own "
                        f"design {ranked[i, j]:,.0f} {self.currency}/year cheaper: the model prices continuous "
                        f"sizes ({ROUNDED_SIZES}), which here orders the two the other way; either is the optimum "
                        "at the model's resolution (compare both rows of the cross table)")
                else:
                    found.append(f"{beaten}, which is therefore not the lowest TAC found (a local optimum: searched "
                                 "again from that design, the search did not reach it)")
        return tuple(found)


def optimum_table(optimum: OptimumDesign) -> Table:
    """The lowest-TAC design: decisions, shortcut bounds, sizes, duties, costs and the solver's report.

    Costs here are the optimisation model's (column, trays, exchangers, reflux drum and pump, at
    continuous sizes); the cost sheets hold the same design priced by the sizing and costing layers
    at standard sizes.
    """
    best, s = optimum.best, optimum.solver
    c = best.cost.currency
    items: list[tuple[str, Cell]] = [
        ("Reflux ratio [-]", best.reflux_ratio),
        ("Minimum reflux ratio, on the model's fitted forms [-]", optimum.minimum_reflux_ratio),
        ("Reflux ratio / that minimum [-]", best.reflux_ratio / optimum.minimum_reflux_ratio),
        (f"Equilibrium stages, {stages_counted(best.profile)} [-]", best.stages),
        ("Minimum stages on the model's fitted forms, reboiler included [-]", optimum.minimum_stages),
        ("Feed stage, from the top [-]", best.feed_stage),
        ("Real trays [-]", best.sizes.real_trays),
        ("Tray efficiency [-]", best.sizes.tray_efficiency),
        ("Diameter [m]", best.sizes.diameter),
        ("Height [m]", best.sizes.height),
        ("Condenser duty [kW]", best.sizes.condenser_duty / KW),
        ("Reboiler duty [kW]", best.sizes.reboiler_duty / KW),
        ("Condenser area [m^2]", best.sizes.condenser_area),
        ("Reboiler area [m^2]", best.sizes.reboiler_area),
        (f"Installed capital, optimisation model [{c}]", best.cost.capital_installed),
        (f"Annualised capital, optimisation model [{c}/year]", best.cost.annualised_capital_per_year),
        (f"Utilities, optimisation model [{c}/year]", best.cost.utilities_per_year),
        (f"Total annualised cost, optimisation model [{c}/year]", best.cost.tac_per_year),
        ("Cost year [year]", best.cost.cost_year),
        ("Solver", s.solver),
        ("Solver status", s.status),
        ("Termination condition", s.termination),
        ("Relative optimality gap [-]", s.gap if s.gap is not None and math.isfinite(s.gap) else "no bound"),
        ("Configurations solved [-]", s.configurations_solved),
        ("Solution time [s]", s.wall_time),
    ]
    if s.message:
        items.append(("Solver message", s.message))
    return quantity_table("Optimum design", items)


def search_table(optimum: OptimumDesign) -> Table:
    """Every configuration the search visited, in order, with its TAC or why it had none."""
    currency = optimum.best.cost.currency
    columns = (Column("Step", "-", "0", 8.0), Column("Stages", "-", "0", 10.0), Column("Feed stage", "-", "0", 12.0),
               _money("TAC", currency), text("Status", 24.0))
    rows = tuple((i, v.stages, v.feed_stage, v.tac, v.status) for i, v in enumerate(optimum.visited, start=1))
    return Table("Configurations visited", columns, rows)


@dataclass(frozen=True)
class ReportedDesign:
    """A scenario's design as reported: corrected on thermo where its verification corrected it."""

    profile: StageProfile
    condenser_duty: float  # W
    reboiler_duty: float  # W
    price: SequentialPrice | None  # the sizing and costing layers' price; None: the model's only
    tac: float  # currency/yr: the price's, else the model's

    @property
    def reflux_ratio(self) -> float:
        return self.profile.reflux_ratio


def reported(optimum: OptimumDesign, checks=None) -> ReportedDesign:
    """``optimum`` as the run reports it, given its :class:`ThermoChecks` (the console's cost line, result.json
    and the scenario tables then give one design: an ethanol/1-propanol column corrected on thermo from
    R 2.855 to 2.756 showed the model's design in the scenario table and the corrected one above it)."""
    v = None if checks is None else checks.verification
    if v is not None and v.corrected is not None and v.corrected_price is not None:
        c = v.corrected
        return ReportedDesign(c, c.condenser_duty, c.reboiler_duty, v.corrected_price,
                              v.corrected_price.cost.tac_per_year)
    b = optimum.best
    return ReportedDesign(b.profile, b.sizes.condenser_duty, b.sizes.reboiler_duty, optimum.sequential,
                          optimum.reported_tac)


def scenario_table(optima: Sequence[tuple[str, OptimumDesign]], checks=()) -> Table:
    """The optimum of every price scenario side by side (one row per scenario)."""
    currency = optima[0][1].best.cost.currency
    columns = (text("Scenario", 22.0), Column("Reflux ratio", "-", "0.000"), Column("R / R_min", "-", "0.000"),
               Column("Stages", "-", "0", 9.0), Column("Feed stage", "-", "0", 10.0),
               Column("Real trays", "-", "0", 10.0), Column("Diameter", "m", "0.00"),
               Column("Height, tallest shell", "m", "0.0", 14.0),
               Column("Condenser duty", "kW", "#,##0"), Column("Reboiler duty", "kW", "#,##0"),
               Column("Installed capital", currency, MONEY), _money("Annualised capital", currency),
               _money("Condenser utility", currency), _money("Reboiler utility", currency),
               _money("Pump electricity", currency), _money("Utilities", currency), _money("TAC", currency), text("Solver status", 18.0),
               text("Condenser utility", 18.0), Column("Condenser utility amount", "per year, unit in next column",
                                                        MONEY, 18.0), text("Unit", 8.0),
               text("Reboiler utility", 18.0), Column("Reboiler utility amount", "per year, unit in next column",
                                                       MONEY, 18.0), text("Unit", 8.0))
    rows = []
    by_name = dict(checks)
    for name, opt in optima:
        b, shown = opt.best, reported(opt, by_name.get(name))
        rows.append((name, shown.reflux_ratio, shown.reflux_ratio / opt.minimum_reflux_ratio, b.stages, b.feed_stage)
                    + _reported_sizes_and_costs(opt, shown) + (opt.solver.status,)
                    + _utility_amount(shown, "condenser") + _utility_amount(shown, "reboiler"))
    return Table("Optimum design of each price scenario", columns, tuple(rows))


def _reported_sizes_and_costs(optimum: OptimumDesign, shown: ReportedDesign) -> tuple[Cell, ...]:
    """(real trays, diameter, height, duties, capital, annualised capital, condenser, reboiler and pump utility,
    utilities, TAC) as reported (:func:`reported`): the sizing and costing layers' price where there is one
    (the console's, the cross table's), else the model's."""
    b, seq = optimum.best, shown.price
    duties = (shown.condenser_duty / KW, shown.reboiler_duty / KW)
    if seq is None:
        return ((b.sizes.real_trays, b.sizes.diameter, b.sizes.height) + duties
                + (b.cost.capital_installed, b.cost.annualised_capital_per_year, b.cost.condenser_utility_per_year,
                   b.cost.reboiler_utility_per_year, b.cost.pump_electricity_per_year, b.cost.utilities_per_year,
                   b.cost.tac_per_year))
    cost = seq.cost
    per_item = {item: sum(u.cost_per_year for u in cost.utilities if u.item == item)
                for item in ("condenser", "reboiler")}
    pumps = sum(u.cost_per_year for u in cost.utilities if u.kind == "electricity")
    return ((seq.sizing.real_trays, seq.sizing.diameter, seq.sizing.tallest_shell.tangent_length) + duties
            + (cost.capital_installed, cost.annualised_capital, per_item["condenser"], per_item["reboiler"], pumps,
               cost.utilities_per_year, cost.tac_per_year))


def _utility_amount(shown: ReportedDesign, item: str) -> tuple[Cell, ...]:
    """(utility, yearly amount, unit) of an item from the reported price, where there is one."""
    if shown.price is not None:
        for u in shown.price.cost.utilities:
            if u.item == item:
                return u.utility, u.amount_per_year, u.amount_unit
    return "", None, ""


def cross_tables(cross: CrossTable) -> tuple[Table, Table]:
    """The TAC matrix and the extra-TAC matrix (rows: design built for; columns: prices that apply)."""
    columns = (text("Design optimal for", 24.0),) + tuple(
        Column(f"Prices of {name}", f"{cross.currency}/year", MONEY, 18.0) for name in cross.scenarios)
    tac = tuple((name,) + tuple(row) for name, row in zip(cross.scenarios, cross.tac))
    extra = tuple((name,) + tuple(row) for name, row in zip(cross.scenarios, cross.extra))
    return (Table("TAC of each scenario's design under each scenario's prices", columns, tac),
            Table("Extra TAC of building for the wrong prices", columns, extra))


def tac_curve_table(designs: Sequence[DesignEvaluation], scenario: str, stage_limit: int | None = None) -> Table:
    """TAC against reflux ratio, stages and feed stage re-optimised at each reflux; with the
    ``stage_limit`` of the shell height limit, the points beyond it are marked."""
    currency = designs[0].cost.currency
    columns = (Column("Reflux ratio", "-", "0.000"), Column("Stages", "-", "0", 9.0),
               Column("Feed stage", "-", "0", 10.0), Column("Reboiler duty", "kW", "#,##0"),
               _money("Annualised capital", currency), _money("Utilities", currency), _money("TAC", currency))
    rows = tuple((d.reflux_ratio, d.stages, d.feed_stage, d.sizes.reboiler_duty / KW,
                  d.cost.annualised_capital_per_year, d.cost.utilities_per_year, d.cost.tac_per_year)
                 for d in sorted(designs, key=lambda d: d.reflux_ratio))
    if stage_limit is not None:
        columns += (Column("Shell height limit", "-", TEXT, 22.0),)
        rows = tuple(row + ("beyond" if row[1] > stage_limit else "within",) for row in rows)
    return Table(f"TAC against reflux ratio ({scenario})", columns, rows)
