"""Shared set-up of the optimisation tests and benchmark: example problems and a stand-in cost basis.

The stand-in basis holds equipment cost-curve constants and prices of Turton et al.,
Analysis, Synthesis and Design of Chemical Processes, 4th ed. (2012), Appendix A and
Table 8.3, recalled from memory; it stands in until the model reads the costing layer's
data and only makes the tests' cost surface realistic in shape.
"""

from __future__ import annotations

from functools import lru_cache
from pathlib import Path

from disteco.case import EndSpec, load_case
from disteco.optimisation.basis import CostBasis, CostCurve, ExchangerBasis, SeparationProblem, TrayBasis
from disteco.properties import build_mixture, feed_state
from disteco.properties.fitted import fit_mixture

EXAMPLES = Path(__file__).resolve().parents[1] / "examples"
INDEX_RATIO = 800.0 / 397.0  # cost index 2024 over 2001, from memory
# Smooth Fair capacity at 0.61 m tray spacing: Lygeros and Magoulas, Hydrocarbon Processing
# 65(12) 43 (1986), C_sb = 0.0105 + 8.127e-4 TS[mm]^0.755 exp(-1.463 F_LV^0.842), from memory.
CAPACITY_24IN = (0.0105, 8.127e-4 * 609.6 ** 0.755, 1.463, 0.842)


def standin_basis(steam_price: float = 13.28e-9, capital_multiplier: float = 1.0) -> CostBasis:
    """A cost basis of recalled published constants (see the module docstring)."""
    source = "Turton et al. 4th ed., Appendix A, from memory"
    shell = CostCurve("column shell", 3.4974, 0.4485, 0.1074, "m^3", 0.3, 520.0,
                      INDEX_RATIO * capital_multiplier, 2.25 + 1.82, source)
    trays = CostCurve("sieve trays", 2.9949, 0.4465, 0.3961, "m^2", 0.07, 12.3,
                      INDEX_RATIO * capital_multiplier, 1.0, source)
    condenser = CostCurve("condenser", 4.3247, -0.3030, 0.1634, "m^2", 10.0, 1000.0,
                          INDEX_RATIO * capital_multiplier, 3.29, source)
    reboiler = CostCurve("reboiler", 4.4646, -0.5277, 0.3955, "m^2", 10.0, 100.0,
                         INDEX_RATIO * capital_multiplier, 3.29, source)
    return CostBasis(
        trays=TrayBasis(tray_spacing=0.6096, flooding_fraction=0.8, downcomer_fraction=0.12, efficiency=0.7,
                        extra_height=3.0, capacity=CAPACITY_24IN),
        shell=shell, tray_cost=trays,
        condenser=ExchangerBasis(U=800.0, utility_in=303.15, utility_out=313.15, minimum_approach=5.0,
                                 price=0.354e-9, curve=condenser),
        reboiler=ExchangerBasis(U=1000.0, utility_in=433.15, utility_out=433.15, minimum_approach=10.0,
                                price=steam_price, curve=reboiler),
        annualisation=0.1627, operating_hours=8000.0, currency="USD", cost_year=2024)


@lru_cache(maxsize=8)
def example_problem(name: str, max_stages: int = 60) -> SeparationProblem:
    """The separation problem of ``examples/<name>.toml`` with forms fitted over ``max_stages``."""
    case = load_case(EXAMPLES / f"{name}.toml")
    mixture = build_mixture(case.components, case.thermo, case.column.top_pressure)
    P = case.column.top_pressure
    feed = feed_state(case.feed, mixture, P)
    fitted = fit_mixture(mixture, P, P + max_stages * case.column.pressure_drop_per_stage, z=feed.z)
    return SeparationProblem(fitted, feed.molar_flow, feed.z, feed.q, P, case.column.pressure_drop_per_stage,
                             case.products.light_key, case.products.heavy_key,
                             case.products.light_key_spec, case.products.heavy_key_spec)


def with_specs(problem: SeparationProblem, light: EndSpec, heavy: EndSpec) -> SeparationProblem:
    """The same problem with other product specifications."""
    from dataclasses import replace

    return replace(problem, light_key_spec=light, heavy_key_spec=heavy)
