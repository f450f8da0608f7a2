"""Large networks over two structured families, with CP-SAT: fewest parts within an accuracy, or closest.

Beyond the exhaustive search's few parts, this module searches two families that cover what
people build with many parts:

``banks``
    a series string of parallel banks: R = Σⱼ rⱼ with rⱼ = 1 / Σᵢ 1/Rᵢⱼ;
``strings``
    a parallel set of series strings: G = 1/R = Σⱼ gⱼ with gⱼ = 1 / Σᵢ Rᵢⱼ.

Each bank (string) holds 1 to :data:`BANK_PARTS` parts from at most two stock lines (two values,
or one value from two lines of different ratings); a network has at most ``max_banks`` banks
(strings), and never takes more parts of a line than the line holds. "Proven best within the
family" means within exactly this family.

Model (pattern form)
--------------------
numpy lists every bank (string) of the family, an *option*, that fits the stock (each line's
count) and lies below the top of the accuracy window on its own (a bank's r ≤ R_hi; a string's
g ≤ G_hi). An integer ``z_b ≥ 0`` counts the copies of option b. Constraints: the value inside the
window, ``Σ z_b ≤ max_banks``, ``Σ parts_b·z_b ≤ max_parts``, and a row per limited line
``Σ uses_{b,l}·z_b ≤ count_l``.

Power and voltage limits, exactly: with the part count fixed, each part's load follows in closed
form from the operating point and the network's own value R (each bank carries the string current,
each string sees the network voltage; Ohm's law, P = V²/R = I²R). For every part of an option that
gives a threshold (:func:`_reach`): a bank's parts stay within their limits while R ≥ some R_b, a
string's while R ≤ some R_s (G ≥ 1/R_s). Options within their limits nowhere in the window are
dropped, those within them everywhere are free, and the rest get a 0/1 "used" literal with the
linear row ``value ≥ threshold × used``: every network the model accepts keeps each part within its
own line's limits at the network's own value, including exactly at a limit (forty ¼ W parts
sharing 5 W).

Objective, as two stages (the first stage's optimum becomes a constraint of the second):
``prefer="parts"``: fewest parts, then the smallest |error| at that count;
``prefer="error"``: smallest |error|, then the fewest parts at that error.

Integer scaling (the solver takes integers only)
------------------------------------------------
Two scales, both chosen so that no coefficient passes about 2**40:

* the window and the limit thresholds in *fine* units of ``FINE`` = 2**-40 of the window's top
  value. Each option's value is rounded to the nearest fine unit, so n copies are off by at most
  n/2 of them; the rows use that bound (``Σ (2v_b − 1)·z_b ≥ 2·lo``, ``Σ (2v_b + 1)·z_b ≤ 2·hi``),
  so every network the model accepts is truly inside (one within about 1e-12 of an edge may be
  missed), and a threshold is met to about 1e-11, far below the stress check's 1e-9 slack;
* the error objective in units of ``(window width) / (UNITS_PER_BANK × max_banks)`` (1 ppm of the
  target for ±1 % and 16 banks), never finer than 2**-36 of the value. n copies are off by at most
  n/2 units, and the second stage stops within a gap of ``max(n/2, window/1000)`` units, so a
  proven error is within :attr:`FamilyAnswer.resolution` of the family's best.

Every answer's value is recomputed in floating point; the caller ties it to lines and verifies it
with the nodal solver and the per-part stress check. Large coefficients on 0/1 terms trip a
presolve rule of OR-Tools 9.15 (or-tools#5293: a wrong INFEASIBLE here), which
:func:`netsynth.search.solver.solve` switches off.

Pruning that keeps the proof
----------------------------
For fewest parts with an operating point: every part can dissipate at most ``p_max`` (the bin's
largest derated power), so a network of N parts dissipating P has ``N = P/p_max + Σᵢ (1 − Pᵢ/p_max)``
(energy conservation: the parts' powers add up to P). An option whose parts waste more than
``n_inc − P_min/p_max`` (each part's power taken at the window's worst point, an upper bound)
cannot be in any network of at most ``n_inc`` parts, where ``n_inc`` is a known network's part
count (an incumbent: the regular arrays, or a first solve over the well-used options) and P_min
the least power inside the window; it is dropped, and the proof stands. An option with more parts
than ``n_inc`` is dropped the same way.

References
----------
Power in series and parallel resistors: OpenStax *University Physics* Vol. 2, §10.2–10.3.
OR-Tools CP-SAT (``ortools/sat/python/cp_model.py``): ``new_int_var``, ``LinearExpr.weighted_sum``,
``minimize``, ``add_hint``; or-tools#5293 (presolve accumulating coefficients in 32 bits).
"""

