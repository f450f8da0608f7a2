"""Sensor models (netsynth.jobs.sensors), the calibration ladder and the ``sensor`` command.

Outside references, beside each check:

* IEC 60751:2022, *Industrial platinum resistance thermometers and platinum temperature sensors*:
  the Callendar–Van Dusen equation and coefficients (§5.1.3) and the Pt100 reference table
  (Table 1), printed to 0.001 Ω.
* The Beta definition of a thermistor maker: B = ln(R1/R2)/(1/T1 − 1/T2), temperatures in kelvin
  (Cantherm, "How do I calculate the resistance of a thermistor?", FAQ).
* J. S. Steinhart and S. R. Hart, Deep-Sea Research 15 (1968) 497–503: the equation's form.
"""

from __future__ import annotations

import json
import math

import pytest
from hypothesis import given
from hypothesis import strategies as st

from netsynth.api import make
from netsynth.errors import ArgumentError, InfeasibleError
from netsynth.jobs.sensors import (
    BetaNTC,
    PlatinumRTD,
    SteinhartHartNTC,
    calibration_ladder,
    temperature_error_c,
)
from netsynth.cli import cli
from netsynth.stock import StockBin, StockItem

PT100 = PlatinumRTD(100.0)


@pytest.mark.parametrize("t_c, ohms", [
    (-200.0, 18.520),   # IEC 60751:2022 Table 1, Pt100 at −200 °C
    (-100.0, 60.256),   # Table 1, −100 °C
    (0.0, 100.000),     # Table 1, 0 °C
    (15.0, 105.849),    # Table 1, 15 °C
    (25.0, 109.735),    # Table 1, 25 °C
    (37.0, 114.382),    # Table 1, 37 °C
    (100.0, 138.505),   # Table 1, 100 °C
    (850.0, 390.481),   # Table 1, 850 °C
])
def test_pt100_matches_the_iec_60751_table(t_c, ohms):
    # the table is printed to 0.001 Ω, so the equation must land within half of that
    assert abs(PT100.ohms(t_c) - ohms) <= 0.0005 + 1e-12


def test_pt100_mean_coefficient_is_the_standards_alpha():
    # IEC 60751: the mean temperature coefficient between 0 and 100 °C, (R100 − R0)/(100·R0),
    # is 0.003 850 55 °C⁻¹ (from memory: the standard's stated α)
    assert (PT100.ohms(100) - PT100.ohms(0)) / (100 * PT100.ohms(0)) == pytest.approx(0.00385055, abs=5e-9)


def test_pt1000_is_ten_pt100s():
    # IEC 60751 scales the same equation by R0 (Pt1000: R0 = 1000 Ω)
    pt1000 = PlatinumRTD(1000.0)
    for t in (-200, -37.5, 0, 37, 850):
        assert pt1000.ohms(t) == pytest.approx(10 * PT100.ohms(t), rel=1e-12)
    assert pt1000.name.startswith("Pt1000") and PlatinumRTD(500.0).name.startswith("Pt RTD, R0 500 Ω")


@given(st.floats(min_value=-200.0, max_value=850.0))
def test_rtd_inverse_round_trip(t):
    assert PT100.temp_c(PT100.ohms(t)) == pytest.approx(t, abs=1e-9)


def test_rtd_inverse_at_the_table_points():
    # IEC 60751 Table 1 values read back within their rounding (0.0005 Ω over a slope of at least
    # 0.17 Ω/°C); 18.520 Ω is a hair below R(−200 °C) = 18.52008 Ω, so it reads as the equation continued
    for t, ohms in ((-200, 18.520), (0, 100.000), (100, 138.505), (850, 390.481)):
        assert PT100.temp_c(ohms, extrapolate=True) == pytest.approx(t, abs=0.0005 / 0.17)


@pytest.mark.parametrize("t", [-199.0, -50.0, -0.5, 0.5, 25.0, 400.0, 849.0])
def test_rtd_slope_by_central_difference(t):
    h = 1e-4
    assert PT100.slope(t) == pytest.approx((PT100.ohms(t + h) - PT100.ohms(t - h)) / (2 * h), rel=1e-7)


