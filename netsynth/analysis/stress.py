"""Voltage, current and power of every part, against its derated limits.

The per-part figures come from the nodal solver (:mod:`netsynth.nodal`), not from
series/parallel formulas, so the stress check is independent of the search that
proposed the network. Each part is matched to the bin line of the same value
(the highest-rated one when several lines share a value); a part the bin does
not hold gets the bin defaults and is flagged ``in_bin=False``.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache

from netsynth.analysis.conditions import Derating, OperatingPoint, limit_volts, limit_watts
from netsynth.network import Network, parts_in_order, to_netlist
from netsynth.nodal import solve_network
from netsynth.stock import StockBin, StockItem


@dataclass(frozen=True, slots=True)
class PartStress:
    """One part at the operating point. Volts and amps are peak; watts are average (duty × peak)."""

    ohms: float
    volts: float
    amps: float
    watts: float
    limit_watts: float  #: derated average power limit, W
    limit_volts: float  #: derated voltage limit, V
    item: StockItem  #: the bin line this part is taken from (or the bin defaults)
    in_bin: bool

    @property
    def power_use(self) -> float:
        """Fraction of the derated power limit used (1.0 = at the limit)."""
        return self.watts / self.limit_watts if self.limit_watts > 0 else math.inf

    @property
    def voltage_use(self) -> float:
        """Fraction of the derated voltage limit used."""
        return self.volts / self.limit_volts

    @property
    def headroom(self) -> float:
        """How many times the stress could grow before the first limit: min(limit/actual) (∞ if unstressed)."""
        use = max(self.power_use, self.voltage_use)
        return math.inf if use == 0 else 1.0 / use

    @property
    def ok(self) -> bool:
        return self.headroom >= 1.0


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
        """The smallest headroom of any part."""
        return min(p.headroom for p in self.parts)

    @property
    def violations(self) -> tuple[int, ...]:
        """Indices of parts over a derated limit."""
        return tuple(i for i, p in enumerate(self.parts) if not p.ok)


def rating_items(stock: StockBin | None, ohms: list[float]) -> list[tuple[StockItem, bool]]:
    """For each value, the bin line it comes from (highest power rating first) and whether the bin
    holds it; values the bin lacks get the bin defaults."""
    lines = _best_lines(stock) if stock is not None else {}
    out = []
    for r in ohms:
        item = lines.get(_key(r))
        out.append((item, True) if item is not None else (_default_item(r), False))
    return out


def _key(ohms: float) -> float:
    return float(f"{ohms:.12g}")  # equal values up to float noise share a key


def _best_lines(stock: StockBin) -> dict[float, StockItem]:
    best: dict[float, StockItem] = {}
    for item in stock.items:
        k = _key(item.ohms)
        if k not in best or (item.power_rating_w, item.max_volts) > (best[k].power_rating_w, best[k].max_volts):
            best[k] = item
    return best


@lru_cache(maxsize=1024)
def _default_item(ohms: float) -> StockItem:
    return StockItem(ohms)


def network_stress(
    net: Network,
    point: OperatingPoint,
    stock: StockBin | None = None,
    derating: Derating = Derating(),
) -> NetworkStress:
    """Per-part voltage, current and power from a nodal solve, with derated limits.

    Examples
    --------
    Two equal parts in series share 10 V equally (Ohm's law):

    >>> from netsynth.network import from_text
    >>> s = network_stress(from_text("1k + 1k"), OperatingPoint(volts=10.0))
    >>> [round(p.volts, 9) for p in s.parts], round(s.watts, 9)
    ([5.0, 5.0], 0.05)
    """
    edges, nodes = to_netlist(net)
    parts = parts_in_order(net)
    # one solve at 1 V; every edge quantity scales with the drive (linear network)
    unit = solve_network(edges, nodes, volts=1.0)
    volts = point.volts_across(unit.resistance_ohms)
    stresses = []
    items = rating_items(stock, [p.ohms for p in parts])
    for part, (item, in_bin), v1, a1, w1 in zip(parts, items, unit.edge_volts, unit.edge_amps, unit.edge_watts):
        v, a, w = v1 * volts, a1 * volts, w1 * volts * volts
        stresses.append(
            PartStress(
                ohms=part.ohms,
                volts=abs(v),
                amps=abs(a),
                watts=w * point.duty,
                limit_watts=limit_watts(item.power_rating_w, item.max_temp_c, point.ambient_c, derating),
                limit_volts=limit_volts(part.ohms, item.power_rating_w, item.max_volts, derating),
                item=item,
                in_bin=in_bin,
            )
        )
    return NetworkStress(
        volts=volts,
        amps=volts / unit.resistance_ohms,
        watts=volts * volts / unit.resistance_ohms * point.duty,
        verified_ohms=unit.resistance_ohms,
        parts=tuple(stresses),
    )
