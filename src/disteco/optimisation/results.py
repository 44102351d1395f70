"""Result dataclasses of the optimiser: sizes, cost breakdown, solver report, designs."""

from __future__ import annotations

from dataclasses import dataclass, field

from ..costing.column import CostSummary
from ..costing.data import HeatTransferCoefficient
from ..sizing.column import ColumnSizing
from ..stages.results import StageProfile


@dataclass(frozen=True)
class ModelCheck:
    """Diagnostic only: the optimisation model's TAC and diameter against the reported re-price.

    The reported TAC is the re-price (sizing and costing layers, thermo properties, diameter
    rounded up to the standard increment). Both paths evaluate the same sizing and costing
    functions (tests/test_one_copy.py), so what separates them is: the rounding of the
    diameter (``rounding_tac``), and the fitted property forms and the constants the model
    freezes at its reference design (the rest of ``difference``).
    """

    model_tac: float  # currency/yr, the optimisation model at its solution
    reported_tac: float  # currency/yr, the re-price that is reported
    unrounded_tac: float  # currency/yr, the re-price with the diameter flooding requires
    model_diameter: float  # m
    reported_diameter: float  # m, rounded up
    unrounded_diameter: float  # m

    @property
    def difference(self) -> float:
        """Model TAC minus reported TAC [currency/yr]."""
        return self.model_tac - self.reported_tac

    @property
    def rounding_tac(self) -> float:
        """Part of the reported TAC due to rounding the diameter up [currency/yr]."""
        return self.reported_tac - self.unrounded_tac


@dataclass(frozen=True)
class SequentialPrice:
    """A design sized and costed again by the sizing and costing layers (drum and pump included): the reported price."""

    sizing: ColumnSizing
    cost: CostSummary
    coefficients: tuple[HeatTransferCoefficient, ...] = ()  # cost-data U rows of condenser and reboiler
    model_check: ModelCheck | None = None  # the model's TAC against this one, a diagnostic


@dataclass(frozen=True)
class CostItem:
    """One priced item: its size in the cost curve's unit, purchased and installed cost [currency]."""

    name: str
    size: float
    size_unit: str
    purchased: float
    installed: float


@dataclass(frozen=True)
class CostBreakdown:
    """Installed capital, utilities and total annualised cost [currency, currency/yr]."""

    items: tuple[CostItem, ...]
    capital_installed: float
    condenser_utility_per_year: float
    reboiler_utility_per_year: float
    utilities_per_year: float
    annualised_capital_per_year: float
    tac_per_year: float
    currency: str
    cost_year: int
    pump_electricity_per_year: float = 0.0


@dataclass(frozen=True)
class ColumnSizes:
    """Sizes of the column and its exchangers, SI units."""

    diameter: float  # m
    height: float  # m
    real_trays: int
    tray_efficiency: float  # [-]
    condenser_area: float  # m^2
    reboiler_area: float  # m^2
    condenser_duty: float  # W
    reboiler_duty: float  # W
    flooding_stage: int  # the tray that sets the diameter (highest required diameter)


@dataclass(frozen=True)
class SearchStep:
    """One configuration visited by the search: TAC [currency/yr] or None when it had no feasible design."""

    stages: int
    feed_stage: int
    tac: float | None
    status: str


@dataclass(frozen=True)
class SolverReport:
    """How a result was obtained: solver, status in words, termination condition, gap, effort.

    For a search, ``status`` says "locally optimal (discrete neighbourhood)" only when every
    neighbour of the chosen configuration was solved (feasible or shown infeasible); the
    configurations whose solve failed are listed in ``unsolved``, and ``termination`` is
    "maxTimeLimit" when the search was stopped by its time limit.
    """

    solver: str
    status: str  # "optimal", "locally optimal", "certified", "time limit", "iteration limit", "failed", "best found; ..."
    termination: str  # Pyomo's termination condition
    gap: float | None  # relative optimality gap where a bound exists [-]
    wall_time: float  # s
    configurations_solved: int = 1  # configurations tried, whether or not they solved
    message: str = ""
    barrier: str = ""  # interior-point barrier strategy of the successful try ("" for other solvers)
    unsolved: tuple[SearchStep, ...] = ()  # configurations whose solve failed (status: the failure)
    neighbours: int = 0  # neighbours of the chosen configuration within the stage range
    neighbours_unsolved: int = 0  # of them, failed or never tried (time limit)


@dataclass(frozen=True)
class DesignEvaluation:
    """One configuration solved: its column profile, sizes, costs and how it was solved."""

    stages: int  # ideal stages incl. reboiler
    feed_stage: int  # from the top
    reflux_ratio: float  # [-]
    profile: StageProfile
    sizes: ColumnSizes
    cost: CostBreakdown
    solver: SolverReport
    warnings: tuple[str, ...] = ()
    sequential: SequentialPrice | None = None  # filled by the case-level functions
    shortfall: float = 0.0  # largest relative shortfall of a product specification on the fitted forms [-]

    @property
    def tac(self) -> float:
        """Total annualised cost [currency/yr]."""
        return self.cost.tac_per_year

    @property
    def reported_tac(self) -> float:
        """The TAC the reports give [currency/yr]: the sequential price (drum and pump included, the
        diameter rounded up) where the design has one, else the model's."""
        return self.sequential.cost.tac_per_year if self.sequential is not None else self.tac


def minimum_method(minima_method: str, quantity: str) -> str:
    """The method of ``minima_method`` ("Fenske-Underwood" or "McCabe-Thiele") that gives the minimum
    ``quantity`` ("reflux" or "stages")."""
    if minima_method == "Fenske-Underwood":
        return "Underwood" if quantity == "reflux" else "Fenske"
    return minima_method


