"""The thermodynamics adapter: one ``Mixture`` per case, built once over thermo and cached.

This module, ``components`` and ``data_cache`` are the only places that import thermo/chemicals. Every
method takes and returns SI floats and mole-fraction sequences; callers never see a thermo
object.
"""

from __future__ import annotations

import math
from contextlib import contextmanager
from dataclasses import dataclass
from functools import cached_property, lru_cache

import numpy as np
from chemicals.interface import Winterfeld_Scriven_Davis
from fluids.numerics import UnconvergedError
from scipy.optimize import brentq
from thermo import (CEOSGas, CEOSLiquid, FlashVL, GibbsExcessLiquid,
                    IdealGas, NRTL, PR, PRMIX, UNIFAC, Wilson)
from thermo.unifac import DOUFIP2016, DOUFSG

from .._base.errors import CaseError, InfeasibleSpecError, PropertyError
from ..case import Thermo
from .association import DIMERISING_ACIDS, dimerised_k_values, dimerising_acid
from .solid_liquid import Liquidus, liquidus
from .components import ComponentId, resolve_components
from .data_cache import component_packages
from .eos_bubble import newton_bubble_point
from .vle_fallback import NoSplit, isothermal_split, saturation_point, wilson_k, wilson_start
from .critical import (extrapolated_surface_tension, log_mixing, supercritical_liquid_density,
                       supercritical_liquid_viscosity, supercritical_surface_tension)

HIGH_PRESSURE = 1e6  # Pa; above this the automatic choice is Peng-Robinson (common practice, no source)
# Pa; above this a vapour taken as an ideal gas overstates a light hydrocarbon key pair's relative
# volatility by more than about 5 % (measured against thermo's gamma-phi route, DEVELOPERS.md)
IDEAL_GAS_VAPOUR_LIMIT = 2e5
REFERENCE_T = 298.15  # K
NEAR_PURE = 1e-6  # [-]; a composition within this of a pure component is an end point
# Largest |kij| of a Peng-Robinson mixture whose bubble points skip thermo's stability test (hydrocarbon
# pairs carry 0 to about 0.03; carbon dioxide with hydrocarbons about 0.13, where liquids can split;
# common practice, no source)
REGULAR_KIJ = 0.05


@dataclass(frozen=True)
class PhasePoint:
    """A two-phase state: temperature [K], pressure [Pa], vapour fraction [-], x and y [-]."""

    T: float
    P: float
    vapour_fraction: float
    x: tuple[float, ...]
    y: tuple[float, ...]


# Pure-component correlations, in order of preference, for the properties sizing uses. thermo's
# own default for many components is a fit labelled with the name of an existing program; data
# so labelled is not used here, so a published correlation or data compilation is chosen instead.
PUBLISHED_METHODS = {
    "SurfaceTensions": ("SOMAYAJULU2", "SOMAYAJULU", "JASPER", "VDI_PPDS", "MIQUEU", "BROCK_BIRD", "PITZER_SIGMA",
                        "SASTRI_RAO", "ZUO_STENBY", "Aleem"),
    "ViscosityLiquids": ("DIPPR_PERRY_8E", "VDI_PPDS", "DUTT_PRASAD", "VISWANATH_NATARAJAN_3",
                         "VISWANATH_NATARAJAN_2", "LETSOU_STIEL", "PRZEDZIECKI_SRIDHAR", "JOBACK"),
    "ViscosityGases": ("DIPPR_PERRY_8E", "VDI_PPDS", "LUCAS_GAS", "STIEL_THODOS", "YOON_THODOS", "GHARAGHEIZI"),
    "ThermalConductivityLiquids": ("DIPPR_PERRY_8E", "VDI_PPDS", "SATO_RIEDEL", "LAKSHMI_PRASAD", "GHARAGHEIZI_L"),
    "ThermalConductivityGases": ("DIPPR_PERRY_8E", "VDI_PPDS", "CHUNG", "EUCKEN_MOD", "EUCKEN"),
}


SECANT_REACH = 60.0  # K beyond the pure components' saturation temperatures the secant may look
SECANT_STEP = 20.0  # K, its largest step
SECANT_SLOPE = 0.04  # 1/K, d ln(sum K x)/dT assumed for its first step (Clausius-Clapeyron, about 30 kJ/mol at 350 K)


def _secant_temperature(residual, T: float, low: float, high: float, iterations: int = 12) -> float | None:
    """Root [K] of the increasing ``residual`` (ln sum K x) by the secant method from ``T``, or None where it
    leaves ``low`` to ``high`` or does not converge to 1e-9 K (the caller then brackets it).

    Measured on ethanol-water (UNIFAC-Dortmund, 60 liquids at 1.2 bar): 11 evaluations of K a bubble point
    by brentq on the saturation temperatures' bracket; the secant from the saturation temperatures' mean
    needs 6.6, and agrees to 1e-11 K.
    """
    f = residual(T)
    step = max(-SECANT_STEP, min(SECANT_STEP, -f / SECANT_SLOPE))
    for _ in range(iterations):
        if not (math.isfinite(f) and low <= T + step <= high):
            return None
        T_next = T + step
        if abs(step) < 1e-9:
            return T_next
        f_next = residual(T_next)
        if not math.isfinite(f_next) or f_next == f:
            return None
        step = max(-SECANT_STEP, min(SECANT_STEP, -f_next * (T_next - T) / (f_next - f)))
        T, f = T_next, f_next
    return None


