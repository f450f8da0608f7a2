"""Trimming a measured part (netsynth.jobs.trim, the ``trim`` command) and measured parts in a bin file.

Outside references, beside each check: series and parallel resistance (OpenStax *University
Physics* Vol. 2 §10.2); hand arithmetic of the trim formulas t = T − Rbase and
t = Rbase·T/(Rbase − T) on the numbers shown; Rayleigh's monotonicity law (P. G. Doyle and
J. L. Snell, *Random Walks and Electric Networks*, 1984) for the band, checked against every
corner; the trim examples are invented scenarios of ours.
"""

from __future__ import annotations

import itertools
import json

import pytest

from netsynth.api import make
from netsynth.errors import ArgumentError, StockError
from netsynth.jobs.shared import take_parts
from netsynth.jobs.trim import combine, sensitivity, trim_result, trim_target
from netsynth.cli import cli
from netsynth.stock import kit_bin, load_bin, save_bin


# ------------------------------------------------------------------ formulas


def test_parallel_trim_by_hand():
    # 10.02 kΩ measured, 10 kΩ wanted: t = 10 020 · 10 000 / 20 = 5.01 MΩ (hand arithmetic)
    assert trim_target(10_020.0, 10_000.0) == ("parallel", pytest.approx(5_010_000.0, rel=1e-12))
    # 8.635 Ω measured, 8.5 Ω wanted: t = 8.635 · 8.5 / 0.135 = 543.685 Ω (hand arithmetic)
    mode, t = trim_target(8.635, 8.5)
    assert mode == "parallel" and t == pytest.approx(543.685, abs=5e-4)
    # a 549 Ω trim that is really 555 Ω: 8.635 · 555 / 563.635 = 8.5027 Ω (hand arithmetic, 0.03 % high)
    assert combine(8.635, 555.0, "parallel") == pytest.approx(8.5027, abs=5e-5)


def test_series_trim_by_hand():
    # 4.98 kΩ measured, 4.99 kΩ wanted: 10 Ω in series (hand arithmetic)
    assert trim_target(4_980.0, 4_990.0) == ("series", pytest.approx(10.0, rel=1e-9))
    assert trim_target(4_980.0, 4_990.0, "series")[0] == "series"


def test_trim_refuses_what_it_cannot_do():
    with pytest.raises(ArgumentError, match="already on the target"):
        trim_target(1000.0, 1000.0)
    with pytest.raises(ArgumentError, match="mode='series'"):
        trim_target(1010.0, 1000.0, "series")
    with pytest.raises(ArgumentError, match="mode='parallel'"):
        trim_target(990.0, 1000.0, "parallel")
    with pytest.raises(ArgumentError, match="mode='sideways'"):
        trim_target(990.0, 1000.0, "sideways")  # type: ignore[arg-type]
    with pytest.raises(ArgumentError, match="base_ohms"):
        trim_target(-1.0, 1000.0)


@pytest.mark.parametrize("base, trim, mode", [(10_020.0, 5.01e6, "parallel"), (8.635, 543.7, "parallel"),
                                              (4_980.0, 10.0, "series"), (100.0, 100.0, "series")])
def test_sensitivity_by_finite_difference(base, trim, mode):
    # S = d ln R / d ln t, by a central difference of the series/parallel formula
    h = 1e-6
    up, down = combine(base, trim * (1 + h), mode), combine(base, trim * (1 - h), mode)
    numeric = (up - down) / (2 * h * combine(base, trim, mode))
    assert sensitivity(base, trim, mode) == pytest.approx(numeric, rel=1e-6)


def test_sensitivity_of_a_large_parallel_trim_is_small():
    # 10.02 k with 5.01 M: S = 10 020 / 5 020 020 = 0.001996 (hand arithmetic): a 1 % trim moves the
    # result by 0.002 %
    assert sensitivity(10_020.0, 5.01e6, "parallel") == pytest.approx(0.0019960, abs=1e-7)


