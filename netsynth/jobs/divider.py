"""Dividers: two arms from one bin, searched jointly for a ratio or an output voltage.

Map of the module
-----------------
``DividerGoal`` and :func:`ratio_goal`, :func:`voltage_goal`, :func:`regulator_goal`
    What the divider must do, and the formulas (output, ideal arm, error).
:func:`search_divider`
    For each total part count k, the pair (top, bottom) of k parts in all whose output lands
    nearest the goal, both arms from one bin sharing its quantities; exhaustive.
:func:`divider_review` / ``DividerReview``
    Bands (arm tolerances by Rayleigh monotonicity, reference tolerance), the temperature
    coefficient of the output (tracking and worst case), the divider current, the output
    resistance, each arm's load, cautions and notes.
:func:`design_divider` / ``DividerDesign``
    Both of the above for one request, the way the ``divider`` command runs it.

Formulas
--------
The divider is ``top`` from the input (or regulator output) to the middle node and ``bottom``
from the middle node to 0 V; unloaded, Kirchhoff's laws give

* ratio ``r = Rb / (Rt + Rb)``; from an input voltage ``Vout = Vin·r``;
* regulator feedback (the reference ``Vref`` at the middle node, ``Ipin`` the bias current
  flowing *into* the feedback pin): the bottom arm carries ``Vref/Rb``, the top arm that plus
  ``Ipin``, so ``Vout = Vref + Rt·(Vref/Rb + Ipin) = Vref·(1 + Rt/Rb) + Ipin·Rt``.
  This is the form of feedback-pin regulators; an adjust-pin regulator whose reference sits
  across the top arm (LM317 type) is the same with the arms' roles swapped.

The error is the relative error of ``Vout`` where a voltage was given, else of the ratio.

Search (exhaustive)
-------------------
The output is monotone in each arm with the other fixed, so for a fixed arm the best other
arm is the nearest network value below or above the *ideal* one (``Rt = Rb·(1/r − 1)``;
``Rt = (Vout − Vref)/(Vref/Rb + Ipin)``; and the inverses). For each split k = kt + kb the
arm of fewer parts is listed in full (every distinct network of that many parts, from the
exact engine's tables over the bin's pooled values, :func:`netsynth.analysis.lines.value_pool`)
and, for every entry at once (numpy), the exact engine (:class:`netsynth.search.exact.ExactSearch`)
finds the floor and ceil of the ideal other arm among networks of the other size, by binary
search in a sorted table or by its meet-in-the-middle recursion. The total window (``Rt + Rb``
within ``[low, high]``) and a divider-current bound narrow the other arm to an interval,
and the ideal is clipped to it; the engine's stock-line check steps past networks that would,
together with the listed arm, take more of a value than the bin holds. Every split and every
listed network is covered, so each row is the best pair of exactly k parts: "proven" (ties
closer than 1e-12 relative are float noise and are broken by the total resistance, below).

Among pairs of equal error the one whose total lies nearest, on a log scale, to the middle of
the allowed totals (the window narrowed to what the bin's values span) is reported.
"""

from __future__ import annotations

import math
import time
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Literal

import numpy as np

from netsynth.analysis.conditions import CAUTION_VOLTS, NEAR_LIMIT, Derating, OperatingPoint
from netsynth.analysis.lines import assign_lines, value_pool
from netsynth.analysis.review import SAFETY_NOTE
from netsynth.analysis.stress import NetworkStress, line_of, network_stress
from netsynth.analysis.thermal import temperature_coefficient
from netsynth.analysis.tolerance import tolerance_band
from netsynth.design import PickLine
from netsynth.errors import ArgumentError, InfeasibleError
from netsynth.network import Network, Part, Series, parts_in_order, resistance, series, to_netlist, to_text, value_network
from netsynth.nodal import VERIFY_RTOL, verify_resistance
from netsynth.search.exact import ExactSearch, lookup_budget
from netsynth.stock import StockBin, StockItem, bin_order

GoalKind = Literal["ratio", "voltage", "regulator"]

