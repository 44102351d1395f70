"""result.json: a stable, documented shape with the unit of every quantity in its key.

Top-level keys (schema_version 1): ``schema_version``, ``disteco_version``, ``case_title``,
``case_file``, ``mode`` ("optimise" or "evaluate"), ``minimum_reflux_ratio``,
``minimum_stages``, ``design``, ``cost``, ``solver``, ``model_check``, ``equipment``, ``stage_profile``,
``shortcut_table``, ``scenarios``, ``cross_table``, ``tac_curves``, ``mixture``, ``feed``, ``warnings``,
``cautions``, ``inputs`` (the sizing options the run used and the least R/Rmin asked for),
``control_margin`` (the floor on the reflux ratio and, where it binds, the optimum without it),
and the thermo checks of the reported design (``reports.json_checks``):
``verification``, ``minimum_reflux_energy_balance``, ``fit_check``. A part that was not computed is ``null``. Money is in ``cost.currency`` of
``cost.cost_year``; ``_per_year`` means per operating year.
"""

from __future__ import annotations

from .. import __version__
from .._base.units import to_degC
from ..case import Feed
from ..costing import CostSummary
from ..costing.from_sizing import swaged
from ..optimisation.results import DesignEvaluation, LayoutChoice, OptimumDesign, SequentialPrice, SolverReport
from ..properties import FeedState, MixtureSummary
from ..sizing import ColumnSizing
from ..stages import StageDesign, StageProfile
from .cautions import CAUTIONS
from .choices import inputs_json, margin_json
from .design_result import SCHEMA_VERSION, DesignResult
from .json_checks import checks_json, scenario_verification_json
from .tables_prices import economics_json
from .tables_design import GivenDesignReport, GivenUnderPrices
from .tables_scenarios import reported

KMOL_PER_H = 3.6  # (kmol/h) per (mol/s)


def mixture_json(summary: MixtureSummary) -> dict:
    return {
        "method": summary.method,
        "top_pressure_kPa": summary.pressure / 1e3,
        "components": [
            {"name": c.name, "databank_name": c.databank_name, "cas": c.cas,
             "molar_mass_g_per_mol": c.molar_mass * 1e3,
             "normal_boiling_point_degC": to_degC(c.normal_boiling_point),
             "feed_mole_fraction": c.feed_fraction}
            for c in summary.components],
        "light_key": summary.light_key,
        "heavy_key": summary.heavy_key,
        "key_relative_volatility_min": summary.key_volatility_min,
        "key_relative_volatility_max": summary.key_volatility_max,
        "polar_pairs_without_interaction_parameter": list(summary.untuned_polar_pairs),
        "acids_without_vapour_dimerisation": list(summary.acids_without_dimerisation),
        "ideal_gas_vapour_check": None if summary.vapour is None else {
            "feed_bubble_point_degC": to_degC(summary.vapour.temperature),
            "key_relative_volatility_ideal_gas_vapour": summary.vapour.alpha_ideal_gas,
            "key_relative_volatility_real_vapour": summary.vapour.alpha_real_vapour,
            "ideal_gas_deviation_fraction": summary.vapour.deviation},
        "feed_bubble_point_degC": to_degC(summary.feed_bubble_T),
        "feed_dew_point_degC": to_degC(summary.feed_dew_T),
        "azeotropes": [
            {"first": a.first, "second": a.second, "mole_fraction_first": a.x_first,
             "temperature_degC": to_degC(a.T), "pressure_kPa": a.pressure / 1e3, "kind": a.kind,
             "relative_volatility_with_dimerisation": a.alpha_dimerised,
             "predicted_by": a.predicted_by or None}
            for a in summary.azeotropes],
        "vapour_dimerisation_check": None if summary.association is None else {
            "acid": summary.association.acid,
            "key_relative_volatility_min": summary.association.alpha_min,
            "key_relative_volatility_max": summary.association.alpha_max},
    }


def feed_json(feed: FeedState, written: Feed | None = None) -> dict:
    """The feed state; ``written`` (the case's :class:`Feed`) adds mass fractions where the case gave them."""
    found = {
        "molar_flow_kmol_per_h": feed.molar_flow * KMOL_PER_H,
        "mole_fractions": list(feed.z),
        "pressure_kPa": feed.pressure / 1e3,
        "temperature_degC": to_degC(feed.temperature),
        "q": feed.q,
        "vapour_fraction": feed.vapour_fraction,
    }
    if written is not None and written.composition_basis == "mass":
        found["mass_fractions_as_written"] = list(written.composition)
    return found


