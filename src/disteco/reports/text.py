"""Short plain-text reports for the terminal, with units on every number."""

from __future__ import annotations

from .._base.units import to_degC
from ..case import Products
from ..costing import CostSummary
from ..optimisation.layout import percent_apart
from ..properties import FeedState, MixtureSummary
from ..stages.results import StageProfile
from .cautions import CAUTIONS
from .choices import margin_text, sizing_text
from .check_result import CaseCheck
from .design_result import DesignResult
from .notes import console_warnings
from .tables import KMOL_PER_H, size_text, stages_counted
from .tables_design import GivenDesignReport
from .text_checks import checks_lines, fraction_text
from .text_scenarios import given_scenario_lines, scenario_lines

CONSOLE_TITLE_LENGTH = 100  # characters of the case title shown on the console
# relative departure of the stage profile's R/Rmin from its row's factor that the console points out
ROW_DEPARTURE = 0.25
Q_SATURATED = 5e-4  # distance of q from 1 or 0 still called a saturated feed (the printed q's last digit)
# What to do about a bound the optimum sits on (OptimumDesign.limits), by the option that sets it.
RAISE_ADVICE = {"max_stages": "raise --max-stages (option max_stages) to look further",
                "reflux_max": "the optimiser option reflux_max caps it; raise it to look further",
                "reflux_min": "the optimiser option reflux_min holds it; lower it to look further",
                "max_height": "raise [sizing] max_height, or let the column go to two shells",
                ("max_height", 2): "raise [sizing] max_height (two shells in series are the most disteco builds)"}


def limit_advice(limit, layout) -> str:
    """What to do about a bound the optimum sits on. A height limit on one shell where two shells in
    series were designed and cost more says so: advising two shells there contradicts the Layout line
    (an isopentane splitter of 76 stages was told to go to two shells that cost 0.1 % more)."""
    two = [] if layout is None or limit.option != "max_height" or limit.shells != 1 else [
        o for o in layout.options if o.shells == 2 and o.tac is not None]
    chosen = [] if not two else [o for o in layout.options if o.label == layout.chosen and o.tac is not None]
    if two and chosen and two[0].tac > chosen[0].tac:
        return (f"raise [sizing] max_height; two shells in series ({two[0].stages} stages) were designed too and "
                f"cost {percent_apart(two[0].tac, chosen[0].tac)} more a year")
    return RAISE_ADVICE.get((limit.option, limit.shells), RAISE_ADVICE[limit.option])


def console_title(title: str, limit: int = CONSOLE_TITLE_LENGTH) -> str:
    """The case title on one console line: whitespace runs folded to one space and the text
    shortened to ``limit`` characters with "..." (the files keep the whole title)."""
    line = " ".join(title.split())
    return line if len(line) <= limit else line[:limit - 3] + "..."


def _mass_fractions(case) -> tuple[float, ...] | None:
    """The feed's mass fractions as the case writes them, or None for mole fractions."""
    return case.feed.composition if case.feed.composition_basis == "mass" else None


def mass_specification_lines(case) -> list[str]:
    """The product fractions a case writes by mass, as the mole fractions used (two components only)."""
    p = case.products
    if p.written is None:
        return []
    light = case.components[p.light_key]
    parts = []
    if p.light_key_spec.kind == "fraction":
        parts.append(f"{light} in the bottoms {p.written[0].value:.4g} -> {fraction_text(p.light_key_spec.value, 4)}")
    if p.heavy_key_spec.kind == "fraction":
        parts.append(f"{light} in the distillate {1.0 - p.written[1].value:.4g} -> "
                     f"{fraction_text(1.0 - p.heavy_key_spec.value, 4)}")
    return [f"Product specifications written by mass, used as mole fractions: {'; '.join(parts)}"] if parts else []


