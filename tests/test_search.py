"""The exact search against outside counts (OEIS) and against a deliberately simple brute force."""

from __future__ import annotations

import itertools
import os
from collections import Counter
from fractions import Fraction
from functools import lru_cache

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from netsynth.errors import InfeasibleError
from netsynth.network import exact_resistance, part_count, part_values, resistance
from netsynth.search.exact import ExactSearch
from netsynth.search.frontier import search_frontier
from netsynth.search.tables import all_tables, distinct_value_count
from netsynth.stock import StockBin, StockItem, bin_from_values

# ------------------------------------------------------------------ OEIS counts

# OEIS A048211: distinct resistances of exactly n equal resistors, series and parallel only.
A048211 = [1, 2, 4, 9, 22, 53, 131, 337, 869, 2213, 5691, 14517]
# OEIS A153588: distinct resistances of at most n equal resistors, series and parallel.
A153588 = [1, 3, 7, 15, 35, 77, 179, 429, 1039, 2525, 6235, 15463]


@pytest.fixture(scope="module", autouse=True, params=["compiled", "numpy"])
def engine_kind(request):
    """Every test here runs on both engines: the compiled recursion and the numpy one."""
    from netsynth.search import kernel

    if request.param == "compiled" and not kernel.built():
        pytest.skip("the compiled recursion was not built (no C compiler at install)")
    before = os.environ.get("NETSYNTH_KERNEL")
    os.environ["NETSYNTH_KERNEL"] = "on" if request.param == "compiled" else "off"
    yield request.param
    if before is None:
        del os.environ["NETSYNTH_KERNEL"]
    else:
        os.environ["NETSYNTH_KERNEL"] = before


@pytest.fixture(scope="module")
def unit_tables():
    return all_tables([1.0], None, 12)


@pytest.mark.parametrize("n, expected", list(enumerate(A048211, start=1)))
def test_exactly_n_unit_parts_matches_oeis_a048211(unit_tables, n, expected):
    # OEIS A048211
    assert len(unit_tables[n - 1]) == expected


@pytest.mark.parametrize("n, expected", list(enumerate(A153588, start=1)))
def test_at_most_n_unit_parts_matches_oeis_a153588(unit_tables, n, expected):
    # OEIS A153588
    assert distinct_value_count(unit_tables[:n]) == expected


def test_values_new_at_five_parts_match_oeis_a051389(unit_tables):
    # OEIS A051389, explicit set of the 20 values that need exactly 5 unit resistors
    expected = {Fraction(1, 5), Fraction(2, 7), Fraction(3, 8), Fraction(3, 7), Fraction(4, 7), Fraction(5, 8),
                Fraction(5, 7), Fraction(4, 5), Fraction(5, 6), Fraction(6, 7), Fraction(7, 6), Fraction(6, 5),
                Fraction(5, 4), Fraction(7, 5), Fraction(8, 5), Fraction(7, 4), Fraction(7, 3), Fraction(8, 3),
                Fraction(7, 2), Fraction(5)}
    fewer = {Fraction(v).limit_denominator(100) for t in unit_tables[:4] for v in t.values}
    five = {Fraction(v).limit_denominator(100) for v in unit_tables[4].values}
    assert five - fewer == expected


def test_four_unit_parts_match_oeis_a048211_example(unit_tables):
    # OEIS A048211 comment: the n = 4 set {1/4, 2/5, 3/5, 3/4, 1, 4/3, 5/3, 5/2, 4}
    four = sorted(Fraction(v).limit_denominator(100) for v in unit_tables[3].values)
    assert four == sorted(Fraction(x) for x in ["1/4", "2/5", "3/5", "3/4", "1", "4/3", "5/3", "5/2", "4"])


# ------------------------------------------------------------------ brute force


