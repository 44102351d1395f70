"""Shell thickness (ASME VIII-1 UG-27, UG-32), allowable-stress table, height, mass."""

import csv
import math
from importlib.resources import files

import pytest

from disteco._base.errors import CaseError, CorrelationRangeError, CostDataError
from disteco._base.units import ATMOSPHERE, PSI
from disteco.sizing.materials import COLUMNS, KSI, load_materials, material, parse_materials
from disteco.sizing.vessel import (CAUTION, collapse_pressure_von_mises, external_pressure_thickness,
                                   column_height, design_pressure, design_vessel,
                                   head_thickness_ug32, minimum_thickness, shell_mass, shell_thickness_ug27)

DEG_F_100 = (100.0 - 32.0) * 5.0 / 9.0 + 273.15  # K
DEG_F_500 = (500.0 - 32.0) * 5.0 / 9.0 + 273.15  # K


# ---------------------------------------------------------------- validation: hand calculations


def test_shell_thickness_against_hand_calculation():
    """UG-27(c)(1), t = P R / (S E - 0.6 P), by hand: P = 0.5 N/mm^2 gauge, R = 750 mm,
    S = 12.9 ksi = 88.94 N/mm^2 (A285 Grade A at 500 degF, Towler and Sinnott, Chemical
    Engineering Design, 2nd ed., Table 14.2, from memory), E = 0.85:
    t = 0.5 x 750 / (88.94 x 0.85 - 0.3) = 375 / 75.30 = 4.980 mm."""
    stress = material("A285 Grade A").allowable_stress(DEG_F_500)
    assert stress == pytest.approx(12.9 * 1e3 * PSI, rel=1e-12)
    assert stress / 1e6 == pytest.approx(88.94, abs=0.01)
    assert shell_thickness_ug27(0.5e6, 0.75, stress, 0.85) * 1e3 == pytest.approx(4.980, abs=0.002)


def test_head_thickness_against_hand_calculation():
    """UG-32(d), t = P D / (2 S E - 0.2 P), by hand with the values above and D = 1500 mm:
    t = 0.5 x 1500 / (2 x 88.94 x 0.85 - 0.1) = 750 / 151.10 = 4.964 mm."""
    stress = material("A285 Grade A").allowable_stress(DEG_F_500)
    assert head_thickness_ug32(0.5e6, 1.5, stress, 0.85) * 1e3 == pytest.approx(4.964, abs=0.002)


def test_thin_wall_limit_raises():
    """UG-27(c)(1) holds for P <= 0.385 S E (ASME VIII-1)."""
    with pytest.raises(CorrelationRangeError, match="0.385 S E"):
        shell_thickness_ug27(0.4 * 100e6, 1.0, 100e6, 1.0)


def test_minimum_thickness_rules():
    """UG-16(b): 1.5 mm plus corrosion allowance; rigidity table of Towler and Sinnott, 2nd ed.,
    Section 14.5 (from memory): 5 mm up to 1 m, 7 mm to 2 m, including 2 mm corrosion allowance."""
    assert minimum_thickness(0.8, 2e-3) == pytest.approx(5e-3)
    assert minimum_thickness(1.5, 3e-3) == pytest.approx(8e-3)
    assert minimum_thickness(0.3, 0.0) == pytest.approx(3e-3)


def test_shell_mass_of_cylinder_against_hand_calculation():
    """By hand: rho pi D_m L t = 7850 x pi x 1.508 x 20 x 0.008 = 5950 kg for the cylinder;
    a 2:1 head of mid-wall diameter 1.508 m has about 1.084 D^2 = 2.465 m^2 of surface (common
    approximation, no source), 2 x 2.465 x 0.008 x 7850 = 310 kg."""
    assert shell_mass(1.5, 20.0, 0.008, 0.008, 7850.0) == pytest.approx(5950 + 310, rel=0.005)


# ---------------------------------------------------------------- the allowable-stress table


def test_table_fingerprint():
    """Guards the file against accidental edits: columns, row count, materials, a source on every row."""
    text = (files("disteco.cost_data") / "allowable_stress.csv").read_text(encoding="utf-8")
    rows = list(csv.DictReader(text.splitlines()))
    assert tuple(rows[0].keys()) == COLUMNS
    assert len(rows) == 53
    assert all(row["source"].strip() for row in rows)
    assert len({(row["material"], row["temperature"]) for row in rows}) == len(rows)
    assert len(load_materials()) == 9


