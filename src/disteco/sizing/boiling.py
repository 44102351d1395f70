"""The peak heat flux of boiling, against which a reboiler's mean heat flux is checked.

A reboiler sized on U x mean temperature difference alone can ask for a heat flux that
nucleate boiling cannot carry: past the peak (critical) flux the liquid leaves the tubes in a
vapour film and the duty falls. This happens when the heating medium is far hotter than the
boiling liquid (low-pressure steam under a refrigerated column's bottoms) and near a
component's critical point, where latent heat, surface tension and the density difference
all shrink.
"""

from __future__ import annotations

STANDARD_GRAVITY = 9.80665  # m/s^2
LIENHARD_DHIR = 0.149  # [-], the constant of Zuber's form now most used


def zuber_peak_heat_flux(latent_heat: float, liquid_density: float, vapour_density: float,
                         surface_tension: float, constant: float = LIENHARD_DHIR) -> float:
    """Peak (critical) heat flux of nucleate pool boiling, Zuber's form [W/m^2].

    .. math:: q_{max} = K \\Delta h_v \\rho_v^{1/2} [\\sigma g (\\rho_L - \\rho_v)]^{1/4}

    Parameters
    ----------
    latent_heat : latent heat of vaporisation at the boiling pressure [J/kg]
    liquid_density, vapour_density : saturated densities [kg/m^3]
    surface_tension : of the boiling liquid [N/m]
    constant : K [-]; pi/24 = 0.131 in Zuber's derivation, 0.149 after Lienhard and Dhir

    Validity: a large flat plate or a single tube in a pool; the peak flux of a tube bundle is
    lower (the vapour of the lower tubes blankets the upper ones), so this is an upper bound.

    Examples
    --------
    >>> round(zuber_peak_heat_flux(272e3, 567.0, 18.09, 8.2e-3))
    444307

    References
    ----------
    1. Zuber, N., "On the stability of boiling heat transfer", Trans. ASME 80 (1958) 711-720.
    2. Lienhard, J. H., Dhir, V. K., "Extended hydrodynamic theory of the peak and minimum
       pool boiling heat fluxes", NASA CR-2270 (1973).
    3. Serth, R. W., Process Heat Transfer: Principles, Applications and Rules of Thumb,
       2nd ed., Academic Press (2014): the example above (as reproduced in the ht library).
    """
    lift = surface_tension * STANDARD_GRAVITY * (liquid_density - vapour_density)
    return constant * latent_heat * vapour_density ** 0.5 * max(lift, 0.0) ** 0.25


def reboiler_flux_warning(duty: float, area: float, peak: float, medium: str) -> str | None:
    """A warning where the mean heat flux ``duty``/``area`` [W/m^2] exceeds the ``peak`` [W/m^2]; else None."""
    flux = duty / area
    if flux <= peak:
        return None
    return (f"reboiler: the mean heat flux {flux / 1e3:,.0f} kW/m2 (on {medium}) exceeds the peak heat flux of "
            f"boiling the bottoms liquid, {peak / 1e3:,.0f} kW/m2 (Zuber's form, K 0.149; a tube bundle's peak "
            "is lower still): film boiling would cut the duty. The area is sized on the temperature difference "
            f"alone; at least {duty / peak:,.0f} m2 would be needed, or a heating medium nearer the boiling "
            "temperature")


__all__ = ["LIENHARD_DHIR", "reboiler_flux_warning", "zuber_peak_heat_flux"]
