"""Optimisation layer: one equation model of stages, sizes and costs; the lowest-TAC design.

Entry points: :func:`optimise_design` (search over reflux, stages and feed stage) and
:func:`evaluate_design` (price a given design with the same model). :func:`enumerate_designs`
is the checking tool that solves every configuration.
"""

from .._base.lazy import import_on_first_use, lazy_names

import_on_first_use("scipy.stats", "scipy.integrate")  # before any module of this layer imports Pyomo

__getattr__, __dir__, __all__ = lazy_names(__name__, {
    "basis": ("CostBasis", "ExchangerBasis", "SeparationProblem", "TrayBasis"),
    "design": ("evaluate_design", "optimise_design", "separation_problem"),
    "enumerate": ("Enumeration", "enumerate_designs"),
    "options": ("OPTIONS", "model_options"),
    "results": ("ColumnSizes", "CostBreakdown", "CostItem", "DesignEvaluation", "OptimumDesign", "SearchStep",
        "SequentialPrice", "SolverReport"),
    "search": ("optimise",),
})
