"""Every part is a stock line: identity from the search to stress, bands, pick list and JSON.

References: the brute force in exact rationals of ``tests/test_search.py`` (every tree of every
multiset within the counts); Ohm's law and P = V²/R for the hand-computed stress; Rayleigh's
monotonicity law for the worst-case band (all parts at one end of their own band).
"""

from __future__ import annotations

import random
from collections import Counter
from fractions import Fraction

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from netsynth import make
from netsynth.analysis.conditions import Derating, OperatingPoint
from netsynth.analysis.tolerance import tolerance_band
from netsynth.network import exact_resistance, parts_in_order
from netsynth.stock import StockBin, StockItem, load_bin
from tests.test_search import brute_force_best

FULL = Derating(1.0, 1.0)


def mixed_drawer() -> StockBin:
    # two lines of one value: ¼ W in drawer A, 1 W in drawer B (an invented repair bench)
    return StockBin((StockItem(10.0, 2, location="drawer A"),
                     StockItem(10.0, 2, power_rating_w=1.0, location="drawer B")))


def test_pick_list_and_rating_check_use_the_same_line():
    # 5 Ω at 0.8 W from 10 Ω parts: two in parallel, 0.4 W each (P = V²/R with V = √(0.8 · 5) = 2 V).
    # ¼ W parts at 50 % derating allow 0.125 W: only the 1 W line (0.5 W allowed) can carry it.
    design = make(5.0, mixed_drawer(), point=OperatingPoint(watts=0.8))
    parts = parts_in_order(design.best.network)
    assert [p.line.location for p in parts] == ["drawer B", "drawer B"]
    assert [s.line for s in design.review.stress.parts] == [p.line for p in parts]
    assert [(p.location, p.count) for p in design.pick_list] == [("drawer B", 2)]
    assert design.review.stress.headroom == pytest.approx(0.5 / 0.4)  # power drive: factor on the power
    assert design.review.ok


def test_a_search_may_mix_lines_of_one_value():
    # 2.5 Ω at 1 W from four 10 Ω in parallel: 0.25 W each; two 1 W parts are not enough, and ¼ W parts
    # at 100 % derating just carry 0.25 W: two of each line, every part within its own line's limit.
    design = make(2.5, mixed_drawer(), max_parts=4, point=OperatingPoint(watts=1.0), derating=FULL)
    assert design.best.parts == 4 and design.best.error == pytest.approx(0.0, abs=1e-12)
    used = Counter(p.line.location for p in parts_in_order(design.best.network))
    assert used == {"drawer A": 2, "drawer B": 2}
    assert all(s.ok for s in design.review.stress.parts)


def test_tolerance_comes_from_each_part_s_own_line():
    # a 0.1 % line and a 5 % line of 1 kΩ, one part each: 1k + 1k takes one of each, so the worst case
    # is ±(0.1 % + 5 %)/2 = ±2.55 % (series: the band is the value-weighted mean of the parts' bands)
    stock = StockBin((StockItem(1000.0, 1, tolerance=0.001, location="tight"),
                      StockItem(1000.0, 1, tolerance=0.05, location="loose")))
    design = make(2000.0, stock, max_parts=2)
    assert design.best.parts == 2
    low, high = design.review.band.worst_rel
    assert (low, high) == pytest.approx((-0.0255, 0.0255))
    assert sorted(p.location for p in design.pick_list) == ["loose", "tight"]


# ------------------------------------------------------------------ property: identity end to end

line_ratings = st.tuples(
    st.sampled_from([0.001, 0.01, 0.05]),  # tolerance
    st.sampled_from([0.125, 0.25, 1.0]),  # watts
    st.sampled_from([50.0, 200.0]),  # max volts
    st.sampled_from([25.0, 100.0]),  # tcr
)