def feed_condition(q: float, vapour_fraction: float | None = None) -> str:
    """The feed's thermal condition in words, from q, the liquid formed per mole of feed on the feed stage [-],
    and the feed's molar vapour fraction on entry where known [-] (not 1 - q on a wide-boiling feed)."""
    if q > 1.0 + Q_SATURATED:
        return "subcooled liquid"
    if q >= 1.0 - Q_SATURATED:
        return "saturated liquid"
    if q > Q_SATURATED:
        return "partly vaporised" + (f", vapour fraction {vapour_fraction:.3f}" if vapour_fraction is not None else "")
    return "saturated vapour" if q >= -Q_SATURATED else "superheated vapour"


def feed_line(feed: FeedState) -> str:
    """The feed's flow, temperature, pressure and q with its condition in words."""
    return (f"Feed: {feed.molar_flow * KMOL_PER_H:,.2f} kmol/h at {to_degC(feed.temperature):.2f} degC and "
            f"{feed.pressure / 1e3:.2f} kPa, q {feed.q:.3f} [-] ({feed_condition(feed.q, feed.vapour_fraction)})")


def mixture_text(summary: MixtureSummary, mass_fractions: tuple[float, ...] | None = None,
                 feed: FeedState | None = None) -> str:
    """The mixture report printed by the check command; ``mass_fractions``: the feed's as written, where the
    case gives them (shown beside the mole fractions computed from them); ``feed``: its state, in a line."""
    lines = [f"Thermodynamic method: {summary.method}"]
    if summary.untuned_polar_pairs:
        lines.append(f"Interaction parameters: none given for {', '.join(summary.untuned_polar_pairs)} (kij = 0, "
                     "with a polar component, or carbon dioxide or nitrogen beside a hydrocarbon: give "
                     "[mixture.peng_robinson] kij fitted to data)")
    if summary.acids_without_dimerisation:
        acids = summary.acids_without_dimerisation
        lines.append(f"Vapour association: {', '.join(acids)} {'dimerises' if len(acids) == 1 else 'dimerise'} in "
                     "the vapour, left out by the ideal-gas vapour and not measured (no constants): the relative "
                     "volatilities are uncertain")
    lines += [
             f"Top pressure: {summary.pressure / 1e3:.2f} kPa",
             "",
             f"{'component':<22}{'CAS':>12}{'M [g/mol]':>11}{'Tb [degC]':>11}{'z feed [-]':>12}"
             + (f"{'w feed [-]':>12}" if mass_fractions else "")]
    for k, c in enumerate(summary.components):
        lines.append(f"{c.name:<22}{c.cas:>12}{c.molar_mass * 1e3:>11.2f}"
                     f"{to_degC(c.normal_boiling_point):>11.2f}{c.feed_fraction:>12.4f}"
                     + (f"{mass_fractions[k]:>12.4f}" if mass_fractions else ""))
    if mass_fractions:
        lines.append("Feed written as mass fractions w; z, the mole fractions used, from them and the molar masses")
    lines += ["", *([feed_line(feed)] if feed is not None else []),
              f"Feed bubble / dew point at top pressure: {to_degC(summary.feed_bubble_T):.2f} / "
              f"{to_degC(summary.feed_dew_T):.2f} degC",
              f"Relative volatility {summary.light_key}/{summary.heavy_key}: "
              f"{summary.key_volatility_min:.3f} to {summary.key_volatility_max:.3f} [-]"]
    vapour = summary.vapour
    if vapour is not None:
        real = ("not evaluated" if vapour.alpha_real_vapour is None else
                f"{vapour.alpha_real_vapour:.4f} [-] with a real vapour (the ideal gas's "
                f"{100.0 * vapour.deviation:+.1f} %)")
        lines.append(f"Vapour taken as an ideal gas: key relative volatility at the feed's bubble point "
                     f"{vapour.alpha_ideal_gas:.4f} [-]; {real}")
    association = summary.association
    if association is not None:
        lines.append(f"With {association.acid}'s dimerisation in the vapour (left out of the design): "
                     f"{association.alpha_min:.3f} to {association.alpha_max:.3f} [-]")
    if summary.azeotropes:
        for a in summary.azeotropes:
            artefact = ("" if not a.vapour_artefact else
                        f" (with {a.dimerising}'s dimerisation in the vapour the pair's relative volatility "
                        f"there is {a.alpha_dimerised:.3f} [-]: likely an azeotrope of the ideal-gas vapour only)")
            lines.append(f"Azeotrope ({a.kind}): {a.x_first:.4f} mole fraction {a.first} in {a.second} "
                         f"at {to_degC(a.T):.2f} degC{artefact}")
    else:
        lines.append("Azeotropes: none found between any pair at top pressure" + (
            f" (with kij = 0 for {', '.join(summary.untuned_polar_pairs)}: an azeotrope of those pairs can be "
            "missed)" if summary.untuned_polar_pairs else ""))
    return "\n".join(lines)


