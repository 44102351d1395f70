"""The equation model of one configuration: twins of its correlations, bounds, termination mapping.

Twin tests compare each Pyomo expression with the float function of the sizing or costing
layer (or thermo) at design points; regression pins say so in their docstrings.
"""

import math

import pyomo.environ as pyo
import pytest

from disteco._base.errors import InfeasibleSpecError, SolverError
from disteco.costing.data import load_cost_data
from disteco.optimisation.correlations import (capacity_factor_expr, cost_curve_expr, lmtd_expr,
                                                mean_temperature_difference, vapour_density_expr)
from disteco.optimisation.model import build_column_model, flooding_terms, initialise
from disteco.optimisation.solve import attempts, run_solver, solve_configuration, solved_model, start_profile
from disteco.optimisation.options import model_options
from disteco.sizing.exchangers import log_mean_temperature_difference
from disteco.sizing.flooding import (capacity_factor_lygeros_magoulas, flooding_diameter_smooth,
                                     lygeros_magoulas_constants)
from test_optimisation_support import EASY_SPLIT, example, example_basis, example_problem

MAX = 22


@pytest.fixture(scope="module")
def problem():
    return example_problem("aromatics_binary", MAX, *EASY_SPLIT)


@pytest.fixture(scope="module")
def basis():
    return example_basis("aromatics_binary", MAX, *EASY_SPLIT, scenario="cheap-steam-demo")


@pytest.fixture(scope="module")
def solved(problem, basis):
    return solved_model(problem, basis, 18, 9, {"max_stages": MAX})[0]


def _value(expression_builder, *numbers):
    """Evaluate a Pyomo-form builder on fixed Pyomo variables holding ``numbers``."""
    m = pyo.ConcreteModel()
    m.v = pyo.Var(range(len(numbers)))
    for i, number in enumerate(numbers):
        m.v[i].fix(number)
    return pyo.value(expression_builder(*[m.v[i] for i in range(len(numbers))]))


@pytest.mark.parametrize("flv", [0.01, 0.05, 0.1, 0.3, 1.0])
@pytest.mark.parametrize("spacing", [0.3048, 0.4572, 0.6096])
def test_capacity_factor_twin(flv, spacing):
    """Pyomo capacity factor equals the sizing layer's Lygeros-Magoulas fit of Fair's chart."""
    constants = lygeros_magoulas_constants(spacing)
    assert _value(lambda f: capacity_factor_expr(f, constants), flv) == pytest.approx(
        capacity_factor_lygeros_magoulas(flv, spacing), rel=1e-12)


@pytest.mark.parametrize("item", ["vertical_vessel", "sieve_tray", "fixed_tube_sheet_exchanger", "kettle_reboiler"])
def test_cost_curve_twin(item):
    """Pyomo cost curve equals the costing layer's purchased cost over each curve's size range."""
    data = load_cost_data()
    curve = data.curve(item)
    from disteco.optimisation.basis import CostCurve
    mine = CostCurve(item, curve.k1, curve.k2, curve.k3, curve.size_unit, curve.size_min, curve.size_max)
    for size in (curve.size_min, math.sqrt(curve.size_min * curve.size_max), curve.size_max):
        assert _value(lambda s: cost_curve_expr(mine, s), size) == pytest.approx(curve.purchased_cost(size), rel=1e-10)


@pytest.mark.parametrize("ends", [(30.0, 20.0), (12.0, 36.0), (10.0, 10.0), (5.0, 50.0)])
def test_mean_temperature_difference_against_sizing_lmtd(ends):
    """Underwood's cube-root mean used in the model is within 0.4 % of the sizing layer's log mean
    (via ht) for end ratios up to 10, and exact for equal ends (a stated approximation, not a twin)."""
    hot_in, hot_out = 400.0, 390.0
    cold_out, cold_in = hot_in - ends[0], hot_out - ends[1]
    exact = log_mean_temperature_difference(hot_in, hot_out, cold_in, cold_out)
    approx = _value(lambda a, b: lmtd_expr(a, b), *ends)
    assert approx == pytest.approx(exact, rel=0.004)
    assert approx == pytest.approx(mean_temperature_difference(*ends), rel=1e-12)


def test_vapour_density_twin():
    """Ideal-gas vapour density equals thermo's ideal-gas model for benzene-toluene (within 1e-9)."""
    _, mixture, _ = example("aromatics_binary")
    y = [0.6, 0.4]
    M = mixture.molar_mass(y)
    assert _value(lambda T: vapour_density_expr(1.15e5, T, M), 370.0) == pytest.approx(
        mixture.vapour_density(370.0, 1.15e5, y), rel=1e-9)


