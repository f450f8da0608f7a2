"""Regular arrays under load: the part-count bound by hand, the stress by an independent nodal solve.

Every stress check below re-derives each part's volts and watts with ``netsynth.nodal`` (which
knows nothing of series/parallel rules or of the closed forms in ``search.arrays``) and each
part's limit with the datasheet formulas written out here, not with ``analysis.conditions``.
"""

from __future__ import annotations

import itertools
import math
from collections import Counter

import networkx as nx
import pytest

from netsynth.analysis.conditions import Derating, OperatingPoint
from netsynth.network import parallel, part_count, part_values, series, to_netlist
from netsynth.nodal import solve_network
from netsynth.search.arrays import ArrayDesign, part_lower_bound, search_arrays
from netsynth.search.exact import Found
from netsynth.stock import StockBin, StockItem, kit_bin

#: relative slack on a limit: the closed forms and the nodal solve round differently in the last
#: few bits, and an array may sit exactly on a limit (40 × 0.125 W = 5 W); 1e-9 is far below
#: any rating's own accuracy (same slack as the module's STRESS_SLACK).
SLACK = 1e-9


def datasheet_limits(ohms, power_w, max_volts, max_temp_c, ambient_c, power_factor, voltage_factor):
    """Derated (watts, volts) limits of one part, written out from the sources.

    Power: full rating up to 70 °C, then linear to zero at the maximum temperature (IEC 60115-1
    derating line as drawn in the Yageo CFR/MFR and Vishay D/CRCW datasheets). Voltage: the
    lower of the limiting element voltage and √(P·R) (rated continuous working voltage, Yageo and
    KOA datasheet notes). Then the user's factors.
    """
    if ambient_c <= 70.0:
        line = 1.0
    elif ambient_c >= max_temp_c:
        line = 0.0
    else:
        line = (max_temp_c - ambient_c) / (max_temp_c - 70.0)
    return power_w * line * power_factor, voltage_factor * min(max_volts, math.sqrt(power_w * ohms))


def nodal_stress(design: ArrayDesign, point: OperatingPoint):
    """(nodal ohms, [(part ohms, volts, average watts)]) at the operating point, by nodal analysis."""
    edges, nodes = to_netlist(design.found.network)
    unit = solve_network(edges, nodes, volts=1.0)
    volts = point.volts_across(unit.resistance_ohms)
    solved = solve_network(edges, nodes, volts=volts)
    parts = [(e.ohms, abs(v), w * point.duty) for e, v, w in zip(edges, solved.edge_volts, solved.edge_watts)]
    return solved.resistance_ohms, parts


def assert_within_limits(design, point, stock, derating):
    """Every part of the design within its derated limits, by nodal solve and datasheet formulas.

    Returns the nodal headroom as a factor on the drive: part power grows with the square of a
    volt or amp drive (P = V²/R = I²R) and part voltage with the square root of a watt drive.
    """
    a, b = (1.0, 0.5) if point.watts is not None else (2.0, 1.0)
    _, parts = nodal_stress(design, point)
    headroom = math.inf
    for ohms, volts, watts in parts:
        item = next(i for i in stock.items if i.ohms == ohms)
        lim_w, lim_v = datasheet_limits(ohms, item.power_rating_w, item.max_volts, item.max_temp_c,
                                        point.ambient_c, derating.power_factor, derating.voltage_factor)
        assert watts <= lim_w * (1 + SLACK), (design.found.network, ohms, watts, lim_w)
        assert volts <= lim_v * (1 + SLACK), (design.found.network, ohms, volts, lim_v)
        headroom = min(headroom, (lim_w / watts) ** (1 / a), (lim_v / volts) ** (1 / b))
    return headroom


def quarter_watt_bin(max_temp_c: float = 155.0) -> StockBin:
    # ¼ W film parts (Yageo MFR-25 class: 155 °C maximum), a few values round 10 Ω
    return StockBin(tuple(StockItem(r, power_rating_w=0.25, max_temp_c=max_temp_c)
                          for r in (4.7, 10.0, 22.0, 47.0, 100.0)))


