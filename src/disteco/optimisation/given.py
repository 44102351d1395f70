"""Checks on a given design before any solver call: each refusal names the decision and says why.

A design with fewer stages than the minimum, a reflux ratio at or below the minimum, or a
feed stage off the column cannot meet the specifications whatever the solver does; saying so
in engineering words is faster and clearer than letting a solve fail on it.
"""

from __future__ import annotations

import math

from .._base.errors import CaseError, CorrelationRangeError, InfeasibleDesignError, InfeasibleSpecError, \
    SolverError
from ..stages.correlations import stages_from_gilliland
from .start import Shortcut

# Field names of the three decisions; the command line maps them to its options.
REFLUX, STAGES, FEED_STAGE = "reflux_ratio", "stages", "feed_stage"
# Share of the constant-molar-overflow minimum reflux by which a given reflux may lie below it and
# still be tried: with energy balances the minimum can be lower (water/acetic acid at 1 bar: 0.483
# against 0.546, 12 % below), and the optimiser reports such designs, which must price as given.
# A reflux between this floor and the minimum is left to the model, whose failure names the minimum.
ENERGY_BALANCE_ALLOWANCE = 0.25  # common practice, no source; measured range above


def check_decisions(reflux_ratio: float, stages: int, feed_stage: int) -> None:
    """Reject decisions no column can have: a reflux ratio that is not a finite positive number, fewer
    than 3 stages, a feed stage off the column (stage 1 is the top stage, ``stages`` the reboiler)."""
    if isinstance(reflux_ratio, bool) or not isinstance(reflux_ratio, (int, float)) \
            or not (math.isfinite(reflux_ratio) and reflux_ratio > 0.0):
        raise CaseError(REFLUX, f"{reflux_ratio!r} is not a reflux ratio", "a finite number above 0")
    if isinstance(stages, bool) or not isinstance(stages, int) or stages < 3:
        raise CaseError(STAGES, f"{stages!r} stages",
                        "a whole number of at least 3 (a stage above the feed, the feed stage, the reboiler)")
    if isinstance(feed_stage, bool) or not isinstance(feed_stage, int) or not 2 <= feed_stage <= stages - 1:
        raise CaseError(FEED_STAGE, f"feed on stage {feed_stage!r} of a {stages}-stage column: stage 1 is the top "
                        f"stage and stage {stages} the reboiler",
                        f"a stage from 2 to {stages - 1}, counted from the top")


def check_given_design(estimate: Shortcut, reflux_ratio: float, stages: int, feed_stage: int,
                       reflux_max: float) -> None:
    """Reject a given design that cannot meet the specifications, against the shortcut's minima
    (the reflux against :data:`ENERGY_BALANCE_ALLOWANCE` below its minimum).

    ``estimate``: the minima on the column's fitted forms (Fenske and Underwood, McCabe-Thiele for
    a binary); ``reflux_max``: the
    highest reflux ratio the model allows (option ``reflux_max``) [-].
    """
    check_decisions(reflux_ratio, stages, feed_stage)
    n_min, r_min = estimate.minimum_stages, estimate.minimum_reflux
    if stages <= n_min:
        raise InfeasibleDesignError(
            STAGES, f"{stages} stages is fewer than the minimum of {n_min:.2f} ({estimate.minimum_by('stages')} at "
            "total reflux, reboiler included): no reflux ratio meets the product specifications",
            f"more than {n_min:.2f} stages", stages)
    floor = (1.0 - ENERGY_BALANCE_ALLOWANCE) * r_min
    if reflux_ratio <= floor:
        raise InfeasibleDesignError(
            REFLUX, f"reflux ratio {reflux_ratio:.4g} is below the minimum reflux ratio {r_min:.4g} "
            f"({estimate.minimum_by('reflux')}) by more than energy balances can move it "
            f"({100 * ENERGY_BALANCE_ALLOWANCE:.0f} %): no number of stages meets the product specifications",
            f"above {floor:.4g}", reflux_ratio)
    if reflux_ratio > reflux_max:
        raise InfeasibleDesignError(
            REFLUX, f"reflux ratio {reflux_ratio:.4g} is above the highest the model allows ({reflux_max:g}, "
            "option reflux_max); a column run that far above its minimum reflux "
            f"({r_min:.4g}) is not a design worth pricing", f"above {r_min:.4g} and at most {reflux_max:g}",
            reflux_ratio)


def explain_failure(estimate: Shortcut, reflux_ratio: float, stages: int, failure: SolverError) -> Exception:
    """The error to raise when the solver failed on a given design that passed the checks.

    When Gilliland's correlation asks for more stages at this reflux than the design has, the
    design is most likely short of stages (the solver then wanders without a feasible point);
    when the reflux lies within :data:`ENERGY_BALANCE_ALLOWANCE` above the constant-molar-overflow
    minimum, the energy balances and the pressure drop most likely put the column's own minimum
    above it (the benzene example at R = 1.6, 1.006 x that minimum, on 60 stages: its energy-balance
    minimum is about 1.74, and ripopt ended at its iteration limit, exit 1): an
    :class:`InfeasibleDesignError` saying which; otherwise ``failure`` itself.
    """
    try:
        needed = stages_from_gilliland(estimate.minimum_stages, estimate.minimum_reflux, reflux_ratio)
    except (CorrelationRangeError, InfeasibleSpecError):
        needed = 0.0  # at or below the minimum reflux: the reflux is what to name
    r_min = estimate.minimum_reflux
    if stages >= needed and reflux_ratio < (1.0 + ENERGY_BALANCE_ALLOWANCE) * r_min:
        return InfeasibleDesignError(
            REFLUX, f"reflux ratio {reflux_ratio:.4g} is {reflux_ratio / r_min:.3g} x the minimum reflux ratio "
            f"{r_min:.4g} ({estimate.minimum_by('reflux')}); with the stage energy balances and the column's "
            "pressure drop the minimum can lie higher, and the design most likely cannot meet the product "
            f"specifications at any number of stages (the solver found no solution: {failure})",
            f"a reflux ratio of at least {(1.0 + ENERGY_BALANCE_ALLOWANCE) * r_min:.4g} "
            f"({1.0 + ENERGY_BALANCE_ALLOWANCE:g} x the minimum), or run design without --reflux for the "
            "energy-balance minimum", reflux_ratio)
    if stages >= needed:
        return failure
    return InfeasibleDesignError(
        STAGES, f"{stages} stages at reflux ratio {reflux_ratio:.4g}: Gilliland's correlation asks for about "
        f"{needed:.1f} (minimum {estimate.minimum_stages:.2f} stages, minimum reflux {estimate.minimum_reflux:.4g}), "
        f"so the design most likely cannot meet the product specifications (the solver found no solution: "
        f"{failure})", f"about {math.ceil(needed)} stages or more at this reflux, or a higher reflux", stages)


def check_stage_bound(estimate: Shortcut, max_stages: int) -> None:
    """Refuse a search whose stage bound does not exceed the minimum stages on the fitted forms."""
    if max_stages <= estimate.minimum_stages:
        raise InfeasibleDesignError(
            "max_stages", f"{max_stages} is not above the minimum of {estimate.minimum_stages:.2f} stages "
            f"({estimate.minimum_by('stages')} at total reflux): no column within it meets the product specifications",
            f"more than {estimate.minimum_stages:.2f}, in practice 2 to 5 times it", max_stages)


__all__ = ["FEED_STAGE", "REFLUX", "STAGES", "check_decisions", "check_given_design", "check_stage_bound",
           "explain_failure"]
