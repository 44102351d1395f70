"""The feed on a molar basis, and its thermal condition q, from the mixture's properties."""

from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np
from scipy.optimize import brentq

from .._base.errors import CaseError, InfeasibleSpecError
from ..case import EndSpec, Feed, Products
from .mixture import Mixture

STANDARD_T = 288.15  # K; volumetric feed flows are taken as liquid at 15 degC (common practice, no source)


@dataclass(frozen=True)
class FeedState:
    """Feed molar flow [mol/s], composition [-], its own pressure [Pa], q [-] and enthalpy [J/mol].

    ``bubble_T`` and ``dew_T`` are those of the feed composition at the column pressure it enters.
    ``vapour_fraction`` is the feed's molar vapour fraction as it enters the column [-], None where not
    computed (a feed given by a q between 0 and 1, or one let down from its own pressure, which flashes
    on entry): on a wide-boiling feed it differs from 1 - q, which weighs the phases by enthalpy.
    """

    molar_flow: float
    z: tuple[float, ...]
    pressure: float
    q: float
    enthalpy: float
    bubble_T: float  # K
    dew_T: float  # K
    temperature: float  # K
    vapour_fraction: float | None = None


def mole_fractions(feed: Feed, mixture: Mixture) -> tuple[float, ...]:
    """The feed's mole fractions [-]: as written, or from mass fractions w_i (``feed.composition_basis``
    "mass") by the components' molar masses M_i, x_i = (w_i / M_i) / sum_j (w_j / M_j)."""
    if feed.composition_basis == "mole":
        return feed.composition
    moles = np.asarray(feed.composition) / mixture.molar_masses
    return tuple(float(v) for v in moles / moles.sum())


def products_on_mole_basis(products: Products, mixture: Mixture) -> Products:
    """``products`` with in-product fractions written by mass (``fraction_basis`` "mass", two components)
    as mole fractions, x = (w / M_key) / (w / M_key + (1 - w) / M_other), recoveries as they are; the
    specifications as written kept in ``written``."""
    if products.fraction_basis == "mole":
        return products
    M = mixture.molar_masses

    def moles(spec: EndSpec, key: int, other: int) -> EndSpec:
        if spec.kind != "fraction":
            return spec
        key_moles, other_moles = spec.value / M[key], (1.0 - spec.value) / M[other]
        return EndSpec("fraction", float(key_moles / (key_moles + other_moles)))

    light, heavy = products.light_key, products.heavy_key
    return replace(products, light_key_spec=moles(products.light_key_spec, light, heavy),
                   heavy_key_spec=moles(products.heavy_key_spec, heavy, light), fraction_basis="mole",
                   written=(products.light_key_spec, products.heavy_key_spec))


def feed_molar_flow(feed: Feed, mixture: Mixture) -> float:
    """Feed molar flow [mol/s] from the flow as written (molar, mass or liquid volume)."""
    z = np.asarray(mole_fractions(feed, mixture))
    if feed.flow.basis == "molar":
        return feed.flow.value
    if feed.flow.basis == "mass":
        return feed.flow.value / mixture.molar_mass(z)
    density = mixture.liquid_density(STANDARD_T, 101325.0, z)
    return feed.flow.value * density / mixture.molar_mass(z)


