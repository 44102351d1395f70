"""A run's warnings once each, grouped by kind and ordered by importance.

The layers add warnings where they arise, so one condition can arrive several times: the
optimisation model's price and the reported re-price of the same column both note a cost
curve extrapolated (with 13.01 and 13.2 m2), two scenarios' optima the same pump rule.
Warnings that differ only in their numbers are one warning here, and the one kept is the last
(the reported design's, which the result adds after the model's). The console shows the kinds
that bear on the design and counts the rest, which ``result.json`` and the workbook list.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

_NUMBER = re.compile(r"[-+]?\d[\d,]*(?:\.\d+)?(?:[eE][-+]?\d+)?")


@dataclass(frozen=True)
class Kind:
    """A kind of warning: its name, rank (0 most important), whether the console shows it, the words marking it."""

    name: str
    rank: int
    on_console: bool
    pattern: re.Pattern


# A warning takes the first kind whose pattern it contains (so "trays: extrapolated" is a cost-curve
# range, not a tray-hydraulics note); the rank orders the list.
KINDS = (
    Kind("design not vouched for", 0, True, re.compile(
        r"REFLUX BELOW MINIMUM|specification|corrected|did not solve|time limit|not settled|found no design|"
        r"short of|not found|OUTSIDE TOLERANCE|neighbour|not the lowest", re.IGNORECASE)),
    Kind("properties and model", 1, True, re.compile(
        r"azeotrope|critical|flash|fitted|thermo|deprecated|ideal gas", re.IGNORECASE)),
    Kind("cost data and correlation ranges", 4, False, re.compile(
        r"extrapolat|nearer end|cost curve|electricity|parallel units|coefficient|price|index|scenario '",
        re.IGNORECASE)),
    Kind("sizing and mechanical", 2, True, re.compile(
        r"height|tall|vacuum|shell|diameter|flood|buckling|tray|metal temperature|heat flux", re.IGNORECASE)),
    Kind("other", 3, True, re.compile(r".")),
)
# Advice on the reflux ratio that a bound the optimum sits on explains (a stage bound forces a high R/Rmin).
FOLLOWS_FROM_BOUND = re.compile(r"control margin|R/Rmin|x the minimum reflux|x the energy-balance minimum",
                                re.IGNORECASE)
BOUND_NOTE = "follows from the bound the optimum sits on: "


def kind_of(warning: str) -> Kind:
    return next(kind for kind in KINDS if kind.pattern.search(warning))


def ordered_warnings(found, bound: bool = False) -> tuple[str, ...]:
    """``found`` once each (warnings differing only in numbers are one, the last kept), by kind.

    ``bound``: the optimum sits on a bound of the search; reflux advice that follows from it
    is kept as a note, not shown as advice.
    """
    last: dict[str, str] = {}
    for warning in found:
        last[_NUMBER.sub("#", warning)] = warning  # a key keeps its first place, takes the last text
    kept = list(last.values())
    if bound:
        kept = [BOUND_NOTE + w if FOLLOWS_FROM_BOUND.search(w) and not w.startswith(BOUND_NOTE) else w
                for w in kept]
    return tuple(sorted(kept, key=lambda w: len(KINDS) if w.startswith(BOUND_NOTE) else kind_of(w).rank))


def console_warnings(warnings: tuple[str, ...]) -> tuple[tuple[str, ...], int]:
    """The warnings the console shows (kinds that bear on the design) and how many more there are."""
    shown = tuple(w for w in warnings if not w.startswith(BOUND_NOTE) and kind_of(w).on_console)
    return shown, len(warnings) - len(shown)


__all__ = ["KINDS", "console_warnings", "kind_of", "ordered_warnings"]
