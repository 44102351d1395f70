"""Liquid properties when a component is near or above its critical temperature.

thermo's pure-component correlations for surface tension stop short of the critical point
(they return ``None``), and its liquid density and viscosity correlations are extrapolated
silently past it. These routes replace them where that happens; each is a published method,
and the caller records a warning that reaches the result.

Routes (``Tc`` of the component, ``T_end`` where thermo's pure surface-tension correlation ends):

- surface tension of a subcritical component beyond ``T_end``: its last value scaled as
  ``((Tc - T)/(Tc - T_end))**(11/9)``, the corresponding-states temperature dependence that
  vanishes at the critical point [1]_, then thermo's mixture rule;
- any component at or above ``Tc``: the mixture's surface tension by the Diguilio-Teja
  corresponding-states rule [2]_, its liquid density by the Hankinson-Thomson (COSTALD)
  mixture rule [3]_, and the supercritical components' liquid viscosity by Letsou-Stiel [4]_
  (never below the component's gas viscosity at the same state) in thermo's molar
  logarithmic mixing rule. All three need the liquid below its pseudo-critical temperature
  (mole-fraction mean of ``Tc``); at or above it the liquid is at its critical point and no
  tray can work, which is an infeasible request, not a property failure.

References
----------
.. [1] Brock, J. R., Bird, R. B. "Surface tension and the principle of corresponding states."
   AIChE Journal 1 (1955) 174-177 (exponent 11/9).
.. [2] Diguilio, R. M., Teja, A. S. "Correlation and prediction of the surface tensions of
   mixtures." Chemical Engineering Journal 38 (1988) 205-208.
.. [3] Hankinson, R. W., Thomson, G. H. "A new correlation for saturated densities of liquids
   and their mixtures." AIChE Journal 25 (1979) 653-663.
.. [4] Letsou, A., Stiel, L. I. "Viscosity of saturated nonpolar liquids at elevated
   pressures." AIChE Journal 19 (1973) 409-411.
"""

from __future__ import annotations

import math

import numpy as np
from chemicals.interface import Diguilio_Teja
from chemicals.viscosity import Letsou_Stiel
from chemicals.volume import COSTALD_mixture

from .._base.errors import InfeasibleSpecError

CORRESPONDING_STATES_EXPONENT = 11.0 / 9.0  # [-], Brock and Bird (1955)


def extrapolated_surface_tension(T: float, sigma_end: float, T_end: float, Tc: float) -> float:
    """Pure-liquid surface tension past the end of its correlation, vanishing at Tc [N/m].

    sigma = sigma_end * ((Tc - T) / (Tc - T_end))**(11/9) for T_end <= T < Tc, 0 above Tc.

    Parameters
    ----------
    T : float
        Temperature [K]
    sigma_end : float
        Surface tension at the end of the correlation's range [N/m]
    T_end : float
        Temperature where the correlation's range ends [K]
    Tc : float
        Critical temperature [K]

    Notes
    -----
    The exponent 11/9 is the corresponding-states temperature dependence of Brock and Bird [1]_;
    used only over the last few per cent below Tc, where the databank fits stop.

    Examples
    --------
    >>> round(extrapolated_surface_tension(366.0, 1.5e-3, 364.0, 369.89) * 1e3, 4)
    0.9034

    References
    ----------
    .. [1] Brock, J. R., Bird, R. B., AIChE Journal 1 (1955) 174-177.
    """
    if T >= Tc:
        return 0.0
    return sigma_end * ((Tc - T) / (Tc - T_end)) ** CORRESPONDING_STATES_EXPONENT


def pseudo_critical_temperature(x, Tcs) -> float:
    """Mole-fraction mean critical temperature (Kay's rule) [K]."""
    return float(np.dot(x, Tcs))


def _check_below_pseudo_critical(T: float, x, Tcs) -> None:
    Tpc = pseudo_critical_temperature(x, Tcs)
    if T >= Tpc:
        raise InfeasibleSpecError(
            f"a liquid at {T - 273.15:.1f} degC is at or above its pseudo-critical temperature "
            f"{Tpc - 273.15:.1f} degC: the column works in the critical region where liquid and vapour "
            "become alike and no tray can separate them; lower the column pressure")


def supercritical_surface_tension(T: float, x, sigmas_Tb, Tbs, Tcs) -> float:
    """Mixture surface tension by the Diguilio-Teja rule [N/m] (liquid below its pseudo-critical T)."""
    _check_below_pseudo_critical(T, x, Tcs)
    return float(Diguilio_Teja(T, list(x), list(sigmas_Tb), list(Tbs), list(Tcs)))


def supercritical_liquid_density(T: float, x, molar_masses, Tcs, Vcs, omegas) -> float:
    """Liquid mass density by the Hankinson-Thomson (COSTALD) mixture rule [kg/m^3]."""
    _check_below_pseudo_critical(T, x, Tcs)
    volume = COSTALD_mixture(list(x), T, list(Tcs), list(Vcs), list(omegas))
    return float(np.dot(molar_masses, x)) / volume


def supercritical_liquid_viscosity(T: float, Tc: float, Pc: float, omega: float, molar_mass: float,
                                   gas_viscosity: float) -> float:
    """Liquid viscosity of a component above its Tc: Letsou-Stiel, not below its gas viscosity [Pa s].

    ``molar_mass`` in [kg/mol]; Letsou-Stiel is fitted for 0.76 < Tr < 0.98 and is extrapolated here.
    """
    return max(Letsou_Stiel(T, molar_mass * 1e3, Tc, Pc, omega), gas_viscosity)


def log_mixing(x, values) -> float:
    """Molar logarithmic mixing: ln(mu) = sum x_i ln(mu_i) (thermo's default liquid-viscosity rule)."""
    return math.exp(sum(xi * math.log(v) for xi, v in zip(x, values) if xi > 0.0))