#: default and largest part count of both arms together
DEFAULT_MAX_PARTS = 4
MAX_PARTS = 12
#: errors closer than this are one error (float noise of equal ratios, a few ulps)
SAME_ERROR = 1e-12
#: relative slack on the total window and the current bound (float noise at the edges)
EDGE_SLACK = 1e-12
#: rule of thumb for a feedback divider: its current at least this many times the pin's
#: bias current, so that the pin current shifts Vout by about 1 % or less. Common practice, no source.
PIN_CURRENT_FACTOR = 100.0


# ---------------------------------------------------------------- the goal


def _positive(name: str, x: object) -> float:
    if isinstance(x, bool) or not isinstance(x, (int, float)) or not (math.isfinite(x) and x > 0):
        raise ArgumentError(f"{name}={x!r}: must be a finite value above zero")
    return float(x)


@dataclass(frozen=True, slots=True)
class DividerGoal:
    """What a divider must do. Build with :func:`ratio_goal`, :func:`voltage_goal` or :func:`regulator_goal`.

    Volts and amperes; ``ratio`` is ``Rb/(Rt + Rb)`` (for a regulator without a pin current,
    ``Vref/Vout``; with one the ratio alone does not fix Vout and ``ratio`` is None).
    """

    kind: GoalKind
    ratio: float | None
    vin: float | None = None
    vout: float | None = None
    vref: float | None = None
    pin_current_a: float = 0.0

    @property
    def has_voltage(self) -> bool:
        return self.kind != "ratio"

    @property
    def target(self) -> float:
        """The quantity the error is measured on: Vout (volts) or the ratio."""
        return self.vout if self.has_voltage else self.ratio  # type: ignore[return-value]

    def ratio_of(self, rt, rb):
        """``Rb/(Rt + Rb)``, elementwise."""
        return rb / (rt + rb)

    def output(self, rt, rb):
        """Vout in volts (or the ratio for a ratio goal), elementwise over arm values in ohms."""
        if self.kind == "regulator":
            return self.vref * (1.0 + rt / rb) + self.pin_current_a * rt
        r = rb / (rt + rb)
        return r * self.vin if self.kind == "voltage" else r

    def error(self, rt, rb):
        """Signed relative error of :meth:`output`: output / target − 1."""
        return self.output(rt, rb) / self.target - 1.0

    def ideal_top(self, rb: np.ndarray) -> np.ndarray:
        """The top arm (ohms) that puts the output exactly on target for each bottom arm."""
        if self.kind == "regulator":
            return (self.vout - self.vref) / (self.vref / rb + self.pin_current_a)
        return rb * (1.0 / self.ratio - 1.0)

    def ideal_bottom(self, rt: np.ndarray) -> np.ndarray:
        """The bottom arm (ohms) that puts the output exactly on target for each top arm (inf: none)."""
        if self.kind == "regulator":
            room = self.vout - self.vref - self.pin_current_a * rt
            with np.errstate(divide="ignore", invalid="ignore"):
                return np.where(room > 0, self.vref * rt / np.where(room > 0, room, 1.0), np.inf)
        return rt * self.ratio / (1.0 - self.ratio)

    def arm_volts(self, rt: float, rb: float) -> tuple[float, float] | None:
        """Volts across (top, bottom) at the nominal input; None for a bare ratio."""
        if self.kind == "voltage":
            vout = self.output(rt, rb)
            return self.vin - vout, vout
        if self.kind == "regulator":
            return self.output(rt, rb) - self.vref, self.vref
        return None

    def bottom_current(self, rt: float, rb: float) -> float | None:
        """The divider current (amperes): the current in the bottom arm; None for a bare ratio."""
        volts = self.arm_volts(rt, rb)
        return None if volts is None else volts[1] / rb


#: the narrowest divider ratio accepted, and 1 minus it the widest: a part-per-trillion divider is
#: beyond any resistor network (the accepted values span 1 µΩ..1 TΩ, netsynth.limits) and would only
#: overflow the arithmetic of the arms
MIN_RATIO = 1e-12


def _checked_ratio(ratio: float, what: str) -> float:
    if not MIN_RATIO <= ratio <= 1.0 - MIN_RATIO:
        raise ArgumentError(f"{what} gives a divider ratio of {ratio:.3g}; netsynth builds ratios from {MIN_RATIO:g} "
                            f"to 1 − {MIN_RATIO:g}")
    return ratio


