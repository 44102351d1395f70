"""The optimiser's minima of a binary: McCabe-Thiele stepped on the fitted forms' own curve.

Fenske and Underwood take one relative volatility; on a binary whose volatility changes
along the curve the search then started far too short. The reference is the stages
layer's McCabe-Thiele construction on thermo's bubble points (McCabe, W.L., Thiele, E.W.,
"Graphical design of fractionating columns", Ind. Eng. Chem. 17, 605-611 (1925)), which
the fitted forms must reproduce within their fit.
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pytest

from disteco import api
from disteco.optimisation.options import model_options
from disteco.optimisation.problem import resolved_problem
from disteco.optimisation.start import fitted_equilibrium_curve, shortcut
from disteco.properties import feed_state
from disteco.stages import design_stages
from disteco.stages.correlations import fenske_minimum_stages

ROOT = Path(__file__).resolve().parents[1]


def _setting(path: Path):
    case = api.load_case(path)
    mixture = api.mixture_of(case)
    feed = feed_state(case.feed, mixture, case.column.top_pressure)
    config = model_options(None)
    problem = resolved_problem(case, mixture, feed, config)
    return case, mixture, feed, problem, config


def test_acetone_water_minima_follow_the_curve_not_the_feed_volatility():
    case, mixture, feed, problem, config = _setting(ROOT / "tests" / "cases" / "acetone_water.toml")
    thermo = design_stages(mixture, feed, case.products, case.column)  # McCabe-Thiele on thermo's curve
    estimate = shortcut(problem)
    assert estimate.method == "McCabe-Thiele"
    assert estimate.minimum_stages == pytest.approx(thermo.minimum_stages, rel=0.05)  # 23.3 against 22.6
    assert estimate.minimum_reflux == pytest.approx(thermo.minimum_reflux, rel=0.08)  # 4.91 against 4.71
    # Fenske at the feed bubble point's volatility (what the start used before): a fifth of it
    lk, hk = problem.light_key, problem.heavy_key
    d, F, z = np.asarray(estimate.distillate), problem.feed_flow, np.asarray(problem.z)
    fenske = fenske_minimum_stages(d[lk], F * z[lk] - d[lk], d[hk], F * z[hk] - d[hk], estimate.alpha[lk])
    assert fenske < 0.25 * estimate.minimum_stages
    # the stage bound follows (4.5 x the minimum on forms fitted to the first 60 stages: 104)
    assert 4.4 * estimate.minimum_stages < config.max_stages <= math.ceil(4.5 * estimate.minimum_stages)


def test_fitted_curve_matches_the_bubble_points_of_the_fitted_forms():
    *_, problem, _ = _setting(ROOT / "tests" / "cases" / "acetone_water.toml")
    curve = fitted_equilibrium_curve(problem)
    f, lk = problem.fitted, problem.light_key
    for x_light in (0.01, 0.3, 0.9, 0.995):
        x = np.zeros(2)
        x[lk], x[1 - lk] = x_light, 1.0 - x_light
        T = f.bubble_temperature(problem.top_pressure, x)
        k = f.k_values(T, problem.top_pressure, x)
        assert float(curve.y_of(x_light)) == pytest.approx(k[lk] * x_light / float(k @ x), abs=2e-4)


def test_near_constant_volatility_binary_keeps_fenske_and_underwood():
    """Benzene-toluene (volatility 2.3-2.6): stepping agrees with Fenske at the feed's volatility within
    5 % and with Underwood's minimum reflux within 1 %: for a feed pinch the construction is Underwood's
    equation at the pinch's volatility (exact for constant volatility, Underwood 1948)."""
    *_, problem, _ = _setting(ROOT / "examples" / "aromatics_binary.toml")
    estimate = shortcut(problem)
    lk, hk = problem.light_key, problem.heavy_key
    d, F, z = np.asarray(estimate.distillate), problem.feed_flow, np.asarray(problem.z)
    fenske = fenske_minimum_stages(d[lk], F * z[lk] - d[lk], d[hk], F * z[hk] - d[hk], estimate.alpha[lk])
    assert estimate.method == "McCabe-Thiele"
    assert estimate.minimum_stages == pytest.approx(fenske, rel=0.05)
    alpha, x_d, q = estimate.alpha[lk], d[lk] / (d[lk] + d[hk]), problem.q
    assert q == pytest.approx(1.0)
    underwood = (x_d / z[lk] - alpha * (1 - x_d) / (1 - z[lk])) / (alpha - 1)  # saturated-liquid feed
    assert estimate.minimum_reflux == pytest.approx(underwood, rel=0.01)


def test_check_points_out_a_profile_far_off_its_row(capsys):
    """The stage profile of acetone-water meets its specifications on thermo only at 13.6, 2.9 x the
    minimum at top pressure (its row is 1.3 x): `check` says so beside the reflux; the benzene
    example's profile (1.40 x) stays as it was."""
    from disteco.cli import main

    assert main(["check", str(ROOT / "tests" / "cases" / "acetone_water.toml")]) == 0
    line = next(row for row in capsys.readouterr().out.splitlines() if row.startswith("Stage profile"))
    assert "reflux ratio 13.632 [-] (2.89 x the minimum: what thermo's column" in line
    assert main(["check", str(ROOT / "examples" / "aromatics_binary.toml")]) == 0
    line = next(row for row in capsys.readouterr().out.splitlines() if row.startswith("Stage profile"))
    assert line.endswith("reflux ratio 2.229 [-]")