# ------------------------------------------------------------------ with a search


def _value(net, scale):
    """A tree's value with each part scaled: series adds, parallel adds conductances (written here)."""
    from netsynth.network import Parallel, Series

    if isinstance(net, Series):
        return sum(_value(c, scale) for c in net.children)
    if isinstance(net, Parallel):
        return 1 / sum(1 / _value(c, scale) for c in net.children)
    return net.ohms * scale[id(net)]


@pytest.mark.parametrize("base, target, unc", [(10_020.0, 10_000.0, 1e-4), (8.635, 8.5, 5e-4), (4_980.0, 4_990.0, 0.0)])
def test_trim_result_is_verified_and_banded(base, target, unc):
    mode, ideal = trim_target(base, target)
    design = make(ideal, kit_bin("E24", 1, 10e6), max_parts=3, alternatives=0)
    result = trim_result(base, target, design, mode, unc)
    trim = design.best.value_ohms
    assert result.result_ohms == pytest.approx(combine(base, trim, mode), rel=1e-12)
    assert result.verified_ohms == pytest.approx(result.result_ohms, rel=1e-9)
    assert abs(result.error) < 1e-3
    # the band is the extreme corners (Rayleigh monotonicity): every corner of base ± unc and the
    # trim's parts at their tolerance limits lies inside it, and two corners are its ends
    tol = design.best.components[0].line.tolerance
    parts = design.best.components
    corners = []
    for signs in itertools.product((-1, 1), repeat=len(parts) + 1):
        scale = {id(p): 1 + s * p.line.tolerance for p, s in zip(parts, signs[1:])}
        corners.append(combine(base * (1 + signs[0] * unc), _value(design.best.network, scale), mode))
    low, high = result.band_ohms
    assert min(corners) == pytest.approx(low, rel=1e-12) and max(corners) == pytest.approx(high, rel=1e-12)
    assert tol == 0.01
    assert low < result.result_ohms < high


def test_trim_result_checks_its_arguments():
    design = make(5.01e6, kit_bin("E24", 1, 10e6), max_parts=2, alternatives=0)
    with pytest.raises(ArgumentError, match="base_uncertainty"):
        trim_result(10_020.0, 10_000.0, design, "parallel", 1.5)


# ------------------------------------------------------------------ the command


def test_trim_command_text(runner):
    result = runner.invoke(cli, ["trim", "10.02k", "10k", "--base-uncertainty", "0.01%", "-k", "2",
                                 "--series", "E24", "--range", "1k..10M"])
    assert result.exception is None, result.output
    assert result.exit_code == 0
    out = result.output
    assert out.startswith("Base 10.02 kΩ (measured ±0.01 %), target 10 kΩ: parallel trim of 5.01 MΩ")
    assert "Trimmed: base || " in out and "nodal analysis gives" in out
    assert "Sensitivity to the trim: S = 0.002" in out
    assert "Band (base ±0.01 %, trim at its worst case):" in out


def test_trim_command_json(runner):
    result = runner.invoke(cli, ["trim", "4k98", "4k99", "--json", "-k", "2"])
    assert result.exception is None and result.exit_code == 0
    data = json.loads(result.output)
    trim = data["trim"]
    assert data["job"] == "trim" and trim["mode"] == "series"
    assert data["target_ohms"] == pytest.approx(10.0, rel=1e-9)  # the trim's own target, 4990 − 4980
    assert trim["ideal_trim_ohms"] == pytest.approx(10.0, rel=1e-9)
    assert trim["result_ohms"] == pytest.approx(4980 + data["best"]["value_ohms"], rel=1e-12)
    assert trim["verified_ohms"] == pytest.approx(trim["result_ohms"], rel=1e-9)
    assert trim["sensitivity"] == pytest.approx(data["best"]["value_ohms"] / trim["result_ohms"], rel=1e-12)
    assert trim["band_ohms"][0] < trim["result_ohms"] < trim["band_ohms"][1]