def profile_json(profile: StageProfile) -> dict:
    """Per-stage arrays, stage 1 at the top, the reboiler last."""
    return {
        "model": profile.model,
        "stage": list(range(1, profile.stages + 1)),
        "temperature_degC": [to_degC(t) for t in profile.T],
        "pressure_kPa": [p / 1e3 for p in profile.P],
        "liquid_flow_kmol_per_h": [v * KMOL_PER_H for v in profile.L],
        "vapour_flow_kmol_per_h": [v * KMOL_PER_H for v in profile.V],
        "x": [list(row) for row in profile.x],
        "y": [list(row) for row in profile.y],
        "distillate_kmol_per_h": profile.distillate_flow * KMOL_PER_H,
        "bottoms_kmol_per_h": profile.bottoms_flow * KMOL_PER_H,
        "distillate_mole_fractions": list(profile.distillate_composition),
        "bottoms_mole_fractions": list(profile.bottoms_composition),
    }


def design_json(profile: StageProfile, minimum_reflux: float | None, sizing: ColumnSizing | None) -> dict:
    data = {
        "reflux_ratio": profile.reflux_ratio,
        "reflux_ratio_over_minimum": profile.reflux_ratio / minimum_reflux if minimum_reflux else None,
        "stages": profile.stages,
        "feed_stage": profile.feed_stage,
        "condenser_duty_kW": profile.condenser_duty / 1e3,
        "reboiler_duty_kW": profile.reboiler_duty / 1e3,
        "distillate_kmol_per_h": profile.distillate_flow * KMOL_PER_H,
        "bottoms_kmol_per_h": profile.bottoms_flow * KMOL_PER_H,
        "top_temperature_degC": to_degC(profile.T[0]),
        "reboiler_temperature_degC": to_degC(profile.reboiler_temperature),
        "top_pressure_kPa": profile.P[0] / 1e3,
        "bottom_pressure_kPa": profile.P[-1] / 1e3,
        "tray_pressure_drop_hydraulics_kPa": None,
        "real_trays": None, "tray_efficiency": None, "diameter_m": None, "height_m": None,
        "shell_thickness_mm": None, "condenser_area_m2": None, "reboiler_area_m2": None,
        "condenser_utility": None, "reboiler_utility": None,
    }
    if sizing is not None:
        data.update({
            "real_trays": sizing.real_trays,
            "tray_pressure_drop_hydraulics_kPa": sizing.tray_pressure_drop / 1e3 if sizing.pressure_drops else None,
            "tray_efficiency": sizing.efficiency.value,
            "diameter_m": sizing.diameter,
            "height_m": sizing.tallest_shell.tangent_length,
            "height_to_diameter": sizing.tallest_shell.tangent_length / sizing.diameter,
            "diameter_basis": sizing.diameter_basis,
            "flooding_diameter_m": sizing.flooding_diameter,
            "tray_spacing_m": sizing.height.tray_spacing,
            "shell_count": sizing.shells,
            "shells": shells_json(sizing),
            "sections": sections_json(sizing),
            "interconnection": interconnection_json(sizing),
            "shell_thickness_mm": sizing.vessel.shell_thickness * 1e3,
            "condenser_area_m2": sizing.condenser.area,
            "reboiler_area_m2": sizing.reboiler.area,
            "condenser_utility": sizing.condenser.utility.name,
            "reboiler_utility": sizing.reboiler.utility.name,
        })
    return data


def shells_json(sizing: ColumnSizing) -> list[dict]:
    """Each shell, top first: trays, heights, slenderness and design pressure."""
    split = sizing.split
    shells = [("single", sizing.real_trays, sizing.height, sizing.vessel)] if split is None else [
        ("upper", split.upper_trays, split.upper_height, split.upper_vessel),
        ("lower", split.lower_trays, sizing.height, sizing.vessel)]
    return [{"position": position, "real_trays": trays, "tangent_length_m": h.tangent_length,
             "overall_height_m": h.overall, "height_to_diameter": h.tangent_length / sizing.diameter,
             "design_pressure_kPa_gauge": vessel.design_pressure / 1e3,
             "shell_thickness_mm": vessel.shell_thickness * 1e3}
            for position, trays, h, vessel in shells]


