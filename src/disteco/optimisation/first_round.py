"""The search's first round of a shell layout, before any model solve: the reference design whose
pressure drop per stage agrees with its own trays, the cheapest tray spacing at it, and the height
limit's refusal of a layout whose shells cannot hold the column.

Kept apart from :mod:`.design` so that ``check`` refuses what the first round would refuse with the
same functions, without importing the modelling layer.
"""

from __future__ import annotations

import math
from dataclasses import replace

from .._base.errors import InfeasibleSpecError
from ..case import Case
from ..costing.data import CostData
from ..properties import FeedState, Mixture
from ..sizing.column import ColumnSizing
from ..sizing.options import SHELL_COUNTS, SizingOptions
from ..stages import ShortcutDesign
from ..stages.correlations import stages_from_gilliland
from .basis import SeparationProblem, TrayBasis
from .layout import best_spacing, spacing_prices
from .pricing import cost_basis_from_data, reference_profile, size_reference
from .problem import separation_problem
from .start import shortcut

ROUNDS = 4  # most optimisations with re-evaluated constants
DROP_TOLERANCE = 0.01  # relative change of the per-stage pressure drop that counts as settled [-]
# Wegstein's acceleration factor q kept within these bounds (common practice, no source): q < 0
# accelerates a slowly moving drop, 0 < q < 1 damps one that swings about its fixed point.
WEGSTEIN_BOUNDS = (-5.0, 0.9)
HEIGHT_ALLOWANCE = 0.25  # the check's first column against the search's first reference: efficiency, spacing
NO_MORE_SHELLS = ("two shells in series are the most disteco builds; raise [sizing] max_height, or ask for purities "
                  "that need fewer stages")


def stage_pressure_drop(case: Case, sizing: ColumnSizing) -> float:
    """Drop per equilibrium stage [Pa] of a sized design: per-tray drop (case or hydraulics) over its efficiency.

    With N - 1 equilibrium trays at efficiency E, the column has (N - 1)/E real trays, so
    the drop per real tray times (N - 1)/E spreads as drop/E over each equilibrium stage.
    """
    return case.column.stage_pressure_drop(sizing.efficiency.value, sizing.tray_pressure_drop)


def keyed(sizing: SizingOptions, problem: SeparationProblem) -> SizingOptions:
    return replace(sizing, light_key=problem.light_key, heavy_key=problem.heavy_key)


def settled_reference(case: Case, mixture: Mixture, feed: FeedState, data: CostData, sizing: SizingOptions,
                      config, configuration: tuple[int, int] | None = None, reflux: float | None = None):
    """Problem and reference profile whose pressure drop per stage agrees with the reference's trays.

    The per-stage drop is the per-tray drop over the efficiency, both from sizing the
    reference; repeated (at most :data:`ROUNDS` times) until it moves less than :data:`DROP_TOLERANCE`.
    """
    drop, trials = None, []
    for _ in range(ROUNDS):
        problem = separation_problem(case, mixture, feed, config.max_stages, drop)
        reference = reference_profile(problem, config, configuration, reflux)
        new = stage_pressure_drop(case, size_reference(mixture, data, reference, keyed(sizing, problem)))
        if close_enough(new, problem.stage_pressure_drop, DROP_TOLERANCE):
            break
        trials.append((problem.stage_pressure_drop, new))
        drop = next_drop(trials)
    return problem, reference


def next_drop(trials: list[tuple[float, float]]) -> float:
    """The pressure drop per stage [Pa] the next round assumes, from the rounds' (assumed, found) pairs.

    The drop found at a design depends on the drop assumed (through the relative volatility, the
    reflux, the diameter and the trays' hydraulics), and plain substitution can swing about the
    answer: a 1-octanol/1-decanol column at 5 kPa went 1144, 1335, 1207, 1324 Pa and ended five
    rounds unsettled. Wegstein's method (Wegstein, Commun. ACM 1 (6), 9 (1958)) takes the slope
    s of found against assumed over the last two rounds and assumes
    q x_assumed + (1 - q) x_found with q = s/(s - 1), q within :data:`WEGSTEIN_BOUNDS`; with
    one round only, the drop found.
    """
    assumed, found = trials[-1]
    if len(trials) < 2 or trials[-2][0] == assumed:
        return found
    slope = (found - trials[-2][1]) / (assumed - trials[-2][0])
    q = min(max(slope / (slope - 1.0), WEGSTEIN_BOUNDS[0]), WEGSTEIN_BOUNDS[1]) if slope != 1.0 else \
        WEGSTEIN_BOUNDS[0]
    return max(q * assumed + (1.0 - q) * found, 0.0)


