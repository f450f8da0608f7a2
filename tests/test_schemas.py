"""The shipped JSON Schemas (netsynth/schemas) hold for the real --json output of every command.

The schemas are written from the contracts in the docstrings of netsynth/render/json.py (make,
check, check --netlist), netsynth/render/divider.py (divider, rc), netsynth/cli/jobs.py (shunt,
multiplier, sensor, trim), netsynth/render/board.py (plan) and netsynth/cli/bench.py (bin show,
check, take, add); errors follow netsynth/cli/shell.py. Validation uses the jsonschema package
(Draft 2020-12). Every schema is checked against at least two real outputs and shown to refuse a
broken one. The job schemas (rc, shunt, multiplier, sensor, trim) each carry a copy of the make
schema, so that every file validates on its own; a test keeps the copies equal to make's.
"""

from __future__ import annotations

import copy
import json
import shutil
from collections.abc import Callable
from importlib.resources import files
from pathlib import Path
from typing import Any

import jsonschema
import pytest
from click.testing import CliRunner

from netsynth.cli import cli

BINS = Path(__file__).resolve().parent.parent / "bins"

#: every file in netsynth/schemas; a schema added for a new command needs its outputs and a broken case below
SHIPPED = [
    "bin", "bin-add", "bin-check", "bin-take", "check", "divider", "error", "make", "multiplier", "plan", "rc",
    "sensor", "shunt", "trim",
]


def schema(name: str) -> dict:
    text = (files("netsynth") / "schemas" / f"{name}.schema.json").read_text(encoding="utf-8")
    s = json.loads(text)
    jsonschema.Draft202012Validator.check_schema(s)
    return s


def output(runner, args: list[str], exit_code: int = 0) -> dict:
    result = runner.invoke(cli, [*args, "--json"])
    if exit_code == 0:
        assert result.exception is None, result.output
    else:
        assert isinstance(result.exception, SystemExit)
    assert result.exit_code == exit_code, result.output
    return json.loads(result.stdout)


def valid(data: dict, name: str) -> None:
    jsonschema.Draft202012Validator(schema(name)).validate(data)


# ------------------------------------------------------------------ input files

BRIDGE = """Wheatstone bridge (Lessons In Electric Circuits Vol. I ch. 10 values)
R1 A C 12
R2 A D 18
R3 C D 6
R4 C B 18
R5 D B 12
"""
EDGES = "from,to,value\nA,C,4k7\nC,B,0R47\nC,D,1k\nA,B,10k\n"  # series/parallel between A and B; C-D dangles
COUNTED = "value,qty,tolerance,location\n10k,,1%,tray 1\n4k7,5,5%,tray 2\n"  # one line with a blank qty


@pytest.fixture(scope="module")
def paths(tmp_path_factory) -> dict[str, str]:
    """Files the commands read or edit, in a temporary folder: the demo bins are never touched.

    ``drawer`` is read only (dry runs); ``drawer_take`` and ``drawer_add`` are each written once.
    """
    folder = tmp_path_factory.mktemp("schemas")
    out = {}
    for name in ("drawer", "drawer_take", "drawer_add"):
        out[name] = str(shutil.copy(BINS / "makerspace-drawer.csv", folder / f"{name}.csv"))
    for name, text in (("bridge", BRIDGE), ("edges", EDGES), ("counted", COUNTED)):
        path = folder / {"bridge": "bridge.cir", "edges": "net.csv", "counted": "counted.csv"}[name]
        path.write_text(text, encoding="utf-8")
        out[name] = str(path)
    return out


_SEEN: dict[tuple[str, ...], dict] = {}


def run(args: list[str], paths: dict[str, str]) -> dict:
    """The --json output of `args` ("{drawer}" and the like name the files of `paths`), run once per session."""
    key = tuple(a.format(**paths) for a in args)
    if key not in _SEEN:
        _SEEN[key] = output(CliRunner(), list(key))
    return copy.deepcopy(_SEEN[key])


