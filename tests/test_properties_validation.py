"""Validation of phase equilibrium against published data and thermo's own flash."""

import numpy as np
import pytest
from chemicals.vapor_pressure import Antoine, Psat_data_AntoinePoling
from scipy.optimize import brentq
from thermo import ChemicalConstantsPackage, FlashVL, GibbsExcessLiquid, IdealGas

from disteco.properties import find_azeotropes

P_ATM = 101325.0


def test_benzene_toluene_bubble_point_against_thermo_flash(benzene_toluene):
    """Equimolar benzene-toluene at 101.325 kPa against thermo's general VL flash (Raoult's law).

    Reference library: thermo's FlashVL with an ideal liquid and ideal gas. Tolerance 0.01 K:
    both solve the same equations; the difference is solver tolerance only.
    """
    constants, correlations = ChemicalConstantsPackage.from_IDs(["benzene", "toluene"])
    state = dict(T=300.0, P=P_ATM, zs=[0.5, 0.5])
    liquid = GibbsExcessLiquid(VaporPressures=correlations.VaporPressures,
                               HeatCapacityGases=correlations.HeatCapacityGases,
                               VolumeLiquids=correlations.VolumeLiquids, **state)
    gas = IdealGas(HeatCapacityGases=correlations.HeatCapacityGases, **state)
    reference = FlashVL(constants, correlations, liquid=liquid, gas=gas).flash(P=P_ATM, VF=0.0, zs=[0.5, 0.5])
    ours = benzene_toluene.bubble_point(P_ATM, [0.5, 0.5])
    assert ours.T == pytest.approx(reference.T, abs=0.01)
    assert ours.y[0] == pytest.approx(reference.gas.zs[0], abs=1e-4)


def test_benzene_toluene_bubble_point_against_published_vapour_pressures(benzene_toluene):
    """Raoult's law with the Antoine constants of Poling, Prausnitz and O'Connell,
    The Properties of Gases and Liquids, 5th ed., Appendix A (vapour-pressure table, as
    shipped by chemicals: Psat_data_AntoinePoling). Tolerance 0.3 K, the spread between
    vapour-pressure correlations near the normal boiling points. Expected value about
    92.1 degC (365.2 K).
    """
    def psat(cas, T):
        row = Psat_data_AntoinePoling.loc[cas]
        return Antoine(T, row.A, row.B, row.C, base=10.0)

    bubble = brentq(lambda T: 0.5 * psat("71-43-2", T) + 0.5 * psat("108-88-3", T) - P_ATM, 340.0, 390.0)
    ours = benzene_toluene.bubble_point(P_ATM, [0.5, 0.5]).T
    assert ours == pytest.approx(bubble, abs=0.3)
    assert 365.0 < ours < 365.5


# Ethanol-water at 101.325 kPa, mole fraction of ethanol in liquid x and vapour y, T in degC.
# The widely reproduced data set of Carey and Lewis, Ind. Eng. Chem. 24 (1932) 882, as
# tabulated in Geankoplis, Transport Processes and Separation Process Principles, 4th ed.,
# Appendix A.3-23 (values from memory of that table).
ETHANOL_WATER_VLE = np.array([
    # x, y, T
    [0.0190, 0.1700, 95.50],
    [0.0721, 0.3891, 89.00],
    [0.0966, 0.4375, 86.70],
    [0.1238, 0.4704, 85.30],
    [0.1661, 0.5089, 84.10],
    [0.2337, 0.5445, 82.70],
    [0.2608, 0.5580, 82.30],
    [0.3273, 0.5826, 81.50],
    [0.3965, 0.6122, 80.70],
    [0.5079, 0.6564, 79.80],
    [0.5732, 0.6841, 79.30],
    [0.6763, 0.7385, 78.74],
    [0.7472, 0.7815, 78.41],
    [0.8943, 0.8943, 78.15],
])


