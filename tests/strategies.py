"""Hypothesis strategies: resistances, networks."""

from __future__ import annotations

from hypothesis import strategies as st

from netsynth.network import Network, Part, parallel, series

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
