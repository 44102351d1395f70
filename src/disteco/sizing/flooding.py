"""Sieve-tray flooding by Fair's correlation: capacity factor, flooding velocity, tray area.

Fair's chart gives the flooding capacity factor C (the Souders-Brown K at flood) against
the flow parameter F_LV for tray spacings from 6 to 36 in. Two published fits of the chart
are offered; both are kept so that their spread (about 10 %) stays visible:

- ``lygeros-magoulas`` (default): one closed form over all spacings. It decreases
  monotonically with F_LV everywhere.
- ``kessler-wankat``: one quadratic in log10 F_LV per charted spacing, interpolated
  linearly in spacing. Its quadratic turns over, so at F_LV below about 0.02-0.04 it
  decreases as F_LV decreases, unlike the chart, which levels off.

Every relation here is written once over an operations namespace
(:class:`disteco._base.operations.Operations`, floats by default): the sizing layer and the
optimisation model (which passes Pyomo's functions) evaluate the same code, whichever fit
``SizingOptions.flooding_method`` names. The tray spacing is a constant of the model, so the
Kessler-Wankat interpolation in spacing happens on numbers.

Measured over the chart (6-36 in, F_LV 0.02-1.0) the two fits differ by -13 % to +10 %
(Lygeros-Magoulas lower near F_LV 0.05 at 24-36 in, higher near F_LV 0.5 at 9-18 in); at
F_LV = 0.01 Lygeros-Magoulas is up to 15 % higher because the other fit turns over there.
The diameter goes as C^-1/2, so the Lygeros-Magoulas diameter lies -5 % to +7 % from the
other fit's (-7 % at F_LV = 0.01): up to 0.1 m, two rounding steps, on a 1.5 m column.
No digitised chart is shipped: without the original figure at hand, points read "from
memory" would be invented; the two published fits are checked against each other and
against chart readings of a worked example (tests/test_sizing_flooding.py).
"""

from __future__ import annotations

import math

from .._base.operations import FLOAT, Operations
from .._base.units import FOOT
from .._base.validity import ValidityRange

INCH = 0.0254  # m
MILLIMETRE = 1e-3  # m
DYNE_PER_CM = 1e-3  # N/m
FAIR_REFERENCE_SURFACE_TENSION = 20.0 * DYNE_PER_CM  # N/m

_FAIR_SOURCE = "Fair (1961) chart range, as reproduced in Seader, Henley and Roper, 3rd ed., Fig. 6.24"
FLOW_PARAMETER_RANGE = ValidityRange("Fair flooding chart", "flow parameter", 0.01, 1.0, "-", _FAIR_SOURCE)
TRAY_SPACING_RANGE = ValidityRange("Fair flooding chart", "tray spacing", 6.0 * INCH, 36.0 * INCH, "m",
                                   _FAIR_SOURCE)


LN10 = math.log(10.0)


def capacity_factor_lygeros_magoulas(flow_parameter, tray_spacing, ops: Operations = FLOAT):
    r"""Flooding capacity factor of sieve trays, closed-form fit of Fair's chart by Lygeros and Magoulas.

    .. math::
        C_F = 0.0105 + 8.127\times10^{-4}\,TS^{0.755}\exp(-1.463\,F_{LV}^{0.842})

    with TS in mm and C_F in m/s, for a surface tension of 20 dyn/cm.

    Parameters
    ----------
    flow_parameter : float
        Flow parameter F_LV = (L/V) (rho_V/rho_L)^0.5 on a mass basis [-]
    tray_spacing : float
        Tray spacing [m]
    ops : Operations
        exp, log, sqrt of the numbers used: floats by default, Pyomo's in the model [-]

    Returns
    -------
    float
        Capacity factor at flood at sigma = 20 dyn/cm [m/s]

    Notes
    -----
    No branches, so the expression is valid for Pyomo variables. Range of the chart:
    F_LV 0.01 to 1.0, TS 6 to 36 in (0.15 to 0.91 m); ranges are checked by the caller
    (:data:`FLOW_PARAMETER_RANGE`, :data:`TRAY_SPACING_RANGE`). Source units: TS in mm,
    C_F in m/s. Departs from the per-curve fit of Kessler and Wankat by up to about 10 %.

    Examples
    --------
    >>> round(capacity_factor_lygeros_magoulas(0.1, 0.6096), 4)
    0.0939

    References
    ----------
    1. Lygeros, A. I., and K. G. Magoulas, Hydrocarbon Processing 65(12), 43 (1986).
    2. Seader, J. D., E. J. Henley and D. K. Roper, Separation Process Principles, 3rd ed.,
       Wiley (2011), Section 6.6 (quotes the fit).
    """
    c0, c1, c2, c3 = lygeros_magoulas_constants(tray_spacing)
    return c0 + c1 * ops.exp(-c2 * flow_parameter ** c3)


