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
    """Mixture surface tension by the Diguilio-Teja corresponding-states rule [N/m].

    sigma = 1.002855 T*^1.118091 (T / Tb_m) sigma_r, T* = (Tc_m/T - 1)/(Tc_m/Tb_m - 1), with Tc_m,
    Tb_m and sigma_r mole-fraction means of Tc, Tb and the surface tensions at Tb.

    Parameters
    ----------
    T : float
        Temperature [K]
    x : sequence of float
        Liquid mole fractions [-]
    sigmas_Tb : sequence of float
        Pure-component surface tensions at their normal boiling points [N/m]
    Tbs : sequence of float
        Normal boiling points [K]
    Tcs : sequence of float
        Critical temperatures [K]

    Notes
    -----
    Needs only constants, so it holds for components above their Tc while the liquid is below
    its pseudo-critical temperature; at or above it :class:`InfeasibleSpecError`. Source error
    about 2 % over 21 binary and 4 ternary non-aqueous systems [1]_.

    Examples
    --------
    >>> round(supercritical_surface_tension(298.15, [0.1606, 0.8394], [0.01424, 0.02530],
    ...                                     [309.21, 312.95], [469.7, 508.0]) * 1e3, 3)
    25.717

    References
    ----------
    .. [1] Diguilio, R. M., Teja, A. S., Chemical Engineering Journal 38 (1988) 205-208.
    """
    _check_below_pseudo_critical(T, x, Tcs)
    return float(Diguilio_Teja(T, list(x), list(sigmas_Tb), list(Tbs), list(Tcs)))


def supercritical_liquid_density(T: float, x, molar_masses, Tcs, Vcs, omegas) -> float:
    """Saturated liquid mass density by the Hankinson-Thomson (COSTALD) mixture rule [kg/m^3].

    V = V*_m V_R0 (1 - omega_m V_Rdelta) at Tr = T / Tc_m, with the mixture's characteristic
    volume, critical temperature and acentric factor from the published mixing rules.

    Parameters
    ----------
    T : float
        Temperature [K]
    x : sequence of float
        Liquid mole fractions [-]
    molar_masses : sequence of float
        Molar masses [kg/mol]
    Tcs : sequence of float
        Critical temperatures [K]
    Vcs : sequence of float
        Critical volumes, standing in for the characteristic volumes [m^3/mol]
    omegas : sequence of float
        Acentric factors [-]

    Notes
    -----
    Source range 0.25 < Tr < 0.95 on the mixture's Tc (often used to 1.0) [1]_; at or above
    the pseudo-critical temperature :class:`InfeasibleSpecError`.

    Examples
    --------
    >>> round(supercritical_liquid_density(330.0, [1.0], [0.0441], [369.89], [2.0e-4], [0.1521]), 1)
    435.3

    References
    ----------
    .. [1] Hankinson, R. W., Thomson, G. H., AIChE Journal 25 (1979) 653-663.
    """
    _check_below_pseudo_critical(T, x, Tcs)
    volume = COSTALD_mixture(list(x), T, list(Tcs), list(Vcs), list(omegas))
    return float(np.dot(molar_masses, x)) / volume


def supercritical_liquid_viscosity(T: float, Tc: float, Pc: float, omega: float, molar_mass: float,
                                   gas_viscosity: float) -> float:
    """Liquid viscosity of a component near or above its Tc by Letsou-Stiel [Pa s].

    mu xi = (1.5174 - 2.135 Tr + 0.75 Tr^2) 1e-5 + omega (4.2552 - 7.674 Tr + 3.4 Tr^2) 1e-5,
    xi = 2173.424 Tc^(1/6) M^(-1/2) Pc^(-2/3); never below ``gas_viscosity``.

    Parameters
    ----------
    T : float
        Temperature [K]
    Tc : float
        Critical temperature [K]
    Pc : float
        Critical pressure [Pa]
    omega : float
        Acentric factor [-]
    molar_mass : float
        Molar mass [kg/mol]
    gas_viscosity : float
        The component's gas viscosity at the same state, the floor [Pa s]

    Notes
    -----
    Fitted for 0.76 < Tr < 0.98 [1]_ and extrapolated above; the quadratics turn down past
    Tr of about 1.1, hence the floor at the gas viscosity.

    Examples
    --------
    >>> round(supercritical_liquid_viscosity(355.0, 369.89, 4.2512e6, 0.1521, 0.0441, 0.0) * 1e6, 1)
    48.6

    References
    ----------
    .. [1] Letsou, A., Stiel, L. I., AIChE Journal 19 (1973) 409-411.
    """
    return max(Letsou_Stiel(T, molar_mass * 1e3, Tc, Pc, omega), gas_viscosity)


def log_mixing(x, values) -> float:
    """Molar logarithmic mixing: ln(mu) = sum x_i ln(mu_i) (thermo's default liquid-viscosity rule)."""
    return math.exp(sum(xi * math.log(v) for xi, v in zip(x, values) if xi > 0.0))
