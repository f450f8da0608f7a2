"""Operating point, derating and per-part stress against textbook examples and datasheet curves."""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from netsynth.analysis.conditions import (
    Derating,
    OperatingPoint,
    limit_volts,
    limit_watts,
    temperature_fraction,
)
from netsynth.analysis.review import SAFETY_NOTE, review
from netsynth.analysis.lines import assign_lines
from netsynth.analysis.stress import network_stress
from netsynth.errors import ArgumentError
from netsynth.network import from_text, parallel, parts_in_order, resistance, series
from netsynth.stock import StockBin, StockItem
from tests.strategies import networks

FULL = Derating(power_factor=1.0, voltage_factor=1.0)


def tie(net, stock, point=None, derating=Derating()):
    """The network with its parts tied to the bin's lines (as the search and ``check`` do)."""
    if stock is None:
        return net
    return assign_lines(net, stock, point, derating, counts_bind=False, missing_ok=True).network


def stress_in(net, point, stock, derating):
    return network_stress(tie(net, stock, point, derating), point, derating)

# ------------------------------------------------------------------ derating line

DERATING_LINE = [
    # (ambient °C, max temp °C, fraction of rated power) — IEC 60115-1 style curve as drawn in
    # Yageo CFR/MFR and Vishay D/CRCW datasheets: 100 % up to 70 °C, linear to 0 at the upper category temperature
    (25.0, 155.0, 1.0),
    (70.0, 155.0, 1.0),  # the rated ambient: full power
    (112.5, 155.0, 0.5),  # halfway down the line: (155 - 112.5) / 85
    (125.0, 155.0, 30 / 85),  # Vishay RCM tutorial slide: 35 % at 125 °C (reference-values §4)
    (155.0, 155.0, 0.0),  # derate-to-zero temperature
    (170.0, 155.0, 0.0),
    (100.0, 125.0, 25 / 55),  # a thin-film part with a 125 °C category (Vishay TNPW 55/125/56)
]


@pytest.mark.parametrize("ambient, max_temp, fraction", DERATING_LINE)
def test_derating_line(ambient, max_temp, fraction):
    assert temperature_fraction(ambient, max_temp) == pytest.approx(fraction, abs=1e-12)


def test_rated_voltage_at_125_c_matches_the_datasheet_example():
    # Vishay RCM tutorial slide (reference-values §4): 1 W at 70 °C, 10 kΩ: U_max 100 V;
    # at 125 °C the rating is 35 % (30/85) and U_max = √(0.353 × 1 W × 10 kΩ) = 59.4 V (59.16 V with 35 %)
    watts = limit_watts(1.0, 155.0, 125.0, FULL)
    assert math.sqrt(watts * 10e3) == pytest.approx(59.41, abs=0.01)
    assert limit_volts(10e3, 1.0, 1000.0, FULL) == pytest.approx(100.0)


def test_voltage_limit_is_the_lower_of_lev_and_sqrt_pr():
    # Stackpole note (reference-values §4): 0402, 0.063 W, 50 V; the limits cross at 50²/0.063 = 39.68 kΩ
    assert limit_volts(10.0, 0.063, 50.0, FULL) == pytest.approx(math.sqrt(0.63))  # power-limited
    assert limit_volts(20e6, 0.063, 50.0, FULL) == 50.0  # LEV-limited
    crit = 50.0**2 / 0.063
    assert limit_volts(crit, 0.063, 50.0, FULL) == pytest.approx(50.0)


@pytest.mark.parametrize(
    "kwargs, fragment",
    [
        ({}, "exactly one"),
        ({"volts": 1.0, "amps": 1.0}, "exactly one"),
        ({"volts": -1.0}, "above zero"),
        ({"watts": math.nan}, "above zero"),
        ({"volts": 1.0, "duty": 0.0}, "duty"),
        ({"volts": 1.0, "duty": 1.5}, "duty"),
    ],
)
def test_bad_operating_points(kwargs, fragment):
    with pytest.raises(ArgumentError, match=fragment):
        OperatingPoint(**kwargs)


# ------------------------------------------------------------------ per-part stress, textbook examples

BIG = StockBin(tuple(StockItem(r, power_rating_w=1000.0, max_volts=1e4) for r in (1, 2, 4, 6, 7, 10, 13, 20)))


def test_series_circuit_openstax_e1():
    # OpenStax University Physics Vol. 2, §10.2, "Equivalent Resistance, Current, and Power in a Series Circuit":
    # 9 V across four 20 Ω and one 10 Ω in series: 0.1 A; 2 V and 0.2 W on each 20 Ω; 1 V and 0.1 W on the 10 Ω
    s = stress_in(series(20.0, 20.0, 20.0, 20.0, 10.0), OperatingPoint(volts=9.0), BIG, FULL)
    assert s.amps == pytest.approx(0.1)
    by_value = {p.ohms: p for p in s.parts}
    assert by_value[20.0].volts == pytest.approx(2.0) and by_value[20.0].watts == pytest.approx(0.2)
    assert by_value[10.0].volts == pytest.approx(1.0) and by_value[10.0].watts == pytest.approx(0.1)
    assert s.watts == pytest.approx(0.9)