from __future__ import annotations

import math
import time
from collections.abc import Callable
from dataclasses import dataclass
from typing import Literal

import numpy as np

from netsynth.analysis.conditions import Derating, OperatingPoint, limit_volts, limit_watts
from netsynth.errors import ArgumentError, InfeasibleError
from netsynth.network import Network, Part, parallel, resistance, series
from netsynth.search.exact import Found
from netsynth.search.solver import SolverSettings, Status, cp_model, solve
from netsynth.stock import StockBin, StockItem

Family = Literal["banks", "strings"]
FAMILIES: tuple[Family, ...] = ("banks", "strings")
#: what each family is, in words (for reports)
FAMILY_TEXT = {
    "banks": "a series string of parallel banks",
    "strings": "a parallel set of series strings",
}
#: parts per bank (string) at most
BANK_PARTS = 12
#: banks (strings) per network at most, unless the voltage needs more in series
MAX_BANKS = 48
#: units across the accuracy window per bank allowed (see "Integer scaling"): 1250 × 16 banks is
#: 20 000 units, 1 ppm of the target for ±1 %; the rounding bound grows with the banks, so does this
UNITS_PER_BANK = 1250
#: the finest unit, as a fraction of the window's top value: keeps row coefficients near 2**40
FINEST = 2.0 ** -36
#: the unit of the window and limit rows, a fraction of the window's top value: about 1e-12, far
#: below the 1e-9 slack of the stress check, and no coefficient above 2**40 (or-tools#5293)
FINE = 2.0 ** -40
#: options the model takes without pruning; more, and the caller decides (see family_search)
OPTION_CAP = 4000
#: rows of two-line options built per numpy step (bounds memory: about 100 MB per step)
CHUNK_ROWS = 2_000_000
#: two-line options (pairs of lines × splits of a bank) above which the families are not built at all
MAX_PAIR_ROWS = 150_000_000
#: options inside the value window above which the families are refused (each option costs a few
#: hundred bytes through the model's arrays; the model stalls far earlier, above OPTION_CAP)
MAX_OPTIONS_BUILT = 1_000_000
#: ``auto`` skips CP-SAT on bins with more stock lines than this (the pattern model stalls far below the
#: option counts such bins give; measured: E192 1 Ω..10 MΩ took 38 s and 11 GB before this guard)
AUTO_MAX_LINES = 200
#: a first solve over well-used options keeps those whose parts use at least this share of p_max
#: on average (a heuristic for an incumbent only; the proof comes from the exact prune after it)
WELL_USED = 0.7
#: relative slack on a limit (a part exactly at its limit must not be lost to the last bit)
STRESS_SLACK = 1e-9


@dataclass(frozen=True, slots=True)
class FamilyAnswer:
    """What one family search found, and what its status promises.

    ``status`` is ``optimal`` when both stages were proven (fewest parts, then the smallest error
    at that count; or the reverse), ``feasible`` when a time limit cut a stage short, and
    ``infeasible`` when the family holds no network inside the window and the limits (proven;
    ``found`` is then None).
    """

    family: Family
    found: Found | None  #: the network (parts tied to the lines the model chose), value and error in float
    status: Status
    first_proven: bool  #: the first stage (fewest parts, or smallest error) was proven
    parts_bound: int | None  #: a proven lower bound on the part count inside the family (prefer parts)
    error_bound: float | None  #: a proven lower bound on |error| inside the family (prefer error)
    prefer: str
    options: int  #: options in the model after pruning
    resolution: float  #: a proven error is within this of the family's best (a fraction of the target)
    seconds: float
    interrupted: bool = False  #: Ctrl-C stopped the solver: this is the best it had

    def describe(self) -> str:
        """The row's proof words."""
        if self.status == "optimal":
            return "proven best in family"
        if self.first_proven:
            return ("fewest parts proven in family" if self.prefer == "parts" else "closest proven in family")
        if self.prefer == "parts" and self.parts_bound is not None:
            return f"best found, bound {self.parts_bound} parts"
        if self.error_bound is not None:
            return f"best found, bound {self.error_bound * 1e6:.3g} ppm"
        return "best found, no bound"


