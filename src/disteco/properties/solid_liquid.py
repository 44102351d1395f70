"""Where a liquid mixture starts to freeze: each component's pure solid at its ideal solubility.

A condensate whose components melt above the coolant's temperature (naphthalene melts at
80 degC) freezes on the tube walls at the condenser's cold end. The first solid appears at the
highest of the components' ideal-solubility temperatures (a simple eutectic system).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

GAS_CONSTANT = 8.314462618  # J/(mol K)


def ideal_solubility_temperature(x: float, melting_point: float, heat_of_fusion: float) -> float:
    """Temperature [K] at which a liquid holding mole fraction ``x`` [-] of a component is saturated
    with that component's pure solid.

    Schroeder-van Laar equation, the heat-capacity difference between solid and liquid neglected:

    .. math::
        \\ln x = -\\frac{\\Delta H_{fus}}{R}\\left(\\frac{1}{T} - \\frac{1}{T_m}\\right)
        \\quad\\Rightarrow\\quad T = \\left(\\frac{1}{T_m} - \\frac{R \\ln x}{\\Delta H_{fus}}\\right)^{-1}

    Units: ``melting_point`` T_m [K], ``heat_of_fusion`` [J/mol]. Valid for an ideal liquid
    solution whose solid is the pure component (no solid solutions), not far below T_m. Zero for
    ``x`` = 0 (an absent component never freezes out).

    Reference: Prausnitz, Lichtenthaler and de Azevedo, Molecular Thermodynamics of Fluid-Phase
    Equilibria, 3rd ed., 1999, Section 11.2 (solubilities of solids in liquids), from memory.

    Examples
    --------
    >>> round(ideal_solubility_temperature(1.0, 353.35, 19010.0), 2)
    353.35
    >>> round(ideal_solubility_temperature(0.265, 353.35, 19010.0), 1)  # naphthalene near 20 degC
    293.2
    """
    if x <= 0.0:
        return 0.0
    return 1.0 / (1.0 / melting_point - GAS_CONSTANT * math.log(x) / heat_of_fusion)


@dataclass(frozen=True)
class Liquidus:
    """The temperature [K] at which a liquid starts to freeze, the component that freezes out and its melting point [K]."""

    temperature: float
    component: str
    melting_point: float


def liquidus(x, names, melting_points, heats_of_fusion) -> Liquidus | None:
    """The highest ideal-solubility temperature over the components of liquid ``x`` [-] that have a
    melting point and a heat of fusion in the databank, or None where none has."""
    found = [Liquidus(ideal_solubility_temperature(float(xi), tm, h), name, tm)
             for xi, name, tm, h in zip(x, names, melting_points, heats_of_fusion)
             if tm and h and float(xi) > 0.0]
    return max(found, key=lambda f: f.temperature) if found else None


__all__ = ["Liquidus", "ideal_solubility_temperature", "liquidus"]
