"""Imports point one way (see DEVELOPERS.md): the verifier stays independent, click stays in the CLI.

Two rules, both over a graph whose nodes are netsynth's modules (``stock.items`` and
``stock.kits`` are nodes of their own, ``stock`` is the package's ``__init__``):

* no cycle: no module reaches itself through imports (``items -> binfile -> items`` fails);
* layers: a module imports only from its own layer or a lower one.

An edge is an import statement anywhere in the module (also inside functions), except inside
``if TYPE_CHECKING:``, which never runs.  Importing ``netsynth.a.b`` also runs ``netsynth.a``
first, so that is an edge too, unless the importer lives inside ``a`` itself (the package is
already running then); for the same reason no module gets an edge to ``netsynth/__init__``
for the package it lives in.  A package's ``__init__`` importing its own submodules is an
ordinary downward edge.
"""

from __future__ import annotations

import ast
from pathlib import Path

import networkx as nx
import pytest

PACKAGE = Path(__file__).resolve().parent.parent / "netsynth"

#: lower layers first; a module may import only from its own layer or below.  A module is
#: placed by its first name: ``stock.items`` is in the layer of ``stock``.
LAYERS = [
    {"errors", "limits"},
    {"values", "eseries", "nodal", "atomic"},
    {"stock", "network", "notation", "inputs", "markings", "netlist"},
    {"analysis"},
    {"search"},
    {"design", "jobs"},
    {"api", "render", "plan"},
    {"cli", "__main__", "__init__"},
]


def layer_of(module: str) -> int:
    top = module.split(".")[0]
    return next(i for i, names in enumerate(LAYERS) if top in names)


def module_name(path: Path, root: Path = PACKAGE) -> str:
    """``stock/items.py`` -> ``stock.items``; ``stock/__init__.py`` -> ``stock``; the root's is ``__init__``."""
    parts = path.relative_to(root).with_suffix("").parts
    if parts[-1] == "__init__" and len(parts) > 1:
        parts = parts[:-1]
    return ".".join(parts)


def _is_type_checking(test: ast.expr) -> bool:
    return (isinstance(test, ast.Name) and test.id == "TYPE_CHECKING") or (
        isinstance(test, ast.Attribute) and test.attr == "TYPE_CHECKING")


def _import_nodes(tree: ast.AST):
    """Every Import / ImportFrom in the tree, skipping the body of ``if TYPE_CHECKING:``."""
    for node in ast.iter_child_nodes(tree):
        if isinstance(node, (ast.Import, ast.ImportFrom)):
            yield node
        if isinstance(node, ast.If) and _is_type_checking(node.test):
            for child in node.orelse:
                yield from _import_nodes(ast.Module(body=[child], type_ignores=[]))
            continue
        yield from _import_nodes(node)


def _absolute(node: ast.ImportFrom, me: str, is_package: bool, package: str) -> str:
    """The absolute dotted module an ``from ... import`` names (relative imports resolved)."""
    if not node.level:
        return node.module or ""
    here = [package, *([] if me == "__init__" else me.split("."))]
    if not is_package:
        here = here[:-1]  # a plain module's relative imports start from its package
    base = here[: len(here) - (node.level - 1)]
    return ".".join([*base, node.module] if node.module else base)


def _local(dotted: str, package: str) -> str | None:
    """``netsynth.stock.items`` -> ``stock.items``; ``netsynth`` -> ``__init__``; else None."""
    if dotted == package:
        return "__init__"
    if dotted.startswith(package + "."):
        return dotted.removeprefix(package + ".")
    return None


def import_graph(root: Path = PACKAGE) -> nx.DiGraph:
    """Directed graph of imports between the modules of the package at `root` (see the docstring)."""
    package = root.name
    paths = sorted(root.rglob("*.py"))
    names = {module_name(p, root) for p in paths}
    graph = nx.DiGraph()
    graph.add_nodes_from(names)
    for path in paths:
        me = module_name(path, root)
        is_package = path.name == "__init__.py"
        own_packages = {"__init__"} | {".".join(me.split(".")[:i]) for i in range(1, me.count(".") + 1)}
        if is_package:
            own_packages.add(me)
        targets: set[str] = set()
        for node in _import_nodes(ast.parse(path.read_text(encoding="utf-8"))):
            if isinstance(node, ast.Import):
                dotted = [a.name for a in node.names]
            else:
                base = _absolute(node, me, is_package, package)
                # ``from netsynth.stock import items`` names a module; ``... import StockBin`` does not
                dotted = [base, *(f"{base}.{a.name}" for a in node.names)]
            for d in dotted:
                local = _local(d, package)
                if local is None or local not in names:
                    continue
                targets.add(local)
                parts = local.split(".") if local != "__init__" else []
                targets |= {".".join(parts[:i]) for i in range(1, len(parts))}  # parents run first
        for target in targets - own_packages - {me}:
            graph.add_edge(me, target)
    return graph


