"""Exchanger data from the physics: process side, coefficient row, reboiler type, and the areas they give."""

import pytest

from disteco.costing.data import load_cost_data
from disteco.optimisation.pricing import exchanger_data, price_design, stage_profile
from disteco.optimisation.results import DesignEvaluation
from disteco.optimisation.start import start_profile
from disteco.sizing.exchanger_service import (HEAVY_ORGANIC_VISCOSITY, condenser_side, reboiler_side,
                                              reboiler_type)
from disteco.sizing.exchangers import mean_temperature_difference
from disteco.sizing.options import SizingOptions
from test_optimisation_support import example, example_problem

ORGANIC_SOURCE = "Towler and Sinnott, Chemical Engineering Design, 2nd ed., Table 19.1"


@pytest.fixture(scope="module")
def benzene():
    """The benzene-toluene example at 24 stages, feed on 12, 1.3 x Gilliland's reflux, priced sequentially."""
    _, mixture, _ = example("aromatics_binary")
    problem = example_problem("aromatics_binary")
    profile = stage_profile(problem, start_profile(problem, 24, 12, factor=1.3), 12)
    design = DesignEvaluation(24, 12, profile.reflux_ratio, profile, None, None, None)
    return mixture, profile, price_design(design, mixture, load_cost_data(), SizingOptions())


def test_benzene_exchanger_areas_are_duty_over_organic_U_times_mean_difference(benzene):
    """Area = Q / (U dT_m) with U of the organic rows of heat_transfer_coefficients.csv (from memory:
    Towler and Sinnott, Chemical Engineering Design, 2nd ed., Table 19.1: condensers, organic vapours /
    water 700-1000 W/(m2 K); vaporisers, steam / light organics 900-1200 W/(m2 K); mid-points)."""
    _, profile, priced = benzene
    condenser, reboiler = priced.sizing.condenser, priced.sizing.reboiler
    assert (condenser.process_side, condenser.overall_coefficient) == ("organic vapours", 850.0)
    assert (reboiler.process_side, reboiler.overall_coefficient) == ("light organics", 1050.0)
    n = profile.stages
    c_ends = (profile.T[0] - condenser.utility_out, profile.condenser_temperature - condenser.utility_in)
    r_ends = (reboiler.utility_in - profile.T[n - 1], reboiler.utility_out - profile.T[n - 2])
    assert condenser.area == pytest.approx(profile.condenser_duty / (850.0 * mean_temperature_difference(*c_ends)),
                                           rel=1e-12)
    assert reboiler.area == pytest.approx(profile.reboiler_duty / (1050.0 * mean_temperature_difference(*r_ends)),
                                          rel=1e-12)
    # the aqueous row (1250 W/(m2 K)) used before made both exchangers too small by these fractions
    assert 1.0 - 850.0 / 1250.0 == pytest.approx(0.32) and 1.0 - 1050.0 / 1250.0 == pytest.approx(0.16)
    for exchanger in (condenser, reboiler):
        assert ORGANIC_SOURCE in exchanger.coefficient_source


def test_benzene_reboiler_is_a_thermosyphon_priced_on_its_own_curve(benzene):
    """Above atmospheric pressure with light organic bottoms the rule picks a vertical thermosyphon."""
    _, _, priced = benzene
    assert priced.sizing.reboiler.exchanger_type == "thermosiphon"
    reboiler = next(e for e in priced.cost.items if e.item == "reboiler")
    assert reboiler.equipment == "thermosiphon_reboiler"
    listed = {e.tag: e for e in priced.sizing.equipment}
    assert listed["reboiler"].kind == "vertical thermosyphon reboiler"
    assert listed["condenser"].overall_coefficient == 850.0
    assert "organic vapours" in listed["condenser"].coefficient_basis
    assert ORGANIC_SOURCE in listed["reboiler"].coefficient_basis
    assert [row.process_side for row in priced.coefficients] == ["organic vapours", "light organics"]


def test_process_side_and_reboiler_type_rules():
    """The stated rules (common practice / from memory, see disteco.sizing.exchanger_service)."""
    assert condenser_side(0.6) == "aqueous vapours" and condenser_side(0.4) == "organic vapours"
    assert condenser_side(0.4, gas=True) == "organics with some non-condensables"
    assert condenser_side(0.6, gas=True) == "aqueous vapours"
    assert reboiler_side(0.9, 0.3e-3) == "aqueous solutions"
    assert reboiler_side(0.0, 0.99 * HEAVY_ORGANIC_VISCOSITY) == "light organics"
    assert reboiler_side(0.0, HEAVY_ORGANIC_VISCOSITY) == "heavy organics"
    assert reboiler_type(0.3e5, "light organics") == "kettle"  # vacuum
    assert reboiler_type(2e5, "heavy organics") == "kettle"
    assert reboiler_type(2e5, "aqueous solutions") == "thermosiphon"


def test_ethanol_water_bottoms_are_aqueous():
    """Water-rich bottoms of the ethanol-water example take the aqueous reboiler row (1000-1500 W/(m2 K))."""
    _, mixture, _ = example("ethanol_water")
    problem = example_problem("ethanol_water")
    profile = stage_profile(problem, start_profile(problem, 30, 20, factor=1.5), 20)
    found = exchanger_data(load_cost_data(), mixture, profile, SizingOptions())
    assert found.service.reboiler_side == "aqueous solutions"
    assert found.reboiler_U.value == 1250.0
    assert found.service.condenser_side == "organic vapours"  # the top vapour is mostly ethanol


def test_missing_process_side_row_falls_back_to_the_lowest_U_with_a_note():
    """No aqueous row against hot oil: the lowest hot-oil reboiler row is used and the note says so."""
    row, note = load_cost_data().coefficient_row("reboiler", "hot_oil", "aqueous solutions")
    assert row.u_typical == 350.0
    assert "no overall coefficient for 'aqueous solutions' against hot_oil" in note
    assert row.process_side in ("heavy organics", "light organics")


def test_vacuum_condenser_takes_the_non_condensables_row():
    """The styrene example's condenser at 8 kPa condenses with the air that leaks into a vacuum column:
    the row of organics with some non-condensables against cooling water (from memory: Towler and
    Sinnott, Chemical Engineering Design, 2nd ed., Table 19.1, 500-700 W/(m2 K), mid-point 600)."""
    _, mixture, _ = example("styrene_vacuum")
    problem = example_problem("styrene_vacuum")
    profile = stage_profile(problem, start_profile(problem, 40, 20, factor=1.5), 20)
    found = exchanger_data(load_cost_data(), mixture, profile, SizingOptions())
    assert found.service.condenser_side == "organics with some non-condensables"
    assert found.condenser_U.value == 600.0 and found.condenser_level.kind == "cooling_water"
    assert "under vacuum (air leaks in)" in found.service.reasons[0]
