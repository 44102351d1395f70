"""The reported design solved again on thermo: stage energy balances, no fitted forms.

The optimiser works on fitted closed forms (``properties.fitted``). Its design (stages,
feed stage, reflux ratio, distillate flow) is solved once more by the stages layer's
energy-balance solver on the mixture's own equilibrium and enthalpies, warm-started from
the optimum's profile, at the optimum's pressures: one rigorous solve per reported design.

A specification counts as met when its key impurity (mole fraction, or the loss
1 - recovery) is at most ``SPEC_TOLERANCE`` (relative) above the specified value. When
thermo misses a specification by more, ``solve_to_specs`` corrects the reflux ratio and
the distillate flow at the same stages and feed stage, the corrected design is priced
again by the sizing and costing layers, and the result says so in a warning (a given design keeps
its reflux where its distillate flow alone meets both specifications). Where the
correction's reflux falls below a control margin's floor, the corrected distillate is run at
the floor instead (both products purer than specified), so the margin holds on thermo too.
"""

from __future__ import annotations

import math
import time
from dataclasses import dataclass, replace

import numpy as np

from .._base.errors import ConvergenceError, InfeasibleSpecError
from ..case import Case
from ..costing.data import CostData
from ..properties import FeedState, Mixture
from ..sizing.options import SizingOptions
from ..stages import ColumnSpec, ShortcutDesign, StageProfile, solve_rigorous, solve_to_specs, spec_residuals
from .first_round import DROP_TOLERANCE, close_enough, stage_pressure_drop
from .pricing import price_design
from .results import DesignEvaluation, SequentialPrice

# relative excess of a key impurity accepted as meeting its specification (common practice, no source)
SPEC_TOLERANCE = 0.01
PURER = 1e-6  # relative excess of an impurity over its specification still read as meeting it exactly [-]
PRESSURE_PASSES = 3  # corrections at most, each at the drop of the trays the one before is priced with
FLOOR_TOLERANCE = 1e-3  # a reflux this close below the control margin's floor holds it [-] (the margin's own too)
METHOD = "stage-by-stage energy balances on the thermodynamic library's equilibrium and enthalpies ({method})"


@dataclass(frozen=True)
class KeyFractions:
    """Key-component results of one profile: product mole fractions and recoveries [-]."""

    distillate_light_key_fraction: float
    bottoms_light_key_fraction: float
    distillate_heavy_key_fraction: float
    light_key_recovery: float  # to the distillate
    heavy_key_recovery: float  # to the bottoms
    excess: tuple[float, float]  # relative excess of (light, heavy) key impurity over its specification [-]


@dataclass(frozen=True)
class Verification:
    """The model's design under thermo and, where a specification was missed, the corrected design.

    Temperatures [K], duties [W], differences between the model's profile and thermo's
    profile stage by stage (temperature [K], liquid and vapour mole fractions [-]).
    """

    method: str
    specifications_met: bool
    tolerance: float  # [-], see SPEC_TOLERANCE
    keys: KeyFractions
    max_temperature_difference: float  # K
    max_composition_difference: float  # [-]
    condenser_duty: float  # W
    reboiler_duty: float  # W
    profile: StageProfile  # thermo's profile of the model's design
    wall_time: float  # s
    # thermo profile meeting both specifications exactly, or with purer products at a control margin's floor
    corrected: StageProfile | None = None
    corrected_price: SequentialPrice | None = None
    warnings: tuple[str, ...] = ()


def key_fractions(profile: StageProfile, case: Case, feed: FeedState) -> KeyFractions:
    """Key fractions and recoveries of ``profile`` and the relative excess over each specification."""
    light, heavy = case.products.light_key, case.products.heavy_key
    F, z = feed.molar_flow, feed.z
    d = profile.distillate_flow * np.asarray(profile.distillate_composition)
    b = profile.bottoms_flow * np.asarray(profile.bottoms_composition)
    excess = np.expm1(spec_residuals(profile, case.products, feed))
    return KeyFractions(float(profile.distillate_composition[light]), float(profile.bottoms_composition[light]),
                        float(profile.distillate_composition[heavy]), float(d[light] / (F * z[light])),
                        float(b[heavy] / (F * z[heavy])), (float(excess[0]), float(excess[1])))


