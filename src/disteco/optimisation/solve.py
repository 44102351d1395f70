"""Solve one configuration's model and read it back into result dataclasses.

Termination conditions are always checked: an optimal or locally optimal answer is read
back; infeasibility becomes :class:`InfeasibleSpecError`; anything else (iteration or
time limit, solver error) becomes :class:`SolverError` naming the configuration.
"""

from __future__ import annotations

import math
import time
from dataclasses import replace

import numpy as np
import pyomo.environ as pyo
import pyomo_ripopt  # noqa: F401  registers the 'ripopt' solver with Pyomo
from pyomo.opt import SolverStatus, TerminationCondition as TC

from .._base.errors import InfeasibleSpecError, SolverError, UtilityTemperatureError
from .._base.interrupt import stop_if_requested
from ..stages.results import StageProfile
from .basis import CostBasis, SeparationProblem
from .model import KILO, build_column_model, held_ends, initialise, required_areas, shortfall, \
    unwatched_flooding, watch_flooding
from .options import barrier_order, model_options
from .results import ColumnSizes, CostBreakdown, CostItem, DesignEvaluation, SolverReport
from .start import Profile, start_profile

RETRY_REFLUX_FACTORS = (1.5, 3.0)  # start reflux multiples tried after a stalled solve
# Stages x components of the models the per-configuration time limits were measured on (the
# five-component example near its optimum, 23 stages); larger models get proportionally more.
LIMIT_SIZE = 120
OK = {TC.optimal: "optimal", TC.locallyOptimal: "locally optimal"}
INFEASIBLE = (TC.infeasible, TC.invalidProblem, TC.infeasibleOrUnbounded)
STOPPED = {TC.maxIterations: "iteration limit", TC.maxTimeLimit: "time limit",
           TC.maxEvaluations: "evaluation limit"}


_SOLVERS: dict = {}  # name -> (solver, its own options): one per process, executable found and version read once


def make_solver(name: str, time_limit: float, max_iterations: int, relative_gap: float,
                barrier: str | None = None, tolerance: float | None = None, initial_barrier: float | None = None):
    """A Pyomo solver with the limits (and an interior-point ``barrier`` strategy, convergence
    ``tolerance`` and ``initial_barrier`` parameter) in its own option names.

    The process keeps one solver object per name and sets its options anew for each solve: a new
    object looked for its executable and ran it once more for its version, 2.4 ms of a 50-ms solve.
    """
    if name not in _SOLVERS:
        solver = pyo.SolverFactory(name)
        if not solver.available(exception_flag=False):
            raise SolverError(f"solver {name!r} is not available; the default 'ripopt' installs with pyomo-ripopt")
        _SOLVERS[name] = solver, dict(solver.options)  # the options it was made with (the executable's name)
    solver, made_with = _SOLVERS[name]
    solver.options.clear()
    solver.options.update(made_with)
    if name in ("ripopt", "ipopt"):
        solver.options["max_iter"] = max_iterations
        if tolerance is not None:
            solver.options["tol"] = tolerance
        if initial_barrier is not None:
            solver.options["mu_init"] = initial_barrier
        solver.options["max_wall_time" if name == "ripopt" else "max_cpu_time"] = max(time_limit, 1.0)
        if barrier:
            solver.options["mu_strategy"] = barrier
    elif name.startswith("scip"):
        solver.options["limits/time"] = max(time_limit, 1.0)
        solver.options["limits/gap"] = relative_gap
    return solver


def _timed_solve(model, config, name: str, time_limit: float, failure: str, barrier: str | None = None,
                 iterations: int | None = None):
    """Solve without loading; return (results, wall time [s]); a solver crash becomes a SolverError."""
    solver = make_solver(name, time_limit, iterations or config.max_iterations, config.relative_gap, barrier,
                         config.nlp_tolerance, config.initial_barrier)
    start = time.perf_counter()
    try:
        results = solver.solve(model, tee=config.tee, load_solutions=False)
    except (ValueError, RuntimeError, OSError) as exc:
        stop_if_requested()  # an interrupt the modelling library reported as its own error
        raise SolverError(f"{name} {failure} {model.name}: {exc}") from exc
    stop_if_requested()
    return results, time.perf_counter() - start


