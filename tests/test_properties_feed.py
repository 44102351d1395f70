"""Feed thermal condition q against a hand calculation with thermo's Peng-Robinson enthalpies."""

import pytest
from thermo import CEOSGas, CEOSLiquid, ChemicalConstantsPackage, FlashVL, PRMIX

from disteco.case import Feed, FeedFlow, ThermalCondition, Thermo
from disteco.properties import build_mixture, feed_state

NAMES = ("propane", "isobutane", "n-butane")
Z = (0.40, 0.25, 0.35)
P_COLUMN = 11e5


@pytest.fixture(scope="module")
def hand():
    """thermo's own Peng-Robinson flash (zero kij), set up here independently of disteco."""
    constants, correlations = ChemicalConstantsPackage.from_IDs(list(NAMES))
    eos = dict(Tcs=constants.Tcs, Pcs=constants.Pcs, omegas=constants.omegas, kijs=[[0.0] * 3 for _ in range(3)])
    state = dict(T=300.0, P=P_COLUMN, zs=list(Z))
    gas = CEOSGas(PRMIX, eos_kwargs=eos, HeatCapacityGases=correlations.HeatCapacityGases, **state)
    liquid = CEOSLiquid(PRMIX, eos_kwargs=eos, HeatCapacityGases=correlations.HeatCapacityGases, **state)
    return FlashVL(constants, correlations, liquid=liquid, gas=gas)


@pytest.fixture(scope="module")
def mixture():
    return build_mixture(NAMES, Thermo("peng-robinson"), P_COLUMN)


def hand_q(flasher, feed_spec: dict, P_feed: float) -> float:
    """q = (H_dew - H_feed) / (H_dew - H_bubble), saturation at the column pressure, feed at its own."""
    h_bubble = flasher.flash(P=P_COLUMN, VF=0.0, zs=list(Z)).H()
    h_dew = flasher.flash(P=P_COLUMN, VF=1.0, zs=list(Z)).H()
    h_feed = flasher.flash(P=P_feed, zs=list(Z), **feed_spec).H()
    return (h_dew - h_feed) / (h_dew - h_bubble)


@pytest.mark.parametrize("kind, value, spec, P_feed", [
    ("temperature", 293.15, {"T": 293.15}, None),  # subcooled liquid, q about 1.29
    ("temperature", 333.15, {"T": 333.15}, None),  # two-phase feed
    ("vapour_fraction", 0.3, {"VF": 0.3}, None),
    ("temperature", 293.15, {"T": 293.15}, 16e5),  # liquid held at 16 bar, let down into the column
    ("vapour_fraction", 0.0, {"VF": 0.0}, 16e5),  # saturated at 16 bar: flashes on entry, q < 1
])
def test_q_against_hand_calculation_with_thermo_pr_enthalpies(hand, mixture, kind, value, spec, P_feed):
    """Hand calculation with thermo's PR enthalpies (FlashVL with PRMIX phases, built in the test):
    q = (H_dew - H_feed)/(H_dew - H_bubble). Same equation of state: agreement to 1e-6."""
    feed = Feed(FeedFlow("molar", 50.0), Z, ThermalCondition(kind, value), P_feed)
    state = feed_state(feed, mixture, P_COLUMN)
    assert state.q == pytest.approx(hand_q(hand, spec, P_feed or P_COLUMN), abs=1e-6)
    # the vapour fraction on entry, thermo's flash at the feed's temperature and the column's pressure; not
    # computed for a feed let down from its own pressure (it flashes on entry)
    if P_feed is None:
        assert state.vapour_fraction == pytest.approx(hand.flash(P=P_COLUMN, zs=list(Z), **spec).VF, abs=1e-6)
    else:
        assert state.vapour_fraction is None


def test_saturated_liquid_feed_at_column_pressure_has_q_one(mixture):
    feed = Feed(FeedFlow("molar", 50.0), Z, ThermalCondition("vapour_fraction", 0.0), None)
    assert feed_state(feed, mixture, P_COLUMN).q == pytest.approx(1.0, abs=1e-9)


