"""Text and JSON forms of a board plan (``netsynth plan``).

JSON contract (stable; later work adds keys, never removes these)::

    {
      "needs_file": str | null, "bin": str, "max_parts": int,
      "status": "optimal" | "feasible",   # optimal: every stage of the allocation proven by CP-SAT
      "bound": float | null,              # with "feasible": the solver's bound on the first open stage
      "bound_of": str | null,             # that stage: "unserved and parts", "largest error", "total error"
      "served": int, "parts": int, "largest_error": float | null,
      "targets": [                        # one per need, in the file's order
        {"ref": str, "target_ohms": float, "within": float, "served": bool,
         # served:
         "expression": str, "value_ohms": float, "verified_ohms": float, "error": float,
         "components": [component, ...],  # as in make (netsynth/render/json.py)
         "headroom": float,               # only with an operating point
         # not served:
         "reason": str,
         "candidates": int}               # candidate networks within its accuracy and limits
      ],
      "pick_list": [{"line", "ohms", "count", "location", "tolerance", "watts", "max_volts", "refs": [str]}],
      "leftover": [{"line", "ohms", "qty"}],   # every line of the bin; qty null: as many as needed
      "verification": {"method", "rtol"},
      "seconds": float
    }
"""

from __future__ import annotations

import math
from typing import Any

from netsynth.nodal import VERIFY_RTOL
from netsynth.plan.board import BoardPlan
from netsynth.render.json import VERIFICATION, component_dict
from netsynth.render.report import table
from netsynth.values import format_error, format_ohms, to_code


def _within(w: float) -> str:
    return "±" + format_error(w).lstrip("+")


def _pct(error: float) -> str:
    return "0" if abs(error) < 1e-12 else f"{error * 100:+.4f}"


def plan_text(plan: BoardPlan, needs_file: str | None = None, saved: str | None = None) -> str:
    """The plan as a report: status, one row per need, the pick list, what is left, the checks."""
    head = f"Board: {needs_file}   " if needs_file else ""
    out = [f"{head}bin: {plan.bin_name}   up to {plan.max_parts} parts per network"]
    n = len(plan.results)
    summary = f"{plan.served} of {n} needs served with {plan.parts} part{'s' if plan.parts != 1 else ''}"
    if plan.largest_error is not None:
        summary += f"; largest error {format_error(plan.largest_error).lstrip('+')}"
    if plan.status == "optimal":
        out.append(f"Plan: proven optimal (CP-SAT): {summary}")
    else:
        out.append(f"Plan: best found in the time limit: {summary}; {plan.bound_text() or 'no bound'}")
    if plan.kit.interrupted:
        out.append("Interrupted: the solver was stopped; this is the best plan it had")
    out.append("")
    stressed = any(r.need.point is not None for r in plan.results)
    rows = [("ref", "target", "within", "network", "value", "error %", "verified") + (("headroom",) if stressed else ())]
    for r in plan.results:
        if r.candidate is None:
            continue
        c = r.candidate
        target = format_ohms(r.need.target_ohms, 6) + (f" at {_drive(r.need.point)}" if r.need.point else "")
        cells = (r.need.ref, target, _within(r.need.within), c.expression, format_ohms(c.value_ohms, 6),
                 _pct(c.error), format_ohms(c.verified_ohms, 9))
        if stressed:
            cells += (f"{r.stress.headroom:.3g}×" if r.stress is not None and math.isfinite(r.stress.headroom)
                      else "",)
        rows.append(cells)
    if len(rows) > 1:
        out += table(rows, "llllrrr" + ("r" if stressed else ""))
    missing = [r for r in plan.results if r.candidate is None]
    if missing:
        out += ["", "Not served:"]
        for r in missing:
            what = format_ohms(r.need.target_ohms, 6) + (f" at {_drive(r.need.point)}" if r.need.point else "")
            out.append(f"  {r.need.ref} ({what}, {_within(r.need.within)}): {r.reason}")
    if plan.pick_list:
        out.append("")
        out.append("Take from the bin (all needs):")
        rows = [(f"{p.count} ×", to_code(p.ohms), f"±{p.line.tolerance * 100:g} %", f"{p.line.power_rating_w:g} W",
                 f"{p.line.max_volts:g} V", p.location or "-", f"line {p.line.line}", ", ".join(refs))
                for p, refs in zip(plan.pick_list, plan.users)]
        out += ["  " + r for r in table(rows, "rllrrlll")]
        left = {item.line: item for item in plan.leftover.items}
        rows = [(to_code(p.ohms), p.location or "-", f"line {p.line.line}",
                 "any" if p.line.count is None else f"{left[p.line.line].count} of {p.line.count}")
                for p in plan.pick_list]
        out += ["", "Left in the lines used:"] + ["  " + r for r in table(rows, "lllr")]
        worst = max(abs(r.candidate.verified_ohms / r.candidate.value_ohms - 1) for r in plan.results
                    if r.candidate is not None)
        out.append(f"Verified: nodal analysis of every network agrees within {worst:.1e} (each checked to "
                   f"{VERIFY_RTOL:.0e})" + ("; every part within its derated limits on its own line" if stressed
                                            else ""))
    if saved:
        out.append(f"Saved the leftover bin ({len(plan.leftover)} lines) to {saved}")
    if plan.status == "optimal":
        out.append("Proven optimal: no choice among the candidates (the exhaustive search's best and runners-up "
                   "per part count) serves more needs, or as many with fewer parts, or with a smaller largest error.")
    return "\n".join(out)


def _drive(point) -> str:
    if point.volts is not None:
        return f"{point.volts:g} V"
    if point.amps is not None:
        return f"{point.amps:g} A"
    return f"{point.watts:g} W"


def plan_dict(plan: BoardPlan, needs_file: str | None = None) -> dict[str, Any]:
    """The JSON-ready dict of the contract in the module docstring."""
    bound = plan.bound
    targets = []
    for r in plan.results:
        row: dict[str, Any] = {"ref": r.need.ref, "target_ohms": r.need.target_ohms, "within": r.need.within,
                               "served": r.served}
        if r.candidate is not None:
            c = r.candidate
            row.update({"expression": c.expression, "value_ohms": c.value_ohms, "verified_ohms": c.verified_ohms,
                        "error": c.error, "components": [component_dict(p) for p in c.components]})
            if r.stress is not None:
                row["headroom"] = r.stress.headroom if math.isfinite(r.stress.headroom) else None
        else:
            row["reason"] = r.reason
        row["candidates"] = r.candidates
        targets.append(row)
    return {
        "needs_file": needs_file,
        "bin": plan.bin_name,
        "max_parts": plan.max_parts,
        "status": "optimal" if plan.status == "optimal" else "feasible",
        "bound": None if plan.status == "optimal" or bound is None else bound[1],
        "bound_of": None if plan.status == "optimal" or bound is None else bound[0],
        "served": plan.served,
        "parts": plan.parts,
        "largest_error": plan.largest_error,
        "targets": targets,
        "pick_list": [{"line": p.line.line, "ohms": p.ohms, "count": p.count, "location": p.location,
                       "tolerance": p.line.tolerance, "watts": p.line.power_rating_w,
                       "max_volts": p.line.max_volts, "refs": list(refs)}
                      for p, refs in zip(plan.pick_list, plan.users)],
        "leftover": [{"line": item.line, "ohms": item.ohms, "qty": item.count} for item in plan.leftover.items],
        "verification": VERIFICATION,
        "seconds": round(plan.seconds, 4),
    }
