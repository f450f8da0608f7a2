"""Tests of netsynth.analysis.tolerance: sensitivities, worst case, RSS, Monte Carlo.

Expected values come from closed forms written out here (reference-values §6),
from brute force over every tolerance corner evaluated with
``netsynth.network.resistance`` (a second route: the series/parallel fold,
while ``sensitivities`` reads power shares from the nodal solve), from the
uniform distribution's analytic law, and from published theorems (Euler,
Rayleigh). None is taken from running the code under test.
"""

from __future__ import annotations

import itertools
import math
from fractions import Fraction

import numpy as np
import pytest
from hypothesis import assume, given, settings
from hypothesis import strategies as st

from netsynth.analysis.tolerance import (
    MonteCarlo,
    ToleranceBand,
    monte_carlo,
    sample_values,
    sensitivities,
    tolerance_band,
)
from netsynth.errors import ValueParseError
from netsynth.network import Network, Part, fold, from_text, parallel, part_count, parts_in_order, resistance, series
from tests.strategies import networks


def with_values(net: Network, values: list[float]) -> Network:
    """The same tree with the i-th part (parts_in_order order) replaced by ``values[i]`` ohms."""
    it = iter(values)
    return fold(net, lambda _p: Part(next(it)), lambda ks: series(*ks), lambda ks: parallel(*ks))


def ohms_of(net: Network) -> list[float]:
    return [p.ohms for p in parts_in_order(net)]


# ---------------------------------------------------------------- sensitivities: closed forms


def series_shares(values: list[float]) -> list[Fraction]:
    # reference-values §6: series c_i = 1, so S_i = R_i / ΣR
    exact = [Fraction(v) for v in values]
    return [v / sum(exact) for v in exact]


def parallel_shares(values: list[float]) -> list[Fraction]:
    # reference-values §6: parallel ∂lnR/∂lnR_i = R/R_i = G_i/G
    g = [1 / Fraction(v) for v in values]
    return [gi / sum(g) for gi in g]


def divider_shares(values: list[float]) -> list[Fraction]:
    """Ra + (Rb || Rc): closed form by the chain rule (hand derivation, [calc]).

    R = Ra + Rp with Rp = RbRc/(Rb+Rc); S_a = Ra/R; S_b = (Rp/R)·(Rp/Rb); S_c = (Rp/R)·(Rp/Rc).
    Values are given as (Ra, Rb, Rc) and the result keyed by value for lookup.
    """
    ra, rb, rc = (Fraction(v) for v in values)
    rp = rb * rc / (rb + rc)
    r = ra + rp
    return [ra / r, (rp / r) * (rp / rb), (rp / r) * (rp / rc)]


@pytest.mark.parametrize(
    "text, closed_form",
    [
        ("100 + 200 + 700", series_shares),  # shares 0.1, 0.2, 0.7
        ("1k + 3k", series_shares),  # 1/4, 3/4
        ("1 + 10M", series_shares),  # 7 decades apart: tiny share must stay accurate
        ("100 || 300", parallel_shares),  # G shares 3/4, 1/4
        ("1k || 2k || 4k || 8k", parallel_shares),  # 8/15, 4/15, 2/15, 1/15
        ("1m || 1M", parallel_shares),  # 9 decades apart
    ],
)
def test_sensitivities_series_and_parallel_closed_forms(text, closed_form):
    net = from_text(text)
    expected = closed_form(ohms_of(net))
    got = sensitivities(net)
    assert len(got) == len(expected)
    for s, e in zip(got, expected):
        assert s == pytest.approx(float(e), rel=1e-12, abs=1e-15)


@pytest.mark.parametrize(
    "ra, rb, rc",
    [
        (1000.0, 2000.0, 2000.0),  # R = 2k: S = 1/2, 1/4, 1/4
        (470.0, 1000.0, 3300.0),  # unequal arms
        (10.0, 1e6, 22.0),  # a large part barely loading a small one
    ],
)
def test_sensitivities_divider_like(ra, rb, rc):
    net = series(ra, parallel(rb, rc))
    expected = dict(zip((ra, rb, rc), divider_shares([ra, rb, rc])))
    for part, s in zip(parts_in_order(net), sensitivities(net)):
        assert s == pytest.approx(float(expected[part.ohms]), rel=1e-12)


