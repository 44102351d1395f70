"""Shortcut correlations of distillation: Fenske, Underwood, Gilliland, Kirkbride.

Pure functions on floats and numpy arrays; no mixture, no case. Relative volatilities are
referred to the heavy key (alpha_HK = 1). Stage counts are equilibrium stages with the
reboiler included (a total condenser is not a stage).
"""

from __future__ import annotations

import math

import numpy as np
from scipy.optimize import brentq

from .._base.errors import InfeasibleSpecError
from .._base.validity import OutOfRange, ValidityRange

ROOT_GAP = 1e-9  # relative distance kept from the poles of Underwood's function

KIRKBRIDE_EXPONENT = 0.206
MOLOKANOV_RANGE = ValidityRange("Gilliland (Molokanov form)", "X = (R - Rmin)/(R + 1)", 0.0, 1.0, "-",
                                "Molokanov et al. (1972)")


def geometric_mean_volatility(alpha_top: float, alpha_bottom: float) -> float:
    """Mean relative volatility over the column: geometric mean of top and bottom values.

    .. math:: \\bar\\alpha = \\sqrt{\\alpha_{top}\\,\\alpha_{bottom}}

    Parameters
    ----------
    alpha_top : Relative volatility at the top of the column [-]
    alpha_bottom : Relative volatility at the bottom of the column [-]

    Notes
    -----
    The usual average for the Fenske equation (Seader, Henley and Roper, ref. 1). It is
    good when alpha changes by less than about a factor of two over the column.

    Examples
    --------
    >>> round(geometric_mean_volatility(2.6, 2.25), 4)
    2.4187

    References
    ----------
    1. Seader, J.D., Henley, E.J., Roper, D.K. Separation Process Principles, 3rd ed.,
       Wiley, 2011, section 9.1.
    """
    return math.sqrt(alpha_top * alpha_bottom)


def fenske_minimum_stages(d_light: float, b_light: float, d_heavy: float, b_heavy: float,
                          alpha: float) -> float:
    """Minimum number of equilibrium stages at total reflux, Fenske (1932).

    .. math:: N_{min} = \\frac{\\ln[(d_{LK}/b_{LK})(b_{HK}/d_{HK})]}{\\ln \\alpha_{LK,HK}}

    Parameters
    ----------
    d_light : Light-key flow in the distillate [mol/s]
    b_light : Light-key flow in the bottoms [mol/s]
    d_heavy : Heavy-key flow in the distillate [mol/s]
    b_heavy : Heavy-key flow in the bottoms [mol/s]
    alpha : Mean relative volatility of light to heavy key [-]

    Notes
    -----
    Constant relative volatility; counts the reboiler (and a partial condenser) as stages.
    Any consistent flow unit works because only ratios enter.

    Examples
    --------
    >>> round(fenske_minimum_stages(0.95, 0.05, 0.05, 0.95, 1.0 / 0.21), 2)
    3.77

    References
    ----------
    1. Fenske, M.R. Fractionation of straight-run Pennsylvania gasoline. Ind. Eng. Chem.
       24 (1932) 482-485.
    """
    if alpha <= 1.0:
        raise InfeasibleSpecError(
            f"the light key is not more volatile than the heavy key (relative volatility {alpha:.4g}); "
            "choose keys in order of volatility at column conditions")
    return math.log((d_light / b_light) * (b_heavy / d_heavy)) / math.log(alpha)


