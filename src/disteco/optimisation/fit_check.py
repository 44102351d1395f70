"""The fitted property forms checked against thermo at the states of the verified column.

At a handful of stages of the thermo profile (top, feed, bottom and two between) the
fitted forms' bubble temperature and vapour composition are compared with thermo's
bubble point at the stage's liquid and pressure, and the fitted liquid and vapour
enthalpies with thermo's at thermo's bubble temperature. A check costs five bubble
points. Outside the tolerances below the result carries a warning (the thermo
verification, not the fit, is then the check on the design's purities).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .._base.errors import PropertyError
from ..properties import Mixture
from ..properties.fitted import FittedMixture
from ..stages import StageProfile

# Tolerances (common practice, no source): 1 K moves a key's volatility by well under 1 % on
# the examples; 0.01 in y is the size of a typical product impurity; 0.5 kJ/mol is about
# 1.5 % of a hydrocarbon latent heat.
BUBBLE_TEMPERATURE_TOLERANCE = 1.0  # K
VAPOUR_FRACTION_TOLERANCE = 0.01  # [-]
ENTHALPY_TOLERANCE = 500.0  # J/mol
POINTS = 5


@dataclass(frozen=True)
class FitCheck:
    """Largest differences, fitted forms minus thermo, over the checked stages."""

    stages: tuple[int, ...]  # stages checked, from the top
    max_bubble_temperature_error: float  # K
    max_vapour_fraction_error: float  # [-]
    max_enthalpy_error: float  # J/mol, liquid or vapour
    within_tolerance: bool
    warnings: tuple[str, ...] = ()
    unreached: tuple[int, ...] = ()  # stages whose liquid has no bubble point on the fitted forms

    @property
    def misfit(self) -> float:
        """The largest difference over its tolerance [-]; infinite where a stage's liquid has no fitted bubble point."""
        if self.unreached:
            return float("inf")
        return max(self.max_bubble_temperature_error / BUBBLE_TEMPERATURE_TOLERANCE,
                   self.max_vapour_fraction_error / VAPOUR_FRACTION_TOLERANCE,
                   self.max_enthalpy_error / ENTHALPY_TOLERANCE)


def check_fit(fitted: FittedMixture, mixture: Mixture, profile: StageProfile) -> FitCheck:
    """Compare ``fitted`` with ``mixture`` at ``POINTS`` stages of the thermo ``profile``."""
    N = profile.stages
    stages = tuple(sorted({1, profile.feed_stage, N} | {int(round(1 + f * (N - 1))) for f in (0.25, 0.75)}))
    dT = dy = dh = 0.0
    unreached = []
    for j in stages:
        x, P = profile.x[j - 1], profile.P[j - 1]
        point = mixture.bubble_point(P, x)
        try:
            T_fit = fitted.bubble_temperature(P, x)
        except PropertyError:  # the forms, fitted away from this liquid, have no bubble point for it
            unreached.append(j)
            continue
        y_fit = fitted.k_values(T_fit, P, x) * np.asarray(x)
        dT = max(dT, abs(T_fit - point.T))
        dy = max(dy, float(np.max(np.abs(y_fit - np.asarray(point.y)))))
        dh = max(dh, abs(fitted.liquid_enthalpy_of(point.T, x) - mixture.liquid_enthalpy(point.T, P, x)),
                 abs(fitted.vapour_enthalpy_of(point.T, point.y) - mixture.vapour_enthalpy(point.T, P, point.y)))
    warnings = [f"the fitted property forms give no bubble point at the liquid of stage(s) "
                f"{', '.join(map(str, unreached))} of the column; the optimum rests on them, the verification on "
                "thermo does not"] if unreached else []
    for value, tolerance, what, allowed in (
            (dT, BUBBLE_TEMPERATURE_TOLERANCE, f"bubble temperature by {dT:.3g} K",
             f"{BUBBLE_TEMPERATURE_TOLERANCE:g} K"),
            (dy, VAPOUR_FRACTION_TOLERANCE, f"vapour mole fraction by {dy:.3g}", f"{VAPOUR_FRACTION_TOLERANCE:g}"),
            (dh, ENTHALPY_TOLERANCE, f"molar enthalpy by {dh / 1e3:.3g} kJ/mol", f"{ENTHALPY_TOLERANCE / 1e3:g} kJ/mol")):
        if value > tolerance:
            warnings.append(f"the fitted property forms differ from the thermodynamic library in {what} (tolerance "
                            f"{allowed}) at the column's stages; the optimum rests on them, the verification "
                            "on thermo does not")
    return FitCheck(stages, dT, dy, dh, not warnings, tuple(warnings), tuple(unreached))


__all__ = ["BUBBLE_TEMPERATURE_TOLERANCE", "ENTHALPY_TOLERANCE", "FitCheck", "VAPOUR_FRACTION_TOLERANCE",
           "check_fit"]
