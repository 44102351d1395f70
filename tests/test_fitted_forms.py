"""Validation of the fitted closed forms against thermo (a general-purpose reference library).

The fitted forms are what the optimisation model sees; these tests bound their departure
from the full thermodynamic models over the range they were fitted for.
"""

import numpy as np
import pytest

from disteco.case import Thermo
from disteco.properties import build_mixture
from disteco.properties.fitted import fit_mixture

ATM = 101325.0


@pytest.fixture(scope="module")
def fitted_benzene_toluene(benzene_toluene):
    return fit_mixture(benzene_toluene, ATM, ATM + 40 * 700.0)


def test_range_spans_pure_boiling_points(benzene_toluene, fitted_benzene_toluene):
    """The range runs from benzene's boiling point at the top to toluene's at the bottom pressure (thermo)."""
    f = fitted_benzene_toluene
    assert f.T_low < benzene_toluene.saturation_temperatures(ATM)[0] < f.T_high
    assert f.T_low < benzene_toluene.saturation_temperatures(ATM + 40 * 700.0)[1] < f.T_high


def test_ideal_k_values_within_2_percent(benzene_toluene, fitted_benzene_toluene):
    """Raoult K of benzene and toluene within 2 % of thermo over the fitted range (measured: 0.02 %)."""
    f = fitted_benzene_toluene
    for T in np.linspace(f.T_low, f.T_high, 9):
        for P in (ATM, ATM + 20e3):
            ratio = f.k_values(T, P, [0.5, 0.5]) / benzene_toluene.k_values(T, P, [0.5, 0.5])
            assert ratio == pytest.approx([1.0, 1.0], abs=0.02)


def test_unifac_bubble_points_within_half_kelvin_up_to_azeotrope(ethanol_water):
    """Ethanol-water (UNIFAC Dortmund in thermo): fitted NRTL bubble T within 0.15 K from 1 % ethanol
    to the azeotrope (about 0.89 ethanol at 1 atm; measured: 0.05 K at most with the pair's alpha
    free, 0.23 K with alpha fixed at 0.3)."""
    f = fit_mixture(ethanol_water, ATM, ATM + 30 * 800.0)
    assert f.form == "nrtl"
    for x1 in np.linspace(0.01, 0.89, 12):
        x = [x1, 1.0 - x1]
        assert f.bubble_temperature(ATM, x) == pytest.approx(ethanol_water.bubble_point(ATM, x).T, abs=0.15)


def test_acetone_water_vapour_where_the_column_pinches():
    """Acetone/water at 1.1 bar (UNIFAC Dortmund in thermo), a strongly non-ideal aqueous pair whose
    rectifying line pinches against a flat equilibrium curve: a vapour-fraction error of 0.005 there
    moved a design's reflux by 15 %. Fitted bubble T within 0.15 K and vapour within 0.003 of thermo's
    bubble points from 1 % to 98 % acetone (measured 0.084 K and 0.0017 with the pair's alpha free at
    0.44; 0.79 K and 0.0085 with alpha fixed at 0.3)."""
    mixture = build_mixture(("acetone", "water"), Thermo("unifac-dortmund"), 110e3)
    f = fit_mixture(mixture, 110e3, 170e3)
    assert 0.3 < f.nrtl_alpha[0][1] == f.nrtl_alpha[1][0] < 0.6
    for x1 in (0.01, 0.05, 0.1, 0.3, 0.5, 0.7, 0.8, 0.9, 0.98):
        x = np.array([x1, 1.0 - x1])
        reference = mixture.bubble_point(110e3, x)
        T = f.bubble_temperature(110e3, x)
        k = f.k_values(T, 110e3, x)
        assert T == pytest.approx(reference.T, abs=0.15)
        assert k[0] * x1 / (k @ x) == pytest.approx(reference.y[0], abs=0.003)