def test_ethanol_water_vle_against_published_data(ethanol_water):
    """UNIFAC (Dortmund) against the isobaric ethanol-water data above.

    Tolerances: vapour mole fraction within 0.035 absolute and temperature within 1.0 K.
    A predictive group-contribution method, not fitted to this system, is expected to
    reproduce such data to a few hundredths in y and about a kelvin in T; the largest
    deviations are at high dilution, where y rises steeply.
    """
    for x, y, t_degC in ETHANOL_WATER_VLE:
        point = ethanol_water.bubble_point(P_ATM, [x, 1.0 - x])
        assert point.y[0] == pytest.approx(y, abs=0.035), x
        assert point.T - 273.15 == pytest.approx(t_degC, abs=1.0), x


def test_secant_bubble_temperatures_equal_the_bracketed_ones(ethanol_water, monkeypatch):
    """Bubble temperatures with an ideal-gas vapour come from the secant method (about 6.6 evaluations of K
    against brentq's 11 on the saturation temperatures' bracket); on 40 ethanol-water liquids at 1 atm,
    across the azeotrope, they equal brentq's within 1e-8 K (the same equation, xtol 1e-9 K)."""
    import disteco.properties.mixture as mixture_module

    xs = np.linspace(0.001, 0.999, 40)
    calls = []
    original = ethanol_water.k_values
    monkeypatch.setattr(ethanol_water, "k_values", lambda *a: calls.append(1) or original(*a))
    secant = [ethanol_water.bubble_point(P_ATM, [x, 1.0 - x]).T for x in xs]
    evaluations = len(calls) / len(xs)
    monkeypatch.setattr(mixture_module, "_secant_temperature", lambda *a, **k: None)
    calls.clear()
    bracketed = [ethanol_water.bubble_point(P_ATM, [x, 1.0 - x]).T for x in xs]
    assert secant == pytest.approx(bracketed, abs=1e-8)
    assert evaluations < 8 < len(calls) / len(xs)


def test_ethanol_water_azeotrope_against_published_value(ethanol_water):
    """Minimum-boiling azeotrope at 101.325 kPa: 89.4 mol % ethanol (95.6 mass %), 78.15 degC.

    Source: Horsley, Azeotropic Data, Advances in Chemistry Series 6, American Chemical
    Society (1952), ethanol-water entry (from memory). Tolerances 0.01 mole fraction and
    0.3 K, the agreement expected of a predictive activity model at an azeotrope.
    """
    (azeotrope,) = find_azeotropes(ethanol_water, P_ATM)
    assert azeotrope.kind == "minimum-boiling"
    assert azeotrope.x_first == pytest.approx(0.894, abs=0.01)
    assert azeotrope.T - 273.15 == pytest.approx(78.15, abs=0.3)


def test_ideal_mixture_has_no_azeotrope(benzene_toluene):
    """Raoult's law: y - x keeps one sign between the pure ends (common practice, no source)."""
    assert find_azeotropes(benzene_toluene, P_ATM) == []


def test_heat_of_vaporisation_of_benzene_near_its_normal_boiling_point():
    """Benzene's enthalpy of vaporisation at its normal boiling point, 30.72 kJ/mol.

    Source: Poling, Prausnitz and O'Connell, The Properties of Gases and Liquids, 5th ed.,
    Appendix A (from memory). Tolerance 2 %.
    """
    from disteco.case import Thermo
    from disteco.properties import build_mixture

    mixture = build_mixture(("benzene", "toluene"), Thermo("ideal"), P_ATM)
    latent = mixture.heat_of_vaporisation(P_ATM, [1.0 - 1e-9, 1e-9])
    assert latent == pytest.approx(30.72e3, rel=0.02)


@pytest.mark.parametrize("names", [("benzene", "toluene"), ("propane", "isobutane", "n-butane"),
                                   ("methanol", "water"), ("ethylbenzene", "styrene")])
def test_pure_correlations_are_published_methods(names):
    """Surface tension, viscosity and conductivity of every component come from a method in our list of
    published correlations and data compilations, not from thermo's default where that is a fit labelled
    with an existing program's name."""
    from disteco.case import Thermo
    from disteco.properties import build_mixture
    from disteco.properties.mixture import PUBLISHED_METHODS
    mixture = build_mixture(names, Thermo("ideal"), 101325.0)
    for group, allowed in PUBLISHED_METHODS.items():
        for correlation in getattr(mixture._correlations, group):
            assert correlation.method in allowed, (group, correlation.method)
