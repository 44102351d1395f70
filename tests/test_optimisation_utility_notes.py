"""Notes on a condenser or reboiler kept off the cheapest utility level: the pressure that frees it.

The pressure found is checked on thermo's own bubble points (the saturation temperature of the
product moves by the shift the cheaper level needs) and on the sizing layer's own utility choice
(at the moved temperatures the cheaper level fits with the minimum approach).
"""

import re

import pytest

from disteco.optimisation.utility_notes import pressure_for, utility_level_notes
from disteco.sizing import SizingOptions, UtilityLevel, size_column
from disteco.sizing.exchangers import choose_utility
from test_sizing_column import make_profile

C = 273.15
LEVELS = (  # invented for the test: a cooling-water loop, chilled water, two steam mains
    UtilityLevel("cooling_water", "cooling", "cooling_water", C + 30, C + 45, heat_capacity=4180.0),
    UtilityLevel("chilled_water", "cooling", "chilled_water", C + 5, C + 15, heat_capacity=4190.0),
    UtilityLevel("lp_steam", "heating", "steam", C + 130, C + 130, latent_heat=2.17e6),
    UtilityLevel("mp_steam", "heating", "steam", C + 184, C + 184, latent_heat=2.0e6),
)
def _notes(mixture, profile, sized, levels=LEVELS):
    return utility_level_notes(mixture, profile, sized.condenser, sized.reboiler, levels, 10.0)


@pytest.fixture(scope="module")
def vacuum(benzene_toluene):
    """Benzene-toluene at 20 kPa: the top near 30 degC is too cold for cooling water."""
    profile = make_profile(benzene_toluene, top=20e3)
    return profile, size_column(profile, benzene_toluene, LEVELS, 850.0, 1000.0)


def test_condenser_note_gives_the_pressure_at_which_cooling_water_fits(benzene_toluene, vacuum):
    profile, sized = vacuum
    assert sized.condenser.utility.name == "chilled_water"
    [note] = [n for n in _notes(benzene_toluene, profile, sized)
              if n.startswith("condenser")]
    # cooling water's return end binds: the condensing side must reach 45 + 10 degC
    shift = C + 55.0 - sized.condenser.process_in
    assert float(re.search(r"needs its process side ([\d.]+) K warmer", note).group(1)) == pytest.approx(shift,
                                                                                                      abs=0.05)
    xd = profile.distillate_composition
    found = pressure_for(lambda P: benzene_toluene.bubble_point(P, xd).T, profile.P[0], shift)
    assert f"top pressure of about {found / 1e3:.3g} kPa" in note and "now 20 kPa" in note
    moved = benzene_toluene.bubble_point(found, xd).T - benzene_toluene.bubble_point(profile.P[0], xd).T
    assert moved == pytest.approx(shift, abs=1e-3)
    level = choose_utility(LEVELS, "cooling", sized.condenser.process_in + moved,
                           sized.condenser.process_out + moved + 1e-6, 10.0, "condenser")
    assert level.name == "cooling_water"
    assert "the reboiler would then take lp_steam" in note
    assert not any(n.startswith("reboiler") for n in _notes(benzene_toluene, profile, sized))


def test_partial_condenser_moves_with_the_vapour_distillate_dew_point(benzene_toluene, vacuum):
    """With a vapour distillate the condensing side follows its dew point, not a bubble point."""
    import dataclasses

    profile = dataclasses.replace(vacuum[0], partial_condenser=True)
    sized = size_column(profile, benzene_toluene, LEVELS, 850.0, 1000.0)
    [note] = [n for n in _notes(benzene_toluene, profile, sized)
              if n.startswith("condenser")]
    shift = C + 55.0 - sized.condenser.process_in
    yd = profile.distillate_composition
    dew = pressure_for(lambda P: benzene_toluene.dew_point(P, yd).T, profile.P[0], shift)
    bubble = pressure_for(lambda P: benzene_toluene.bubble_point(P, yd).T, profile.P[0], shift)
    assert f"top pressure of about {dew / 1e3:.3g} kPa" in note
    assert f"{dew / 1e3:.3g}" != f"{bubble / 1e3:.3g}"


