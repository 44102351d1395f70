"""Plot data of the design: stage profiles, the x-y diagram, TAC against reflux, stages against duty.

Each builder takes typed results and returns a :class:`Plot` in display units; the PNG
figures and the workbook's charts both draw these, so a number read off a figure is the
number in the workbook and in result.json.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

from .._base.units import to_degC
from ..optimisation.results import DesignEvaluation, OptimumDesign
from ..properties import BinaryDiagram, MixtureSummary
from ..stages.binary import EquilibriumCurve, SteppedColumn
from ..stages.results import StageProfile
from .tables import KPA, KW, PALETTE, Note, Plot, SecondAxis, Series, nice_limits, size_text

# Colours of our own for the x-y diagram's parts (hex RGB).
EQUILIBRIUM, CONSTRUCTION, DESIGN, GUIDE, PRODUCT, AZEOTROPE = (
    "1F5A7A", "9A9A9A", "D9822B", "5C5C5C", "3E8E41", "B23A48")


def round_up(value: float) -> float:
    """``value`` rounded up to a quarter of its power of ten, for the top of an axis from zero.

    >>> round_up(1.1e6), round_up(38.5)
    (1250000.0, 40.0)
    """
    if value <= 0.0:
        return 1.0
    quarter = 10.0 ** math.floor(math.log10(value)) / 4.0
    return math.ceil(value / quarter) * quarter


def padded_limits(values, pad: float = 0.04) -> tuple[float, float]:
    """Axis limits a little beyond ``values``, on steps of a tenth of their span's power of ten.

    >>> padded_limits([1.59, 3.18])
    (1.5, 3.3)
    """
    low, high = min(values), max(values)
    span = high - low if high > low else max(abs(high), 1.0)
    step = 10.0 ** math.floor(math.log10(span)) / 10.0
    digits = max(0, -math.floor(math.log10(step)))
    return (round(math.floor((low - pad * span) / step) * step, digits),
            round(math.ceil((high + pad * span) / step) * step, digits))


def _feed_stage_line(profile: StageProfile, low: float, high: float) -> Series:
    return Series(f"Feed stage {profile.feed_stage}", (low, high), (float(profile.feed_stage),) * 2, "guide", GUIDE)


def temperature_profile_plot(profile: StageProfile) -> Plot:
    """Stage temperature against stage number (stage 1 at the top), the feed stage marked."""
    stages = tuple(float(n) for n in range(1, profile.stages + 1))
    temperatures = tuple(to_degC(t) for t in profile.T)
    limits = nice_limits(temperatures)
    return Plot("temperature_profile", f"Stage temperatures ({profile.stages} stages, feed on {profile.feed_stage})",
                "Temperature [degC]", "Stage from the top [-]",
                (Series("Temperature", temperatures, stages), _feed_stage_line(profile, *limits)),
                x_limits=limits, stage_axis=True)


def composition_profile_plot(profile: StageProfile, names: tuple[str, ...]) -> Plot:
    """Liquid mole fraction of each component against stage number, the feed stage marked."""
    stages = tuple(float(n) for n in range(1, profile.stages + 1))
    series = tuple(Series(f"x {name}", tuple(row[i] for row in profile.x), stages)
                   for i, name in enumerate(names))
    return Plot("composition_profile", "Liquid composition on the stages", "Liquid mole fraction [-]",
                "Stage from the top [-]", series + (_feed_stage_line(profile, 0.0, 1.0),), x_limits=(0.0, 1.0),
                stage_axis=True)


def operating_series(column: SteppedColumn) -> tuple[Series, ...]:
    """Operating lines, feed line and stage steps of a McCabe-Thiele construction.

    The rectifying line runs from (x_D, x_D) to its meeting point with the feed line,
    y = (R x + x_D)/(R + 1) and x = ((q - 1) x_D + (R + 1) z_F)/(q + R); the stripping line
    from there to (x_B, x_B); the feed line from (z_F, z_F). At total reflux only the steps.
    """
    steps = Series(f"Constant-molar-overflow steps ({column.stages:.1f})", tuple(p[0] for p in column.steps),
                   tuple(p[1] for p in column.steps), "line", CONSTRUCTION)
    R, x_d, x_b, z, q = column.reflux_ratio, column.x_distillate, column.x_bottoms, column.z, column.q
    if not math.isfinite(R):
        return (steps,)
    x_int = min(max(((q - 1.0) * x_d + (R + 1.0) * z) / (q + R), x_b), x_d)
    y_int = (R * x_int + x_d) / (R + 1.0)
    return (Series("Rectifying line", (x_d, x_int), (x_d, y_int), "line", CONSTRUCTION),
            Series("Stripping line", (x_int, x_b), (y_int, x_b), "line", CONSTRUCTION),
            Series("Feed line", (z, x_int), (z, y_int), "dashed", PALETTE[4]),
            steps)


def design_staircase(profile: StageProfile, light: int) -> Series:
    """The design's own stages on the x-y diagram: from the top vapour down, across to each stage's
    liquid and down to the vapour rising from the stage below, ending at the bottoms on the diagonal.

    Corners (y_1, y_1), (x_1, y_1), (x_1, y_2), (x_2, y_2), ..., (x_N, y_N), (x_N, x_N); the stage
    points (x_n, y_n) are the rigorous profile's light-key fractions, not points read off a curve.
    """
    x = [row[light] for row in profile.x]
    y = [row[light] for row in profile.y]
    corners = [(y[0], y[0])]
    for n in range(profile.stages):
        if n:
            corners.append((x[n - 1], y[n]))
        corners.append((x[n], y[n]))
    corners.append((x[-1], x[-1]))
    return Series(f"Design stages, rigorous profile ({profile.stages})", tuple(c[0] for c in corners),
                  tuple(c[1] for c in corners), "line_markers", DESIGN)


def _light_fraction(a, light_name: str) -> float | None:
    if a.first == light_name:
        return a.x_first
    if a.second == light_name:
        return 1.0 - a.x_first
    return None


def xy_plot(curve: EquilibriumCurve | BinaryDiagram, mixture: MixtureSummary, column: SteppedColumn | None = None,
            profile: StageProfile | None = None) -> Plot:
    """x-y diagram of the light key: equilibrium curve, diagonal, the constant-molar-overflow
    construction (``column``), the design's own stages (``profile``), products, feed and azeotropes."""
    light_name = mixture.light_key
    series = (Series("Equilibrium", tuple(curve.x), tuple(curve.y), "line", EQUILIBRIUM),
              Series("y = x", (0.0, 1.0), (0.0, 1.0), "guide", GUIDE))
    if column is not None:
        series += operating_series(column)
    title = f"x-y diagram of {light_name} at {curve.pressure / KPA:.1f} kPa"
    if profile is not None:
        light = [c.name for c in mixture.components].index(light_name)
        series += (design_staircase(profile, light),)
        x_d, x_b = profile.distillate_composition[light], profile.bottoms_composition[light]
        series += (Series("Distillate and bottoms", (x_d, x_b), (x_d, x_b), "highlight", PRODUCT),)
        title += f": R = {profile.reflux_ratio:.3f}, N = {profile.stages}, feed on {profile.feed_stage}"
    if column is not None:
        series += (Series("Feed", (column.z,), (column.z,), "markers", PALETTE[4]),)
    for a in mixture.azeotropes:
        x = _light_fraction(a, light_name)
        if x is not None and {a.first, a.second} == {light_name, mixture.heavy_key}:
            series += (Series(f"Azeotrope ({a.kind})", (x,), (x,), "highlight", AZEOTROPE),)
    return Plot("xy_diagram", title, f"Liquid mole fraction {light_name} [-]",
                f"Vapour mole fraction {light_name} [-]", series, (0.0, 1.0), (0.0, 1.0))