def _against_minimum(stages) -> str:
    """The profile's reflux over the minimum where meeting the specifications moved it well off its row
    (on acetone-water at 1.2 bar the column's own pressure drop needed 2.9 x the top pressure's minimum)."""
    ratio = stages.profile.reflux_ratio / stages.minimum_reflux if stages.minimum_reflux > 0.0 else None
    if not stages.meets_specs or ratio is None or abs(ratio / stages.reflux_factor - 1.0) <= ROW_DEPARTURE:
        return ""
    return (f" ({ratio:.2f} x the minimum: what thermo's column, with energy balances and its pressure "
            f"profile, needs for both specifications on these stages)")


def check_text(found: CaseCheck) -> str:
    """What `check` found: the mixture report, the minima, and what a design run will use."""
    stages = found.stages
    lines = [f"Case: {console_title(found.case.title)}",
             mixture_text(found.mixture, _mass_fractions(found.case), found.feed), "",
             *mass_specification_lines(found.case),
             f"Minimum reflux ratio: {stages.minimum_reflux:.3f} [-]   minimum stages: {stages.minimum_stages:.2f} [-] "
             f"({stages.basis})",
             f"Stage profile{' meeting both specifications' if stages.meets_specs else ''}: {stages.profile.stages} "
             f"stages (the {stages.reflux_factor:g} x minimum-reflux row), feed on stage {stages.profile.feed_stage}, "
             f"reflux ratio {stages.profile.reflux_ratio:.3f} [-]{_against_minimum(stages)}",
             f"Scenarios: {', '.join(found.scenarios)}; cost year {found.cost_year}, {found.currency}"]
    if found.given is None:
        lines.append(f"Stage bound of the search: {found.stage_bound} stages (minimum stages on the fitted forms "
                     f"{found.fitted_minimum_stages:.2f}, {found.fitted_minima_method})")
    else:
        reflux, n, feed_stage = found.given
        lines.append(f"Given design: reflux ratio {reflux:.4g} [-], {n} stages, feed on stage {feed_stage}: above the "
                     f"minima on the fitted forms ({found.fitted_minimum_reflux:.4g}, "
                     f"{found.fitted_minimum_stages:.2f} stages, {found.fitted_minima_method})")
    if found.utilities:
        which = "the search's first column" if found.given is None else "the given design"
        lines.append(f"Utilities of {which} ({found.reference_stages} stages, constant molar overflow on the fitted "
                     "forms): " + "; ".join(f"{e.name} {e.process_in - 273.15:.1f} -> {e.process_out - 273.15:.1f} "
                                            f"degC on {e.utility.name}" for e in found.utilities))
        lines.extend(f"Note: {note}" for note in found.utility_notes)
    lines.append("Case file is valid. design with these options will not refuse it before optimising.")
    return "\n".join(lines)