GRAPH = import_graph()
MODULES = sorted(GRAPH.nodes)


def test_graph_sees_the_stock_package():
    # the modules this test is about are nodes, and their known imports are edges
    assert {"stock", "stock.items", "stock.kits", "stock.binfile"} <= GRAPH.nodes
    assert GRAPH.has_edge("stock.kits", "stock.items") and GRAPH.has_edge("stock.binfile", "stock.items")
    assert GRAPH.has_edge("stock", "stock.kits") and GRAPH.has_edge("stock", "stock.binfile")


def test_no_import_cycle():
    cycles = sorted(sorted(c) for c in nx.simple_cycles(GRAPH))
    assert not cycles, "import cycles: " + "; ".join(" -> ".join(c) for c in cycles)


@pytest.mark.parametrize("module", MODULES)
def test_imports_point_down(module):
    me = layer_of(module)
    for target in GRAPH.successors(module):
        assert layer_of(target) <= me, f"{module} imports {target} from a higher layer"


def test_nodal_solver_knows_nothing_of_series_parallel():
    # limits holds only numbers (the netlist size the solver takes), nothing of series/parallel rules
    assert set(GRAPH.successors("nodal")) <= {"errors", "limits"}


# A package made up for the checks above: they must fail on the faults they exist to catch.
FAKE_FILES = {
    "__init__.py": "from fake.stock import StockBin\n",
    "errors.py": "",
    "stock/__init__.py": "from fake.stock.items import StockBin\nfrom fake.stock import binfile\n",
    # the old shape: items re-exports binfile at its end, binfile imports items at its top
    "stock/items.py": "from fake import errors\nclass StockBin: ...\nfrom fake.stock.binfile import load_bin\n",
    "stock/binfile.py": "from typing import TYPE_CHECKING\nfrom .items import StockBin\n"
                        "if TYPE_CHECKING:\n    from fake import api\ndef load_bin(): ...\n",
    "api.py": "from fake import stock\n",
    "network.py": "def f():\n    from fake.api import x\n",  # a late import still counts
}


def test_checks_catch_a_cycle_and_an_upward_import(tmp_path):
    root = tmp_path / "fake"
    for name, text in FAKE_FILES.items():
        (root / name).parent.mkdir(parents=True, exist_ok=True)
        (root / name).write_text(text, encoding="utf-8")
    graph = import_graph(root)
    assert sorted(sorted(c) for c in nx.simple_cycles(graph)) == [["stock.binfile", "stock.items"]]
    assert set(graph.successors("stock.binfile")) == {"stock.items"}  # the TYPE_CHECKING import is ignored
    assert set(graph.successors("__init__")) == {"stock"}
    assert set(graph.successors("api")) == {"stock"}
    upward = [(m, t) for m, t in graph.edges if layer_of(t) > layer_of(m)]
    assert upward == [("network", "api")]


@pytest.mark.parametrize("path", sorted(PACKAGE.rglob("*.py")), ids=module_name)
def test_only_the_cli_imports_click(path):
    """Only the ``cli`` package imports click: the library works in a notebook without it."""
    if module_name(path).split(".")[0] == "cli":  # the cli package: its modules are the shell
        return
    tree = ast.parse(path.read_text(encoding="utf-8"))
    names = {a.name for n in ast.walk(tree) if isinstance(n, ast.Import) for a in n.names}
    names |= {n.module for n in ast.walk(tree) if isinstance(n, ast.ImportFrom) and n.module}
    assert "click" not in names


def test_help_does_not_load_numpy():
    # `netsynth --help` and usage errors stay fast: the shell and the package's __init__ import no numpy
    import subprocess
    import sys

    code = "import sys, netsynth.cli; print('numpy' in sys.modules)"
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "False"