@pytest.mark.parametrize("light, ideal_mixing_off", [("acetone", 600.0), ("isopropanol", 850.0)])
def test_liquid_enthalpy_carries_the_excess_enthalpy_of_aqueous_pairs(light, ideal_mixing_off):
    """The fitted liquid enthalpy at the pair's bubble points within 60 J/mol of thermo's (UNIFAC
    Dortmund, 1.1 bar), where the pure liquids mixed ideally were off by the excess enthalpy, over
    ``ideal_mixing_off`` J/mol at its largest (measured: 611 and 882 J/mol; with the pair's
    Redlich-Kister terms 41 and 30 J/mol). The form is the same one the equation model builds."""
    mixture = build_mixture((light, "water"), Thermo("unifac-dortmund"), 110e3)
    f = fit_mixture(mixture, 110e3, 130e3)
    worst_ideal = 0.0
    for x1 in (0.02, 0.1, 0.3, 0.5, 0.7, 0.9, 0.98):
        x = np.array([x1, 1.0 - x1])
        T = mixture.bubble_point(110e3, x).T
        thermo_h = mixture.liquid_enthalpy(T, 120e3, x)
        assert f.liquid_enthalpy_of(T, x) == pytest.approx(thermo_h, abs=60.0)
        worst_ideal = max(worst_ideal, abs(f.liquid_enthalpy_of(T, x) - f.excess_enthalpy_of(T, x) - thermo_h))
    assert worst_ideal > ideal_mixing_off


def test_k_values_and_liquid_enthalpy_from_one_phase_equal_the_separate_calls(ethanol_water):
    """The stage solver's shared evaluation gives exactly what the two separate calls give."""
    x, y = [0.3, 0.7], [0.6, 0.4]
    k, h = ethanol_water.k_values_and_liquid_enthalpy(355.0, ATM, x, y)
    assert np.array_equal(k, ethanol_water.k_values(355.0, ATM, x, y))
    assert h == ethanol_water.liquid_enthalpy(355.0, ATM, x)


def test_given_nrtl_parameters_are_taken_up_with_their_alpha():
    """A case's own NRTL (tau = a + b/T, alpha 0.47, invented values of the size published for
    alcohol/water pairs): the fitted form, the same model, recovers alpha and tau to 1e-3."""
    a = ((0.0, -0.8), (3.4, 0.0))
    b = ((0.0, 250.0), (-600.0, 0.0))
    alpha = ((0.0, 0.47), (0.47, 0.0))
    mixture = build_mixture(("methanol", "water"), Thermo("nrtl", nrtl_a=a, nrtl_b=b, nrtl_alpha=alpha), ATM)
    f = fit_mixture(mixture, ATM, ATM + 20 * 800.0)
    assert f.nrtl_alpha[0][1] == pytest.approx(0.47, abs=1e-3)
    for T in (f.T_low, f.T_high):
        for i, j in ((0, 1), (1, 0)):
            assert f.nrtl_a[i][j] + f.nrtl_b[i][j] / T == pytest.approx(a[i][j] + b[i][j] / T, abs=1e-3)


def test_unifac_range_reaches_down_to_the_azeotrope(ethanol_water):
    """The range starts below the minimum-boiling azeotrope, not at ethanol's boiling point."""
    f = fit_mixture(ethanol_water, ATM, ATM + 30 * 800.0)
    assert f.T_low < ethanol_water.bubble_point(ATM, [0.894, 0.106]).T - 4.0


def test_peng_robinson_range_reaches_down_to_the_azeotrope():
    """Carbon dioxide/ethane at 20 bar with kij 0.13 (tests/cases/co2_ethane.toml): thermo's Peng-Robinson
    has a minimum-boiling azeotrope below carbon dioxide's own saturation temperature; the fitted range
    reaches below it, and a column whose distillate lies just short of it is found by the search and meets
    both specifications on thermo. Before, the range stopped 5 K under the carbon dioxide's saturation, above
    the column's top, and no column of 3 to 60 stages met the specifications in the model."""
    from pathlib import Path

    from disteco.api import cost_data_of, load_case, mixture_of
    from disteco.optimisation.design import optimise_design
    from disteco.optimisation.verification import SPEC_TOLERANCE, column_spec, key_fractions
    from disteco.properties import feed_state
    from disteco.properties.binary import all_azeotropes
    from disteco.sizing.options import sizing_options
    from disteco.stages.rigorous import solve_rigorous

    case = load_case(Path(__file__).parent / "cases" / "co2_ethane.toml")
    mixture = mixture_of(case)
    P = case.column.top_pressure
    (azeotrope,) = all_azeotropes(mixture, P)
    assert azeotrope.T < mixture.saturation_temperatures(P).min() - 0.5
    assert fit_mixture(mixture, P, P + 20e3).T_low < azeotrope.T - 4.0
    feed = feed_state(case.feed, mixture, P)
    optimum = optimise_design(case, mixture, feed, cost_data_of(case), None, sizing_options(case))
    assert 10 <= optimum.best.stages <= 40
    model = optimum.best.profile
    thermo = solve_rigorous(mixture, feed, column_spec(model, case), guess=model)
    assert max(key_fractions(thermo, case, feed).excess) <= SPEC_TOLERANCE