@settings(max_examples=60, deadline=None)
@given(networks(max_leaves=12))
def test_sensitivities_sum_to_one(net):
    # Euler's homogeneous function theorem: R is homogeneous of degree 1 in the
    # part values, so Σ R_i ∂R/∂R_i = R, i.e. Σ S_i = 1. Our S_i come from nodal
    # power shares divided by V²/R, so this also checks Tellegen/power conservation.
    shares = sensitivities(net)
    assert len(shares) == part_count(net)
    assert all(s >= 0 for s in shares)
    assert math.fsum(shares) == pytest.approx(1.0, abs=1e-9)


@settings(max_examples=60, deadline=None)
@given(networks(max_leaves=10))
def test_sensitivities_match_finite_differences_of_the_fold(net):
    # Second route: central differences of network.resistance (series/parallel fold)
    # with a relative step h: S_i ≈ (R(R_i(1+h)) − R(R_i(1−h))) / (2h·R).
    # Truncation error O(h²) ≈ 1e-10; rounding ≈ n·eps/h ≈ 1e-9; so check to 1e-6.
    h = 1e-5
    values = ohms_of(net)
    nominal = resistance(net)
    for i, s in enumerate(sensitivities(net)):
        up = values.copy()
        down = values.copy()
        up[i] *= 1 + h
        down[i] *= 1 - h
        fd = (resistance(with_values(net, up)) - resistance(with_values(net, down))) / (2 * h * nominal)
        assert s == pytest.approx(fd, abs=1e-6)


# ---------------------------------------------------------------- worst case


@st.composite
def nets_with_tolerances(draw, max_leaves: int = 8, max_tol: float = 0.2):
    net = draw(networks(max_leaves=max_leaves))
    assume(part_count(net) <= max_leaves)
    tols = draw(st.lists(st.floats(0.0, max_tol), min_size=part_count(net), max_size=part_count(net)))
    return net, tols


@settings(max_examples=60, deadline=None)
@given(nets_with_tolerances(max_leaves=8))
def test_worst_case_equals_brute_force_over_all_corners(case):
    # Rayleigh's monotonicity law (Doyle & Snell, Random Walks and Electric
    # Networks, MAA 1984): the min and max over all 2^n corners are the all-low
    # and all-high corners. Corners evaluated by network.resistance.
    net, tols = case
    values = ohms_of(net)
    corners = [
        resistance(with_values(net, [v * (1 + s * t) for v, s, t in zip(values, signs, tols)]))
        for signs in itertools.product((-1, 1), repeat=len(values))
    ]
    band = tolerance_band(net, tols)
    assert band.low_ohms == pytest.approx(min(corners), rel=1e-12)
    assert band.high_ohms == pytest.approx(max(corners), rel=1e-12)
    assert band.nominal_ohms == pytest.approx(resistance(net), rel=1e-12)


@settings(max_examples=60, deadline=None)
@given(networks(max_leaves=12), st.floats(0.0, 0.5))
def test_equal_tolerance_gives_exactly_that_tolerance(net, t):
    # reference-values §6: R is homogeneous of degree 1 and monotone, so equal t on
    # every part gives exactly R·[1 − t, 1 + t] for any topology.
    band = tolerance_band(net, [t] * part_count(net))
    nominal = resistance(net)
    assert band.low_ohms == pytest.approx(nominal * (1 - t), rel=1e-12)
    assert band.high_ohms == pytest.approx(nominal * (1 + t), rel=1e-12)
    low_rel, high_rel = band.worst_rel
    assert low_rel == pytest.approx(-t, abs=1e-12)
    assert high_rel == pytest.approx(t, abs=1e-12)


@pytest.mark.parametrize(
    "text, tols, low, high",
    [
        # reference-values §6 series worst case: ΔR = Σ t_i R_i: 1k·1 % + 3k·5 % = 160 Ω
        ("1k + 3k", [0.01, 0.05], 4000 - 160, 4000 + 160),
        # parallel by hand: 990 || 990 = 495, 1010 || 1010 = 505 (1 % each)
        ("1k || 1k", [0.01, 0.01], 495.0, 505.0),
        # exact non-linear worst case, by hand: 1k at ±10 % with 1k at 0 %:
        # 900 || 1000 = 900000/1900, 1100 || 1000 = 1100000/2100
        ("1k || 1k", [0.10, 0.0], 900000 / 1900, 1100000 / 2100),
    ],
)
def test_worst_case_by_hand(text, tols, low, high):
    net = from_text(text)
    band = tolerance_band(net, tols)
    assert band.low_ohms == pytest.approx(low, rel=1e-12)
    assert band.high_ohms == pytest.approx(high, rel=1e-12)