def test_a_feed_written_in_mass_fractions_is_the_same_feed():
    """The propane/isobutane/n-butane feed above, written as mass fractions w_i = z_i M_i / sum(z_j M_j)
    and as a mass flow, gives the feed state of the mole-fraction case: the same mole fractions, molar
    flow and q. By hand with the molar masses 44.10, 58.12 and 58.12 g/mol (from memory: CRC Handbook of
    Chemistry and Physics), 40 mol % propane is 33.6 % by mass."""
    from disteco.properties import mole_fractions

    mixture = build_mixture(NAMES, Thermo("peng-robinson"), P_COLUMN)
    M = mixture.molar_masses
    mass = [z * m for z, m in zip(Z, M)]
    w = tuple(x / sum(mass) for x in mass)
    assert w[0] == pytest.approx(0.40 * 44.10 / (0.40 * 44.10 + 0.60 * 58.12), rel=1e-3)
    assert w[0] == pytest.approx(0.336, abs=5e-4)
    molar_flow = 50.0  # mol/s
    moles = Feed(FeedFlow("molar", molar_flow), Z, ThermalCondition("temperature", 320.0), None)
    masses = Feed(FeedFlow("mass", molar_flow * sum(mass)), w, ThermalCondition("temperature", 320.0), None, "mass")
    assert mole_fractions(masses, mixture) == pytest.approx(Z, abs=1e-12)
    a, b = feed_state(moles, mixture, P_COLUMN), feed_state(masses, mixture, P_COLUMN)
    assert b.z == pytest.approx(a.z, abs=1e-12)
    assert b.molar_flow == pytest.approx(molar_flow, rel=1e-12)
    assert b.q == pytest.approx(a.q, rel=1e-9)


def test_a_subcooled_feed_given_by_q_has_its_own_temperature(benzene_toluene):
    """Geankoplis, Transport Processes and Separation Process Principles, 4th ed., Example 11.4-1 (from
    memory): benzene-toluene, x_F = 0.45, fed at 54.4 degC to a column at 1 atm where it boils at
    93.5 degC: q = 1.195 (his constant heat capacity 159 kJ/kmol K and latent heat 32,099 kJ/kmol).
    On thermo's enthalpies the two directions agree with his within 1 K and 0.01."""
    def state(condition):
        return feed_state(Feed(FeedFlow("molar", 1.0), (0.45, 0.55), condition, None), benzene_toluene, 101325.0)

    given_q = state(ThermalCondition("q", 1.195))
    assert given_q.bubble_T - 273.15 == pytest.approx(93.5, abs=0.3)
    assert given_q.temperature - 273.15 == pytest.approx(54.4, abs=1.0)
    assert state(ThermalCondition("temperature", 54.4 + 273.15)).q == pytest.approx(1.195, abs=0.01)


def test_a_q_colder_than_the_feed_can_be_is_refused(benzene_toluene):
    """q = 5 asked for a benzene-toluene liquid about 800 K below its bubble point; it was designed as
    given. Refused naming feed.q, where the liquid would freeze (benzene's liquidus) and the largest q
    this feed allows, which itself is accepted."""
    from disteco._base.errors import CaseError

    def state(q):
        return feed_state(Feed(FeedFlow("molar", 1.0), (0.42, 0.58), ThermalCondition("q", q), None),
                          benzene_toluene, 115000.0)

    with pytest.raises(CaseError) as refused:
        state(5.0)
    text = str(refused.value)
    assert text.startswith("feed.q: q = 5 asks for a liquid feed colder than its freezing point (benzene freezes")
    largest = float(text.split("q up to ")[1].split(" ")[0])
    assert 1.4 < largest < 1.9
    coldest = state(largest - 0.005)
    assert coldest.temperature < 273.15 - 30.0


def test_the_console_states_the_feed_condition_from_q(mixture):
    """The console's feed line names the condition q describes: above 1 a subcooled liquid, 1 saturated,
    between 0 and 1 partly vaporised with the feed's own vapour fraction where known (not 1 - q: q weighs
    the phases by enthalpy), below 0 a superheated vapour."""
    from disteco.reports.text import feed_condition, feed_line

    cold = feed_state(Feed(FeedFlow("molar", 50.0), Z, ThermalCondition("temperature", 293.15), None), mixture,
                      P_COLUMN)
    assert feed_line(cold) == (f"Feed: 180.00 kmol/h at 20.00 degC and 1100.00 kPa, q {cold.q:.3f} [-] "
                               "(subcooled liquid)")
    assert [feed_condition(q) for q in (1.0002, 0.9998, 0.0, -0.0004)] == ["saturated liquid"] * 2 + [
        "saturated vapour"] * 2
    assert feed_condition(0.3) == "partly vaporised"
    assert feed_condition(0.3, 0.62) == "partly vaporised, vapour fraction 0.620"
    flashed = feed_state(Feed(FeedFlow("molar", 50.0), Z, ThermalCondition("vapour_fraction", 0.3), None), mixture,
                         P_COLUMN)
    assert feed_line(flashed).endswith(f"q {flashed.q:.3f} [-] (partly vaporised, vapour fraction 0.300)")
    assert abs(flashed.q - 0.7) > 2e-3  # q weighs by enthalpy: 0.703 here, 0.556 on a wide-boiling feed
    assert feed_condition(-0.2) == "superheated vapour"