def test_room_temperature_values_follow_the_code_criterion():
    """ASME Section II Part D, Appendix 1 (from memory): below the creep range S is the lesser of
    tensile strength / 3.5 and 2/3 of yield strength. The table's first values follow it to the
    0.1 ksi rounding of the source."""
    for steel in load_materials().values():
        criterion = min(steel.tensile_strength / 3.5, 2.0 * steel.yield_strength / 3.0)
        assert steel.allowable_stresses[0] == pytest.approx(criterion, abs=0.051 * KSI), steel.name


def test_allowable_stress_interpolates_and_refuses_outside_table():
    steel = material("A285 Grade A")
    assert steel.allowable_stress(DEG_F_100) == pytest.approx(12.9 * KSI)
    t700 = (700.0 - 32.0) * 5.0 / 9.0 + 273.15
    t900 = (900.0 - 32.0) * 5.0 / 9.0 + 273.15
    assert steel.allowable_stress((t700 + t900) / 2) == pytest.approx((11.5 + 5.9) / 2 * KSI)
    with pytest.raises(CaseError, match="outside the allowable-stress table of A285 Grade A"):
        steel.allowable_stress(900.0)
    with pytest.raises(CaseError, match="unknown material"):
        material("unobtainium")


def test_malformed_rows_name_file_row_and_column():
    header = ",".join(COLUMNS)
    good = "X,CS,100,degF,12.9,45,24,ksi,7850,kg/m^3,a source"
    with pytest.raises(CostDataError, match=r"allowable_stress.csv, row 2, column 'allowable_stress'"):
        parse_materials(f"{header}\n{good.replace('12.9', 'abc')}\n")
    with pytest.raises(CostDataError, match=r"row 3, column 'stress_unit'"):
        parse_materials(f"{header}\n{good}\n{good.replace('100', '200').replace('ksi', 'bar')}\n")
    with pytest.raises(CostDataError, match=r"row 2, column 'source'"):
        parse_materials(f"{header}\n{good.replace('a source', '')}\n")
    with pytest.raises(CostDataError, match="must rise strictly"):
        parse_materials(f"{header}\n{good}\n{good}\n")
    with pytest.raises(CostDataError, match="missing columns"):
        parse_materials("material,source\nX,y\n")


# ---------------------------------------------------------------- design conditions, vessel, height


def test_design_pressure_margins():
    """Common practice, no source: 10 % above the operating gauge pressure, at least 1 bar above it."""
    assert design_pressure(ATMOSPHERE + 20e5, 0.10, 1e5) == pytest.approx(22e5)
    assert design_pressure(ATMOSPHERE + 2e5, 0.10, 1e5) == pytest.approx(3e5)


def test_vessel_carries_caution_and_vacuum_warning():
    vessel = design_vessel(1.5, 20.0, 0.3e5, 350.0, "A285 Grade A", 0.85, 3e-3, 0.1, 1e5, 25.0)
    assert vessel.caution == CAUTION and "qualified engineer" in vessel.caution
    assert any("external pressure" in w for w in vessel.warnings)
    assert vessel.shell_thickness >= vessel.shell_thickness_pressure + vessel.corrosion_allowance
    assert vessel.shell_thickness * 1e3 == pytest.approx(round(vessel.shell_thickness * 1e3))


def test_pressure_governs_thick_shell():
    """At 20 bar gauge and 2 m the UG-27 thickness passes the rigidity minimum."""
    vessel = design_vessel(2.0, 30.0, ATMOSPHERE + 20e5, 450.0, "SA-516 Grade 70", 1.0, 3e-3, 0.1, 1e5, 25.0)
    expected = 22e5 * 1.003 / (20.0 * KSI - 0.6 * 22e5) + 3e-3
    assert vessel.shell_thickness == pytest.approx(math.ceil(expected * 1e3) * 1e-3)