@dataclass(frozen=True, slots=True)
class _Lines:
    items: tuple[StockItem, ...]
    ohms: np.ndarray
    cap: np.ndarray  #: parts each line may give (unlimited: the part limit)
    limited: np.ndarray  #: bool
    limit_w: np.ndarray
    limit_v: np.ndarray


@dataclass(frozen=True, slots=True)
class _Options:
    a: np.ndarray
    b: np.ndarray  #: -1: a single line
    ka: np.ndarray
    kb: np.ndarray
    value: np.ndarray  #: r (banks) or g (strings), SI
    watts: np.ndarray  #: the parts' total power at the window's worst point (0 without a point)
    floor: np.ndarray  #: the least network value (R for banks, G for strings) keeping its parts within limits; 0: any

    @property
    def parts(self) -> np.ndarray:
        return self.ka + self.kb

    def key(self, i: int) -> tuple[int, int, int, int]:
        """What option i is: (line a, line b or -1, parts of a, parts of b)."""
        return int(self.a[i]), int(self.b[i]), int(self.ka[i]), int(self.kb[i])

    def take(self, keep: np.ndarray) -> _Options:
        return _Options(self.a[keep], self.b[keep], self.ka[keep], self.kb[keep], self.value[keep], self.watts[keep],
                        self.floor[keep])

    def __len__(self) -> int:
        return len(self.a)


