"""Impossible specifications are explained in engineering words, never computed through."""

import dataclasses

import pytest

from disteco._base.errors import CaseError, InfeasibleSpecError
from disteco.case import Column, EndSpec, Feed, FeedFlow, Products, ThermalCondition, Thermo
from disteco.properties import build_mixture, feed_state
from disteco.stages.design import design_stages
from disteco.stages.rigorous import ColumnSpec, solve_cmo
from disteco.stages.shortcut import minimum_reflux_underwood, shortcut_design
from disteco.stages.specs import gilliland_reflux
from disteco.stages.splits import ProductSplit, product_split

P_ATM = 101325.0
COLUMN = Column(P_ATM, 0.0, "total", 0.0)


def binary(x_distillate, x_bottoms):
    return Products(0, 1, EndSpec("fraction", x_bottoms), EndSpec("fraction", 1.0 - x_distillate),
                    binary_fractions=True)


def feed_of(mixture, z, q=1.0):
    return feed_state(Feed(FeedFlow("molar", 1.0), z, ThermalCondition("q", q), None), mixture, P_ATM)


@pytest.fixture(scope="module")
def bt_feed(benzene_toluene):
    return feed_of(benzene_toluene, (0.45, 0.55))


def test_distillate_purity_at_or_below_feed(benzene_toluene, bt_feed):
    """The message names the field as the case wrote it: the binary fraction, or the key form's."""
    for x_d in (0.45, 0.40):
        with pytest.raises(InfeasibleSpecError, match="^products.distillate_light_key_fraction: distillate "
                           "light-key mole fraction .* at or below the feed"):
            shortcut_design(benzene_toluene, bt_feed, binary(x_d, 0.05), COLUMN)
    key_form = dataclasses.replace(binary(0.40, 0.05), binary_fractions=False)
    with pytest.raises(InfeasibleSpecError, match="^products.heavy_key_in_distillate: distillate light-key"):
        shortcut_design(benzene_toluene, bt_feed, key_form, COLUMN)


def test_bottoms_above_feed(benzene_toluene, bt_feed):
    with pytest.raises(InfeasibleSpecError, match="^products.bottoms_light_key_fraction: bottoms light-key mole "
                       "fraction .* at or above the feed"):
        shortcut_design(benzene_toluene, bt_feed, binary(0.95, 0.50), COLUMN)


def test_purity_beyond_azeotrope(ethanol_water):
    """Ethanol-water forms a minimum-boiling azeotrope near 0.89 to 0.90 mole fraction ethanol
    at 1 atm (widely tabulated; from memory). A distillate of 0.95 is refused, 0.80 accepted."""
    feed = feed_of(ethanol_water, (0.2, 0.8))
    with pytest.raises(InfeasibleSpecError, match="beyond the minimum-boiling azeotrope of ethanol and water"):
        shortcut_design(ethanol_water, feed, binary(0.95, 0.01), COLUMN)
    below = shortcut_design(ethanol_water, feed, binary(0.80, 0.01), COLUMN)
    assert below.minimum_reflux > 0.0


@pytest.fixture(scope="module")
def methanol_ethanol_water():
    return build_mixture(("methanol", "ethanol", "water"), Thermo("unifac-dortmund"), P_ATM)


def test_multicomponent_key_pair_beyond_azeotrope(methanol_ethanol_water):
    """Methanol-ethanol-water with ethanol/water as keys: 99 % of the ethanol up and 99.5 % of
    the water down puts the distillate's ethanol/(ethanol + water) at 0.994, beyond the binary
    azeotrope (0.89 to 0.90 at 1 atm, widely tabulated; from memory). The shortcut warns, and
    the stage design, which cannot reach the specification, explains it by the azeotrope."""
    feed = feed_of(methanol_ethanol_water, (0.1, 0.4, 0.5))
    products = Products(1, 2, EndSpec("recovery", 0.99), EndSpec("recovery", 0.995))
    shortcut = shortcut_design(methanol_ethanol_water, feed, products, COLUMN)
    (warning,) = shortcut.warnings
    assert "distillate light-key fraction of the key pair 0.99" in warning
    assert "minimum-boiling azeotrope of ethanol and water at 0.89" in warning
    with pytest.raises(InfeasibleSpecError, match="azeotrope bounds the product"):
        design_stages(methanol_ethanol_water, feed, products, COLUMN, energy=False)


