"""Any two-terminal resistor network, bridges included: value, stress, bands, all from nodal solves.

:mod:`netsynth.netlist` reads the file and finds the parts that can carry current between the
two terminals; this module analyses those parts with :mod:`netsynth.nodal` only, so it needs no
``+``/``||`` form and works for a Wheatstone bridge as for a ladder.

Map of the module
-----------------
``ElementReview`` / ``NetlistReview``   one element's line and share of the power / the whole network
:func:`review_netlist`                   the analysis; its ``review`` has the same shape as
                                         :func:`netsynth.analysis.review.review` gives a tree
:func:`sample_resistances`               resistances of many perturbed copies (batched solves)

What is computed, and how
    * **value**: the nodal solve (:func:`netsynth.nodal.solve_network`, refined to a few ulps).
    * **parts without current**: besides the dead parts of the topology, a live part whose
      current is below :data:`NO_CURRENT` of the network's (a balanced bridge at these values).
    * **stock lines**: each element tied to a line of the bin by
      :func:`netsynth.analysis.lines.tie_parts` (the rule of ``assign_lines``: counts do not
      bind, a value the bin lacks gets the defaults; with an operating point, most headroom).
    * **stress**: volts, amps and watts per element from the solve at the operating point,
      against its own line's derated limits (:func:`netsynth.analysis.stress.part_stress`).
    * **worst case**: every part at the low end of its band, and every part at the high end: two
      solves, exact for any passive network, since its resistance never falls when a part's
      value grows (Rayleigh's monotonicity law; no search over the 2^n corners is needed).
    * **RSS and σ**: the GUM first-order law with sensitivities ``S_i = P_i / P`` (power shares
      from the solve; Tellegen's theorem), as for trees.
    * **Monte Carlo**: each build's resistance from its own conductance matrix, solved in
      batches with ``numpy.linalg.solve`` (no refinement: 1e-8 relative is ample against
      tolerances of 1e-3 and up). Samples are bounded so the work stays near
      :data:`MC_WORK` flops (n³ per solve for n nodes): 10 000 builds for networks of up to
      ~27 nodes, fewer above, never fewer than :data:`MC_MIN_SAMPLES`; the report states the count.
      Netlists of more than :data:`MAX_NODES` nodes are refused.
    * **temperature**: ``Σ S_i·|α_i|`` as for trees.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from netsynth.analysis.conditions import Derating, OperatingPoint
from netsynth.analysis.lines import tie_parts
from netsynth.analysis.review import MC_SAMPLES, Review, assemble
from netsynth.analysis.stress import NetworkStress, PartLoad, default_line, part_stress
from netsynth.analysis.thermal import REFERENCE_C
from netsynth.errors import ArgumentError
from netsynth.analysis.tolerance import HIGH_QUANTILE, LOW_QUANTILE, MonteCarlo, ToleranceBand
from netsynth.netlist import Topology
from netsynth.nodal import Edge, solve_network
from netsynth.stock import StockBin, StockItem

__all__ = ["MAX_NODES", "NO_CURRENT", "ElementReview", "NetlistReview", "review_netlist", "sample_resistances"]

#: a live part whose current is below this share of the network's carries none (a balanced bridge):
#: the solve's edge currents are good to a few ulps of the drive over the part's resistance, so
#: float noise stays near 1e-15 of the network's current for parts within a few decades of the
#: network's value; 1e-12 is above that noise and far below any current a real imbalance leaves.
NO_CURRENT = 1e-12
#: flops allowed for the Monte Carlo (n³ per solve): a second or two of numpy (measured: a 20 × 20 grid of
#: 760 parts and 400 nodes, 312 builds; the whole check about 2 s on two cores)
MC_WORK = 2e10
#: the fewest Monte Carlo builds, whatever the size
MC_MIN_SAMPLES = 100
#: the most nodes of the live network: beyond, a dense solve per build would take minutes
MAX_NODES = 600
#: builds solved per batch (bounds the memory: batch × n² floats)
_BATCH = 256


@dataclass(frozen=True, slots=True)
class ElementReview:
    """One live element: its netlist index, stock line, share of the power and current."""

    index: int  #: index into ``Netlist.elements``
    line: StockItem  #: the stock line it is (or the bin defaults when ``in_bin`` is False)
    in_bin: bool
    share: float  #: P_i / P: its share of the network's power, also its relative sensitivity
    current_share: float  #: |I_i| / I: its current over the network's
    no_current: bool  #: True when ``current_share`` is below :data:`NO_CURRENT`


@dataclass(frozen=True, slots=True)
class NetlistReview:
    """A netlist between two terminals, analysed by nodal solves (see the module docstring)."""

    topology: Topology
    value_ohms: float
    elements: tuple[ElementReview, ...]  #: one per live element, in ``topology.live`` order
    review: Review  #: bands, Monte Carlo, drift, stress (element order), cautions and notes

    @property
    def no_current(self) -> tuple[tuple[int, str], ...]:
        """(element index, reason) of every part that carries no current, dead or balanced."""
        a, b = self.topology.between
        balanced = [(e.index, f"no current at these values (balanced bridge between {a} and {b})")
                    for e in self.elements if e.no_current]
        return tuple(sorted([*self.topology.dead, *balanced]))


def sample_resistances(edges: list[Edge], node_count: int, factors: np.ndarray) -> np.ndarray:
    """Resistance between nodes 0 and 1 of the netlist with edge k scaled by ``factors[s, k]``.

    One plain ``numpy.linalg.solve`` per build (grounded Laplacian, unit current into node 0),
    in batches of :data:`_BATCH`. Relative accuracy about 1e-8 (no refinement; see
    :mod:`netsynth.nodal`), meant for statistics, not verification.
    """
    ohms = np.array([e.ohms for e in edges]) * factors  # (S, E)
    g = 1.0 / ohms
    g /= g.max(axis=1, keepdims=True)  # scale into (0, 1] per build, as the nodal solver does
    scale = 1.0 / (np.array([e.ohms for e in edges]) * factors).min(axis=1)  # the largest conductance
    free = [n for n in range(node_count) if n != 1]
    row = np.full(node_count, -1)
    row[free] = np.arange(len(free))
    a = row[[e.a for e in edges]]
    b = row[[e.b for e in edges]]
    out = np.empty(len(factors))
    m = len(free)
    for start in range(0, len(factors), _BATCH):
        gs = g[start:start + _BATCH]
        mats = np.zeros((len(gs), m, m))
        for k in range(len(edges)):
            i, j = a[k], b[k]
            if i >= 0:
                mats[:, i, i] += gs[:, k]
            if j >= 0:
                mats[:, j, j] += gs[:, k]
            if i >= 0 and j >= 0:
                mats[:, i, j] -= gs[:, k]
                mats[:, j, i] -= gs[:, k]
        rhs = np.zeros((len(gs), m, 1))
        rhs[:, row[0], 0] = 1.0
        out[start:start + len(gs)] = np.linalg.solve(mats, rhs)[:, row[0], 0]
    return out / scale


def review_netlist(
    topo: Topology,
    stock: StockBin,
    point: OperatingPoint | None = None,
    derating: Derating = Derating(),
    target_ohms: float | None = None,
    spec: float | None = None,
    temp_c: float | None = None,
    samples: int | None = None,
    seed: int = 1,
) -> NetlistReview:
    """Analyse the live parts of a netlist between its two terminals (see the module docstring).

    ``samples`` (Monte Carlo builds) defaults to :data:`MC_SAMPLES` bounded by :data:`MC_WORK`.

    Examples
    --------
    The Wheatstone bridge of Lessons In Electric Circuits Vol. I ch. 10 ("Δ-Y and Y-Δ
    conversions"): 102/7 Ω between A and B.

    >>> from netsynth.netlist import parse_edges, topology
    >>> net = parse_edges("A,C,12\\nA,D,18\\nC,D,6\\nC,B,18\\nD,B,12")
    >>> r = review_netlist(topology(net, "A", "B"), StockBin((StockItem(12.0),)))
    >>> round(r.value_ohms * 7, 9), r.topology.series_parallel
    (102.0, False)
    """
    edges = list(topo.edges)
    nodes = len(topo.node_names)
    if nodes > MAX_NODES:
        raise ArgumentError(f"{topo.netlist.name}: {nodes} nodes between {' and '.join(topo.between)}; netsynth "
                            f"checks netlists of up to {MAX_NODES} nodes")
    elements = [topo.netlist.elements[i] for i in topo.live]
    unit = solve_network(edges, nodes, volts=1.0)
    value = unit.resistance_ohms
    total_amps, total_watts = 1.0 / value, 1.0 / value  # at 1 V
    shares = [w / total_watts for w in unit.edge_watts]
    current = [abs(i) / total_amps for i in unit.edge_amps]

    loads = None
    stress = None
    if point is not None:
        volts = point.volts_across(value)
        loads = [PartLoad(e.ohms, abs(v * volts), abs(i * volts), w * volts * volts * point.duty)
                 for e, v, i, w in zip(elements, unit.edge_volts, unit.edge_amps, unit.edge_watts)]
    tied = tie_parts([e.ohms for e in elements], stock, point, derating, loads=loads, counts_bind=False,
                     missing_ok=True)
    assert tied is not None  # counts do not bind and missing values are allowed
    lines = [(line, True) if line is not None else (default_line(e.ohms), False)
             for line, e in zip(tied[0], elements)]
    if point is not None:
        volts = point.volts_across(value)
        stress = NetworkStress(volts, volts / value, volts * volts / value * point.duty, value,
                               tuple(part_stress(load, line, held, point, derating)
                                     for load, (line, held) in zip(loads, lines)))

    tol = np.array([line.tolerance for line, _ in lines])
    low = solve_network([Edge(e.a, e.b, e.ohms * (1 - t)) for e, t in zip(edges, tol)], nodes).resistance_ohms
    high = solve_network([Edge(e.a, e.b, e.ohms * (1 + t)) for e, t in zip(edges, tol)], nodes).resistance_ohms
    rss = math.sqrt(math.fsum((s * t) ** 2 for s, t in zip(shares, tol)))
    band = ToleranceBand(value, low, high, rss, rss / math.sqrt(3.0))

    target = value if target_ohms is None else target_ohms
    if samples is None:
        samples = int(min(MC_SAMPLES, max(MC_MIN_SAMPLES, MC_WORK / max(nodes - 1, 1) ** 3)))
    rng = np.random.default_rng(seed)
    factors = 1.0 + tol[None, :] * rng.uniform(-1.0, 1.0, size=(samples, len(edges)))
    built = sample_resistances(edges, nodes, factors)
    ratio = built / value
    mc = MonteCarlo(
        samples=samples, seed=seed, mean_rel=float(np.mean(ratio) - 1.0), sigma_rel=float(np.std(ratio, ddof=1)),
        low_rel=float(np.quantile(ratio, LOW_QUANTILE) - 1.0), high_rel=float(np.quantile(ratio, HIGH_QUANTILE) - 1.0),
        yield_fraction=None if spec is None else float(np.mean(np.abs(built / target - 1.0) <= spec)),
        spec=spec, target_ohms=float(target),
    )
    tcr = math.fsum(s * line.tcr_ppm for s, (line, _) in zip(shares, lines))
    at_temp = None
    if temp_c is not None:
        drift = tcr * abs(temp_c - REFERENCE_C) * 1e-6
        at_temp = (max(0.0, value * (1 - drift)), value * (1 + drift))
    missing = tuple(sorted({e.ohms for e, (_, held) in zip(elements, lines) if not held}))
    review = assemble(topo.network, value, band, mc, tcr, temp_c, at_temp, stress, point, target_ohms, missing)
    per = tuple(ElementReview(i, line, held, s, c, c < NO_CURRENT)
                for i, (line, held), s, c in zip(topo.live, lines, shares, current))
    return NetlistReview(topo, value, per, review)

