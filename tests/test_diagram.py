"""The terminal drawing: hand-drawn expected pictures for small networks, and properties for any network."""

from __future__ import annotations

import pytest
from hypothesis import given
from hypothesis import strategies as st

from netsynth.errors import ArgumentError
from netsynth.network import Network, Part, Series, from_text, parallel, part_count, series
from netsynth.render.diagram import MIN_RUN, WIDTH, draw, draw_block, plan, plan_parts, power_label

# Each expected picture is drawn by hand from the layout rules in the module docstring
# (series side by side, parallel between rails, runs of five or more drawn once with a count).
DRAWINGS = [
    # one part: the wire, the part, the wire
    ("4k7", "A ──[4k7]── B"),
    # series, side by side on one wire
    ("1k + 2k2", "A ──[1k]──[2k2]── B"),
    # the README's picture: a part in series with a bank of two
    ("1k + (2k2 || 4k7)",
     "A ──[1k]──┬─[2k2]─┬── B\n"
     "          └─[4k7]─┘"),
    # two equal parts are drawn out (runs of fewer than five are not collapsed)
    ("10 || 10",
     "A ──┬─[10]─┬── B\n"
     "    └─[10]─┘"),
    # three branches: the middle one hangs on ├ ┤
    ("10 || 22 || 33",
     "A ──┬─[10]─┬── B\n"
     "    ├─[22]─┤\n"
     "    └─[33]─┘"),
    # a bank inside a bank: the inner one is a branch like any other
    ("1k + (10 || (22 + (33 || 47)))",
     "A ──[1k]──┬─[10]───────────┬── B\n"
     "          └─[22]──┬─[33]─┬─┘\n"
     "                  └─[47]─┘"),
    # a string of six equal parts: one block with a brace and its count
    ("6s(10)",
     "A ──[10]──────────────── B\n"
     "    ╰─ ×6 in series ─╯"),
    # twenty strings of eight: one string, the count of strings on the bottom rail
    ("20p(8s(10))",
     "A ──┬─[10]───────────────┬── B\n"
     "    │ ╰─ ×8 in series ─╯ │\n"
     "    └─ ×20 in parallel ──┘"),
    # a run that is part of a bank becomes a bank inside the bank
    ("5p(10) || 22",
     "A ──┬─┬─[10]─────────────┬─┬── B\n"
     "    │ └─ ×5 in parallel ─┘ │\n"
     "    └─[22]─────────────────┘"),
]


@pytest.mark.parametrize("text, expected", DRAWINGS, ids=[t for t, _ in DRAWINGS])
def test_drawing_matches_the_hand_drawn_picture(text, expected):
    assert draw(from_text(text)) == expected


def test_ascii_drawing_with_power_labels():
    # drawn by hand: 5 × 100 Ω in parallel, each at 0.25 W; ASCII rails and an x for the count
    expected = ("A --+-[100 0.25W]------+-- B\n"
                "    +- x5 in parallel -+")
    assert draw(from_text("5p(100)"), watts=[0.25] * 5, ascii=True) == expected


def test_power_labels_follow_the_parts_order():
    # parts_in_order of 1k + (2k2 || 4k7): 1k, 2k2, 4k7 (depth first, children sorted)
    expected = ("A ──[1k 1W]──┬─[2k2 2W]─┬── B\n"
                "             └─[4k7 3W]─┘")
    assert draw(from_text("1k + (2k2 || 4k7)"), watts=[1.0, 2.0, 3.0]) == expected


def test_a_long_chain_folds_within_the_width():
    # width 30 leaves 24 columns for the chain; five parts of 5 columns need 25, so it folds:
    # four parts on the first row (20 columns), the fifth below, the wire back up on the right
    expected = ("A ──[1]──[2]──[3]──[4]──┐ ┌─ B\n"
                "   ┌────────────────────┘ │\n"
                "   └─[5]──────────────────┘")
    assert draw(from_text("1 + 2 + 3 + 4 + 5"), width=30) == expected


def test_power_label_spelling():
    # two significant digits below 1 W, three from 1 W; milliwatts below 10 mW
    assert [power_label(w) for w in (0.125, 0.5, 1.0, 4.75, 0.005, 1500.0)] == [
        "0.12W", "0.5W", "1W", "4.75W", "5mW", "1.5kW"]
    assert power_label(2e-6, ascii=True) == "2uW" and power_label(2e-6) == "2µW"