def choose_published_methods(correlations) -> None:
    """Set each pure-component correlation named in :data:`PUBLISHED_METHODS` to the first listed
    method thermo has data for (a component with none of them keeps thermo's choice)."""
    for group, preferred in PUBLISHED_METHODS.items():
        for correlation in getattr(correlations, group, None) or ():
            available = correlation.all_methods
            chosen = next((m for m in preferred if m in available), None)
            if chosen is not None:
                correlation.method = chosen


# Share of a fluid's pseudo-critical pressure (Kay's rule) above which a split neither flash route finds
# is put down to the critical region (a demethaniser's top vapour at 44 bar, its pseudo-critical 46 bar).
NEAR_CRITICAL_SHARE = 0.9


class Mixture:
    """Phase equilibrium and physical properties of one mixture over thermo.

    Build it with :func:`build_mixture`, which caches one instance per components and
    method, because thermo's set-up takes about a second.
    """

    def __init__(self, components: tuple[ComponentId, ...], method: str, thermo_spec: Thermo):
        self.components = components
        self.method = method
        ids = [c.cas for c in components]
        self._constants, self._correlations = component_packages(ids)
        choose_published_methods(self._correlations)
        self._flasher = self._make_flasher(thermo_spec)
        self._notes: dict[str, str] = {}
        self._quiet = False

    # ------------------------------------------------------------ set-up
    def _make_flasher(self, spec: Thermo) -> FlashVL:
        consts, props = self._constants, self._correlations
        n = len(self.components)
        z = [1.0 / n] * n
        state = dict(T=REFERENCE_T, P=101325.0, zs=z)
        if self.method == "peng-robinson":
            kij = [list(row) for row in spec.kij] if spec.kij else [[0.0] * n for _ in range(n)]
            self._kij = kij
            eos_kwargs = dict(Tcs=consts.Tcs, Pcs=consts.Pcs, omegas=consts.omegas, kijs=kij)
            gas = CEOSGas(PRMIX, eos_kwargs=eos_kwargs, HeatCapacityGases=props.HeatCapacityGases, **state)
            liquid = CEOSLiquid(PRMIX, eos_kwargs=eos_kwargs, HeatCapacityGases=props.HeatCapacityGases,
                                **state)
            return FlashVL(consts, props, liquid=liquid, gas=gas)
        excess = self._excess_model(spec, z)
        liquid = GibbsExcessLiquid(
            VaporPressures=props.VaporPressures, HeatCapacityGases=props.HeatCapacityGases,
            VolumeLiquids=props.VolumeLiquids, EnthalpyVaporizations=props.EnthalpyVaporizations,
            GibbsExcessModel=excess, equilibrium_basis="Psat", caloric_basis="Hvap", **state)
        gas = IdealGas(HeatCapacityGases=props.HeatCapacityGases, **state)
        return FlashVL(consts, props, liquid=liquid, gas=gas)

    def _excess_model(self, spec: Thermo, z):
        if self.method == "unifac-dortmund":
            groups = self._constants.UNIFAC_Dortmund_groups
            missing = [c.given for c, g in zip(self.components, groups) if not g]
            if missing:
                raise CaseError("mixture.method", f"no UNIFAC (Dortmund) groups for {', '.join(missing)}",
                                "nrtl or wilson with parameters in the case file, or peng-robinson with the pairs' "
                                "kij in the case file")
            return UNIFAC.from_subgroups(T=REFERENCE_T, xs=z, chemgroups=groups, version=1,
                                         interaction_data=DOUFIP2016, subgroups=DOUFSG)
        if self.method == "nrtl":
            return NRTL(T=REFERENCE_T, xs=z, tau_as=[list(r) for r in spec.nrtl_a],
                        tau_bs=[list(r) for r in spec.nrtl_b], alpha_cs=[list(r) for r in spec.nrtl_alpha])
        if self.method == "wilson":
            return Wilson(T=REFERENCE_T, xs=z, lambda_as=[list(r) for r in spec.wilson_a],
                          lambda_bs=[list(r) for r in spec.wilson_b])
        return None  # ideal solution: activity coefficients of one

    # ------------------------------------------------------------ constants
    @property
    def names(self) -> tuple[str, ...]:
        return tuple(c.given for c in self.components)

    @cached_property
    def molar_masses(self) -> np.ndarray:
        """Molar masses [kg/mol]."""
        return np.array(self._constants.MWs) * 1e-3

    @cached_property
    def normal_boiling_points(self) -> np.ndarray:
        """Normal boiling points [K]."""
        return np.array(self._constants.Tbs, dtype=float)

    @cached_property
    def critical_temperatures(self) -> np.ndarray:
        """Critical temperatures [K]."""
        return np.array(self._constants.Tcs, dtype=float)

    @cached_property
    def critical_pressures(self) -> np.ndarray:
        """Critical pressures [Pa]."""
        return np.array(self._constants.Pcs, dtype=float)

    @property
    def size(self) -> int:
        return len(self.components)

    # ------------------------------------------------------------ equilibrium
    def _flash(self, **kwargs):
        zs = [float(v) for v in kwargs.pop("zs")]
        try:
            with np.errstate(all="ignore"):
                return self._flasher.flash(zs=zs, **kwargs)
        except Exception as exc:  # thermo raises many kinds; ours names the state
            state = ", ".join(f"{k}={v:.6g}" for k, v in kwargs.items())
            raise PropertyError(f"phase equilibrium failed at {state}, z={np.round(zs, 6).tolist()}: {exc}") \
                from exc

    def _point(self, result, P: float) -> PhasePoint:
        liquid = result.liquid0 if result.liquid_count else None
        gas = result.gas
        x = tuple(liquid.zs) if liquid is not None else tuple(result.zs)
        y = tuple(gas.zs) if gas is not None else tuple(result.zs)
        return PhasePoint(result.T, P, float(result.VF), x, y)

    def bubble_point(self, P: float, x) -> PhasePoint:
        """Bubble temperature and incipient vapour of liquid ``x`` at ``P`` [Pa].

        With an ideal-gas vapour K depends on T and x only, so sum(K_i x_i) = 1 is solved
        directly in T; this also holds at an azeotrope, where a general flash struggles.
        """
        if self.method == "peng-robinson":
            own = self._newton_bubble_point(P, x) if self._regular_eos_liquid else None
            return own or self.flash_pvf(P, 0.0, x)
        x = np.asarray(x, dtype=float)
        T = self.own_vapour_temperature(P, x)
        y = self.k_values(T, P, x) * x
        return PhasePoint(float(T), P, 0.0, tuple(map(float, x)), tuple(map(float, y / y.sum())))

    @cached_property
    def _regular_eos_liquid(self) -> bool:
        """Whether the Peng-Robinson liquid can be taken as one phase at its bubble point: no polar
        component and every |kij| at most :data:`REGULAR_KIJ` (see :mod:`.eos_bubble`)."""
        return not any(c.is_polar for c in self.components) and \
            float(np.max(np.abs(self._kij))) <= REGULAR_KIJ

    def _newton_bubble_point(self, P: float, x) -> PhasePoint | None:
        c = self._constants
        found = newton_bubble_point(self._flasher.liquid, self._flasher.gas, P, x, c.Tcs, c.Pcs, c.omegas)
        if found is None:
            return None
        T, y = found
        return PhasePoint(float(T), P, 0.0, tuple(float(v) for v in x), tuple(map(float, y)))

    def own_vapour_temperature(self, P: float, x, bracket: tuple[float, float] | None = None) -> float:
        """Temperature [K] at which liquid ``x`` is in equilibrium with a vapour of its own
        composition at ``P`` [Pa]: sum_i K_i(T, x, y = x) x_i = 1.

        The bubble temperature where K do not depend on the vapour (an ideal-gas vapour), and
        for any method the temperature of an azeotrope at its composition. Without ``bracket``
        first by the secant method from the mole-fraction mean of the saturation temperatures
        (:func:`_secant_temperature`), else, and where that fails, by brentq: ``bracket`` [K] is
        where to look first (default the pure components' saturation temperatures, 20 K
        wider), widened by 20 K steps until it brackets.
        """
        x = np.asarray(x, dtype=float)

        def residual(T):
            return float(np.log(np.dot(self.k_values(T, P, x, x), x)))

        if bracket is None:
            T_sat = self.saturation_temperatures(P)
            found = _secant_temperature(residual, float(x @ T_sat), float(T_sat.min()) - SECANT_REACH,
                                        float(T_sat.max()) + SECANT_REACH)
            if found is not None:
                return found
            bracket = (float(T_sat.min()) - 20.0, float(T_sat.max()) + 20.0)
        low, high = bracket
        for _ in range(10):
            if residual(low) < 0.0 < residual(high):
                break
            low, high = low - 20.0, high + 20.0
        else:
            raise PropertyError(f"no bubble point found for x={np.round(x, 6).tolist()} at P={P:.6g} Pa")
        return float(brentq(residual, low, high, xtol=1e-9))

    def saturation_temperatures(self, P: float) -> np.ndarray:
        """Pure-component saturation temperatures at ``P`` [Pa] from thermo's vapour pressures [K]."""
        return np.array([_saturation_temperature(psat, P) for psat in self._correlations.VaporPressures])

    def vapour_pressures(self, T: float) -> np.ndarray:
        """Pure-component vapour pressures at ``T`` [K] [Pa]."""
        return np.array([psat(T) for psat in self._correlations.VaporPressures])

    def dew_point(self, P: float, y) -> PhasePoint:
        """Dew temperature and incipient liquid of vapour ``y`` at ``P`` [Pa]."""
        return self.flash_pvf(P, 1.0, y)

    def flash_tp(self, T: float, P: float, z) -> PhasePoint:
        """Isothermal flash at ``T`` [K] and ``P`` [Pa] (second route as for :meth:`flash_pvf`)."""
        try:
            return self._point(self._flash(T=T, P=P, zs=z), P)
        except PropertyError as failure:
            c = self._constants
            z = np.asarray(z, dtype=float)
            try:
                beta, x, y = isothermal_split(lambda T, x, y: self.k_values(T, P, x, y), T, z,
                                              wilson_k(T, P, c.Tcs, c.Pcs, c.omegas))
            except NoSplit:
                self._no_split(P, z, failure)
            self._note_fallback(z)
            return PhasePoint(float(T), P, float(beta), tuple(map(float, x)), tuple(map(float, y)))

    def flash_pvf(self, P: float, vapour_fraction: float, z) -> PhasePoint:
        """Flash at ``P`` [Pa] and a molar vapour fraction [-].

        Where thermo's flash fails, the equilibrium is solved again on the same fugacities by
        :mod:`.vle_fallback`; where no vapour-liquid split exists at ``P`` that is an
        infeasible request (:meth:`_no_split`).
        """
        try:
            return self._point(self._flash(P=P, VF=vapour_fraction, zs=z), P)
        except PropertyError as failure:
            return self._fallback_pvf(P, vapour_fraction, z, failure)

    def _fallback_pvf(self, P: float, vapour_fraction: float, z, failure: PropertyError) -> PhasePoint:
        c = self._constants
        z = np.asarray(z, dtype=float)
        try:
            T0, k0 = wilson_start(P, z, vapour_fraction, c.Tcs, c.Pcs, c.omegas)
            T, x, y = saturation_point(lambda T, x, y: self.k_values(T, P, x, y), z, vapour_fraction, T0, k0)
        except (NoSplit, ValueError):
            self._no_split(P, z, failure, vapour_fraction)
        self._note_fallback(z)
        return PhasePoint(T, P, float(vapour_fraction), tuple(map(float, x)), tuple(map(float, y)))

    def _note_fallback(self, z) -> None:
        """Say that the second route was taken, except at a near-pure end point (one mole fraction
        above 1 - 1e-6, as the ends of a binary's equilibrium curve): thermo's flash fails there
        routinely and the second route reproduces thermo's pure-component saturation point."""
        if max(z) > 1.0 - NEAR_PURE:
            return
        self._note("fallback-flash", "thermo's flash failed on some states; they were solved by disteco's own "
                   "successive-substitution route on the same equation of state (see DEVELOPERS.md)")

    def _no_split(self, P: float, z, failure: PropertyError, vapour_fraction: float | None = None):
        """Raise: no vapour-liquid split at ``P``. Infeasible at or above the fluid's pseudo-critical
        pressure (Kay's rule, the mole-fraction mean of the critical pressures: a trace of a gas above
        its own critical pressure does not make a mixture critical), and a liquid with no bubble point
        because light gases in it keep a vapour at any temperature; within 10 % below the pseudo-critical
        pressure, not found there (:data:`NEAR_CRITICAL_SHARE`); else ``failure`` itself."""
        present = [i for i, zi in enumerate(z) if zi > 1e-9]
        critical = ", ".join(f"{self.names[i]} {self.critical_pressures[i] / 1e5:.4g} bar" for i in present)
        fluid = ", ".join(f"{self.names[i]} {z[i]:.4g}" for i in present)
        pseudo_critical = sum(z[i] * self.critical_pressures[i] for i in present) / sum(z[i] for i in present)
        if P >= min(self.critical_pressures[i] for i in present) and P >= pseudo_critical:
            raise InfeasibleSpecError(
                f"no vapour-liquid split exists at {P / 1e5:.4g} bar for a fluid of mole fractions {fluid}: "
                "the pressure is at or above the mixture's critical region "
                f"(critical pressures: {critical}), where liquid and vapour become one fluid; "
                "lower the column pressure") from None
        # gases: above their critical temperature at the liquid's mean normal boiling point (a stabiliser's
        # liquid named its ethane and propane beside its hydrogen and methane when the heaviest one's was
        # taken), else at the heaviest one's
        mean = sum(z[i] * self.normal_boiling_points[i] for i in present) / sum(z[i] for i in present)
        heaviest = max(self.normal_boiling_points[i] for i in present)
        gases = [i for i in present if self.critical_temperatures[i] < mean] or \
            [i for i in present if self.critical_temperatures[i] < heaviest]
        if P >= NEAR_CRITICAL_SHARE * pseudo_critical and not (vapour_fraction == 0.0 and gases):
            raise InfeasibleSpecError(
                f"no vapour-liquid split found at {P / 1e5:.4g} bar for a fluid of mole fractions {fluid}: the "
                f"pressure lies within {100 * (1.0 - NEAR_CRITICAL_SHARE):.0f} % of its pseudo-critical pressure "
                f"({pseudo_critical / 1e5:.4g} bar; critical pressures: {critical}), where neither thermo's flash "
                "nor disteco's own route finds the two phases; lower the column pressure") from None
        if vapour_fraction == 0.0 and gases:
            named = ", ".join(f"{self.names[i]} {z[i]:.3g} (critical temperature "
                              f"{self.critical_temperatures[i] - 273.15:.0f} degC)" for i in gases)
            raise InfeasibleSpecError(
                f"a liquid of mole fractions {fluid} has no bubble point at {P / 1e5:.4g} bar: its dissolved "
                f"gases ({named}) keep a vapour at every temperature, its bubble pressure lying above "
                "this pressure; disteco takes the feed's and the column liquids' bubble points at the column "
                "pressure: raise column.top_pressure, or take the gases off before the column (a flash "
                "drum ahead of it)") from None
        raise failure

    def k_values(self, T: float, P: float, x, y=None) -> np.ndarray:
        """Equilibrium ratios K_i = y_i/x_i = phi_i^L(x)/phi_i^V(y) [-] (y defaults to x)."""
        return self.k_values_and_liquid_enthalpy(T, P, x, y, enthalpy=False)[0]

    def k_values_and_liquid_enthalpy(self, T: float, P: float, x, y=None,
                                     enthalpy: bool = True) -> tuple[np.ndarray, float]:
        """:meth:`k_values` and :meth:`liquid_enthalpy` of liquid ``x`` from one liquid phase of thermo's:
        an activity model's intermediate terms are then computed once (measured on acetone/water,
        UNIFAC-Dortmund: 71 instead of 98 microseconds for the pair). The enthalpy is 0 without ``enthalpy``."""
        phi_liquid, h_liquid = self.liquid_state(T, P, x, enthalpy)
        phi_vapour, _ = self.vapour_state(T, P, x if y is None else y, enthalpy=False)
        return phi_liquid / phi_vapour, h_liquid

    def liquid_state(self, T: float, P: float, x, enthalpy: bool = True) -> tuple[np.ndarray, float]:
        """Fugacity coefficients phi_i^L [-] of liquid ``x`` (an activity model's gamma_i Psat_i / P and its
        corrections) and its molar enthalpy [J/mol] (0 without ``enthalpy``), from one phase of thermo's.

        With :meth:`vapour_state`, K_i = phi_i^L / phi_i^V: a Newton column that moves one phase's flows
        evaluates that phase only (one equation-of-state solve instead of two or three on Peng-Robinson).
        """
        liquid = self._phase_at(self._flasher.liquid, T, P, x)
        return np.array(liquid.phis()), float(liquid.H()) if enthalpy else 0.0

    def vapour_state(self, T: float, P: float, y, enthalpy: bool = True) -> tuple[np.ndarray, float]:
        """Fugacity coefficients phi_i^V [-] of vapour ``y`` (ones for an ideal gas) and its molar enthalpy
        [J/mol] (0 without ``enthalpy``), from one phase of thermo's (see :meth:`liquid_state`)."""
        gas = self._phase_at(self._flasher.gas, T, P, y)
        return np.array(gas.phis()), float(gas.H()) if enthalpy else 0.0

    @staticmethod
    def _phase_at(phase, T: float, P: float, z):
        """thermo's ``phase`` at (T, P, z); PropertyError where it cannot be evaluated (a Newton step's
        temperature at or below zero: the square root of T in Peng-Robinson's alpha function)."""
        if not T > 0.0:
            raise PropertyError(f"no phase at T={T:.6g} K")
        try:
            return phase.to(T=T, P=P, zs=[float(v) for v in z])
        except (ValueError, ArithmeticError) as exc:
            raise PropertyError(f"thermo could not evaluate a phase at T={T:.6g} K, P={P:.6g} Pa: {exc}") from exc

    def relative_volatility(self, T: float, P: float, x, light: int, heavy: int, y=None) -> float:
        """alpha = K_light / K_heavy [-]."""
        k = self.k_values(T, P, x, y)
        return float(k[light] / k[heavy])

    @property
    def ideal_gas_vapour(self) -> bool:
        """True when the method takes the vapour as an ideal gas (all but Peng-Robinson)."""
        return self.method != "peng-robinson"

    @cached_property
    def _real_vapour_phases(self):
        """The same liquid with saturation fugacity coefficients and Poynting factors, and a
        Peng-Robinson vapour (kij zero): thermo's gamma-phi route."""
        consts, props, n = self._constants, self._correlations, self.size
        state = dict(T=REFERENCE_T, P=101325.0, zs=[1.0 / n] * n)
        pures = [PR(Tc=Tc, Pc=Pc, omega=omega, T=REFERENCE_T, P=101325.0)
                 for Tc, Pc, omega in zip(consts.Tcs, consts.Pcs, consts.omegas)]
        liquid = GibbsExcessLiquid(
            VaporPressures=props.VaporPressures, HeatCapacityGases=props.HeatCapacityGases,
            VolumeLiquids=props.VolumeLiquids, GibbsExcessModel=self._flasher.liquid.GibbsExcessModel,
            eos_pure_instances=pures, use_phis_sat=True, use_Poynting=True, **state)
        gas = CEOSGas(PRMIX, eos_kwargs=dict(Tcs=consts.Tcs, Pcs=consts.Pcs, omegas=consts.omegas),
                      HeatCapacityGases=props.HeatCapacityGases, **state)
        return liquid, gas

    def real_vapour_k_values(self, T: float, P: float, x, y) -> np.ndarray:
        """K_i [-] of this method's liquid against a real vapour: gamma_i Psat_i phi_sat_i Poynting_i / (phi_i^V P).

        Shows what the ideal-gas vapour of the activity and ideal methods leaves out; raises
        PropertyError where thermo cannot evaluate it (a component above its critical point).
        """
        liquid, gas = self._real_vapour_phases
        try:
            with np.errstate(all="ignore"):
                k = (np.array(liquid.to(T=T, P=P, zs=[float(v) for v in x]).phis())
                     / np.array(gas.to(T=T, P=P, zs=[float(v) for v in y]).phis()))
        except Exception as exc:  # thermo raises many kinds
            raise PropertyError(f"no real-vapour K-values at T={T:.6g} K, P={P:.6g} Pa: {exc}") from exc
        if not np.all(np.isfinite(k)) or np.any(k <= 0.0):
            raise PropertyError(f"no real-vapour K-values at T={T:.6g} K, P={P:.6g} Pa")
        return k

    @cached_property
    def _carboxylic_acids(self) -> tuple[int, ...]:
        """Indices of the components with a Dortmund UNIFAC COOH or HCOOH group, or dimerisation constants."""
        groups = component_packages([c.cas for c in self.components])[0].UNIFAC_Dortmund_groups
        return tuple(i for i, found in enumerate(groups)
                     if any(DOUFSG[g].main_group_id in ACID_MAIN_GROUPS for g in (found or {}))
                     or self.components[i].cas in DIMERISING_ACIDS)

    @cached_property
    def acids_without_dimerisation(self) -> tuple[int, ...]:
        """Indices of the carboxylic acids whose vapour dimerisation disteco cannot measure, where this
        method takes the vapour as an ideal gas of monomers: every acid but :attr:`dimerising_acid`."""
        if not self.ideal_gas_vapour:
            return ()
        return tuple(i for i in self._carboxylic_acids if i != self.dimerising_acid)

    @cached_property
    def dimerising_acid(self) -> int | None:
        """Index of the component that dimerises in the vapour (``association.DIMERISING_ACIDS``) where it is
        the only carboxylic acid (chemical theory with one self-dimerising acid; cross-dimers are not
        covered) and this method takes the vapour as an ideal gas of monomers; else None."""
        if not self.ideal_gas_vapour or len(self._carboxylic_acids) != 1:
            return None
        return dimerising_acid([c.cas for c in self.components])

    @cached_property
    def untuned_polar_pairs(self) -> tuple[tuple[int, int], ...]:
        """Pairs (i < j) that Peng-Robinson takes with a zero interaction parameter although one of
        them is polar (water, ammonia, an alcohol), or is carbon dioxide or nitrogen beside a
        hydrocarbon: the quadratic mixing rule with kij = 0 is a non-polar mixture's default and can
        put a liquid split, an azeotrope or a volatility far from the mixture's own in such a pair,
        or miss one (carbon dioxide/ethane's azeotrope) (common practice, no source). Empty for other
        methods."""
        if self.method != "peng-robinson":
            return ()
        return tuple((i, j) for i in range(self.size) for j in range(i + 1, self.size)
                     if not self.pair_parameters_given(i, j) and _needs_kij(self.components[i], self.components[j]))

    def liquidus(self, x) -> Liquidus | None:
        """Where liquid ``x`` [-] starts to freeze (``solid_liquid``): the databank's melting points and
        heats of fusion in the Schroeder-van Laar equation; None where no component has them."""
        c = self._constants
        return liquidus(x, self.names, c.Tms, c.Hfus_Tms)

    def pair_parameters_given(self, i: int, j: int) -> bool:
        """Whether the case fitted the pair (i, j): NRTL and Wilson always, Peng-Robinson where kij is not
        zero; UNIFAC (Dortmund) predicts from groups and Raoult's law has no parameters."""
        if self.method in ("nrtl", "wilson"):
            return True
        return self.method == "peng-robinson" and self._kij[i][j] != 0.0

    def untuned_pair_caveat(self, light: int, heavy: int) -> str:
        """A clause naming the key pair where :attr:`untuned_polar_pairs` holds it, else ""."""
        pair = (min(light, heavy), max(light, heavy))
        if pair not in self.untuned_polar_pairs:
            return ""
        return (f"Peng-Robinson with no interaction parameter (kij = 0) for {self.names[light]}/"
                f"{self.names[heavy]}, a pair that needs one, may show this where the mixture has none: give "
                "[mixture.peng_robinson] kij fitted to equilibrium data for the pair (or NRTL or Wilson "
                "parameters) and check again")

    def dimerised_relative_volatility(self, T: float, P: float, x, light: int, heavy: int) -> float:
        """alpha = K_light / K_heavy [-] of liquid ``x`` at ``T`` [K], ``P`` [Pa] with this method's
        liquid and the acid's dimerisation in the vapour (for a mixture with a :attr:`dimerising_acid`)."""
        acid = self.dimerising_acid
        k = dimerised_k_values(self.k_values(T, P, x), x, T, P, float(self.vapour_pressures(T)[acid]), acid,
                               DIMERISING_ACIDS[self.components[acid].cas])
        return float(k[light] / k[heavy])

    # ------------------------------------------------------------ caloric
    def liquid_enthalpy(self, T: float, P: float, x) -> float:
        """Molar enthalpy of liquid ``x`` [J/mol] (ideal-gas elements reference of thermo)."""
        return float(self._phase_at(self._flasher.liquid, T, P, x).H())

    def liquid_root_exists(self, T: float, P: float, x) -> bool:
        """False where the equation of state has no liquid-like root at (T, P, x): thermo's "liquid" is then the vapour.

        Activity-coefficient and ideal liquids always exist.
        """
        if self.method != "peng-robinson":
            return True
        return "l" in self._flasher.liquid.to(T=T, P=P, zs=[float(v) for v in x]).eos_mix.phase

    def dilute_liquid_enthalpy(self, T: float, P: float, i: int, solvent: int) -> float | None:
        """Partial molar enthalpy of component ``i`` at infinite dilution in liquid ``solvent`` [J/mol].

        H + dH/dn_i of the pure solvent liquid; None where the solvent has no liquid root.
        """
        zs = [0.0] * self.size
        zs[solvent] = 1.0
        liquid = self._flasher.liquid.to(T=T, P=P, zs=zs)
        if not self.liquid_root_exists(T, P, zs):
            return None
        return float(liquid.H() + liquid.dH_dns()[i])

    def vapour_enthalpy(self, T: float, P: float, y) -> float:
        """Molar enthalpy of vapour ``y`` [J/mol]."""
        return float(self._phase_at(self._flasher.gas, T, P, y).H())

    def heat_of_vaporisation(self, P: float, z) -> float:
        """Dew-point vapour minus bubble-point liquid enthalpy of composition ``z`` [J/mol]."""
        bubble = self.bubble_point(P, z)
        dew = self.dew_point(P, z)
        return self.vapour_enthalpy(dew.T, P, z) - self.liquid_enthalpy(bubble.T, P, z)

    # ------------------------------------------------------------ warnings channel
    @property
    def warnings(self) -> tuple[str, ...]:
        """Notes on property routes taken since the last :meth:`clear_warnings` (in order, no repeats)."""
        return tuple(self._notes.values())

    def clear_warnings(self) -> None:
        """Forget the notes (the mixture is cached across runs; a run starts by clearing them)."""
        self._notes.clear()

    def note(self, key: str, text: str) -> None:
        """Record a note on the properties for this run's warnings (once per ``key``)."""
        self._note(key, text)

    def _note(self, key: str, text: str) -> None:
        if not self._quiet:
            self._notes.setdefault(key, text)

    @contextmanager
    def quiet(self):
        """No notes inside: pure-component states probed to fit closed forms are not column states."""
        self._quiet = True
        try:
            yield self
        finally:
            self._quiet = False

    def _supercritical(self, T: float, x) -> list[int]:
        """Components present in liquid ``x`` at or above their critical temperature at ``T`` [K]."""
        found = [i for i, (xi, Tc) in enumerate(zip(x, self.critical_temperatures)) if xi > 0.0 and T >= Tc]
        for i in found:
            self._note(f"supercritical:{i}",
                       f"{self.names[i]} is above its critical temperature ({self.critical_temperatures[i] - 273.15:.1f} "
                       "degC) in column liquids: their surface tension is taken by the Diguilio-Teja rule, "
                       "density by the Hankinson-Thomson (COSTALD) mixture rule and this component's viscosity "
                       "by Letsou-Stiel extrapolated (see DEVELOPERS.md, Thermodynamics)")
        return found

    # ------------------------------------------------------------ transport and density
    def molar_mass(self, z) -> float:
        """Mean molar mass [kg/mol]."""
        return float(np.dot(self.molar_masses, z))

    def mass_fractions(self, z) -> list[float]:
        mass = self.molar_masses * np.asarray(z, dtype=float)
        return list(mass / mass.sum())

    def liquid_density(self, T: float, P: float, x) -> float:
        """Liquid mass density [kg/m^3]: thermo's mixture liquid-volume correlation, or the
        COSTALD mixture rule when a component is supercritical (``critical`` module)."""
        x = [float(v) for v in x]
        if self._supercritical(T, x):
            c = self._constants
            return supercritical_liquid_density(T, x, self.molar_masses, c.Tcs, c.Vcs, c.omegas)
        volume = self._correlations.VolumeLiquidMixture(T, P, x, self.mass_fractions(x))
        return self.molar_mass(x) / volume

    def vapour_density(self, T: float, P: float, y) -> float:
        """Vapour mass density [kg/m^3] from the gas model of the method."""
        return self.molar_mass(y) / float(self._flasher.gas.to(T=T, P=P, zs=[float(v) for v in y]).V())

    def liquid_viscosity(self, T: float, P: float, x) -> float:
        """Liquid dynamic viscosity [Pa s]; supercritical components by Letsou-Stiel (``critical`` module)."""
        x = [float(v) for v in x]
        hot = self._supercritical(T, x)
        if not hot:
            mixing, ws = self._correlations.ViscosityLiquidMixture, self.mass_fractions(x)
            mu = mixing(T, P, x, ws)
            if mu is None:  # thermo's aqueous-solution rule (Laliberte) past its solute range: an ammonia-rich liquid
                self._note("viscosity-mixing",
                           f"the liquid viscosity of {mixing.method} has no value for some column liquids (outside "
                           "its composition or temperature range); logarithmic molar mixing of the pure-component "
                           "viscosities is taken there")
                mu = mixing.calculate(T, P, x, ws, "Logarithmic mixing, molar")
            return float(mu)
        c, props = self._constants, self._correlations
        values = [supercritical_liquid_viscosity(T, c.Tcs[i], c.Pcs[i], c.omegas[i], self.molar_masses[i],
                                                 props.ViscosityGases[i](T, P))
                  if i in hot else props.ViscosityLiquids[i](T, P) for i in range(self.size)]
        return log_mixing(x, values)

    def surface_tension(self, T: float, x) -> float:
        """Liquid surface tension [N/m]; near-critical and supercritical routes of the ``critical`` module."""
        x = [float(v) for v in x]
        if self._supercritical(T, x):
            c = self._constants
            sigmas_Tb = [s(tb) for s, tb in zip(self._correlations.SurfaceTensions, c.Tbs)]
            return supercritical_surface_tension(T, x, sigmas_Tb, c.Tbs, c.Tcs)
        sigma = self._correlations.SurfaceTensionMixture(T, 101325.0, x, self.mass_fractions(x))
        if sigma is not None:
            return float(sigma)
        sigmas = [self._pure_surface_tension(i, T) for i in range(self.size)]
        volumes = [v(T, 101325.0) for v in self._correlations.VolumeLiquids]
        return float(Winterfeld_Scriven_Davis(x, sigmas, [1.0 / v for v in volumes]))

    def _pure_surface_tension(self, i: int, T: float) -> float:
        correlation = self._correlations.SurfaceTensions[i]
        sigma = correlation(T)
        if sigma is not None:
            return float(sigma)
        T_end = correlation.T_limits[correlation.method][1]
        self._note(f"near-critical:{i}",
                   f"{self.names[i]} is near its critical temperature ({self.critical_temperatures[i] - 273.15:.1f} "
                   f"degC) in column liquids, beyond the databank's surface-tension fit (to {T_end - 273.15:.1f} "
                   "degC): its surface tension is extrapolated to vanish at the critical point "
                   "(corresponding states, exponent 11/9)")
        return extrapolated_surface_tension(T, float(correlation(T_end)), T_end, self.critical_temperatures[i])

    def liquid_heat_capacity(self, T: float, P: float, x) -> float:
        """Liquid molar heat capacity [J/(mol K)]."""
        return float(self._flasher.liquid.to(T=T, P=P, zs=[float(v) for v in x]).Cp())


