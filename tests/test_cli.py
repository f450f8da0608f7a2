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
    # one 1 kΩ part cannot come within 1 ppm of 1.234 kΩ: the closest answer, exit 0, and a line that says so
    result = run(runner, "make", "1k234", "--series", "E3", "--range", "1k..1k", "--qty", "1", "--within", "1ppm")
    assert result.exit_code == 0 and result.exception is None
    assert "Not within ±1 ppm" in result.output or "Not within ±0.0001 %" in result.output


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
    # 5 W over 0.125 W per derated ¼ W part: 40 parts (hand arithmetic)
    assert "at least 40 parts" in result.output and "allow 40 parts or more" in result.output


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
    # 24 V across 1k + (2k2 || 4k7) = 2498.55 Ω: 9.61 mA, 0.092 W in the 1k; 14.39 V and 0.094 W on the 2k2
    # (Ohm's law, P = I²R = V²/R, hand arithmetic)
    assert any("A ──[1k 0.092W]──┬─[2k2 0.094W]─┬── B" in line for line in lines)


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
    # 25 mΩ from parts of 10 Ω and up: 400 in parallel (10 / 400, hand arithmetic); with 100 parts the closest
    # answer and the count that reaches it
    result = run(runner, "make", "25m", "-k", "100")
    assert result.exit_code == 0 and result.exception is None
    assert "from 400 parts on" in result.output and "--max-parts 400" in result.output


def test_stress_screening_marks_rows_honestly(runner):
    result = run(runner, "make", "3k37", "--volts", "24", "--json")
    data = json.loads(result.stdout)
    for row in data["frontier"]:
        assert all(p["watts"] <= p["limit_watts"] * (1 + 1e-9) for p in row["stress"])
    three = next(r for r in data["frontier"] if r["parts"] == 3)
    # 10 + 360 + 3k hits 3370 Ω exactly, but its 3 kΩ part would take (24/3370)² × 3000 = 0.152 W > 0.125 W
    # (Ohm's law; ¼ W × 50 %): the row is the best that passes, and not marked proven
    assert three["expression"] != "10 + 360 + 3k" and three["proven"] is False


# ------------------------------------------------------------------ option values, exit codes, JSON errors


def invoke(runner, *args):
    """Run the command; never a traceback: either no exception or the SystemExit of an exit status."""
    result = runner.invoke(cli, list(args))
    assert result.exception is None or isinstance(result.exception, SystemExit), result.exception
    assert "Traceback" not in result.output
    return result


