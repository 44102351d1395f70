"""Console lines of the thermo checks: verification, both minimum reflux ratios, fitted-form errors."""

from __future__ import annotations

from typing import TYPE_CHECKING

from .tables import fraction_decimals, size_text

if TYPE_CHECKING:  # an annotation only; importing it would pull in the solver interfaces
    from ..optimisation.thermo_checks import ThermoChecks


def fraction_text(value: float, decimals: int = 5) -> str:
    """A mole fraction or recovery [-] with the digits that tell it apart from 0 or 1 (:func:`fraction_decimals`):
    a 1 ppm bottoms read "0.00000" and a recovery of 0.999998 "1.0000".

    Closer to 1 than nine decimals tell, the distance from 1 is written (an over-staged column's
    recoveries read "1.000000000").

    >>> fraction_text(0.98512), fraction_text(1e-06), fraction_text(0.999998, 4), fraction_text(0.0)
    ('0.98512', '1e-06', '0.9999980', '0')
    >>> fraction_text(1.0 - 2.3e-12)
    '1 - 2.3e-12'
    """
    if value <= 0.0 or value >= 1.0:
        return f"{value:g}"
    if 1.0 - value < 5e-10:
        return f"1 - {1.0 - value:.2g}"
    places = fraction_decimals(value, decimals)
    return f"{value:.3g}" if places is None else f"{value:.{places}f}"


def checks_lines(checks: ThermoChecks | None, reflux_ratio: float, cmo_minimum: float | None) -> list[str]:
    """A few lines with units; empty when the checks were not run."""
    if checks is None:
        return []
    v, k = checks.verification, checks.verification.keys
    state = "specifications met" if v.specifications_met else "SPECIFICATIONS MISSED by the model's design"
    lines = [f"Verified on thermo (energy balances, {v.profile.stages} stages): {state} (tolerance "
             f"{100 * v.tolerance:g} %); light key {fraction_text(k.distillate_light_key_fraction)} in the "
             f"distillate, {fraction_text(k.bottoms_light_key_fraction)} in the bottoms; recoveries "
             f"{fraction_text(k.light_key_recovery, 4)} / {fraction_text(k.heavy_key_recovery, 4)} [-]",
             f"  model against thermo: largest difference {v.max_temperature_difference:.3g} K, "
             f"{v.max_composition_difference:.3g} mole fraction; thermo duties condenser "
             f"{size_text(v.condenser_duty / 1e3)} kW, reboiler {size_text(v.reboiler_duty / 1e3)} kW "
             f"({v.wall_time:.1f} s)"]
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
