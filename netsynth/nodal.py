"""Independent nodal verifier: a netlist of resistors -> node potentials and resistance.

This module is the second, independent route to a network's value. It knows
nothing of series/parallel rules and imports nothing from netsynth except
:mod:`netsynth.errors`: it only sees a plain netlist (a list of :class:`Edge`
and a node count) and applies Kirchhoff's current law at every node.

Map of the module
-----------------
``Edge``                  one resistor between two node indices (validated on creation)
``NodalSolution``         resistance, node potentials and per-edge volts, amperes, watts
``solve_network``         validate, check connectivity, solve the grounded Laplacian system
``equivalent_resistance`` the resistance between the terminals only
``verify_resistance``     compare a claimed value with the nodal value (``VERIFY_RTOL``)
``VERIFY_RTOL``           relative tolerance of ``verify_resistance``, with its measurement

Method
------
The sink is grounded (0 V) and a unit current (scaled units, see below) is
injected at the source. With conductances ``g = 1/ohms`` the reduced Laplacian
(conductance) matrix ``A`` of the other nodes gives ``A @ w = e_source``; the
source potential ``w[source]`` *is* the resistance, and every potential is
then rescaled to the requested drive voltage. A current drive is used rather
than a voltage drive because the source potential is then the largest entry of
the solution, so a normwise-accurate solve gives it to full relative
precision; reading the resistance from the sum of currents leaving the source
instead subtracts nearly equal potentials across small resistors.

Numerical accuracy
------------------
Conductances over 1 mΩ..100 MΩ span 11 decades. They are first divided by the
largest one, so every matrix entry lies in (0, 1] and nothing can overflow or
underflow (a uniform scale does not change the condition number; it only keeps
the numbers in range). The condition number itself can reach ~1e12, and a plain
``numpy.linalg.solve`` then agrees with exact rational values only to about
1e-8 relative (measured: 300 ladders of 1..12 rungs, values log-uniform over
1 mΩ..10 MΩ, worst 8.7e-9 with a voltage drive, 5.8e-9 with a current drive).
The cause is the diagonal ``sum(g)``: adding 1e-7 S to 1e3 S loses the small
conductance's digits before the elimination starts.

The fix is iterative refinement with an *edge-wise* residual: the residual at
each node is recomputed from the individual edge currents ``g_e * (w_a - w_b)``
(summed with ``math.fsum``), never from the rounded diagonal, and corrections
come from the same ``numpy.linalg.solve``. Heuristically, the refined solution
is then the exact solution for conductances perturbed by a few ulps each, and
by Rayleigh's monotonicity law and homogeneity that moves the resistance by a
few ulps too, whatever the condition number. The tolerances rest on the
measurement, not on this argument. Measured against exact ``Fraction`` arithmetic
on 4000 ladders of 1..20 rungs over 1 mΩ..10 MΩ the worst relative error was
3.4e-16 (1.5 ulp); tests/test_nodal.py asserts 4e-15 (18 ulp) on ladders,
series chains and parallel sets. Refinement takes 1..4 rounds for 11 decades
(measured on random graphs of up to 150 nodes) and up to 9 for 14 decades;
beyond ~15 decades float64 cannot hold the small conductances next to the large
ones at all, and the solve raises VerificationError instead of guessing.

Large netlists
--------------
Up to :data:`DENSE_NODES` free nodes the grounded Laplacian is a dense matrix solved by
``numpy.linalg.solve``. Above that a dense matrix would cost O(n²) memory and O(n³) time per
solve (a 10 000-part chain: 800 MB and minutes; already some ms at a hundred nodes), so the
solver switches to a sparse symmetric
elimination (LDLᵀ) in minimum-degree order, kept in dictionaries, in the form of the
Grassmann–Taksar–Heyman algorithm [4]_: the matrix is held as edge conductances ``c_ij > 0``
and conductances to ground, and eliminating node k adds ``c_ik·c_kj/d_k`` to ``c_ij`` and
``c_ik·g_k/d_k`` to node i's conductance to ground, where ``d_k`` is the sum of k's
conductances. Every operation adds positive numbers, so no digits cancel and each pivot keeps
full relative accuracy; the edge-wise refinement above then works exactly as with the dense
solve. Eliminating a node of a series/parallel network never joins more than a few nodes, so
the factor stays linear in size (the solver never looks at the tree, only at the degrees). A
general netlist whose elimination would create more than
:data:`netsynth.limits.MAX_NODAL_FILL` entries is refused, as is a netlist of more than
:data:`netsynth.limits.MAX_NETLIST_EDGES` edges or :data:`netsynth.limits.MAX_NETLIST_NODES`
nodes (:class:`~netsynth.errors.ArgumentError`), so no input allocates beyond a bounded size.

Edge quantities are differences of potentials, so their absolute error is a few
ulps of the drive voltage: a 1 mΩ part in series with 10 MΩ shows its 1e-10 V
drop to about 1e-6 relative. That is ample for power and voltage checks and
does not affect the resistance.

References
----------
.. [1] G. Kirchhoff, "Ueber die Auflösung der Gleichungen, auf welche man bei
   der Untersuchung der linearen Vertheilung galvanischer Ströme geführt
   wird", Ann. Phys. 148 (1847) 497-508 (current law; Laplacian of a network).
.. [2] N. J. Higham, *Accuracy and Stability of Numerical Algorithms*, 2nd ed.,
   SIAM (2002), ch. 12 "Iterative Refinement".
.. [3] P. G. Doyle and J. L. Snell, *Random Walks and Electric Networks*, MAA
   (1984): Rayleigh's monotonicity law.
.. [4] W. K. Grassmann, M. I. Taksar, D. P. Heyman, "Regenerative analysis and steady
   state distributions for Markov chains", Oper. Res. 33 (1985) 1107-1116 (elimination
   without subtraction; from memory).
"""

