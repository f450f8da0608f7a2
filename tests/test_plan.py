"""A board's values from one drawer: the needs file, the shared allocation, the plan command.

Reference values are hand arithmetic (series sums, parallel products over sums) written beside each
case; stock accounting is checked by counting parts in the answer, and every network's value by an
independent nodal solve (``netsynth.nodal``, which knows no series/parallel rule).
"""

from __future__ import annotations

import json
import math
from collections import Counter

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from netsynth.analysis.conditions import OperatingPoint
from netsynth.cli import cli
from netsynth.errors import ArgumentError, ValueParseError
from netsynth.network import parts_in_order, to_netlist
from netsynth.nodal import solve_network
from netsynth.plan import Need, load_needs, plan_board
from netsynth.search.solver import SolverSettings
from netsynth.stock import StockBin, StockItem, load_bin

#: a fixed seed and one worker: the same plan on every run (see netsynth.search.solver)
QUICK = SolverSettings(seconds=10.0, workers=1, seed=1)


def nodal_ohms(net) -> float:
    edges, nodes = to_netlist(net)
    return solve_network(edges, nodes, volts=1.0).resistance_ohms


def used_per_line(plan) -> Counter:
    """Parts the plan's networks take, counted per stock line (the line each part *is*)."""
    used: Counter = Counter()
    for r in plan.results:
        if r.candidate is not None:
            used.update(p.line for p in parts_in_order(r.candidate.network))
    return used


# ------------------------------------------------------------------ the needs file


def write(tmp_path, text, name="needs.csv"):
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return str(path)


def test_needs_file_reads_every_column(tmp_path):
    path = write(tmp_path, "# a comment\nRef, Target ,within,watts,note\nR1,4k7,,,\nR2,3k37,0.1%,,gain\n"
                           "\nR3,10,2%,1/4W,\n")
    needs = load_needs(path, ambient_c=40.0)
    assert [n.ref for n in needs] == ["R1", "R2", "R3"]
    assert [n.target_ohms for n in needs] == [4700.0, 3370.0, 10.0]
    assert [n.within for n in needs] == [0.01, pytest.approx(0.001), pytest.approx(0.02)]  # blank: ±1 %
    assert needs[0].point is None and needs[2].point == OperatingPoint(watts=0.25, ambient_c=40.0)
    assert [n.line for n in needs] == [3, 4, 6]  # physical lines, comments and blank lines counted


@pytest.mark.parametrize("text, error, words", [
    ("ref,value\nR1,4k7\n", ArgumentError, "line 1: the header has no 'target' column"),
    ("target\n4k7\n", ArgumentError, "no 'ref' column"),
    ("ref,target\nR1,4k7k\n", ValueParseError, "line 2, field 'target'"),
    ("ref,target\nR1,\n", ValueParseError, "line 2, field 'target': the target is blank"),
    ("ref,target,within\nR1,4k7,1\n", ValueParseError, "line 2, field 'within'"),  # a bare number is refused
    ("ref,target,volts,watts\nR1,4k7,5,1\n", ValueParseError, "line 2, field 'volts, watts'"),
    ("ref,target\nR1,4k7\nR1,1k\n", ArgumentError, "line 3, field 'ref': 'R1' is already listed on line 2"),
    ("ref,target\n", ArgumentError, "no row lists a need"),
    ("ref,target\nR1,4k7,5\n", ArgumentError, "line 2: the row has 3 cells"),
])
def test_needs_file_errors_name_file_line_and_field(tmp_path, text, error, words):
    path = write(tmp_path, text)
    with pytest.raises(error) as info:
        load_needs(path)
    message = str(info.value)
    assert message.startswith(path) and words in message and "\n" not in message


def test_missing_needs_file_is_one_line(tmp_path):
    with pytest.raises(ArgumentError, match="no such file"):
        load_needs(str(tmp_path / "nope.csv"))


# ------------------------------------------------------------------ allocation