def fenske_distribution(alpha: np.ndarray, feed: np.ndarray, d_heavy: float, b_heavy: float,
                        minimum_stages: float) -> np.ndarray:
    """Distillate flows of every component at total reflux from the Fenske equation.

    .. math:: \\frac{d_i}{b_i} = \\alpha_{i,HK}^{N_{min}} \\frac{d_{HK}}{b_{HK}},\\qquad
              d_i = \\frac{f_i\\,(d_i/b_i)}{1 + d_i/b_i}

    Parameters
    ----------
    alpha : Relative volatilities to the heavy key [-]
    feed : Component feed flows [mol/s]
    d_heavy : Heavy-key flow in the distillate [mol/s]
    b_heavy : Heavy-key flow in the bottoms [mol/s]
    minimum_stages : Minimum number of stages [-]

    Notes
    -----
    The non-key distribution at total reflux; a fair estimate at finite reflux (ref. 1).

    Examples
    --------
    >>> d = fenske_distribution(np.array([10.71, 4.762, 1.0]), np.array([40.0, 30.0, 30.0]), 1.5, 28.5, 3.77)
    >>> [round(float(v), 2) for v in d]
    [39.9, 28.49, 1.5]

    References
    ----------
    1. Seader, J.D., Henley, E.J., Roper, D.K. Separation Process Principles, 3rd ed.,
       Wiley, 2011, section 9.1.
    """
    log_ratio = minimum_stages * np.log(alpha) + math.log(d_heavy / b_heavy)
    return feed / (1.0 + np.exp(-np.clip(log_ratio, -700.0, 700.0)))


def underwood_function(phi: float, alpha: np.ndarray, flows: np.ndarray) -> float:
    """Underwood's sum, sum_i alpha_i n_i / (alpha_i - phi) [mol/s or -]."""
    return float(np.sum(alpha * flows / (alpha - phi)))


def underwood_roots(alpha: np.ndarray, z: np.ndarray, q: float, low: float, high: float) -> list[float]:
    """Roots of Underwood's feed equation lying between two volatilities, Underwood (1948).

    .. math:: \\sum_i \\frac{\\alpha_i z_i}{\\alpha_i - \\phi} = 1 - q

    Parameters
    ----------
    alpha : Relative volatilities to the heavy key [-]
    z : Feed mole fractions [-]
    q : Feed thermal condition, liquid fraction by enthalpy [-]
    low : Smallest volatility bounding the roots, the heavy key's [-]
    high : Largest volatility bounding the roots, the light key's [-]

    Notes
    -----
    One root lies between each pair of adjacent volatilities; the roots between the
    heavy and light key (and any component between them) give the minimum reflux.

    Examples
    --------
    >>> alpha = np.array([10.714, 4.762, 1.0])
    >>> [round(r, 4) for r in underwood_roots(alpha, np.array([0.4, 0.3, 0.3]), 1.0, 1.0, 4.762)]
    [1.3428]

    References
    ----------
    1. Underwood, A.J.V. Fractional distillation of multicomponent mixtures. Chem. Eng.
       Prog. 44 (1948) 603-614.
    """
    poles = sorted({float(a) for a, zi in zip(alpha, z) if low <= a <= high and zi > 0.0})  # absent: no pole
    roots = []
    for a, b in zip(poles[:-1], poles[1:]):
        gap = ROOT_GAP * (b - a)
        roots.append(brentq(lambda phi: underwood_function(phi, alpha, z) - (1.0 - q), a + gap, b - gap,
                            xtol=1e-14, rtol=1e-13))
    return roots