def run_solver(model, config, time_limit: float | None = None, solver_name: str | None = None,
               barrier: str | None = None, iterations: int | None = None) -> SolverReport:
    """Solve ``model``; return the report or raise our errors (never pass a failure on silently).

    Flooding constraints left out of the model (:func:`~disteco.optimisation.model.watch_flooding`)
    that the solution breaks are added and the model solved again from its solution, until none is.
    """
    report = _solved(model, config, time_limit, solver_name, barrier, iterations)
    while missed := unwatched_flooding(model):
        for j in missed:
            model.flooding[j].activate()
        again = _solved(model, config, time_limit, solver_name, barrier, iterations)
        report = replace(again, wall_time=report.wall_time + again.wall_time)
    return report


def _solved(model, config, time_limit: float | None, solver_name: str | None, barrier: str | None,
            iterations: int | None) -> SolverReport:
    name = solver_name or config.solver
    limit = config.configuration_time_limit if time_limit is None else time_limit
    results, wall = _timed_solve(model, config, name, limit, "failed on", barrier, iterations)
    tc = results.solver.termination_condition
    if tc in OK or (tc in STOPPED and name.startswith("scip") and len(results.solution) > 0):
        status = OK.get(tc, STOPPED.get(tc, str(tc)))
        if results.solver.status == SolverStatus.warning and tc in OK:
            status += " (acceptable level)"  # the solver's looser tolerances; recorded, not logged
            results.solver.status = SolverStatus.ok
        model.solutions.load_from(results)
        gap = _gap(results)
        return SolverReport(name, status, str(tc), gap, wall, barrier=barrier or "")
    if tc in INFEASIBLE:
        raise InfeasibleSpecError(f"{model.name}: no design meets the product specifications "
                                  f"within the reflux range ({name}: {tc})")
    status = STOPPED.get(tc, "failed")
    raise SolverError(f"{name} stopped on {model.name} with {status} ({tc}, solver status "
                      f"{results.solver.status if results.solver.status != SolverStatus.ok else 'ok'}) "
                      f"after {wall:.1f} s")


def certify(model, config, incumbent: float) -> SolverReport:
    """Bound the solved configuration's optimum with a global solver; the design stays as it is.

    ``incumbent`` is the local solver's objective value. Returns the global solver's report
    with the relative gap between the incumbent and the proven lower bound; "certified"
    when that gap is within ``config.relative_gap``.
    """
    name = config.certify_solver
    watch_flooding(model)  # the bound of the whole model, every flooding constraint in it
    results, wall = _timed_solve(model, config, name, config.certify_time_limit, "failed to bound")
    tc = results.solver.termination_condition
    try:
        lower = float(results.problem.lower_bound)
    except (TypeError, ValueError):
        lower = -math.inf
    gap = (incumbent - lower) / max(abs(incumbent), 1e-10) if math.isfinite(lower) else None
    status = "certified" if gap is not None and gap <= config.relative_gap + 1e-12 else \
        STOPPED.get(tc, OK.get(tc, str(tc)))
    return SolverReport(name, status, str(tc), None if gap is None else max(gap, 0.0), wall)


def _gap(results) -> float | None:
    problem = results.problem
    try:
        upper, lower = float(problem.upper_bound), float(problem.lower_bound)
    except (TypeError, ValueError, AttributeError):
        return None
    if not (math.isfinite(upper) and math.isfinite(lower)):
        return None
    return abs(upper - lower) / max(abs(upper), 1e-10)