def test_five_component_k_values_within_2_percent():
    """Raoult K of C4-C7 paraffins within 2 % of thermo over the fitted range (measured: 0.6 %)."""
    names = ("n-butane", "isopentane", "n-pentane", "n-hexane", "n-heptane")
    mixture = build_mixture(names, Thermo("ideal"), 2.5e5)
    f = fit_mixture(mixture, 2.5e5, 2.5e5 + 40 * 700.0)
    x = [0.2] * 5
    for T in np.linspace(f.T_low, f.T_high, 9):
        assert f.k_values(T, 2.6e5, x) / mixture.k_values(T, 2.6e5, x) == pytest.approx(np.ones(5), abs=0.02)


def test_peng_robinson_bubble_points_within_one_kelvin():
    """Propane-n-butane at 15 bar (Peng-Robinson in thermo): fitted ln K(T, P) gives bubble
    temperatures within 1 K from 2 % to 98 % propane (measured: 0.75 K at most)."""
    mixture = build_mixture(("propane", "n-butane"), Thermo("peng-robinson"), 15e5)
    f = fit_mixture(mixture, 15e5, 15.5e5, z=(0.4, 0.6))
    assert f.form == "k-fit"
    for x1 in (0.02, 0.1, 0.4, 0.9, 0.98):
        x = [x1, 1.0 - x1]
        assert f.bubble_temperature(15.2e5, x) == pytest.approx(mixture.bubble_point(15.2e5, x).T, abs=1.0)


def test_enthalpy_and_volume_fits_follow_thermo(benzene_toluene, fitted_benzene_toluene):
    """Pure-liquid enthalpy within 100 J/mol, vapour enthalpy within 100 J/mol and liquid density
    within 1 % of thermo over the range (quadratic and linear fits)."""
    f = fitted_benzene_toluene
    for T in np.linspace(f.T_low, f.T_high, 7):
        for i, x in enumerate(([1.0, 0.0], [0.0, 1.0])):
            assert f.liquid_enthalpy_of(T, x) == pytest.approx(benzene_toluene.liquid_enthalpy(T, ATM, x), abs=100.0)
            assert f.vapour_enthalpy_of(T, x) == pytest.approx(benzene_toluene.vapour_enthalpy(T, ATM, x), abs=100.0)
            density = f.molar_mass(x) / f.liquid_molar_volume(T, x)
            assert density == pytest.approx(benzene_toluene.liquid_density(T, ATM, x), rel=0.01)


def test_peng_robinson_fit_follows_the_liquid_near_the_critical_region():
    """Ethane / propane / n-butane at 25 bar (thermo's Peng-Robinson as reference): the fitted bubble
    temperature within 0.6 K over random liquids and the near-pure ends, top to a 60-stage bottom
    (measured: 0.34 K; without the composition terms of the K fit 7.6 K, the distillate end 7 K low)."""
    P_top = 25e5
    mixture = build_mixture(("ethane", "propane", "n-butane"), Thermo("peng-robinson"), P_top)
    f = fit_mixture(mixture, P_top, P_top + 60 * 700.0, z=(0.3, 0.4, 0.3))
    liquids = [np.array(x) for x in ((0.973, 0.027, 0.0), (0.0, 0.05, 0.95), (0.5, 0.5, 0.0))]
    liquids += list(np.random.default_rng(7).dirichlet(np.full(3, 0.8), 12))
    for P in (P_top, P_top + 30 * 700.0):
        for x in liquids:
            assert f.bubble_temperature(P, x) == pytest.approx(mixture.bubble_point(P, x).T, abs=0.6)


def test_peng_robinson_liquid_enthalpy_of_a_depropaniser_above_propane_saturation():
    """Bubble-point liquids of propane/isobutane/n-butane at 17.2 bar (reboiler above propane's Tc):
    the fitted liquid enthalpy within 500 J/mol of thermo's Peng-Robinson (about 3 % of the latent
    heat; measured 148 J/mol). Pure propane has no liquid root over most of this range; while the
    vapour root was fitted as its liquid the error was 3100 J/mol."""
    mixture = build_mixture(("propane", "isobutane", "n-butane"), Thermo("peng-robinson"), 17e5)
    fitted = fit_mixture(mixture, 17.0e5, 17.4e5, z=[0.4, 0.25, 0.35])
    for x_propane in np.linspace(0.01, 0.99, 8):
        x = np.array([x_propane, 0.42 * (1 - x_propane), 0.58 * (1 - x_propane)])
        T = mixture.bubble_point(17.2e5, x).T
        assert fitted.liquid_enthalpy_of(T, x) == pytest.approx(mixture.liquid_enthalpy(T, 17.2e5, x), abs=500.0)


