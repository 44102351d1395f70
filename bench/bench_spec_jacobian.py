"""Newton on the specifications: its 2 x 2 Jacobian from linearly moved columns against solved ones.

For each case the optimum is found once, verified on thermo, and then its energy-balance minimum
reflux is computed twice, alternately (``--repeats`` times each): with the specifications'
Jacobian from the converged column moved along the stage equations' own sensitivities
(``stages.rigorous.linearised_moves``, what disteco does) and from the two perturbed columns
solved by Newton (what it did before). Prints the minimum, its wall time and the column solves of
each, the ratios linear / solved and the machine's facts. On a shared machine compare the ratios.

    python bench/bench_spec_jacobian.py
    python bench/bench_spec_jacobian.py --cases aromatics_binary ethanol_water bench/cases/acetone_water.toml
"""

from __future__ import annotations

import argparse
import sys
import time
from pathlib import Path

from machine_facts import facts

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT / "src"))

import disteco.stages.specs as specs  # noqa: E402
from disteco import api  # noqa: E402
from disteco.optimisation.design import optimise_design  # noqa: E402
from disteco.optimisation.minimum_reflux import energy_balance_minimum  # noqa: E402
from disteco.optimisation.verification import verify_design  # noqa: E402
from disteco.properties import feed_state  # noqa: E402
from disteco.sizing.options import SizingOptions  # noqa: E402
from disteco.stages import shortcut_design  # noqa: E402
from disteco.stages.rigorous import linearised_moves, solve_cmo  # noqa: E402


def solved_moves(mixture, feed, spec, energy, profile, moved_specs):
    """The moved columns solved by Newton from ``profile`` (the former way)."""
    solve = specs.solve_rigorous if energy else solve_cmo  # the counted one
    return tuple(solve(mixture, feed, other, profile) for other in moved_specs)


def case_path(name: str) -> Path:
    path = Path(name)
    return path if path.suffix == ".toml" else ROOT / "examples" / f"{name}.toml"


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    parser.add_argument("--cases", nargs="+", default=["aromatics_binary", "ethanol_water", "depentaniser",
                                                       str(ROOT / "bench" / "cases" / "acetone_water.toml")])
    parser.add_argument("--repeats", type=int, default=1)
    args = parser.parse_args()
    counted = [0]
    original = specs.solve_rigorous

    def counting(*a, **k):
        counted[0] += 1
        return original(*a, **k)

    specs.solve_rigorous = counting
    print(f"{'case':<22}{'way':<8}{'minimum R':>11}{'wall [s]':>10}{'column solves':>15}")
    for name in args.cases:
        case = api.load_case(case_path(name))
        mixture, data = api.mixture_of(case), api.cost_data_of(case)
        feed = feed_state(case.feed, mixture, case.column.top_pressure)
        sizing = SizingOptions(light_key=case.products.light_key, heavy_key=case.products.heavy_key)
        design = optimise_design(case, mixture, feed, data, None, sizing).best
        shortcut = shortcut_design(mixture, feed, case.products, case.column)
        checked = verify_design(case, mixture, feed, design, shortcut, data, sizing)
        reported = checked.corrected or checked.profile
        times = {"linear": [], "solved": []}
        for _ in range(args.repeats):
            for way, moves in (("linear", linearised_moves), ("solved", solved_moves)):
                specs.linearised_moves = moves
                counted[0] = 0
                began = time.perf_counter()
                found = energy_balance_minimum(case, mixture, feed, shortcut, reported)
                wall = time.perf_counter() - began
                times[way].append(wall)
                value = "not found" if found.reflux_ratio is None else f"{found.reflux_ratio:.5f}"
                print(f"{Path(name).stem:<22}{way:<8}{value:>11}{wall:>10.2f}{counted[0]:>15}")
        specs.linearised_moves = linearised_moves
        print(f"{'':<22}ratio linear / solved wall time: {min(times['linear']) / min(times['solved']):.2f}")
    print(facts())


if __name__ == "__main__":
    main()
