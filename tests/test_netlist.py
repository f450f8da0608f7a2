"""Networks in: netsynth.netlist (reading, shape) and netsynth.analysis.netlist (nodal analysis).

References
----------
* Lessons In Electric Circuits Vol. I ch. 10, "Δ-Y and Y-Δ conversions": the bridge R1 = 12 Ω,
  R2 = 18 Ω, R3 = 6 Ω (the bridge arm), R4 = 18 Ω, R5 = 12 Ω at 10 V; printed values: total
  14.571 Ω and 686.27 mA; R1 and R5 4.706 V / 392.16 mA, R2 and R4 5.294 V / 294.12 mA,
  R3 588.24 mV / 98.04 mA.
* ``networkx.resistance_distance`` (an outside implementation) on random meshes.
* ngspice's reading of scale suffixes (``M`` milli, ``MEG`` mega; ngspice manual, the section on
  numbers and scale factors) and its operating point for a bridge: run when ngspice is installed
  (always in CI, as tests/test_spice.py).
* Hand arithmetic: a balanced bridge (arms in equal ratio) carries no current in its middle arm.
* Rayleigh's monotonicity law: the worst case of every 2^n tolerance corner (brute force here) is
  all parts low / all parts high.
"""

from __future__ import annotations

import itertools
import json
import math
import os
import random
import re
import shutil
import subprocess

import networkx as nx
import pytest

from netsynth.analysis.conditions import OperatingPoint
from netsynth.analysis.netlist import review_netlist
from netsynth.api import check_netlist
from netsynth.cli import cli
from netsynth.errors import ArgumentError, ValueParseError
from netsynth.netlist import Element, Netlist, parse_edges, parse_netlist, parse_spice, spice_value, topology
from netsynth.network import from_text, resistance, to_text
from netsynth.nodal import Edge, solve_network
from netsynth.stock import StockBin, StockItem, default_bin

BRIDGE_SPICE = """Wheatstone bridge, Lessons In Electric Circuits Vol. I ch. 10
* the bridge arm is R3
R1 A C 12
R2 a d 18 ; node names ignore case
r3 C D 6
R4 C B
+ 18
R5 D b 12 tc1=0.001
V1 A B DC 10
.op
.end
"""


def liec_bridge() -> Netlist:
    return parse_spice(BRIDGE_SPICE, "bridge.cir")


# ------------------------------------------------------------------ reading


@pytest.mark.parametrize(
    "token, ohms",
    [
        ("4.7k", 4700.0), ("4.7K", 4700.0), ("1MEG", 1e6), ("1meg", 1e6), ("2.2Meg", 2.2e6),
        ("1M", 1e-3), ("10m", 1e-2), ("1Mohm", 1e-3),  # SPICE: M is milli
        ("1u", 1e-6), ("3n", 3e-9), ("1G", 1e9), ("1T", 1e12), ("100", 100.0), ("10kohm", 1e4),
        ("1e3", 1e3), ("2.5e-1", 0.25), ("1mil", 25.4e-6),
    ],
)
def test_spice_scale_suffixes(token, ohms):
    assert spice_value(token) == pytest.approx(ohms, rel=1e-15)


@pytest.mark.parametrize("token", ["4k7", "abc", "", "1,5k"])
def test_spice_values_that_are_refused(token):
    with pytest.raises(ValueParseError):
        spice_value(token)


def test_spice_deck_is_read_with_title_comments_continuations_and_case():
    net = liec_bridge()
    assert net.kind == "spice"
    assert [(e.name, e.a, e.b, e.ohms) for e in net.elements] == [
        ("R1", "A", "C", 12.0), ("R2", "a", "d", 18.0), ("r3", "C", "D", 6.0), ("R4", "C", "B", 18.0),
        ("R5", "D", "b", 12.0)]
    assert net.elements[3].line == 6
    assert any("not resistors (1 V)" in n for n in net.notes)


def test_a_subcircuit_gives_its_ports_as_terminals():
    text = "* include file\n.subckt DIV top bottom\nR1 top mid 1k\nR2 mid bottom 1k\n.ends DIV\nX1 in 0 DIV\n"
    net = parse_netlist(text, "div.sub")
    assert net.ports == ("top", "bottom")
    topo = topology(net)
    assert topo.between == ("top", "bottom") and to_text(topo.network) == "1k + 1k"


def test_an_edge_list_in_csv_or_spaces_with_a_header():
    a = parse_netlist("from,to,value\nA,C,4k7\nC,B,0R47\n", "x.csv")
    b = parse_netlist("# comment\nA C 4.7k\nC B R47\n", "x.txt")
    assert a.kind == b.kind == "edges"
    assert [e.ohms for e in a.elements] == [e.ohms for e in b.elements] == [4700.0, 0.47]
    assert a.elements[0].name == "line 2"
    assert parse_edges("a b 10M").elements[0].ohms == 10e6  # our spelling: M is mega in an edge list


