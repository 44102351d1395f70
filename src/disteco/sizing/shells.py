"""Two shells in series: where the trays are split, and the vapour line between the shells.

A column too tall for one shell stands as two shells side by side. The upper shell holds the
top trays and takes the reflux; the liquid leaving its bottom tray is pumped to the top of the
lower shell (the transfer pump, sized by :func:`~disteco.sizing.auxiliaries.size_pump`), and
the vapour leaving the lower shell's top tray rises through a vapour line into the upper
shell's bottom. The lower shell holds the sump and the reboiler connections.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .auxiliaries import PumpSizing
from .vessel import ColumnHeight, VesselDesign

VAPOUR_LINE_VELOCITY = 20.0  # m/s, design velocity in the vapour line (common practice, no source)
VAPOUR_LINE_RUN = 10.0  # m of line beyond the lower shell's height, across to the upper shell (common practice, no source)


def shell_trays(real_trays: int, shells: int) -> tuple[int, ...]:
    """Real trays of each shell, top first; two shells split where their tray sections balance.

    The upper shell takes the odd tray: its bottom holds no reboiler sump, so it is the shorter
    one for equal tray counts.

    >>> shell_trays(75, 2)
    (38, 37)
    """
    if shells == 1:
        return (real_trays,)
    upper = math.ceil(real_trays / 2)
    return upper, real_trays - upper


def split_stage(upper_trays: int, efficiency: float, stages: int) -> int:
    """Last equilibrium stage (from the top) held by the upper shell of ``upper_trays`` real trays.

    At overall efficiency E the real trays hold E x trays equilibrium stages; at least one stage
    stays in each shell and the reboiler (stage ``stages``) below the lower shell's trays.

    >>> split_stage(38, 0.5, 40)
    19
    """
    return min(max(round(upper_trays * efficiency), 1), stages - 2)


@dataclass(frozen=True)
class VapourLine:
    """The vapour line from the top of the lower shell to the bottom of the upper shell (SI)."""

    volume_flow: float  # m^3/s
    velocity: float  # m/s
    diameter: float  # m, inside
    length: float  # m

    @property
    def surface(self) -> float:
        """Pipe surface pi D L [m^2]: the size the line is priced on (cost grows with diameter times length)."""
        return math.pi * self.diameter * self.length


def vapour_line(volume_flow: float, lower_shell_height: float, velocity: float = VAPOUR_LINE_VELOCITY,
                run: float = VAPOUR_LINE_RUN) -> VapourLine:
    """Line diameter for ``velocity`` [m/s] and length up the lower shell [m] plus a ``run`` across [m].

    >>> line = vapour_line(2.0 * math.pi / 4.0 * 20.0, 30.0)
    >>> round(line.diameter, 6), line.length
    (1.414214, 40.0)
    """
    diameter = math.sqrt(4.0 * volume_flow / (math.pi * velocity))
    return VapourLine(volume_flow, velocity, diameter, lower_shell_height + run)


@dataclass(frozen=True)
class ShellSplit:
    """The upper of two shells and what connects it to the lower one (the lower is the column's own)."""

    upper_trays: int
    lower_trays: int
    split_stage: int  # last equilibrium stage held by the upper shell, from the top
    upper_height: ColumnHeight
    upper_vessel: VesselDesign
    transfer_pump: PumpSizing
    vapour_line: VapourLine
