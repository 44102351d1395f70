"""The control margin: the least reflux ratio over the energy-balance minimum.

The economic optimum of a column often lies within a few per cent of the minimum reflux,
where small changes of feed or equilibrium cost the specification. The case's
``column.min_reflux_ratio_factor`` sets the least R/Rmin (against the energy-balance
minimum of :mod:`.minimum_reflux`). Where the optimum lies below it, the search is repeated
with the reflux ratio bounded from below (the model's ``reflux_min``), starting from the
optimum without the margin, which is kept beside the result.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

from .._base.errors import InfeasibleSpecError
from ..case import Case
from ..costing.data import CostData
from ..properties import FeedState, Mixture
from ..sizing.options import SizingOptions
from ..stages.correlations import stages_from_gilliland
from .design import TAC_TOLERANCE, optimise_design
from .options import model_options
from .results import OptimumDesign
from .start import shortcut
from .verification import FLOOR_TOLERANCE as RELATIVE_TOLERANCE  # one tolerance for the margin and the check


@dataclass(frozen=True)
class ControlMargin:
    """The least R/Rmin asked for and, where it binds, the lowest-TAC design without it."""

    factor: float  # least reflux ratio over the energy-balance minimum [-]
    minimum_reflux: float | None  # energy-balance minimum [-]; None: not found, the margin not applied
    unconstrained: OptimumDesign | None = None  # the optimum without the margin, where the margin binds
    tac_tolerance: float = TAC_TOLERANCE  # relative TAC difference within which two designs tie [-]

    @property
    def reflux_floor(self) -> float | None:
        """The least reflux ratio the margin allows [-]."""
        return None if self.minimum_reflux is None else self.factor * self.minimum_reflux

    @property
    def binds(self) -> bool:
        return self.unconstrained is not None

    def costs_nothing(self, tac: float, free_tac: float) -> bool:
        """Whether the design held to the margin, at ``tac``, costs no more than the one without it, at
        ``free_tac`` [money/year], beyond the search's tolerance: two local optima can tie (an NGL column's
        margin design, one stage shorter, came out 1 USD a year cheaper)."""
        return tac - free_tac <= self.tac_tolerance * abs(free_tac)

    def holds(self, reflux_ratio: float) -> bool:
        """Whether ``reflux_ratio`` [-] keeps the margin (within 0.1 %, the rounds' tolerance)."""
        return self.reflux_floor is None or reflux_ratio >= self.reflux_floor * (1.0 - RELATIVE_TOLERANCE)

    def below_floor(self, reflux_ratio: float) -> tuple[str, ...]:
        """The warning of a reported design below the floor: a design the verification corrected on
        thermo to less reflux than the model's, which held the floor."""
        if self.holds(reflux_ratio):
            return ()
        return (f"the design corrected on thermo runs at reflux ratio {reflux_ratio:.4g}, below the control "
                f"margin's floor {self.reflux_floor:.4g} ({self.factor:g} x the energy-balance minimum "
                f"{self.minimum_reflux:.4g}): thermo meets the specifications with less reflux than the model "
                f"did; running at the floor makes the products purer than specified, or lower "
                f"column.min_reflux_ratio_factor",)

    @property
    def warnings(self) -> tuple[str, ...]:
        if self.minimum_reflux is not None or self.factor <= 1.0:
            return ()
        return (f"control margin not applied: the energy-balance minimum reflux was not found, so the least "
                f"R/Rmin of {self.factor:g} (column.min_reflux_ratio_factor) could not be set as a floor",)


def hold_margin(case: Case, mixture: Mixture, feed: FeedState, data: CostData, optimum: OptimumDesign,
                reflux_ratio: float, minimum_reflux: float | None, options=None,
                sizing: SizingOptions = SizingOptions(), scenario: str | None = None
                ) -> tuple[OptimumDesign, ControlMargin]:
    """``optimum`` if its ``reflux_ratio`` (as reported, on thermo) holds the case's margin, else the
    lowest-TAC design with the reflux ratio at or above the floor, and the margin either way."""
    margin = ControlMargin(case.column.min_reflux_ratio_factor, minimum_reflux)
    floor = margin.reflux_floor
    if floor is None or margin.factor <= 1.0 or reflux_ratio >= floor * (1.0 - RELATIVE_TOLERANCE):
        return optimum, margin
    config = model_options(options)
    if floor > config.reflux_max:
        raise InfeasibleSpecError(
            f"the control margin asks for a reflux ratio of at least {floor:.4g} "
            f"({margin.factor:g} x the energy-balance minimum {minimum_reflux:.4g}), above the optimiser's "
            f"highest reflux ratio {config.reflux_max:g}: lower column.min_reflux_ratio_factor or raise reflux_max")
    bounded = search_above_floor(case, mixture, feed, data, floor, optimum, options, sizing, scenario,
                                 start_at_floor(optimum, floor))
    return bounded, replace(margin, unconstrained=optimum)


def search_above_floor(case: Case, mixture: Mixture, feed: FeedState, data: CostData, floor: float | None,
                       warm: OptimumDesign, options=None, sizing: SizingOptions = SizingOptions(),
                       scenario: str | None = None, start: tuple[int, int] | None = None) -> OptimumDesign:
    """The lowest-TAC design with the reflux ratio at or above ``floor`` [-] (None: no floor), the search
    warm-started from ``warm``."""
    config = model_options(options)
    asked = config.reflux_min
    config.reflux_min = max(config.reflux_min, floor or 0.0)
    bounded = optimise_design(case, mixture, feed, data, config, sizing, scenario, warm=warm, start=start)
    # The floor is the margin's, reported by the margin; the bounds the optimum is judged against
    # (OptimumDesign.limits: headline, solver.limited_by) stay the options' own.
    return replace(bounded, reflux_range=(asked, config.reflux_max))


def start_at_floor(optimum: OptimumDesign, floor: float) -> tuple[int, int] | None:
    """Where the search at the margin's reflux floor starts: the optimum's stages times Gilliland's
    ratio of the stages at the floor to those at the optimum's reflux (both on the model's
    shortcut), the feed stage in proportion; None where the shortcut gives no ratio.

    More reflux needs fewer stages, so the bounded optimum lies below the unconstrained one;
    starting there spares the descent its first moves (measured on the benzene example: start at
    25 stages for an optimum at 24, 21 solves against 29 from the unconstrained optimum's 27).
    """
    if optimum.problem is None:
        return None
    estimate = shortcut(optimum.problem)
    n_min, r_min = estimate.minimum_stages, estimate.minimum_reflux
    try:
        ratio = (stages_from_gilliland(n_min, r_min, floor)
                 / stages_from_gilliland(n_min, r_min, optimum.best.reflux_ratio))
    except InfeasibleSpecError:
        return None
    if not math.isfinite(ratio) or ratio <= 0.0:
        return None
    N, NF = optimum.best.stages, optimum.best.feed_stage
    stages = max(3, round(N * ratio))
    return stages, min(max(2, round(1 + (NF - 1) * (stages - 1) / (N - 1))), stages - 1)


__all__ = ["ControlMargin", "hold_margin", "search_above_floor", "start_at_floor"]
