"""Validation of the cost engine against published constants, tables and hand calculations.

Sources:
[T] Turton, Bailie, Whiting, Shaeiwitz, Bhattacharyya, Analysis, Synthesis and Design of
    Chemical Processes, 4th ed., Prentice Hall 2012, Appendix A (Tables A.1, A.2, A.4,
    Figure A.18, Table A.6) and Table 8.3. Constants as recalled, flagged 'from memory'
    in the data files; the hand calculations below redo the printed equation with the
    constants typed in, so a slip in the data file or the code is caught.
[IAPWS] IAPWS-95 formulation for water, as implemented in the chemicals library.
"""

import math

import pytest

from disteco.costing import (ColumnCostInput, UtilityPrice, capital_recovery_factor, cost_column, cost_equipment,
                             cost_trays, escalate, load_cost_data, utility_cost)

DATA = load_cost_data()
BASE = 397.0  # CEPCI of [T] Appendix A (September 2001)
REL = 1e-3  # hand calculations are carried to about 4-5 significant figures


# size [SI], K1, K2, K3 of [T] Table A.1, and log10(Cp0) and Cp0 worked by hand (4-5 digits)
TABLE_A1 = {
    "vertical_vessel": (50.0, 3.4974, 0.4485, 0.1074, 4.5694, 37102),  # V = 50 m3
    "horizontal_vessel": (10.0, 3.5565, 0.3776, 0.0905, 4.0246, 10583),  # V = 10 m3
    "sieve_tray": (3.14, 2.9949, 0.4465, 0.3961, 3.31459, 2063),  # A = 3.14 m2 (2 m tray)
    "valve_tray": (3.14, 3.3322, 0.4838, 0.3434, 3.65741, 4544),
    "fixed_tube_sheet_exchanger": (100.0, 4.3247, -0.3030, 0.1634, 4.3723, 23567),
    "floating_head_exchanger": (100.0, 4.8306, -0.8509, 0.3187, 4.4036, 25328),
    "kettle_reboiler": (50.0, 4.4646, -0.5277, 0.3955, 4.70966, 51246),
    "thermosiphon_reboiler": (100.0, 4.3247, -0.3030, 0.1634, 4.3723, 23567),  # costed as fixed tube sheet
    "u_tube_exchanger": (100.0, 4.1884, -0.2503, 0.1974, 4.4774, 30019),
    "centrifugal_pump": (10e3, 3.3892, 0.0536, 0.1538, 3.5966, 3950),  # 10 kW shaft power
    # not [T]: the vapour line's rule of thumb, 150 USD per inch of diameter per metre (from memory),
    # is 150/(pi 0.0254) = 1880 USD per m2 of pi D L; 50 m2 (a 0.4 m line 40 m long)
    "vapour_line": (50.0, 3.2741, 1.0, 0.0, 4.97307, 93987),
}


@pytest.mark.parametrize("item", sorted(TABLE_A1))
def test_purchased_cost_matches_hand_calculation_from_table_a1(item):
    """[T] Table A.1: log10 Cp0 = K1 + K2 log10 A + K3 (log10 A)^2, worked by hand at one size."""
    size, k1, k2, k3, log_cp, cp = TABLE_A1[item]
    curve = DATA.curve(item)
    assert (curve.k1, curve.k2, curve.k3) == (k1, k2, k3)
    assert curve.base_index == BASE
    a = size / curve.si_per_unit
    assert k1 + k2 * math.log10(a) + k3 * math.log10(a) ** 2 == pytest.approx(log_cp, abs=1e-4)
    assert curve.purchased_cost(size) == pytest.approx(cp, rel=REL)


def test_every_curve_has_a_hand_calculation():
    """Each row of purchased_cost_correlations.csv is checked against [T] Table A.1 above."""
    assert {c.item for c in DATA.curves} == set(TABLE_A1)


def test_curve_expression_takes_other_log_and_exp():
    """The same constants give the same number through the log/exp form used for model expressions."""
    curve = DATA.curve("floating_head_exchanger")
    assert curve.expression(100.0) == pytest.approx(25328, rel=REL)
    assert curve.expression(100.0) == pytest.approx(curve.purchased_cost(100.0), rel=1e-12)


def test_exchanger_pressure_factor_and_bare_module_hand_calculation():
    """[T] Tables A.2 and A.4: floating head, 100 m2, CS/SS at 20 barg.

    Fp: log10 Fp = 0.03881 - 0.11272 (1.30103) + 0.08183 (1.30103)^2 = 0.03067 -> 1.0732.
    FBM = 1.63 + 1.66 (1.81)(1.0732) = 4.8545; CBM = 25328 x 4.8545 = 122,956 at CEPCI 397.
    """
    cost = cost_equipment(DATA, "condenser", "floating_head_exchanger", 100.0, BASE, material="CS/SS",
                          pressure_gauge=20e5)
    assert cost.pressure_factor == pytest.approx(1.0732, rel=REL)
    assert cost.material_factor == 1.81
    assert cost.bare_module_factor == pytest.approx(4.8545, rel=REL)
    assert cost.installed == pytest.approx(122956, rel=2 * REL)
    assert cost.warnings == ()


