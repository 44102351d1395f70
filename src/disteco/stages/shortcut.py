"""Shortcut design of a column on the mixture's phase behaviour: Fenske-Underwood-Gilliland.

Relative volatilities come from the mixture's K-values: at the bubble point of the
distillate (top pressure), of the bottoms (bottom pressure) and of the feed (feed
pressure). Fenske uses the geometric mean of top and bottom values; Underwood uses the
feed values, because the pinch that sets the minimum reflux sits at the feed.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .._base.errors import InfeasibleSpecError
from ..case import Column, Products
from ..properties import FeedState, Mixture, find_azeotropes
from .correlations import (fenske_minimum_stages, fenske_section_ratio, kirkbride_feed_stage, kirkbride_ratio,
                           stages_from_gilliland, underwood_minimum_vapour)
from .splits import ProductSplit, check_binary_azeotropes, key_azeotrope_crossings, product_split

STAGE_ESTIMATE = 2.0  # N ~ 2 Nmin for the bottom pressure estimate (common practice, no source)
ALPHA_PASSES = 3  # volatility <-> product composition passes; the split changes < 1e-4 after 3
REFLUX_FACTORS = (1.05, 1.1, 1.2, 1.3, 1.5, 1.75, 2.0, 2.5, 3.0)
# share of the stages by which the two feed-stage rules may differ before Fenske's by section replaces
# Kirkbride's (common practice, no source). Measured at R/Rmin 1.05 to 3: the multicomponent examples and
# test cases agree within 0.08 of the stages, the twenty-component debutaniser within 0.14; a depentaniser
# with a 10 ppm pentane loss against a 2 % hexane slip is 0.20 to 0.23 apart (Kirkbride: stage 3 of 41)
FEED_RULES_APART = 0.15


@dataclass(frozen=True)
class ShortcutPoint:
    """One row of the reflux-stages trade-off: R [-], R/Rmin [-], stages N [-], feed stage [-]."""

    reflux_ratio: float
    reflux_factor: float
    stages: float  # Gilliland, fractional, reboiler included
    whole_stages: int  # rounded up
    feed_stage: int  # Kirkbride, from the top


@dataclass(frozen=True)
class ShortcutDesign:
    """Fenske-Underwood-Gilliland result. Volatilities are referred to the heavy key [-]."""

    light_key: int
    heavy_key: int
    feed_flow: float  # mol/s
    feed_q: float  # -
    z: tuple[float, ...]
    split: ProductSplit
    alpha_top: tuple[float, ...]
    alpha_bottom: tuple[float, ...]
    alpha_feed: tuple[float, ...]
    top_temperature: float  # K, bubble point of the distillate (its dew point in a partial condenser)
    bottom_temperature: float  # K, bubble point of the bottoms
    top_pressure: float  # Pa
    bottom_pressure: float  # Pa, estimated at STAGE_ESTIMATE x Nmin stages
    minimum_stages: float  # Fenske, reboiler included
    minimum_reflux: float  # Underwood
    underwood_roots: tuple[float, ...]
    azeotrope_crossings: tuple[str, ...] = ()  # products beyond a key-pair azeotrope (multicomponent)

    @property
    def warnings(self) -> tuple[str, ...]:
        """What the engineer should know about the shortcut's specification."""
        return tuple(f"{crossing}: the binary azeotrope of the keys is likely to pinch the column unless the "
                     "other components move it; confirm with the stage profile"
                     for crossing in self.azeotrope_crossings)

    @property
    def alpha_mean(self) -> tuple[float, ...]:
        """Geometric mean of top and bottom volatilities [-]."""
        return tuple(math.sqrt(a * b) for a, b in zip(self.alpha_top, self.alpha_bottom))

    @property
    def distillate_flow(self) -> float:
        return self.split.distillate_flow

    @property
    def bottoms_flow(self) -> float:
        return self.split.bottoms_flow

    def stages(self, reflux_ratio: float) -> float:
        """Equilibrium stages (reboiler included) at ``reflux_ratio`` by Gilliland [-]."""
        return stages_from_gilliland(self.minimum_stages, self.minimum_reflux, reflux_ratio)

    def feed_stage(self, stages: float) -> int:
        """Feed stage from the top for ``stages`` equilibrium stages [-]: Kirkbride's, unless Fenske's
        equation applied to each section puts it more than :data:`FEED_RULES_APART` of the stages (at least
        two) away, as it does where one product is far purer than the other (Kirkbride's squared purity
        ratio then pushes the feed to an end of the column)."""
        xd = self.split.distillate_composition
        xb = self.split.bottoms_composition
        lk, hk = self.light_key, self.heavy_key
        ratio = kirkbride_ratio(self.z[lk], self.z[hk], xb[lk], xd[hk], self.bottoms_flow, self.distillate_flow)
        kirkbride = kirkbride_feed_stage(stages, ratio)
        try:
            sections = kirkbride_feed_stage(stages, fenske_section_ratio(self.z[lk], self.z[hk], xd[lk], xd[hk],
                                                                         xb[lk], xb[hk]))
        except (ValueError, ZeroDivisionError):  # a product without one of the keys: Kirkbride's stands
            return kirkbride
        return sections if abs(sections - kirkbride) > max(2.0, FEED_RULES_APART * stages) else kirkbride

    def point(self, reflux_factor: float) -> ShortcutPoint:
        """The trade-off row at R = reflux_factor x Rmin."""
        reflux = reflux_factor * self.minimum_reflux
        n = self.stages(reflux)
        return ShortcutPoint(reflux, reflux_factor, n, math.ceil(n - 1e-9), self.feed_stage(math.ceil(n - 1e-9)))

    def table(self, factors=REFLUX_FACTORS) -> tuple[ShortcutPoint, ...]:
        """Stages and feed stage against R/Rmin (default 1.05 to 3)."""
        return tuple(self.point(f) for f in factors)


