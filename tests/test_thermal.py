"""Tests of netsynth.analysis.thermal: network TCR and value at temperature.

Expected values are closed forms written out here: power-share sensitivities of
series (R_i/ΣR) and parallel (G_i/G) groups (reference-values §6), homogeneity
of R (equal TCR everywhere gives that TCR), and the first-order drift formula
ΔR/R = α·ΔT applied by hand.
"""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from netsynth.analysis.thermal import REFERENCE_C, temperature_coefficient, value_at
from netsynth.errors import ValueParseError
from netsynth.network import from_text, part_count, parts_in_order, resistance
from tests.strategies import networks


@settings(max_examples=60, deadline=None)
@given(networks(max_leaves=12), st.floats(0.0, 5000.0))
def test_equal_tcr_everywhere_is_the_network_tcr(net, alpha):
    # R is homogeneous of degree 1: scaling every part by (1 + αΔT) scales R by the
    # same factor, for any topology (reference-values §6, homogeneity).
    tc = temperature_coefficient(net, [alpha] * part_count(net))
    assert tc == pytest.approx(alpha, rel=1e-9, abs=1e-9)


def tcr_by_value(net, alpha_of):
    return [alpha_of[p.ohms] for p in parts_in_order(net)]


@pytest.mark.parametrize(
    "text, alpha_of, expected",
    [
        # series of equal values: S = 1/2 each (R_i/ΣR), so (0 + 100)/2 = 50 ppm/K
        ("1k + 1k", None, 50.0),
        # parallel of equal values: S = G_i/G = 1/2 each, also 50 ppm/K
        ("1k || 1k", None, 50.0),
        # series 1k (0 ppm) + 3k (100 ppm): S = 3/4 for the 3k part → 75 ppm/K
        ("1k + 3k", {1000.0: 0.0, 3000.0: 100.0}, 75.0),
        # parallel 1k (100 ppm) || 3k (0 ppm): S = G_i/G = (1/1k)/(4/3k) = 3/4 → 75 ppm/K
        ("1k || 3k", {1000.0: 100.0, 3000.0: 0.0}, 75.0),
        # series 1k (50 ppm) + 3k (200 ppm): 1/4·50 + 3/4·200 = 162.5 ppm/K
        ("1k + 3k", {1000.0: 50.0, 3000.0: 200.0}, 162.5),
        # signs are unknown (bins store magnitudes): −100 counts as 100; 1/4·100 + 3/4·100
        ("1k + 3k", {1000.0: -100.0, 3000.0: 100.0}, 100.0),
    ],
)
def test_network_tcr_closed_forms(text, alpha_of, expected):
    net = from_text(text)
    tcr = [0.0, 100.0] if alpha_of is None else tcr_by_value(net, alpha_of)
    assert temperature_coefficient(net, tcr) == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize(
    "text, tcr, temp_c, low, high",
    [
        # 100 ppm/K × 100 K = 1 %: 1k → 990..1010 Ω
        ("1k", [100.0], 125.0, 990.0, 1010.0),
        # below the reference temperature the spread is the same: |−40 − 25| = 65 K, 100 ppm/K → ±0.65 %
        ("1k", [100.0], -40.0, 993.5, 1006.5),
        # at 25 °C nominal values hold
        ("1k + 1k", [50.0, 200.0], REFERENCE_C, 2000.0, 2000.0),
        # series 0 ppm + 100 ppm equal values → 50 ppm/K; × 60 K = 0.3 % of 2k = 6 Ω
        ("1k + 1k", [0.0, 100.0], 85.0, 1994.0, 2006.0),
    ],
)
def test_value_at_first_order(text, tcr, temp_c, low, high):
    got = value_at(from_text(text), tcr, temp_c)
    assert got[0] == pytest.approx(low, rel=1e-12)
    assert got[1] == pytest.approx(high, rel=1e-12)


def test_reference_temperature_is_25_c():
    # common practice: datasheets specify TCR from 25 °C
    assert REFERENCE_C == 25.0


@settings(max_examples=40, deadline=None)
@given(networks(max_leaves=8), st.floats(-55.0, 155.0))
def test_value_at_brackets_nominal(net, temp_c):
    # The range is centred on the nominal value (first order, symmetric in the unknown signs).
    tcr = [100.0] * part_count(net)
    low, high = value_at(net, tcr, temp_c)
    nominal = resistance(net)
    assert low <= nominal * (1 + 1e-12) and high >= nominal * (1 - 1e-12)
    assert (low + high) / 2 == pytest.approx(nominal, rel=1e-12)
    # equal TCR: half-width is exactly α·|ΔT| (homogeneity)
    assert (high - low) / 2 == pytest.approx(nominal * 100e-6 * abs(temp_c - 25.0), rel=1e-9, abs=1e-12 * nominal)


@pytest.mark.parametrize(
    "call",
    [
        lambda: temperature_coefficient(from_text("1k + 1k"), [100.0]),  # one TCR short
        lambda: temperature_coefficient(from_text("1k"), [math.nan]),  # not a number
        lambda: value_at(from_text("1k"), [100.0], math.inf),  # temperature not finite
        lambda: value_at(from_text("1k"), [100.0], -300.0),  # below absolute zero
    ],
)
def test_bad_input_raises_value_parse_error(call):
    with pytest.raises(ValueParseError):
        call()
