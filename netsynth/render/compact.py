"""A short display form for networks of many parts (display only; not parsed back).

Repeated identical children are counted the way their values combine:
``7×10`` is seven 10 Ω parts in series (70 Ω) and ``10/7`` is seven in parallel
(about 1.43 Ω). ``(7×10)/7`` is seven strings of seven 10 Ω parts: 10 Ω.

>>> from netsynth.network import from_text
>>> compact(from_text("(10 + 10 + 10) || (10 + 10 + 10)"))
'(3×10)/2'
>>> compact(from_text("1k + 1k + 470"))
'470 + 2×1k'
"""

from __future__ import annotations

from itertools import groupby

from netsynth.network import Network, Part, Series
from netsynth.values import to_code

LEGEND = "k×R: k parts in series; R/k: k parts in parallel"


def compact(net: Network) -> str:
    """The network with repeated children counted (see the module docstring)."""
    if isinstance(net, Part):
        return to_code(net.ohms)
    in_series = isinstance(net, Series)
    pieces = []
    for child, group in groupby(net.children):
        k = len(list(group))
        text = compact(child)
        if not isinstance(child, Part):
            text = f"({text})"
        if k > 1:
            text = f"{k}×{text}" if in_series else f"{text}/{k}"
        pieces.append(text)
    return (" + " if in_series else " || ").join(pieces)


def is_compacted(net: Network) -> bool:
    """True when :func:`compact` differs from the plain text form (some child repeats)."""
    if isinstance(net, Part):
        return False
    kids = net.children
    return any(a == b for a, b in zip(kids, kids[1:])) or any(is_compacted(c) for c in kids)
