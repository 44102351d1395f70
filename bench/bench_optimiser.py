"""Optimiser against exhaustive enumeration of the same model, in one run.

Both solve configurations with the same model, solver, options and start, so the time
ratio is honest. Prints, per case: the optimiser's and the enumeration's best
configuration, TAC difference, wall times, their ratio and configurations solved.

    python bench/bench_optimiser.py                  # all cases, one after the other (about an hour)
    python bench/bench_optimiser.py --only binary100 # one group (binary, binary100, multi)
    python bench/bench_optimiser.py --quick          # binary at 20 and 40 stages only
    python bench/bench_optimiser.py --only c4        # butane super-fractionator, window enumeration

The butane splitter (examples/c4_splitter.toml) is searched at its default stage bound
(4.5 x the Fenske minimum, about 130 stages). Enumerating all of its ~8,500 configurations
would take hours here, so it is compared with a *partial* enumeration: every configuration in
a window of +-WINDOW_STAGES stages and +-WINDOW_FEED feed stages around the optimiser's
answer. Equal TACs there show the answer is the best of its surroundings, not the global best.
"""

from __future__ import annotations

import argparse
import os
import platform
import sys
import time

import pyomo
import pyomo.environ as pyo

from machine_facts import cpu_model

from disteco.case import load_case, parse_case
from disteco.costing.data import load_cost_data
from disteco.optimisation.design import model_cost_basis, resolved_problem
from disteco.optimisation.enumerate import enumerate_designs
from disteco.optimisation.options import model_options
from disteco.optimisation.search import Evaluator, optimise
from disteco.properties import build_mixture, feed_state
from disteco.sizing.options import SizingOptions

EXAMPLES = os.path.join(os.path.dirname(__file__), "..", "examples")

# Invented demo feed: a three-component aromatics cut, benzene/toluene split.
THREE_COMPONENTS = {
    "title": "bench: benzene-toluene-o-xylene",
    "mixture": {"components": ["benzene", "toluene", "o-xylene"], "method": "ideal"},
    "feed": {"flow": "150 kmol/h", "composition": [0.35, 0.40, 0.25], "q": 1.0},
    "column": {"top_pressure": "1.2 bar", "pressure_drop_per_tray": "0.7 kPa"},
    "products": {"light_key": "benzene", "heavy_key": "toluene",
                 "light_key_recovery": 0.98, "heavy_key_recovery": 0.98},
}


def machine() -> str:
    cpu = cpu_model()
    return (f"nproc {os.cpu_count()}, CPU {cpu}, Python {platform.python_version()}, Pyomo {pyomo.version.version}, "
            f"solver ripopt available: {pyo.SolverFactory('ripopt').available(exception_flag=False)}")


def optimised(case, options: dict, max_stages: int | None):
    """(problem, basis, options, optimum, optimiser time [s]) at ``max_stages`` (None: the Fenske-based default)."""
    mixture = build_mixture(case.components, case.thermo, case.column.top_pressure)
    feed = feed_state(case.feed, mixture, case.column.top_pressure)
    config = model_options({**options, "max_stages": max_stages})
    problem = resolved_problem(case, mixture, feed, config)
    basis, _ = model_cost_basis(problem, mixture, load_cost_data(), SizingOptions(), None,
                                case.economics.cost_year, config)
    start = time.perf_counter()
    found = optimise(problem, basis, config)
    return problem, basis, config, found, time.perf_counter() - start


def run(label: str, case, max_stages: int, options: dict) -> None:
    problem, basis, config, found, t_opt = optimised(case, options, max_stages)
    start = time.perf_counter()
    full = enumerate_designs(problem, basis, config, reflux_points=7)
    t_enum = time.perf_counter() - start
    grid_best = min([tac for _, tac in full.reflux_grid] + [full.best.tac])
    diff = 100.0 * (found.best.tac - grid_best) / grid_best
    b, e = found.best, full.best
    print(f"{label:<34} opt N={b.stages:3d} NF={b.feed_stage:3d} R={b.reflux_ratio:7.4f} "
          f"(R/Rmin {b.reflux_ratio / found.minimum_reflux_ratio:5.3f}) TAC={b.tac:12.1f} {t_opt:7.2f} s "
          f"{found.solver.configurations_solved:4d} cfg | enum N={e.stages:3d} NF={e.feed_stage:3d} "
          f"TAC={e.tac:12.1f} {t_enum:8.2f} s {len(full.visited):5d} cfg | dTAC {diff:+.4f} % "
          f"ratio {t_enum / t_opt:6.1f}x", flush=True)