def ratio_goal(ratio: float) -> DividerGoal:
    """A bare ratio ``Rb/(Rt + Rb)``, strictly between 0 and 1.

    >>> ratio_goal(0.25).ideal_top(np.array([1000.0]))  # Rt = Rb·(1/r − 1)
    array([3000.])
    """
    r = _positive("ratio", ratio)
    if not r < 1:
        raise ArgumentError(f"ratio={ratio!r}: a divider's ratio Rbottom/(Rtop + Rbottom) lies between 0 and 1")
    return DividerGoal("ratio", _checked_ratio(r, f"ratio={ratio!r}"))


def voltage_goal(vin: float, vout: float) -> DividerGoal:
    """An output voltage from an input voltage, unloaded: ``r = Vout/Vin``, ``Vout < Vin``."""
    vin, vout = _positive("vin", vin), _positive("vout", vout)
    if not vout < vin:
        raise ArgumentError(f"vout={vout!r}: a divider's output lies below its input (vin={vin!r})")
    return DividerGoal("voltage", _checked_ratio(vout / vin, f"vout={vout!r} from vin={vin!r}"), vin=vin, vout=vout)


def regulator_goal(vref: float, vout: float, pin_current_a: float = 0.0) -> DividerGoal:
    """A regulator's output from its reference: ``Vout = Vref·(1 + Rt/Rb) + Ipin·Rt``.

    ``pin_current_a`` (amperes, 0 or more) is the bias current flowing into the feedback pin.

    >>> g = regulator_goal(0.8, 3.3)   # 0.8·(1 + 75k/24k) = 3.3 V (hand arithmetic)
    >>> round(g.output(75e3, 24e3), 12), round(g.ratio * 99, 12)   # ratio Vref/Vout = 24/99
    (3.3, 24.0)
    """
    vref, vout = _positive("vref", vref), _positive("vout", vout)
    if isinstance(pin_current_a, bool) or not isinstance(pin_current_a, (int, float)) or not (
            math.isfinite(pin_current_a) and pin_current_a >= 0):
        raise ArgumentError(f"pin_current_a={pin_current_a!r}: the pin's bias current is 0 or more amperes")
    if not vout > vref:
        raise ArgumentError(f"vout={vout!r}: a feedback divider sets an output above the reference (vref={vref!r})")
    _checked_ratio(vref / vout, f"vout={vout!r} from vref={vref!r}")
    ratio = vref / vout if pin_current_a == 0 else None
    return DividerGoal("regulator", ratio, vref=vref, vout=vout, pin_current_a=float(pin_current_a))


# ---------------------------------------------------------------- records


@dataclass(frozen=True, slots=True)
class Arm:
    """One arm of a divider: its parts tied to stock lines, its value and the nodal solver's value."""

    network: Network
    value_ohms: float
    verified_ohms: float

    @property
    def expression(self) -> str:
        return to_text(self.network)

    @property
    def parts(self) -> int:
        return len(parts_in_order(self.network))

    @property
    def components(self) -> tuple[Part, ...]:
        return tuple(parts_in_order(self.network))


@dataclass(frozen=True, slots=True)
class DividerRow:
    """The best pair of arms of exactly ``parts`` parts together."""

    parts: int
    top: Arm
    bottom: Arm
    ratio: float  #: Rb / (Rt + Rb)
    output: float  #: Vout in volts, or the ratio for a ratio goal
    error: float  #: signed relative error of ``output``
    proven: bool  #: exhaustive over every pair of this many parts

    @property
    def total_ohms(self) -> float:
        return self.top.value_ohms + self.bottom.value_ohms


@dataclass(frozen=True, slots=True)
class ArmLoad:
    """What one arm sees at the nominal operating point (per-part figures from the nodal solver)."""

    volts: float
    stress: NetworkStress


