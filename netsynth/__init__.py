"""netsynth: series/parallel resistor networks from your own stock bin.

The public API; the command line (``netsynth``) is a thin shell over it.

>>> from netsynth import make, kit_bin
>>> make("4k7", kit_bin("E12", 1000, 10_000), max_parts=1).best.error
0.0
"""

from netsynth.analysis.conditions import Derating, OperatingPoint
from netsynth.analysis.review import Review, review
from netsynth.api import check, make
from netsynth.design import Candidate, Design, FrontierEntry, PickLine
from netsynth.errors import (
    InfeasibleError,
    NetsynthError,
    StockError,
    ValueParseError,
    VerificationError,
)
from netsynth.network import Parallel, Part, Series, from_text, parallel, resistance, series, to_netlist, to_text
from netsynth.nodal import Edge, equivalent_resistance, solve_network
from netsynth.stock import StockBin, StockItem, default_bin, kit_bin, load_bin, save_bin
from netsynth.values import format_ohms, parse_resistance, to_code

__all__ = sorted([
    "Candidate", "Derating", "Design", "OperatingPoint", "Review", "check", "review", "Edge", "FrontierEntry", "InfeasibleError", "NetsynthError", "Parallel", "Part",
    "PickLine", "Series", "StockBin", "StockError", "StockItem", "ValueParseError", "VerificationError",
    "default_bin", "equivalent_resistance", "format_ohms", "from_text", "kit_bin", "load_bin", "make",
    "parallel", "parse_resistance", "resistance", "save_bin", "series", "solve_network", "to_code",
    "to_netlist", "to_text",
])
