"""Tests of netsynth.nodal, the independent nodal verifier.

Every expected value comes from outside the project: exact rational arithmetic
of textbook closed forms hand-coded here, networkx, OEIS entries and worked
examples printed in open textbooks. Nothing here calls netsynth's own
series/parallel code.
"""

from __future__ import annotations

import ast
import math
from fractions import Fraction
from pathlib import Path

import networkx as nx
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from netsynth.errors import VerificationError
from netsynth.nodal import (
    VERIFY_RTOL,
    Edge,
    NodalSolution,
    equivalent_resistance,
    solve_network,
    verify_resistance,
)

EPS = 2.0**-52  # float64 machine epsilon


def printed(text: str) -> tuple[float, float]:
    """A value as printed in a book and half a unit of its last printed digit."""
    decimals = len(text.split(".")[1]) if "." in text else 0
    return float(text), 0.5 * 10.0**-decimals + 1e-12


def rel_error(value: float, exact: Fraction) -> float:
    """|value/exact - 1| computed exactly, so the check itself adds no rounding."""
    return float(abs(Fraction(value) / exact - 1))


# --- strategies -------------------------------------------------------------


def log_uniform(lo_exp: float, hi_exp: float) -> st.SearchStrategy[float]:
    """Resistances in ohms, log-uniform between 10**lo_exp and 10**hi_exp."""
    return st.floats(lo_exp, hi_exp, allow_nan=False).map(lambda e: 10.0**e)


@st.composite
def connected_netlists(draw, max_nodes: int = 8, lo_exp: float = -2, hi_exp: float = 7):
    """(edges, node_count, source, sink): a random spanning tree plus extra edges.

    The extra edges may repeat a pair of nodes (parallel resistors).
    """
    n = draw(st.integers(2, max_nodes))
    pairs = [(draw(st.integers(0, v - 1)), v) for v in range(1, n)]
    extra = draw(
        st.lists(
            st.tuples(st.integers(0, n - 1), st.integers(0, n - 1)).filter(lambda p: p[0] != p[1]),
            max_size=10,
        )
    )
    pairs += extra
    ohms = draw(st.lists(log_uniform(lo_exp, hi_exp), min_size=len(pairs), max_size=len(pairs)))
    edges = [Edge(a, b, r) for (a, b), r in zip(pairs, ohms)]
    source, sink = draw(st.permutations(range(n)))[:2]
    return edges, n, source, sink


# --- exact closed forms: accuracy of the scaled, refined solve ----------------
# The module docstring claims a few ulps (measured worst 3.4e-16) over
# 1 mΩ..10 MΩ; 4e-15 (18 ulp) is asserted so a regression to the ~1e-8 of a
# plain dense solve fails loudly.
EXACT_RTOL = 4e-15


@settings(max_examples=300, deadline=None)
@given(st.lists(log_uniform(-3, 7), min_size=1, max_size=30))
def test_series_chain_matches_exact_sum(ohms):
    # reference: series rule R = sum(R_i) in exact Fraction arithmetic
    # (OpenStax University Physics Vol. 2, §10.2, "Resistors in Series")
    edges = [Edge(0 if i == 0 else i + 1, 1 if i == len(ohms) - 1 else i + 2, r)
             for i, r in enumerate(ohms)]
    exact = sum(Fraction(r) for r in ohms)
    assert rel_error(equivalent_resistance(edges, len(ohms) + 1), exact) <= EXACT_RTOL


@settings(max_examples=300, deadline=None)
@given(st.lists(log_uniform(-3, 7), min_size=1, max_size=30))
def test_parallel_set_matches_exact_reciprocal_sum(ohms):
    # reference: parallel rule 1/R = sum(1/R_i) in exact Fraction arithmetic
    # (OpenStax University Physics Vol. 2, §10.2, "Resistors in Parallel")
    edges = [Edge(0, 1, r) for r in ohms]
    exact = 1 / sum(1 / Fraction(r) for r in ohms)
    assert rel_error(equivalent_resistance(edges, 2), exact) <= EXACT_RTOL


