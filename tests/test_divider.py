"""Dividers: the joint search against a brute force, shared stock, textbook dividers, bands and tempco."""

from __future__ import annotations

import itertools
import json
import random
from collections import Counter
from fractions import Fraction
from functools import lru_cache

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from netsynth.cli import cli
from netsynth.errors import ArgumentError, InfeasibleError
from netsynth.jobs.divider import (
    design_divider,
    ratio_goal,
    regulator_goal,
    search_divider,
    voltage_goal,
)
from netsynth.network import Part, Series, parts_in_order
from netsynth.stock import StockBin, StockItem, bin_from_values, default_bin

# ------------------------------------------------------------------ brute force


@lru_cache(maxsize=None)
def realisable(multiset: tuple[int, ...]) -> frozenset[Fraction]:
    """Every value of a series/parallel network using exactly these parts (exact rationals)."""
    if len(multiset) == 1:
        return frozenset({Fraction(multiset[0])})
    out = set()
    for mask in range(1, 2 ** len(multiset) - 1):
        left = tuple(sorted(multiset[i] for i in range(len(multiset)) if mask >> i & 1))
        right = tuple(sorted(multiset[i] for i in range(len(multiset)) if not mask >> i & 1))
        for a in realisable(left):
            for b in realisable(right):
                out.add(a + b)
                out.add(a * b / (a + b))
    return frozenset(out)


def brute_force_divider(values, counts, k, output, target, window=None):
    """Smallest |output(Rt, Rb)/target − 1| over every pair of arms with k parts in all.

    Deliberately simple: every multiset of k parts within the counts, every way to split it
    into a top and a bottom multiset, every network value of each, in exact rationals.
    """
    limit = {v: (k if c is None else c) for v, c in zip(values, counts)}
    best = None
    for combo in itertools.combinations_with_replacement(sorted(values), k):
        if any(combo.count(v) > limit[v] for v in set(combo)):
            continue
        for mask in range(1, 2 ** k - 1):
            top = tuple(sorted(combo[i] for i in range(k) if mask >> i & 1))
            bottom = tuple(sorted(combo[i] for i in range(k) if not mask >> i & 1))
            for rt in realisable(top):
                for rb in realisable(bottom):
                    if window is not None and not window[0] <= rt + rb <= window[1]:
                        continue
                    err = abs(output(rt, rb) / target - 1)
                    if best is None or err < best:
                        best = err
    return best


def ratio_of(r):
    return lambda rt, rb: rb / (rt + rb)


def regulator_of(vref, ipin):
    return lambda rt, rb: vref * (1 + rt / rb) + ipin * rt


CASES = [
    # (values, counts, goal, exact output function, exact target, window, k) — small invented drawers
    ([100, 220, 470, 1000], [1, 1, 1, 1], ratio_goal(0.3), ratio_of(None), Fraction("0.3"), None, 4),
    ([100, 220, 470, 1000], [2, 1, 2, 1], ratio_goal(0.123), ratio_of(None), Fraction("0.123"), None, 4),
    ([10, 47, 150], [None, 1, 2], voltage_goal(12.0, 5.0), lambda rt, rb: 12 * rb / (rt + rb), Fraction(5),
     (100, 400), 4),
    ([330, 680, 1500, 3300], [1, 2, 1, 1], regulator_goal(0.8, 3.3, 2e-5), regulator_of(Fraction("0.8"),
     Fraction("2e-5")), Fraction("3.3"), None, 4),
    ([1, 2, 5], [2, 2, 1], ratio_goal(0.37), ratio_of(None), Fraction("0.37"), (2, 9), 5),
]


@pytest.mark.parametrize("values, counts, goal, output, target, window, k", CASES)
def test_joint_search_equals_brute_force(values, counts, goal, output, target, window, k):
    # reference: the brute force above (exact rationals, every pair of trees from one bin)
    stock = StockBin(tuple(StockItem(float(v), c) for v, c in zip(values, counts)))
    rows = {row.parts: row for row in search_divider(goal, stock, k, total_ohms=window)}
    for n in range(2, k + 1):
        expected = brute_force_divider(values, counts, n, output, target, window)
        if expected is None:
            assert n not in rows
            continue
        row = rows[n]
        assert abs(abs(row.error) - float(expected)) <= 1e-9 * max(1.0, float(expected))
        assert row.proven
        assert row.top.parts + row.bottom.parts == n