def brute_force_best(values: list[int], counts: list[int | None], n: int, target: Fraction):
    """Smallest |value/target - 1| over every series/parallel network of exactly n parts.

    Deliberately simple: every multiset of n parts within the counts, and every way of
    splitting a multiset in two, recursively, in exact rational arithmetic.
    """

    @lru_cache(maxsize=None)
    def realisable(multiset: tuple[int, ...]) -> frozenset[Fraction]:
        if len(multiset) == 1:
            return frozenset({Fraction(multiset[0])})
        out = set()
        items = list(multiset)
        for mask in range(1, 2 ** len(items) - 1):
            left = tuple(sorted(items[i] for i in range(len(items)) if mask >> i & 1))
            right = tuple(sorted(items[i] for i in range(len(items)) if not mask >> i & 1))
            for a in realisable(left):
                for b in realisable(right):
                    out.add(a + b)
                    out.add(a * b / (a + b))
        return frozenset(out)

    best = None
    limit = {v: (n if c is None else c) for v, c in zip(values, counts)}
    for combo in itertools.combinations_with_replacement(sorted(values), n):
        if any(combo.count(v) > limit[v] for v in set(combo)):
            continue
        for r in realisable(combo):
            err = abs(r / target - 1)
            if best is None or err < best:
                best = err
    return best


SMALL_CASES = [
    # (values, counts, target, max parts) — small invented bins, limited and unlimited
    ([100, 220, 470, 1000], [1, 1, 1, 1], 337, 4),          # one of each
    ([100, 220, 470, 1000], [2, 1, 3, 1], 1234, 5),         # mixed counts
    ([10, 47, 150], [None, None, None], 88, 4),              # unlimited
    ([1.9], [None], 1.9, 5),                                  # (1.9 + 1.9) ∥ (1.9 + 1.9) rounds above 1.9
    ([10, 47, 150], [1, 2, None], 31, 5),                    # partly limited
    ([1000], [3], 1500, 4),                                  # too few parts for 4
    ([330, 680, 1500, 3300, 6800], [1, 1, 2, 1, 1], 2000, 4),
    ([1, 2, 5], [2, 2, 2], 3.3, 5),
]


@pytest.mark.parametrize("values, counts, target, k", SMALL_CASES)
def test_search_equals_brute_force_on_small_bins(values, counts, target, k):
    # reference: the brute-force enumerator above (exact rationals, every tree)
    search = ExactSearch([float(v) for v in values], counts, k)
    target_q = Fraction(str(target))
    for n in range(1, k + 1):
        found = search.best(n, float(target))
        expected = brute_force_best(values, counts, n, target_q)
        if expected is None:
            assert found == []
            continue
        got = found[0]
        assert part_count(got.network) == n
        assert abs(float(abs(exact_resistance(got.network) / target_q - 1)) - float(expected)) <= 1e-12
        _assert_within_stock(got.network, values, counts)


@settings(max_examples=25, deadline=None)
@given(
    values=st.lists(st.integers(1, 50).map(lambda x: x * 10), min_size=1, max_size=4, unique=True),
    count_choices=st.lists(st.sampled_from([1, 2, None]), min_size=4, max_size=4),
    target=st.integers(5, 3000),
)
def test_search_equals_brute_force_on_random_bins(values, count_choices, target):
    # reference: the brute-force enumerator above
    counts = count_choices[: len(values)]
    k = 4
    search = ExactSearch([float(v) for v in values], counts, k)
    for n in range(1, k + 1):
        found = search.best(n, float(target))
        expected = brute_force_best(values, counts, n, Fraction(target))
        if expected is None:
            assert found == []
        else:
            assert abs(abs(found[0].error) - float(expected)) <= 1e-12


DEPTH_CASES = [
    # (values, counts, target, k, table depth): every depth of the recursion against the brute force,
    # targets inside, below and above the bin's span, limited and unlimited counts (small invented bins)
    ([100, 220, 470, 1000], [None, None, None, None], 337, 5, 2),
    ([100, 220, 470, 1000], [1, 1, 1, 1], 337, 5, 2),      # every value once: the limited search
    ([10, 47, 150], [1, 2, None], 31, 5, 2),
    ([10, 47, 150], [None, None, None], 2.2, 5, 2),        # below the smallest value: parallel banks
    ([10, 47, 150], [2, 1, 2], 900, 5, 2),                 # above all the bin holds: 2×10 + 47 + 2×150 = 367
    ([10, 47, 150], [None, None, None], 88, 3, 1),         # one-part tables only
    ([1, 2, 5], [2, 2, 2], 3.3, 6, 3),                     # six parts from three-part tables
    ([22, 33], [None, None], 27.5, 6, 3),
    ([100, 330], [3, 3], 1000, 6, 3),
]


