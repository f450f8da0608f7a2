"""RC timing: τ = RC and f = 1/(2πRC) against textbook examples and hand arithmetic; the rc command."""

from __future__ import annotations

import json
import math

import pytest

from netsynth.cli import cli
from netsynth.errors import ArgumentError, ValueParseError
from netsynth.jobs.rc import (
    corner_goal,
    parse_capacitance,
    parse_frequency,
    parse_time,
    rc_result,
    tau_goal,
)


def test_liec_capacitor_transient_time_constant():
    # Lessons In Electric Circuits Vol. I, ch. 16 "Capacitor transient response": 10 kΩ and 100 µF, τ = 1 s
    assert tau_goal(1.0, 100e-6).resistance_ohms == pytest.approx(10e3, rel=1e-12)


def test_openstax_relaxation_oscillator_time_constant():
    # OpenStax University Physics Vol. 2 §10.5 "RC Circuits", relaxation oscillator example:
    # R + r = 101 Ω with C = 50 mF gives τ = 5.05 s (printed)
    assert tau_goal(5.05, 50e-3).resistance_ohms == pytest.approx(101.0, rel=1e-12)


def test_openstax_wiper_timer_resistance():
    # OpenStax University Physics Vol. 2 §10.5 "RC Circuits", windshield-wiper timer example: C = 10.00 mF,
    # 12.00 V, trip at 10.00 V after 10.00 s: t = −RC·ln(1 − 10/12), so τ = 10 s / ln 6; R = 558.11 Ω (printed)
    goal = tau_goal(10.0 / math.log(6.0), 10e-3)
    assert goal.resistance_ohms == pytest.approx(558.11, abs=0.005)


def test_corner_frequency_hand_arithmetic():
    # f = 1/(2πRC) (OpenStax University Physics Vol. 2 §10.5 time constant τ = RC, corner ω = 1/τ):
    # 1 kΩ with 1 µF: τ = 1 ms, f = 1000/(2π) = 159.155 Hz (hand arithmetic)
    goal = corner_goal(1000.0 / (2 * math.pi), 1e-6)
    assert goal.resistance_ohms == pytest.approx(1000.0, rel=1e-12)
    assert goal.achieved(1000.0) == pytest.approx(159.1549, rel=1e-6)
    # 1 kHz with 100 nF: R = 1/(2π·1e3·1e-7) = 10⁴/(2π) = 1591.55 Ω (hand arithmetic)
    assert corner_goal(1e3, 100e-9).resistance_ohms == pytest.approx(1591.549, rel=1e-6)


def test_bands_pair_the_ends_of_resistor_and_capacitor():
    # τ: 10 kΩ ±1 % with 100 µF ±10 %: 0.99·0.9 = 0.891 s .. 1.01·1.1 = 1.111 s (hand arithmetic)
    r = rc_result(tau_goal(1.0, 100e-6, 0.10), 10e3, 9.9e3, 10.1e3)
    assert (r.low, r.high) == pytest.approx((0.891, 1.111), rel=1e-12)
    # f falls with R and C: 1 kΩ ±1 % with 1 µF ±5 %: 159.155/(1.01·1.05) .. 159.155/(0.99·0.95) Hz
    f0 = 1000 / (2 * math.pi)
    r = rc_result(corner_goal(f0, 1e-6, 0.05), 1e3, 990.0, 1010.0)
    assert (r.low, r.high) == pytest.approx((f0 / (1.01 * 1.05), f0 / (0.99 * 0.95)), rel=1e-12)
    assert r.error == pytest.approx(0.0, abs=1e-12)


@pytest.mark.parametrize("text, farads", [
    ("100n", 100e-9), ("100nF", 100e-9), ("4n7", 4.7e-9),   # IEC 60062 letter in place of the point
    ("2.2 µF", 2.2e-6), ("2.2uF", 2.2e-6), ("10p", 10e-12), ("1e-6", 1e-6), ("47 mF", 47e-3),
])
def test_capacitance_spellings(text, farads):
    assert parse_capacitance(text) == pytest.approx(farads, rel=1e-15)


@pytest.mark.parametrize("text, seconds", [("1ms", 1e-3), ("250 us", 250e-6), ("2.5s", 2.5), ("3", 3.0)])
def test_time_spellings(text, seconds):
    assert parse_time(text) == pytest.approx(seconds, rel=1e-15)


@pytest.mark.parametrize("text, hertz", [("1kHz", 1e3), ("159.2 Hz", 159.2), ("2k", 2e3), ("1MHz", 1e6)])
def test_frequency_spellings(text, hertz):
    assert parse_frequency(text) == pytest.approx(hertz, rel=1e-15)


@pytest.mark.parametrize("text", ["", "abc", "-5n", "0", "4,7n", "1nn"])
def test_bad_capacitances_are_refused(text):
    with pytest.raises(ValueParseError):
        parse_capacitance(text)


@pytest.mark.parametrize("call", [lambda: tau_goal(0, 1e-6), lambda: tau_goal(1e-3, -1e-9),
                                  lambda: corner_goal(1e3, 1e-6, 1.5), lambda: corner_goal(float("inf"), 1e-6)])
def test_bad_goals_are_argument_errors(call):
    with pytest.raises(ArgumentError):
        call()


# ------------------------------------------------------------------ command line


def run(runner, *args):
    result = runner.invoke(cli, list(args))
    assert result.exception is None or isinstance(result.exception, SystemExit)
    assert "Traceback" not in result.output
    return result


def test_cli_rc_tau_json_is_the_make_object_plus_rc(runner):
    result = run(runner, "rc", "--tau", "1ms", "--cap", "100n", "--cap-tol", "5%", "-k", "2", "--json")
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    # 1 ms / 100 nF = 10 kΩ (hand arithmetic); 10k is an E24 value (IEC 60063)
    assert data["target_ohms"] == pytest.approx(10e3, rel=1e-12)
    assert set(data) >= {"frontier", "best", "pick_list", "review", "rc"}
    rc = data["rc"]
    assert rc["tau_s"] == pytest.approx(1e-3, rel=1e-12) and rc["unit"] == "s"
    # 1 % parts and a 5 % capacitor: 0.99·0.95 ms .. 1.01·1.05 ms (hand arithmetic)
    assert rc["band"] == pytest.approx([0.9405e-3, 1.0605e-3], rel=1e-12)


def test_cli_rc_corner_text(runner):
    result = run(runner, "rc", "--corner", "1kHz", "--cap", "4n7", "-k", "2", "--alternatives", "0")
    assert result.exit_code == 0, result.output
    # 1/(2π·1 kHz·4.7 nF) = 33.863 kΩ (hand arithmetic)
    assert result.output.startswith("RC: f = 1 kHz with C = 4.7 nF: R = 1/(2π·f·C) = 33.8628 kΩ")
    assert "Achieved: f = " in result.output and " Hz" in result.output
    assert "A ──" in result.output and "Take from the bin:" in result.output


@pytest.mark.parametrize("args", [
    ["rc", "--cap", "100n"],                                   # neither τ nor f
    ["rc", "--tau", "1ms", "--corner", "1kHz", "--cap", "1u"],  # both
    ["rc", "--tau", "1ms"],                                    # no capacitor
    ["rc", "--tau", "1ms", "--cap", "abc"],                    # unreadable capacitor
])
def test_cli_rc_usage_errors_exit_2(runner, args):
    result = run(runner, *args)
    assert result.exit_code == 2 and "Error" in result.output


def test_cli_rc_help(runner):
    result = run(runner, "rc", "--help")
    assert result.exit_code == 0 and "τ = R·C" in result.output and "--cap" in result.output