def _used_per_line(row) -> Counter:
    return Counter(p.line for p in parts_in_order(row.top.network) + parts_in_order(row.bottom.network))


small_bins = st.lists(
    st.tuples(st.sampled_from([10, 22, 47, 100, 220, 470, 1000]), st.integers(1, 3)),
    min_size=1, max_size=4, unique_by=lambda t: t[0],
)


@settings(max_examples=40, deadline=None)
@given(small_bins, st.floats(0.02, 0.98), st.integers(2, 4))
def test_both_arms_together_never_take_more_of_a_line_than_it_holds(lines, ratio, k):
    stock = StockBin(tuple(StockItem(float(v), c) for v, c in lines))
    try:
        rows = search_divider(ratio_goal(ratio), stock, k)
    except InfeasibleError:
        assert sum(c for _, c in lines) < 2  # only when the bin holds fewer than two parts
        return
    for row in rows:
        for line, used in _used_per_line(row).items():
            assert line is not None and used <= line.count
        for part in parts_in_order(row.top.network) + parts_in_order(row.bottom.network):
            assert part.line.ohms == part.ohms


def test_two_lines_of_one_value_are_shared_across_arms():
    # a drawer of two 1k parts on two lines (¼ W and 1 W): 1k over 1k (ratio ½) takes one from each
    stock = StockBin((StockItem(1000.0, 1, location="A"), StockItem(1000.0, 1, power_rating_w=1.0, location="B")))
    row = search_divider(ratio_goal(0.5), stock, 2)[0]
    assert row.error == 0
    assert sorted(p.line.location for p in row.top.components + row.bottom.components) == ["A", "B"]


# ------------------------------------------------------------------ textbook dividers


def test_lessons_in_electric_circuits_voltage_divider():
    # Lessons In Electric Circuits Vol. I, ch. 6 "Voltage divider circuits": 45 V across three resistors,
    # I = 2 mA, V_R1 = 10 V (printed); R2 = 2·R1, so R1 = 5 kΩ, R2 = 10 kΩ, R3 = 7.5 kΩ (hand arithmetic
    # from the printed numbers: 45 V / 2 mA = 22.5 kΩ, 10 V / 2 mA = 5 kΩ).
    stock = bin_from_values([5000, 10000, 7500], count=1)
    design = design_divider(voltage_goal(45.0, 10.0), stock, 3)
    best = design.best
    assert best.parts == 3 and abs(best.error) < 1e-12
    assert best.bottom.value_ohms == 5000 and best.top.value_ohms == 17500
    assert design.review.current_a == pytest.approx(2e-3, rel=1e-12)  # printed: 2 mA
    # same book, same page: at 180 V the same divider gives V_R1 = 40 V (printed)
    again = design_divider(voltage_goal(180.0, 40.0), stock, 3).best
    assert (again.top.value_ohms, again.bottom.value_ohms) == (17500, 5000)


