"""Product flows from the key specifications, with mass-balance and azeotrope checks.

The two end specifications (see ``case.Products``) fix the key flows; the non-keys
distribute as at total reflux by Fenske's equation. Every way the specifications can
contradict the feed raises ``InfeasibleSpecError`` or ``CaseError`` in engineering words.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .._base.errors import CaseError, InfeasibleSpecError
from ..case import EndSpec, Products, require_mole_basis
from .correlations import fenske_distribution, fenske_minimum_stages

MAX_ITERATIONS = 200
TOLERANCE = 1e-12  # relative change of the key flows between iterations
# where a binary case without products.light_key takes its keys from
BINARY_KEYS = ("; in a binary case without it, the first of mixture.components",
               " (or the order of mixture.components)")


@dataclass(frozen=True)
class ProductSplit:
    """Component flows [mol/s] in distillate and bottoms; their sum is the feed."""

    light_key: int
    heavy_key: int
    distillate: tuple[float, ...]
    bottoms: tuple[float, ...]

    @property
    def distillate_flow(self) -> float:
        return float(sum(self.distillate))

    @property
    def bottoms_flow(self) -> float:
        return float(sum(self.bottoms))

    @property
    def distillate_composition(self) -> tuple[float, ...]:
        return tuple(float(d) / self.distillate_flow for d in self.distillate)

    @property
    def bottoms_composition(self) -> tuple[float, ...]:
        return tuple(float(b) / self.bottoms_flow for b in self.bottoms)


def _spec_field(products: Products, end: str) -> str:
    spec = products.light_key_spec if end == "light" else products.heavy_key_spec
    if products.binary_fractions:
        return "products.bottoms_light_key_fraction" if end == "light" else "products.distillate_light_key_fraction"
    if spec.kind == "recovery":
        return f"products.{end}_key_recovery"
    return "products.light_key_in_bottoms" if end == "light" else "products.heavy_key_in_distillate"


def check_end_specs(products: Products, z) -> None:
    """Raise when an end specification is no fraction, or a binary purity contradicts the feed."""
    require_mole_basis(products, "the stages layer")
    for end, spec in (("light", products.light_key_spec), ("heavy", products.heavy_key_spec)):
        if spec.kind not in ("recovery", "fraction"):
            raise CaseError(_spec_field(products, end), f"unknown kind {spec.kind!r}", "recovery or fraction")
        if not 0.0 < spec.value < 1.0:
            what = "recovery" if spec.kind == "recovery" else "mole fraction"
            raise CaseError(_spec_field(products, end),
                            f"{what} {spec.value:.6g} is not between 0 and 1: a product cannot take more "
                            "of a component than the feed brings, nor none of it", "strictly between 0 and 1",
                            spec.value)
    if len(z) == 2 and products.light_key_spec.kind == products.heavy_key_spec.kind == "fraction":
        z_light = z[products.light_key]
        x_distillate = 1.0 - products.heavy_key_spec.value
        x_bottoms = products.light_key_spec.value
        if x_distillate <= z_light:
            raise InfeasibleSpecError(
                f"{_spec_field(products, 'heavy')}: distillate light-key mole fraction {x_distillate:.6g} is at "
                f"or below the feed's {z_light:.6g}: the distillate must be richer in the light key than the feed")
        if x_bottoms >= z_light:
            raise InfeasibleSpecError(
                f"{_spec_field(products, 'light')}: bottoms light-key mole fraction {x_bottoms:.6g} is at or "
                f"above the feed's {z_light:.6g}: the bottoms must be leaner in the light key than the feed")


def _key_equation(spec: EndSpec, end: str, f: np.ndarray, light: int, heavy: int,
                  other_d: float, other_b: float) -> tuple[np.ndarray, float]:
    """One linear equation a . (d_LK, d_HK) = b from one end specification."""
    x = spec.value
    if end == "light":
        if spec.kind == "recovery":
            return np.array([1.0, 0.0]), x * f[light]
        # x = b_LK / B with B = other_b + (f_LK - d_LK) + (f_HK - d_HK)
        return np.array([-(1.0 - x), x]), x * (other_b + f[heavy]) - (1.0 - x) * f[light]
    if spec.kind == "recovery":
        return np.array([0.0, 1.0]), (1.0 - x) * f[heavy]
    # x = d_HK / D with D = other_d + d_LK + d_HK
    return np.array([-x, 1.0 - x]), x * other_d


def _solve_keys(products: Products, f: np.ndarray, other_d: float, other_b: float) -> tuple[float, float]:
    light, heavy = products.light_key, products.heavy_key
    a1, b1 = _key_equation(products.light_key_spec, "light", f, light, heavy, other_d, other_b)
    a2, b2 = _key_equation(products.heavy_key_spec, "heavy", f, light, heavy, other_d, other_b)
    d_light, d_heavy = np.linalg.solve(np.array([a1, a2]), np.array([b1, b2]))
    return float(d_light), float(d_heavy)


def _check_key_flows(products: Products, f: np.ndarray, d_light: float, d_heavy: float) -> None:
    light, heavy = products.light_key, products.heavy_key
    if not 0.0 < d_light < f[light]:
        raise InfeasibleSpecError(
            f"the key specifications ask for {d_light:.6g} mol/s of the light key in the distillate out of "
            f"{f[light]:.6g} mol/s fed: the light key's fraction in the bottoms is too high for this feed "
            f"(set by {_spec_field(products, 'light')} together with {_spec_field(products, 'heavy')})")
    if not 0.0 < d_heavy < f[heavy]:
        raise InfeasibleSpecError(
            f"the key specifications ask for {d_heavy:.6g} mol/s of the heavy key in the distillate out of "
            f"{f[heavy]:.6g} mol/s fed: the heavy key's fraction in the distillate is too high for this feed "
            f"(set by {_spec_field(products, 'heavy')} together with {_spec_field(products, 'light')})")


def product_split(products: Products, z, feed_flow: float, alpha, names=None) -> ProductSplit:
    """Distillate and bottoms flows meeting the key specifications.

    ``z`` feed mole fractions [-], ``feed_flow`` [mol/s], ``alpha`` relative volatilities to
    the heavy key [-] (used for the Fenske distribution of the non-keys), ``names`` the
    components' names for messages (default: their numbers). Mole-fraction
    specifications make the key flows depend on the non-keys; a fixed-point iteration
    solves both together.
    """
    z = np.asarray(z, dtype=float)
    alpha = np.asarray(alpha, dtype=float)
    check_end_specs(products, z)
    light, heavy = products.light_key, products.heavy_key
    if alpha[light] <= alpha[heavy]:
        label = names or [f"component {i + 1}" for i in range(len(z))]
        raise InfeasibleSpecError(
            f"the light key {label[light]} (products.light_key{BINARY_KEYS[0] if len(z) == 2 else ''}) is not more "
            f"volatile than the heavy key {label[heavy]} at column conditions (relative volatility "
            f"{alpha[light] / alpha[heavy]:.4g}); swap the keys{BINARY_KEYS[1] if len(z) == 2 else ''}")
    f = z * feed_flow
    others = [i for i in range(len(z)) if i not in (light, heavy)]
    d = np.where(alpha > alpha[light], f, 0.0)  # first guess: sharp split of the non-keys
    d_light = d_heavy = math.nan
    for _ in range(MAX_ITERATIONS):
        other_d = float(sum(d[i] for i in others))
        other_b = float(sum(f[i] - d[i] for i in others))
        new_light, new_heavy = _solve_keys(products, f, other_d, other_b)
        _check_key_flows(products, f, new_light, new_heavy)
        converged = (abs(new_light - d_light) <= TOLERANCE * f[light]
                     and abs(new_heavy - d_heavy) <= TOLERANCE * f[heavy])
        d_light, d_heavy = new_light, new_heavy
        if not others or converged:
            break
        n_min = fenske_minimum_stages(d_light, f[light] - d_light, d_heavy, f[heavy] - d_heavy,
                                      alpha[light] / alpha[heavy])
        d_fenske = fenske_distribution(alpha / alpha[heavy], f, d_heavy, f[heavy] - d_heavy, n_min)
        d[others] = d_fenske[others]
    d[light], d[heavy] = d_light, d_heavy
    return ProductSplit(light, heavy, tuple(map(float, d)), tuple(map(float, f - d)))


def key_azeotrope_crossings(split: ProductSplit, z, azeotropes) -> tuple[str, ...]:
    """Say which product lies across an azeotrope of the key pair from the feed.

    ``azeotropes`` are the properties layer's ``Azeotrope`` records of the key pair, with
    ``x_first`` the light key's mole fraction in the binary. Products and feed are compared
    on the key-pair basis, x_LK / (x_LK + x_HK): for a binary that is the mole fraction and
    ordinary distillation keeps both products on the feed's side of every azeotrope. With
    other components present the binary azeotrope only marks where the column is likely to
    pinch (a heavy third component can move it, as in extractive distillation).
    """
    light, heavy = split.light_key, split.heavy_key

    def key_basis(x) -> float:
        return x[light] / (x[light] + x[heavy])

    z_key = key_basis(z)
    ends = {"distillate": key_basis(split.distillate), "bottoms": key_basis(split.bottoms)}
    found = []
    for az in azeotropes:
        for name, x in ends.items():
            if (x - az.x_first) * (z_key - az.x_first) <= 0.0:
                found.append(
                    f"{name} light-key fraction of the key pair {x:.6g} lies beyond the {az.kind} azeotrope "
                    f"of {az.first} and {az.second} at {az.x_first:.4g} ({az.T - 273.15:.1f} degC, "
                    f"{az.pressure / 1e5:.4g} bar{_predicted(az)}) while the feed has {z_key:.4g}{_artefact(az)}")
    return tuple(found)


def _predicted(az) -> str:
    """Where no parameters fitted to the pair stand behind the azeotrope, which method predicts it and
    what would settle it."""
    if not az.predicted_by:
        return ""
    return (f"; predicted by {az.predicted_by} without parameters fitted to the pair: where equilibrium "
            "data show none, give NRTL or Wilson parameters fitted to them")


def _artefact(az) -> str:
    """Where the azeotrope is one of the ideal-gas vapour (a dimerising acid), say so and what to give."""
    if not az.vapour_artefact:
        return ""
    return (f" (an azeotrope of the ideal-gas vapour only: with {az.dimerising}'s dimerisation in the vapour, "
            f"which disteco's activity-coefficient methods leave out, the pair's relative volatility there is "
            f"{az.alpha_dimerised:.3f} [-], so the mixture likely has none)")


# what to do about an azeotrope the method's vapour makes, said after the usual remedy
ARTEFACT_REMEDY = ("; or give NRTL or Wilson parameters regressed from equilibrium data with an ideal-gas vapour, "
                   "which carry the dimerisation into the liquid model")


def check_binary_azeotropes(split: ProductSplit, z, azeotropes) -> None:
    """Raise when a product of a two-component feed lies across an azeotrope from the feed."""
    crossings = key_azeotrope_crossings(split, z, azeotropes)
    if crossings:
        remedy = ARTEFACT_REMEDY if any(az.vapour_artefact for az in azeotropes) else ""
        raise InfeasibleSpecError(
            f"{crossings[0]}: ordinary distillation cannot cross an azeotrope; ask for a purity on the "
            f"feed's side of it{remedy}")