def family_search(
    target_ohms: float,
    stock: StockBin,
    family: Family,
    within: float,
    max_parts: int,
    point: OperatingPoint | None = None,
    derating: Derating = Derating(),
    prefer: Literal["parts", "error"] = "parts",
    incumbent: int | None = None,
    settings: SolverSettings = SolverSettings(),
    force: bool = False,
    on_progress: Callable[[str], None] | None = None,
) -> FamilyAnswer | None:
    """The best network of one family within ±``within`` of the target (see the module docstring).

    Parameters
    ----------
    target_ohms : the value wanted, ohms
    stock : the bin; no line gives more parts than it holds
    family : ``"banks"`` or ``"strings"``
    within : the accuracy window, a fraction above 0 (0.01 for ±1 %)
    max_parts : the largest part count
    point, derating : the operating point and margins; with a point, every part stays within its
        own line's derated limits anywhere inside the window
    prefer : ``"parts"`` (fewest parts, then error) or ``"error"`` (smallest error, then parts)
    incumbent : the part count of a network already known inside the window and the limits; used
        only to prune options (exactly, see the module docstring)
    settings : the solver's time limit (for this whole search), workers and seed
    force : search even when the model stays above :data:`OPTION_CAP` options after pruning
    on_progress : receives progress lines

    Returns
    -------
    FamilyAnswer or None
        None when the search was not run (too many options without ``force``: a large
        unconstrained request, where the pattern model stalls) or found nothing in its time limit.
        Ctrl-C during a solve returns what the solver had, ``interrupted`` set (``found`` None if
        it had nothing).

    Examples
    --------
    Forty ¼ W parts carry 5 W at 50 % derating (5 / 0.125 W). Five banks of eight 16 Ω parts make
    10 Ω (5 × 16/8) with every part at exactly 0.125 W ((√(5/10) A × 2 Ω)² / 16 Ω), so no family
    network does better:

    >>> from netsynth.stock import StockItem
    >>> drawer = StockBin((StockItem(10.0, 30), StockItem(16.0, 100), StockItem(22.0, 30)))
    >>> ans = family_search(10.0, drawer, "banks", 0.01, 80, OperatingPoint(watts=5.0))
    >>> ans.status, ans.found.parts, ans.found.error
    ('optimal', 40, 0.0)
    """
    start = time.perf_counter()
    if family not in FAMILIES:
        raise ArgumentError(f"family={family!r}: choose one of {', '.join(FAMILIES)}")
    if not (0 < within < 1):
        raise ArgumentError(f"within={within!r}: the family search needs an accuracy window above 0 and below 1")
    if prefer not in ("parts", "error"):
        raise ArgumentError(f"prefer={prefer!r}: choose parts or error")
    lines = _lines_of(stock, point, derating, max_parts)
    lo_r, hi_r = target_ohms * (1 - within), target_ohms * (1 + within)
    if family == "banks":
        lo, hi, goal = lo_r, hi_r, target_ohms
    else:
        lo, hi, goal = 1.0 / hi_r, 1.0 / lo_r, 1.0 / target_ohms
    banks = _max_banks(target_ohms, within, lines, point, family, max_parts)
    unit = max((hi - lo) / (UNITS_PER_BANK * banks), hi * FINEST)
    options = _options(family, lines, hi, unit, point, lo_r, hi_r)
    p_max = float(lines.limit_w.max()) if point is not None else 0.0
    least_watts = _least_watts(point, lo_r, hi_r) if point is not None else 0.0

    def prune(opts: _Options, n_inc: int | None) -> _Options:
        if n_inc is None or prefer != "parts":
            return opts
        keep = opts.parts <= n_inc
        if point is not None and p_max > 0:
            waste = opts.parts - opts.watts / p_max
            keep &= least_watts / p_max + waste <= n_inc + 1e-9
        return opts.take(keep)

    options = prune(options, incumbent)
    budget = settings.seconds
    hint: dict[tuple[int, int, int, int], int] = {}  # a network already found, as copies per option
    if len(options) > OPTION_CAP and point is not None and prefer == "parts":
        # a first solve over the well-used options gives an incumbent; the exact prune follows
        used = options.watts / np.maximum(options.parts * p_max, 1e-300)
        first = options.take(used >= WELL_USED)
        if 0 < len(first) <= OPTION_CAP:
            if on_progress:
                on_progress(f"CP-SAT ({family}): a first solve over {len(first)} well-used options")
            quick = _solve(first, lines, lo, hi, goal, unit, banks, max_parts, "parts", settings,
                           budget / 3, on_progress, family, stage_two=False)
            if quick.interrupted:
                return FamilyAnswer(family, None, "unknown", False, None, None, prefer, len(first), 0.0,
                                    time.perf_counter() - start, interrupted=True)
            if quick.copies is not None:
                parts = int(np.sum(first.parts * np.array(quick.copies)))
                incumbent = parts if incumbent is None else min(incumbent, parts)
                options = prune(options, incumbent)
                hint = {first.key(i): c for i, c in enumerate(quick.copies) if c}
    if len(options) > OPTION_CAP and not force:
        if not hint:
            return None
        # the first solve's network stands, unproven: the pruned model is still too large to prove
        copies = tuple(hint.get(options.key(i), 0) for i in range(len(options)))
        net = _network(options, copies, lines, family)
        value = resistance(net)
        found = Found(net, value, value / target_ohms - 1.0, int(np.sum(options.parts * np.array(copies))))
        return FamilyAnswer(family, found, "feasible", False, None, None, prefer, len(options), 0.0,
                            time.perf_counter() - start)
    if len(options) == 0:
        return FamilyAnswer(family, None, "infeasible", True, None, None, prefer, 0, 0.0,
                            time.perf_counter() - start)
    left = budget - (time.perf_counter() - start)
    if on_progress:
        on_progress(f"CP-SAT ({family}): {len(options)} options, up to {banks} {'banks' if family == 'banks' else 'strings'}")
    solved = _solve(options, lines, lo, hi, goal, unit, banks, max_parts, prefer, settings, max(left, 0.05),
                    on_progress, family, hint=hint)
    # how far from the family's best error a proven answer may be: n/2 units of rounding on each
    # side, plus the proof's gap of n/2 units when parts come first (see _solve)
    resolution = (banks + (_gap(banks) if prefer == "parts" else 0.0)) * unit / goal
    if solved.copies is None:
        if solved.status == "infeasible" or solved.interrupted:
            return FamilyAnswer(family, None, solved.status, solved.status == "infeasible", None, None, prefer,
                                len(options), resolution, time.perf_counter() - start, solved.interrupted)
        return None
    copies, status, first_proven, bound = solved.copies, solved.status, solved.first_proven, solved.bound
    net = _network(options, copies, lines, family)
    value = resistance(net)
    found = Found(net, value, value / target_ohms - 1.0, int(np.sum(options.parts * np.array(copies))))
    parts_bound = error_bound = None
    if prefer == "parts" and bound is not None:
        parts_bound = math.ceil(bound - 1e-6)
    elif bound is not None:
        error_bound = max(0.0, (bound - banks / 2) * unit / goal)
        if family == "strings":  # a conductance off by e is a resistance off by e / (1 + e) at least
            error_bound /= 1 + error_bound
    return FamilyAnswer(family, found, status, first_proven, parts_bound, error_bound, prefer, len(options),
                        resolution, time.perf_counter() - start, solved.interrupted)


