"""Text and JSON forms of a divider design and of an RC timing answer.

The ``divider`` JSON contract (stable; later work adds keys, never removes these)::

    {
      "goal": {"kind": "ratio" | "voltage" | "regulator", "ratio": float | null,
               "vin": float | null, "vout": float | null, "vref": float | null,
               "pin_current_a": float, "quantity": "ratio" | "vout", "target": float},
      "bin": str, "max_parts": int,            # parts of both arms together
      "total_ohms": [low, high] | null,        # window on Rtop + Rbottom
      "min_current_a": float | null,
      "frontier": [row, ...],                  # one per total part count with a feasible pair
      "best": row,
      "band": {"ratio": [low, high],           # exact worst case over the parts' tolerances
               "output": [low, high],          # Vout in volts (with the reference tolerance), or the ratio
               "output_rel": [low, high],      # the same as fractions of the target
               "vref_tolerance": float},
      "tempco_ppm": {"tracking": float,        # ± ppm/K of the output, parts drifting together
                     "worst": float},          # ± ppm/K, each part drifting either way
      "sensitivity": {"top": float, "bottom": float},   # ∂ln(output)/∂ln(arm)
      "current_a": float | null,               # divider current: the bottom arm's, at nominal
      "pin_rule": {"factor": 100, "least_current_a": float, "met": bool} | null,  # with a pin current
      "output_ohms": float,                    # Thévenin resistance at the middle node, Rtop ∥ Rbottom
      "loads": {"top": load, "bottom": load} | null,    # null for a bare ratio
      "pick_list": [{"ohms", "count", "location", "line", "tolerance", "watts", "max_volts"}],
      "status": "ok" | "over_limit", "cautions": [str], "notes": [str],
      "method": str, "verification": {"method", "rtol"}, "seconds": float
    }

    row:  {"parts": int, "top": arm, "bottom": arm,
           "ratio": float,                     # Rbottom / (Rtop + Rbottom)
           "vout": float,                      # only where a voltage was given
           "error": float,                     # relative error of vout, else of the ratio
           "proven": bool}
    arm:  {"expression", "parts", "value_ohms", "verified_ohms", "components": [component, ...]}
          (component as in netsynth.render.json)
    load: {"volts": float, "watts": float, "headroom": float | null, "stress": [stress entry, ...]}
          (stress entry as in netsynth.render.json)

The ``rc`` JSON is the ``make`` object (:func:`netsynth.render.json.design_dict`, with
``target_ohms`` the computed resistance) plus::

    "rc": {"kind": "tau" | "corner", "unit": "s" | "Hz", "target": float,
           "cap_farads": float, "cap_tolerance": float,
           "achieved": float, "error": float, "band": [low, high],
           "tau_s": float,                     # with --tau: the achieved time constant
           "corner_hz": float}                 # with --corner: the achieved corner frequency
"""

from __future__ import annotations

import math
from typing import Any

from netsynth.jobs.divider import PIN_CURRENT_FACTOR, Arm, ArmLoad, DividerDesign, DividerGoal, DividerRow
from netsynth.jobs.rc import RcResult
from netsynth.nodal import VERIFY_RTOL
from netsynth.render.compact import LEGEND, compact, is_compacted
from netsynth.render.diagram import draw
from netsynth.render.json import VERIFICATION, component_dict, stress_list
from netsynth.render.report import pick_lines, table
from netsynth.values import format_error, format_ohms, to_code

METHOD = ("exhaustive joint search: for every split of the parts between the arms, every network of the "
          "smaller arm against the nearest networks of the other arm to its ideal value")

#: errors smaller than this are float noise of an exact hit
EXACT = 1e-12
#: SI prefixes for output (SI Brochure, 9th ed., Table 7)
_PREFIXES = {-12: "p", -9: "n", -6: "µ", -3: "m", 0: "", 3: "k", 6: "M", 9: "G"}


