"""Minimum reflux ratio with stage energy balances on thermo, on the reported design's basis.

Basis: the reflux ratio that meets both key specifications (``solve_to_specs``, energy
balances on thermo's equilibrium and enthalpies) with ``STAGE_FACTOR`` times the design's
equilibrium stages, the feed at the same fraction of the column, and the design's own top
and bottom pressures (the pressure drop spread over the longer column, so that "many
stages" does not make the bottom hotter). Newton starts from the design's thermo profile, or from the
shortcut's distillate where the design over-purifies a product (each the other's fallback).
The value is an upper bound of the true minimum; measured on the examples, three times
the stages lowered it by under 0.05 % (benzene-toluene 1.7277 at 62 stages, 1.7278 at 93;
five alkanes 0.7527 and 0.7525; ethanol-water 1.0942 and 1.0939). The column of a design that
over-purifies a product (stages to spare) is capped at ``STAGE_CAP`` times the minimum stages,
beyond which more stages change nothing.
"""

from __future__ import annotations

import math
import time
from dataclasses import dataclass, replace

import numpy as np

from .._base.errors import ConvergenceError, InfeasibleSpecError
from ..case import Case
from ..properties import FeedState, Mixture
from ..stages import ShortcutDesign, StageProfile, solve_to_specs, spec_residuals
from .verification import SPEC_TOLERANCE

STAGE_FACTOR = 2  # stages of the minimum-reflux column over the design's
# ... but, for a design with stages to spare, no more than this multiple of the minimum stages. Measured:
# the benzene column given 150 stages at R 3 searched 300 stages for 150 s in vain (the design's own
# solve 0.9 s); 77 stages, 1 s.
STAGE_CAP = 8
REFLUX_STEP = 0.1  # largest Newton step in ln R: small steps keep the warm starts near the pinch good
REFLUX_RESOLUTION = 1e-5  # ln R: a column meeting both specifications ends the search once Newton's step is smaller
TIME_LIMIT = 30.0  # s per SIZE_REFERENCE; past it the minimum is reported as not found
# stage-components the plain time limit is for; a larger column gets it in proportion. Measured: a
# six-component debutaniser, 78 stages (468), took 29.8 s on a 2-core machine with one other run
# beside it and was cut off at 30 s in another run; ethanol-water took 58 s under heavy load
SIZE_REFERENCE = 120
# log units by which a design must over-meet a specification for the search to start from the shortcut's
# distillate rather than its own (an optimum, corrected on thermo, meets both to about 1e-7; a given
# propylene splitter 1.4 log units inside its distillate specification crept 40 s from its own distillate)
OVER_PURIFIED = 0.5


@dataclass(frozen=True)
class EnergyBalanceMinimum:
    """The energy-balance minimum reflux ratio [-] and the column it was found on (None: not found)."""

    reflux_ratio: float | None
    stages: int
    feed_stage: int
    top_pressure: float  # Pa
    bottom_pressure: float  # Pa
    wall_time: float  # s
    basis: str
    failure: str = ""
    capped_at: float | None = None  # the minimum stages whose STAGE_CAP multiple the column was cut to [-]

    def of_unconstrained_design(self) -> "EnergyBalanceMinimum":
        """The same minimum, its basis naming the design without the control margin as its column's source."""
        return replace(self, basis=_basis(self.stages, self.feed_stage, self.top_pressure, self.bottom_pressure,
                                          "the design's without the control margin", self.capped_at, "that design"))


def minimum_column(design_stages: int, minimum_stages: float) -> tuple[int, float | None]:
    """(stages of the minimum-reflux column, the minimum stages where :data:`STAGE_CAP` cut it, else None)."""
    cap = math.ceil(STAGE_CAP * minimum_stages)
    if STAGE_FACTOR * design_stages <= cap:
        return STAGE_FACTOR * design_stages, None
    return cap, minimum_stages


def _basis(stages: int, feed_stage: int, top: float, bottom: float, whose: str = "the design's",
           capped_at: float | None = None, pressures_of: str = "the design") -> str:
    multiple = (f"{STAGE_FACTOR} x {whose}" if capped_at is None else
                f"{STAGE_CAP} x the minimum stages {capped_at:.2f}, fewer than {STAGE_FACTOR} x {whose}")
    return (f"energy balances on thermo, {stages} stages ({multiple}), feed on stage "
            f"{feed_stage}, pressures {top / 1e3:.4g} to {bottom / 1e3:.4g} kPa as in {pressures_of}")


