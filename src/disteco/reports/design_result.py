"""The aggregate of one design run, as the reports see it: typed results from every layer."""

from __future__ import annotations

from dataclasses import dataclass, field

from ..case import Case
from ..optimisation.results import DesignEvaluation
from ..properties import FeedState, MixtureSummary
from ..stages import StageDesign
from .cautions import CAUTIONS
from .tables import Table, stage_profile_table
from .tables_costs import capital_table, equipment_table
from .tables_design import ReportParts
from .tables_scenarios import scenario_table

SCHEMA_VERSION = 1


@dataclass(frozen=True)
class DesignResult:
    """Everything one design run produced, in SI units."""

    case: Case
    mixture: MixtureSummary
    feed: FeedState
    stages: StageDesign | None = None
    parts: ReportParts = field(default_factory=ReportParts)  # optimum or evaluated design, sizes, costs
    evaluation: DesignEvaluation | None = None  # set when a given design was priced, not optimised
    warnings: tuple[str, ...] = field(default_factory=tuple)
    options: tuple[tuple[str, object], ...] = ()  # optimiser options the run was given (name, value)

    def __str__(self) -> str:
        """The engineer's summary the command line prints, in engineering units."""
        from .text import result_text  # text.py imports this module

        return result_text(self)

    def profile_frame(self):
        """The stage profile (temperature, pressure, flows, compositions per stage) as a pandas DataFrame."""
        return _frame(stage_profile_table(self.parts.profile, self.case.components) if self.parts.profile else None,
                      "stage profile")

    def equipment_frame(self):
        """The equipment list (sizes, design pressure and temperature, materials) as a pandas DataFrame."""
        return _frame(equipment_table(self.parts.sizing) if self.parts.sizing else None, "equipment list")

    def capital_frame(self):
        """The installed capital item by item as a pandas DataFrame."""
        return _frame(capital_table(self.parts.cost) if self.parts.cost else None, "capital table")

    def scenario_frame(self):
        """Each price scenario's optimum as a pandas DataFrame (an optimised run only)."""
        return _frame(scenario_table(self.parts.scenarios, self.parts.scenario_checks) if self.parts.scenarios else None, "scenario table")


def _frame(table: Table | None, what: str):
    if table is None:
        raise ValueError(f"this result has no {what} (the run did not produce it)")
    return table.frame()
