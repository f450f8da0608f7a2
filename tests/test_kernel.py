"""The compiled recursion against the numpy engine it replaces, on bins too large for a brute force.

The brute force in exact rationals (tests/test_search.py) checks both engines on small bins;
here the two engines check each other where the compiled loop's own shortcuts (look-ups in
blocks, galloping, pairs taken x-first, a window that narrows) actually fire: bins of tens of
values, every table depth, targets inside and outside the bin's span, and windows.
"""

from __future__ import annotations

import math
import os

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from netsynth.eseries import series_values
from netsynth.search import kernel
from netsynth.search.exact import NEG, POS, ExactSearch, _Rows
from netsynth.search.tables import OP_PARALLEL, OP_SERIES

pytestmark = pytest.mark.skipif(not kernel.built(), reason="the compiled recursion was not built")

#: the two engines compute a ⊕ x with the same expressions; taking a pair x-first may round the
#: last bit of the partner target the other way, so a reported value may differ by an ulp or two
ULPS = 8 * np.finfo(float).eps


def engines(call):
    """Run ``call`` under the compiled engine, then under numpy; return both results."""
    before = os.environ.get("NETSYNTH_KERNEL")
    try:
        os.environ["NETSYNTH_KERNEL"] = "on"
        compiled = call()
        os.environ["NETSYNTH_KERNEL"] = "off"
        plain = call()
    finally:
        if before is None:
            os.environ.pop("NETSYNTH_KERNEL", None)
        else:
            os.environ["NETSYNTH_KERNEL"] = before
    return compiled, plain


def test_ci_builds_the_compiled_recursion():
    # CI installs with a C compiler; a silent fallback to numpy there would hide a broken build
    if os.environ.get("CI"):
        assert kernel.built()


def test_off_switch_turns_it_off(monkeypatch):
    monkeypatch.setenv("NETSYNTH_KERNEL", "off")
    assert not kernel.enabled()
    monkeypatch.setenv("NETSYNTH_KERNEL", "on")
    assert kernel.enabled()


def _same(a: np.ndarray, b: np.ndarray) -> bool:
    finite = np.isfinite(a) & np.isfinite(b)
    with np.errstate(invalid="ignore"):  # inf - inf where both are missing
        close = np.abs(np.where(finite, a - b, 0.0)) <= ULPS * np.abs(np.where(finite, b, 0.0))
    return bool(np.all((a == b) | (finite & close)))


def _hits(t: float, *found: float) -> bool:
    """Whether one of the values lands on t (to a few ulps)."""
    return any(abs(v - t) <= ULPS * t for v in found)


def _agree(lo_a, hi_a, lo_b, hi_b, t) -> bool:
    """Floor and ceil agree row by row, but for one rounding case: a network landing on the target
    to the last bit may be seen from below by one engine and from above by the other (a ⊕ x = t
    found as the floor of x ≤ t′ or as the ceil of x ≥ t′, with t′ rounded either way); then
    both must have it, on one side or the other."""
    for la, ha, lb, hb, tt in zip(lo_a, hi_a, lo_b, hi_b, t):
        if _same(np.array([la, ha]), np.array([lb, hb])):
            continue
        if not (_hits(tt, la, ha) and _hits(tt, lb, hb)):
            return False
    return True


BINS = {
    # IEC 60063:2015 E-series over a few decades, and a bin of round numbers with coincidences
    "E12 10..10k": list(series_values("E12", 10, 1e4)),
    "E24 1..1k": list(series_values("E24", 1, 1e3)),
    "E6 1..1M": list(series_values("E6", 1, 1e6)),
    "round": [1.0, 2.0, 3.0, 5.0, 10.0, 20.0, 50.0, 100.0],
}


FULL_CASES = [(name, k, depth) for name in sorted(BINS) for k, depth in [(4, 2), (5, 2), (5, 3), (6, 3)]
              if not (k == 6 and len(BINS[name]) > 40)]  # 6 parts of 73 values: a minute in numpy


@pytest.mark.parametrize("name, k, depth", FULL_CASES)
def test_full_floor_and_ceil_agree(name, k, depth):
    values = BINS[name]
    search = ExactSearch(values, [None] * len(values), k, table_parts=depth)
    rng = np.random.default_rng(k * 10 + depth)
    count = 60 if k < 6 else 15
    t = np.exp(rng.uniform(math.log(min(values) / (k + 1)), math.log(max(values) * (k + 1)), count))
    t = np.concatenate([t, values[:3], [min(values) / k, max(values) * k]])  # exact hits and the span's ends
    (clo, chi), (plo, phi) = engines(lambda: search.bounds(k, t))
    assert _agree(clo, chi, plo, phi, t)


