"""Plain-text and JSON forms of a :class:`~netsynth.api.Design`.

The JSON contract (stable; later work extends it, never breaks it)::

    {
      "target_ohms": float,
      "bin": str, "max_parts": int, "within": float | null,
      "frontier": [            # one entry per part count, ascending
        {"parts": int, "expression": str, "value_ohms": float,
         "error": float,       # signed relative error, value / target - 1
         "verified_ohms": float, "proven": bool,
         "alternatives": [{"parts", "expression", "value_ohms", "error", "verified_ohms"}]}
      ],
      "best": {"parts", "expression", "value_ohms", "error", "verified_ohms"},
      "pick_list": [{"ohms": float, "count": int, "location": str}],
      "verification": {"method": str, "rtol": float},
      "seconds": float
    }
"""

from __future__ import annotations

from typing import Any

from netsynth.design import Candidate, Design
from netsynth.nodal import VERIFY_RTOL
from netsynth.render.diagram import draw
from netsynth.values import format_error, format_ohms, to_code


def candidate_dict(c: Candidate) -> dict[str, Any]:
    return {
        "parts": c.parts,
        "expression": c.expression,
        "value_ohms": c.value_ohms,
        "error": c.error,
        "verified_ohms": c.verified_ohms,
    }


def design_dict(d: Design) -> dict[str, Any]:
    """The JSON-ready dict of the contract above."""
    return {
        "target_ohms": d.target_ohms,
        "bin": d.bin_name,
        "max_parts": d.max_parts,
        "within": d.within,
        "frontier": [
            {**candidate_dict(e.best), "proven": e.proven, "alternatives": [candidate_dict(a) for a in e.alternatives]}
            for e in d.frontier
        ],
        "best": candidate_dict(d.best),
        "pick_list": [{"ohms": p.ohms, "count": p.count, "location": p.location} for p in d.pick_list],
        "verification": {"method": "nodal analysis (conductance matrix solve)", "rtol": VERIFY_RTOL},
        "seconds": round(d.seconds, 4),
    }


def _ppm(error: float) -> str:
    return "0" if error == 0 else f"{error * 1e6:+.1f}"


def _pct(error: float) -> str:
    return "0" if error == 0 else f"{error * 100:+.4f}"


def design_text(d: Design, show_alternatives: bool = False) -> str:
    """The frontier table, the drawing of the recommended network, its pick list and check."""
    out = [f"Target {format_ohms(d.target_ohms, 6)}   bin: {d.bin_name}   up to {d.max_parts} parts"]
    if d.within is not None:
        out[0] += f"   within ±{format_error(d.within).lstrip('+')}"
    out.append("")
    rows = [("parts", "network", "value", "error %", "ppm", "proof")]
    for e in d.frontier:
        c = e.best
        mark = "proven best" if e.proven else "best found"
        rows.append((str(c.parts), c.expression, format_ohms(c.value_ohms, 6), _pct(c.error), _ppm(c.error), mark))
        if show_alternatives:
            for a in e.alternatives:
                rows.append(("", "  or " + a.expression, format_ohms(a.value_ohms, 6), _pct(a.error), _ppm(a.error), ""))
    widths = [max(len(r[i]) for r in rows) for i in range(len(rows[0]))]
    align = ["r", "l", "r", "r", "r", "l"]
    for r in rows:
        cells = [cell.rjust(w) if a == "r" else cell.ljust(w) for cell, w, a in zip(r, widths, align)]
        out.append("  ".join(cells).rstrip())
    b = d.best
    off = "exact" if b.error == 0 else format_error(b.error)
    out += ["", f"Recommended: {b.expression}  =  {format_ohms(b.value_ohms, 6)}  ({off})", ""]
    out.append(draw(b.network))
    out.append("")
    picks = ", ".join(
        f"{p.count} × {to_code(p.ohms)}" + (f" ({p.location})" if p.location else "") for p in d.pick_list
    )
    out.append(f"Take from the bin: {picks}")
    rel = abs(b.verified_ohms / b.value_ohms - 1)
    out.append(
        f"Verified: nodal analysis gives {format_ohms(b.verified_ohms, 9)} "
        f"(agrees within {rel:.1e}; every row checked to {VERIFY_RTOL:.0e})"
    )
    out.append(
        "Proven best: no network of that many parts from this bin lands closer (exhaustive search)."
        if all(e.proven for e in d.frontier)
        else "Rows marked 'best found' were not searched exhaustively."
    )
    return "\n".join(out)