def test_multicomponent_key_pair_on_the_feed_side_has_no_warning(methanol_ethanol_water):
    """The same feed with 80 % of the ethanol up and 90 % of the water down: distillate
    key-pair fraction about 0.8, below the azeotrope."""
    feed = feed_of(methanol_ethanol_water, (0.1, 0.4, 0.5))
    products = Products(1, 2, EndSpec("recovery", 0.80), EndSpec("recovery", 0.90))
    assert shortcut_design(methanol_ethanol_water, feed, products, COLUMN).warnings == ()


@pytest.mark.parametrize("field, spec", [
    ("light_key_recovery", Products(0, 1, EndSpec("recovery", 1.2), EndSpec("recovery", 0.9))),
    ("heavy_key_recovery", Products(0, 1, EndSpec("recovery", 0.9), EndSpec("recovery", 1.0))),
    ("light_key_recovery", Products(0, 1, EndSpec("recovery", 0.0), EndSpec("recovery", 0.9))),
])
def test_recoveries_outside_zero_to_one(bt_feed, field, spec):
    with pytest.raises(CaseError, match=f"products.{field}: .* not between 0 and 1"):
        product_split(spec, bt_feed.z, bt_feed.molar_flow, (2.5, 1.0))


def test_recoveries_that_contradict_each_other():
    """A light-key bottoms fraction that needs more light key in the bottoms than the feed holds."""
    products = Products(1, 2, EndSpec("fraction", 0.6), EndSpec("recovery", 0.99))
    with pytest.raises(InfeasibleSpecError, match="light key in the distillate"):
        product_split(products, (0.2, 0.2, 0.6), 1.0, (4.0, 2.0, 1.0))


def test_keys_out_of_volatility_order(bt_feed):
    products = Products(1, 0, EndSpec("recovery", 0.9), EndSpec("recovery", 0.9))
    with pytest.raises(InfeasibleSpecError, match="not more volatile"):
        product_split(products, bt_feed.z, 1.0, (2.5, 1.0))


def test_underwood_never_reports_negative_minimum_reflux():
    """Four components (volatilities 4, 2, 1, 0.5), keys 2 and 3, liquid feed: 95 % of the
    light key up but only 40 % of the heavy key down. Underwood's Vmin falls below D, i.e. a
    negative minimum reflux (a known failure of the method for loose splits); it is explained."""
    z = (0.25, 0.25, 0.25, 0.25)
    d = (0.25, 0.95 * 0.25, 0.6 * 0.25, 0.0)
    split = ProductSplit(1, 2, d, tuple(f - di for f, di in zip(z, d)))
    with pytest.raises(InfeasibleSpecError, match=r"not above the distillate flow .*\(no reflux would be needed"):
        minimum_reflux_underwood((4.0, 2.0, 1.0, 0.5), z, 1.0, split)


def test_reflux_below_minimum_in_stage_count(benzene_toluene, bt_feed):
    design = shortcut_design(benzene_toluene, bt_feed, binary(0.95, 0.05), COLUMN)
    with pytest.raises(InfeasibleSpecError, match="at or below the minimum reflux"):
        design.stages(0.9 * design.minimum_reflux)
    with pytest.raises(InfeasibleSpecError, match=r"not more than the minimum .* \(Fenske"):
        gilliland_reflux(design, int(design.minimum_stages))


def test_stage_solver_rejects_impossible_specs(benzene_toluene, bt_feed):
    base = ColumnSpec(12, 6, 2.0, 0.45, P_ATM)
    with pytest.raises(InfeasibleSpecError, match="distillate flow .* between zero and the feed flow"):
        solve_cmo(benzene_toluene, bt_feed, dataclasses.replace(base, distillate_flow=1.2))
    with pytest.raises(CaseError, match="feed_stage"):
        solve_cmo(benzene_toluene, bt_feed, dataclasses.replace(base, feed_stage=13))
    vapour = feed_of(benzene_toluene, (0.45, 0.55), q=0.0)
    with pytest.raises(InfeasibleSpecError, match="no boil-up is left below the feed"):
        solve_cmo(benzene_toluene, vapour, dataclasses.replace(base, reflux_ratio=0.5, distillate_flow=0.3))
