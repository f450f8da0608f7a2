"""netsynth.render.spice: the deck is run through ngspice and compared with the nodal solver.

The outside reference is an ngspice operating-point run (``ngspice -b``) of the deck that
``to_spice_deck`` writes: the source current gives the equivalent resistance, and each
element's current and power come from ngspice's device vectors ``@r.xnet.<name>[i]`` and
``[p]``. They must agree with :func:`netsynth.nodal.solve_network` (edge order = parts order).

Without ngspice the simulator tests are skipped on a workstation but fail in CI (the ``CI``
environment variable is set there, and ``.ci/run`` installs ngspice).
"""

from __future__ import annotations

import math
import os
import random
import re
import shutil
import subprocess

import pytest

from netsynth.errors import ArgumentError
from netsynth.network import Network, Part, Series, from_text, parallel, parts_in_order, series, to_netlist
from netsynth.nodal import solve_network
from netsynth.render.spice import spice_number, to_spice, to_spice_deck
from netsynth.stock import StockItem

NGSPICE = shutil.which("ngspice")
RTOL = 1e-6
EPS = 2.0**-52  # float64 unit roundoff (ulp of 1.0)
ULPS = 16  # ulps of the drive voltage allowed on each potential, both solvers together


def _need_ngspice() -> str:
    if NGSPICE is None:
        if os.environ.get("CI"):
            pytest.fail("ngspice is not on PATH; CI must install it (.ci/run does: apt-get install ngspice)")
        pytest.skip("ngspice is not installed here (CI installs it); apt-get install ngspice to run this")
    return NGSPICE


def _random_tree(rng: random.Random, parts: int, low: float, high: float) -> Network:
    """A random series/parallel tree of `parts` parts, values log-uniform in [low, high]."""
    if parts == 1:
        return Part(10 ** rng.uniform(math.log10(low), math.log10(high)))
    left = rng.randint(1, parts - 1)
    join = series if rng.random() < 0.5 else parallel
    return join(_random_tree(rng, left, low, high), _random_tree(rng, parts - left, low, high))


def _with_lines(net: Network, first_line: int) -> Network:
    """The same circuit with every part tied to a stock line numbered from `first_line`."""
    counter = iter(range(first_line, first_line + 10_000))

    def tie(n: Network) -> Network:
        if isinstance(n, Part):
            return Part(n.ohms, StockItem(n.ohms, tolerance=0.001, tcr_ppm=25.0, location="drawer 3, row B",
                                          line=next(counter)))
        kids = [tie(c) for c in n.children]
        return series(*kids) if isinstance(n, Series) else parallel(*kids)

    return tie(net)


NETWORKS = {
    "one part": from_text("4k7"),
    "series and parallel": from_text("1k + (2k2 || 4k7)"),
    "parallel of strings": from_text("(1k + 1k + 470) || (2k2 + 330) || 10k"),
    "1 mOhm to 10 MOhm": from_text("1m + (10M || 4k7) + (1m || 10M) + 1M"),
    "shunt of milliohms": from_text("(10m || 22m || 47m) + 1m"),
    "mega and milli in one string": from_text("1M + 1m + 2M2 + 4m7"),
    "nested tree": from_text("((1k + 2k2) || (470 + (100 || 330))) + (10k || (22k + (47k || (1M + 3k3))))"),
    "stock lines": _with_lines(from_text("(68 + 3k3) || (10k + (4k7 || 1k5))"), 7),
    **{f"random {seed}": _random_tree(random.Random(seed), 4 + seed % 9, 1e-3, 1e7) for seed in range(8)},
}

_VALUE_LINE = re.compile(r"^\s*(\S+)\s*=\s*([-+0-9.eE]+)\s*$")


def _run_ngspice(net: Network, volts: float, tmp_path) -> tuple[dict[str, float], list[str]]:
    """Run the deck in ngspice; return the printed vectors (lower-case names) and the element names."""
    exe = _need_ngspice()
    deck = to_spice_deck(net, volts)
    elements = [line.split()[0] for line in deck.splitlines() if re.match(r"R\w*\s", line)]
    probes = ["print i(vdrive)"] + [f"print @r.xnet.{e.lower()}[i] @r.xnet.{e.lower()}[p]" for e in elements]
    control = ".control\nset numdgt=16\nop\n" + "\n".join(probes) + "\n.endc\n"
    assert deck.endswith(".end\n")
    path = tmp_path / "deck.cir"
    path.write_text(deck[: -len(".end\n")] + control + ".end\n", encoding="utf-8")
    run = subprocess.run([exe, "-b", str(path)], capture_output=True, text=True, timeout=60, check=False)
    assert run.returncode == 0, run.stdout + run.stderr
    assert "error" not in run.stderr.lower(), run.stderr
    values = {}
    for line in run.stdout.splitlines():
        if m := _VALUE_LINE.match(line):
            values[m[1].lower()] = float(m[2])
    return values, elements