def lygeros_magoulas_constants(tray_spacing: float) -> tuple[float, float, float, float]:
    """(c0 [m/s], c1 [m/s], c2 [-], c3 [-]) of C_F = c0 + c1 exp(-c2 F_LV^c3) at one tray spacing [m].

    The Lygeros-Magoulas fit at a fixed spacing, in the form an equation model takes as constants.
    """
    return (0.0105, 8.127e-4 * (tray_spacing / MILLIMETRE) ** 0.755, 1.463, 0.842)


# log10(C_F [ft/s]) = a0 + a1 log10(F_LV) + a2 log10(F_LV)^2, one row per charted spacing [in].
_KESSLER_WANKAT = (
    (6.0, -1.1977, -0.53143, -0.18760),
    (9.0, -1.1622, -0.56014, -0.18168),
    (12.0, -1.0674, -0.55780, -0.17919),
    (18.0, -1.0262, -0.63513, -0.20097),
    (24.0, -0.94506, -0.70234, -0.22618),
    (36.0, -0.85984, -0.73980, -0.23735),
)


def capacity_factor_kessler_wankat(flow_parameter, tray_spacing, ops: Operations = FLOAT):
    r"""Flooding capacity factor of sieve trays, per-spacing fits of Fair's chart by Kessler and Wankat.

    .. math::
        \log_{10} C_F = a_0 + a_1 \log_{10} F_{LV} + a_2 (\log_{10} F_{LV})^2

    with C_F in ft/s and one set (a0, a1, a2) for each charted spacing (6, 9, 12, 18, 24,
    36 in); between spacings log10 C_F is interpolated linearly in spacing, which is the
    same as interpolating the constants (:func:`kessler_wankat_constants`).

    Parameters
    ----------
    flow_parameter : float
        Flow parameter F_LV = (L/V) (rho_V/rho_L)^0.5 on a mass basis [-]
    tray_spacing : float
        Tray spacing, 6 to 36 in [m]
    ops : Operations
        exp, log, sqrt of the numbers used: floats by default, Pyomo's in the model [-]

    Returns
    -------
    float
        Capacity factor at flood at sigma = 20 dyn/cm [m/s]

    Notes
    -----
    Valid for F_LV 0.01 to 1.0 and TS 6 to 36 in; source units ft/s and in. The
    coefficients are quoted from memory of the table in reference 2; they agree with the
    Lygeros-Magoulas fit within about 10 % over the chart, which supports them. The
    quadratic has its maximum at F_LV = 0.02-0.04, so at lower F_LV this fit falls while
    the chart levels off.

    Examples
    --------
    >>> round(capacity_factor_kessler_wankat(0.1, 24 * 0.0254), 4)
    0.1035

    References
    ----------
    1. Kessler, D. P., and P. C. Wankat, Chem. Eng. 95(13), 72 (1988).
    2. Wankat, P. C., Separation Process Engineering, 3rd ed., Prentice Hall (2012), Chapter 10.
    """
    a0, a1, a2 = kessler_wankat_constants(tray_spacing)
    log_flv = ops.log(flow_parameter) / LN10
    return FOOT * ops.exp(LN10 * (a0 + a1 * log_flv + a2 * log_flv * log_flv))


