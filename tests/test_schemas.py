"""The shipped JSON Schemas (netsynth/schemas) hold for the real --json output of every command.

The schemas are written from the contract in netsynth/render/json.py's docstring (and, for
errors, netsynth/cli/shell.py's); validation uses the jsonschema package (Draft 2020-12).
"""

from __future__ import annotations

import copy
import json
from importlib.resources import files
from pathlib import Path

import jsonschema
import pytest
from click import Group

from netsynth.cli import cli

BINS = Path(__file__).resolve().parent.parent / "bins"


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


MAKE = [
    ["make", "3k37"],
    ["make", "3k37", "--within", "0.1%", "--alternatives", "0"],
    ["make", "1k234", "--series", "E12", "--range", "100..10k", "--qty", "2", "-k", "3"],
    ["make", "50k", "--series", "E12", "--range", "100..10k", "-k", "4"],  # out of reach with 4 parts
    ["make", "10", "--watts", "5", "--bin", str(BINS / "quarter-watt-kit.csv")],  # arrays, operating point
    ["make", "5", "--watts", "3", "--bin", str(BINS / "power-shelf.csv"), "-k", "3"],
    ["make", "1M8", "--volts", "1kV", "--series", "E24", "--range", "10k..1M", "--temp", "85", "--spec", "1%"],
]


@pytest.mark.parametrize("args", MAKE, ids=" ".join)
def test_make_output_matches_its_schema(runner, args):
    valid(output(runner, args), "make")


CHECK = [
    ["check", "1k + (2k2 || 4k7)"],
    ["check", "680 + 2k7", "--target", "3k37", "--spec", "0.5%", "--temp", "85"],
    ["check", "(100 + 100) || (100 + 100)", "--volts", "24", "--bin", str(BINS / "power-shelf.csv")],
    ["check", "470k + 470k + 470k + 470k", "--volts", "1kV", "--ambient", "50"],
    ["check", "20p(2s(100))", "--watts", "5"],
]


@pytest.mark.parametrize("args", CHECK, ids=" ".join)
def test_check_output_matches_its_schema(runner, args):
    valid(output(runner, args), "check")


def _bin_args(*rest: str) -> list[str]:
    # `bin FILE` today; `bin show FILE` once bin is a group of subcommands
    return ["bin", "show", *rest] if isinstance(cli.commands["bin"], Group) else ["bin", *rest]


@pytest.mark.parametrize("rest", [[], [str(BINS / "makerspace-drawer.csv")], [str(BINS / "precision-kit.csv")]])
def test_bin_output_matches_its_schema(runner, rest):
    valid(output(runner, _bin_args(*rest)), "bin")


ERRORS = [
    (["make", "3k37", "--within", "1k"], 2),  # usage: a bare value is no accuracy
    (["make", "4,7k"], 2),  # usage: a decimal comma is refused
    (["check", "1k +"], 1),  # parse
    (["check", "1k", "--bin", str(BINS / "no-such-bin.csv")], 1),  # stock: the file does not exist
    (["make", "10", "--watts", "100", "--bin", str(BINS / "quarter-watt-kit.csv"), "-k", "4"], 1),  # infeasible
]


@pytest.mark.parametrize("args, code", ERRORS, ids=[" ".join(a) for a, _ in ERRORS])
def test_error_output_matches_its_schema(runner, args, code):
    valid(output(runner, args, code), "error")


def test_schemas_reject_output_that_breaks_the_contract(runner):
    # the schemas can fail: a missing key, a wrong type, an unknown status are each refused
    made = output(runner, ["make", "10", "--watts", "5", "--bin", str(BINS / "quarter-watt-kit.csv")])
    broken = [copy.deepcopy(made) for _ in range(4)]
    del broken[0]["frontier"][0]["components"]
    broken[1]["best"]["parts"] = "40"
    broken[2]["status"] = "fine"
    del broken[3]["frontier"][0]["stress"]  # with an operating point every row has its stress
    for data in broken:
        with pytest.raises(jsonschema.ValidationError):
            valid(data, "make")
    checked = output(runner, ["check", "1k + 1k"])
    checked["stress"] = []  # no operating point: no stress
    with pytest.raises(jsonschema.ValidationError):
        valid(checked, "check")
    with pytest.raises(jsonschema.ValidationError):
        valid({"error": {"kind": "parse", "message": "two\nlines"}}, "error")


def test_every_shipped_schema_is_tested():
    # a schema added for a new command needs its own test above
    shipped = sorted(p.name for p in (files("netsynth") / "schemas").iterdir() if p.name.endswith(".schema.json"))
    assert shipped == ["bin.schema.json", "check.schema.json", "error.schema.json", "make.schema.json"]
