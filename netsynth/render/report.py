"""Plain-text reports of a design (``make``) and of a checked network (``check``)."""

from __future__ import annotations

import math

from netsynth.analysis.review import Review
from netsynth.design import Candidate, Design
from netsynth.nodal import VERIFY_RTOL
from netsynth.render.compact import LEGEND, compact, is_compacted
from netsynth.render.diagram import draw
from netsynth.render.picklist import pick_table
from netsynth.values import format_error, format_ohms, to_code

#: networks with more parts than this are written in the compact form (Ns(X), Np(X)); every network is drawn
DRAW_PARTS = 12


#: errors smaller than this are float noise of an exact hit (a few ulps), shown as 0
EXACT = 1e-12


def _parts(n: int) -> str:
    return f"{n} part" if n == 1 else f"{n} parts"


def _ppm(error: float) -> str:
    if abs(error) < EXACT:
        return "0"
    ppm = error * 1e6
    if abs(ppm) >= 1e7:  # a target far out of reach: digits beyond the first few say nothing
        return f"{ppm:+.3g}"
    return f"{ppm:+.1f}" if abs(ppm) >= 0.1 else f"{ppm:+.2g}"


def _pct(error: float) -> str:
    if abs(error) < EXACT:
        return "0"
    pct = error * 100
    if abs(pct) >= 1e5:
        return f"{pct:+.3g}"
    return f"{pct:+.4f}" if abs(pct) >= 1e-4 else f"{pct:+.2g}"


def _headroom(h: float) -> str:
    return "∞" if math.isinf(h) else f"{h:.3g}×"


def _share(use: float) -> str:
    return "∞" if math.isinf(use) else f"{use * 100:.3g} %"


def table(rows: list[tuple[str, ...]], align: str) -> list[str]:
    """Rows of cells as aligned text; ``align`` has one 'l' or 'r' per column."""
    widths = [max(len(r[i]) for r in rows) for i in range(len(rows[0]))]
    out = []
    for r in rows:
        cells = [c.rjust(w) if a == "r" else c.ljust(w) for c, w, a in zip(r, widths, align)]
        out.append("  ".join(cells).rstrip())
    return out


def _proof(entry) -> str:
    if entry.proven:
        return "proven best"
    if entry.row.status:  # a CP-SAT row says what the solver proved
        return entry.row.status
    return "best found" if entry.method == "exhaustive" else f"array: {entry.method}"


def _larger(d: Design) -> str:
    """What searched the counts above the exhaustive range, from the rows shown."""
    methods = {e.method for e in d.frontier}
    cpsat = any(e.method.startswith("cp-sat") or e.row.status for e in d.frontier)
    arrays = any(m != "exhaustive" and not m.startswith("cp-sat") for m in methods)
    if cpsat:
        return "CP-SAT families and regular arrays" if arrays else "CP-SAT families"
    return "regular arrays"


def _proof_notes(d: Design) -> list[str]:
    """What each CP-SAT row's status promises, and the rows no network of any shape can beat on parts."""
    out: list[str] = []
    for e in d.frontier:
        if e.row.note and f"({e.row.note})" not in out:
            out.append(f"({e.row.note})")
    why = d.bound.explain() if d.bound is not None else d.reach.explain()
    for e in d.frontier:
        if e.row.fewest:
            limits = " and keeps every part within its limits" if d.point is not None else ""
            close = "exactly" if abs(e.best.error) < EXACT else f"within ±{format_error(abs(e.best.error)).lstrip('+')}"
            out.append(f"Fewest parts: no network of any shape with fewer than {e.parts} parts lands {close}{limits} "
                       f"({why})")
    return out


