"""Every limit of netsynth.limits, just inside (works) and just outside (one clear line).

Each row gives the input at the edge; the expected values come from the limits as documented
in the README ("## Limits"), not from running the code. The fuzz suite (test_fuzz.py) covers
the space between; benchmarks/limits_check.py measures time and memory at the largest inputs.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from netsynth import limits
from netsynth.analysis.conditions import Derating, OperatingPoint
from netsynth.api import check
from netsynth.cli import cli
from netsynth.errors import ArgumentError, StockError, ValueParseError
from netsynth.inputs import as_factor, as_fraction, as_ohms, as_temp_c
from netsynth.network import Part, from_text, levels, parallel, part_count, series
from netsynth.nodal import Edge, equivalent_resistance
from netsynth.stock import StockItem, load_bin
from netsynth.values import (
    format_error,
    format_ohms,
    parse_current,
    parse_duty,
    parse_power,
    parse_ratio,
    parse_resistance,
    parse_tcr,
    parse_voltage,
)


def _one_line(exc: BaseException) -> str:
    message = str(exc)
    assert "\n" not in message and len(message) < 300, message
    return message


# ------------------------------------------------------------------ text parsers

# (parser, just inside, its value, just outside, a fragment of the refusal)
PARSERS = [
    (parse_resistance, "1e-6", 1e-6, "0.99e-6", "1 µΩ to 1 TΩ"),  # MIN_OHMS
    (parse_resistance, "0.001m", 1e-6, "0.00099m", "1 µΩ to 1 TΩ"),  # the same, with a prefix
    (parse_resistance, "1e12", 1e12, "1.01e12", "1 µΩ to 1 TΩ"),  # MAX_OHMS
    (parse_resistance, "1000G", 1e12, "1001G", "1 µΩ to 1 TΩ"),
    (parse_voltage, "1e-6", 1e-6, "0.9e-6", "1 µV to 1 MV"),  # MIN_VOLTS
    (parse_voltage, "1000kV", 1e6, "1001kV", "1 µV to 1 MV"),  # MAX_VOLTS
    (parse_current, "1e-12", 1e-12, "0.9e-12", "1 pA to 10 kA"),  # MIN_AMPS
    (parse_current, "10000A", 1e4, "10001A", "1 pA to 10 kA"),  # MAX_AMPS
    (parse_power, "1e-12", 1e-12, "0.9e-12", "1 pW to 1 MW"),  # MIN_WATTS
    (parse_power, "1000kW", 1e6, "1001kW", "1 pW to 1 MW"),  # MAX_WATTS
    (parse_duty, "0.0001%", 1e-6, "0.00009%", "1 ppm to 100 %"),  # MIN_DUTY
    (parse_ratio, "1e-10%", 1e-12, "0.9e-10%", "1e-12"),  # MIN_FRACTION (a non-zero accuracy)
    (parse_tcr, "10000", 1e4, "10001", "1e4 ppm/K"),  # MAX_TCR_PPM
    (parse_tcr, "0.000001", 1e-6, "0.0000009", "1e-6"),  # MIN_TCR_PPM (non-zero)
    (parse_resistance, "0" * 63 + "1", 1.0, "0" * 64 + "1", "at most 64 characters"),  # MAX_VALUE_CHARS
]


@pytest.mark.parametrize("parse, inside, value, outside, fragment", PARSERS)
def test_text_parsers_at_their_limits(parse, inside, value, outside, fragment):
    assert parse(inside) == pytest.approx(value, rel=1e-12)
    with pytest.raises(ValueParseError) as info:
        parse(outside)
    assert fragment in _one_line(info.value)


@pytest.mark.parametrize("text", ["1e-320", "1e300", "1e99999999999", "9" * 5000, "-1e-320"])
def test_extreme_spellings_end_in_one_short_line(text):
    for parse in (parse_resistance, parse_voltage, parse_current, parse_power):
        with pytest.raises(ValueParseError) as info:
            parse(text)
        assert len(_one_line(info.value)) < 160


# ------------------------------------------------------------------ API numbers

API = [
    (lambda x: as_ohms(x), 1e-6, 0.99e-6, "1 µΩ to 1 TΩ"),
    (lambda x: as_ohms(x), 1e12, 1.01e12, "1 µΩ to 1 TΩ"),
    (lambda x: Part(x), 1e-6, 0.99e-6, "1 µΩ to 1 TΩ"),
    (lambda x: Part(x), 1e12, 1.01e12, "1 µΩ to 1 TΩ"),
    (lambda x: OperatingPoint(volts=x), 1e-6, 0.99e-6, "1 µV to 1 MV"),
    (lambda x: OperatingPoint(volts=x), 1e6, 1.01e6, "1 µV to 1 MV"),
    (lambda x: OperatingPoint(amps=x), 1e-12, 0.99e-12, "1 pA to 10 kA"),
    (lambda x: OperatingPoint(amps=x), 1e4, 1.01e4, "1 pA to 10 kA"),
    (lambda x: OperatingPoint(watts=x), 1e-12, 0.99e-12, "1 pW to 1 MW"),
    (lambda x: OperatingPoint(watts=x), 1e6, 1.01e6, "1 pW to 1 MW"),
    (lambda x: OperatingPoint(volts=1.0, duty=x), 1e-6, 0.99e-6, "1 ppm"),
    (lambda x: OperatingPoint(volts=1.0, ambient_c=x), -100.0, -100.1, "-100 to 300"),  # MIN_AMBIENT_C
    (lambda x: OperatingPoint(volts=1.0, ambient_c=x), 300.0, 300.1, "-100 to 300"),  # MAX_AMBIENT_C
    (lambda x: Derating(x, 0.8), 0.01, 0.0099, "at least 0.01"),  # MIN_DERATE
    (lambda x: as_factor(x, "power_factor"), 0.01, 0.0099, "at least 0.01"),
    (lambda x: as_fraction(x, "within"), 1e-12, 0.9e-12, "1e-12"),
    (lambda x: as_temp_c(x, "temp_c"), 1000.0, 1000.1, "at most 1000"),  # MAX_TEMP_C
    (lambda x: as_temp_c(x, "temp_c"), -273.14, -273.15, "absolute zero"),  # ABSOLUTE_ZERO_C
    (lambda x: StockItem(x), 1e-6, 0.99e-6, "1 µΩ to 1 TΩ"),
    (lambda x: StockItem(1.0, count=x), 10**6, 10**6 + 1, "at most 1000000"),  # MAX_QTY
    (lambda x: StockItem(1.0, power_rating_w=x), 1e-3, 0.99e-3, "1 mW to 1 MW"),  # MIN_RATING_W
    (lambda x: StockItem(1.0, tcr_ppm=x), 1e4, 1.01e4, "ppm/K"),
]


@pytest.mark.parametrize("build, inside, outside, fragment", API)
def test_api_arguments_at_their_limits(build, inside, outside, fragment):
    build(inside)
    with pytest.raises((ArgumentError, StockError)) as info:
        build(outside)
    assert fragment in _one_line(info.value)


@pytest.mark.parametrize("x", [10**400, -(10**400), 2**2000])
def test_huge_integers_are_refused_not_overflowed(x):
    for build in (lambda: as_ohms(x), lambda: OperatingPoint(volts=x), lambda: as_temp_c(x, "temp_c")):
        with pytest.raises(ArgumentError) as info:
            build()
        _one_line(info.value)


# ------------------------------------------------------------------ networks


def test_part_count_limit_in_text_and_in_code():
    assert part_count(from_text(f"{limits.MAX_PARTS}s(1k)")) == limits.MAX_PARTS
    with pytest.raises(ValueParseError, match=f"more than {limits.MAX_PARTS} parts"):
        from_text(f"{limits.MAX_PARTS + 1}s(1k)")
    assert part_count(series(*[1.0] * limits.MAX_PARTS)) == limits.MAX_PARTS
    with pytest.raises(ArgumentError, match=f"up to {limits.MAX_PARTS} parts"):
        series(*[1.0] * (limits.MAX_PARTS + 1))


def _alternating(depth: int) -> str:
    """A network nested `depth` parentheses deep, each adding one series/parallel level."""
    half = depth // 2
    return "1k + (1k || (" * half + "1k" + "))" * half


def test_nesting_limit_in_text():
    text = _alternating(limits.MAX_NESTING)
    assert text.count("(") == limits.MAX_NESTING
    assert levels(from_text(text)) == limits.MAX_LEVELS
    with pytest.raises(ValueParseError, match="nested more than"):
        from_text("(" * (limits.MAX_NESTING + 1) + "1k" + ")" * (limits.MAX_NESTING + 1))
    # 100 parentheses around 101 levels: the tree's own depth limit, as a parse error
    with pytest.raises(ValueParseError, match="nested more than"):
        from_text("1k + (1k || (" * 50 + "1k + 1k" + "))" * 50)


def test_a_network_built_in_code_5000_deep_is_refused_with_an_argument_error():
    net = Part(1.0)
    with pytest.raises(ArgumentError) as info:
        for i in range(5000):
            net = series(net, 1.0) if i % 2 else parallel(net, 1.0)
    assert "levels" in _one_line(info.value)
    assert levels(net) == limits.MAX_LEVELS  # the deepest that may exist, and it works:
    candidate, review = check(net)
    assert candidate.verified_ohms == pytest.approx(candidate.value_ohms, rel=1e-9)


def test_expression_length_limit():
    padded = "1k" + " " * (limits.MAX_EXPRESSION_CHARS - 2)
    assert from_text(padded) == Part(1000.0)
    with pytest.raises(ValueParseError) as info:
        from_text(padded + " ")
    assert f"up to {limits.MAX_EXPRESSION_CHARS} characters" in _one_line(info.value)


def test_the_largest_network_is_checked_with_its_stress():
    # 10 000 parts: the nodal check is sparse (a dense matrix would be 800 MB)
    candidate, review = check(f"{limits.MAX_PARTS}s(1k)", point=OperatingPoint(volts=10.0), spec="1%")
    assert candidate.verified_ohms == pytest.approx(1e7, rel=1e-12)  # 10 000 × 1 kΩ
    assert review.stress.watts == pytest.approx(1e-5, rel=1e-9)  # (10 V)² / 10 MΩ


# ------------------------------------------------------------------ the nodal solver


def _chain(n: int) -> list[Edge]:
    return [Edge(i, i + 1, 1.0) for i in range(n)]


def test_netlist_size_limits():
    edges = _chain(limits.MAX_NETLIST_EDGES)
    assert equivalent_resistance(edges, limits.MAX_NETLIST_NODES, 0, limits.MAX_NETLIST_EDGES) == pytest.approx(1e4)
    with pytest.raises(ArgumentError, match="edges"):
        equivalent_resistance(_chain(limits.MAX_NETLIST_EDGES + 1), limits.MAX_NETLIST_NODES + 1)
    with pytest.raises(ArgumentError, match="nodes"):
        equivalent_resistance([Edge(0, 1, 1.0)], limits.MAX_NETLIST_NODES + 1)


def _grid(width: int) -> tuple[list[Edge], int]:
    edges = []
    for i in range(width):
        for j in range(width):
            if j + 1 < width:
                edges.append(Edge(i * width + j, i * width + j + 1, 1.0))
            if i + 1 < width:
                edges.append(Edge(i * width + j, (i + 1) * width + j, 1.0))
    return edges, width * width


def test_a_netlist_whose_elimination_would_fill_gigabytes_is_refused():
    edges, nodes = _grid(70)  # 9660 edges: within the edge limit, but a 2-D mesh fills in
    with pytest.raises(ArgumentError, match="too densely connected"):
        equivalent_resistance(edges, nodes, 0, nodes - 1)


def test_the_sparse_solve_agrees_with_the_dense_one(monkeypatch):
    import netsynth.nodal as nodal

    edges, nodes = _grid(12)  # not series/parallel: a mesh (144 nodes)
    sparse = equivalent_resistance(edges, nodes, 0, nodes - 1)
    monkeypatch.setattr(nodal, "DENSE_NODES", 10**6)
    dense = equivalent_resistance(edges, nodes, 0, nodes - 1)
    assert sparse == pytest.approx(dense, rel=1e-14)


# ------------------------------------------------------------------ bin files

HEADER = "value,qty\n"


def _bin(tmp_path: Path, text: str) -> Path:
    path = tmp_path / "b.csv"
    path.write_bytes(text.encode("utf-8"))
    return path


def _padded(size: int) -> str:
    """A valid bin of exactly `size` bytes: one part, then comment lines of padding."""
    body = HEADER + "1k,1\n"
    lines = []
    left = size - len(body)
    while left > 0:
        n = min(left, limits.MAX_BIN_LINE_CHARS + 1)  # a line and its newline
        lines.append("#" + "x" * (n - 2) + "\n" if n >= 2 else "\n")
        left -= n
    return body + "".join(lines)


def test_bin_file_size_limit(tmp_path):
    assert len(load_bin(_bin(tmp_path, _padded(limits.MAX_BIN_BYTES)))) == 1
    with pytest.raises(StockError) as info:
        load_bin(_bin(tmp_path, _padded(limits.MAX_BIN_BYTES + 1)))
    assert "larger than 8 MiB" in _one_line(info.value)


def test_bin_line_length_limit(tmp_path):
    inside = HEADER + "1k,1\n#" + "x" * (limits.MAX_BIN_LINE_CHARS - 1) + "\n"  # a line of exactly the limit
    assert len(load_bin(_bin(tmp_path, inside))) == 1
    with pytest.raises(StockError) as info:
        load_bin(_bin(tmp_path, HEADER + "1k,1\n#" + "x" * limits.MAX_BIN_LINE_CHARS + "\n"))
    assert "line 3" in _one_line(info.value) and "at most 4096" in str(info.value)


def test_bin_column_limit(tmp_path):
    names = ["value"] + [f"extra{i}" for i in range(limits.MAX_BIN_COLUMNS - 1)]
    assert len(load_bin(_bin(tmp_path, ",".join(names) + "\n1k\n"))) == 1
    with pytest.raises(StockError) as info:
        load_bin(_bin(tmp_path, ",".join(names + ["one_more"]) + "\n1k\n"))
    assert "at most 64" in _one_line(info.value)


def test_bin_row_limit(tmp_path):
    rows = "".join(f"{1000 + i},1\n" for i in range(limits.MAX_BIN_ROWS))
    assert len(load_bin(_bin(tmp_path, HEADER + rows))) == limits.MAX_BIN_ROWS
    with pytest.raises(StockError) as info:
        load_bin(_bin(tmp_path, HEADER + rows + "99k,1\n"))
    assert f"more than {limits.MAX_BIN_ROWS} rows" in _one_line(info.value)


def test_lines_of_one_value_limit(tmp_path):
    # rows of one value stay separate lines when their ratings differ (here the tcr)
    rows = "".join(f"1k,1,{i + 1}\n" for i in range(limits.MAX_LINES_PER_VALUE))
    assert len(load_bin(_bin(tmp_path, "value,qty,tcr\n" + rows))) == limits.MAX_LINES_PER_VALUE
    with pytest.raises(StockError) as info:
        load_bin(_bin(tmp_path, "value,qty,tcr\n" + rows + "1k,1,999\n"))
    assert "at most 100 lines of one value" in _one_line(info.value)


def test_bin_qty_limit(tmp_path):
    assert load_bin(_bin(tmp_path, HEADER + f"1k,{limits.MAX_QTY}\n")).items[0].count == limits.MAX_QTY
    for qty in (limits.MAX_QTY + 1, "9" * 4000):  # 4000 digits: still within a line, beyond int()'s own limit
        with pytest.raises(StockError) as info:
            load_bin(_bin(tmp_path, HEADER + f"1k,{qty}\n"))
        assert "field 'qty'" in _one_line(info.value)


def test_a_huge_header_with_repeated_columns_is_refused_in_one_short_line(tmp_path):
    names = ",".join(["value"] + ["x" * 200] * 2)
    with pytest.raises(StockError) as info:
        load_bin(_bin(tmp_path, names + "\n1k\n"))
    assert "twice" in _one_line(info.value)


@pytest.mark.parametrize("device", ["/dev/zero", "/dev/urandom"])
def test_an_endless_device_is_refused_not_read_forever(device):
    if not Path(device).exists():
        pytest.skip(f"{device} is not on this system")
    with pytest.raises(StockError) as info:
        load_bin(device)
    assert "larger than" in _one_line(info.value)


def test_a_fifo_nobody_writes_to_does_not_hang(tmp_path):
    import os

    if not hasattr(os, "mkfifo"):
        pytest.skip("no FIFOs here")
    fifo = tmp_path / "fifo.csv"
    os.mkfifo(fifo)
    with pytest.raises(StockError) as info:
        load_bin(fifo)
    _one_line(info.value)


def test_a_nul_in_the_path_is_a_stock_error():
    with pytest.raises(StockError) as info:
        load_bin("drawer\0.csv")
    assert "\0" not in _one_line(info.value)


# ------------------------------------------------------------------ the command line

CLI = [
    # (arguments, exit status, fragment of the one-line error or None when it works)
    (["check", "1k", "--volts", "1e-6"], 0, None),
    (["check", "1k", "--volts", "0.9e-6"], 2, "1 µV to 1 MV"),
    (["check", "1k", "--amps", "1e4"], 0, None),
    (["check", "1k", "--amps", "1e5"], 2, "1 pA to 10 kA"),
    (["check", "1k", "--watts", "1e-12"], 0, None),
    (["check", "1k", "--watts", "2e6"], 2, "1 pW to 1 MW"),
    (["check", "1k", "--temp", "1000"], 0, None),
    (["check", "1k", "--temp", "1000.5"], 2, "at most 1000"),
    (["check", "1k", "--temp", "-273.15"], 2, "absolute zero"),
    (["check", "1k", "--volts", "1", "--ambient", "300"], 0, None),
    (["check", "1k", "--volts", "1", "--ambient", "301"], 2, "-100 to 300"),
    (["check", "1k", "--ambient", "-300"], 2, "absolute zero"),  # refused even without a drive
    (["check", "1k", "--volts", "1", "--derate", "1%"], 0, None),
    (["check", "1k", "--volts", "1", "--derate", "0.5%"], 2, "at least 0.01"),
    (["make", "1e-6", "-k", "1"], 0, None),
    (["make", "1e-320"], 2, "1 µΩ to 1 TΩ"),
    (["make", "1e12", "-k", "1"], 0, None),
    (["make", "1e300"], 2, "1 µΩ to 1 TΩ"),
    (["make", "1k", "--series", "E12", "--qty", str(limits.MAX_QTY), "-k", "1"], 0, None),
    (["make", "1k", "--series", "E12", "--qty", str(limits.MAX_QTY + 1)], 2, str(limits.MAX_QTY)),
    (["make", "1k", "--bin="], 2, "empty"),
    (["make", "1k", "--range", ""], 2, "empty"),
    (["check", "1k", "--spec", ""], 2, "empty"),
    (["check", "(" * 101 + "1k" + ")" * 101], 1, "nested more than 100"),
]


@pytest.mark.parametrize("args, status, fragment", CLI, ids=[" ".join(a)[:40] for a, _, _ in CLI])
def test_the_command_line_at_the_limits(runner, args, status, fragment):
    result = runner.invoke(cli, args + ["--json"])
    assert result.exit_code == status, result.output
    data = json.loads(result.stdout, parse_constant=_no_constant)
    if fragment is None:
        assert not isinstance(data.get("error"), dict)  # ("error" of a result is its relative error)
    else:
        assert result.stdout.count("\n") == 1 and fragment in data["error"]["message"]


def _no_constant(name: str):
    raise AssertionError(f"{name} in JSON output")


# ------------------------------------------------------------------ printed numbers


@pytest.mark.parametrize(
    "ohms, text",
    [
        (1e-6, "0.001 mΩ"),  # the smallest resistance, still with the milli prefix
        (5e-7, "500e-09 Ω"),  # a network below it (parallel parts): an engineering exponent
        (1e12, "1000 GΩ"),  # the largest resistance
        (1e16, "10e+15 Ω"),  # 10 000 of the largest in series
    ],
)
def test_extreme_resistances_print_short(ohms, text):
    assert format_ohms(ohms) == text


def test_extreme_errors_print_short():
    assert format_error(1e20) == "+10e+21 %"  # 1e20 as a fraction is 1e22 %
    assert format_error(-1e-20) == "-10e-15 ppm"
