"""SVG schematic of a series/parallel network, with terminals and a title block.

Map of the module
-----------------
:func:`to_svg`
    The network as an SVG document (a string).
:func:`design_title`, :func:`check_title`
    The title block's rows for a design (``make``) and for a checked network (``check``).
:func:`save_svg`
    Write an SVG file atomically (temporary file in the same folder, fsync, ``os.replace``).

Drawing
-------
The schematic draws the plan of :func:`netsynth.render.diagram.plan`, the same blocks as
the terminal drawing: series blocks side by side, parallel blocks stacked between two
rails, runs of five or more equal children drawn once with their count (``×8 in series``
under a bracket; ``×20 in parallel`` on a dashed branch standing for the other copies).
So the SVG holds exactly one resistor symbol per part label of the terminal drawing:
``<rect class="resistor">``, one per :class:`~netsynth.render.diagram.PlanPart`. Unlike
the terminal drawing, long chains are not folded: a vector drawing scales, and a viewer
zooms.

Resistors are the IEC 60617 general resistor symbol, a plain rectangle (symbol S00555,
from memory), with the value above and, with an operating point, the part's power below.
The terminals are small open circles named ``A`` and ``B``; junctions of three wires are
dots. Lengths are in px of a 12 px monospace font, whose advance (0.6 em) sizes the labels.

Why hand-written SVG and not a schematic library: the layout here is recursive (banks
inside strings inside banks, to any depth) and comes from the same plan as the text
drawing; the schematic libraries on PyPI place elements one after another along a path,
so nested banks would need the same box arithmetic written on top of them. The drawing
needs only lines, rectangles, circles and text, which :mod:`xml.etree.ElementTree` writes
without a dependency.
"""

from __future__ import annotations

import datetime
import os
import xml.etree.ElementTree as ET
from collections.abc import Mapping, Sequence
from dataclasses import dataclass

from netsynth.analysis.review import Review
from netsynth.atomic import write_atomic
from netsynth.design import Candidate, Design
from netsynth.errors import ArgumentError
from netsynth.network import Network
from netsynth.render.compact import compact
from netsynth.render.diagram import PlanNode, PlanPart, PlanRun, plan, run_label
from netsynth.values import format_error, format_ohms

SVG_NS = "http://www.w3.org/2000/svg"

FONT_PX = 12
CHAR_W = 0.6 * FONT_PX  #: advance of a monospace glyph (0.6 em)
RECT_W, RECT_H = 42, 14  #: the resistor rectangle, about 3:1
LEAD = 14  #: wire on each side of a resistor
WIRE_Y = 24  #: the wire's height in every block, from the block's top
PART_H = 48  #: a part's block: value above the rectangle, power below
RAIL = 14  #: from a bank's edge to its rail
GAP = 10  #: between the branches of a bank
RUN_H = 24  #: the bracket and count under a series run
GHOST_H = 30  #: the dashed branch that stands for the other copies of a parallel run
MARGIN = 16
TERM_W = 30  #: a terminal: its name, its circle and a short wire
ROW_H = 18  #: one row of the title block


def _text_w(text: str) -> float:
    return len(text) * CHAR_W


@dataclass(frozen=True, slots=True)
class _Size:
    w: float
    h: float