def test_watts_must_give_one_value_per_part():
    with pytest.raises(ArgumentError, match="watts: 2 values for a network of 3 parts"):
        draw(from_text("1k + 1k + 1k"), watts=[0.1, 0.1])


# ---------------------------------------------------------------- properties

values = st.sampled_from([0.47, 10.0, 22.0, 100.0, 4700.0, 1e6])


def _runs_of(join, kids):
    # at most 400 parts per tree, checked before joining: nested runs multiply, and a tree past the
    # 10 000-part limit would be refused while it is built
    return st.lists(st.tuples(kids, st.integers(1, 8)), min_size=1, max_size=3).filter(
        lambda runs: sum(part_count(k) * n for k, n in runs) <= 400).map(
        lambda runs: join(*[k for k, n in runs for _ in range(n)]))


#: series/parallel trees whose children repeat up to eight times (so some runs collapse)
repeating = st.recursive(
    values.map(Part),
    lambda kids: st.one_of(_runs_of(series, kids), _runs_of(parallel, kids)),
    max_leaves=10,
).filter(lambda n: part_count(n) <= 400)


def drawn_blocks(net: Network) -> int:
    """How many part labels a drawing of `net` shows, counted from the rule, not from the drawing code:
    a run of MIN_RUN or more equal neighbours shows one copy, a shorter run every copy."""
    if isinstance(net, Part):
        return 1
    total, kids, i = 0, net.children, 0
    while i < len(kids):
        j = i
        while j < len(kids) and kids[j] == kids[i]:
            j += 1
        n = j - i
        total += drawn_blocks(kids[i]) * (1 if n >= MIN_RUN else n)
        i = j
    return total


@given(repeating, st.booleans())
def test_every_line_of_a_block_has_the_same_width(net, ascii):
    block = draw_block(net, ascii=ascii)
    assert len({len(line) for line in block}) == 1


@given(repeating)
def test_one_label_per_collapsed_block(net):
    drawing = draw(net)
    assert drawing.count("[") == drawn_blocks(net) == len(plan_parts(plan(net)))


@given(repeating)
def test_ascii_drawing_is_ascii(net):
    watts = [1e-6 * (i + 1) for i in range(part_count(net))]  # µW labels too
    assert draw(net, watts=watts, ascii=True).isascii()


@given(repeating)
def test_terminals_on_the_first_line_only(net):
    lines = draw(net, left="IN", right="OUT").splitlines()
    assert lines[0].startswith("IN ─") and lines[0].endswith("─ OUT")
    assert not any("IN" in line or "OUT" in line for line in lines[1:])


@given(st.lists(values, min_size=2, max_size=60))
def test_chains_of_parts_stay_within_the_width(vals):
    # a chain of parts always folds narrow enough: nothing wider than a part label has to fit
    assert all(len(line) <= WIDTH for line in draw(series(*vals)).splitlines())


def test_collapsed_run_shows_the_copy_and_the_count():
    net = from_text("10p(4s(10) + 5s(12))")  # 90 parts
    drawing = draw(net)
    assert drawing.count("[10]") == 4 and drawing.count("[12]") == 1
    assert "×5 in series" in drawing and "×10 in parallel" in drawing


def test_equal_values_on_different_stock_lines_are_not_one_run():
    # == includes the stock line: five 10 Ω parts from two drawers are two runs
    from netsynth.stock import StockItem

    a, b = StockItem(10.0, location="A1"), StockItem(10.0, location="B2")
    net = series(*[Part(10.0, a)] * 5, *[Part(10.0, b)] * 2)
    assert isinstance(net, Series)
    assert draw(net).count("[10]") == 1 + 2


@pytest.mark.parametrize("text", ["20p(20s(10))", "400s(10)", "400p(1k)", "8p(10s(10) + 40s(12))"])
def test_four_hundred_part_arrays_draw_as_small_pictures(text):
    net = from_text(text)
    assert part_count(net) == 400
    lines = draw(net).splitlines()
    assert len(lines) <= 4 and max(len(line) for line in lines) <= WIDTH


def test_a_large_irregular_network_is_drawn_without_a_fallback():
    # 400 different parts: 20 banks of 20 parts in series, each bank of four strings of five
    vals = [10.0 * (1 + i / 1000) for i in range(400)]
    banks = [parallel(*[series(*vals[b * 20 + s * 5: b * 20 + s * 5 + 5]) for s in range(4)]) for b in range(20)]
    net = series(*banks)
    drawing = draw(net)
    assert drawing.count("[") == 400
    assert max(len(line) for line in drawing.splitlines()) <= WIDTH