def kessler_wankat_constants(tray_spacing: float) -> tuple[float, float, float]:
    """(a0, a1, a2) of log10(C_F [ft/s]) = a0 + a1 log10 F_LV + a2 (log10 F_LV)^2 at one spacing [m].

    Linear interpolation between the charted spacings; ``CorrelationRangeError`` outside 6-36 in.
    """
    spacing_in = tray_spacing / INCH
    if not _KESSLER_WANKAT[0][0] <= spacing_in <= _KESSLER_WANKAT[-1][0]:
        TRAY_SPACING_RANGE.check(tray_spacing)
    for low, high in zip(_KESSLER_WANKAT, _KESSLER_WANKAT[1:]):
        if spacing_in <= high[0]:
            w = (spacing_in - low[0]) / (high[0] - low[0])
            return tuple((1.0 - w) * a + w * b for a, b in zip(low[1:], high[1:]))
    raise AssertionError("unreachable: spacing checked above")


FLOODING_METHODS = {
    "lygeros-magoulas": capacity_factor_lygeros_magoulas,
    "kessler-wankat": capacity_factor_kessler_wankat,
}


def surface_tension_correction(surface_tension):
    r"""Fair's surface-tension correction of the flooding capacity factor.

    .. math::
        C = C_{20} \left(\frac{\sigma}{20\ \mathrm{dyn/cm}}\right)^{0.2}

    Parameters
    ----------
    surface_tension : float
        Liquid surface tension [N/m]

    Returns
    -------
    float
        Factor multiplying the capacity factor read at 20 dyn/cm [-]

    Notes
    -----
    Source units dyn/cm (= mN/m). Widely applied from about 5 to 80 dyn/cm.

    Examples
    --------
    >>> round(surface_tension_correction(0.057), 3)
    1.233

    References
    ----------
    1. Fair, J. R., Petro/Chem Engineer 33(10), 45 (1961).
    2. Sinnott, R. K., Coulson and Richardson's Chemical Engineering Vol. 6, 4th ed.,
       Elsevier (2005), Eq. 11.81.
    """
    return (surface_tension / FAIR_REFERENCE_SURFACE_TENSION) ** 0.2


def flow_parameter(liquid_mass_flow, vapour_mass_flow, liquid_density, vapour_density):
    r"""Flow parameter of a tray, as used by Fair's flooding chart.

    .. math::
        F_{LV} = \frac{L}{V}\sqrt{\frac{\rho_V}{\rho_L}}

    Parameters
    ----------
    liquid_mass_flow : float
        Liquid mass flow [kg/s]
    vapour_mass_flow : float
        Vapour mass flow [kg/s]
    liquid_density : float
        Liquid density [kg/m^3]
    vapour_density : float
        Vapour density [kg/m^3]

    Returns
    -------
    float
        Flow parameter [-]

    Notes
    -----
    Dimensionless in any consistent units.

    Examples
    --------
    >>> round(flow_parameter(2.0, 2.5, 800.0, 2.8), 4)
    0.0473

    References
    ----------
    1. Fair, J. R., Petro/Chem Engineer 33(10), 45 (1961).
    """
    return liquid_mass_flow / vapour_mass_flow * (vapour_density / liquid_density) ** 0.5


