"""McCabe-Thiele stage stepping on the real equilibrium curve of a binary (or key pair).

The curve is tabulated once from the mixture's bubble points at one pressure and
interpolated monotonically (PCHIP); stepping, the minimum reflux (feed pinch or tangent
pinch) and the total-reflux minimum stages all work on that table. Mole fractions are of
the light key. Constant molar overflow is assumed, as in the method.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from scipy.optimize import brentq

from .._base.errors import ConvergenceError, InfeasibleSpecError
from ..properties import Mixture

CURVE_POINTS = 161
END_POINTS = 12  # extra points geometrically close to each pure end, where high purities are stepped
MAX_STEPS = 2000
PINCH_GRID = 4001
REFLUX_CEILING = 1e4  # above this the split is treated as unreachable at any reflux


@dataclass(frozen=True)
class EquilibriumCurve:
    """Tabulated y(x) of the light key at one pressure [Pa]; x, y [-] increasing in x."""

    x: tuple[float, ...]
    y: tuple[float, ...]
    pressure: float
    caveat: str = ""  # why the method itself may put a liquid split in the curve (Mixture.untuned_pair_caveat)

    def __post_init__(self):
        from scipy.interpolate import PchipInterpolator  # here: importing it costs `check` a large share of its time

        object.__setattr__(self, "_y_of_x", PchipInterpolator(np.array(self.x), np.array(self.y)))

    def y_of(self, x):
        """Vapour mole fraction in equilibrium with liquid ``x`` [-]."""
        return self._y_of_x(x)

    def x_of(self, y: float) -> float:
        """Liquid mole fraction in equilibrium with vapour ``y`` [-] (inverse of the curve)."""
        y_grid = np.array(self.y)
        flat = np.flatnonzero(np.diff(y_grid) <= 0.0)
        if flat.size:
            low, high = self.x[flat[0]], self.x[flat[-1] + 1]
            where = (f"the equilibrium curve is not monotone between light-key liquid fractions of about {low:.3g} "
                     f"and {high:.3g} at {self.pressure / 1e3:.4g} kPa")
            if self.caveat:
                raise InfeasibleSpecError(
                    f"{where}: the method puts a liquid split there. {self.caveat}; where the liquid does split "
                    "(a heterogeneous azeotrope), disteco models one liquid phase, so a column with a decanter "
                    "is outside its scope")
            raise InfeasibleSpecError(
                f"{where}: the liquid splits into two phases there (a heterogeneous azeotrope); disteco models one "
                "liquid phase, so a column with a decanter is outside its scope")
        return float(brentq(lambda x: float(self._y_of_x(x)) - y, self.x[0], self.x[-1], xtol=1e-14))


@dataclass(frozen=True)
class MinimumReflux:
    """Minimum reflux from the curve: L0/D [-], the pinch point (x, y) [-] and its kind."""

    reflux_ratio: float
    pinch_x: float
    pinch_y: float
    kind: str  # "feed pinch" or "tangent pinch"


@dataclass(frozen=True)
class SteppedColumn:
    """A McCabe-Thiele construction.

    ``stages`` counts equilibrium stages with the reboiler, the last one fractional;
    ``feed_stage`` is the optimal one from the top; ``steps`` the corner points (x, y) of
    the staircase starting at (x_D, x_D), for diagrams.
    """

    reflux_ratio: float
    stages: float
    feed_stage: int
    steps: tuple[tuple[float, float], ...]
    x_distillate: float
    x_bottoms: float
    z: float
    q: float
    partial_condenser: bool


def binary_grid(points: int = CURVE_POINTS) -> np.ndarray:
    """Light-key liquid fractions where an equilibrium curve is tabulated, ends excluded: cosine-spaced,
    with points geometrically close to each pure end, where high purities are stepped."""
    inner = 0.5 - 0.5 * np.cos(np.linspace(0.0, math.pi, points))
    ends = np.geomspace(1e-7, inner[1], END_POINTS, endpoint=False)
    return np.unique(np.concatenate([inner[1:-1], ends, 1.0 - ends]))


def equilibrium_curve(mixture: Mixture, pressure: float, light: int = 0, heavy: int = 1,
                      points: int = CURVE_POINTS) -> EquilibriumCurve:
    """Tabulate the light key's y(x) from bubble points at ``pressure`` [Pa]."""
    xs = binary_grid(points)
    ys = []
    for x1 in xs:
        z = np.zeros(mixture.size)
        z[light], z[heavy] = x1, 1.0 - x1
        point = mixture.bubble_point(pressure, z)
        ys.append(point.y[light] / (point.y[light] + point.y[heavy]))
    return tabulated_curve(xs, ys, pressure, mixture.untuned_pair_caveat(light, heavy))


