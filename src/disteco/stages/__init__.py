"""Stages layer: shortcut design, binary stage stepping, stage-by-stage column solutions.

Public entry points (see each module): :func:`design_stages` (all of it for a case),
:func:`shortcut_design`, :func:`equilibrium_curve`,
:func:`minimum_reflux`, :func:`step_stages`, :func:`total_reflux_stages`, :class:`ColumnSpec`,
:func:`solve_cmo`, :func:`solve_rigorous`, :func:`solve_to_specs`, :func:`duties`.
"""

from .._base.lazy import lazy_names
from .duties import duties  # eager: a lazy name cannot share its module's name (the import rebinds it)

__getattr__, __dir__, _lazy = lazy_names(__name__, {
    "binary": ("EquilibriumCurve", "MinimumReflux", "SteppedColumn", "equilibrium_curve", "minimum_reflux",
        "step_stages", "total_reflux_stages"),
    "design": ("BinaryStepping", "StageDesign", "design_stages"),
    "results": ("Duties", "StageProfile"),
    "rigorous": ("ColumnSpec", "solve_cmo", "solve_rigorous"),
    "shortcut": ("ShortcutDesign", "ShortcutPoint", "shortcut_design"),
    "specs": ("gilliland_reflux", "solve_to_specs", "spec_residuals"),
    "splits": ("ProductSplit", "product_split"),
})
__all__ = sorted(_lazy + ["duties"])
