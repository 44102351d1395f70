"""The operations a relation needs to serve both floats and an equation model: exp, log, sqrt, a smooth max.

A sizing or costing relation that the optimisation model also needs is written once over an
:class:`Operations` namespace: :data:`FLOAT` (``math``) by default, and the Pyomo functions
when the model builds it (``disteco.optimisation.model`` makes that namespace). The same
smooth max serves both, so the two paths agree to rounding.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Callable

SMOOTH_WIDTH = 1e-4  # default width of the smooth max, in the arguments' unit


@dataclass(frozen=True)
class Operations:
    """exp, log and sqrt of one kind of number (floats, or Pyomo expressions)."""

    exp: Callable
    log: Callable
    sqrt: Callable

    def max(self, a, b, width: float = SMOOTH_WIDTH):
        """Smooth maximum 0.5 (a + b + sqrt((a - b)^2 + w^2)).

        Differentiable everywhere; above the true maximum by at most w/2 (where a = b) and by
        w^2 / (4 |a - b|) away from it.
        """
        return 0.5 * (a + b + self.sqrt((a - b) ** 2 + width * width))

    def min(self, a, b, width: float = SMOOTH_WIDTH):
        """Smooth minimum, the mirror of :meth:`max`."""
        return -self.max(-a, -b, width)


FLOAT = Operations(math.exp, math.log, math.sqrt)
