"""Shell layout around the search: tray spacing by TAC, and one shell, two shells or more stages.

The limits of one shell (``SizingOptions.max_height`` of tangent length and
``max_height_to_diameter``; defaults 50 m and 30, common practice, no source) are constraints
of the search: a configuration whose shells would be taller than the limit is outside the
search's stage range, and the height-to-diameter limit is a lower bound on the model's
diameter (the sizing layer applies the same least diameter). The tray spacing is chosen from
the candidates by the sequential TAC of the design at hand, re-chosen at every round's optimum
with the model's other constants. :func:`choose_layout` compares the optima of the layouts
that apply and says why it chose one.
"""

from __future__ import annotations

import math
from dataclasses import replace

from ..sizing.column import ColumnSizing
from ..sizing.options import SizingOptions
from ..sizing.trays import round_up
from ..stages.results import StageProfile
from .pricing import price_profile
from .results import LayoutChoice, LayoutOption, OptimumDesign, SpacingPrice

ONE_SHELL, TWO_SHELLS, MORE_STAGES = "one shell", "two shells", "more stages"
STAGE_BOUND_STEP = 1.5  # the search's stage bound is raised by this factor when the optimum sits on it
# A swaged shell is priced when the section diameters differ by more than this fraction of the
# larger (common practice, no source: below it the swage and its support ring are not worth it).
SWAGE_THRESHOLD = 0.20
# Two shells are also searched where the height-to-diameter limit widens one shell beyond what
# flooding asks by more than this fraction: two shorter shells may hold the stages at flooding's
# diameter. Measured: acetone-water at 1.05 bar, one shell 1.50 m where flooding asks 1.04 m (the
# limit costing 11 % of the TAC); the methanol-water example's 0.90 m against 0.81 m is not searched.
SLENDER_WIDENING = 0.20


def widened_by_slenderness(sizing: ColumnSizing) -> bool:
    """Whether the height-to-diameter limit sets the diameter more than :data:`SLENDER_WIDENING` above flooding's."""
    return sizing.diameter_basis == "height-to-diameter limit" and \
        sizing.diameter > (1.0 + SLENDER_WIDENING) * sizing.flooding_diameter


def spacing_prices(profile: StageProfile, mixture, data, sizing: SizingOptions, scenario: str | None,
                   cost_year: int | None) -> tuple[SpacingPrice, ...]:
    """The design ``profile`` priced at each candidate tray spacing (sizing and costing layers).

    A spacing at which a shell would be taller than ``sizing.max_height`` has no price (None).
    """
    prices = []
    for spacing in sizing.spacing_candidates:
        sized, cost = price_profile(profile, mixture, data, replace(sizing, tray_spacing=spacing), scenario,
                                    cost_year)
        tall = sized.tallest_shell.tangent_length
        prices.append(SpacingPrice(spacing, cost.tac_per_year if tall <= sizing.max_height else None, tall,
                                   sized.diameter))
    return tuple(prices)


SPACING_TOLERANCE = 1e-3  # relative TAC another spacing must save to replace the current one [-]
# relative TAC by which another scenario's design must beat a scenario's own optimum under its prices
# for that scenario to be searched again from it: the search's own tolerance (SPACING_TOLERANCE);
# closer designs are equally good at the model's resolution (a methanol column's reference optimum
# was beaten by 0.09 % by the 0.5 m spacing another scenario chose; searched again from it, the
# optimum gained 0.03 % for 25 % more run time)
SEARCH_AGAIN_TOLERANCE = SPACING_TOLERANCE


def best_spacing(prices: tuple[SpacingPrice, ...], current: float) -> float:
    """The cheapest priced spacing [m]; ``current`` when it is within :data:`SPACING_TOLERANCE` of the
    cheapest (near-equal spacings would otherwise swap from round to round and keep the rounds from
    settling: measured on the vacuum example, 0.50 and 0.60 m within 0.03 %). Where none fits the
    height limit, the spacing of the lowest shells, which hold the most stages (``current`` kept the
    default 0.61 m, which no candidate offers, and a propylene splitter's one shell was refused as
    holding 70 stages, where at 0.45 m it holds 94)."""
    priced = [p for p in prices if p.tac is not None]
    if not priced:
        return min(prices, key=lambda p: p.tallest_shell).spacing if prices else current
    cheapest = min(priced, key=lambda p: p.tac)
    here = next((p.tac for p in priced if p.spacing == current), None)
    if here is not None and here <= cheapest.tac * (1.0 + SPACING_TOLERANCE):
        return current
    return cheapest.spacing


def _slenderness(sizing: ColumnSizing) -> float:
    return sizing.tallest_shell.tangent_length / sizing.diameter


def layout_option(label: str, shells: int, optimum: OptimumDesign | None, failure: Exception | None = None
                  ) -> LayoutOption:
    """The record of one layout's optimum, or of why it has none."""
    if optimum is None:
        return LayoutOption(label, shells, None, note=str(failure) if failure is not None else "not needed")
    best, sized = optimum.best, optimum.sequential.sizing
    note = ""
    if optimum.stage_limit is not None and best.stages >= optimum.stage_limit:
        note = f"at the most stages ({optimum.stage_limit}) shells of at most the height limit hold"
    return LayoutOption(label, shells, optimum.sequential.cost.tac_per_year, best.stages, best.feed_stage,
                        best.reflux_ratio, sized.height.tray_spacing, sized.tallest_shell.tangent_length,
                        _slenderness(sized), note)


