"""One copy of the physics: the equation model and the sequential re-price agree to 1e-9 on random designs.

For each drawn design (example, stages, feed stage, reflux, flooding fit, tray type, tray
spacing, approach to flood, condenser kind) the model is built on a cost basis frozen at
that design, its variables are set to the design's profile, and every size and cost
expression is compared with the sizing and costing layers run on the same profile with
the same options and the same (fitted) properties, the diameter not rounded up. Equal to
1e-9 relative: the two paths evaluate the same functions. A regression guard on the
structure, not a validation against an outside source.
"""

import random
from dataclasses import replace

import pyomo.environ as pyo
import pytest

from disteco.costing.data import load_cost_data
from disteco.optimisation.fitted_sizing import FittedSizingProperties
from disteco.optimisation.model import build_column_model, initialise
from disteco.optimisation.pricing import cost_basis_from_data, price_design, stage_profile
from disteco.optimisation.results import SolverReport
from disteco.optimisation.solve import read_design
from disteco.optimisation.start import start_profile
from disteco.sizing.flooding import FLOODING_METHODS
from disteco.sizing.options import TRAY_TYPES, SizingOptions
from test_optimisation_support import example, example_problem

REL = 1e-9
DRAWS = 8
INCH = 0.0254


def _draws():
    """Designs and options drawn at random (fixed seed); every fit, tray type and condenser kind appears."""
    rng = random.Random(20261202)
    methods, trays = sorted(FLOODING_METHODS), list(TRAY_TYPES)
    for k in range(DRAWS):
        stages = rng.randint(14, 30)
        yield pytest.param(
            rng.choice(["aromatics_binary", "depentaniser"]), stages, rng.randint(4, stages - 4),
            rng.uniform(1.2, 2.5), methods[k % len(methods)], trays[(k // 2) % len(trays)],
            rng.choice([18, 24, 30]) * INCH, rng.uniform(0.7, 0.85), k % 4 >= 2, id=f"draw{k}")


@pytest.mark.parametrize("name, stages, feed, factor, method, tray, spacing, flood, partial", list(_draws()))
def test_model_expressions_equal_the_re_price(name, stages, feed, factor, method, tray, spacing, flood, partial):
    _, mixture, _ = example(name)
    problem = replace(example_problem(name, 40), partial_condenser=partial)
    start = start_profile(problem, stages, feed, factor=factor)
    properties = FittedSizingProperties(problem.fitted, mixture)
    options = SizingOptions(flooding_method=method, tray_type=tray, tray_spacing=spacing, flood_fraction=flood,
                            light_key=problem.light_key, heavy_key=problem.heavy_key)
    data = load_cost_data()
    basis, _ = cost_basis_from_data(data, properties, stage_profile(problem, start, feed), options, None, 2023)
    m = build_column_model(problem, basis, stages, feed, {"max_stages": 40, "energy_balances": False})
    initialise(m, start)
    design = read_design(m, SolverReport("none", "fixed", "none", None, 0.0))
    priced = price_design(design, properties, data, options, None, 2023, round_diameter=False)
    sizing, cost = priced.sizing, priced.cost
    installed = {e.item: e.installed for e in cost.items}
    utilities = {u.item: u.cost_per_year for u in cost.utilities}
    v = pyo.value
    pairs = {
        "diameter": (v(m.diameter), sizing.diameter),
        "tangent height": (m.height, sizing.height.tangent_length),
        "condenser area": (v(m.condenser_area), sizing.condenser.area),
        "reboiler area": (v(m.reboiler_area), sizing.reboiler.area),
        "drum volume": (v(m.drum_volume), sizing.reflux_drum.volume),
        "pump power": (v(m.pump_power), sizing.reflux_pump.shaft_power),
        "column shell": (v(m.cost_shell), installed["column shell"]),
        "trays": (v(m.cost_trays), installed["trays"]),
        "condenser": (v(m.cost_condenser), installed["condenser"]),
        "reboiler": (v(m.cost_reboiler), installed["reboiler"]),
        "reflux drum": (v(m.cost_drum), installed["reflux drum"]),
        "reflux pump": (v(m.cost_pump), installed["reflux pump"]),
        "condenser utility": (v(m.condenser_utility), utilities["condenser"]),
        "reboiler utility": (v(m.reboiler_utility), utilities["reboiler"]),
        "pump electricity": (v(m.pump_utility), utilities["reflux pump"]),
        "capital": (v(m.capital), cost.capital_installed),
        "TAC": (v(m.tac), cost.tac_per_year),
    }
    off = {key: (a, b) for key, (a, b) in pairs.items() if a != pytest.approx(b, rel=REL)}
    assert off == {}
    assert sizing.reboiler.exchanger_type in ("kettle", "thermosiphon")
    assert sizing.real_trays == m.real_trays