@pytest.mark.parametrize(
    "text, fragment",
    [
        ("R1 a b 4k7\n", "line 1, 'R1 a b 4k7', is read as the deck's title"),  # unless a complete element
        ("* t\nR1 a b 4k7\n", "write 4.7k, not 4k7"),
        ("* t\nR1 a b\n", "needs two nodes and a value"),
        ("* t\nR1 a b RMOD l=1u\n", "models and parameters are not read"),
        ("* t\nR1 a b {rval}\n", "parameters are not evaluated"),
        ("* t\nR1 a b 0\n", "above zero"),
        ("* t\nR1 a b 1k\nR1 b c 1k\n", "also on line 2"),
        ("* t\n.subckt X a b\nR1 a b 1k\n.ends\nR2 a b 1k\n", "more than one place"),
        ("* t\nV1 a b 1\n", "no resistor"),
        ("a,b\n", "no resistor"),
        ("a b 4x7\nb c 1k\n", "line 1, field 'value'"),
    ],
)
def test_unreadable_netlists_say_where(text, fragment):
    with pytest.raises(ValueParseError, match=re.escape(fragment)):
        parse_netlist(text, "n.cir")


def test_a_capital_m_in_spice_is_noted():
    net = parse_spice("* t\nR1 a b 1M\n", "m.cir")
    assert net.elements[0].ohms == pytest.approx(1e-3)
    assert any("M is milli" in n for n in net.notes)


# ------------------------------------------------------------------ shape


def test_the_liec_bridge_is_not_series_parallel_and_has_the_printed_value():
    topo = topology(liec_bridge(), "A", "B")
    assert topo.network is None and not topo.dead
    # 102/7 Ω = 14.571 Ω (printed), by the refined nodal solve
    r = review_netlist(topo, default_bin())
    assert r.value_ohms == pytest.approx(102 / 7, rel=1e-14)


def test_the_liec_bridge_at_10_volts_gives_the_printed_volts_and_amps():
    r = review_netlist(topology(liec_bridge(), "A", "B"), default_bin(), OperatingPoint(volts=10.0))
    s = r.review.stress
    assert s.amps == pytest.approx(0.68627, abs=5e-6)  # 686.27 mA printed
    printed = {"R1": (4.706, 0.39216), "R2": (5.294, 0.29412), "r3": (0.58824, 0.098039),
               "R4": (5.294, 0.29412), "R5": (4.706, 0.39216)}
    for e, p in zip(r.elements, s.parts):
        name = r.topology.netlist.elements[e.index].name
        volts, amps = printed[name]
        assert p.volts == pytest.approx(volts, abs=5e-4) and p.amps == pytest.approx(amps, abs=5e-6)
        assert p.watts == pytest.approx(p.volts * p.amps, rel=1e-12)


def test_dead_parts_are_named_with_their_reason():
    edges = parse_edges("A C 1k\nC B 1k\nC E 220\nE F 330\nB B 47\nX Y 10\nA B 10k\nC G 1k\nG C2 1k\nC2 C 1k\n")
    topo = topology(edges, "A", "B")
    dead = {edges.elements[i].name: why for i, why in topo.dead}
    assert set(dead) == {"line 3", "line 4", "line 5", "line 6", "line 8", "line 9", "line 10"}
    assert "dangling" in dead["line 3"] and "dangling" in dead["line 4"]
    assert "dangling" in dead["line 8"]  # a loop C-G-C2-C touching the paths at one node only
    assert "shorted" in dead["line 5"] and "not connected" in dead["line 6"]
    # what is left is (1k + 1k) || 10k (hand: the dead parts change nothing)
    assert resistance(topo.network) == pytest.approx(1 / (1 / 2000 + 1 / 10000), rel=1e-15)


def test_a_balanced_bridge_leaves_its_middle_arm_without_current():
    # arms 1k/1k and 2k/2k: C and D both sit at half the drive, so the 470 Ω arm carries nothing;
    # the rest is (1k + 1k) || (2k + 2k) = 4/3 kΩ (hand arithmetic)
    net = parse_edges("A C 1k\nA D 2k\nC D 470\nC B 1k\nD B 2k\n")
    r = review_netlist(topology(net, "A", "B"), default_bin())
    assert r.value_ohms == pytest.approx(4000 / 3, rel=1e-14)
    assert [net.elements[i].name for i, why in r.no_current if "balanced" in why] == ["line 3"]


def test_terminals_that_are_not_joined_are_named():
    net = parse_edges("A C 1k\nD B 1k\n")
    with pytest.raises(ArgumentError, match="no path of parts joins A and B"):
        topology(net, "A", "B")
    with pytest.raises(ArgumentError, match="no node 'Z'"):
        topology(net, "A", "Z")
    with pytest.raises(ArgumentError, match="one node"):
        topology(net, "A", "a")