def _saturation_temperature(psat, P: float) -> float:
    """T [K] where thermo's vapour-pressure correlation ``psat`` gives ``P`` [Pa]: thermo's own solve, else
    bisection over the correlation's range (thermo's solve failed for water at 700 Pa, where its
    correlation holds down to 235 K); PropertyError where the range does not reach ``P``."""
    try:
        return float(psat.solve_property(P))
    except (UnconvergedError, ValueError):
        low, high = psat.Tmin, psat.Tmax
        try:
            if psat(low) < P < psat(high):
                return float(brentq(lambda T: psat(T) - P, low, high, xtol=1e-9))
        except (TypeError, ValueError):  # a correlation with no value at an end of its range
            pass
        raise PropertyError(f"no saturation temperature at {P:.6g} Pa from the vapour-pressure correlation of "
                            f"{psat.CASRN}") from None


def choose_method(components: tuple[ComponentId, ...], pressure: float) -> str:
    """Default method: Peng-Robinson above 10 bar, UNIFAC (Dortmund) for polar mixtures below it,
    Peng-Robinson for non-polar mixtures above 2 bar, else ideal (Raoult's law), or UNIFAC
    (Dortmund) where aromatic and aliphatic hydrocarbons mix (:func:`mixes_aromatic_and_aliphatic`).

    Activity-coefficient liquids for polar liquids at low pressure and a cubic equation of state
    at high pressure are common practice, no source. The 2-bar line for non-polar mixtures is
    measured: Raoult's law's ideal-gas vapour overstates the key relative volatility against
    thermo's gamma-phi route (the databank's vapour pressures with vapour, saturation and
    Poynting corrections) by 3 % for benzene/toluene at 1.15 bar, 9 % for n-pentane/n-hexane at
    2.5 bar and 6.4 % for isobutane/n-butane at 8 bar (30 % of alpha - 1), where Peng-Robinson
    agrees with that route within 0.1 %; at vacuum Peng-Robinson's own vapour pressures are the
    larger error (ethylbenzene/styrene at 8 kPa: 4.6 % low). See DEVELOPERS.md.
    """
    if pressure > HIGH_PRESSURE:
        return "peng-robinson"
    if any(c.is_polar for c in components):
        return "unifac-dortmund"
    if pressure > IDEAL_GAS_VAPOUR_LIMIT:
        return "peng-robinson"
    return "unifac-dortmund" if mixes_aromatic_and_aliphatic(components) else "ideal"


