"""A carboxylic acid's dimerisation in the vapour, measured against the ideal-gas vapour of the
activity-coefficient methods: the chemical-theory functions, the azeotrope it removes, and what
check and design say about it."""

import json
from pathlib import Path

import numpy as np
import pytest

from disteco.case import Thermo, load_case
from disteco.cli import main
from disteco.properties import all_azeotropes, build_mixture, summarise_mixture
from disteco.properties.association import DIMERISING_ACIDS, dimer_amount, fugacity_coefficients

ACID_CASE = Path(__file__).parent / "cases" / "acid_water.toml"
ACETIC = DIMERISING_ACIDS["64-19-7"]


@pytest.mark.parametrize("kp, acid", [(1e-6, 0.5), (0.3, 0.05), (3.6, 1.0), (50.0, 0.7), (5.0, 1e-9)])
def test_dimer_amount_is_the_physical_root_of_the_balance(kp, acid):
    """d (1 - d) = K P (y_A - 2 d)^2 with 0 <= 2 d <= y_A (Prausnitz, Lichtenthaler and de Azevedo,
    Molecular Thermodynamics of Fluid-Phase Equilibria, 3rd ed., section 5.8: the chemical theory of
    a dimerising vapour)."""
    d = dimer_amount(kp, acid)
    assert 0.0 <= 2.0 * d <= acid
    assert d * (1.0 - d) == pytest.approx(kp * (acid - 2.0 * d) ** 2, rel=1e-9, abs=1e-300)


def test_fugacity_coefficients_tend_to_the_ideal_gas():
    """No dimerisation (K P = 0) or a trace of acid leaves an ideal gas of monomers: phi = 1."""
    assert fugacity_coefficients(0.0, [0.4, 0.6], 1) == pytest.approx([1.0, 1.0])
    assert fugacity_coefficients(5.0, [1.0 - 1e-12, 1e-12], 1) == pytest.approx([1.0, 1.0], rel=1e-9)


def test_saturated_acetic_acid_vapour_is_mostly_dimers():
    """At its normal boiling point (117.9 degC, 1 atm) acetic acid vapour weighs about 1.6 times the
    monomer's molar mass per true mole (vapour-density measurements, from memory); chemical theory
    with the Marek-Standart constant gives 1.59."""
    kp = ACETIC.constant(391.05) * 101325.0
    d = dimer_amount(kp, 1.0)
    dimer_fraction = d / (1.0 - d)  # true mole fraction of dimers
    assert 1.0 + dimer_fraction == pytest.approx(1.6, abs=0.1)


@pytest.fixture(scope="module")
def acid_water():
    case = load_case(ACID_CASE)
    mixture = build_mixture(case.components, case.thermo, case.column.top_pressure)
    mixture.clear_warnings()
    return case, mixture


def test_the_ideal_gas_vapours_azeotrope_vanishes_with_the_dimerisation(acid_water):
    """Water and acetic acid form no azeotrope at atmospheric pressure (Gmehling et al., Azeotropic
    Data, from memory), but UNIFAC (Dortmund) with an ideal-gas vapour puts one near 86 % water at
    1.05 bar. With the acid's dimerisation the pair's relative volatility there is well above one,
    and over the whole key pair; the azeotrope is marked as one of the ideal-gas vapour."""
    case, mixture = acid_water
    P = case.column.top_pressure
    (found,) = all_azeotropes(mixture, P)
    assert 0.80 < found.x_first < 0.92 and found.dimerising == "acetic acid"
    assert found.vapour_artefact and found.alpha_dimerised > 1.3
    summary = summarise_mixture(mixture, case.feed.composition, P, 0, 1)
    assert summary.key_volatility_min < 1.0  # the ideal-gas vapour: water is the heavier near its own end
    assert summary.association.alpha_min > 1.3
    assert any("acetic acid dimerises in the vapour" in w for w in mixture.warnings)


def test_an_azeotrope_without_an_acid_is_left_alone(ethanol_water):
    """Ethanol-water (no dimerising component): no dimerised volatility, no artefact."""
    (found,) = all_azeotropes(ethanol_water, 101325.0)
    assert found.alpha_dimerised is None and not found.vapour_artefact
    assert ethanol_water.dimerising_acid is None


@pytest.mark.parametrize("names, acids", [
    (("water", "formic acid"), ("formic acid",)),           # a carboxylic acid without constants
    (("acetic acid", "propionic acid"), ("acetic acid", "propionic acid")),  # two acids: cross-dimers
    (("water", "acetic acid"), ()),                          # measured by chemical theory instead
    (("ethanol", "water"), ()),
    (("methyl formate", "methanol"), ()),                    # an ester's HCOO group is no acid
])
def test_acids_whose_dimerisation_is_not_measured_are_named(names, acids, tmp_path, capsys):
    """Formic acid dimerises in the vapour as acetic acid does (both carboxylic acids, COOH or HCOOH
    groups), but disteco has constants for acetic acid alone: a water/formic acid column designed
    with no word of it. Such acids are named in the mixture summary, with a note."""
    mixture = build_mixture(names, Thermo("unifac-dortmund"), 105e3)
    summary = summarise_mixture(mixture, [0.5, 0.5], 105e3, 0, 1)
    assert summary.acids_without_dimerisation == acids
    assert any("carboxylic acid vapour dimerises" in w for w in mixture.warnings) == bool(acids)


def test_refusal_past_the_artefact_says_what_it_is(tmp_path, capsys):
    """A distillate of 99 % water lies past the ideal-gas vapour's azeotrope: check exits 2 and says
    the azeotrope likely does not exist and what parameters would design through it."""
    text = ACID_CASE.read_text().replace("distillate_light_key_fraction = 0.80", "distillate_light_key_fraction = 0.99")
    case = tmp_path / "dry.toml"
    case.write_text(text)
    assert main(["check", str(case)]) == 2
    err = capsys.readouterr().err
    assert "azeotrope of the ideal-gas vapour only" in err and "likely has none" in err
    assert "NRTL or Wilson parameters regressed from equilibrium data" in err


def test_design_below_the_constant_molar_overflow_minimum_prices_and_says_so(tmp_path, capsys):
    """The optimiser's own design of this column (R 0.531, 16 stages, feed on 8, measured) lies below the
    McCabe-Thiele minimum 0.546 because energy balances need less; priced as a given design it passes the
    check, the x-y diagram leaves out the construction it cannot step, and the result carries the
    dimerisation's volatility range beside the design's."""
    out = tmp_path / "out"
    code = main(["design", str(ACID_CASE), "-o", str(out), "-q", "--no-figures",
                 "--reflux", "0.531", "--stages", "16", "--feed-stage", "8"])
    assert code == 0, capsys.readouterr().err
    result = json.loads((out / "result.json").read_text())
    warnings = " ".join(result["warnings"])
    assert "x-y diagram without the constant-molar-overflow construction" in warnings
    assert "acetic acid dimerises in the vapour" in warnings
    check = result["mixture"]["vapour_dimerisation_check"]
    assert check["acid"] == "acetic acid" and check["key_relative_volatility_min"] > 1.3
    assert result["mixture"]["key_relative_volatility_min"] < 1.0
    (azeotrope,) = result["mixture"]["azeotropes"]
    assert azeotrope["relative_volatility_with_dimerisation"] > 1.3
    assert np.isfinite(result["cost"]["tac_per_year"])
