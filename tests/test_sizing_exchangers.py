"""Condenser and reboiler: LMTD and area against a handbook example, utility choice, errors."""

import math

import pytest

from disteco._base.errors import CaseError, InfeasibleSpecError
from ht import LMTD

from disteco.sizing.exchangers import (choose_utility, exchanger_area, log_mean_temperature_difference,
                                       mean_temperature_difference, size_exchanger, utility_mass_flow)
from disteco.sizing.utilities import UtilityLevel

C = 273.15  # K at 0 degC

LEVELS = (  # levels for the tests only
    UtilityLevel("cooling water", "cooling", "cooling_water", C + 30, C + 45, heat_capacity=4180.0),
    UtilityLevel("chilled water", "cooling", "chilled_water", C + 5, C + 15, heat_capacity=4190.0),
    UtilityLevel("refrigerant -20", "cooling", "refrigerant", C - 20, C - 20),
    UtilityLevel("low-pressure steam", "heating", "steam", C + 160, C + 160, latent_heat=2.08e6),
    UtilityLevel("medium-pressure steam", "heating", "steam", C + 184, C + 184, latent_heat=2.00e6),
    UtilityLevel("high-pressure steam", "heating", "steam", C + 254, C + 254, latent_heat=1.70e6),
    UtilityLevel("hot oil", "heating", "hot_oil", C + 320, C + 280, heat_capacity=2500.0),
    UtilityLevel("electricity", "heating", "electricity", C + 1000, C + 1000),
)


# ---------------------------------------------------------------- validation


def test_lmtd_and_area_of_handbook_example():
    """Bergman, Lavine, Incropera and DeWitt, Introduction to Heat Transfer, 6th ed. (2011),
    Example 11.1: oil 100 -> 60 degC, water 30 -> 40.2 degC counter-current, q = 8524 W,
    dT_lm = 43.2 degC, U = 38.1 W/(m^2 K), inner tube 25 mm, L = 65.9 m."""
    lmtd = log_mean_temperature_difference(C + 100.0, C + 60.0, C + 30.0, C + 40.2)
    assert lmtd == pytest.approx(43.2, abs=0.05)
    area = exchanger_area(8524.0, 38.1, lmtd)
    assert area / (math.pi * 0.025) == pytest.approx(65.9, abs=0.1)


@pytest.mark.parametrize("ratio, tolerance", [(1.001, 1e-9), (1.5, 1e-4), (3.0, 3e-4), (10.0, 4e-3)])
def test_mean_temperature_difference_against_the_log_mean_of_ht(ratio, tolerance):
    """The cube-root mean against the true log mean of ``ht.core.LMTD`` (Bell, ht library), stated tolerances:
    0.01 % at an end ratio of 1.5, 0.03 % at 3, 0.4 % at 10; it never falls below the log mean."""
    dt_two = 12.0
    dt_one = ratio * dt_two
    exact = LMTD(C + 100.0 + dt_one, C + 100.0 + dt_two, C + 100.0, C + 100.0)
    approx = mean_temperature_difference(dt_one, dt_two)
    assert approx == pytest.approx(exact, rel=tolerance)
    assert approx >= exact * (1.0 - 1e-12)


def test_mean_temperature_difference_is_smooth_where_the_ends_are_equal():
    """Equal ends give that difference exactly, and the neighbourhood has no 0/0 (regression guard)."""
    assert mean_temperature_difference(25.0, 25.0) == pytest.approx(25.0, rel=1e-14)
    below, above = mean_temperature_difference(25.0, 25.0 - 1e-7), mean_temperature_difference(25.0, 25.0 + 1e-7)
    assert (above - below) / 2e-7 == pytest.approx(0.5, rel=1e-6)


def test_lmtd_with_equal_terminal_differences():
    """Limit of the LMTD for equal differences is that difference (e.g. condensing steam
    boiling a pure liquid)."""
    assert log_mean_temperature_difference(C + 160, C + 160, C + 110, C + 110) == pytest.approx(50.0)


# ---------------------------------------------------------------- utility choice


@pytest.mark.parametrize("process, expected", [(80.0, "cooling water"), (40.0, "chilled water"),
                                               (10.0, "refrigerant -20")])
def test_condenser_takes_the_warmest_level_that_fits(process, expected):
    level = choose_utility(LEVELS, "cooling", C + process, C + process, 10.0, "condenser")
    assert level.name == expected