def size_factor(problem: SeparationProblem, stages: int) -> float:
    """Multiple of the per-configuration time limits a model of ``stages`` stages needs [-], at least one.

    A solver iteration costs about in proportion to the model's size. Measured on a
    twenty-component debutaniser, 17 stages (340 stage-components, 820 variables): the
    adaptive barrier converged in 18 iterations and 2.0 s on a loaded 2-core machine, twice
    the 1 s quick limit set for the five-component example, so every try was cut off.
    """
    return max(1.0, stages * len(problem.z) / LIMIT_SIZE)


def attempts(config, strategies: tuple[str, ...] | None, retries: bool,
             components: int = 2, first: bool = True, last_full: bool = True) -> list[tuple[float, str | None, int]]:
    """(start reflux factor, barrier strategy, iteration limit) of each try on one configuration.

    Each strategy in turn from the Gilliland start (``first``), then the last one from the
    retry starts (``retries``). Every try but the last stops at ``quick_iterations`` (and
    ``quick_time_limit``), the last too unless ``last_full``: a strategy that is going to
    converge does so quickly (measured, see DEVELOPERS.md), one that is not only burns time.
    Barrier strategies apply to interior-point solvers only.
    """
    if config.solver not in ("ripopt", "ipopt"):
        strategies = (None,)
    order = tuple(strategies or barrier_order(config, components))
    plan = [(1.0, strategy) for strategy in order] if first else []
    if retries:
        plan += [(factor, order[-1]) for factor in RETRY_REFLUX_FACTORS]
    quick = min(config.quick_iterations, config.max_iterations)
    return [(factor, strategy, quick if k < len(plan) - 1 or not last_full else config.max_iterations)
            for k, (factor, strategy) in enumerate(plan)]


def solved_model(problem: SeparationProblem, basis: CostBasis, stages: int, feed_stage: int, options=None,
                 start: Profile | None = None, fixed_reflux: float | None = None,
                 time_limit: float | None = None,
                 strategies: tuple[str, ...] | None = None) -> tuple[pyo.ConcreteModel, SolverReport]:
    """Build, initialise and solve one configuration; return the solved model and its report.

    The tries are listed by :func:`attempts`; ``strategies`` orders the barrier strategies
    (the search passes the one that last worked first). Without a given start, a stalled
    solve is also retried from profiles at 1.5 and 3 times the start reflux: which start
    lets ripopt converge is erratic (measured: ethanol-water, 39 stages, feed on 20:
    stalled from the Gilliland reflux, 0.8 s from twice it; three components, 31 stages,
    feed on 13: converged from 0.8, 1.5, 3 and 4 times, stalled from 1 and 2 times).
    """
    config = model_options(options)
    full_limit = config.configuration_time_limit * size_factor(problem, stages) if time_limit is None else time_limit
    components = len(problem.z)
    retries = start is None and fixed_reflux is None

    def tries(run_config, begin, plan):
        return _tries(problem, basis, stages, feed_stage, run_config, begin, fixed_reflux, full_limit, plan)

    if not config.energy_balances or start is not None:
        model, report = tries(config, start, attempts(config, strategies, retries, components))
    else:
        try:  # each strategy's quick try from the Gilliland start
            model, report = tries(config, None, attempts(config, strategies, False, components, last_full=False))
        except SolverError:
            try:
                # Homotopy before the long tries: the constant-molar-overflow model, then the energy
                # balances from its solution. Measured: ethane/propane/n-butane at 25 bar with a
                # partial condenser, 20 stages, feed on 10: every try from the constant-molar-overflow
                # start profile stalled (90 s), solved from the converged model in 0.4 s; the
                # twenty-component debutaniser, 24 stages, feed on 9: the long tries 62 s in vain
                # (ripopt overran its 20 s wall-time limit to 51 s), the homotopy 3 s.
                cmo = model_options(config)
                cmo.energy_balances = False
                first, _ = tries(cmo, None, attempts(cmo, strategies, retries, components))
                model, report = tries(config, profile_of(first), attempts(config, strategies, False, components))
            except SolverError:  # the retry starts last (at a fixed reflux: the full tries from the start)
                model, report = tries(config, None, attempts(config, strategies, retries, components,
                                                             first=not retries))
    missed = shortfall(model)
    if missed > config.shortfall_tolerance and fixed_reflux is None:
        model, report, missed = _charged_again(model, report, config,
                                               min(full_limit, config.quick_time_limit * size_factor(problem, stages)))
    if missed > config.shortfall_tolerance:
        at = f"reflux ratio {fixed_reflux:.4g}, " if fixed_reflux is not None else ""
        short = (f"{at}{stages} stages with the feed on stage {feed_stage}: the product specifications cannot be met "
                 f"(best reachable falls {100 * missed:.3g} % short)")
        held = held_ends(model)
        if held:
            raise utility_held(short, basis, *held[0])
        raise InfeasibleSpecError(
            f"{short}; more stages, more reflux or another feed stage "
            f"are needed{_pressure_rise(problem, stages) if fixed_reflux is not None else ''}")
    return model, report