def products_lines(products: Products, feed: FeedState, profile: StageProfile, names: tuple[str, ...]) -> list[str]:
    """The product compositions a priced design reaches, each against its specification."""
    light, heavy = products.light_key, products.heavy_key
    x_d, x_b = profile.distillate_composition, profile.bottoms_composition
    reached = []
    light_mass = heavy_mass = ""
    if products.written:  # by mass as written; a binary's distillate line gives the light key's fraction
        light_mass = f"; {products.written[0].value:.4g} by mass as written"
        written = products.written[1].value
        heavy_mass = f"; {1.0 - written if len(names) == 2 else written:.4g} by mass as written"
    if products.light_key_spec.kind == "recovery":
        recovery = profile.distillate_flow * x_d[light] / (feed.molar_flow * feed.z[light])
        reached.append(f"{names[light]} recovery to the distillate {fraction_text(recovery, 4)} (specification at least "
                       f"{products.light_key_spec.value:.4g})")
    else:
        reached.append(f"{names[light]} in the bottoms {fraction_text(x_b[light], 4)} (specification at most "
                       f"{products.light_key_spec.value:.4g}{light_mass})")
    if products.heavy_key_spec.kind == "recovery":
        recovery = profile.bottoms_flow * x_b[heavy] / (feed.molar_flow * feed.z[heavy])
        reached.append(f"{names[heavy]} recovery to the bottoms {fraction_text(recovery, 4)} (specification at least "
                       f"{products.heavy_key_spec.value:.4g})")
    elif len(names) == 2:  # a binary's distillate is specified by its light-key fraction
        reached.append(f"{names[light]} in the distillate {fraction_text(x_d[light], 4)} (specification at least "
                       f"{1.0 - products.heavy_key_spec.value:.4g}{heavy_mass})")
    else:
        reached.append(f"{names[heavy]} in the distillate {fraction_text(x_d[heavy], 4)} (specification at most "
                       f"{products.heavy_key_spec.value:.4g}{heavy_mass})")
    return [f"Held: reflux ratio {profile.reflux_ratio:.4g} [-], {profile.stages} stages, feed on stage "
            f"{profile.feed_stage}; the distillate flow ({profile.distillate_flow * KMOL_PER_H:,.2f} kmol/h) is "
            "chosen to meet both specifications at least cost",
            "Products reached (mole fractions): " + "; ".join(reached)]


TRACE_FRACTION = 1e-3  # components below it in a product are counted, not listed (the keys always are)


def _stream_words(flow: float, composition, names: tuple[str, ...], keys: tuple[int, int]) -> str:
    # a key below the threshold is what a ppm specification is about: listed, in its own digits
    listed = [f"{n} {fraction_text(x, 4)}" for i, (n, x) in enumerate(zip(names, composition))
              if x >= TRACE_FRACTION or i in keys]
    traces = len(names) - len(listed)
    more = f", {traces} more below {TRACE_FRACTION:g}" if traces else ""
    return f"{flow * KMOL_PER_H:,.2f} kmol/h ({', '.join(listed)}{more})"


def product_streams_lines(profile: StageProfile, feed: FeedState, names: tuple[str, ...],
                          keys: tuple[int, int]) -> list[str]:
    """Both products of a multicomponent design, and where each component that distributes goes.

    A binary's products are told by its key fractions; with more components an engineer reads
    here where the non-keys went (a component boiling between the keys splits by the column).
    """
    if len(names) <= 2:
        return []
    distillate = _stream_words(profile.distillate_flow, profile.distillate_composition, names, keys)
    bottoms = _stream_words(profile.bottoms_flow, profile.bottoms_composition, names, keys)
    lines = [f"Products (mole fractions): distillate {distillate}; bottoms {bottoms}"]
    splits = []
    for i, name in enumerate(names):
        fed = feed.molar_flow * feed.z[i]
        if i in keys or fed <= 0.0:
            continue
        split = profile.distillate_flow * profile.distillate_composition[i] / fed
        if 0.01 <= split <= 0.99:
            splits.append(f"{name} {split:.3f}")
    if splits:
        lines.append("Non-key components that distribute, fraction of the feed to the distillate: "
                     f"{', '.join(splits)} [-]")
    return lines