def column_spec(design: StageProfile, case: Case, stage_drop: float | None = None) -> ColumnSpec:
    """The design's stages, feed, R and D at its top pressure and a uniform drop per stage to the reboiler:
    ``stage_drop`` [Pa], the drop its own trays give, where known, else its profile's."""
    N = design.stages
    drop = stage_drop if stage_drop is not None else (design.P[-1] - design.P[0]) / (N - 1) if N > 1 else 0.0
    return ColumnSpec(N, design.feed_stage, design.reflux_ratio, design.distillate_flow, design.P[0], drop,
                      case.column.condenser == "partial", case.column.subcooling)


def _differences(model: StageProfile, thermo: StageProfile) -> tuple[float, float]:
    dT = float(np.max(np.abs(np.subtract(model.T, thermo.T))))
    dx = max(float(np.max(np.abs(np.subtract(model.x, thermo.x)))),
             float(np.max(np.abs(np.subtract(model.y, thermo.y)))))
    return dT, dx



def _pressure_note(model: StageProfile, thermo: StageProfile) -> list[str]:
    """Where the model's pressure profile and the design's own trays' differ beyond the rounds' settling
    tolerance, the pressures thermo verified the design at: a round at the trays' drop found no design,
    the rounds stopped unsettled, or the layout changed the trays after them (a stabiliser's swaged shell
    at 0.45 m, 735 Pa per stage, where the rounds had settled one diameter at 0.75 m on 793 Pa)."""
    drops = [(p.P[-1] - p.P[0]) for p in (model, thermo)]
    if not drops[0] > 0.0 or close_enough(drops[1], drops[0], DROP_TOLERANCE):
        return []
    return [f"verified at its own trays' pressures: {thermo.P[0] / 1e3:.4g} kPa at the top to "
            f"{thermo.P[-1] / 1e3:.4g} kPa in the reboiler, where the model's profile, set on other trays (an "
            f"earlier round's, or another layout's or spacing's), reached {model.P[-1] / 1e3:.4g} kPa"]


def _beyond_tolerance(excess: float) -> str:
    """``excess`` in per cent with the digits that tell it from the tolerance (an acetone/methanol
    design read "1 % above its specification (tolerance 1 %)").

    >>> _beyond_tolerance(0.01004), _beyond_tolerance(0.0212)
    ('1.004', '2.12')
    """
    digits = 3
    while digits < 8 and f"{100 * excess:.{digits}g}" == f"{100 * SPEC_TOLERANCE:.{digits}g}":
        digits += 1
    return f"{100 * excess:.{digits}g}"


