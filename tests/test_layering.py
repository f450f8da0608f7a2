"""Imports point one way (see DEVELOPERS.md): the verifier stays independent, click stays in the CLI."""

from __future__ import annotations

import ast
from pathlib import Path

import pytest

PACKAGE = Path(__file__).resolve().parent.parent / "netsynth"

#: lower layers first; a module may import only from its own layer or below
LAYERS = [
    {"errors"},
    {"values", "eseries", "nodal"},
    {"stock", "binfile", "network"},
    {"analysis"},
    {"search"},
    {"design"},
    {"api", "render"},
    {"cli", "__main__", "__init__"},
]


def layer_of(module: str) -> int:
    top = module.split(".")[0]
    return next(i for i, names in enumerate(LAYERS) if top in names)


def netsynth_imports(path: Path) -> set[str]:
    found = set()
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.ImportFrom) and node.module == "netsynth":
            found |= {a.name for a in node.names}  # from netsynth import values
        elif isinstance(node, ast.ImportFrom) and node.module and node.module.startswith("netsynth"):
            found.add(node.module.removeprefix("netsynth").lstrip(".") or "__init__")
        elif isinstance(node, ast.Import):
            found |= {a.name.removeprefix("netsynth.") for a in node.names if a.name.startswith("netsynth.")}
    return found


def module_name(path: Path) -> str:
    return ".".join(path.relative_to(PACKAGE).with_suffix("").parts)


MODULES = sorted(PACKAGE.rglob("*.py"))


@pytest.mark.parametrize("path", MODULES, ids=module_name)
def test_imports_point_down(path):
    me = layer_of(module_name(path))
    for target in netsynth_imports(path):
        assert layer_of(target) <= me, f"{module_name(path)} imports {target} from a higher layer"


def test_nodal_solver_knows_nothing_of_series_parallel():
    assert netsynth_imports(PACKAGE / "nodal.py") <= {"errors"}


@pytest.mark.parametrize("path", MODULES, ids=module_name)
def test_only_the_cli_imports_click(path):
    if module_name(path) == "cli":
        return
    tree = ast.parse(path.read_text(encoding="utf-8"))
    names = {a.name for n in ast.walk(tree) if isinstance(n, ast.Import) for a in n.names}
    names |= {n.module for n in ast.walk(tree) if isinstance(n, ast.ImportFrom) and n.module}
    assert "click" not in names