# ---------------------------------------------------------------- RSS


@pytest.mark.parametrize(
    "text, tols, rss",
    [
        ("1k + 1k", [0.01] * 2, 0.01 / math.sqrt(2)),  # reference-values §6 [calc]: 0.707 %
        ("1k || 1k", [0.01] * 2, 0.01 / math.sqrt(2)),  # reference-values §6 [calc]: 0.707 %
        ("1k + " * 9 + "1k", [0.10] * 10, 0.10 / math.sqrt(10)),  # reference-values §6 [calc]: 3.16 %
        # reference-values §6 series RSS: √(Σ (t_i R_i)²) / ΣR_i = √(10² + 150²) / 4000
        ("1k + 3k", [0.01, 0.05], math.sqrt(10.0**2 + 150.0**2) / 4000),
        # reference-values §6 parallel RSS: √(Σ (R/R_i)² t_i²), R = 750, R/R_i = 3/4 and 1/4
        ("1k || 3k", [0.01, 0.05], math.sqrt((0.75 * 0.01) ** 2 + (0.25 * 0.05) ** 2)),
    ],
)
def test_rss_against_closed_forms(text, tols, rss):
    band = tolerance_band(from_text(text), tols)
    assert band.rss_rel == pytest.approx(rss, rel=1e-9)
    # GUM 4.3.7 (clause number from memory): rectangular ±a has u = a/√3
    assert band.sigma_rel == pytest.approx(rss / math.sqrt(3), rel=1e-9)


def test_rss_matches_the_forum_example_for_three_equal_parts_in_series():
    # reference-values §6 [2nd]: EEVblog forum "Tolerance stackup" (2021): 1 % + 1 % + 1.5 %
    # give worst case 3.5 % and RSS 2.06 %. Those add percentages directly, which is our
    # formula's meaning only when every term has the same weight: three EQUAL parts in
    # series, deviations counted in units of ONE part's value (network = 3 parts).
    # The forum prints 3 significant digits, hence the ±0.005 % (of one part) check.
    one = 1000.0
    band = tolerance_band(from_text("1k + 1k + 1k"), [0.01, 0.01, 0.015])
    assert (band.high_ohms - band.nominal_ohms) / one == pytest.approx(0.035, abs=1e-12)
    assert (band.nominal_ohms - band.low_ohms) / one == pytest.approx(0.035, abs=1e-12)
    assert band.rss_rel * band.nominal_ohms / one == pytest.approx(0.0206, abs=0.00005)


# ---------------------------------------------------------------- Monte Carlo


MC_CASES = [
    ("1k + 1k", [0.01, 0.01]),  # series, equal
    ("1k || 2k2", [0.05, 0.01]),  # parallel, unequal
    ("1k + (2k2 || 4k7)", [0.02, 0.05, 0.01]),  # divider-like
    ("(10 + 22) || (47 + 100) || 1k", [0.05, 0.05, 0.02, 0.01, 0.05]),  # deeper tree
    ("4k7", [0.05]),  # one part: uniform, σ = t/√3 exactly
]


@pytest.mark.parametrize("text, tols", MC_CASES)
def test_monte_carlo_sigma_agrees_with_first_order_propagation(text, tols):
    # GUM §5.1.2 Eq. (10) with rectangular inputs (4.3.7): first order is accurate
    # to O(t²) ≈ 0.25 % for t ≤ 5 %; the sample σ of 20 000 uniform-ish draws has a
    # relative spread of about √(0.8/(4·20000)) ≈ 0.3 %. 5 % is many spreads wide.
    net = from_text(text)
    band = tolerance_band(net, tols)
    run = monte_carlo(net, tols, target_ohms=band.nominal_ohms, samples=20_000, seed=7)
    assert run.sigma_rel == pytest.approx(band.sigma_rel, rel=0.05)


@pytest.mark.parametrize("text, tols", MC_CASES)
def test_monte_carlo_samples_stay_inside_the_worst_case(text, tols):
    # Rayleigh's monotonicity law: no build can leave [low, high].
    net = from_text(text)
    band = tolerance_band(net, tols)
    values = sample_values(net, tols, samples=20_000, seed=3)
    assert values.shape == (20_000,)
    assert np.all(values >= band.low_ohms * (1 - 1e-12))
    assert np.all(values <= band.high_ohms * (1 + 1e-12))
    run = monte_carlo(net, tols, target_ohms=band.nominal_ohms, samples=20_000, seed=3)
    low_rel, high_rel = band.worst_rel
    assert low_rel - 1e-12 <= run.low_rel < run.high_rel <= high_rel + 1e-12