@st.composite
def drawers(draw):
    values = draw(st.lists(st.sampled_from([10.0, 22.0, 47.0, 100.0, 220.0, 470.0]), min_size=1, max_size=3,
                           unique=True))
    items = []
    for v in values:
        ratings = draw(st.lists(line_ratings, min_size=1, max_size=3, unique=True))
        for k, (tol, watts, volts, tcr) in enumerate(ratings):
            items.append(StockItem(v, draw(st.integers(1, 3)), tolerance=tol, power_rating_w=watts, max_volts=volts,
                                   tcr_ppm=tcr, location=f"{v:g}-{k}"))
    return StockBin(tuple(items), name="random drawer")


def lines_used(net) -> Counter:
    return Counter(p.line for p in parts_in_order(net))


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(stock=drawers(), target=st.sampled_from([3.3, 15.0, 68.0, 150.0, 333.0, 1000.0]),
       volts=st.sampled_from([None, 0.5, 2.0, 6.0]))
def test_every_part_is_one_stock_line_end_to_end(stock, target, volts):
    point = OperatingPoint(volts=volts) if volts else None
    try:
        design = make(target, stock, max_parts=3, point=point, alternatives=1)
    except Exception as exc:  # only "nothing stays within the limits" may refuse
        from netsynth.errors import InfeasibleError

        assert isinstance(exc, InfeasibleError) and point is not None
        return
    for entry in design.frontier:
        for cand in (entry.best, *entry.alternatives):
            parts = parts_in_order(cand.network)
            assert all(p.line is not None and p.line in stock.items for p in parts)
            for line, n in lines_used(cand.network).items():
                assert n <= line.count, "a line gives more parts than it holds"
        if entry.stress is not None:
            assert [s.line for s in entry.stress.parts] == [p.line for p in parts_in_order(entry.best.network)]
            assert not entry.stress.violations, "a part over its own line's derated limit"
    best = parts_in_order(design.best.network)
    # the band is that of the parts' own lines (worst case by Rayleigh monotonicity: all low, all high)
    band = tolerance_band(design.best.network, [p.line.tolerance for p in best])
    assert (design.review.band.low_ohms, design.review.band.high_ohms) == (band.low_ohms, band.high_ohms)
    assert {p.line: p.count for p in design.pick_list} == dict(lines_used(design.best.network))


def _csv(items, order) -> str:
    rows = ["value,qty,tolerance,watts,max_volts,tcr,location"]
    for i in order:
        it = items[i]
        rows.append(f"{it.ohms!r},{it.count},{it.tolerance * 100!r}%,{it.power_rating_w!r},{it.max_volts!r},"
                    f"{it.tcr_ppm!r},{it.location}")
    return "\n".join(rows) + "\n"


def _answer(design):
    """Everything of an answer but the bin file's line numbers."""
    def parts(net):
        return [(p.ohms, p.line.location, p.line.tolerance, p.line.power_rating_w) for p in parts_in_order(net)]
    return ([(e.parts, e.best.expression, e.best.value_ohms, parts(e.best.network)) for e in design.frontier],
            [(p.location, p.count) for p in design.pick_list])


@settings(max_examples=15, deadline=None, suppress_health_check=[HealthCheck.too_slow,
                                                                 HealthCheck.function_scoped_fixture])
@given(stock=drawers(), target=st.sampled_from([15.0, 68.0, 333.0]), seed=st.integers(0, 10**6),
       volts=st.sampled_from([None, 2.0]))
def test_shuffling_the_bin_file_changes_no_answer(tmp_path, stock, target, seed, volts):
    items = list(stock.items)
    order = list(range(len(items)))
    random.Random(seed).shuffle(order)
    first, second = tmp_path / "a.csv", tmp_path / "b.csv"
    first.write_text(_csv(items, range(len(items))), encoding="utf-8")
    second.write_text(_csv(items, order), encoding="utf-8")
    point = OperatingPoint(volts=volts) if volts else None
    answers = []
    for path in (first, second):
        try:
            answers.append(_answer(make(target, load_bin(path), max_parts=3, point=point)))
        except Exception as exc:
            answers.append(type(exc).__name__)
    assert answers[0] == answers[1]


