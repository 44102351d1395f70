"""Binary phase diagrams from the mixture: x-y and T-x-y data, and azeotrope detection."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy.optimize import brentq

from .mixture import Mixture

GRID_POINTS = 101
EDGE = 1e-6  # mole fraction kept from the pure ends, where y - x is zero by definition


@dataclass(frozen=True)
class BinaryDiagram:
    """Bubble-point curve of a pair at one pressure [Pa]: x, y of the first component [-], T [K]."""

    first: int
    second: int
    pressure: float
    x: tuple[float, ...]
    y: tuple[float, ...]
    T: tuple[float, ...]


@dataclass(frozen=True)
class Azeotrope:
    """A binary azeotrope: mole fraction of the first component [-], temperature [K]."""

    first: str
    second: str
    pressure: float  # Pa
    x_first: float
    T: float
    kind: str  # "minimum-boiling" or "maximum-boiling"


def _bubble(mixture: Mixture, pressure: float, first: int, second: int, x1: float):
    z = np.zeros(mixture.size)
    z[first], z[second] = x1, 1.0 - x1
    point = mixture.bubble_point(pressure, z)
    return point.T, point.y[first]


def binary_diagram(mixture: Mixture, pressure: float, first: int = 0, second: int = 1,
                   points: int = GRID_POINTS) -> BinaryDiagram:
    """x-y and T-x-y data of the pair (first, second) at ``pressure`` [Pa]."""
    xs = np.linspace(0.0, 1.0, points)
    T, y = [], []
    for x1 in xs:
        t, y1 = _bubble(mixture, pressure, first, second, float(np.clip(x1, EDGE, 1.0 - EDGE)))
        T.append(t)
        y.append(float(np.clip(y1, 0.0, 1.0)) if 0.0 < x1 < 1.0 else float(x1))
    return BinaryDiagram(first, second, pressure, tuple(map(float, xs)), tuple(y), tuple(T))


def find_azeotropes(mixture: Mixture, pressure: float, first: int = 0, second: int = 1,
                    points: int = 41) -> list[Azeotrope]:
    """Azeotropes of the pair at ``pressure`` [Pa]: sign changes of y - x, refined by brentq."""
    xs = np.linspace(0.002, 0.998, points)
    gap = [_bubble(mixture, pressure, first, second, float(x))[1] - x for x in xs]
    pure_T = [_bubble(mixture, pressure, first, second, v)[0] for v in (1.0 - EDGE, EDGE)]
    found = []
    for a, b, ga, gb in zip(xs[:-1], xs[1:], gap[:-1], gap[1:]):
        if ga * gb >= 0.0:
            continue
        x_az = brentq(lambda x: _bubble(mixture, pressure, first, second, x)[1] - x, a, b, xtol=1e-7)
        T_az = _bubble(mixture, pressure, first, second, x_az)[0]
        kind = "minimum-boiling" if T_az < min(pure_T) else "maximum-boiling"
        found.append(Azeotrope(mixture.names[first], mixture.names[second], pressure, float(x_az),
                               float(T_az), kind))
    return found


def all_azeotropes(mixture: Mixture, pressure: float) -> list[Azeotrope]:
    """Binary azeotropes of every pair of components at ``pressure`` [Pa]."""
    if mixture.method in ("ideal",):
        return []  # Raoult's law cannot form an azeotrope between components of distinct vapour pressure
    found = []
    for i in range(mixture.size):
        for j in range(i + 1, mixture.size):
            found.extend(find_azeotropes(mixture, pressure, i, j))
    return found
