"""JSON forms of a design and of a checked network.

The contract (stable; later work adds keys, never removes these)::

    make:
    {
      "target_ohms": float, "bin": str, "max_parts": int | null, "within": float | null,
      "frontier": [            # one entry per part count, ascending
        {"parts": int, "expression": str, "value_ohms": float,
         "error": float,       # signed relative error, value / target - 1
         "verified_ohms": float, "proven": bool, "method": str,
         "alternatives": [{"parts", "expression", "value_ohms", "error", "verified_ohms"}],
         "stress": [...],      # only with an operating point, one entry per part (below)
         "headroom": float}    # only with an operating point
      ],
      "best": {"parts", "expression", "value_ohms", "error", "verified_ohms"},
      "pick_list": [{"ohms": float, "count": int, "location": str}],
      "operating_point": {...} | null, "derating": {...}, "prefer": str,
      "lower_bound": {"count", "by_power", "by_voltage", "text"} | null,
      "value_parts": int,      # the fewest parts that can reach the target from the bin's values
      "part_limit": int,       # the largest part count searched
      "exhaustive_parts": int, # counts up to this were searched exhaustively; above it, regular arrays
      "review": {review of "best", below},
      "status": "ok" | "over_limit",
      "verification": {"method": str, "rtol": float},
      "seconds": float
    }

    stress entry: {"value_ohms", "volts", "amps", "watts", "limit_watts", "limit_volts",
                   "headroom", "in_bin", "location"}
                   (volts and amps peak; watts average; limits derated)

    check:
    {"expression", "value_ohms", "verified_ohms", "worst_case_ohms": [low, high],
     "stress": [...] (with an operating point), plus the review keys and "status"}

    review: {"worst_case_ohms": [low, high], "rss_rel", "sigma_rel", "monte_carlo": {...},
             "tcr_ppm", "at_temp": {"temp_c", "low_ohms", "high_ohms"} | null,
             "cautions": [str], "notes": [str], "not_in_bin": [float]}
"""

from __future__ import annotations

import math
from typing import Any

from netsynth.analysis.conditions import Derating, OperatingPoint
from netsynth.analysis.review import Review
from netsynth.analysis.stress import NetworkStress
from netsynth.design import Candidate, Design
from netsynth.nodal import VERIFY_RTOL

VERIFICATION = {"method": "nodal analysis (conductance matrix solve)", "rtol": VERIFY_RTOL}


def _finite(x: float) -> float | None:
    return x if math.isfinite(x) else None


def candidate_dict(c: Candidate) -> dict[str, Any]:
    return {
        "parts": c.parts,
        "expression": c.expression,
        "value_ohms": c.value_ohms,
        "error": c.error,
        "verified_ohms": c.verified_ohms,
    }


def stress_list(s: NetworkStress) -> list[dict[str, Any]]:
    return [
        {
            "value_ohms": p.ohms,
            "volts": p.volts,
            "amps": p.amps,
            "watts": p.watts,
            "limit_watts": p.limit_watts,
            "limit_volts": p.limit_volts,
            "headroom": _finite(p.headroom),
            "in_bin": p.in_bin,
            "location": p.item.location,
        }
        for p in s.parts
    ]


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
        row = {**candidate_dict(e.best), "proven": e.proven, "method": e.method,
               "alternatives": [candidate_dict(a) for a in e.alternatives]}
        if e.stress is not None:
            row["stress"] = stress_list(e.stress)
            row["headroom"] = _finite(e.stress.headroom)
        frontier.append(row)
    b = d.bound
    return {
        "target_ohms": d.target_ohms,
        "bin": d.bin_name,
        "max_parts": d.max_parts,
        "within": d.within,
        "frontier": frontier,
        "best": candidate_dict(d.best),
        "pick_list": [{"ohms": p.ohms, "count": p.count, "location": p.location} for p in d.pick_list],
        "operating_point": point_dict(d.point),
        "derating": derating_dict(d.derating),
        "prefer": d.prefer,
        "lower_bound": None if b is None
        else {"count": b.count, "by_power": b.by_power, "by_voltage": b.by_voltage, "text": b.explain()},
        "value_parts": d.value_parts,
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
    if r.stress is not None:
        out["stress"] = stress_list(r.stress)
        out["headroom"] = _finite(r.stress.headroom)
    return out