from __future__ import annotations

import heapq
import itertools
import math
import numbers
from collections import deque
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

import netsynth.limits as limits  # numbers only: the sizes and ranges the solver takes
from netsynth.errors import ArgumentError, VerificationError

__all__ = [
    "VERIFY_RTOL",
    "Edge",
    "NodalSolution",
    "equivalent_resistance",
    "solve_network",
    "verify_resistance",
]

#: Relative tolerance of :func:`verify_resistance`.
#: The refined nodal solve agrees with exact rational arithmetic to 3.4e-16
#: relative at worst (measured, see the module docstring), and a series/parallel fold of
#: a network of up to a few hundred parts carries at most a few hundred ulps
#: (~1e-13). 1e-9 leaves a factor of >= 1e4 of headroom over both, yet is a
#: million times tighter than the 1e-3 of the finest stock tolerance (0.1 %), so
#: any wrong topology, swapped value or dropped part is still caught. A naive
#: dense solve (~5e-9 measured) would NOT pass at this tolerance; that is why the
#: solver refines.
VERIFY_RTOL: float = 1e-9

# Iterative refinement stops when a correction is below this many ulps of the
# largest potential. Measured rounds needed: at most 4 for 11 decades of values,
# 9 for 14 decades; _MAX_REFINE leaves room, and running out raises.
_STOP_ULPS = 4.0
_MAX_REFINE = 20

#: free nodes (all but the sink) up to which the dense solve is used; above it the sparse
#: elimination (see "Large netlists"). Measured on chains and ladders of 10..300 nodes: the two
#: take about as long up to a few dozen nodes, and beyond that the dense solve (O(n³) per
#: refinement round) runs 10 to 500 times slower, so the dense solve is kept for small netlists only.
DENSE_NODES = 24


