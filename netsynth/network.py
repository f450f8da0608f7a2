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

Limits (:mod:`netsynth.limits`): a part is 1 µΩ .. 1 TΩ; a tree holds at most
:data:`~netsynth.limits.MAX_PARTS` parts and :data:`~netsynth.limits.MAX_LEVELS` series/parallel
levels. Every node checks them when it is built (``Series`` and ``Parallel`` keep their part
count and depth, so the check is O(children)), so no tree beyond them exists and the
recursive walks of this module and of the renderers stay far below Python's recursion limit.
"""

from __future__ import annotations

import math
import re
from collections.abc import Callable, Iterable
import numbers
from dataclasses import dataclass, field
from fractions import Fraction
from typing import TypeVar, Union

from netsynth import limits
from netsynth.errors import ArgumentError, ValueParseError
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
        if isinstance(self.ohms, bool) or not isinstance(self.ohms, numbers.Real):
            raise ArgumentError(f"ohms={limits.excerpt(repr(self.ohms))}: a part's resistance is a number of ohms, "
                                f"not {type(self.ohms).__name__}")
        if not (self.ohms > 0 and self.ohms != float("inf")):
            raise ValueParseError(f"ohms={self.ohms!r}: a part's resistance must be a finite value above zero")
        if not limits.MIN_OHMS <= self.ohms <= limits.MAX_OHMS:
            raise ArgumentError(f"ohms={self.ohms!r}: a part's resistance must be from {limits.OHMS_RANGE}")
        if self.line is not None and not math.isclose(self.line.ohms, self.ohms, rel_tol=1e-12):
            raise ValueParseError(f"part of {self.ohms!r} Ω tied to a stock line of {self.line.ohms!r} Ω")


def _check_group(group: Series | Parallel) -> None:
    """Type-check a group's children and record its part count and depth, within the limits.

    Raises ArgumentError when the group would hold more than MAX_PARTS parts or nest deeper than
    MAX_LEVELS: the check is at the one place every tree is built, so no walk ever meets a
    deeper one (see the module docstring).
    """
    kind = type(group).__name__
    kids = group.children
    if not isinstance(kids, tuple) or not kids:
        raise ArgumentError(f"{kind}(children={limits.excerpt(repr(kids))}): expected a non-empty tuple of "
                            "networks; build groups with series() and parallel()")
    parts, deepest = 0, 0
    for kid in kids:
        if isinstance(kid, Part):
            parts += 1
        elif isinstance(kid, (Series, Parallel)):
            parts += kid.parts
            deepest = max(deepest, kid.levels)
        else:
            raise ArgumentError(f"{kind} child {limits.excerpt(repr(kid))}: expected a Part, Series or Parallel")
    if parts > limits.MAX_PARTS:
        raise ArgumentError(f"a network of {parts} parts: netsynth takes networks of up to {limits.MAX_PARTS} parts")
    if deepest + 1 > limits.MAX_LEVELS:
        raise ArgumentError(f"a network nested more than {limits.MAX_LEVELS} series/parallel levels deep: "
                            f"netsynth takes up to {limits.MAX_LEVELS}")
    object.__setattr__(group, "parts", parts)
    object.__setattr__(group, "levels", deepest + 1)


@dataclass(frozen=True, slots=True)
class Series:
    """Children in series; build with :func:`series` to get the canonical form.

    ``parts`` and ``levels`` (the part count and the depth, a part being level 0) are
    computed when the node is built; they take no part in equality or hashing.
    """

    children: tuple[Network, ...]
    parts: int = field(default=0, init=False, repr=False, compare=False)
    levels: int = field(default=0, init=False, repr=False, compare=False)

    def __post_init__(self) -> None:
        _check_group(self)


@dataclass(frozen=True, slots=True)
class Parallel:
    """Children in parallel; build with :func:`parallel` to get the canonical form.

    ``parts`` and ``levels`` as for :class:`Series`.
    """

    children: tuple[Network, ...]
    parts: int = field(default=0, init=False, repr=False, compare=False)
    levels: int = field(default=0, init=False, repr=False, compare=False)

    def __post_init__(self) -> None:
        _check_group(self)


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
    """How many parts the network uses (kept by each group when it is built)."""
    return 1 if isinstance(net, Part) else net.parts


def levels(net: Network) -> int:
    """Series/parallel levels of the tree: 0 for a part, one more than the deepest child for a group."""
    return 0 if isinstance(net, Part) else net.levels


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
MAX_TEXT_PARTS = limits.MAX_PARTS
#: the deepest nesting of parentheses (a repeat's included) :func:`from_text` reads; the tree it
#: builds may also have at most :data:`netsynth.limits.MAX_LEVELS` series/parallel levels
MAX_TEXT_DEPTH = limits.MAX_NESTING
#: the longest text :func:`from_text` reads, in characters
MAX_TEXT_CHARS = limits.MAX_EXPRESSION_CHARS
#: the most characters of the input, and of one token, quoted in an error message
_QUOTE_TEXT, _QUOTE_TOKEN = 28, 12


def to_text(net: Network) -> str:
    """The text form: ``1k + (2k2 || 4k7)``; compound children always in parentheses."""
    if isinstance(net, Part):
        return to_code(net.ohms)
    joiner = " + " if isinstance(net, Series) else " || "
    return joiner.join(to_text(c) if isinstance(c, Part) else f"({to_text(c)})" for c in net.children)


# the operators and parentheses; the pieces between them are stripped afterwards (a pattern that
# swallowed the spaces around an operator, \s*(...)\s*, would rescan a long run of spaces from
# every position in it: quadratic time on 200 000 spaces)
_TOKEN = re.compile(r"(\|\||∥|\+|\(|\))")
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
        :data:`MAX_TEXT_PARTS` parts, parentheses nested deeper than :data:`MAX_TEXT_DEPTH`
        (or a tree of more than :data:`netsynth.limits.MAX_LEVELS` levels), text longer than
        :data:`MAX_TEXT_CHARS`, or a value outside 1 µΩ .. 1 TΩ.

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
        parts = level.parts
        if level.repeat is not None:
            parts *= level.repeat[0]
            if parts > MAX_TEXT_PARTS:
                raise fail(too_many)
        try:
            if level.op is not None:
                net = series(*level.items) if level.op == "+" else parallel(*level.items)
            if level.repeat is not None:
                n, kind = level.repeat
                net = series(*[net] * n) if kind == "s" else parallel(*[net] * n)
        except ArgumentError as exc:  # the tree's own limits: parts are counted above, so its depth
            raise fail(f"nested more than {limits.MAX_LEVELS} series/parallel levels deep") from exc
        return net, parts

    if not isinstance(text, str):
        raise ValueParseError(f"cannot read a network from {type(text).__name__}: expected text such as "
                              "'1k + (2k2 || 4k7)'")
    if len(text) > MAX_TEXT_CHARS:
        raise fail(f"the text is {len(text)} characters long; netsynth reads networks of up to "
                   f"{MAX_TEXT_CHARS} characters")
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
