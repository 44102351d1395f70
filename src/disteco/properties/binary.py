"""Binary phase diagrams from the mixture: x-y and T-x-y data, and azeotrope detection."""

from __future__ import annotations

import math
from dataclasses import dataclass
from weakref import WeakKeyDictionary

import numpy as np
from scipy.optimize import brentq

from .._base.errors import InfeasibleSpecError, PropertyError
from .mixture import Mixture

GRID_POINTS = 101
EDGE = 1e-6  # mole fraction kept from the pure ends, where y - x is zero by definition
BRACKET = 2.0  # K beyond the bubble points either side of an azeotrope, where its temperature lies
DISTINCT_VOLATILITY = 1.5  # relative volatility at both ends beyond which a pair is not scanned [-]
# relative volatility [-] beyond which an azeotrope of the ideal-gas vapour is said to vanish with the
# acid's dimerisation: 1.05 is well outside the fitted models' error at an azeotrope (common practice, no source)
ARTEFACT_VOLATILITY = 1.05


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
    # where one of the pair dimerises in the vapour: the pair's relative volatility [-] at this
    # liquid with the dimerisation (``association``), which the method's ideal-gas vapour leaves out
    alpha_dimerised: float | None = None
    dimerising: str | None = None  # the acid's name
    # the method that predicts it without parameters fitted to the pair ("unifac-dortmund", or
    # "peng-robinson" with kij = 0); "" where the case gave the pair's parameters
    predicted_by: str = ""

    @property
    def vapour_artefact(self) -> bool:
        """True where the dimerising vapour moves the pair's relative volatility here off one by
        more than :data:`ARTEFACT_VOLATILITY`: the azeotrope is then one of the ideal-gas vapour."""
        a = self.alpha_dimerised
        return a is not None and abs(math.log(a)) > math.log(ARTEFACT_VOLATILITY)


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
    """Azeotropes of the pair at ``pressure`` [Pa]: sign changes of y - x, refined by brentq.

    With an equation of state the pair's two ends are looked at first: where the first
    component is the more (or the less) volatile at both ends by a factor of at least
    :data:`DISTINCT_VOLATILITY`, the scan between them is left out (an azeotrope there would
    need two, which regular mixtures do not form); its bubble points are flashes, and on a
    five-component demethaniser the scan of all pairs was 78 of the 100 s of `check` under the profiler.
    """
    xs = np.linspace(0.002, 0.998, points)
    ends = [_bubble(mixture, pressure, first, second, float(x))[1] for x in (xs[0], xs[-1])]
    if not mixture.ideal_gas_vapour:
        alphas = [y * (1.0 - x) / (x * (1.0 - y)) for x, y in zip((xs[0], xs[-1]), ends)]
        if all(a >= DISTINCT_VOLATILITY for a in alphas) or all(a <= 1.0 / DISTINCT_VOLATILITY for a in alphas):
            return []
    inner = {float(x): _gap(mixture, pressure, first, second, float(x)) for x in xs[1:-1]}
    grid = [(xs[0], ends[0] - xs[0])] + [(x, g) for x, g in inner.items() if g is not None] \
        + [(xs[-1], ends[1] - xs[-1])]
    pure_T = [_bubble(mixture, pressure, first, second, v)[0] for v in (1.0 - EDGE, EDGE)]
    found = []
    for (a, ga), (b, gb) in zip(grid[:-1], grid[1:]):
        if ga * gb >= 0.0:
            continue
        # a bubble point that fails inside the bracket is the azeotrope itself (see _gap)
        x_az = brentq(lambda x: _gap(mixture, pressure, first, second, x) or 0.0, a, b, xtol=1e-7)
        T_az = _azeotrope_temperature(mixture, pressure, first, second, x_az, a, b)
        kind = "minimum-boiling" if T_az < min(pure_T) else "maximum-boiling"
        found.append(Azeotrope(mixture.names[first], mixture.names[second], pressure, float(x_az),
                               float(T_az), kind, *_dimerised(mixture, pressure, first, second, x_az, T_az),
                               predicted_by="" if mixture.pair_parameters_given(first, second) else mixture.method))
    return found


def _dimerised(mixture: Mixture, pressure: float, first: int, second: int, x1: float, T: float):
    """(alpha with the acid's dimerisation, the acid's name) at an azeotrope of the pair, or (None, None)."""
    acid = mixture.dimerising_acid
    if acid not in (first, second):
        return None, None
    z = np.zeros(mixture.size)
    z[first], z[second] = x1, 1.0 - x1
    return mixture.dimerised_relative_volatility(T, pressure, z, first, second), mixture.names[acid]


def _gap(mixture: Mixture, pressure: float, first: int, second: int, x1: float) -> float | None:
    """y - x of the first component at its bubble point, None where the bubble point fails.

    thermo's flash of an equation of state fails at and right next to an azeotrope, where the
    incipient vapour equals the liquid (carbon dioxide/ethane with kij 0.13 at 20 bar), and
    so does the second route.
    """
    try:
        return _bubble(mixture, pressure, first, second, x1)[1] - x1
    except PropertyError:
        return None


def _azeotrope_temperature(mixture: Mixture, pressure: float, first: int, second: int, x1: float,
                           a: float, b: float) -> float:
    """Bubble temperature at the azeotrope [K]; where the flash fails there, the temperature at
    which the liquid is in equilibrium with a vapour of its own composition (K all one), which
    is exact at an azeotrope, bracketed by the bubble points at ``a`` and ``b``."""
    try:
        return _bubble(mixture, pressure, first, second, x1)[0]
    except PropertyError:
        pass
    z = np.zeros(mixture.size)
    z[first], z[second] = x1, 1.0 - x1
    ends = [_bubble(mixture, pressure, first, second, v)[0] for v in (a, b)]
    return mixture.own_vapour_temperature(pressure, z, (min(ends) - BRACKET, max(ends) + BRACKET))


_FOUND: WeakKeyDictionary = WeakKeyDictionary()  # mixture -> {pressure: azeotropes}


def all_azeotropes(mixture: Mixture, pressure: float) -> list[Azeotrope]:
    """Binary azeotropes of every pair of components at ``pressure`` [Pa].

    A pair whose liquids have no bubble point at ``pressure`` (hydrogen and methane at 8 bar: the
    hydrogen keeps a vapour at any temperature; hydrogen-rich liquids above its critical pressure)
    forms no azeotrope there and is passed over; the key pair's own liquids are checked elsewhere.
    Kept per mixture and pressure: the check, the stage design and every fit of the column's
    temperature range ask at the top pressure (0.1-0.2 s each for a few Peng-Robinson pairs).
    """
    if mixture.method in ("ideal",):
        return []  # Raoult's law cannot form an azeotrope between components of distinct vapour pressure
    kept = _FOUND.setdefault(mixture, {})
    if pressure not in kept:
        kept[pressure] = _azeotropes(mixture, pressure)
    return list(kept[pressure])


def _azeotropes(mixture: Mixture, pressure: float) -> list[Azeotrope]:
    found = []
    for i in range(mixture.size):
        for j in range(i + 1, mixture.size):
            try:
                found.extend(find_azeotropes(mixture, pressure, i, j))
            except InfeasibleSpecError:  # no vapour-liquid split of the pair's liquids at this pressure
                continue
    return found
