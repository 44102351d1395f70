"""Limits on user-supplied interaction parameters that keep the property calculations finite.

An activity-coefficient model is judged by what it predicts, the activity coefficient of
each component infinitely diluted in each other one, because that is where a parameter
set does its damage: a very negative ln gamma puts the bubble point of a dilute liquid
beyond any temperature the equilibrium search can reach, a very large one overflows.
The limits are checked at temperatures across ``TEMPERATURES``, the range in which
ordinary distillation at 0.01 to 50 bar boils (common practice, no source).

Limits, each with its reason:

- ln gamma_inf from -5 to 30. Strong negative deviations in non-electrolyte liquids reach
  about -2 (acetone-chloroform about -0.7, from memory); below about -5 the bubble-point
  search of disteco found no root in probes with benzene-toluene (measured). Alkanes
  infinitely diluted in water reach about 20 (decane, from memory); 30 leaves room.
- NRTL non-randomness alpha from 0 to 1: Renon and Prausnitz recommend 0.2 to 0.47 [1];
  fitted values up to 1 occur; negative values are out of scope.
- Peng-Robinson k_ij from -0.5 to 0.6: fitted values lie near zero for hydrocarbons and
  reach about 0.5 for water-hydrocarbon pairs (from memory); k_ij >= 1 would make the
  attraction term of the pair zero or repulsive.

References
----------
1. Renon, H., Prausnitz, J. M. "Local compositions in thermodynamic excess functions for
   liquid mixtures." AIChE Journal 14 (1968) 135-144.
2. Wilson, G. M. "Vapor-liquid equilibrium. XI. A new expression for the excess free energy
   of mixing." J. Am. Chem. Soc. 86 (1964) 127-130.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence

LN_GAMMA_INF_RANGE = (-5.0, 30.0)  # [-]
TEMPERATURES = (200.0, 250.0, 300.0, 350.0, 400.0, 450.0, 500.0, 550.0, 600.0)  # K
NRTL_ALPHA_RANGE = (0.0, 1.0)  # [-]
KIJ_RANGE = (-0.5, 0.6)  # [-]
_EXP_MAX = 700.0  # math.exp overflows a float just above 709

Matrix = Sequence[Sequence[float]]


def _exp(x: float) -> float:
    return math.inf if x > _EXP_MAX else math.exp(x)


def nrtl_ln_gamma_infinite(tau_ij: float, tau_ji: float, alpha_ij: float) -> float:
    r"""NRTL activity coefficient of component i infinitely diluted in component j [1].

    .. math::
        \ln\gamma_i^\infty = \tau_{ji} + \tau_{ij}\exp(-\alpha_{ij}\tau_{ij})

    Parameters
    ----------
    tau_ij : float
        Interaction parameter of i with j at the temperature of interest [-]
    tau_ji : float
        Interaction parameter of j with i [-]
    alpha_ij : float
        Non-randomness parameter [-]

    Returns
    -------
    float
        ln gamma_i at infinite dilution in j [-]; infinite where the exponential overflows

    Notes
    -----
    The limit x_i -> 0 of the binary NRTL equation; valid for any finite parameters.

    Examples
    --------
    >>> round(nrtl_ln_gamma_infinite(1.0, 0.5, 0.3), 6)
    1.240818

    References
    ----------
    1. Renon, H., Prausnitz, J. M. AIChE Journal 14 (1968) 135-144.
    """
    growth = _exp(-alpha_ij * tau_ij)
    return tau_ji + (tau_ij * growth if tau_ij else 0.0)


def wilson_ln_gamma_infinite(ln_lambda_ij: float, ln_lambda_ji: float) -> float:
    r"""Wilson activity coefficient of component i infinitely diluted in component j [1].

    .. math::
        \ln\gamma_i^\infty = 1 - \ln\Lambda_{ij} - \Lambda_{ji}

    Parameters
    ----------
    ln_lambda_ij : float
        Natural logarithm of the Wilson parameter Lambda_ij [-]
    ln_lambda_ji : float
        Natural logarithm of Lambda_ji [-]

    Returns
    -------
    float
        ln gamma_i at infinite dilution in j [-]; minus infinity where Lambda_ji overflows

    Notes
    -----
    The limit x_i -> 0 of the binary Wilson equation; valid for any finite parameters.

    Examples
    --------
    >>> round(wilson_ln_gamma_infinite(0.0, 0.0), 6)
    0.0

    References
    ----------
    1. Wilson, G. M. J. Am. Chem. Soc. 86 (1964) 127-130.
    """
    return 1.0 - ln_lambda_ij - _exp(ln_lambda_ji)


def _first_outside(ln_gamma: Callable[[int, int, float], float], n: int):
    """(value, i, j, T) of the first pair whose ln gamma_inf lies outside the limits, else None."""
    low, high = LN_GAMMA_INF_RANGE
    for T in TEMPERATURES:
        for i in range(n):
            for j in range(n):
                if i != j:
                    value = ln_gamma(i, j, T)
                    if not low <= value <= high:  # also refuses NaN
                        return value, i, j, T
    return None


def nrtl_outside(a: Matrix, b: Matrix, alpha: Matrix):
    """First NRTL pair outside the ln gamma_inf limits as (value, i, j, T), else None.

    tau_ij = a_ij + b_ij / T with a [-] and b [K], as in the case file.
    """
    def ln_gamma(i, j, T):
        return nrtl_ln_gamma_infinite(a[i][j] + b[i][j] / T, a[j][i] + b[j][i] / T, alpha[i][j])
    return _first_outside(ln_gamma, len(a))


def wilson_outside(a: Matrix, b: Matrix):
    """First Wilson pair outside the ln gamma_inf limits as (value, i, j, T), else None.

    ln Lambda_ij = a_ij + b_ij / T with a [-] and b [K], as in the case file.
    """
    def ln_gamma(i, j, T):
        return wilson_ln_gamma_infinite(a[i][j] + b[i][j] / T, a[j][i] + b[j][i] / T)
    return _first_outside(ln_gamma, len(a))
