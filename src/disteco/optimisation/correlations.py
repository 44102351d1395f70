"""Pyomo forms of the sizing and costing correlations, each beside the float form it must equal.

Each pair is checked by a twin test at design points. The float forms stand in for the
sizing and costing layers' functions until the model takes its constants from them.
"""

from __future__ import annotations

import math

import pyomo.environ as pyo

from ..properties.fitted import GAS_CONSTANT
from .basis import CostCurve

LN10 = math.log(10.0)


def capacity_factor(flow_parameter: float, capacity: tuple[float, float, float, float]) -> float:
    """Flooding capacity factor C_sb = c0 + c1 exp(-c2 F_LV^c3) [m/s] (smooth form of Fair's chart).

    Parameters
    ----------
    flow_parameter : float
        F_LV = (L/V) sqrt(rho_V/rho_L) on a mass basis [-]
    capacity : tuple
        c0 [m/s], c1 [m/s], c2 [-], c3 [-] at the chosen tray spacing

    Examples
    --------
    >>> round(capacity_factor(0.1, (0.0105, 0.1, 1.463, 0.842)), 4)
    0.0911
    """
    c0, c1, c2, c3 = capacity
    return c0 + c1 * math.exp(-c2 * flow_parameter ** c3)


def capacity_factor_expr(flow_parameter, capacity):
    """Pyomo twin of :func:`capacity_factor`."""
    c0, c1, c2, c3 = capacity
    return c0 + c1 * pyo.exp(-c2 * flow_parameter ** c3)


def cost_curve_expr(curve: CostCurve, size):
    """Pyomo twin of :meth:`CostCurve.purchased`: multiplier 10**(k1 + k2 s + k3 s^2), s = log10 size."""
    s = pyo.log(size) / LN10
    return curve.multiplier * pyo.exp(LN10 * (curve.k1 + curve.k2 * s + curve.k3 * s * s))


def mean_temperature_difference(dt_one: float, dt_two: float) -> float:
    """Log-mean temperature difference [K]; equal ends give that difference.

    Examples
    --------
    >>> round(mean_temperature_difference(30.0, 20.0), 3)
    24.663
    """
    if abs(dt_one - dt_two) < 1e-12:
        return dt_one
    return (dt_one - dt_two) / math.log(dt_one / dt_two)


def lmtd_expr(dt_one, dt_two, equal_ends: bool = False):
    """Pyomo twin of :func:`mean_temperature_difference`.

    ``equal_ends`` comes from the utility data (a condensing or evaporating utility has
    equal supply and return temperatures), so the branch is never taken on a variable.
    """
    if equal_ends:
        return dt_one
    return (dt_one - dt_two) / pyo.log(dt_one / dt_two)


def vapour_density(pressure: float, temperature: float, molar_mass: float) -> float:
    """Ideal-gas vapour density rho_V = P M / (R T) [kg/m^3].

    Examples
    --------
    >>> round(vapour_density(101325.0, 353.0, 0.078), 3)
    2.693
    """
    return pressure * molar_mass / (GAS_CONSTANT * temperature)


def vapour_density_expr(pressure, temperature, molar_mass):
    """Pyomo twin of :func:`vapour_density`."""
    return pressure * molar_mass / (GAS_CONSTANT * temperature)