@pytest.mark.parametrize("key", sorted(NETWORKS))
def test_ngspice_operating_point_matches_the_nodal_solve(key, tmp_path):
    net = NETWORKS[key]
    volts = 12.0
    values, elements = _run_ngspice(net, volts, tmp_path)
    edges, count = to_netlist(net)
    nodal = solve_network(edges, count, volts=volts)
    assert len(elements) == len(edges) == len(parts_in_order(net))
    assert [float(line.split()[3]) for line in to_spice(net).splitlines() if line.startswith("R")] == [
        e.ohms for e in edges]

    # Floors beside the relative tolerance, from float64 alone: SPICE (and the nodal solve) gets a
    # part's current from the potentials at its ends, which are good to a few ulps of the drive
    # voltage, so a part of R ohms has its current to about ULPS * eps * volts / R (absolute) and
    # its power to 2 * |I| * ULPS * eps * volts. Across 1 mΩ in series with megohms that is ~1e-6
    # relative; everywhere else the relative tolerance is the binding one.
    resolution = ULPS * EPS * abs(volts)

    # ngspice operating-point run: the source current flows into VDRIVE's + terminal; it is the
    # current of the parts at terminal A, so its floor is set by the smallest of them
    source_amps = -values["i(vdrive)"]
    smallest_at_a = min(e.ohms for e in edges if 0 in (e.a, e.b))
    # (this is the equivalent resistance check: R = volts / I)
    assert source_amps == pytest.approx(volts / nodal.resistance_ohms, rel=RTOL, abs=resolution / smallest_at_a)

    for k, (element, edge, amps, watts) in enumerate(
            zip(elements, edges, nodal.edge_amps, nodal.edge_watts, strict=True)):
        name = f"@r.xnet.{element.lower()}"
        # ngspice operating-point run: element current (node 1 -> node 2) and power
        spice_amps, spice_watts = values[f"{name}[i]"], values[f"{name}[p]"]
        assert spice_amps == pytest.approx(amps, rel=RTOL, abs=resolution / edge.ohms), (k, element)
        assert spice_watts == pytest.approx(watts, rel=RTOL, abs=2 * abs(amps) * resolution), (k, element)


def test_ngspice_reads_mega_and_milli_values_as_written(tmp_path):
    # 1 MΩ and 1 mΩ in parallel is 1/(1e-6 + 1e3) S; SPICE's 'M' suffix would be milli, so a
    # value written as '1M' would make this 0.5 mΩ (ngspice operating-point run)
    net = from_text("1M || 1m")
    values, _ = _run_ngspice(net, 1.0, tmp_path)
    assert 1.0 / -values["i(vdrive)"] == pytest.approx(1 / (1e-6 + 1e3), rel=RTOL)


# --------------------------------------------------------------------------- the text itself


def test_element_names_nodes_and_values():
    net = NETWORKS["stock lines"]
    text = to_spice(net, name="DIVIDER")
    lines = text.splitlines()
    assert lines[0].startswith("* ") and ".subckt DIVIDER A B" in lines
    assert lines[-1] == ".ends DIVIDER"
    elements = [line.split() for line in lines if line.startswith("R")]
    parts = parts_in_order(net)
    edges, _ = to_netlist(net)
    assert len(elements) == len(parts)
    for k, (fields, part, edge) in enumerate(zip(elements, parts, edges, strict=True), start=1):
        assert fields[0] == f"R{k}_L{part.line.line}"
        nodes = {0: "A", 1: "B"}
        assert fields[1:3] == [nodes.get(edge.a, f"N{edge.a}"), nodes.get(edge.b, f"N{edge.b}")]
        assert float(fields[3]) == part.ohms
        assert len(fields) == 4  # no TC1: the tcr's sign is unknown
    assert sorted(p.line.line for p in parts) == list(range(7, 7 + len(parts)))
    comments = [line for line in lines if line.startswith("* R")]
    assert len(comments) == len(parts)
    assert all("+/-0.1 %" in c and "+/-25 ppm/K" in c and "drawer 3, row B" in c for c in comments)


def test_parts_without_a_line_are_plain_r():
    text = to_spice(from_text("1k + 1k"))
    assert [line.split()[0] for line in text.splitlines() if line.startswith("R")] == ["R1", "R2"]


@pytest.mark.parametrize("x", [4700.0, 0.001, 1e6, 2.2e6, 10e6, 3370.0, 0.25, 1.0, 1 / 3, 123456.789, 1e-3 * 4.7])
def test_numbers_read_back_and_carry_no_suffix(x):
    text = spice_number(x)
    assert float(text) == x
    assert re.fullmatch(r"-?\d(\.\d+)?(e-?\d+)?", text)  # digits and an exponent only, never M/MEG/k


def test_title_and_bad_arguments():
    assert to_spice(from_text("1k"), title="feedback divider\nlow side").splitlines()[0] == (
        "* feedback divider low side")
    with pytest.raises(ArgumentError):
        to_spice(from_text("1k"), name="two words")
    with pytest.raises(ArgumentError):
        to_spice(from_text("1k"), name="1ST")
    with pytest.raises(ArgumentError):
        to_spice_deck(from_text("1k"), math.nan)
