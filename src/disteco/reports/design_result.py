"""The aggregate of one design run, as the reports see it: typed results from every layer."""

from __future__ import annotations

from dataclasses import dataclass, field

from ..case import Case
from ..optimisation.results import DesignEvaluation
from ..properties import FeedState, MixtureSummary
from ..stages import StageDesign
from .cautions import CAUTIONS
from .tables_design import ReportParts

SCHEMA_VERSION = 1



@dataclass(frozen=True)
class DesignResult:
    """Everything one design run produced, in SI units."""

    case: Case
    mixture: MixtureSummary
    feed: FeedState
    stages: StageDesign | None = None
    parts: ReportParts = field(default_factory=ReportParts)  # optimum or evaluated design, sizes, costs
    evaluation: DesignEvaluation | None = None  # set when a given design was priced, not optimised
    warnings: tuple[str, ...] = field(default_factory=tuple)
    options: tuple[tuple[str, object], ...] = ()  # optimiser options the run was given (name, value)