def record_drop(trials: list, design: object, assumed: float, found: float) -> float:
    """Add a round's pressure drop per stage [Pa], ``assumed`` and ``found`` at ``design`` (its configuration),
    to ``trials`` and return the drop the next round assumes (:func:`next_drop`).

    Trials of another design are dropped first: Wegstein's slope is one design's response to the drop
    assumed, and between two configurations it measures the move instead (an acetone/methanol column's
    next drop 1261 Pa from a trial at other stages, against 1284 found; its four rounds ended unsettled).
    """
    if trials and trials[-1][0] != design:
        trials.clear()
    trials.append((design, assumed, found))
    return next_drop([(a, f) for _, a, f in trials])


def first_reference(case: Case, mixture: Mixture, feed: FeedState, data: CostData, config, sizing: SizingOptions,
                    scenario: str | None):
    """Problem, reference profile, sizing options (the cheapest tray spacing at the reference) and the
    spacings' prices a layout's search starts from without a warm start."""
    problem, reference = settled_reference(case, mixture, feed, data, sizing, config)
    return cheapest_spacing(case, mixture, feed, data, config, sizing, scenario, problem, reference)


def cheapest_spacing(case: Case, mixture: Mixture, feed: FeedState, data: CostData, config, sizing: SizingOptions,
                     scenario: str | None, problem: SeparationProblem, reference):
    """``sizing`` at the cheapest tray spacing for ``reference``, with the problem and reference settled again
    where the spacing changed (the trays' pressure drop moves with the diameter the spacing gives), and the
    spacings' prices at ``reference``."""
    spacings = spacing_prices(reference, mixture, data, keyed(sizing, problem), scenario, case.economics.cost_year)
    spacing = best_spacing(spacings, sizing.tray_spacing)
    if spacing != sizing.tray_spacing:
        sizing = replace(sizing, tray_spacing=spacing)
        problem, reference = settled_reference(case, mixture, feed, data, sizing, config)
    return problem, reference, sizing, spacings


def check_layouts_hold(case: Case, mixture: Mixture, feed: FeedState, data: CostData, config,
                       sizing: SizingOptions, scenario: str | None, problem: SeparationProblem,
                       near: TrayBasis) -> None:
    """Refuse, with the words :func:`optimise_design` would use before its first search, a column
    that neither one shell nor two in series within the height limit can hold
    (:func:`check_height_limit` on the same first references). ``near``: the trays of a nearby
    reference (the check's first column); where two shells :data:`HEIGHT_ALLOWANCE` shorter than
    the limit would hold the column on them, the first references are not built (they cost `check`
    about 0.7 s on the benzene example)."""
    shorter = replace(sizing, shells=2, max_height=(1.0 - HEIGHT_ALLOWANCE) * sizing.max_height)
    trays = replace(near, shells=2)
    limit = trays.stage_limit(shorter.max_height, config.max_stages)
    try:
        if limit >= config.max_stages:
            return
        check_height_limit(problem, trays, shorter, limit, config.reflux_max)
        return
    except HeightLimitError:
        pass
    failures = [_layout_refusal(case, mixture, feed, data, config, replace(sizing, shells=n), scenario) for n in (1, 2)]
    if all(failures):
        raise HeightLimitError(f"{'; '.join(map(str, failures))}: {NO_MORE_SHELLS}")


def _layout_refusal(case: Case, mixture: Mixture, feed: FeedState, data: CostData, config, sizing: SizingOptions,
                    scenario: str | None) -> HeightLimitError | None:
    """The refusal the first round of ``sizing``'s layout gives before searching (None: it searches)."""
    problem, reference, sizing, _ = first_reference(case, mixture, feed, data, config, sizing, scenario)
    basis, _ = cost_basis_from_data(data, mixture, reference, keyed(sizing, problem), scenario,
                                    case.economics.cost_year)
    limit = basis.trays.stage_limit(sizing.max_height, config.max_stages)
    if limit < config.max_stages:
        try:
            check_height_limit(problem, basis.trays, sizing, limit, config.reflux_max)
        except HeightLimitError as failure:
            return failure
    return None