def tabulated_curve(xs, ys, pressure: float, caveat: str = "") -> EquilibriumCurve:
    """The curve through (``xs``, ``ys``) [-] of :func:`binary_grid` with the pure ends (0, 0) and (1, 1) added."""
    x = np.concatenate([[0.0], np.asarray(xs, dtype=float), [1.0]])
    y = np.concatenate([[0.0], np.asarray(ys, dtype=float), [1.0]])
    return EquilibriumCurve(tuple(map(float, x)), tuple(map(float, y)), pressure, caveat)


def _intersection(x_d: float, z: float, q: float, reflux: float) -> float:
    """x where the rectifying operating line meets the q-line: ((q-1) x_D + (R+1) z)/(q + R)."""
    return ((q - 1.0) * x_d + (reflux + 1.0) * z) / (q + reflux)


def _operating_lines(x_d: float, x_b: float, z: float, q: float, reflux: float):
    """Return x_int and a vectorised y_op(x) of both sections."""
    x_int = min(max(_intersection(x_d, z, q, reflux), x_b), x_d)
    y_int = (reflux * x_int + x_d) / (reflux + 1.0)
    slope_s = (y_int - x_b) / (x_int - x_b) if x_int > x_b else math.inf

    def y_op(x):
        x = np.asarray(x, dtype=float)
        with np.errstate(invalid="ignore"):  # inf * 0 at x = x_b on a vertical stripping line, discarded below
            stripping = x_b + slope_s * (x - x_b)
        return np.where(x >= x_int, (reflux * x + x_d) / (reflux + 1.0), stripping)

    return x_int, y_op


def _check_fractions(x_d: float, x_b: float, z: float) -> None:
    if not 0.0 < x_b < z < x_d < 1.0:
        raise InfeasibleSpecError(
            f"light-key mole fractions must satisfy bottoms < feed < distillate, strictly between 0 and 1; "
            f"got bottoms {x_b:.6g}, feed {z:.6g}, distillate {x_d:.6g}")


def minimum_reflux(curve: EquilibriumCurve, x_d: float, x_b: float, z: float, q: float) -> MinimumReflux:
    """Smallest reflux at which both operating lines stay below the equilibrium curve.

    The gap between curve and operating lines is checked on a fine grid from x_B to x_D,
    so a tangent pinch inside a section is found as well as the pinch at the feed.
    """
    _check_fractions(x_d, x_b, z)
    grid = np.linspace(x_b, x_d, PINCH_GRID)[1:-1]
    y_eq = curve.y_of(grid)

    def gap(reflux: float) -> float:
        x_int, y_op = _operating_lines(x_d, x_b, z, q, reflux)
        at_feed = float(curve.y_of(x_int) - y_op(x_int))  # the feed pinch exactly, not only on the grid
        return min(float(np.min(y_eq - y_op(grid))), at_feed)

    # With a superheated vapour feed (q < 0) a rectifying line flatter than the q-line (R < -q) meets it
    # beyond the distillate: the construction starts above R = -q (there the lines meet far below the
    # bottoms and the rectifying line alone crosses the curve). Searched from zero, such a feed's split
    # was said to need no reflux.
    low = max(1e-9, -q + 1e-9)
    high = max(1.0, 2.0 * low)
    while gap(high) <= 0.0:
        high *= 4.0
        if high > REFLUX_CEILING:
            raise InfeasibleSpecError(
                f"no reflux reaches a distillate of {x_d:.6g} and bottoms of {x_b:.6g}: the operating lines "
                "cross the equilibrium curve at any reflux (an azeotrope or a pinch lies between the products)")
    if gap(low) > 0.0:
        raise InfeasibleSpecError(
            f"the split (distillate {x_d:.6g}, bottoms {x_b:.6g}) needs no reflux at this feed condition "
            f"(q = {q:.3g}): a minimum reflux is not defined; tighten the purities or use a stripping column")
    r_min = brentq(gap, low, high, xtol=1e-10, rtol=1e-10)
    _, y_op = _operating_lines(x_d, x_b, z, q, r_min)
    i = int(np.argmin(y_eq - y_op(grid)))
    x_int = _intersection(x_d, z, q, r_min)
    kind = "feed pinch" if abs(grid[i] - x_int) <= 2.0 * (x_d - x_b) / PINCH_GRID else "tangent pinch"
    return MinimumReflux(float(r_min), float(grid[i]), float(y_eq[i]), kind)