def design_text(d: Design, show_alternatives: bool = False, ascii: bool = False) -> str:
    """The frontier table, the recommended network drawn, its pick list, checks and cautions.

    ``ascii`` draws the network with ``-``, ``+`` and ``|`` only.
    """
    limit = f"up to {_parts(d.part_limit)}" + ("" if d.max_parts else " (as needed)" if d.point or d.value_parts > 1 else "")
    out = [f"Target {format_ohms(d.target_ohms, 6)}   bin: {d.bin_name}   {limit}"]
    if d.within is not None:
        out[0] += f"   within ±{format_error(d.within).lstrip('+')}"
    if d.point is not None:
        out.append(
            f"Operating point: {d.point.describe()}; parts derated to {d.derating.power_factor:.0%} of power "
            f"and {d.derating.voltage_factor:.0%} of voltage"
        )
    if d.bound is not None:
        out.append(f"Lower bound: {d.bound.explain()}")
    if d.exhaustive_parts == 0:
        out.append(f"Search: regular arrays of up to {d.part_limit} parts (too many parts for the exhaustive search)")
    elif d.exhaustive_parts < d.part_limit:
        above = d.exhaustive_parts + 1
        span = f"at {above}" if above == d.part_limit else f"from {above} to {d.part_limit}"
        out.append(
            f"Exhaustive search up to {d.exhaustive_parts} parts; {span} parts, {_larger(d)} "
            "(listed only where they improve on fewer parts)"
        )
    reach = d.reach
    if reach.parts is None:
        out.append("Out of reach: " + reach.explain())
    elif reach.parts > d.part_limit:
        out.append(f"Out of reach with {d.part_limit} parts: {reach.explain()}; ask for --max-parts {reach.parts} "
                   "or more to reach it")
    elif reach.parts > 1:
        out.append("Reach: " + reach.explain())
    out.append("")
    stressed = d.point is not None
    head = ("parts", "network", "value", "error %", "ppm") + (("headroom",) if stressed else ()) + ("proof",)
    rows = [head]
    shown = [e.best for e in d.frontier]
    for e in d.frontier:
        c = e.best
        cells = (str(c.parts), compact(c.network), format_ohms(c.value_ohms, 6), _pct(c.error), _ppm(c.error))
        if stressed:
            cells += (_headroom(e.stress.headroom) if e.stress else "",)
        rows.append(cells + (_proof(e),))
        if show_alternatives:
            for a in e.alternatives:
                alt = ("", "  or " + compact(a.network), format_ohms(a.value_ohms, 6), _pct(a.error), _ppm(a.error))
                rows.append(alt + (("",) if stressed else ()) + ("",))
                shown.append(a)
    out += table(rows, "rlrrr" + ("r" if stressed else "") + "l")
    if any(is_compacted(c.network) for c in shown):
        out.append(f"({LEGEND})")
    out += _proof_notes(d)
    b = d.best
    off = "exact" if abs(b.error) < EXACT else format_error(b.error)
    shown_as = compact(b.network) if b.parts > DRAW_PARTS else b.expression
    out += ["", f"Recommended ({d.prefer} first): {shown_as}  =  {format_ohms(b.value_ohms, 6)}  ({off})", ""]
    out.append(_drawing(b, d.review, ascii))
    out.append("")
    if d.within is not None and d.within_met is False:
        out.append(f"Not within ±{format_error(d.within).lstrip('+')}: no network of up to {d.part_limit} parts "
                   "from this bin lands inside it; the closest is shown")
    out += pick_lines(d.pick_list)
    out.append(_verified(b))
    if all(e.proven for e in d.frontier):
        out.append("Proven best: no network of that many parts from this bin lands closer (exhaustive search).")
    elif any(e.row.status for e in d.frontier):
        out.append(
            "Rows marked 'in family' are proven by CP-SAT within that family only; rows marked 'best found' or "
            "'array' are the best the search found, not proven."
        )
    else:
        out.append(
            "Rows marked 'best found' or 'array' are the best the search found, not proven: with an operating "
            "point larger counts come from regular arrays."
        )
    out += [""] + review_lines(d.review)
    return "\n".join(out)


def _watts_text(w: float) -> str:
    return {0.125: "⅛ W", 0.25: "¼ W", 0.5: "½ W"}.get(w, f"{w:g} W")


def pick_lines(picks) -> list[str]:
    """The pick list: one line per stock line (ratings, location, bin line), and under it the
    part's marking per IEC 60062 (:mod:`netsynth.render.picklist` chooses the codes)."""
    entries = pick_table(picks)
    out = ["Take from the bin:"] if entries else []
    for row, (_, marking) in zip(table([cells for cells, _ in entries], "rllrrll") if entries else [], entries):
        out += ["  " + row, "      " + marking]
    return out


def _drawing(c: Candidate, r: Review, ascii: bool) -> str:
    """The network drawn, each part with its power when there is an operating point."""
    watts = None if r.stress is None else [p.watts for p in r.stress.parts]
    return draw(c.network, watts=watts, ascii=ascii)