@dataclass(frozen=True, slots=True)
class DividerReview:
    """Bands, drift, current, output resistance and loads of one divider.

    ``output_band`` is the exact worst case of the output (volts, or the ratio) over every
    part at either end of its tolerance and the reference at either end of ``vref_tolerance``.
    ``tempco_tracking_ppm`` assumes every part drifts by its full tcr in the same direction
    (parts of one technology track); ``tempco_worst_ppm`` lets each part drift either way.
    Both are first order, ppm/K of the output, and leave out the reference's own drift.
    """

    ratio_band: tuple[float, float]
    output_band: tuple[float, float]
    vref_tolerance: float
    sensitivity_top: float  #: ∂ln(output)/∂ln(Rt)
    sensitivity_bottom: float  #: ∂ln(output)/∂ln(Rb)
    tempco_tracking_ppm: float
    tempco_worst_ppm: float
    current_a: float | None  #: the current in the bottom arm at nominal; None for a bare ratio
    output_ohms: float  #: Thévenin resistance at the middle node, Rt ∥ Rb
    loads: tuple[ArmLoad, ArmLoad] | None  #: (top, bottom); None for a bare ratio
    cautions: tuple[str, ...]
    notes: tuple[str, ...]
    #: with a pin current: the least divider current by the common rule (no source) of
    #: :data:`PIN_CURRENT_FACTOR` × the pin current, in amperes
    pin_rule_a: float | None = None

    @property
    def pin_rule_met(self) -> bool | None:
        """Whether the divider current meets :attr:`pin_rule_a` (None without a pin current)."""
        if self.pin_rule_a is None or self.current_a is None:
            return None
        return self.current_a >= self.pin_rule_a

    @property
    def ok(self) -> bool:
        return self.loads is None or not any(load.stress.violations for load in self.loads)


@dataclass(frozen=True, slots=True)
class DividerDesign:
    """The answer to one divider request."""

    goal: DividerGoal
    bin_name: str
    max_parts: int
    total_ohms: tuple[float, float] | None  #: the window on Rt + Rb, if any
    min_current_a: float | None
    rows: tuple[DividerRow, ...]  #: one per total part count that has a feasible pair
    best: DividerRow  #: smallest |error|, then fewest parts
    review: DividerReview
    pick_list: tuple[PickLine, ...]
    seconds: float


# ---------------------------------------------------------------- the search


@dataclass(frozen=True, slots=True)
class _Hit:
    error: float
    tie: float
    small_is_top: bool
    n_small: int
    n_big: int
    small_index: int
    query: float
    side: int


def _as_window(total_ohms) -> tuple[float, float]:
    if total_ohms is None:
        return 0.0, math.inf
    try:
        low, high = (float(x) for x in total_ohms)
    except (TypeError, ValueError):
        raise ArgumentError(f"total_ohms={total_ohms!r}: expected (low, high) in ohms") from None
    if not (0 <= low <= high and high > 0) or math.isnan(low) or math.isnan(high):
        raise ArgumentError(f"total_ohms={total_ohms!r}: expected 0 ≤ low ≤ high, high above zero, in ohms")
    return low, high


