"""Hypothesis strategies: resistances, networks."""

from __future__ import annotations

from hypothesis import strategies as st

from netsynth.network import Network, Part, parallel, part_count, series
from netsynth.stock import StockItem

#: log-uniform-ish resistances from 1 mΩ to 10 MΩ with at most 4 significant digits
ohms = st.builds(
    lambda mantissa, exp: float(f"{mantissa}e{exp}"),
    st.integers(10, 9999),
    st.integers(-6, 4),
)


def networks(max_leaves: int = 12) -> st.SearchStrategy[Network]:
    """Random series/parallel trees of Parts."""
    return st.recursive(
        ohms.map(Part),
        lambda kids: st.one_of(
            st.lists(kids, min_size=2, max_size=3).map(lambda ks: series(*ks)),
            st.lists(kids, min_size=2, max_size=3).map(lambda ks: parallel(*ks)),
        ),
        max_leaves=max_leaves,
    )


#: a few values drawn often, so that equal parts and equal sub-networks sit side by side
common_ohms = st.sampled_from([0.022, 0.47, 10.0, 12.0, 1000.0, 4700.0])


def _part_with_line(value: float, location: str | None) -> Part:
    return Part(value, None if location is None else StockItem(value, location=location))


#: parts, some tied to one of two stock lines of their value (same value, different drawer)
parts_with_lines = st.builds(_part_with_line, common_ohms | ohms, st.sampled_from([None, "A1", "B2"]))


def _join(join, runs: list[tuple[Network, int]]) -> Network:
    return join(*[child for child, count in runs for _ in range(count)])


def _runs(kids: st.SearchStrategy[Network]) -> st.SearchStrategy[list[tuple[Network, int]]]:
    """One to three children, each repeated 1 to 4 times side by side (10 000 parts at most: nested
    runs multiply, and a larger tree would be refused while it is built)."""
    return st.lists(st.tuples(kids, st.integers(1, 4)), min_size=1, max_size=3).filter(
        lambda runs: sum(part_count(k) * n for k, n in runs) <= 10_000)


def repeated_networks(max_leaves: int = 8, max_parts: int = 300) -> st.SearchStrategy[Network]:
    """Random series/parallel trees in which children repeat (runs of 1 to 4 equal copies).

    Parts may carry a stock line, so equal values can still be different parts.
    """
    return st.recursive(
        parts_with_lines,
        lambda kids: st.one_of(
            _runs(kids).map(lambda rs: _join(series, rs)),
            _runs(kids).map(lambda rs: _join(parallel, rs)),
        ),
        max_leaves=max_leaves,
    ).filter(lambda net: part_count(net) <= max_parts)
