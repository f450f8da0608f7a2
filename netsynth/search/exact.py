"""Exact search: the best network of exactly n parts for a target, proven by exhaustion.

Method
------
Small tables hold every distinct network of up to ``h`` parts (:mod:`.tables`, by top
join). Larger networks are never listed; they are searched by meet-in-the-middle over
the top-level split. For a target T the search asks, for each part count n, two
questions: the largest value ≤ T (*floor*) and the smallest value ≥ T (*ceil*) among
n-part networks. The best network is the nearer of the two, because the relative error
is monotone in the value.

Both questions decompose exactly. A network of n parts is a series or a parallel node
``a ⊕ x`` with ``a`` its smallest child (the canonical split of :mod:`.tables`: a is not
an ⊕ node, has n₁ ≤ n/2 parts, and every child of x has at least n₁ parts, those of
exactly n₁ parts not smaller than a for series, not larger for parallel). Both joins
increase with x, so

* series: a + x ≤ T  ⇔  x ≤ T − a;
* parallel: ax/(a + x) ≤ T  ⇔  x ≤ 1/(1/T − 1/a) when a > T, and always when a ≤ T;

hence floor_n(T) = max over the splits and a of a ⊕ floor(T′(a)) over the x allowed,
and likewise for the ceil. When x has at most h parts that inner floor is one binary
search in a sorted table; otherwise the same rule recurses, vectorised over every row.

Pruning (each step keeps the answer exact)
------------------------------------------
* Target window: a series child must lie below the target (a + x > a), a parallel child
  above it (a ∥ x < a); of the rest only one *boundary* entry can matter: for series,
  the smallest a ≥ T gives the least a + min x (min x does not fall as a grows, since
  the children allowed in x only shrink); for parallel, the largest a ≤ T gives the
  largest a ∥ max x. With x of the same size as a (ordered pairs) the edges move to T/2
  and 2T (a + x ≥ 2a, a ∥ x ≤ a/2).
* Incumbent: the previous row's best with one part added or one part replaced by its
  nearest two-part network is a network of n parts; only values nearer than it (or than
  the runners-up asked for) can change the answer, so each row carries a window
  [L, U] and a branch is cut when no x could bring a ⊕ x into it (x lies between
  v_min/n₂ and n₂·v_max).
* Exact hit: a value equal to the target is proven best of its size; the remaining
  top-level splits are skipped once the runners-up asked for are in hand.

Stock limits
------------
The search first ignores the counts (every value as many times as needed). When its
best network takes no more of a value than the bin holds, it is also the best of the
limited bin (the limited networks are a subset): proven. Only otherwise does the
limited search run: every query row carries the bin values its ancestors took, a table
entry is taken only if the combined use stays within the bin (the scan steps past
entries that would overdraw a value), and since the boundary argument above relies on
x's choices not depending on a, a second pass there widens the boundary to every
entry that could still beat the best found (a ⊕ x lies beyond a).

Compiled recursion
------------------
Where :mod:`.kernel` was built, ``_family`` and ``_nodes`` above the tables run in C, one
row at a time, with the same splits, cuts and expressions, plus a window that narrows as
the row improves, and pairs taken x-first where fewer x than a matter (see ``_kernel.c``).
The two engines give the same values (tests/test_kernel.py); ``NETSYNTH_KERNEL=off``
picks this module's numpy code.

Cost model
----------
:meth:`ExactSearch.lookups` estimates the table look-ups from the bin's size alone,
before any table is built; a request above :func:`lookup_budget` is refused with the
largest part count that fits, and that count is always accepted (it is computed by
the same function).
"""

from __future__ import annotations

import heapq
import math
from collections import Counter
from collections.abc import Callable, Iterator
from dataclasses import dataclass

import numpy as np

from netsynth.errors import InfeasibleError
from netsynth.network import Network, Part, parallel, part_values, resistance, series
from netsynth.search import cache, kernel
from netsynth.search.tables import (
    KIND_ANY,
    KIND_PAR,
    KIND_SER,
    OP_PARALLEL,
    OP_SERIES,
    SAME_VALUE_RTOL,
    UNLIMITED,
    Level,
    Table,
    compatible,
    first_level,
    join_values,
)

#: query rows (targets × table entries) handled in one numpy step; bounds memory.
CHUNK_ROWS = 1_000_000
#: estimated table look-ups one search may need before it is refused as too long, in numpy:
#: measured 0.05 µs (E24, 6 parts) to 0.16 µs (E96, 5 parts) per look-up on the reference
#: 2-core machine, so 15–50 s at worst; typical targets hit an exact network early.
MAX_LOOKUPS = 300_000_000
#: the same with the compiled recursion (:mod:`.kernel`): measured 3 ns (E192, 5 parts) to 10 ns
#: (E24, 6 parts; E96, 5 parts) per estimated look-up on targets with no early exact hit, both
#: cores, so about 40 s at worst. Limited bins keep :data:`MAX_LOOKUPS`: their look-ups step past
#: parts that would overdraw (measured: E24 one of each, 6 parts, 2.4e8 estimated, 6 s at worst).
MAX_LOOKUPS_COMPILED = 4_000_000_000
#: the largest table level built (``any`` entries, estimated from the bin's size): a level
#: holds about twice that many entries over its three tables at 20 bytes each (measured: 5.25 M
#: on 169 values take 210 MB), so 12 million stay under 500 MB.
TABLE_BUDGET = 12_000_000
#: the largest table level built at all (estimated ``any`` entries): measured 113 bytes per entry at
#: the peak of building (5.25 M entries of 169 values: 596 MB), so about 1.4 GB; a search that needs
#: a larger one is refused whatever its look-ups (:data:`TOO_LARGE`)
TABLE_LIMIT = 12_000_000
#: the look-ups :func:`plan` reports for a search whose tables would exceed :data:`TABLE_LIMIT`
TOO_LARGE = 10**18
#: a table level is cached on disk from this many estimated entries on; smaller ones build
#: about as fast as a file opens (measured: 25 k entries in 2 ms, 395 k in 40 ms).
CACHE_FROM = 500_000
#: share of a table that survives the target-window cut at each level of the recursion, set
#: so the estimate meets measured look-ups for targets with no exact hit (estimate vs measured:
#: E24 5 parts 6.5 M vs 6.3 M; E96 5 parts 4.1e8 vs 4.7e8; E24 6 parts 2.4e8 vs 1.1e8).
PRUNED_SHARE = 0.45
#: runner-up candidates kept per top-level split (the closest; more only cost witness time).
KEEP_PER_SPLIT = 32
#: witnesses built while looking for a realisation of the best value within the stock.
STOCK_TRIES = 16