def given_lines(given: GivenDesignReport, cost: CostSummary | None) -> list[str]:
    """The given design's TAC against the optimum's under the same prices."""
    if given.optimum is None:
        return ["Not compared with the optimum (--no-compare)"]
    extra = given.extra_tac(cost.tac_per_year) if cost is not None else None
    best = given.optimum.best
    line = (f"Optimum under the same prices: reflux ratio {best.reflux_ratio:.3f} [-], {best.stages} stages, "
            f"feed on stage {best.feed_stage}")
    if extra is not None:
        optimum_tac = cost.tac_per_year - extra
        line += (f", TAC {optimum_tac:,.0f} per year; the given design costs {extra:+,.0f} {cost.currency} per year "
                 f"({100 * extra / optimum_tac:+.1f} %)")
    return [line]


def result_text(result: DesignResult) -> str:
    """A design run as the command line prints it: case, mixture, design, warnings."""
    lines = [f"Case: {console_title(result.case.title)}", mixture_text(result.mixture, _mass_fractions(result.case),
                                                                  result.feed),
             "", *mass_specification_lines(result.case), design_text(result)]
    shown, more = console_warnings(result.warnings)
    lines += [f"Warning: {w}" for w in shown]
    if more:
        lines.append(f"and {more} more note{'s' if more != 1 else ''} in result.json and the workbook's Warnings sheet "
                     "(cost data, correlation ranges, reflux advice a bound explains)")
    return "\n".join(lines)


def cautions_text() -> str:
    return "\n".join(f"Caution: {c}" for c in CAUTIONS)


def _shells_words(sizing) -> str:
    """Shells and their tangent lengths (height-to-diameter in brackets), and what set the diameter."""
    split = sizing.split
    heights = [sizing.height] if split is None else [split.upper_height, sizing.height]
    words = " and ".join(f"{h.tangent_length:.1f} m (H/D {h.tangent_length / sizing.diameter:.0f})" for h in heights)
    shells = "one shell" if split is None else f"two shells in series (split after stage {split.split_stage})"
    basis = "" if sizing.diameter_basis == "flooding" else ", diameter set by the height-to-diameter limit"
    return f"{shells}, {words} tangent to tangent{basis}"


def layout_lines(layout, currency: str) -> list[str]:
    """The shell layout chosen, why, and what the limits cost."""
    lines = [f"Layout: {layout.why}"] + ([f"Sections: {layout.sections}"] if layout.sections else [])
    limits = f"limits {layout.max_height:g} m per shell, height-to-diameter {layout.max_height_to_diameter:g}"
    if layout.binding:
        cost = layout.limit_cost
        if cost is None:
            extra = ""
        elif round(cost) <= 0:  # the limit's size rounds to the standard size flooding asks, say
            extra = "; at no cost: the same designs priced as one shell without limits cost no less"
        else:
            extra = f"; {cost:,.0f} {currency} per year above the same designs priced as one shell without limits"
        lines.append(f"Binding: {', '.join(layout.binding)} ({limits}, common practice, no source){extra}")
    else:
        lines.append(f"No shell limit binds ({limits}, common practice, no source)")
    return lines