@pytest.mark.parametrize(
    "args, option, fragment",
    [
        (["make", "4k7k"], "'TARGET'", "cannot read '4k7k'"),
        (["make", "1k", "--within", "abc"], "'--within'", "cannot read 'abc'"),
        (["make", "1k", "--within", "0.001"], "'--within'", "add % or ppm"),  # fraction or percent? refused
        (["make", "1k", "--within", "1e-5"], "'--within'", "add % or ppm"),
        (["make", "1k", "--within", "150%"], "'--within'", "below 100 %"),
        (["make", "1k", "--spec", "2"], "'--spec'", "add % or ppm"),
        (["make", "1k", "--volts", "abc"], "'--volts'", "cannot read 'abc'"),
        (["make", "1k", "--amps", "-1"], "'--amps'", "greater than zero"),
        (["make", "1k", "--watts", "0W"], "'--watts'", "greater than zero"),
        (["make", "1k", "--volts", "5", "--duty", "150%"], "'--duty'", "duty cycle"),
        (["make", "1k", "--range", "1M..10"], "'--range'", "1M..10"),
        (["make", "1k", "--range", "10"], "'--range'", "LOW..HIGH"),
        (["make", "1k", "--ambient", "500"], "'--ambient'", "-100 to 300 °C"),
        (["make", "1k", "--ambient", "hot"], "'--ambient'", "cannot read 'hot'"),
        (["make", "1k", "--ambient", "-300"], "'--ambient'", "absolute zero"),  # 0 K = -273.15 °C (SI Brochure)
        (["make", "1k", "--temp", "85K"], "'--temp'", "cannot read '85K'"),
        (["make", "1k", "--temp", "2000"], "'--temp'", "at most 1000 °C"),
        (["make", "1k", "--derate", "2"], "'--derate'", "at most 1"),
        (["make", "1k", "--derate", "0"], "'--derate'", "above 0"),
        (["make", "1k", "--volt-derate", "150%"], "'--volt-derate'", "at most 1"),
        (["make", "1k", "--kit-tolerance", "100%"], "'--kit-tolerance'", "below 100 %"),
        (["make", "1k", "--kit-power", "0"], "'--kit-power'", "greater than zero"),
        (["make", "1k", "--kit-power", "abc"], "'--kit-power'", "cannot read 'abc'"),
        (["check", "1k", "--target", "abc"], "'--target'", "cannot read 'abc'"),
        (["check", "1k", "--temp", "warm"], "'--temp'", "cannot read 'warm'"),
        (["check", "1k", "--volts", "1kW"], "'--volts'", "cannot read '1kW'"),
        # an empty value is a mistake, not "the default"
        (["make", "1k", "--bin="], "'--bin'", "empty"),
        (["make", "1k", "--bin", ""], "'--bin'", "empty"),
        (["make", "1k", "--range", ""], "'--range'", "empty"),
        (["make", "1k", "--spec", ""], "'--spec'", "empty"),
        (["make", "1k", "--within", " "], "'--within'", "empty"),
        (["make", "1k", "--volts", ""], "'--volts'", "empty"),
        (["check", "1k", "--bin="], "'--bin'", "empty"),
        (["bin", ""], "'FILE'", "empty"),
    ],
)
def test_a_bad_option_value_is_a_usage_error(runner, args, option, fragment):
    result = invoke(runner, *args)
    assert result.exit_code == 2
    assert result.stdout == ""
    error_lines = [line for line in result.stderr.splitlines() if line.startswith("Error:")]
    assert len(error_lines) == 1
    assert error_lines[0].startswith(f"Error: Invalid value for {option}: ")
    assert fragment in error_lines[0]


@pytest.mark.parametrize(
    "args, fragment",
    [
        (["make", "1k", "--bin", "x.csv", "--kit-tolerance", "1%"], "not both"),
        (["make", "1k", "--bin", "x.csv", "--kit-power", "1W"], "not both"),
        (["make", "1k", "--volts", "1", "--watts", "1"], "only one"),
        (["make"], "Missing argument 'TARGET'"),
        (["make", "1k", "--no-such-option"], "No such option"),
        (["make", "--", "--json"], "Invalid value for 'TARGET'"),  # after --, "--json" is the target, not the flag
    ],
)
def test_other_usage_errors_exit_2_with_one_error_line(runner, args, fragment):
    result = invoke(runner, *args)
    assert result.exit_code == 2
    assert result.stdout == ""
    assert [line for line in result.stderr.splitlines() if line.startswith("Error:")] == [
        next(line for line in result.stderr.splitlines() if fragment in line)
    ]


@pytest.mark.parametrize(
    "args, fragment",
    [
        (["make", "1k", "--bin", "no-such-file.csv"], "no-such-file.csv"),
        (["check", "1k", "--bin", "no-such-file.csv"], "no-such-file.csv"),
        (["bin", "no-such-file.csv"], "no-such-file.csv"),
        (["check", "1k + 2k2 || 4k7"], "mixed"),
        (["make", "10", "--watts", "5", "--bin", str(BINS / "quarter-watt-kit.csv"), "-k", "10"], "at least 40 parts"),
    ],
)
def test_a_library_error_exits_1_with_one_line_on_stderr(runner, args, fragment):
    result = invoke(runner, *args)
    assert result.exit_code == 1
    assert result.stdout == ""
    assert result.stderr.startswith("Error: ") and fragment in result.stderr
    assert len(result.stderr.splitlines()) == 1


