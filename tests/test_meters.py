"""Meter shunts and multipliers (netsynth.jobs.meters) and the ``shunt`` / ``multiplier`` commands.

Outside references, beside each check:

* T. R. Kuphaldt, *Lessons In Electric Circuits* Vol. I (DC), ch. 8: "Voltmeter design" (a 1 mA,
  500 Ω movement; multipliers for 1, 10, 100 and 1000 V and the chained 900k + 90k + 9k + 500
  design) and "Ammeter design" (the same movement; a 5 A shunt "just over 100 mΩ", and
  5.00005 mΩ for 100 A).
* OpenStax *College Physics* 2e §21.4 "DC Voltmeters and Ammeters" (a 25 Ω, 50 µA galvanometer):
  from memory, see the test.
* A. D. Helfrick and W. D. Cooper, *Modern Electronic Instrumentation and Measurement
  Techniques*, §4-4, the Ayrton shunt example (1, 5, 10 A; 50 Ω, 1 mA): from memory; the ring is
  also checked by a Kirchhoff solve written here, independent of the module.
"""

from __future__ import annotations

import json

import numpy as np
import pytest

from netsynth.api import make
from netsynth.analysis.conditions import OperatingPoint
from netsynth.errors import ArgumentError
from netsynth.jobs.meters import (
    Movement,
    chain_reading_error,
    multiplier_chain,
    multiplier_ohms,
    multiplier_reading_error,
    ring_reading_error,
    ring_shunt,
    shunt_amps,
    shunt_ohms,
    shunt_reading_error,
)
from netsynth.cli import cli
from netsynth.stock import kit_bin

LIEC = Movement(1e-3, 500.0)  # LIEC Vol. I ch. 8: 1 mA full scale, 500 Ω


# ------------------------------------------------------------------ multipliers


@pytest.mark.parametrize("volts, ohms", [
    (1.0, 500.0),        # LIEC ch. 8 "Voltmeter design": 1 V range, 500 Ω
    (10.0, 9_500.0),     # 10 V range: 9.5 kΩ
    (100.0, 99_500.0),   # 100 V range: 99.5 kΩ
    (1000.0, 999_500.0),  # 1000 V range: 999.5 kΩ
])
def test_multiplier_matches_liec(volts, ohms):
    assert multiplier_ohms(LIEC, volts) == pytest.approx(ohms, rel=1e-12)


def test_multiplier_chain_matches_liec_common_values():
    # LIEC ch. 8 "Voltmeter design": the chained design uses 900 kΩ + 90 kΩ + 9 kΩ + 500 Ω
    chain = multiplier_chain(LIEC, [1000, 1, 100, 10])  # any order in, lowest range first out
    assert [s.volts for s in chain] == [1, 10, 100, 1000]
    assert [s.section_ohms for s in chain] == pytest.approx([500, 9_000, 90_000, 900_000], rel=1e-12)
    assert chain[-1].multiplier_ohms == pytest.approx(999_500, rel=1e-12)
    assert all(s.amps == 1e-3 for s in chain)


def test_multiplier_openstax_galvanometer():
    # OpenStax College Physics 2e §21.4: a 25.0 Ω, 50.0 µA galvanometer as a 10.0 V voltmeter
    # needs 199 975 Ω in series (from memory: the section's worked text)
    assert multiplier_ohms(Movement(50e-6, 25.0), 10.0) == pytest.approx(199_975.0, rel=1e-12)


def test_multiplier_refuses_a_range_the_movement_already_reads():
    with pytest.raises(ArgumentError, match="volts=0.5"):
        multiplier_ohms(LIEC, 0.5)  # 0.5 V / 1 mA = 500 Ω = Rm: nothing left for a multiplier
    with pytest.raises(ArgumentError, match="volts"):
        multiplier_chain(LIEC, [10, 10])


def test_multiplier_reading_error_by_ohms_law():
    # a multiplier 1 % high: at 10 V the movement carries 10 / (500 + 9595) A; the scale reads
    # that over 1 mA times 10 V (Ohm's law, hand arithmetic)
    built = 9_500 * 1.01
    shown = 10 / (500 + built) / 1e-3 * 10
    assert multiplier_reading_error(LIEC, 10, built) == pytest.approx(shown / 10 - 1, rel=1e-12)
    errors = chain_reading_error(LIEC, multiplier_chain(LIEC, [1, 10]), [500, 9_000 * 1.01])
    assert errors[0] == pytest.approx(0, abs=1e-15)
    assert errors[1] == pytest.approx(10 / (500 + 500 + 9_090) / 1e-3 / 10 * 10 - 1, rel=1e-12)


