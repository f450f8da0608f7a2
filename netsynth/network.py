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
    parentheses is an error that says so. ``from_text`` also reads repeats,
    ``Ns(X)`` for N copies of X in series and ``Np(X)`` in parallel (``7p(7s(10))``),
    as :func:`netsynth.render.compact.compact` prints them; the grammar heads the
    text-form section below.
:func:`to_netlist`
    Plain edges between numbered nodes (terminals 0 and 1) for the nodal solver,
    which knows nothing of series/parallel rules.

Formulas: series R = ΣRᵢ; parallel R = 1 / Σ(1/Rᵢ) (Ohm's and Kirchhoff's laws).
"""

from __future__ import annotations

import math
import re
from collections.abc import Callable, Iterable
from dataclasses import dataclass
from fractions import Fraction
from typing import TypeVar, Union

from netsynth.errors import ValueParseError
from netsynth.nodal import Edge
from netsynth.stock import StockItem, bin_order
from netsynth.values import parse_resistance, to_code

T = TypeVar("T")


@dataclass(frozen=True, slots=True)
class Part:
    """One resistor of ``ohms`` Ω, and the stock line it is taken from.

    ``line`` is the bin's :class:`~netsynth.stock.StockItem` the part *is*: its ratings,
    tolerance, tcr and location travel with it to the stress check, the bands and the
    pick list. ``None`` for a part not yet tied to a bin (typed by the user, or a value
    network straight out of the search, before :func:`netsynth.search.lines.assign_lines`).
    """

    ohms: float
    line: StockItem | None = None

    def __post_init__(self) -> None:
        if not (self.ohms > 0 and self.ohms != float("inf")):
            raise ValueParseError(f"ohms={self.ohms!r}: a part's resistance must be a finite value above zero")
        if self.line is not None and not math.isclose(self.line.ohms, self.ohms, rel_tol=1e-12):
            raise ValueParseError(f"part of {self.ohms!r} Ω tied to a stock line of {self.line.ohms!r} Ω")


@dataclass(frozen=True, slots=True)
class Series:
    """Children in series; build with :func:`series` to get the canonical form."""

    children: tuple[Network, ...]


@dataclass(frozen=True, slots=True)
class Parallel:
    """Children in parallel; build with :func:`parallel` to get the canonical form."""

    children: tuple[Network, ...]


Network = Union[Part, Series, Parallel]


def _line_key(line: StockItem | None) -> tuple:
    return () if line is None else bin_order(line)


def _sort_key(net: Network) -> tuple:
    if isinstance(net, Part):
        return (0, net.ohms, _line_key(net.line))
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


def value_network(net: Network) -> Network:
    """The same circuit with every part's stock line dropped (values only)."""
    if isinstance(net, Part):
        return net if net.line is None else Part(net.ohms)
    kids = [value_network(c) for c in net.children]
    return series(*kids) if isinstance(net, Series) else parallel(*kids)


def part_values(net: Network) -> tuple[float, ...]:
    """The ohms of every part, ascending."""
    return tuple(sorted(fold(net, lambda p: [p.ohms], _concat, _concat)))


def _concat(lists: list[list[float]]) -> list[float]:
    return [x for chunk in lists for x in chunk]


# ---------------------------------------------------------------- text form
#
# Grammar of the text form (spaces between tokens are free; spaces inside a value such as
# ``4.7 kΩ`` are part of the value):
#
#     network := operand (op operand)*          the same op throughout one level
#     op      := "+" | "||" | "∥"               series | parallel
#     operand := value | repeat | "(" network ")"
#     repeat  := N "s(" network ")"             N copies of the network in series
#              | N "p(" network ")"             N copies of the network in parallel
#     N       := a whole number from 2 to MAX_TEXT_PARTS, written right before a lowercase s or p
#     value   := any spelling parse_resistance reads: 4k7, 4.7 kΩ, 0R47, R47, 10m
#
# to_text writes the full form, every part spelled out: ``1k + (2k2 || 4k7)``.
# netsynth.render.compact.compact writes repeats, ``10p(4s(10) + 5s(12))``; from_text reads
# both, so anything printed reads back to the same network. from_text refuses networks of
# more than MAX_TEXT_PARTS parts (repeats multiplied out) and parentheses nested deeper than
# MAX_TEXT_DEPTH, with one short line: the parser keeps its own stack and never recurses.

#: the most parts :func:`from_text` builds, repeats multiplied out (``10001p(1k)`` is refused)
MAX_TEXT_PARTS = 10_000
#: the deepest nesting of parentheses (a repeat's included) :func:`from_text` reads
MAX_TEXT_DEPTH = 100
#: the most characters of the input, and of one token, quoted in an error message
_QUOTE_TEXT, _QUOTE_TOKEN = 28, 12


def to_text(net: Network) -> str:
    """The text form: ``1k + (2k2 || 4k7)``; compound children always in parentheses."""
    if isinstance(net, Part):
        return to_code(net.ohms)
    joiner = " + " if isinstance(net, Series) else " || "
    return joiner.join(to_text(c) if isinstance(c, Part) else f"({to_text(c)})" for c in net.children)


_TOKEN = re.compile(r"\s*(\|\||∥|\+|\(|\))\s*")
_REPEAT = re.compile(r"(\d+)([sp])")
_OPERATORS = ("+", "||", "∥")
_EXPECTED = "a value (4k7, 0R47), a repeat (3s(1k), 3p(1k)), '+', '||' or a parenthesis"


def _quoted(text: str, limit: int) -> str:
    """`text` on one line, cut to `limit` characters with '...'."""
    flat = " ".join(text.split())
    return flat if len(flat) <= limit else flat[: limit - 3] + "..."


