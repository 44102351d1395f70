"""Console tables of a run under several price scenarios: each scenario's optimum and the cross table."""

from __future__ import annotations

from .tables_design import GivenDesignReport, ReportParts
from .tables_scenarios import CrossTable, reported

NAME_WIDTH = 24  # characters of a scenario name shown in a console table


def _name(name: str) -> str:
    return name if len(name) <= NAME_WIDTH else name[:NAME_WIDTH - 3] + "..."


def scenario_lines(parts: ReportParts) -> list[str]:
    """The optimum of every scenario, one row each, and the cross table; empty for one scenario."""
    if len(parts.scenarios) < 2:
        return []
    currency = parts.scenarios[0][1].best.cost.currency
    lines = ["", "Optimum of each price scenario:",
             f"  {'scenario':<{NAME_WIDTH}}{'R [-]':>8}{'R/Rmin [-]':>12}{'stages':>8}{'feed':>6}"
             f"{'reboiler [kW]':>15}{f'TAC [{currency}/year]':>20}"]
    checks = dict(parts.scenario_checks)
    for name, o in parts.scenarios:
        b, shown = o.best, reported(o, checks.get(name))
        lines.append(f"  {_name(name):<{NAME_WIDTH}}{shown.reflux_ratio:>8.3f}"
                     f"{shown.reflux_ratio / o.minimum_reflux_ratio:>12.3f}{b.stages:>8d}{b.feed_stage:>6d}"
                     f"{shown.reboiler_duty / 1e3:>15,.0f}{_money(shown.tac):>20}")
    if parts.cross is not None:
        lines += cross_lines(parts.cross)
    return lines


def _money(value: float) -> str:
    text = f"{value:,.0f}"
    return "0" if text == "-0" else text


def cross_lines(cross: CrossTable) -> list[str]:
    """TAC of each scenario's design (rows) under each scenario's prices (columns), and the extra TAC."""
    width = max(16, max(len(_name(n)) for n in cross.scenarios) + 2)
    corner = "design for / prices of"
    head = f"  {corner:<{NAME_WIDTH}}" + "".join(f"{_name(n):>{width}}" for n in cross.scenarios)
    lines = ["", f"TAC of each scenario's design under each scenario's prices [{cross.currency}/year]:", head]
    lines += [f"  {_name(name):<{NAME_WIDTH}}" + "".join(f"{_money(v):>{width}}" for v in row)
              for name, row in zip(cross.scenarios, cross.tac)]
    lines += ["", f"Extra TAC of building for the wrong prices [{cross.currency}/year]:", head]
    lines += [f"  {_name(name):<{NAME_WIDTH}}" + "".join(f"{_money(v):>{width}}" for v in row)
              for name, row in zip(cross.scenarios, cross.extra)]
    lines += ["  " + note[0].upper() + note[1:] for note in cross.close_notes()]
    return lines


def given_scenario_lines(given: GivenDesignReport) -> list[str]:
    """The given design under each scenario's prices beside that scenario's optimum; empty for one scenario."""
    if not given.scenarios:
        return []
    currency = given.scenarios[0].cost.currency
    lines = ["", f"The given design under each price scenario [{currency}/year]:",
             f"  {'scenario':<{NAME_WIDTH}}{'utilities':>14}{'TAC':>14}{'optimum R, N, NF':>22}{'optimum TAC':>14}"
             f"{'given - optimum':>17}"]
    for under in given.scenarios:
        row = f"  {_name(under.scenario):<{NAME_WIDTH}}{_money(under.cost.utilities_per_year):>14}" \
              f"{_money(under.cost.tac_per_year):>14}"
        if under.extra_tac is not None:
            best = under.optimum.best
            row += (f"{f'{best.reflux_ratio:.3f}, {best.stages}, {best.feed_stage}':>22}"
                    f"{_money(under.cost.tac_per_year - under.extra_tac):>14}{under.extra_tac:>+17,.0f}")
        lines.append(row)
    return lines
