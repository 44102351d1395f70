"""Overall tray efficiency (O'Connell) and the number of real trays."""

from __future__ import annotations

import math
from dataclasses import dataclass

from .._base.errors import CaseError
from .._base.validity import ValidityRange

CENTIPOISE = 1e-3  # Pa s

OCONNELL_RANGE = ValidityRange(
    "O'Connell efficiency (Lockett fit)", "liquid viscosity x relative volatility", 0.1, 7.5, "cP",
    "range of O'Connell's plant data as fitted by Lockett (1986), from memory")


def oconnell_efficiency_lockett(viscosity, relative_volatility):
    r"""Overall tray efficiency by O'Connell's correlation, power-law fit by Lockett.

    .. math::
        E_O = 0.492\,(\mu_L \alpha)^{-0.245}

    with the liquid viscosity mu_L in cP and alpha the key relative volatility, both at
    average column conditions.

    Parameters
    ----------
    viscosity : float
        Liquid dynamic viscosity at average column conditions [Pa s]
    relative_volatility : float
        Relative volatility of the light to the heavy key at average column conditions [-]

    Returns
    -------
    float
        Overall (column) tray efficiency [-]

    Notes
    -----
    O'Connell's plant data span mu*alpha of about 0.1 to 7.5 cP (:data:`OCONNELL_RANGE`,
    checked by the caller). Source unit of viscosity: cP (= mPa s). Bubble-cap and sieve
    trays in hydrocarbon and similar services; the fit lies within the scatter of the
    original data (roughly +-10 efficiency points).

    Examples
    --------
    >>> round(oconnell_efficiency_lockett(0.3e-3, 2.5), 3)
    0.528

    References
    ----------
    1. O'Connell, H. E., Trans. AIChE 42, 741 (1946).
    2. Lockett, M. J., Distillation Tray Fundamentals, Cambridge University Press (1986).
    """
    mu_alpha = viscosity / CENTIPOISE * relative_volatility
    return 0.492 * mu_alpha ** -0.245


@dataclass(frozen=True)
class TrayEfficiency:
    """Overall efficiency used and how it was obtained."""

    value: float  # -
    method: str  # "O'Connell (Lockett fit)" or "user value"
    viscosity: float | None  # Pa s, average of top and bottom; None for a user value
    relative_volatility: float | None  # -, average of top and bottom; None for a user value


def real_trays(ideal_stages: int, efficiency: float) -> int:
    """Real trays for ``ideal_stages`` equilibrium stages with the reboiler counted as one.

    ``ceil((N - 1) / E)``: the reboiler is an equilibrium stage that is not a tray.
    """
    if ideal_stages < 2:
        raise CaseError("stages", f"{ideal_stages} equilibrium stage(s)", "at least 2 (one tray and the reboiler)")
    if not 0.0 < efficiency <= 1.0:
        raise CaseError("sizing.tray_efficiency", f"{efficiency:.4g}", "above 0 and at most 1")
    return math.ceil((ideal_stages - 1) / efficiency - 1e-9)