def _staircase(curve: EquilibriumCurve, x_d: float, x_b: float, next_y, what: str):
    """Step from (x_D, x_D) down to x_B; ``next_y(n, x)`` gives the vapour under stage n.

    Returns the stage count (last stage fractional) and the corner points.
    """
    steps = [(x_d, x_d)]
    x_prev, y = x_d, x_d
    for n in range(1, MAX_STEPS + 1):
        x = curve.x_of(y)
        steps.append((x, y))
        if x <= x_b:
            return n - 1 + (x_prev - x_b) / (x_prev - x), steps
        if x >= x_prev:
            raise InfeasibleSpecError(f"the steps stall at x = {x:.4g} (the operating line meets the equilibrium "
                                      "curve, e.g. at an azeotrope) between the products; no number of stages "
                                      "reaches them")
        y = next_y(n, x)
        steps.append((x, y))
        x_prev = x
    raise ConvergenceError(f"more than {MAX_STEPS} stages {what}; too close to the minimum")


def step_stages(curve: EquilibriumCurve, x_d: float, x_b: float, z: float, q: float, reflux: float,
                partial_condenser: bool = False) -> SteppedColumn:
    """Step off ideal stages from the top, switching to the stripping line at the optimum feed.

    The last stage counts as the fraction of its step that is needed to reach x_B. With a
    partial condenser the first step is the condenser and is not counted in ``stages``.
    """
    r_min = minimum_reflux(curve, x_d, x_b, z, q)
    if reflux <= r_min.reflux_ratio:
        raise InfeasibleSpecError(f"reflux ratio {reflux:.4g} is at or below the minimum reflux "
                                  f"{r_min.reflux_ratio:.4g} ({r_min.kind} at x = {r_min.pinch_x:.4g}); "
                                  "choose a larger reflux ratio")
    x_int, _ = _operating_lines(x_d, x_b, z, q, reflux)
    slope_s = ((reflux * x_int + x_d) / (reflux + 1.0) - x_b) / (x_int - x_b)
    feed = []  # the first stage whose liquid lies below the intersection of the operating lines

    def next_y(n: int, x: float) -> float:
        if not feed and x <= x_int:
            feed.append(n)
        return x_b + slope_s * (x - x_b) if feed else (reflux * x + x_d) / (reflux + 1.0)

    count, steps = _staircase(curve, x_d, x_b, next_y, f"at reflux {reflux:.4g}")
    feed_stage = feed[0] if feed else math.ceil(count)
    if partial_condenser:
        count -= 1.0
        feed_stage = max(feed_stage - 1, 1)
    return SteppedColumn(float(reflux), float(count), int(feed_stage), tuple(steps), x_d, x_b, z, q,
                         partial_condenser)


def total_reflux_stages(curve: EquilibriumCurve, x_d: float, x_b: float) -> SteppedColumn:
    """Minimum number of stages: steps between the curve and the diagonal (total reflux)."""
    count, steps = _staircase(curve, x_d, x_b, lambda n, x: x, "at total reflux")
    return SteppedColumn(math.inf, float(count), 0, tuple(steps), x_d, x_b, math.nan, math.nan, False)
