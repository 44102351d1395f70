"""Solver effort on one configuration from the constant-molar-overflow start against a naive start.

The naive start has the feed composition on every stage, temperatures linear between the
lightest and heaviest boiling points and constant-molar-overflow flows. Prints ripopt's
iterations, wall time and status for each example, with CMO and with energy balances.

    python bench/bench_start_quality.py
"""

from __future__ import annotations

import os
import re
import time

import numpy as np
from pyomo.common.tee import capture_output

from disteco.case import load_case, parse_case
from disteco.costing.data import load_cost_data
from disteco.optimisation.design import model_cost_basis, separation_problem
from disteco.optimisation.model import build_column_model, initialise
from disteco.optimisation.options import model_options
from disteco.optimisation.solve import make_solver
from disteco.optimisation.start import start_profile
from disteco.optimisation.start import Profile, cmo_flows, gilliland_reflux, shortcut
from disteco.properties import build_mixture, feed_state
from disteco.sizing.options import SizingOptions

from bench_optimiser import EXAMPLES, THREE_COMPONENTS, machine

CASES = (("binary benzene-toluene", "aromatics_binary", 31, 15),
         ("ethanol-water (NRTL fit)", "ethanol_water", 39, 33),
         ("3 components (aromatics)", THREE_COMPONENTS, 30, 14),
         ("5 components (depentaniser)", "depentaniser", 30, 15))


def naive_start(problem, stages: int, feed_stage: int) -> Profile:
    estimate = shortcut(problem)
    R, D = gilliland_reflux(stages, estimate), float(sum(estimate.distillate))
    L, V = cmo_flows(problem, stages, feed_stage, R, D)
    f = problem.fitted
    T = np.linspace(f.T_low, f.T_high, stages)
    x = np.tile(problem.z, (stages, 1))
    return Profile(R, D, T, x, x.copy(), L, V)


def solve(problem, basis, stages, feed_stage, options, start) -> str:
    config = model_options({**options, "max_iterations": 3000})
    model = build_column_model(problem, basis, stages, feed_stage, config)
    initialise(model, start)
    solver = make_solver("ripopt", 60.0, 3000, 1e-4)
    began = time.perf_counter()
    with capture_output() as log:
        results = solver.solve(model, tee=True, load_solutions=False)
    wall = time.perf_counter() - began
    found = re.search(r"Number of Iterations\.*:\s*(\d+)", log.getvalue())
    iterations = found.group(1) if found else "?"
    return f"{iterations:>5} it {wall:6.2f} s {results.solver.termination_condition}"


def main() -> None:
    print(machine())
    data = load_cost_data()
    for label, source, stages, feed_stage in CASES:
        case = parse_case(source) if isinstance(source, dict) else load_case(os.path.join(EXAMPLES, f"{source}.toml"))
        mixture = build_mixture(case.components, case.thermo, case.column.top_pressure)
        feed = feed_state(case.feed, mixture, case.column.top_pressure)
        for energy in (False, True):
            options = {"max_stages": 60, "energy_balances": energy}
            problem = separation_problem(case, mixture, feed, 60)
            basis, _ = model_cost_basis(problem, mixture, data, SizingOptions(), None, case.economics.cost_year,
                                        model_options(options))
            good = solve(problem, basis, stages, feed_stage, options, start_profile(problem, stages, feed_stage))
            naive = solve(problem, basis, stages, feed_stage, options, naive_start(problem, stages, feed_stage))
            print(f"{label:<30} N={stages} NF={feed_stage} {'energy' if energy else 'CMO   '} | "
                  f"CMO-profile start: {good} | naive start: {naive}", flush=True)


if __name__ == "__main__":
    main()
