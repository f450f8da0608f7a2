"""Report and JSON of ``netsynth check --netlist FILE --between A B``.

A series/parallel netlist is reported as ``check`` reports its ``+``/``||`` form, after a header
naming the file, the terminals and the parts that carry no current, and followed by a table of the
file's elements. Any other network (a bridge) gets the same header, its nodal value, the element
table and the usual review lines (bands, Monte Carlo, drift, stress, cautions).
"""

from __future__ import annotations

from typing import Any

from netsynth.analysis.netlist import NetlistReview
from netsynth.analysis.review import Review
from netsynth.design import Candidate
from netsynth.network import Part
from netsynth.render.json import (
    VERIFICATION,
    _finite,
    check_dict,
    component_dict,
    headroom_dict,
    point_dict,
    review_dict,
    stress_list,
)
from netsynth.render.report import check_text, review_lines, table
from netsynth.values import format_error, format_ohms, to_code

__all__ = ["netlist_dict", "netlist_text"]


def _header(nr: NetlistReview) -> list[str]:
    topo = nr.topology
    net = topo.netlist
    kind = "SPICE" if net.kind == "spice" else "edge list"
    count = len(net.elements)
    a, b = topo.between
    out = [f"Netlist: {net.name} ({kind}, {count} resistor{'s' if count != 1 else ''}), between {a} and {b}"]
    if topo.network is not None:
        out.append("Shape: series/parallel between the terminals")
    else:
        out.append("Shape: not series/parallel (a bridge or other mesh): value and bands by nodal analysis")
    for index, why in nr.no_current:
        out.append(f"No current: {net.elements[index].name}: {why}")
    for note in net.notes:
        out.append(f"Read: {note}")
    return out


def _elements(nr: NetlistReview) -> list[str]:
    net = nr.topology.netlist
    rows = [("element", "nodes", "value", "power", "line", "location")]
    for e in nr.elements:
        el = net.elements[e.index]
        rows.append((el.name, f"{el.a}-{el.b}", to_code(el.ohms), f"{e.share * 100:.3g} %",
                     f"line {e.line.line}" if e.in_bin else "not in bin", e.line.location or "-"))
    return ["Elements (power: share of the network's; also each part's sensitivity):"] + [
        "  " + r for r in table(rows, "llrrll")]


def netlist_text(nr: NetlistReview, candidate: Candidate | None, review: Review, ascii: bool = False) -> str:
    """The report: header, then ``check``'s report of the ``+``/``||`` form or the nodal one."""
    out = _header(nr) + [""]
    if candidate is not None:
        out.append(check_text(candidate, review, ascii=ascii))
        out += [""] + _elements(nr)
        return "\n".join(out)
    mc = review.monte_carlo
    target = mc.target_ohms
    error = nr.value_ohms / target - 1.0
    out.append(f"Value: {format_ohms(nr.value_ohms, 6)}" + ("" if error == 0 else f"  (target error "
                                                                                   f"{format_error(error)})"))
    out.append(f"By nodal analysis (conductance matrix, refined); Monte Carlo re-solves each build ({mc.samples} "
               "builds)")
    out += [""] + _elements(nr) + [""] + review_lines(review)
    return "\n".join(out)


def netlist_dict(nr: NetlistReview, candidate: Candidate | None, review: Review) -> dict[str, Any]:
    """The JSON of ``check --netlist``: ``check``'s keys plus ``netlist`` (see netsynth.render.json)."""
    topo = nr.topology
    net = topo.netlist
    info = {
        "file": net.name,
        "format": net.kind,
        "between": list(topo.between),
        "series_parallel": topo.network is not None,
        "elements": [
            {"name": net.elements[e.index].name, "nodes": [net.elements[e.index].a, net.elements[e.index].b],
             "ohms": net.elements[e.index].ohms, "file_line": net.elements[e.index].line,
             "power_share": e.share, "line": e.line.line if e.in_bin else None, "location": e.line.location}
            for e in nr.elements
        ],
        "no_current": [{"name": net.elements[i].name, "reason": why} for i, why in nr.no_current],
        "notes": list(net.notes),
    }
    if candidate is not None:
        return {**check_dict(candidate, review), "netlist": info}
    mc = review.monte_carlo
    out: dict[str, Any] = {
        "expression": None,
        "parts": len(nr.elements),
        "value_ohms": nr.value_ohms,
        "verified_ohms": nr.value_ohms,
        "error": nr.value_ohms / mc.target_ohms - 1.0,
        **review_dict(review),
        "operating_point": point_dict(review.point),
        "status": "ok" if review.ok else "over_limit",
        "verification": VERIFICATION,
        "components": [component_dict(Part(nr.topology.netlist.elements[e.index].ohms, e.line if e.in_bin else None))
                       for e in nr.elements],
    }
    if review.stress is not None:
        out["stress"] = stress_list(review.stress)
        out["headroom"] = _finite(review.stress.headroom)
        out["binding"] = headroom_dict(review.stress)
    out["netlist"] = info
    return out