def underwood_minimum_vapour(alpha: np.ndarray, z: np.ndarray, q: float, distillate: np.ndarray,
                             light: int, heavy: int, feed: np.ndarray | None = None
                             ) -> tuple[float, np.ndarray, tuple]:
    """Minimum vapour flow from the top section, Underwood's second equation.

    .. math:: V_{min} = \\sum_i \\frac{\\alpha_i d_i}{\\alpha_i - \\phi_k}\\quad\\text{for every root } \\phi_k

    Parameters
    ----------
    alpha : Relative volatilities to the heavy key [-]
    z : Feed mole fractions [-]
    q : Feed thermal condition [-]
    distillate : Distillate flows of every component; the keys' are fixed, the others a guess [mol/s]
    light : Index of the light key [-]
    heavy : Index of the heavy key [-]
    feed : Component feed flows; given, non-keys outside the keys may distribute too [mol/s]

    Notes
    -----
    Underwood's Class 2 separation (ref. 1; set out in ref. 2, section 9.2, and ref. 3,
    chapter 9). Every component between the keys distributes; with ``feed`` given every
    non-key outside the keys is first taken as distributing too. The roots of the feed
    equation between the volatilities of the lightest and heaviest distributing
    components (one fewer than those components) each give one equation of the second
    kind, linear in V_min and the unknown distillate flows: a square system. A non-key
    outside the keys that comes out with d_i < 0 or d_i > f_i is fixed at that bound, and
    with it every component farther from the keys, and the system is solved again. Without
    ``feed`` the non-keys outside the keys keep the flows passed in. Returns V_min [mol/s],
    the distillate flows at minimum reflux [mol/s] and the roots used [-].

    Examples
    --------
    >>> v, d, r = underwood_minimum_vapour(np.array([10.714, 4.762, 1.0]), np.array([0.4, 0.3, 0.3]), 1.0,
    ...                                    np.array([40.0, 28.5, 1.5]), 1, 2)
    >>> round(v, 2)
    81.05

    References
    ----------
    1. Underwood, A.J.V. Fractional distillation of multicomponent mixtures. Chem. Eng.
       Prog. 44 (1948) 603-614.
    2. Seader, J.D., Henley, E.J., Roper, D.K. Separation Process Principles, 3rd ed.,
       Wiley, 2011, section 9.2 (Class 2 separations; section number from memory).
    3. King, C.J. Separation Processes, 2nd ed., McGraw-Hill, 1980, chapter 9 (from memory).
    """
    alpha = np.asarray(alpha, dtype=float)
    z = np.asarray(z, dtype=float)
    d = np.array(distillate, dtype=float)
    present = [i for i in range(len(alpha)) if z[i] > 0.0 and i not in (light, heavy)]
    between = [i for i in present if alpha[heavy] < alpha[i] < alpha[light]]
    outside = [] if feed is None else [i for i in present if i not in between]
    while True:
        v_min, d_free, roots = _underwood_system(alpha, z, q, d, light, heavy, between + outside)
        d[between + outside] = d_free
        bounds = {i: 0.0 if d[i] < 0.0 else feed[i] for i in outside if not 0.0 <= d[i] <= feed[i]}
        if not bounds:
            return v_min, d, roots
        for j, bound in bounds.items():
            side = 1.0 if alpha[j] > alpha[light] else -1.0
            # a non-key beyond one that does not distribute does not distribute either
            for i in [i for i in outside if side * (alpha[i] - alpha[j]) >= 0.0]:
                outside.remove(i)
                d[i] = bound if i == j else (feed[i] if side > 0.0 else 0.0)


def _underwood_system(alpha: np.ndarray, z: np.ndarray, q: float, d: np.ndarray, light: int, heavy: int,
                      unknown: list[int]) -> tuple[float, np.ndarray, tuple]:
    """V_min and the distillate flows of ``unknown`` from one equation per root."""
    volatilities = [alpha[i] for i in unknown + [light, heavy]]
    roots = underwood_roots(alpha, z, q, min(volatilities), max(volatilities))
    if len(roots) != 1 + len(unknown):
        raise InfeasibleSpecError(
            "two distributing components have the same relative volatility at the feed, so Underwood's "
            "equations cannot split them; choose keys that differ from the other components in volatility")
    fixed = d.copy()
    fixed[unknown] = 0.0
    matrix = np.zeros((len(roots), 1 + len(unknown)))
    rhs = np.zeros(len(roots))
    for k, phi in enumerate(roots):
        matrix[k, 0] = 1.0
        for col, i in enumerate(unknown, start=1):
            matrix[k, col] = -alpha[i] / (alpha[i] - phi)
        rhs[k] = underwood_function(phi, alpha, fixed)
    solution = np.linalg.solve(matrix, rhs)
    return float(solution[0]), solution[1:], tuple(roots)