BOUND_TOLERANCE = 1e-6  # relative distance from a bound of the reflux ratio that counts as on it [-]


@dataclass(frozen=True)
class Limit:
    """A bound of the search that the optimum sits on: the option that sets it, its value, in words."""

    option: str
    value: float
    text: str
    shells: int = 1  # shells in series of the design the bound holds (a height limit's advice depends on it)


@dataclass(frozen=True)
class OptimumDesign:
    """The lowest-TAC design found, the shortcut bounds and the search trail."""

    best: DesignEvaluation
    minimum_reflux_ratio: float  # [-], on the fitted forms by :attr:`minima_method`
    minimum_stages: float  # [-], on the fitted forms by :attr:`minima_method`, reboiler included
    solver: SolverReport
    visited: tuple[SearchStep, ...]
    warnings: tuple[str, ...] = ()
    sequential: SequentialPrice | None = None  # the best design priced by the sizing and costing layers
    rounds: int = 1  # optimisations run until the re-evaluated model constants settled
    settled: bool = True  # False: the rounds ended before the re-evaluated constants settled (a warning says why)
    # the separation problem and cost basis of the last round, for further designs on the same basis
    problem: object | None = field(default=None, compare=False, repr=False)
    basis: object | None = field(default=None, compare=False, repr=False)
    # every configuration the search solved (the last round's), each at its own lowest-TAC reflux
    solved: tuple[DesignEvaluation, ...] = field(default=(), compare=False, repr=False)
    sizing_options: object | None = None  # SizingOptions of the result: tray spacing and shells chosen
    stage_limit: int | None = None  # most stages one shell within the height limit holds, when below the search's bound
    layout: "LayoutChoice | None" = None  # the layouts compared and the one chosen
    spacings: tuple = ()  # SpacingPrice of each candidate tray spacing at the optimum

    stage_bound: int | None = None  # most stages the search could use
    reflux_range: tuple[float, float] = (0.0, float("inf"))  # lowest and highest reflux ratio of the model [-]
    minima_method: str = "Fenske-Underwood"  # or "McCabe-Thiele" (a binary stepped on the fitted curve)

    @property
    def reported_tac(self) -> float:
        """The TAC the reports give for :attr:`best` [currency/yr] (see :attr:`DesignEvaluation.reported_tac`)."""
        return self.sequential.cost.tac_per_year if self.sequential is not None else self.best.tac

    def minimum_by(self, quantity: str) -> str:
        """The method that gave the minimum ``quantity`` ("reflux" or "stages")."""
        return minimum_method(self.minima_method, quantity)

    @property
    def limits(self) -> tuple[Limit, ...]:
        """The bounds the optimum sits on: the optimum within them is not the unconstrained one."""
        found = []
        best = self.best
        if self.stage_bound is not None and best.stages >= self.stage_bound:
            if self.stage_limit is not None and self.stage_bound >= self.stage_limit:
                shells = getattr(self.sizing_options, "shells", 1)
                held = "one shell within the height limit holds" if shells == 1 else \
                    f"{shells} shells in series within the height limit hold"
                found.append(Limit("max_height", self.stage_limit, f"the {self.stage_limit} stages {held}", shells))
            else:
                found.append(Limit("max_stages", self.stage_bound, f"the stage bound of {self.stage_bound} stages"))
        low, high = self.reflux_range
        if best.reflux_ratio >= high * (1.0 - BOUND_TOLERANCE):
            found.append(Limit("reflux_max", high, f"the highest reflux ratio of the model ({high:g})"))
        if best.reflux_ratio <= low * (1.0 + BOUND_TOLERANCE):
            found.append(Limit("reflux_min", low, f"the lowest reflux ratio of the model ({low:g})"))
        return tuple(found)


@dataclass(frozen=True)
class SpacingPrice:
    """A candidate tray spacing priced at a fixed design: TAC [currency/yr], None when a shell is too tall."""

    spacing: float  # m
    tac: float | None
    tallest_shell: float  # m, tangent length
    diameter: float  # m


@dataclass(frozen=True)
class LayoutOption:
    """One layout the optimiser compared: its optimum, or why it has none."""

    label: str  # "one shell", "two shells", "more stages"
    shells: int
    tac: float | None  # currency/yr, the sequential price; None: no design
    stages: int | None = None
    feed_stage: int | None = None
    reflux_ratio: float | None = None
    tray_spacing: float | None = None  # m
    tallest_shell: float | None = None  # m, tangent length
    height_to_diameter: float | None = None  # [-], of the tallest shell
    note: str = ""


@dataclass(frozen=True)
class LayoutChoice:
    """Which shell layout was chosen among those compared, and what the limits cost."""

    chosen: str  # label of the chosen LayoutOption
    why: str
    max_height: float  # m, of one shell
    max_height_to_diameter: float  # [-]
    binding: tuple[str, ...]  # "shell height", "height-to-diameter"
    options: tuple[LayoutOption, ...]
    spacings: tuple[SpacingPrice, ...]  # the candidate spacings at the chosen design
    unconstrained_tac: float | None = None  # currency/yr: the designs priced as one shell without limits
    sections: str = ""  # the section diameters and whether a swaged shell was priced and chosen

    @property
    def limit_cost(self) -> float | None:
        """Chosen TAC minus the unconstrained TAC [currency/yr]; None without both."""
        chosen = next(o for o in self.options if o.label == self.chosen)
        if chosen.tac is None or self.unconstrained_tac is None:
            return None
        return chosen.tac - self.unconstrained_tac