# ------------------------------------------------------------------ shunts


def test_shunt_liec_5a_is_just_over_100_milliohm():
    # LIEC ch. 8 "Ammeter design": for 5 A the shunt is "just over 100 mΩ"
    rs = shunt_ohms(LIEC, 5.0)
    assert 0.100 < rs < 0.1001


@pytest.mark.parametrize("amps, ohms", [
    (100.0, 5.00005e-3),   # LIEC ch. 8 "Ammeter design", printed: 5.00005 mΩ for 100 A
    (0.1, 0.5 / 0.099),    # hand arithmetic with the book's formula: 0.5 V / 99 mA = 5.0505 Ω
    (1.0, 0.5 / 0.999),    # 0.5 V / 999 mA = 500.5 mΩ
    (10.0, 0.5 / 9.999),   # 0.5 V / 9.999 A = 50.005 mΩ
])
def test_shunt_liec(amps, ohms):
    assert shunt_ohms(LIEC, amps) == pytest.approx(ohms, rel=1e-6 if amps == 100 else 1e-12)


def test_shunt_openstax_galvanometer():
    # OpenStax College Physics 2e §21.4: the same 25.0 Ω, 50.0 µA galvanometer as a 10.0 A ammeter
    # takes a shunt of 1.25 × 10⁻⁴ Ω (from memory; three significant figures)
    assert shunt_ohms(Movement(50e-6, 25.0), 10.0) == pytest.approx(1.25e-4, rel=1e-3)


def test_shunt_refuses_a_range_at_or_below_full_scale():
    with pytest.raises(ArgumentError, match="amps=0.001"):
        shunt_ohms(LIEC, 1e-3)
    with pytest.raises(ArgumentError, match="movement_ohms"):
        Movement(1e-3, 0.0)


def test_shunt_reading_error_by_current_division():
    # a shunt 2 % low takes more of the current: the movement carries I·Rs'/(Rs' + Rm)
    # (current divider, OpenStax University Physics Vol. 2 §10.2), read as that over Ifs times I
    rs = shunt_ohms(LIEC, 5.0)
    built = rs * 0.98
    meter = 5.0 * built / (built + 500.0)
    assert shunt_reading_error(LIEC, 5.0, built) == pytest.approx(meter / 1e-3 - 1, rel=1e-9)
    assert shunt_reading_error(LIEC, 5.0, rs) == pytest.approx(0, abs=1e-12)


# ------------------------------------------------------------------ ring shunt


def _ring_meter_current(movement, sections, tap, amps):
    """Movement current with ``amps`` fed in at ``tap`` (0 = the end of section 1): a Kirchhoff
    (nodal) solve written here, independent of netsynth's solver.

    Nodes: 0 = common terminal (ground), 1..k = the ring's junctions from the common end; the
    ring's far end (node k) ties to the movement, whose other end is ground.
    """
    k = len(sections)
    # ring: section k (nearest common) from node 0 to node 1, ..., section 1 from node k-1 to node k
    order = list(reversed(sections))
    g = np.zeros((k + 1, k + 1))

    def edge(a, b, ohms):
        c = 1 / ohms
        g[a, a] += c
        g[b, b] += c
        g[a, b] -= c
        g[b, a] -= c

    for i, r in enumerate(order):
        edge(i, i + 1, r)
    edge(k, 0, movement.ohms)
    current = np.zeros(k + 1)
    current[k - tap] = amps  # tap i sits at the far end of section i
    v = np.linalg.solve(g[1:, 1:], current[1:])
    return v[k - 1] / movement.ohms


def test_ring_shunt_helfrick_cooper_example():
    # Helfrick & Cooper §4-4 Ayrton shunt example (from memory): 1 A, 5 A and 10 A on a 50 Ω, 1 mA
    # movement; Ra = 0.04004 Ω, Rb = 0.005005 Ω, Rc = 0.005005 Ω
    ring = ring_shunt(Movement(1e-3, 50.0), [10, 1, 5])
    assert [s.amps for s in ring] == [1, 5, 10]
    assert [s.section_ohms for s in ring] == pytest.approx([0.04004, 0.005005, 0.005005], rel=1e-3)
    assert sum(s.section_ohms for s in ring) == pytest.approx(ring[0].tap_ohms, rel=1e-15)