@pytest.mark.parametrize("values, counts, target, k, depth", DEPTH_CASES)
def test_every_table_depth_equals_brute_force(values, counts, target, k, depth):
    # reference: the brute-force enumerator above; the table depth is forced, so the recursion,
    # the canonical splits and the pruning are exercised at every level, not only the tables
    search = ExactSearch([float(v) for v in values], counts, k, table_parts=depth)
    target_q = Fraction(str(target))
    for n in range(1, k + 1):
        found = search.best(n, float(target), alternatives=3)
        expected = brute_force_best(values, counts, n, target_q)
        if expected is None:
            assert found == []
            continue
        got = found[0]
        assert part_count(got.network) == n
        assert abs(float(abs(exact_resistance(got.network) / target_q - 1)) - float(expected)) <= 1e-12
        _assert_alternatives_sound(found, values, counts, n)


def _assert_alternatives_sound(found, values, counts, n):
    errors = [abs(f.error) for f in found]
    assert errors == sorted(errors), "alternatives ranked by |error|"
    assert len({round(f.value_ohms, 9) for f in found}) == len(found), "alternatives of distinct values"
    for f in found:
        assert part_count(f.network) == n
        assert abs(float(exact_resistance(f.network)) - f.value_ohms) <= 1e-9 * f.value_ohms
        _assert_within_stock(f.network, values, counts)


def _assert_within_stock(net, values, counts):
    used = Counter(part_values(net))
    for v, c in zip(values, counts):
        assert c is None or used[float(v)] <= c, "the network takes more parts than the bin holds"


