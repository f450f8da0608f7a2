"""Regular arrays for loads that need many parts: the fewest parts that hit a value *and* stay cool.

Exhaustive search stops near a dozen parts, but a 10 Ω 5 W load from ¼ W parts
needs about forty. This module searches three regular families in which every
part of one value carries the same current or voltage, so each part's stress is
a closed form (ideal nominal values, Ohm's and Kirchhoff's laws):

``uniform``
    p parallel strings of s equal parts R: value R·s/p; each part sees V/s and
    dissipates P/(s·p), P the average network power.
``two-value strings``
    p identical parallel strings, each a×R1 + (s−a)×R2 in series (R1 < R2,
    1 ≤ a ≤ s−1): value (a·R1 + (s−a)·R2)/p; each string carries I_s = V/(p·value),
    so a part of Rᵢ sees I_s·Rᵢ and dissipates duty·I_s²·Rᵢ.
``two-value groups``
    s identical groups in series, each b×R1 ∥ (p−b)×R2 (1 ≤ b ≤ p−1):
    value s/(b/R1 + (p−b)/R2); each group sees V_g = V/s, so a part of Rᵢ sees
    V_g and dissipates duty·V_g²/Rᵢ.

V is the peak voltage across the network *at the candidate's own value*
(``OperatingPoint.volts_across``: with a current or power drive it moves with the
value); powers are averages (duty × peak).

Map of the module
-----------------
:class:`PartBound`, :func:`part_lower_bound`
    How many parts any series/parallel network needs at the target, whatever
    its shape: total power over the best part's derated power, and peak voltage
    over the best part's derated voltage (a path between the terminals).
:class:`ArrayDesign`, :func:`search_arrays`
    For each part count N the array of exactly N parts with the smallest error
    whose every part is within its derated limits.

What is exhaustive
------------------
* ``uniform``: every (s, p) with s·p = N and every stock line; exhaustive.
* two-value families: every (s, p) with s·p = N, every split a (or b), every
  stock line as R1. R2 is walked outward from the ideal R2* (the value that
  lands exactly on the target) on both sides. The value grows with R2, so the
  error grows with every step, and a row stops at the first line that passes
  or once its error exceeds the best array already known at N (seeded by the
  exhaustive uniform family; the strings' best also seeds the groups). Lines
  outside a value window are skipped: there no array can pass, by two
  whole-network conditions (total power ≤ N × the largest part power; peak
  voltage ≤ s × the largest part voltage, since every path holds s parts).
  So the search is exact at every N where an array is already known when the
  family starts, or where some row of the family finds one within
  :data:`R2_STEPS` lines of R2*. Otherwise the walk stops after R2_STEPS lines per
  side and may miss an array further out. (A full walk agreed on all 1302 counts
  of a scratch comparison: E12 and E24 bins, 7 targets, 5 operating points.)
* Arrays mixing more than two values, unequal strings, and two lines of the same
  value but different ratings in one array are not searched.

Limits and quantities
---------------------
Per-part limits are ``conditions.limit_watts`` (rating × IEC 60115-1 derating
line × power factor) and ``conditions.limit_volts`` (voltage factor ×
min(LEV, √(P·R))). Stock lines with equal value and ratings are pooled (their
counts add up); an array never takes more parts of a line than its count.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from netsynth.analysis.conditions import Derating, OperatingPoint, limit_volts, limit_watts
from netsynth.analysis.stress import drive_exponents
from netsynth.errors import InfeasibleError, ValueParseError
from netsynth.network import Network, parallel, resistance, series
from netsynth.search.exact import Found
from netsynth.stock import StockBin

#: relative slack on the stress check. The closed forms round a few ulps either
#: way, and a design exactly at its limit (40 parts × 0.125 W = 5 W) must not be
#: lost to the last bit; 1e-9 is far below any rating's own accuracy.
STRESS_SLACK = 1e-9
#: stock lines tried for R2 on each side of the ideal value (see "What is exhaustive").
R2_STEPS = 3
#: stands for an unlimited count in integer arrays.
_UNLIMITED = np.iinfo(np.int64).max // 4

FAMILIES = ("uniform", "two-value strings", "two-value groups")


# --------------------------------------------------------------------- lower bound


@dataclass(frozen=True, slots=True)
class PartBound:
    """The fewest parts any series/parallel network of the bin needs at the target.

    ``count = max(by_power, by_voltage)``; both halves are explained by :meth:`explain`.
    """

    count: int
    by_power: int  #: ceil(average network power / largest derated part power)
    by_voltage: int  #: ceil(peak network voltage / largest derated part voltage)
    watts: float = 0.0  #: average network power at the target, W
    part_watts: float = 0.0  #: the largest derated part power in the bin, W
    volts: float = 0.0  #: peak network voltage at the target, V
    part_volts: float = 0.0  #: the largest derated part voltage limit in the bin, V

    def explain(self) -> str:
        """One line: the bound and the reason for each half.

        >>> PartBound(40, 40, 1, 5.0, 0.125, 7.0710678, 160.0).explain()
        'at least 40 parts: 5 W over 0.125 W per part (derated); 1 part for voltage: 7.07 V over 160 V'
        """
        power = f"{_num(self.watts)} W over {_num(self.part_watts)} W per part (derated)"
        voltage = f"{_num(self.volts)} V over {_num(self.part_volts)} V"
        if self.by_power >= self.by_voltage:
            return f"at least {_parts(self.count)}: {power}; {_parts(self.by_voltage)} for voltage: {voltage}"
        return (f"at least {_parts(self.count)}: {voltage} per part (derated) on every path between the "
                f"terminals; {_parts(self.by_power)} for power: {power}")


def _num(x: float) -> str:
    """Three significant figures, but every digit of the whole part: 7.07, 0.125, 1000."""
    return f"{x:.3g}" if abs(x) < 1000 else f"{x:.0f}"


def _parts(n: int) -> str:
    return f"{n} part" if n == 1 else f"{n} parts"


def _ceil(x: float) -> int:
    # Rounding down a hair keeps the bound a bound: 5 / 0.125 computed as 40.000000000000004
    # must give 40, and a smaller lower bound is never wrong.
    return max(1, math.ceil(x * (1.0 - 1e-12)))


def part_lower_bound(
    target_ohms: float, stock: StockBin, point: OperatingPoint, derating: Derating
) -> PartBound:
    """The fewest parts any series/parallel network from ``stock`` needs at ``target_ohms``.

    Parameters
    ----------
    target_ohms : float
        The value the network must have, in ohms.
    stock : StockBin
        The bin; lines with a count of zero are ignored.
    point : OperatingPoint
        What the whole network sees (volts, amps or watts; duty; ambient °C).
    derating : Derating
        The user's margins on each part's ratings.

    Returns
    -------
    PartBound
        ``by_power = ceil(P / max Wᵢ)`` with P = V²/R·duty the average power at the target and Wᵢ
        each line's ``limit_watts``; ``by_voltage = ceil(V / max Uᵢ)`` with V the peak voltage
        and Uᵢ each line's ``limit_volts`` at its own resistance.

    Raises
    ------
    InfeasibleError
        If the bin has no usable line, or no part may dissipate anything at this ambient.

    Notes
    -----
    Why both halves are bounds, for any network (not only arrays): the power the network
    dissipates is the sum of its parts' powers (energy conservation), each at most max Wᵢ,
    so N·max Wᵢ ≥ P. Follow any path of parts from one terminal to the other: the potential
    falls by the whole V along it, so the voltages of the parts on it add up to at least V
    and the path holds at least V / max Uᵢ parts, all of them in the network.

    Examples
    --------
    Forty ¼ W parts at 50 % derating carry 5 W (hand arithmetic: 5 / 0.125); a 10 Ω part may
    see 0.8 × √(0.25 × 10) = 1.26 V, so the 7.07 V across the network needs 6 in series:

    >>> from netsynth.stock import StockItem
    >>> bound = part_lower_bound(10.0, StockBin((StockItem(10.0),)), OperatingPoint(watts=5.0), Derating())
    >>> bound.count, bound.by_power, bound.by_voltage
    (40, 40, 6)
    """
    target = _checked_target(target_ohms)
    lines = _Lines.of(stock, point, derating)
    volts = point.volts_across(target)
    watts = volts * volts / target * point.duty
    best_w = float(lines.limit_w.max())
    best_v = float(lines.limit_v.max())
    if not best_w > 0:
        raise InfeasibleError(
            f"at --ambient {point.ambient_c:g} °C every part in the bin is at or past its maximum "
            "temperature, so none may dissipate any power; lower the ambient or add parts rated hotter"
        )
    by_power = _ceil(watts / best_w)
    by_voltage = _ceil(volts / best_v)
    return PartBound(max(by_power, by_voltage), by_power, by_voltage, watts, best_w, volts, best_v)


def _checked_target(target_ohms: float) -> float:
    target = float(target_ohms)
    if not (target > 0 and math.isfinite(target)):
        raise ValueParseError(f"target {target_ohms!r} Ω: give a finite resistance above zero, e.g. 10 or 4k7")
    return target


# --------------------------------------------------------------------- stock lines


@dataclass(frozen=True, slots=True)
class _Lines:
    """The bin as arrays sorted by ohms, with each line's derated limits."""

    ohms: np.ndarray
    count: np.ndarray  #: int64, _UNLIMITED for None
    limit_w: np.ndarray
    limit_v: np.ndarray
    first_above: np.ndarray  #: index of the first line of strictly larger ohms

    @staticmethod
    def of(stock: StockBin, point: OperatingPoint, derating: Derating) -> _Lines:
        pooled: dict[tuple[float, float, float, float], int] = {}
        for item in stock.items:
            if item.count == 0:
                continue
            key = (item.ohms, item.power_rating_w, item.max_volts, item.max_temp_c)
            have = pooled.get(key, 0)
            pooled[key] = _UNLIMITED if item.count is None else min(_UNLIMITED, have + item.count)
        if not pooled:
            raise InfeasibleError("every line of the bin has a count of zero; add parts to the bin")
        keys = sorted(pooled)
        ohms = np.array([k[0] for k in keys])
        return _Lines(
            ohms=ohms,
            count=np.array([pooled[k] for k in keys], dtype=np.int64),
            limit_w=np.array([limit_watts(w, t, point.ambient_c, derating) for _, w, _, t in keys]),
            limit_v=np.array([limit_volts(r, w, v, derating) for r, w, v, _ in keys]),
            first_above=np.searchsorted(ohms, ohms, side="right"),
        )


