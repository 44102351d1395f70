"""The sizing layer's own conventions: docstring format of correlations and one-way imports."""

import ast
import inspect
import re
from pathlib import Path

import pytest

import disteco.sizing
from disteco.sizing import auxiliaries, efficiency, exchangers, flooding, vessel

CORRELATIONS = [
    flooding.capacity_factor_lygeros_magoulas, flooding.capacity_factor_kessler_wankat,
    flooding.surface_tension_correction, flooding.flow_parameter, flooding.downcomer_area_fraction,
    flooding.flooding_velocity, flooding.flooding_diameter_smooth, efficiency.oconnell_efficiency_lockett,
    vessel.shell_thickness_ug27, vessel.head_thickness_ug32, vessel.shell_mass,
    exchangers.log_mean_temperature_difference, exchangers.exchanger_area,
    auxiliaries.drum_volume, auxiliaries.pump_shaft_power,
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


ALLOWED = {"disteco._base", "disteco.stages", "disteco.sizing", "disteco.properties", "disteco.case"}
FORBIDDEN_THIRD_PARTY = {"thermo", "chemicals", "pyomo"}


def test_imports_go_one_way():
    package = Path(disteco.sizing.__file__).parent
    for path in package.glob("*.py"):
        module = "disteco.sizing." + path.stem
        for node in ast.walk(ast.parse(path.read_text())):
            if isinstance(node, ast.ImportFrom):
                if node.level:
                    base = module.rsplit(".", node.level)[0]
                    target = f"{base}.{node.module}" if node.module else base
                else:
                    target = node.module
                names = [target]
            elif isinstance(node, ast.Import):
                names = [a.name for a in node.names]
            else:
                continue
            for name in names:
                if name.startswith("disteco"):
                    assert any(name == a or name.startswith(a + ".") for a in ALLOWED), (path.name, name)
                assert name.split(".")[0] not in FORBIDDEN_THIRD_PARTY, (path.name, name)