def test_note_names_the_next_cheaper_level(benzene_toluene, vacuum):
    """With a still warmer cooling level offered, the note is about the level next to the one taken."""
    profile, sized = vacuum
    warm = UtilityLevel("tempered_water", "cooling", "cooling_water", C + 38, C + 48, heat_capacity=4180.0)
    [note] = [n for n in _notes(benzene_toluene, profile, sized, (warm,) + LEVELS)
              if n.startswith("condenser")]
    assert note.startswith("condenser on chilled_water: cooling_water (30.0 -> 45.0 degC)")


def test_reboiler_note_gives_the_lower_pressure_for_the_cheaper_steam(benzene_toluene):
    """At 3 bar the toluene-rich bottoms boil near 152 degC, above what 130-degC steam can heat."""
    profile = make_profile(benzene_toluene, top=3e5)
    sized = size_column(profile, benzene_toluene, LEVELS, 850.0, 1000.0)
    assert sized.reboiler.utility.name == "mp_steam"
    [note] = _notes(benzene_toluene, profile, sized)
    assert note.startswith("reboiler on mp_steam: lp_steam (130.0 -> 130.0 degC) needs its process side")
    shift = sized.reboiler.process_out - (C + 120.0)  # 10 K below the steam at the hotter end
    assert float(re.search(r"([\d.]+) K cooler", note).group(1)) == pytest.approx(shift, abs=0.05)
    xb = profile.bottoms_composition
    bottom = pressure_for(lambda P: benzene_toluene.bubble_point(P, xb).T, profile.P[-1], -shift)
    assert benzene_toluene.bubble_point(bottom, xb).T == pytest.approx(C + 120.0, abs=1e-3)
    top = profile.P[0] + bottom - profile.P[-1]  # the column's own pressure drop kept
    assert f"top pressure of about {top / 1e5:.3g} bar" in note and "condenser would then take cooling_water" in note


def test_no_note_when_the_cheapest_levels_fit(benzene_toluene):
    profile = make_profile(benzene_toluene)
    sized = size_column(profile, benzene_toluene, LEVELS, 850.0, 1000.0, SizingOptions())
    assert (sized.condenser.utility.name, sized.reboiler.utility.name) == ("cooling_water", "lp_steam")
    assert _notes(benzene_toluene, profile, sized) == ()


def test_no_note_where_no_pressure_frees_the_exchanger(benzene_toluene):
    """Cooling water as a reboiler's heat source (30 -> 20 degC, offered for reboilers below ambient) is
    the next cheaper level of a steam-heated benzene-toluene reboiler near 110 degC at 1 bar, which no
    column pressure above 0.5 kPa brings below 10 degC: no note."""
    warm = UtilityLevel("warm_water", "heating", "warm_water", C + 30, C + 20, heat_capacity=4180.0)
    levels = LEVELS + (warm,)
    profile = make_profile(benzene_toluene)
    sized = size_column(profile, benzene_toluene, levels, 850.0, 1000.0, SizingOptions())
    assert sized.reboiler.utility.name == "lp_steam"
    assert _notes(benzene_toluene, profile, sized, levels) == ()


def test_no_pressure_found_is_said(benzene_toluene, vacuum):
    """A shift no pressure within the bracket reaches (500 K warmer) is reported, not invented."""
    profile, _ = vacuum
    xd = profile.distillate_composition
    assert pressure_for(lambda P: benzene_toluene.bubble_point(P, xd).T, profile.P[0], 500.0) is None


def test_no_note_where_the_other_exchanger_would_have_no_level(benzene_toluene):
    """At 3 bar the reboiler takes mp_steam; lp_steam would need the column near 1.7 bar, where the top
    (about 100 degC) is too cold for the only cooling level offered here, a tempered-water loop at
    90 -> 100 degC (invented): no column to try, so no note."""
    tempered = UtilityLevel("tempered_water", "cooling", "cooling_water", C + 90, C + 100, heat_capacity=4200.0)
    levels = (tempered,) + LEVELS[2:]
    profile = make_profile(benzene_toluene, top=3e5)
    sized = size_column(profile, benzene_toluene, levels, 850.0, 1000.0)
    assert (sized.condenser.utility.name, sized.reboiler.utility.name) == ("tempered_water", "mp_steam")
    assert _notes(benzene_toluene, profile, sized, levels) == ()
    # the same column with cooling water offered too gets its note (the condenser would take it)
    [note] = _notes(benzene_toluene, profile, sized, LEVELS)
    assert note.startswith("reboiler on mp_steam: lp_steam") and "condenser would then take cooling_water" in note


