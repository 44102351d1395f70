"""Stages layer: shortcut design, binary stage stepping, stage-by-stage column solutions.

Public entry points (see each module): :func:`design_stages` (all of it for a case),
:func:`shortcut_design`, :func:`equilibrium_curve`,
:func:`minimum_reflux`, :func:`step_stages`, :func:`total_reflux_stages`, :class:`ColumnSpec`,
:func:`solve_cmo`, :func:`solve_rigorous`, :func:`solve_to_specs`, :func:`duties`.
"""

from .binary import EquilibriumCurve, MinimumReflux, SteppedColumn, equilibrium_curve, minimum_reflux, \
    step_stages, total_reflux_stages
from .design import BinaryStepping, StageDesign, design_stages
from .duties import duties
from .results import Duties, StageProfile
from .rigorous import ColumnSpec, solve_cmo, solve_rigorous
from .shortcut import ShortcutDesign, ShortcutPoint, shortcut_design
from .specs import gilliland_reflux, solve_to_specs, spec_residuals
from .splits import ProductSplit, product_split

__all__ = ["BinaryStepping", "ColumnSpec", "StageDesign", "design_stages", "Duties", "EquilibriumCurve", "MinimumReflux", "ProductSplit", "ShortcutDesign",
           "ShortcutPoint", "StageProfile", "SteppedColumn", "duties", "equilibrium_curve", "gilliland_reflux",
           "minimum_reflux", "product_split", "shortcut_design", "solve_cmo", "solve_rigorous",
           "solve_to_specs", "spec_residuals", "step_stages", "total_reflux_stages"]