@pytest.mark.parametrize("text", ["1k + (2k2 || 4k7)", "(1k + 1k + 470) || (2k2 + 330) || 10k",
                                  "((1k + 2k2) || (470 + (100 || 330))) + (10k || (22k + 47k))", "4k7"])
def test_series_parallel_netlists_reduce_to_their_form(text):
    net = from_text(text)
    from netsynth.network import parts_in_order, to_netlist

    edges, _ = to_netlist(net)
    names = {0: "A", 1: "B"}
    elements = tuple(Element(f"R{k}", names.get(e.a, f"n{e.a}"), names.get(e.b, f"n{e.b}"), e.ohms, k)
                     for k, e in enumerate(edges, start=1))
    random.Random(1).shuffle(list(elements))
    topo = topology(Netlist("t", "edges", elements), "A", "B")
    assert topo.network is not None and sorted(p.ohms for p in parts_in_order(topo.network)) == sorted(
        p.ohms for p in parts_in_order(net))
    assert resistance(topo.network) == pytest.approx(resistance(net), rel=1e-13)


# ------------------------------------------------------------------ against outside references


def _random_mesh(rng: random.Random, nodes: int, extra: int) -> list[tuple[int, int, float]]:
    """A connected random graph: a random spanning tree plus `extra` chords, values log-uniform 1..1M."""
    out = []
    for n in range(1, nodes):
        out.append((rng.randrange(n), n, 10 ** rng.uniform(0, 6)))
    for _ in range(extra):
        a, b = rng.sample(range(nodes), 2)
        out.append((a, b, 10 ** rng.uniform(0, 6)))
    return out


@pytest.mark.parametrize("seed", range(12))
def test_value_agrees_with_networkx_resistance_distance(seed):
    rng = random.Random(seed)
    mesh = _random_mesh(rng, 4 + seed, 3 + seed)
    net = parse_edges("\n".join(f"n{a} n{b} {w!r}" for a, b, w in mesh))
    r = review_netlist(topology(net, "n0", f"n{3 + seed}"), default_bin())
    graph = nx.Graph()
    for a, b, w in mesh:  # parallel parts merge into one conductance for networkx's simple graph
        g = graph.get_edge_data(a, b, {"g": 0.0})["g"] + 1 / w
        graph.add_edge(a, b, g=g, ohms=1 / g)
    expected = nx.resistance_distance(graph, 0, 3 + seed, weight="ohms", invert_weight=True)
    assert r.value_ohms == pytest.approx(expected, rel=1e-9)


def test_worst_case_is_the_extreme_of_every_tolerance_corner():
    stock = StockBin((StockItem(12.0, tolerance=0.05), StockItem(18.0, tolerance=0.01), StockItem(6.0, tolerance=0.1)))
    topo = topology(liec_bridge(), "A", "B")
    r = review_netlist(topo, stock)
    tol = [e.line.tolerance for e in r.elements]
    corners = []
    for signs in itertools.product((-1, 1), repeat=len(tol)):
        edges = [Edge(e.a, e.b, e.ohms * (1 + s * t)) for e, s, t in zip(topo.edges, signs, tol)]
        corners.append(solve_network(edges, len(topo.node_names)).resistance_ohms)
    assert r.review.band.low_ohms == pytest.approx(min(corners), rel=1e-14)
    assert r.review.band.high_ohms == pytest.approx(max(corners), rel=1e-14)
    # the Monte Carlo (each build re-solved) agrees with the first-order σ of the GUM within sampling error
    assert r.review.monte_carlo.sigma_rel == pytest.approx(r.review.band.sigma_rel, rel=0.05)


def test_a_series_parallel_netlist_gets_the_same_review_as_its_expression():
    net = parse_edges("a b 1k\nb c 2k2\nb c 4k7\n")
    general, candidate, verdict = check_netlist(net, ("a", "c"), default_bin(), OperatingPoint(volts=24.0))
    assert candidate.expression == "1k + (2k2 || 4k7)"
    from netsynth.api import check

    c2, v2 = check("1k + (2k2 || 4k7)", default_bin(), OperatingPoint(volts=24.0))
    assert verdict == v2 and candidate == c2
    assert general.value_ohms == pytest.approx(candidate.value_ohms, rel=1e-12)


NGSPICE = shutil.which("ngspice")


def _need_ngspice() -> str:
    if NGSPICE is None:
        if os.environ.get("CI"):
            pytest.fail("ngspice is not on PATH; CI must install it (.ci/run does)")
        pytest.skip("ngspice is not installed here (CI installs it)")
    return NGSPICE


