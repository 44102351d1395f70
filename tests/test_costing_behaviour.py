"""Behaviour of the cost engine: sizes outside a range, the TAC sum, docstring format, pins.

The pinned numbers at the end are regression pins: they only guard against change.
"""

import inspect
import math
import re

import pytest

import disteco.costing as costing
from disteco._base.errors import CorrelationRangeError
from disteco._base.validity import OutOfRange
from disteco.costing import ColumnCostInput, cost_column, cost_equipment, load_cost_data

DATA = load_cost_data()
INPUT = ColumnCostInput(shell_diameter=2.0, shell_height=25.0, design_pressure_gauge=2e5, trays=40,
                        condenser_area=150.0, condenser_duty=5e6, condenser_utility="cooling_water",
                        reboiler_area=100.0, reboiler_duty=5.5e6, reboiler_utility="lp_steam",
                        drum_volume=8.0, drum_diameter=1.5, pump_shaft_power=3e3, pump_electric_power=3.5e3)


def test_exchanger_above_range_is_split_into_parallel_units():
    """1500 m2 of fixed-tube-sheet exchanger (range 10-1000 m2) becomes 2 units of 750 m2, with a warning."""
    split = cost_equipment(DATA, "condenser", "fixed_tube_sheet_exchanger", 1500.0, 397.0)
    one = cost_equipment(DATA, "condenser", "fixed_tube_sheet_exchanger", 750.0, 397.0)
    assert split.parallel_units == 2
    assert split.purchased_base == pytest.approx(2 * one.purchased_base)
    assert split.size == 1500.0
    assert any("split into 2 parallel units" in w for w in split.warnings)


def test_tower_above_range_is_extrapolated_with_a_warning():
    """A column cannot be split: 600 m3 (range 0.3-520 m3) is costed along the curve's tangent at 520 m3
    and says so. Turton et al., 4th ed., Table A.1 (vertical vessel, from memory): K1 3.4974, K2 0.4485,
    K3 0.1074; the tangent's slope at 520 m3 is K2 + 2 K3 log10 520 = 1.032."""
    cost = cost_equipment(DATA, "column shell", "vertical_vessel", 600.0, 397.0, diameter=5.0)
    assert cost.parallel_units == 1
    assert any(w.startswith("column shell: volume 600 m3 is above 520 m3") and "tangent" in w for w in cost.warnings)
    at_top = 10 ** (3.4974 + 0.4485 * math.log10(520) + 0.1074 * math.log10(520) ** 2)
    slope = 0.4485 + 2 * 0.1074 * math.log10(520)
    assert cost.purchased_base == pytest.approx(at_top * (600 / 520) ** slope, rel=1e-6)


def test_small_pump_below_range_is_costed_along_the_tangent_with_a_warning():
    """Turton et al., 4th ed., Table A.1 (centrifugal pump, 1-300 kW; from memory): K1 3.3892, K2 0.0536; at
    the range's 1 kW, u = 0, the tangent's slope is K2: 0.5 kW costs 10**(3.3892 + 0.0536 log10 0.5) at the
    base index, less than the 1 kW pump (the quadratic itself would price it higher: K3 > 0)."""
    cost = cost_equipment(DATA, "reflux pump", "centrifugal_pump", 500.0, 397.0)
    assert cost.purchased_base == pytest.approx(10 ** (3.3892 + 0.0536 * math.log10(0.5)), rel=1e-6)
    assert cost.purchased_base < cost_equipment(DATA, "reflux pump", "centrifugal_pump", 1000.0, 397.0).purchased_base
    assert any("shaft_power 500 W is below 1000 W" in w and "tangent" in w for w in cost.warnings)


def test_raise_policy_refuses_a_size_outside_the_range():
    with pytest.raises(CorrelationRangeError, match=r"kettle_reboiler cost: area = 150 m2 is outside"):
        cost_equipment(DATA, "reboiler", "kettle_reboiler", 150.0, 397.0, policy=OutOfRange.RAISE)


def test_zero_size_is_an_error():
    with pytest.raises(CorrelationRangeError, match="area = 0"):
        cost_equipment(DATA, "condenser", "floating_head_exchanger", 0.0, 397.0)


def test_high_pressure_exchanger_is_extrapolated_with_a_warning():
    cost = cost_equipment(DATA, "reboiler", "kettle_reboiler", 50.0, 397.0, pressure_gauge=160e5)
    assert cost.pressure_factor > 1.0
    assert any("heat_exchanger pressure factor" in w for w in cost.warnings)


def test_tac_is_annualised_capital_plus_utilities_and_breakdown_adds_up():
    summary = cost_column(DATA, INPUT, "reference", 2020)
    assert summary.capital_installed == pytest.approx(sum(e.installed for e in summary.items))
    assert summary.tac_per_year == pytest.approx(summary.annualised_capital + summary.utilities_per_year)
    assert sum(line.per_year for line in summary.breakdown) == pytest.approx(summary.tac_per_year)
    assert [e.item for e in summary.items] == ["column shell", "trays", "condenser", "reboiler", "reflux drum",
                                                "reflux pump"]
    assert [u.item for u in summary.utilities] == ["condenser", "reboiler", "reflux pump"]
    low, high = summary.tac_range
    assert (low, high) == pytest.approx((0.5 * summary.tac_per_year, 2.0 * summary.tac_per_year))
    assert "18R-97" in summary.accuracy_band.source and summary.accuracy_band.cautions


