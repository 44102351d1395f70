"""The design command's speed, this source against another revision's, in one run.

Exports ``--base`` (a git revision, default main) with ``git archive`` into a temporary
folder and runs the same measurement on it and on this working tree, alternately
(``--repeats`` times each), each in a fresh interpreter with that source first on the path.
Prints per example and revision: ``disteco check`` and ``disteco design`` (figures
included) wall and CPU time (the solver's processes included), the optimisation's and the
TAC curve's CPU time, NLP solves (tries included) and curve points, the optimum; then the
ratios new / base and the machine's facts. On a shared machine compare the ratios, not the absolute times.

    python bench/bench_speed.py                          # binary example, base main
    python bench/bench_speed.py --examples aromatics_binary ethanol_water depentaniser --repeats 2
    python bench/bench_speed.py --examples bench/cases/propylene_splitter.toml   # a case file by path
"""

from __future__ import annotations

import argparse
import json
import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

from machine_facts import facts

ROOT = Path(__file__).resolve().parents[1]

# Runs in the child: measures one revision (the one first on sys.path).
CHILD = r'''
import json, os, sys, time
def cpu():
    t = os.times()
    return t.user + t.system + t.children_user + t.children_system
case_path, out = sys.argv[1], sys.argv[2]
import disteco.optimisation.solve as solve
solves = [0]
original = solve.run_solver
def counted(*args, **kwargs):  # every NLP solve, failed tries included
    solves[0] += 1
    return original(*args, **kwargs)
solve.run_solver = counted
from disteco import api
from disteco.optimisation.curves import reflux_curve
from disteco.optimisation.design import optimise_design
from disteco.properties import feed_state
from disteco.sizing.options import SizingOptions
from disteco.stages import design_stages
case = api.load_case(case_path)
mixture, data = api.mixture_of(case), api.cost_data_of(case)
feed = feed_state(case.feed, mixture, case.column.top_pressure)
stages = design_stages(mixture, feed, case.products, case.column)
sizing = SizingOptions(light_key=case.products.light_key, heavy_key=case.products.heavy_key)
name = case.economics.scenarios[0] if case.economics.scenarios else None
t = cpu()
optimum = optimise_design(case, mixture, feed, data, None, sizing, name)
t_opt, n_opt = cpu() - t, solves[0]
t = cpu()
curve = reflux_curve(case, mixture, feed, data, optimum, stages.table, None, sizing, name)
t_curve, n_curve = cpu() - t, solves[0] - n_opt
b = optimum.best
json.dump({"optimise_cpu": t_opt, "optimise_solves": n_opt, "curve_cpu": t_curve, "curve_solves": n_curve,
           "curve_points": len(curve), "R": b.reflux_ratio, "N": b.stages, "NF": b.feed_stage,
           "TAC": optimum.sequential.cost.tac_per_year}, open(out, "w"))
'''


def timed(command: list[str], env: dict) -> tuple[float, float]:
    """(wall, CPU of the child and its children) [s] of ``command``; raises when it fails."""
    before = os.times()
    start = time.perf_counter()
    subprocess.run(command, env=env, check=True, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    wall = time.perf_counter() - start
    after = os.times()
    return wall, (after.children_user + after.children_system) - (before.children_user + before.children_system)


def measure(source: Path, example: Path, scratch: Path) -> dict:
    env = {**os.environ, "PYTHONPATH": str(source)}
    py = [sys.executable]
    found = {}
    found["check_wall"], found["check_cpu"] = timed(py + ["-m", "disteco.cli", "check", str(example)], env)
    found["design_wall"], found["design_cpu"] = timed(
        py + ["-m", "disteco.cli", "design", str(example), "-q", "-o", str(scratch / "out")], env)
    out = scratch / "parts.json"
    subprocess.run(py + ["-c", CHILD, str(example), str(out)], env=env, check=True, stdout=subprocess.DEVNULL,
                   stderr=subprocess.DEVNULL)
    found.update(json.loads(out.read_text()))
    return found


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--base", default="main", help="git revision to compare with (default main)")
    parser.add_argument("--examples", nargs="+", default=["aromatics_binary"])
    parser.add_argument("--repeats", type=int, default=1)
    parser.add_argument("--tree", type=Path, default=ROOT / "src",
                        help="source folder to measure against the base (default: this tree's src)")
    args = parser.parse_args()
    print(facts(), flush=True)
    with tempfile.TemporaryDirectory() as tmp:
        base = Path(tmp) / "base"
        base.mkdir()
        archive = subprocess.run(["git", "-C", str(ROOT), "archive", args.base, "src"], check=True,
                                 capture_output=True).stdout
        subprocess.run(["tar", "-x", "-C", str(base)], input=archive, check=True)
        sources = {args.base: base / "src", "this tree": args.tree}
        for name in args.examples:
            example = Path(name).resolve() if name.endswith(".toml") else ROOT / "examples" / f"{name}.toml"
            runs = {label: [] for label in sources}
            for _ in range(args.repeats):
                for label, source in sources.items():  # interleaved, so both see the same load
                    runs[label].append(measure(source, example, Path(tmp)))
            print(f"\n{name}")
            keys = ("check_wall", "check_cpu", "design_wall", "design_cpu", "optimise_cpu", "curve_cpu")
            for label, found in runs.items():
                mean = {k: sum(r[k] for r in found) / len(found) for k in keys}
                last = found[-1]
                print(f"  {label:<10} check {mean['check_wall']:5.1f} s wall {mean['check_cpu']:5.1f} s CPU | design "
                      f"{mean['design_wall']:6.1f} s wall {mean['design_cpu']:6.1f} s CPU | optimise "
                      f"{mean['optimise_cpu']:5.1f} s CPU {last['optimise_solves']} solves | curve "
                      f"{mean['curve_cpu']:5.1f} s CPU {last['curve_solves']} solves {last['curve_points']} points | "
                      f"R {last['R']:.4f} N {last['N']} NF {last['NF']} TAC {last['TAC']:,.0f}")
                runs[label] = mean | {"curve_over_optimise": mean["curve_cpu"] / mean["optimise_cpu"],
                                      "TAC": last["TAC"]}
            old, new = runs[args.base], runs["this tree"]
            print("  ratios this tree / base: " + ", ".join(f"{k} {new[k] / old[k]:.2f}" for k in keys)
                  + f"; curve/optimise CPU {old['curve_over_optimise']:.2f} -> {new['curve_over_optimise']:.2f}"
                  + f"; TAC {100 * (new['TAC'] / old['TAC'] - 1):+.3f} %", flush=True)
    print(facts())


if __name__ == "__main__":
    main()
