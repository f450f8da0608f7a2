"""Value tables: every distinct network of exactly n parts from a bin, sorted by value.

A series/parallel network of n ≥ 2 parts always splits at its top level into two
networks of n₁ + n₂ = n parts joined in series or in parallel (take the first child
against the rest). So the table of n-part networks is the union, over n₁ ≤ n₂ and the
two joins, of every compatible pair from the smaller tables. This is exhaustive.

What "distinct" means depends on the bin:

* every stock line unlimited: one entry per distinct value (any realisation will do);
* some lines limited: one entry per distinct (value, multiset of stock lines), because
  two networks of equal value may differ in which parts they consume.

Values are merged as equal when they differ by less than :data:`SAME_VALUE_RTOL`
relative; the same rational reached by different float operations differs by a few
units in the last place (~1e-16), while distinct values of a dozen equal parts differ
by more than 1e-5 (their numerators and denominators stay below F(n+1), OEIS A048211).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

#: two values closer than this (relative) are one value; see the module docstring.
SAME_VALUE_RTOL = 1e-12

OP_PART, OP_SERIES, OP_PARALLEL = 0, 1, 2

#: a stock line with no count, or a count at least this large, never limits a search.
UNLIMITED = np.iinfo(np.int32).max


@dataclass(frozen=True, eq=False)
class Table:
    """All distinct n-part networks, as parallel numpy arrays sorted by ``values``.

    ``parts[i]`` holds the stock-line indices of entry i (ascending). Entry i was built
    as ``op[i]`` of entry ``left[i]`` of the ``left_n[i]``-part table and entry
    ``right[i]`` of the ``(n - left_n[i])``-part table; for n = 1, ``left[i]`` is the
    stock-line index.
    """

    n: int
    values: np.ndarray  # float64, ascending
    parts: np.ndarray  # int32, shape (len, n)
    op: np.ndarray  # int8
    left_n: np.ndarray  # int8
    left: np.ndarray  # int64
    right: np.ndarray  # int64

    def __len__(self) -> int:
        return len(self.values)


def join_values(op: int, a: np.ndarray, b: np.ndarray) -> np.ndarray:
    """Series a + b, or parallel ab/(a + b), elementwise (ohms)."""
    if op == OP_SERIES:
        return a + b
    return (a * b) / (a + b)


def compatible(parts: np.ndarray, used: np.ndarray, limits: np.ndarray) -> np.ndarray:
    """Row-wise: may the parts of each row be taken when ``used`` are taken already?

    ``parts`` (R, n) and ``used`` (R, u) hold stock-line indices, -1 for none;
    ``limits`` holds each line's count. Only the new parts need checking: ``used``
    is within stock by construction.
    """
    ok = np.ones(len(parts), dtype=bool)
    allp = np.concatenate([parts, used], axis=1) if used.size else parts
    for j in range(parts.shape[1]):
        p = parts[:, j]
        taken = (allp == p[:, None]).sum(axis=1)
        ok &= (p < 0) | (taken <= limits[np.maximum(p, 0)])
    return ok


def first_table(values: np.ndarray) -> Table:
    """The one-part table: each stock line, sorted by value."""
    order = np.argsort(values, kind="stable")
    n = len(values)
    return Table(
        n=1,
        values=values[order].astype(np.float64),
        parts=order.astype(np.int32)[:, None],
        op=np.full(n, OP_PART, dtype=np.int8),
        left_n=np.zeros(n, dtype=np.int8),
        left=order.astype(np.int64),
        right=np.full(n, -1, dtype=np.int64),
    )


def estimated_size(tables: dict[int, Table], n: int) -> int:
    """Entries before de-duplication if the n-part table were built from ``tables``."""
    total = 0
    for n1 in range(1, n // 2 + 1):
        a, b = len(tables[n1]), len(tables[n - n1])
        pairs = a * (a + 1) // 2 if n1 == n - n1 else a * b
        total += 2 * pairs
    return total


def build_table(tables: dict[int, Table], n: int, limits: np.ndarray | None) -> Table:
    """The n-part table from the smaller ones; ``limits`` None means an unlimited bin."""
    chunks: list[tuple[np.ndarray, ...]] = []
    for n1 in range(1, n // 2 + 1):
        n2 = n - n1
        ta, tb = tables[n1], tables[n2]
        if n1 == n2:
            ia, ib = np.triu_indices(len(ta))
        else:
            ia, ib = np.divmod(np.arange(len(ta) * len(tb), dtype=np.int64), len(tb))
        parts = np.concatenate([ta.parts[ia], tb.parts[ib]], axis=1)
        if limits is not None:
            keep = compatible(parts, np.empty((len(parts), 0), dtype=np.int32), limits)
            ia, ib, parts = ia[keep], ib[keep], parts[keep]
        parts.sort(axis=1)
        for op in (OP_SERIES, OP_PARALLEL):
            vals = join_values(op, ta.values[ia], tb.values[ib])
            chunks.append((vals, parts, np.full(len(vals), op, np.int8), np.full(len(vals), n1, np.int8), ia, ib))
    values = np.concatenate([c[0] for c in chunks])
    parts = np.concatenate([c[1] for c in chunks])
    op = np.concatenate([c[2] for c in chunks])
    left_n = np.concatenate([c[3] for c in chunks])
    left = np.concatenate([c[4] for c in chunks])
    right = np.concatenate([c[5] for c in chunks])
    keep = _distinct(values, parts if limits is not None else None)
    values, parts, op, left_n, left, right = (x[keep] for x in (values, parts, op, left_n, left, right))
    order = np.argsort(values, kind="stable")
    return Table(n, values[order], parts[order], op[order], left_n[order], left[order], right[order])


def _distinct(values: np.ndarray, parts: np.ndarray | None) -> np.ndarray:
    """Indices of one representative per distinct value (or per value and multiset)."""
    if parts is None:
        order = np.argsort(values, kind="stable")
        v = values[order]
        new = np.ones(len(v), dtype=bool)
        new[1:] = (v[1:] - v[:-1]) > SAME_VALUE_RTOL * v[1:]
        return order[new]
    packed = _packed(parts)
    order = np.lexsort((values, packed))  # by multiset, then by value
    v, p = values[order], packed[order]
    new = np.ones(len(v), dtype=bool)
    close = (v[1:] - v[:-1]) <= SAME_VALUE_RTOL * v[1:]
    new[1:] = ~((p[1:] == p[:-1]) & close)
    return order[new]


def _packed(parts: np.ndarray) -> np.ndarray:
    """One integer per row naming its sorted multiset of stock lines (exact while it fits 63 bits)."""
    width = parts.shape[1]
    bits = max(1, int(parts.max(initial=0)).bit_length() + 1) if parts.size else 1
    if bits * width > 63:
        # fall back to a row view: a unique id per distinct row
        _, ids = np.unique(parts, axis=0, return_inverse=True)
        return ids.ravel().astype(np.int64)
    out = np.zeros(len(parts), dtype=np.int64)
    for j in range(width):
        out = (out << bits) | (parts[:, j].astype(np.int64) + 1)
    return out


def distinct_value_count(tables: list[Table]) -> int:
    """How many distinct values the union of ``tables`` holds."""
    v = np.sort(np.concatenate([t.values for t in tables]))
    if len(v) == 0:
        return 0
    return int(1 + np.count_nonzero((v[1:] - v[:-1]) > SAME_VALUE_RTOL * v[1:]))


def all_tables(values, counts, n: int) -> list[Table]:
    """Tables of 1..n parts with no size budget: for small bins and for counting.

    ``counts`` None (or a None entry) means as many as needed.
    """
    vals = np.asarray(values, dtype=np.float64)
    if counts is None:
        counts = [None] * len(vals)
    lim = np.array([UNLIMITED if c is None or c >= n else c for c in counts], dtype=np.int64)
    limits = lim if np.any(lim < UNLIMITED) else None
    tables = {1: first_table(vals)}
    for m in range(2, n + 1):
        tables[m] = build_table(tables, m, limits)
    return [tables[m] for m in range(1, n + 1)]
