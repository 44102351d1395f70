"""Why a condenser or reboiler takes a dearer utility level, and what column pressure would free it.

The sizing layer gives the condenser the warmest cooling level and the reboiler the coolest
heating level that keep the minimum approach at both ends (``sizing.exchangers.choose_utility``).
When the next cheaper level offered does not fit, an engineer's first question is how far the
column pressure would have to move for it to fit. :func:`utility_level_notes` answers it: the
shift of the process temperatures the cheaper level needs, the pressure at which the product's
own saturation temperature (thermo's bubble point of the liquid distillate or the bottoms, the
dew point of a vapour distillate) has moved that far, and the level the other exchanger would
then take, its temperatures moved by its product's saturation temperature at the same pressure
change. The relative volatility moves with the pressure, so the note asks for a second design
at that pressure rather than claiming it is cheaper. Where no pressure within
``PRESSURE_STEP ** PRESSURE_STEPS`` of the column's (and above :data:`LOWEST_PRESSURE`) frees the
exchanger, where the bottom pressure it needs is below the column's own pressure drop, or where
the other exchanger would then have no level offered, there is no top pressure to try and no note.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass

from scipy.optimize import brentq

from .._base.errors import DistecoError, InfeasibleSpecError
from ..sizing.exchangers import choose_utility, offered_levels

PRESSURE_STEP = 1.25  # ratio between trial pressures while bracketing [-]
PRESSURE_STEPS = 16  # at most 1.25**16 = 36 x up or down from the column's own pressure
LOWEST_PRESSURE = 500.0  # Pa; below it a column pressure is no longer a practical answer


@dataclass(frozen=True)
class UtilityPricing:
    """Yearly cost [currency/yr] of ``duty`` [W] on the level named, under the run's first scenario."""

    yearly: Callable[[str, float], float]
    currency: str


def utility_level_notes(mixture, profile, condenser, reboiler, levels: Sequence,
                        min_approach: float, pricing: UtilityPricing | None = None) -> tuple[str, ...]:
    """Notes for a condenser or reboiler whose utility is not the cheapest offered, each about the next
    cheaper level.

    ``profile`` is the :class:`~disteco.stages.results.StageProfile` the exchangers serve,
    ``condenser`` and ``reboiler`` its exchangers (a sizing's, or
    :class:`~disteco.sizing.exchangers.ExchangerEnds`),
    ``levels`` the utility levels offered and ``min_approach`` [K] the sizing option. Empty
    when both exchangers already take the cheapest level. With ``pricing`` the note says how much
    the two utilities would cost a year at the profile's duties, and is left out where moving the
    pressure would not make them cheaper (a depropaniser's reboiler freed for warm water at 1.9 bar,
    its condenser then on refrigeration at -50 degC).
    """
    top, bottom = _top_saturation(mixture, profile), _bottom_saturation(mixture, profile)
    notes = []
    with mixture.quiet():  # probed states, not the column's: no property notes from them
        for exchanger, other, service, own, other_side in ((condenser, reboiler, "cooling", top, bottom),
                                                           (reboiler, condenser, "heating", bottom, top)):
            note = _note(exchanger, other, service, own, other_side, profile, levels, min_approach, pricing)
            if note:
                notes.append(note)
    return tuple(notes)


def _top_saturation(mixture, profile) -> Callable[[float], float]:
    """Saturation temperature [K] of the distillate at a pressure [Pa]: dew point of a vapour product."""
    if profile.partial_condenser:
        return lambda P: mixture.dew_point(P, profile.distillate_composition).T
    return lambda P: mixture.bubble_point(P, profile.distillate_composition).T


def _bottom_saturation(mixture, profile) -> Callable[[float], float]:
    return lambda P: mixture.bubble_point(P, profile.bottoms_composition).T


def _needed_shift(exchanger, level, service: str, min_approach: float) -> float:
    """Process-temperature shift [K] that gives ``level`` the minimum approach at both ends (+ warmer)."""
    if service == "cooling":
        return max(min_approach - (exchanger.process_out - level.supply_temperature),
                   min_approach - (exchanger.process_in - level.return_temperature))
    return -max(min_approach - (level.supply_temperature - exchanger.process_out),
                min_approach - (level.return_temperature - exchanger.process_in))


def pressure_for(saturation: Callable[[float], float], pressure: float, shift: float) -> float | None:
    """Pressure [Pa] at which ``saturation`` lies ``shift`` [K] from its value at ``pressure`` [Pa].

    Bracketed by steps of :data:`PRESSURE_STEP` up (``shift`` > 0) or down, then solved by
    brentq in log pressure. None when no pressure within :data:`PRESSURE_STEPS` steps, above
    :data:`LOWEST_PRESSURE`, gets there, or when the properties fail on the way (as they do
    near the mixture's critical point).
    """
    try:
        target = saturation(pressure) + shift
        rising = shift > 0.0

        def residual(log_p: float) -> float:
            return saturation(math.exp(log_p)) - target

        low = math.log(pressure)
        step = math.log(PRESSURE_STEP) * (1.0 if rising else -1.0)
        for _ in range(PRESSURE_STEPS):
            high = low + step
            if math.exp(high) < LOWEST_PRESSURE:
                return None
            if (residual(high) >= 0.0) == rising:
                return math.exp(brentq(residual, min(low, high), max(low, high), xtol=1e-6))
            low = high
    except (DistecoError, ArithmeticError, ValueError):
        return None
    return None