def unconstrained_tac(optima, mixture, data, sizing: SizingOptions, scenario, cost_year) -> float | None:
    """Lowest TAC of the layouts' optima priced as one shell without height or slenderness limits."""
    free = replace(sizing, shells=1, max_height=math.inf, max_height_to_diameter=math.inf)
    tacs = []
    for optimum in optima:
        if optimum is None:
            continue
        spacing = optimum.sequential.sizing.height.tray_spacing
        _, cost = price_profile(optimum.best.profile, mixture, data, replace(free, tray_spacing=spacing), scenario,
                                cost_year)
        tacs.append(cost.tac_per_year)
    return min(tacs) if tacs else None


def swaged_design(optimum: OptimumDesign, mixture, data, scenario, cost_year) -> tuple[OptimumDesign, str]:
    """``optimum`` with a swaged shell when its section diameters differ enough and that is cheaper; and why.

    The swaged price is the sizing and costing layers' (rectifying and stripping diameters, each
    section's shell volume and trays); the cone between the sections has no cost row and is not priced.
    """
    sized = optimum.sequential.sizing
    d_top, d_bottom = sized.rectifying_diameter, sized.stripping_diameter
    feed = optimum.best.feed_stage  # the threshold on the diameters flooding needs, before rounding
    need_top = max((t.diameter for t in sized.hydraulics if t.stage < feed), default=0.0)
    need_bottom = max((t.diameter for t in sized.hydraulics if t.stage >= feed), default=0.0)
    gap = abs(need_top - need_bottom) / max(need_top, need_bottom)
    step = optimum.sizing_options.diameter_increment
    slender = [name for name, need, d in (("rectifying", need_top, d_top), ("stripping", need_bottom, d_bottom))
               if d > round_up(need, step) + 1e-9]
    words = (f"at {sized.height.tray_spacing:.2f} m tray spacing flooding asks {need_top:.2f} m (rectifying) and "
             f"{need_bottom:.2f} m (stripping), {100 * gap:.0f} % apart; sections sized {d_top:.2f} and "
             f"{d_bottom:.2f} m" + (f" ({' and '.join(slender)} by the height-to-diameter limit)" if slender else ""))
    if sized.split is not None:
        return optimum, f"{words}: one diameter (a swaged shell is priced for one shell only)"
    if optimum.sizing_options.separate_sections:
        return optimum, f"{words}: separate sections as the case asks"
    if gap <= SWAGE_THRESHOLD:
        return optimum, f"{words}, within {100 * SWAGE_THRESHOLD:.0f} %: one diameter"
    options = replace(optimum.sizing_options, separate_sections=True)
    # the spacing is chosen again for the swaged shell: each section's diameter moves with it
    prices = spacing_prices(optimum.best.profile, mixture, data, options, scenario, cost_year)
    options = replace(options, tray_spacing=best_spacing(prices, options.tray_spacing))
    swaged, cost = price_profile(optimum.best.profile, mixture, data, options, scenario, cost_year)
    plain = optimum.sequential.cost.tac_per_year
    verdict = (f"swaged shell ({swaged.rectifying_diameter:.2f} and {swaged.stripping_diameter:.2f} m at "
               f"{options.tray_spacing:.2f} m tray spacing) TAC {cost.tac_per_year:,.0f} against {plain:,.0f} with "
               f"one diameter ({sized.diameter:.2f} m at {sized.height.tray_spacing:.2f} m)")
    if cost.tac_per_year >= plain:
        return optimum, f"{words}: {verdict}, one diameter kept"
    sequential = replace(optimum.sequential, sizing=swaged, cost=cost, model_check=None)
    return (replace(optimum, sequential=sequential, sizing_options=options, spacings=prices),
            f"{words}: {verdict}, swaged chosen")


def percent_apart(a: float, b: float) -> str:
    """How far ``a`` lies from ``b``, in percent of ``b`` with two significant digits ("0.012 %" where one
    decimal read "0.0 %": two shells "costing 0.0 % more")."""
    return f"{100.0 * abs(a / b - 1.0):.2g} %"


def choose_layout(options: list[LayoutOption], sizing: SizingOptions, chosen_sizing: ColumnSizing,
                  spacings: tuple[SpacingPrice, ...], unconstrained: float | None, sections: str = "") -> LayoutChoice:
    """The cheapest layout with a design, the limits that bind and the reasons in words."""
    priced = [o for o in options if o.tac is not None]
    chosen = min(priced, key=lambda o: o.tac)
    others = [o for o in options if o is not chosen]
    shells = "one shell of" if chosen.shells == 1 else f"{chosen.shells} shells of at most"
    reasons = [f"{chosen.label} chosen: {chosen.stages} stages, {shells} {chosen.tallest_shell:.1f} m "
               f"(height-to-diameter {chosen.height_to_diameter:.0f}), tray spacing {chosen.tray_spacing:.2f} m"]
    for other in others:
        if other.tac is None:
            reasons.append(f"{other.label}: {other.note}")
        else:
            reasons.append(f"{other.label} ({other.stages} stages) costs {percent_apart(other.tac, chosen.tac)} more")
    binding = []
    one = next((o for o in options if o.label == ONE_SHELL), None)
    if one is not None and (one.tac is None or one.note):
        binding.append("shell height")
    if chosen_sizing.diameter_basis == "height-to-diameter limit":
        binding.append("height-to-diameter")
    return LayoutChoice(chosen.label, "; ".join(reasons), sizing.max_height, sizing.max_height_to_diameter,
                        tuple(binding), tuple(options), spacings, unconstrained, sections)


__all__ = ["MORE_STAGES", "ONE_SHELL", "SLENDER_WIDENING", "SPACING_TOLERANCE", "STAGE_BOUND_STEP", "SWAGE_THRESHOLD",
           "TWO_SHELLS", "best_spacing", "choose_layout", "layout_option", "spacing_prices", "swaged_design",
           "unconstrained_tac", "widened_by_slenderness"]