def design_text(result: DesignResult) -> str:
    """The chosen (or priced) design in a few lines, units on every number."""
    lines = []
    stages = result.stages
    if stages is not None:
        lines.append(f"Minimum reflux ratio: {stages.minimum_reflux:.3f} [-]   "
                     f"minimum stages: {stages.minimum_stages:.2f} [-] ({stages.basis})")
    parts = result.parts
    profile = parts.profile
    if profile is None:
        return "\n".join(lines)
    heading = "Given design (priced)" if result.evaluation is not None else "Lowest-TAC design"
    limits = parts.optimum.limits if parts.optimum is not None else ()
    if parts.margin is not None and parts.margin.binds:
        heading = ("Lowest-TAC design holding the control margin" if parts.margin.holds(profile.reflux_ratio)
                   else "Lowest-TAC design, corrected on thermo below the control margin")
    if limits:
        heading = "Lowest-TAC design within the bounds"
    if parts.optimum is not None and parts.optimum.solver.neighbours_unsolved:
        heading = "Best design found (search incomplete, see the warnings)"
    factor = f" ({profile.reflux_ratio / stages.minimum_reflux:.2f} x the constant-molar-overflow minimum)" if stages else ""
    lines += [f"{heading}: reflux ratio {profile.reflux_ratio:.3f} [-]{factor}, {profile.stages} stages "
              f"({stages_counted(profile)}), feed on stage {profile.feed_stage} from the top",
              *(f"Limited by {limit.text}: {limit_advice(limit, parts.optimum.layout)}" for limit in limits),
              f"Condenser duty {size_text(profile.condenser_duty / 1e3)} kW, "
              f"reboiler duty {size_text(profile.reboiler_duty / 1e3)} kW"]
    margin = margin_text(parts.margin, parts.cost.currency if parts.cost else "",
                         parts.cost.tac_per_year if parts.cost else None)
    lines += [margin] if margin else []
    if result.case is not None and result.feed is not None:  # a bare optimum's text has neither
        products = result.case.products
        lines += product_streams_lines(profile, result.feed, result.case.components,
                                       (products.light_key, products.heavy_key))
    if parts.given is not None:
        lines += products_lines(result.case.products, result.feed, profile, result.case.components)
    lines += checks_lines(parts.checks, profile.reflux_ratio, stages.minimum_reflux if stages else None)
    chosen = sizing_text(result.case)
    lines += [chosen] if chosen else []
    if parts.sizing is not None:
        s = parts.sizing
        lines.append(f"Column: {s.diameter:.2f} m diameter, {s.real_trays} real trays "
                     f"(efficiency {s.efficiency.value:.2f}) at {s.height.tray_spacing:.2f} m spacing, "
                     f"{_shells_words(s)}; "
                     f"condenser {size_text(s.condenser.area)} m2 on {s.condenser.utility.name}, "
                     f"reboiler {size_text(s.reboiler.area)} m2 on {s.reboiler.utility.name}")
    if parts.cost is not None:
        c = parts.cost
        lines.append(f"Cost ({c.currency} {c.cost_year}, scenario '{c.scenario}'): installed capital "
                     f"{c.capital_installed:,.0f}, utilities {c.utilities_per_year:,.0f} per year, "
                     f"TAC {c.tac_per_year:,.0f} per year")
    if parts.given is not None:
        lines += given_lines(parts.given, parts.cost)
    optimum = parts.optimum
    if optimum is not None and optimum.layout is not None:
        lines += layout_lines(optimum.layout, parts.cost.currency if parts.cost is not None else "")
        if parts.checks is not None and parts.checks.verification.corrected is not None:
            lines.append("  (layouts and sections compared at the optimiser's design; the cost above is the "
                         "design corrected on thermo)")
    if optimum is not None:
        gap = f", gap {optimum.solver.gap:.2%}" if optimum.solver.gap is not None else ""
        failed = f" ({len(optimum.solver.unsolved)} did not solve)" if optimum.solver.unsolved else ""
        rounds = f"{optimum.rounds} round{'s' if optimum.rounds != 1 else ''}"
        lines.append(f"Optimiser: {optimum.solver.status}{gap}, {optimum.solver.configurations_solved} "
                     f"configurations tried{failed} in {optimum.solver.wall_time:.1f} s, "
                     + (f"{rounds}, the last stopped by its time limit before the model's constants settled"
                        if optimum.solver.status.startswith("time limit") else
                        f"{rounds} until the model's constants settled" if optimum.settled
                        else f"{rounds} without the model's constants settling (see the warnings)"))
    lines += scenario_lines(parts) + (given_scenario_lines(parts.given) if parts.given is not None else [])
    return "\n".join(lines)