def test_payback_method(tmp_path):
    """With method = payback the capital charge is 1 / payback years."""
    import shutil
    from importlib.resources import files
    folder = tmp_path / "d"
    shutil.copytree(str(files("disteco.cost_data")), folder, ignore=shutil.ignore_patterns("__pycache__"))
    text = (folder / "annualisation.toml").read_text().replace('method = "capital_recovery"\n', 'method = "payback"\n')
    (folder / "annualisation.toml").write_text(text)
    summary = cost_column(load_cost_data(folder), INPUT)
    assert summary.capital_charge_factor == pytest.approx(1 / 3)


def test_scenarios_change_only_the_utilities():
    ref = cost_column(DATA, INPUT, "reference", 2020)
    cheap = cost_column(DATA, INPUT, "cheap-steam-demo", 2020)
    power = cost_column(DATA, INPUT, "expensive-power-demo", 2020)
    assert ref.capital_installed == cheap.capital_installed == power.capital_installed
    assert cheap.utilities[1].cost_per_year < ref.utilities[1].cost_per_year
    assert power.utilities[2].cost_per_year > ref.utilities[2].cost_per_year


def test_curve_as_pyomo_expression_matches_the_float():
    """Twin check: the same constants as a Pyomo expression give the float cost at design points."""
    pyo = pytest.importorskip("pyomo.environ")
    curve = DATA.curve("kettle_reboiler")
    model = pyo.ConcreteModel()
    model.area = pyo.Var(bounds=(curve.size_min, curve.size_max))
    from disteco._base.operations import Operations
    model.cost = pyo.Expression(expr=curve.expression(model.area, Operations(pyo.exp, pyo.log, pyo.sqrt)))
    for area in (12.0, 50.0, 95.0):
        model.area.set_value(area)
        assert pyo.value(model.cost) == pytest.approx(curve.purchased_cost(area), rel=1e-12)


def test_price_per_joule_is_the_linear_utility_coefficient():
    """cost per year = duty x hours x 3600 x price per joule, for every scenario and utility."""
    summary = cost_column(DATA, INPUT, "cheap-steam-demo", 2020)
    hours = DATA.settings.operating_hours_per_year
    for use in summary.utilities:
        coefficient = DATA.price_per_joule("cheap-steam-demo", use.utility, 2020)
        assert use.duty * hours * 3600.0 * coefficient == pytest.approx(use.cost_per_year, rel=1e-12)


# ---------------------------------------------------------------- docstring format


def _correlations():
    for name in costing.__all__:
        obj = getattr(costing, name)
        if inspect.isfunction(obj) and "References" in (obj.__doc__ or ""):
            yield obj


def test_correlation_functions_document_every_parameter_with_a_unit():
    """Numpy-style docstrings: each parameter of the signature is documented and ends with [unit]."""
    functions = list(_correlations())
    assert len(functions) >= 8
    for function in functions:
        doc = function.__doc__
        params = doc.split("Parameters\n    ----------\n")[1].split("\n    Returns")[0]
        documented = re.findall(r"^    (\w+) : ", params, flags=re.M)
        assert documented == list(inspect.signature(function).parameters), function.__name__
        descriptions = re.split(r"^    \w+ : .*$", params, flags=re.M)[1:]
        for name, text in zip(documented, descriptions):
            assert re.search(r"\[[^\]]+\]\s*$", text.strip()), (function.__name__, name)
        for section in ("Notes", "Examples", "References"):
            assert f"\n    {section}\n" in doc, (function.__name__, section)


# ---------------------------------------------------------------- regression pins


def test_whole_column_pin():
    """Regression pin of the demo column at CEPCI 2020 (596.2), reference prices; guards against change only.

    The reference prices are of 2006 and are moved to 2020 with the utility price indices
    (before they were not: utilities 2,156,222 and TAC 2,342,204 USD/year mixed 2006 prices
    with 2020 capital)."""
    summary = cost_column(DATA, INPUT, "reference", 2020)
    installed = {e.item: e.installed for e in summary.items}
    assert installed["column shell"] == pytest.approx(339_643, rel=1e-4)
    assert installed["trays"] == pytest.approx(124_005, rel=1e-4)
    assert summary.capital_installed == pytest.approx(1_142_780, rel=1e-4)
    assert summary.utilities_per_year == pytest.approx(944_425, rel=1e-4)
    assert summary.tac_per_year == pytest.approx(944_425 + 1_142_780 * 0.1627453948825, rel=1e-4)
    assert {u.price_year for u in summary.utilities} == {2020}
    assert math.isclose(summary.capital_charge_factor, 0.1627453948825, rel_tol=1e-9)