def utility_held(short: str, basis: CostBasis, exchanger: str, utility: float) -> UtilityTemperatureError:
    """The error of a configuration held short of its specifications by ``exchanger``'s utility temperature,
    ``utility`` [K] at the end where the minimum approach binds (:func:`~disteco.optimisation.model.held_ends`).

    A condenser's process side can be no colder than the utility plus the minimum approach (a
    reboiler's no hotter than the utility less it); a product that meets the specifications
    condenses colder (boils hotter) at the column's pressure, whatever the stages and reflux.
    """
    side = basis.condenser if exchanger == "condenser" else basis.reboiler
    cooling = side.service == "cooling"
    bound = utility + side.minimum_approach if cooling else utility - side.minimum_approach
    product, act, beyond, further, pressure = (("distillate", "condenses", "warmer", "colder", "raise") if cooling
                                               else ("bottoms", "boils", "colder", "hotter", "lower"))
    return UtilityTemperatureError(
        f"{short}: the {exchanger} on {side.level} ({utility - 273.15:.1f} degC at that end) with the minimum "
        f"approach of {side.minimum_approach:g} K holds its process side at {bound - 273.15:.1f} degC or {beyond}, "
        f"and a {product} that meets the specifications {act} {further} at this pressure; {pressure} "
        f"column.top_pressure, lower sizing.min_approach, or offer a {further} level in your own cost data "
        "(economics.cost_data: utility_levels.csv and utility_prices.csv)", side.level, side.service)


PENALTY_STEP = 10.0  # factor on the shortfall's charge for the second solve of a configuration that fell short


def _charged_again(model, report: SolverReport, config, time_limit: float):
    """(model, report, shortfall) after solving ``model`` again from its solution with the shortfall charged
    :data:`PENALTY_STEP` times more; the first solve's where the second fails.

    The charge is exact only above the TAC a unit of shortfall saves, which near the fewest stages that
    meet the specifications can exceed it: a vapour-fed toluene column of 25 stages ended 0.49 % short
    at R 3.26 where R 3.40 meets both specifications (TAC 6 % higher), and was counted infeasible, so
    that the search's first steps walked to 32 stages through two stalled solves (12 and 16 s). A charge
    ten times higher from the start loosened the solver's convergence at every configuration (the
    bound multiplier of the shortfall scales its test): TACs 3e-5 apart against 1e-5.
    """
    model.penalty.set_value(PENALTY_STEP * pyo.value(model.penalty))
    try:
        again = run_solver(model, config, time_limit, barrier=report.barrier or None)
    except (SolverError, InfeasibleSpecError):
        again = None
    if again is None:  # a failed solve loads nothing: the model holds the first solution
        model.penalty.set_value(pyo.value(model.penalty) / PENALTY_STEP)
        return model, report, shortfall(model)
    return model, replace(again, wall_time=report.wall_time + again.wall_time), shortfall(model)