@dataclass(frozen=True, slots=True)
class Edge:
    """One resistor of a netlist.

    Parameters
    ----------
    a, b : int
        Node indices at the two ends (0-based, different from each other).
        Current and voltage signs run from ``a`` to ``b``.
    ohms : float
        Resistance in ohms; greater than zero and finite.

    Raises
    ------
    VerificationError
        If ``ohms`` is not a finite number above zero, a node index is not a
        non-negative integer, or ``a == b``.
    """

    a: int
    b: int
    ohms: float

    def __post_init__(self) -> None:
        for name in ("a", "b"):
            value = getattr(self, name)
            if isinstance(value, bool) or not isinstance(value, numbers.Integral) or value < 0:
                raise VerificationError(
                    f"edge node {name}={value!r}: a node index must be an integer 0 or above"
                )
        if isinstance(self.ohms, bool) or not isinstance(self.ohms, numbers.Real):
            raise VerificationError(
                f"edge {self.a}-{self.b} ohms={self.ohms!r}: a resistance must be a number"
            )
        if not (math.isfinite(self.ohms) and self.ohms > 0):
            raise VerificationError(
                f"edge {self.a}-{self.b} ohms={self.ohms!r}: "
                "a resistance must be finite and greater than zero"
            )
        if not limits.MIN_OHMS <= self.ohms <= limits.MAX_OHMS:
            raise VerificationError(
                f"edge {self.a}-{self.b} ohms={self.ohms!r}: a resistance must be from {limits.OHMS_RANGE}"
            )
        if self.a == self.b:
            raise VerificationError(
                f"edge {self.a}-{self.b} ({self.ohms!r} Ω) joins node {self.a} to itself: "
                "a resistor needs two different nodes"
            )


@dataclass(frozen=True, slots=True)
class NodalSolution:
    """The nodal solution of a netlist under a voltage drive.

    Attributes
    ----------
    resistance_ohms : float
        Equivalent resistance between source and sink, in ohms.
    node_volts : tuple of float
        Potential of each node in volts, sink = 0 V, source = the drive voltage.
    edge_volts : tuple of float
        ``V(a) - V(b)`` per edge in volts, in the order of the edges given.
    edge_amps : tuple of float
        Current from ``a`` to ``b`` per edge in amperes.
    edge_watts : tuple of float
        Power dissipated per edge in watts (never negative).
    """

    resistance_ohms: float
    node_volts: tuple[float, ...]
    edge_volts: tuple[float, ...]
    edge_amps: tuple[float, ...]
    edge_watts: tuple[float, ...]


def _check_netlist(edges: Sequence[Edge], node_count: int, source: int, sink: int) -> None:
    """Raise VerificationError unless the netlist is well formed and nothing floats."""
    if isinstance(node_count, bool) or not isinstance(node_count, numbers.Integral):
        raise VerificationError(f"node_count={node_count!r}: expected an integer of 2 or more")
    if node_count < 2:
        raise VerificationError(
            f"node_count={node_count}: a network needs at least 2 nodes (source and sink)"
        )
    if node_count > limits.MAX_NETLIST_NODES:
        raise ArgumentError(
            f"node_count={node_count}: the nodal solver takes netlists of up to "
            f"{limits.MAX_NETLIST_NODES} nodes"
        )
    for name, value in (("source", source), ("sink", sink)):
        if isinstance(value, bool) or not isinstance(value, numbers.Integral):
            raise VerificationError(f"{name}={value!r}: expected a node index (integer)")
        if not 0 <= value < node_count:
            raise VerificationError(
                f"{name}={value} is outside the nodes 0..{node_count - 1}; "
                "pick a terminal inside the netlist"
            )
    if source == sink:
        raise VerificationError(
            f"source and sink are both node {source}: the terminals must be different nodes"
        )
    neighbours: list[list[int]] = [[] for _ in range(node_count)]
    for index, edge in enumerate(edges):
        if not isinstance(edge, Edge):
            raise VerificationError(f"edge {index} is {edge!r}: expected an Edge(a, b, ohms)")
        for end in (edge.a, edge.b):
            if end >= node_count:
                raise VerificationError(
                    f"edge {index} ({edge.a}-{edge.b}, {edge.ohms!r} Ω) uses node {end}, "
                    f"outside the nodes 0..{node_count - 1}; raise node_count or fix the edge"
                )
        neighbours[edge.a].append(edge.b)
        neighbours[edge.b].append(edge.a)
    # Breadth-first search from the source: every node must be reached,
    # the sink included, or the network is open or has a floating part.
    reached = [False] * node_count
    reached[source] = True
    queue = deque([source])
    while queue:
        node = queue.popleft()
        for other in neighbours[node]:
            if not reached[other]:
                reached[other] = True
                queue.append(other)
    if not reached[sink]:
        raise VerificationError(
            f"no path joins source node {source} to sink node {sink}: "
            "the network is an open circuit"
        )
    for node in range(node_count):
        if not reached[node]:
            what = "has no edges" if not neighbours[node] else "is not connected to the terminals"
            raise VerificationError(
                f"node {node} {what} (it floats); connect it or leave it out of node_count"
            )