# ------------------------------------------------------------------ real outputs

MAKE = [
    ["make", "3k37"],
    ["make", "3k37", "--within", "0.1%", "--alternatives", "0"],
    ["make", "1k234", "--series", "E12", "--range", "100..10k", "--qty", "2", "-k", "3"],
    ["make", "50k", "--series", "E12", "--range", "100..10k", "-k", "4"],  # out of reach with 4 parts
    ["make", "10", "--watts", "5", "--bin", str(BINS / "quarter-watt-kit.csv")],  # arrays, CP-SAT row, operating point
    ["make", "5", "--watts", "3", "--bin", str(BINS / "power-shelf.csv"), "-k", "3"],
    ["make", "1M8", "--volts", "1kV", "--series", "E24", "--range", "10k..1M", "--temp", "85", "--spec", "1%"],
]
CHECK = [
    ["check", "1k + (2k2 || 4k7)"],
    ["check", "680 + 2k7", "--target", "3k37", "--spec", "0.5%", "--temp", "85"],
    ["check", "(100 + 100) || (100 + 100)", "--volts", "24", "--bin", str(BINS / "power-shelf.csv")],
    ["check", "470k + 470k + 470k + 470k", "--volts", "1kV", "--ambient", "50"],
    ["check", "20p(2s(100))", "--watts", "5"],
    ["check", "--netlist", "{bridge}", "--between", "A", "B", "--volts", "10"],  # a bridge: expression null
    ["check", "--netlist", "{edges}", "--between", "A", "B"],  # series/parallel, a dangling part
]
DIVIDER = [
    ["divider", "--vref", "0.8", "--vout", "3.3", "--total", "50k..200k"],
    ["divider", "--ratio", "0.1", "--bin", str(BINS / "precision-kit.csv")],
    ["divider", "--vref", "1.25", "--vout", "5", "--pin-current", "0.1uA", "--vref-tol", "1%"],
    ["divider", "--vin", "12", "--vout", "3.3", "--total", "10k..100k", "-k", "3", "--min-current", "100uA"],
]
RC = [
    ["rc", "--tau", "1ms", "--cap", "100n"],
    ["rc", "--corner", "1kHz", "--cap", "4n7", "--cap-tol", "5%", "-k", "3"],
    ["rc", "--tau", "2.5s", "--cap", "220uF", "--bin", str(BINS / "makerspace-drawer.csv")],
]
SHUNT = [
    ["shunt", "100mA", "--movement", "1mA", "--movement-ohms", "500"],
    ["shunt", "1A", "--movement", "1mA", "--movement-ohms", "500", "--bin", str(BINS / "power-shelf.csv")],
    ["shunt", "100mA,1A", "--movement", "1mA", "--movement-ohms", "500"],  # a ring
    ["shunt", "10mA,100mA", "--movement", "50uA", "--movement-ohms", "1k5", "--series", "E12", "--range", "1..10k"],
]
MULTIPLIER = [
    ["multiplier", "30V", "--movement", "50uA", "--movement-ohms", "1k5"],
    ["multiplier", "300V", "--movement", "1mA", "--movement-ohms", "500", "--bin", str(BINS / "makerspace-drawer.csv")],
    ["multiplier", "1,10", "--movement", "1mA", "--movement-ohms", "500"],  # a chain
]
SENSOR = [
    ["sensor", "pt100", "37"],
    ["sensor", "pt1000", "0", "25", "--bin", str(BINS / "precision-kit.csv")],  # a ladder
    ["sensor", "ntc", "25", "60", "--r25", "10k", "--beta", "3950"],
]
TRIM = [
    ["trim", "10.02k", "10k"],
    ["trim", "8.635", "8.5", "--base-uncertainty", "0.05%"],
    ["trim", "4k98", "4k99", "--mode", "series", "--bin", str(BINS / "precision-kit.csv"), "-k", "3"],
]
PLAN = [
    ["plan", str(BINS / "board-needs.csv"), "--bin", str(BINS / "makerspace-drawer.csv")],
    ["plan", str(BINS / "board-needs.csv"), "--series", "E12", "--range", "10..1M", "--qty", "3", "-k", "3"],
]
BIN = [
    ["bin", "show"],
    ["bin", "show", str(BINS / "makerspace-drawer.csv")],
    ["bin", str(BINS / "precision-kit.csv")],  # `bin FILE` is `bin show FILE`
    ["bin", "show", "{counted}"],
]
BIN_CHECK = [
    ["bin", "check", str(BINS / "makerspace-drawer.csv")],
    ["bin", "check", str(BINS / "power-shelf.csv")],
    ["bin", "check", "{counted}"],
]
BIN_TAKE = [
    ["bin", "take", "{drawer}", "--network", "10 + 22 + 1k", "--dry-run"],
    ["bin", "take", "{drawer}", "--network", "2p(10)", "--dry-run"],
    ["bin", "take", "{drawer_take}", "--network", "2p(10)", "--yes"],  # written, with a backup
]
BIN_ADD = [
    ["bin", "add", "{drawer}", "4k7", "--qty", "10", "--dry-run"],
    ["bin", "add", "{drawer}", "1M5", "--qty", "2", "--dry-run"],  # a new row
    ["bin", "add", "{drawer_add}", "2k2", "--qty", "5", "--tolerance", "5%", "--location", "drawer A4", "--yes"],
]

