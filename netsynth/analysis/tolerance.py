"""How part tolerances stack up into the tolerance of a whole network.

Map of the module
-----------------
:func:`sensitivities`
    Relative sensitivity of the network value to each part, ``S_i = P_i / P``,
    read from the nodal solve (power shares), not from series/parallel rules.
:func:`tolerance_band` / ``ToleranceBand``
    Exact worst case (two tree evaluations, by Rayleigh's monotonicity law) and
    the first-order statistical figures of the GUM.
:func:`sample_values` / :func:`monte_carlo` / ``MonteCarlo``
    Builds simulated with every part uniform within its band, evaluated all at
    once with numpy arrays at the leaves; quantiles and the yield against a spec.

Every sequence of per-part figures (tolerances, sensitivities) follows the order
of :func:`netsynth.network.parts_in_order`, which is also the edge order of
:func:`netsynth.network.to_netlist`. Tolerances are fractions: 0.01 means ±1 %.

Caveat: RSS and Monte Carlo assume independent, centred errors. Parts from one
reel are often correlated and tight parts may be binned out of a wider
distribution, so neither is a guaranteed bound; only the worst case is.
"""

from __future__ import annotations

import math
import numbers
from collections.abc import Iterable, Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np

from netsynth.errors import ValueParseError
from netsynth.network import Network, Part, Series, parts_in_order, to_netlist
from netsynth.nodal import solve_network

#: quantiles reported by :func:`monte_carlo`: the central 99 % of builds
LOW_QUANTILE = 0.005
HIGH_QUANTILE = 0.995


# ---------------------------------------------------------------- evaluation


def _evaluate(net: Network, leaves: Iterable[Any]) -> Any:
    """The network's value with the i-th leaf in place of the i-th part (parts_in_order order).

    Works for floats and for numpy arrays of equal shape (one entry per build):
    series is the sum, parallel the reciprocal of the sum of reciprocals.
    The walk is depth first, children left to right, which is the order of
    ``parts_in_order``, so an iterator hands each part its own leaf. It streams:
    each open group keeps one running total (summed left to right, as ``sum`` would),
    so `leaves` may be a generator and memory is one leaf per level of the tree, not
    one per part (a 10 000-part Monte Carlo would otherwise hold 10 000 arrays).
    """
    values = iter(leaves)
    if isinstance(net, Part):
        return next(values)
    # one frame per open group: [group, its children not yet visited, running total]
    stack: list[list[Any]] = [[net, iter(net.children), None]]
    while True:
        frame = stack[-1]
        child = next(frame[1], None)
        if child is None:
            stack.pop()
            value = frame[2] if isinstance(frame[0], Series) else 1.0 / frame[2]
            if not stack:
                return value
        elif isinstance(child, Part):
            value = next(values)
        else:
            stack.append([child, iter(child.children), None])
            continue
        outer = stack[-1]
        term = value if isinstance(outer[0], Series) else 1.0 / value
        outer[2] = term if outer[2] is None else outer[2] + term


def _check_tolerances(net: Network, tolerances: Sequence[float]) -> np.ndarray:
    """The tolerances as an array, one per part, each a fraction in [0, 1)."""
    parts = parts_in_order(net)
    values = list(tolerances)
    if len(values) != len(parts):
        raise ValueParseError(
            f"got {len(values)} tolerances for a network of {len(parts)} parts: "
            "give one fraction per part, in parts_in_order order"
        )
    for index, t in enumerate(values):
        if isinstance(t, bool) or not isinstance(t, numbers.Real) or not (0.0 <= t < 1.0):
            raise ValueParseError(
                f"tolerance {index} = {t!r}: expected a fraction from 0 up to (not including) 1, "
                "e.g. 0.01 for ±1 %"
            )
    return np.array(values, dtype=float)


# ---------------------------------------------------------------- sensitivities


def sensitivities(net: Network) -> tuple[float, ...]:
    """Relative sensitivity of the network value to each part.

    ``S_i = (R_i / R) · ∂R/∂R_i``: a change of x % in part i alone changes the
    network by about ``S_i · x`` %.

    Parameters
    ----------
    net : Network
        Any series/parallel tree.

    Returns
    -------
    tuple of float
        One dimensionless figure per part in :func:`parts_in_order` order, each
        in [0, 1]; they sum to 1.

    Raises
    ------
    VerificationError
        If the nodal solve fails (values spanning more than ~15 decades).

    Notes
    -----
    For any two-terminal resistor network ``∂R/∂R_i = (I_i / I)²``, so
    ``S_i = R_i·I_i² / (R·I²) = P_i / P``: the part's share of the dissipated
    power. This follows from Tellegen's theorem (Cohn's theorem). The shares
    are taken from the nodal solve's ``edge_watts`` and divided by ``P = V²/R``
    with the nodal ``R``, so nothing here uses the series/parallel rules and the
    sum equals 1 only because power is conserved. They sum to 1 also by Euler's
    theorem: R is homogeneous of degree 1 in the part values.

    References
    ----------
    P. Penfield, R. Spence, S. Duinker, *Tellegen's Theorem and Electrical
    Networks*, MIT Press (1970) (from memory). R. M. Cohn, "The resistance of an
    electrical network", Proc. AMS 1 (1950) 316-324 (from memory).

    Examples
    --------
    Series parts share the power as their values (reference-values §6, c_i = 1):

    >>> from netsynth.network import from_text
    >>> [round(s, 12) for s in sensitivities(from_text("1k + 3k"))]
    [0.25, 0.75]
    """
    edges, nodes = to_netlist(net)
    solution = solve_network(edges, nodes, volts=1.0)
    total_watts = 1.0 / solution.resistance_ohms  # P = V²/R at V = 1 V
    return tuple(w / total_watts for w in solution.edge_watts)


