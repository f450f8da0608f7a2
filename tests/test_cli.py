"""The command line: exact lines, the JSON contract, exit codes, never a traceback."""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from netsynth.cli import cli

BINS = Path(__file__).resolve().parent.parent / "bins"


def run(runner, *args):
    result = runner.invoke(cli, list(args))
    assert "Traceback" not in result.output
    return result


def test_make_on_the_default_bin_finds_an_exact_three_part_network(runner):
    result = run(runner, "make", "3k37", "--json")
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    assert data["target_ohms"] == 3370.0
    assert [row["parts"] for row in data["frontier"]] == [1, 2, 3, 4]
    # E24 holds 3k3 and 68 (IEC 60063): 3k3 + 68 = 3368 Ω, and 3k + 360 + 10 = 3370 Ω exactly (hand arithmetic)
    one, two, three = data["frontier"][:3]
    assert one["expression"] == "3k3" and one["error"] == pytest.approx(3300 / 3370 - 1)
    assert abs(two["error"]) <= abs(3368 / 3370 - 1) + 1e-15
    assert three["error"] == 0
    for row in data["frontier"]:
        assert row["proven"] is True
        assert row["verified_ohms"] == pytest.approx(row["value_ohms"], rel=1e-9)
        assert set(row) >= {"parts", "expression", "value_ohms", "error", "verified_ohms", "proven"}


def test_make_text_output_has_units_table_and_drawing(runner):
    result = run(runner, "make", "4k7", "--series", "E12", "--range", "1k..10k", "-k", "2")
    assert result.exit_code == 0, result.output
    lines = result.output.splitlines()
    assert lines[0].startswith("Target 4.7 kΩ")
    assert any(line.split()[:2] == ["1", "4k7"] for line in lines)
    assert "A ──[4k7]── B" in lines
    assert any(line.startswith("Verified: nodal analysis gives 4.7 kΩ") for line in lines)


def test_make_with_a_limited_demo_bin(runner):
    result = run(runner, "make", "2k", "--bin", str(BINS / "makerspace-drawer.csv"), "--json")
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    assert all(row["proven"] for row in data["frontier"])
    assert data["pick_list"] and all(p["location"] for p in data["pick_list"])


def test_within_stops_at_the_fewest_parts(runner):
    result = run(runner, "make", "3k37", "--within", "0.1%", "--json")
    data = json.loads(result.stdout)
    # 3k3 + 68 = 3368 Ω is within 0.1 % of 3370 Ω (hand arithmetic), one part is not (3k3: -2.1 %)
    assert [row["parts"] for row in data["frontier"]] == [1, 2]
    assert data["best"]["parts"] == 2


@pytest.mark.parametrize(
    "args, fragment",
    [
        (["make", "4k7k"], "cannot read '4k7k'"),
        (["make", "0"], "greater than zero"),
        (["make", "--", "-5"], "greater than zero"),
        (["make", "nan"], "cannot read 'nan'"),
        (["make", "inf"], "cannot read 'inf'"),
        (["make", "1k", "--bin", "no-such-file.csv"], "no-such-file.csv"),
        (["make", "1k", "--range", "1M..10"], "1M..10"),
        (["make", "1k", "--within", "abc"], "abc"),
        (["make", "1k", "--bin", "x.csv", "--series", "E12"], "not both"),
    ],
)
def test_bad_input_is_one_line_and_a_non_zero_exit(runner, args, fragment):
    result = run(runner, *args)
    assert result.exit_code != 0
    assert fragment in result.output
    assert [line for line in result.output.splitlines() if line.startswith("Error:")] == [
        next(line for line in result.output.splitlines() if fragment in line)
    ]