def test_height_sums_parts_and_warns():
    height = column_height(40, 0.6, 1.0, 0.002, 300.0, 1.2, 1.0, 3.0, 20.0, 15.0)
    sump = 0.002 * 300.0 / (math.pi / 4.0)
    assert height.tangent_length == pytest.approx(24.0 + 1.2 + sump + 1.0)
    assert height.overall == pytest.approx(height.tangent_length + 3.0)
    assert len(height.warnings) == 2
    assert "tangent height" in height.warnings[0] and "height-to-diameter" in height.warnings[1]
    assert "consider two shells" in height.warnings[0]
    # one of two shells in series names itself and cannot be advised to become two shells
    upper = column_height(40, 0.6, 1.0, 0.002, 300.0, 1.2, 1.0, 3.0, 20.0, 15.0, "upper shell")
    assert upper.warnings[0].startswith("upper shell tangent height 27.0 m exceeds 20 m")
    assert "two shells in series are the most disteco builds" in upper.warnings[0]
    assert upper.warnings[1].startswith("upper shell height-to-diameter ratio 27 exceeds 15")


# ---------------------------------------------------------------- external pressure


def test_von_mises_matches_windenburg_trilling_for_short_shells():
    """Windenburg and Trilling, Trans. ASME 56, 819 (1934): their closed form
    p = 2.42 E (t/D)^2.5 / ((1 - nu^2)^0.75 (L/D - 0.45 (t/D)^0.5)) approximates von Mises for
    cylinders shorter than about a quarter of the critical length 1.11 D (D/t)^0.5 (from memory);
    measured 0.4 % and 2.8 % here."""
    E, nu = 200e9, 0.3
    for t, D, L in ((0.008, 1.5, 3.0), (0.01, 2.0, 5.0)):
        assert L < 0.25 * 1.11 * D * math.sqrt(D / t)
        closed = 2.42 * E * (t / D) ** 2.5 / ((1 - nu ** 2) ** 0.75 * (L / D - 0.45 * math.sqrt(t / D)))
        assert collapse_pressure_von_mises(t, D, L, E, nu) == pytest.approx(closed, rel=0.04)


def test_von_mises_long_shell_tends_to_ring_buckling():
    """Timoshenko and Gere, Theory of Elastic Stability, 2nd ed., Section 7.5 (from memory): a long
    tube collapses at 2 E / (1 - nu^2) (t/D)^3 (n = 2 lobes); within 1 % at L = 30 D."""
    E, nu, t, D = 200e9, 0.3, 0.006, 1.0
    ring = 2.0 * E / (1.0 - nu ** 2) * (t / D) ** 3
    assert collapse_pressure_von_mises(t, D, 30.0, E, nu) == pytest.approx(ring, rel=0.01)


def test_vacuum_shell_thickness_from_buckling():
    """A 2 m, 30 m shell at 8 kPa: full vacuum governs; the corroded thickness gives exactly the
    design factor 3 on collapse, and the nominal wall is it plus the corrosion allowance, rounded up."""
    vessel = design_vessel(2.0, 30.0, 0.3e5, 400.0, "SA-516 Grade 70", 0.85, 3e-3, 0.1, 1e5, 25.0,
                           min_pressure=8e3)
    assert vessel.external_pressure == pytest.approx(ATMOSPHERE)
    t = vessel.shell_thickness_external
    corroded = 2.0 + 2 * 3e-3
    collapse = collapse_pressure_von_mises(t, corroded + 2 * t, 30.0 + 2.0 / 6.0, 200e9, 0.3)
    assert collapse == pytest.approx(3.0 * ATMOSPHERE, rel=1e-6)
    assert t > vessel.shell_thickness_pressure
    assert vessel.shell_thickness == pytest.approx(math.ceil((t + 3e-3) * 1e3) * 1e-3)
    assert any("full vacuum" in w for w in vessel.warnings)
    above = design_vessel(2.0, 30.0, 1.5e5, 400.0, "SA-516 Grade 70", 0.85, 3e-3, 0.1, 1e5, 25.0)
    assert above.shell_thickness_external == 0.0 and above.shell_thickness < vessel.shell_thickness
    assert external_pressure_thickness(ATMOSPHERE, 1.0, 10.0) < external_pressure_thickness(ATMOSPHERE, 1.0, 20.0)