# ---------------------------------------------------------------- worst case and RSS


@dataclass(frozen=True, slots=True)
class ToleranceBand:
    """The spread of a network's value from the tolerances of its parts.

    Attributes
    ----------
    nominal_ohms : float
        Value with every part at nominal, in ohms.
    low_ohms, high_ohms : float
        Exact worst case in ohms: every part at its lowest (highest). Exact for
        any passive network by Rayleigh's monotonicity law.
    rss_rel : float
        Statistical half-width, a fraction: ``sqrt(Σ (S_i·t_i)²)``, the GUM law
        of propagation (JCGM 100:2008 §5.1.2, Eq. (10)) with each tolerance
        taken as the half-width. First order.
    sigma_rel : float
        Standard uncertainty, a fraction, with each part uniform within ±t_i:
        ``sqrt(Σ (S_i·t_i/√3)²)`` (rectangular distribution, GUM 4.3.7; clause
        number from memory). First order.
    """

    nominal_ohms: float
    low_ohms: float
    high_ohms: float
    rss_rel: float
    sigma_rel: float

    @property
    def worst_rel(self) -> tuple[float, float]:
        """``(low/nominal − 1, high/nominal − 1)``: the worst case as fractions."""
        return (self.low_ohms / self.nominal_ohms - 1.0, self.high_ohms / self.nominal_ohms - 1.0)


def tolerance_band(net: Network, tolerances: Sequence[float]) -> ToleranceBand:
    """Worst-case and statistical tolerance of a network.

    Parameters
    ----------
    net : Network
        Any series/parallel tree.
    tolerances : sequence of float
        Fractions (0.01 = ±1 %), one per part in :func:`parts_in_order` order.

    Returns
    -------
    ToleranceBand
        Nominal, exact worst-case bounds in ohms; RSS and standard uncertainty
        as fractions.

    Raises
    ------
    ValueParseError
        If the count of tolerances differs from the part count, or one is not
        a fraction in [0, 1).
    VerificationError
        If the nodal solve behind :func:`sensitivities` fails.

    Notes
    -----
    The network value never decreases when a part's value grows (Rayleigh's
    monotonicity law), so its extremes over all tolerance corners are the two
    evaluations with every part at ``R_i(1 − t_i)`` and at ``R_i(1 + t_i)``; no
    corner search is needed. With equal tolerance t on every part the band is
    exactly ``R·[1 − t, 1 + t]`` for any topology (R is homogeneous of degree 1).

    References
    ----------
    P. G. Doyle, J. L. Snell, *Random Walks and Electric Networks*, MAA (1984):
    Rayleigh's monotonicity law. JCGM 100:2008 (GUM) §5.1.2 Eq. (10) and 4.3.7.
    netsynth reference-values §6.

    Examples
    --------
    Two equal 1 % parts in series: worst case 1 %, RSS 1 %/√2 (reference-values §6):

    >>> from netsynth.network import from_text
    >>> band = tolerance_band(from_text("1k + 1k"), [0.01, 0.01])
    >>> round(band.low_ohms, 9), round(band.high_ohms, 9), round(band.rss_rel, 6)
    (1980.0, 2020.0, 0.007071)
    """
    t = _check_tolerances(net, tolerances)
    ohms = np.array([p.ohms for p in parts_in_order(net)])
    nominal = float(_evaluate(net, ohms.tolist()))
    low = float(_evaluate(net, (ohms * (1.0 - t)).tolist()))
    high = float(_evaluate(net, (ohms * (1.0 + t)).tolist()))
    weighted = np.array(sensitivities(net)) * t
    rss = math.sqrt(math.fsum((weighted * weighted).tolist()))
    return ToleranceBand(
        nominal_ohms=nominal,
        low_ohms=low,
        high_ohms=high,
        rss_rel=rss,
        sigma_rel=rss / math.sqrt(3.0),
    )


# ---------------------------------------------------------------- Monte Carlo