@settings(max_examples=300, deadline=None)
@given(st.integers(1, 20).flatmap(
    lambda k: st.tuples(
        st.lists(log_uniform(-3, 7), min_size=k + 1, max_size=k + 1),
        st.lists(log_uniform(-3, 7), min_size=k, max_size=k),
    )
))
def test_ladder_matches_exact_continued_fraction(arms):
    # reference: ladder network value as a continued fraction, evaluated from the
    # far end in exact Fraction arithmetic, R_k = s_k + (p_k * R_k+1) / (p_k + R_k+1)
    # (ladder analysis as in Lessons In Electric Circuits Vol. I, ch. 7)
    series, shunts = arms
    edges, node, fresh = [], 0, 2
    for s, p in zip(series, shunts):
        edges += [Edge(node, fresh, s), Edge(fresh, 1, p)]
        node, fresh = fresh, fresh + 1
    edges.append(Edge(node, 1, series[-1]))
    exact = Fraction(series[-1])
    for s, p in reversed(list(zip(series, shunts))):
        exact = Fraction(s) + Fraction(p) * exact / (Fraction(p) + exact)
    assert rel_error(equivalent_resistance(edges, fresh), exact) <= EXACT_RTOL


# --- networkx as an outside reference ------------------------------------------


def merged_graph(edges: list[Edge], node_count: int) -> nx.Graph:
    """A simple networkx Graph; parallel edges merged by adding conductances."""
    siemens: dict[tuple[int, int], float] = {}
    for e in edges:
        key = (min(e.a, e.b), max(e.a, e.b))
        siemens[key] = siemens.get(key, 0.0) + 1.0 / e.ohms
    graph = nx.Graph()
    graph.add_nodes_from(range(node_count))
    graph.add_edges_from((a, b, {"weight": 1.0 / g}) for (a, b), g in siemens.items())
    return graph


@settings(max_examples=300, deadline=None)
@given(connected_netlists())
def test_agrees_with_networkx_resistance_distance(netlist):
    edges, n, source, sink = netlist
    # reference: networkx.resistance_distance
    expected = nx.resistance_distance(
        merged_graph(edges, n), source, sink, weight="weight", invert_weight=True
    )
    # Tolerance: networkx takes the pseudo-inverse of the dense Laplacian
    # (numpy.linalg.pinv), whose error grows like eps * cond(L), and cond(L) is
    # at most about n * max(ohms) / min(ohms). Over 12000 random cases like these
    # its error reached 1.24 * eps * n * spread (8e-8 worst with 9 decades); our
    # side is exact to a few ulps. 32x that bound leaves headroom and still
    # fails a real error (a wrong edge moves R by far more than 1e-4).
    spread = max(e.ohms for e in edges) / min(e.ohms for e in edges)
    rtol = max(32 * EPS * n * spread, 1e-13)
    got = solve_network(edges, n, source, sink).resistance_ohms
    assert got == pytest.approx(expected, rel=rtol)


# --- energy conservation and Kirchhoff's current law ------------------------------


@settings(max_examples=300, deadline=None)
@given(
    connected_netlists(max_nodes=10, lo_exp=-3, hi_exp=7),
    st.floats(-1e3, 1e3).filter(lambda v: abs(v) > 1e-6),
)
def test_edge_watts_sum_to_drive_power(netlist, volts):
    edges, n, source, sink = netlist
    solution = solve_network(edges, n, source, sink, volts=volts)
    # reference: Tellegen's theorem / conservation of energy: the power the
    # source delivers, V^2/R, equals the sum of I^2 R over the parts
    # (B. D. H. Tellegen, Philips Res. Rep. 7 (1952) 259-269).
    assert all(w >= 0 for w in solution.edge_watts)
    total = math.fsum(solution.edge_watts)
    assert total == pytest.approx(volts**2 / solution.resistance_ohms, rel=1e-12)
    # The terminals sit at the drive voltage and 0 V.
    assert solution.node_volts[source] == volts
    assert solution.node_volts[sink] == 0.0
    # reference: Kirchhoff's current law: the edge currents at every node other
    # than the terminals sum to zero. Edge volts carry an absolute error of a few
    # ulps of the drive, so allow 64 * eps * |V| * (sum of conductances there).
    net = [0.0] * n
    bound = [0.0] * n
    for e, amps in zip(edges, solution.edge_amps):
        net[e.a] -= amps
        net[e.b] += amps
        bound[e.a] += 64 * EPS * abs(volts) / e.ohms
        bound[e.b] += 64 * EPS * abs(volts) / e.ohms
    for node in set(range(n)) - {source, sink}:
        assert abs(net[node]) <= bound[node]


# --- Wheatstone bridges that are not series-parallel ------------------------------
# Node map for the book netlists: book node 1 (+ of the source) -> 0,
# book node 0 (ground) -> 1, book nodes 2 and 3 keep their numbers.


def book_bridge(r1: float, r2: float, r3: float, r4: float, r5: float) -> list[Edge]:
    """r1 1-2, r2 1-3, r3 2-3, r4 2-0, r5 3-0 in the book's numbering."""
    return [Edge(0, 2, r1), Edge(0, 3, r2), Edge(2, 3, r3), Edge(2, 1, r4), Edge(3, 1, r5)]


