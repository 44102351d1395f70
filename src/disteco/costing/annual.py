"""Annualisation of capital and the accuracy band of the estimate."""

from __future__ import annotations

from dataclasses import dataclass


def capital_recovery_factor(interest_rate: float, years: float) -> float:
    """Capital recovery factor: the uniform yearly payment that repays one unit of capital.

    .. math::
        CRF = \\frac{i (1 + i)^n}{(1 + i)^n - 1}, \\qquad CRF = 1/n \\text{ for } i = 0

    Parameters
    ----------
    interest_rate : float
        Interest rate per year i [-]
    years : float
        Plant life n [year]

    Returns
    -------
    float
        Capital recovery factor [1/year]

    Notes
    -----
    Any i >= 0 and n > 0; end-of-year payments, no salvage value, no tax.

    Examples
    --------
    10 % over 10 years:

    >>> round(capital_recovery_factor(0.10, 10), 5)
    0.16275

    References
    ----------
    1. Turton et al., Analysis, Synthesis and Design of Chemical Processes, 4th ed.,
       2012, Chapter 9 (the uniform series capital recovery factor, A/P).
    """
    if interest_rate == 0.0:
        return 1.0 / years
    growth = (1.0 + interest_rate) ** years
    return interest_rate * growth / (growth - 1.0)


def total_annualised_cost(capital, utilities_per_year, capital_charge_factor: float):
    """TAC = capital charge factor x installed capital + yearly utilities [currency/year].

    The one form the costing layer and the optimisation model both evaluate (floats or Pyomo).
    """
    return capital_charge_factor * capital + utilities_per_year


@dataclass(frozen=True)
class AnnualisationSettings:
    """How capital becomes a yearly charge (``annualisation.toml``)."""

    default_scenario: str
    method: str  # "capital_recovery" or "payback"
    interest_rate: float  # [-] per year
    plant_life_years: float  # [year]
    payback_years: float  # [year]
    operating_hours_per_year: float  # [h/year]
    currency: str
    source: str

    def capital_charge_factor(self) -> float:
        """Fraction of the installed capital charged per year [1/year]."""
        if self.method == "payback":
            return 1.0 / self.payback_years
        return capital_recovery_factor(self.interest_rate, self.plant_life_years)

    def describe(self) -> str:
        """The annualisation basis in words, for reports."""
        if self.method == "payback":
            return f"capital / {self.payback_years:g} year payback"
        return (f"capital recovery factor at {100 * self.interest_rate:g} %/year over "
                f"{self.plant_life_years:g} years")


@dataclass(frozen=True)
class AccuracyBand:
    """Expected accuracy of the estimate (``estimate_accuracy.toml``); fractions of the point value."""

    estimate_class: str  # e.g. "4-5"
    low_best: float  # e.g. -0.30
    low_worst: float  # e.g. -0.50
    high_best: float  # e.g. +0.50
    high_worst: float  # e.g. +1.00
    source: str
    cautions: tuple[str, ...]

    def range_of(self, value: float) -> tuple[float, float]:
        """Widest band around ``value``: (value (1 + low_worst), value (1 + high_worst))."""
        return value * (1.0 + self.low_worst), value * (1.0 + self.high_worst)

    def describe(self) -> str:
        return (f"AACE class {self.estimate_class}: {100 * self.low_best:+.0f} % to {100 * self.low_worst:+.0f} % "
                f"low, {100 * self.high_best:+.0f} % to {100 * self.high_worst:+.0f} % high ({self.source})")