def downcomer_area_fraction(flow_parameter, ops: Operations = FLOAT):
    r"""Downcomer area as a fraction of the column cross-section, from the flow parameter.

    .. math::
        A_d/A_T = 0.1 \;(F_{LV} \le 0.1);\quad 0.1 + (F_{LV} - 0.1)/9 \;(0.1 < F_{LV} < 1);
        \quad 0.2 \;(F_{LV} \ge 1)

    Parameters
    ----------
    flow_parameter : float
        Flow parameter [-]
    ops : Operations
        exp, log, sqrt and smooth max of the numbers used: floats by default, Pyomo's in the model [-]

    Returns
    -------
    float
        Downcomer area over total cross-section [-]

    Notes
    -----
    A rule for preliminary design: more liquid needs more downcomer. Quoted from memory.
    The two corners are rounded by the smooth max and min of ``ops`` (width 1e-4), the same
    for floats and the model: at most 5e-5 above the sharp rule, at the corners.

    Examples
    --------
    >>> round(downcomer_area_fraction(0.55), 3)
    0.15

    References
    ----------
    1. Seader, J. D., E. J. Henley and D. K. Roper, Separation Process Principles, 3rd ed.,
       Wiley (2011), Section 6.6.
    """
    return ops.min(0.2, ops.max(0.1, 0.1 + (flow_parameter - 0.1) / 9.0))


def flooding_velocity(capacity_factor, liquid_density, vapour_density, ops: Operations = FLOAT):
    r"""Vapour velocity at flood through the net area, Souders-Brown form.

    .. math::
        u_f = C \sqrt{\frac{\rho_L - \rho_V}{\rho_V}}

    Parameters
    ----------
    capacity_factor : float
        Capacity factor at flood, corrected for surface tension [m/s]
    liquid_density : float
        Liquid density [kg/m^3]
    vapour_density : float
        Vapour density [kg/m^3]
    ops : Operations
        exp, log, sqrt of the numbers used: floats by default, Pyomo's in the model [-]

    Returns
    -------
    float
        Flooding vapour velocity based on the net area [m/s]

    Notes
    -----
    Any consistent units; checked against ``fluids.separator.v_Souders_Brown``
    (tests/test_sizing_flooding.py).

    Examples
    --------
    >>> round(flooding_velocity(0.093, 954.0, 0.72), 2)
    3.38

    References
    ----------
    1. Souders, M., and G. G. Brown, Ind. Eng. Chem. 26, 98 (1934).
    2. Bell, C., fluids library, ``fluids.separator.v_Souders_Brown``.
    """
    return capacity_factor * ops.sqrt((liquid_density - vapour_density) / vapour_density)


def allowable_vapour_velocity(flow_parameter, liquid_density, vapour_density, surface_tension, tray_spacing,
                              flood_fraction, method="lygeros-magoulas", system_factor=1.0, downcomer_fraction=None,
                              ops: Operations = FLOAT):
    r"""Vapour velocity on the total tray cross-section at the design approach to flood, with any flooding fit.

    .. math::
        u_{A_T} = f\,u_f\,(1 - A_d/A_T),\qquad
        u_f = C_F(F_{LV}, TS)\,(\sigma/0.02)^{0.2}\,SF\,\sqrt{(\rho_L - \rho_V)/\rho_V}

    Parameters
    ----------
    flow_parameter : float
        Flow parameter of the tray, :func:`flow_parameter` [-]
    liquid_density : float
        Liquid density [kg/m^3]
    vapour_density : float
        Vapour density [kg/m^3]
    surface_tension : float
        Liquid surface tension [N/m]
    tray_spacing : float
        Tray spacing [m]
    flood_fraction : float
        Design fraction of flooding velocity [-]
    method : str
        Key of :data:`FLOODING_METHODS` [-]
    system_factor : float
        Foaming (system) factor on the capacity [-]
    downcomer_fraction : float or None
        Downcomer area over total cross-section; None applies :func:`downcomer_area_fraction` [-]
    ops : Operations
        exp, log, sqrt and smooth max: floats by default, Pyomo's in the model [-]

    Returns
    -------
    float
        Allowable vapour velocity on the total cross-section [m/s]

    Notes
    -----
    Ranges as in the fit chosen (:data:`FLOW_PARAMETER_RANGE`, :data:`TRAY_SPACING_RANGE`),
    checked by the caller. The tray needs the cross-section (vapour volume flow) / (this
    velocity), :func:`required_tray_area`; the optimisation model writes its flooding
    constraint as area x this velocity >= vapour volume flow, which keeps the division out,
    and passes the flow parameter as one shared subexpression (it enters the fit and the
    downcomer rule several times).

    Examples
    --------
    >>> round(allowable_vapour_velocity(0.0473, 800.0, 2.8, 0.02, 0.6096, 0.8, downcomer_fraction=0.1), 3)
    1.246

    References
    ----------
    1. Fair, J. R., Petro/Chem Engineer 33(10), 45 (1961).
    2. Lygeros, A. I., and K. G. Magoulas, Hydrocarbon Processing 65(12), 43 (1986).
    """
    flv = flow_parameter
    c = FLOODING_METHODS[method](flv, tray_spacing, ops) * surface_tension_correction(surface_tension) * system_factor
    u_flood = flooding_velocity(c, liquid_density, vapour_density, ops)
    fraction = downcomer_area_fraction(flv, ops) if downcomer_fraction is None else downcomer_fraction
    return flood_fraction * u_flood * (1.0 - fraction)