def search_divider(goal: DividerGoal, stock: StockBin, max_parts: int = DEFAULT_MAX_PARTS,
                   total_ohms: tuple[float, float] | None = None,
                   min_current_a: float | None = None) -> list[DividerRow]:
    """The best divider of exactly k parts (both arms together) for each k in 2..max_parts.

    Parameters
    ----------
    goal : DividerGoal
    stock : StockBin
        Both arms come from it and share its quantities.
    max_parts : int
        Parts of both arms together, 2 to :data:`MAX_PARTS`.
    total_ohms : (low, high) or None
        Window on ``Rt + Rb`` in ohms.
    min_current_a : float or None
        The divider current (in the bottom arm, at the nominal output) must be at least this
        (amperes): ``Vin/(Rt + Rb)`` for a voltage goal, ``Vref/Rb`` for a regulator.

    Returns
    -------
    list of DividerRow
        One per k with a feasible pair (none when the window or the counts exclude every
        pair of k parts), arms tied to stock lines and nodally verified; all proven (see the
        module docstring).

    Raises
    ------
    ArgumentError
        A bad argument; a current bound on a bare ratio.
    InfeasibleError
        The search would take too long, or no pair of any size meets the limits.
    """
    if not isinstance(goal, DividerGoal):
        raise ArgumentError(f"goal={goal!r}: expected a DividerGoal (ratio_goal, voltage_goal or regulator_goal)")
    if isinstance(max_parts, bool) or not isinstance(max_parts, int) or not 2 <= max_parts <= MAX_PARTS:
        raise ArgumentError(f"max_parts={max_parts!r}: both arms together take 2 to {MAX_PARTS} parts")
    low, high = _as_window(total_ohms)
    rb_max = math.inf
    if min_current_a is not None:
        imin = _positive("min_current_a", min_current_a)
        if goal.kind == "ratio":
            raise ArgumentError("min_current_a: a divider current needs a voltage (vin/vout or vref/vout), "
                                "not a bare ratio; bound the total resistance instead")
        if goal.kind == "voltage":
            high = min(high, goal.vin / imin)
        else:
            rb_max = goal.vref / imin
    values, counts = value_pool(stock)
    if not values:
        raise InfeasibleError("every line of the bin has a count of zero; add parts to the bin")
    engine = ExactSearch(values, counts, max_parts)
    splits = [(kt, k - kt) for k in range(2, max_parts + 1) for kt in range(1, k)]
    work = sum(engine.lookups(max(s), len(engine.tables[min(s)])) for s in splits)
    if work > lookup_budget(engine.limited):
        raise InfeasibleError(
            f"a joint search of both arms for {max_parts} parts on a bin of {len(values)} values needs about "
            f"{work:.1e} table look-ups, too many to finish in reasonable time; ask for fewer parts "
            f"(--max-parts {max_parts - 1}) or use a smaller bin")
    span_low = max(low, min(values))
    span_high = min(high, max_parts * max(values))
    centre = math.sqrt(span_low * span_high) if span_high >= span_low else span_high
    rows = []
    for k in range(2, max_parts + 1):
        hits = [h for kt in range(1, k) if (h := _best_split(engine, goal, kt, k - kt, low, high, rb_max, centre))]
        if not hits:
            continue
        least = min(h.error for h in hits)
        hit = min((h for h in hits if h.error - least <= SAME_ERROR), key=lambda h: h.tie)
        rows.append(_row(engine, goal, stock, k, hit))
    if not rows:
        raise InfeasibleError(_nothing_fits(goal, low, high, rb_max, max_parts))
    return rows


def _nothing_fits(goal: DividerGoal, low: float, high: float, rb_max: float, k: int) -> str:
    limits = []
    if low > 0 or math.isfinite(high):
        limits.append(f"a total Rtop + Rbottom from {low:g} to {high:g} Ω")
    if math.isfinite(rb_max):
        limits.append(f"a bottom arm of at most {rb_max:g} Ω (the current bound)")
    what = " and ".join(limits) or "the bin's quantities"
    return (f"no pair of arms of up to {k} parts from this bin meets {what}; widen the window (--total), "
            "lower the current bound, or allow more parts (--max-parts)")


def _best_split(engine: ExactSearch, goal: DividerGoal, kt: int, kb: int, low: float, high: float,
                rb_max: float, centre: float) -> _Hit | None:
    """The best pair with kt parts on top and kb below (see the module docstring)."""
    small_is_top = kt <= kb
    n_small, n_big = (kt, kb) if small_is_top else (kb, kt)
    table = engine.tables[n_small]
    s = table.values
    idx = np.arange(len(s))
    lo = np.maximum(low - s, 0.0)
    hi = high - s
    if small_is_top:
        hi = np.minimum(hi, rb_max)  # the big arm is the bottom
        ideal = goal.ideal_bottom(s)
    else:
        keep = s <= rb_max * (1 + EDGE_SLACK)
        idx, s, lo, hi = idx[keep], s[keep], lo[keep], hi[keep]
        ideal = goal.ideal_top(s)
    keep = hi >= lo
    idx, s, lo, hi, ideal = idx[keep], s[keep], lo[keep], hi[keep], ideal[keep]
    if not len(s):
        return None
    query = np.clip(ideal, lo, hi)
    used = table.parts[idx] if engine.limited else None
    floor, ceil = engine.bounds(n_big, query, used)
    best: _Hit | None = None
    for side, x in ((-1, floor), (+1, ceil)):
        ok = np.isfinite(x) & (x > 0)
        total = s + np.where(ok, x, 0.0)
        ok &= (total >= low * (1 - EDGE_SLACK)) & (total <= high * (1 + EDGE_SLACK))
        if small_is_top:
            ok &= x <= rb_max * (1 + EDGE_SLACK)
        where = np.nonzero(ok)[0]
        if not where.size:
            continue
        xs, ss = x[where], s[where]
        rt, rb = (ss, xs) if small_is_top else (xs, ss)
        err = np.abs(goal.error(rt, rb))
        tie = np.abs(np.log((ss + xs) / centre))
        least = err.min()
        near = np.nonzero(err - least <= SAME_ERROR)[0]
        j = near[np.argmin(tie[near])]
        hit = _Hit(float(err[j]), float(tie[j]), small_is_top, n_small, n_big, int(idx[where[j]]),
                   float(query[where[j]]), side)
        if best is None or hit.error < best.error - SAME_ERROR or (
                abs(hit.error - best.error) <= SAME_ERROR and hit.tie < best.tie):
            best = hit
    return best