def _verified(c: Candidate) -> str:
    rel = abs(c.verified_ohms / c.value_ohms - 1)
    return (
        f"Verified: nodal analysis gives {format_ohms(c.verified_ohms, 9)} "
        f"(agrees within {rel:.1e}; every row checked to {VERIFY_RTOL:.0e})"
    )


def review_lines(r: Review) -> list[str]:
    """Bands, drift, per-part stress, cautions and notes."""
    b, mc = r.band, r.monte_carlo
    low, high = b.worst_rel
    out = [
        f"Tolerance: worst case {format_ohms(b.low_ohms, 6)} .. {format_ohms(b.high_ohms, 6)} "
        f"({low * 100:+.3g} % .. {high * 100:+.3g} %); statistical ±{b.rss_rel * 100:.3g} % (RSS), "
        f"σ {b.sigma_rel * 100:.3g} % (parts uniform in their band, independent)",
        f"Monte Carlo ({mc.samples} builds, seed {mc.seed}): σ {mc.sigma_rel * 100:.3g} %, "
        f"99 % of builds within {mc.low_rel * 100:+.3g} % .. {mc.high_rel * 100:+.3g} %"
        + (f"; yield within ±{mc.spec * 100:.3g} % of target: {mc.yield_fraction * 100:.1f} %" if mc.spec is not None else ""),
        f"Temperature: up to ±{r.tcr_ppm:.3g} ppm/K"
        + (
            f"; at {r.temp_c:g} °C: {format_ohms(r.at_temp_ohms[0], 6)} .. {format_ohms(r.at_temp_ohms[1], 6)}"
            if r.at_temp_ohms is not None
            else ""
        ),
    ]
    if r.not_in_bin:
        out.append("Not in the bin (bin defaults assumed): " + ", ".join(to_code(v) for v in r.not_in_bin))
    if r.stress is not None:
        s = r.stress
        out += [
            "",
            f"At {r.point.describe()}: {s.volts:.4g} V, {s.amps:.4g} A, {s.watts:.4g} W in the network",
        ]
        i, limit = s.binding
        drive = "voltage" if r.point.volts is not None else "current" if r.point.amps is not None else "power"
        out.append(f"Headroom: the {drive} may grow {_headroom(s.headroom)} before a part reaches a limit "
                   f"({limit} of {to_code(s.parts[i].ohms)}" + (f" at {s.parts[i].line.location}" if
                                                               s.parts[i].line.location else "") + ")")
        rows = [("parts", "value", "rating", "volts", "amps", "watts", "limit W", "limit V", "power", "voltage",
                 "headroom", "")]
        # parts under identical stress (as printed) share one row
        groups: dict[tuple[str, ...], int] = {}
        for p in s.parts:
            cells = (
                to_code(p.ohms), _watts_text(p.line.power_rating_w) + ("" if p.in_bin else "?"),
                f"{p.volts:.4g}", f"{p.amps:.4g}", f"{p.watts:.4g}",
                f"{p.limit_watts:.4g}", f"{p.limit_volts:.4g}", _share(p.power_use), _share(p.voltage_use),
                _headroom(p.headroom) + f" {p.binding[0]}", "OVER LIMIT" if not p.ok else "",
            )
            groups[cells] = groups.get(cells, 0) + 1
        rows += [(f"{n} ×",) + cells for cells, n in groups.items()]
        out += table(rows, "rllrrrrrrrrl")
        out.append("(power, voltage: share of the part's derated limit used; headroom: factor on the drive, "
                   "p/v = the limit it reaches first)")
    for c in r.cautions:
        out.append(f"Caution: {c}")
    for n in r.notes:
        out.append(f"Note: {n}")
    return out


def check_text(c: Candidate, r: Review, ascii: bool = False) -> str:
    """Report of one network the user typed (``ascii``: the drawing in plain ASCII)."""
    out = [
        f"Network: {compact(c.network) if c.parts > DRAW_PARTS else c.expression}  ({_parts(c.parts)})",
        f"Value: {format_ohms(c.value_ohms, 6)}" + ("" if c.error == 0 else f"  (target error {format_error(c.error)})"),
        _verified(c),
        "",
        _drawing(c, r, ascii),
        "",
    ]
    return "\n".join(out + review_lines(r))