def verify_design(case: Case, mixture: Mixture, feed: FeedState, design: DesignEvaluation,
                  shortcut: ShortcutDesign, data: CostData, sizing: SizingOptions = SizingOptions(),
                  scenario: str | None = None, reflux_floor: float | None = None,
                  hold_reflux: bool = False, priced: SequentialPrice | None = None) -> Verification:
    """Solve ``design`` on thermo; correct R and D and price again when a specification is missed.

    ``shortcut`` is the stages layer's shortcut design of the case (Newton's fallback start);
    ``reflux_floor``: the control margin's least reflux ratio [-], which a correction keeps;
    ``hold_reflux``: a given design's reflux, which a correction keeps where the distillate flow alone
    meets both specifications (:func:`_distillate_at_reflux`); ``priced``: the design sized, whose trays'
    hydraulics and efficiency give the pressures it is solved at (else its profile's pressures, the model's,
    which the optimiser's rounds settle to within ``DROP_TOLERANCE`` of the trays' but a round that found no
    design at its trays' drop leaves further off).
    """
    began = time.monotonic()
    model = design.profile
    own = None if priced is None else stage_pressure_drop(case, priced.sizing)
    spec = column_spec(model, case, own)
    thermo = solve_rigorous(mixture, feed, spec, guess=model)
    keys = key_fractions(thermo, case, feed)
    met = max(keys.excess) <= SPEC_TOLERANCE
    dT, dx = _differences(model, thermo)
    corrected = price = None
    warnings: list[str] = []
    if not met:
        missed = "; ".join(f"{name} key impurity {_beyond_tolerance(e)} % above its specification"
                           for name, e in zip(("light", "heavy"), keys.excess) if e > SPEC_TOLERANCE)
        start, unsettled = thermo, None
        for passes in range(1, PRESSURE_PASSES + 1):
            try:
                found = (hold_reflux and _distillate_at_reflux(mixture, feed, case, start, spec)) or \
                    solve_to_specs(mixture, feed, case.products, case.column, shortcut, spec.stages,
                                   spec.feed_stage, energy=True, start=start,
                                   pressure_drop_per_stage=spec.pressure_drop_per_stage)
            except (ConvergenceError, InfeasibleSpecError) as failure:
                if corrected is None:
                    warnings.append(
                        f"SPECIFICATION MISSED: solved on thermo, the design (reflux ratio {model.reflux_ratio:.4g}, "
                        f"{spec.stages} stages) gives {missed} (tolerance {100 * SPEC_TOLERANCE:g} %), and no reflux "
                        f"ratio meets both at these stages ({failure}); add stages")
                break  # a later pass's failure keeps the correction before it
            held = _held_at_floor(case, mixture, feed, found, reflux_floor)
            corrected = held or found
            evaluation = replace(design, profile=corrected, reflux_ratio=corrected.reflux_ratio)
            price = price_design(evaluation, mixture, data, replace(sizing, light_key=case.products.light_key,
                                                                    heavy_key=case.products.heavy_key),
                                 scenario, case.economics.cost_year)
            # the correction's reflux moves the diameter and so the trays' drop: corrected again at the drop of
            # the trays it is priced with (acetone/water: R 37.5 -> 61.05 at 276 kPa, whose 170 trays give 279.5;
            # after three corrections R 79.16 at 282.2 kPa, its trays' 282.4)
            drop = stage_pressure_drop(case, price.sizing)
            settled = own is None or close_enough(drop, spec.pressure_drop_per_stage, DROP_TOLERANCE)
            unsettled = None if settled else (drop, spec.pressure_drop_per_stage)
            if settled or passes == PRESSURE_PASSES:
                break
            spec = column_spec(found, case, drop)
            try:
                start = solve_rigorous(mixture, feed, spec, guess=found)
            except ConvergenceError:
                break
        if corrected is not None:  # found and held: the last pass that solved
            warnings.append(
                f"corrected design: solved on thermo, the model's design gives {missed} (tolerance "
                f"{100 * SPEC_TOLERANCE:g} %); reported instead: reflux ratio {corrected.reflux_ratio:.4g} "
                f"(model {model.reflux_ratio:.4g}) and distillate {3.6 * corrected.distillate_flow:.4g} kmol/h "
                f"(model {3.6 * model.distillate_flow:.4g}), same {spec.stages} stages and feed stage "
                f"{spec.feed_stage}, priced again" + ("" if held is None else _floor_note(case, feed, found, held)))
        if corrected is not None and unsettled is not None:
            warnings.append(f"the corrected design's trays give {unsettled[0]:.0f} Pa per equilibrium stage where "
                            f"its correction on thermo took {unsettled[1]:.0f} Pa: the corrections at the trays' "
                            f"pressures did not settle within {100 * DROP_TOLERANCE:g} %")
    if own is not None:
        warnings[:0] = _pressure_note(model, corrected or thermo)
    return Verification(METHOD.format(method=mixture.method), met, SPEC_TOLERANCE, keys, dT, dx,
                        thermo.condenser_duty, thermo.reboiler_duty, thermo, time.monotonic() - began,
                        corrected, price, tuple(warnings))