def _row(engine: ExactSearch, goal: DividerGoal, stock: StockBin, k: int, hit: _Hit) -> DividerRow:
    """The row of a hit: both arms rebuilt, tied to stock lines jointly, verified."""
    used = engine.tables[hit.n_small].parts[[hit.small_index]] if engine.limited else None
    small = engine.network_at(hit.n_small, hit.small_index)
    # the engine's witness for the floor (side -1) or ceil (+1) at the same query the search made
    big = engine.witness(hit.n_big, np.array([hit.query]), used, hit.side)
    top, bottom = (small, big) if hit.small_is_top else (big, small)
    top, bottom = tie_arms(top, bottom, stock, goal)
    rt, rb = resistance(top), resistance(bottom)
    return DividerRow(
        parts=k,
        top=checked_arm(top),
        bottom=checked_arm(bottom),
        ratio=goal.ratio_of(rt, rb),
        output=float(goal.output(rt, rb)),
        error=float(goal.error(rt, rb)),
        proven=True,
    )


def tie_arms(top: Network, bottom: Network, stock: StockBin, goal: DividerGoal | None = None) -> tuple[Network, Network]:
    """Tie both arms' parts to stock lines at once, so together they never take more of a line than it holds.

    The two arms in series *are* the divider's string, so :func:`assign_lines` runs on
    ``series(top, bottom)`` (at the string's voltage, for headroom, when the goal has one) and
    the tied children are handed back to the arm they came from (a child of that series belongs
    to exactly one arm; equal children carry equal current, so which of two equal ones goes
    where changes nothing).

    Raises
    ------
    InfeasibleError
        When the bin cannot supply both arms together.
    """
    top, bottom = value_network(top), value_network(bottom)
    point = None
    if goal is not None and goal.has_voltage:
        point = OperatingPoint(volts=goal.vin if goal.kind == "voltage" else goal.vout)
    assigned = assign_lines(series(top, bottom), stock, point)
    if assigned is None:
        raise InfeasibleError(f"the bin cannot supply both arms together: {to_text(top)} and {to_text(bottom)}")
    tied = list(_series_children(assigned.network))
    top_kids = []
    for child in _series_children(top):
        j = next(i for i, t in enumerate(tied) if value_network(t) == child)
        top_kids.append(tied.pop(j))
    return series(*top_kids), series(*tied)


def _series_children(net: Network) -> tuple[Network, ...]:
    return net.children if isinstance(net, Series) else (net,)


def checked_arm(net: Network) -> Arm:
    """An arm with its value re-checked by the nodal solver (VerificationError beyond VERIFY_RTOL)."""
    value = resistance(net)
    edges, nodes = to_netlist(net)
    return Arm(net, value, verify_resistance(value, edges, nodes, rtol=VERIFY_RTOL))


# ---------------------------------------------------------------- review


def _extremes(net: Network) -> tuple[float, float]:
    """(lowest, highest) value of an arm over its parts' tolerances (exact: Rayleigh monotonicity)."""
    band = tolerance_band(net, [line_of(p)[0].tolerance for p in parts_in_order(net)])
    return band.low_ohms, band.high_ohms


def _arm_tc(net: Network) -> float:
    """The arm's coefficient Σ S_i·|α_i| in ppm/K: every part drifting its full tcr the same way.

    The part sensitivities S_i are positive, so this is also the largest magnitude the arm
    reaches when each part may drift either way; the two cases differ only in how the arms combine.
    """
    return temperature_coefficient(net, [line_of(p)[0].tcr_ppm for p in parts_in_order(net)])


