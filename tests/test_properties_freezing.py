"""Where a condensate starts to freeze, and the warning of a coolant colder than that.

The reference is chemicals' ``solubility_eutectic`` (the same Schroeder-van Laar equation in a
general-purpose library) and the ideal solubility of naphthalene near 0.26 at 20 degC (Prausnitz,
Lichtenthaler and de Azevedo, Molecular Thermodynamics of Fluid-Phase Equilibria, 3rd ed.,
Section 11.2, from memory).
"""

import pytest
from chemicals.solubility import solubility_eutectic

from disteco.case import Thermo
from disteco.cli import main
from disteco.properties import build_mixture
from disteco.properties.solid_liquid import ideal_solubility_temperature
from disteco.sizing.exchangers import condensate_freezing_warning
from disteco.sizing.utilities import UtilityLevel

NAPHTHALENE = (353.35, 19010.0)  # K, J/mol: the databank's melting point and heat of fusion


@pytest.mark.parametrize("T", [293.15, 320.0, 350.0])
def test_ideal_solubility_temperature_inverts_the_reference_solubility(T):
    x = solubility_eutectic(T, *NAPHTHALENE)
    assert ideal_solubility_temperature(x, *NAPHTHALENE) == pytest.approx(T, rel=1e-9)


def test_naphthalene_ideal_solubility_near_room_temperature():
    assert 0.25 < solubility_eutectic(293.15, *NAPHTHALENE) < 0.28
    assert ideal_solubility_temperature(0.26, *NAPHTHALENE) == pytest.approx(293.15, abs=1.0)


def test_liquidus_is_the_first_solid_and_a_cold_coolant_is_warned():
    mixture = build_mixture(("naphthalene", "1-methylnaphthalene"), Thermo("ideal"), 15e3)
    found = mixture.liquidus([0.98, 0.02])
    assert found.component == "naphthalene" and found.melting_point == pytest.approx(353.35)
    assert found.temperature == pytest.approx(ideal_solubility_temperature(0.98, *NAPHTHALENE))
    cooling_water = UtilityLevel("cooling_water", "cooling", "cooling_water", 303.15, 318.15, heat_capacity=4180.0)
    tempered = UtilityLevel("tempered_water", "cooling", "cooling_water", 358.15, 368.15, heat_capacity=4200.0)
    warning = condensate_freezing_warning(found, cooling_water)
    assert warning.startswith("condenser: the condensate starts to freeze at about 79.1 degC (naphthalene comes out")
    assert condensate_freezing_warning(found, tempered) is None
    # benzene (melting at 5.5 degC) condensed on cooling water: nothing to say
    benzene = build_mixture(("benzene", "toluene"), Thermo("ideal"), 1e5).liquidus([0.99, 0.01])
    assert benzene.temperature < 279.0 and condensate_freezing_warning(benzene, cooling_water) is None


def test_check_names_the_freezing_condensate(tmp_path, capsys):
    case = tmp_path / "naphthalene.toml"
    case.write_text('title = "t"\n[mixture]\ncomponents = ["naphthalene", "1-methylnaphthalene"]\n[feed]\n'
                    'flow = "20 kmol/h"\ncomposition = { naphthalene = 0.6, "1-methylnaphthalene" = 0.4 }\nq = 1.0\n'
                    '[column]\ntop_pressure = "0.15 bar"\n[products]\ndistillate_light_key_fraction = 0.98\n'
                    'bottoms_light_key_fraction = 0.02\n')
    assert main(["check", str(case)]) == 0
    out = capsys.readouterr().out
    assert "Note: condenser: the condensate starts to freeze at about" in out
    assert "above the cooling_water supply at 30.0 degC" in out