@settings(max_examples=25, deadline=None)
@given(
    values=st.lists(st.integers(1, 60).map(lambda x: x * 10), min_size=1, max_size=4, unique=True),
    count_choices=st.lists(st.sampled_from([1, 2, 3, None]), min_size=4, max_size=4),
    target=st.one_of(st.integers(1, 3000), st.fractions(Fraction(1, 10), Fraction(5000))),
    k=st.sampled_from([4, 5]),
    deeper=st.booleans(),
)
def test_forced_depths_equal_brute_force_on_random_bins(values, count_choices, target, k, deeper):
    # reference: the brute-force enumerator above; targets anywhere, in or out of the bin's span
    counts = count_choices[: len(values)]
    search = ExactSearch([float(v) for v in values], counts, k, table_parts=k // 2 + int(deeper))
    target_q = Fraction(target)
    for n in range(1, k + 1):
        found = search.best(n, float(target_q), alternatives=2)
        expected = brute_force_best(values, counts, n, target_q)
        if expected is None:
            assert found == []
        else:
            assert abs(float(abs(exact_resistance(found[0].network) / target_q - 1)) - float(expected)) <= 1e-12
            _assert_alternatives_sound(found, values, counts, n)


def test_lines_of_one_value_are_pooled_then_tied_to_lines():
    # two limited lines of 100 Ω (1 % and 0.1 %) hold two parts together: the search may take both;
    # reference: the brute force with the pooled count
    stock = StockBin((StockItem(100.0, count=1), StockItem(100.0, count=1, tolerance=0.001),
                      StockItem(220.0, count=1)), name="pooled")
    rows = search_frontier(420.0, stock, max_parts=3, alternatives=0).rows
    for row in rows:
        expected = brute_force_best([100, 220], [2, 1], row.parts, Fraction(420))
        assert row.proven and abs(abs(row.best.error) - float(expected)) <= 1e-12
    # 100 + 100 + 220 = 420 exactly (hand arithmetic), one part from each 100 Ω line
    lines = {p.line.tolerance for p in _parts(rows[2].best.network) if p.ohms == 100.0}
    assert rows[2].best.error == 0 and lines == {0.01, 0.001}


def _parts(net):
    from netsynth.network import Part

    return [net] if isinstance(net, Part) else [p for c in net.children for p in _parts(c)]


def test_cost_model_refuses_before_building_and_its_advice_is_accepted(monkeypatch):
    import re

    from netsynth.search import exact
    from netsynth.stock import kit_bin

    values = list(kit_bin("E96", 1.0, 10e6).values)  # 673 values: IEC 60063 E96 over seven decades
    built = []
    real = exact._Engine.__init__
    monkeypatch.setattr(exact._Engine, "__init__", lambda self, *a: built.append(a) or real(self, *a))
    with pytest.raises(InfeasibleError) as refused:
        ExactSearch(values, [None] * len(values), 7)
    assert built == [], "the cost model speaks before any table is built"
    fits = int(re.search(r"--max-parts (\d+)", str(refused.value)).group(1))
    assert 1 <= fits < 7
    ExactSearch(values, [None] * len(values), fits)  # the advice, when followed, is accepted


def test_alternatives_are_distinct_and_ranked():
    search = ExactSearch([float(v) for v in (100, 150, 220, 330, 470, 680, 1000)], [None] * 7, 3)
    found = search.best(3, 555.0, alternatives=5)
    errors = [abs(f.error) for f in found]
    assert errors == sorted(errors)
    assert len({round(f.value_ohms, 9) for f in found}) == len(found)
    for f in found:
        assert abs(resistance(f.network) - f.value_ohms) <= 1e-9 * f.value_ohms


def test_frontier_stops_at_required_accuracy():
    stock = bin_from_values([100.0, 220.0, 470.0, 1000.0])
    rows = search_frontier(320.0, stock, max_parts=5, within=1e-9).rows
    # 100 + 220 = 320 exactly (hand arithmetic): two parts suffice, the search stops there
    assert [r.parts for r in rows] == [1, 2]
    assert rows[-1].best.error == 0


def test_frontier_says_when_accuracy_is_out_of_reach():
    # one 1 kΩ part cannot land within 0.1 % of 1234 Ω: the closest answer, and the news that it misses
    stock = StockBin((StockItem(1000.0, count=1),), name="one part")
    found = search_frontier(1234.0, stock, max_parts=3, within=0.001)
    assert found.within_met is False
    assert [r.parts for r in found.rows] == [1] and found.rows[0].best.value_ohms == 1000.0


def _row(parts, error, headroom):
    from netsynth.network import Part
    from netsynth.search.exact import Found
    from netsynth.search.frontier import FrontierRow

    from types import SimpleNamespace

    stress = SimpleNamespace(headroom=headroom)  # pick() reads only the network's headroom
    return FrontierRow(parts, Found(Part(1.0), 1.0, error, parts), (), proven=False, method="x", stress=stress)


PICK_CASES = [
    # (prefer, within, expected parts) over rows (parts, error, headroom) below — the ranking rules of pick()
    ("error", None, 9),  # smallest error wins
    ("error", 0.001, 5),  # with --within: the fewest parts inside it
    ("parts", None, 3),  # fewest parts within the default ±1 %
    ("headroom", None, 5),  # most headroom within ±1 %
    ("headroom", 1e-6, 9),  # nothing else within ±1 ppm: the smallest error
]


@pytest.mark.parametrize("prefer, within, parts", PICK_CASES)
def test_pick_ranks_by_preference(prefer, within, parts):
    from netsynth.search.frontier import pick

    rows = (_row(1, 0.05, 1.0), _row(3, 0.004, 1.5), _row(5, 0.0005, 3.0), _row(9, 1e-7, 2.0))
    assert pick(rows, prefer, within).parts == parts


def test_a_witness_is_ranked_by_the_value_its_tree_computes():
    # a candidate reported at 100 Ω whose witness computes to 100 + 10 = 110 Ω (hand arithmetic)
    # is ranked at 110 Ω, behind a right one at 104 Ω
    from netsynth.network import Part, series
    from netsynth.search.exact import _ranked

    cands = [(100.0, lambda: series(Part(100.0), Part(10.0))), (104.0, lambda: series(Part(100.0), Part(4.0)))]
    found = _ranked(cands, 100.0, 2, alternatives=1)
    assert [(f.value_ohms, round(f.error, 12)) for f in found] == [(104.0, 0.04), (110.0, 0.1)]


def test_a_witness_missing_on_its_side_is_taken_from_the_other(monkeypatch):
    # a network on the target to the last bit may be seen from below by the search and from above
    # by its witness (netsynth.search.exact._NoWitness): the witness then comes from the other side
    from netsynth.search import exact

    search = ExactSearch([100.0, 220.0, 470.0], [None] * 3, 4, table_parts=2)
    real = exact._Engine.witness_any

    def below_missing(self, n, r, side):
        if side < 0:
            raise exact._NoWitness
        return real(self, n, r, side)

    monkeypatch.setattr(exact._Engine, "witness_any", below_missing)
    net = search.witness(4, np.array([555.0]), None, -1)
    assert part_count(net) == 4 and resistance(net) >= 555.0  # the ceil's network