def test_trim_command_errors(runner):
    result = runner.invoke(cli, ["trim", "1010", "1k", "--mode", "series", "--json"])
    assert isinstance(result.exception, SystemExit) and result.exit_code == 1
    assert json.loads(result.output)["error"]["kind"] == "argument"
    result = runner.invoke(cli, ["trim", "1010", "1k", "--mode", "diagonal"])
    assert isinstance(result.exception, SystemExit) and result.exit_code == 2
    result = runner.invoke(cli, ["trim", "10k"])
    assert isinstance(result.exception, SystemExit) and result.exit_code == 2
    assert "TARGET" in result.output


# ------------------------------------------------------------------ measured parts in a bin file


def _write(tmp_path, text, name="bench.csv"):
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return str(path)


def test_a_measured_part_is_its_measured_value(tmp_path):
    path = _write(tmp_path, "value,qty,tolerance,measured,uncertainty,location\n"
                            "4k7,,1%,4.6982k,0.01%,tray 1\n"
                            "4k7,10,1%,,,drawer\n")
    stock = load_bin(path)
    measured, plain = stock.items
    assert (measured.ohms, measured.count, measured.tolerance) == (4698.2, 1, 0.0001)
    assert dict(measured.extra) == {"nominal": "4k7"} and measured.location == "tray 1" and measured.line == 2
    assert (plain.ohms, plain.count, plain.tolerance) == (4700.0, 10, 0.01)
    # synthesis uses the measured value and its band: one part lands exactly, ±0.01 %
    design = make("4.6982k", stock, max_parts=1)
    assert design.best.error == 0 and design.best.components[0].line is measured
    assert design.review.band.low_ohms == pytest.approx(4698.2 * (1 - 1e-4), rel=1e-12)


def test_measured_parts_round_trip(tmp_path):
    path = _write(tmp_path, "value,measured,uncertainty\n100,100.013,0.005%\n220,,\n")
    first = load_bin(path)
    save_bin(first, tmp_path / "saved.csv")
    again = load_bin(str(tmp_path / "saved.csv"))
    assert again.items == first.items


@pytest.mark.parametrize("rows, field", [
    ("4k7,2,4.6982k,0.01%", "'qty'"),        # a measured row is one part
    ("4k7,,4.6982k,", "'uncertainty'"),      # a measurement needs its uncertainty
    ("4k7,,,0.01%", "'uncertainty'"),        # an uncertainty without a measurement
    ("4k7,,4,7k,0.01%", "line 2"),           # a decimal comma splits the row
    ("4k7,,junk,0.01%", "'measured'"),
    ("4k7,,4.6982k,150%", "'uncertainty'"),
])
def test_measured_part_problems(tmp_path, rows, field):
    path = _write(tmp_path, "value,qty,measured,uncertainty\n" + rows + "\n")
    with pytest.raises(StockError, match=field):
        load_bin(path)


def test_measured_part_with_a_nominal_column_is_refused(tmp_path):
    path = _write(tmp_path, "value,measured,uncertainty,nominal\n4k7,4.6982k,0.01%,x\n")
    with pytest.raises(StockError, match="own 'nominal' column"):
        load_bin(path)


def test_take_parts_leaves_the_rest(tmp_path):
    path = _write(tmp_path, "value,qty,measured,uncertainty\n100,,100.013,0.005%\n100,3,,\n220,,,\n")
    stock = load_bin(path)
    design = make("200.013", stock, max_parts=2, alternatives=0)
    assert design.best.expression == "100 + 100.013" or design.best.value_ohms == pytest.approx(200.013)
    left = take_parts(stock, design.pick_list)
    assert sum(i.count or 0 for i in left.items if i.ohms == 100.013) == 0
    assert [i.count for i in left.items if i.ohms == 100.0] == [2]