@pytest.mark.parametrize("ranges", [[1, 5, 10], [0.1, 1, 10, 100], [0.01, 0.25]])
def test_ring_shunt_gives_full_scale_on_every_range(ranges):
    movement = Movement(1e-3, 50.0)
    ring = ring_shunt(movement, ranges)
    sections = [s.section_ohms for s in ring]
    for tap, s in enumerate(ring):
        assert _ring_meter_current(movement, sections, tap, s.amps) == pytest.approx(1e-3, rel=1e-9)
    assert ring_reading_error(movement, ring, sections) == pytest.approx([0] * len(ring), abs=1e-12)


def test_ring_reading_error_against_the_kirchhoff_solve():
    movement = Movement(50e-6, 1500.0)
    ring = ring_shunt(movement, [0.01, 0.1, 1])
    built = [s.section_ohms * f for s, f in zip(ring, (1.003, 0.99, 1.02))]
    errors = ring_reading_error(movement, ring, built)
    for tap, (s, e) in enumerate(zip(ring, errors)):
        assert e == pytest.approx(_ring_meter_current(movement, built, tap, s.amps) / 50e-6 - 1, rel=1e-9)


# ------------------------------------------------------------------ synthesis at full scale


def test_shunt_network_carries_the_shunt_current():
    # the shunt carries I − Ifs at full scale (Kirchhoff's current law); its parts' powers add up to
    # (I − Ifs)²·R (Joule, OpenStax University Physics Vol. 2 §10.2 power examples)
    movement = Movement(50e-6, 1500.0)
    target = shunt_ohms(movement, 2.0)
    design = make(target, kit_bin("E12", 0.1, 100), max_parts=4, point=OperatingPoint(amps=shunt_amps(movement, 2.0)))
    s = design.review.stress
    assert s.amps == pytest.approx(2.0 - 50e-6, rel=1e-9)
    value = design.best.verified_ohms
    assert sum(p.watts for p in s.parts) == pytest.approx((2.0 - 50e-6) ** 2 * value, rel=1e-9)


# ------------------------------------------------------------------ commands


def test_shunt_command_text(runner):
    result = runner.invoke(cli, ["shunt", "2A", "--movement", "50uA", "--movement-ohms", "1k5", "-k", "3",
                                 "--series", "E12", "--range", "R1..100"])
    assert result.exception is None, result.output
    assert result.exit_code == 0
    out = result.output
    # 1.5 kΩ · 50 µA / (2 − 50 µA) = 37.5009 mΩ (hand arithmetic)
    assert "Shunt for 2 A on a movement 50 µA full scale, 1.5 kΩ (75 mV at full scale): Rs = 37.5009 mΩ" in out
    assert "carrying 1.99995 A at full scale" in out
    assert "Full scale with the recommended network: reads" in out
    # 1 mΩ more in a 37.5 mΩ shunt: the reading rises by about 1/37.5 = 2.67 % (hand arithmetic)
    assert "1 mΩ more moves the 2 A range's full scale by +2.67 %" in out
    assert "four-terminal, Kelvin connection" in out
    assert "never across a source" in out


def test_shunt_command_json(runner):
    result = runner.invoke(cli, ["shunt", "2", "--movement", "50uA", "--movement-ohms", "1500", "-k", "3",
                                 "--series", "E12", "--range", "R1..100", "--json"])
    assert result.exception is None and result.exit_code == 0
    data = json.loads(result.output)
    assert data["job"] == "shunt"
    assert data["target_ohms"] == pytest.approx(1500 * 50e-6 / (2 - 50e-6), rel=1e-12)
    assert data["range_amps"] == 2.0 and data["operating_amps"] == pytest.approx(1.99995)
    assert data["movement"] == {"full_scale_amps": 5e-05, "ohms": 1500.0, "full_scale_volts": pytest.approx(0.075)}
    best = data["best"]["verified_ohms"]
    rs = data["target_ohms"]
    assert data["full_scale_error"] == pytest.approx(best * (rs + 1500) / (rs * (best + 1500)) - 1, rel=1e-9)


