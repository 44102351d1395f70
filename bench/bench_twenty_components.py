"""The twenty-component naphtha debutaniser (tests/cases/twenty_component_debutaniser.toml).

Compares, in one run: the two barrier strategies on the search's first configuration (17
stages, feed on 8) from the same start, and the whole `disteco design` command (wall time,
exit code, the design found). Prints ratios and the machine's facts.

    python bench/bench_twenty_components.py
"""

from __future__ import annotations

import subprocess
import sys
import tempfile
import time
from pathlib import Path

from disteco.optimisation.solve import solved_model
from disteco._base.errors import SolverError

from bench_optimiser import machine

sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "tests"))
from test_many_components import CASE, problem_and_basis  # noqa: E402

MAX = 60


def one_configuration(strategy: str) -> tuple[float, str]:
    problem, basis = problem_and_basis(MAX)
    options = {"max_stages": MAX, "barrier_strategies": (strategy,), "configuration_time_limit": 20.0}
    began = time.perf_counter()
    try:
        _, report = solved_model(problem, basis, 17, 8, options)
        outcome = report.status
    except SolverError as exc:
        outcome = f"failed: {exc}"
    return time.perf_counter() - began, outcome


def main() -> None:
    print(machine())
    times = {}
    for strategy in ("adaptive", "monotone"):
        times[strategy], outcome = one_configuration(strategy)
        print(f"N=17 NF=8, {strategy:9s}: {times[strategy]:6.1f} s  {outcome}")
    print(f"monotone / adaptive time: {times['monotone'] / times['adaptive']:.1f}")
    with tempfile.TemporaryDirectory() as out:
        began = time.perf_counter()
        run = subprocess.run([sys.executable, "-m", "disteco.cli", "design", str(CASE), "--out", out, "--no-figures",
                              "--time-limit", "60"], capture_output=True, text=True)
        wall = time.perf_counter() - began
    design = [line for line in run.stdout.splitlines() if "reflux" in line.lower()][:3]
    print(f"disteco design: exit {run.returncode}, {wall:.1f} s wall")
    print("\n".join(design) or run.stderr.strip()[-500:])


if __name__ == "__main__":
    main()