#: windows are widened by this much (relative to their edges) wherever they are carried to a child
#: or compared with a join: a window's edge moved to a child's by float arithmetic may round inwards
#: by a few ulps (more where 1/edge - 1/a cancels), and must not cut off a network that lands on
#: the edge itself. A wider window only prunes a little less, never wrongly.
WINDOW_SLACK = 1e-12
#: a witness whose tree computes to a value this far (relative) from the one the search reported
#: is ranked by its own value (see :func:`_ranked`); float noise of one value is far below it
WITNESS_RTOL = 1e-9
#: a relative error this small is an exact hit (a few units in the last place of float arithmetic)
EXACT = 1e-15

NEG, POS = -np.inf, np.inf


class _NoWitness(Exception):
    """A witness search found no network on the side asked for. Only a network that lands on the
    target to the last bit does that: the compiled recursion may see it from below (pairs taken
    x-first) and the witness, which takes them a-first, from above, or the other way round. The
    callers then take the other side; :func:`_ranked` ranks what they build by its own value."""


@dataclass(frozen=True, slots=True)
class Found:
    """One network the search found: its tree, value and signed relative error."""

    network: Network
    value_ohms: float
    error: float  # value / target - 1
    parts: int


def _other(op: int) -> int:
    return OP_PARALLEL if op == OP_SERIES else OP_SERIES