def test_peng_robinson_enthalpies_fitted_where_the_column_phases_exist():
    """Propane / isobutane / n-butane at 17 bar (thermo's Peng-Robinson as reference): liquid and vapour
    enthalpies of bubble-point states within 100 J/mol, top to a 30-stage bottom (measured 6 J/mol;
    fitted on pure components, with propane supercritical at the reboiler, the column's enthalpies were
    2.9 kJ/mol off and the optimum missed both recoveries on thermo by 5-10 %)."""
    P_top = 17e5
    mixture = build_mixture(("propane", "isobutane", "n-butane"), Thermo("peng-robinson"), P_top)
    f = fit_mixture(mixture, P_top, P_top + 30 * 1000.0, z=(0.4, 0.22, 0.38))
    for P in (P_top, P_top + 20e3):
        for x in np.random.default_rng(3).dirichlet(np.full(3, 0.7), 10):
            point = mixture.bubble_point(P, x)
            assert f.liquid_enthalpy_of(point.T, x) == pytest.approx(mixture.liquid_enthalpy(point.T, P, x), abs=100.0)
            assert f.vapour_enthalpy_of(point.T, point.y) == pytest.approx(
                mixture.vapour_enthalpy(point.T, P, point.y), abs=100.0)


def _fitted_as_designed(path):
    """(mixture, feed, the case's own thermo stage profile, the separation problem's fitted forms) of a case file."""
    from disteco.api import load_case, mixture_of
    from disteco.optimisation.problem import remember_column_profile, separation_problem
    from disteco.properties import feed_state
    from disteco.stages import design_stages

    case = load_case(path)
    mixture = mixture_of(case)
    feed = feed_state(case.feed, mixture, case.column.top_pressure)
    profile = design_stages(mixture, feed, case.products, case.column).profile
    remember_column_profile(case, mixture, feed, profile)  # as the checks do
    return mixture, feed, profile, separation_problem(case, mixture, feed, 60).fitted


def test_k_fit_on_the_column_liquids_where_the_sampled_fit_misses():
    """An equation of state's K fit is made on liquids sampled over the whole composition range;
    on the demethaniser case (tests/cases/demethaniser_partial.toml: nitrogen to n-butane at 28
    bar, keys methane/ethane) that fit misses thermo's bubble points along the case's own thermo
    stage profile by more than the fit check's 1 K, so the separation problem is fitted again on
    that profile's stage liquids and meets thermo there within 0.3 K (measured 0.05 K along the
    verified column). The depentaniser example's sampled fit is within the tolerances and kept."""
    from pathlib import Path

    from disteco.optimisation.fit_check import check_fit

    from conftest import EXAMPLES

    for path, refitted in ((Path(__file__).parent / "cases" / "demethaniser_partial.toml", True),
                           (EXAMPLES / "depentaniser.toml", False)):
        mixture, feed, profile, fitted = _fitted_as_designed(path)
        sampled = fit_mixture(mixture, fitted.P_low, fitted.P_high, z=feed.z)
        assert (fitted.k_fit != sampled.k_fit) == refitted, path.name
        if refitted:
            assert check_fit(sampled, mixture, profile).max_bubble_temperature_error > 1.0
            assert check_fit(fitted, mixture, profile).max_bubble_temperature_error < 0.3
        else:
            assert check_fit(fitted, mixture, profile).within_tolerance


def test_surface_tension_stays_positive_past_a_light_components_critical_temperature():
    """Ethane/propane/n-butane at 40 bar (Peng-Robinson): the bottoms liquid of a deethaniser there
    (386 K, above propane's critical temperature, 370 K) took the fitted pure lines' mean below
    zero and ended `design` in an internal error (a complex (sigma/0.020)^0.2 in the flooding
    correlation). The floored mean stays positive over the fitted range, equals the mean within 1 %
    from 1 mN/m up, and lies between zero and thermo's own mixture value (Diguilio-Teja near the
    critical point) where the lines fail: a lower surface tension sizes a wider column."""
    mixture = build_mixture(("ethane", "propane", "n-butane"), Thermo("peng-robinson"), 40e5)
    f = fit_mixture(mixture, 40e5, 40.16e5, z=[0.3, 0.4, 0.3])
    x = [0.0086, 0.5616, 0.4298]

    def mean(T):
        return sum(x[i] * f._poly(f.surface_tension[i], T) for i in range(3))

    assert mean(390.0) < 0.0
    for T in np.linspace(f.T_low, f.T_high, 15):
        assert f.surface_tension_of(T, x) > 0.0
        if mean(T) >= 1e-3:
            assert f.surface_tension_of(T, x) == pytest.approx(mean(T), rel=0.01)
    for T in (386.0, 390.0):
        assert 0.0 < f.surface_tension_of(T, x) < mixture.surface_tension(T, x)



