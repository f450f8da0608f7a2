"""Which stock line each part of a network is taken from.

The search works on values: two lines of one value (a ¼ W and a 1 W 10 Ω, or a 1 % and a
0.1 % 4k7) give the same resistance. This module ties each part of a value network to a
stock line, once, so that everything downstream (stress, bands, tempco, pick list, JSON)
reads the same line from the part itself.

Rule
----
* No line gives more parts than it holds (``count``), unless the caller says counts do not
  bind (``check`` of a network the user already built).
* With an operating point, the assignment maximises the network's headroom (the smallest
  over the parts of the factor the drive may grow, see :mod:`.stress`): for each value, the
  largest threshold ``h`` such that every part of that value can get a line whose headroom
  for that part is at least ``h``, found by bisection over the candidate thresholds with a
  bipartite b-matching (augmenting paths, Ford–Fulkerson) as the feasibility test.
* Otherwise, and among equally good choices, lines are taken in the bin's order (by value,
  then tolerance, power, voltage, tcr, max temperature, text). The bin sorts its lines, so the
  answer never depends on the order of the file's rows.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from netsynth.analysis.conditions import Derating, OperatingPoint
from netsynth.analysis.stress import NetworkLoad, PartLoad, network_load, part_stress
from netsynth.errors import ArgumentError
from netsynth.network import Network, Part, Series, parallel, parts_in_order, series
from netsynth.stock import StockBin, StockItem


def value_key(ohms: float) -> float:
    """Values equal to 12 significant digits are one value (float noise of '4k7' vs 4700)."""
    return float(f"{ohms:.12g}")


def usable_lines(stock: StockBin) -> dict[float, list[StockItem]]:
    """The bin's lines with parts on hand, by value, in bin order."""
    out: dict[float, list[StockItem]] = {}
    for item in stock.items:
        if item.count is None or item.count > 0:
            out.setdefault(value_key(item.ohms), []).append(item)
    return out


def value_pool(stock: StockBin) -> tuple[list[float], list[int | None]]:
    """The bin's distinct values, ascending, each with the parts its lines hold together
    (None: as many as needed). What the value search needs: lines of one value differ only
    in ratings, which :func:`assign_lines` settles afterwards."""
    values: list[float] = []
    counts: list[int | None] = []
    for lines in usable_lines(stock).values():
        held = [line.count for line in lines]
        values.append(lines[0].ohms)
        counts.append(None if None in held else sum(held))  # type: ignore[arg-type]
    return values, counts


@dataclass(frozen=True, slots=True)
class Assignment:
    """A network whose parts carry their stock lines, and how much of the bin it takes."""

    network: Network
    headroom: float | None  #: the network's headroom at the operating point (None without one)
    missing: tuple[float, ...]  #: values the bin does not hold (their parts have no line)
    short: tuple[tuple[StockItem, int], ...]  #: lines asked for more than they hold (only when counts do not bind)


def assign_lines(
    net: Network,
    stock: StockBin,
    point: OperatingPoint | None = None,
    derating: Derating = Derating(),
    *,
    counts_bind: bool = True,
    missing_ok: bool = False,
    load: NetworkLoad | None = None,
) -> Assignment | None:
    """Tie every part of ``net`` to a line of ``stock`` (see the module docstring).

    Returns None when the bin cannot supply the parts: a value it does not hold (unless
    ``missing_ok``), or more parts of a value than its lines hold together (when
    ``counts_bind``). With ``point``, the assignment of largest headroom is returned even
    if that headroom is below 1 (over a limit): the caller decides.

    Examples
    --------
    >>> from netsynth.network import from_text
    >>> from netsynth.stock import StockBin, StockItem
    >>> drawer = StockBin((StockItem(10.0, 2, location="A"), StockItem(10.0, 2, power_rating_w=1.0, location="B")))
    >>> a = assign_lines(from_text("10 || 10"), drawer, OperatingPoint(watts=0.8), Derating(1.0, 1.0))
    >>> [p.line.location for p in parts_in_order(a.network)], round(a.headroom, 6)
    (['B', 'B'], 2.5)
    """
    parts = parts_in_order(net)
    if point is not None and load is None:
        load = network_load(net, point)
    tied = tie_parts([p.ohms for p in parts], stock, point, derating, loads=None if load is None else load.parts,
                     counts_bind=counts_bind, missing_ok=missing_ok)
    if tied is None:
        return None
    chosen, worst, missing, short = tied
    return Assignment(_with_lines(net, iter(chosen)), worst, missing, short)