def estimated_sizes(values: int, h: int) -> dict[int, int]:
    """Upper estimates of the ``any`` table sizes of 1..h parts for a bin of ``values`` values.

    Two-part networks of distinct values are distinct up to rare coincidences (10 + 20 =
    15 + 15): v(v + 1) of them. Beyond that the canonical pairs of :mod:`.tables` are
    counted, and a level's distinct values are taken as 60 % of its pairs (measured:
    E24 169 values, 3 parts: 5.25 M distinct of 9.7 M pairs, 54 %).
    """
    sizes = {1: values}
    for n in range(2, h + 1):
        pairs = 0
        for n1 in range(1, n // 2 + 1):
            a = sizes[n1] if n1 == 1 else sizes[n1] // 2
            b = sizes[n - n1]
            pairs += 2 * (a * (a + 1) // 2 if n1 == n - n1 else a * b)
        sizes[n] = pairs if n == 2 else int(0.6 * pairs)
    return sizes


def lookup_budget(limited: bool) -> int:
    """The estimated look-ups a search may take: more when the compiled recursion will run it."""
    return MAX_LOOKUPS_COMPILED if kernel.enabled() and not limited else MAX_LOOKUPS


def plan(values: int, max_parts: int) -> tuple[int, int]:
    """(table depth h, estimated look-ups of the largest row) for a search of up to ``max_parts`` parts.

    h is at least max_parts // 2 (the smaller side of every split comes from a table) and
    grows while a deeper table stays within :data:`TABLE_BUDGET` and cuts the look-ups.
    """
    need = max(1, max_parts // 2)
    best = None
    for h in range(need, max(need, max_parts - 1) + 1):
        sizes = estimated_sizes(values, h)
        if sizes[h] > TABLE_BUDGET and h > need:
            break
        work = _lookups(sizes, h, max_parts, 1)
        cost = work + (sizes[h] * 20 if h > 2 else 0)  # an entry costs ~20 look-ups to build
        if best is None or cost < best[2]:
            best = (h, work, cost)
    assert best is not None
    return best[0], best[1] if estimated_sizes(values, best[0])[best[0]] <= TABLE_LIMIT else TOO_LARGE


def _lookups(sizes: dict[int, int], h: int, n: int, rows: float) -> int:
    """Look-ups for ``rows`` queries of n parts: one per row from a table, else the splits' rows."""
    if n <= h:
        return int(rows)
    total = 0.0
    for n1 in range(1, n // 2 + 1):
        a = sizes[n1] if n1 == 1 else sizes[n1] / 2
        share = PRUNED_SHARE / 2 if n1 == n - n1 else PRUNED_SHARE
        # both joins: the window keeps about PRUNED_SHARE of a for each
        total += 2 * _lookups(sizes, h, n - n1, rows * max(1.0, a * share))
    return int(total)


class ExactSearch:
    """Exhaustive search over the series/parallel networks of one bin.

    Parameters
    ----------
    values : array of ohms, the bin's distinct values (lines of one value pooled)
    counts : how many of each value the bin holds (None = as many as needed)
    max_parts : the largest part count that will be asked for
    table_parts : the largest table level to build (at least max_parts // 2); None: the cost
        model's choice. Only tests and benchmarks set it, to exercise every depth.

    Raises
    ------
    InfeasibleError
        When the cost model says the search would take too long; the message names the
        largest part count that fits, and asking for it is always accepted.

    Examples
    --------
    >>> s = ExactSearch([100.0, 220.0, 470.0], [None, None, None], 3)
    >>> f = s.best(2, 320.0)[0]
    >>> f.value_ohms, f.error
    (320.0, 0.0)
    """

    def __init__(self, values, counts, max_parts: int, table_parts: int | None = None) -> None:
        if max_parts < 1:
            raise InfeasibleError("the part count must be at least 1")
        pooled: dict[float, int | None] = {}
        for v, c in zip(values, counts):
            v = float(v)
            pooled[v] = None if c is None or pooled.get(v, 0) is None else pooled.get(v, 0) + c
        order = sorted(pooled)
        self.values = np.array(order, dtype=np.float64)
        self.counts = [pooled[v] for v in order]
        lim = np.array([UNLIMITED if c is None or c >= max_parts else c for c in self.counts], dtype=np.int64)
        self.limited = bool(np.any(lim < UNLIMITED))
        self.limits = lim if self.limited else None
        self.max_parts = max_parts
        self.h, work = plan(len(self.values), max_parts)
        budget = lookup_budget(self.limited)
        if work > budget:
            fits = max((n for n in range(1, max_parts) if plan(len(self.values), n)[1] <= budget), default=1)
            need = (f"tables of about {estimated_sizes(len(self.values), self.h)[self.h] / 1e6:.0f} million "
                    f"networks, too large to hold in memory" if work >= TOO_LARGE else
                    f"about {work:.1e} table look-ups, too many to finish in reasonable time")
            raise InfeasibleError(
                f"an exhaustive search for {max_parts} parts on a bin of {len(self.values)} values needs "
                f"{need}; ask for at most "
                f"{fits} parts (--max-parts {fits}) or use a smaller bin"
            )
        if table_parts is not None:
            if not max(1, max_parts // 2) <= table_parts:
                raise InfeasibleError(f"table_parts={table_parts!r}: at least max_parts // 2 = {max_parts // 2}")
            self.h = table_parts
        self.h = min(self.h, max_parts)
        self.free = _Engine(self.values, None, self.h)
        self._bound: _Engine | None = None
        self._memo: dict[tuple[int, float], Found] = {}

    @property
    def tables(self) -> dict[int, Table]:
        """The ``any`` table of each level built (1..h parts); on a limited bin, one entry per
        value and multiset, whose ``parts`` rows are what :meth:`bounds` takes as ``used``."""
        return {n: level.any for n, level in self._engine.levels.items()}

    @property
    def bound(self) -> _Engine:
        """The limited engine, built on first need (see "Stock limits")."""
        if self._bound is None:
            self._bound = _Engine(self.values, self.limits, self.h)
        return self._bound

    def lookups(self, n: int, targets: int = 1) -> int:
        """Table look-ups a search for n parts at ``targets`` targets will make (its cost model)."""
        return _lookups(estimated_sizes(len(self.values), self.h), self.h, n, targets)

    @property
    def _engine(self) -> _Engine:
        """The engine whose tables :attr:`tables`, :meth:`bounds` and :meth:`network_at` speak of."""
        return self.bound if self.limited else self.free

    def network_at(self, n: int, i: int) -> Network:
        """The tree of entry i of the n-part table (:attr:`tables`)."""
        return self._engine.network(n, KIND_ANY, i)

    def bounds(self, n: int, t: np.ndarray, used: np.ndarray | None = None) -> tuple[np.ndarray, np.ndarray]:
        """Floor and ceil values of n-part networks at each target in ``t`` (ohms), for callers that
        search many targets at once (the divider's arms).

        ``used`` (limited bins): per row, the bin-value indices already taken (rows of
        ``tables[m].parts``). ``-inf`` / ``+inf`` where no network lies on that side.
        """
        return self._engine.bounds_any(n, self._rows(t, used))

    def witness(self, n: int, t: np.ndarray, used: np.ndarray | None, side: int) -> Network:
        """A network of n parts whose value is :meth:`bounds`' floor (side -1) or ceil (+1) at ``t[0]``."""
        try:
            return self._engine.witness_any(n, self._rows(t, used), side)
        except _NoWitness:  # the value was seen from the other side (see _NoWitness)
            return self._engine.witness_any(n, self._rows(t, used), -side)

    def _rows(self, t, used) -> _Rows:
        t = np.asarray(t, dtype=np.float64)
        if self.limited:
            used = np.empty((len(t), 0), np.int16) if used is None else np.asarray(used, dtype=np.int16)
        else:
            used = None
        return _Rows(t, np.full(len(t), NEG), np.full(len(t), NEG), np.full(len(t), POS), used)

    # ------------------------------------------------------------ the search

    def best(self, n: int, target: float, alternatives: int = 0) -> list[Found]:
        """The best n-part network for ``target`` ohms, then up to ``alternatives`` runners-up.

        Runners-up have distinct values and are ranked by |error|; among them each
        top-level choice contributes its own best, so they are good alternatives,
        not a complete ranking of every network. Empty if the bin cannot make n parts.
        """
        target = float(target)
        if self.limited and None not in self.counts and n > sum(self.counts):  # type: ignore[arg-type]
            return []
        incumbent = self._incumbent(n, target)
        cands = self.free.candidates(n, target, alternatives, incumbent)
        if self.limited:
            cands = self._within_stock(n, target, alternatives, cands, incumbent)
        out = _ranked(cands, target, n, alternatives)
        if out:
            self._memo[(n, target)] = out[0]
        return out

    def _within_stock(self, n, target, alternatives, cands, incumbent):
        """The free search's candidates that respect the stock, if they include a proven best;
        else the limited search's (see "Stock limits")."""
        cands = sorted(cands, key=lambda c: abs(c[0] / target - 1.0))
        if not cands:
            return []
        floor_err = abs(cands[0][0] / target - 1.0)
        kept: list[tuple[float, Callable[[], Network]]] = []
        tries, proven = 0, False
        for value, make in cands:
            err = abs(value / target - 1.0)
            if not proven and err > floor_err * (1 + 1e-9) + 1e-15:
                break  # the free best value has no realisation within the stock among those tried
            if any(abs(value - v) <= SAME_VALUE_RTOL * value for v, _ in kept):
                continue  # this value already has a realisation within the stock
            tries += 1
            if tries > STOCK_TRIES + alternatives:
                break
            net = make()
            if self._fits(net):
                kept.append((value, lambda net=net: net))
                proven = True
                if len(kept) > alternatives:
                    return kept
        if proven:
            return kept
        return self.bound.candidates(n, target, alternatives, incumbent)

    def _fits(self, net: Network) -> bool:
        used = Counter(part_values(net))
        for v, c in used.items():
            i = int(np.searchsorted(self.values, v))
            if i >= len(self.values) or self.values[i] != v:
                return False
            if self.counts[i] is not None and c > self.counts[i]:
                return False
        return True

    def _incumbent(self, n: int, target: float) -> list[tuple[float, Network]]:
        """Networks of n parts built from the previous row's best (see "Pruning"): it with one
        part added, or with one part replaced by a nearest two-part network. Empty when
        the previous row is unknown or n parts come from a table anyway."""
        prev = self._memo.get((n - 1, target))
        if n <= self.h or prev is None:
            return []
        net = prev.network
        v = prev.value_ohms
        parts = self.free.levels[1].any.values
        options: list[Network] = []
        for x in _near(parts, target - v):
            options.append(series(net, Part(float(x))))
        g = 1.0 / target - 1.0 / v  # 0 where v is above the target by a rounding only
        if g > 0:
            for x in _near(parts, 1.0 / g):
                options.append(parallel(net, Part(float(x))))
        two = self.free.levels[2].any if 2 in self.free.levels else None
        for p in sorted(set(part_values(net))) if two is not None else ():
            for i in _near_index(two.values, p):
                options.append(_replace_one(net, p, self.free.network(2, KIND_ANY, i)))
        return [(resistance(o), o) for o in options if not self.limited or self._fits(o)]


def _near(values: np.ndarray, x: float) -> np.ndarray:
    if not x > 0:
        return values[:1]
    return values[_near_index(values, x)]


def _near_index(values: np.ndarray, x: float) -> list[int]:
    i = int(np.searchsorted(values, x))
    return [j for j in (i - 1, i) if 0 <= j < len(values)]


def _replace_one(net: Network, ohms: float, by: Network) -> Network:
    """``net`` with its first part of ``ohms`` replaced by ``by``."""
    done = [False]

    def walk(node: Network) -> Network:
        if isinstance(node, Part):
            if not done[0] and node.ohms == ohms:
                done[0] = True
                return by
            return node
        kids = [walk(c) for c in node.children]
        return series(*kids) if type(node).__name__ == "Series" else parallel(*kids)

    return walk(net)


def _ranked(cands, target: float, n: int, alternatives: int) -> list[Found]:
    """The best ``alternatives`` + 1 candidates of distinct values, nearest first.

    Each network is built and its value computed from the tree; that value, not the one the
    search reported, is what is ranked and returned. The two differ only where a network lands on
    the target to the last bit: the search may then have seen it from one side (a ⊕ x ≤ t) and its
    witness, whose partner target rounds the other way, from the other, and build a neighbour.
    """
    pending = [(abs(v / target - 1.0), i, v, make, False) for i, (v, make) in enumerate(cands)]
    heapq.heapify(pending)
    out: list[Found] = []
    seen: list[float] = []
    while pending and len(out) <= alternatives:
        _, i, value, make, built = heapq.heappop(pending)
        if any(abs(value - s) <= SAME_VALUE_RTOL * value for s in seen):
            continue
        if not built:
            net = make()
            real = resistance(net)
            if abs(real - value) > WITNESS_RTOL * value:  # rank it where it really lands
                heapq.heappush(pending, (abs(real / target - 1.0), i, real, lambda net=net: net, True))
                continue
            make = lambda net=net: net  # noqa: E731
        net = make()
        seen.append(value)
        out.append(Found(net, value, value / target - 1.0, n))
    return out


# ---------------------------------------------------------------------- the engine


@dataclass
class _Rows:
    """Query rows: target, bound on same-size children, window [L, U], values already taken."""

    t: np.ndarray
    bnd: np.ndarray  # series: a lower bound (-inf none); parallel: an upper bound (+inf none)
    L: np.ndarray
    U: np.ndarray
    used: np.ndarray | None  # int16 (R, u), limited engine only

    def take(self, rows: np.ndarray) -> _Rows:
        return _Rows(self.t[rows], self.bnd[rows], self.L[rows], self.U[rows],
                     None if self.used is None else self.used[rows])


class _Engine:
    """Tables and the pruned recursion over one bin; ``limits`` None: counts never bind."""

    def __init__(self, values: np.ndarray, limits: np.ndarray | None, h: int) -> None:
        self.values = values
        self.limits = limits
        self.levels: dict[int, Level] = {1: first_level(values, limits is not None)}
        sizes = estimated_sizes(len(values), h)
        for n in range(2, h + 1):
            self.levels[n] = cache.level(values, limits, n, self.levels, CACHE_FROM, sizes[n])
        self.h = h
        self.vmin, self.vmax = float(values[0]), float(values[-1])
        self.looked = 0  #: table look-ups made so far (to check the cost model)
        self._kernel_tables: tuple | None = None  # the tables as the compiled recursion takes them

    # ------------------------------------------------------------ witnesses

    def network(self, n: int, kind: int, i: int) -> Network:
        table = self.levels[n].table(kind)
        if n == 1:
            return Part(float(self.values[table.left[i]]))
        n1 = int(table.left_n[i])
        left = self.network(n1, int(table.left_kind[i]), int(table.left[i]))
        right = self.network(n - n1, int(table.right_kind[i]), int(table.right[i]))
        return series(left, right) if table.op[i] == OP_SERIES else parallel(left, right)

    # ------------------------------------------------------------ top level

    def candidates(self, n, target, alternatives, incumbent) -> list[tuple[float, Callable[[], Network]]]:
        """(value, builder) for the floor and ceil reached through each top-level choice."""
        t = np.array([target])
        if n <= self.h:
            return self._table_candidates(n, t)
        out: list[tuple[float, Callable[[], Network]]] = [(v, lambda net=net: net) for v, net in incumbent]
        for op in (OP_SERIES, OP_PARALLEL):
            for n1 in range(1, n // 2 + 1):
                errs = sorted(abs(v / target - 1.0) for v, _ in out)
                if errs and errs[0] <= EXACT and len(_distinct_values([v for v, _ in out])) > alternatives:
                    return out  # an exact hit is proven best of its size
                # only candidates nearer than the (alternatives + 1)-th distinct one matter
                e = _kth_distinct_error(out, target, alternatives)
                rows = _Rows(t, np.array([NEG if op == OP_SERIES else POS]),
                             np.array([target * (1 - e) if e < 1 else NEG]), np.array([target * (1 + e)]),
                             np.empty((1, 0), np.int16) if self.limits is not None else None)
                out.extend(self._split_candidates(op, n, n1, rows, target))
        return out

    def _table_candidates(self, n, t):
        table = self.levels[n].any
        used = np.empty((1, 0), np.int16) if self.limits is not None else None
        out = []
        lo_i = np.searchsorted(table.values, t, side="right") - 1
        hi_i = np.searchsorted(table.values, t, side="left")
        # a few entries each way give alternatives as well as the floor and ceil
        for idx, step in ((lo_i, -1), (hi_i, +1)):
            for _ in range(8):
                if used is not None:
                    idx = self._scan(table, idx, used, step, np.array([NEG if step < 0 else POS]))
                i = int(idx[0])
                if not 0 <= i < len(table):
                    break
                out.append((float(table.values[i]), lambda n=n, i=i: self.network(n, KIND_ANY, i)))
                idx = idx + step
        return out

    def _split_candidates(self, op, n, n1, rows: _Rows, target):
        lo = np.full(1, NEG)
        hi = np.full(1, POS)
        found = []
        for _, a_idx, a, clo, chi, sub in self._split(op, n, n1, 1, rows, lo, hi):
            for child, side in ((clo, -1), (chi, +1)):
                joined = _join(op, a, child, NEG if side < 0 else POS)
                idx = np.nonzero(np.isfinite(joined))[0]
                if idx.size == 0:
                    continue
                err = np.abs(joined[idx] / target - 1.0)
                keep = idx[np.argsort(err, kind="stable")[:KEEP_PER_SPLIT]]
                for j in keep:
                    found.append((float(joined[j]), self._builder(op, n, n1, int(a_idx[j]), sub.take(np.array([j])),
                                                                  side)))
            _reduce(op, lo, hi, np.zeros(len(a), np.intp), a, clo, chi)
        return found

    def _builder(self, op, n, n1, a_i, child: _Rows, side) -> Callable[[], Network]:
        def build() -> Network:
            left = self.network(n1, KIND_ANY if n1 == 1 else self._non_kind(op), a_i)
            try:
                right = self._witness_family(op, n - n1, n1, child, side)
            except _NoWitness:  # the value was seen from the other side (see _NoWitness)
                right = self._witness_family(op, n - n1, n1, child, -side)
            return series(left, right) if op == OP_SERIES else parallel(left, right)

        return build

    @staticmethod
    def _non_kind(op: int) -> int:
        """The table kind of the children an ``op`` node may have (:meth:`Level.non`)."""
        return KIND_PAR if op == OP_SERIES else KIND_SER

    def bounds_any(self, n: int, r: _Rows) -> tuple[np.ndarray, np.ndarray]:
        """Floor and ceil over every network of n parts."""
        if n <= self.h:
            return self._lookup(self.levels[n].any, OP_SERIES, r, bounded=False)
        lo, hi = self._nodes(OP_SERIES, n, 1, _unbounded(OP_PARALLEL, r))
        lo2, hi2 = self._nodes(OP_PARALLEL, n, 1, _unbounded(OP_SERIES, r))
        return np.maximum(lo, lo2), np.minimum(hi, hi2)

    def witness_any(self, n: int, r: _Rows, side: int) -> Network:
        """A network of n parts whose value is :meth:`bounds_any`'s floor or ceil (one row)."""
        if n <= self.h:
            table = self.levels[n].any
            return self.network(n, KIND_ANY, self._lookup_index(table, OP_SERIES, r, False, side))
        rs, rp = _unbounded(OP_PARALLEL, r), _unbounded(OP_SERIES, r)
        lo, hi = self._nodes(OP_SERIES, n, 1, rs)
        lo2, hi2 = self._nodes(OP_PARALLEL, n, 1, rp)
        par_better = (lo2[0] > lo[0]) if side < 0 else (hi2[0] < hi[0])
        if par_better:
            return self._witness_nodes(OP_PARALLEL, n, 1, rp, side)
        return self._witness_nodes(OP_SERIES, n, 1, rs, side)

    # ------------------------------------------------------------ the recursion

    def _family(self, op: int, n: int, m: int, r: _Rows) -> tuple[np.ndarray, np.ndarray]:
        """Floor and ceil over x of n parts that may follow an ⊕ child of m parts (module docstring):
        a non-⊕ network (not below/above the bound when n == m), or an ⊕ node of children ≥ m parts."""
        if n <= self.h:
            table = self.levels[n].non(op) if 2 * m > n else self.levels[n].any
            return self._lookup(table, op, r, bounded=n == m)
        if self._compiled():
            return self._kernel(0, op, n, m, r)
        if n == m:
            lo, hi = self._nodes(_other(op), n, 1, _bounded_rows(op, r))
            lo, hi = _bound_filter(op, r, lo, hi)
        else:
            lo, hi = self._nodes(_other(op), n, 1, _unbounded(op, r))
        if 2 * m <= n:
            lo2, hi2 = self._nodes(op, n, m, r)
            lo, hi = np.maximum(lo, lo2), np.minimum(hi, hi2)
        return lo, hi

    def _nodes(self, op: int, n: int, m: int, r: _Rows) -> tuple[np.ndarray, np.ndarray]:
        """Floor and ceil over ⊕ nodes of n parts whose children all have at least m parts."""
        if self._compiled():
            return self._kernel(1, op, n, m, r)
        lo = np.full(len(r.t), NEG)
        hi = np.full(len(r.t), POS)
        for n1 in range(m, n // 2 + 1):
            for rows, _, a, clo, chi, _ in self._split(op, n, n1, m, r, lo, hi):
                _reduce(op, lo, hi, rows, a, clo, chi)
        return lo, hi

    def _compiled(self) -> bool:
        """Whether the compiled recursion (:mod:`.kernel`) answers."""
        return kernel.enabled()

    def _kernel(self, what: int, op: int, n: int, m: int, r: _Rows) -> tuple[np.ndarray, np.ndarray]:
        if self._kernel_tables is None:
            self._kernel_tables = tuple(
                tuple(kernel.table_spec(t.values, t.parts) for t in (lv.ser, lv.par, lv.any))
                for lv in (self.levels[i] for i in range(1, self.h + 1))
            )
        lo, hi, looked = kernel.bounds(self._kernel_tables, self.vmin, self.vmax, what, op, n, m,
                                       r.t, r.bnd, r.L, r.U, self.limits, r.used)
        self.looked += looked
        return lo, hi

    def _split(self, op, n, n1, m, r: _Rows, lo, hi) -> Iterator:
        """Yield (row, a index, a, child floor, child ceil, child rows) over the a of one split.

        ``lo``/``hi`` are the callers' running results; the limited engine's second pass
        reads them after the first pass's chunks have been reduced into them.
        """
        n2 = n - n1
        table = self.levels[n1].non(op)
        vals = table.values
        size = len(vals)
        if size == 0:
            return
        same = n1 == n2
        c = 2.0 if same else 1.0
        bounded = n1 == m
        xmin, xmax = self.vmin / n2, self.vmax * n2
        if op == OP_SERIES:
            low = r.L - xmax - WINDOW_SLACK * np.abs(r.L)
            if bounded:
                low = np.maximum(low, r.bnd)
            start = np.searchsorted(vals, low, side="left")
            full = np.maximum(np.searchsorted(vals, r.t / c, side="left"), start)
            b = np.minimum(full, size - 1)
            least = vals[b] + np.maximum(xmin, vals[b] if same else 0.0)
            stop = full + ((full < size) & (least <= r.U + WINDOW_SLACK * np.abs(r.U)))
        else:
            with np.errstate(divide="ignore"):
                g = 1.0 / r.U - 1.0 / xmin - WINDOW_SLACK / r.U
                high = np.where(g > 0, 1.0 / np.where(g > 0, g, 1.0), POS)
            if bounded:
                high = np.minimum(high, r.bnd)
            stop = np.searchsorted(vals, high, side="right")
            full = np.minimum(np.searchsorted(vals, r.t * c, side="right"), stop)
            b = np.maximum(full - 1, 0)
            most = _par(vals[b], np.minimum(xmax, vals[b]) if same else xmax)
            start = full - ((full > 0) & (most >= r.L - WINDOW_SLACK * np.abs(r.L)))
        yield from self._expand(op, n1, n2, table, r, start, stop)
        if self.limits is None:
            return
        # second pass (limited engine): entries beyond the boundary that could still beat the best found
        if op == OP_SERIES:
            start2 = stop
            stop2 = np.maximum(np.searchsorted(vals, np.minimum(hi, r.U) / c, side="left"), start2)
        else:
            stop2 = start
            start2 = np.minimum(np.searchsorted(vals, np.maximum(lo, r.L) * c, side="right"), stop2)
        yield from self._expand(op, n1, n2, table, r, start2, stop2)

    def _expand(self, op, n1, n2, table: Table, r: _Rows, start, stop) -> Iterator:
        counts = np.maximum(stop - start, 0)
        total = int(counts.sum())
        if total == 0:
            return
        ends = np.cumsum(counts)
        begins = ends - counts
        # chunk boundaries at row edges, CHUNK_ROWS entries or more per chunk
        cuts = [0]
        while cuts[-1] < len(counts):
            # the rows whose entries end within CHUNK_ROWS of this chunk's first entry (at least one row)
            k = int(np.searchsorted(ends, begins[cuts[-1]] + CHUNK_ROWS, side="left")) + 1
            cuts.append(min(len(counts), max(k, cuts[-1] + 1)))
        for c0, c1 in zip(cuts[:-1], cuts[1:]):
            cnt = counts[c0:c1]
            m = int(cnt.sum())
            if m == 0:
                continue
            rows = np.repeat(np.arange(c0, c1), cnt)
            idx = start[rows] + (np.arange(m) - (begins[rows] - begins[c0]))
            sub_used = None
            if r.used is not None:
                fits = compatible(table.parts[idx], r.used[rows], self.limits)
                rows, idx = rows[fits], idx[fits]
                if len(rows) == 0:
                    continue
                sub_used = np.concatenate([r.used[rows], table.parts[idx]], axis=1)
            a = table.values[idx]
            t = r.t[rows]
            L, U = r.L[rows], r.U[rows]
            if op == OP_SERIES:
                sub = _Rows(t - a, a, L - a - WINDOW_SLACK * np.abs(L), U - a + WINDOW_SLACK * np.abs(U), sub_used)
            else:
                sub = _Rows(_child_target(op, t, a), a, _par_child(L, a, NEG, +1), _par_child(U, a, POS, -1), sub_used)
            clo, chi = self._family(op, n2, n1, sub)
            yield rows, idx, a, clo, chi, sub

    def _lookup(self, table: Table, op: int, r: _Rows, bounded: bool) -> tuple[np.ndarray, np.ndarray]:
        v = table.values
        size = len(v)
        self.looked += len(r.t)
        if size == 0:
            return np.full(len(r.t), NEG), np.full(len(r.t), POS)
        tf, tc = r.t, r.t
        if bounded:
            if op == OP_SERIES:
                tc = np.maximum(r.t, r.bnd)
            else:
                tf = np.minimum(r.t, r.bnd)
        ilo = np.searchsorted(v, tf, side="right") - 1
        ihi = np.searchsorted(v, tc, side="left")
        if r.used is not None:
            lo_stop, hi_stop = _scan_stops(op, r, bounded)
            ilo = self._scan(table, ilo, r.used, -1, lo_stop)
            ihi = self._scan(table, ihi, r.used, +1, hi_stop)
        lo = np.where(ilo >= 0, v[np.clip(ilo, 0, size - 1)], NEG)
        hi = np.where(ihi < size, v[np.clip(ihi, 0, size - 1)], POS)
        if bounded:
            return _bound_filter(op, r, lo, hi)
        return lo, hi

    def _lookup_index(self, table: Table, op: int, r: _Rows, bounded: bool, side: int) -> int:
        """Index of the entry :meth:`_lookup` reports on ``side`` for one row."""
        v = table.values
        tf, tc = r.t, r.t
        if bounded:
            if op == OP_SERIES:
                tc = np.maximum(r.t, r.bnd)
            else:
                tf = np.minimum(r.t, r.bnd)
        if side < 0:
            i = np.searchsorted(v, tf, side="right") - 1
            if r.used is not None:
                i = self._scan(table, i, r.used, -1, _scan_stops(op, r, bounded)[0])
        else:
            i = np.searchsorted(v, tc, side="left")
            if r.used is not None:
                i = self._scan(table, i, r.used, +1, _scan_stops(op, r, bounded)[1])
        return int(i[0])

    def _scan(self, table: Table, idx, used, step, stop_at) -> np.ndarray:
        """Move each index in direction ``step`` until its entry fits beside ``used``; give up
        (index off the table) once the value passes ``stop_at``, beyond which no entry matters."""
        idx = idx.copy()
        size = len(table)
        v = table.values
        todo = np.nonzero((idx >= 0) & (idx < size))[0]
        while todo.size:
            ok = compatible(table.parts[idx[todo]], used[todo], self.limits)
            todo = todo[~ok]
            idx[todo] += step
            todo = todo[(idx[todo] >= 0) & (idx[todo] < size)]  # off the table: no entry on that side
            past = (v[idx[todo]] < stop_at[todo]) if step < 0 else (v[idx[todo]] > stop_at[todo])
            idx[todo[past]] = -1 if step < 0 else size
            todo = todo[~past]
        return idx

    # ------------------------------------------------------------ witnesses

    def _witness_family(self, op: int, n: int, m: int, r: _Rows, side: int) -> Network:
        """A network of :meth:`_family` (one row) whose value is its floor (side -1) or ceil (+1)."""
        if n <= self.h:
            kind = self._non_kind(op) if 2 * m > n and n > 1 else KIND_ANY
            table = self.levels[n].table(kind)
            return self.network(n, kind, self._lookup_index(table, op, r, n == m, side))
        if n == m:
            rr = _bounded_rows(op, r)
            lo, hi = self._nodes(_other(op), n, 1, rr)
            lo, hi = _bound_filter(op, r, lo, hi)
        else:
            rr = _unbounded(op, r)
            lo, hi = self._nodes(_other(op), n, 1, rr)
        single = lo[0] if side < 0 else hi[0]
        if 2 * m <= n:
            lo2, hi2 = self._nodes(op, n, m, r)
            other = lo2[0] if side < 0 else hi2[0]
            if (side < 0 and other > single) or (side > 0 and other < single):
                return self._witness_nodes(op, n, m, r, side)
        if not np.isfinite(single):
            raise _NoWitness
        return self._witness_nodes(_other(op), n, 1, rr, side)

    def _witness_nodes(self, op: int, n: int, m: int, r: _Rows, side: int) -> Network:
        best_val, best = (NEG if side < 0 else POS), None
        lo = np.full(1, NEG)
        hi = np.full(1, POS)
        for n1 in range(m, n // 2 + 1):
            for _, a_idx, a, clo, chi, sub in self._split(op, n, n1, m, r, lo, hi):
                joined = _join(op, a, clo if side < 0 else chi, NEG if side < 0 else POS)
                j = int(np.argmax(joined) if side < 0 else np.argmin(joined))
                if (side < 0 and joined[j] > best_val) or (side > 0 and joined[j] < best_val):
                    best_val, best = joined[j], (n1, int(a_idx[j]), sub.take(np.array([j])))
                _reduce(op, lo, hi, np.zeros(len(a), np.intp), a, clo, chi)
        if best is None:
            raise _NoWitness
        n1, a_i, sub = best
        left = self.network(n1, KIND_ANY if n1 == 1 else self._non_kind(op), a_i)
        right = self._witness_family(op, n - n1, n1, sub, side)
        return series(left, right) if op == OP_SERIES else parallel(left, right)


# ---------------------------------------------------------------------- helpers


def _scan_stops(op: int, r: _Rows, bounded: bool) -> tuple[np.ndarray, np.ndarray]:
    """Where a limited look-up stops stepping down and up: past the window's edges (tightened by a
    same-size bound), widened by :data:`WINDOW_SLACK`."""
    lo = np.maximum(r.L, r.bnd) if bounded and op == OP_SERIES else r.L
    hi = np.minimum(r.U, r.bnd) if bounded and op == OP_PARALLEL else r.U
    return lo - WINDOW_SLACK * np.abs(lo), hi + WINDOW_SLACK * np.abs(hi)


def _bounded_rows(op: int, r: _Rows) -> _Rows:
    """Rows for the single-child family under a value bound: the ceil (series) or floor
    (parallel) is taken at the bound when the bound lies beyond the target."""
    t = np.maximum(r.t, r.bnd) if op == OP_SERIES else np.minimum(r.t, r.bnd)
    return _Rows(t, np.full(len(t), NEG if _other(op) == OP_SERIES else POS), r.L, r.U, r.used)


def _unbounded(op: int, r: _Rows) -> _Rows:
    return _Rows(r.t, np.full(len(r.t), NEG if _other(op) == OP_SERIES else POS), r.L, r.U, r.used)


def _bound_filter(op: int, r: _Rows, lo: np.ndarray, hi: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Drop a floor below a series bound, or a ceil above a parallel bound (and a side the bound rules out)."""
    if op == OP_SERIES:
        lo = np.where((lo >= r.bnd) & (r.bnd <= r.t), lo, NEG)
    else:
        hi = np.where((hi <= r.bnd) & (r.bnd >= r.t), hi, POS)
    return lo, hi


def _reduce(op, lo, hi, rows, a, clo, chi) -> None:
    """Fold a ⊕ child floor/ceil into the running per-row results (rows ascending)."""
    jl = _join(op, a, clo, NEG)
    jh = _join(op, a, chi, POS)
    if len(rows) == 0:
        return
    starts = np.flatnonzero(np.r_[True, rows[1:] != rows[:-1]])
    urows = rows[starts]
    lo[urows] = np.maximum(lo[urows], np.maximum.reduceat(jl, starts))
    hi[urows] = np.minimum(hi[urows], np.minimum.reduceat(jh, starts))


def _distinct_values(values: list[float]) -> list[float]:
    out: list[float] = []
    for v in sorted(values):
        if not out or v - out[-1] > SAME_VALUE_RTOL * v:
            out.append(v)
    return out


def _kth_distinct_error(cands, target: float, k: int) -> float:
    """The error of the (k + 1)-th nearest distinct candidate value (inf when fewer)."""
    errs = sorted((abs(v / target - 1.0), v) for v, _ in cands)
    seen: list[float] = []
    for e, v in errs:
        if any(abs(v - s) <= SAME_VALUE_RTOL * v for s in seen):
            continue
        seen.append(v)
        if len(seen) > k:
            # a hair of slack: a value at exactly this error is still collected
            return e * (1 + 1e-9) + 1e-15
    return math.inf


def _par(a, x):
    return a * x / (a + x)


def _par_child(edge: np.ndarray, a: np.ndarray, none: float, widen: int) -> np.ndarray:
    """The x at which a ∥ x equals ``edge`` (the window's edge for x); ``none`` where no x does.

    ``widen`` +1 moves a lower edge down, -1 an upper edge up, by :data:`WINDOW_SLACK` of the
    edge's conductance: 1/edge - 1/a cancels when a is near the edge, and a rounding there must not
    cut off an x that lands on the edge.
    """
    with np.errstate(divide="ignore", invalid="ignore"):
        g = 1.0 / edge - 1.0 / a + widen * WINDOW_SLACK / edge
        out = np.where(g > 0, 1.0 / np.where(g > 0, g, 1.0), POS)
    return np.where(np.isfinite(edge) & (edge > 0), out, none)


def _child_target(op: int, t: np.ndarray, a: np.ndarray) -> np.ndarray:
    """The target for x such that a ⊕ x lands on t (see the module docstring)."""
    if op == OP_SERIES:
        return t - a
    with np.errstate(divide="ignore"):
        g = 1.0 / t - 1.0 / a
        out = np.where(g > 0, 1.0 / np.where(g > 0, g, 1.0), POS)
    return np.where(t <= 0, t, out)


def _join(op: int, a: np.ndarray, x: np.ndarray, none: float) -> np.ndarray:
    """a ⊕ x, keeping ``none`` (±inf) where x is missing."""
    missing = ~np.isfinite(x)
    safe = np.where(missing, 1.0, x)
    return np.where(missing, none, join_values(op, a, safe))
