"""Warnings once: repeats that differ only in their numbers are one (the reported design's kept),
grouped by kind in order of importance; the console shows what bears on the design and counts the rest."""

import pytest

from disteco._base.validity import OutOfRange, ValidityRange
from disteco.optimisation.margin import ControlMargin
from disteco.reports.notes import BOUND_NOTE, console_warnings, kind_of, ordered_warnings

TRAY_AREA = ValidityRange("sieve trays (cost curve)", "tray area", 0.07, 12.3, "m^2", "cost data")


def extrapolated(area: float) -> str:
    found: list[str] = []
    TRAY_AREA.check(area, OutOfRange.WARN, found)
    return "trays: " + found[0]


MODEL_PRICE, REPORTED_PRICE = extrapolated(13.01), extrapolated(13.2)
PUMP = ("reflux pump: extrapolated: Corripio pump efficiency: volumetric flow = 0.0004 m^3/s is outside the valid "
        "range 0.003155 to 0.3155 m^3/s; the efficiency is taken at 0.003155 m^3/s, the nearer end of the range")
SHORT = "the given design falls 1.6 % short of a product specification on the optimiser's fitted forms"
TALL = "column tangent length 62 m is above a practical single shell of 50 m"


def test_repeats_differing_in_numbers_are_one_with_the_last_number():
    """The model's price (13.01 m2) and the reported re-price (13.2 m2) of the same trays: one
    warning, the reported one; the pump rule of two scenarios' optima: one."""
    assert MODEL_PRICE != REPORTED_PRICE
    found = ordered_warnings([MODEL_PRICE, PUMP, PUMP.replace("0.0004", "0.0005"), REPORTED_PRICE])
    assert found == (REPORTED_PRICE, PUMP.replace("0.0004", "0.0005"))


def test_ordered_by_importance_and_the_console_counts_the_notes():
    found = ordered_warnings([PUMP, TALL, REPORTED_PRICE, SHORT])
    assert found == (SHORT, TALL, PUMP, REPORTED_PRICE)  # within a kind, in the order found
    assert [kind_of(w).name for w in found[:2]] == ["design not vouched for", "sizing and mechanical"]
    shown, more = console_warnings(found)
    assert shown == (SHORT, TALL) and more == 2


def test_reflux_advice_a_bound_explains_is_a_note_not_advice():
    advice = "design at 3.15 x the energy-balance minimum reflux; consider more stages for a control margin"
    assert ordered_warnings([advice]) == (advice,)
    found = ordered_warnings([advice, TALL], bound=True)
    assert found == (TALL, BOUND_NOTE + advice)
    assert console_warnings(found) == ((TALL,), 1)


def test_a_corrected_design_below_the_control_margin_says_so():
    """A design the verification corrected on thermo to less reflux than the model's floor
    (the invented demethaniser: 0.5989 against the floor 1.1 x 0.5940 = 0.6534) is not reported
    as holding the margin: `holds` is false and the warning names both numbers and the way out
    (a design of its own to check, no published reference; the floor's arithmetic is exact)."""
    margin = ControlMargin(1.1, 0.5940)
    assert margin.reflux_floor == pytest.approx(0.6534)
    assert margin.holds(0.6534) and margin.holds(0.6534 * (1.0 - 5e-4)) and not margin.holds(0.5989)
    assert margin.below_floor(0.66) == ()
    (warning,) = margin.below_floor(0.5989)
    assert "reflux ratio 0.5989, below the control margin's floor 0.6534 (1.1 x the energy-balance minimum 0.594)" \
        in warning and "column.min_reflux_ratio_factor" in warning
    assert kind_of(warning).rank == 0 and console_warnings((warning,))[0] == (warning,)
    assert ControlMargin(1.1, None).holds(0.1)


def test_a_margin_design_as_cheap_as_the_one_without_is_not_said_to_bind():
    """Two local optima can tie: an NGL debutaniser's design held to the margin (35 stages) came out
    1 USD a year cheaper than the search's optimum without it (36 stages, reflux 1.163). The console
    then says the margin costs nothing rather than that it binds at -1 USD; a dearer margin design
    (the benzene example's +5,606 USD a year) still binds. Invented numbers of the shape of both runs."""
    from types import SimpleNamespace

    from disteco.reports.choices import margin_text

    free = SimpleNamespace(best=SimpleNamespace(reflux_ratio=1.163, stages=36, feed_stage=11, tac=483_211.0),
                           sequential=None)
    margin = ControlMargin(1.1, 1.0596, unconstrained=free)
    tie = margin_text(margin, "USD", 483_210.0)
    assert tie.startswith("Control margin held at no cost: reflux ratio at least 1.166 [-]")
    assert "36 stages" in tie and "(-1 per year with the margin)" in tie
    assert "within the search's 0.1 % tolerance" in tie
    dearer = margin_text(margin, "USD", 483_211.0 * 1.002)
    assert dearer.startswith("Control margin binds: reflux ratio at least 1.166 [-]") and "+966 per year" in dearer
