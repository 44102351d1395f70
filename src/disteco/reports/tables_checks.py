"""The workbook's summary block of the thermo checks."""

from __future__ import annotations

from ..optimisation.thermo_checks import ThermoChecks
from .tables import Cell, Table, quantity_table


def checks_table(checks: ThermoChecks, reflux_ratio: float, cmo_minimum: float | None) -> Table:
    """Verification on thermo, both minimum reflux ratios and the fitted forms' largest errors."""
    v, k = checks.verification, checks.verification.keys
    items: list[tuple[str, Cell]] = [
        ("Verification method", v.method),
        ("Specifications met on thermo", "yes" if v.specifications_met else "no"),
        ("Specification tolerance [-]", v.tolerance),
        ("Light key in the distillate, thermo [mole fraction]", k.distillate_light_key_fraction),
        ("Light key in the bottoms, thermo [mole fraction]", k.bottoms_light_key_fraction),
        ("Heavy key in the distillate, thermo [mole fraction]", k.distillate_heavy_key_fraction),
        ("Light key recovery to the distillate, thermo [fraction]", k.light_key_recovery),
        ("Heavy key recovery to the bottoms, thermo [fraction]", k.heavy_key_recovery),
        ("Largest temperature difference, model against thermo [K]", v.max_temperature_difference),
        ("Largest mole-fraction difference, model against thermo [-]", v.max_composition_difference),
        ("Condenser duty, thermo [kW]", v.condenser_duty / 1e3),
        ("Reboiler duty, thermo [kW]", v.reboiler_duty / 1e3),
        ("Corrected on thermo", "no" if v.corrected is None else
         f"yes: reflux ratio {v.corrected.reflux_ratio:.4f}, "
         f"distillate {3.6 * v.corrected.distillate_flow:.3f} kmol/h"),
    ]
    if cmo_minimum:
        items.append(("Reflux ratio / constant-molar-overflow minimum [-]", reflux_ratio / cmo_minimum))
    m = checks.minimum
    if m is not None and m.reflux_ratio is not None:
        items += [("Minimum reflux ratio, energy balances on thermo [-]", m.reflux_ratio),
                  ("Reflux ratio / energy-balance minimum [-]", reflux_ratio / m.reflux_ratio),
                  ("Energy-balance minimum basis", m.basis)]
    f = checks.fit
    if f is not None:
        items += [("Fitted forms: largest bubble temperature error [K]", f.max_bubble_temperature_error),
                  ("Fitted forms: largest vapour mole-fraction error [-]", f.max_vapour_fraction_error),
                  ("Fitted forms: largest enthalpy error [kJ/mol]", f.max_enthalpy_error / 1e3)]
    return quantity_table("Checks on thermo", items)