def _reference_minimum(optimum: OptimumDesign, energy_balance_minimum: float | None) -> tuple[float, str]:
    """The minimum reflux the R/R_min scale refers to: the energy-balance one where it was found."""
    if energy_balance_minimum:
        return energy_balance_minimum, "energy balances"
    return optimum.minimum_reflux_ratio, optimum.minimum_by("reflux")


def tac_curve_plot(curves: Sequence[tuple[str, Sequence[DesignEvaluation]]], optimum: OptimumDesign,
                   energy_balance_minimum: float | None = None) -> Plot:
    """TAC against reflux ratio of every scenario, each optimum marked and each point's stage count
    written beside it; annualised capital and utilities of the first scenario; both minimum reflux
    ratios; R/R_min along the top."""
    curves = [(name, sorted(designs, key=lambda d: d.reflux_ratio)) for name, designs in curves if designs]
    currency = curves[0][1][0].cost.currency
    several = len(curves) > 1
    series: list[Series] = []
    notes: list[Note] = []
    first_name, first = curves[0]
    R = tuple(d.reflux_ratio for d in first)
    suffix = f", {first_name}" if several else ""
    series += [Series(f"Annualised capital{suffix}", R, tuple(d.cost.annualised_capital_per_year for d in first),
                      "dashed", PALETTE[6]),
               Series(f"Utilities{suffix}", R, tuple(d.cost.utilities_per_year for d in first), "dashed", PALETTE[5])]
    for k, (name, designs) in enumerate(curves):
        colour = PALETTE[(0, 1, 2, 3, 4, 7)[k % 6]]
        x = tuple(d.reflux_ratio for d in designs)
        y = tuple(d.cost.tac_per_year for d in designs)
        series.append(Series(f"TAC, {name}" if several else "Total annualised cost", x, y, "line_markers", colour))
        lowest = min(designs, key=lambda d: d.cost.tac_per_year)
        series.append(Series(f"Lowest TAC, {name}: R = {lowest.reflux_ratio:.3f}, N = {lowest.stages}"
                             if several else f"Lowest TAC: R = {lowest.reflux_ratio:.3f}, N = {lowest.stages}",
                             (lowest.reflux_ratio,), (lowest.cost.tac_per_year,), "highlight", colour))
        notes += [Note(d.reflux_ratio, d.cost.tac_per_year, str(d.stages), colour) for d in designs]
    reported = optimum.best  # held by a bound (the control margin) away from the curve's lowest point
    if abs(reported.reflux_ratio / min(first, key=lambda d: d.cost.tac_per_year).reflux_ratio - 1.0) > 1e-3:
        series.append(Series(f"Reported design (held by a bound): R = {reported.reflux_ratio:.3f}, "
                             f"N = {reported.stages}", (reported.reflux_ratio,), (reported.cost.tac_per_year,),
                             "highlight", PALETTE[3]))
    limit = optimum.stage_limit  # most stages within the shell height limit, where it cut the search
    beyond = [d for d in first if limit is not None and d.stages > limit]
    if beyond:
        series.append(Series(f"Beyond the height limit (more than {limit} stages per shell)",
                             tuple(d.reflux_ratio for d in beyond), tuple(d.cost.tac_per_year for d in beyond),
                             "open_markers", GUIDE))
    y_limits = (0.0, round_up(max(v for s in series for v in s.y) * 1.12))
    within = [d.reflux_ratio for d in first if limit is not None and d.stages <= limit]
    if beyond and within:  # the least reflux a column within the limit reaches on this curve
        series.append(Series(f"Height limit: R from {min(within):.3f} at {limit} stages or fewer per shell",
                             (min(within), min(within)), y_limits, "guide", PALETTE[3]))
    minima = [(f"Minimum reflux, {optimum.minimum_by('reflux')}", optimum.minimum_reflux_ratio)]
    if energy_balance_minimum:
        minima.append(("Minimum reflux, energy balances", energy_balance_minimum))
    for (label, value), colour in zip(minima, (GUIDE, AZEOTROPE)):
        series.append(Series(f"{label} ({value:.3f})", (value, value), y_limits, "guide", colour))
    reference, basis = _reference_minimum(optimum, energy_balance_minimum)
    all_R = [v for s in series for v in s.x]
    return Plot("tac_vs_reflux", "Total annualised cost against reflux ratio" + (" by price scenario" if several
                else f" ({first_name})"), "Reflux ratio R [-]", f"Cost [{currency}/year]", tuple(series),
                x_limits=padded_limits(all_R), y_limits=y_limits, notes=tuple(notes),
                top_axis=SecondAxis(f"R / R_min, {basis} [-]", reference))