@settings(max_examples=max(40, settings().max_examples // 4), deadline=None)  # 500 under the fuzz profile
@given(
    values=st.lists(st.floats(1.0, 1e6).map(lambda v: float(f"{v:.3g}")), min_size=2, max_size=30, unique=True),
    k=st.integers(3, 5),
    deeper=st.booleans(),
    target=st.floats(0.05, 5e6),
    op=st.sampled_from([OP_SERIES, OP_PARALLEL]),
    m=st.integers(1, 2),
    width=st.sampled_from([0.0, 1e-9, 1e-4, 0.05, math.inf]),
    bound=st.sampled_from(["none", "below", "above"]),
    stock=st.sampled_from([None, 1, 2]),
)
def test_families_agree_inside_any_window(values, k, deeper, target, op, m, width, bound, stock):
    # what the recursion returns for one family of x (the module docstring of netsynth.search.exact):
    # wherever the true floor or ceil lies inside the window [L, U], both engines report it;
    # with a stock of 1 or 2 of each value, the limited engine (rows carry the parts taken)
    values = sorted(values)
    search = ExactSearch(values, [stock] * len(values), k, table_parts=k // 2 + int(deeper))
    engine = search.bound if search.limited else search.free
    used = np.empty((1, 0), np.int16) if search.limited else None
    n = k
    m = min(m, n)
    none = NEG if op == OP_SERIES else POS  # a series bound is a lower one, a parallel bound an upper one
    bnd = {"none": none, "below": target * 0.5, "above": target * 2.0}[bound]
    lo_edge = target * (1 - width) if width < 1 else NEG
    hi_edge = target * (1 + width) if math.isfinite(width) else POS
    rows = _Rows(np.array([target]), np.array([bnd]), np.array([lo_edge]), np.array([hi_edge]), used)
    open_rows = _Rows(rows.t, rows.bnd, np.array([NEG]), np.array([POS]), used)
    (clo, chi), (plo, phi) = engines(lambda: engine._family(op, n, m, rows))
    (_, _), (tlo, thi) = engines(lambda: engine._family(op, n, m, open_rows))  # the truth: no window
    for lo, hi in ((clo, chi), (plo, phi)):
        if _hits(target, tlo[0], thi[0]):  # a network on the target: found, from one side or the other
            assert _hits(target, lo[0], hi[0])
            continue
        if tlo[0] >= lo_edge:
            assert _same(lo, tlo)
        else:
            assert not lo[0] > tlo[0] * (1 + ULPS), "a floor no network has"
        if thi[0] <= hi_edge:
            assert _same(hi, thi)
        else:
            assert not hi[0] < thi[0] * (1 - ULPS), "a ceil no network has"


LIMITED_CASES = [(name, counts, k, depth) for name in ("E12 10..10k", "E6 1..1M", "round")
                 for counts in ("one", "one or two") for k, depth in [(4, 2), (5, 2), (5, 3)]]


@pytest.mark.parametrize("name, counts, k, depth", LIMITED_CASES)
def test_limited_bins_agree(name, counts, k, depth):
    # a drawer with one (or one or two) of each value: every row carries the parts it has taken,
    # and both engines must keep within the stock and still find the same floor and ceil
    values = BINS[name]
    stock = [1] * len(values) if counts == "one" else [1 + i % 2 for i in range(len(values))]
    search = ExactSearch(values, stock, k, table_parts=depth)
    assert search.limited
    rng = np.random.default_rng(k * 10 + depth + len(counts))
    t = np.exp(rng.uniform(math.log(min(values) / (k + 1)), math.log(max(values) * (k + 1)), 25))
    t = np.concatenate([t, [2 * values[1], 3 * values[2]]])  # exact only with more parts than the bin holds
    (clo, chi), (plo, phi) = engines(lambda: search.bounds(k, t))
    assert _agree(clo, chi, plo, phi, t)
    for target in t[:4]:
        compiled, plain = engines(lambda: [round(f.value_ohms, 9) for f in search.best(k, float(target), 2)])
        assert compiled[:1] == plain[:1]


def test_a_network_on_the_target_is_found_from_either_side():
    # found by a longer random run: 1.5 R ∥ 3 R = R exactly (hand arithmetic), six parts of R; the
    # numpy engine saw it as the floor, the compiled one (pairs taken x-first) as the ceil
    r = 45873115655.0
    search = ExactSearch([1.0, 2.0, r], [None] * 3, 6, table_parts=3)
    (clo, chi), (plo, phi) = engines(lambda: search.bounds(6, np.array([r])))
    assert _agree(clo, chi, plo, phi, [r]) and _hits(r, clo[0], chi[0])
    assert engines(lambda: search.best(6, r)[0].error) == (0.0, 0.0)


@pytest.mark.parametrize("name", sorted(BINS))
def test_best_networks_agree(name):
    # the whole search: the best network of each size and its runners-up have the same values
    values = BINS[name]
    for target in (math.pi * 1000, 47.123, 0.9 * min(values), 3.3 * max(values)):
        def rows():
            search = ExactSearch(values, [None] * len(values), 5)
            return [[round(f.value_ohms, 9) for f in search.best(n, target, alternatives=2)] for n in range(1, 6)]

        compiled, plain = engines(rows)
        assert [r[0] for r in compiled] == [r[0] for r in plain]


@settings(max_examples=60, deadline=None)
@given(st.lists(st.floats(1e-6, 1e12), min_size=300, max_size=2000, unique=True))
def test_table_index_runs_hold_every_entry_of_their_key(values):
    # the index of a table (kernel.table_spec): entry index[k] is the first whose leading bits are at
    # least kmin + k, so numpy.searchsorted over the keys is the reference
    values = np.sort(np.array(values))
    _, index, kmin, shift, _ = kernel.table_spec(values)
    assert index is not None and index.dtype == np.int32
    keys = values.view(np.int64) >> shift
    assert kmin == keys[0] and len(index) == keys[-1] - kmin + 2
    expected = np.searchsorted(keys, np.arange(kmin, keys[-1] + 2))
    assert np.array_equal(index, expected)
    assert np.all(np.diff(keys) >= 0), "leading bits grow with the value"


def test_a_call_told_to_stop_does_no_work():
    # Ctrl-C: kernel.bounds sets the stop flag the compiled loop reads before each row and each child
    from netsynth.search import _kernel

    values = BINS["E12 10..10k"]
    search = ExactSearch(values, [None] * len(values), 6)
    engine = search.free
    engine._kernel(1, OP_SERIES, 6, 1, search._rows(np.array([3141.5926]), None))  # builds the tables
    t = np.array([3141.5926, 47.0])
    lo, hi = np.empty(2), np.empty(2)
    args = (engine._kernel_tables, engine.vmin, engine.vmax, 1, OP_SERIES, 6, 1, t, np.full(2, NEG),
            np.full(2, NEG), np.full(2, POS), lo, hi, 0, 1)
    assert _kernel.bounds(*args, np.zeros(1, np.int32), None, None) > 0
    assert _kernel.bounds(*args, np.ones(1, np.int32), None, None) == 0


FORKED = r"""
import multiprocessing as mp
from netsynth.search.exact import ExactSearch

VALUES = [10.0, 22.0, 33.0, 47.0, 68.0, 100.0, 150.0, 220.0, 330.0, 470.0, 680.0, 1000.0]

def best(target):
    search = ExactSearch(VALUES, [None] * len(VALUES), 6)
    return search.bounds(6, [target] * 100)[0][0]  # 100 rows: shared between threads

if __name__ == "__main__":
    best(123.4)  # the parent's threads start
    with mp.get_context("fork").Pool(2) as pool:
        print(len(pool.map(best, [56.7, 890.1])))
"""


def test_a_forked_child_searches_with_threads_of_its_own(tmp_path):
    # multiprocessing with fork copies the parent's pool without its threads; a child that used it
    # would wait for ever (the timeout turns that into a failure)
    import subprocess
    import sys

    script = tmp_path / "forked.py"
    script.write_text(FORKED, encoding="utf-8")
    env = {**os.environ, "NETSYNTH_KERNEL": "on", "NETSYNTH_CACHE": "off"}
    out = subprocess.run([sys.executable, str(script)], capture_output=True, text=True, timeout=60, env=env)
    assert out.returncode == 0 and out.stdout.strip() == "2", out.stderr[-500:]
