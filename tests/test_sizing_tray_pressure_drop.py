"""Sieve-tray pressure drop (Sinnott's method): each relation against physics or a reference library."""

import math

import pytest
from fluids.open_flow import Q_weir_rectangular_full_Kindsvater_Carter

from disteco.sizing.tray_pressure_drop import (GRAVITY, VACUUM_WEIR_HEIGHT, WEIR_HEIGHT, dry_plate_head,
                                               head_to_pressure, residual_head, sieve_tray_pressure_drop,
                                               weir_crest_francis, weir_height_for, weir_length)
from disteco.sizing.trays import tray_hydraulics


# ---------------------------------------------------------------- validation


def test_dry_plate_head_is_the_orifice_equation():
    """Sinnott, Coulson and Richardson's Chemical Engineering Vol. 6, 4th ed., eq. 11.88: the
    constant 51 is 1000/(2 g) of the orifice equation Delta P = rho_V u^2 / (2 C0^2); checked
    against that equation to the rounding of 51 (0.06 %)."""
    for u, rho_v, rho_l, c0 in ((8.0, 2.5, 780.0, 0.84), (30.0, 0.25, 850.0, 0.75), (15.0, 12.0, 500.0, 0.9)):
        orifice = rho_v * u ** 2 / (2.0 * c0 ** 2) / (rho_l * GRAVITY)
        assert dry_plate_head(u, rho_v, rho_l, c0) == pytest.approx(orifice, rel=1e-3)


def test_residual_head_of_worked_example():
    """Sinnott, Vol. 6, 4th ed., Example 11.11 (from memory): h_r = 12.5e3 / 954 = 13.1 mm."""
    assert residual_head(954.0) * 1e3 == pytest.approx(13.1, abs=0.05)


def test_crest_against_full_width_sharp_crested_weir():
    """The segmental-weir crest of Sinnott eq. 11.85 lies above that of a full-width sharp-crested
    weir (Kindsvater and Carter, as coded in the fluids library, ``Q_weir_rectangular_full_
    Kindsvater_Carter``): at Sinnott's crest the full-width weir passes 1.25-1.40 x the flow
    (measured 1.30-1.35), the end contraction and approach of a tray's segmental weir."""
    for mass_flow, length in ((2.0, 0.8), (5.0, 1.0), (10.0, 1.5)):
        crest = weir_crest_francis(mass_flow, 800.0, length)
        ratio = Q_weir_rectangular_full_Kindsvater_Carter(crest, WEIR_HEIGHT, length) / (mass_flow / 800.0)
        assert 1.25 < ratio < 1.40


def test_weir_length_of_segment_geometry():
    """Sinnott, Vol. 6, 4th ed., Fig. 11.31 (from memory): l_w / D_c = 0.76 at A_d / A_c = 0.12;
    and the exact half circle: a downcomer of half the area has a weir of one diameter."""
    assert weir_length(2.0, 0.12) / 2.0 == pytest.approx(0.76, abs=0.01)
    assert weir_length(1.5, 0.5) == pytest.approx(1.5, rel=1e-9)
    theta = 2.0 * math.asin(weir_length(1.0, 0.1))  # chord back to the segment's area
    assert (theta - math.sin(theta)) / (2.0 * math.pi) == pytest.approx(0.1, rel=1e-9)


def test_head_to_pressure_is_hydrostatic():
    """Sinnott eq. 11.87: 9.81e-3 h[mm] rho_L = rho_L g h."""
    assert head_to_pressure(0.1, 954.0) == pytest.approx(954.0 * 9.81 * 0.1, rel=1e-12)


# ---------------------------------------------------------------- behaviour


def test_tray_drop_adds_its_parts_at_a_typical_tray():
    """A benzene-toluene tray at 80 % of flood: total head = dry + weir + crest + residual, in the
    0.4-1.2 kPa that the source calls usual for sieve trays above atmospheric pressure (about
    100 mm of liquid; from memory)."""
    tray = tray_hydraulics(1, 4.0, 5.5, 800.0, 3.0, 0.02, 0.6096, 0.8)
    diameter = tray.diameter * 1.02
    drop = sieve_tray_pressure_drop(tray, diameter, weir_height_for(1.2e5))
    assert drop.weir_height == WEIR_HEIGHT
    assert drop.total_head == pytest.approx(drop.dry_head + drop.weir_height + drop.crest_head
                                            + drop.residual_head, rel=1e-12)
    assert drop.pressure_drop == pytest.approx(drop.total_head * 800.0 * GRAVITY, rel=1e-12)
    assert 400.0 < drop.pressure_drop < 1200.0
    assert drop.hole_velocity == pytest.approx(tray.vapour_volume_flow / (
        0.1 * math.pi * diameter ** 2 / 4.0 * (1.0 - 2.0 * tray.downcomer_fraction)), rel=1e-12)


def test_vacuum_weir_is_low():
    """Sinnott Section 11.13: 6-12 mm weirs under vacuum (10 mm taken), 40-50 mm otherwise (50 mm)."""
    assert weir_height_for(0.08e5) == VACUUM_WEIR_HEIGHT
    assert weir_height_for(1.01325e5) == WEIR_HEIGHT