@pytest.mark.parametrize("process, expected", [(110.0, "low-pressure steam"), (170.0, "medium-pressure steam"),
                                               (250.0, "hot oil")])
def test_reboiler_takes_the_coolest_level_that_fits(process, expected):
    level = choose_utility(LEVELS, "heating", C + process - 2.0, C + process, 10.0, "reboiler")
    assert level.name == expected


def test_no_cold_enough_utility_names_temperatures_levels_and_approach():
    with pytest.raises(InfeasibleSpecError, match=r"condenser: no cooling utility is cold enough .* "
                                                  r"-25.0 -> -25.0 degC .* 10.0 K; .*refrigerant -20.*; raise "
                                                  r"column.top_pressure, lower sizing.min_approach, or offer a colder "
                                                  r"level in your own cost data \(economics.cost_data"):
        choose_utility(LEVELS, "cooling", C - 25, C - 25, 10.0, "condenser")


def test_no_hot_enough_utility_raises():
    with pytest.raises(InfeasibleSpecError, match=r"reboiler: no heating utility is hot enough .*hot oil 320.0.*; "
                                                  r"lower column.top_pressure, lower sizing.min_approach, or offer a "
                                                  r"hotter level"):
        choose_utility(LEVELS, "heating", C + 278, C + 280, 10.0, "reboiler")


def test_no_level_offered_at_all():
    with pytest.raises(InfeasibleSpecError, match="levels offered: none"):
        choose_utility(LEVELS[3:], "cooling", C + 80, C + 80, 10.0, "condenser")


def test_temperature_cross_raises():
    with pytest.raises(InfeasibleSpecError, match="temperature cross"):
        log_mean_temperature_difference(C + 50, C + 40, C + 45, C + 55)


# ---------------------------------------------------------------- flows and the whole exchanger


def test_utility_flows():
    """Q / latent heat for steam, Q / (cp dT) for water, none for a level priced per energy."""
    assert utility_mass_flow(2.08e6, LEVELS[3]) == pytest.approx(1.0)
    assert utility_mass_flow(4180.0 * 15.0, LEVELS[0]) == pytest.approx(1.0)
    assert utility_mass_flow(1e6, LEVELS[2]) is None


def test_size_condenser():
    sized = size_exchanger("condenser", "cooling", 1.0e6, C + 80.0, C + 78.0, LEVELS, 800.0, 10.0, 8000.0)
    lmtd = ((80 - 45) - (78 - 30)) / math.log((80 - 45) / (78 - 30))
    assert sized.utility.name == "cooling water"
    # the sizing layer's mean temperature difference is the cube-root mean: 0.03 % of the log mean here
    assert sized.lmtd == pytest.approx(lmtd, rel=3e-4)
    assert sized.area == pytest.approx(1.0e6 / (800.0 * sized.lmtd), rel=1e-12)
    assert sized.utility_mass_flow == pytest.approx(1.0e6 / (4180.0 * 15.0))
    assert sized.utility_mass_per_year == pytest.approx(sized.utility_mass_flow * 8000.0 * 3600.0)
    assert sized.utility_energy_per_year == pytest.approx(1.0e6 * 8000.0 * 3600.0)


def test_bad_coefficient_names_field():
    with pytest.raises(CaseError, match="sizing.U_reboiler"):
        size_exchanger("reboiler", "heating", 1.0e6, C + 100, C + 102, LEVELS, 0.0, 10.0, 8000.0)


@pytest.mark.parametrize("process, expected", [(-8.0, "warm_water"), (10.0, "warm_water"), (12.0, "lp_steam"),
                                               (110.0, "lp_steam")])
def test_a_reboiler_below_ambient_takes_the_bundled_warm_water(process, expected):
    """With the bundled levels, a reboiler boiling below ambient (an ethylene/ethane splitter's near
    -8 degC at 19 bar) is heated by cooling water from its supply header (30 -> 20 degC), not by steam;
    warm water keeps the 10 K approach up to a process side at 10 degC (its return end)."""
    from disteco.costing import load_cost_data

    levels = load_cost_data().levels
    level = choose_utility(levels, "heating", C + process - 0.5, C + process, 10.0, "reboiler")
    assert level.name == expected
