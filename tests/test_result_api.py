"""The Python API for notebooks: print() of the check and design results gives the engineer's
summary in engineering units, and the tables come as pandas DataFrames equal to the result."""

import dataclasses

import pytest

from disteco import api
from disteco.case import load_case

from conftest import EXAMPLES
from test_reports_tables import design_parts


@pytest.fixture(scope="module")
def result():
    found, parts = design_parts()
    return dataclasses.replace(found, parts=parts)


def test_print_of_a_design_result_is_the_console_summary(result):
    text = str(result)
    assert text.startswith("Case: ")
    assert "Top pressure: 115.00 kPa" in text  # 1.15 bar, not 115000.0 Pa
    assert f"Condenser duty {result.parts.profile.condenser_duty / 1e3:,.0f} kW" in text
    assert "Warning: plain warning" in text
    assert "DesignResult(" not in text


def test_profile_frame_equals_the_profile_in_display_units(result):
    profile = result.parts.profile
    frame = result.profile_frame()
    assert len(frame) == profile.stages
    assert list(frame["Temperature [degC]"]) == pytest.approx([t - 273.15 for t in profile.T])
    assert list(frame["Pressure [kPa]"]) == pytest.approx([p / 1e3 for p in profile.P])


def test_equipment_and_capital_frames(result):
    equipment = result.equipment_frame()
    assert {"column", "condenser"} <= set(equipment["Tag"])
    capital = result.capital_frame()
    installed = [c for c in capital.columns if c.startswith("Installed cost")]
    assert len(installed) == 1
    items = capital[capital["Item"] != "total"]
    assert list(items[installed[0]]) == pytest.approx([e.installed for e in result.parts.cost.items])


def test_a_part_the_run_did_not_produce_is_named(result):
    with pytest.raises(ValueError, match="no scenario table"):
        result.scenario_frame()


def test_print_of_a_check_result():
    """kPa and degC, the key volatility, the minima; not the dataclass with kelvin and kg/mol."""
    found = api.check(load_case(EXAMPLES / "aromatics_binary.toml"))
    text = str(found)
    assert "Tb [degC]" in text and "80.07" in text  # benzene's normal boiling point, 353.2 K
    assert "M [g/mol]" in text and "78.11" in text
    assert f"minimum stages: {found.stages.minimum_stages:.2f} [-]" in text
    assert "CaseCheck(" not in text