def test_bad_bin_file_names_file_line_and_field(runner, tmp_path):
    bad = tmp_path / "drawer.csv"
    bad.write_text("value,qty\n1k,5\n2k2,lots\n", encoding="utf-8")
    result = run(runner, "make", "1k5", "--bin", str(bad))
    assert result.exit_code == 1
    assert result.output.startswith("Error: ")
    assert "line 3" in result.output and "'qty'" in result.output
    assert len(result.output.strip().splitlines()) == 1


def test_impossible_accuracy_says_what_to_relax(runner):
    result = run(runner, "make", "1k234", "--series", "E3", "--range", "1k..1k", "--qty", "1", "--within", "1ppm")
    assert result.exit_code == 1
    assert "raise --max-parts" in result.output


def test_help_teaches_value_spellings(runner):
    result = run(runner, "make", "--help")
    assert result.exit_code == 0
    assert "3k37" in result.output and "default bin" in result.output


def test_bin_command_lists_a_demo_bin(runner):
    result = run(runner, "bin", str(BINS / "precision-kit.csv"))
    assert result.exit_code == 0, result.output
    assert "stock lines" in result.output.splitlines()[0]


# ------------------------------------------------------------------ operating conditions


def test_dummy_load_from_quarter_watt_parts(runner):
    result = run(runner, "make", "10", "--watts", "5", "--bin", str(BINS / "quarter-watt-kit.csv"), "--json")
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    # lower bound: 5 W over ¼ W × 50 % (default power factor, common practice) = 40 parts (hand arithmetic)
    assert data["lower_bound"]["count"] == 40
    best = data["frontier"][0]
    assert best["parts"] >= 40 and best["parts"] <= 50
    assert abs(best["error"]) <= 0.01
    assert len(best["stress"]) == best["parts"]
    for part in best["stress"]:
        # each part within its derated limit, and the limit is ¼ W × 50 % = 0.125 W (IEC 60115-1 line, 25 °C)
        assert part["limit_watts"] == pytest.approx(0.125)
        assert part["watts"] <= part["limit_watts"] * (1 + 1e-9)
        assert part["volts"] <= part["limit_volts"] * (1 + 1e-9)
    # power conservation: the parts dissipate the 5 W asked for, within the value error (P = V²/R at fixed V)
    assert sum(p["watts"] for p in best["stress"]) == pytest.approx(5.0, rel=0.011)
    assert data["status"] == "ok"


def test_dummy_load_text_shows_bound_headroom_and_caution(runner):
    result = run(runner, "make", "10", "--watts", "5", "--bin", str(BINS / "quarter-watt-kit.csv"))
    assert result.exit_code == 0, result.output
    text = result.output
    assert "Lower bound: at least 40 parts" in text
    assert "headroom" in text
    assert "Caution:" in text and "part maker's data" in text


def test_too_few_parts_names_the_count_needed(runner):
    result = run(runner, "make", "10", "--watts", "5", "--bin", str(BINS / "quarter-watt-kit.csv"), "-k", "10")
    assert result.exit_code == 1
    assert "--max-parts 10 is too small" in result.output and "at least 40 parts" in result.output


def test_high_voltage_string_keeps_each_part_under_its_limit(runner):
    result = run(runner, "make", "1M8", "--volts", "1kV", "--series", "E24", "--range", "10k..1M", "--json")
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    # 1000 V over 200 V × 80 % (default voltage factor) = 6.25: at least 7 parts in series (hand arithmetic)
    assert data["lower_bound"]["by_voltage"] == 7
    for row in data["frontier"]:
        assert all(p["volts"] <= 160.0 * (1 + 1e-9) for p in row["stress"])
    assert any("1000 V is present" in c for c in data["review"]["cautions"])


