"""Shared set-up of the optimisation tests and benchmark: example problems and their cost basis.

Not a test module itself; the cost basis comes from the bundled cost data through the
sizing and costing layers, as in a design run.
"""

from __future__ import annotations

from dataclasses import replace
from functools import lru_cache
from pathlib import Path

from disteco.case import EndSpec, load_case
from disteco.costing.data import load_cost_data
from disteco.optimisation.basis import CostBasis, SeparationProblem
from disteco.optimisation.design import model_cost_basis, separation_problem
from disteco.optimisation.options import model_options
from disteco.properties import build_mixture, feed_state
from disteco.sizing.options import SizingOptions

EXAMPLES = Path(__file__).resolve().parents[1] / "examples"


@lru_cache(maxsize=8)
def example(name: str):
    """(case, mixture, feed state) of ``examples/<name>.toml``."""
    case = load_case(EXAMPLES / f"{name}.toml")
    mixture = build_mixture(case.components, case.thermo, case.column.top_pressure)
    return case, mixture, feed_state(case.feed, mixture, case.column.top_pressure)


@lru_cache(maxsize=16)
def example_problem(name: str, max_stages: int = 60, light: EndSpec | None = None,
                    heavy: EndSpec | None = None) -> SeparationProblem:
    """The separation problem of an example, optionally with other product specifications."""
    case, mixture, feed = example(name)
    problem = separation_problem(case, mixture, feed, max_stages)
    if light is not None:
        problem = replace(problem, light_key_spec=light, heavy_key_spec=heavy)
    return problem


@lru_cache(maxsize=16)
def example_basis(name: str, max_stages: int = 60, light: EndSpec | None = None, heavy: EndSpec | None = None,
                  scenario: str | None = None) -> CostBasis:
    """The cost basis of an example from the bundled cost data (reference price scenario by default)."""
    case, mixture, _ = example(name)
    problem = example_problem(name, max_stages, light, heavy)
    basis, _ = model_cost_basis(problem, mixture, load_cost_data(), SizingOptions(), scenario,
                                case.economics.cost_year, model_options({"max_stages": max_stages}))
    return basis


EASY_SPLIT = (EndSpec("fraction", 0.05), EndSpec("fraction", 0.05))  # 95 % benzene overhead, 5 % in the bottoms
