"""Short plain-text reports for the terminal, with units on every number."""

from __future__ import annotations

from .._base.units import to_degC
from ..properties import MixtureSummary
from .cautions import CAUTIONS
from .choices import margin_text, sizing_text
from .design_result import DesignResult
from .text_checks import checks_lines

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


def _shells_words(sizing) -> str:
    """Shells and their tangent lengths (height-to-diameter in brackets), and what set the diameter."""
    split = sizing.split
    heights = [sizing.height] if split is None else [split.upper_height, sizing.height]
    words = " and ".join(f"{h.tangent_length:.1f} m (H/D {h.tangent_length / sizing.diameter:.0f})" for h in heights)
    shells = "one shell" if split is None else f"two shells in series (split after stage {split.split_stage})"
    basis = "" if sizing.diameter_basis == "flooding" else ", diameter set by the height-to-diameter limit"
    return f"{shells}, {words} tangent to tangent{basis}"


def layout_lines(layout, currency: str) -> list[str]:
    """The shell layout chosen, why, and what the limits cost."""
    lines = [f"Layout: {layout.why}"] + ([f"Sections: {layout.sections}"] if layout.sections else [])
    limits = f"limits {layout.max_height:g} m per shell, height-to-diameter {layout.max_height_to_diameter:g}"
    if layout.binding:
        cost = layout.limit_cost
        extra = "" if cost is None else (f"; {cost:,.0f} {currency} per year above the same designs priced as "
                                         "one shell without limits")
        lines.append(f"Binding: {', '.join(layout.binding)} ({limits}, common practice, no source){extra}")
    else:
        lines.append(f"No shell limit binds ({limits}, common practice, no source)")
    return lines


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
    if parts.margin is not None and parts.margin.binds:
        heading = "Lowest-TAC design holding the control margin"
    if parts.optimum is not None and parts.optimum.solver.neighbours_unsolved:
        heading = "Best design found (search incomplete, see the warnings)"
    factor = f" ({profile.reflux_ratio / stages.minimum_reflux:.2f} x the constant-molar-overflow minimum)" if stages else ""
    lines += [f"{heading}: reflux ratio {profile.reflux_ratio:.3f} [-]{factor}, {profile.stages} stages "
              f"(reboiler included), feed on stage {profile.feed_stage} from the top",
              f"Condenser duty {profile.condenser_duty / 1e3:,.0f} kW, reboiler duty {profile.reboiler_duty / 1e3:,.0f} kW"]
    margin = margin_text(parts.margin, parts.cost.currency if parts.cost else "",
                         parts.cost.tac_per_year if parts.cost else None)
    lines += [margin] if margin else []
    lines += checks_lines(parts.checks, profile.reflux_ratio, stages.minimum_reflux if stages else None)
    chosen = sizing_text(result.case)
    lines += [chosen] if chosen else []
    if parts.sizing is not None:
        s = parts.sizing
        lines.append(f"Column: {s.diameter:.2f} m diameter, {s.real_trays} real trays "
                     f"(efficiency {s.efficiency.value:.2f}) at {s.height.tray_spacing:.2f} m spacing, "
                     f"{_shells_words(s)}; "
                     f"condenser {s.condenser.area:,.0f} m2 on {s.condenser.utility.name}, "
                     f"reboiler {s.reboiler.area:,.0f} m2 on {s.reboiler.utility.name}")
    if parts.cost is not None:
        c = parts.cost
        lines.append(f"Cost ({c.currency} {c.cost_year}, scenario '{c.scenario}'): installed capital "
                     f"{c.capital_installed:,.0f}, utilities {c.utilities_per_year:,.0f} per year, "
                     f"TAC {c.tac_per_year:,.0f} per year")
    optimum = parts.optimum
    if optimum is not None and optimum.layout is not None:
        lines += layout_lines(optimum.layout, parts.cost.currency if parts.cost is not None else "")
    if optimum is not None:
        gap = f", gap {optimum.solver.gap:.2%}" if optimum.solver.gap is not None else ""
        failed = f" ({len(optimum.solver.unsolved)} did not solve)" if optimum.solver.unsolved else ""
        lines.append(f"Optimiser: {optimum.solver.status}{gap}, {optimum.solver.configurations_solved} "
                     f"configurations tried{failed} in {optimum.solver.wall_time:.1f} s, "
                     f"{optimum.rounds} round{'s' if optimum.rounds != 1 else ''} until the model's constants settled")
    if len(parts.scenarios) > 1:
        lines.append("Scenario optima: " + "; ".join(
            f"'{name}': R {o.best.reflux_ratio:.3f}, {o.best.stages} stages, TAC "
            f"{(o.sequential.cost.tac_per_year if o.sequential else o.best.tac):,.0f} per year"
            for name, o in parts.scenarios))
    return "\n".join(lines)