OUTPUTS: dict[str, list[list[str]]] = {
    "make": MAKE, "check": CHECK, "divider": DIVIDER, "rc": RC, "shunt": SHUNT, "multiplier": MULTIPLIER,
    "sensor": SENSOR, "trim": TRIM, "plan": PLAN, "bin": BIN, "bin-check": BIN_CHECK, "bin-take": BIN_TAKE,
    "bin-add": BIN_ADD,
}
CASES = [(name, args) for name, runs in OUTPUTS.items() for args in runs]


def shown(args: list[str]) -> str:
    """A test id: the command line, the demo bins as bins/NAME."""
    return " ".join(args).replace(str(BINS), "bins")


@pytest.mark.parametrize("name, args", CASES, ids=[f"{n}: {shown(a)}" for n, a in CASES])
def test_output_matches_its_schema(name, args, paths):
    valid(run(args, paths), name)


def test_bin_edits_in_the_tests_touch_only_their_copies(paths):
    # the written cases edit temporary copies; the dry runs leave theirs as they were
    for name in ("bin-take", "bin-add"):
        for args in OUTPUTS[name]:
            run(args, paths)
    assert Path(paths["drawer"]).read_bytes() == (BINS / "makerspace-drawer.csv").read_bytes()
    for name in ("drawer_take", "drawer_add"):
        assert Path(paths[name]).read_bytes() != (BINS / "makerspace-drawer.csv").read_bytes()
        assert Path(paths[name] + ".bak").read_bytes() == (BINS / "makerspace-drawer.csv").read_bytes()


ERRORS = [
    (["make", "3k37", "--within", "1k"], 2),  # usage: a bare value is no accuracy
    (["make", "4,7k"], 2),  # usage: a decimal comma is refused
    (["check", "1k +"], 1),  # parse
    (["check", "1k", "--bin", str(BINS / "no-such-bin.csv")], 1),  # stock: the file does not exist
    (["make", "10", "--watts", "100", "--bin", str(BINS / "quarter-watt-kit.csv"), "-k", "4"], 1),  # infeasible
    (["bin", "take", "{drawer}", "--network", "10 + 22"], 2),  # usage: with --json, --dry-run or --yes
    (["divider", "--ratio", "0.1", "--vout", "3"], 2),  # usage: two goals
]