WINDOW_STAGES, WINDOW_FEED = 5, 6


def run_window(label: str, case, options: dict) -> None:
    """Optimiser at the default (Fenske-based) stage bound against a window enumeration around its answer."""
    problem, basis, config, found, t_opt = optimised(case, options, None)
    max_stages = config.max_stages
    b = found.best
    evaluator = Evaluator(problem, basis, config, deadline=float("inf"), low=3, warm_starts=False)
    start = time.perf_counter()
    for n in range(b.stages - WINDOW_STAGES, b.stages + WINDOW_STAGES + 1):
        for f in range(b.feed_stage - WINDOW_FEED, b.feed_stage + WINDOW_FEED + 1):
            if evaluator.allowed(n, f):
                evaluator.tac(n, f)
    t_enum = time.perf_counter() - start
    (n_e, f_e) = evaluator.best()
    tac_e = evaluator.designs[(n_e, f_e)]
    per_config = t_enum / len(evaluator.designs)
    full = sum(n - 2 for n in range(3, max_stages + 1))  # every (N, NF) with 2 <= NF <= N - 1
    print(f"{label:<34} bound {max_stages} (Fenske {found.minimum_stages:.1f}) opt N={b.stages:3d} NF={b.feed_stage:3d} "
          f"R={b.reflux_ratio:7.4f} TAC={b.tac:12.1f} {t_opt:7.2f} s {found.solver.configurations_solved:4d} cfg "
          f"[{found.solver.status}] | window enum N={n_e:3d} NF={f_e:3d} TAC={tac_e:12.1f} {t_enum:8.2f} s "
          f"{len(evaluator.designs):5d} cfg, {len(evaluator.failures)} failed | dTAC "
          f"{100.0 * (b.tac - tac_e) / tac_e:+.4f} % | full enumeration ~{full} cfg, about "
          f"{full * per_config / 3600:.1f} h at {per_config:.2f} s each: ratio ~{full * per_config / t_opt:.0f}x "
          "(estimated)", flush=True)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--quick", action="store_true")
    parser.add_argument("--cmo", action="store_true", help="constant molar overflow instead of stage energy balances")
    parser.add_argument("--only", choices=("binary", "binary100", "multi", "three", "five", "c4"),
                        help="binary: 20-60 stages; binary100: 100 stages; multi: 3 and 5 components; "
                             "three or five: one of them; c4: the butane super-fractionator")
    args = parser.parse_args()
    options = {"energy_balances": not args.cmo}
    print(machine())
    print(f"model: {'constant molar overflow' if args.cmo else 'stage energy balances'}; "
          "TAC in the cost data's currency per year; reference price scenario")
    if args.only == "c4":
        run_window("butane splitter (super-fractionator)", load_case(os.path.join(EXAMPLES, "c4_splitter.toml")),
                   options)
        return
    binary = load_case(os.path.join(EXAMPLES, "aromatics_binary.toml"))
    if args.quick:
        stage_counts = (20, 40)
    else:
        stage_counts = {"binary": (20, 40, 60), "binary100": (100,)}.get(args.only, () if args.only else (20, 40, 60, 100))
    for max_stages in stage_counts:
        run(f"binary benzene-toluene, {max_stages} max", binary, max_stages, options)
    if args.quick or args.only in ("binary", "binary100"):
        return
    if args.only != "five":
        run("3 components (aromatics), 40 max", parse_case(THREE_COMPONENTS), 40, options)
    if args.only != "three":
        run("5 components (depentaniser), 30 max", load_case(os.path.join(EXAMPLES, "depentaniser.toml")), 30,
            options)
    if args.only is None:
        run_window("butane splitter (super-fractionator)", load_case(os.path.join(EXAMPLES, "c4_splitter.toml")),
                   options)


if __name__ == "__main__":
    sys.exit(main())
