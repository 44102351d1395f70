"""Console lines of the thermo checks: verification, both minimum reflux ratios, fitted-form errors."""

from __future__ import annotations

from typing import TYPE_CHECKING

if TYPE_CHECKING:  # an annotation only; importing it would pull in the solver interfaces
    from ..optimisation.thermo_checks import ThermoChecks


def checks_lines(checks: ThermoChecks | None, reflux_ratio: float, cmo_minimum: float | None) -> list[str]:
    """A few lines with units; empty when the checks were not run."""
    if checks is None:
        return []
    v, k = checks.verification, checks.verification.keys
    state = "specifications met" if v.specifications_met else "SPECIFICATIONS MISSED by the model's design"
    lines = [f"Verified on thermo (energy balances, {v.profile.stages} stages): {state} (tolerance "
             f"{100 * v.tolerance:g} %); light key {k.distillate_light_key_fraction:.5f} in the distillate, "
             f"{k.bottoms_light_key_fraction:.5f} in the bottoms; recoveries {k.light_key_recovery:.4f} / "
             f"{k.heavy_key_recovery:.4f} [-]",
             f"  model against thermo: largest difference {v.max_temperature_difference:.3g} K, "
             f"{v.max_composition_difference:.3g} mole fraction; thermo duties condenser "
             f"{v.condenser_duty / 1e3:,.0f} kW, reboiler {v.reboiler_duty / 1e3:,.0f} kW ({v.wall_time:.1f} s)"]
    if v.corrected is not None:
        lines.append(f"  corrected on thermo to reflux ratio {v.corrected.reflux_ratio:.4f} [-], distillate "
                     f"{3.6 * v.corrected.distillate_flow:.3f} kmol/h (reported design)")
    m = checks.minimum
    if m is not None:
        if m.reflux_ratio is None:
            lines.append(f"Energy-balance minimum reflux: not found ({m.failure})")
        else:
            cmo = f", {reflux_ratio / cmo_minimum:.3f} x the constant-molar-overflow minimum" if cmo_minimum else ""
            lines.append(f"Energy-balance minimum reflux ratio: {m.reflux_ratio:.4f} [-] ({m.basis}; "
                         f"{m.wall_time:.1f} s); design at {reflux_ratio / m.reflux_ratio:.3f} x it{cmo}")
    f = checks.fit
    if f is not None:
        lines.append(f"Fitted forms against thermo on stages {', '.join(map(str, f.stages))}: bubble temperature "
                     f"{f.max_bubble_temperature_error:.3g} K, vapour fraction {f.max_vapour_fraction_error:.3g}, "
                     f"enthalpy {f.max_enthalpy_error / 1e3:.3g} kJ/mol"
                     + ("" if f.within_tolerance else " (OUTSIDE TOLERANCE, see warnings)"))
    return lines
