"""Dimerisation of a carboxylic acid in the vapour (chemical theory), to say how far the
ideal-gas vapour of disteco's activity-coefficient methods lies from it.

Acetic acid vapour near its boiling point is more than half dimers. A vapour taken as an ideal
gas of monomers overstates the acid's fugacity there, and with it its volatility: UNIFAC
(Dortmund) with an ideal-gas vapour puts a water/acetic acid azeotrope near 86 % water at
1 bar, where the mixture has none. disteco's equilibrium stays thermo's (no association); these
functions only measure the difference, for a note and for the azeotrope refusal.

Chemical theory with one self-dimerising acid A in an otherwise ideal vapour (Prausnitz,
Lichtenthaler and de Azevedo, *Molecular Thermodynamics of Fluid-Phase Equilibria*, 3rd ed.,
section 5.8, from memory): per mole of apparent vapour with acid fraction y_A, the dimer
amount d solves

    d (1 - d) = K P (y_A - 2 d)^2

and the fugacity coefficients are phi_A = (y_A - 2 d) / ((1 - d) y_A) (true monomer over
apparent acid fraction) and phi_j = 1 / (1 - d) for every other component. The pure acid's
saturated vapour gives phi_A^sat the same way with y_A = 1 at its vapour pressure.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

MMHG = 133.322368  # Pa
FIXED_POINT_STEPS = 50  # iterations on the vapour composition; converged to 1e-10 within about 20
VAPOUR_TOLERANCE = 1e-10  # [-]


@dataclass(frozen=True)
class Dimerisation:
    """log10(K / mmHg^-1) = a + b / T for 2 A = A2 in the vapour; T in K."""

    name: str
    a: float
    b: float  # K
    source: str

    def constant(self, T: float) -> float:
        """Dimerisation constant K = z_A2 / (z_A^2 P) [1/Pa] at ``T`` [K]."""
        return 10.0 ** (self.a + self.b / T) / MMHG


# CAS number -> constants. Acetic acid: Marek and Standart, Collect. Czech. Chem. Commun. 19
# (1954) 1074, as quoted in vapour-liquid equilibrium texts (from memory); K = 8.8 atm^-1 at
# 100 degC.
DIMERISING_ACIDS = {
    "64-19-7": Dimerisation("acetic acid", -10.4205, 3166.0,
                            "Marek and Standart (1954), from memory"),
}


def dimer_amount(kp: float, acid: float) -> float:
    """Moles of dimer per mole of apparent vapour [-] at K P = ``kp`` [-] and apparent acid fraction ``acid`` [-].

    The smaller root of (4 K P + 1) d^2 - (1 + 4 K P y_A) d + K P y_A^2 = 0, written as
    2 c / (b + sqrt(b^2 - 4 a c)) so that it stays exact as K P y_A goes to zero.
    """
    a, b, c = 4.0 * kp + 1.0, 1.0 + 4.0 * kp * acid, kp * acid * acid
    return 2.0 * c / (b + math.sqrt(max(b * b - 4.0 * a * c, 0.0)))


def fugacity_coefficients(kp: float, y, acid: int) -> np.ndarray:
    """phi_i [-] of vapour ``y`` with the acid at index ``acid`` dimerising, K P = ``kp`` [-]."""
    y = np.asarray(y, dtype=float)
    d = dimer_amount(kp, float(y[acid]))
    phi = np.full(y.size, 1.0 / (1.0 - d))
    # y_A - 2 d over y_A tends to one as y_A goes to zero (d is of order y_A^2)
    phi[acid] = (1.0 - 2.0 * d / y[acid]) / (1.0 - d) if y[acid] > 0.0 else 1.0
    return phi


def dimerising_acid(cas_numbers) -> int | None:
    """Index of the one component with dimerisation constants, None for none or for several
    (cross-dimers of two acids are not covered)."""
    found = [i for i, cas in enumerate(cas_numbers) if cas in DIMERISING_ACIDS]
    return found[0] if len(found) == 1 else None


def dimerised_k_values(k_ideal, x, T: float, P: float, acid_pressure: float, acid: int,
                       dimerisation: Dimerisation) -> np.ndarray:
    """K_i [-] of liquid ``x`` at ``T`` [K], ``P`` [Pa] with the acid's vapour dimerising.

    ``k_ideal`` are the ideal-gas vapour's K-values (gamma_i Psat_i / P) and ``acid_pressure``
    the acid's vapour pressure [Pa] at ``T``: K_i = K_i,ideal phi_i^sat / phi_i, with phi^sat one
    for all but the acid. The vapour composition is found by successive substitution on
    y_i = K_i x_i / sum(K x) at the same temperature.
    """
    k_ideal, x = np.asarray(k_ideal, dtype=float), np.asarray(x, dtype=float)
    kp = dimerisation.constant(T) * P
    saturated = np.ones(k_ideal.size)
    saturated[acid] = fugacity_coefficients(dimerisation.constant(T) * acid_pressure, [1.0], 0)[0]
    y = k_ideal * x / np.dot(k_ideal, x)
    k = k_ideal
    for _ in range(FIXED_POINT_STEPS):
        k = k_ideal * saturated / fugacity_coefficients(kp, y, acid)
        y_new = k * x / np.dot(k, x)
        if np.max(np.abs(y_new - y)) < VAPOUR_TOLERANCE:
            break
        y = y_new
    return k