def _volts_at(point: OperatingPoint, ohms: np.ndarray) -> np.ndarray:
    """``point.volts_across`` for many values at once (Ohm's law; P = V²/R)."""
    if point.volts is not None:
        return np.full_like(ohms, point.volts)
    if point.amps is not None:
        return point.amps * ohms
    return np.sqrt(point.watts * ohms)


def _use(point: OperatingPoint, watts: np.ndarray, volts: np.ndarray, limit_w: np.ndarray,
         limit_v: np.ndarray) -> np.ndarray:
    """1 / headroom in drive units (see :mod:`netsynth.analysis.stress`): 1.0 means at a limit.

    max((watts/limit_w)^(1/a), (volts/limit_v)^(1/b)) where part power grows as drive^a and part
    voltage as drive^b (∞ where a power limit is zero).
    """
    a, b = drive_exponents(point)
    with np.errstate(divide="ignore", invalid="ignore"):
        use_w = np.where(limit_w > 0, watts / np.where(limit_w > 0, limit_w, 1.0), np.inf)
    return np.maximum(use_w ** (1.0 / a), (volts / limit_v) ** (1.0 / b))


# --------------------------------------------------------------------- search


@dataclass(frozen=True, slots=True)
class ArrayDesign:
    """One regular array: the network and how close its most stressed part is to a limit."""

    found: Found
    family: str  #: one of :data:`FAMILIES`
    headroom: float  #: factor the drive may grow before a part reaches a limit; ≥ 1 is within limits