def test_openstax_series_circuit_as_a_divider_and_its_part_loads():
    # OpenStax University Physics Vol. 2 §10.2, Example "Equivalent Resistance, Current, and Power in a
    # Series Circuit": 9 V across four 20 Ω and one 10 Ω; 2 V and 0.2 W on each 20 Ω, 1 V and 0.1 W on the 10 Ω
    stock = StockBin((StockItem(20.0, 4), StockItem(10.0, 1)))
    # (10 || 20 || 20) under 20 + 20 is 1/9 as well (5 Ω of 45 Ω); the book's string is 90 Ω in all (printed R_S)
    design = design_divider(voltage_goal(9.0, 1.0), stock, 5, total_ohms=(90.0, 90.0))
    best = design.best
    assert best.parts == 5 and abs(best.error) < 1e-12
    assert best.bottom.expression == "10" and best.top.value_ohms == 80
    top_load, bottom_load = design.review.loads
    assert [p.volts for p in top_load.stress.parts] == pytest.approx([2.0] * 4, rel=1e-9)
    assert [p.watts for p in top_load.stress.parts] == pytest.approx([0.2] * 4, rel=1e-9)
    assert bottom_load.stress.parts[0].volts == pytest.approx(1.0, rel=1e-9)
    assert bottom_load.stress.parts[0].watts == pytest.approx(0.1, rel=1e-9)
    assert design.review.current_a == pytest.approx(0.1, rel=1e-12)  # printed: I = 0.1 A


def test_regulator_feedback_from_a_0v8_reference_to_3v3_with_two_e24_parts():
    # 0.8 V·(1 + 75k/24k) = 0.8·99/24 = 3.3 V exactly (hand arithmetic); 75 and 24 are E24 values (IEC 60063)
    design = design_divider(regulator_goal(0.8, 3.3), default_bin(), 4, total_ohms=(50e3, 200e3),
                            vref_tolerance=0.01)
    two = design.rows[0]
    assert two.parts == 2 and abs(two.error) < 1e-12
    assert (two.top.expression, two.bottom.expression) == ("75k", "24k")
    assert design.best is two  # exact with the fewest parts
    review = design.review
    # hand arithmetic: Rt ∥ Rb = 75k·24k/99k; divider current Vref/Rb = 0.8 V / 24 kΩ
    assert review.output_ohms == pytest.approx(75e3 * 24e3 / 99e3, rel=1e-12)
    assert review.current_a == pytest.approx(0.8 / 24e3, rel=1e-12)
    # worst case, hand arithmetic: Vref and top high, bottom low (and the reverse), each part ±1 %
    high = Fraction("0.808") * (1 + Fraction(75750) / Fraction(23760))
    low = Fraction("0.792") * (1 + Fraction(74250) / Fraction(24240))
    assert review.output_band == pytest.approx((float(low), float(high)), rel=1e-12)
    # both arms 100 ppm/K parts: they track, and the ratio's coefficient cancels
    assert review.tempco_tracking_ppm == pytest.approx(0.0, abs=1e-9)
    # untracked: (1 − r)·(100 + 100) with r = 24/99 (hand arithmetic)
    assert review.tempco_worst_ppm == pytest.approx((1 - 24 / 99) * 200, rel=1e-12)


def test_pin_current_term_moves_the_answer():
    # Vout = Vref·(1 + Rt/Rb) + Ipin·Rt: 0.8·(1 + 75/24) + 1 µA·75k = 3.375 V (hand arithmetic)
    goal = regulator_goal(0.8, 3.3, 1e-6)
    assert goal.output(75e3, 24e3) == pytest.approx(3.375, rel=1e-12)
    design = design_divider(goal, default_bin(), 2, total_ohms=(50e3, 200e3))
    assert abs(design.best.error) < abs(3.375 / 3.3 - 1)
    assert design.review.pin_rule_a == pytest.approx(100e-6)  # 100 × 1 µA (common practice, no source)


# ------------------------------------------------------------------ bands and tempco vs Monte Carlo


def _value(net, leaf):
    """Network value with leaf(part) in place of each part (the test's own series/parallel walk)."""
    if isinstance(net, Part):
        return leaf(net)
    kids = [_value(c, leaf) for c in net.children]
    return sum(kids) if isinstance(net, Series) else 1 / sum(1 / k for k in kids)


MIXED = StockBin((
    StockItem(1000.0, 2, tolerance=0.01, tcr_ppm=100.0),
    StockItem(2200.0, 2, tolerance=0.001, tcr_ppm=25.0),
    StockItem(4700.0, 2, tolerance=0.05, tcr_ppm=250.0),
    StockItem(330.0, 2, tolerance=0.002, tcr_ppm=10.0),
))


