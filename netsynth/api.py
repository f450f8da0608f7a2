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

import dataclasses
import os
import time
from collections.abc import Callable

from netsynth.analysis.conditions import Derating, OperatingPoint
from netsynth.analysis.lines import assign_lines, value_key, value_pool
from netsynth.analysis.netlist import NetlistReview, review_netlist
from netsynth.analysis.review import Review, review
from netsynth.design import Candidate, Design, FrontierEntry, PickLine
from netsynth.errors import ArgumentError, StockError
from netsynth.inputs import as_bin, as_count, as_fraction, as_ohms, as_temp_c
from netsynth.network import (
    Network,
    Parallel,
    Part,
    Series,
    from_text,
    part_count,
    parts_in_order,
    resistance,
    to_netlist,
    to_text,
)
from netsynth.netlist import Netlist, read_netlist, topology
from netsynth.nodal import VERIFY_RTOL, verify_resistance
from netsynth.render import notebook  # noqa: F401  (registers the notebook display of results)
from netsynth.search.exact import Found
from netsynth.inputs import PREFERENCES, Preference
from netsynth.search.frontier import ENGINES, Engine, pick, search_frontier
from netsynth.stock import StockBin, StockItem, bin_order
from netsynth.values import to_code

#: runners-up per part count the API lists at most
MAX_ALTERNATIVES = 20


def make(
    target: float | str,
    stock: StockBin | str | None = None,
    max_parts: int | None = None,
    within: float | str | None = None,
    alternatives: int = 3,
    on_progress: Callable[[str], None] | None = None,
    point: OperatingPoint | None = None,
    derating: Derating = Derating(),
    prefer: Preference = "error",
    spec: float | str | None = None,
    temp_c: float | str | None = None,
    engine: Engine = "auto",
) -> Design:
    """Find the best series/parallel network for each part count, checked and verified.

    Parameters
    ----------
    target : ohms, or a value as people write it (``"3k37"``, ``"25m"``)
    stock : the bin to build from: a :class:`StockBin`, a bin file's path, or None for the
        built-in default bin
    max_parts : the largest part count searched; None means 4 (or as many as the target needs
        to be reached) without an operating point and "as far as the physics needs" with one
    within : required accuracy, a fraction (0.001) or text (``"0.1%"``, ``"50ppm"``): the answer
        is the fewest parts that land inside it
    alternatives : runners-up listed per part count (0..20)
    point : what the network sees (volts, amps or watts; duty; ambient); with it, no
        part may exceed its own stock line's derated power or voltage limit
    derating : the margins applied to each part's ratings
    prefer : what ranks the recommended network first: ``error``, ``parts`` or ``headroom``
    spec : the builder's acceptance band (fraction or text such as ``"1%"``) for the Monte Carlo yield
    temp_c : a temperature (°C) at which to report the value band
    engine : how part counts above the exhaustive range are searched: ``auto`` (arrays, and CP-SAT
        where its model stays small), ``arrays``, ``cpsat`` or ``exhaustive`` (no larger counts)

    Raises
    ------
    ArgumentError, ValueParseError
        A bad argument (names the parameter).
    StockError
        A bin file that cannot be read.
    InfeasibleError
        With an operating point, when no network of the parts allowed stays within its limits.
    VerificationError
        The nodal check disagrees (a bug; never shown as an answer).
    """
    target_ohms = as_ohms(target, "target")
    stock = as_bin(stock)
    max_parts = as_count(max_parts, "max_parts", 1, 400)
    within = as_fraction(within, "within")
    alternatives = as_count(alternatives, "alternatives", 0, MAX_ALTERNATIVES)
    spec = as_fraction(spec, "spec")
    temp_c = as_temp_c(temp_c, "temp_c")
    _check_conditions(point, derating, prefer)
    if engine not in ENGINES:
        raise ArgumentError(f"engine={engine!r}: choose one of {', '.join(ENGINES)}")
    start = time.perf_counter()
    found = search_frontier(target_ohms, stock, max_parts, within, alternatives, on_progress, point, derating,
                            engine=engine)
    frontier = tuple(
        FrontierEntry(
            row=row,
            best=checked(row.best, target_ohms),
            alternatives=tuple(checked(f, target_ohms) for f in row.alternatives),
        )
        for row in found.rows
    )
    chosen = pick(found.rows, prefer, within)
    entry = next(e for e in frontier if e.parts == chosen.parts)
    best = entry.best
    verdict = review(best.network, point, derating, target_ohms, spec, temp_c, stress=entry.stress)
    seconds = time.perf_counter() - start
    return Design(
        target_ohms=target_ohms,
        bin_name=stock.name,
        max_parts=max_parts,
        within=within,
        frontier=frontier,
        best=best,
        pick_list=pick_list(best.network),
        review=verdict,
        point=point,
        derating=derating,
        prefer=prefer,
        bound=found.bound,
        reach=found.reach,
        within_met=found.within_met,
        part_limit=found.limit,
        exhaustive_parts=found.exhaustive_parts,
        seconds=seconds,
    )