class _DenseSolver:
    """The grounded Laplacian as a dense matrix; each solve is ``numpy.linalg.solve``."""

    def __init__(self, ra: list[int], rb: list[int], siemens: list[float], size: int) -> None:
        matrix = np.zeros((size, size))
        for i, j, g in zip(ra, rb, siemens):
            if i >= 0:
                matrix[i, i] += g
            if j >= 0:
                matrix[j, j] += g
            if i >= 0 and j >= 0:
                matrix[i, j] -= g
                matrix[j, i] -= g
        self.matrix = matrix

    def solve(self, rhs: np.ndarray) -> np.ndarray:
        try:
            return np.linalg.solve(self.matrix, rhs)
        except np.linalg.LinAlgError:
            raise _too_many_decades() from None


class _SparseSolver:
    """LDLᵀ of the grounded Laplacian by elimination without subtraction (module docstring).

    ``conductance[i]`` maps each neighbour j of free node i to the conductance ``c_ij > 0``
    between them (parallel edges summed); ``ground[i]`` is i's conductance to the grounded
    sink. Nodes are eliminated in minimum-degree order (a heap with stale entries skipped);
    each elimination records its pivot ``d_k`` and the multipliers ``c_ik / d_k``.
    """

    def __init__(self, ra: list[int], rb: list[int], siemens: list[float], size: int) -> None:
        conductance: list[dict[int, float]] = [{} for _ in range(size)]
        ground = [0.0] * size
        for i, j, g in zip(ra, rb, siemens):
            if i >= 0 and j >= 0:
                conductance[i][j] = conductance[i].get(j, 0.0) + g
                conductance[j][i] = conductance[j].get(i, 0.0) + g
            elif i >= 0:
                ground[i] += g
            elif j >= 0:
                ground[j] += g
        heap = [(len(conductance[k]), k) for k in range(size)]
        heapq.heapify(heap)
        done = [False] * size
        self.order: list[int] = []
        self.pivots: list[float] = []
        self.columns: list[list[tuple[int, float]]] = []
        work = 0
        while heap:
            degree, k = heapq.heappop(heap)
            if done[k] or degree != len(conductance[k]):
                continue  # a stale entry: k was eliminated, or its degree changed since
            done[k] = True
            row = conductance[k]
            work += len(row) * len(row)
            if work > limits.MAX_NODAL_FILL:
                raise ArgumentError(
                    f"the netlist is too densely connected for the nodal solver: eliminating its "
                    f"nodes would create more than {limits.MAX_NODAL_FILL} entries"
                )
            pivot = ground[k] + math.fsum(row.values())
            if not pivot > 0:
                raise _too_many_decades()
            kids = list(row.items())
            for i, _ in kids:
                del conductance[i][k]
            for n, (i, c_ik) in enumerate(kids):
                share = c_ik / pivot
                ground[i] += share * ground[k]
                near = conductance[i]
                for j, c_kj in kids[n + 1:]:
                    added = share * c_kj
                    near[j] = near.get(j, 0.0) + added
                    conductance[j][i] = near[j]
            for i, _ in kids:
                heapq.heappush(heap, (len(conductance[i]), i))
            conductance[k] = {}
            self.order.append(k)
            self.pivots.append(pivot)
            self.columns.append([(i, c_ik / pivot) for i, c_ik in kids])

    def solve(self, rhs: np.ndarray) -> np.ndarray:
        b = rhs.tolist()
        for k, column in zip(self.order, self.columns):  # forward: L z = b
            bk = b[k]
            if bk:
                for i, m in column:
                    b[i] += m * bk
        x = [0.0] * len(b)
        for k, pivot, column in zip(reversed(self.order), reversed(self.pivots), reversed(self.columns)):
            x[k] = b[k] / pivot + math.fsum(m * x[i] for i, m in column)  # backward: D Lᵀ x = z
        return np.array(x)


