"""JSON forms of a design and of a checked network.

The contract (stable; later work adds keys, never removes these)::

    make:
    {
      "target_ohms": float, "bin": str, "max_parts": int | null, "within": float | null,
      "frontier": [            # one entry per part count, ascending
        {"parts": int, "expression": str, "value_ohms": float,
         "error": float,       # signed relative error, value / target - 1
         "verified_ohms": float, "proven": bool, "method": str,
         "status": str,        # the row's proof: "proven best" (exhaustive), "proven best in family" (CP-SAT
                               # OPTIMAL), "best found, bound N parts" (CP-SAT FEASIBLE), "best found", "array"
         "status_note": str,   # a CP-SAT row: its family and what its status promises ("" otherwise)
         "fewest": bool,       # no network of any shape with fewer parts lands as close within the limits
         "components": [component, ...],   # one per part, in the order of "expression"
         "alternatives": [{"parts", "expression", "value_ohms", "error", "verified_ohms", "components"}],
         "stress": [...],      # only with an operating point, one entry per part (below)
         "headroom": float,    # only with an operating point: factor the drive may grow
         "binding": {"factor", "part", "limit": "power"|"voltage", "ohms", "line"}}  # which part sets it
      ],
      "best": {"parts", "expression", "value_ohms", "error", "verified_ohms", "proven", "method", "components"},
      "pick_list": [pick entry, ...],  # one per stock line, in the bin's order (below)
      "operating_point": {...} | null, "derating": {...}, "prefer": str,
      "lower_bound": {"count", "by_power", "by_voltage", "text"} | null,
      "value_parts": int,      # the fewest parts that can reach the target from the bin's values
      "reach": {"parts": int | null, "low_ohms", "high_ohms", "text"},  # parts null: the whole bin cannot
      "within_met": bool | null,  # with "within": whether some row lands inside it
      "part_limit": int,       # the largest part count searched
      "exhaustive_parts": int, # counts up to this were searched exhaustively; above it, regular arrays
      "review": {review of "best", below},
      "status": "ok" | "over_limit",
      "verification": {"method": str, "rtol": float},
      "seconds": float
    }

    pick entry: {"ohms", "count", "location", "line", "tolerance", "watts", "max_volts",
                 "rkm": str,               # IEC 60062 RKM code printed on the part: "4K7", "R47", "1M0"
                 "bands": [str] | null,    # IEC 60062 colour names, first band first: 4 bands for
                                           # ±5 % and wider, else 5 (the other count when the value
                                           # needs it); null when the value/tolerance has no colour code
                 "smd_code": str | null,   # chip digit code: 4 characters for ±1 % and tighter, else 3
                                           # (the other when the value needs it): "472", "4701", "4R7"
                 "eia96": str | null}      # EIA-96 code of an E96 value: "01C" = 10 kΩ; null otherwise
               (every code whatever the line's package; netsynth.render.picklist says which the
                package calls for on screen)

    component: {"ohms", "line", "location", "tolerance", "watts", "max_volts", "tcr_ppm"}
               (the stock line the part is: "line" is the bin file's line number of its first row,
                or its position in a kit's listing; null for a part the bin does not hold)

    stress entry: {"value_ohms", "volts", "amps", "watts", "limit_watts", "limit_volts",
                   "power_use", "voltage_use",   # shares of the derated limits used (1.0 = at the limit)
                   "headroom", "binding", "in_bin", "line", "location"}
                   (volts and amps peak; watts average; limits derated; headroom is the factor
                    the drive may grow before this part reaches its "binding" limit)

    error (any command, with --json): {"error": {"kind": str, "message": str}} and a non-zero exit

    check:
    {"expression", "value_ohms", "verified_ohms", "worst_case_ohms": [low, high],
     "stress": [...] (with an operating point), plus the review keys and "status"}

    check --netlist FILE: the check keys (for a network that is not series/parallel, "expression"
    is null, "verified_ohms" is the nodal value and "components"/"stress" follow the file's live
    elements), plus
    "netlist": {"file": str, "format": "spice" | "edges", "between": [A, B], "series_parallel": bool,
                "elements": [{"name", "nodes": [a, b], "ohms", "file_line", "power_share",
                              "line": int | null, "location"}],   # the parts that can carry current
                "no_current": [{"name", "reason"}],   # shorted, not connected, dangling, balanced bridge
                "notes": [str]}                       # how the file was read (M as milli, left out)

    review: {"worst_case_ohms": [low, high], "rss_rel", "sigma_rel", "monte_carlo": {...},
             "tcr_ppm", "at_temp": {"temp_c", "low_ohms", "high_ohms"} | null,
             "cautions": [str], "notes": [str], "not_in_bin": [float]}
"""

