"""The equation model of one configuration: flooding at a solution, bounds, termination mapping.

The model's sizes and costs are the sizing and costing layers' own functions; their equality
with the re-price over random designs is tests/test_one_copy.py.
"""

import math

import pyomo.environ as pyo
import pytest

from disteco._base.errors import InfeasibleSpecError, SolverError
from disteco.optimisation.fitted_sizing import vapour_density
from disteco.optimisation.model import build_column_model, initialise, watch_flooding
from disteco.optimisation.solve import attempts, make_solver, run_solver, solve_configuration, solved_model
from disteco.optimisation.start import start_profile
from disteco.optimisation.options import model_options
from disteco.sizing.flooding import required_tray_area
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


def test_flooding_at_solution_is_the_sizing_layers_area(solved, basis):
    """At a solved design the diameter is the one the sizing layer's area function requires at the
    tray that governs, evaluated with the model's own properties (Fair via Lygeros-Magoulas)."""
    m = solved
    f = m.problem.fitted
    worst = 0.0
    for j in m.TRAYS:
        x = [pyo.value(m.x[j, i]) for i in m.C]
        y = [pyo.value(m.y[j, i]) for i in m.C]
        T = pyo.value(m.T[j])
        area = required_tray_area(
            pyo.value(m.V[j]) * f.molar_mass(y), pyo.value(m.L[j]) * f.molar_mass(x), pyo.value(m.rho_L[j]),
            pyo.value(m.rho_V[j]), f.surface_tension_of(T, x), basis.trays.tray_spacing,
            basis.trays.flooding_fraction, basis.trays.flooding_method, basis.trays.system_factor,
            basis.trays.downcomer_fraction)
        assert pyo.value(m.required_area[j]) == pytest.approx(area, rel=1e-12)
        worst = max(worst, math.sqrt(4.0 * area / math.pi))
        assert pyo.value(m.tray_area) >= area * (1 - 1e-6)
    assert pyo.value(m.diameter) == pytest.approx(worst, rel=1e-5)


def test_vapour_density_equals_thermo_ideal_gas():
    """Ideal-gas vapour density of the model equals thermo's ideal-gas model for benzene-toluene (1e-9)."""
    _, mixture, _ = example("aromatics_binary")
    y = [0.6, 0.4]
    assert vapour_density(1.15e5, 370.0, mixture.molar_mass(y)) == pytest.approx(
        mixture.vapour_density(370.0, 1.15e5, y), rel=1e-9)


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
    with pytest.raises(InfeasibleSpecError, match="more stages, more reflux or another feed stage"):
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
    # without strategies given, a mixture of more than two components starts with adaptive
    assert [s for _, s, _ in attempts(config, None, retries=False, components=20)] == ["adaptive", "monotone"]
    assert attempts(model_options({"solver": "scip_direct"}), None, retries=False) == [(1.0, None, 300)]


def test_unknown_barrier_strategy_is_refused_by_name():
    with pytest.raises(ValueError, match="barrier_strategies: \\['fast'\\] not among"):
        model_options({"barrier_strategies": ("monotone", "fast")})


@pytest.mark.parametrize("strategy", ["monotone", "adaptive"])
def test_both_barrier_strategies_reach_the_same_optimum(problem, basis, solved, strategy):
    """The optimum of one configuration does not depend on the barrier strategy that found it (within
    1e-5 of the TAC at the default ``nlp_tolerance`` 1e-3, measured 1.9e-6 apart; 1e-6 at the solver's own
    1e-8)."""
    model, report = solved_model(problem, basis, 18, 9, {"max_stages": MAX, "barrier_strategies": (strategy,)})
    assert report.barrier == strategy
    assert pyo.value(model.tac) == pytest.approx(pyo.value(solved.tac), rel=1e-5)
    tight, _ = solved_model(problem, basis, 18, 9, {"max_stages": MAX, "barrier_strategies": (strategy,),
                                                    "nlp_tolerance": None})
    assert pyo.value(tight.tac) == pytest.approx(pyo.value(model.tac), rel=1e-5)
    assert pyo.value(model.R) == pytest.approx(pyo.value(solved.R), rel=1e-4)


def _initialised(problem, basis, config):
    model = build_column_model(problem, basis, 18, 9, config)
    initialise(model, start_profile(problem, 18, 9, None))
    return model


