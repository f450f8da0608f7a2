"""netsynth: series/parallel resistor networks from your own stock bin.

The public API; the command line (``netsynth``) is a thin shell over it. Names are
imported on first use (PEP 562), so ``import netsynth`` and ``netsynth --help`` do not
load numpy or the search.

>>> from netsynth import make, kit_bin
>>> make("4k7", kit_bin("E12", 1000, 10_000), max_parts=1).best.error
0.0
"""

from __future__ import annotations

import importlib
from typing import Any

#: public name -> the module that defines it
_HOMES = {
    "ArgumentError": "netsynth.errors",
    "InfeasibleError": "netsynth.errors",
    "NetsynthError": "netsynth.errors",
    "StockError": "netsynth.errors",
    "ValueParseError": "netsynth.errors",
    "VerificationError": "netsynth.errors",
    "Derating": "netsynth.analysis.conditions",
    "OperatingPoint": "netsynth.analysis.conditions",
    "Review": "netsynth.analysis.review",
    "review": "netsynth.analysis.review",
    "assign_lines": "netsynth.analysis.lines",
    "check": "netsynth.api",
    "make": "netsynth.api",
    "Candidate": "netsynth.design",
    "Design": "netsynth.design",
    "FrontierEntry": "netsynth.design",
    "PickLine": "netsynth.design",
    "Parallel": "netsynth.network",
    "Part": "netsynth.network",
    "Series": "netsynth.network",
    "from_text": "netsynth.network",
    "parallel": "netsynth.network",
    "resistance": "netsynth.network",
    "series": "netsynth.network",
    "to_netlist": "netsynth.network",
    "to_text": "netsynth.network",
    "Edge": "netsynth.nodal",
    "equivalent_resistance": "netsynth.nodal",
    "solve_network": "netsynth.nodal",
    "StockBin": "netsynth.stock",
    "StockItem": "netsynth.stock",
    "default_bin": "netsynth.stock",
    "kit_bin": "netsynth.stock",
    "load_bin": "netsynth.stock",
    "save_bin": "netsynth.stock",
    "format_ohms": "netsynth.values",
    "parse_resistance": "netsynth.values",
    "to_code": "netsynth.values",
}

__all__ = sorted(_HOMES)


def __getattr__(name: str) -> Any:
    home = _HOMES.get(name)
    if home is None:
        raise AttributeError(f"module 'netsynth' has no attribute {name!r}")
    value = getattr(importlib.import_module(home), name)
    globals()[name] = value  # later look-ups skip this function
    return value


def __dir__() -> list[str]:
    return sorted(set(globals()) | set(__all__))
