"""What the condenser and reboiler handle: process side (aqueous, light or heavy organic) and reboiler type.

The process side picks the row of ``heat_transfer_coefficients.csv``; the reboiler type picks
the cost curve. Both are decided from the column's own streams by the rules below, and
stated in the result with the reason.

Rules
-----
- Aqueous: water is at least half of the stream by moles (the top vapour for the condenser,
  the bottoms liquid for the reboiler). *Common practice, no source.*
- Organics with some non-condensables (condenser): an organic top vapour condensed under vacuum
  (air leaks into the column and gathers in the condenser) or in a partial condenser (the vapour
  product leaves uncondensed through it); reference 2's row for such condensers lies below the
  plain organic one. *Common practice, no source.*
- Light or heavy organics (reboiler): the bottoms liquid's viscosity at the reboiler is below
  1 mPa s (light) or not (heavy). Reference 1 calls organics below 0.5 mPa s light, 0.5-1 mPa s
  medium and above 1 mPa s heavy (*from memory*); medium organics are taken with the light
  row, which has no medium neighbour in the table (*common practice, no source*).
- Reboiler type: a vertical thermosyphon, the cheaper and more common choice, unless the
  column bottom is under vacuum or the bottoms liquid is a heavy (viscous) organic, where a
  thermosyphon's driving head and circulation are poor and a kettle is chosen (reference 2,
  *from memory*).

References
----------
1. Sinnott, R. K., Coulson and Richardson's Chemical Engineering Vol. 6, 4th ed., Elsevier
   (2005), Table 12.1 and its footnote (viscosity classes of organics), from memory.
2. Towler, G., and R. Sinnott, Chemical Engineering Design, 2nd ed., Elsevier (2013),
   Section 19.11 (choice of reboiler type), from memory.
"""

from __future__ import annotations

from dataclasses import dataclass

from .._base.units import ATMOSPHERE

WATER_CAS = "7732-18-5"
AQUEOUS_WATER_FRACTION = 0.5  # [-] mole fraction of water from which a stream is aqueous
HEAVY_ORGANIC_VISCOSITY = 1.0e-3  # Pa s, from which an organic liquid is "heavy"
VACUUM_PRESSURE = ATMOSPHERE  # Pa, below which the column bottom is under vacuum

CONDENSER_SIDES = {"aqueous": "aqueous vapours", "organic": "organic vapours",
                   "gas": "organics with some non-condensables"}
REBOILER_SIDES = {"aqueous": "aqueous solutions", "light": "light organics", "heavy": "heavy organics"}
REBOILER_KINDS = {"kettle": "kettle reboiler", "thermosiphon": "vertical thermosyphon reboiler"}


@dataclass(frozen=True)
class ExchangerService:
    """Process sides of the condenser and reboiler, the reboiler type, and why."""

    condenser_side: str  # a process_side of heat_transfer_coefficients.csv
    reboiler_side: str
    reboiler_type: str  # a key of REBOILER_KINDS (and of the costing layer's REBOILER_TYPES)
    reasons: tuple[str, ...]


def water_fraction(mixture, z) -> float:
    """Mole fraction of water in ``z`` [-]; zero when the mixture names no water."""
    components = getattr(mixture, "components", ())
    return sum(float(zi) for c, zi in zip(components, z) if getattr(c, "cas", None) == WATER_CAS)


def condenser_side(water: float, gas: bool = False) -> str:
    """Process side of the condenser from the water mole fraction of the top vapour [-] and whether
    gas passes through it uncondensed (``gas``: under vacuum or in a partial condenser)."""
    if water >= AQUEOUS_WATER_FRACTION:
        return CONDENSER_SIDES["aqueous"]
    return CONDENSER_SIDES["gas" if gas else "organic"]


def reboiler_side(water: float, viscosity: float) -> str:
    """Process side of the reboiler from the bottoms' water mole fraction [-] and viscosity [Pa s]."""
    if water >= AQUEOUS_WATER_FRACTION:
        return REBOILER_SIDES["aqueous"]
    return REBOILER_SIDES["heavy" if viscosity >= HEAVY_ORGANIC_VISCOSITY else "light"]


def reboiler_type(bottom_pressure: float, side: str) -> str:
    """Kettle under vacuum [Pa absolute] or for heavy organics; vertical thermosyphon otherwise."""
    if bottom_pressure < VACUUM_PRESSURE or side == REBOILER_SIDES["heavy"]:
        return "kettle"
    return "thermosiphon"


def exchanger_service(profile, mixture) -> ExchangerService:
    """Decide the process sides and the reboiler type of a column profile (see the module's rules)."""
    n = profile.stages
    top_water = water_fraction(mixture, profile.y[0])
    bottom_water = water_fraction(mixture, profile.x[n - 1])
    viscosity = mixture.liquid_viscosity(profile.T[n - 1], profile.P[n - 1], profile.x[n - 1])
    vacuum, partial = profile.P[0] < VACUUM_PRESSURE, profile.partial_condenser
    cond = condenser_side(top_water, vacuum or partial)
    reb = reboiler_side(bottom_water, viscosity)
    kind = reboiler_type(profile.P[n - 1], reb)
    why = "under vacuum" if profile.P[n - 1] < VACUUM_PRESSURE else \
        "heavy organic bottoms" if kind == "kettle" else "above atmospheric pressure, not a heavy organic"
    gas = (", under vacuum (air leaks in)" if vacuum else ", a partial condenser (its vapour product passes "
           "uncondensed)") if cond == CONDENSER_SIDES["gas"] else ""
    reasons = (
        f"condenser process side '{cond}': top vapour {100 * top_water:.0f} mol% water{gas} "
        f"(aqueous from {100 * AQUEOUS_WATER_FRACTION:.0f} mol%; non-condensables under vacuum or in a partial "
        "condenser; common practice, no source)",
        f"reboiler process side '{reb}': bottoms {100 * bottom_water:.0f} mol% water, liquid viscosity "
        f"{viscosity * 1e3:.3g} mPa s (heavy organics from {HEAVY_ORGANIC_VISCOSITY * 1e3:g} mPa s, from memory: "
        "Sinnott, Coulson and Richardson Vol. 6, Table 12.1)",
        f"reboiler type {REBOILER_KINDS[kind]}: {why} (kettle under vacuum or for heavy organics, from memory: "
        "Towler and Sinnott, Chemical Engineering Design, Section 19.11)",
    )
    return ExchangerService(cond, reb, kind, reasons)
