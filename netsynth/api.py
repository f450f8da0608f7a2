"""The one place that chains search → analysis → verification → results.

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

from netsynth.analysis.conditions import Derating, OperatingPoint
from netsynth.analysis.review import Review, review
from netsynth.analysis.stress import network_stress
from netsynth.design import Candidate, Design, FrontierEntry, PickLine
from netsynth.errors import ValueParseError
from netsynth.network import Network, from_text, part_count, part_values, resistance, to_netlist, to_text
from netsynth.nodal import VERIFY_RTOL, verify_resistance
from netsynth.search.exact import Found
from netsynth.search.frontier import Preference, pick, search_frontier
from netsynth.stock import StockBin, default_bin
from netsynth.values import parse_resistance


def make(
    target: float | str,
    stock: StockBin | None = None,
    max_parts: int | None = None,
    within: float | None = None,
    alternatives: int = 3,
    on_progress: Callable[[str], None] | None = None,
    point: OperatingPoint | None = None,
    derating: Derating = Derating(),
    prefer: Preference = "error",
    spec: float | None = None,
    temp_c: float | None = None,
) -> Design:
    """Find the best series/parallel network for each part count, checked and verified.

    Parameters
    ----------
    target : ohms, or a value as people write it (``"3k37"``, ``"25m"``)
    stock : the bin to build from; the built-in default bin when None
    max_parts : the largest part count searched; None means 4 without an operating
        point and "as far as the physics needs" with one
    within : required accuracy as a fraction (0.001 = ±0.1 %): stop at the fewest
        parts that land inside it
    alternatives : runners-up listed per part count
    point : what the network sees (volts, amps or watts; duty; ambient); with it, no
        part may exceed its derated power or voltage limit
    derating : the margins applied to each part's ratings
    prefer : what ranks the recommended network first: ``error``, ``parts`` or ``headroom``
    spec : the builder's acceptance band (fraction) for the Monte Carlo yield
    temp_c : a temperature (°C) at which to report the value band

    Raises
    ------
    ValueParseError, InfeasibleError, VerificationError
    """
    target_ohms = parse_resistance(target) if isinstance(target, str) else float(target)
    if not (target_ohms > 0 and target_ohms != float("inf")):
        raise ValueParseError(f"target {target!r}: a target resistance must be a finite value above zero")
    stock = stock if stock is not None else default_bin()
    start = time.perf_counter()
    found = search_frontier(target_ohms, stock, max_parts, within, alternatives, on_progress, point, derating)
    frontier = tuple(
        FrontierEntry(
            best=checked(row.best, target_ohms),
            alternatives=tuple(checked(f, target_ohms) for f in row.alternatives),
            proven=row.proven,
            method=row.method,
            stress=network_stress(row.best.network, point, stock, derating) if point is not None else None,
        )
        for row in found.rows
    )
    chosen = pick(found.rows, prefer, within)
    entry = next(e for e in frontier if e.parts == chosen.parts)
    best = entry.best
    verdict = review(best.network, stock, point, derating, target_ohms, spec, temp_c, stress=entry.stress)
    seconds = time.perf_counter() - start
    return Design(
        target_ohms=target_ohms,
        bin_name=stock.name,
        max_parts=max_parts,
        within=within,
        frontier=frontier,
        best=best,
        pick_list=pick_list(best.network, stock),
        review=verdict,
        point=point,
        derating=derating,
        prefer=prefer,
        bound=found.bound,
        value_parts=found.value_parts,
        part_limit=found.limit,
        exhaustive_parts=found.exhaustive_parts,
        seconds=seconds,
    )


def check(
    network: Network | str,
    stock: StockBin | None = None,
    point: OperatingPoint | None = None,
    derating: Derating = Derating(),
    spec: float | None = None,
    temp_c: float | None = None,
    target: float | str | None = None,
) -> tuple[Candidate, Review]:
    """Analyse a network the user typed: value, nodal check, bands, drift, per-part stress.

    Parts are matched to ``stock`` (the default bin when None) by value for their
    ratings; values the bin does not hold get the bin defaults and are listed in
    ``Review.not_in_bin``.
    """
    net = from_text(network) if isinstance(network, str) else network
    stock = stock if stock is not None else default_bin()
    value = resistance(net)
    target_ohms = value if target is None else (parse_resistance(target) if isinstance(target, str) else float(target))
    candidate = checked(Found(net, value, value / target_ohms - 1.0, part_count(net)), target_ohms)
    return candidate, review(net, stock, point, derating, target_ohms, spec, temp_c)


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
