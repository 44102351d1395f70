"""Condenser and reboiler duties: energy-balance values next to the constant-molar-overflow estimate."""

from __future__ import annotations

from ..properties import FeedState, Mixture
from .results import Duties, StageProfile


def cmo_duty_estimate(vapour_flow: float, latent_heat: float) -> float:
    """Duty of a condenser or reboiler under constant molar overflow [W].

    .. math:: Q = V\\,\\Delta h_{vap}

    Parameters
    ----------
    vapour_flow : Vapour condensed at the top or raised at the bottom [mol/s]
    latent_heat : Molar heat of vaporisation of the product at that end [J/mol]

    Notes
    -----
    Ignores sensible heat (subcooling, feed enthalpy differences); those are what the
    energy-balance duties add.

    Examples
    --------
    >>> cmo_duty_estimate(2.0, 30000.0)
    60000.0

    References
    ----------
    1. McCabe, W.L., Smith, J.C., Harriott, P. Unit Operations of Chemical Engineering,
       7th ed., McGraw-Hill, 2005, chapter 21 (enthalpy balances of a column).
    """
    return vapour_flow * latent_heat


def duties(mixture: Mixture, feed: FeedState, profile: StageProfile) -> Duties:
    """Energy-balance duties of ``profile`` and the CMO estimates from latent heats [W]."""
    top_vapour = (profile.reflux_ratio + 1.0) * profile.distillate_flow
    bottom_vapour = top_vapour - (1.0 - feed.q) * feed.molar_flow
    condensed = profile.reflux_ratio * profile.distillate_flow if profile.partial_condenser else top_vapour
    latent_top = mixture.heat_of_vaporisation(profile.P[0], profile.distillate_composition)
    latent_bottom = mixture.heat_of_vaporisation(profile.P[-1], profile.bottoms_composition)
    return Duties(profile.condenser_duty, profile.reboiler_duty,
                  cmo_duty_estimate(condensed, latent_top), cmo_duty_estimate(bottom_vapour, latent_bottom))