def _too_many_decades() -> VerificationError:
    # Only possible when the values span more decades than float64 holds
    # (~16): the small conductances vanish from the rounded diagonal.
    return VerificationError(
        "the nodal matrix is singular in float64: the resistances span too many "
        "decades (more than about 15); split the check or rescale the parts"
    )


def _solve_unit_current(
    a_nodes: np.ndarray,
    b_nodes: np.ndarray,
    siemens: np.ndarray,
    node_count: int,
    source: int,
    sink: int,
) -> np.ndarray:
    """Potentials (all nodes, sink = 0) for a unit current into ``source``.

    ``siemens`` must already be scaled into (0, 1]. Solves the grounded
    Laplacian (dense up to :data:`DENSE_NODES` free nodes, sparse above) and refines
    with an edge-wise residual (see the module docstring).
    """
    free = np.array([n for n in range(node_count) if n != sink], dtype=np.intp)
    row = np.full(node_count, -1, dtype=np.intp)
    row[free] = np.arange(free.size)
    ra, rb = row[a_nodes].tolist(), row[b_nodes].tolist()
    kind = _DenseSolver if free.size <= DENSE_NODES else _SparseSolver
    solver = kind(ra, rb, siemens.tolist(), int(free.size))
    rhs = np.zeros(free.size)
    rhs[row[source]] = 1.0

    potentials = np.zeros(node_count)
    potentials[free] = solver.solve(rhs)
    a_list, b_list = a_nodes.tolist(), b_nodes.tolist()
    for _ in range(_MAX_REFINE):
        # Edge-wise residual: injected current minus the current leaving each node,
        # built from the individual edge currents (one rounding each) and summed
        # exactly, so the rounded diagonal of the matrix never enters it.
        flows = (siemens * (potentials[a_nodes] - potentials[b_nodes])).tolist()
        terms: list[list[float]] = [[] for _ in range(node_count)]
        terms[source].append(1.0)
        for a, b, flow in zip(a_list, b_list, flows):
            terms[a].append(-flow)
            terms[b].append(flow)
        residual = np.array([math.fsum(terms[n]) for n in free.tolist()])
        correction = solver.solve(residual)
        if not np.all(np.isfinite(correction)):
            raise _too_many_decades()
        potentials[free] += correction
        if np.max(np.abs(correction)) <= _STOP_ULPS * np.spacing(np.max(np.abs(potentials))):
            return potentials
    raise VerificationError(
        f"the nodal solve did not settle after {_MAX_REFINE} refinement rounds: the "
        "resistances span too many decades for float64; split the check or rescale the parts"
    )