def test_nrtl_pairs_fitted_again_together_on_the_column_liquids_of_three_components():
    """NRTL pairs fitted one by one to UNIFAC-Dortmund's binaries miss the liquid of three components
    (methanol/ethanol/water, tests/cases/alcohols_aqueous.toml: 0.73 K and 0.016 in a vapour fraction
    along the case's own thermo profile, the fit check allowing 1 K and 0.01; the model's column then
    needed R 12.1 where thermo's needs 9.2, TAC 30 % high). Fitted together on the binaries and the stage
    liquids they meet thermo there within 0.5 K and 0.008 (0.32 K, 0.006), each binary still within 0.08 in
    ln(gamma) over its grid (0.027, 0.018 and 0.069 against the pair fits' 0.014, 0.018 and 0.032; thermo's
    UNIFAC-Dortmund is the reference). A binary (ethanol-water) keeps its pair fit, and so do four aqueous
    alcohols (tests/cases/alcohols_four_aqueous.toml), where the joint fit cut no third of the misfit
    (0.0099 -> 0.0096 in a vapour fraction) and had cost 2.3 s at each of a run's twelve pressure ranges
    (the design 121 -> 40 s)."""
    from pathlib import Path

    from disteco.optimisation.fit_check import check_fit
    from disteco.properties.fitted import X_GRID

    from conftest import EXAMPLES

    cases = Path(__file__).parent / "cases"
    for path, refitted in ((cases / "alcohols_aqueous.toml", True), (EXAMPLES / "ethanol_water.toml", False),
                           (cases / "alcohols_four_aqueous.toml", False)):
        mixture, feed, profile, fitted = _fitted_as_designed(path)
        pairs = fit_mixture(mixture, fitted.P_low, fitted.P_high, z=feed.z)
        # compared by ln(gamma) on the column's liquids, not by parameters: a pair's a and b trade off along a
        # flat valley (tau = a + b/T over a narrow range of T), and two fits of the same points have ended
        # 0.05 K apart in b, 1e-4 in a, with ln(gamma) the same to 1e-6
        apart = max(abs(g - h) for T, x in zip(profile.T, profile.x)
                    for g, h in zip(fitted.ln_gamma(T, list(x)), pairs.ln_gamma(T, list(x))))
        assert (apart > 1e-3 if refitted else apart < 1e-5), (path.name, apart)
        if not refitted:
            continue
        before, after = check_fit(pairs, mixture, profile), check_fit(fitted, mixture, profile)
        assert before.max_vapour_fraction_error > 0.01 and not before.within_tolerance
        assert after.max_vapour_fraction_error < 0.008 and after.max_bubble_temperature_error < 0.5
        P = fitted.P_low
        for i, j in ((0, 1), (0, 2), (1, 2)):
            for T in np.linspace(fitted.T_low, fitted.T_high, 4):
                for xi in X_GRID:
                    x = np.zeros(3)
                    x[i], x[j] = xi, 1.0 - xi
                    thermo = np.log(mixture.k_values(T, P, x) * P / mixture.vapour_pressures(T))
                    assert np.abs(np.array(fitted.ln_gamma(T, list(x))) - thermo)[[i, j]].max() < 0.08


def test_the_pair_fits_closed_form_is_the_general_nrtl_for_two_components():
    """The fits' two-component NRTL (closed form, for speed) equals the model's general formula."""
    from disteco.properties.fitted import _binary_nrtl, nrtl_ln_gamma

    T, x1 = np.array([330.0, 360.0, 390.0]), np.array([0.05, 0.5, 0.95])
    a12, a21, b12, b21, alpha = 0.4, 1.2, -150.0, 420.0, 0.35
    closed = _binary_nrtl((a12, a21, b12, b21, alpha), T, x1)
    general = nrtl_ln_gamma(((0.0, a12), (a21, 0.0)), ((0.0, b12), (b21, 0.0)), ((0.0, alpha), (alpha, 0.0)),
                            T, (x1, 1.0 - x1), np.exp)
    np.testing.assert_allclose(closed, general, rtol=1e-12)
