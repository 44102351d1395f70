"""Every reported design checked on thermo: verification, energy-balance minimum reflux, fit check.

One call per reported design; see :mod:`.verification`, :mod:`.minimum_reflux` and
:mod:`.fit_check` for what each part does and costs.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..case import Case
from ..costing.data import CostData
from ..properties import FeedState, Mixture
from ..sizing.options import SizingOptions
from ..stages import StageDesign
from .problem import resolved_problem
from .fit_check import FitCheck, check_fit
from .minimum_reflux import EnergyBalanceMinimum, energy_balance_minimum, minimum_warnings
from .options import model_options
from .results import DesignEvaluation, SequentialPrice
from .verification import Verification, verify_design


@dataclass(frozen=True)
class ThermoChecks:
    """The reported design on thermo, its minimum reflux on the same basis, the property fits' errors."""

    verification: Verification
    minimum: EnergyBalanceMinimum | None  # None where not asked for (other scenarios)
    fit: FitCheck | None
    warnings: tuple[str, ...]

    @property
    def reflux_ratio(self) -> float:
        """Reflux ratio of the reported design (the corrected one where there is one) [-]."""
        v = self.verification
        return (v.corrected or v.profile).reflux_ratio


def thermo_checks(case: Case, mixture: Mixture, feed: FeedState, data: CostData, design: DesignEvaluation,
                  stages: StageDesign, options=None, sizing: SizingOptions = SizingOptions(),
                  scenario: str | None = None, full: bool = True, fitted=None,
                  minimum_near: EnergyBalanceMinimum | None = None, reflux_floor: float | None = None,
                  hold_reflux: bool = False, priced: SequentialPrice | None = None) -> ThermoChecks:
    """Verify ``design`` on thermo; with ``full`` also its energy-balance minimum reflux and the fit check.

    ``fitted``: the fitted forms the design was optimised on (:attr:`OptimumDesign.problem`); None
    fits them again as the optimiser would. ``minimum_near``: the minimum reflux found on the design
    without the control margin, where the margin's floor was set on it: the design held to the floor is
    reported against that minimum, not its own, so that R/Rmin reads the margin's factor. Both bound the
    true minimum from above: 0.05 % apart on the benzene example (1.7385 on 54 stages, 1.7377 on 48); a
    water/acetic acid design held at 1.1 x 0.7736 had read "1.096 x" its own 0.7768; on an ethylene/ethane
    splitter its own took 3.5 s of a 27-s design and came out the higher. ``reflux_floor``: the control margin's
    least reflux ratio, which a correction on thermo keeps (:func:`verify_design`); ``hold_reflux``: a given
    design's reflux, which a correction keeps where it can; ``priced``: the design sized and costed (an
    optimum's :attr:`OptimumDesign.sequential`; a given design carries its own), whose trays set the
    pressures it is verified at.
    """
    verification = verify_design(case, mixture, feed, design, stages.shortcut, data, sizing, scenario,
                                 reflux_floor, hold_reflux, priced or design.sequential)
    if not full:
        return ThermoChecks(verification, None, None, verification.warnings)
    reported = verification.corrected or verification.profile
    if minimum_near is not None and minimum_near.reflux_ratio is not None:
        minimum = minimum_near.of_unconstrained_design()
    else:
        minimum = energy_balance_minimum(case, mixture, feed, stages.shortcut, reported,
                                         minimum_stages=stages.minimum_stages, given=hold_reflux)
    if fitted is None:
        fitted = resolved_problem(case, mixture, feed, model_options(options), at_least=design.stages).fitted
    fit = check_fit(fitted, mixture, verification.profile)
    warnings = (verification.warnings + fit.warnings
                + minimum_warnings(reported.reflux_ratio, stages.minimum_reflux, stages.basis, minimum))
    return ThermoChecks(verification, minimum, fit, warnings)


__all__ = ["ThermoChecks", "thermo_checks"]
