"""Short plain-text reports for the terminal, with units on every number."""

from __future__ import annotations

from .._base.units import to_degC
from ..properties import MixtureSummary
from .cautions import CAUTIONS
from .design_result import DesignResult
from .text_checks import checks_lines
from .text_scenarios import scenario_lines

CONSOLE_TITLE_LENGTH = 100  # characters of the case title shown on the console


def console_title(title: str, limit: int = CONSOLE_TITLE_LENGTH) -> str:
    """The case title on one console line: whitespace runs folded to one space and the text
    shortened to ``limit`` characters with "..." (the files keep the whole title)."""
    line = " ".join(title.split())
    return line if len(line) <= limit else line[:limit - 3] + "..."


def mixture_text(summary: MixtureSummary) -> str:
    """The mixture report printed by the check command."""
    lines = [f"Thermodynamic method: {summary.method}",
             f"Top pressure: {summary.pressure / 1e3:.2f} kPa",
             "",
             f"{'component':<22}{'CAS':>12}{'M [g/mol]':>11}{'Tb [degC]':>11}{'z feed [-]':>12}"]
    for c in summary.components:
        lines.append(f"{c.name:<22}{c.cas:>12}{c.molar_mass * 1e3:>11.2f}"
                     f"{to_degC(c.normal_boiling_point):>11.2f}{c.feed_fraction:>12.4f}")
    lines += ["",
              f"Feed bubble / dew point at top pressure: {to_degC(summary.feed_bubble_T):.2f} / "
              f"{to_degC(summary.feed_dew_T):.2f} degC",
              f"Relative volatility {summary.light_key}/{summary.heavy_key}: "
              f"{summary.key_volatility_min:.3f} to {summary.key_volatility_max:.3f} [-]"]
    if summary.azeotropes:
        for a in summary.azeotropes:
            lines.append(f"Azeotrope ({a.kind}): {a.x_first:.4f} mole fraction {a.first} in {a.second} "
                         f"at {to_degC(a.T):.2f} degC")
    else:
        lines.append("Azeotropes: none found between any pair at top pressure")
    return "\n".join(lines)


def cautions_text() -> str:
    return "\n".join(f"Caution: {c}" for c in CAUTIONS)


def design_text(result: DesignResult) -> str:
    """The chosen (or priced) design in a few lines, units on every number."""
    lines = []
    stages = result.stages
    if stages is not None:
        lines.append(f"Minimum reflux ratio: {stages.minimum_reflux:.3f} [-]   "
                     f"minimum stages: {stages.minimum_stages:.2f} [-] ({stages.basis})")
    parts = result.parts
    profile = parts.profile
    if profile is None:
        return "\n".join(lines)
    heading = "Priced design" if result.evaluation is not None else "Lowest-TAC design"
    if parts.optimum is not None and parts.optimum.solver.neighbours_unsolved:
        heading = "Best design found (search incomplete, see the warnings)"
    factor = f" ({profile.reflux_ratio / stages.minimum_reflux:.2f} x the constant-molar-overflow minimum)" if stages else ""
    lines += [f"{heading}: reflux ratio {profile.reflux_ratio:.3f} [-]{factor}, {profile.stages} stages "
              f"(reboiler included), feed on stage {profile.feed_stage} from the top",
              f"Condenser duty {profile.condenser_duty / 1e3:,.0f} kW, reboiler duty {profile.reboiler_duty / 1e3:,.0f} kW"]
    lines += checks_lines(parts.checks, profile.reflux_ratio, stages.minimum_reflux if stages else None)
    if parts.sizing is not None:
        s = parts.sizing
        lines.append(f"Column: {s.diameter:.2f} m diameter, {s.real_trays} real trays "
                     f"(efficiency {s.efficiency.value:.2f}), {s.height.tangent_length:.1f} m tangent to tangent; "
                     f"condenser {s.condenser.area:,.0f} m2 on {s.condenser.utility.name}, "
                     f"reboiler {s.reboiler.area:,.0f} m2 on {s.reboiler.utility.name}")
    if parts.cost is not None:
        c = parts.cost
        lines.append(f"Cost ({c.currency} {c.cost_year}, scenario '{c.scenario}'): installed capital "
                     f"{c.capital_installed:,.0f}, utilities {c.utilities_per_year:,.0f} per year, "
                     f"TAC {c.tac_per_year:,.0f} per year")
    optimum = parts.optimum
    if optimum is not None:
        gap = f", gap {optimum.solver.gap:.2%}" if optimum.solver.gap is not None else ""
        failed = f" ({len(optimum.solver.unsolved)} did not solve)" if optimum.solver.unsolved else ""
        lines.append(f"Optimiser: {optimum.solver.status}{gap}, {optimum.solver.configurations_solved} "
                     f"configurations tried{failed} in {optimum.solver.wall_time:.1f} s, "
                     f"{optimum.rounds} round{'s' if optimum.rounds != 1 else ''} until the model's constants settled")
    lines += scenario_lines(parts)
    return "\n".join(lines)