def _alpha_at_bubble(mixture: Mixture, pressure: float, x, heavy: int) -> tuple[np.ndarray, float]:
    point = mixture.bubble_point(pressure, x)
    k = mixture.k_values(point.T, pressure, point.x, point.y)
    return k / k[heavy], point.T


def _alpha_at_top(mixture: Mixture, column: Column, distillate, heavy: int) -> tuple[np.ndarray, float]:
    """Relative volatilities [-] and temperature [K] of the column's top: the distillate's bubble point
    below a total condenser, its dew point in a partial one, whose vapour product leaves in equilibrium
    with the reflux (a stabiliser's off-gas carries hydrogen and methane, whose liquid of the
    distillate's composition has no bubble point at column pressure)."""
    if column.condenser != "partial":
        return _alpha_at_bubble(mixture, column.top_pressure, distillate, heavy)
    point = mixture.dew_point(column.top_pressure, distillate)
    k = mixture.k_values(point.T, column.top_pressure, point.x, point.y)
    return k / k[heavy], point.T


def minimum_reflux_underwood(alpha, z, q: float, split: ProductSplit) -> tuple[float, tuple[float, ...]]:
    """Underwood minimum reflux L0/D [-] and the roots used, with the impossible cases explained."""
    alpha = np.asarray(alpha, dtype=float)
    light, heavy = split.light_key, split.heavy_key
    feed = np.asarray(split.distillate) + np.asarray(split.bottoms)
    v_min, d_min, roots = underwood_minimum_vapour(alpha, np.asarray(z, dtype=float), q,
                                                   np.asarray(split.distillate), light, heavy, feed)
    # L_min = V_min - D with D of the distribution at minimum reflux, which Underwood's
    # equations give together with V_min (the Fenske split is the total-reflux one)
    distillate = float(np.sum(d_min))
    r_min = v_min / distillate - 1.0
    if not math.isfinite(r_min):
        raise InfeasibleSpecError("Underwood's equations have no root between the key volatilities; "
                                  "check that the keys differ in volatility at column conditions")
    if r_min <= 0.0:
        raise InfeasibleSpecError(
            f"Underwood's equations give a minimum vapour flow {v_min:.4g} mol/s that is not above the "
            f"distillate flow {distillate:.4g} mol/s: the specified split is looser than "
            f"the feed itself provides at q = {q:.3g} (no reflux would be needed, a flash or a stripping "
            "column does it); tighten the key specifications or change the feed condition")
    return float(r_min), roots