def test_ngspice_reads_the_same_bridge_and_suffixes(tmp_path):
    exe = _need_ngspice()
    # the LIEC bridge with a series part written with SPICE suffixes: 1M is 1 mΩ, 1MEG is 1 MΩ
    deck = BRIDGE_SPICE.replace("V1 A B DC 10\n.op\n.end\n", "") + (
        "R6 B G 1M\nR7 B G 1MEG\nV1 A G DC 10\n.op\n.control\nset numdgt=12\nop\nprint i(v1)\n.endc\n.end\n")
    path = tmp_path / "bridge.cir"
    path.write_text(deck)
    run = subprocess.run([exe, "-b", str(path)], capture_output=True, text=True, timeout=60, check=False)
    assert run.returncode == 0, run.stdout + run.stderr
    amps = -float(re.search(r"i\(v1\)\s*=\s*([-+0-9.eE]+)", run.stdout)[1])
    general, _, _ = check_netlist(str(path), ("A", "G"))
    assert general.value_ohms == pytest.approx(10.0 / amps, rel=1e-9)


# ------------------------------------------------------------------ command line


@pytest.fixture
def bridge_file(tmp_path):
    path = tmp_path / "bridge.cir"
    path.write_text(BRIDGE_SPICE + "")
    return path


def test_check_netlist_from_the_command_line(runner, bridge_file):
    result = runner.invoke(cli, ["check", "--netlist", str(bridge_file), "--between", "A", "B", "--volts", "10"])
    assert result.exception is None and result.exit_code == 0, result.output
    lines = result.output.splitlines()
    assert lines[1].startswith("Shape: not series/parallel")
    assert "Value: 14.5714 Ω" in lines  # 102/7 Ω
    assert any(line.split()[:3] == ["R1", "A-C", "12"] for line in lines)


def test_check_netlist_json(runner, bridge_file):
    result = runner.invoke(cli, ["check", "--netlist", str(bridge_file), "--between", "a", "b", "--json"])
    assert result.exception is None and result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    assert data["expression"] is None and data["value_ohms"] == pytest.approx(102 / 7)
    assert data["netlist"]["series_parallel"] is False and data["netlist"]["between"] == ["A", "B"]
    assert [e["name"] for e in data["netlist"]["elements"]] == ["R1", "R2", "r3", "R4", "R5"]
    assert sum(e["power_share"] for e in data["netlist"]["elements"]) == pytest.approx(1.0)


def test_check_netlist_refusals(runner, bridge_file, tmp_path):
    both = runner.invoke(cli, ["check", "1k", "--netlist", str(bridge_file)])
    assert isinstance(both.exception, SystemExit) and both.exit_code == 2
    stray = runner.invoke(cli, ["check", "1k", "--between", "A", "B"])
    assert isinstance(stray.exception, SystemExit) and stray.exit_code == 2
    open_ = runner.invoke(cli, ["check", "--netlist", str(bridge_file), "--between", "A", "Q"])
    assert isinstance(open_.exception, SystemExit) and open_.exit_code == 1 and "no node 'Q'" in open_.output
    spice = runner.invoke(cli, ["check", "--netlist", str(bridge_file), "--between", "A", "B", "--spice",
                                str(tmp_path / "x.cir")])
    assert isinstance(spice.exception, SystemExit) and spice.exit_code == 1 and "not one" in spice.output
    missing = runner.invoke(cli, ["check", "--netlist", str(tmp_path / "nope.cir"), "--between", "A", "B", "--json"])
    assert missing.exit_code == 1 and json.loads(missing.stdout)["error"]["kind"] == "parse"


def test_spice_out_and_back_in(runner, tmp_path):
    out = tmp_path / "net.cir"
    made = runner.invoke(cli, ["make", "3k37", "--alternatives", "0", "--spice", str(out)])
    assert made.exception is None and made.exit_code == 0
    assert out.read_text().splitlines()[2] == ".subckt NETSYNTH A B"
    back = runner.invoke(cli, ["check", "--netlist", str(out), "--json"])  # the subcircuit's ports: A and B
    assert back.exception is None and back.exit_code == 0, back.output
    data = json.loads(back.stdout)
    assert data["expression"] == "10 + 360 + 3k" and data["value_ohms"] == pytest.approx(3370.0)
    assert [c["line"] for c in data["components"]] == [1, 38, 60]
    checked = tmp_path / "c.cir"
    result = runner.invoke(cli, ["check", "1k + (2k2 || 4k7)", "--spice", str(checked)])
    assert result.exception is None and result.exit_code == 0
    assert [line.split()[3] for line in checked.read_text().splitlines() if line.startswith("R")] == [
        "1e3", "2.2e3", "4.7e3"]
    assert not [p for p in tmp_path.iterdir() if p.name.endswith(".tmp")]
    assert math.isclose(float("2.2e3"), 2200.0)