PRESSURE_RISE = 1.2  # bottom over top pressure from which a given design's shortfall names the pressure drop [-]


def _pressure_rise(problem: SeparationProblem, stages: int) -> str:
    """A clause on the trays' pressure drop where it raises the reboiler's pressure by a fifth or more: a
    given benzene column of 110 stages at a reflux above the energy-balance minimum of a 48-stage one
    fell 30 % short, its reboiler at 232 kPa against 115 at the top (common practice, no source)."""
    top, bottom = problem.top_pressure, problem.pressure(stages)
    if bottom < PRESSURE_RISE * top:
        return ""
    return (f"; its trays take the pressure from {top / 1e3:.4g} kPa at the top to {bottom / 1e3:.4g} kPa in the "
            "reboiler, which lowers the relative volatility down the column: on so many stages more reflux helps "
            "where more stages raise the pressure further")


def _tries(problem: SeparationProblem, basis: CostBasis, stages: int, feed_stage: int, config,
           start: Profile | None, fixed_reflux: float | None, full_limit: float,
           plan: list[tuple[float, str | None, int]]) -> tuple[pyo.ConcreteModel, SolverReport]:
    """The tries of ``plan`` (see :func:`attempts`) on one configuration, until one solves; the last
    failure raises."""
    profiles = {}
    # One model for all tries: a failed solve loads nothing, so initialising again restores every value.
    model = build_column_model(problem, basis, stages, feed_stage, config)
    for attempt, (factor, barrier, iterations) in enumerate(plan):
        if factor not in profiles:
            profiles[factor] = start or start_profile(problem, stages, feed_stage, fixed_reflux, factor=factor)
        initialise(model, profiles[factor])
        if fixed_reflux is not None:
            model.R.fix(fixed_reflux)
        quick = config.quick_time_limit * size_factor(problem, stages)
        last_full = attempt == len(plan) - 1 and iterations >= config.max_iterations  # see attempts()
        limit = full_limit if last_full else min(full_limit, quick)
        try:
            return model, run_solver(model, config, limit, barrier=barrier, iterations=iterations)
        except SolverError:
            if attempt == len(plan) - 1:
                raise
    raise AssertionError("attempts() returns at least one try")


def profile_of(model) -> Profile:
    """The solved model's stage profile as a start :class:`Profile`."""
    J, C, v = model.J, model.C, pyo.value
    return Profile(v(model.R), v(model.D), np.array([v(model.T[j]) for j in J]),
                   np.array([[v(model.x[j, i]) for i in C] for j in J]),
                   np.array([[v(model.y[j, i]) for i in C] for j in J]),
                   np.array([v(model.L[j]) for j in J]), np.array([v(model.V[j]) for j in J]))


def solve_configuration(problem: SeparationProblem, basis: CostBasis, stages: int, feed_stage: int,
                        options=None, start: Profile | None = None, fixed_reflux: float | None = None,
                        time_limit: float | None = None, strategies: tuple[str, ...] | None = None) -> DesignEvaluation:
    """Lowest-TAC design of one configuration (or the priced design at ``fixed_reflux``)."""
    return read_design(*solved_model(problem, basis, stages, feed_stage, options, start, fixed_reflux, time_limit,
                                     strategies))


def configuration_design(problem: SeparationProblem, basis: CostBasis, stages: int, feed_stage: int,
                         options=None, time_limit: float | None = None, strategies: tuple[str, ...] | None = None,
                         start: Profile | None = None) -> tuple[DesignEvaluation, Profile]:
    """(lowest-TAC design, its solved profile) of one configuration, from ``start`` if given.

    The profile starts neighbouring configurations (:func:`~disteco.optimisation.start.moved_profile`).
    """
    model, report = solved_model(problem, basis, stages, feed_stage, options, start=start, time_limit=time_limit,
                                 strategies=strategies)
    return read_design(model, report), profile_of(model)