@pytest.mark.parametrize("goal", [ratio_goal(0.2), voltage_goal(10.0, 3.0), regulator_goal(1.25, 5.0, 1e-5)])
def test_band_and_tempco_against_corners_and_monte_carlo(goal):
    design = design_divider(goal, MIXED, 4, vref_tolerance=0.02 if goal.kind == "regulator" else 0.0)
    row, review = design.best, design.review
    parts = [(arm, p) for arm in ("t", "b") for p in (row.top.components if arm == "t" else row.bottom.components)]
    vref_tol = review.vref_tolerance

    def output(factors, vref_factor=1.0):
        it = iter(factors)
        top = _value(row.top.network, lambda p: p.ohms * next(it))
        bottom = _value(row.bottom.network, lambda p: p.ohms * next(it))
        if goal.kind == "regulator":
            return goal.vref * vref_factor * (1 + top / bottom) + goal.pin_current_a * top
        r = bottom / (top + bottom)
        return r * goal.vin if goal.kind == "voltage" else r

    # every corner of every part's tolerance (and the reference's): the extremes are the band
    corners = [output([1 + s * p.line.tolerance for s, (_, p) in zip(signs, parts)], 1 + sv * vref_tol)
               for signs in itertools.product((-1, 1), repeat=len(parts)) for sv in (-1, 1)]
    assert (min(corners), max(corners)) == pytest.approx(review.output_band, rel=1e-12)
    # Monte Carlo: parts uniform in their band, all builds inside the band
    rng = random.Random(7)
    builds = [output([1 + rng.uniform(-1, 1) * p.line.tolerance for _, p in parts],
                     1 + rng.uniform(-1, 1) * vref_tol) for _ in range(3000)]
    assert review.output_band[0] <= min(builds) and max(builds) <= review.output_band[1]
    # temperature: each part drifts by ±|tcr| over a small step; every sign pattern stays within the worst
    # figure, the largest reaches it, and all-parts-the-same-way gives the tracking figure (first order)
    dt = 1e-3
    nominal = output([1.0] * len(parts))
    drift = {signs: (output([1 + s * p.line.tcr_ppm * 1e-6 * dt for s, (_, p) in zip(signs, parts)]) / nominal - 1)
             / dt * 1e6 for signs in itertools.product((-1, 1), repeat=len(parts))}
    assert max(abs(d) for d in drift.values()) == pytest.approx(review.tempco_worst_ppm, rel=1e-4)
    assert abs(drift[(1,) * len(parts)]) == pytest.approx(review.tempco_tracking_ppm, rel=1e-4, abs=1e-6)


# ------------------------------------------------------------------ limits and errors


def test_total_window_and_current_bound_are_kept():
    rows = search_divider(voltage_goal(12.0, 3.3), default_bin(), 4, total_ohms=(10e3, 20e3))
    assert all(10e3 * (1 - 1e-12) <= r.total_ohms <= 20e3 * (1 + 1e-12) for r in rows)
    # at least 1 mA from 12 V: Rt + Rb ≤ 12 kΩ (Ohm's law)
    rows = search_divider(voltage_goal(12.0, 3.3), default_bin(), 3, min_current_a=1e-3)
    assert all(r.total_ohms <= 12e3 * (1 + 1e-12) for r in rows)
    # a regulator's divider current is the bottom arm's: Vref/Rb ≥ 100 µA means Rb ≤ 8 kΩ
    rows = search_divider(regulator_goal(0.8, 3.3), default_bin(), 3, min_current_a=1e-4)
    assert all(r.bottom.value_ohms <= 8e3 * (1 + 1e-12) for r in rows)


@pytest.mark.parametrize("make_goal", [lambda: ratio_goal(1.0), lambda: ratio_goal(0), lambda: voltage_goal(3, 5),
                                       lambda: regulator_goal(1.25, 1.0), lambda: regulator_goal(0.8, 3.3, -1e-6)])
def test_bad_goals_are_argument_errors(make_goal):
    with pytest.raises(ArgumentError):
        make_goal()