def _fenske(split, names, alpha_feed, alpha_top, alpha_bottom) -> float:
    """Fenske's minimum stages at the geometric mean of the key relative volatility at the products'
    bubble points, refused in words where that mean is not above one although the feed's is (the keys'
    order turns between feed and products: ethyl acetate/ethanol with water, 0.99 on average)."""
    light, heavy = split.light_key, split.heavy_key
    mean = math.sqrt(alpha_top[light] * alpha_bottom[light])
    if mean <= 1.0:
        raise InfeasibleSpecError(
            f"the light key {names[light]} (products.light_key) is more volatile than the heavy key {names[heavy]} "
            f"(products.heavy_key) at the feed (relative volatility {alpha_feed[light]:.4g}) but not on average "
            f"through the column ({alpha_top[light]:.4g} at the distillate's bubble point, mean {mean:.4g}): the "
            "keys' order of volatility turns between feed and products, as near an azeotrope; ask for products on "
            "the feed's side of it, or choose other keys")
    return fenske_minimum_stages(split.distillate[light], split.bottoms[light], split.distillate[heavy],
                                 split.bottoms[heavy], mean)


def shortcut_design(mixture: Mixture, feed: FeedState, products: Products, column: Column) -> ShortcutDesign:
    """Fenske minimum stages, Underwood minimum reflux and the product split for the case.

    The products are checked against the azeotropes of the key pair at the top pressure:
    for a binary a product beyond one is refused; with more components it is a warning,
    since a third component can move the azeotrope (extractive distillation).
    """
    z = np.asarray(feed.z, dtype=float)
    light, heavy = products.light_key, products.heavy_key
    P_top = column.top_pressure
    alpha_feed, _ = _alpha_at_bubble(mixture, feed.pressure, z, heavy)
    alpha_top = alpha_bottom = alpha_feed
    P_bottom = P_top
    T_top = T_bottom = math.nan
    split = product_split(products, z, feed.molar_flow, alpha_feed, mixture.names)
    key_azeotropes = find_azeotropes(mixture, P_top, light, heavy) if mixture.method != "ideal" else []
    if mixture.size == 2:
        check_binary_azeotropes(split, z, key_azeotropes)
    for _ in range(ALPHA_PASSES):
        alpha_top, T_top = _alpha_at_top(mixture, column, split.distillate_composition, heavy)
        n_min = _fenske(split, mixture.names, alpha_feed, alpha_top, alpha_bottom)
        P_bottom = P_top + column.pressure_drop_per_stage * STAGE_ESTIMATE * max(n_min, 1.0)
        alpha_bottom, T_bottom = _alpha_at_bubble(mixture, P_bottom, split.bottoms_composition, heavy)
        split = product_split(products, z, feed.molar_flow, np.sqrt(alpha_top * alpha_bottom))
    n_min = _fenske(split, mixture.names, alpha_feed, alpha_top, alpha_bottom)
    r_min, roots = minimum_reflux_underwood(alpha_feed, z, feed.q, split)
    return ShortcutDesign(light, heavy, feed.molar_flow, feed.q, tuple(map(float, z)), split,
                          tuple(map(float, alpha_top)), tuple(map(float, alpha_bottom)),
                          tuple(map(float, alpha_feed)), float(T_top), float(T_bottom), P_top, P_bottom,
                          float(n_min), r_min, roots,
                          key_azeotrope_crossings(split, z, key_azeotropes))