def test_parallel_circuit_openstax_e2():
    # OpenStax University Physics Vol. 2, §10.2, "Analysis of a Parallel Circuit": 3.00 V across 1 ∥ 2 ∥ 2 Ω:
    # 6.00 A total; branch currents 3.00, 1.50, 1.50 A; powers 9.00, 4.50, 4.50 W
    s = stress_in(parallel(1.0, 2.0, 2.0), OperatingPoint(volts=3.0), BIG, FULL)
    assert s.amps == pytest.approx(6.0)
    assert sorted(p.amps for p in s.parts) == pytest.approx([1.5, 1.5, 3.0])
    assert sorted(p.watts for p in s.parts) == pytest.approx([4.5, 4.5, 9.0])


def test_series_parallel_openstax_e3():
    # OpenStax University Physics Vol. 2, §10.2 text example: 7 Ω + (10 Ω ∥ (6 Ω + 4 Ω)) at 24 V:
    # 12 Ω, 2 A; P1 = 28 W, P2 = 10 W, P3 = 6 W, P4 = 4 W
    net = series(7.0, parallel(10.0, series(6.0, 4.0)))
    s = stress_in(net, OperatingPoint(volts=24.0), BIG, FULL)
    assert s.verified_ohms == pytest.approx(12.0)
    assert s.amps == pytest.approx(2.0)
    watts = {p.ohms: p.watts for p in s.parts}
    assert watts == pytest.approx({7.0: 28.0, 10.0: 10.0, 6.0: 6.0, 4.0: 4.0})


def test_series_parallel_lessons_in_electric_circuits():
    # Lessons In Electric Circuits Vol. I, ch. 7 "Analysis technique" (SPICE output printed in the book):
    # (100 ∥ 250) + (350 ∥ 200) at 24 V: drops 8.627 V and 15.37 V; currents 86.27, 34.51, 43.92, 76.86 mA
    net = series(parallel(100.0, 250.0), parallel(350.0, 200.0))
    s = stress_in(net, OperatingPoint(volts=24.0), None, FULL)
    amps = {p.ohms: p.amps * 1e3 for p in s.parts}
    assert amps == pytest.approx({100.0: 86.27, 250.0: 34.51, 350.0: 43.92, 200.0: 76.86}, abs=0.006)
    volts = {p.ohms: p.volts for p in s.parts}
    assert volts[100.0] == pytest.approx(8.627, abs=0.001) and volts[350.0] == pytest.approx(15.37, abs=0.005)


def test_current_and_power_drives():
    # Ohm's law: 2 A through 12 Ω is 24 V; 48 W in 12 Ω is also 24 V (P = V²/R)
    net = series(7.0, parallel(10.0, series(6.0, 4.0)))
    for point in (OperatingPoint(amps=2.0), OperatingPoint(watts=48.0)):
        assert stress_in(net, point, BIG, FULL).volts == pytest.approx(24.0)


def test_duty_cycle_scales_power_not_voltage():
    # average power = duty × peak power; the peak voltage is unchanged (definition of duty cycle)
    net = series(10.0, 10.0)
    full = stress_in(net, OperatingPoint(volts=10.0), None, FULL)
    tenth = stress_in(net, OperatingPoint(volts=10.0, duty=0.1), None, FULL)
    assert tenth.parts[0].volts == full.parts[0].volts
    assert tenth.parts[0].watts == pytest.approx(0.1 * full.parts[0].watts)


@settings(max_examples=60, deadline=None)
@given(networks(), st.floats(0.1, 1000.0))
def test_part_powers_sum_to_v_squared_over_r(net, volts):
    # energy conservation (Tellegen's theorem): Σ part powers = V² / R
    s = stress_in(net, OperatingPoint(volts=volts), None, FULL)
    assert sum(p.watts for p in s.parts) == pytest.approx(volts**2 / resistance(net), rel=1e-9)


def test_headroom_and_violations_against_hand_arithmetic():
    # 10 V across two 100 Ω ¼ W parts in series: 5 V and 0.25 W each (Ohm's law). With a 50 % power factor the
    # limit is 0.125 W, so each is at twice its limit: headroom 0.5. Voltage limit 0.8 × min(200, √(0.25·100)) = 4 V.
    stock = StockBin((StockItem(100.0, power_rating_w=0.25, max_volts=200.0),))
    s = stress_in(series(100.0, 100.0), OperatingPoint(volts=10.0), stock, Derating(0.5, 0.8))
    p = s.parts[0]
    assert p.limit_watts == pytest.approx(0.125) and p.limit_volts == pytest.approx(4.0)
    # Headroom is a factor on the drive (volts): power grows with its square, so 2× over the power limit
    # allows 1/√2 of the voltage; 5 V against 4 V allows 0.8. The smaller, power, binds.
    assert p.power_use == pytest.approx(2.0) and p.voltage_use == pytest.approx(1.25)
    assert p.headroom == pytest.approx(1 / math.sqrt(2.0)) and p.binding == "power"
    assert s.violations == (0, 1)


