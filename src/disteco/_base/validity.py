"""Validity ranges of correlations as data, with an explicit policy outside them.

Each correlation publishes its ranges as ``ValidityRange`` records. The same records give
the bounds of the matching variables in the optimisation model. Outside a range the
caller chooses: raise, or go on and list a warning. Nothing is clamped silently.
"""

from __future__ import annotations

from dataclasses import dataclass
from enum import Enum

from .errors import CorrelationRangeError


class OutOfRange(Enum):
    """What to do with an input outside a correlation's validity range."""

    RAISE = "raise"
    WARN = "warn"


@dataclass(frozen=True)
class ValidityRange:
    """Range of one input of one correlation, with its source."""

    correlation: str
    variable: str
    low: float
    high: float
    unit: str
    source: str

    def contains(self, value: float) -> bool:
        """True when ``low <= value <= high``."""
        return self.low <= value <= self.high

    def check(self, value: float, policy: OutOfRange = OutOfRange.RAISE,
              warnings: list[str] | None = None) -> float:
        """Return ``value`` unchanged; raise or append a warning when it is out of range."""
        if self.contains(value):
            return value
        error = CorrelationRangeError(self.correlation, self.variable, value, self.low,
                                      self.high, self.unit, self.source)
        if policy is OutOfRange.RAISE:
            raise error
        if warnings is not None:
            warnings.append(f"extrapolated: {error}")
        return value
