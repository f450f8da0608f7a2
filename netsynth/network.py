"""Series/parallel resistor networks as immutable trees.

Map of the module
-----------------
``Part``, ``Series``, ``Parallel``
    The tree nodes. Build compound nodes with :func:`series` and :func:`parallel`:
    they flatten (no Series directly inside Series) and sort the children, so two
    networks that are the same circuit compare and hash equal.
:func:`fold`
    One bottom-up walk with a function per node kind; :func:`resistance`,
    :func:`part_count` and :func:`part_values` are folds.
:func:`to_text` / :func:`from_text`
    The text form. ``+`` joins parts in series and ``||`` (or ``∥``) in parallel;
    every compound child is wrapped in parentheses, so no precedence rule is needed:
    ``1k + (2k2 || 4k7)``. Mixing ``+`` and ``||`` at one level without
    parentheses is an error that says so.
:func:`to_netlist`
    Plain edges between numbered nodes (terminals 0 and 1) for the nodal solver,
    which knows nothing of series/parallel rules.

Formulas: series R = ΣRᵢ; parallel R = 1 / Σ(1/Rᵢ) (Ohm's and Kirchhoff's laws).
"""

from __future__ import annotations

import re
from collections.abc import Callable, Iterable
from dataclasses import dataclass
from fractions import Fraction
from typing import TypeVar, Union

from netsynth.errors import ValueParseError
from netsynth.nodal import Edge
from netsynth.values import parse_resistance, to_code

T = TypeVar("T")


@dataclass(frozen=True, slots=True)
class Part:
    """One resistor of ``ohms`` Ω."""

    ohms: float

    def __post_init__(self) -> None:
        if not (self.ohms > 0 and self.ohms != float("inf")):
            raise ValueParseError(f"ohms={self.ohms!r}: a part's resistance must be a finite value above zero")


@dataclass(frozen=True, slots=True)
class Series:
    """Children in series; build with :func:`series` to get the canonical form."""

    children: tuple[Network, ...]


@dataclass(frozen=True, slots=True)
class Parallel:
    """Children in parallel; build with :func:`parallel` to get the canonical form."""

    children: tuple[Network, ...]


Network = Union[Part, Series, Parallel]


def _sort_key(net: Network) -> tuple:
    if isinstance(net, Part):
        return (0, net.ohms)
    rank = 1 if isinstance(net, Series) else 2
    return (rank, len(net.children), tuple(_sort_key(c) for c in net.children))


def _combine(kind: type, nets: Iterable[Network | float]) -> Network:
    flat: list[Network] = []
    for net in nets:
        if isinstance(net, (int, float)):
            net = Part(float(net))
        if isinstance(net, kind):
            flat.extend(net.children)
        else:
            flat.append(net)
    if not flat:
        raise ValueParseError(f"a {kind.__name__.lower()} group needs at least one part")
    if len(flat) == 1:
        return flat[0]
    return kind(tuple(sorted(flat, key=_sort_key)))


def series(*nets: Network | float) -> Network:
    """Join networks (or plain ohms) in series, in canonical form.

    Examples
    --------
    >>> series(1000.0, series(220.0, 47.0)) == series(47.0, 220.0, 1000.0)
    True
    """
    return _combine(Series, nets)


def parallel(*nets: Network | float) -> Network:
    """Join networks (or plain ohms) in parallel, in canonical form."""
    return _combine(Parallel, nets)


def canonical(net: Network) -> Network:
    """The canonical form of any tree (flattened, children sorted)."""
    if isinstance(net, Part):
        return net
    kids = [canonical(c) for c in net.children]
    return series(*kids) if isinstance(net, Series) else parallel(*kids)


def fold(
    net: Network,
    part: Callable[[Part], T],
    series_of: Callable[[list[T]], T],
    parallel_of: Callable[[list[T]], T],
) -> T:
    """Fold the tree bottom-up with one function per node kind."""
    if isinstance(net, Part):
        return part(net)
    kids = [fold(c, part, series_of, parallel_of) for c in net.children]
    return series_of(kids) if isinstance(net, Series) else parallel_of(kids)


def resistance(net: Network) -> float:
    """Equivalent resistance in ohms: series ΣRᵢ, parallel 1/Σ(1/Rᵢ)."""
    return fold(net, lambda p: p.ohms, sum, lambda rs: 1.0 / sum(1.0 / r for r in rs))


