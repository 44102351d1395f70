"""Purchased-cost curves and the factors that turn them into installed cost.

The functions are the published equations with their constants as arguments; the
constants themselves live in ``cost_data/`` and arrive here through the record
dataclasses (``CostCurve`` and friends), which also expose them to the optimisation
model. ``CostCurve.expression`` takes an operations namespace (floats by default), so
the same numbers build a float or a Pyomo expression.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .._base.operations import FLOAT, SMOOTH_WIDTH, Operations
from .._base.units import ATMOSPHERE
from .._base.validity import OutOfRange, ValidityRange

LN10 = math.log(10.0)
BAR = 1e5  # Pa
KILOWATT = 1e3  # W

# SI value of one source size unit; a cost-data size unit must be one of these.
SI_PER_SIZE_UNIT = {"m3": 1.0, "m2": 1.0, "m": 1.0, "kW": KILOWATT}


def turton_purchased_cost(size, k1: float, k2: float, k3: float, ops: Operations = FLOAT):
    """Purchased equipment cost at base conditions, Turton et al. Appendix A.

    .. math::
        \\log_{10} C_p^0 = K_1 + K_2 \\log_{10} A + K_3 (\\log_{10} A)^2

    Parameters
    ----------
    size : float
        Capacity or size parameter A in the source's unit (m3, m2 or kW) [source unit]
    k1 : float
        Constant K1 [-]
    k2 : float
        Constant K2 [-]
    k3 : float
        Constant K3 [-]
    ops : Operations
        exp and log of the numbers used: floats by default, Pyomo's in the model [-]

    Returns
    -------
    float
        Purchased cost, carbon steel, near-ambient pressure, at the base cost index [USD]

    Notes
    -----
    Valid inside the size range printed next to each row of the source's table (kept
    with the constants in ``purchased_cost_correlations.csv``). Base: CEPCI 397 (2001).

    Examples
    --------
    Floating-head exchanger of 100 m2 (constants of the cost-data row):

    >>> round(turton_purchased_cost(100.0, 4.8306, -0.8509, 0.3187))
    25328

    References
    ----------
    1. Turton, R., Bailie, R. C., Whiting, W. B., Shaeiwitz, J. A., Bhattacharyya, D.
       Analysis, Synthesis and Design of Chemical Processes, 4th ed., Prentice Hall,
       2012, Appendix A, Table A.1.
    """
    log_a = ops.log(size) / LN10
    return ops.exp(LN10 * (k1 + k2 * log_a + k3 * log_a * log_a))


def held_to_tangents(size, smallest: float, largest: float, k1: float, k2: float, k3: float,
                     ops: Operations = FLOAT):
    """Purchased cost of :func:`turton_purchased_cost` between ``smallest`` and ``largest``, continued beyond
    them along the curve's tangents in log-log coordinates (value and slope kept: differentiable for the model).

    .. math::
        \log_{10} C = K_1 + K_2 u + K_3 u^2 - K_3 [\min(u - u_s, 0)^2 + \max(u - u_l, 0)^2],
        \quad u = \log_{10} A

    (beyond :math:`u_s = \log_{10} A_s` or :math:`u_l = \log_{10} A_l` the last terms cancel the
    quadratic's curvature: the tangent line there, a power law). Not the source's: the constants are
    fitted over a size range, and a quadratic with :math:`K_3 > 0` rises again below its lowest point, so
    that a 0.05 m2 exchanger read 99 000 USD and a 10 m2 one 15 000 USD (2001), and steepens above it (a
    93 m2 sieve tray, 7.5 x the range's largest, 258 000 USD a tray; 127 000 on the tangent). A tangent
    with a slope of zero or more below holds the price of the smallest unit built; a power law above is
    the usual way to scale a cost beyond its data (both common practice, no source). The max and the
    distance from the range's centre are smooth (:meth:`Operations.max`).

    Parameters
    ----------
    size : float
        Size A in the source's unit [source unit]
    smallest : float
        Size A_s below which the lower tangent holds [source unit]
    largest : float
        Size A_l above which the upper tangent holds [source unit]
    k1, k2, k3 : float
        The curve's constants [-]
    ops : Operations
        exp, log, sqrt of the numbers used [-]

    Returns
    -------
    float
        Purchased cost at the base cost index [USD]

    Examples
    --------
    The fixed-tube-sheet row (range 10-1000 m2): equal inside, nearly flat below.

    >>> k = (4.3247, -0.3030, 0.1634)
    >>> round(held_to_tangents(100.0, 10.0, 1000.0, *k)) == round(turton_purchased_cost(100.0, *k))
    True
    >>> round(held_to_tangents(0.05, 10.0, 1000.0, *k)), round(turton_purchased_cost(0.05, *k))
    (13500, 98968)
    """
    log_a = ops.log(size) / LN10
    if k3 == 0.0:  # a straight line is its own tangent
        return ops.exp(LN10 * (k1 + k2 * log_a))
    # Written so that log_a appears three times, as in the quadratic itself: each appearance is written into
    # the model's file and evaluated apart, and the plain form (eleven) made every solve 9 % slower on the
    # benzene example. The quadratic about its vertex; the distance outside [u_s, u_l] as the
    # smooth max of a smooth |u - centre| less the half width (both at most 1e-8 off inside the range).
    low, high = math.log10(smallest), math.log10(largest)
    vertex = -k2 / (2.0 * k3)
    centre = ops.sqrt((log_a - 0.5 * (low + high)) ** 2 + SMOOTH_WIDTH ** 2)
    outside = ops.max(centre - 0.5 * (high - low), 0.0)
    return ops.exp(LN10 * (k1 - k2 * k2 / (4.0 * k3) + k3 * ((log_a - vertex) ** 2 - outside ** 2)))


def pressure_factor_polynomial(pressure_gauge: float, c1: float, c2: float, c3: float,
                               pressure_min_gauge: float) -> float:
    """Pressure factor of exchangers and pumps, Turton et al. Appendix A.

    .. math::
        \\log_{10} F_P = C_1 + C_2 \\log_{10} P + C_3 (\\log_{10} P)^2

    with P in barg; below the source's lower pressure the factor is 1.

    Parameters
    ----------
    pressure_gauge : float
        Design pressure above atmospheric [Pa]
    c1 : float
        Constant C1 [-]
    c2 : float
        Constant C2 [-]
    c3 : float
        Constant C3 [-]
    pressure_min_gauge : float
        Pressure below which the factor is 1 [Pa]

    Returns
    -------
    float
        Pressure factor F_P [-]

    Notes
    -----
    The source gives the constants for P in barg over a stated range (5 to 140 barg for
    shell-and-tube exchangers, 10 to 100 barg for centrifugal pumps).

    Examples
    --------
    Shell-and-tube exchanger at 20 barg:

    >>> round(pressure_factor_polynomial(20e5, 0.03881, -0.11272, 0.08183, 5e5), 4)
    1.0732

    References
    ----------
    1. Turton et al., Analysis, Synthesis and Design of Chemical Processes, 4th ed.,
       2012, Appendix A, Table A.2.
    """
    if pressure_gauge < pressure_min_gauge:
        return 1.0
    log_p = math.log10(pressure_gauge / BAR)
    return 10.0 ** (c1 + c2 * log_p + c3 * log_p * log_p)


def vessel_pressure_factor(pressure_gauge: float, diameter: float, allowable_stress: float,
                           pressure_coefficient: float, corrosion_allowance: float,
                           minimum_thickness: float) -> float:
    """Pressure factor of a process vessel from its wall thickness, Turton et al. Appendix A.

    .. math::
        F_P = \\frac{\\frac{(P+1) D}{2 [S E - 0.6 (P+1)]} + CA}{t_{min}}, \\quad F_P \\ge 1

    with P in barg and S E in bar (the source's 850 bar: carbon steel, weld efficiency 0.9).

    Parameters
    ----------
    pressure_gauge : float
        Design pressure above atmospheric [Pa]
    diameter : float
        Vessel diameter [m]
    allowable_stress : float
        Allowable stress times weld efficiency S E [Pa]
    pressure_coefficient : float
        Coefficient of the pressure in the denominator (0.6 in the source) [-]
    corrosion_allowance : float
        Corrosion allowance CA [m]
    minimum_thickness : float
        Wall thickness the base cost assumes t_min [m]

    Returns
    -------
    float
        Pressure factor F_P, at least 1 [-]

    Notes
    -----
    The source adds 1 bar to the gauge pressure as a design margin. Vacuum vessels
    (below -0.5 barg) take a fixed factor instead; the caller handles that case.

    Examples
    --------
    A 2 m tower at 10 barg:

    >>> round(vessel_pressure_factor(10e5, 2.0, 850e5, 0.6, 0.00315, 0.0063), 3)
    2.57

    References
    ----------
    1. Turton et al., Analysis, Synthesis and Design of Chemical Processes, 4th ed.,
       2012, Appendix A (pressure factors for process vessels).
    """
    p_design = pressure_gauge / BAR + 1.0
    stress = allowable_stress / BAR
    thickness = p_design * diameter / (2.0 * (stress - pressure_coefficient * p_design)) + corrosion_allowance
    return max(1.0, thickness / minimum_thickness)


def tray_quantity_factor(trays: int, c1: float, c2: float, c3: float, trays_max: int) -> float:
    """Quantity factor for the cost of several trays, Turton et al. Appendix A.

    .. math::
        \\log_{10} F_q = C_1 + C_2 \\log_{10} N + C_3 (\\log_{10} N)^2, \\quad N < 20;
        \\qquad F_q = 1, \\quad N \\ge 20

    Parameters
    ----------
    trays : int
        Number of trays N [-]
    c1 : float
        Constant [-]
    c2 : float
        Constant [-]
    c3 : float
        Constant [-]
    trays_max : int
        Number of trays from which F_q = 1 [-]

    Returns
    -------
    float
        Quantity factor F_q [-]

    Notes
    -----
    Few trays cost more each (set-up of the fabrication); from 20 trays the factor is 1.

    Examples
    --------
    >>> round(tray_quantity_factor(10, 0.4771, 0.08516, -0.3473, 20), 3)
    1.64

    References
    ----------
    1. Turton et al., Analysis, Synthesis and Design of Chemical Processes, 4th ed.,
       2012, Appendix A (trays).
    """
    if trays >= trays_max:
        return 1.0
    log_n = math.log10(trays)
    return 10.0 ** (c1 + c2 * log_n + c3 * log_n * log_n)


def bare_module_factor(b1: float, b2: float, material_factor: float, pressure_factor: float) -> float:
    """Bare-module (installed) cost factor, Turton et al. Appendix A.

    .. math::
        F_{BM} = B_1 + B_2 F_M F_P

    Parameters
    ----------
    b1 : float
        Constant B1 [-]
    b2 : float
        Constant B2 [-]
    material_factor : float
        Material factor F_M [-]
    pressure_factor : float
        Pressure factor F_P [-]

    Returns
    -------
    float
        Bare-module factor F_BM [-]

    Notes
    -----
    The bare-module cost is C_BM = C_p^0 F_BM: purchase, piping, instruments, erection,
    and the indirect costs of installing the item.

    Examples
    --------
    Carbon-steel exchanger at low pressure:

    >>> bare_module_factor(1.63, 1.66, 1.0, 1.0)
    3.29

    References
    ----------
    1. Turton et al., Analysis, Synthesis and Design of Chemical Processes, 4th ed.,
       2012, Appendix A, Table A.4.
    """
    return b1 + b2 * material_factor * pressure_factor


# ---------------------------------------------------------------- records from cost_data


@dataclass(frozen=True)
class CostCurve:
    """One purchased-cost correlation row (``purchased_cost_correlations.csv``)."""

    item: str
    description: str
    size_variable: str  # "volume", "area" or "shaft_power"
    size_unit: str  # the source's unit of the size: "m3", "m2" or "kW"
    size_min: float  # in size_unit
    size_max: float  # in size_unit
    k1: float
    k2: float
    k3: float
    base_year: int
    base_index: float  # cost index the constants refer to [-]
    index_name: str
    currency: str
    above_range: str  # "parallel" (split into identical units) or "extrapolate"
    material_group: str
    pressure_group: str
    bare_module_group: str
    source: str

    @property
    def si_per_unit(self) -> float:
        """SI value of one size unit (1000 for kW -> W) [-]."""
        return SI_PER_SIZE_UNIT[self.size_unit]

    def validity(self) -> ValidityRange:
        """Size range as a validity record, in SI units."""
        unit = {"kW": "W"}.get(self.size_unit, self.size_unit)
        return ValidityRange(f"{self.item} cost", self.size_variable, self.size_min * self.si_per_unit,
                             self.size_max * self.si_per_unit, unit, self.source)

    def expression(self, size, ops: Operations = FLOAT):
        """Purchased cost at the base index, :func:`turton_purchased_cost` over ``ops`` (float or Pyomo), held
        to its tangents below :attr:`held_below` and above the range.

        ``size`` is in SI units (m3, m2, W). The one form the costing layer and the
        optimisation model both evaluate.
        """
        return held_to_tangents(size / self.si_per_unit, self.held_below, self.size_max, self.k1, self.k2, self.k3,
                                ops)

    @property
    def held_below(self) -> float:
        """Size [size_unit] below which the cost follows the curve's tangent (:func:`held_to_tangents`): the range's
        lower end, or the curve's lowest point where that lies above it (a floating-head exchanger's at 21.6 m2,
        a sieve tray's at 0.27 m2: below them the fitted curve rises as the size falls); at most the range's
        upper end (a user's row falling over its whole range)."""
        lowest = 10.0 ** (-self.k2 / (2.0 * self.k3)) if self.k3 > 0.0 else 0.0
        return min(max(self.size_min, lowest), self.size_max)

    def purchased_cost(self, size: float, policy: OutOfRange = OutOfRange.RAISE,
                       warnings: list[str] | None = None) -> float:
        """Purchased cost of one unit at the base index [currency]; ``size`` in SI units."""
        self.validity().check(size, policy, warnings)
        return self.expression(size)


@dataclass(frozen=True)
class PressureFactorCurve:
    """Polynomial pressure factor of a group of equipment (``pressure_factors.csv``)."""

    pressure_group: str
    c1: float
    c2: float
    c3: float
    pressure_min: float  # Pa gauge; below it F_P = 1
    pressure_max: float  # Pa gauge
    source: str

    def factor(self, pressure_gauge: float, warnings: list[str]) -> float:
        """F_P [-]; above the source's range the polynomial is extrapolated with a warning."""
        ValidityRange(f"{self.pressure_group} pressure factor", "design pressure (gauge)", -ATMOSPHERE,
                      self.pressure_max, "Pa", self.source).check(pressure_gauge, OutOfRange.WARN, warnings)
        return pressure_factor_polynomial(pressure_gauge, self.c1, self.c2, self.c3, self.pressure_min)


@dataclass(frozen=True)
class VesselPressureFactor:
    """Wall-thickness pressure factor of process vessels (``vessel_pressure_factor.csv``)."""

    pressure_group: str
    allowable_stress: float  # Pa, S E
    pressure_coefficient: float
    corrosion_allowance: float  # m
    minimum_thickness: float  # m
    vacuum_limit: float  # Pa gauge; below it the vacuum factor applies
    vacuum_factor: float
    pressure_max: float  # Pa gauge
    source: str

    def factor(self, pressure_gauge: float, diameter: float, warnings: list[str]) -> float:
        """F_P [-] of a vessel of ``diameter`` [m] at ``pressure_gauge`` [Pa]."""
        ValidityRange(f"{self.pressure_group} pressure factor", "design pressure (gauge)", -ATMOSPHERE,
                      self.pressure_max, "Pa", self.source).check(pressure_gauge, OutOfRange.WARN, warnings)
        if pressure_gauge < self.vacuum_limit:
            return self.vacuum_factor
        return vessel_pressure_factor(pressure_gauge, diameter, self.allowable_stress,
                                      self.pressure_coefficient, self.corrosion_allowance,
                                      self.minimum_thickness)


@dataclass(frozen=True)
class TrayQuantityFactor:
    """Constants of the tray quantity factor (``tray_quantity_factor.csv``)."""

    c1: float
    c2: float
    c3: float
    trays_max: int
    source: str

    def factor(self, trays: int) -> float:
        """F_q [-] for ``trays`` trays."""
        return tray_quantity_factor(trays, self.c1, self.c2, self.c3, self.trays_max)


@dataclass(frozen=True)
class MaterialFactor:
    material_group: str
    material: str
    factor: float
    source: str


@dataclass(frozen=True)
class BareModuleFactor:
    bare_module_group: str
    b1: float
    b2: float
    source: str
