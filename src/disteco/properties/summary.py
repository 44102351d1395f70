"""A short summary of the mixture at column pressure: boiling points, volatility, azeotropes."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .._base.errors import PropertyError
from .binary import ARTEFACT_VOLATILITY, Azeotrope, all_azeotropes
from .mixture import IDEAL_GAS_VAPOUR_LIMIT, Mixture, PhasePoint

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
class VapourIdeality:
    """The key relative volatility at the feed's bubble point with the method's ideal-gas vapour
    and with a real vapour (thermo's gamma-phi route), for a method that takes the vapour as
    an ideal gas above :data:`IDEAL_GAS_VAPOUR_LIMIT`."""

    temperature: float  # K, the feed's bubble point at the top pressure
    alpha_ideal_gas: float  # [-]
    alpha_real_vapour: float | None  # [-]; None where thermo could not evaluate the real vapour

    @property
    def deviation(self) -> float | None:
        """alpha with the ideal-gas vapour over alpha with the real vapour, minus one [-] (positive: overstated)."""
        return None if self.alpha_real_vapour is None else self.alpha_ideal_gas / self.alpha_real_vapour - 1.0


@dataclass(frozen=True)
class VapourAssociation:
    """The key relative volatility range over the key pair with a carboxylic acid's dimerisation in the
    vapour (``association``), which the method's ideal-gas vapour leaves out."""

    acid: str
    alpha_min: float  # [-]
    alpha_max: float  # [-]


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
    vapour: VapourIdeality | None = None  # only for an ideal-gas vapour above 2 bar
    association: VapourAssociation | None = None  # only for a dimerising acid that moves alpha
    untuned_polar_pairs: tuple[str, ...] = ()  # "a/b": Peng-Robinson pairs with kij = 0 and a polar member
    acids_without_dimerisation: tuple[str, ...] = ()  # carboxylic acids whose vapour dimerisation is not measured


def _key_pair_bubble_points(mixture: Mixture, pressure: float, light: int, heavy: int) -> list[PhasePoint]:
    """Bubble points at ``pressure`` [Pa] of key-pair liquids from 1 % to 99 % light key."""
    points = []
    for x_light in VOLATILITY_GRID:
        x = np.zeros(mixture.size)
        x[light], x[heavy] = x_light, 1.0 - x_light
        points.append(mixture.bubble_point(pressure, x))
    return points


def key_volatility_range(mixture: Mixture, pressure: float, light: int, heavy: int,
                         points: list[PhasePoint] | None = None) -> tuple[float, float]:
    """Range of alpha(light/heavy) [-] over key-pair liquids from 1 % to 99 % light key at ``pressure`` [Pa]."""
    alphas = _key_alphas(mixture, points or _key_pair_bubble_points(mixture, pressure, light, heavy), light, heavy)
    return float(min(alphas)), float(max(alphas))


def _key_alphas(mixture: Mixture, points: list[PhasePoint], light: int, heavy: int) -> list[float]:
    """alpha(light/heavy) [-] at each of the bubble ``points``."""
    return [mixture.relative_volatility(p.T, p.P, p.x, light, heavy, p.y) for p in points]


def vapour_association(mixture: Mixture, points: list[PhasePoint], alphas: list[float], light: int,
                       heavy: int) -> VapourAssociation | None:
    """The key relative volatility range with the acid's dimerisation in the vapour, with a note, where the
    mixture has a dimerising acid and the dimerisation moves alpha (``alphas`` with the method's ideal-gas
    vapour) by more than :data:`ARTEFACT_VOLATILITY` somewhere on the key-pair bubble ``points``; else None."""
    acid = mixture.dimerising_acid
    if acid is None:
        return None
    pairs = [(ideal, mixture.dimerised_relative_volatility(p.T, p.P, p.x, light, heavy))
             for p, ideal in zip(points, alphas)]
    if max(abs(np.log(ideal / dimer)) for ideal, dimer in pairs) <= np.log(ARTEFACT_VOLATILITY):
        return None
    ideal, dimer = zip(*pairs)
    found = VapourAssociation(mixture.names[acid], float(min(dimer)), float(max(dimer)))
    keys = f"{mixture.names[light]}/{mixture.names[heavy]}"
    mixture.note("vapour-association",
                 f"{found.acid} dimerises in the vapour, which the {mixture.method} method's ideal-gas vapour "
                 f"leaves out: over key-pair liquids from 1 % to 99 % {mixture.names[light]} the {keys} relative "
                 f"volatility is {min(ideal):.3f} to {max(ideal):.3f} [-] as designed and {found.alpha_min:.3f} to "
                 f"{found.alpha_max:.3f} with the dimerisation (chemical theory, DEVELOPERS.md, Thermodynamics); "
                 "treat the stages and reflux as that uncertain, or give NRTL or Wilson parameters regressed from "
                 "equilibrium data with an ideal-gas vapour")
    return found


def untuned_polar_pairs(mixture: Mixture) -> tuple[str, ...]:
    """The pairs Peng-Robinson takes with kij = 0 although they need one ("a/b": a polar member, or carbon
    dioxide or nitrogen beside a hydrocarbon), with a note."""
    pairs = tuple(f"{mixture.names[i]}/{mixture.names[j]}" for i, j in mixture.untuned_polar_pairs)
    if pairs:
        names = ", ".join(pairs)
        mixture.note("untuned-polar-pairs",
                     f"Peng-Robinson takes {names} with no interaction parameter (kij = 0), a non-polar "
                     "mixture's default: with a polar component, or carbon dioxide or nitrogen beside a "
                     "hydrocarbon, the relative volatility can be far off and an azeotrope missed (carbon "
                     "dioxide/ethane's) or put where there is none; give [mixture.peng_robinson] kij fitted to "
                     "equilibrium data for these pairs")
    return pairs


def acids_without_dimerisation(mixture: Mixture) -> tuple[str, ...]:
    """The carboxylic acids whose vapour dimerisation the ideal-gas vapour leaves out and disteco
    cannot measure (``Mixture.acids_without_dimerisation``), with a note."""
    acids = tuple(mixture.names[i] for i in mixture.acids_without_dimerisation)
    if acids:
        mixture.note("unmeasured-association",
                     f"{', '.join(acids)}: carboxylic acid vapour dimerises (acetic acid's is more than half dimers "
                     f"near its boiling point), which the {mixture.method} method's ideal-gas vapour leaves out and "
                     "disteco has no dimerisation constants to measure here; treat the relative volatility, any "
                     "azeotrope, the stages and the reflux as uncertain, or give NRTL or Wilson parameters "
                     "regressed from equilibrium data with an ideal-gas vapour")
    return acids


def summarise_mixture(mixture: Mixture, z, pressure: float, light: int, heavy: int) -> MixtureSummary:
    """Summarise ``mixture`` with feed ``z`` [-] at ``pressure`` [Pa] for the key pair."""
    components = tuple(
        ComponentSummary(c.given, c.name, c.cas, float(mw), float(tb), float(zi))
        for c, mw, tb, zi in zip(mixture.components, mixture.molar_masses, mixture.normal_boiling_points, z))
    untuned = untuned_polar_pairs(mixture)
    points = _key_pair_bubble_points(mixture, pressure, light, heavy)
    alphas = _key_alphas(mixture, points, light, heavy)
    bubble = mixture.bubble_point(pressure, z)
    return MixtureSummary(
        method=mixture.method, pressure=pressure, components=components,
        light_key=mixture.names[light], heavy_key=mixture.names[heavy],
        key_volatility_min=float(min(alphas)), key_volatility_max=float(max(alphas)),
        feed_bubble_T=bubble.T, feed_dew_T=mixture.dew_point(pressure, z).T,
        azeotropes=tuple(all_azeotropes(mixture, pressure)),
        vapour=vapour_ideality(mixture, bubble, light, heavy),
        association=vapour_association(mixture, points, alphas, light, heavy), untuned_polar_pairs=untuned,
        acids_without_dimerisation=acids_without_dimerisation(mixture))


def vapour_ideality(mixture: Mixture, bubble: PhasePoint, light: int, heavy: int) -> VapourIdeality | None:
    """How far the ideal-gas vapour moves the key relative volatility at the feed's ``bubble`` point, with a note.

    None for Peng-Robinson and at or below :data:`IDEAL_GAS_VAPOUR_LIMIT`.
    """
    pressure = bubble.P
    if not mixture.ideal_gas_vapour or pressure <= IDEAL_GAS_VAPOUR_LIMIT:
        return None
    alpha = mixture.relative_volatility(bubble.T, pressure, bubble.x, light, heavy, bubble.y)
    try:
        k = mixture.real_vapour_k_values(bubble.T, pressure, bubble.x, bubble.y)
        found = VapourIdeality(bubble.T, alpha, float(k[light] / k[heavy]))
    except PropertyError:
        found = VapourIdeality(bubble.T, alpha, None)
    keys = f"{mixture.names[light]}/{mixture.names[heavy]}"
    if found.alpha_real_vapour is None:
        effect = "thermo could not evaluate a real vapour at the feed's bubble point"
    else:
        effect = (f"at the feed's bubble point ({bubble.T - 273.15:.1f} degC) the {keys} relative volatility is "
                  f"{alpha:.4f} with it and {found.alpha_real_vapour:.4f} [-] with vapour fugacity coefficients "
                  f"(Peng-Robinson), saturation fugacity coefficients and Poynting factors "
                  f"({100.0 * found.deviation:+.1f} %)")
    remedy = ('method = "peng-robinson" takes the vapour as it is' if mixture.method == "ideal" else
              "disteco's activity-coefficient methods have no real vapour yet: allow for it in the stages and reflux")
    mixture.note("ideal-gas-vapour",
                 f"the {mixture.method} method takes the vapour as an ideal gas at a top pressure of "
                 f"{pressure / 1e3:.0f} kPa (above {IDEAL_GAS_VAPOUR_LIMIT / 1e3:.0f} kPa): {effect}; {remedy}")
    return found
