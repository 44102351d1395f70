"""The stages layer for one case in one call: shortcut, trade-off table, binary stepping, stage profile.

The default reflux of 1.3 x minimum is common practice (no source) until the optimiser
chooses the reflux.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .._base.errors import ConvergenceError, InfeasibleSpecError
from ..case import Column, Products
from ..properties import FeedState, Mixture, all_azeotropes
from .binary import (EquilibriumCurve, MinimumReflux, SteppedColumn, equilibrium_curve, minimum_reflux,
                     step_stages, total_reflux_stages)
from .results import StageProfile
from .rigorous import ColumnSpec, solve_cmo, solve_rigorous
from .shortcut import REFLUX_FACTORS, ShortcutDesign, ShortcutPoint, shortcut_design
from .specs import solve_to_specs

DEFAULT_REFLUX_FACTOR = 1.3  # R/Rmin (common practice, no source)


@dataclass(frozen=True)
class BinaryStepping:
    """McCabe-Thiele on the real curve of the key pair at the top pressure."""

    curve: EquilibriumCurve
    minimum_reflux: MinimumReflux
    total_reflux: SteppedColumn
    column: SteppedColumn  # at reflux_factor x the curve's minimum reflux


@dataclass(frozen=True)
class StageDesign:
    """Minimum reflux and stages, the trade-off table, the stage profile at the chosen reflux.

    For two components the minimum reflux, minimum stages and the table come from
    McCabe-Thiele stepping on the real equilibrium curve (``basis`` says so); otherwise
    from Fenske, Underwood, Gilliland and Kirkbride. ``profile`` has the table's stage
    count and feed stage at ``reflux_factor`` x the minimum; when ``meets_specs`` its
    reflux ratio and distillate flow were adjusted so both key specifications hold exactly.
    """

    basis: str  # "McCabe-Thiele on the equilibrium curve" or "Fenske-Underwood-Gilliland-Kirkbride"
    minimum_reflux: float  # L0/D [-]
    minimum_stages: float  # equilibrium stages at total reflux, reboiler included [-]
    table: tuple[ShortcutPoint, ...]
    reflux_factor: float
    profile: StageProfile
    meets_specs: bool
    shortcut: ShortcutDesign
    binary: BinaryStepping | None


def _unreached(mixture: Mixture, products: Products, column: Column, point: ShortcutPoint,
               failure: ConvergenceError) -> str:
    """Why no stage profile on thermo reaches the specifications at the stage design's ``point``, in words."""
    bottom = column.top_pressure + (point.whole_stages - 1) * column.pressure_drop_per_stage
    light, heavy = mixture.names[products.light_key], mixture.names[products.heavy_key]
    near = [a for a in all_azeotropes(mixture, column.top_pressure) if {a.first, a.second} == {light, heavy}]
    where = "".join(f"; the key pair has a {a.kind} azeotrope at {a.x_first:.4g} {a.first} at "
                    f"{column.top_pressure / 1e3:.4g} kPa, which pinches the equilibrium curve near it" for a in near)
    return (f"no stage profile of thermo's column reaches both key specifications at the stage design's "
            f"{point.whole_stages} stages (feed on {point.feed_stage}) and reflux ratio {point.reflux_ratio:.4g}, "
            f"pressures {column.top_pressure / 1e3:.4g} to {bottom / 1e3:.4g} kPa ({failure}){where}: ask for "
            "key-pair purities further from the pinch, or a smaller column.pressure_drop_per_tray where the "
            "pressure profile spans much of the column's pressure")


def binary_stepping(mixture: Mixture, feed: FeedState, products: Products, column: Column,
                    shortcut: ShortcutDesign, reflux_factor: float) -> BinaryStepping:
    """McCabe-Thiele construction of a two-component case at the top pressure."""
    light, heavy = products.light_key, products.heavy_key
    curve = equilibrium_curve(mixture, column.top_pressure, light, heavy)
    x_d = shortcut.split.distillate_composition[light]
    x_b = shortcut.split.bottoms_composition[light]
    z = feed.z[light]
    r_min = minimum_reflux(curve, x_d, x_b, z, feed.q)
    stepped = step_stages(curve, x_d, x_b, z, feed.q, reflux_factor * r_min.reflux_ratio,
                          column.condenser == "partial")
    return BinaryStepping(curve, r_min, total_reflux_stages(curve, x_d, x_b), stepped)


def _stepped_point(binary: BinaryStepping, factor: float) -> ShortcutPoint:
    c = binary.column
    stepped = step_stages(binary.curve, c.x_distillate, c.x_bottoms, c.z, c.q,
                          factor * binary.minimum_reflux.reflux_ratio, c.partial_condenser)
    whole = math.ceil(stepped.stages - 1e-9)
    return ShortcutPoint(stepped.reflux_ratio, factor, stepped.stages, whole, min(stepped.feed_stage, whole))


def design_stages(mixture: Mixture, feed: FeedState, products: Products, column: Column,
                  reflux_factor: float = DEFAULT_REFLUX_FACTOR, energy: bool = True,
                  meet_specs: bool = True, before_profile=None) -> StageDesign:
    """Everything the stages layer reports for a case.

    ``energy`` selects energy balances (True) or constant molar overflow for the profile;
    ``meet_specs`` adjusts R and D at the table's stage count so both key specifications
    hold (else the profile is at R = reflux_factor x Rmin and the shortcut's D).
    ``before_profile(shortcut)``, where given, may refuse the case from its shortcut design before
    the stage profile on thermo is solved (a caller's limit on the stages a column can hold).
    """
    shortcut = shortcut_design(mixture, feed, products, column)
    if before_profile is not None:
        before_profile(shortcut)
    if mixture.size == 2:
        binary = binary_stepping(mixture, feed, products, column, shortcut, reflux_factor)
        basis = "McCabe-Thiele on the equilibrium curve"
        r_min, n_min = binary.minimum_reflux.reflux_ratio, binary.total_reflux.stages
        table = tuple(_stepped_point(binary, f) for f in REFLUX_FACTORS)
        point = _stepped_point(binary, reflux_factor)
    else:
        binary = None
        basis = "Fenske-Underwood-Gilliland-Kirkbride"
        r_min, n_min = shortcut.minimum_reflux, shortcut.minimum_stages
        table = shortcut.table(REFLUX_FACTORS)
        point = shortcut.point(reflux_factor)
    if meet_specs:
        try:
            profile = solve_to_specs(mixture, feed, products, column, shortcut, point.whole_stages,
                                     point.feed_stage, energy, start_reflux=point.reflux_ratio)
        except ConvergenceError as failure:
            if not shortcut.azeotrope_crossings:
                raise InfeasibleSpecError(_unreached(mixture, products, column, point, failure)) from failure
            raise InfeasibleSpecError(
                f"{shortcut.azeotrope_crossings[0]}, and no stage profile reaches the key specifications: "
                "the azeotrope bounds the product; ask for a key-pair purity on the feed's side of it or "
                "add a component that breaks it") from failure
    else:
        spec = ColumnSpec.from_column(column, point.whole_stages, point.feed_stage, point.reflux_ratio,
                                      shortcut.distillate_flow)
        profile = (solve_rigorous if energy else solve_cmo)(mixture, feed, spec)
    return StageDesign(basis, r_min, n_min, table, reflux_factor, profile, meet_specs, shortcut, binary)