def test_a_note_that_moves_the_other_exchanger_to_a_dearer_level_says_so(benzene_toluene):
    """At 3 bar the condenser takes the warmest cooling level offered (tempered water, 90 -> 100 degC,
    invented) and the reboiler mp_steam; the 1.7 bar that lp_steam needs brings the top near 100 degC,
    onto cooling water, a dearer level: the note says so. With prices (invented, per GJ of duty) it
    gives both yearly changes at the profile's duties, and is left out where their sum is no saving."""
    from disteco._base.errors import CostDataError
    from disteco.optimisation.utility_notes import UtilityPricing

    tempered = UtilityLevel("tempered_water", "cooling", "cooling_water", C + 90, C + 100, heat_capacity=4200.0)
    levels = (tempered,) + LEVELS
    profile = make_profile(benzene_toluene, top=3e5)
    sized = size_column(profile, benzene_toluene, levels, 850.0, 1000.0)
    assert (sized.condenser.utility.name, sized.reboiler.utility.name) == ("tempered_water", "mp_steam")
    [note] = _notes(benzene_toluene, profile, sized, levels)
    assert note.startswith("reboiler on mp_steam: lp_steam")
    assert re.search(r"condenser would then take cooling_water \([\d.]+ -> [\d.]+ degC\), a dearer level than its "
                     r"tempered_water now\. ", note)

    def priced(per_gj):
        seconds = 8000.0 * 3600.0
        return UtilityPricing(lambda name, duty: duty * seconds * per_gj[name] / 1e9, "USD")

    prices = {"tempered_water": 0.2, "cooling_water": 0.5, "lp_steam": 6.0, "mp_steam": 8.0}
    [note] = utility_level_notes(benzene_toluene, profile, sized.condenser, sized.reboiler, levels, 10.0,
                                 priced(prices))
    year = 8000.0 * 3600.0 / 1e9
    reboiler = profile.reboiler_duty * year * (6.0 - 8.0)
    condenser = profile.condenser_duty * year * (0.5 - 0.2)
    assert (f"at the present duties the two utilities would cost about {-(reboiler + condenser):,.0f} USD a year less "
            f"(reboiler {reboiler:+,.0f}, condenser {condenser:+,.0f})") in note
    dear_water = dict(prices, cooling_water=8.0)  # the condenser's move would cost more than the steam saves
    assert utility_level_notes(benzene_toluene, profile, sized.condenser, sized.reboiler, levels, 10.0,
                               priced(dear_water)) == ()

    def unpriced(name, duty):  # a level the scenario has no price for: the note stands without money
        raise CostDataError("utility_prices.csv", f"no price for {name}")

    [note] = utility_level_notes(benzene_toluene, profile, sized.condenser, sized.reboiler, levels, 10.0,
                                 UtilityPricing(unpriced, "USD"))
    assert note.startswith("reboiler on mp_steam: lp_steam") and "a year less" not in note


def test_no_reboiler_note_below_the_columns_own_pressure_drop(benzene_toluene, vacuum):
    """At 20 kPa the toluene bottoms boil near 65 degC on lp_steam; warm water would need them near
    10 degC, a bottom pressure of a few kPa, below what the column's own pressure drop allows: no
    reboiler note, while the condenser's note (cooling water at a higher top pressure) stays."""
    warm = UtilityLevel("warm_water", "heating", "warm_water", C + 30, C + 20, heat_capacity=4180.0)
    levels = LEVELS + (warm,)
    profile, _ = vacuum
    sized = size_column(profile, benzene_toluene, levels, 850.0, 1000.0)
    assert sized.reboiler.utility.name == "lp_steam"
    notes = _notes(benzene_toluene, profile, sized, levels)
    assert [n.split(":")[0] for n in notes] == ["condenser on chilled_water"]


def test_suggested_top_pressure_never_reads_as_the_present_one():
    """A suggested top pressure 0.15 % above the present one gets the digits that tell them apart (a
    dimethyl ether column at 13 bar was told "about 13 bar (now 13 bar)")."""
    from disteco.optimisation.utility_notes import _kpa

    assert _kpa(13.02e5, 13e5) == "13.02 bar"
    assert _kpa(8.46e5, 13e5) == "8.46 bar"
    assert _kpa(45.123e3, 45.1e3) == "45.12 kPa"
    assert _kpa(13e5, 13e5) == "13 bar"  # the same pressure stops at 6 digits
