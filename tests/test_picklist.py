"""The pick list with markings: on screen, as CSV (``make --pick-csv``) and in JSON.

References: IEC 60062 (RKM code 4K7, R47, 1M0; colour code: yellow-violet-red-gold is 4.7 kΩ ±5 %;
4-character chip code 1002 = 10 kΩ; EIA-96 code: index 01 = 100 and 96 = 976 of the IEC 60063 E96
mantissas, letter C = ×100, so 01C = 10 kΩ and 96C = 97.6 kΩ). Band colours by digit: black 0, brown 1,
red 2, orange 3, yellow 4, green 5, blue 6, violet 7, grey 8, white 9; tolerance brown ±1 %, gold ±5 %.
The demo bins' own text (values, tolerances, packages, locations, line numbers).
"""

from __future__ import annotations

import csv
import io
import json
from pathlib import Path

import pytest

from netsynth.cli import cli
from netsynth.design import PickLine
from netsynth.render.picklist import CSV_COLUMNS, package_kind, pick_csv, pick_marking, pick_table
from netsynth.stock import StockItem

BINS = Path(__file__).resolve().parent.parent / "bins"


@pytest.mark.parametrize(
    "package, kind",
    [("0805", "chip"), ("1206 thick film", "chip"), ("SMD", "chip"), ("chip", "chip"), ("axial", "leaded"),
     ("axial 1W", "leaded"), ("Through-hole", "leaded"), ("cement 5W", "any"), ("", "any"), ("TO-220", "any")],
)
def test_package_kind(package, kind):
    assert package_kind(package) == kind


def test_a_5_percent_leaded_part_gets_four_bands():
    m = pick_marking(4700.0, 0.05, "axial")
    assert m.rkm == "4K7" and m.bands == ("yellow", "violet", "red", "gold")  # IEC 60062 example


def test_a_1_percent_part_gets_five_bands_and_the_4_character_code():
    # 4.7 kΩ ±1 %: 4, 7, 0, ×10, brown: yellow-violet-black-brown-brown; chip 4701 (470 × 10^1)
    m = pick_marking(4700.0, 0.01, "")
    assert m.bands == ("yellow", "violet", "black", "brown", "brown") and m.smd_code == "4701"


def test_a_value_with_three_digits_at_5_percent_falls_back_to_five_bands():
    # 4.75 kΩ does not fit two digit bands; 475 × 10^1 with gold
    assert pick_marking(4750.0, 0.05).bands == ("yellow", "violet", "green", "brown", "gold")
    assert pick_marking(4750.0, 0.05).smd_code == "4751"  # no 3-character code: 4 characters


def test_chip_codes_and_eia96():
    assert pick_marking(10000.0, 0.01, "0805").smd_code == "1002"
    assert pick_marking(10000.0, 0.01, "0805").eia96 == "01C"
    assert pick_marking(97600.0, 0.01, "0805").eia96 == "96C"
    assert pick_marking(4700.0, 0.05, "0603").smd_code == "472" and pick_marking(4700.0, 0.05).eia96 is None
    assert pick_marking(0.47, 0.05).rkm == "R47" and pick_marking(1e6, 0.05).rkm == "1M0"


def test_a_20_percent_part_has_no_bands():
    assert pick_marking(4700.0, 0.2, "axial").bands is None


def test_screen_lines_follow_the_package():
    picks = [PickLine(StockItem(4700.0, 10, tolerance=0.05, package="axial", location="B1", line=19), 2),
             PickLine(StockItem(10000.0, 5, tolerance=0.001, package="0805", location="strip 3", line=4), 1),
             PickLine(StockItem(100.0, 5, tolerance=0.05, package="cement 5W", line=7), 1)]
    rows = pick_table(picks)
    assert rows[0][0] == ("2 ×", "4k7", "±5 %", "¼ W", "200 V", "B1", "line 19")
    assert rows[0][1] == "marked 4K7; bands yellow-violet-red-gold"
    assert rows[1][1] == "marked 10K; chip 1002, EIA-96 01C"
    # 100 Ω ±5 %: brown-black-brown-gold; chip 101; package says neither: both shown; EIA-96 01A = 100 × 1
    assert rows[2][1] == "marked 100R; bands brown-black-brown-gold; chip 101, EIA-96 01A"


def test_csv_rows():
    picks = [PickLine(StockItem(4700.0, 10, tolerance=0.05, package="axial", location="drawer B1, left", line=19), 2)]
    rows = list(csv.reader(io.StringIO(pick_csv(picks))))
    assert rows[0] == list(CSV_COLUMNS)
    assert dict(zip(rows[0], rows[1])) == {
        "qty": "2", "value": "4k7", "ohms": "4700.0", "tolerance": "5%", "watts": "0.25", "max_volts": "200",
        "tcr_ppm": "100", "package": "axial", "location": "drawer B1, left", "bin_line": "19", "rkm": "4K7",
        "bands": "yellow-violet-red-gold", "smd_code": "472", "eia96": ""}


def test_make_prints_markings_and_writes_the_csv(runner, tmp_path):
    # bins/makerspace-drawer.csv line 19: 4k7, 14 parts, 5 %, axial, drawer B1
    out = tmp_path / "pick.csv"
    args = ["make", "4k7", "--bin", str(BINS / "makerspace-drawer.csv"), "-k", "1", "--pick-csv", str(out)]
    result = runner.invoke(cli, args)
    assert result.exception is None and result.exit_code == 0, result.output
    lines = result.output.splitlines()
    at = lines.index("Take from the bin:")
    assert lines[at + 1].split() == ["1", "×", "4k7", "±5", "%", "¼", "W", "250", "V", "drawer", "B1", "line", "19"]
    assert lines[at + 2].strip() == "marked 4K7; bands yellow-violet-red-gold"
    rows = list(csv.DictReader(io.StringIO(out.read_text())))
    assert [(r["qty"], r["value"], r["bin_line"], r["bands"]) for r in rows] == [
        ("1", "4k7", "19", "yellow-violet-red-gold")]


def test_make_json_pick_list_has_the_markings(runner):
    result = runner.invoke(cli, ["make", "4k99", "--bin", str(BINS / "precision-kit.csv"), "-k", "1", "--json"])
    assert result.exception is None and result.exit_code == 0, result.output
    (entry,) = json.loads(result.stdout)["pick_list"]
    # 4.99 kΩ ±0.1 % (bins/precision-kit.csv): 4, 9, 9, ×10, violet (±0.1 %); chip 4991
    assert entry["rkm"] == "4K99"
    assert entry["bands"] == ["yellow", "white", "white", "brown", "violet"]
    assert entry["smd_code"] == "4991"
    assert entry["eia96"].endswith("B")  # ×10; the index of 499 among the E96 mantissas is test_markings' job
    result = runner.invoke(cli, ["make", "3k37", "-k", "3", "--json"])
    entries = json.loads(result.stdout)["pick_list"]
    # 10 + 360 + 3k (README): 360 Ω is not an E96 value, so its eia96 is null
    assert [e["eia96"] for e in entries] == ["01X", None, None]
    assert all(set(e) >= {"rkm", "bands", "smd_code", "eia96"} for e in entries)