# Lessons In Electric Circuits Vol. I, ch. 10, "Δ-Y and Y-Δ conversions":
# 10 V; SPICE-printed drops across R1..R5 (sign: node a minus node b).
E12_DROPS = ["4.706", "5.294", "0.5882", "5.294", "4.706"]
# Lessons In Electric Circuits Vol. I, ch. 10, "Mesh current method": 24 V;
# SPICE-printed drops; R3 carries 1.655 V with node 3 positive, so V(2)-V(3) < 0.
E13_DROPS = ["6.345", "4.690", "-1.655", "17.66", "19.31"]
# Same section, mesh currents in mA (R3 flows from node 3 to node 2).
E13_MILLIAMPS = ["42.299", "93.793", "-16.552", "58.851", "77.241"]


@pytest.mark.parametrize(
    ("arms", "volts", "exact", "drops"),
    [
        # LIEC Vol. I ch. 10 "Δ-Y and Y-Δ conversions"; R = 102/7 Ω from the
        # A337516 bridge formula (OEIS), drops printed by SPICE in the book
        ((12, 18, 6, 18, 12), 10.0, Fraction(102, 7), E12_DROPS),
        # LIEC Vol. I ch. 10 "Mesh current method"; R = 6525/37 Ω from the
        # A337516 bridge formula (OEIS), drops printed by SPICE in the book
        ((150, 50, 100, 300, 250), 24.0, Fraction(6525, 37), E13_DROPS),
    ],
)
def test_textbook_bridges(arms, volts, exact, drops):
    solution = solve_network(book_bridge(*map(float, arms)), 4, volts=volts)
    assert rel_error(solution.resistance_ohms, exact) <= EXACT_RTOL
    for got, text in zip(solution.edge_volts, drops):
        value, half_digit = printed(text)
        assert got == pytest.approx(value, abs=half_digit)


def test_mesh_currents_of_second_bridge():
    # Lessons In Electric Circuits Vol. I, ch. 10 "Mesh current method":
    # branch currents from the book's mesh solution, in mA
    solution = solve_network(book_bridge(150.0, 50.0, 100.0, 300.0, 250.0), 4, volts=24.0)
    for got, text in zip(solution.edge_amps, E13_MILLIAMPS):
        value, half_digit = printed(text)
        assert got * 1e3 == pytest.approx(value, abs=half_digit)


def bridge_formula(
    x1: Fraction, x2: Fraction, x3: Fraction, x4: Fraction, x5: Fraction
) -> Fraction:
    """Bridge value from the comment in OEIS A337516.

    Terminals A, D; arms x1 A-B, x2 A-C, x3 B-C (diagonal), x4 B-D, x5 C-D.
    """
    top = x1 * x2 * x4 + x1 * x2 * x5 + x1 * x4 * x5 + x2 * x4 * x5 + x3 * (x2 + x5) * (x1 + x4)
    return top / ((x1 + x2) * (x4 + x5) + x3 * (x1 + x2 + x4 + x5))


def bridge_edges(x1: float, x2: float, x3: float, x4: float, x5: float) -> list[Edge]:
    """A = 0 (source), D = 1 (sink), B = 2, C = 3."""
    return [Edge(0, 2, x1), Edge(0, 3, x2), Edge(2, 3, x3), Edge(2, 1, x4), Edge(3, 1, x5)]


@settings(max_examples=300, deadline=None)
@given(st.lists(log_uniform(-3, 7), min_size=5, max_size=5))
def test_random_bridges_match_oeis_formula(arms):
    # reference: bridge formula in the comment of OEIS A337516, exact Fractions
    exact = bridge_formula(*map(Fraction, arms))
    assert rel_error(equivalent_resistance(bridge_edges(*arms), 4), exact) <= EXACT_RTOL


@pytest.mark.parametrize(
    ("arms", "exact"),
    [
        ((1, 1, 1, 1, 1), Fraction(1)),  # OEIS A174283/A174285: unit bridge gives 1 Ω
        ((2, 1, 1, 1, 1), Fraction(13, 11)),  # OEIS A174283: one outer arm 2 Ω -> 13/11 Ω
        ((0.5, 1, 1, 1, 1), Fraction(11, 13)),  # OEIS A174283: one outer arm 1/2 Ω -> 11/13 Ω
        ((1, 1, 1, 2, 1), Fraction(13, 11)),  # OEIS A174283: same, arm at the other terminal
        ((1, 1, 2, 1, 1), Fraction(1)),  # OEIS A174285: diagonal 2 Ω, bridge balanced -> 1 Ω
        ((1, 1, 0.5, 1, 1), Fraction(1)),  # OEIS A174285: diagonal 1/2 Ω, balanced -> 1 Ω
    ],
)
def test_unit_bridge_identities(arms, exact):
    got = equivalent_resistance(bridge_edges(*map(float, arms)), 4)
    assert rel_error(got, exact) <= EXACT_RTOL


