"""The fitted property forms as the sizing layer's property provider.

The optimisation model sizes trays with the fitted forms (``disteco.properties.fitted``):
liquid density from the fitted molar volume, vapour density as an ideal gas, surface
tension from the fitted line. :class:`FittedSizingProperties` gives the sizing layer the
same numbers, so that the sizing and costing layers re-price a design exactly as the model
priced it (the model-against-re-price test, tests/test_one_copy.py). Viscosity, which the
model does not need, comes from the full mixture.
"""

from __future__ import annotations

from ..properties.fitted import GAS_CONSTANT, FittedMixture


def vapour_density(pressure, temperature, molar_mass):
    """Ideal-gas vapour density rho_V = P M / (R T) [kg/m^3] (floats or Pyomo expressions).

    Examples
    --------
    >>> round(vapour_density(101325.0, 353.0, 0.078), 3)
    2.693
    """
    return pressure * molar_mass / (GAS_CONSTANT * temperature)


def liquid_density(fitted: FittedMixture, T, x):
    """Liquid density from the fitted molar volume, M(x) / v_L(T, x) [kg/m^3] (floats or Pyomo)."""
    return fitted.molar_mass(x) / fitted.liquid_molar_volume(T, x)


class FittedSizingProperties:
    """The sizing layer's ``SizingProperties`` from fitted forms; viscosity and components from ``mixture``."""

    def __init__(self, fitted: FittedMixture, mixture):
        self.fitted = fitted
        self.mixture = mixture
        self.components = getattr(mixture, "components", ())

    def liquid_density(self, T: float, P: float, x) -> float:
        return liquid_density(self.fitted, T, list(x))

    def vapour_density(self, T: float, P: float, y) -> float:
        return vapour_density(P, T, self.fitted.molar_mass(list(y)))

    def surface_tension(self, T: float, x) -> float:
        return self.fitted.surface_tension_of(T, list(x))

    def liquid_viscosity(self, T: float, P: float, x) -> float:
        return self.mixture.liquid_viscosity(T, P, x)

    def molar_mass(self, z) -> float:
        return self.fitted.molar_mass(list(z))

    def liquidus(self, x):
        return self.mixture.liquidus(x)

    def relative_volatility(self, T: float, P: float, x, light: int, heavy: int, y=None) -> float:
        k = self.fitted.k_values(T, P, list(x))
        return float(k[light] / k[heavy])