def energy_balance_minimum(case: Case, mixture: Mixture, feed: FeedState, shortcut: ShortcutDesign,
                           verified: StageProfile, time_limit: float | None = None,
                           start_reflux: float | None = None,
                           minimum_stages: float | None = None, given: bool = False) -> EnergyBalanceMinimum:
    """Minimum reflux on the basis of the design whose thermo profile is ``verified``; Newton starts
    at ``start_reflux`` (a minimum found on a nearby design) where given, else at the design's.
    ``minimum_stages``: the column's minimum stages that :data:`STAGE_CAP` multiplies (a binary's on its
    equilibrium curve: Fenske's on a mean volatility can lie far below, acetone-water 6.94 against 18.19,
    and a cap at 8 x it gave 7.28 on 56 stages against 6.43 on the design's 70); None: the shortcut's.

    ``given``: the design's stages are a given design's, not an optimum's, and capped like those of a
    design that over-purifies.

    ``time_limit`` [s]: by default :data:`TIME_LIMIT` for every :data:`SIZE_REFERENCE`
    stage-components of the column solved, at least :data:`TIME_LIMIT`.
    """
    began = time.monotonic()
    N, NF = verified.stages, verified.feed_stage
    residuals = spec_residuals(verified, case.products, feed)
    over = float(np.min(residuals)) < -OVER_PURIFIED
    # the design's own reflux meets both specifications on its stages, so on more of them too
    meets = start_reflux is None and float(np.max(residuals)) <= math.log1p(SPEC_TOLERANCE)
    # only a design with stages to spare (over-purifying a product) or a given one is capped: an optimum meets
    # its specifications, and its stages say more of the separation than a minimum-stages estimate can; a given
    # design's say nothing of it (ethanol-water given 100 stages at R 3, its distillate 0.43 log units inside
    # the specification near the azeotrope: on 200 stages not found in 100 s, on 58 found in 6.5 s)
    stages, capped_at = (minimum_column(N, shortcut.minimum_stages if minimum_stages is None else minimum_stages)
                         if over or given else (STAGE_FACTOR * N, None))
    if time_limit is None:
        time_limit = TIME_LIMIT * max(1.0, stages * mixture.size / SIZE_REFERENCE)
    feed_stage = round(1 + (NF - 1) * (stages - 1) / (N - 1))
    top, bottom = verified.P[0], verified.P[-1]
    basis = _basis(stages, feed_stage, top, bottom, capped_at=capped_at)

    def minimum_from(start: StageProfile | None, reflux: float | None, limit: float, last: bool) -> StageProfile:
        # the first start's first column is not retried at more reflux: the other start follows (a given
        # demethaniser's shortcut start failed at 1, 1.5, 2 and 3 x its reflux, 11 s, before its own start
        # found the minimum in 5.5 s)
        return solve_to_specs(mixture, feed, case.products, case.column, shortcut, stages, feed_stage,
                              energy=True, start_reflux=reflux, start=start,
                              pressure_drop_per_stage=(bottom - top) / (stages - 1),
                              max_log_reflux_step=REFLUX_STEP, time_limit=limit, reflux_resolution=REFLUX_RESOLUTION,
                              start_meets=meets, first_retries=last)

    # Newton from the design's own distillate where the design meets its specifications about exactly (an
    # optimum does); a design that over-purifies a product starts from the shortcut's distillate, which
    # meets both by Fenske: a given vapour-fed toluene column at R 5 (p-xylene 13 log units inside its
    # specification, the distillate 1.3 % below the one meeting both) crept in ln R-capped steps that moved
    # the distillate too little and failed after 9 s; from the shortcut's distillate 1.3 s
    own = (verified, start_reflux)
    shortcut_start = (None, start_reflux or verified.reflux_ratio)
    try:
        for k, (start, reflux) in enumerate((shortcut_start, own) if over else (own, shortcut_start)):
            try:
                profile = minimum_from(start, reflux, time_limit - (time.monotonic() - began), k == 1)
                break
            except ConvergenceError:
                if k == 1 or time.monotonic() - began >= time_limit:
                    raise
    except (ConvergenceError, InfeasibleSpecError) as failure:
        spent = time.monotonic() - began
        why = (f"stopped after {spent:.0f} s (limit {time_limit:g} s) before both specifications were met"
               if spent > time_limit else str(failure))
        return EnergyBalanceMinimum(None, stages, feed_stage, top, bottom, spent, basis, why, capped_at)
    return EnergyBalanceMinimum(profile.reflux_ratio, stages, feed_stage, top, bottom, time.monotonic() - began,
                                basis, capped_at=capped_at)


def minimum_warnings(reflux_ratio: float, cmo_minimum: float, cmo_basis: str,
                     minimum: EnergyBalanceMinimum) -> tuple[str, ...]:
    """Loud warnings for a reported reflux ratio below either minimum, naming the basis and why."""
    found = []
    if minimum.reflux_ratio is None:
        found.append(f"energy-balance minimum reflux not found ({minimum.basis}): {minimum.failure}; "
                     f"R/Rmin is given against the constant-molar-overflow minimum {cmo_minimum:.4g} only")
    elif reflux_ratio < minimum.reflux_ratio:
        found.append(
            f"REFLUX BELOW MINIMUM: reflux ratio {reflux_ratio:.4g} is below the energy-balance minimum "
            f"{minimum.reflux_ratio:.4g} ({minimum.basis}): with these pressures no number of stages meets "
            "the specifications at this reflux on thermo's equilibrium and enthalpies; raise the reflux")
    if reflux_ratio < cmo_minimum and minimum.reflux_ratio is not None and reflux_ratio >= minimum.reflux_ratio:
        # no alarm: the shortcut's assumptions miss a non-ideal or multicomponent column (methanol/ethanol/water:
        # Underwood 10.94 on the feed's volatilities, 7.82 on thermo), and the design holds against thermo's
        found.append(
            f"reflux ratio {reflux_ratio:.4g} lies below the constant-molar-overflow minimum {cmo_minimum:.4g} "
            f"({cmo_basis}), which takes constant relative volatilities, equal molar latent heats and the top "
            f"pressure; on thermo's equilibrium and enthalpies the minimum is {minimum.reflux_ratio:.4g} "
            f"({minimum.basis}), which the design lies above: that is the minimum that holds")
    elif reflux_ratio < cmo_minimum:
        found.append(
            f"REFLUX BELOW MINIMUM: reflux ratio {reflux_ratio:.4g} is below the constant-molar-overflow "
            f"minimum {cmo_minimum:.4g} ({cmo_basis}); that minimum assumes equal molar latent heats and the "
            "top pressure, while the design comes from energy balances, which here need less reflux; the "
            "energy-balance minimum is the one that holds")
    return tuple(found)


__all__ = ["EnergyBalanceMinimum", "STAGE_CAP", "STAGE_FACTOR", "energy_balance_minimum", "minimum_column",
           "minimum_warnings"]