def gilliland_molokanov(X: float, policy: OutOfRange = OutOfRange.RAISE,
                        warnings: list[str] | None = None) -> float:
    """Gilliland's correlation in the closed form of Molokanov et al. (1972).

    .. math:: Y = 1 - \\exp\\left[\\frac{1 + 54.4X}{11 + 117.2X}\\,\\frac{X - 1}{\\sqrt{X}}\\right],
              \\quad X = \\frac{R - R_{min}}{R + 1},\\quad Y = \\frac{N - N_{min}}{N + 1}

    Parameters
    ----------
    X : Reflux parameter (R - Rmin)/(R + 1) [-]
    policy : What to do when X is outside 0 to 1 [-]
    warnings : List that collects a warning under the WARN policy [-]

    Notes
    -----
    Fits Gilliland's chart over its whole range 0 <= X <= 1 and meets its end points
    (Y = 1 at X = 0, Y = 0 at X = 1). N and Nmin count the reboiler.

    Examples
    --------
    >>> round(gilliland_molokanov(0.1), 4)
    0.5537

    References
    ----------
    1. Molokanov, Y.K., Korablina, T.P., Mazurina, N.I., Nikiforov, G.A. An approximation
       method for calculating the basic parameters of multicomponent fractionation. Int.
       Chem. Eng. 12 (1972) 209-212.
    2. Gilliland, E.R. Multicomponent rectification. Ind. Eng. Chem. 32 (1940) 1220-1223.
    """
    MOLOKANOV_RANGE.check(X, policy, warnings)
    if X <= 0.0:
        return 1.0
    return 1.0 - math.exp((1.0 + 54.4 * X) / (11.0 + 117.2 * X) * (X - 1.0) / math.sqrt(X))


def gilliland_eduljee(X: float) -> float:
    """Gilliland's correlation in the closed form of Eduljee (1975).

    .. math:: Y = 0.75\\,(1 - X^{0.5668})

    Parameters
    ----------
    X : Reflux parameter (R - Rmin)/(R + 1) [-]

    Notes
    -----
    A simpler fit, kept as a cross-check of the Molokanov form; valid 0.01 < X < 0.9
    roughly (it gives Y = 0.75, not 1, at X = 0).

    Examples
    --------
    >>> round(gilliland_eduljee(0.1), 4)
    0.5466

    References
    ----------
    1. Eduljee, H.E. Equations replace Gilliland plot. Hydrocarbon Processing 54(9)
       (1975) 120.
    """
    return 0.75 * (1.0 - X ** 0.5668)


def stages_from_gilliland(minimum_stages: float, minimum_reflux: float, reflux: float) -> float:
    """Equilibrium stages at reflux R from Nmin and Rmin by Gilliland (Molokanov form).

    .. math:: N = \\frac{N_{min} + Y}{1 - Y}

    Parameters
    ----------
    minimum_stages : Minimum number of stages, Fenske [-]
    minimum_reflux : Minimum reflux ratio, Underwood [-]
    reflux : Reflux ratio L0/D, above the minimum [-]

    Notes
    -----
    Solves Y = (N - Nmin)/(N + 1) for N with Y from :func:`gilliland_molokanov`.

    Examples
    --------
    >>> round(stages_from_gilliland(3.77, 0.50, 0.65), 2)
    9.92

    References
    ----------
    1. Molokanov, Y.K. et al. Int. Chem. Eng. 12 (1972) 209-212.
    """
    if reflux <= minimum_reflux:
        raise InfeasibleSpecError(f"reflux ratio {reflux:.4g} is at or below the minimum reflux "
                                  f"{minimum_reflux:.4g}: no number of stages reaches the specification")
    Y = gilliland_molokanov((reflux - minimum_reflux) / (reflux + 1.0))
    return (minimum_stages + Y) / (1.0 - Y) if Y < 1.0 else math.inf