@dataclass(frozen=True, slots=True)
class MonteCarlo:
    """Statistics of simulated builds, each part uniform within its tolerance.

    Attributes
    ----------
    samples : int
        Number of simulated builds.
    seed : int
        Random seed of ``numpy.random.default_rng``; the same seed gives the same result.
    mean_rel : float
        Mean of ``value/nominal − 1``.
    sigma_rel : float
        Sample standard deviation (n − 1) of ``value/nominal``.
    low_rel, high_rel : float
        0.5 % and 99.5 % quantiles of ``value/nominal − 1``.
    yield_fraction : float or None
        Fraction of builds with ``|value/target − 1| ≤ spec``; None without a spec.
    spec : float or None
        The accepted relative deviation from the target (a fraction), if any.
    target_ohms : float
        The value the builds are judged against, in ohms.
    """

    samples: int
    seed: int
    mean_rel: float
    sigma_rel: float
    low_rel: float
    high_rel: float
    yield_fraction: float | None
    spec: float | None
    target_ohms: float


def _check_count(name: str, value: object, least: int) -> int:
    if isinstance(value, bool) or not isinstance(value, numbers.Integral) or value < least:
        raise ValueParseError(f"{name}={value!r}: expected a whole number of {least} or more")
    return int(value)


def sample_values(
    net: Network, tolerances: Sequence[float], samples: int = 20_000, seed: int = 1
) -> np.ndarray:
    """Values in ohms of simulated builds, every part uniform within ±t_i.

    Parameters
    ----------
    net : Network
        Any series/parallel tree.
    tolerances : sequence of float
        Fractions, one per part in :func:`parts_in_order` order.
    samples : int
        Number of builds (at least 1).
    seed : int
        Random seed for ``numpy.random.default_rng`` (0 or above).

    Returns
    -------
    numpy.ndarray
        Shape ``(samples,)``, ohms. Deterministic for a given random seed.

    Raises
    ------
    ValueParseError
        On bad tolerances, sample count or random seed.
    """
    t = _check_tolerances(net, tolerances)
    samples = _check_count("samples", samples, 1)
    seed = _check_count("seed", seed, 0)
    rng = np.random.default_rng(seed)
    ohms = [p.ohms for p in parts_in_order(net)]
    # one row per part: that part's value in every build, drawn part by part (the same stream
    # as one (parts, samples) draw) and consumed as the walk reaches the part
    leaves = (ohms[i] * (1.0 + t[i] * rng.uniform(-1.0, 1.0, size=samples)) for i in range(len(ohms)))
    return np.asarray(_evaluate(net, leaves), dtype=float)


def monte_carlo(
    net: Network,
    tolerances: Sequence[float],
    target_ohms: float,
    spec: float | None = None,
    samples: int = 20_000,
    seed: int = 1,
) -> MonteCarlo:
    """Simulate builds of a network and summarise them.

    Parameters
    ----------
    net : Network
        Any series/parallel tree.
    tolerances : sequence of float
        Fractions, one per part in :func:`parts_in_order` order; each part is
        drawn uniform within ±t_i, independently.
    target_ohms : float
        The value wanted, in ohms (> 0); the yield is judged against it.
    spec : float or None
        Accepted relative deviation from the target (fraction > 0), or None.
    samples : int
        Number of builds (at least 2, for a standard deviation).
    seed : int
        Random seed for ``numpy.random.default_rng``.

    Returns
    -------
    MonteCarlo
        Mean, standard deviation and 0.5 %/99.5 % quantiles relative to the
        nominal value; yield against ``target_ohms ± spec``.

    Raises
    ------
    ValueParseError
        On bad tolerances, target, spec, sample count or random seed.

    Examples
    --------
    One ±1 % part judged at ±0.5 %: about half the builds pass (uniform law).

    >>> from netsynth.network import from_text
    >>> run = monte_carlo(from_text("1k"), [0.01], target_ohms=1000.0, spec=0.005)
    >>> abs(run.yield_fraction - 0.5) < 0.02
    True
    """
    if isinstance(target_ohms, bool) or not isinstance(target_ohms, numbers.Real) or not (
        math.isfinite(target_ohms) and target_ohms > 0
    ):
        raise ValueParseError(f"target_ohms={target_ohms!r}: the target must be a finite value above zero")
    if spec is not None and (
        isinstance(spec, bool) or not isinstance(spec, numbers.Real) or not (math.isfinite(spec) and spec > 0)
    ):
        raise ValueParseError(f"spec={spec!r}: expected a fraction above zero (0.01 for ±1 %) or None")
    samples = _check_count("samples", samples, 2)
    values = sample_values(net, tolerances, samples, seed)
    nominal = float(_evaluate(net, [p.ohms for p in parts_in_order(net)]))
    ratio = values / nominal
    yield_fraction = None
    if spec is not None:
        yield_fraction = float(np.mean(np.abs(values / target_ohms - 1.0) <= spec))
    return MonteCarlo(
        samples=samples,
        seed=int(seed),
        mean_rel=float(np.mean(ratio) - 1.0),
        sigma_rel=float(np.std(ratio, ddof=1)),
        low_rel=float(np.quantile(ratio, LOW_QUANTILE) - 1.0),
        high_rel=float(np.quantile(ratio, HIGH_QUANTILE) - 1.0),
        yield_fraction=yield_fraction,
        spec=None if spec is None else float(spec),
        target_ohms=float(target_ohms),
    )