@pytest.mark.parametrize("args, code", ERRORS, ids=[shown(a) for a, _ in ERRORS])
def test_error_output_matches_its_schema(runner, args, code, paths):
    valid(output(runner, [a.format(**paths) for a in args], code), "error")


# ------------------------------------------------------------------ broken outputs are refused


def drop(*path: Any) -> Callable[[dict], None]:
    """Delete the key at `path`."""
    def edit(data: dict) -> None:
        for step in path[:-1]:
            data = data[step]
        del data[path[-1]]
    return edit


def put(*path: Any) -> Callable[[dict], None]:
    """Set the place at `path[:-1]` to `path[-1]`."""
    def edit(data: dict) -> None:
        *where, value = path
        for step in where[:-1]:
            data = data[step]
        data[where[-1]] = value
    return edit


_MADE = MAKE[4]  # operating point, arrays and a CP-SAT row
BROKEN = [
    ("make", _MADE, drop("frontier", 0, "components"), "a row without its components"),
    ("make", _MADE, put("best", "parts", "40"), "a count as a string"),
    ("make", _MADE, put("status", "fine"), "an unknown status"),
    ("make", _MADE, drop("frontier", 0, "stress"), "a row without stress, with an operating point"),
    ("make", _MADE, drop("frontier", 1, "fewest"), "a row without fewest"),
    ("make", _MADE, put("frontier", 0, "status_note", None), "a status note that is no string"),
    ("make", MAKE[0], drop("pick_list", 0, "rkm"), "a pick entry without its RKM code"),
    ("make", MAKE[0], put("pick_list", 0, "bands", ["brown", "black", "gold"]), "three colour bands"),
    ("make", MAKE[0], put("pick_list", 0, "eia96", "1C"), "an EIA-96 code of two characters"),
    ("make", MAKE[0], put("within_met", True), "within_met without within"),
    ("make", MAKE[0], drop("reach"), "no reach"),
    ("check", ["check", "1k + 1k"], put("stress", []), "stress without an operating point"),
    ("check", ["check", "1k + 1k"], put("expression", None), "a null expression without a netlist"),
    ("check", CHECK[5], drop("netlist", "elements"), "a netlist without its elements"),
    ("check", CHECK[6], put("expression", None), "a null expression for a series/parallel netlist"),
    ("check", CHECK[6], put("netlist", "format", "csv"), "an unknown netlist format"),
    ("divider", DIVIDER[0], drop("best", "top"), "a pair without its top arm"),
    ("divider", DIVIDER[0], drop("frontier", 0, "vout"), "a row without vout when a voltage was given"),
    ("divider", DIVIDER[1], put("frontier", 0, "vout", 1.0), "a vout for a bare ratio"),
    ("divider", DIVIDER[1], put("total_ohms", [1.0]), "a window of one number"),
    ("rc", RC[0], drop("rc", "tau_s"), "--tau without tau_s"),
    ("rc", RC[1], drop("review"), "the make object without its review"),
    ("shunt", SHUNT[0], drop("full_scale_error"), "no full-scale error"),
    ("shunt", SHUNT[0], put("job", "multiplier"), "another job"),
    ("shunt", SHUNT[2], drop("networks", 0, "tap_ohms"), "a ring section without its tap"),
    ("shunt", SHUNT[2], drop("networks", 1, "frontier"), "a ring section that is no make object"),
    ("multiplier", MULTIPLIER[0], drop("range_volts"), "no range"),
    ("multiplier", MULTIPLIER[2], put("networks", 0, "section", 0), "a section numbered from 0"),
    ("sensor", SENSOR[0], put("reads_as_band_c", [37.0]), "a band of one temperature"),
    ("sensor", SENSOR[1], drop("networks", 1, "pick_list"), "a ladder step that is no make object"),
    ("trim", TRIM[0], put("trim", "mode", "auto"), "a mode that is neither series nor parallel"),
    ("trim", TRIM[0], drop("trim"), "no trim object"),
    ("plan", PLAN[0], drop("targets", 0, "components"), "a served need without its components"),
    ("plan", PLAN[0], put("targets", 0, "served", False), "a need not served, without a reason"),
    ("plan", PLAN[1], put("bound", 0.5), "a bound on an optimal plan"),
    ("bin", BIN[1], put("items", 0, "qty", -1), "a negative count"),
    ("bin", BIN[1], drop("items", 0, "line"), "an item without its line"),
    ("bin-check", BIN_CHECK[0], put("ok", False), "ok false"),
    ("bin-check", BIN_CHECK[0], drop("unlimited_lines"), "no count of unlimited lines"),
    ("bin-take", BIN_TAKE[0], put("written", True), "written on a dry run"),
    ("bin-take", BIN_TAKE[2], put("backup", None), "written without a backup"),
    ("bin-take", BIN_TAKE[0], drop("take"), "no take list"),
    ("bin-add", BIN_ADD[0], put("changes", 0, "before", None), "a counted row with no count before"),
    ("bin-add", BIN_ADD[1], put("changes", 0, "before", 0), "an appended row with a count before"),
    ("bin-add", BIN_ADD[2], drop("changes"), "no changes"),
]