def format_si(value: float, unit: str, digits: int = 4) -> str:
    """A quantity with an engineering prefix: ``format_si(3.3e-5, "A")`` -> ``'33 µA'``.

    >>> format_si(3.3e-5, "A"), format_si(0.0016, "s"), format_si(159.15494, "Hz", 5), format_si(3.3, "V")
    ('33 µA', '1.6 ms', '159.15 Hz', '3.3 V')
    """
    if value == 0 or not math.isfinite(value):
        return f"{value:g} {unit}"
    exp = int(math.floor(math.log10(abs(value)) / 3) * 3)
    exp = min(max(exp, -12), 9)
    mantissa = float(f"{value / 10 ** exp:.{digits}g}")
    if abs(mantissa) >= 1000 and exp < 9:  # rounding carried into the next prefix
        exp, mantissa = exp + 3, mantissa / 1000
    return f"{mantissa:g} {_PREFIXES[exp]}{unit}"


def _pct(error: float) -> str:
    if abs(error) < EXACT:
        return "0"
    pct = error * 100
    return f"{pct:+.4f}" if abs(pct) >= 1e-4 else f"{pct:+.2g}"


def _ppm(error: float) -> str:
    if abs(error) < EXACT:
        return "0"
    ppm = error * 1e6
    return f"{ppm:+.1f}" if abs(ppm) >= 0.1 else f"{ppm:+.2g}"


# ---------------------------------------------------------------- JSON


def arm_dict(arm: Arm) -> dict[str, Any]:
    return {
        "expression": arm.expression,
        "parts": arm.parts,
        "value_ohms": arm.value_ohms,
        "verified_ohms": arm.verified_ohms,
        "components": [component_dict(p) for p in arm.components],
    }


def row_dict(row: DividerRow, has_voltage: bool) -> dict[str, Any]:
    out: dict[str, Any] = {"parts": row.parts, "top": arm_dict(row.top), "bottom": arm_dict(row.bottom),
                           "ratio": row.ratio}
    if has_voltage:
        out["vout"] = row.output
    out["error"] = row.error
    out["proven"] = row.proven
    return out


def _load_dict(load: ArmLoad) -> dict[str, Any]:
    h = load.stress.headroom
    return {"volts": load.volts, "watts": load.stress.watts, "headroom": h if math.isfinite(h) else None,
            "stress": stress_list(load.stress)}


def divider_dict(d: DividerDesign) -> dict[str, Any]:
    """The JSON-ready dict of the ``divider`` contract above."""
    g, r = d.goal, d.review
    target = g.target
    return {
        "goal": {"kind": g.kind, "ratio": g.ratio, "vin": g.vin, "vout": g.vout, "vref": g.vref,
                 "pin_current_a": g.pin_current_a, "quantity": "vout" if g.has_voltage else "ratio",
                 "target": target},
        "bin": d.bin_name,
        "max_parts": d.max_parts,
        "total_ohms": None if d.total_ohms is None else list(d.total_ohms),
        "min_current_a": d.min_current_a,
        "frontier": [row_dict(row, g.has_voltage) for row in d.rows],
        "best": row_dict(d.best, g.has_voltage),
        "band": {"ratio": list(r.ratio_band), "output": list(r.output_band),
                 "output_rel": [r.output_band[0] / target - 1, r.output_band[1] / target - 1],
                 "vref_tolerance": r.vref_tolerance},
        "tempco_ppm": {"tracking": r.tempco_tracking_ppm, "worst": r.tempco_worst_ppm},
        "sensitivity": {"top": r.sensitivity_top, "bottom": r.sensitivity_bottom},
        "current_a": r.current_a,
        "pin_rule": None if r.pin_rule_a is None
        else {"factor": PIN_CURRENT_FACTOR, "least_current_a": r.pin_rule_a, "met": r.pin_rule_met},
        "output_ohms": r.output_ohms,
        "loads": None if r.loads is None else {"top": _load_dict(r.loads[0]), "bottom": _load_dict(r.loads[1])},
        "pick_list": [{"ohms": p.ohms, "count": p.count, "location": p.location, "line": p.line.line,
                       "tolerance": p.line.tolerance, "watts": p.line.power_rating_w,
                       "max_volts": p.line.max_volts} for p in d.pick_list],
        "status": "ok" if r.ok else "over_limit",
        "cautions": list(r.cautions),
        "notes": list(r.notes),
        "method": METHOD,
        "verification": VERIFICATION,
        "seconds": round(d.seconds, 4),
    }


