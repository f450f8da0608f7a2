"""A short display form for networks of many parts; ``network.from_text`` reads it back.

Notation
--------
Consecutive equal children (equal values and stock lines) are written once with a count:

``Ns(X)``
    N copies of X in series: ``7s(10)`` is seven 10 Ω parts in series (70 Ω).
``Np(X)``
    N copies of X in parallel: ``7p(10)`` is seven 10 Ω parts in parallel (about 1.43 Ω).

X is a part or any network in the text form and always sits inside the parentheses, so
repeats nest: ``7p(7s(10))`` is seven strings of seven 10 Ω parts (10 Ω), and
``10p(4s(10) + 5s(12))`` is ten strings of four 10 Ω and five 12 Ω parts. Everything else
is the full text form of :func:`netsynth.network.to_text`: ``+`` series, ``||`` parallel,
compound children in parentheses. A repeat is an operand like a part, so it needs no
parentheses of its own: ``470 + 2s(1k)``, ``1k || 3p(4k7)``.

The notation is plain ASCII; N is a whole number of 2 or more followed by a lowercase
``s`` or ``p`` and ``(``, so it reads neither as a value (``R1/4``) nor as a power rating
(``1/2``). Parts print as :func:`netsynth.values.to_code` writes them, ``0R47`` below 1 Ω.
``from_text(compact(n))`` is ``n`` without its stock lines, in canonical form.

>>> from netsynth.network import from_text
>>> compact(from_text("(10 + 10 + 10) || (10 + 10 + 10)"))
'2p(3s(10))'
>>> compact(from_text("1k + 1k + 470"))
'470 + 2s(1k)'
>>> compact(from_text("1k + (2k2 || 4k7)"))
'1k + (2k2 || 4k7)'
"""

from __future__ import annotations

from itertools import groupby

from netsynth.network import Network, Part, Series
from netsynth.values import to_code

LEGEND = "Ns(X): N of X in series; Np(X): N of X in parallel"


def compact(net: Network) -> str:
    """The network with consecutive equal children counted (see the module docstring)."""
    if isinstance(net, Part):
        return to_code(net.ohms)
    kind = "s" if isinstance(net, Series) else "p"
    pieces = []
    for child, group in groupby(net.children):
        k = len(list(group))
        text = compact(child)
        if k > 1:
            text = f"{k}{kind}({text})"
        elif not (isinstance(child, Part) or _one_repeat(child)):
            text = f"({text})"
        pieces.append(text)
    return (" + " if kind == "s" else " || ").join(pieces)


def _one_repeat(net: Network) -> bool:
    """True when :func:`compact` writes `net` as a single repeat group, ``Ns(X)`` or ``Np(X)``."""
    kids = getattr(net, "children", ())
    return len(kids) > 1 and all(c == kids[0] for c in kids)


def is_compacted(net: Network) -> bool:
    """True when :func:`compact` differs from the plain text form (some child repeats)."""
    if isinstance(net, Part):
        return False
    kids = net.children
    return any(a == b for a, b in zip(kids, kids[1:])) or any(is_compacted(c) for c in kids)