def close_enough(new: float, old: float, tolerance: float) -> bool:
    return abs(new - old) <= tolerance * abs(old)


class HeightLimitError(InfeasibleSpecError):
    """No design of a shell layout: its shells within the height limit hold too few stages."""


def check_height_limit(problem: SeparationProblem, trays: TrayBasis, sizing: SizingOptions, limit: int,
                        reflux_max: float) -> None:
    """Refuse, in engineering words, a layout whose shells cannot hold Fenske's minimum stages, or
    fewer stages than Gilliland's correlation asks at the highest reflux ratio searched.

    The second saves the search the configurations just above Fenske's minimum, each of which
    runs the solver to its iteration limit (a propylene/propane splitter in one 50 m shell:
    68 stages held, Fenske 66, Gilliland at R = 50 about 74; the one-shell search spent a
    minute proving it). Near total reflux Gilliland's stages approach Fenske's, so the estimate
    is closest where it decides.
    """
    estimate = shortcut(problem)
    minimum = estimate.minimum_stages
    if limit <= minimum:
        raise HeightLimitError(f"{shells_hold(sizing, trays, limit)}, not above the minimum of {minimum:.1f} "
                               "stages at total reflux")
    if reflux_max > estimate.minimum_reflux:
        needed = stages_from_gilliland(minimum, estimate.minimum_reflux, reflux_max)
        if limit < needed:
            raise HeightLimitError(f"{shells_hold(sizing, trays, limit)}, fewer than the {needed:.1f} stages "
                                   f"Gilliland's correlation asks at the highest reflux ratio searched "
                                   f"({reflux_max:g})")


def most_stages_held(sizing: SizingOptions) -> int:
    """Equilibrium stages two shells in series within the height limit hold at best [-]: every tray
    an equilibrium stage at the closest tray spacing offered, no sump liquid, plus the reboiler and
    a partial condenser. Above this no layout disteco builds can hold the column."""
    trays = max(0.0, sizing.max_height - sizing.top_space - sizing.bottom_space) / min(sizing.spacing_candidates)
    return max(SHELL_COUNTS) * math.floor(trays) + 2


def check_stages_fit(shortcut: ShortcutDesign, sizing: SizingOptions) -> None:
    """Refuse, before any column on thermo is solved, a split whose Fenske minimum stages exceed
    :func:`most_stages_held` (an m-/p-xylene splitter at 95 %: about 300 stages at total reflux;
    `check` spent 15 s on a 584-stage column before saying only that it did not converge)."""
    most = most_stages_held(sizing)
    if shortcut.minimum_stages <= most:
        return
    light, heavy = shortcut.light_key, shortcut.heavy_key
    top = shortcut.alpha_top[light] / shortcut.alpha_top[heavy]
    bottom = shortcut.alpha_bottom[light] / shortcut.alpha_bottom[heavy]
    raise HeightLimitError(
        f"the key purities need {shortcut.minimum_stages:.0f} equilibrium stages even at total reflux (Fenske, "
        f"the keys' relative volatility {min(top, bottom):.4g} to {max(top, bottom):.4g}); "
        f"{max(SHELL_COUNTS)} shells of at most {sizing.max_height:g} m hold at most {most}, even with every tray an "
        f"equilibrium stage at the closest tray spacing offered ({min(sizing.spacing_candidates):.2f} m): ask for "
        "looser purities, raise [sizing] max_height, or separate the keys another way (extractive distillation, "
        "crystallisation, adsorption)")


def shells_hold(sizing: SizingOptions, trays: TrayBasis, limit: int) -> str:
    shells = "one shell" if sizing.shells == 1 else f"{sizing.shells} shells"
    hold = "holds" if sizing.shells == 1 else "hold"
    at = f"at {sizing.tray_spacing:.2f} m tray spacing and {100 * trays.efficiency:.0f} % tray efficiency"
    if trays.height(limit) > sizing.max_height:  # the least stage count searched does not fit either
        return (f"{shells} of at most {sizing.max_height:g} m {hold} fewer than {limit} stages {at} ({limit} make "
                f"{trays.height(limit):.1f} m{'' if sizing.shells == 1 else ' in the taller shell'}, of which "
                f"{trays.extra_height:.1f} m sump, top space and nozzles)")
    return f"{shells} of at most {sizing.max_height:g} m {hold} at most {limit} stages {at}"