def rc_dict(result: RcResult, design_json: dict[str, Any]) -> dict[str, Any]:
    """The ``make`` JSON of the resistor plus the ``rc`` keys above."""
    g = result.goal
    rc = {"kind": g.kind, "unit": g.unit, "target": g.value, "cap_farads": g.cap_farads,
          "cap_tolerance": g.cap_tolerance, "achieved": result.achieved, "error": result.error,
          "band": [result.low, result.high], ("tau_s" if g.kind == "tau" else "corner_hz"): result.achieved}
    return {**design_json, "rc": rc}


# ---------------------------------------------------------------- text


def goal_text(g: DividerGoal) -> str:
    """One line: what the divider must do, with units."""
    if g.kind == "ratio":
        return f"ratio {g.ratio:.6g} (Rbottom / (Rtop + Rbottom))"
    if g.kind == "voltage":
        return f"Vout {format_si(g.vout, 'V', 6)} from Vin {format_si(g.vin, 'V', 6)} (ratio {g.ratio:.6g}, unloaded)"
    text = f"Vout {format_si(g.vout, 'V', 6)} from a {g.vref:g} V reference, Vout = Vref·(1 + Rtop/Rbottom)"
    if g.pin_current_a:
        text += f" + Ipin·Rtop, Ipin {format_si(g.pin_current_a, 'A')}"
    return text


def _terminals(kind: str) -> tuple[str, str, str]:
    return {"voltage": ("IN", "OUT", "GND"), "regulator": ("OUT", "FB", "GND")}.get(kind, ("HI", "MID", "LO"))


def _output_text(d: DividerDesign, value: float) -> str:
    return format_si(value, "V", 6) if d.goal.has_voltage else f"{value:.6g}"


