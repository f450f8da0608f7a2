"""Result types of a search: candidates, the frontier, the pick list and the design.

Plain frozen records; built by :mod:`netsynth.api`, shown by :mod:`netsynth.render`.
"""

from __future__ import annotations

from dataclasses import dataclass

from netsynth.network import Network


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
    max_parts: int
    within: float | None
    frontier: tuple[FrontierEntry, ...]
    best: Candidate  #: smallest |error| (fewest parts on ties); with ``within``, fewest parts inside it
    pick_list: tuple[PickLine, ...]
    seconds: float