def _check_conditions(point: object, derating: object, prefer: object = "error") -> None:
    if point is not None and not isinstance(point, OperatingPoint):
        raise ArgumentError(f"point={point!r}: expected an OperatingPoint or None")
    if not isinstance(derating, Derating):
        raise ArgumentError(f"derating={derating!r}: expected a Derating")
    if prefer not in PREFERENCES:
        raise ArgumentError(f"prefer={prefer!r}: choose one of {', '.join(PREFERENCES)}")


def check(
    network: Network | str,
    stock: StockBin | str | None = None,
    point: OperatingPoint | None = None,
    derating: Derating = Derating(),
    spec: float | str | None = None,
    temp_c: float | str | None = None,
    target: float | str | None = None,
) -> tuple[Candidate, Review]:
    """Analyse a network the user typed: value, nodal check, bands, drift, per-part stress.

    Each part is tied to a line of ``stock`` (the default bin when None) of its value; where
    several lines share a value, the one that gives the most headroom at ``point`` (else the
    first in the bin's order). Values the bin does not hold get the bin defaults and are
    listed in ``Review.not_in_bin``; a network that takes more of a line than the bin holds
    gets a note.
    """
    net = _as_network(network)
    stock = as_bin(stock)
    spec = as_fraction(spec, "spec")
    temp_c = as_temp_c(temp_c, "temp_c")
    _check_conditions(point, derating)
    assigned = assign_lines(net, stock, point, derating, counts_bind=False, missing_ok=True)
    net = assigned.network
    value = resistance(net)
    target_ohms = value if target is None else as_ohms(target, "target")
    candidate = checked(Found(net, value, value / target_ohms - 1.0, part_count(net)), target_ohms)
    verdict = review(net, point, derating, target_ohms, spec, temp_c)
    short = tuple(
        f"the network takes {need} more of {to_code(line.ohms)} than the bin's line"
        + (f" at {line.location}" if line.location else "") + " holds"
        for line, need in assigned.short
    )
    if short:
        verdict = dataclasses.replace(verdict, notes=verdict.notes + short)
    return candidate, verdict


def _as_network(network: object) -> Network:
    """A network given as a tree or in its text form."""
    if isinstance(network, str):
        return from_text(network)
    if isinstance(network, (Part, Series, Parallel)):
        return network
    raise ArgumentError(f"network={network!r}: expected a network or its text form, e.g. '1k + (2k2 || 4k7)'")


def checked(found: Found, target_ohms: float) -> Candidate:
    """A search result with its value re-checked by the nodal solver.

    Raises VerificationError when the nodal value and the tree's value differ by
    more than VERIFY_RTOL.
    """
    value = resistance(found.network)
    edges, nodes = to_netlist(found.network)
    verified = verify_resistance(value, edges, nodes, rtol=VERIFY_RTOL)
    exact = dataclasses.replace(found, value_ohms=value, error=value / target_ohms - 1.0)
    return Candidate(found=exact, expression=to_text(found.network), verified_ohms=verified)


