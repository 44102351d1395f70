"""The least-reflux search on one unknown, ln R (stages.specs._least_reflux_at), on residuals of known root.

A column's specification residuals near its minimum reflux fall steeply on one side and flatly on the
other (a pinch), as exp(k (x* - x)) - 1 does in x = ln R. Plain false position then moves one end only;
the search halved the bracket instead whenever the same end moved twice, and the Illinois step (Dowell
and Jarratt, BIT 11 (1971) 168-174, from memory: halve the residual kept at the other end) now takes its
place. Measured on these residuals (from ln R* + 0.05, steps of 0.1): 9 -> 6 columns at k = 1, 12 -> 8 at
k = 10, 13 -> 11 at k = 30; on the benzene example's energy-balance minimum (48 stages) 13 -> 9 columns,
the same minimum to 1e-5 in ln R (1.73848 -> 1.73847).
"""

import math

import numpy as np
import pytest

from disteco.stages.specs import TOLERANCE, _least_reflux_at

ROOT = 1.7385  # the benzene example's energy-balance minimum reflux ratio, a realistic root [-]
RESOLUTION = 1e-5  # in ln R, as the energy-balance minimum asks


def search(curvature: float, start: float) -> tuple[float, int]:
    """(reflux ratio returned, columns solved) from ln R* + ``start``."""
    trials = []

    def run(log_r, distillate, guess):
        trials.append(log_r)
        residual = math.expm1(curvature * (math.log(ROOT) - log_r))
        return log_r, np.array([residual, 1.4 * residual])  # the "profile" is its own ln R

    found = _least_reflux_at(run, lambda profile, at, trial: None, lambda: None, math.log(ROOT) + start, 1.0,
                             None, 0.1, RESOLUTION, 48, 24)
    return math.exp(found), len(trials)


@pytest.mark.parametrize("curvature, start, most", [(1.0, 0.05, 6), (3.0, 0.17, 8), (10.0, 0.05, 8),
                                                    (10.0, 0.26, 10), (30.0, 0.05, 11), (30.0, 0.26, 12)])
def test_the_root_within_the_resolution_in_few_columns(curvature, start, most):
    found, columns = search(curvature, start)
    assert columns <= most
    # the search returns a column meeting both specifications, or one within the residuals' tolerance
    assert math.log(found) - math.log(ROOT) < RESOLUTION + TOLERANCE / curvature
    assert math.log(found) - math.log(ROOT) > -TOLERANCE / curvature