@dataclass(slots=True)
class _Level:
    """One open level of the parser: the operands read so far and what closes it."""

    items: list[Network]
    parts: int = 0
    op: str | None = None
    repeat: tuple[int, str] | None = None  #: (N, "s" or "p") for a level opened by ``Ns(`` / ``Np(``


def from_text(text: str) -> Network:
    """Read a network in the text form, full (``1k + 1k``) or with repeats (``2s(1k)``).

    The grammar is at the top of this section of the module. Values take any spelling
    ``parse_resistance`` reads. Parts carry no stock line.

    Raises
    ------
    ValueParseError
        One line, quoting at most about 40 characters of the input: on an unreadable
        value or token, unbalanced parentheses, an operator without a part beside it,
        ``+`` and ``||`` mixed at one level, a repeat count below 2, more than
        :data:`MAX_TEXT_PARTS` parts, or parentheses nested deeper than :data:`MAX_TEXT_DEPTH`.

    Examples
    --------
    >>> to_text(from_text("4.7k || (1k + 1k)"))
    '4k7 || (1k + 1k)'
    >>> to_text(from_text("470 + 2s(1k)"))
    '470 + 1k + 1k'
    >>> to_text(from_text("2p(2s(1k))"))
    '(1k + 1k) || (1k + 1k)'
    >>> from_text("1k + 7×10")
    Traceback (most recent call last):
    ...
    netsynth.errors.ValueParseError: cannot read network '1k + 7×10': '7×10' is not a value (4k7, 0R47), a repeat (3s(1k), 3p(1k)), '+', '||' or a parenthesis
    """

    def fail(why: str) -> ValueParseError:
        return ValueParseError(f"cannot read network '{_quoted(text, _QUOTE_TEXT)}': {why}")

    def tok_q(tok: str) -> str:
        return _quoted(tok, _QUOTE_TOKEN)

    too_many = f"more than {MAX_TEXT_PARTS} parts; netsynth reads networks of up to {MAX_TEXT_PARTS} parts"

    def value(tok: str) -> Part:
        try:
            return Part(parse_resistance(tok))
        except ValueParseError as e:
            reason = str(e).partition("': ")[2]
            if "expected a resistance" in reason or not reason or len(tok) > _QUOTE_TOKEN:
                raise fail(f"'{tok_q(tok)}' is not {_EXPECTED}") from None
            raise fail(f"'{tok_q(tok)}': {reason}") from None

    def close(level: _Level) -> tuple[Network, int]:
        net = level.items[0]
        if level.op is not None:
            net = series(*level.items) if level.op == "+" else parallel(*level.items)
        parts = level.parts
        if level.repeat is not None:
            n, kind = level.repeat
            parts *= n
            if parts > MAX_TEXT_PARTS:
                raise fail(too_many)
            net = series(*[net] * n) if kind == "s" else parallel(*[net] * n)
        return net, parts

    pieces = [p.strip() for p in _TOKEN.split(text) if p is not None and p.strip() != ""]
    if not pieces:
        raise fail("it is empty")
    stack = [_Level([])]
    want_operand = True
    i = 0
    while i < len(pieces):
        tok = pieces[i]
        level = stack[-1]
        # a level opens at '(' or at a token written right before one ('3s' of '3s(1k)')
        opens = tok == "(" or (tok not in (*_OPERATORS, ")") and i + 1 < len(pieces) and pieces[i + 1] == "(")
        if want_operand:
            if opens:
                repeat = None
                if tok != "(":
                    m = _REPEAT.fullmatch(tok)
                    if not m:
                        try:
                            parse_resistance(tok)
                        except ValueParseError:
                            raise fail(f"'{tok_q(tok)}(' is not a repeat; write Ns(X) for N of X in series, "
                                       "Np(X) in parallel") from None
                        raise fail("expected '+' or '||' before '('")
                    if len(m[1].lstrip("0")) > len(str(MAX_TEXT_PARTS)) or int(m[1]) > MAX_TEXT_PARTS:
                        raise fail(too_many)
                    if int(m[1]) < 2:
                        raise fail(f"'{tok_q(tok)}(': a repeat count is 2 or more")
                    repeat = (int(m[1]), m[2])
                    i += 1  # the '(' that belongs to the repeat
                if len(stack) > MAX_TEXT_DEPTH:
                    raise fail(f"parentheses nested more than {MAX_TEXT_DEPTH} deep")
                stack.append(_Level([], repeat=repeat))
            elif tok in (*_OPERATORS, ")"):
                raise fail(f"expected a part before '{tok}'")
            else:
                level.items.append(value(tok))
                level.parts += 1
                want_operand = False
        elif tok in _OPERATORS:
            op = "||" if tok == "∥" else tok
            if level.op is not None and op != level.op:
                raise fail("'+' and '||' are mixed at one level; add parentheses, e.g. 1k + (2k2 || 4k7)")
            level.op = op
            want_operand = True
        elif tok == ")":
            if len(stack) == 1:
                raise fail("a ')' has no matching '('")
            net, parts = close(stack.pop())
            stack[-1].items.append(net)
            stack[-1].parts += parts
        else:
            raise fail(f"expected '+' or '||' before '{tok_q(tok)}'")
        if stack[-1].parts > MAX_TEXT_PARTS:
            raise fail(too_many)
        i += 1
    if want_operand:
        raise fail("a part is missing at the end")
    if len(stack) > 1:
        raise fail("a '(' is never closed")
    return close(stack[0])[0]


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