def pick_list(net: Network) -> tuple[PickLine, ...]:
    """Parts to take from the bin for ``net``, one entry per stock line, in the bin's order.

    Each part carries its line, so this only counts; parts tied to no line are left out.
    """
    counts: dict[StockItem, int] = {}
    for part in parts_in_order(net):
        if part.line is not None:
            counts[part.line] = counts.get(part.line, 0) + 1
    return tuple(PickLine(line, n) for line, n in sorted(counts.items(), key=lambda kv: bin_order(kv[0])))


def take_list(
    network: Network | str,
    stock: StockBin | str,
    point: OperatingPoint | None = None,
    derating: Derating = Derating(),
) -> tuple[PickLine, ...]:
    """The stock lines a built network takes from ``stock``, tied as :func:`make` ties them.

    Counts bind: each line gives at most what it holds. With ``point`` the lines are chosen for
    the most headroom (so a network found with an operating point takes the same lines it was
    checked with); without, in the bin's order.

    Raises
    ------
    StockError
        When the bin cannot supply the network: a value it does not hold, or more parts of a
        value than its lines hold together (naming the value, what is held and what is needed).
    """
    net = _as_network(network)
    stock = as_bin(stock)
    _check_conditions(point, derating)
    assigned = assign_lines(net, stock, point, derating)
    if assigned is None:
        values, counts = value_pool(stock)
        held = {value_key(v): c for v, c in zip(values, counts)}
        need: dict[float, int] = {}
        for part in parts_in_order(net):
            need[value_key(part.ohms)] = need.get(value_key(part.ohms), 0) + 1
        for key, n in sorted(need.items()):
            if key not in held:
                raise StockError(f"{stock.name} holds no {to_code(key)}; the network needs {n}")
            if held[key] is not None and held[key] < n:
                lines = "; ".join(f"line {i.line}" + (f" at {i.location}" if i.location else "") + f": {i.count}"
                                  for i in stock.items if value_key(i.ohms) == key)
                raise StockError(f"{stock.name} holds {held[key]} of {to_code(key)} ({lines}); the network takes "
                                 f"{n}; nothing was changed")
        raise StockError(f"{stock.name} cannot supply every part of the network")  # not reached: counts pooled
    return pick_list(assigned.network)


def check_netlist(
    netlist: str | os.PathLike | Netlist,
    between: tuple[str, str] | None = None,
    stock: StockBin | str | None = None,
    point: OperatingPoint | None = None,
    derating: Derating = Derating(),
    spec: float | str | None = None,
    temp_c: float | str | None = None,
    target: float | str | None = None,
) -> tuple[NetlistReview, Candidate | None, Review]:
    """Check a network read from a netlist (SPICE or edge list) between two named terminals.

    ``between`` defaults to the subcircuit's two ports. Every network, bridges included, gets the
    nodal analysis of :func:`netsynth.analysis.netlist.review_netlist` (per element: its line,
    share of the power, and whether it carries current). A series/parallel one also gets its
    ``+``/``||`` form and the usual :func:`check` of that form (the Candidate, and the Review the
    report shows); for any other the Review is the nodal one and the Candidate is None.

    Raises
    ------
    ValueParseError
        The file cannot be read (file, line and what is wrong).
    ArgumentError
        A terminal names no node, or no path of parts joins the two terminals.
    VerificationError
        The ``+``/``||`` form and the netlist's nodal solve disagree (a bug; never shown).
    """
    net = netlist if isinstance(netlist, Netlist) else read_netlist(netlist)
    a, b = between if between is not None else (None, None)
    topo = topology(net, a, b)
    stock = as_bin(stock)
    spec = as_fraction(spec, "spec")
    temp_c = as_temp_c(temp_c, "temp_c")
    target_ohms = None if target is None else as_ohms(target, "target")
    _check_conditions(point, derating)
    general = review_netlist(topo, stock, point, derating, target_ohms, spec, temp_c)
    if topo.network is None:
        return general, None, general.review
    candidate, verdict = check(topo.network, stock, point, derating, spec=spec, temp_c=temp_c, target=target)
    verify_resistance(candidate.value_ohms, list(topo.edges), len(topo.node_names), rtol=VERIFY_RTOL)
    return general, candidate, verdict