class _Drawer:
    """Sizes the plan's blocks (memoised) and emits their SVG elements."""

    def __init__(self, root: ET.Element) -> None:
        self.root = root
        self.sizes: dict[int, _Size] = {}

    # -- sizes

    def size(self, node: PlanNode) -> _Size:
        key = id(node)
        if key not in self.sizes:
            self.sizes[key] = self._size(node)
        return self.sizes[key]

    def _size(self, node: PlanNode) -> _Size:
        if isinstance(node, PlanPart):
            label = max(_text_w(node.value), _text_w(node.power))
            return _Size(max(RECT_W, label + 6) + 2 * LEAD, PART_H)
        if isinstance(node, PlanRun):
            inner = self.size(node.block)
            label = _text_w(run_label(node)) + 24
            if node.kind == "series":
                return _Size(max(inner.w, label), inner.h + RUN_H)
            return _Size(max(inner.w, label) + 2 * RAIL, inner.h + GHOST_H)
        kids = [self.size(c) for c in node.children]
        if node.kind == "series":
            return _Size(sum(k.w for k in kids), max(k.h for k in kids))
        return _Size(max(k.w for k in kids) + 2 * RAIL, sum(k.h for k in kids) + GAP * (len(kids) - 1))

    # -- elements

    def line(self, x1: float, y1: float, x2: float, y2: float, cls: str = "wire") -> None:
        ET.SubElement(self.root, "line", {"class": cls, "x1": _n(x1), "y1": _n(y1), "x2": _n(x2), "y2": _n(y2)})

    def dot(self, x: float, y: float) -> None:
        ET.SubElement(self.root, "circle", {"class": "junction", "cx": _n(x), "cy": _n(y), "r": "2.5"})

    def text(self, x: float, y: float, text: str, cls: str) -> None:
        el = ET.SubElement(self.root, "text", {"class": cls, "x": _n(x), "y": _n(y)})
        el.text = text

    def place(self, node: PlanNode, x: float, y: float) -> None:
        """Draw `node` with its top-left corner at (x, y); its wire runs at y + WIRE_Y."""
        size = self.size(node)
        wy = y + WIRE_Y
        if isinstance(node, PlanPart):
            cx = x + size.w / 2
            self.line(x, wy, cx - RECT_W / 2, wy)
            self.line(cx + RECT_W / 2, wy, x + size.w, wy)
            ET.SubElement(self.root, "rect", {
                "class": "resistor", "x": _n(cx - RECT_W / 2), "y": _n(wy - RECT_H / 2),
                "width": _n(RECT_W), "height": _n(RECT_H), "data-part": str(node.index)})
            self.text(cx, wy - RECT_H / 2 - 5, node.value, "value")
            if node.power:
                self.text(cx, wy + RECT_H / 2 + 14, node.power, "power")
            return
        if isinstance(node, PlanRun):
            inner = self.size(node.block)
            label = run_label(node)
            if node.kind == "series":
                self.place(node.block, x, y)
                if size.w > inner.w:
                    self.line(x + inner.w, wy, x + size.w, wy)
                # the bracket spans the repeated block; its count sits centred under it where it fits
                top = y + inner.h + 2
                ET.SubElement(self.root, "path", {
                    "class": "bracket",
                    "d": f"M{_n(x + 4)},{_n(top)} v5 H{_n(x + inner.w - 4)} v-5"})
                half = _text_w(label) / 2 + 4
                centre = min(max(x + inner.w / 2, x + half), x + size.w - half)
                self.text(centre, top + 18, label, "count")
                return
            left, right = x + RAIL, x + size.w - RAIL
            self.place(node.block, left, y)
            self.line(x, wy, left, wy)
            self.line(left + inner.w, wy, x + size.w, wy)
            ghost = y + inner.h + GHOST_H - 6
            self.line(left, wy, left, ghost, "ghost")
            self.line(right, wy, right, ghost, "ghost")
            self.line(left, ghost, right, ghost, "ghost")
            self.dot(left, wy)
            self.dot(right, wy)
            self.text((left + right) / 2, ghost - 5, label, "count")
            return
        kids = [(c, self.size(c)) for c in node.children]
        if node.kind == "series":
            at = x
            for child, s in kids:
                self.place(child, at, y)
                at += s.w
            return
        left, right = x + RAIL, x + size.w - RAIL
        self.line(x, wy, left, wy)
        self.line(right, wy, x + size.w, wy)
        at = y
        for i, (child, s) in enumerate(kids):
            cy = at + WIRE_Y
            self.place(child, left, at)
            if left + s.w < right:
                self.line(left + s.w, cy, right, cy)
            if i < len(kids) - 1:
                self.dot(left, cy)
                self.dot(right, cy)
            at += s.h + GAP
        last = at - GAP - kids[-1][1].h + WIRE_Y
        self.line(left, wy, left, last)
        self.line(right, wy, right, last)


