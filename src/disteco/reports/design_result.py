"""The aggregate of one design run, as the reports see it: typed results from every layer."""

from __future__ import annotations

from dataclasses import dataclass, field

from ..case import Case
from ..properties import FeedState, MixtureSummary

SCHEMA_VERSION = 1

CAUTIONS = (
    "Screening estimate (AACE class 4-5): expect the installed cost to lie within about -30 % / +50 % "
    "to -50 % / +100 % of the figures given.",
    "Vessel and exchanger mechanical design must follow the applicable code (for example ASME "
    "Section VIII) and be checked by a qualified, licensed engineer.",
    "Flammable or toxic service, pressure relief and plant layout are out of scope.",
)


@dataclass(frozen=True)
class DesignResult:
    """Everything one design run produced, in SI units."""

    case: Case
    mixture: MixtureSummary
    feed: FeedState
    warnings: tuple[str, ...] = field(default_factory=tuple)