def test_rtd_slope_at_25c_by_hand():
    # derivative of the IEC 60751 equation above 0 °C: R0·(A + 2·B·t) = 100·(3.9083e-3 − 2·5.775e-7·25)
    # = 0.387 942 5 Ω/°C (hand arithmetic)
    assert PT100.slope(25.0) == pytest.approx(0.3879425, rel=1e-12)


def test_rtd_out_of_range():
    with pytest.raises(ArgumentError, match="t_c=-201"):
        PT100.ohms(-201.0)
    with pytest.raises(ArgumentError, match="ohms=400"):
        PT100.temp_c(400.0)
    # a value just past an end reads as the equation continued, when asked
    assert PT100.temp_c(18.50, extrapolate=True) < -200.0
    with pytest.raises(ArgumentError, match="r0"):
        PlatinumRTD(0.0)


def test_temperature_error_first_order():
    # 0.0388 Ω high at 25 °C is about 0.1 °C (value error over the slope, IEC 60751 equation)
    assert temperature_error_c(PT100, 25.0, PT100.ohms(25.0) + 0.03879425) == pytest.approx(0.1, rel=1e-4)


# ------------------------------------------------------------------ thermistors


def test_beta_model_meets_the_makers_definition():
    # Cantherm FAQ: B = ln(R1/R2)/(1/T1 − 1/T2), T in kelvin (T = °C + 273.15)
    ntc = BetaNTC(10_000.0, 3380.0)
    for t1, t2 in ((25, 50), (0, 85), (-20, 100)):
        b = math.log(ntc.ohms(t1) / ntc.ohms(t2)) / (1 / (t1 + 273.15) - 1 / (t2 + 273.15))
        assert b == pytest.approx(3380.0, rel=1e-12)
    assert ntc.ohms(25.0) == pytest.approx(10_000.0, rel=1e-15)


def test_beta_model_at_50c_by_hand():
    # R(50 °C) = 10 kΩ · exp(3380 · (1/323.15 − 1/298.15)): the exponent is 3380 · (−2.59477e-4)
    # = −0.877032, so R = 4.16 kΩ (hand arithmetic, four figures)
    assert BetaNTC(10_000.0, 3380.0).ohms(50.0) == pytest.approx(4160.0, rel=5e-4)


@given(st.floats(min_value=-40.0, max_value=150.0))
def test_thermistor_inverses_round_trip(t):
    beta = BetaNTC(10_000.0, 3950.0)
    sh = SteinhartHartNTC(1.009249522e-3, 2.378405444e-4, 2.019202697e-7)
    assert beta.temp_c(beta.ohms(t)) == pytest.approx(t, abs=1e-9)
    assert sh.temp_c(sh.ohms(t)) == pytest.approx(t, abs=1e-9)


def test_steinhart_hart_without_c_is_the_beta_model():
    # algebra: 1/T = 1/T25 + (ln R − ln R25)/B is Steinhart–Hart with a = 1/T25 − ln R25/B, b = 1/B, c = 0
    r25, b = 10_000.0, 3950.0
    sh = SteinhartHartNTC(1 / 298.15 - math.log(r25) / b, 1 / b, 0.0)
    beta = BetaNTC(r25, b)
    for t in (-30, 0, 25, 60, 120):
        assert sh.ohms(t) == pytest.approx(beta.ohms(t), rel=1e-12)


@pytest.mark.parametrize("model", [BetaNTC(10_000.0, 3950.0),
                                   SteinhartHartNTC(1.009249522e-3, 2.378405444e-4, 2.019202697e-7)])
@pytest.mark.parametrize("t", [-20.0, 25.0, 80.0])
def test_thermistor_slope_by_central_difference(model, t):
    h = 1e-4
    assert model.slope(t) == pytest.approx((model.ohms(t + h) - model.ohms(t - h)) / (2 * h), rel=1e-6)


def test_thermistor_bad_parameters():
    with pytest.raises(ArgumentError, match="beta"):
        BetaNTC(10_000.0, -1.0)
    with pytest.raises(ArgumentError, match="sh_b"):
        SteinhartHartNTC(1e-3, -2e-4, 1e-7)


# ------------------------------------------------------------------ calibration ladder


def _synth(target, stock, index):
    return make(target, stock, max_parts=2, alternatives=0)