# ------------------------------------------------------------------ lower bound


@pytest.mark.parametrize(
    "target, point, stock, derating, by_power, by_voltage",
    [
        # 5 W over ¼ W × 0.5 = 0.125 W per part → 40 (full rating at ≤ 70 °C, IEC 60115-1 derating
        # line); V = √(5·10) = 7.07 V over 0.8 × min(200, √(0.25·100)) = 4 V → 2 (hand arithmetic)
        (10.0, OperatingPoint(watts=5.0), quarter_watt_bin(), Derating(power_factor=0.5), 40, 2),
        # at 112.5 °C the line gives (155 − 112.5)/85 = 0.5 of the rating: 0.0625 W per part → 80
        (10.0, OperatingPoint(watts=5.0, ambient_c=112.5), quarter_watt_bin(), Derating(power_factor=0.5), 80, 2),
        # duty 25 %: average 1.25 W over 0.125 W → 10; the peak voltage is unchanged (hand arithmetic)
        (10.0, OperatingPoint(watts=5.0, duty=0.25), quarter_watt_bin(), Derating(power_factor=0.5), 10, 2),
        # 1 kV across 1.8 MΩ: 1000²/1.8e6 = 0.556 W over 0.125 W → 5; 1000 V over 0.8 × 200 V
        # (√(0.25 × 10 MΩ) = 1581 V > 200 V LEV) → ceil(6.25) = 7 (hand arithmetic)
        (1.8e6, OperatingPoint(volts=1000.0), kit_bin("E24", 1e3, 1e7, max_volts=200.0),
         Derating(power_factor=0.5, voltage_factor=0.8), 5, 7),
        # 2 A through 10 Ω: 40 W over 1 W × 1.0 → 40; 20 V over min(200, √(1 × 100)) = 10 V → 2
        (10.0, OperatingPoint(amps=2.0), StockBin((StockItem(10.0, power_rating_w=1.0),
                                                   StockItem(100.0, power_rating_w=1.0))), Derating(1.0, 1.0), 40, 2),
    ],
)
def test_part_lower_bound_by_hand(target, point, stock, derating, by_power, by_voltage):
    bound = part_lower_bound(target, stock, point, derating)
    assert (bound.by_power, bound.by_voltage, bound.count) == (by_power, by_voltage, max(by_power, by_voltage))


def test_bound_explains_itself():
    bound = part_lower_bound(10.0, kit_bin("E24", 1, 1e6), OperatingPoint(watts=5.0), Derating())
    # 5 W / 0.125 W = 40; 7.07 V against 0.8 × 200 V = 160 V (1 MΩ part: √(0.25·1e6) = 500 V > LEV)
    assert bound.explain() == ("at least 40 parts: 5 W over 0.125 W per part (derated); "
                               "1 part for voltage: 7.07 V over 160 V")


# ------------------------------------------------------------------ searches under load


def test_ten_ohm_five_watt_load_from_quarter_watt_parts():
    stock = kit_bin("E24", 1, 1e6)  # ¼ W 200 V parts
    point, derating = OperatingPoint(watts=5.0), Derating(power_factor=0.5)
    designs = search_arrays(10.0, stock, point, derating, max_parts=60, within=0.01)
    best = designs[-1]
    assert_within_limits(best, point, stock, derating)
    ohms, _ = nodal_stress(best, point)
    assert abs(ohms / 10.0 - 1) <= 0.01
    # the bound by hand is 40 (5 W / 0.125 W); 100 Ω as 2 × 20 gives 10 Ω at exactly 0.125 W each
    assert 40 <= best.found.parts <= 50
    assert part_count(best.found.network) == best.found.parts