from __future__ import annotations

import math
from typing import Any

from netsynth.analysis.conditions import Derating, OperatingPoint
from netsynth.analysis.review import Review
from netsynth.analysis.stress import NetworkStress, line_of
from netsynth.design import Candidate, Design, PickLine
from netsynth.network import Part
from netsynth.nodal import VERIFY_RTOL
from netsynth.render.picklist import pick_marking

VERIFICATION = {"method": "nodal analysis (conductance matrix solve)", "rtol": VERIFY_RTOL}


def _finite(x: float) -> float | None:
    """`x`, or None (JSON ``null``) where a figure has no bound: the headroom of a part under no
    stress, the power share of a part allowed no power at the ambient, the ``high_ohms`` reach of
    a bin with unlimited parts. The CLI writes strict JSON (no ``NaN`` or ``Infinity``)."""
    return x if math.isfinite(x) else None


def component_dict(part: Part) -> dict[str, Any]:
    """One part and the stock line it is taken from (bin defaults, ``line`` null, when none)."""
    line, in_bin = line_of(part)
    return {
        "ohms": part.ohms,
        "line": line.line if in_bin else None,
        "location": line.location,
        "tolerance": line.tolerance,
        "watts": line.power_rating_w,
        "max_volts": line.max_volts,
        "tcr_ppm": line.tcr_ppm,
    }


def pick_dict(p: PickLine) -> dict[str, Any]:
    """One pick-list entry: the stock line, how many, and its markings (see the contract above)."""
    m = pick_marking(p.ohms, p.line.tolerance, p.line.package)
    return {"ohms": p.ohms, "count": p.count, "location": p.location, "line": p.line.line,
            "tolerance": p.line.tolerance, "watts": p.line.power_rating_w, "max_volts": p.line.max_volts,
            "rkm": m.rkm, "bands": list(m.bands) if m.bands else None, "smd_code": m.smd_code, "eia96": m.eia96}


def candidate_dict(c: Candidate, proven: bool | None = None, method: str | None = None) -> dict[str, Any]:
    out: dict[str, Any] = {
        "parts": c.parts,
        "expression": c.expression,
        "value_ohms": c.value_ohms,
        "error": c.error,
        "verified_ohms": c.verified_ohms,
    }
    if proven is not None:
        out["proven"] = proven
        out["method"] = method
    out["components"] = [component_dict(p) for p in c.components]
    return out


def stress_list(s: NetworkStress) -> list[dict[str, Any]]:
    return [
        {
            "value_ohms": p.ohms,
            "volts": p.volts,
            "amps": p.amps,
            "watts": p.watts,
            "limit_watts": p.limit_watts,
            "limit_volts": p.limit_volts,
            "power_use": _finite(p.power_use),
            "voltage_use": p.voltage_use,
            "headroom": _finite(p.headroom),
            "binding": p.binding,
            "in_bin": p.in_bin,
            "line": p.line.line if p.in_bin else None,
            "location": p.line.location,
        }
        for p in s.parts
    ]


def headroom_dict(s: NetworkStress) -> dict[str, Any]:
    """The network's headroom (factor on the drive) and the part and limit that set it."""
    i, limit = s.binding
    return {"factor": _finite(s.headroom), "part": i, "limit": limit, "ohms": s.parts[i].ohms,
            "line": s.parts[i].line.line if s.parts[i].in_bin else None}


