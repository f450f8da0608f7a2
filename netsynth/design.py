"""Result types of a request: verified candidates, frontier entries, the pick list and the design.

Plain frozen records; built by :mod:`netsynth.api`, shown by :mod:`netsynth.render`. One record
per stage, each built from the one before instead of copying its fields:

    search.exact.Found  --(nodal check)-->  Candidate
    search.frontier.FrontierRow  --(candidates verified)-->  FrontierEntry
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

from netsynth.analysis.conditions import Derating, OperatingPoint
from netsynth.analysis.review import Review
from netsynth.analysis.stress import NetworkStress
from netsynth.network import Network, Part, parts_in_order
from netsynth.search.arrays import PartBound
from netsynth.search.exact import Found
from netsynth.search.frontier import FrontierRow, Reach
from netsynth.stock import StockItem


@dataclass(frozen=True, slots=True)
class Candidate:
    """A search result with its nodal check: the network, its value and error, and the solver's value."""

    found: Found  #: the search's record (network, value, signed relative error, part count)
    expression: str  #: the network's text form (``to_text``)
    verified_ohms: float  #: from the nodal solver, which knows no series/parallel rule

    @property
    def parts(self) -> int:
        return self.found.parts

    @property
    def network(self) -> Network:
        return self.found.network

    @property
    def value_ohms(self) -> float:
        return self.found.value_ohms

    @property
    def error(self) -> float:
        """Signed relative error, value / target − 1."""
        return self.found.error

    @property
    def components(self) -> tuple[Part, ...]:
        """Every part with its stock line, in the order the parts appear in ``expression``."""
        return tuple(parts_in_order(self.network))

    def _repr_svg_(self) -> str | None:
        """The schematic, for Jupyter (see "Notebook display" at the end of this module)."""
        return _shown(self, "svg")


@dataclass(frozen=True, slots=True)
class FrontierEntry:
    """A frontier row whose networks have passed the nodal check."""

    row: FrontierRow  #: the search's row: proof, method, stress
    best: Candidate
    alternatives: tuple[Candidate, ...]

    @property
    def parts(self) -> int:
        return self.row.parts

    @property
    def proven(self) -> bool:
        """True when the exhaustive search showed no network of this many parts does better."""
        return self.row.proven

    @property
    def method(self) -> str:
        """"exhaustive" or the regular-array family that produced the row."""
        return self.row.method

    @property
    def stress(self) -> NetworkStress | None:
        """Per-part stress of ``best`` at the operating point (nodal), None without one."""
        return self.row.stress


@dataclass(frozen=True, slots=True)
class PickLine:
    """How many parts the chosen network takes from one stock line, and where they live."""

    line: StockItem  #: the stock line itself (value, ratings, tolerance, location)
    count: int

    @property
    def ohms(self) -> float:
        return self.line.ohms

    @property
    def location(self) -> str:
        return self.line.location


@dataclass(frozen=True, slots=True)
class Design:
    """The answer to one request: the frontier by part count and the recommended network."""

    target_ohms: float
    bin_name: str
    max_parts: int | None  #: None: as far as the operating point needs
    within: float | None
    frontier: tuple[FrontierEntry, ...]
    best: Candidate  #: the recommended network (see ``search.frontier.pick``)
    pick_list: tuple[PickLine, ...]
    review: Review  #: stress, bands, drift and cautions of ``best``
    point: OperatingPoint | None
    derating: Derating
    prefer: str
    bound: PartBound | None  #: lower bound on the part count at the operating point
    reach: Reach  #: the fewest parts that reach the target at all (None there: the whole bin cannot)
    within_met: bool | None  #: with ``within``: whether some row lands inside it
    part_limit: int  #: the largest part count searched
    exhaustive_parts: int  #: part counts up to this were searched exhaustively
    seconds: float

    def _repr_svg_(self) -> str | None:
        """The recommended network's schematic, for Jupyter (see "Notebook display" below)."""
        return _shown(self, "svg")

    def _repr_html_(self) -> str | None:
        """The schematic and the frontier table, for Jupyter (see "Notebook display" below)."""
        return _shown(self, "html")

    @property
    def value_parts(self) -> int:
        """The fewest parts that reach the target from the bin (the part limit when the bin cannot)."""
        return self.reach.parts if self.reach.parts is not None else self.part_limit


# ---------------------------------------------------------------- notebook display
#
# Jupyter shows a record through its _repr_svg_ / _repr_html_ methods. The drawing lives in
# netsynth.render, a layer above this module, which this module may not import, not even
# inside a function (tests/test_layering.py counts those imports too). So the render layer
# hands its functions down instead: importing netsynth.render.notebook calls set_display.
# Until then the methods return None, which IPython reads as "no such form" and shows the repr.

#: ("svg" or "html", record type) -> the function that shows such a record in that form
_DISPLAY: dict[tuple[str, type], Callable[[object], str]] = {}


def set_display(form: str, kind: type, show: Callable[[object], str]) -> None:
    """Register `show` as the way to show records of type `kind` in `form` ("svg" or "html")."""
    _DISPLAY[(form, kind)] = show


def _shown(record: object, form: str) -> str | None:
    show = _DISPLAY.get((form, type(record)))
    return None if show is None else show(record)
