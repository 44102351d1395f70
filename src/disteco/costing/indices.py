"""Cost indices by year and escalation of a cost from one index to another."""

from __future__ import annotations

from dataclasses import dataclass

from .._base.errors import CaseError


def escalate(cost: float, index_from: float, index_to: float) -> float:
    """Move a cost from one cost-index value to another, as in Turton et al. Chapter 7.

    .. math::
        C_2 = C_1 \\frac{I_2}{I_1}

    Parameters
    ----------
    cost : float
        Cost at the first index [currency]
    index_from : float
        Cost index the cost refers to, e.g. 397 for the base of Turton's Appendix A [-]
    index_to : float
        Cost index of the year wanted [-]

    Returns
    -------
    float
        Cost at the second index [currency]

    Notes
    -----
    Escalation over more than about ten years adds error of its own; the estimate's
    cautions say so.

    Examples
    --------
    >>> round(escalate(10000.0, 397.0, 596.2), 1)
    15017.6

    References
    ----------
    1. Turton et al., Analysis, Synthesis and Design of Chemical Processes, 4th ed.,
       2012, Section 7.2 (effect of time on purchased equipment cost).
    """
    return cost * index_to / index_from


@dataclass(frozen=True)
class CostIndexTable:
    """A plant cost index by year (``cost_index.csv``)."""

    name: str  # e.g. "CEPCI"
    years: tuple[int, ...]  # ascending
    values: tuple[float, ...]  # [-]
    file: str  # shown in error messages

    @property
    def newest_year(self) -> int:
        return self.years[-1]

    def allowed_years(self) -> str:
        """The years in the table, written compactly for an error message."""
        years = self.years
        if years == tuple(range(years[0], years[-1] + 1)):
            return f"years {years[0]} to {years[-1]} (extend {self.file} for others)"
        return "years " + ", ".join(map(str, years))

    def index(self, year: int) -> float:
        """Index of ``year``; a year not in the table raises CaseError on ``economics.cost_year``."""
        if year not in self.years:
            raise CaseError("economics.cost_year", f"{year} is not in the cost-index table {self.file}",
                            self.allowed_years(), year)
        return self.values[self.years.index(year)]