def test_monte_carlo_series_mean_is_unbiased():
    # Linearity of expectation: a series sum of centred parts has mean = nominal.
    # Standard error of the mean is σ/√N; allow 4 of them.
    net = from_text("1k + 2k2 + 4k7")
    tols = [0.05, 0.05, 0.05]
    run = monte_carlo(net, tols, target_ohms=7900.0, samples=20_000, seed=11)
    assert abs(run.mean_rel) <= 4 * run.sigma_rel / math.sqrt(20_000)


def test_monte_carlo_is_deterministic_for_a_random_seed():
    net = from_text("1k + (2k2 || 4k7)")
    tols = [0.02, 0.05, 0.01]
    first = monte_carlo(net, tols, target_ohms=2500.0, spec=0.01, samples=5_000, seed=42)
    again = monte_carlo(net, tols, target_ohms=2500.0, spec=0.01, samples=5_000, seed=42)
    other = monte_carlo(net, tols, target_ohms=2500.0, spec=0.01, samples=5_000, seed=43)
    assert first == again
    assert isinstance(first, MonteCarlo)
    assert (first.samples, first.seed, first.spec, first.target_ohms) == (5_000, 42, 0.01, 2500.0)
    assert other.sigma_rel != first.sigma_rel  # a different random seed draws different builds


@pytest.mark.parametrize(
    "target, spec, expected",
    [
        # uniform on [990, 1010]; pass band [995, 1005] covers 10/20 of it
        (1000.0, 0.005, 0.5),
        # pass band [1004.95, 1015.05] ∩ [990, 1010] = 5.05 of 20 → 0.2525 (judged against the TARGET)
        (1010.0, 0.005, 0.2525),
        # pass band [979.11, 1000.89] ∩ [990, 1010] = 10.89 of 20 → 0.5445
        (990.0, 0.011, (990.0 * 1.011 - 990.0) / 20.0),
        # spec wider than the band: every build passes
        (1000.0, 0.02, 1.0),
    ],
)
def test_monte_carlo_yield_of_one_uniform_part(target, spec, expected):
    # Uniform distribution: the yield is the covered fraction of [990, 1010].
    # Binomial spread √(p(1−p)/N) ≤ 0.0036 at N = 20 000, so ±0.02 is > 5 spreads.
    run = monte_carlo(from_text("1k"), [0.01], target_ohms=target, spec=spec, samples=20_000, seed=1)
    assert run.yield_fraction == pytest.approx(expected, abs=0.02)


def test_monte_carlo_without_spec_has_no_yield():
    run = monte_carlo(from_text("1k + 1k"), [0.01, 0.01], target_ohms=2000.0, samples=100)
    assert run.yield_fraction is None and run.spec is None


# ---------------------------------------------------------------- bad input


@pytest.mark.parametrize(
    "call",
    [
        lambda: tolerance_band(from_text("1k + 1k"), [0.01]),  # one tolerance short
        lambda: tolerance_band(from_text("1k"), [0.01, 0.01]),  # one too many
        lambda: tolerance_band(from_text("1k"), [-0.01]),  # negative
        lambda: tolerance_band(from_text("1k"), [1.0]),  # ±100 % would reach 0 Ω
        lambda: tolerance_band(from_text("1k"), [float("nan")]),  # not a number
        lambda: monte_carlo(from_text("1k"), [0.01], target_ohms=0.0),  # target must be > 0
        lambda: monte_carlo(from_text("1k"), [0.01], target_ohms=1e3, spec=0.0),  # spec must be > 0
        lambda: monte_carlo(from_text("1k"), [0.01], target_ohms=1e3, samples=1),  # σ needs 2 builds
        lambda: monte_carlo(from_text("1k"), [0.01], target_ohms=1e3, seed=-1),  # numpy needs ≥ 0
    ],
)
def test_bad_input_raises_value_parse_error(call):
    with pytest.raises(ValueParseError):
        call()


def test_tolerance_band_is_frozen():
    band = tolerance_band(from_text("1k"), [0.01])
    assert isinstance(band, ToleranceBand)
    with pytest.raises(AttributeError):
        band.low_ohms = 0.0  # type: ignore[misc]