def _lines_of(stock: StockBin, point: OperatingPoint | None, derating: Derating, max_parts: int) -> _Lines:
    items = tuple(i for i in stock.items if i.count is None or i.count > 0)
    ohms = np.array([i.ohms for i in items])
    cap = np.array([max_parts if i.count is None else min(i.count, max_parts) for i in items], dtype=np.int64)
    limited = np.array([i.count is not None and i.count < max_parts for i in items])
    if point is None:
        lw = np.full(len(items), np.inf)
        lv = np.full(len(items), np.inf)
    else:
        lw = np.array([limit_watts(i.power_rating_w, i.max_temp_c, point.ambient_c, derating) for i in items])
        lv = np.array([limit_volts(i.ohms, i.power_rating_w, i.max_volts, derating) for i in items])
    return _Lines(items, ohms, cap, limited, lw, lv)


def _worst_drive(point: OperatingPoint, lo_r: float, hi_r: float) -> tuple[float, float]:
    """(largest string current, largest network voltage) any value in [lo_r, hi_r] draws (peak)."""
    if point.volts is not None:
        return point.volts / lo_r, point.volts
    if point.amps is not None:
        return point.amps, point.amps * hi_r
    return math.sqrt(point.watts / lo_r), math.sqrt(point.watts * hi_r)


def _least_watts(point: OperatingPoint, lo_r: float, hi_r: float) -> float:
    """The least average power any value in [lo_r, hi_r] dissipates (P = V²/R = I²R)."""
    if point.volts is not None:
        return point.duty * point.volts ** 2 / hi_r
    if point.amps is not None:
        return point.duty * point.amps ** 2 * lo_r
    return point.duty * point.watts


def _max_banks(target, within, lines, point, family, max_parts) -> int:
    """MAX_BANKS, or more banks in series when the voltage needs them (each bank sees its share)."""
    if point is None or family == "strings":
        return min(max_parts, MAX_BANKS)
    _, volts = _worst_drive(point, target * (1 - within), target * (1 + within))
    need = math.ceil(volts / float(lines.limit_v.max()))
    return min(max_parts, max(MAX_BANKS, 2 * need))


_PAIRS = tuple(np.array(col, dtype=np.int64) for col in zip(
    *[(x, y) for x in range(1, BANK_PARTS) for y in range(1, BANK_PARTS - x + 1)]))