DISTILLATE_STEPS = 12  # secant steps on the distillate flow of a design corrected at its own reflux


def _distillate_at_reflux(mixture: Mixture, feed: FeedState, case: Case, thermo: StageProfile,
                          spec: ColumnSpec) -> StageProfile | None:
    """``thermo``'s column at its own reflux and stages with the distillate flow that brings the missed
    specification onto its value, where the other then holds too; None where it does not (the
    reflux has to move as well) or the search fails.

    A given design with stages to spare over-purifies one product; correcting reflux and distillate
    together found the reflux that meets both exactly (ethanol-water given R 3 on 100 stages was
    reported at R 1.11). The missed residual (light key in the bottoms, or heavy key in the
    distillate, in logs) moves monotonically with D; secant steps from a first step that moves the
    excess key flow into the other product.
    """
    residuals = spec_residuals(thermo, case.products, feed)
    missed = int(np.argmax(residuals))
    if residuals[1 - missed] > 0.0:
        return None  # both missed: the distillate alone cannot meet both
    light, heavy = case.products.light_key, case.products.heavy_key
    # the missed key's flow in the wrong product, by which D rises (light key in the bottoms) or falls
    excess = (thermo.bottoms_flow * thermo.bottoms_composition[light] if missed == 0
              else -thermo.distillate_flow * thermo.distillate_composition[heavy])
    points = [(thermo.distillate_flow, residuals[missed])]
    D, profile = thermo.distillate_flow + excess * (1.0 - np.exp(-residuals[missed])), thermo
    for _ in range(DISTILLATE_STEPS):
        if not 0.0 < D < feed.molar_flow:
            return None
        try:
            profile = solve_rigorous(mixture, feed, replace(spec, distillate_flow=D), guess=profile)
        except (ConvergenceError, InfeasibleSpecError):
            return None
        residuals = spec_residuals(profile, case.products, feed)
        if abs(residuals[missed]) <= math.log1p(SPEC_TOLERANCE) / 2.0:
            return profile if max(key_fractions(profile, case, feed).excess) <= SPEC_TOLERANCE else None
        (D0, r0), points = points[-1], points + [(D, residuals[missed])]
        if residuals[missed] == r0:
            return None
        D = D - residuals[missed] * (D - D0) / (residuals[missed] - r0)
    return None


def _held_at_floor(case: Case, mixture: Mixture, feed: FeedState, corrected: StageProfile,
                   reflux_floor: float | None) -> StageProfile | None:
    """``corrected``'s distillate at the control margin's floor, where the correction fell below it and
    thermo meets both specifications there; else None.

    More reflux at the same distillate makes both products purer, so the floor keeps both
    specifications (checked on thermo, not assumed).
    """
    if reflux_floor is None or corrected.reflux_ratio >= reflux_floor * (1.0 - FLOOR_TOLERANCE):
        return None
    spec = replace(column_spec(corrected, case), reflux_ratio=reflux_floor)
    try:
        held = solve_rigorous(mixture, feed, spec, guess=corrected)
    except (ConvergenceError, InfeasibleSpecError):
        return None
    return held if max(key_fractions(held, case, feed).excess) <= PURER else None


def _floor_note(case: Case, feed: FeedState, corrected: StageProfile, held: StageProfile) -> str:
    keys = key_fractions(held, case, feed)
    return (f"; the reflux ratio is the control margin's floor: thermo meets both specifications from "
            f"{corrected.reflux_ratio:.4g} at this distillate, and at the floor the products are purer than "
            f"specified (light key {keys.distillate_light_key_fraction:.5g} in the distillate, "
            f"{keys.bottoms_light_key_fraction:.3g} in the bottoms; recoveries {keys.light_key_recovery:.4f} / "
            f"{keys.heavy_key_recovery:.4f})")


__all__ = ["KeyFractions", "SPEC_TOLERANCE", "Verification", "column_spec", "key_fractions", "verify_design"]