def point_dict(point: OperatingPoint | None) -> dict[str, Any] | None:
    if point is None:
        return None
    return {"volts": point.volts, "amps": point.amps, "watts": point.watts, "duty": point.duty,
            "ambient_c": point.ambient_c, "mains": point.mains}


def derating_dict(d: Derating) -> dict[str, float]:
    return {"power_factor": d.power_factor, "voltage_factor": d.voltage_factor}


def review_dict(r: Review) -> dict[str, Any]:
    mc = r.monte_carlo
    return {
        "worst_case_ohms": [r.band.low_ohms, r.band.high_ohms],
        "rss_rel": r.band.rss_rel,
        "sigma_rel": r.band.sigma_rel,
        "monte_carlo": {
            "samples": mc.samples, "seed": mc.seed, "mean_rel": mc.mean_rel, "sigma_rel": mc.sigma_rel,
            "low_rel": mc.low_rel, "high_rel": mc.high_rel, "spec": mc.spec, "yield": mc.yield_fraction,
        },
        "tcr_ppm": r.tcr_ppm,
        "at_temp": None if r.at_temp_ohms is None
        else {"temp_c": r.temp_c, "low_ohms": r.at_temp_ohms[0], "high_ohms": r.at_temp_ohms[1]},
        "cautions": list(r.cautions),
        "notes": list(r.notes),
        "not_in_bin": list(r.not_in_bin),
    }


def design_dict(d: Design) -> dict[str, Any]:
    """The JSON-ready dict of the ``make`` contract above."""
    frontier = []
    for e in d.frontier:
        row = {**candidate_dict(e.best, e.proven, e.method),
               "alternatives": [candidate_dict(a) for a in e.alternatives]}
        row["status"] = ("proven best" if e.proven else e.row.status or
                         ("best found" if e.method == "exhaustive" else "array"))
        row["status_note"] = e.row.note
        row["fewest"] = e.row.fewest
        if e.stress is not None:
            row["stress"] = stress_list(e.stress)
            row["headroom"] = _finite(e.stress.headroom)
            row["binding"] = headroom_dict(e.stress)
        frontier.append(row)
    chosen = next(e for e in d.frontier if e.best is d.best)
    b = d.bound
    return {
        "target_ohms": d.target_ohms,
        "bin": d.bin_name,
        "max_parts": d.max_parts,
        "within": d.within,
        "frontier": frontier,
        "best": candidate_dict(d.best, chosen.proven, chosen.method),
        "pick_list": [pick_dict(p) for p in d.pick_list],
        "operating_point": point_dict(d.point),
        "derating": derating_dict(d.derating),
        "prefer": d.prefer,
        "lower_bound": None if b is None
        else {"count": b.count, "by_power": b.by_power, "by_voltage": b.by_voltage, "text": b.explain()},
        "value_parts": d.value_parts,
        "reach": {"parts": d.reach.parts, "low_ohms": d.reach.low_ohms if d.reach.low_ohms > 0 else None,
                  "high_ohms": _finite(d.reach.high_ohms), "text": d.reach.explain()},
        "within_met": d.within_met,
        "part_limit": d.part_limit,
        "exhaustive_parts": d.exhaustive_parts,
        "review": review_dict(d.review),
        "status": "ok" if d.review.ok else "over_limit",
        "verification": VERIFICATION,
        "seconds": round(d.seconds, 4),
    }


def check_dict(c: Candidate, r: Review) -> dict[str, Any]:
    """The JSON-ready dict of the ``check`` contract above."""
    out = {
        "expression": c.expression,
        "parts": c.parts,
        "value_ohms": c.value_ohms,
        "verified_ohms": c.verified_ohms,
        "error": c.error,
        **review_dict(r),
        "operating_point": point_dict(r.point),
        "status": "ok" if r.ok else "over_limit",
        "verification": VERIFICATION,
    }
    out["components"] = [component_dict(p) for p in c.components]
    if r.stress is not None:
        out["stress"] = stress_list(r.stress)
        out["headroom"] = _finite(r.stress.headroom)
        out["binding"] = headroom_dict(r.stress)
    return out
