"""Data flows one way: a layer imports only from the layers before it."""

import ast
import re
from pathlib import Path

SRC = Path(__file__).resolve().parents[1] / "src" / "disteco"
ORDER = ["_base", "case", "properties", "stages", "sizing", "costing", "optimisation", "reports", "api", "cli"]


def layer_of(path: Path) -> str:
    part = path.relative_to(SRC).parts[0]
    return part.removesuffix(".py")


def imported_layers(path: Path):
    tree = ast.parse(path.read_text())
    depth = len(path.relative_to(SRC).parts) - 1
    for node in ast.walk(tree):
        if isinstance(node, ast.ImportFrom):
            if node.level:
                parts = path.relative_to(SRC).parts[:depth + 1 - node.level]
                target = ".".join(parts + ((node.module,) if node.module else ()))
                names = [target] if node.module else [f"{a.name}" for a in node.names]
                for name in names:
                    first = name.split(".")[0]
                    yield first if first else name
            elif node.module and node.module.startswith("disteco."):
                yield node.module.split(".")[1]
        elif isinstance(node, ast.Import):
            for alias in node.names:
                if alias.name.startswith("disteco."):
                    yield alias.name.split(".")[1]


def test_layers_import_only_earlier_layers():
    problems = []
    for path in SRC.rglob("*.py"):
        layer = layer_of(path)
        if layer not in ORDER:
            continue
        for target in imported_layers(path):
            if target in ORDER and ORDER.index(target) > ORDER.index(layer):
                problems.append(f"{path.relative_to(SRC)} imports {target}")
    assert problems == []


def test_only_properties_imports_thermo():
    for path in SRC.rglob("*.py"):
        text = path.read_text()
        if layer_of(path) != "properties":
            assert not re.search(r"\b(import|from) thermo\b", text), path  # thermo_checks is ours
            assert "from chemicals" not in text, path