def test_flooding_constraints_left_out_give_the_whole_models_design(problem, basis):
    """Only the trays that can set the diameter keep their flooding constraint (model.watch_flooding: the
    three needing the largest cross-section at the start and each section's end trays, 6 of 17 here); the
    design equals the one with every constraint in the model (TAC and diameter within 1e-5, the solver's
    tolerance), and the solution meets flooding on every tray."""
    config = model_options({"max_stages": MAX})
    kept, whole = _initialised(problem, basis, config), _initialised(problem, basis, config)
    assert sum(kept.flooding[j].active for j in kept.TRAYS) == 6 < len(kept.TRAYS) == 17
    watch_flooding(whole)
    assert all(whole.flooding[j].active for j in whole.TRAYS)
    run_solver(kept, config)
    run_solver(whole, config)
    assert pyo.value(kept.tac) == pytest.approx(pyo.value(whole.tac), rel=1e-5)
    assert pyo.value(kept.diameter) == pytest.approx(pyo.value(whole.diameter), rel=1e-5)
    assert all(pyo.value(kept.tray_area * kept.allowable_velocity[j] - kept.vapour_volume[j]) >= -1e-6
               for j in kept.TRAYS)


def test_a_flooding_constraint_left_out_that_the_solution_breaks_is_added(problem, basis):
    """With only the top tray's flooding constraint in the model, the first solution sizes the column for
    the top tray while the bottom trays need more; run_solver adds the constraints it breaks and solves
    again from that solution: the diameter is the whole model's, every tray within flooding."""
    config = model_options({"max_stages": MAX})
    model, whole = _initialised(problem, basis, config), _initialised(problem, basis, config)
    for j in model.TRAYS:
        if j != 1:
            model.flooding[j].deactivate()
    watch_flooding(whole)
    run_solver(model, config)
    run_solver(whole, config)
    assert model.flooding[model.N - 1].active  # added: the bottom tray governs
    assert pyo.value(model.diameter) == pytest.approx(pyo.value(whole.diameter), rel=1e-5)
    assert pyo.value(model.tac) == pytest.approx(pyo.value(whole.tac), rel=1e-5)


def test_initial_barrier_leaves_the_optimum(problem, basis, solved):
    """The solves start from a barrier parameter of 1e-4 (option ``initial_barrier``, ripopt's ``mu_init``);
    the same configuration from the solver's own 0.1 reaches the same optimum (within the 1e-5 of the TAC
    the tolerance allows)."""
    assert model_options({}).initial_barrier == 1e-4
    assert make_solver("ripopt", 10.0, 100, 1e-4, initial_barrier=1e-4).options["mu_init"] == 1e-4
    assert "mu_init" not in make_solver("ripopt", 10.0, 100, 1e-4).options
    own, _ = solved_model(problem, basis, 18, 9, {"max_stages": MAX, "initial_barrier": None})
    assert pyo.value(own.tac) == pytest.approx(pyo.value(solved.tac), rel=1e-5)
    assert pyo.value(own.R) == pytest.approx(pyo.value(solved.R), rel=1e-4)


def test_one_solver_object_per_process_with_each_solves_own_options():
    """The solver object is kept (its executable and version looked up once), its options set anew each
    time: nothing of one solve's limits or barrier strategy reaches the next."""
    first = make_solver("ripopt", 5.0, 40, 1e-4, barrier="adaptive", tolerance=1e-3)
    made_with = dict(first.options)
    second = make_solver("ripopt", 12.0, 300, 1e-4)
    assert second is first
    assert "mu_strategy" not in second.options and "tol" not in second.options
    assert (second.options["max_iter"], second.options["max_wall_time"]) == (300, 12.0)
    assert made_with["mu_strategy"] == "adaptive" and made_with["solver"] == second.options["solver"]


def test_distillate_without_a_bubble_point_is_refused_in_words(problem, monkeypatch):
    """A top vapour the fitted forms cannot condense totally (light components at a low top pressure:
    a 20-component case with 6.6 % methane at 3 bar) is an infeasible request, not an internal error."""
    from disteco._base.errors import PropertyError
    from disteco.optimisation.pricing import total_condensate_temperature

    def no_root(self, P, x):
        raise PropertyError("no bubble point")

    monkeypatch.setattr(type(problem.fitted), "bubble_temperature", no_root)
    with pytest.raises(InfeasibleSpecError, match="cannot be condensed totally.*condenser"):
        total_condensate_temperature(problem, [0.99, 0.01])
