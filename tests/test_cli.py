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