def kirkbride_ratio(z_light: float, z_heavy: float, x_light_bottoms: float, x_heavy_distillate: float,
                    bottoms: float, distillate: float) -> float:
    """Ratio of stages above to stages below the feed, Kirkbride (1944).

    .. math:: \\frac{N_R}{N_S} = \\left[\\frac{z_{HK}}{z_{LK}}
              \\left(\\frac{x_{LK,B}}{x_{HK,D}}\\right)^2 \\frac{B}{D}\\right]^{0.206}

    Parameters
    ----------
    z_light : Light-key mole fraction in the feed [-]
    z_heavy : Heavy-key mole fraction in the feed [-]
    x_light_bottoms : Light-key mole fraction in the bottoms [-]
    x_heavy_distillate : Heavy-key mole fraction in the distillate [-]
    bottoms : Bottoms molar flow [mol/s]
    distillate : Distillate molar flow [mol/s]

    Notes
    -----
    N_R counts the stages above the feed stage, N_S the feed stage and those below it
    (reboiler included). An empirical fit; flows in any consistent unit.

    Examples
    --------
    >>> round(kirkbride_ratio(0.3, 0.3, 0.0025, 0.0214, 30.0, 70.0), 3)
    0.347

    References
    ----------
    1. Kirkbride, C.G. Process design procedure for multicomponent fractionators.
       Petroleum Refiner 23(9) (1944) 87-102.
    """
    return ((z_heavy / z_light) * (x_light_bottoms / x_heavy_distillate) ** 2 * bottoms / distillate) \
        ** KIRKBRIDE_EXPONENT


def fenske_section_ratio(z_light: float, z_heavy: float, x_light_distillate: float, x_heavy_distillate: float,
                         x_light_bottoms: float, x_heavy_bottoms: float) -> float:
    """Ratio of stages above to stages below the feed from Fenske's equation applied to each section
    between the feed and its product, at one relative volatility (which cancels).

    .. math:: \\frac{N_R}{N_S} = \\ln\\left[\\frac{x_{LK,D}/x_{HK,D}}{z_{LK}/z_{HK}}\\right] \\Big/
              \\ln\\left[\\frac{z_{LK}/z_{HK}}{x_{LK,B}/x_{HK,B}}\\right]

    Mole fractions [-]. Common practice, no source. Unlike Kirkbride's fit it weighs each product's
    purity by its logarithm: with a 10 ppm light-key loss against a 2 % heavy-key slip Kirkbride put a
    depentaniser's feed on stage 3 of 41 (no reflux met the specifications there), this ratio on stage 11.

    Examples
    --------
    >>> round(fenske_section_ratio(0.25, 0.25, 0.98, 0.02, 0.02, 0.98), 3)
    1.0
    """
    feed = z_light / z_heavy
    return (math.log((x_light_distillate / x_heavy_distillate) / feed)
            / math.log(feed / (x_light_bottoms / x_heavy_bottoms)))


def kirkbride_feed_stage(stages: float, ratio: float) -> int:
    """Feed stage counted from the top from the total stages and a ratio N_R/N_S [-] (Kirkbride's, or
    :func:`fenske_section_ratio`).

    .. math:: f = \\mathrm{round}\\left(\\frac{N\\,r}{1 + r}\\right) + 1

    Parameters
    ----------
    stages : Number of equilibrium stages, reboiler included [-]
    ratio : Kirkbride ratio N_R/N_S [-]

    Notes
    -----
    Kept between stage 1 and the stage above the reboiler.

    Examples
    --------
    >>> kirkbride_feed_stage(10.0, 0.347)
    4

    References
    ----------
    1. Kirkbride, C.G. Petroleum Refiner 23(9) (1944) 87-102.
    """
    above = round(stages * ratio / (1.0 + ratio))
    return int(min(max(above + 1, 1), max(math.ceil(stages) - 1, 1)))
