"""What `check` found: everything `design` validates before it optimises, as the reports see it."""

from __future__ import annotations

from dataclasses import dataclass

from ..case import Case
from ..properties import FeedState, MixtureSummary
from ..stages import StageDesign


@dataclass(frozen=True)
class CaseCheck:
    """A case that passed every check `design` runs before optimising, in SI units.

    ``stage_bound``: most stages the search may use; ``fitted_minimum_stages`` and
    ``fitted_minimum_reflux``: the minima on the optimiser's fitted forms (what the stage bound
    and a given design are checked against) by ``fitted_minima_method`` (Fenske and Underwood,
    or McCabe-Thiele for a binary); ``given``: (reflux ratio [-],
    stages, feed stage) of a given design, or None; ``utilities`` the levels the condenser and
    reboiler of the first column sized take, with ``utility_notes`` on a cheaper level.
    """

    case: Case
    mixture: MixtureSummary
    feed: FeedState
    stages: StageDesign
    scenarios: tuple[str, ...]
    cost_year: int
    currency: str
    stage_bound: int
    fitted_minimum_stages: float
    fitted_minimum_reflux: float
    given: tuple[float, int, int] | None = None
    fitted_minima_method: str = "Fenske-Underwood"
    reference_stages: int = 0  # stages of the column sized first (the search's start or the given design)
    utilities: tuple = ()  # its condenser and reboiler (sizing.exchangers.ExchangerEnds)
    utility_notes: tuple[str, ...] = ()  # the pressure a cheaper level would need, where one is offered

    def __str__(self) -> str:
        from .text import check_text  # text.py imports the result types

        return check_text(self)
