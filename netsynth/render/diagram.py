"""Drawings of a series/parallel network: the layout plan, and the plan as text.

Map of the module
-----------------
:func:`plan`
    The network as a drawing sees it: runs of equal children collapsed into one block with
    a count, every part labelled with its value and, with an operating point, its power.
    The terminal drawing below and the SVG schematic (:mod:`netsynth.render.svg`) both draw
    this plan, so they always show the same blocks.
:func:`draw`
    The plan as lines of text between two terminals (``A`` and ``B``); ``ascii=True``
    draws with ``-``, ``+`` and ``|`` only.
:func:`draw_block`
    The same drawing without terminals: equal-width lines whose first line carries the wire.

Layout
------
Series children sit side by side on one wire; parallel children are stacked between two
rails. Every block is a list of equal-width lines; the wire enters at the left end of the
first line and leaves at its right end, so blocks compose by plain concatenation (series)
or stacking between rails (parallel) to any depth, and no two wires ever cross.
``1k + (2k2 || 4k7)``::

    A ──[1k]──┬─[2k2]─┬── B
              └─[4k7]─┘

**Repeats.** Children of one series or parallel group are sorted (canonical form), so
equal children (``==``: the same value *and* the same stock line) stand next to each other.
A run of :data:`MIN_RUN` or more of them is drawn once, with its count. In series, a brace
under the block; in parallel, the copies are a bank of their own whose bottom rail carries
the count (a run that is only part of a bank becomes a bank inside the bank). Up to four
copies are drawn out, since a reader takes in up to about four things at a glance without
counting ("subitizing", Kaufman et al., Am. J. Psychol. 62, 1949) and the person at the bench
then sees every part. A 20 × 8 array of 10 Ω (``20p(8s(10))``)::

    A ──┬─[10]─────────────────┬── B
        │ ╰─ ×8 in series ─╯   │
        └─ ×20 in parallel ────┘

Copies in a run carry the same current and voltage (a series run shares its current, a
parallel run its voltage), so the power shown for the drawn copy holds for every copy.

**Width.** A drawing aims to stay within :data:`WIDTH` columns. A series chain too wide for
the columns it has is folded onto several rows, its wire returning to the left under each
row and the last row's wire climbing back to the top on the right, so the folded chain is
again a block with the wire in and out on its first line and nests like any other::

    ─[1]──[2]──[3]──┐ ┌─
    ┌───────────────┘ │
    └─[4]──[5]────────┘

Every network is drawn (no "too large to draw" fallback): repeats keep regular arrays small
and folding keeps long chains narrow. Only a structure that cannot fold narrower (a single
label, or banks nested deeper than the width allows) makes lines longer than ``width``.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import Literal, Union

from netsynth.errors import ArgumentError
from netsynth.network import Network, Part, Series, part_count
from netsynth.values import to_code

#: the columns a terminal drawing aims to stay within (folding long chains to fit)
WIDTH = 100
#: the fewest equal neighbours drawn as one block with a count
MIN_RUN = 5
#: the narrowest a block is ever asked to be: below this, folding only makes it taller
MIN_BUDGET = 24

Kind = Literal["series", "parallel"]


# ---------------------------------------------------------------- the plan


@dataclass(frozen=True, slots=True)
class PlanPart:
    """One drawn resistor: its value code, its power label ("" without one) and its place in the parts."""

    value: str  #: ``to_code`` of the part's ohms, e.g. ``4k7``
    power: str  #: e.g. ``0.12W``; empty without an operating point
    index: int  #: position of the part in :func:`netsynth.network.parts_in_order`

    @property
    def label(self) -> str:
        """What the drawing prints for the part: ``4k7`` or ``4k7 0.12W``."""
        return f"{self.value} {self.power}" if self.power else self.value


@dataclass(frozen=True, slots=True)
class PlanGroup:
    """Blocks in series (side by side) or in parallel (stacked between rails)."""

    kind: Kind
    children: tuple[PlanNode, ...]


@dataclass(frozen=True, slots=True)
class PlanRun:
    """``count`` equal copies of ``block`` in series or in parallel, drawn once."""

    kind: Kind
    count: int
    block: PlanNode


PlanNode = Union[PlanPart, PlanGroup, PlanRun]


def power_label(watts: float, ascii: bool = False) -> str:
    """A part's power in a few characters: ``0.12W``, ``1.5W``, ``3.3mW``.

    Two significant digits below 1 W, three above (a drawing label, not a report; the
    stress table prints four).

    Examples
    --------
    >>> [power_label(w) for w in (0.125, 1.5, 12.25, 0.0033, 2500.0, 0.0, 4e-7, 1e-24)]
    ['0.12W', '1.5W', '12.2W', '3.3mW', '2.5kW', '0W', '0.4µW', '<10nW']
    """
    w = abs(float(watts))
    if w == 0:
        return "0W"
    if w >= 1000:
        return f"{w / 1e3:.3g}kW"
    if w >= 1:
        return f"{w:.3g}W"
    if w >= 0.01:
        return f"{w:.2g}W"
    if w >= 1e-5:
        return f"{w * 1e3:.2g}mW"
    if w >= 1e-8:
        return f"{w * 1e6:.2g}{'u' if ascii else 'µ'}W"
    return "<10nW"  # below what any part's dissipation means on a drawing


def plan(net: Network, watts: Sequence[float] | None = None, ascii: bool = False) -> PlanNode:
    """The network as drawn: runs of :data:`MIN_RUN` or more equal children collapsed.

    Parameters
    ----------
    net : Network
        The network.
    watts : sequence of float, optional
        Power in watts of every part, in :func:`~netsynth.network.parts_in_order` order
        (as :class:`~netsynth.analysis.stress.NetworkStress` lists them); labels the parts.
    ascii : bool
        Use ``u`` rather than ``µ`` in power labels.

    Raises
    ------
    ArgumentError
        If `watts` does not hold one value per part.

    Examples
    --------
    >>> from netsynth.network import from_text
    >>> plan(from_text("6s(10)"))
    PlanRun(kind='series', count=6, block=PlanPart(value='10', power='', index=0))
    """
    if watts is not None and len(watts) != part_count(net):
        raise ArgumentError(f"watts: {len(watts)} values for a network of {part_count(net)} parts; "
                            "give one per part, in parts_in_order order")
    node, _ = _plan(net, 0, watts, ascii)
    return node


def _plan(net: Network, first: int, watts: Sequence[float] | None, ascii: bool) -> tuple[PlanNode, int]:
    """The plan of `net` whose first part is part number `first`, and the number of parts it spans."""
    if isinstance(net, Part):
        power = "" if watts is None else power_label(watts[first], ascii)
        return PlanPart(to_code(net.ohms), power, first), 1
    kind: Kind = "series" if isinstance(net, Series) else "parallel"
    blocks: list[PlanNode] = []
    at = first
    kids = net.children
    i = 0
    while i < len(kids):
        j = i + 1
        while j < len(kids) and kids[j] == kids[i]:
            j += 1
        node, span = _plan(kids[i], at, watts, ascii)
        count = j - i
        if count >= MIN_RUN:
            blocks.append(PlanRun(kind, count, node))
            at += span * count
        else:
            blocks.append(node)
            at += span
            for _ in range(count - 1):  # drawn out: each copy gets its own parts' labels
                node, span = _plan(kids[i], at, watts, ascii)
                blocks.append(node)
                at += span
        i = j
    if len(blocks) == 1:
        return blocks[0], at - first
    return PlanGroup(kind, tuple(blocks)), at - first


def plan_parts(node: PlanNode) -> list[PlanPart]:
    """The drawn parts of a plan (one per resistor symbol), left to right, top to bottom."""
    if isinstance(node, PlanPart):
        return [node]
    if isinstance(node, PlanRun):
        return plan_parts(node.block)
    return [p for child in node.children for p in plan_parts(child)]


def run_label(run: PlanRun, ascii: bool = False) -> str:
    """``×8 in series`` / ``×20 in parallel`` (``x`` in ASCII)."""
    return f"{'x' if ascii else '×'}{run.count} in {run.kind}"


# ---------------------------------------------------------------- text


@dataclass(frozen=True, slots=True)
class _Pen:
    """The characters of one drawing style."""

    h: str
    v: str
    top_left: str  # ┌  fold: the wire returning left turns down
    top_right: str  # ┐  fold: the chain's row turns down; exit riser turns right
    bottom_left: str  # └
    bottom_right: str  # ┘
    tee_down: str  # ┬
    tee_right: str  # ├
    tee_left: str  # ┤
    brace_left: str
    brace_right: str


_UNICODE = _Pen("─", "│", "┌", "┐", "└", "┘", "┬", "├", "┤", "╰", "╯")
_ASCII = _Pen("-", "|", "+", "+", "+", "+", "+", "+", "+", "\\", "/")


def draw(
    net: Network,
    left: str = "A",
    right: str = "B",
    watts: Sequence[float] | None = None,
    ascii: bool = False,
    width: int = WIDTH,
) -> str:
    """The network drawn between terminals `left` and `right`, as lines of text.

    Parameters
    ----------
    net : Network
        The network to draw.
    left, right : str
        Terminal names.
    watts : sequence of float, optional
        Power in watts of every part, in :func:`~netsynth.network.parts_in_order` order;
        each part's label then shows it (``[100 0.12W]``).
    ascii : bool
        Draw with ``-``, ``+``, ``|`` (and ``x`` for a count) instead of box-drawing characters.
    width : int
        Columns the drawing aims to stay within; long chains fold to fit (see the module notes).

    Returns
    -------
    str
        The drawing, trailing spaces stripped, without a final newline.

    Examples
    --------
    >>> from netsynth.network import from_text
    >>> print(draw(from_text("1k + (2k2 || 4k7)")))
    A ──[1k]──┬─[2k2]─┬── B
              └─[4k7]─┘
    >>> print(draw(from_text("5p(100)"), watts=[0.25] * 5, ascii=True))
    A --+-[100 0.25W]------+-- B
        +- x5 in parallel -+
    """
    pen = _ASCII if ascii else _UNICODE
    block = draw_block(net, watts, ascii, width - len(left) - len(right) - 4)
    lines = [f"{left} {pen.h}{block[0]}{pen.h} {right}"]
    pad = " " * (len(left) + 2)
    lines += [pad + line for line in block[1:]]
    return "\n".join(line.rstrip() for line in lines)


def draw_block(net: Network, watts: Sequence[float] | None = None, ascii: bool = False,
               width: int = WIDTH) -> list[str]:
    """The drawing without terminals: equal-width lines, the wire in and out on the first.

    Parameters are those of :func:`draw`; `width` is the block's own budget of columns.
    """
    pen = _ASCII if ascii else _UNICODE
    memo: dict[tuple[int, int], list[str]] = {}

    def block(node: PlanNode, budget: int) -> list[str]:
        budget = max(budget, MIN_BUDGET)
        key = (id(node), budget)
        if key not in memo:
            memo[key] = _block(node, budget, pen, ascii, block)
        return memo[key]

    return block(plan(net, watts, ascii), width)


def _pad(rows: list[str], width: int, pen: _Pen) -> list[str]:
    """Rows widened to `width`: the wire row with wire, the others with spaces."""
    return [r + (pen.h if i == 0 else " ") * (width - len(r)) for i, r in enumerate(rows)]


def _block(node: PlanNode, budget: int, pen: _Pen, ascii: bool, block) -> list[str]:
    if isinstance(node, PlanPart):
        return [f"{pen.h}[{node.label}]{pen.h}"]
    if isinstance(node, PlanRun):
        label = f"{pen.h} {run_label(node, ascii)} {pen.h}"
        if node.kind == "series":
            inner = block(node.block, budget)
            width = max(len(inner[0]), len(label) + 4)
            brace = pen.brace_left + label + pen.h * (width - len(label) - 4) + pen.brace_right
            return _pad(inner, width, pen) + [f" {brace} "]
        inner = block(node.block, budget - 4)
        width = max(len(inner[0]), len(label))
        rows = _pad(inner, width, pen)
        rows = [f"{pen.tee_down}{rows[0]}{pen.tee_down}"] + [f"{pen.v}{r}{pen.v}" for r in rows[1:]]
        rows.append(pen.bottom_left + label + pen.h * (width - len(label)) + pen.bottom_right)
        return _wrap(rows, pen)
    if node.kind == "parallel":
        return _parallel([block(c, budget - 4) for c in node.children], pen)
    kids = [block(c, budget) for c in node.children]
    if sum(len(k[0]) for k in kids) <= budget:
        return _side_by_side(kids)
    return _fold([block(c, budget - 4) for c in node.children], budget - 4, pen)


def _side_by_side(kids: list[list[str]]) -> list[str]:
    height = max(len(k) for k in kids)
    rows = ["" for _ in range(height)]
    for k in kids:
        width = len(k[0])
        for r in range(height):
            rows[r] += k[r] if r < len(k) else " " * width
    return rows


def _wrap(rows: list[str], pen: _Pen) -> list[str]:
    """Rails' rows with a lead of wire on each side of the first row."""
    return [pen.h + rows[0] + pen.h] + [" " + r + " " for r in rows[1:]]