def test_check_with_an_operating_point(runner):
    # OpenStax University Physics Vol. 2 §10.2: 7 Ω + (10 Ω ∥ (6 Ω + 4 Ω)) at 24 V draws 2 A; P1 = 28 W
    result = run(runner, "check", "7 + (10 || (6 + 4))", "--volts", "24", "--json")
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    assert data["value_ohms"] == pytest.approx(12.0)
    assert data["verified_ohms"] == pytest.approx(12.0)
    assert {p["value_ohms"]: p["watts"] for p in data["stress"]} == pytest.approx({7.0: 28.0, 10.0: 10.0, 6.0: 6.0, 4.0: 4.0})
    # 28 W in a ¼ W default part is far over its limit
    assert data["status"] == "over_limit"
    low, high = data["worst_case_ohms"]
    # every part ±1 % (bin default): the band is exactly 12 Ω × (1 ∓ 1 %) by homogeneity and monotonicity
    assert (low, high) == (pytest.approx(11.88), pytest.approx(12.12))
    assert set(data) >= {"expression", "value_ohms", "verified_ohms", "worst_case_ohms", "stress"}


def test_check_text_has_per_part_table(runner):
    result = run(runner, "check", "1k + (2k2 || 4k7)", "--volts", "24")
    assert result.exit_code == 0, result.output
    lines = result.output.splitlines()
    assert lines[0] == "Network: 1k + (2k2 || 4k7)  (3 parts)"
    assert any(line.split()[:2] == ["parts", "value"] for line in lines)
    assert any("A ──[1k]──┬─[2k2]─┬── B" in line for line in lines)


def test_check_yield_and_temperature(runner):
    result = run(runner, "check", "1k", "--spec", "0.5%", "--temp", "85", "--json")
    data = json.loads(result.stdout)
    # one ±1 % part, uniform: half of all builds land within ±0.5 % (analytic, uniform distribution)
    assert data["monte_carlo"]["yield"] == pytest.approx(0.5, abs=0.02)
    # 100 ppm/K (bin default) over 60 K: ±0.6 % (first order)
    assert data["at_temp"]["low_ohms"] == pytest.approx(994.0) and data["at_temp"]["high_ohms"] == pytest.approx(1006.0)


@pytest.mark.parametrize(
    "args, fragment",
    [
        (["check", "1k + 2k2 || 4k7"], "mixed"),
        (["check", "1k", "--volts", "1", "--amps", "1"], "only one"),
        (["check", "1k", "--duty", "10%"], "need an operating point"),
        (["check", "1k", "--volts", "abc"], "cannot read 'abc'"),
        (["make", "1k", "--watts", "1", "--derate", "2"], "--derate"),
        (["make", "1k", "--volts", "5", "--duty", "150%"], "duty"),
    ],
)
def test_bad_operating_input_is_one_line(runner, args, fragment):
    result = run(runner, *args)
    assert result.exit_code != 0
    assert fragment in result.output


def test_far_target_reaches_for_as_many_parts_as_its_value_needs(runner):
    result = run(runner, "make", "25m", "--json")
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    # the default bin's smallest value is 10 Ω: 25 mΩ needs 10 / 0.025 = 400 in parallel (hand arithmetic)
    assert data["value_parts"] == 400
    assert data["best"]["parts"] == 400 and abs(data["best"]["error"]) < 1e-12


def test_too_few_parts_for_the_value_names_the_count(runner):
    result = run(runner, "make", "25m", "-k", "100")
    assert result.exit_code == 1
    assert "--max-parts 100 is too small" in result.output and "at least 400 parts" in result.output


def test_stress_screening_marks_rows_honestly(runner):
    result = run(runner, "make", "3k37", "--volts", "24", "--json")
    data = json.loads(result.stdout)
    for row in data["frontier"]:
        assert all(p["watts"] <= p["limit_watts"] * (1 + 1e-9) for p in row["stress"])
    three = next(r for r in data["frontier"] if r["parts"] == 3)
    # 10 + 360 + 3k hits 3370 Ω exactly, but its 3 kΩ part would take (24/3370)² × 3000 = 0.152 W > 0.125 W
    # (Ohm's law; ¼ W × 50 %): the row is the best that passes, and not marked proven
    assert three["expression"] != "10 + 360 + 3k" and three["proven"] is False
