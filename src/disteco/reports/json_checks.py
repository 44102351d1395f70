"""result.json parts of the thermo checks: ``verification``, ``minimum_reflux_energy_balance``, ``fit_check``."""

from __future__ import annotations

from ..optimisation.fit_check import BUBBLE_TEMPERATURE_TOLERANCE, ENTHALPY_TOLERANCE, VAPOUR_FRACTION_TOLERANCE
from ..optimisation.thermo_checks import ThermoChecks
from ..optimisation.verification import Verification

KMOL_PER_H = 3.6  # (kmol/h) per (mol/s)


def verification_json(v: Verification) -> dict:
    """The model's design solved on thermo; ``corrected_design`` when a specification was missed."""
    k = v.keys
    corrected = None
    if v.corrected is not None:
        corrected = {"reflux_ratio": v.corrected.reflux_ratio,
                     "distillate_kmol_per_h": v.corrected.distillate_flow * KMOL_PER_H,
                     "condenser_duty_kW": v.corrected.condenser_duty / 1e3,
                     "reboiler_duty_kW": v.corrected.reboiler_duty / 1e3,
                     "tac_per_year": v.corrected_price.cost.tac_per_year if v.corrected_price else None}
    return {
        "method": v.method,
        "specifications_met": v.specifications_met,
        "specification_tolerance": v.tolerance,
        "distillate_light_key_fraction": k.distillate_light_key_fraction,
        "bottoms_light_key_fraction": k.bottoms_light_key_fraction,
        "distillate_heavy_key_fraction": k.distillate_heavy_key_fraction,
        "light_key_recovery": k.light_key_recovery,
        "heavy_key_recovery": k.heavy_key_recovery,
        "max_temperature_difference_K": v.max_temperature_difference,
        "max_composition_difference": v.max_composition_difference,
        "condenser_duty_kW": v.condenser_duty / 1e3,
        "reboiler_duty_kW": v.reboiler_duty / 1e3,
        "corrected_design": corrected,
        "wall_time_s": v.wall_time,
    }


def scenario_verification_json(checks: ThermoChecks | None) -> dict | None:
    return None if checks is None else verification_json(checks.verification)


def checks_json(checks: ThermoChecks | None, reflux_ratio: float | None) -> dict:
    """The three top-level keys (each None when not computed)."""
    if checks is None:
        return {"verification": None, "minimum_reflux_energy_balance": None, "fit_check": None}
    m, f = checks.minimum, checks.fit
    minimum = None if m is None else {
        "reflux_ratio": m.reflux_ratio,
        "reflux_ratio_over_minimum": reflux_ratio / m.reflux_ratio if m.reflux_ratio and reflux_ratio else None,
        "stages": m.stages, "feed_stage": m.feed_stage, "top_pressure_kPa": m.top_pressure / 1e3,
        "bottom_pressure_kPa": m.bottom_pressure / 1e3, "basis": m.basis, "failure": m.failure or None,
        "wall_time_s": m.wall_time}
    fit = None if f is None else {
        "stages_checked": list(f.stages),
        "max_bubble_temperature_error_K": f.max_bubble_temperature_error,
        "max_vapour_fraction_error": f.max_vapour_fraction_error,
        "max_enthalpy_error_kJ_per_mol": f.max_enthalpy_error / 1e3,
        "within_tolerance": f.within_tolerance,
        "tolerances": {"bubble_temperature_K": BUBBLE_TEMPERATURE_TOLERANCE,
                       "vapour_fraction": VAPOUR_FRACTION_TOLERANCE,
                       "enthalpy_kJ_per_mol": ENTHALPY_TOLERANCE / 1e3}}
    return {"verification": verification_json(checks.verification), "minimum_reflux_energy_balance": minimum,
            "fit_check": fit}