@pytest.mark.parametrize(
    "args, status, kind, fragment",
    [
        (["make", "4k7k", "--json"], 2, "usage", "cannot read '4k7k'"),
        (["make", "1k", "--json", "--within", "abc"], 2, "usage", "'--within'"),
        (["make", "1k", "--spec", "", "--json"], 2, "usage", "empty"),
        (["make", "1k", "--bin=", "--json"], 2, "usage", "empty"),
        (["make", "--json"], 2, "usage", "Missing argument 'TARGET'"),
        (["make", "1k", "--json", "--bin", "x.csv", "--series", "E12"], 2, "usage", "not both"),
        (["make", "1k", "--json", "--volts", "1", "--amps", "1"], 2, "usage", "only one"),
        (["make", "1k", "--json", "--jsn"], 2, "usage", "No such option"),
        (["check", "1k", "--json", "--duty", "10%"], 2, "usage", "need an operating point"),
        (["check", "1k", "--json", "--ambient", "400"], 2, "usage", "'--ambient'"),
        (["bin", "", "--json"], 2, "usage", "empty"),
        (["--json"], 2, "usage", "No such option"),
        (["make", "1k", "--bin", "no-such-file.csv", "--json"], 1, "stock", "no-such-file.csv"),
        (["check", "1k", "--bin", "no-such-file.csv", "--json"], 1, "stock", "no-such-file.csv"),
        (["bin", "no-such-file.csv", "--json"], 1, "stock", "no-such-file.csv"),
        (["check", "1k + 2k2 || 4k7", "--json"], 1, "parse", "mixed"),
        (["check", "1k +", "--json"], 1, "parse", "cannot read"),
        (["make", "10", "--watts", "5", "--bin", str(BINS / "quarter-watt-kit.csv"), "-k", "10", "--json"],
         1, "infeasible", "at least 40 parts"),
    ],
)
def test_json_errors_are_one_object_on_stdout(runner, args, status, kind, fragment):
    result = invoke(runner, *args)
    assert result.exit_code == status
    data = json.loads(result.stdout)  # the whole of stdout is one JSON object
    assert list(data) == ["error"]
    assert set(data["error"]) == {"kind", "message"}
    assert data["error"]["kind"] == kind
    message = data["error"]["message"]
    assert fragment in message and "\n" not in message and not message.startswith("Error:")
    assert result.stderr == ""


def test_json_error_for_a_bad_bin_row_names_file_line_and_field(runner, tmp_path):
    bad = tmp_path / "drawer.csv"
    bad.write_text("value,qty\n1k,5\n2k2,lots\n", encoding="utf-8")
    result = invoke(runner, "bin", str(bad), "--json")
    assert result.exit_code == 1
    error = json.loads(result.stdout)["error"]
    assert error["kind"] == "stock"
    assert "line 3" in error["message"] and "'qty'" in error["message"]


def test_within_accepts_an_exponent(runner):
    result = invoke(runner, "make", "3k37", "--within", "1e-5%", "--json")
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    assert data["within"] == 1e-7  # 1e-5 % = 1e-5 / 100 (hand arithmetic)
    # 3k + 360 + 10 = 3370 Ω exactly from E24 (IEC 60063; hand arithmetic): inside any accuracy
    assert data["best"]["error"] == 0


@pytest.mark.parametrize(
    "kit_args, stated",
    [
        ([], "1 % ¼ W"),  # the default bin's grade: 1 %, ¼ W
        (["--kit-tolerance", "0.1%"], "0.1 % ¼ W"),
        (["--kit-tolerance", "B", "--kit-power", "1W"], "0.1 % 1 W"),  # IEC 60062 letter B = ±0.1 %
        (["--kit-power", "250mW"], "1 % ¼ W"),
        (["--kit-power", "0.5"], "1 % ½ W"),
    ],
)
def test_kit_options_set_the_stated_tolerance_and_power(runner, kit_args, stated):
    result = invoke(runner, "make", "4k7", "--series", "E12", "--range", "1k..10k", "-k", "1", "--alternatives",
                    "0", *kit_args)
    assert result.exit_code == 0, result.output
    header = result.stdout.splitlines()[0]
    assert f"bin: kit E12 1 kΩ..10 kΩ, {stated}, unlimited" in header