def test_high_voltage_string_keeps_every_part_under_its_voltage_limit():
    stock = kit_bin("E24", 1, 1e7, max_volts=200.0)
    point, derating = OperatingPoint(volts=1000.0), Derating(voltage_factor=0.8)
    designs = search_arrays(1.8e6, stock, point, derating, max_parts=30, within=0.01)
    assert designs and abs(designs[-1].found.error) <= 0.01
    for design in designs:  # every count, not only the best
        assert_within_limits(design, point, stock, derating)  # includes ≤ 0.8 × 200 V = 160 V
        _, parts = nodal_stress(design, point)
        assert max(v for _, v, _ in parts) <= 160.0 * (1 + SLACK)
        # every path between the terminals has ≥ ceil(1000 / 160) = 7 parts (networkx shortest path)
        edges, _ = to_netlist(design.found.network)
        graph = nx.MultiGraph([(e.a, e.b) for e in edges])
        assert nx.shortest_path_length(graph, 0, 1) >= 7


@pytest.mark.parametrize(
    "target, point",
    [
        (47.0, OperatingPoint(amps=0.3)),  # current drive: the voltage moves with each array's value
        (2.2e3, OperatingPoint(volts=60.0, duty=0.5, ambient_c=90.0)),  # derated line and duty
        (330.0, OperatingPoint(watts=2.0, ambient_c=40.0)),  # power drive, below 70 °C
        (5.6e5, OperatingPoint(volts=900.0)),  # voltage-limited strings
        (12.0, OperatingPoint(watts=3.0, duty=0.3)),  # low value, pulsed: average 0.9 W
        (1.5e4, OperatingPoint(amps=0.02, duty=0.7, ambient_c=120.0)),  # 6 W peak, hot enclosure
    ],
)
def test_every_design_passes_an_independent_stress_check(target, point):
    stock = kit_bin("E12", 1, 1e7, max_volts=150.0)
    derating = Derating(power_factor=0.6, voltage_factor=0.8)
    designs = search_arrays(target, stock, point, derating, max_parts=40)
    assert designs
    for design in designs:
        # the search's closed-form headroom is the one the nodal solve gives
        assert design.headroom == pytest.approx(assert_within_limits(design, point, stock, derating), rel=1e-9)
        ohms, _ = nodal_stress(design, point)
        assert design.found.value_ohms == pytest.approx(ohms, rel=1e-9)
        assert design.found.error == pytest.approx(ohms / target - 1, rel=1e-9, abs=1e-12)
    assert [d.found.parts for d in designs] == sorted({d.found.parts for d in designs})


def test_uniform_two_by_two_closed_form():
    # Ohm's law: two strings of two 100 Ω parts = 100 Ω; at 10 V each part sees V/2 = 5 V and
    # dissipates P/4 = (10²/100)/4 = 0.25 W. Limits 1 W and min(200, √(1·100)) = 10 V give a
    # headroom of min(1/0.25, 10/5) = 2.
    stock = StockBin((StockItem(100.0, power_rating_w=1.0),))
    point = OperatingPoint(volts=10.0)
    four = [d for d in search_arrays(100.0, stock, point, Derating(1.0, 1.0), max_parts=4) if d.found.parts == 4]
    assert len(four) == 1
    design = four[0]
    assert design.found.network == parallel(series(100.0, 100.0), series(100.0, 100.0))
    assert design.family == "uniform"
    assert design.found.value_ohms == pytest.approx(100.0, rel=1e-12)
    assert design.headroom == pytest.approx(2.0, rel=1e-12)
    ohms, parts = nodal_stress(design, point)
    assert ohms == pytest.approx(100.0, rel=1e-12)
    assert [(round(v, 9), round(w, 9)) for _, v, w in parts] == [(5.0, 0.25)] * 4


def test_quantities_are_honoured():
    # 1 kΩ at 1 W from ¼ W parts needs ≥ 8 parts (1 / 0.125, hand arithmetic); with 5 of each
    # value no uniform array of 8 or more is allowed, so the search must mix two values.
    point, derating = OperatingPoint(watts=1.0), Derating(power_factor=0.5)
    limited = kit_bin("E12", 10, 1e5, count=5)
    designs = search_arrays(1e3, limited, point, derating, max_parts=12)
    assert designs and designs[0].found.parts >= 8
    for design in designs:
        assert max(Counter(part_values(design.found.network)).values()) <= 5
        assert_within_limits(design, point, limited, derating)
    # the same search on an unlimited bin does use more than 5 of a value (3 × 3 of 1 kΩ, hand)
    free = search_arrays(1e3, kit_bin("E12", 10, 1e5), point, derating, max_parts=12)
    assert any(max(Counter(part_values(d.found.network)).values()) > 5 for d in free)


