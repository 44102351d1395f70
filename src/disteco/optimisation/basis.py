"""The numbers the optimisation model is built from: the separation problem and the cost basis.

``SeparationProblem`` carries the process side (fitted mixture, feed, pressures, product
specifications); ``CostBasis`` carries the sizing and costing side as plain numbers, so
that the model does not depend on how the sizing and costing layers load their data.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache

from .._base.errors import CaseError
from ..case import EndSpec
from ..costing.equipment import InstalledCost
from ..properties.fitted import FittedMixture
from ..sizing.efficiency import real_trays


# m; the largest shell diameter the model allows (common practice, no source: trayed columns much wider are
# rare, and their trays need multiple passes the sizing layer does not model)
DIAMETER_MAX = 12.0

@dataclass(frozen=True)
class SeparationProblem:
    """One column's process specification, SI units.

    Stage j (1 = top stage, N = reboiler) is at ``top_pressure + (j - 1) * stage_pressure_drop``;
    the condenser is at ``top_pressure``. The feed (liquid and vapour parts) enters the feed stage.
    """

    fitted: FittedMixture
    feed_flow: float  # mol/s
    z: tuple[float, ...]  # feed mole fractions [-]
    q: float  # feed thermal condition [-]
    top_pressure: float  # Pa
    stage_pressure_drop: float  # Pa
    light_key: int
    heavy_key: int
    light_key_spec: EndSpec  # recovery to the distillate, or mole fraction in the bottoms
    heavy_key_spec: EndSpec  # recovery to the bottoms, or mole fraction in the distillate
    subcooling: float = 0.0  # K below the distillate bubble point
    partial_condenser: bool = False  # vapour distillate; the condenser is one more equilibrium contact

    def pressure(self, stage: int) -> float:
        """Pressure of ``stage`` [Pa]."""
        return self.top_pressure + (stage - 1) * self.stage_pressure_drop

    def feed_enthalpy(self) -> float:
        """Feed molar enthalpy from the fitted forms and q [J/mol]."""
        return _feed_enthalpy(self)


@lru_cache(maxsize=32)
def _feed_enthalpy(problem: SeparationProblem) -> float:
    """Cached: a dew point by successive substitution costs a model build about 20 ms."""
    P = problem.pressure(1)
    f = problem.fitted
    h_liquid = f.liquid_enthalpy_of(f.bubble_temperature(P, problem.z), problem.z)
    h_vapour = f.vapour_enthalpy_of(_dew_temperature(f, P, problem.z), problem.z)
    return h_vapour - problem.q * (h_vapour - h_liquid)


def _dew_temperature(fitted: FittedMixture, P: float, y) -> float:
    """Dew temperature [K] of vapour ``y`` with the fitted forms (x from successive substitution)."""
    x = list(y)
    T = fitted.bubble_temperature(P, y)
    for _ in range(200):
        k = fitted.k_values(T, P, x)
        x_new = [yi / ki for yi, ki in zip(y, k)]
        total = sum(x_new)
        x_new = [v / total for v in x_new]
        T_new = fitted.bubble_temperature(P, x_new)
        if abs(T_new - T) < 1e-7:
            return T_new
        x, T = x_new, T_new
    return T


@dataclass(frozen=True)
class ExchangerBasis:
    """A condenser or reboiler: overall coefficient, utility temperatures, price and installed-cost numbers."""

    U: float  # W/(m^2 K)
    utility_in: float  # K, utility supply temperature
    utility_out: float  # K, utility return temperature (equal to supply for condensing steam)
    minimum_approach: float  # K
    price: float  # currency/J of duty
    cost: InstalledCost  # size: area [m^2]
    service: str = "cooling"  # the utility's service: "cooling" (condenser) or "heating" (reboiler)
    level: str = ""  # the utility level's name in the cost data


@dataclass(frozen=True)
class TrayBasis:
    """Tray and shell numbers for sizing: the flooding fit and options, efficiency, height allowances.

    Flooding follows :func:`disteco.sizing.flooding.required_tray_area` with ``flooding_method``
    (a key of ``FLOODING_METHODS``), the system factor and the downcomer fraction (None: the
    flow-parameter rule on every tray), as in the sizing layer.
    """

    tray_spacing: float  # m
    flooding_fraction: float  # [-]
    efficiency: float  # overall tray efficiency [-]
    extra_height: float  # m, sump, top space and feed nozzles
    flooding_method: str = "lygeros-magoulas"
    system_factor: float = 1.0  # [-]
    downcomer_fraction: float | None = None  # [-] of the cross-section; None: rule from the flow parameter
    diameter_min: float = 0.3  # m
    diameter_max: float = DIAMETER_MAX  # m
    shells: int = 1  # shells in series, trays split evenly between them
    max_height_to_diameter: float = math.inf  # [-] of a shell's tangent length over the diameter

    def real_trays(self, stages: int) -> int:
        """Real trays for ``stages`` equilibrium stages (the reboiler is not a tray) [-]."""
        return real_trays(stages, self.efficiency)

    def height(self, stages: int) -> float:
        """Height (tangent to tangent) of the taller shell [m]: its share of the trays and the allowances."""
        return math.ceil(self.real_trays(stages) / self.shells) * self.tray_spacing + self.extra_height

    def least_diameter(self, stages: int) -> float:
        """Least diameter the height-to-diameter limit allows a shell of :meth:`height` [m]."""
        return self.height(stages) / self.max_height_to_diameter

    def stage_limit(self, max_height: float, bound: int) -> int:
        """Most stages, up to ``bound``, whose shells are at most ``max_height`` tall [-] (at least 3)."""
        stages = bound
        while stages > 3 and self.height(stages) > max_height:
            stages -= 1
        return stages


@dataclass(frozen=True)
class CondensateBasis:
    """Reflux drum and reflux pump on the condensate (reflux plus liquid distillate).

    The condensate's molar volume, the pump's efficiency and the head beyond the shell's
    tangent length are frozen at the reference design; the flow moves with the decisions.
    Drum volume and pump shaft power come from the sizing layer's functions.
    """

    liquid_molar_volume: float  # m^3/mol
    liquid_density: float  # kg/m^3
    holdup_time: float  # s
    fill_fraction: float  # [-]
    pump_efficiency: float  # [-]
    head_beyond_shell: float  # m, pump head minus the shell's tangent length
    drum: InstalledCost  # size: m^3
    pump: InstalledCost  # size: W of shaft power
    electricity_price: float  # currency/J


@dataclass(frozen=True)
class CostBasis:
    """Everything the TAC needs beyond the stages: sizing numbers, installed-cost numbers, prices, annualisation."""

    trays: TrayBasis
    shell: InstalledCost  # size: shell volume [m^3]
    tray_cost: InstalledCost  # size: tray area [m^2], cost per tray
    condenser: ExchangerBasis
    reboiler: ExchangerBasis
    annualisation: float  # 1/yr, capital charge
    operating_hours: float  # h/yr
    currency: str = "USD"
    cost_year: int = 0
    tray_quantity: object | None = None  # has .factor(trays) -> F_q [-]; None means F_q = 1
    condensate: CondensateBasis | None = None  # reflux drum and pump; None leaves them out of the TAC

    def tray_quantity_factor(self, trays: int) -> float:
        """Quantity factor of ``trays`` identical trays [-]."""
        return 1.0 if self.tray_quantity is None else self.tray_quantity.factor(trays)


def check_problem(problem: SeparationProblem) -> None:
    """Reject specifications no column can meet, in engineering words."""
    for spec, field in ((problem.light_key_spec, "light key"), (problem.heavy_key_spec, "heavy key")):
        if not 0.0 < spec.value < 1.0:
            raise CaseError(f"products ({field})", f"{spec.kind} {spec.value}", "strictly between 0 and 1")
    if problem.feed_flow <= 0.0:
        raise CaseError("feed.flow", "not positive", "a flow above zero")
