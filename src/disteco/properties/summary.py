"""A short summary of the mixture at column pressure: boiling points, volatility, azeotropes."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .binary import Azeotrope, all_azeotropes
from .mixture import Mixture

VOLATILITY_GRID = np.linspace(0.01, 0.99, 25)


@dataclass(frozen=True)
class ComponentSummary:
    name: str  # as written in the case
    databank_name: str
    cas: str
    molar_mass: float  # kg/mol
    normal_boiling_point: float  # K
    feed_fraction: float  # [-]


@dataclass(frozen=True)
class MixtureSummary:
    """What the check command reports about a mixture at the column's top pressure."""

    method: str
    pressure: float  # Pa, top pressure
    components: tuple[ComponentSummary, ...]
    light_key: str
    heavy_key: str
    key_volatility_min: float  # [-]
    key_volatility_max: float  # [-]
    feed_bubble_T: float  # K
    feed_dew_T: float  # K
    azeotropes: tuple[Azeotrope, ...]


def key_volatility_range(mixture: Mixture, pressure: float, light: int, heavy: int) -> tuple[float, float]:
    """Range of alpha(light/heavy) [-] over key-pair liquids from 1 % to 99 % light key at ``pressure`` [Pa]."""
    alphas = []
    for x_light in VOLATILITY_GRID:
        x = np.zeros(mixture.size)
        x[light], x[heavy] = x_light, 1.0 - x_light
        point = mixture.bubble_point(pressure, x)
        alphas.append(mixture.relative_volatility(point.T, pressure, x, light, heavy))
    return float(min(alphas)), float(max(alphas))


def summarise_mixture(mixture: Mixture, z, pressure: float, light: int, heavy: int) -> MixtureSummary:
    """Summarise ``mixture`` with feed ``z`` [-] at ``pressure`` [Pa] for the key pair."""
    components = tuple(
        ComponentSummary(c.given, c.name, c.cas, float(mw), float(tb), float(zi))
        for c, mw, tb, zi in zip(mixture.components, mixture.molar_masses, mixture.normal_boiling_points, z))
    low, high = key_volatility_range(mixture, pressure, light, heavy)
    return MixtureSummary(
        method=mixture.method, pressure=pressure, components=components,
        light_key=mixture.names[light], heavy_key=mixture.names[heavy],
        key_volatility_min=low, key_volatility_max=high,
        feed_bubble_T=mixture.bubble_point(pressure, z).T, feed_dew_T=mixture.dew_point(pressure, z).T,
        azeotropes=tuple(all_azeotropes(mixture, pressure)))
