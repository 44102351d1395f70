"""Result dataclasses of the stages layer, shared by sizing, costing, optimisation and reports.

Conventions: stages are numbered from the top, 1 .. N; stage N is the reboiler. The
condenser is not counted in N (a partial condenser is one extra equilibrium contact,
flagged by ``partial_condenser``). ``feed_stage`` is counted from the top. Flows leave
the stage they are listed under. Duties are positive magnitudes.
"""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class StageProfile:
    """A converged column: per-stage state and the two products.

    T [K], P [Pa], L and V [mol/s] leaving each stage, x and y [-] per stage and component.
    """

    T: tuple[float, ...]
    P: tuple[float, ...]
    L: tuple[float, ...]
    V: tuple[float, ...]
    x: tuple[tuple[float, ...], ...]
    y: tuple[tuple[float, ...], ...]
    feed_stage: int
    reflux_ratio: float  # L0 / D [-]
    distillate_flow: float  # mol/s
    bottoms_flow: float  # mol/s
    distillate_composition: tuple[float, ...]
    bottoms_composition: tuple[float, ...]
    condenser_duty: float  # W, heat removed
    reboiler_duty: float  # W, heat supplied
    condenser_temperature: float  # K, of the reflux/distillate leaving the condenser
    partial_condenser: bool = False
    model: str = "rigorous"  # "rigorous" (energy balances) or "cmo" (constant molar overflow)

    @property
    def stages(self) -> int:
        """Number of equilibrium stages N, reboiler included [-]."""
        return len(self.T)

    @property
    def reboiler_temperature(self) -> float:
        """Temperature of the bottom stage [K]."""
        return self.T[-1]


@dataclass(frozen=True)
class Duties:
    """Condenser and reboiler duties [W], from energy balances and the CMO estimate.

    ``condenser``/``reboiler`` come from the converged profile's energy balances;
    ``condenser_cmo``/``reboiler_cmo`` are the constant-molar-overflow estimates
    (vapour flow x latent heat of the product leaving that end).
    """

    condenser: float
    reboiler: float
    condenser_cmo: float
    reboiler_cmo: float
