"""The separation problem of a case: fitted forms down to the search's stage bound.

Kept apart from the search and the model so that ``check`` builds it without the solver
interfaces (Pyomo's modelling layer is a quarter of a second to import).
"""

from __future__ import annotations

import math

import numpy as np

from .._base.errors import ConvergenceError, InfeasibleSpecError, PropertyError
from ..case import Case, require_mole_basis
from ..properties import FeedState, Mixture
from ..properties.fitted import fit_mixture
from ..stages import StageProfile, design_stages
from .basis import SeparationProblem, check_problem
from .fit_check import check_fit
from .start import shortcut

# The search's stage bound when none is given: the optimum usually lies near 2-2.5 x the
# minimum stages (Fenske's, or McCabe-Thiele's for a binary), so 4.5 x leaves room on the
# expensive-energy side (common practice, no source); never below the 60 stages that were the
# fixed bound before, so small columns keep the room they had.
STAGE_BOUND_FACTOR = 4.5
STAGE_BOUND_FLOOR = 60
COLUMN_LIQUIDS = 24  # most stage liquids of the case's own profile an equation of state's K fit is made on
KEPT = 16  # cases whose stage profile and fit decision are kept

_profiles: dict = {}  # (case, mixture, feed) -> the stage design's thermo profile, or None
_on_column: dict = {}  # (case, mixture, feed) -> whether the K fit is made on that profile's liquids
# (case, mixture, feed, top and bottom pressure) -> the fitted forms: a design asks for the same fit
# again in later rounds, the control margin and the curve (the depentaniser: 8 fits, 2 distinct,
# 0.17 s each)
_fits: dict = {}


def default_max_stages(minimum_stages: float) -> int:
    """Largest stage count searched when the options give none [-]: ``STAGE_BOUND_FACTOR`` x the minimum stages."""
    return max(STAGE_BOUND_FLOOR, math.ceil(STAGE_BOUND_FACTOR * minimum_stages))


def separation_problem(case: Case, mixture: Mixture, feed: FeedState, max_stages: int,
                       stage_pressure_drop: float | None = None) -> SeparationProblem:
    """The process side of ``case``, with forms fitted from the top pressure to ``max_stages`` stages down.

    ``stage_pressure_drop`` [Pa per equilibrium stage]: None takes the case's preliminary
    figure (per-tray drop over a preliminary efficiency, see :meth:`disteco.case.Column.stage_pressure_drop`).
    """
    column = case.column
    require_mole_basis(case.products, "the optimisation")
    drop = column.pressure_drop_per_stage if stage_pressure_drop is None else stage_pressure_drop
    P_top = column.top_pressure
    P_bottom = P_top + max_stages * drop
    problem = SeparationProblem(
        _fitted(case, mixture, feed, P_top, P_bottom), feed.molar_flow, tuple(feed.z), feed.q, P_top,
        drop, case.products.light_key, case.products.heavy_key,
        case.products.light_key_spec, case.products.heavy_key_spec, column.subcooling,
        column.condenser == "partial")
    check_problem(problem)
    return problem


def remember_column_profile(case: Case, mixture: Mixture, feed: FeedState, profile: StageProfile | None) -> None:
    """Keep the thermo stage profile the case's checks solved (:func:`design_stages`), so that
    :func:`separation_problem` need not solve it again."""
    _keep(_profiles, (case, mixture, feed), profile)


def _keep(store: dict, key, value) -> None:
    if key not in store and len(store) >= KEPT:
        store.pop(next(iter(store)))
    store[key] = value


def _column_profile(case: Case, mixture: Mixture, feed: FeedState) -> StageProfile | None:
    key = (case, mixture, feed)
    if key not in _profiles:
        try:
            profile = design_stages(mixture, feed, case.products, case.column).profile
        except (InfeasibleSpecError, ConvergenceError, PropertyError):
            profile = None  # the checks refuse such a case in their own words
        _keep(_profiles, key, profile)
    return _profiles[key]