def duty_at_reflux(designs: Sequence[DesignEvaluation], reflux: float) -> float | None:
    """Reboiler duty [W] at ``reflux`` from a straight line through the designs' (R, duty) points.

    At fixed products the boil-up is (R + 1) D - (1 - q) F under constant molar overflow,
    linear in R; with energy balances it stays close to linear, so the line fitted by least
    squares over the curve's points is carried to the minimum reflux. None with fewer than
    two distinct reflux ratios.
    """
    points = [(d.reflux_ratio, d.sizes.reboiler_duty) for d in designs]
    if len({r for r, _ in points}) < 2:
        return None
    n = len(points)
    mean_r = sum(r for r, _ in points) / n
    mean_q = sum(q for _, q in points) / n
    slope = (sum((r - mean_r) * (q - mean_q) for r, q in points)
             / sum((r - mean_r) ** 2 for r, _ in points))
    return mean_q + slope * (reflux - mean_r)


def stages_duty_plot(curves: Sequence[tuple[str, Sequence[DesignEvaluation]]], optimum: OptimumDesign,
                     energy_balance_minimum: float | None = None) -> Plot:
    """Ideal stages against reboiler duty for every scenario's curve, the chosen design marked, and
    both asymptotes: the minimum stages (total reflux) and the duty at minimum reflux."""
    curves = [(name, designs) for name, designs in curves if designs]
    several = len(curves) > 1
    series: list[Series] = []
    for k, (name, designs) in enumerate(curves):
        ordered = sorted(designs, key=lambda d: d.stages)
        series.append(Series(f"Designs, {name}" if several else "Designs along the reflux ratio",
                             tuple(d.sizes.reboiler_duty / KW for d in ordered),
                             tuple(float(d.stages) for d in ordered), "markers" if k == 0 else "open_markers",
                             PALETTE[(0, 1, 2, 3, 4, 7)[k % 6]]))
    best = optimum.best
    series.append(Series(f"Chosen design: N = {best.stages}, {size_text(best.sizes.reboiler_duty / KW)} kW",
                         (best.sizes.reboiler_duty / KW,), (float(best.stages),), "highlight", AZEOTROPE))
    duties = [v for s in series for v in s.x]
    stages = [v for s in series for v in s.y] + [optimum.minimum_stages]
    reference, basis = _reference_minimum(optimum, energy_balance_minimum)
    q_min = duty_at_reflux(curves[0][1], reference)
    if q_min is not None and q_min > 0.0:
        duties.append(q_min / KW)
    x_limits = padded_limits(duties)
    y_limits = (0.0, round_up(max(stages) * 1.1))
    series.append(Series(f"Minimum stages, {optimum.minimum_by('stages')} ({optimum.minimum_stages:.1f})", x_limits,
                         (optimum.minimum_stages,) * 2, "guide", GUIDE))
    if q_min is not None and q_min > 0.0:
        series.append(Series(f"Duty at minimum reflux, {basis} ({size_text(q_min / KW)} kW)", (q_min / KW,) * 2,
                             y_limits, "guide", GUIDE))
    return Plot("stages_vs_duty", "Ideal stages against reboiler duty", "Reboiler duty [kW]",
                "Ideal stages, reboiler included [-]", tuple(series), x_limits=x_limits, y_limits=y_limits)