@dataclass(frozen=True, slots=True)
class _Best:
    """The best candidate of one family at one part count."""

    abs_error: float
    headroom: float
    rank: int  #: family index, breaks ties
    build: tuple  #: (family rank, s, p, k, R1, R2)

    def key(self) -> tuple[float, float, int]:
        return (self.abs_error, -self.headroom, self.rank)


def search_arrays(
    target_ohms: float,
    stock: StockBin,
    point: OperatingPoint,
    derating: Derating,
    max_parts: int,
    within: float | None = None,
    min_parts: int = 1,
) -> list[ArrayDesign]:
    """For each part count 1..max_parts, the closest regular array whose parts all stay within limits.

    Parameters
    ----------
    target_ohms : float
        The value wanted, in ohms.
    stock : StockBin
        The bin; an array never takes more of a line than its count.
    point : OperatingPoint
        What the whole network sees; the stress of a candidate is taken at its own value.
    derating : Derating
        The user's margins on each part's ratings.
    max_parts : int
        The largest part count to search (at least 1).
    within : float or None
        A relative error (fraction). When given, the search stops after the first part count
        whose best array is within it: the caller wants the fewest parts.
    min_parts : int
        The smallest part count evaluated (counts below a proven floor need no evaluation).

    Returns
    -------
    list of ArrayDesign
        Ascending by part count, only the counts that have an array within limits; for each,
        the smallest |error| (ties: the larger headroom, then family order). Empty if nothing
        fits. Below :func:`part_lower_bound` no array *at the target* fits; under a power drive
        (``watts``) the power is the same at every value, so the list is then empty, but under a
        voltage or current drive an array far from the target draws less power and may still
        be listed, with its large error (filter with ``within``).

    Raises
    ------
    InfeasibleError
        If ``max_parts`` is below 1 or ``within`` is negative, or the bin has no usable line.
    ValueParseError
        If the target is not a finite resistance above zero.

    Notes
    -----
    See the module docstring for the families, the closed-form stress and what is exhaustive.

    Examples
    --------
    Four 100 Ω parts as two strings of two give 100 Ω, each part at V/2 (Ohm's law):

    >>> from netsynth.stock import StockItem
    >>> bin_ = StockBin((StockItem(100.0, power_rating_w=1.0),))
    >>> d = search_arrays(100.0, bin_, OperatingPoint(volts=10.0), Derating(1.0, 1.0), 4)[-1]
    >>> d.found.parts, d.found.value_ohms, d.family, d.headroom
    (4, 100.0, 'uniform', 2.0)
    """
    target = _checked_target(target_ohms)
    if isinstance(max_parts, bool) or not isinstance(max_parts, int) or max_parts < 1:
        raise InfeasibleError(f"--max-parts {max_parts!r}: the part count must be a whole number of at least 1")
    if within is not None and not within >= 0:
        raise InfeasibleError(f"within {within!r}: the tolerance is a fraction of 0 or more, e.g. 0.01 for 1 %")
    lines = _Lines.of(stock, point, derating)
    if not np.any(lines.limit_w > 0):
        return []
    out: list[ArrayDesign] = []
    for n in range(max(1, min_parts), max_parts + 1):
        # the uniform family is exhaustive and cheap; its error seeds the two-value walks
        bests = [b for b in (_uniform(n, target, lines, point),) if b is not None]
        for strings in (True, False):
            beat = min((b.abs_error for b in bests), default=math.inf)
            found = _two_value(n, target, lines, point, strings, beat)
            if found is not None:
                bests.append(found)
        if not bests:
            continue
        best = min(bests, key=_Best.key)
        out.append(_design(best, n, target))
        if within is not None and abs(out[-1].found.error) <= within:
            break
    return out


