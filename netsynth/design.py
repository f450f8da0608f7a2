"""Result types of a search: candidates, the frontier, the pick list and the design.

Plain frozen records; built by :mod:`netsynth.api`, shown by :mod:`netsynth.render`.
"""

from __future__ import annotations

from dataclasses import dataclass

from netsynth.analysis.conditions import Derating, OperatingPoint
from netsynth.analysis.review import Review
from netsynth.analysis.stress import NetworkStress
from netsynth.network import Network, Part, parts_in_order
from netsynth.search.arrays import PartBound
from netsynth.search.frontier import Reach
from netsynth.stock import StockItem


@dataclass(frozen=True, slots=True)
class Candidate:
    """One network with its value, its error against the target, and its nodal check."""

    parts: int
    network: Network
    expression: str
    value_ohms: float
    error: float  #: signed relative error, value / target − 1
    verified_ohms: float  #: from the nodal solver, which knows no series/parallel rule

    @property
    def components(self) -> tuple[Part, ...]:
        """Every part with its stock line, in the order the parts appear in ``expression``."""
        return tuple(parts_in_order(self.network))


@dataclass(frozen=True, slots=True)
class FrontierEntry:
    """The best network of exactly ``parts`` parts and its runners-up."""

    best: Candidate
    alternatives: tuple[Candidate, ...]
    proven: bool  #: True when the exhaustive search showed no n-part network does better
    method: str = "exhaustive"  #: "exhaustive" or the regular-array family that produced it
    stress: NetworkStress | None = None  #: per-part stress at the operating point (nodal)

    @property
    def parts(self) -> int:
        return self.best.parts


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

    @property
    def value_parts(self) -> int:
        """The fewest parts that reach the target from the bin (the part limit when the bin cannot)."""
        return self.reach.parts if self.reach.parts is not None else self.part_limit