@pytest.mark.parametrize(
    "max_parts, expect_any",
    [
        (39, False),  # below the hand bound of 40 (5 W / 0.125 W): nothing can carry 5 W
        (40, True),  # 100 Ω as 2 series × 20 parallel = 10 Ω, 0.125 W each (hand arithmetic)
    ],
)
def test_below_the_bound_nothing_fits(max_parts, expect_any):
    stock = kit_bin("E24", 1, 1e6)
    designs = search_arrays(10.0, stock, OperatingPoint(watts=5.0), Derating(power_factor=0.5), max_parts)
    assert bool(designs) == expect_any
    if expect_any:
        assert designs[-1].found.parts == 40 and abs(designs[-1].found.error) < 1e-12


# ------------------------------------------------------------------ brute force on a small bin


def brute_force(target, values, point, stock, derating, n):
    """Smallest |error| over every array of the three families with n parts, stress by nodal solve."""
    nets = []
    for s in range(1, n + 1):
        if n % s:
            continue
        p = n // s
        for r in values:
            nets.append(parallel(*[series(*[r] * s)] * p))
        for r1, r2 in itertools.combinations(sorted(values), 2):
            nets += [parallel(*[series(*([r1] * a + [r2] * (s - a)))] * p) for a in range(1, s)]
            nets += [series(*[parallel(*([r1] * b + [r2] * (p - b)))] * s) for b in range(1, p)]
    best = math.inf
    for net in nets:
        counts = Counter(part_values(net))
        if any(stock_count(stock, r) is not None and c > stock_count(stock, r) for r, c in counts.items()):
            continue
        design = ArrayDesign(found=Found(net, 0.0, 0.0, part_count(net)), family="", headroom=0.0)
        ohms, parts = nodal_stress(design, point)
        ok = True
        for r, volts, watts in parts:
            item = next(i for i in stock.items if i.ohms == r)
            lim_w, lim_v = datasheet_limits(r, item.power_rating_w, item.max_volts, item.max_temp_c,
                                            point.ambient_c, derating.power_factor, derating.voltage_factor)
            ok &= watts <= lim_w * (1 + SLACK) and volts <= lim_v * (1 + SLACK)
        if ok:
            best = min(best, abs(ohms / target - 1))
    return best


def stock_count(stock, ohms):
    return next(i.count for i in stock.items if i.ohms == ohms)


@pytest.mark.parametrize(
    "target, point",
    [
        (150.0, OperatingPoint(watts=0.6)),  # needs ≥ 0.6 / 0.125 = 5 parts
        (150.0, OperatingPoint(watts=1.2, duty=0.5)),  # the same average power at half duty
        (68.0, OperatingPoint(amps=0.12)),  # 0.98 W at 68 Ω: the voltage moves with the value
        (3.3e3, OperatingPoint(volts=25.0, ambient_c=100.0)),  # derated line: (155 − 100)/85
    ],
)
def test_matches_a_brute_force_over_the_families(target, point):
    # E6 10 Ω..1 kΩ (IEC 60063:2015 Table 1), 3 parts of each value, ¼ W
    stock = kit_bin("E6", 10, 1e3, count=3)
    derating = Derating(power_factor=0.5, voltage_factor=0.8)
    values = [i.ohms for i in stock.items]
    found = {d.found.parts: abs(d.found.error) for d in search_arrays(target, stock, point, derating, max_parts=6)}
    for n in range(1, 7):
        expected = brute_force(target, values, point, stock, derating, n)
        if math.isinf(expected):
            assert n not in found
        else:
            assert found[n] == pytest.approx(expected, rel=1e-9, abs=1e-12)