@pytest.mark.parametrize("name, args, edit, why", BROKEN, ids=[f"{b[0]}: {b[3]}" for b in BROKEN])
def test_schemas_reject_output_that_breaks_the_contract(name, args, edit, why, paths):
    data = run(args, paths)
    valid(data, name)  # the real output holds ...
    edit(data)
    with pytest.raises(jsonschema.ValidationError):  # ... the broken one does not
        valid(data, name)


def test_error_schema_rejects_a_broken_error():
    valid({"error": {"kind": "parse", "message": "one line"}}, "error")
    for broken in ({"error": {"kind": "parse", "message": "two\nlines"}},
                   {"error": {"kind": "oops", "message": "one line"}},
                   {"error": {"kind": "parse", "message": "one line"}, "value_ohms": 1.0}):
        with pytest.raises(jsonschema.ValidationError):
            valid(broken, "error")


# ------------------------------------------------------------------ the set of schemas


def test_every_shipped_schema_is_tested():
    # each file: at least two real outputs and a broken one refused (the error schema has its own tests)
    shipped = sorted(p.name for p in (files("netsynth") / "schemas").iterdir() if p.name.endswith(".schema.json"))
    assert shipped == sorted(f"{name}.schema.json" for name in SHIPPED)
    for name in SHIPPED:
        if name == "error":
            assert len(ERRORS) >= 2
            continue
        assert len(OUTPUTS[name]) >= 2, name
        assert any(b[0] == name for b in BROKEN), name
    assert not [p.name for p in (files("netsynth") / "schemas").iterdir() if p.name.endswith(".json")
                and not p.name.endswith(".schema.json")]


JOBS = ["rc", "shunt", "multiplier", "sensor", "trim"]


@pytest.mark.parametrize("name", JOBS)
def test_the_make_object_in_a_job_schema_is_make_schema(name):
    # a job's schema embeds the make schema (so each file stands alone): the copy must stay equal
    make, job = schema("make"), schema(name)
    body = {k: v for k, v in make.items() if k not in ("$schema", "title", "description", "$defs")}
    embedded = {k: v for k, v in job["$defs"]["make"].items() if k != "description"}
    assert embedded == body
    for key, definition in make["$defs"].items():
        assert job["$defs"][key] == definition, key


@pytest.mark.parametrize("name", ["divider", "plan"])
def test_shared_definitions_are_make_schema_s(name):
    make, other = schema("make"), schema(name)
    for key in ("component", "stress_entry", "verification"):
        if key in other["$defs"]:
            assert other["$defs"][key] == make["$defs"][key], key