def _parallel(kids: list[list[str]], pen: _Pen) -> list[str]:
    width = max(len(k[0]) for k in kids)
    rows: list[str] = []
    for i, k in enumerate(kids):
        first, last = i == 0, i == len(kids) - 1
        for r, line in enumerate(_pad(k, width, pen)):
            if r == 0:
                lrail = pen.tee_down if first else (pen.bottom_left if last else pen.tee_right)
                rrail = pen.tee_down if first else (pen.bottom_right if last else pen.tee_left)
            else:
                lrail = rrail = " " if last else pen.v
            rows.append(f"{lrail}{line}{rrail}")
    return _wrap(rows, pen)


def _fold(kids: list[list[str]], inner: int, pen: _Pen) -> list[str]:
    """A series chain folded onto rows of at most `inner` columns (see the module notes).

    Columns: 0 the left turn, 1..W the rows of the chain (the first row starts at column 0),
    W+1 the turn down at each row's end, W+2 a gap, W+3 the riser that brings the last row's
    wire back up to the first line.
    """
    segments: list[list[list[str]]] = [[]]
    used = 0
    for k in kids:
        if segments[-1] and used + len(k[0]) > inner:
            segments.append([])
            used = 0
        segments[-1].append(k)
        used += len(k[0])
    if len(segments) == 1:  # narrower children fit on one row after all
        return _side_by_side(kids)
    rows_of = [_side_by_side(seg) for seg in segments]
    width = max(len(r[0]) for r in rows_of)
    out: list[str] = []
    for s, seg in enumerate(rows_of):
        first, last = s == 0, s == len(rows_of) - 1
        # the first row needs no left turn: it starts at column 0, where the wire comes in
        seg = _pad(seg, width + 1, pen) if first else [pen.bottom_left + seg[0]] + [" " + r for r in seg[1:]]
        seg = _pad(seg, width + 1, pen)
        if last:
            out.append(seg[0] + pen.h * 2 + pen.bottom_right)
            out += [f"{r}   " for r in seg[1:]]
        else:
            out.append(seg[0] + pen.top_right + " " + (pen.top_left if first else pen.v))
            out += [f"{r}{pen.v} {pen.v}" for r in seg[1:]]
            out.append(pen.top_left + pen.h * width + pen.bottom_right + " " + pen.v)
    return out