def sections_json(sizing: ColumnSizing) -> dict:
    """Diameters the rectifying and stripping trays need, and whether the column is priced with two."""
    return {"rectifying_diameter_m": sizing.rectifying_diameter, "stripping_diameter_m": sizing.stripping_diameter,
            "rectifying_real_trays": sizing.rectifying_real_trays,
            "stripping_real_trays": sizing.real_trays - sizing.rectifying_real_trays,
            "separate_sections": sizing.separate_sections, "swaged_shell": swaged(sizing)}


def interconnection_json(sizing: ColumnSizing) -> dict | None:
    """Transfer pump and vapour line between two shells; None for one shell."""
    split = sizing.split
    if split is None:
        return None
    pump, line = split.transfer_pump, split.vapour_line
    return {"split_after_stage": split.split_stage, "transfer_pump_shaft_power_kW": pump.shaft_power / 1e3,
            "transfer_pump_head_m": pump.head, "transfer_pump_flow_m3_per_h": pump.volume_flow * 3600.0,
            "vapour_line_diameter_m": line.diameter, "vapour_line_length_m": line.length,
            "vapour_line_velocity_m_per_s": line.velocity}


def layout_json(layout: LayoutChoice | None) -> dict | None:
    """The shell layouts compared, the one chosen and why, the limits and what they cost."""
    if layout is None:
        return None
    return {
        "chosen": layout.chosen, "why": layout.why,
        "limits": {"max_height_m": layout.max_height, "max_height_to_diameter": layout.max_height_to_diameter,
                   "source": "common practice, no source (defaults; the case's sizing table may set them)"},
        "binding": list(layout.binding),
        "unconstrained_tac_per_year": layout.unconstrained_tac,
        "sections": layout.sections,
        "limit_cost_per_year": layout.limit_cost,
        "options": [{"layout": o.label, "shells": o.shells, "tac_per_year": o.tac, "stages": o.stages,
                     "feed_stage": o.feed_stage, "reflux_ratio": o.reflux_ratio, "tray_spacing_m": o.tray_spacing,
                     "tallest_shell_m": o.tallest_shell, "height_to_diameter": o.height_to_diameter,
                     "note": o.note} for o in layout.options],
        "tray_spacings": [{"tray_spacing_m": p.spacing, "tac_per_year": p.tac, "tallest_shell_m": p.tallest_shell,
                           "diameter_m": p.diameter} for p in layout.spacings],
    }


def cost_json(cost: CostSummary) -> dict:
    band = cost.accuracy_band
    return {
        "currency": cost.currency,
        "cost_year": cost.cost_year,
        "scenario": cost.scenario,
        "capital_installed": cost.capital_installed,
        "annualised_capital_per_year": cost.annualised_capital,
        "capital_charge_factor_per_year": cost.capital_charge_factor,
        "utilities_per_year": cost.utilities_per_year,
        "tac_per_year": cost.tac_per_year,
        "operating_hours_per_year": cost.operating_hours_per_year,
        "accuracy": {"estimate_class": band.estimate_class, "low_best": band.low_best,
                     "low_worst": band.low_worst, "high_best": band.high_best, "high_worst": band.high_worst,
                     "source": band.source},
        "items": [
            {"item": i.item, "size": i.size, "size_unit": i.size_unit, "purchased_base": i.purchased_base,
             "purchased_escalated": i.purchased_escalated, "material": i.material,
             "material_factor": i.material_factor, "pressure_factor": i.pressure_factor,
             "bare_module_factor": i.bare_module_factor, "installed": i.installed, "source": i.source}
            for i in cost.items],
        "utilities": [
            {"item": u.item, "utility": u.utility, "duty_kW": u.duty / 1e3, "amount_per_year": u.amount_per_year,
             "amount_unit": u.amount_unit, "price": u.price, "price_unit": u.price_unit, "price_year": u.price_year,
             "given_price": u.given_price, "given_year": u.given_year, "escalation_factor": u.escalation_factor,
             "price_index": u.price_index, "set_by": u.set_by, "cost_per_year": u.cost_per_year, "source": u.source}
            for u in cost.utilities],
    }