# Dortmund UNIFAC main groups of carbon in an aromatic ring (ACH, ACCH2)
AROMATIC_MAIN_GROUPS = frozenset({3, 4})
# Dortmund UNIFAC main groups of a carboxylic acid (COOH; HCOOH, formic acid)
ACID_MAIN_GROUPS = frozenset({20, 44})


def mixes_aromatic_and_aliphatic(components: tuple[ComponentId, ...]) -> bool:
    """True for hydrocarbons of which some have an aromatic ring and some none (benzene/cyclohexane),
    each with Dortmund UNIFAC groups: their liquid is not ideal (benzene/cyclohexane has a
    minimum-boiling azeotrope near 54 % benzene at 1 atm, from memory: Gmehling et al., Azeotropic
    Data; Raoult's law shows none and puts the key relative volatility near 1.02), so the automatic
    method takes activity coefficients for them where it would take Raoult's law. Aromatics alone
    (benzene/toluene, ethylbenzene/styrene) or aliphatics alone stay ideal."""
    groups = component_packages([c.cas for c in components])[0].UNIFAC_Dortmund_groups
    if not all(groups):
        return False
    aromatic = [any(DOUFSG[g].main_group_id in AROMATIC_MAIN_GROUPS for g in found) for found in groups]
    return any(aromatic) and not all(aromatic)


@lru_cache(maxsize=16)
def build_mixture(names: tuple[str, ...], thermo_spec: Thermo, pressure: float) -> Mixture:
    """Resolve ``names`` and build (once) the mixture for the case's method.

    ``pressure`` [Pa] only steers the automatic choice of method.
    """
    components = resolve_components(names)
    method = thermo_spec.method
    if method == "auto":
        method = choose_method(components, pressure)
    return Mixture(components, method, thermo_spec)


def _needs_kij(a, b) -> bool:
    """Whether Peng-Robinson's kij = 0 is a poor default for the pair of components ``a``, ``b``."""
    return a.is_polar or b.is_polar or (a.is_kij_gas and b.is_hydrocarbon) or (b.is_kij_gas and a.is_hydrocarbon)