def _note(exchanger, other_exchanger, service: str, own, other, profile, levels,
          min_approach: float, pricing: UtilityPricing | None = None) -> str | None:
    offered = offered_levels(levels, service)
    names = [u.name for u in offered]
    if exchanger.utility.name not in names[1:]:
        return None
    # the next cheaper level: a refrigerated condenser is asked about the warmer refrigerant first
    cheaper = offered[names.index(exchanger.utility.name) - 1]
    shift = _needed_shift(exchanger, cheaper, service, min_approach)
    top, bottom = profile.P[0], profile.P[-1]
    here = pressure_for(own, top if service == "cooling" else bottom, shift)
    word = "warmer" if shift > 0 else "cooler"
    opening = (f"{exchanger.name} on {exchanger.utility.name}: {cheaper.name} "
               f"({_c(cheaper.supply_temperature)} -> {_c(cheaper.return_temperature)} degC) needs its process side "
               f"{abs(shift):.1f} K {word} than now ({_c(exchanger.process_in)} -> {_c(exchanger.process_out)} "
               f"degC) for the {min_approach:g} K approach")
    if here is None:
        # no practical pressure gets there: nothing to try (cooling water as the heat source of a reboiler
        # near 120 degC, 112 K too hot for it, would otherwise be noted on every steam-heated column)
        return None
    change = here - (top if service == "cooling" else bottom)
    new_top = top + change
    if new_top < LOWEST_PRESSURE:
        # the bottom pressure it needs is below the column's own pressure drop: no top pressure to try
        # (a chloroform column's reboiler near 70 degC on warm water, 59 K cooler, at about 14 kPa)
        return None
    other_service = "heating" if service == "cooling" else "cooling"
    then = _level_then(other, other_service, other_exchanger, bottom if service == "cooling" else top, change,
                       levels, min_approach)
    if then is None:
        # the other exchanger would have no level there: not a column to try (a 30-bar CO2/ethane column's
        # reboiler on warm water at about 7.8 bar, where nothing offered condenses its top)
        return None
    text, other_level = then
    money = ""
    changes = _yearly_changes(pricing, profile, exchanger, cheaper, other_exchanger, other_level)
    if changes is not None:
        own_change, other_change = changes
        if own_change + other_change >= 0.0:
            return None  # the utilities would cost no less: nothing to try
        money = (f"; at the present duties the two utilities would cost about {_money(-(own_change + other_change))} "
                 f"{pricing.currency} a year less ({exchanger.name} {_money(own_change, sign=True)}, "
                 f"{other_exchanger.name} {_money(other_change, sign=True) if abs(other_change) >= 0.5 else 'unchanged'})")
    return (f"{opening}, which a top pressure of about {_kpa(new_top, top)} gives (now {_kpa(top)}); "
            f"the {other_exchanger.name} would then take {text}{money}. The relative volatility moves with the "
            "pressure: design the case again at that top pressure to compare")


def _yearly_changes(pricing: UtilityPricing | None, profile, exchanger, level, other_exchanger,
                    other_level) -> tuple[float, float] | None:
    """(change of the exchanger's, of the other's utility cost) [currency/yr] at the profile's duties when they
    move to ``level`` and ``other_level``; None without prices or where the scenario prices a level not."""
    if pricing is None or other_level is None:
        return None
    duties = {"condenser": profile.condenser_duty, "reboiler": profile.reboiler_duty}

    def change(item, new, old) -> float:
        return pricing.yearly(new.name, duties[item.name]) - pricing.yearly(old.name, duties[item.name])

    try:
        return change(exchanger, level, exchanger.utility), change(other_exchanger, other_level, other_exchanger.utility)
    except DistecoError:
        return None


def _money(value: float, sign: bool = False) -> str:
    """Whole money with thousands separators, with its sign where asked ("+5,700", "-18,000")."""
    return f"{value:+,.0f}" if sign else f"{value:,.0f}"


def _level_then(saturation, service: str, exchanger, pressure: float, change: float, levels,
                min_approach: float) -> tuple[str, object] | None:
    """(in words, the level) the other exchanger would take with its column end ``change`` [Pa] away (the level
    None where thermo could not say); None where no level offered would fit it."""
    try:
        moved = saturation(pressure + change) - saturation(pressure)
        level = choose_utility(levels, service, exchanger.process_in + moved, exchanger.process_out + moved,
                               min_approach, exchanger.name)
    except InfeasibleSpecError:
        return None
    except (DistecoError, ArithmeticError, ValueError):
        return "a level not found here (thermo's saturation temperature failed at that pressure)", None
    then = f"{level.name} ({_c(exchanger.process_in + moved)} -> {_c(exchanger.process_out + moved)} degC)"
    names = [u.name for u in offered_levels(levels, service)]
    if exchanger.utility.name in names and names.index(level.name) > names.index(exchanger.utility.name):
        # the pressure that frees one exchanger pushes the other onto a dearer level (a glycol drying
        # column's reboiler off medium-pressure steam at 0.66 kPa, its condenser onto refrigeration)
        then += f", a dearer level than its {exchanger.utility.name} now"
    return then, level


def _c(kelvin: float) -> str:
    return f"{kelvin - 273.15:.1f}"


def _kpa(pascal: float, other: float | None = None) -> str:
    """``pascal`` in bar (kPa below 1 bar) to 3 significant digits, more (up to 6) where it would read as
    ``other`` (a dimethyl ether column at 13 bar was told to go to "about 13 bar (now 13 bar)")."""
    unit, scale = ("bar", 1e5) if pascal >= 1e5 else ("kPa", 1e3)
    digits = 3
    while other is not None and digits < 6 and f"{pascal / scale:.{digits}g}" == f"{other / scale:.{digits}g}":
        digits += 1
    return f"{pascal / scale:.{digits}g} {unit}"
