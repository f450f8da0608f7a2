"""Exact search: the best network of exactly n parts for a target, proven by exhaustion.

Method
------
Small tables hold every distinct network of up to ``h`` parts (:mod:`.tables`).
Larger networks are never listed; they are searched by meet-in-the-middle over
the top-level split. For a target T the search asks, for each part count n, two
questions: the largest value ≤ T (*floor*) and the smallest value ≥ T (*ceil*)
among n-part networks. The best network is the nearer of the two, because the
relative error is monotone in the value.

Both questions decompose exactly. A network of n parts is ``a ⊕ x`` with a from
the n₁-part table and x an n₂-part network, ⊕ series or parallel, and both joins
increase with x. So

* series: a + x ≤ T  ⇔  x ≤ T − a;
* parallel: ax/(a + x) ≤ T  ⇔  x ≤ 1/(1/T − 1/a) when a > T, and always when a ≤ T;

hence floor_n(T) = max over n₁, ⊕ and a of a ⊕ floor_{n₂}(T′(a)), and likewise for the
ceil. When n₂ ≤ h the inner floor is one binary search in a sorted table; otherwise
the same rule recurses, vectorised over every a at once.

Stock limits ride along: every query row carries the stock lines its ancestors
took, and a table entry is taken only if the combined use stays within the bin
(the scan steps past entries that would overdraw a line).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

import numpy as np

from netsynth.errors import InfeasibleError
from netsynth.network import Network, Part, parallel, series
from netsynth.search.tables import (
    OP_PARALLEL,
    OP_SERIES,
    UNLIMITED,
    Table,
    build_table,
    estimated_size,
    first_table,
    join_values,
    compatible,
)

#: largest table (entries before de-duplication) built to speed up a search.
TABLE_BUDGET = 12_000_000
#: query rows (targets × table entries) handled in one numpy step; bounds memory.
CHUNK_ROWS = 2_000_000
#: table look-ups one search may need before it is refused as too long; at about
#: 0.15 µs per look-up on the reference 2-core machine this is about a minute.
MAX_LOOKUPS = 400_000_000

NEG, POS = -np.inf, np.inf


@dataclass(frozen=True, slots=True)
class Found:
    """One network the search found: its tree, value and signed relative error."""

    network: Network
    value_ohms: float
    error: float  # value / target - 1
    parts: int


class ExactSearch:
    """Exhaustive search over the series/parallel networks of one bin.

    Parameters
    ----------
    values : array of ohms, one per stock line
    counts : how many of each line the bin holds (None = as many as needed)
    max_parts : the largest part count that will be asked for
    """

    def __init__(self, values, counts, max_parts: int) -> None:
        if max_parts < 1:
            raise InfeasibleError("the part count must be at least 1")
        self.values = np.asarray(values, dtype=np.float64)
        lim = np.array([UNLIMITED if c is None or c >= max_parts else c for c in counts], dtype=np.int64)
        self.limited = bool(np.any(lim < UNLIMITED))
        self.limits = lim if self.limited else None
        self.max_parts = max_parts
        self.tables: dict[int, Table] = {1: first_table(self.values)}
        self._grow_tables()
        work = self.lookups(max_parts)
        if work > MAX_LOOKUPS:
            fits = max((n for n in range(1, max_parts) if self.lookups(n) <= MAX_LOOKUPS), default=1)
            raise InfeasibleError(
                f"an exhaustive search for {max_parts} parts on a bin of {len(self.values)} values needs about "
                f"{work:.1e} table look-ups, too many to finish in reasonable time; ask for at most "
                f"{fits} parts (--max-parts {fits}) or use a smaller bin"
            )

    def lookups(self, n: int, targets: int = 1) -> int:
        """Table look-ups a search for n parts at ``targets`` targets will make (its cost model)."""
        if n in self.tables:
            return targets
        return sum(
            2 * self.lookups(n - n1, targets * len(self.tables[n1])) if n1 in self.tables else 10**18
            for n1 in range(1, n // 2 + 1)
        )

    # ------------------------------------------------------------ tables

    def _grow_tables(self) -> None:
        k = self.max_parts
        need = k // 2  # the smaller side of every split must come from a table
        want = max(need, (k + 1) // 2 if k >= 5 else min(2, k - 1))
        n = 2
        while n <= k - 1:
            size = estimated_size(self.tables, n)
            if n > want and size > TABLE_BUDGET // 6:
                break
            if size > TABLE_BUDGET and n > need:
                break
            if size > 4 * TABLE_BUDGET:
                raise InfeasibleError(
                    f"an exhaustive search for {k} parts on a bin of {len(self.values)} values is too large "
                    f"for this machine; ask for fewer parts (--max-parts {k - 1}) or use a smaller bin"
                )
            self.tables[n] = build_table(self.tables, n, self.limits)
            n += 1
        self.h = max(self.tables)

    # ------------------------------------------------------------ bounds

    def _table_bounds(self, n: int, t: np.ndarray, used: np.ndarray | None) -> tuple[np.ndarray, np.ndarray]:
        table = self.tables[n]
        v = table.values
        size = len(v)
        if size == 0:
            return np.full(len(t), NEG), np.full(len(t), POS)
        ilo = np.searchsorted(v, t, side="right") - 1
        ihi = np.searchsorted(v, t, side="left")
        if used is not None:
            ilo = self._scan(table, ilo, used, -1)
            ihi = self._scan(table, ihi, used, +1)
        lo = np.where(ilo >= 0, v[np.clip(ilo, 0, size - 1)], NEG)
        hi = np.where(ihi < size, v[np.clip(ihi, 0, size - 1)], POS)
        return lo, hi

    def _scan(self, table: Table, idx: np.ndarray, used: np.ndarray, step: int) -> np.ndarray:
        """Move each index in direction ``step`` until its entry fits beside ``used``."""
        idx = idx.copy()
        size = len(table)
        todo = np.nonzero((idx >= 0) & (idx < size))[0]
        while todo.size:
            ok = compatible(table.parts[idx[todo]], used[todo], self.limits)
            todo = todo[~ok]
            idx[todo] += step
            todo = todo[(idx[todo] >= 0) & (idx[todo] < size)]
        return idx

    def bounds(self, n: int, t: np.ndarray, used: np.ndarray | None = None) -> tuple[np.ndarray, np.ndarray]:
        """Floor and ceil values of n-part networks at each target in ``t`` (ohms).

        ``-inf`` / ``+inf`` where no network lies on that side.
        """
        if self.limited and used is None:
            used = np.empty((len(t), 0), dtype=np.int32)
        if n in self.tables:
            return self._table_bounds(n, t, used)
        lo = np.full(len(t), NEG)
        hi = np.full(len(t), POS)
        for n1, op, rows, a_idx, clo, chi in self._expand(n, t, used):
            a = self.tables[n1].values[a_idx]
            rlo = _join(op, a, clo, NEG)
            rhi = _join(op, a, chi, POS)
            np.maximum.at(lo, rows, rlo)
            np.minimum.at(hi, rows, rhi)
        return lo, hi

    def _expand(self, n: int, t: np.ndarray, used: np.ndarray | None):
        """Yield (n₁, op, row, a index, child floor, child ceil) over every top-level split."""
        for n1 in range(1, n // 2 + 1):
            n2 = n - n1
            if n1 not in self.tables:
                raise InfeasibleError(f"no table of {n1}-part networks; ask for fewer parts")
            table = self.tables[n1]
            per_chunk = max(1, CHUNK_ROWS // max(1, len(t)))
            for start in range(0, len(table), per_chunk):
                a_idx = np.arange(start, min(len(table), start + per_chunk))
                rows = np.repeat(np.arange(len(t)), len(a_idx))
                aa = np.tile(a_idx, len(t))
                child_used = None
                if used is not None:
                    fits = compatible(table.parts[aa], used[rows], self.limits)
                    rows, aa = rows[fits], aa[fits]
                    child_used = np.concatenate([used[rows], table.parts[aa]], axis=1)
                a = table.values[aa]
                tt = t[rows]
                for op in (OP_SERIES, OP_PARALLEL):
                    ct = _child_target(op, tt, a)
                    clo, chi = self.bounds(n2, ct, child_used)
                    yield n1, op, rows, aa, clo, chi

    # ------------------------------------------------------------ witnesses

    def best(self, n: int, target: float, alternatives: int = 0) -> list[Found]:
        """The best n-part network for ``target`` ohms, then up to ``alternatives`` runners-up.

        Runners-up have distinct values and are ranked by |error|; among them each
        top-level choice contributes its own best, so they are good alternatives,
        not a complete ranking of every network. Empty if the bin cannot make n parts.
        """
        t = np.array([float(target)])
        used = np.empty((1, 0), dtype=np.int32) if self.limited else None
        cands = self._candidates(n, t, used)
        if not cands:
            return []
        cands.sort(key=lambda c: abs(c[0] / target - 1.0))
        out: list[Found] = []
        seen: list[float] = []
        for value, make in cands:
            if any(abs(value - s) <= 1e-12 * value for s in seen):
                continue
            seen.append(value)
            net = make()
            out.append(Found(net, value, value / target - 1.0, n))
            if len(out) > alternatives:
                break
        return out

    def _candidates(self, n: int, t: np.ndarray, used: np.ndarray | None) -> list[tuple[float, Callable[[], Network]]]:
        """(value, builder) for the floor and ceil reached through each top-level choice."""
        out: list[tuple[float, Callable[[], Network]]] = []
        if n in self.tables:
            table = self.tables[n]
            lo_i = np.searchsorted(table.values, t, side="right") - 1
            hi_i = np.searchsorted(table.values, t, side="left")
            # a few entries each way give alternatives as well as the floor and ceil
            for idx, step in ((lo_i, -1), (hi_i, +1)):
                for _ in range(8):
                    if used is not None:
                        idx = self._scan(table, idx, used, step)
                    i = int(idx[0])
                    if not 0 <= i < len(table):
                        break
                    out.append((float(table.values[i]), lambda n=n, i=i: self.network_at(n, i)))
                    idx = idx + step
            return out
        for n1, op, rows, aa, clo, chi in self._expand(n, t, used):
            a = self.tables[n1].values[aa]
            for child, side in ((clo, -1), (chi, +1)):
                joined = _join(op, a, child, NEG if side < 0 else POS)
                finite = np.isfinite(joined)
                # keep each a's result, the closest few dozen suffice for alternatives
                idx = np.nonzero(finite)[0]
                if idx.size == 0:
                    continue
                err = np.abs(joined[idx] / t[0] - 1.0)
                keep = idx[np.argsort(err, kind="stable")[:32]]
                for j in keep:
                    out.append((float(joined[j]), self._builder(n1, op, int(aa[j]), n - n1, t[0], side, used)))
        return out

    def _builder(self, n1, op, a_i, n2, target, side, used) -> Callable[[], Network]:
        def build() -> Network:
            table = self.tables[n1]
            child_t = _child_target(op, np.array([target]), table.values[[a_i]])
            child_used = None
            if used is not None:
                child_used = np.concatenate([used, table.parts[[a_i]]], axis=1)
            child = self._witness(n2, child_t, child_used, side)
            left = self.network_at(n1, a_i)
            return series(left, child) if op == OP_SERIES else parallel(left, child)

        return build

    def _witness(self, n: int, t: np.ndarray, used: np.ndarray | None, side: int) -> Network:
        """A network of n parts whose value is the floor (side -1) or ceil (+1) at t."""
        if n in self.tables:
            table = self.tables[n]
            i = np.searchsorted(table.values, t, side="right" if side < 0 else "left") - (1 if side < 0 else 0)
            if used is not None:
                i = self._scan(table, i, used, side)
            return self.network_at(n, int(i[0]))
        best_val, best = (NEG if side < 0 else POS), None
        for n1, op, rows, aa, clo, chi in self._expand(n, t, used):
            a = self.tables[n1].values[aa]
            joined = _join(op, a, clo if side < 0 else chi, NEG if side < 0 else POS)
            j = int(np.argmax(joined) if side < 0 else np.argmin(joined))
            if (side < 0 and joined[j] > best_val) or (side > 0 and joined[j] < best_val):
                best_val, best = joined[j], (n1, op, int(aa[j]))
        if best is None:
            raise AssertionError("witness asked for a side with no network")
        n1, op, a_i = best
        return self._builder(n1, op, a_i, n - n1, float(t[0]), side, used)()

    def network_at(self, n: int, i: int) -> Network:
        """The tree of entry i of the n-part table."""
        table = self.tables[n]
        if n == 1:
            return Part(float(self.values[table.left[i]]))
        n1 = int(table.left_n[i])
        left = self.network_at(n1, int(table.left[i]))
        right = self.network_at(n - n1, int(table.right[i]))
        return series(left, right) if table.op[i] == OP_SERIES else parallel(left, right)


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