def equipment_json(sizing: ColumnSizing) -> list[dict]:
    return [
        {"tag": e.tag, "kind": e.kind, "size": e.size, "size_unit": e.size_unit, "size_basis": e.size_basis,
         "material": e.material, "quantity": e.quantity,
         "design_pressure_kPa_gauge": e.design_pressure / 1e3,
         "design_temperature_degC": to_degC(e.design_temperature),
         "lowest_operating_temperature_degC": None if e.minimum_temperature is None else to_degC(e.minimum_temperature),
         "overall_coefficient_W_per_m2K": e.overall_coefficient, "coefficient_basis": e.coefficient_basis}
        for e in sizing.equipment]


def solver_json(report: SolverReport, rounds: int = 1, settled: bool = True) -> dict:
    return {"solver": report.solver, "status": report.status, "termination": report.termination,
            "gap": report.gap, "wall_time_s": report.wall_time,
            "configurations_solved": report.configurations_solved, "message": report.message,
            "rounds": rounds, "constants_settled": settled,
            "unsolved": {"neighbours_of_chosen": report.neighbours,
                         "neighbours_of_chosen_unsolved": report.neighbours_unsolved,
                         "configurations": [{"stages": u.stages, "feed_stage": u.feed_stage, "reason": u.status}
                                            for u in report.unsolved]}}


def model_check_json(sequential: SequentialPrice | None) -> dict | None:
    """Diagnostic: the optimisation model's TAC and diameter against the reported re-price."""
    check = sequential.model_check if sequential is not None else None
    if check is None:
        return None
    return {"model_tac_per_year": check.model_tac, "reported_tac_per_year": check.reported_tac,
            "difference_per_year": check.difference,
            "difference_fraction": check.difference / check.reported_tac,
            "diameter_rounding_tac_per_year": check.rounding_tac,
            "model_diameter_m": check.model_diameter, "reported_diameter_m": check.reported_diameter,
            "unrounded_diameter_m": check.unrounded_diameter}


def scenario_json(name: str, optimum: OptimumDesign, minimum_reflux: float | None, checks=None) -> dict:
    best, shown = optimum.best, reported(optimum, checks)
    sequential = shown.price
    return {
        "scenario": name,
        "reflux_ratio": shown.reflux_ratio,
        "reflux_ratio_over_minimum": shown.reflux_ratio / minimum_reflux if minimum_reflux else None,
        "stages": best.stages,
        "feed_stage": best.feed_stage,
        "condenser_duty_kW": shown.condenser_duty / 1e3,
        "reboiler_duty_kW": shown.reboiler_duty / 1e3,
        "cost": cost_json(sequential.cost) if sequential else None,
        "model_check": model_check_json(sequential),
        "diameter_m": sequential.sizing.diameter if sequential else best.sizes.diameter,
        "height_m": sequential.sizing.tallest_shell.tangent_length if sequential else best.sizes.height,
        "shell_count": sequential.sizing.shells if sequential else None,
        "tray_spacing_m": sequential.sizing.height.tray_spacing if sequential else None,
        "layout": layout_json(optimum.layout),
        "verification": scenario_verification_json(checks),
    }


def stages_json(stages: StageDesign) -> dict:
    return {
        "basis": stages.basis,
        "table": [{"reflux_ratio": p.reflux_ratio, "reflux_ratio_over_minimum": p.reflux_factor,
                   "stages": p.stages, "whole_stages": p.whole_stages, "feed_stage": p.feed_stage}
                  for p in stages.table],
    }


def given_json(given: GivenDesignReport | None, cost: CostSummary | None) -> dict | None:
    """A priced given design: the decisions held, and the optimum under the same prices (None: not compared)."""
    if given is None:
        return None
    held = {"reflux_ratio": given.reflux_ratio, "stages": given.stages, "feed_stage": given.feed_stage}
    under = {"scenarios": [_given_under_json(u) for u in given.scenarios]} if given.scenarios else {}
    extra = given.extra_tac(cost.tac_per_year) if cost is not None else None
    if extra is None:
        return {"held": held, "optimum": None, **under}
    return {"held": held, **_against_optimum(given.optimum, cost.tac_per_year, extra, cost.scenario), **under}


