"""The steam-price trend on the whole case against the small check the tests run, in one run.

For five low-pressure steam prices set as ``--price lp_steam=...`` on the benzene-toluene
example, runs (a) ``optimise_design`` on the case as the design command does (its own stage
bound, re-evaluated constants) and (b) the tests' check: one search on the 95 %/5 % split with
at most 30 stages. Prints R, stages, feed stage and TAC per price for both, whether each is
monotone (a dearer steam never raises R, the TAC always rises) and the time ratio.

    python bench/bench_steam_price.py
"""

from __future__ import annotations

import os
import sys
import time

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", "tests"))

from bench_optimiser import machine  # noqa: E402

from disteco import api  # noqa: E402
from disteco.optimisation.design import model_cost_basis, optimise_design  # noqa: E402
from disteco.optimisation.options import model_options  # noqa: E402
from disteco.optimisation.search import optimise  # noqa: E402
from disteco.properties import feed_state  # noqa: E402
from disteco.sizing.options import SizingOptions  # noqa: E402
from test_optimisation_support import EASY_SPLIT, example_problem  # noqa: E402

CASE = os.path.join(os.path.dirname(__file__), "..", "examples", "aromatics_binary.toml")
PRICES = (3.0, 5.0, 8.0, 13.0, 20.0)  # USD/GJ
SMALL_MAX = 30


def monotone(rows) -> str:
    refluxes = [r for r, _, _, _ in rows]
    tacs = [t for _, _, _, t in rows]
    reflux_ok = all(b <= a * (1 + 1e-6) for a, b in zip(refluxes, refluxes[1:]))
    tac_ok = all(b > a for a, b in zip(tacs, tacs[1:]))
    return f"reflux never rises: {reflux_ok}; TAC always rises: {tac_ok}"


def main() -> None:
    print(machine())
    case = api.load_case(CASE)
    mixture = api.mixture_of(case)
    feed = feed_state(case.feed, mixture, case.column.top_pressure)
    sizing = SizingOptions(light_key=case.products.light_key, heavy_key=case.products.heavy_key)
    problem = example_problem("aromatics_binary", SMALL_MAX, *EASY_SPLIT)
    whole, small = [], []
    whole_time = small_time = 0.0
    for price in PRICES:
        data = api.priced_cost_data(case, (f"lp_steam={price:g} USD/GJ",))
        start = time.process_time()
        best = optimise_design(case, mixture, feed, data, {}, sizing, "reference").best
        whole_time += time.process_time() - start
        whole.append((best.reflux_ratio, best.stages, best.feed_stage, best.tac))
        start = time.process_time()
        basis, _ = model_cost_basis(problem, mixture, data, SizingOptions(), "reference", case.economics.cost_year,
                                    model_options({"max_stages": SMALL_MAX}))
        best = optimise(problem, basis, {"max_stages": SMALL_MAX}).best
        small_time += time.process_time() - start
        small.append((best.reflux_ratio, best.stages, best.feed_stage, best.tac))
    for label, rows in (("whole case (optimise_design)", whole), (f"tests' check (<= {SMALL_MAX} stages)", small)):
        print(label)
        for price, (r, n, nf, tac) in zip(PRICES, rows):
            print(f"  steam {price:5.1f} USD/GJ: R {r:.4f}, {n} stages, feed {nf}, TAC {tac:,.0f} USD/year")
        print("  " + monotone(rows))
    print(f"CPU: whole case {whole_time:.1f} s, tests' check {small_time:.1f} s, ratio {whole_time / small_time:.1f} x")


if __name__ == "__main__":
    main()