def test_flooding_constraint_twin_at_solution(solved, basis):
    """At a solved design the diameter equals the sizing layer's smooth flooding diameter at the
    tray that governs, evaluated with the model's own properties (Fair via Lygeros-Magoulas)."""
    m = solved
    f = m.problem.fitted
    worst = 0.0
    for j in m.TRAYS:
        x = [pyo.value(m.x[j, i]) for i in m.C]
        y = [pyo.value(m.y[j, i]) for i in m.C]
        T = pyo.value(m.T[j])
        rho_v = pyo.value(m.rho_V[j])
        worst = max(worst, flooding_diameter_smooth(
            pyo.value(m.V[j]) * f.molar_mass(y), pyo.value(m.L[j]) * f.molar_mass(x), pyo.value(m.rho_L[j]), rho_v,
            f.surface_tension_of(T, x), basis.trays.tray_spacing, basis.trays.flooding_fraction,
            basis.trays.downcomer_fraction))
        per_d2, volume = flooding_terms(m, j)
        assert pyo.value(m.diameter) ** 2 * pyo.value(per_d2) >= pyo.value(volume) * (1 - 1e-6)
    assert pyo.value(m.diameter) == pytest.approx(worst, rel=1e-5)


def test_stage_temperatures_bounded_to_fitted_range(problem, basis):
    """Every stage temperature and the distillate bubble point are bounded to the fitted range."""
    m = build_column_model(problem, basis, 12, 6, {"max_stages": MAX})
    bounds = {m.T[j].bounds for j in m.J} | {m.TD.bounds}
    assert bounds == {(problem.fitted.T_low, problem.fitted.T_high)}


def test_every_variable_bounded(problem, basis):
    """No variable is left without both bounds."""
    m = build_column_model(problem, basis, 12, 6, {"max_stages": MAX, "energy_balances": True})
    loose = [v.name for v in m.component_data_objects(pyo.Var) if v.lb is None or v.ub is None]
    assert loose == []


def test_energy_balances_close_to_constant_molar_overflow(problem, basis):
    """Benzene-toluene has near-equal latent heats, so the two forms agree on TAC within 5 %
    (measured: 1.3 %); a regression pin that both forms solve, not a validation."""
    cmo = solve_configuration(problem, basis, 18, 9, {"max_stages": MAX, "energy_balances": False})
    rigorous = solve_configuration(problem, basis, 18, 9, {"max_stages": MAX})
    assert rigorous.tac == pytest.approx(cmo.tac, rel=0.05)
    assert rigorous.profile.model == "rigorous" and cmo.profile.model == "cmo"


def test_specifications_met_at_solution(solved, problem):
    """The solved column meets both product specifications (within the shortfall tolerance)."""
    m = solved
    assert pyo.value(m.x[m.N, 0]) <= 0.05 * (1 + 1e-6)
    assert pyo.value(m.y[1, 1]) <= 0.05 * (1 + 1e-6)


def test_too_few_stages_is_infeasible_in_words(problem, basis):
    """Below the minimum stages the configuration is reported infeasible, naming what to change."""
    with pytest.raises(InfeasibleSpecError, match="more stages or more reflux"):
        solve_configuration(problem, basis, 6, 3, {"max_stages": MAX})


def test_unknown_solver_is_a_solver_error(problem, basis):
    """A solver that is not installed gives SolverError naming the default."""
    with pytest.raises(SolverError, match="not available"):
        solve_configuration(problem, basis, 12, 6, {"max_stages": MAX, "solver": "no-such-solver"})


def test_iteration_limit_is_a_solver_error(problem, basis):
    """Stopping at the iteration limit is never passed on as a design."""
    config = model_options({"max_stages": MAX, "max_iterations": 1})
    m = build_column_model(problem, basis, 12, 6, config)
    initialise(m, start_profile(problem, 12, 6))
    with pytest.raises(SolverError, match="iteration"):
        run_solver(m, config)


def test_attempt_plan_orders_strategies_and_caps_all_but_the_last():
    """Each barrier strategy from the Gilliland start (quick cap), then the last one from the retry starts."""
    config = model_options({"quick_iterations": 40, "max_iterations": 300})
    assert attempts(config, None, retries=True) == [
        (1.0, "monotone", 40), (1.0, "adaptive", 40), (1.5, "adaptive", 40), (3.0, "adaptive", 300)]
    assert attempts(config, ("adaptive", "monotone"), retries=False) == [(1.0, "adaptive", 40), (1.0, "monotone", 300)]
    assert attempts(model_options({"solver": "scip_direct"}), None, retries=False) == [(1.0, None, 300)]


def test_unknown_barrier_strategy_is_refused_by_name():
    with pytest.raises(ValueError, match="barrier_strategies: \\['fast'\\] not among"):
        model_options({"barrier_strategies": ("monotone", "fast")})


@pytest.mark.parametrize("strategy", ["monotone", "adaptive"])
def test_both_barrier_strategies_reach_the_same_optimum(problem, basis, solved, strategy):
    """The optimum of one configuration does not depend on the barrier strategy that found it."""
    model, report = solved_model(problem, basis, 18, 9, {"max_stages": MAX, "barrier_strategies": (strategy,)})
    assert report.barrier == strategy
    assert pyo.value(model.tac) == pytest.approx(pyo.value(solved.tac), rel=1e-6)
    assert pyo.value(model.R) == pytest.approx(pyo.value(solved.R), rel=1e-4)