def solve_network(
    edges: Sequence[Edge],
    node_count: int,
    source: int = 0,
    sink: int = 1,
    volts: float = 1.0,
) -> NodalSolution:
    """Solve a resistor netlist by nodal analysis under a voltage drive.

    Parameters
    ----------
    edges : sequence of Edge
        The resistors. Parallel edges between the same two nodes are allowed.
    node_count : int
        Number of nodes; indices run 0..node_count-1 and every one of them must
        be connected to the terminals.
    source, sink : int
        Terminal nodes. The source is driven to ``volts``, the sink is 0 V.
    volts : float
        Drive voltage in volts (finite; may be negative or zero).

    Returns
    -------
    NodalSolution
        Resistance in ohms; node potentials in volts; per-edge volts, amperes
        and watts in the order of ``edges``.

    Raises
    ------
    VerificationError
        On an invalid edge, a node index outside ``0..node_count-1``,
        ``source == sink``, no path from source to sink, a node that floats
        (not connected to the terminals, or with no edges at all), a resistance
        outside 1 µΩ .. 1 TΩ, or values spanning too many decades (> ~15) for a
        float64 solve.
    ArgumentError
        On more than :data:`netsynth.limits.MAX_NETLIST_EDGES` edges or
        :data:`netsynth.limits.MAX_NETLIST_NODES` nodes, a drive above 1 MV, or a
        netlist whose sparse elimination would exceed :data:`netsynth.limits.MAX_NODAL_FILL`.

    Notes
    -----
    The resistance has a relative error of a few ulps (measured worst 3.4e-16
    over 1 mΩ..10 MΩ; see the module docstring for the method). Values
    spanning more than ~15 decades raise VerificationError.

    References
    ----------
    Kirchhoff's current law on the grounded Laplacian; iterative refinement as
    in N. J. Higham, *Accuracy and Stability of Numerical Algorithms*, ch. 12.

    Examples
    --------
    A Wheatstone bridge that is not series-parallel (Lessons In Electric
    Circuits Vol. I, ch. 10, "Δ-Y and Y-Δ conversions": R = 102/7 Ω):

    >>> bridge = [Edge(0, 2, 12.0), Edge(0, 3, 18.0), Edge(2, 3, 6.0),
    ...           Edge(2, 1, 18.0), Edge(3, 1, 12.0)]
    >>> solution = solve_network(bridge, node_count=4, volts=10.0)
    >>> round(solution.resistance_ohms * 7, 9)
    102.0
    >>> [round(v, 4) for v in solution.edge_volts]
    [4.7059, 5.2941, 0.5882, 5.2941, 4.7059]
    """
    if isinstance(volts, bool) or not isinstance(volts, numbers.Real) or not math.isfinite(volts):
        raise VerificationError(f"volts={volts!r}: the drive voltage must be a finite number")
    if abs(volts) > limits.MAX_VOLTS:
        raise ArgumentError(f"volts={volts!r}: the drive voltage is at most {limits.VOLTS_RANGE.split(' to ')[1]}")
    edges = list(itertools.islice(edges, limits.MAX_NETLIST_EDGES + 1))
    if len(edges) > limits.MAX_NETLIST_EDGES:
        raise ArgumentError(f"the nodal solver takes netlists of up to {limits.MAX_NETLIST_EDGES} edges")
    _check_netlist(edges, node_count, source, sink)

    a_nodes = np.array([e.a for e in edges], dtype=np.intp)
    b_nodes = np.array([e.b for e in edges], dtype=np.intp)
    ohms = np.array([float(e.ohms) for e in edges])
    # Every edge is 1 µΩ .. 1 TΩ and |volts| at most 1 MV, so nothing below overflows; errstate
    # keeps numpy quiet all the same, and the results are checked to be finite.
    with np.errstate(all="ignore"):
        siemens = 1.0 / ohms
        # Scale into (0, 1]: keeps every entry and sum in range for any finite ohms.
        scale = float(np.max(siemens))
        unit = _solve_unit_current(a_nodes, b_nodes, siemens / scale, node_count, source, sink)

        # In scaled units a unit current gives potentials `unit`; with the true
        # conductances (scale times larger) the potentials are unit/scale, so the
        # resistance is unit[source] / scale.
        resistance = float(unit[source]) / scale
        node_volts = unit * (float(volts) / float(unit[source]))
        node_volts[sink] = 0.0
        node_volts[source] = float(volts)
        edge_volts = node_volts[a_nodes] - node_volts[b_nodes]
        edge_amps = edge_volts / ohms
        edge_watts = edge_volts * edge_amps
    if not (math.isfinite(resistance) and resistance > 0 and np.all(np.isfinite(edge_watts))):
        raise _too_many_decades()
    return NodalSolution(
        resistance_ohms=resistance,
        node_volts=tuple(node_volts.tolist()),
        edge_volts=tuple(edge_volts.tolist()),
        edge_amps=tuple(edge_amps.tolist()),
        edge_watts=tuple(edge_watts.tolist()),
    )


