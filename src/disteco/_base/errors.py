"""Error classes. One base class; each subclass also inherits the matching built-in.

User mistakes (bad case file, infeasible specification, bad cost data) derive from
``ValueError`` and map to exit code 2; internal failures derive from ``RuntimeError``
and map to exit code 1.
"""

from __future__ import annotations


class DistecoError(Exception):
    """Base class of every error disteco raises on purpose."""


def _stated(where: str, problem: str, allowed: str | None) -> str:
    """One error line: where, what is wrong and, if known, what is allowed."""
    return f"{where}: {problem}" + (f" (allowed: {allowed})" if allowed else "")


class CaseError(DistecoError, ValueError):
    """A case-file field is missing or invalid.

    Attributes carry the dotted field name, the offending value and what is allowed.
    """

    def __init__(self, field: str, problem: str, allowed: str | None = None, value=None):
        self.field = field or "case file"  # never an empty name before the colon
        self.problem = problem
        self.allowed = allowed
        self.value = value
        super().__init__(_stated(self.field, problem, allowed))


class InfeasibleSpecError(DistecoError, ValueError):
    """The separation asked for cannot be done (mass balance, azeotrope, reflux)."""


class UtilityTemperatureError(InfeasibleSpecError):
    """Products that meet the specifications condense colder (boil hotter) than the condenser's
    (reboiler's) utility level allows with the minimum approach; ``level`` names that level and
    ``service`` its service ("cooling" or "heating")."""

    def __init__(self, message: str, level: str, service: str):
        self.level, self.service = level, service
        super().__init__(message)


class CorrelationRangeError(DistecoError, ValueError):
    """An input lies outside the range where a correlation is valid."""

    def __init__(self, correlation: str, variable: str, value: float, low: float, high: float,
                 unit: str, source: str):
        self.correlation = correlation
        self.variable = variable
        self.value = value
        self.low = low
        self.high = high
        self.unit = unit
        self.source = source
        super().__init__(
            f"{correlation}: {variable} = {value:.4g} {unit} is outside the valid range "
            f"{low:.4g} to {high:.4g} {unit} ({source})")


class CostDataError(DistecoError, ValueError):
    """A cost-data file is malformed; names the file, row and column."""

    def __init__(self, file: str, problem: str, row: int | None = None, column: str | None = None):
        self.file = file
        self.row = row
        self.column = column
        where = file
        if row is not None:
            where += f", row {row}"
        if column is not None:
            where += f", column '{column}'"
        super().__init__(f"{where}: {problem}")


class OutputFolderError(DistecoError, ValueError):
    """The output folder cannot be created, written into, or is held by another run.

    ``label`` names the folder as the user gave it (``--out`` on the command line).
    """

    def __init__(self, label: str, folder, problem: str, allowed: str | None = None):
        self.label = label
        self.folder = folder
        self.problem = problem
        self.allowed = allowed
        super().__init__(_stated(f"{label} {str(folder)!r}", problem, allowed))


class PropertyError(DistecoError, RuntimeError):
    """A property or phase-equilibrium calculation failed."""


class ConvergenceError(DistecoError, RuntimeError):
    """A numerical solution did not converge."""


class SolverError(DistecoError, RuntimeError):
    """The optimisation solver failed or stopped without a usable design."""


class InfeasibleDesignError(CaseError, InfeasibleSpecError):
    """A given design (reflux, stages, feed stage) that cannot work; ``field`` names the decision at fault."""


class SearchTimeLimitError(CaseError, SolverError):
    """The search's time limit passed before any configuration gave a design; ``field`` names the limit.

    A limit the user sets (or the default) that is too short for the case: exit code 2, with
    the option named, like any other value that does not suit the case.
    """