def divider_text(d: DividerDesign) -> str:
    """The frontier of pairs, the recommended divider drawn, its pick list, bands, drift, loads and cautions."""
    g, r, b = d.goal, d.review, d.best
    out = [f"Divider: {goal_text(g)}",
           f"Bin: {d.bin_name}   up to {d.max_parts} parts in both arms together"]
    limits = []
    if d.total_ohms is not None:
        limits.append(f"Rtop + Rbottom {format_ohms(d.total_ohms[0])} .. {format_ohms(d.total_ohms[1])}")
    if d.min_current_a is not None:
        limits.append(f"divider current at least {format_si(d.min_current_a, 'A')}")
    if limits:
        out.append("Limits: " + "; ".join(limits))
    out.append("")
    quantity = "Vout" if g.has_voltage else "ratio"
    rows = [("parts", "top", "bottom", "ratio") + (("Vout",) if g.has_voltage else ()) + ("error %", "ppm", "proof")]
    for row in d.rows:
        cells = (str(row.parts), compact(row.top.network), compact(row.bottom.network), f"{row.ratio:.6f}")
        if g.has_voltage:
            cells += (format_si(row.output, "V", 6),)
        rows.append(cells + (_pct(row.error), _ppm(row.error), "proven best" if row.proven else "best found"))
    out += table(rows, "rlll" + ("r" if g.has_voltage else "") + "rrl")
    if any(is_compacted(row.top.network) or is_compacted(row.bottom.network) for row in d.rows):
        out.append(f"({LEGEND})")
    off = "exact" if abs(b.error) < EXACT else format_error(b.error)
    out += ["", f"Recommended: top {b.top.expression}, bottom {b.bottom.expression}  =  {quantity} "
                f"{_output_text(d, b.output)}  ({off})", ""]
    high, mid, low = _terminals(g.kind)
    out += [f"Top arm ({format_ohms(b.top.value_ohms, 6)}):", draw(b.top.network, high, mid),
            f"Bottom arm ({format_ohms(b.bottom.value_ohms, 6)}):", draw(b.bottom.network, mid, low), ""]
    out += pick_lines(d.pick_list)
    worst = max(abs(a.verified_ohms / a.value_ohms - 1) for a in (b.top, b.bottom))
    out.append(f"Verified: nodal analysis gives top {format_ohms(b.top.verified_ohms, 9)}, bottom "
               f"{format_ohms(b.bottom.verified_ohms, 9)} (agree within {worst:.1e}; every row checked to "
               f"{VERIFY_RTOL:.0e})")
    if all(row.proven for row in d.rows):
        out.append("Proven best: no pair of arms of that many parts in all from this bin lands closer "
                   "(exhaustive joint search).")
    out.append("")
    lo, hi = r.output_band
    rel = f"{(lo / g.target - 1) * 100:+.3g} % .. {(hi / g.target - 1) * 100:+.3g} %"
    with_ref = f" and the reference ±{r.vref_tolerance * 100:g} %" if r.vref_tolerance else ""
    out.append(f"Band: {quantity} {_output_text(d, lo)} .. {_output_text(d, hi)} ({rel}) with every part at "
               f"either end of its tolerance{with_ref} (worst case)")
    if g.has_voltage:
        out.append(f"      ratio {r.ratio_band[0]:.6f} .. {r.ratio_band[1]:.6f}")
    out.append(f"Temperature: {quantity} ±{r.tempco_tracking_ppm:.3g} ppm/K if the parts track (equal tcr in both "
               f"arms cancels), up to ±{r.tempco_worst_ppm:.3g} ppm/K if each drifts its own way"
               + (" (reference drift not included)" if g.kind == "regulator" else ""))
    line = f"Output resistance (Rtop ∥ Rbottom): {format_ohms(r.output_ohms, 4)}"
    if r.current_a is not None:
        line = f"Divider current: {format_si(r.current_a, 'A')}; " + line[0].lower() + line[1:]
    out.append(line)
    if r.loads is not None:
        out.append("")
        rows = [("arm", "parts", "value", "volts", "watts", "limit", "power", "headroom")]
        for name, load in zip(("top", "bottom"), r.loads):
            groups: dict[tuple[str, ...], int] = {}
            for p in load.stress.parts:
                cells = (to_code(p.ohms), format_si(p.volts, "V"), format_si(p.watts, "W", 3),
                         format_si(p.limit_watts, "W", 3),
                         f"{p.power_use * 100:.3g} %", "∞" if math.isinf(p.headroom) else f"{p.headroom:.3g}×")
                groups[cells] = groups.get(cells, 0) + 1
            rows += [(name, f"{n} ×") + cells for cells, n in groups.items()]
        out.append(f"Load: top {format_si(r.loads[0].volts, 'V')}, {format_si(r.loads[0].stress.watts, 'W')}; "
                   f"bottom {format_si(r.loads[1].volts, 'V')}, {format_si(r.loads[1].stress.watts, 'W')}")
        out += ["  " + line for line in table(rows, "lrlrrrrr")]
    out += [f"Caution: {c}" for c in r.cautions]
    if r.pin_rule_met is not None:
        verdict = "meets" if r.pin_rule_met else "falls short of"
        out.append(f"Note: the divider current {format_si(r.current_a, 'A')} {verdict} the common rule (common "
                   f"practice, no source) of at least {PIN_CURRENT_FACTOR:g} × the pin current = "
                   f"{format_si(r.pin_rule_a, 'A')}")
    out += [f"Note: {n}" for n in r.notes]
    return "\n".join(out)


def rc_text(result: RcResult, design_report: str) -> str:
    """The RC goal and result lines around the ``make`` report of the resistor."""
    g = result.goal
    name = "τ" if g.kind == "tau" else "f"
    target = format_si(g.value, g.unit, 6)
    off = "exact" if abs(result.error) < EXACT else format_error(result.error)
    cap = format_si(g.cap_farads, "F") + (f" ±{g.cap_tolerance * 100:g} %" if g.cap_tolerance else "")
    formula = "R = τ/C" if g.kind == "tau" else "R = 1/(2π·f·C)"
    head = f"RC: {name} = {target} with C = {cap}: {formula} = {format_ohms(g.resistance_ohms, 6)}"
    tail = [
        "",
        f"Achieved: {name} = {format_si(result.achieved, g.unit, 6)} ({off}) with "
        f"{format_ohms(result.ohms, 6)} and C = {format_si(g.cap_farads, 'F')}",
        f"Band: {name} {format_si(result.low, g.unit, 5)} .. {format_si(result.high, g.unit, 5)} "
        f"({(result.low / g.value - 1) * 100:+.3g} % .. {(result.high / g.value - 1) * 100:+.3g} %) with the "
        "network at either end of its tolerance" + (f" and the capacitor ±{g.cap_tolerance * 100:g} %"
                                                     if g.cap_tolerance else " (capacitor taken as exact)"),
    ]
    return "\n".join([head, ""] + [design_report] + tail)