def _against_optimum(optimum, tac: float, extra: float, scenario: str) -> dict:
    best = optimum.best
    return {"optimum": {"reflux_ratio": best.reflux_ratio, "stages": best.stages, "feed_stage": best.feed_stage,
                        "tac_per_year": tac - extra, "scenario": scenario},
            "extra_tac_per_year": extra, "extra_tac_fraction": extra / (tac - extra)}


def _given_under_json(under: GivenUnderPrices) -> dict:
    """The given design under one scenario's prices, and that scenario's optimum (None: not compared)."""
    c = under.cost
    priced = {"scenario": under.scenario, "utilities_per_year": c.utilities_per_year, "tac_per_year": c.tac_per_year}
    if under.extra_tac is None:
        return {**priced, "optimum": None}
    return {**priced, **_against_optimum(under.optimum, c.tac_per_year, under.extra_tac, under.scenario)}


def result_json(result: DesignResult) -> dict:
    """The whole result as a JSON-ready dict."""
    parts = result.parts
    stages = result.stages
    r_min = stages.minimum_reflux if stages else None
    chosen: DesignEvaluation | None = parts.optimum.best if parts.optimum else result.evaluation
    profile = parts.profile or (stages.profile if stages else None)
    solver = None
    if parts.optimum is not None:
        solver = solver_json(parts.optimum.solver, parts.optimum.rounds, parts.optimum.settled)
        solver["limited_by"] = [{"option": b.option, "value": b.value, "bound": b.text}
                                for b in parts.optimum.limits]
    elif chosen is not None:
        solver = solver_json(chosen.solver)
    sequential = parts.optimum.sequential if parts.optimum is not None else \
        result.evaluation.sequential if result.evaluation is not None else None
    cross = parts.cross
    limits = {name: optimum.stage_limit for name, optimum in parts.scenarios}  # shell height limit, where it cut
    return {
        "schema_version": SCHEMA_VERSION,
        "disteco_version": __version__,
        "case_title": result.case.title,
        "case_file": str(result.case.source) if result.case.source else None,
        "mode": "evaluate" if result.evaluation is not None else "optimise",
        "minimum_reflux_ratio": r_min,
        "minimum_stages": stages.minimum_stages if stages else None,
        "design": design_json(profile, r_min, parts.sizing) if profile else None,
        "cost": cost_json(parts.cost) if parts.cost else None,
        "economics": economics_json(parts),
        "solver": solver,
        "model_check": model_check_json(sequential),
        "equipment": equipment_json(parts.sizing) if parts.sizing else None,
        "layout": layout_json(parts.optimum.layout if parts.optimum is not None else None),
        "stage_profile": profile_json(profile) if profile else None,
        "shortcut_table": stages_json(stages) if stages else None,
        "scenarios": [{**scenario_json(name, optimum, r_min, dict(parts.scenario_checks).get(name)),
                       "control_margin": margin_json(dict(parts.margins).get(name))}
                      for name, optimum in parts.scenarios],
        "cross_table": None if cross is None else {
            "scenarios": list(cross.scenarios), "currency": cross.currency,
            "tac_per_year": [list(row) for row in cross.tac],
            "extra_tac_per_year": [list(row) for row in cross.extra]},
        "tac_curves": [
            {"scenario": name, "stage_limit": limits.get(name), "points": [
                {"reflux_ratio": d.reflux_ratio, "stages": d.stages, "feed_stage": d.feed_stage,
                 "reboiler_duty_kW": d.sizes.reboiler_duty / 1e3, "capital_installed": d.cost.capital_installed,
                 "annualised_capital_per_year": d.cost.annualised_capital_per_year,
                 "utilities_per_year": d.cost.utilities_per_year, "model_tac_per_year": d.tac}
                for d in designs]}
            for name, designs in parts.tac_curves],
        "mixture": mixture_json(result.mixture),
        "feed": feed_json(result.feed, result.case.feed),
        "inputs": inputs_json(result.case),
        "control_margin": margin_json(parts.margin),
        "given_design": given_json(parts.given, parts.cost),
        "warnings": list(result.warnings),
        "cautions": list(CAUTIONS),
        **checks_json(parts.checks, profile.reflux_ratio if profile else None),
    }
