"""The tray spacing's descent walks on from a cheaper neighbouring spacing to the next one.

Seen on an invented six-component C3/C5 split at 8 bar (n-butane between the keys): searched at
0.60 m, the optimum re-optimised at 0.50 m was 2.5 % cheaper, and priced at that optimum 0.45 m was
1.3 % cheaper again, but the descent priced the 0.50-m optimum at its own spacing only (an optimum
found at one spacing holds that spacing alone), found no price for 0.45 m and stopped: the design was
reported at 0.50 m, 18 stages, TAC 166,757 USD/yr, where 0.45 m gives 20 stages and 164,679.
"""

from dataclasses import dataclass, replace
from types import SimpleNamespace

from disteco.optimisation import design as design_module
from disteco.optimisation.results import SpacingPrice
from disteco.sizing.options import SizingOptions

CANDIDATES = (0.45, 0.5, 0.6)
OPTIMUM_TAC = {0.6: 100.0, 0.5: 97.5, 0.45: 96.0}  # each spacing's re-optimised TAC


@dataclass(frozen=True)
class Optimum:
    """The parts of an OptimumDesign the descent reads."""

    sizing_options: SizingOptions
    tac: float
    spacings: tuple = ()

    @property
    def solver(self):
        return SimpleNamespace(status="locally optimal (discrete neighbourhood)")

    @property
    def best(self):
        return SimpleNamespace(profile=self.sizing_options.tray_spacing)  # the profile stands for its design

    @property
    def sequential(self):
        return SimpleNamespace(cost=SimpleNamespace(tac_per_year=self.tac))


def fixed_design_prices(profile, mixture, data, sizing, scenario, year):
    """A design priced at every candidate the sizing offers: 1 % dearer per step away from the design's own."""
    own = OPTIMUM_TAC[profile]
    return tuple(SpacingPrice(s, own * (1.0 + 0.01 * abs(CANDIDATES.index(s) - CANDIDATES.index(profile))), 10.0, 1.0)
                 for s in sizing.spacing_candidates)


def test_the_descent_reaches_the_spacing_two_steps_away(monkeypatch):
    monkeypatch.setattr(design_module, "spacing_prices", fixed_design_prices)
    sizing = SizingOptions(tray_spacing=0.6, tray_spacings=CANDIDATES)
    searched = []

    def optimise_at(at, warm, rounds=None):
        searched.append((at.tray_spacing, rounds))
        return Optimum(at, OPTIMUM_TAC[at.tray_spacing])  # as a search at one spacing returns it: that spacing alone

    start = Optimum(replace(sizing, tray_spacing=0.6), OPTIMUM_TAC[0.6])
    found = design_module._spacing_descent(start, sizing, optimise_at, None, None, None, None)
    assert found.sizing_options.tray_spacing == 0.45 and found.tac == 96.0
    assert searched == [(0.5, 1), (0.5, None), (0.45, 1), (0.45, None)]
    assert found.sizing_options.tray_spacings == CANDIDATES
    assert [p.spacing for p in found.spacings] == list(CANDIDATES)