# ------------------------------------------------------------------ the fewest parts within an accuracy

FEWEST_CASES = [
    # (values, counts, target, within) — small invented drawers; targets inside and outside their span.
    ([10_000, 8200, 6800], [2, 2, 2], 10_400, 0.05),  # one 10k is -3.8 %: one part
    ([10, 2000], [None, None], 9.95, 0.01),  # one 10 Ω is +0.5 %: one part (not 10 || 2k)
    ([100, 220, 470], [1, 1, 1], 790, 0.001),  # 100 + 220 + 470 = 790 exactly: three parts
    ([100, 220, 470], [1, 1, 1], 5000, 0.01),  # beyond the whole drawer (790 Ω): never within
    ([1000], [3], 333.3, 0.001),  # below the smallest value: three in parallel (333.33 Ω)
    ([47, 150, 330], [2, 1, 1], 100, 0.02),  # 150 || 330 = 103.1 Ω (+3.1 %); 47 + 47 = 94 (-6 %)
]


def fewest_within(values, counts, target, within, k):
    """From the brute force: the fewest parts whose best network lands within ``within``, or None."""
    for n in range(1, k + 1):
        best = brute_force_best(values, counts, n, Fraction(str(target)))
        if best is not None and best <= Fraction(str(within)):
            return n
    return None


@pytest.mark.parametrize("values, counts, target, within", FEWEST_CASES)
@pytest.mark.parametrize("prefer", ["error", "parts"])
def test_fewest_parts_within_an_accuracy_against_brute_force(values, counts, target, within, prefer):
    stock = StockBin(tuple(StockItem(float(v), c) for v, c in zip(values, counts)))
    k = 4
    design = make(float(target), stock, max_parts=k, within=within, prefer=prefer)
    expected = fewest_within(values, counts, target, within, k)
    if expected is None:
        assert design.within_met is False
        # the answer is then the closest of all (brute force over every count)
        errors = [brute_force_best(values, counts, n, Fraction(str(target))) for n in range(1, k + 1)]
        closest = min(e for e in errors if e is not None)
        got = abs(exact_resistance(design.best.network) / Fraction(str(target)) - 1)
        assert float(got) == pytest.approx(float(closest), abs=1e-12)
    else:
        assert design.within_met is True
        assert design.best.parts == expected


@settings(max_examples=30, deadline=None)
@given(
    values=st.lists(st.integers(1, 60).map(lambda x: x * 10), min_size=1, max_size=3, unique=True),
    counts=st.lists(st.sampled_from([1, 2, None]), min_size=3, max_size=3),
    target=st.integers(2, 4000),
    within=st.sampled_from([0.001, 0.01, 0.05, 0.2]),
)
def test_fewest_parts_property(values, counts, target, within):
    # reference: the brute force in exact rationals; targets run well outside the drawers' span
    counts = counts[: len(values)]
    stock = StockBin(tuple(StockItem(float(v), c) for v, c in zip(values, counts)))
    k = 4
    design = make(float(target), stock, max_parts=k, within=within, prefer="parts")
    expected = fewest_within(values, counts, target, within, k)
    if expected is None:
        assert design.within_met is False
    else:
        assert design.best.parts == expected


def test_a_row_for_every_part_count_even_far_from_the_target():
    # 50 kΩ from an E12 kit up to 10 kΩ: four parts reach 40 kΩ at most (4 × 10k in series, hand arithmetic);
    # every count gets its row, and five parts would reach the target
    design = make("50k", StockBin(tuple(StockItem(v) for v in (1000.0, 4700.0, 10_000.0))), max_parts=4)
    assert [e.parts for e in design.frontier] == [1, 2, 3, 4]
    assert [e.best.value_ohms for e in design.frontier] == [10e3, 20e3, 30e3, 40e3]
    assert design.reach.parts == 5
