"""Rich display of results in Jupyter: a design shows its schematic and frontier table, a candidate its schematic.

Importing this module registers the displays with :func:`netsynth.design.set_display`;
:class:`~netsynth.design.Design` and :class:`~netsynth.design.Candidate` then answer
IPython's ``_repr_svg_`` (and the design ``_repr_html_``). The records live a layer below
the renderers and cannot import them, so the renderers hand the functions down (see the
end of :mod:`netsynth.design`).
"""

from __future__ import annotations

import html

from netsynth.design import Candidate, Design, set_display
from netsynth.render.compact import compact
from netsynth.render.svg import design_svg, to_svg
from netsynth.values import format_error, format_ohms

#: errors smaller than this are float noise of an exact hit, as in the text report
_EXACT = 1e-12


def _svg_body(svg: str) -> str:
    """The ``<svg>`` element alone, for inline HTML (no XML declaration)."""
    return svg[svg.index("<svg"):]


def _error(e: float) -> str:
    return "exact" if abs(e) < _EXACT else format_error(e)


def design_html(d: Design) -> str:
    """The recommended network's schematic, then one table row per part count of the frontier."""
    head = ("parts", "network", "value", "error", "proof")
    rows = []
    for e in d.frontier:
        c = e.best
        proof = "proven best" if e.proven else "best found" if e.method == "exhaustive" else f"array: {e.method}"
        mark = ' style="font-weight:bold"' if c is d.best else ""
        cells = (str(c.parts), compact(c.network), format_ohms(c.value_ohms, 6), _error(c.error), proof)
        rows.append(f"<tr{mark}>" + "".join(f"<td>{html.escape(x)}</td>" for x in cells) + "</tr>")
    table = ("<table><thead><tr>" + "".join(f"<th>{h}</th>" for h in head) + "</tr></thead><tbody>"
             + "".join(rows) + "</tbody></table>")
    caption = (f"<p>Target {html.escape(format_ohms(d.target_ohms, 6))}, bin {html.escape(d.bin_name)}: "
               f"recommended (bold) {html.escape(compact(d.best.network))} = "
               f"{html.escape(format_ohms(d.best.value_ohms, 6))} ({html.escape(_error(d.best.error))})</p>")
    return f"<div>{_svg_body(design_svg(d))}{caption}{table}</div>"


def candidate_svg(c: Candidate) -> str:
    """A candidate's schematic with a short title block (its value and error)."""
    return to_svg(c.network, {"network": compact(c.network), "value": format_ohms(c.value_ohms, 6),
                              "error": _error(c.error), "parts": str(c.parts)})


set_display("svg", Design, design_svg)
set_display("html", Design, design_html)
set_display("svg", Candidate, candidate_svg)