def test_pump_pressure_factor_hand_calculation():
    """[T] Table A.2, centrifugal pump at 50 barg: log10 Fp = -0.3935 + 0.3957 (1.69897) - 0.00226 (2.88650)
    = 0.27227 -> Fp = 1.8722; FBM (cast iron) = 1.89 + 1.35 (1.0)(1.8722) = 4.4175 ([T] Table A.4)."""
    cost = cost_equipment(DATA, "pump", "centrifugal_pump", 10e3, BASE, material="CI", pressure_gauge=50e5)
    assert cost.pressure_factor == pytest.approx(1.8722, rel=REL)
    assert cost.bare_module_factor == pytest.approx(4.4175, rel=REL)
    assert cost.installed == pytest.approx(3950 * 4.4175, rel=2 * REL)


def test_low_pressure_gives_unit_pressure_factor():
    """[T] Table A.2: exchangers below 5 barg and pumps below 10 barg have Fp = 1."""
    assert cost_equipment(DATA, "c", "fixed_tube_sheet_exchanger", 50.0, BASE, pressure_gauge=4e5).pressure_factor == 1
    assert cost_equipment(DATA, "p", "centrifugal_pump", 5e3, BASE, pressure_gauge=9e5).pressure_factor == 1


def test_vessel_pressure_factor_and_bare_module_hand_calculation():
    """[T] Appendix A vessel pressure factor: 2 m tower at 10 barg.

    Fp = [(11)(2) / (2 (850 - 0.6 x 11)) + 0.00315] / 0.0063 = (0.013043 + 0.00315) / 0.0063 = 2.5703.
    FBM (CS) = 2.25 + 1.82 (1.0)(2.5703) = 6.9279 ([T] Table A.4, vertical vessels).
    """
    volume = math.pi / 4 * 2.0 ** 2 * 20.0
    cost = cost_equipment(DATA, "shell", "vertical_vessel", volume, BASE, pressure_gauge=10e5, diameter=2.0)
    assert cost.pressure_factor == pytest.approx(2.5703, rel=REL)
    assert cost.bare_module_factor == pytest.approx(6.9279, rel=REL)


def test_vacuum_vessel_takes_the_vacuum_factor():
    """[T] Appendix A: a vessel below -0.5 barg has Fp = 1.25."""
    cost = cost_equipment(DATA, "shell", "vertical_vessel", 30.0, BASE, pressure_gauge=-0.8e5, diameter=2.0)
    assert cost.pressure_factor == 1.25


def test_tray_quantity_factor_and_tray_cost_hand_calculation():
    """[T] Appendix A trays: log10 Fq = 0.4771 + 0.08516 log10 N - 0.3473 (log10 N)^2 (N < 20).

    N = 10: 0.4771 + 0.08516 - 0.3473 = 0.21496 -> Fq = 1.6402; N = 1: Fq = 3.0 (10^0.4771 = 3.0001).
    10 SS sieve trays of 3.14 m2: 10 x 1.6402 x 2063 x 1.8 (Table A.6) = 60,906.
    """
    assert DATA.tray_quantity.factor(1) == pytest.approx(3.0, rel=REL)
    assert DATA.tray_quantity.factor(25) == 1.0
    cost = cost_trays(DATA, "trays", "sieve_tray", 3.14, 10, BASE, material="SS")
    assert cost.quantity_factor == pytest.approx(1.6402, rel=REL)
    assert cost.installed == pytest.approx(60906, rel=2 * REL)


def test_escalation_hand_calculation():
    """Cost-index escalation C2 = C1 I2/I1 ([T] Section 7.2): 37,102 from 397 to 550.8 (CEPCI 2010,
    from memory) = 51,475."""
    assert escalate(37102.0, 397.0, 550.8) == pytest.approx(51475, rel=REL)
    cost = cost_equipment(DATA, "shell", "vertical_vessel", 50.0, DATA.cost_index.index(2010), diameter=2.0)
    assert cost.purchased_escalated == pytest.approx(51475, rel=REL)


@pytest.mark.parametrize("rate, years, expected", [(0.10, 10, 0.16275), (0.08, 20, 0.10185), (0.15, 5, 0.29832)])
def test_capital_recovery_factor_against_interest_tables(rate, years, expected):
    """A/P factors of standard compound-interest tables (e.g. Peters, Timmerhaus and West, Plant Design
    and Economics for Chemical Engineers, 5th ed., Chapter 7 interest tables), 5 decimals."""
    assert capital_recovery_factor(rate, years) == pytest.approx(expected, abs=1e-5)