def _divisor_pairs(n: int) -> list[tuple[int, int]]:
    """(s, p) with s·p = n."""
    return [(s, n // s) for s in range(1, n + 1) if n % s == 0]


def _uniform(n: int, target: float, lines: _Lines, point: OperatingPoint) -> _Best | None:
    pairs = np.array(_divisor_pairs(n), dtype=np.float64)
    usable = np.nonzero(lines.count >= n)[0]
    if usable.size == 0:
        return None
    s = np.repeat(pairs[:, 0], usable.size)
    p = np.repeat(pairs[:, 1], usable.size)
    idx = np.tile(usable, len(pairs))
    r = lines.ohms[idx]
    value = r * s / p
    volts = _volts_at(point, value)
    watts = volts * volts / value * point.duty / n
    use = _use(point, watts, volts / s, lines.limit_w[idx], lines.limit_v[idx])
    ok = use <= 1.0 + STRESS_SLACK
    if not np.any(ok):
        return None
    err = np.abs(value / target - 1.0)
    cand = np.nonzero(ok)[0]
    j = cand[np.lexsort((use[cand], err[cand]))[0]]
    return _Best(float(err[j]), float(1.0 / use[j]), 0, (0, int(s[j]), int(p[j]), 0, float(r[j]), 0.0))


def _splits(n: int, strings: bool) -> np.ndarray:
    """Rows (s, p, k, m1, m2): k parts of R1 per string (or group), m1/m2 parts of R1/R2 in all."""
    rows = []
    for s, p in _divisor_pairs(n):
        if strings:
            rows += [(s, p, a, a * p, (s - a) * p) for a in range(1, s)]
        else:
            rows += [(s, p, b, b * s, (p - b) * s) for b in range(1, p)]
    return np.array(rows, dtype=np.int64).reshape(-1, 5)


def _two_value(
    n: int, target: float, lines: _Lines, point: OperatingPoint, strings: bool, beat: float = math.inf
) -> _Best | None:
    """The best two-value array of n parts with |error| ≤ ``beat`` (None if there is none)."""
    splits = _splits(n, strings)
    size = len(lines.ohms)
    if len(splits) == 0 or size < 2:
        return None
    # every (split, R1 line) pair that can supply its R1 parts and has a larger value above it
    sp = np.repeat(np.arange(len(splits)), size)
    i = np.tile(np.arange(size), len(splits))
    keep = (lines.count[i] >= splits[sp, 3]) & (lines.first_above[i] < size)
    sp, i = sp[keep], i[keep]
    if i.size == 0:
        return None
    s, p, k = (splits[sp, c].astype(np.float64) for c in range(3))
    m2 = splits[sp, 4]
    r1 = lines.ohms[i]

    def ideal(value: np.ndarray | float) -> np.ndarray:
        """The R2 that gives each row exactly ``value`` ohms (the value grows with R2)."""
        with np.errstate(divide="ignore", invalid="ignore"):
            if strings:  # (k·R1 + (s−k)·R2)/p = value
                return (value * p - k * r1) / (s - k)
            den = s / value - k / r1  # s / (k/R1 + (p−k)/R2) = value
            return np.where(den > 0, (p - k) / np.where(den > 0, den, 1.0), np.inf)

    # Lines a row may take as R2: above R1, and giving a value inside the interval that the
    # whole-network limits allow (see _value_window); the value grows with R2, so it is a range.
    v_lo, v_hi = _value_window(n, s, lines, point)
    lowest = np.maximum(lines.first_above[i], np.searchsorted(lines.ohms, ideal(v_lo), side="left"))
    highest = np.minimum(size, np.searchsorted(lines.ohms, ideal(v_hi), side="right")) - 1
    j0 = np.searchsorted(lines.ohms, ideal(target), side="left")

    def evaluate(rows: np.ndarray, j: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """|error|, use and feasibility of rows with R2 = line j."""
        a, b = i[rows], j
        r1_, r2_ = lines.ohms[a], lines.ohms[b]
        s_, p_, k_ = s[rows], p[rows], k[rows]
        if strings:
            value = (k_ * r1_ + (s_ - k_) * r2_) / p_
            volts = _volts_at(point, value)
            amps = volts / (p_ * value)  # each string's current
            v1, v2 = amps * r1_, amps * r2_
            w1, w2 = point.duty * amps * amps * r1_, point.duty * amps * amps * r2_
        else:
            value = s_ / (k_ / r1_ + (p_ - k_) / r2_)
            volts = _volts_at(point, value)
            v1 = v2 = volts / s_  # each group's voltage
            w1, w2 = point.duty * v1 * v1 / r1_, point.duty * v2 * v2 / r2_
        use = np.maximum(_use(point, w1, v1, lines.limit_w[a], lines.limit_v[a]),
                         _use(point, w2, v2, lines.limit_w[b], lines.limit_v[b]))
        ok = (use <= 1.0 + STRESS_SLACK) & (lines.count[b] >= m2[rows])
        return np.abs(value / target - 1.0), use, ok

    # walk R2 outward from the ideal on both sides at once: step −1 below, +1 above
    rows = np.concatenate([np.arange(i.size), np.arange(i.size)])
    step = np.concatenate([np.full(i.size, -1), np.full(i.size, 1)])
    j = np.concatenate([np.minimum(j0 - 1, highest), np.maximum(j0, lowest)])
    best_err, best_use, best_at = beat, math.inf, None
    for walked in range(1, size + 1):
        live = (j >= lowest[rows]) & (j <= highest[rows])
        rows, step, j = rows[live], step[live], j[live]
        if rows.size == 0:
            break
        err, use, ok = evaluate(rows, j)
        if np.any(ok):
            cand = np.nonzero(ok)[0]
            c = cand[np.lexsort((use[cand], err[cand]))[0]]
            if (err[c], use[c]) < (best_err, best_use):
                best_err, best_use, best_at = float(err[c]), float(use[c]), (int(rows[c]), int(j[c]))
        # A failed row walks on only while its next line could still beat the best: the error
        # grows with every step outward (equal errors go on, for a line of other ratings).
        # With no array at all to beat, the walk stops after R2_STEPS lines.
        if walked >= R2_STEPS and not math.isfinite(best_err):
            break
        more = ~ok & (err <= best_err)
        rows, step, j = rows[more], step[more], j[more] + step[more]
    if best_at is None:
        return None
    row, jj = best_at
    rank = 1 if strings else 2
    build = (rank, int(s[row]), int(p[row]), int(k[row]), float(r1[row]), float(lines.ohms[jj]))
    return _Best(best_err, 1.0 / best_use, rank, build)


def _value_window(n: int, s: np.ndarray, lines: _Lines, point: OperatingPoint) -> tuple[np.ndarray, np.ndarray]:
    """Values (ohms) outside which no n-part array with s parts on each path can pass the stress.

    Two necessary conditions, as in :func:`part_lower_bound`: the average power P(v) ≤ n·max Wᵢ,
    and the peak voltage V(v) ≤ s·max Uᵢ (every terminal-to-terminal path of these arrays holds
    s parts). Solved for v with P(v) = duty·V(v)²/v, and widened by 1e-6 so rounding never
    excludes a feasible array. Empty (lo > hi) where no value can pass.
    """
    watts = n * float(lines.limit_w.max()) * (1 + 1e-6)
    volts = s * float(lines.limit_v.max()) * (1 + 1e-6)
    zero, inf = np.zeros_like(s), np.full_like(s, np.inf)
    if point.volts is not None:  # P = duty·V²/v falls with v
        lo = np.full_like(s, point.duty * point.volts ** 2 / watts)
        return np.where(point.volts <= volts, lo, inf), inf
    if point.amps is not None:  # P = duty·I²·v and V = I·v rise with v
        return zero, np.minimum(watts / (point.duty * point.amps ** 2), volts / point.amps)
    if point.duty * point.watts > watts:  # P is the same at every value
        return inf, zero
    return zero, volts * volts / point.watts  # V = √(P·v)


def _design(best: _Best, n: int, target: float) -> ArrayDesign:
    rank, s, p, k, r1, r2 = best.build
    net: Network
    if rank == 0:
        net = parallel(*[series(*[r1] * s)] * p)
    elif rank == 1:
        net = parallel(*[series(*([r1] * k + [r2] * (s - k)))] * p)
    else:
        net = series(*[parallel(*([r1] * k + [r2] * (p - k)))] * s)
    value = resistance(net)
    return ArrayDesign(Found(net, value, value / target - 1.0, n), FAMILIES[rank], best.headroom)