def _options(family, lines: _Lines, top: float, unit: float, point, lo_r, hi_r) -> _Options:
    """Every bank (string) of one or two lines that fits the stock, the window top and the limits."""
    n = len(lines.ohms)
    ks = np.arange(1, BANK_PARTS + 1)
    # one line
    a1 = np.repeat(np.arange(n), len(ks))
    k1 = np.tile(ks, n)
    ok = k1 <= lines.cap[a1]
    a1, k1 = a1[ok], k1[ok]
    # two lines, a < b: generated a few lines of a at a time and cut to the value window at once, so
    # memory stays bounded on large bins (all pairs of 1345 E192 lines would be 60 M rows)
    if n * (n - 1) // 2 * len(_PAIRS[0]) > MAX_PAIR_ROWS:
        raise InfeasibleError(
            f"the CP-SAT families over {n} stock lines are too large to build (about "
            f"{n * (n - 1) // 2 * len(_PAIRS[0]):.1e} two-line options); use a smaller bin or another engine"
        )
    px, py = _PAIRS
    chunks = [(a1, np.full(len(a1), -1), k1, np.zeros(len(a1), dtype=np.int64))]
    step = max(1, CHUNK_ROWS // max(1, n * len(px)))
    for first in range(0, n - 1, step):
        a_rows = np.arange(first, min(n - 1, first + step))
        ia = np.concatenate([np.full(n - 1 - i, i) for i in a_rows])
        ib = np.concatenate([np.arange(i + 1, n) for i in a_rows])
        a2 = np.repeat(ia, len(px))
        b2 = np.repeat(ib, len(px))
        ka2 = np.tile(px, len(ia))
        kb2 = np.tile(py, len(ia))
        ok = (ka2 <= lines.cap[a2]) & (kb2 <= lines.cap[b2])
        if family == "banks":
            v2 = 1.0 / (ka2 / lines.ohms[a2] + kb2 / lines.ohms[b2])
        else:
            v2 = 1.0 / (ka2 * lines.ohms[a2] + kb2 * lines.ohms[b2])
        ok &= (v2 <= top) & (v2 >= unit)
        chunks.append((a2[ok], b2[ok], ka2[ok], kb2[ok]))
        built = sum(len(c[0]) for c in chunks)
        if built > MAX_OPTIONS_BUILT:
            raise InfeasibleError(
                f"the CP-SAT families over {n} stock lines give more than {MAX_OPTIONS_BUILT:,} options inside "
                "the value window, far beyond what the model proves; use a smaller bin or another engine"
            )
    a = np.concatenate([c[0] for c in chunks])
    b = np.concatenate([c[1] for c in chunks])
    ka = np.concatenate([c[2] for c in chunks])
    kb = np.concatenate([c[3] for c in chunks])
    two = b >= 0
    ra = lines.ohms[a]
    rb = np.where(two, lines.ohms[np.maximum(b, 0)], 1.0)
    if family == "banks":
        value = 1.0 / (ka / ra + np.where(two, kb / rb, 0.0))
    else:
        value = 1.0 / (ka * ra + np.where(two, kb * rb, 0.0))
    keep = (value <= top) & (value >= unit)  # below one unit an option adds parts, not value
    floor = np.zeros(len(a))
    watts = np.zeros(len(a))
    if point is not None:
        bi = np.maximum(b, 0)
        reach = [_reach(family, point, value, ra, lines.limit_w[a], lines.limit_v[a]),
                 np.where(two, _reach(family, point, value, rb, lines.limit_w[bi], lines.limit_v[bi]),
                          np.inf if family == "strings" else 0.0)]
        if family == "banks":  # within limits while the network's R ≥ the threshold
            need_r = np.maximum(*reach) * (1.0 - STRESS_SLACK)
            keep &= need_r <= hi_r
            floor = np.where(need_r > lo_r, need_r, 0.0)
        else:  # within limits while R ≤ the threshold, i.e. G ≥ 1/threshold
            most_r = np.minimum(*reach) * (1.0 + STRESS_SLACK)
            keep &= most_r >= lo_r
            with np.errstate(divide="ignore"):
                floor = np.where(most_r < hi_r, 1.0 / most_r, 0.0)
        amps, volts = _worst_drive(point, lo_r, hi_r)
        if family == "banks":
            per = point.duty * (amps * value) ** 2  # × 1/Rᵢ: a part's power at the largest current
            watts = per * (ka / ra + np.where(two, kb / rb, 0.0))
        else:
            per = point.duty * (volts * value) ** 2  # × Rᵢ: a part's power at the largest voltage
            watts = per * (ka * ra + np.where(two, kb * rb, 0.0))
    return _Options(a[keep], b[keep], ka[keep], kb[keep], value[keep], watts[keep], floor[keep])


def _reach(family, point: OperatingPoint, value, r, limit_w, limit_v) -> np.ndarray:
    """The network resistance at which a part of r ohms in an option of ``value`` reaches a limit.

    Banks (``value`` = the bank's r_b): the part is within limits while the network's R is at least
    the result. With a volts drive the string current is V/R, so power d·V²·r_b²/(R²·Rᵢ) ≤ L_W gives
    R ≥ V·r_b·√(d/(L_W·Rᵢ)) and the bank voltage V·r_b/R ≤ L_V gives R ≥ V·r_b/L_V; with a watts
    drive I² = P/R gives R ≥ d·P·r_b²/(L_W·Rᵢ) and R ≥ P·r_b²/L_V²; with an amps drive nothing
    depends on R (0 if within limits, ∞ if not).

    Strings (``value`` = the string's g_s = 1/s): the part is within limits while R is at most the
    result. An amps drive puts V = I·R across the network: I²R²·Rᵢ·g_s²·d ≤ L_W gives
    R ≤ √(L_W/(d·Rᵢ))/(I·g_s), and I·R·Rᵢ·g_s ≤ L_V gives R ≤ L_V/(I·Rᵢ·g_s); a watts drive
    (V² = P·R) gives R ≤ L_W/(d·P·Rᵢ·g_s²) and R ≤ L_V²/(P·Rᵢ²·g_s²); a volts drive fixes V (∞ if
    within limits, 0 if not). Ohm's law and P = V²/R = I²R throughout.
    """
    d = point.duty
    with np.errstate(divide="ignore", invalid="ignore"):
        if family == "banks":
            if point.volts is not None:
                v = point.volts
                by_w = np.where(limit_w > 0, v * value * np.sqrt(d / (limit_w * r)), np.inf)
                return np.maximum(by_w, v * value / limit_v)
            if point.watts is not None:
                p = point.watts
                by_w = np.where(limit_w > 0, d * p * value ** 2 / (limit_w * r), np.inf)
                return np.maximum(by_w, p * value ** 2 / limit_v ** 2)
            i = point.amps
            ok = (d * (i * value) ** 2 / r <= limit_w * (1 + STRESS_SLACK)) & (i * value <= limit_v * (1 + STRESS_SLACK))
            return np.where(ok, 0.0, np.inf)
        if point.amps is not None:
            i = point.amps
            by_w = np.sqrt(limit_w / (d * r)) / (i * value)
            return np.minimum(by_w, limit_v / (i * r * value))
        if point.watts is not None:
            p = point.watts
            return np.minimum(limit_w / (d * p * r * value ** 2), limit_v ** 2 / (p * r * r * value ** 2))
        v = point.volts
        ok = (d * (v * value) ** 2 * r <= limit_w * (1 + STRESS_SLACK)) & (v * value * r <= limit_v * (1 + STRESS_SLACK))
        return np.where(ok, np.inf, 0.0)


def _solve(options: _Options, lines: _Lines, lo, hi, goal, unit, banks, max_parts, prefer, settings, seconds,
           on_progress, family, stage_two: bool = True, hint: dict | None = None) -> _Outcome:
    """Build the model over ``options`` and solve its stage(s) (see the module docstring); ``hint``
    (copies per option key) is a known network the solver starts from."""
    cp = cp_model()
    LE = cp.LinearExpr
    start = time.perf_counter()
    model = cp.CpModel()
    value = np.rint(options.value / unit).astype(np.int64)
    fine_unit = hi * FINE  # the window and limit rows: exact to n·2**-41 of the value (see "Integer scaling")
    fine = np.rint(options.value / fine_unit).astype(np.int64)
    ub = np.minimum(banks, lines.cap[options.a] // options.ka)
    two = options.b >= 0
    ub[two] = np.minimum(ub[two], lines.cap[options.b[two]] // options.kb[two])
    z = [model.new_int_var(0, int(u), f"z{i}") for i, u in enumerate(ub)]
    model.add(LE.sum(z) <= banks)
    parts = LE.weighted_sum(z, options.parts.tolist())
    model.add(parts <= max_parts)
    # the value window in fine units, each option's rounding (≤ ½ fine unit per copy) counted against it
    low = model.new_int_var(0, int(np.sum((2 * fine + 1) * ub)), "low")
    model.add(low == LE.weighted_sum(z, (2 * fine - 1).tolist()))
    model.add(low >= math.ceil(2 * lo / fine_unit))
    model.add(LE.weighted_sum(z, (2 * fine + 1).tolist()) <= math.floor(2 * hi / fine_unit))
    # options within their limits only above some value of the network: a 0/1 "used" per option
    for i in np.nonzero(options.floor > 0)[0]:
        used = model.new_bool_var(f"u{i}")
        model.add(z[i] <= int(ub[i]) * used)
        model.add(low >= math.ceil(2 * options.floor[i] / fine_unit) * used)
    # stock rows, only where a line can run short
    for line in np.nonzero(lines.limited)[0]:
        uses = np.where(options.a == line, options.ka, 0) + np.where(options.b == line, options.kb, 0)
        idx = np.nonzero(uses)[0]
        if len(idx) and int(np.sum(uses[idx] * ub[idx])) > int(lines.cap[line]):
            model.add(LE.weighted_sum([z[i] for i in idx], uses[idx].tolist()) <= int(lines.cap[line]))
    total = LE.weighted_sum(z, value.tolist())
    goal_u = int(round(goal / unit))
    span = int(math.ceil((hi - lo) / unit)) + banks
    error = model.new_int_var(0, span, "error")
    model.add(error >= total - goal_u)
    model.add(error >= goal_u - total)
    first, second = (parts, error) if prefer == "parts" else (error, parts)
    if hint:
        for i, v in enumerate(z):
            model.add_hint(v, hint.get(options.key(i), 0))
    model.minimize(first)
    what = "fewest parts" if prefer == "parts" else "smallest error"
    one = solve(model, z, settings, seconds=seconds, on_progress=on_progress, label=f"CP-SAT {family}: {what}")
    if not one.has_solution:
        return _Outcome(None, one.status, one.status == "infeasible", None, one.interrupted)
    copies = one.values
    bound = one.bound
    if not stage_two or one.interrupted:
        return _Outcome(copies, one.status if not stage_two else "feasible", one.status == "optimal", bound,
                        one.interrupted)
    model.add(first <= round(one.objective))
    model.minimize(second)
    model.clear_hints()
    for v, c in zip(z, copies):
        model.add_hint(v, c)
    left = seconds - (time.perf_counter() - start)
    if left <= 0.01:
        return _Outcome(copies, "feasible", one.status == "optimal", bound)
    # the error is known to within n/2 units only (rounding), so the proof stops within a small gap
    two_ = solve(model, z, settings, seconds=left, on_progress=on_progress, label=f"CP-SAT {family}: then",
                 gap=_gap(banks) if prefer == "parts" else 0.0)
    if two_.has_solution:
        copies = two_.values
    status = "optimal" if one.status == "optimal" and two_.status == "optimal" else "feasible"
    return _Outcome(copies, status, one.status == "optimal", bound, two_.interrupted)


@dataclass(frozen=True, slots=True)
class _Outcome:
    """What the two stages of one model returned."""

    copies: tuple[int, ...] | None  #: copies per option of the best network found (None: none found)
    status: Status
    first_proven: bool
    bound: float | None  #: the first stage's proven bound
    interrupted: bool = False


def _gap(banks: int) -> float:
    """The second stage's proof gap, in units: the rounding's n/2, or a thousandth of the window."""
    return max(banks / 2, UNITS_PER_BANK * banks / 1000)


def _network(options: _Options, copies, lines: _Lines, family) -> Network:
    """The network the copies describe, each part tied to its option's stock line."""
    groups: list[Network] = []
    for i, c in enumerate(copies):
        if not c:
            continue
        a, b = int(options.a[i]), int(options.b[i])
        members = [Part(float(lines.ohms[a]), lines.items[a])] * int(options.ka[i])
        if b >= 0:
            members += [Part(float(lines.ohms[b]), lines.items[b])] * int(options.kb[i])
        group = parallel(*members) if family == "banks" else series(*members)
        groups += [group] * int(c)
    return series(*groups) if family == "banks" else parallel(*groups)