def exact_resistance(net: Network) -> Fraction:
    """Equivalent resistance as an exact rational, each part read as the decimal it prints as."""
    return fold(
        net,
        lambda p: Fraction(repr(p.ohms)),
        sum,
        lambda rs: 1 / sum(1 / r for r in rs),
    )


def part_count(net: Network) -> int:
    """How many parts the network uses."""
    return fold(net, lambda p: 1, sum, sum)


def part_values(net: Network) -> tuple[float, ...]:
    """The ohms of every part, ascending."""
    return tuple(sorted(fold(net, lambda p: [p.ohms], _concat, _concat)))


def _concat(lists: list[list[float]]) -> list[float]:
    return [x for chunk in lists for x in chunk]


# ---------------------------------------------------------------- text form


def to_text(net: Network) -> str:
    """The text form: ``1k + (2k2 || 4k7)``; compound children always in parentheses."""
    if isinstance(net, Part):
        return to_code(net.ohms)
    joiner = " + " if isinstance(net, Series) else " || "
    return joiner.join(to_text(c) if isinstance(c, Part) else f"({to_text(c)})" for c in net.children)


_TOKEN = re.compile(r"\s*(\|\||∥|\+|\(|\))\s*")


def from_text(text: str) -> Network:
    """Read a network typed in the text form; values in any spelling ``parse_resistance`` reads.

    Raises
    ------
    ValueParseError
        On an unreadable value, unbalanced parentheses, an operator without a
        part beside it, or ``+`` and ``||`` mixed at one level.

    Examples
    --------
    >>> to_text(from_text("4.7k || (1k + 1k)"))
    '4k7 || (1k + 1k)'
    """
    source = text
    pieces = [p for p in _TOKEN.split(text) if p is not None and p.strip() != ""]
    pos = 0

    def fail(why: str) -> ValueParseError:
        return ValueParseError(f"cannot read network '{source}': {why}")

    def group() -> Network:
        nonlocal pos
        items = [operand()]
        op: str | None = None
        while pos < len(pieces) and pieces[pos] != ")":
            tok = "||" if pieces[pos] == "∥" else pieces[pos]
            if tok not in ("+", "||"):
                raise fail(f"expected '+' or '||' before '{tok}'")
            if op is not None and tok != op:
                raise fail("'+' and '||' are mixed at one level; add parentheses, e.g. 1k + (2k2 || 4k7)")
            op = tok
            pos += 1
            items.append(operand())
        if op is None:
            return items[0]
        return series(*items) if op == "+" else parallel(*items)

    def operand() -> Network:
        nonlocal pos
        if pos >= len(pieces):
            raise fail("a part is missing at the end")
        tok = pieces[pos]
        if tok == "(":
            pos += 1
            inner = group()
            if pos >= len(pieces) or pieces[pos] != ")":
                raise fail("a '(' is never closed")
            pos += 1
            return inner
        if tok in ("+", "||", "∥", ")"):
            raise fail(f"expected a part before '{tok}'")
        pos += 1
        return Part(parse_resistance(tok))

    if not pieces:
        raise fail("it is empty")
    net = group()
    if pos != len(pieces):
        raise fail("a ')' has no matching '('")
    return net


# ---------------------------------------------------------------- netlist


def to_netlist(net: Network) -> tuple[list[Edge], int]:
    """Edges between numbered nodes, terminals 0 and 1, plus the node count.

    Each part becomes one edge in the order of a depth-first walk, so
    ``edges[i]`` is the i-th part of ``fold``-order traversal (see :func:`parts_in_order`).
    """
    edges: list[Edge] = []
    count = 2

    def place(n: Network, a: int, b: int) -> None:
        nonlocal count
        if isinstance(n, Part):
            edges.append(Edge(a, b, n.ohms))
        elif isinstance(n, Parallel):
            for child in n.children:
                place(child, a, b)
        else:
            left = a
            for i, child in enumerate(n.children):
                if i == len(n.children) - 1:
                    right = b
                else:
                    right = count
                    count += 1
                place(child, left, right)
                left = right

    place(net, 0, 1)
    return edges, count


def parts_in_order(net: Network) -> list[Part]:
    """The parts in the same depth-first order as the edges of :func:`to_netlist`."""
    return fold(net, lambda p: [p], _concat, _concat)
