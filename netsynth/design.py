"""Result types of a search: candidates, the frontier, the pick list and the design.

Plain frozen records; built by :mod:`netsynth.api`, shown by :mod:`netsynth.render`.
"""

from __future__ import annotations

from dataclasses import dataclass

from netsynth.analysis.conditions import Derating, OperatingPoint
from netsynth.analysis.review import Review
from netsynth.analysis.stress import NetworkStress
from netsynth.network import Network
from netsynth.search.arrays import PartBound


@dataclass(frozen=True, slots=True)
class Candidate:
    """One network with its value, its error against the target, and its nodal check."""

    parts: int
    network: Network
    expression: str
    value_ohms: float
    error: float  #: signed relative error, value / target − 1
    verified_ohms: float  #: from the nodal solver, which knows no series/parallel rule


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
    """How many parts of one value the chosen network takes from the bin, and where they live."""

    ohms: float
    count: int
    location: str


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
    value_parts: int  #: the fewest parts that can reach the target from the bin's values
    part_limit: int  #: the largest part count searched
    exhaustive_parts: int  #: part counts up to this were searched exhaustively
    seconds: float