def equivalent_resistance(
    edges: Sequence[Edge], node_count: int, source: int = 0, sink: int = 1
) -> float:
    """Equivalent resistance between two nodes of a netlist, in ohms.

    Parameters
    ----------
    edges : sequence of Edge
        The resistors.
    node_count : int
        Number of nodes (all must connect to the terminals).
    source, sink : int
        The two terminals.

    Returns
    -------
    float
        Resistance in ohms, relative error of a few ulps over 1 mΩ..10 MΩ.

    Raises
    ------
    VerificationError
        As :func:`solve_network`.

    Examples
    --------
    Unit Wheatstone bridge with one outer arm doubled (OEIS A174283: 13/11 Ω):

    >>> arms = [Edge(0, 2, 2.0), Edge(0, 3, 1.0), Edge(2, 3, 1.0),
    ...         Edge(2, 1, 1.0), Edge(3, 1, 1.0)]
    >>> round(equivalent_resistance(arms, 4) * 11, 12)
    13.0
    """
    return solve_network(edges, node_count, source, sink).resistance_ohms


def verify_resistance(
    claimed_ohms: float,
    edges: Sequence[Edge],
    node_count: int,
    source: int = 0,
    sink: int = 1,
    rtol: float = VERIFY_RTOL,
) -> float:
    """Check a claimed resistance against the nodal solve; return the nodal value.

    Parameters
    ----------
    claimed_ohms : float
        The value the caller believes the netlist has, in ohms (> 0).
    edges, node_count, source, sink
        The netlist, as for :func:`solve_network`.
    rtol : float
        Largest accepted ``|nodal / claimed - 1|`` (a fraction). The default
        ``VERIFY_RTOL`` = 1e-9 is explained where it is defined.

    Returns
    -------
    float
        The nodal resistance in ohms.

    Raises
    ------
    VerificationError
        If the two disagree by more than ``rtol``, ``claimed_ohms`` is not a
        finite number above zero, or the netlist is invalid.

    Examples
    --------
    >>> verify_resistance(1.0, [Edge(0, 1, 2.0), Edge(0, 1, 2.0)], 2)
    1.0
    """
    if (
        isinstance(claimed_ohms, bool)
        or not isinstance(claimed_ohms, numbers.Real)
        or not (math.isfinite(claimed_ohms) and claimed_ohms > 0)
    ):
        raise VerificationError(
            f"claimed_ohms={claimed_ohms!r}: the claimed resistance must be finite and above zero"
        )
    if not (isinstance(rtol, numbers.Real) and math.isfinite(rtol) and rtol >= 0):
        raise VerificationError(f"rtol={rtol!r}: the tolerance must be a finite fraction >= 0")
    nodal = equivalent_resistance(edges, node_count, source, sink)
    difference = abs(nodal / claimed_ohms - 1.0)
    if not difference <= rtol:
        raise VerificationError(
            f"nodal check gives {nodal!r} Ω but the network claims {claimed_ohms!r} Ω "
            f"(relative difference {difference:.3g}, tolerance {rtol:.3g})"
        )
    return nodal
