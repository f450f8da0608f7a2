"""The one place that chains search → verification → results.

>>> from netsynth import make, kit_bin
>>> design = make("3k37", kit_bin("E12", 100, 10_000), max_parts=2)
>>> design.best.expression
'680 + 2k7'

Every reported network carries ``verified_ohms`` from the independent nodal solver
(:mod:`netsynth.nodal`); a disagreement beyond :data:`netsynth.nodal.VERIFY_RTOL`
raises :class:`~netsynth.errors.VerificationError` instead of being shown.
"""

from __future__ import annotations

import time
from collections.abc import Callable

from netsynth.design import Candidate, Design, FrontierEntry, PickLine
from netsynth.errors import ValueParseError
from netsynth.network import Network, part_values, resistance, to_netlist, to_text
from netsynth.nodal import VERIFY_RTOL, verify_resistance
from netsynth.search.exact import Found
from netsynth.search.frontier import search_frontier
from netsynth.stock import StockBin, default_bin
from netsynth.values import parse_resistance


def make(
    target: float | str,
    stock: StockBin | None = None,
    max_parts: int = 4,
    within: float | None = None,
    alternatives: int = 3,
    on_progress: Callable[[str], None] | None = None,
) -> Design:
    """Find the best series/parallel network for each part count, proven and verified.

    Parameters
    ----------
    target : ohms, or a value as people write it (``"3k37"``, ``"25m"``)
    stock : the bin to build from; the built-in default bin when None
    max_parts : the largest part count searched (k)
    within : required accuracy as a fraction (0.001 = ±0.1 %): stop at the fewest
        parts that land inside it
    alternatives : runners-up listed per part count

    Raises
    ------
    ValueParseError, InfeasibleError, VerificationError
    """
    target_ohms = parse_resistance(target) if isinstance(target, str) else float(target)
    if not (target_ohms > 0 and target_ohms != float("inf")):
        raise ValueParseError(f"target {target!r}: a target resistance must be a finite value above zero")
    stock = stock if stock is not None else default_bin()
    start = time.perf_counter()
    rows = search_frontier(target_ohms, stock, max_parts, within, alternatives, on_progress)
    frontier = tuple(
        FrontierEntry(
            best=checked(row.best, target_ohms),
            alternatives=tuple(checked(f, target_ohms) for f in row.alternatives),
            proven=row.proven,
        )
        for row in rows
    )
    if within is not None:
        best = frontier[-1].best
    else:
        best = min((e.best for e in frontier), key=lambda c: (abs(c.error), c.parts))
    seconds = time.perf_counter() - start
    return Design(target_ohms, stock.name, max_parts, within, frontier, best, pick_list(best.network, stock), seconds)


def checked(found: Found, target_ohms: float) -> Candidate:
    """A search result with its value re-checked by the nodal solver.

    Raises VerificationError when the nodal value and the tree's value differ by
    more than VERIFY_RTOL.
    """
    value = resistance(found.network)
    edges, nodes = to_netlist(found.network)
    verified = verify_resistance(value, edges, nodes, rtol=VERIFY_RTOL)
    return Candidate(
        parts=found.parts,
        network=found.network,
        expression=to_text(found.network),
        value_ohms=value,
        error=value / target_ohms - 1.0,
        verified_ohms=verified,
    )


def pick_list(net: Network, stock: StockBin) -> tuple[PickLine, ...]:
    """Parts to take from the bin for ``net``, grouped by value, with their locations."""
    counts: dict[float, int] = {}
    for ohms in part_values(net):
        counts[ohms] = counts.get(ohms, 0) + 1
    lines = []
    for ohms, count in counts.items():
        item = stock.item_for(ohms)
        lines.append(PickLine(ohms, count, item.location if item is not None else ""))
    return tuple(lines)
