"""The sizing layer's own conventions: docstring format of correlations, no thermo or pyomo imports."""

import ast
import inspect
import re
from pathlib import Path

import pytest

import disteco.sizing
from disteco.sizing import auxiliaries, efficiency, exchangers, flooding, tray_pressure_drop, vessel

CORRELATIONS = [
    flooding.capacity_factor_lygeros_magoulas, flooding.capacity_factor_kessler_wankat,
    flooding.surface_tension_correction, flooding.flow_parameter, flooding.downcomer_area_fraction,
    flooding.flooding_velocity, flooding.allowable_vapour_velocity, flooding.required_tray_area,
    efficiency.oconnell_efficiency_lockett,
    vessel.shell_thickness_ug27, vessel.head_thickness_ug32, vessel.shell_mass, vessel.collapse_pressure_von_mises,
    exchangers.log_mean_temperature_difference, exchangers.mean_temperature_difference, exchangers.exchanger_area,
    auxiliaries.drum_volume, auxiliaries.pump_shaft_power,
    tray_pressure_drop.dry_plate_head, tray_pressure_drop.weir_crest_francis, tray_pressure_drop.residual_head,
    tray_pressure_drop.head_to_pressure, tray_pressure_drop.weir_length,
]
SECTIONS = ["Parameters", "Returns", "Notes", "Examples", "References"]


@pytest.mark.parametrize("function", CORRELATIONS, ids=lambda f: f.__name__)
def test_correlation_docstring(function):
    doc = inspect.getdoc(function)
    positions = [doc.find(f"\n{name}\n{'-' * len(name)}") for name in SECTIONS]
    assert all(p > 0 for p in positions) and positions == sorted(positions), function.__name__
    params = doc[positions[0]:positions[1]]
    documented = re.findall(r"^(\w+) : .*\n((?:    .*\n?)+)", params, re.M)
    assert [name for name, _ in documented] == list(inspect.signature(function).parameters)
    for name, text in documented:
        assert re.search(r"\[[^\]]+\]\s*$", text.strip()), f"{function.__name__}: {name} has no [unit]"
    assert "\n1. " in doc[positions[4]:]


FORBIDDEN = {"thermo", "chemicals", "pyomo"}  # properties own thermo; equation models own pyomo


def test_sizing_imports_neither_thermo_nor_pyomo():
    """Layer order itself is checked in test_architecture.py."""
    for path in Path(disteco.sizing.__file__).parent.glob("*.py"):
        for node in ast.walk(ast.parse(path.read_text())):
            if isinstance(node, ast.Import):
                names = [a.name for a in node.names]
            elif isinstance(node, ast.ImportFrom) and not node.level:
                names = [node.module]
            else:
                continue
            assert not {n.split(".")[0] for n in names} & FORBIDDEN, (path.name, names)