def feed_state(feed: Feed, mixture: Mixture, pressure: float) -> FeedState:
    """Feed state entering a column at ``pressure`` [Pa].

    q = (H_dew - H_feed) / (H_dew - H_bubble): the fraction of the feed that joins the
    liquid flow (McCabe-Thiele convention), with H_dew and H_bubble the saturated vapour and
    liquid of the feed composition at ``pressure``, where the feed enters, and H_feed the
    feed's enthalpy at its own pressure (``feed.pressure``, default ``pressure``): a feed
    let down through a valve keeps its enthalpy and flashes on entry. The enthalpies are the
    mixture's (``Mixture.liquid_enthalpy``/``vapour_enthalpy``: the equation of state's own
    for Peng-Robinson).
    """
    P = pressure
    P_feed = feed.pressure or pressure
    z = mole_fractions(feed, mixture)
    bubble = mixture.bubble_point(P, z)
    dew = mixture.dew_point(P, z)
    h_liquid = mixture.liquid_enthalpy(bubble.T, P, z)
    h_vapour = mixture.vapour_enthalpy(dew.T, P, z)
    latent = h_vapour - h_liquid
    condition = feed.condition
    if condition.kind == "q":
        q = condition.value
        h_feed = h_vapour - q * latent
        T = _temperature_of(q, bubble.T, dew.T)
        if q > 1.0:
            T = _subcooled_temperature(mixture, P, z, q, h_feed, h_vapour, latent, bubble.T)
        vapour_fraction = 0.0 if q >= 1.0 else 1.0 if q <= 0.0 else None
    elif condition.kind == "vapour_fraction":
        point = mixture.flash_pvf(P_feed, condition.value, z)
        T = point.T
        h_feed = _two_phase_enthalpy(mixture, point)
        q = (h_vapour - h_feed) / latent
        vapour_fraction = condition.value
    else:
        T = condition.value
        own_bubble, own_dew = (bubble, dew) if P_feed == P else (mixture.bubble_point(P_feed, z),
                                                                 mixture.dew_point(P_feed, z))
        if T <= own_bubble.T:
            h_feed, vapour_fraction = mixture.liquid_enthalpy(T, P_feed, z), 0.0
        elif T >= own_dew.T:
            h_feed, vapour_fraction = mixture.vapour_enthalpy(T, P_feed, z), 1.0
        else:
            point = mixture.flash_tp(T, P_feed, z)
            h_feed, vapour_fraction = _two_phase_enthalpy(mixture, point), float(point.vapour_fraction)
        q = (h_vapour - h_feed) / latent
    if not -5.0 <= q <= 5.0:
        raise InfeasibleSpecError(
            f"feed thermal condition: q = {q:.3g} is outside -5 to 5 (feed at {T - 273.15:.1f} degC against "
            f"bubble point {bubble.T - 273.15:.1f} degC and dew point {dew.T - 273.15:.1f} degC); "
            "check the feed temperature and pressure")
    return FeedState(feed_molar_flow(feed, mixture), tuple(z), P_feed, float(q), float(h_feed),
                     bubble.T, dew.T, float(T), vapour_fraction if P_feed == P or condition.kind == "q" else None)


def _two_phase_enthalpy(mixture: Mixture, point) -> float:
    """Molar enthalpy of a two-phase state: liquid and vapour weighted by the vapour fraction [J/mol]."""
    vf = point.vapour_fraction
    return (1.0 - vf) * mixture.liquid_enthalpy(point.T, point.P, point.x) \
        + vf * mixture.vapour_enthalpy(point.T, point.P, point.y)


SUBCOOLING_FLOOR = 0.5  # of the bubble point [K], the coldest liquid feed where the databank has no melting data


def _subcooled_temperature(mixture: Mixture, P: float, z, q: float, h_feed: float, h_vapour: float,
                           latent: float, bubble_T: float) -> float:
    """The liquid temperature [K] whose enthalpy a q above 1 gives, H_L(T) = H_dew - q (H_dew - H_bubble).

    Raises :class:`CaseError` (``feed.q``) where that liquid would be colder than where the feed
    starts to freeze (the liquidus of ``solid_liquid``), or, without melting data, than half its
    bubble point in kelvin: q = 5 for benzene-toluene asked for a liquid about 800 K below its
    bubble point, below absolute zero, and was designed as given.
    """
    frozen = mixture.liquidus(z)
    coldest = frozen.temperature if frozen is not None else SUBCOOLING_FLOOR * bubble_T
    h_coldest = mixture.liquid_enthalpy(coldest, P, z)
    if h_feed < h_coldest:
        where = (f"its freezing point ({frozen.component} freezes out at {coldest - 273.15:.1f} degC)"
                 if frozen is not None else f"half its bubble point in kelvin ({coldest - 273.15:.1f} degC)")
        raise CaseError("feed.q", f"q = {q:g} asks for a liquid feed colder than {where}",
                        f"q up to {(h_vapour - h_coldest) / latent:.3g} for this feed at {P / 1e3:.4g} kPa "
                        "(1: saturated liquid; above 1: subcooled)", q)
    return float(brentq(lambda T: mixture.liquid_enthalpy(T, P, z) - h_feed, coldest, bubble_T, xtol=1e-6))


def _temperature_of(q: float, bubble_T: float, dew_T: float) -> float:
    """Temperature for display when q is given: bubble, dew, or linear in between [K] (a subcooled
    liquid's own temperature replaces the bubble point, :func:`_subcooled_temperature`)."""
    if q >= 1.0:
        return bubble_T
    if q <= 0.0:
        return dew_T
    return dew_T + q * (bubble_T - dew_T)
