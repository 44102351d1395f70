"""Bubble points of a non-polar Peng-Robinson mixture by Newton's method on thermo's fugacities.

thermo's flash at a vapour fraction of zero solves the bubble point and then runs Michelsen's
stability test of the liquid from a dozen trial phases, which was most of its time: on the
depentaniser's check, 0.95 of 1.15 s of bubble points under the profiler. A liquid of non-polar
components under a cubic equation of state with small kij does not split into two liquids (common
practice, no source), so for such a mixture the bubble point is solved here on the same fugacity
coefficients without the test:

    f(T) = ln sum_i K_i x_i = 0,   K_i = phi_i^L(T, P, x) / phi_i^V(T, P, y),

Newton's step in T with df/dT = sum_i K_i x_i d ln K_i/dT / sum_i K_i x_i (the vapour held), the
incipient vapour y = K x / sum K x substituted at each step, from Wilson's K (Michelsen and
Mollerup, Thermodynamic Models: Fundamentals and Computational Aspects, 2nd ed., Tie-Line (2007),
chapter 10). Measured against thermo's flash on the fit liquids of the four Peng-Robinson
examples (226 bubble points at two pressures): temperatures and vapour fractions within 1.6e-6,
in 3 to 13 iterations, 2 to 3 times faster. Where the iteration does not converge, or heads for the
trivial solution (every |ln K| below 1e-4: the liquid's own vapour, near the critical point; or an
azeotrope), the caller takes thermo's flash.
"""

from __future__ import annotations

import math

import numpy as np

from .vle_fallback import TRIVIAL_LN_K, wilson_start

MAX_ITERATIONS = 50
MAX_STEP = 20.0  # K, the largest temperature step (Wilson's start can lie tens of kelvin off)
T_TOLERANCE = 1e-10  # relative temperature step that ends the iteration [-]
Y_TOLERANCE = 1e-10  # largest change of a vapour mole fraction that ends it [-]


def newton_bubble_point(liquid, gas, P: float, x, Tcs, Pcs, omegas) -> tuple[float, np.ndarray] | None:
    """(T [K], y [-]) at the bubble point of liquid ``x`` at ``P`` [Pa], or None where the iteration
    fails or ends on the trivial solution. ``liquid`` and ``gas``: thermo's phases of the equation of
    state (``to(T=, P=, zs=)``, ``lnphis()``, ``dlnphis_dT()``); ``Tcs`` [K], ``Pcs`` [Pa] and
    ``omegas`` [-] for Wilson's starting K."""
    x = np.asarray(x, dtype=float)
    zs = [float(v) for v in x]
    try:
        T, k = wilson_start(P, x, 0.0, Tcs, Pcs, omegas)
    except ValueError:  # no temperature brackets Wilson's balance
        return None
    y = k * x / float(k @ x)
    with np.errstate(all="ignore"):
        for _ in range(MAX_ITERATIONS):
            try:
                at_liquid, at_gas = liquid.to(T=T, P=P, zs=zs), gas.to(T=T, P=P, zs=[float(v) for v in y])
                ln_k = np.array(at_liquid.lnphis()) - np.array(at_gas.lnphis())
                d_ln_k = np.array(at_liquid.dlnphis_dT()) - np.array(at_gas.dlnphis_dT())
            except Exception:  # noqa: BLE001 - thermo raises many kinds (no root of the cubic, unconverged
                return None  # volume solutions); its flash, behind this route, names the state if it fails too
            if float(np.max(np.abs(ln_k))) < TRIVIAL_LN_K:
                return None  # heading for the trivial solution (or an azeotrope, which thermo's routes handle)
            k = np.exp(ln_k)
            kx = k * x
            total = float(kx.sum())
            slope = float(kx @ d_ln_k) / total
            if not (math.isfinite(total) and total > 0.0 and math.isfinite(slope) and slope != 0.0):
                return None
            step = max(-MAX_STEP, min(MAX_STEP, -math.log(total) / slope))
            y_new = kx / total
            moved = float(np.max(np.abs(y_new - y)))
            T, y = T + step, y_new
            if abs(step) < T_TOLERANCE * T and moved < Y_TOLERANCE:
                return T, y
    return None


__all__ = ["newton_bubble_point"]