def divider_review(goal: DividerGoal, row: DividerRow, vref_tolerance: float = 0.0,
                   derating: Derating = Derating()) -> DividerReview:
    """Bands, tempco, current, output resistance and loads of the divider of ``row``.

    Parameters
    ----------
    goal : DividerGoal
    row : DividerRow
    vref_tolerance : float
        The reference's tolerance, a fraction (regulator goals; 0.01 = ±1 %).
    derating : Derating
        Margins for each part's limits in the per-arm stress check.

    Notes
    -----
    *Band.* ``r = Rb/(Rt + Rb)`` grows with Rb and falls with Rt, and each arm's value grows with
    each of its parts (Rayleigh's monotonicity law), so the extremes of the ratio are at
    (top all high, bottom all low) and (top all low, bottom all high): exact, two evaluations
    per arm. A regulator's Vout grows with Vref and Rt and falls with Rb, so its extremes add
    the reference at either end of its tolerance; the pin current is taken as given.

    *Temperature.* ``ln r = ln Rb − ln(Rt + Rb)``, so ``d ln r = (1 − r)·(dRb/Rb − dRt/Rt)``:
    the ratio's coefficient is ``TC_r = (1 − r)·(TC_b − TC_t)`` (first order), and arms of
    equal coefficient cancel (tracking). In general ``TC_out = S_t·TC_t + S_b·TC_b`` with the
    output's relative sensitivities to the arms (``S_t = −(1 − r)``, ``S_b = 1 − r`` for a
    ratio; for a regulator ``S_t = Rt·(Vref/Rb + Ipin)/Vout``, ``S_b = −Rt·Vref/(Rb·Vout)``).
    Each arm's coefficient is ``Σ S_i·α_i`` over its parts (:mod:`netsynth.analysis.thermal`).
    Tracking: every part at +|α_i|; worst case: ``|S_t|·Σ S_i|α_i| + |S_b|·Σ S_j|α_j|``.
    """
    _check_vref_tolerance(goal, vref_tolerance)
    top, bottom = row.top.network, row.bottom.network
    rt, rb = row.top.value_ohms, row.bottom.value_ohms
    t_lo, t_hi = _extremes(top)
    b_lo, b_hi = _extremes(bottom)
    ratio_band = (goal.ratio_of(t_hi, b_lo), goal.ratio_of(t_lo, b_hi))
    if goal.kind == "regulator":
        def vout(vref: float, t: float, b: float) -> float:
            return vref * (1 + t / b) + goal.pin_current_a * t
        output_band = (vout(goal.vref * (1 - vref_tolerance), t_lo, b_hi),
                       vout(goal.vref * (1 + vref_tolerance), t_hi, b_lo))
        s_top = rt * (goal.vref / rb + goal.pin_current_a) / row.output
        s_bottom = -rt * goal.vref / (rb * row.output)
    else:
        scale = goal.vin if goal.kind == "voltage" else 1.0
        output_band = (ratio_band[0] * scale, ratio_band[1] * scale)
        s_top, s_bottom = -(1 - row.ratio), 1 - row.ratio
    tc_top, tc_bottom = _arm_tc(top), _arm_tc(bottom)
    tracking = abs(s_top * tc_top + s_bottom * tc_bottom)
    worst = abs(s_top) * tc_top + abs(s_bottom) * tc_bottom
    loads = None
    volts = goal.arm_volts(rt, rb)
    if volts is not None:
        loads = tuple(ArmLoad(v, network_stress(net, OperatingPoint(volts=v), derating))
                      for v, net in zip(volts, (top, bottom)))
    current = goal.bottom_current(rt, rb)
    return DividerReview(
        ratio_band=ratio_band,
        output_band=output_band,
        vref_tolerance=float(vref_tolerance),
        sensitivity_top=s_top,
        sensitivity_bottom=s_bottom,
        tempco_tracking_ppm=tracking,
        tempco_worst_ppm=worst,
        current_a=current,
        output_ohms=rt * rb / (rt + rb),
        loads=loads,  # type: ignore[arg-type]
        cautions=_cautions(goal, loads),
        notes=_notes(goal),
        pin_rule_a=PIN_CURRENT_FACTOR * goal.pin_current_a if goal.pin_current_a > 0 else None,
    )


