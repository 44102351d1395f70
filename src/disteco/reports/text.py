"""Short plain-text reports for the terminal, with units on every number."""

from __future__ import annotations

from .._base.units import to_degC
from ..properties import MixtureSummary
from .design_result import CAUTIONS


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
