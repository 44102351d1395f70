"""O'Connell overall efficiency (Lockett's fit) and real trays."""

import math

import pytest

from disteco._base.errors import CaseError
from disteco.sizing.efficiency import OCONNELL_RANGE, oconnell_efficiency_lockett, real_trays

CP = 1e-3  # Pa s
POINTS = [0.1, 0.2, 0.5, 1.0, 2.0, 5.0, 7.5]  # mu x alpha [cP], across O'Connell's data


def test_against_power_law_fit_in_seader():
    """Seader, Henley and Roper, Separation Process Principles, 3rd ed., Section 6.5 (from
    memory): E_o = 50.3 (alpha mu)^-0.226 %, another fit of O'Connell's curve. Tolerance 6 %."""
    for mu_alpha in POINTS:
        assert oconnell_efficiency_lockett(mu_alpha * CP, 1.0) == pytest.approx(
            0.503 * mu_alpha ** -0.226, rel=0.06)


def test_against_log_quadratic_fit_of_kessler_and_wankat():
    """Kessler and Wankat, Chem. Eng. 95(13), 72 (1988), as given in Wankat, Separation Process
    Engineering, 3rd ed., Ch. 10 (from memory): E_o = 0.52782 - 0.27511 log10(alpha mu)
    + 0.044923 log10(alpha mu)^2. Tolerance 9 % (the fits differ most at the ends)."""
    for mu_alpha in POINTS:
        log = math.log10(mu_alpha)
        assert oconnell_efficiency_lockett(mu_alpha * CP, 1.0) == pytest.approx(
            0.52782 - 0.27511 * log + 0.044923 * log ** 2, rel=0.09)


def test_lockett_value_at_unit_product():
    """Lockett, Distillation Tray Fundamentals (1986): E_o = 0.492 at mu alpha = 1 cP (the coefficient)."""
    assert oconnell_efficiency_lockett(0.5 * CP, 2.0) == pytest.approx(0.492, abs=1e-12)


def test_range_record_is_in_centipoise():
    assert OCONNELL_RANGE.unit == "cP"
    assert OCONNELL_RANGE.contains(1.0) and not OCONNELL_RANGE.contains(20.0)


def test_real_trays_count_the_reboiler_as_a_stage():
    """Definition: N ideal stages with a reboiler stage are N - 1 ideal trays; real = ceil((N-1)/E)."""
    assert real_trays(21, 0.5) == 40
    assert real_trays(11, 0.5) == 20  # exact quotient, no extra tray from rounding noise
    assert real_trays(11, 0.7) == 15
    assert real_trays(2, 1.0) == 1


def test_real_trays_bad_input():
    with pytest.raises(CaseError, match="at least 2"):
        real_trays(1, 0.5)
    with pytest.raises(CaseError, match="tray_efficiency"):
        real_trays(10, 1.2)
