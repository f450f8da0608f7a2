"""Value tables: every distinct network of exactly n parts from a bin, sorted by value, by top join.

Canonical splits
----------------
A series/parallel network of n ≥ 2 parts is a series node or a parallel node. A series
node's children are never series nodes (nested series flatten), and likewise for
parallel. Write a series node as ``a + x`` with ``a`` its *smallest* child (fewest parts,
then the smallest value) and ``x`` the series of the other children; then ``a`` is a
non-series network of n₁ ≤ n/2 parts, and every child of ``x`` has at least n₁ parts
(those with exactly n₁ parts are not smaller than ``a``). Parallel nodes mirror this, with
the *largest* value first. Each level therefore keeps three tables:

* ``ser``: networks whose top is a series node (for n = 1, the parts);
* ``par``: networks whose top is a parallel node (for n = 1, the parts);
* ``any``: both, merged.

The series table of n parts is built from pairs (a from the n₁-part ``par`` table, x
from the (n − n₁)-part table that can hold x: ``par`` of the same size as an ordered pair
a ≤ x when n₁ = n − n₁, ``par`` when n − n₁ < 2n₁ (x cannot be a series node then),
``any`` otherwise). This covers every series node at least once, so the tables are
exhaustive, and it forms far fewer pairs than joining every pair of smaller tables.

What "distinct" means depends on the bin:

* every value unlimited (or counts too large to bind): one entry per distinct value, and
  no record of the parts (any realisation will do);
* some values limited: one entry per distinct (value, multiset of bin values), because
  two networks of equal value may differ in which parts they consume.

Values are merged as equal when they differ by less than :data:`SAME_VALUE_RTOL`
relative; the same rational reached by different float operations differs by a few
units in the last place (~1e-16), while distinct values of up to twenty equal parts
differ by more than 1e-10 relative (their numerators and denominators stay below the
Fibonacci number F(n+1), OEIS A048211 comments).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

#: two values closer than this (relative) are one value; see the module docstring.
SAME_VALUE_RTOL = 1e-12

OP_PART, OP_SERIES, OP_PARALLEL = 0, 1, 2
#: which table of a level an entry's child sits in
KIND_ANY, KIND_SER, KIND_PAR = 0, 1, 2

#: a value with no count, or a count at least this large, never limits a search.
UNLIMITED = np.iinfo(np.int32).max
#: pairs joined per numpy step while building a table; bounds the temporaries (about 50 MB).
BUILD_CHUNK = 2_000_000


@dataclass(frozen=True, eq=False)
class Table:
    """Distinct n-part networks of one kind, as parallel numpy arrays sorted by ``values``.

    Entry i is ``op[i]`` of entry ``left[i]`` of table ``left_kind[i]`` of the
    ``left_n[i]``-part level and entry ``right[i]`` of table ``right_kind[i]`` of the
    ``(n - left_n[i])``-part level; for n = 1, ``left[i]`` is the index of the bin value.
    ``parts`` (limited bins only) holds the bin-value indices of each entry, ascending.
    The provenance arrays are None in count-only tables (:func:`all_tables`).
    """

    n: int
    values: np.ndarray  # float64, ascending
    op: np.ndarray | None = None  # int8
    left_n: np.ndarray | None = None  # int8
    left_kind: np.ndarray | None = None  # int8
    left: np.ndarray | None = None  # int32
    right_kind: np.ndarray | None = None  # int8
    right: np.ndarray | None = None  # int32
    parts: np.ndarray | None = None  # int16 (len, n), limited bins only

    def __len__(self) -> int:
        return len(self.values)

    def arrays(self) -> dict[str, np.ndarray]:
        """The non-empty arrays by name (for the disk cache)."""
        names = ("values", "op", "left_n", "left_kind", "left", "right_kind", "right", "parts")
        return {k: getattr(self, k) for k in names if getattr(self, k) is not None}


@dataclass(frozen=True, eq=False)
class Level:
    """The three tables of n-part networks (see the module docstring)."""

    n: int
    ser: Table
    par: Table
    any: Table

    def table(self, kind: int) -> Table:
        return self.any if kind == KIND_ANY else self.ser if kind == KIND_SER else self.par

    def non(self, op: int) -> Table:
        """Networks whose top is not ``op``: the possible children of an ``op`` node."""
        return self.par if op == OP_SERIES else self.ser


def join_values(op: int, a: np.ndarray, b: np.ndarray) -> np.ndarray:
    """Series a + b, or parallel ab/(a + b), elementwise (ohms)."""
    if op == OP_SERIES:
        return a + b
    return (a * b) / (a + b)


def compatible(parts: np.ndarray, used: np.ndarray, limits: np.ndarray) -> np.ndarray:
    """Row-wise: may the parts of each row be taken when ``used`` are taken already?

    ``parts`` (R, n) and ``used`` (R, u) hold bin-value indices, -1 for none;
    ``limits`` holds each value's count. Only the new parts need checking: ``used``
    is within stock by construction.
    """
    ok = np.ones(len(parts), dtype=bool)
    allp = np.concatenate([parts, used], axis=1) if used.size else parts
    for j in range(parts.shape[1]):
        p = parts[:, j]
        taken = (allp == p[:, None]).sum(axis=1)
        ok &= (p < 0) | (taken <= limits[np.maximum(p, 0)])
    return ok


def first_level(values: np.ndarray, limited: bool) -> Level:
    """The one-part level: each bin value, sorted (the values are distinct)."""
    order = np.argsort(values, kind="stable")
    n = len(values)
    t = Table(
        n=1,
        values=np.ascontiguousarray(values[order], dtype=np.float64),
        op=np.zeros(n, dtype=np.int8),
        left_n=np.zeros(n, dtype=np.int8),
        left_kind=np.zeros(n, dtype=np.int8),
        left=order.astype(np.int32),
        right_kind=np.zeros(n, dtype=np.int8),
        right=np.full(n, -1, dtype=np.int32),
        parts=order.astype(np.int16)[:, None] if limited else None,
    )
    return Level(1, t, t, t)


def child_kind(op: int, n1: int, n2: int) -> int:
    """The table that holds x in ``a op x`` with a of n₁ parts the smallest child (module docstring)."""
    if n2 < 2 * n1:  # x has no room for two children of n₁ parts or more: it is one child
        return KIND_PAR if op == OP_SERIES else KIND_SER
    return KIND_ANY


def build_level(levels: dict[int, Level], n: int, limits: np.ndarray | None, witness: bool = True) -> Level:
    """The n-part level from the smaller ones; ``limits`` None means counts never bind.

    ``witness`` False keeps values only (for counting).
    """
    ser = _build_kind(levels, n, OP_SERIES, limits, witness)
    par = _build_kind(levels, n, OP_PARALLEL, limits, witness)
    return Level(n, ser, par, _merge(n, [ser, par], limits, witness))


def _build_kind(levels, n, op, limits, witness) -> Table:
    chunks: list[dict[str, np.ndarray]] = []
    for n1 in range(1, n // 2 + 1):
        n2 = n - n1
        ta = levels[n1].non(op)
        kind = child_kind(op, n1, n2)
        tb = levels[n2].table(kind)
        if n1 == n2:  # one table on both sides: ordered pairs only (a is the smaller child)
            ia, ib = np.triu_indices(len(ta))
            ia, ib = ia.astype(np.int32), ib.astype(np.int32)
            if op == OP_PARALLEL:  # parallel takes the larger child first
                ia, ib = ib, ia
            spans = [(ia, ib)]
        else:
            per = max(1, BUILD_CHUNK // max(1, len(tb)))
            spans = []
            for start in range(0, len(ta), per):
                stop = min(len(ta), start + per)
                ia = np.repeat(np.arange(start, stop, dtype=np.int32), len(tb))
                ib = np.tile(np.arange(len(tb), dtype=np.int32), stop - start)
                spans.append((ia, ib))
        left_kind = KIND_ANY if n1 == 1 else (KIND_PAR if op == OP_SERIES else KIND_SER)
        right_kind = KIND_ANY if n2 == 1 else kind
        for ia, ib in spans:
            parts = None
            if limits is not None:
                parts = np.concatenate([ta.parts[ia], tb.parts[ib]], axis=1)
                keep = compatible(parts, np.empty((len(parts), 0), dtype=np.int16), limits)
                ia, ib, parts = ia[keep], ib[keep], parts[keep]
                parts.sort(axis=1)
            vals = join_values(op, ta.values[ia], tb.values[ib])
            c = {"values": vals}
            if witness:
                c.update(op=np.full(len(vals), op, np.int8), left_n=np.full(len(vals), n1, np.int8),
                         left_kind=np.full(len(vals), left_kind, np.int8), left=ia,
                         right_kind=np.full(len(vals), right_kind, np.int8), right=ib)
            if parts is not None:
                c["parts"] = parts
            chunks.append(_distinct(c, limits is not None))
    return _merge(n, [Table(n, **c) for c in chunks], limits, witness)


def _merge(n: int, tables: list[Table], limits, witness) -> Table:
    """One sorted, de-duplicated table from several."""
    if not tables:
        return Table(n, np.empty(0), *(_empty_provenance() if witness else ()),
                     parts=np.empty((0, n), np.int16) if limits is not None else None)
    names = list(tables[0].arrays())
    merged = {k: np.concatenate([t.arrays()[k] for t in tables]) for k in names}
    return Table(n, **_distinct(merged, limits is not None))


def _empty_provenance():
    return (np.empty(0, np.int8), np.empty(0, np.int8), np.empty(0, np.int8), np.empty(0, np.int32),
            np.empty(0, np.int8), np.empty(0, np.int32))


def _distinct(arrays: dict[str, np.ndarray], limited: bool) -> dict[str, np.ndarray]:
    """One representative per distinct value (or value and multiset), sorted by value."""
    values = arrays["values"]
    if len(values) == 0:
        return arrays
    if not limited:
        if len(arrays) == 1:  # values only: sort in place, no index array
            v = np.sort(values)
            new = np.ones(len(v), dtype=bool)
            new[1:] = (v[1:] - v[:-1]) > SAME_VALUE_RTOL * v[1:]
            return {"values": v[new]}
        order = np.argsort(values, kind="stable")
        v = values[order]
        new = np.ones(len(v), dtype=bool)
        new[1:] = (v[1:] - v[:-1]) > SAME_VALUE_RTOL * v[1:]
        keep = order[new]
        return {k: a[keep] for k, a in arrays.items()}
    packed = _packed(arrays["parts"])
    order = np.lexsort((values, packed))  # by multiset, then by value
    v, p = values[order], packed[order]
    new = np.ones(len(v), dtype=bool)
    close = (v[1:] - v[:-1]) <= SAME_VALUE_RTOL * v[1:]
    new[1:] = ~((p[1:] == p[:-1]) & close)
    keep = order[new]
    keep = keep[np.argsort(values[keep], kind="stable")]
    return {k: a[keep] for k, a in arrays.items()}


def _packed(parts: np.ndarray) -> np.ndarray:
    """One integer per row naming its sorted multiset of bin values (exact while it fits 63 bits)."""
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


def all_tables(values, counts, n: int, witness: bool = False) -> list[Table]:
    """Tables (``any``) of 1..n parts with no size budget: for small bins and for counting.

    ``counts`` None (or a None entry) means as many as needed. ``witness`` False keeps
    the values only, which is what counting needs (a fifth of the memory).
    """
    vals = np.asarray(values, dtype=np.float64)
    if counts is None:
        counts = [None] * len(vals)
    lim = np.array([UNLIMITED if c is None or c >= n else c for c in counts], dtype=np.int64)
    limits = lim if np.any(lim < UNLIMITED) else None
    levels = {1: first_level(vals, limits is not None)}
    if not witness and limits is None:
        levels[1] = Level(1, *(Table(1, levels[1].any.values),) * 3)
    for m in range(2, n + 1):
        levels[m] = build_level(levels, m, limits, witness or limits is not None)
    return [levels[m].any for m in range(1, n + 1)]