def _check_vref_tolerance(goal: DividerGoal, vref_tolerance: float) -> None:
    if isinstance(vref_tolerance, bool) or not isinstance(vref_tolerance, (int, float)) or not (
            0 <= vref_tolerance < 1):
        raise ArgumentError(f"vref_tolerance={vref_tolerance!r}: a tolerance is a fraction from 0 up to 1")
    if vref_tolerance and goal.kind != "regulator":
        raise ArgumentError("vref_tolerance: only a regulator goal has a reference")


def _cautions(goal: DividerGoal, loads: Sequence[ArmLoad] | None) -> tuple[str, ...]:
    if loads is None:
        return ()
    out = []
    parts = [p for load in loads for p in load.stress.parts]
    if any(not p.ok for p in parts):
        out.append("a part is over a derated limit: this divider will overheat or break down as built")
    elif any(p.power_use > NEAR_LIMIT for p in parts):
        out.append(f"a part uses more than {NEAR_LIMIT:.0%} of its derated power limit: it will run hot")
    elif any(p.voltage_use > NEAR_LIMIT for p in parts):
        out.append(f"a part sees more than {NEAR_LIMIT:.0%} of its derated voltage limit")
    highest = max([goal.vin or 0.0, goal.vout or 0.0] + [p.volts for p in parts])
    if highest > CAUTION_VOLTS:
        out.append(f"{highest:.4g} V is present: a shock hazard; keep clearances and discharge before touching")
    if out:
        out.append(SAFETY_NOTE[0].upper() + SAFETY_NOTE[1:])
    return tuple(out)


def _notes(goal: DividerGoal) -> tuple[str, ...]:
    if goal.kind == "voltage":
        return ("the output is unloaded: a load on the middle node sits in parallel with the bottom arm; "
                "keep it well above the output resistance",)
    return ()


# ---------------------------------------------------------------- one request


def divider_pick_list(row: DividerRow) -> tuple[PickLine, ...]:
    """The parts of both arms, one entry per stock line, in the bin's order."""
    counts: dict[StockItem, int] = {}
    for part in row.top.components + row.bottom.components:
        if part.line is not None:
            counts[part.line] = counts.get(part.line, 0) + 1
    return tuple(PickLine(line, n) for line, n in sorted(counts.items(), key=lambda kv: bin_order(kv[0])))


def design_divider(goal: DividerGoal, stock: StockBin, max_parts: int = DEFAULT_MAX_PARTS,
                   total_ohms: tuple[float, float] | None = None, min_current_a: float | None = None,
                   vref_tolerance: float = 0.0, derating: Derating = Derating()) -> DividerDesign:
    """Search (:func:`search_divider`), pick the best row (smallest |error|, then fewest parts), review it.

    Examples
    --------
    A regulator from a 0.8 V reference to 3.3 V: single E24 parts 75k and 24k give it exactly,
    0.8·(1 + 75/24) = 3.3 (hand arithmetic; E24 from IEC 60063):

    >>> from netsynth.stock import default_bin
    >>> d = design_divider(regulator_goal(0.8, 3.3), default_bin(), 2, total_ohms=(50e3, 200e3))
    >>> d.best.top.expression, d.best.bottom.expression, abs(d.best.error) < 1e-12
    ('75k', '24k', True)
    """
    start = time.perf_counter()
    _check_vref_tolerance(goal, vref_tolerance)
    rows = search_divider(goal, stock, max_parts, total_ohms, min_current_a)
    best = min(rows, key=lambda r: (abs(r.error) > min(abs(x.error) for x in rows) + SAME_ERROR, r.parts))
    review = divider_review(goal, best, vref_tolerance, derating)
    return DividerDesign(
        goal=goal,
        bin_name=stock.name,
        max_parts=max_parts,
        total_ohms=total_ohms if total_ohms is None else (float(total_ohms[0]), float(total_ohms[1])),
        min_current_a=min_current_a,
        rows=tuple(rows),
        best=best,
        review=review,
        pick_list=divider_pick_list(best),
        seconds=time.perf_counter() - start,
    )