def _fitted(case: Case, mixture: Mixture, feed: FeedState, P_top: float, P_bottom: float):
    """The fitted forms: an equation of state's K first fitted on liquids sampled over the whole
    composition range (:func:`~disteco.properties.fitted.saturated_states`), and again on the
    stage liquids of the case's own thermo profile (the stage design's) and its reflux, where
    that fit misses the profile by more than the fit check's tolerances; likewise an activity
    model's NRTL pairs of three or more components, fitted on their binaries, then together on
    the binaries and the stage liquids (:func:`~disteco.properties.fitted.fit_mixture`). The fit on
    the column is kept where it cuts the check's misfit (its largest difference over its tolerance,
    infinite where a stage has no fitted bubble point) by a third (:data:`ON_COLUMN_GAIN`); the
    decision holds for every fit of the run.

    A column with several non-keys visits a small part of the range: on an invented
    demethaniser at 28 bar the sampled fit's bubble temperatures were up to 3.05 K off thermo
    along the verified column, the fit on its stage liquids 0.05 K. Fits within the tolerances
    are kept as they are (every example).
    """
    pressures = (case, mixture, feed, P_top, P_bottom)
    if pressures not in _fits:
        _keep(_fits, pressures, _fit(case, mixture, feed, P_top, P_bottom))
    return _fits[pressures]


def _fit(case: Case, mixture: Mixture, feed: FeedState, P_top: float, P_bottom: float):
    key = (case, mixture, feed)
    if _on_column.get(key) is True:
        return _fit_on_column(case, mixture, feed, P_top, P_bottom)
    fitted = fit_mixture(mixture, P_top, P_bottom, z=feed.z)
    # an activity model's pairs are fitted on their binaries, which two components reproduce
    if not (fitted.form == "k-fit" or (fitted.form == "nrtl" and fitted.size >= 3)) or key in _on_column:
        return fitted
    profile = _column_profile(case, mixture, feed)
    before = check_fit(fitted, mixture, profile) if profile is not None else None
    if before is None or before.within_tolerance:
        _keep(_on_column, key, False)
        return fitted
    on_column = _fit_on_column(case, mixture, feed, P_top, P_bottom)
    # kept only where it helps: on four aqueous alcohols the joint NRTL fit moved the pairs' 0.0099 in a
    # vapour fraction to 0.0096 and cost 2.3 s at each of the run's twelve pressure ranges
    _keep(_on_column, key, check_fit(on_column, mixture, profile).misfit <= ON_COLUMN_GAIN * before.misfit)
    return on_column if _on_column[key] else fitted


ON_COLUMN_GAIN = 2.0 / 3.0  # a fit on the column's liquids must cut the fit check's misfit by a third to be kept [-]


def _fit_on_column(case: Case, mixture: Mixture, feed: FeedState, P_top: float, P_bottom: float):
    """The forms fitted on the stage liquids and reflux of the case's own thermo profile as well."""
    profile = _column_profile(case, mixture, feed)
    rows = np.linspace(0, profile.stages - 1, min(profile.stages, COLUMN_LIQUIDS)).round().astype(int)
    liquids = [profile.x[j] for j in dict.fromkeys(rows)] + [_reflux(mixture, profile, P_top)]
    liquids = [np.maximum(np.asarray(x, dtype=float), 1e-12) for x in liquids]
    return fit_mixture(mixture, P_top, P_bottom, z=feed.z, liquids=[x / x.sum() for x in liquids])


def _reflux(mixture: Mixture, profile: StageProfile, P_top: float):
    """The reflux's composition: the distillate's, or with a partial condenser the liquid in
    equilibrium with the vapour distillate (the column's lightest liquid; without it the
    demethaniser's model missed its methane recovery on thermo)."""
    if not profile.partial_condenser:
        return profile.distillate_composition
    return mixture.dew_point(P_top, profile.distillate_composition).x


def resolved_problem(case: Case, mixture: Mixture, feed: FeedState, config, at_least: int = 0) -> SeparationProblem:
    """The separation problem fitted down to the search's stage bound, which this sets in ``config``.

    Without a ``max_stages`` option the bound is :func:`default_max_stages` of the minimum stages
    on forms fitted to ``STAGE_BOUND_FLOOR`` stages (refitted only when the bound is larger);
    ``at_least`` raises it to a given design's stages.
    """
    if config.max_stages is None:
        probe = separation_problem(case, mixture, feed, STAGE_BOUND_FLOOR)
        config.max_stages = default_max_stages(shortcut(probe).minimum_stages)
        if max(config.max_stages, at_least) == STAGE_BOUND_FLOOR:
            return probe
    config.max_stages = max(config.max_stages, at_least)
    return separation_problem(case, mixture, feed, config.max_stages)