def read_design(model, report: SolverReport) -> DesignEvaluation:
    """Read a solved model back into a :class:`DesignEvaluation`."""
    m, p, b = model, model.problem, model.basis
    v = pyo.value
    J, C = list(m.J), list(m.C)
    x = tuple(tuple(v(m.x[j, i]) for i in C) for j in J)
    y = tuple(tuple(v(m.y[j, i]) for i in C) for j in J)
    D, B = v(m.D), v(m.L[m.N])
    partial = p.partial_condenser
    distillate = tuple(v(m.yD[i]) for i in C) if partial else y[0]
    profile = StageProfile(
        T=tuple(v(m.T[j]) for j in J), P=tuple(m.P[j] for j in J), L=tuple(v(m.L[j]) for j in J),
        V=tuple(v(m.V[j]) for j in J), x=x, y=y, feed_stage=m.NF, reflux_ratio=v(m.R),
        distillate_flow=D, bottoms_flow=B, distillate_composition=distillate, bottoms_composition=x[-1],
        condenser_duty=v(m.Qc) * KILO, reboiler_duty=v(m.Qr) * KILO, condenser_temperature=v(m.TD) - p.subcooling,
        partial_condenser=partial, model="rigorous" if m.config.energy_balances else "cmo")
    need = required_areas(m)
    sizes = ColumnSizes(diameter=v(m.diameter), height=m.height, real_trays=m.real_trays,
                        tray_efficiency=b.trays.efficiency, condenser_area=v(m.condenser_area),
                        reboiler_area=v(m.reboiler_area), condenser_duty=v(m.Qc) * KILO,
                        reboiler_duty=v(m.Qr) * KILO, flooding_stage=max(need, key=need.get))
    priced = [(b.shell, v(m.shell_volume), v(m.cost_shell)), (m.tray_pricing, v(m.tray_area), v(m.cost_trays)),
              (b.condenser.cost, sizes.condenser_area, v(m.cost_condenser)),
              (b.reboiler.cost, sizes.reboiler_area, v(m.cost_reboiler))]
    if b.condensate is not None:
        priced += [(b.condensate.drum, v(m.drum_volume), v(m.cost_drum)),
                   (b.condensate.pump, v(m.pump_power), v(m.cost_pump))]
    items = tuple(_item(pricing, size, installed) for pricing, size, installed in priced)
    capital = v(m.capital)
    cond_utility, reb_utility, pump_utility = v(m.condenser_utility), v(m.reboiler_utility), v(m.pump_utility)
    cost = CostBreakdown(items, capital, cond_utility, reb_utility, cond_utility + reb_utility + pump_utility,
                         b.annualisation * capital, v(m.tac), b.currency, b.cost_year, pump_utility)
    warnings = tuple(_range_warnings(priced))
    return DesignEvaluation(m.N, m.NF, v(m.R), profile, sizes, cost, report, warnings,
                            shortfall=max(shortfall(m), 0.0))


def _item(pricing, size: float, installed: float) -> CostItem:
    """Cost item; ``size`` [SI] is per piece (one tray's area) when several pieces are costed together."""
    name = pricing.item if pricing.count == 1 else f"{pricing.item} ({pricing.count})"
    return CostItem(name, size, pricing.curve.validity().unit, pricing.purchased_base(size) * pricing.index_ratio,
                    installed)


RANGE_NOTE = " cost curve at "  # in the notes of a model design's sizes beyond a cost curve's range


def _range_warnings(priced) -> list[str]:
    notes = []
    for pricing, size, _ in priced:
        validity = pricing.curve.validity()
        per_unit = size / pricing.parallel_units
        if not validity.contains(per_unit):
            notes.append(f"extrapolated: {pricing.item}{RANGE_NOTE}{per_unit:.4g} {validity.unit}, outside "
                         f"{validity.low:g} to {validity.high:g} {validity.unit}, costed along the curve's tangent "
                         f"({pricing.curve.source or 'cost data'})")
    return notes