def tie_parts(
    values: Sequence[float],
    stock: StockBin,
    point: OperatingPoint | None = None,
    derating: Derating = Derating(),
    *,
    loads: Sequence[PartLoad] | None = None,
    counts_bind: bool = True,
    missing_ok: bool = False,
) -> tuple[list[StockItem | None], float | None, tuple[float, ...], tuple[tuple[StockItem, int], ...]] | None:
    """The rule of :func:`assign_lines` for any list of parts (a netlist's elements, a bridge).

    ``values[i]`` is part i's resistance and ``loads[i]`` (needed with ``point``) what it sees
    at the operating point. Returns (line of each part, None where the bin lacks the value;
    headroom; values not in the bin; lines asked for more than they hold), or None as
    :func:`assign_lines` does.
    """
    if point is not None and loads is None:
        raise ArgumentError("loads=None: with an operating point, give what each part sees (loads)")
    by_value = usable_lines(stock)
    positions: dict[float, list[int]] = {}
    for i, ohms in enumerate(values):
        positions.setdefault(value_key(ohms), []).append(i)
    chosen: list[StockItem | None] = [None] * len(values)
    missing: list[float] = []
    short: list[tuple[StockItem, int]] = []
    worst: float | None = None
    for key, where in positions.items():
        lines = by_value.get(key, [])
        if not lines:
            if not missing_ok:
                return None
            missing.append(values[where[0]])
            if point is not None:
                worst = _min(worst, min(part_stress(loads[i], StockItem(values[i]), False, point,
                                                    derating).headroom for i in where))
            continue
        caps = [len(where) if line.count is None else line.count for line in lines]
        if sum(caps) < len(where):
            if counts_bind:
                return None
            short += _shortfall(lines, caps, len(where))
            caps = [len(where)] * len(lines)
        if point is None:
            taken = _fill(len(where), caps)
        else:
            table = [[part_stress(loads[i], line, True, point, derating).headroom for line in lines] for i in where]
            taken, headroom = _bottleneck(table, caps)
            worst = _min(worst, headroom)
        for i, j in zip(where, taken):
            chosen[i] = lines[j]
    return chosen, worst, tuple(missing), tuple(short)


def _min(a: float | None, b: float) -> float:
    return b if a is None else min(a, b)


def _shortfall(lines: list[StockItem], caps: list[int], need: int) -> list[tuple[StockItem, int]]:
    """The last line of a value takes the parts the bin lacks (for the report)."""
    return [(lines[-1], need - sum(caps))]


def _fill(n: int, caps: Sequence[int]) -> list[int]:
    """n parts from lines in order, each up to its capacity."""
    out: list[int] = []
    for j, cap in enumerate(caps):
        out += [j] * min(cap, n - len(out))
    return out


def _bottleneck(table: list[list[float]], caps: list[int]) -> tuple[list[int], float]:
    """The assignment (part -> line index) maximising the smallest table[part][line]."""
    thresholds = sorted({h for row in table for h in row})
    best = _matching(table, caps, thresholds[0])  # the lowest threshold admits every pair
    lo, hi = 0, len(thresholds) - 1  # thresholds[lo] is feasible
    while lo < hi:
        mid = (lo + hi + 1) // 2
        found = _matching(table, caps, thresholds[mid])
        if found is not None:
            lo, best = mid, found
        else:
            hi = mid - 1
    assert best is not None
    return best, min(table[i][j] for i, j in enumerate(best))


def _matching(table: list[list[float]], caps: list[int], least: float) -> list[int] | None:
    """Each part a line with table[part][line] ≥ least, no line over its cap; None if impossible.

    Augmenting paths (Ford–Fulkerson for a bipartite b-matching); lines are tried in bin
    order, so the first lines are preferred. Each step of a path visits a new line, so the
    recursion is no deeper than the number of lines of one value.
    """
    n_lines = len(caps)
    holders: list[list[int]] = [[] for _ in range(n_lines)]
    match = [-1] * len(table)

    def take(p: int, j: int) -> None:
        if match[p] >= 0:
            holders[match[p]].remove(p)
        match[p] = j
        holders[j].append(p)

    def augment(p: int, seen: list[bool]) -> bool:
        for j in range(n_lines):
            if seen[j] or table[p][j] < least:
                continue
            seen[j] = True
            if len(holders[j]) < caps[j] or any(augment(q, seen) for q in list(holders[j])):
                take(p, j)
                return True
        return False

    for part in range(len(table)):
        if not augment(part, [False] * n_lines):
            return None
    return match


def _with_lines(net: Network, lines) -> Network:
    """The same tree with the i-th part (parts_in_order) tied to the i-th line (None: untied)."""
    if isinstance(net, Part):
        line = next(lines)
        return Part(net.ohms, line) if line is not None else Part(net.ohms)
    kids = [_with_lines(c, lines) for c in net.children]
    return series(*kids) if isinstance(net, Series) else parallel(*kids)