def test_ladder_shares_the_bins_quantities():
    stock = StockBin(tuple(StockItem(v, 1) for v in (10.0, 22.0, 47.0, 68.0, 100.0, 150.0, 220.0, 330.0)))
    designs = calibration_ladder(PT100, [0.0, 0.0, 0.0], stock, _synth)
    used: dict[float, int] = {}
    for d in designs:
        for p in d.pick_list:
            used[p.ohms] = used.get(p.ohms, 0) + p.count
    assert all(n <= 1 for n in used.values())  # one of each in the bin, never taken twice
    # the first gets 100 Ω itself (exact); the later ones cannot
    assert designs[0].best.expression == "100" and designs[1].best.expression != "100"


def test_ladder_runs_out():
    stock = StockBin((StockItem(100.0, 1),))
    with pytest.raises(InfeasibleError, match="target 2 of 2"):
        calibration_ladder(PT100, [0.0, 10.0], stock, _synth)
    with pytest.raises(ArgumentError, match="temps_c"):
        calibration_ladder(PT100, [], stock, _synth)


# ------------------------------------------------------------------ command


def test_sensor_negative_temperature_typed_plainly(runner):
    result = runner.invoke(cli, ["sensor", "pt100", "-200", "-k", "3"])
    assert result.exception is None, result.output
    assert result.exit_code == 0
    # IEC 60751 Table 1: 18.520 Ω at −200 °C
    assert result.output.startswith("Pt100 (IEC 60751) at -200 °C: 18.52008 Ω")
    assert "Reads as: -" in result.output and "°C" in result.output


def test_sensor_json_adds_reads_as(runner):
    result = runner.invoke(cli, ["sensor", "pt100", "37", "--json"])
    assert result.exception is None and result.exit_code == 0
    data = json.loads(result.output)
    assert data["job"] == "sensor" and data["temp_c"] == 37.0
    assert data["target_ohms"] == pytest.approx(114.382, abs=0.0005)  # IEC 60751 Table 1
    assert data["reads_as_c"] == pytest.approx(37.0, abs=0.01)
    assert data["temp_error_c"] == pytest.approx(data["reads_as_c"] - 37.0, abs=1e-12)
    low, high = data["reads_as_band_c"]
    assert low < data["reads_as_c"] < high
    assert data["frontier"] and data["best"]["verified_ohms"] > 0


def test_sensor_ladder_json(runner):
    result = runner.invoke(cli, ["sensor", "pt1000", "0", "-40", "100", "-k", "2", "--series", "E12",
                                 "--range", "100..10k", "--qty", "2", "--json"])
    assert result.exception is None and result.exit_code == 0
    data = json.loads(result.output)
    assert [n["temp_c"] for n in data["networks"]] == [0.0, -40.0, 100.0]
    assert "not a joint optimum" in data["order"]
    used: dict[int, int] = {}
    for n in data["networks"]:
        for p in n["pick_list"]:
            used[p["line"]] = used.get(p["line"], 0) + p["count"]
    assert max(used.values()) <= 2


def test_sensor_ntc_text(runner):
    result = runner.invoke(cli, ["sensor", "ntc", "25", "60", "--r25", "10k", "--beta", "3950", "-k", "3"])
    assert result.exception is None and result.exit_code == 0
    assert "NTC 10000 Ω at 25 °C, B 3950 K at 25 °C: 10 kΩ" in result.output
    assert "Ladder:" in result.output and "greedy order is not a joint optimum" in result.output


@pytest.mark.parametrize("args, message", [
    (["sensor", "rtd", "0"], "needs --r0"),
    (["sensor", "ntc", "25", "--r25", "10k"], "KIND ntc needs"),
    (["sensor", "pt100", "25", "--beta", "3950"], "belong to KIND ntc"),
    (["sensor", "pt100", "hot"], "Invalid value for 'TEMP...'"),
    (["sensor", "thermocouple", "25"], "Invalid value for '{pt100|pt1000|rtd|ntc}'"),
])
def test_sensor_usage_errors(runner, args, message):
    result = runner.invoke(cli, args)
    assert isinstance(result.exception, SystemExit) and result.exit_code == 2
    assert message in result.output


def test_sensor_out_of_range_is_a_library_error(runner):
    result = runner.invoke(cli, ["sensor", "pt100", "900", "--json"])
    assert isinstance(result.exception, SystemExit) and result.exit_code == 1
    error = json.loads(result.output)["error"]
    assert error["kind"] == "argument" and "t_c=900" in error["message"]