# --- textbook power examples (netlists typed by hand) ----------------------------

# OpenStax University Physics Vol. 2 §10.2: four 20 Ω and one 10 Ω in series,
# source node 0, inner nodes 2..5, sink node 1.
E1_SERIES = [
    Edge(0, 2, 20.0), Edge(2, 3, 20.0), Edge(3, 4, 20.0), Edge(4, 5, 20.0), Edge(5, 1, 10.0)
]


@pytest.mark.parametrize(
    ("edges", "nodes", "volts", "ohms", "amps", "watts"),
    [
        # OpenStax University Physics Vol. 2 §10.2, Example "Equivalent Resistance,
        # Current, and Power in a Series Circuit": 9 V, 4 x 20 Ω + 10 Ω in series
        (
            E1_SERIES,
            6, 9.0, 90.0,
            [0.1, 0.1, 0.1, 0.1, 0.1],
            [0.2, 0.2, 0.2, 0.2, 0.1],
        ),
        # OpenStax University Physics Vol. 2 §10.2, Example "Analysis of a
        # Parallel Circuit": 3 V across 1 Ω ∥ 2 Ω ∥ 2 Ω
        (
            [Edge(0, 1, 1.0), Edge(0, 1, 2.0), Edge(0, 1, 2.0)],
            2, 3.0, 0.5,
            [3.0, 1.5, 1.5],
            [9.0, 4.5, 4.5],
        ),
        # OpenStax University Physics Vol. 2 §10.2 text example: 7 Ω in series
        # with 10 Ω ∥ (6 Ω + 4 Ω) at 24 V
        (
            [Edge(0, 2, 7.0), Edge(2, 1, 10.0), Edge(2, 3, 6.0), Edge(3, 1, 4.0)],
            4, 24.0, 12.0,
            [2.0, 1.0, 1.0, 1.0],
            [28.0, 10.0, 6.0, 4.0],
        ),
    ],
)
def test_textbook_power_examples(edges, nodes, volts, ohms, amps, watts):
    solution = solve_network(edges, nodes, volts=volts)
    assert solution.resistance_ohms == pytest.approx(ohms, rel=1e-14)
    assert solution.edge_amps == pytest.approx(amps, rel=1e-12)
    assert solution.edge_watts == pytest.approx(watts, rel=1e-12)
    # same examples: total power 0.9 W, 18 W, 48 W = V * I = V^2 / R
    assert math.fsum(solution.edge_watts) == pytest.approx(volts**2 / ohms, rel=1e-12)


def test_solution_is_frozen_and_ordered():
    # OpenStax University Physics Vol. 2 §10.2 (E2): the 1 Ω branch carries 3 A
    solution = solve_network([Edge(0, 1, 2.0), Edge(1, 0, 1.0)], 2, volts=3.0)
    assert isinstance(solution, NodalSolution)
    # edge given as 1 -> 0: its current from a to b is negative
    assert solution.edge_amps == pytest.approx((1.5, -3.0), rel=1e-14)
    with pytest.raises(AttributeError):
        solution.resistance_ohms = 1.0  # type: ignore[misc]


# --- verify_resistance ---------------------------------------------------------


def test_verify_accepts_the_exact_value():
    # LIEC Vol. I ch. 10 "Δ-Y and Y-Δ conversions": R = 102/7 Ω
    nodal = verify_resistance(102 / 7, book_bridge(12.0, 18.0, 6.0, 18.0, 12.0), 4)
    assert rel_error(nodal, Fraction(102, 7)) <= EXACT_RTOL


@pytest.mark.parametrize(
    ("claim_factor", "accepted"),
    [
        (1 + 0.5 * VERIFY_RTOL, True),  # inside the tolerance: accepted
        (1 + 2 * VERIFY_RTOL, False),  # twice the tolerance off: rejected
        (13 / 11, False),  # a different network's value (OEIS A174283 13/11 vs 1)
    ],
)
def test_verify_tolerance_edges(claim_factor, accepted):
    # OEIS A174283/A174285: the unit bridge is exactly 1 Ω
    edges = bridge_edges(1.0, 1.0, 1.0, 1.0, 1.0)
    if accepted:
        assert verify_resistance(claim_factor, edges, 4) == pytest.approx(1.0, rel=1e-15)
    else:
        pattern = (
            r"nodal check gives .* Ω but the network claims .* Ω "
            r"\(relative difference .*, tolerance 1e-09\)"
        )
        with pytest.raises(VerificationError, match=pattern):
            verify_resistance(claim_factor, edges, 4)


