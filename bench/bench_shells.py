"""Shell layouts of the examples: one shell within the limits, two shells, more stages.

For each example (or those named on the command line) the optimum is found with the limits
inside the search (SizingOptions defaults: 50 m, height-to-diameter 30, spacings 0.45-0.75 m)
and compared with the same case optimised as before (one shell, 24 in spacing, no limits: the
limits set to infinity and the spacing list to the one old spacing). Prints the layouts, the
limits that bind, the TACs and their ratio, and the wall time of both runs.

    .venv/bin/python bench/bench_shells.py ethanol_water c4_splitter styrene_vacuum

With ``--spacing NAME`` it checks the tray-spacing choice instead: the optimum with the spacing
chosen from the standard list against optima searched at each spacing of the list alone (an
enumeration with stages, feed and reflux re-optimised at every spacing); the chosen TAC should be
within 0.1 % of the best of the enumeration.
"""

import math
import os
import platform
import sys
import time
from pathlib import Path

from disteco.api import cost_data_of, mixture_of
from disteco.case import load_case
from disteco.optimisation.design import optimise_design
from disteco.properties import feed_state
from disteco.sizing.options import INCH, SizingOptions

EXAMPLES = Path(__file__).resolve().parent.parent / "examples"


def run(name: str, sizing: SizingOptions):
    case = load_case(EXAMPLES / f"{name}.toml")
    mixture = mixture_of(case)
    feed = feed_state(case.feed, mixture, case.column.top_pressure)
    sizing = SizingOptions(**{**sizing.__dict__, "light_key": case.products.light_key,
                              "heavy_key": case.products.heavy_key})
    clock = time.perf_counter()
    optimum = optimise_design(case, mixture, feed, cost_data_of(case), None, sizing)
    return optimum, time.perf_counter() - clock


def describe(optimum) -> str:
    sized = optimum.sequential.sizing
    tall = sized.tallest_shell
    return (f"N={optimum.best.stages} NF={optimum.best.feed_stage} R={optimum.best.reflux_ratio:.3f} "
            f"shells={sized.shells} spacing={tall.tray_spacing:.2f} m D={sized.diameter:.2f} m "
            f"tallest={tall.tangent_length:.1f} m H/D={tall.tangent_length / sized.diameter:.1f} "
            f"TAC={optimum.sequential.cost.tac_per_year:,.0f}")


def main(names):
    print(f"machine: {platform.processor() or platform.machine()}, {os.cpu_count()} cores, Python "
          f"{platform.python_version()}")
    old = SizingOptions(max_height=math.inf, max_height_to_diameter=math.inf, tray_spacings=(24 * INCH,))
    for name in names:
        limited, t_new = run(name, SizingOptions())
        free, t_old = run(name, old)
        layout = limited.layout
        print(f"\n{name}")
        print(f"  without limits (24 in): {describe(free)}  [{t_old:.0f} s]")
        print(f"  with limits:            {describe(limited)}  [{t_new:.0f} s]")
        print(f"  chosen: {layout.chosen}; binding: {', '.join(layout.binding) or 'none'}; why: {layout.why}")
        for option in layout.options:
            print(f"    {option.label}: TAC {option.tac if option.tac is None else f'{option.tac:,.0f}'} {option.note}")
        print("  spacings at the optimum: " + ", ".join(
            f"{p.spacing:.2f} m: {'too tall' if p.tac is None else f'{p.tac:,.0f}'}" for p in layout.spacings))
        ratio = limited.sequential.cost.tac_per_year / free.sequential.cost.tac_per_year
        print(f"  TAC with limits / without: {ratio:.4f}; unconstrained (priced as one shell): "
              f"{layout.unconstrained_tac:,.0f}; time ratio {t_new / t_old:.2f}")


def spacing_enumeration(name: str):
    chosen, t_chosen = run(name, SizingOptions())
    print(f"{name}: chosen {describe(chosen)}  [{t_chosen:.0f} s]")
    best = None
    for spacing in SizingOptions().spacing_candidates:
        alone, t = run(name, SizingOptions(tray_spacing=spacing, tray_spacings=(spacing,)))
        print(f"  only {spacing:.2f} m: {describe(alone)}  [{t:.0f} s]")
        tac = alone.sequential.cost.tac_per_year
        if best is None or tac < best[1]:
            best = (spacing, tac)
    tac = chosen.sequential.cost.tac_per_year
    print(f"  best of the enumeration: {best[0]:.2f} m, TAC {best[1]:,.0f}; chosen / best = {tac / best[1]:.5f}")


if __name__ == "__main__":
    if sys.argv[1:2] == ["--spacing"]:
        spacing_enumeration(sys.argv[2] if len(sys.argv) > 2 else "aromatics_binary")
    else:
        main(sys.argv[1:] or ["ethanol_water", "c4_splitter", "styrene_vacuum"])
