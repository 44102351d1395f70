"""Optimisation layer: one equation model of stages, sizes and costs; the lowest-TAC design.

Entry points: :func:`optimise_design` (search over reflux, stages and feed stage) and
:func:`evaluate_design` (price a given design with the same model). :func:`enumerate_designs`
is the checking tool that solves every configuration.
"""

from .basis import CostBasis, ExchangerBasis, SeparationProblem, TrayBasis
from .design import evaluate_design, optimise_design, separation_problem
from .enumerate import Enumeration, enumerate_designs
from .options import OPTIONS, model_options
from .results import (ColumnSizes, CostBreakdown, CostItem, DesignEvaluation, OptimumDesign, SearchStep,
                      SequentialPrice, SolverReport)
from .search import optimise

__all__ = ["ColumnSizes", "CostBasis", "CostBreakdown", "CostItem", "DesignEvaluation", "Enumeration",
           "ExchangerBasis", "OPTIONS", "OptimumDesign", "SearchStep", "SeparationProblem", "SequentialPrice",
           "SolverReport", "TrayBasis", "enumerate_designs", "evaluate_design", "model_options", "optimise",
           "optimise_design", "separation_problem"]