def test_verify_rtol_argument_is_used():
    # OpenStax UP2 §10.2 (E1): 90 Ω; a 1 % wrong claim passes only with rtol 2 %
    edges = E1_SERIES
    assert verify_resistance(90.9, edges, 6, rtol=0.02) == pytest.approx(90.0, rel=1e-14)
    with pytest.raises(VerificationError, match="tolerance 0.005"):
        verify_resistance(90.9, edges, 6, rtol=0.005)


# --- bad input: one row per way a netlist can be wrong ---------------------------


ONE_OHM = [Edge(0, 1, 1.0)]


@pytest.mark.parametrize(
    ("make_edges", "node_count", "options", "message"),
    [
        # zero ohms
        (lambda: [Edge(0, 1, 0.0)], 2, {}, "greater than zero"),
        # negative ohms
        (lambda: [Edge(0, 1, -5.0)], 2, {}, "greater than zero"),
        # nan ohms
        (lambda: [Edge(0, 1, math.nan)], 2, {}, "finite"),
        # infinite ohms (an open circuit, not a part)
        (lambda: [Edge(0, 1, math.inf)], 2, {}, "finite"),
        # text instead of a number
        (lambda: [Edge(0, 1, "10")], 2, {}, "must be a number"),
        # negative node index
        (lambda: [Edge(0, -1, 1.0)], 2, {}, "node index"),
        # self loop: both ends on one node
        (lambda: [Edge(0, 0, 1.0), Edge(0, 1, 1.0)], 2, {}, "joins node 0 to itself"),
        # node index beyond node_count
        (lambda: [Edge(0, 2, 1.0), Edge(2, 1, 1.0)], 2, {}, "uses node 2"),
        # source == sink
        (lambda: ONE_OHM, 2, {"source": 1, "sink": 1}, "terminals must be different"),
        # terminal outside the netlist
        (lambda: ONE_OHM, 2, {"source": 5}, "source=5 is outside"),
        # a floating pair of nodes joined to each other only
        (lambda: [Edge(0, 1, 1.0), Edge(2, 3, 1.0)], 4, {}, "node 2 is not connected"),
        # a node index with no edges at all
        (lambda: ONE_OHM, 3, {}, "node 2 has no edges"),
        # source and sink in different components
        (lambda: [Edge(0, 2, 1.0), Edge(1, 3, 1.0)], 4, {}, "open circuit"),
        # no edges at all
        (lambda: [], 2, {}, "open circuit"),
        # fewer than two nodes
        (lambda: ONE_OHM, 1, {}, "at least 2 nodes"),
        # nan drive voltage
        (lambda: ONE_OHM, 2, {"volts": math.nan}, "drive voltage"),
    ],
)
def test_bad_input_raises_verification_error(make_edges, node_count, options, message):
    # expected behaviour from the project brief: a one-line VerificationError
    # naming the fault (edges are built inside the check: Edge validates itself)
    with pytest.raises(VerificationError, match=message) as info:
        solve_network(make_edges(), node_count, **options)
    assert "\n" not in str(info.value)


@pytest.mark.parametrize(
    ("claimed", "message"),
    [
        (0.0, "claimed resistance"),  # zero claim
        (-1.0, "claimed resistance"),  # negative claim
        (math.inf, "claimed resistance"),  # infinite claim
    ],
)
def test_bad_claim_raises_verification_error(claimed, message):
    # expected behaviour from the project brief
    with pytest.raises(VerificationError, match=message):
        verify_resistance(claimed, ONE_OHM, 2)


# --- layering: the verifier must not see the series/parallel code -----------------


def test_nodal_imports_only_errors_from_netsynth():
    # house style (STYLE.md §1): nodal must never import the series/parallel formula
    source = Path(__file__).resolve().parents[1] / "netsynth" / "nodal.py"
    tree = ast.parse(source.read_text(encoding="utf-8"))
    imported = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            imported.update(alias.name for alias in node.names)
        elif isinstance(node, ast.ImportFrom):
            imported.add(("." * node.level) + (node.module or ""))
    ours = {name for name in imported if name.startswith(("netsynth", "."))}
    # netsynth.limits holds numbers only (the netlist sizes and resistance range it takes)
    assert ours <= {"netsynth.errors", "netsynth.limits"} and "netsynth.errors" in ours