def test_an_endless_needs_file_is_refused_not_read_forever(tmp_path):
    # an endless device: read up to the cap plus one byte, then refused in one line
    with pytest.raises(ArgumentError, match="larger than 8 MiB"):
        load_needs("/dev/zero")
    huge = tmp_path / "huge.csv"
    huge.write_bytes(b"ref,target\n" + b"R1,1k\n" * (8 * 1024 * 1024 // 6 + 1))
    with pytest.raises(ArgumentError, match="larger than"):
        load_needs(huge)


def test_careful_allocation_serves_what_greedy_cannot():
    # Drawer: 1k ×1, 1k5 ×2, 5k6 ×2, 8k2 ×1; needs within ±0.1 %: A 1k, B 11k2, C 2k8.
    # By hand: B is 5k6 + 5k6 = 11 200 or 1k5 + 1k5 + 8k2 = 11 200; C is 5k6 || 5k6 = 5600/2 = 2 800;
    # A is the 1k. A greedy that serves A, B, C in turn with each need's fewest parts gives B the two
    # 5k6 and leaves C nothing; the plan gives B the 1k5/8k2 string and uses the whole drawer.
    drawer = StockBin((StockItem(1000.0, 1), StockItem(1500.0, 2), StockItem(5600.0, 2), StockItem(8200.0, 1)))
    hand_options = {"A": [Counter({1000.0: 1})], "B": [Counter({5600.0: 2}), Counter({1500.0: 2, 8200.0: 1})],
                    "C": [Counter({5600.0: 2})]}
    left, greedy_served = Counter({1000.0: 1, 1500.0: 2, 5600.0: 2, 8200.0: 1}), []
    for ref, options in hand_options.items():
        for use in options:
            if all(left[v] >= k for v, k in use.items()):
                left -= use
                greedy_served.append(ref)
                break
    assert greedy_served == ["A", "B"]  # the greedy fails C
    needs = [Need("A", 1000.0, 0.001), Need("B", 11200.0, 0.001), Need("C", 2800.0, 0.001)]
    plan = plan_board(needs, drawer, max_parts=3, settings=QUICK)
    assert plan.status == "optimal" and plan.served == 3 and plan.parts == 6
    assert [r.candidate.expression for r in plan.results] == ["1k", "1k5 + 1k5 + 8k2", "5k6 || 5k6"]
    assert all(item.count == 0 for item in plan.leftover.items)  # the whole drawer, each line used up


def test_oversubscribed_drawer_says_which_needs_and_why():
    # one 1k and one 22 Ω, ¼ W: three needs want the 1k; 0.5 Ω is beyond reach (22 || 1k ≈ 21.5 Ω is the
    # least the drawer makes); 22 Ω at 1 W would put 1 W into a ¼ W part (over its 0.125 W derated limit)
    drawer = StockBin((StockItem(1000.0, 1, location="A1"), StockItem(22.0, 1, location="A2")))
    needs = [Need("R1", 1000.0), Need("R2", 1000.0), Need("R3", 1000.0), Need("R4", 0.5),
             Need("R5", 22.0, point=OperatingPoint(watts=1.0))]
    plan = plan_board(needs, drawer, max_parts=2, settings=QUICK)
    assert plan.status == "optimal" and plan.served == 1
    assert plan.results[0].candidate.expression == "1k"  # ties go to the first need (fixed tie-break)
    for r in plan.results[1:3]:
        assert r.reason.startswith("stock taken by others") and "R1" in r.reason
    assert plan.results[3].reason.startswith("no candidate within accuracy")
    assert plan.results[4].reason.startswith("nothing within its limits")


def test_operating_point_picks_the_line_that_can_carry_it():
    # 10 Ω at 1 W: a ¼ W part may take 0.125 W (50 % derating), a 5 W part 2.5 W. The bin has one
    # 5 W 10 Ω and two ¼ W: R1 (1 W) must get the 5 W part; R2 (no load) then gets a ¼ W one.
    drawer = StockBin((StockItem(10.0, 2, location="quarter"), StockItem(10.0, 1, power_rating_w=5.0, location="big")))
    needs = [Need("R2", 10.0), Need("R1", 10.0, point=OperatingPoint(watts=1.0))]
    plan = plan_board(needs, drawer, max_parts=1, settings=QUICK)
    assert plan.served == 2
    r2, r1 = plan.results
    assert [p.line.location for p in r1.candidate.components] == ["big"]
    assert [p.line.location for p in r2.candidate.components] == ["quarter"]
    assert r1.stress is not None and not r1.stress.violations


# A small random drawer: a few values from one decade, counts 0..3, some lines unlimited.
_values = st.lists(st.sampled_from([10.0, 22.0, 47.0, 100.0, 150.0, 220.0, 330.0, 470.0, 1000.0]),
                   min_size=2, max_size=5, unique=True)


@st.composite
def drawers_and_needs(draw):
    values = draw(_values)
    items = tuple(StockItem(v, draw(st.sampled_from([1, 2, 3, None])), location=f"bay {i}")
                  for i, v in enumerate(values))
    # targets that the drawer's values make in one or two parts, so that needs compete for stock
    made = values + [a + b for a in values for b in values] + [a * b / (a + b) for a in values for b in values]
    targets = draw(st.lists(st.sampled_from(made), min_size=1, max_size=5))
    needs = [Need(f"R{i + 1}", t, draw(st.sampled_from([0.0, 0.01, 0.05]))) for i, t in enumerate(targets)]
    return StockBin(items), needs


@settings(max_examples=25, deadline=None)
@given(drawers_and_needs())
def test_a_plan_never_takes_more_of_a_line_than_it_holds(case):
    drawer, needs = case
    plan = plan_board(needs, drawer, max_parts=2, settings=QUICK)
    used = used_per_line(plan)
    for line, k in used.items():
        assert line in drawer.items  # every part is one of the drawer's own lines
        assert line.count is None or k <= line.count
    left = {item.line: item.count for item in plan.leftover.items}  # the leftover keeps each line's number
    for item in drawer.items:
        assert left[item.line] == (None if item.count is None else item.count - used[item])
    assert sum(p.count for p in plan.pick_list) == sum(used.values())
    for r in plan.results:
        if r.candidate is None:
            assert r.reason
            continue
        c = r.candidate
        assert abs(c.value_ohms / r.need.target_ohms - 1) <= r.need.within + 1e-12
        assert math.isclose(nodal_ohms(c.network), c.value_ohms, rel_tol=1e-9)


# ------------------------------------------------------------------ the command


def test_plan_command_text_and_leftover_file(runner, tmp_path):
    needs = write(tmp_path, "ref,target,within\nA,1k,0.1%\nB,11k2,0.1%\nC,2k8,0.1%\nD,1M,\n")
    drawer = write(tmp_path, "value,qty,location\n1k,1,a\n1k5,2,b\n5k6,2,c\n8k2,1,d\n22,3,e\n", "drawer.csv")
    after = tmp_path / "after.csv"
    result = runner.invoke(cli, ["plan", needs, "--bin", drawer, "-k", "3", "--workers", "1",
                                 "--leftover", str(after)])
    assert result.exit_code == 0, result.output
    out = result.output
    assert "Plan: proven optimal (CP-SAT): 3 of 4 needs served with 6 parts" in out
    assert "1k5 + 1k5 + 8k2" in out and "Not served:" in out and "D (1 MΩ, ±1 %)" in out
    assert "Saved the leftover bin" in out
    left = load_bin(str(after))  # qty-0 rows are read and dropped: only the 22 Ω line is left
    assert [(i.ohms, i.count) for i in left.items] == [(22.0, 3)]


def test_plan_command_json_contract(runner, tmp_path):
    needs = write(tmp_path, "ref,target,within\nA,1k,0.1%\nB,2k,0.1%\nC,7,\n")
    drawer = write(tmp_path, "value,qty\n1k,3\n", "drawer.csv")
    result = runner.invoke(cli, ["plan", needs, "--bin", drawer, "--json", "-k", "2", "--workers", "1"])
    assert result.exit_code == 0, result.output
    data = json.loads(result.output)
    assert data["status"] == "optimal" and data["bound"] is None
    a, b, c = data["targets"]
    assert a["served"] and a["expression"] == "1k" and a["components"][0]["ohms"] == 1000.0
    assert b["served"] and b["expression"] == "1k + 1k" and b["verified_ohms"] == pytest.approx(2000.0)
    assert not c["served"] and c["reason"].startswith("no candidate within accuracy")
    assert data["pick_list"] == [{"line": 2, "ohms": 1000.0, "count": 3, "location": "", "tolerance": 0.01,
                                  "watts": 0.25, "max_volts": 200.0, "refs": ["A", "B"]}]
    assert data["leftover"] == [{"line": 2, "ohms": 1000.0, "qty": 0}]


def test_plan_command_bad_needs_file_is_one_line(runner, tmp_path):
    needs = write(tmp_path, "ref,target\nR1,4k7k\n")
    result = runner.invoke(cli, ["plan", needs, "--json"])
    assert result.exit_code == 1
    error = json.loads(result.output)["error"]
    assert error["kind"] == "parse" and "line 2, field 'target'" in error["message"]