def test_capital_recovery_factor_without_interest():
    """Hand calculation: at zero interest the capital is repaid in n equal parts."""
    assert capital_recovery_factor(0.0, 8) == 0.125


def test_steam_utility_cost_hand_calculation():
    """LP steam at 2086 kJ/kg and 20 USD/t, 1 MW for 8000 h:
    1e6 W x 8000 x 3600 s / 2.086e6 J/kg = 13,806 t/year; x 20 USD/t = 276,127 USD/year."""
    level = DATA.level("lp_steam")
    cost = utility_cost("reboiler", 1e6, UtilityPrice("x", "lp_steam", 20.0, "USD", "t", 2023, "test"), 8000.0, level)
    assert cost.amount_per_year == pytest.approx(13806, rel=REL)
    assert cost.cost_per_year == pytest.approx(276127, rel=REL)


def test_cooling_water_cost_hand_calculation():
    """Cooling water 30 -> 45 degC, cp 4.18 kJ/(kg K), 1000 kg/m3, 0.02 USD/m3 (cheap-steam-demo), 2 MW, 8000 h:
    2e6 / (4180 x 15) = 31.90 kg/s; x 28.8e6 s = 918,660 t = 918,660 m3/year; x 0.02 = 18,373 USD/year."""
    level = DATA.level("cooling_water")
    cost = utility_cost("condenser", 2e6, DATA.price("cheap-steam-demo", "cooling_water"), 8000.0, level,
                        DATA.density("cooling_water"))
    assert cost.amount_per_year == pytest.approx(918660, rel=REL)
    assert cost.cost_per_year == pytest.approx(18373, rel=REL)


def test_reference_steam_price_per_tonne_matches_textbook():
    """[T] Table 8.3 (from memory) gives LP steam as 13.28 USD/GJ, about 27.7 USD per 1000 kg:
    13.28 x 2.086 GJ/t = 27.70 USD/t."""
    price = DATA.price("reference", "lp_steam")
    assert price.price * DATA.level("lp_steam").latent_heat * 1e3 / 1e9 == pytest.approx(27.70, rel=2e-3)


@pytest.mark.parametrize("name", ["lp_steam", "mp_steam", "hp_steam"])
def test_steam_levels_against_iapws95(name):
    """[IAPWS] saturation temperature and latent heat at the level's pressure, within 0.1 K and 0.3 %."""
    from chemicals.iapws import iapws95_properties, iapws95_Tsat

    level = DATA.level(name)
    t_sat = iapws95_Tsat(level.pressure)
    h_liquid = iapws95_properties(t_sat - 1e-3, level.pressure)[3]
    h_vapour = iapws95_properties(t_sat + 1e-3, level.pressure)[3]
    assert level.supply_temperature == pytest.approx(t_sat, abs=0.1)
    assert level.latent_heat == pytest.approx(h_vapour - h_liquid, rel=3e-3)


def test_whole_column_capital_against_a_published_tac_basis():
    """Whole-column installed capital against the economic basis of Luyben's TAC studies of columns
    (from memory: Luyben, W. L., Principles and Case Studies of Simultaneous Design, Wiley 2011,
    economic basis after Douglas 1988: vessel 17,640 D^1.066 L^0.802, exchangers 7,296 A^0.65, USD,
    D and L in m, A in m2, trays not costed separately; base year about 2010).

    Column D = 2 m, L = 25 m, 40 sieve trays, condenser 150 m2, reboiler 100 m2, carbon steel, 2 barg:
    basis 17,640 x 2.0935 x 13.218 + 7,296 (25.97 + 19.95) = 488,100 + 335,000 = 823,100 USD.
    Two independent factored methods should agree within the class 5 band (-50 %/+100 %,
    AACE 18R-97); that is the tolerance.
    """
    inp = ColumnCostInput(shell_diameter=2.0, shell_height=25.0, design_pressure_gauge=2e5, trays=40,
                          condenser_area=150.0, condenser_duty=5e6, condenser_utility="cooling_water",
                          reboiler_area=100.0, reboiler_duty=5.5e6, reboiler_utility="lp_steam",
                          drum_volume=8.0, drum_diameter=1.5, pump_shaft_power=3e3, pump_electric_power=3.5e3)
    summary = cost_column(DATA, inp, "reference", 2010)
    ours = sum(e.installed for e in summary.items if e.item in ("column shell", "trays", "condenser", "reboiler"))
    published = 17640 * 2.0 ** 1.066 * 25.0 ** 0.802 + 7296 * (150.0 ** 0.65 + 100.0 ** 0.65)
    assert published == pytest.approx(823100, rel=REL)
    assert 0.5 <= ours / published <= 2.0