def test_each_part_is_checked_against_its_own_line():
    # two lines of one value, one part each: the 1 W line carries the load (most headroom)
    stock = StockBin((StockItem(100.0, count=1, power_rating_w=0.25, location="A"),
                      StockItem(100.0, count=1, power_rating_w=1.0, location="B")))
    s = stress_in(from_text("100"), OperatingPoint(volts=5.0), stock, FULL)  # 0.25 W: at the ¼ W line's limit
    assert s.parts[0].line.power_rating_w == 1.0 and s.parts[0].in_bin and s.parts[0].line.location == "B"


HEADROOM_CASES = [
    # (network, drive, line ratings, derating, factor the drive may grow, binding limit) — hand arithmetic,
    # Ohm's law and P = V²/R = I²R:
    # A 25 mΩ shunt at 1 A: 25 mW in a 1 W part (100 % derating) is 40× in power but only √40 = 6.32× in
    # current; the voltage limit min(200, √(1 · 0.025)) = 0.158 V against 25 mV is also √40×: both bind.
    ("25m", OperatingPoint(amps=1.0), dict(power_rating_w=1.0), FULL, math.sqrt(40.0), None),
    # A divider string 4 × 470 kΩ at 1 kV: 250 V on each; LEV 500 V × 0.8 = 400 V → 1.6× in voltage; power
    # 250² / 470k = 0.133 W against 0.25 W × 0.5 = 0.125 W → over: √(0.125 / 0.133) = 0.970× in voltage.
    ("470k + 470k + 470k + 470k", OperatingPoint(volts=1000.0), dict(max_volts=500.0), Derating(0.5, 0.8),
     math.sqrt(0.125 / (250.0**2 / 470e3)), "power"),
    # A 10 Ω dummy load (10 + 10) || (10 + 10) at 5 W: 1.25 W per part against 0.125 W; under a power drive the
    # factor is on the power itself: 0.1×.
    ("(10 + 10) || (10 + 10)", OperatingPoint(watts=5.0), {}, Derating(0.5, 0.8), 0.125 / 1.25, "power"),
    # 1 kV on one 10 MΩ part, LEV 200 V × 0.8 = 160 V: 0.16× in voltage (power 0.1 W of 0.125 W would allow 1.118×)
    ("10M", OperatingPoint(volts=1000.0), {}, Derating(0.5, 0.8), 0.16, "voltage"),
    # the same at a power drive of 0.1 W: the voltage grows as √P, so the factor on the power is 0.16² = 0.0256
    ("10M", OperatingPoint(watts=0.1), {}, Derating(0.5, 0.8), 0.16**2, "voltage"),
]


@pytest.mark.parametrize("text, point, ratings, derating, factor, binding", HEADROOM_CASES)
def test_headroom_is_a_factor_on_the_drive(text, point, ratings, derating, factor, binding):
    net = from_text(text)
    stock = StockBin(tuple(StockItem(r, **ratings) for r in {p.ohms for p in parts_in_order(net)}))
    s = stress_in(net, point, stock, derating)
    assert s.headroom == pytest.approx(factor, rel=1e-9)
    if binding is not None:
        assert s.binding[1] == binding


# ------------------------------------------------------------------ cautions


def test_cautions_for_high_voltage_mains_and_near_limit():
    stock = StockBin((StockItem(470e3, power_rating_w=0.25, max_volts=500.0),))
    r = review(tie(from_text("470k + 470k"), stock), OperatingPoint(volts=120.0, mains=True), FULL)
    text = " ".join(r.cautions)
    assert "120 V is present" in text  # above the 50 V threshold
    assert "mains" in text
    assert SAFETY_NOTE[1:] in text  # "…atings are derated per the part maker's data; local codes …"


def test_no_caution_at_low_voltage_and_light_load():
    stock = StockBin((StockItem(1000.0),))
    r = review(tie(from_text("1k + 1k"), stock), OperatingPoint(volts=5.0))
    assert r.cautions == () and r.ok


def test_over_limit_is_shown_plainly():
    stock = StockBin((StockItem(10.0, power_rating_w=0.25),))
    r = review(tie(from_text("10"), stock), OperatingPoint(watts=5.0))
    assert not r.ok and "over a derated limit" in r.cautions[0]


def test_note_when_error_is_far_below_the_tolerance_band():
    stock = StockBin((StockItem(1000.0, tolerance=0.05),))
    r = review(tie(from_text("1k"), stock), target_ohms=1000.1)
    assert any("far below" in n for n in r.notes)


def test_low_ohm_networks_get_a_wiring_note():
    # common practice, no source: wiring resistance matters below about 1 Ω
    assert any("Kelvin" in n for n in review(from_text("R47 || R47")).notes)
    assert not any("Kelvin" in n for n in review(from_text("4k7")).notes)