def test_kit_options_alone_make_a_kit(runner):
    result = invoke(runner, "make", "4k7", "--kit-tolerance", "0.5%", "-k", "1", "--json")
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    assert data["bin"].startswith("kit E24 10 Ω..1 MΩ, 0.5 % ")  # E24 10..1M, the kit defaults
    assert data["best"]["expression"] == "4k7"  # 4.7 is an E24 value (IEC 60063)


@pytest.mark.parametrize("spelling", ["-40", "-40C", "-40 °C", "-4e1"])
def test_temperatures_take_plain_negative_numbers(runner, spelling):
    result = invoke(runner, "check", "1k", "--temp", spelling, "--json")
    assert result.exit_code == 0, result.output
    band = json.loads(result.stdout)["at_temp"]
    # 100 ppm/K (bin default) over 25 - (-40) = 65 K: ±0.65 % of 1 kΩ (first order, hand arithmetic)
    assert band["low_ohms"] == pytest.approx(993.5) and band["high_ohms"] == pytest.approx(1006.5)


def test_ambient_takes_a_negative_number(runner):
    result = invoke(runner, "check", "1k", "--volts", "5", "--ambient", "-40", "--json")
    assert result.exit_code == 0, result.output
    assert json.loads(result.stdout)["operating_point"]["ambient_c"] == -40.0


@pytest.mark.parametrize("derate", ["0.25", "25%", "25 %"])
def test_derate_takes_a_fraction_or_a_percentage(runner, derate):
    result = invoke(runner, "check", "1k", "--volts", "5", "--derate", derate, "--json")
    assert result.exit_code == 0, result.output
    # ¼ W (bin default) × 0.25 = 0.0625 W below 70 °C (IEC 60115-1 style line; hand arithmetic)
    assert json.loads(result.stdout)["stress"][0]["limit_watts"] == pytest.approx(0.0625)


def test_help_teaches_units_and_examples(runner):
    make_help = invoke(runner, "make", "--help")
    assert make_help.exit_code == 0
    for text in ("--kit-tolerance", "--kit-power", "1e-5%", "1/4W", "10..1M", "Exit status"):
        assert text in make_help.stdout
    check_help = invoke(runner, "check", "--help")
    assert check_help.exit_code == 0
    for text in ("85C", "1.5 kV", "150mA", "50%"):
        assert text in check_help.stdout


def test_lazy_command_table_matches_the_commands():
    # `netsynth --help` lists commands from cli.lazy without importing them: each entry must name the
    # module that really registers the command, and show that command's own one-line help
    import click

    from netsynth.cli import cli as group

    for name in sorted(group.lazy):
        command = group.get_command(None, name)
        assert command is not None, name
        assert command.callback.__module__ == group.lazy[name][0] or isinstance(command, click.Group), name
        assert command.get_short_help_str(limit=10**6) == group.lazy[name][1], name


def test_help_imports_no_command_module():
    import subprocess
    import sys

    code = ("import sys; from netsynth.cli import main\n"
            "try:\n    main()\nexcept SystemExit:\n    pass\n"
            "print(sorted(m for m in sys.modules if m.startswith('netsynth.cli.') and m != 'netsynth.cli.shell'),"
            " file=sys.stderr)")
    out = subprocess.run([sys.executable, "-c", code, "--help"], capture_output=True, text=True, check=True)
    assert "Commands:" in out.stdout and "make" in out.stdout
    assert out.stderr.strip() == "[]"


def test_help_lists_the_lazy_commands_as_click_would():
    # the command list netsynth --help prints from its table (no command module loaded) equals the one
    # printed once every command module is loaded (each command's own help, shortened by click)
    import os
    import subprocess
    import sys

    from netsynth.cli import cli as group

    modules = sorted({module for module, _ in group.lazy.values()})
    eager = "; ".join(f"import {m}" for m in modules) + "; from netsynth.cli import main; main()"
    env = {**os.environ, "COLUMNS": "80"}
    outputs = [subprocess.run([sys.executable, "-c", code, "--help"], capture_output=True, text=True, env=env,
                              check=True).stdout
               for code in ("from netsynth.cli import main; main()", eager)]
    assert outputs[0].split("Commands:")[1] == outputs[1].split("Commands:")[1]