def _n(x: float) -> str:
    """A coordinate, rounded to 0.1 px."""
    return f"{round(x, 1):g}"


_STYLE = f"""
text {{ font-family: 'DejaVu Sans Mono', Menlo, Consolas, monospace; font-size: {FONT_PX}px; fill: #1a1a1a; }}
.value, .power, .count, .terminal-name {{ text-anchor: middle; }}
.power {{ fill: #5a5a5a; font-size: {FONT_PX - 1}px; }}
.count {{ font-style: italic; }}
.terminal-name {{ font-weight: bold; }}
.wire, .bracket {{ stroke: #1a1a1a; stroke-width: 1.4; fill: none; }}
.ghost {{ stroke: #1a1a1a; stroke-width: 1.2; stroke-dasharray: 4 3; }}
.resistor {{ fill: #ffffff; stroke: #1a1a1a; stroke-width: 1.6; }}
.junction {{ fill: #1a1a1a; }}
.terminal {{ fill: #ffffff; stroke: #1a1a1a; stroke-width: 1.4; }}
.title-block rect {{ fill: none; stroke: #1a1a1a; stroke-width: 1.2; }}
.title-block line {{ stroke: #9a9a9a; stroke-width: 0.8; }}
.title-key {{ font-weight: bold; }}
"""


def to_svg(
    net: Network,
    title: Mapping[str, str] | None = None,
    watts: Sequence[float] | None = None,
    left: str = "A",
    right: str = "B",
) -> str:
    """The network as an SVG schematic between terminals `left` and `right`.

    Parameters
    ----------
    net : Network
        The network to draw.
    title : mapping of str to str, optional
        Rows of the title block, in order (e.g. from :func:`design_title`); none without it.
    watts : sequence of float, optional
        Power in watts of every part in :func:`~netsynth.network.parts_in_order` order,
        printed under each resistor.
    left, right : str
        Terminal names.

    Returns
    -------
    str
        A standalone SVG document (UTF-8 text, with the XML declaration).

    Raises
    ------
    ArgumentError
        If `watts` does not hold one value per part.

    Examples
    --------
    >>> from netsynth.network import from_text
    >>> svg = to_svg(from_text("1k + (2k2 || 4k7)"), {"target": "2.5 kΩ"})
    >>> svg.count('class="resistor"'), ">A</text>" in svg and ">B</text>" in svg
    (3, True)
    """
    root = ET.Element("svg", {"xmlns": SVG_NS, "version": "1.1"})
    ET.SubElement(root, "title").text = "netsynth schematic: " + compact(net)
    ET.SubElement(root, "style").text = _STYLE
    ET.SubElement(root, "rect", {"x": "0", "y": "0", "width": "100%", "height": "100%", "fill": "#ffffff"})
    drawing = ET.SubElement(root, "g", {"class": "schematic"})
    d = _Drawer(drawing)
    node = plan(net, watts)
    size = d.size(node)
    x0, y0 = MARGIN + TERM_W, MARGIN
    d.place(node, x0, y0)
    wy = y0 + WIRE_Y
    for name, cx, wire in ((left, MARGIN + 16, (MARGIN + 20, x0)),
                           (right, x0 + size.w + TERM_W - 16, (x0 + size.w, x0 + size.w + TERM_W - 20))):
        d.line(wire[0], wy, wire[1], wy)
        ET.SubElement(drawing, "circle", {"class": "terminal", "cx": _n(cx), "cy": _n(wy), "r": "4"})
        d.text(cx, wy - 9, name, "terminal-name")
    width = x0 + size.w + TERM_W + MARGIN
    height = y0 + size.h + MARGIN
    if title:
        block_w, block_h = _title_block(root, title)
        width = max(width, block_w + 2 * MARGIN)
        height += block_h + MARGIN
        # the block sits at the bottom right: move it there now the width is known
        root.find("g[@class='title-block']").set(
            "transform", f"translate({_n(width - MARGIN - block_w)},{_n(y0 + size.h + MARGIN)})")
    root.set("width", _n(width))
    root.set("height", _n(height))
    root.set("viewBox", f"0 0 {_n(width)} {_n(height)}")
    ET.indent(root)
    return '<?xml version="1.0" encoding="UTF-8"?>\n' + ET.tostring(root, encoding="unicode") + "\n"