def test_ring_shunt_command_json(runner):
    result = runner.invoke(cli, ["shunt", "10mA,100mA", "1A", "--movement", "1mA", "--movement-ohms", "500",
                                 "-k", "3", "--series", "E24", "--range", "R1..100", "--qty", "3", "--kit-power", "2W",
                                 "--json"])
    assert result.exception is None and result.exit_code == 0
    data = json.loads(result.output)
    assert data["job"] == "shunt" and "greedy" in data["order"]
    nets = data["networks"]
    assert [n["range_amps"] for n in nets] == [0.01, 0.1, 1.0]
    # the whole ring is the 10 mA shunt: 0.5 V / 9 mA (hand arithmetic with the LIEC formula)
    assert nets[0]["tap_ohms"] == pytest.approx(0.5 / 0.009, rel=1e-12)
    assert sum(n["section_ohms"] for n in nets) == pytest.approx(0.5 / 0.009, rel=1e-12)
    # the 1 A tap: Ifs·(Rm + R)/I = 1 mA · (500 + 55.56) Ω / 1 A (the module docstring's derivation)
    assert nets[2]["tap_ohms"] == pytest.approx(1e-3 * (500 + 0.5 / 0.009), rel=1e-12)
    used: dict[int, int] = {}
    for n in nets:
        assert n["target_ohms"] == n["section_ohms"]
        for p in n["pick_list"]:
            used[p["line"]] = used.get(p["line"], 0) + p["count"]
    assert max(used.values()) <= 3  # the sections share the kit's 3 of each value


def test_multiplier_command_text_and_caution(runner):
    result = runner.invoke(cli, ["multiplier", "300V", "--movement", "50uA", "--movement-ohms", "1k5"])
    assert result.exception is None and result.exit_code == 0
    assert "Multiplier for 300 V on a movement 50 µA full scale, 1.5 kΩ (75 mV at full scale): " \
           "Rmult = 5.9985 MΩ" in result.output  # 300 V / 50 µA − 1.5 kΩ (hand arithmetic)
    assert "Caution: the 300 V range puts up to 300 V on the meter's terminals" in result.output


def test_multiplier_chain_command_json(runner):
    result = runner.invoke(cli, ["multiplier", "1,10", "100", "--movement", "1mA", "--movement-ohms", "500",
                                 "-k", "3", "--json"])
    assert result.exception is None and result.exit_code == 0
    data = json.loads(result.output)
    nets = data["networks"]
    # LIEC ch. 8: sections 500 Ω, 9 kΩ, 90 kΩ
    assert [n["section_ohms"] for n in nets] == pytest.approx([500, 9_000, 90_000], rel=1e-12)
    assert [n["multiplier_ohms"] for n in nets] == pytest.approx([500, 9_500, 99_500], rel=1e-12)
    # each section has an exact E24 network of two parts (470 + 30, 4k3 + 4k7, 43k + 47k: hand arithmetic)
    assert all(abs(n["full_scale_error"]) < 1e-9 for n in nets)


def test_multiplier_command_refuses_a_low_range(runner):
    result = runner.invoke(cli, ["multiplier", "0.4", "--movement", "1mA", "--movement-ohms", "500", "--json"])
    assert isinstance(result.exception, SystemExit) and result.exit_code == 1
    error = json.loads(result.output)["error"]
    assert error["kind"] == "argument" and "volts=0.4" in error["message"]


def test_meter_commands_usage_errors(runner):
    result = runner.invoke(cli, ["shunt", "2A", "--movement", "fifty", "--movement-ohms", "1k5"])
    assert isinstance(result.exception, SystemExit) and result.exit_code == 2
    assert "Invalid value for '--movement'" in result.output
    result = runner.invoke(cli, ["shunt", "2A,", "--movement", "50uA", "--movement-ohms", "1k5"])
    assert isinstance(result.exception, SystemExit) and result.exit_code == 2
    assert "empty entry" in result.output
    result = runner.invoke(cli, ["shunt", "2A", "--movement-ohms", "1k5"])
    assert isinstance(result.exception, SystemExit) and result.exit_code == 2
    assert "--movement" in result.output