def required_tray_area(vapour_mass_flow, liquid_mass_flow, liquid_density, vapour_density, surface_tension,
                       tray_spacing, flood_fraction, method="lygeros-magoulas", system_factor=1.0,
                       downcomer_fraction=None, ops: Operations = FLOAT):
    r"""Total tray (column) cross-section for a design fraction of flood, with any flooding fit.

    .. math::
        A_T = \frac{\dot m_V/\rho_V}{u_{A_T}}

    with u_{A_T} from :func:`allowable_vapour_velocity`.

    Parameters
    ----------
    vapour_mass_flow : float
        Vapour mass flow [kg/s]
    liquid_mass_flow : float
        Liquid mass flow [kg/s]
    liquid_density : float
        Liquid density [kg/m^3]
    vapour_density : float
        Vapour density [kg/m^3]
    surface_tension : float
        Liquid surface tension [N/m]
    tray_spacing : float
        Tray spacing [m]
    flood_fraction : float
        Design fraction of flooding velocity [-]
    method : str
        Key of :data:`FLOODING_METHODS` [-]
    system_factor : float
        Foaming (system) factor on the capacity [-]
    downcomer_fraction : float or None
        Downcomer area over total cross-section; None applies :func:`downcomer_area_fraction` [-]
    ops : Operations
        exp, log, sqrt and smooth max: floats by default, Pyomo's in the model [-]

    Returns
    -------
    float
        Total cross-section the tray needs [m^2]

    Notes
    -----
    As :func:`allowable_vapour_velocity`. The sizing layer and the optimisation model both
    call these functions.

    Examples
    --------
    >>> round(required_tray_area(3.0, 2.4, 800.0, 2.8, 0.02, 0.6096, 0.8, downcomer_fraction=0.1), 4)
    0.8601

    References
    ----------
    1. Fair, J. R., Petro/Chem Engineer 33(10), 45 (1961).
    2. Lygeros, A. I., and K. G. Magoulas, Hydrocarbon Processing 65(12), 43 (1986).
    """
    flv = flow_parameter(liquid_mass_flow, vapour_mass_flow, liquid_density, vapour_density)
    velocity = allowable_vapour_velocity(flv, liquid_density, vapour_density, surface_tension, tray_spacing,
                                         flood_fraction, method, system_factor, downcomer_fraction, ops)
    return vapour_mass_flow / vapour_density / velocity


def tray_area(diameter):
    """Cross-section of a column of ``diameter`` [m]: pi D^2 / 4 [m^2]."""
    return math.pi / 4.0 * diameter ** 2


def diameter_of(area, ops: Operations = FLOAT):
    """Diameter of a circular cross-section ``area`` [m^2]: sqrt(4 A / pi) [m]."""
    return ops.sqrt(4.0 * area / math.pi)