def _title_block(root: ET.Element, title: Mapping[str, str]) -> tuple[float, float]:
    """Add the title block (rows of key and value) at the origin; return its width and height."""
    rows = list(title.items())
    key_w = max(_text_w(k) for k, _ in rows) + 14
    val_w = max(_text_w(v) for _, v in rows) + 14
    w, h = key_w + val_w, ROW_H * len(rows) + 4
    g = ET.SubElement(root, "g", {"class": "title-block"})
    ET.SubElement(g, "rect", {"x": "0", "y": "0", "width": _n(w), "height": _n(h)})
    ET.SubElement(g, "line", {"x1": _n(key_w), "y1": "0", "x2": _n(key_w), "y2": _n(h)})
    for i, (key, value) in enumerate(rows):
        base = 2 + ROW_H * (i + 1) - 5
        if i:
            ET.SubElement(g, "line", {"x1": "0", "y1": _n(2 + ROW_H * i), "x2": _n(w), "y2": _n(2 + ROW_H * i)})
        ET.SubElement(g, "text", {"class": "title-key", "x": "7", "y": _n(base)}).text = key
        ET.SubElement(g, "text", {"class": "title-value", "x": _n(key_w + 7), "y": _n(base)}).text = value
    return w, h


def _today(date: datetime.date | None) -> str:
    return (date or datetime.date.today()).isoformat()


def _off(error: float) -> str:
    # errors smaller than this are float noise of an exact hit, as in the text report
    return "exact" if abs(error) < 1e-12 else format_error(error)


def design_title(d: Design, date: datetime.date | None = None) -> dict[str, str]:
    """The title block of a design's recommended network: target, value, error, bin, date."""
    b = d.best
    rows = {
        "target": format_ohms(d.target_ohms, 6),
        "network": compact(b.network),
        "achieved": format_ohms(b.value_ohms, 6),
        "error": _off(b.error),
        "parts": str(b.parts),
    }
    if d.point is not None:
        rows["operating point"] = d.point.describe()
    rows["bin"] = d.bin_name
    rows["date"] = _today(date)
    return rows


def check_title(c: Candidate, r: Review, bin_name: str, target_ohms: float | None = None,
                date: datetime.date | None = None) -> dict[str, str]:
    """The title block of a checked network: the network, its value, the error when a target is given."""
    rows = {"network": compact(c.network), "value": format_ohms(c.value_ohms, 6)}
    if target_ohms is not None:
        rows = {"target": format_ohms(target_ohms, 6), **rows, "error": _off(c.error)}
    rows["parts"] = str(c.parts)
    if r.point is not None:
        rows["operating point"] = r.point.describe()
    rows["bin"] = bin_name
    rows["date"] = _today(date)
    return rows


def save_svg(svg: str, path: str | os.PathLike) -> None:
    """Write `svg` to `path` atomically: a temporary file in the same folder, fsync, then rename.

    A crash or error leaves either the old file or the new one, never half a file; an
    existing file's permission bits are kept, a new file gets the usual ones (0666 less umask).

    Raises
    ------
    ArgumentError
        If the file cannot be written (the message names `path` and the reason; the old
        file, if any, is unchanged).
    """
    write_atomic(path, svg.encode("utf-8"), error=ArgumentError, what="the SVG")


def _watts(r: Review) -> list[float] | None:
    return None if r.stress is None else [p.watts for p in r.stress.parts]


def design_svg(d: Design, date: datetime.date | None = None) -> str:
    """The schematic of a design's recommended network, with its title block and part powers."""
    return to_svg(d.best.network, design_title(d, date), _watts(d.review))


def check_svg(c: Candidate, r: Review, bin_name: str, target_ohms: float | None = None,
              date: datetime.date | None = None) -> str:
    """The schematic of a checked network, with its title block and part powers."""
    return to_svg(c.network, check_title(c, r, bin_name, target_ohms, date), _watts(r))
