"""Voltage, current and power of every part, against its own stock line's derated limits.

The per-part figures come from the nodal solver (:mod:`netsynth.nodal`), not from
series/parallel formulas, so the stress check is independent of the search that
proposed the network. Each part is checked against the stock line it *is*
(``Part.line``); a part with no line (typed by hand, not in the bin) gets the bin
defaults and is flagged ``in_bin=False``.

Headroom, in one unit
---------------------
Headroom is the factor by which the drive the user gave (volts, amps or watts) may grow
before the first part reaches a derated limit. In a linear network every part's voltage
scales with the drive's voltage and every part's power with its square, so with a volt or
amp drive a part at power share ``u_P`` of its limit and voltage share ``u_V`` allows a
factor ``min(u_P^(-1/2), u_V^(-1))``; with a watt drive (power scales with the drive,
voltage with its square root) ``min(u_P^(-1), u_V^(-2))``. The network's headroom is the
smallest over its parts, and :attr:`NetworkStress.binding` names the part and the limit
(power or voltage) that sets it.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache
from typing import Literal

from netsynth.analysis.conditions import Derating, OperatingPoint, limit_volts, limit_watts
from netsynth.network import Network, Part, parts_in_order, to_netlist
from netsynth.nodal import solve_network
from netsynth.stock import StockItem

Limit = Literal["power", "voltage"]

#: relative slack on "within the limit": a part exactly at its limit (four ¼ W parts sharing 1 W) must
#: not fail on the last bit of a float; 1e-9 is far below any rating's own accuracy.
LIMIT_SLACK = 1e-9


def drive_exponents(point: OperatingPoint) -> tuple[float, float]:
    """(a, b): part power grows as drive^a and part voltage as drive^b (Ohm's law, P = V²/R)."""
    return (1.0, 0.5) if point.watts is not None else (2.0, 1.0)


def drive_headroom(power_use: float, voltage_use: float, point: OperatingPoint) -> tuple[float, Limit]:
    """Factor the drive may grow before a part at these shares of its limits reaches one.

    >>> drive_headroom(0.04, 0.2, OperatingPoint(amps=1.0))  # 25× in power is only 5× in current
    (5.0, 'voltage')
    """
    a, b = drive_exponents(point)
    by_power = math.inf if power_use <= 0 else power_use ** (-1.0 / a)
    by_voltage = math.inf if voltage_use <= 0 else voltage_use ** (-1.0 / b)
    return (by_power, "power") if by_power < by_voltage else (by_voltage, "voltage")


@dataclass(frozen=True, slots=True)
class PartStress:
    """One part at the operating point. Volts and amps are peak; watts are average (duty × peak)."""

    ohms: float
    volts: float
    amps: float
    watts: float
    limit_watts: float  #: derated average power limit, W
    limit_volts: float  #: derated voltage limit, V
    line: StockItem  #: the stock line this part is (or the bin defaults when ``in_bin`` is False)
    in_bin: bool
    headroom: float  #: factor the drive may grow before this part reaches a limit (∞ if unstressed)
    binding: Limit  #: which of its limits this part reaches first

    @property
    def power_use(self) -> float:
        """Fraction of the derated power limit used (1.0 = at the limit)."""
        return self.watts / self.limit_watts if self.limit_watts > 0 else math.inf

    @property
    def voltage_use(self) -> float:
        """Fraction of the derated voltage limit used."""
        return self.volts / self.limit_volts

    @property
    def ok(self) -> bool:
        return self.headroom >= 1.0 - LIMIT_SLACK


@dataclass(frozen=True, slots=True)
class NetworkStress:
    """The whole network at the operating point, part by part (in :func:`parts_in_order` order)."""

    volts: float  #: peak voltage across the network
    amps: float  #: peak current through it
    watts: float  #: average power it dissipates
    verified_ohms: float  #: from the nodal solve
    parts: tuple[PartStress, ...]

    @property
    def headroom(self) -> float:
        """The factor the drive may grow before the first part reaches a limit."""
        return min(p.headroom for p in self.parts)

    @property
    def binding(self) -> tuple[int, Limit]:
        """(index of the part that reaches a limit first, which limit)."""
        i = min(range(len(self.parts)), key=lambda j: self.parts[j].headroom)
        return i, self.parts[i].binding

    @property
    def violations(self) -> tuple[int, ...]:
        """Indices of parts over a derated limit."""
        return tuple(i for i, p in enumerate(self.parts) if not p.ok)


@dataclass(frozen=True, slots=True)
class PartLoad:
    """What one part sees at the operating point, whatever line it comes from."""

    ohms: float
    volts: float  #: peak
    amps: float  #: peak
    watts: float  #: average (duty × peak)


@dataclass(frozen=True, slots=True)
class NetworkLoad:
    """One nodal solve of a network at an operating point, before any line's ratings are applied."""

    volts: float
    amps: float
    watts: float
    verified_ohms: float
    parts: tuple[PartLoad, ...]


def network_load(net: Network, point: OperatingPoint) -> NetworkLoad:
    """Per-part voltage, current and power from one nodal solve (parts in ``parts_in_order`` order)."""
    edges, nodes = to_netlist(net)
    parts = parts_in_order(net)
    # one solve at 1 V; every edge quantity scales with the drive (linear network)
    unit = solve_network(edges, nodes, volts=1.0)
    volts = point.volts_across(unit.resistance_ohms)
    loads = tuple(
        PartLoad(part.ohms, abs(v1 * volts), abs(a1 * volts), w1 * volts * volts * point.duty)
        for part, v1, a1, w1 in zip(parts, unit.edge_volts, unit.edge_amps, unit.edge_watts)
    )
    return NetworkLoad(
        volts=volts,
        amps=volts / unit.resistance_ohms,
        watts=volts * volts / unit.resistance_ohms * point.duty,
        verified_ohms=unit.resistance_ohms,
        parts=loads,
    )


def part_stress(load: PartLoad, line: StockItem, in_bin: bool, point: OperatingPoint, derating: Derating) -> PartStress:
    """One part's load against the derated limits of ``line``."""
    lw = limit_watts(line.power_rating_w, line.max_temp_c, point.ambient_c, derating)
    lv = limit_volts(load.ohms, line.power_rating_w, line.max_volts, derating)
    use_w = load.watts / lw if lw > 0 else (math.inf if load.watts > 0 else 0.0)
    headroom, binding = drive_headroom(use_w, load.volts / lv, point)
    return PartStress(load.ohms, load.volts, load.amps, load.watts, lw, lv, line, in_bin, headroom, binding)


@lru_cache(maxsize=1024)
def default_line(ohms: float) -> StockItem:
    """The bin defaults for a value the bin does not hold (1 % ¼ W 200 V 100 ppm/K)."""
    return StockItem(ohms)


def line_of(part: Part) -> tuple[StockItem, bool]:
    """The part's stock line and True, or the bin defaults and False when it has none."""
    return (part.line, True) if part.line is not None else (default_line(part.ohms), False)


def network_stress(net: Network, point: OperatingPoint, derating: Derating = Derating(),
                   load: NetworkLoad | None = None) -> NetworkStress:
    """Per-part voltage, current and power from a nodal solve, each against its own line's limits.

    ``load``, when the caller already solved ``net`` at ``point``, is used as is.

    Examples
    --------
    Two equal parts in series share 10 V equally (Ohm's law):

    >>> from netsynth.network import from_text
    >>> s = network_stress(from_text("1k + 1k"), OperatingPoint(volts=10.0))
    >>> [round(p.volts, 9) for p in s.parts], round(s.watts, 9)
    ([5.0, 5.0], 0.05)
    """
    load = load if load is not None else network_load(net, point)
    stresses = tuple(
        part_stress(pl, *line_of(part), point, derating) for part, pl in zip(parts_in_order(net), load.parts)
    )
    return NetworkStress(load.volts, load.amps, load.watts, load.verified_ohms, stresses)