def test_nothing_in_the_window_is_infeasible():
    with pytest.raises(InfeasibleError, match="total"):
        search_divider(ratio_goal(0.5), default_bin(), 2, total_ohms=(1.0, 5.0))


def test_current_bound_needs_a_voltage():
    with pytest.raises(ArgumentError, match="min_current_a"):
        search_divider(ratio_goal(0.5), default_bin(), 2, min_current_a=1e-3)


# ------------------------------------------------------------------ command line


def run(runner, *args):
    result = runner.invoke(cli, list(args))
    assert result.exception is None or isinstance(result.exception, SystemExit)
    assert "Traceback" not in result.output
    return result


def test_cli_divider_json_contract(runner):
    result = run(runner, "divider", "--vref", "0.8", "--vout", "3.3", "--total", "50k..200k", "-k", "3",
                 "--vref-tol", "1%", "--json")
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    assert [row["parts"] for row in data["frontier"]] == [2, 3]
    best = data["best"]
    assert best["top"]["expression"] == "75k" and best["bottom"]["expression"] == "24k"
    for row in data["frontier"]:
        assert set(row) >= {"parts", "top", "bottom", "ratio", "vout", "error", "proven"}
        for arm in (row["top"], row["bottom"]):
            assert set(arm) >= {"expression", "value_ohms", "verified_ohms", "components"}
            assert arm["verified_ohms"] == pytest.approx(arm["value_ohms"], rel=1e-9)
            assert all(c["line"] is not None for c in arm["components"])
        assert row["ratio"] == pytest.approx(row["bottom"]["value_ohms"]
                                             / (row["top"]["value_ohms"] + row["bottom"]["value_ohms"]))
    assert set(data) >= {"band", "tempco_ppm", "current_a", "output_ohms", "loads", "pick_list", "cautions"}
    assert data["band"]["vref_tolerance"] == 0.01


def test_cli_divider_ratio_has_no_vout(runner):
    result = run(runner, "divider", "--ratio", "25%", "-k", "2", "--json")
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    assert "vout" not in data["best"] and data["loads"] is None
    # 1/(1 + 3): a top of 3 × the bottom gives 0.25; E24 holds 10 and 30 (IEC 60063)
    assert data["best"]["error"] == pytest.approx(0.0, abs=1e-12)


def test_cli_divider_text_has_units_drawings_and_caution(runner):
    result = run(runner, "divider", "--vin", "120", "--vout", "5", "--total", "100k..1M", "-k", "2")
    assert result.exit_code == 0, result.output
    out = result.output
    assert out.startswith("Divider: Vout 5 V from Vin 120 V")
    assert "IN ──[" in out and "OUT ──[" in out and "GND" in out
    assert "Take from the bin:" in out and "Divider current:" in out and "Ω" in out
    assert "Caution: 120 V is present" in out  # over 50 V: the safety caution
    assert "local codes and licensed practice govern the build" in out


@pytest.mark.parametrize("args", [
    ["divider", "--ratio", "0.5", "--vin", "5", "--vout", "2"],   # two goals
    ["divider", "--vout", "3.3"],                                  # half a goal
    ["divider", "--ratio", "1.5"],                                 # not a ratio
    ["divider", "--vin", "12", "--vout", "3", "--pin-current", "1uA"],  # pin current without a reference
    ["divider", "--ratio", "0.5", "-k", "1"],
])
def test_cli_divider_usage_errors_exit_2(runner, args):
    result = run(runner, *args)
    assert result.exit_code == 2 and "Error" in result.output


def test_cli_divider_infeasible_is_one_json_error(runner):
    result = run(runner, "divider", "--ratio", "0.5", "--total", "1..5", "-k", "2", "--json")
    assert result.exit_code == 1
    assert json.loads(result.stdout)["error"]["kind"] == "infeasible"


def test_cli_divider_help(runner):
    result = run(runner, "divider", "--help")
    assert result.exit_code == 0 and "Vref·(1 + Rtop/Rbottom)" in result.output and "--total" in result.output
