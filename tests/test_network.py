"""Network trees: canonical form, text form, values, netlists."""

from __future__ import annotations

from fractions import Fraction

import pytest
from hypothesis import given, settings

from netsynth.errors import ValueParseError
from netsynth.network import (
    Part,
    Series,
    canonical,
    exact_resistance,
    from_text,
    parallel,
    part_count,
    resistance,
    series,
    to_netlist,
    to_text,
)
from netsynth.nodal import equivalent_resistance
from netsynth.render.diagram import draw
from tests.strategies import networks

TEXT_CASES = [
    # (typed text, canonical text, ohms by hand arithmetic)
    ("1k + (2k2 || 4k7)", "1k + (2k2 || 4k7)", 1000 + 2200 * 4700 / 6900),
    ("(4.7 kΩ || 2k2) + 1000", "1k + (2k2 || 4k7)", 1000 + 2200 * 4700 / 6900),  # spelling and order do not matter
    ("10 + 20 + 30", "10 + 20 + 30", 60.0),
    ("(10 + 20) + 30", "10 + 20 + 30", 60.0),  # nested series flattens
    ("1k || 1k || 1k", "1k || 1k || 1k", 1000 / 3),
    ("R47 ∥ 0R47", "R47 || R47", 0.235),  # ∥ is accepted as parallel
    ("25m", "25m", 0.025),
    ("((1k))", "1k", 1000.0),
    ("100 || (220 + (330 || 470))", "100 || (220 + (330 || 470))", 1 / (1 / 100 + 1 / (220 + 330 * 470 / 800))),
]


@pytest.mark.parametrize("typed, text, ohms", TEXT_CASES)
def test_text_form_reads_and_writes(typed, text, ohms):
    net = from_text(typed)
    assert to_text(net) == text
    assert resistance(net) == pytest.approx(ohms, rel=1e-12)


BAD_TEXT = [
    ("1k + 2k2 || 4k7", "mixed at one level"),
    ("1k +", "missing"),
    ("(1k + 2k", "never closed"),
    ("1k + 2k)", "no matching"),
    ("1k + 4k7k", "cannot read"),
    ("", "empty"),
    ("+ 1k", "expected a part"),
    ("1k 2k", "cannot read"),
]


@pytest.mark.parametrize("text, fragment", BAD_TEXT)
def test_bad_text_is_a_clear_error(text, fragment):
    with pytest.raises(ValueParseError, match=fragment):
        from_text(text)


def test_equivalent_networks_compare_and_hash_equal():
    a = series(1000.0, parallel(2200.0, 4700.0))
    b = series(parallel(4700.0, 2200.0), 1000.0)
    assert a == b and hash(a) == hash(b)
    assert series(series(1.0, 2.0), 3.0) == Series((Part(1.0), Part(2.0), Part(3.0)))


def test_exact_resistance_of_a_ladder_is_a_fibonacci_ratio():
    # OEIS A048211 comment (Schoenfield): the ladder of n unit parts reaches F(n+1)/F(n);
    # for 5 parts 1 + 1/(1 + 1/(1 + 1/(1 + 1))) ... = 8/5
    ladder = series(1.0, parallel(1.0, series(1.0, parallel(1.0, 1.0))))
    assert exact_resistance(ladder) == Fraction(8, 5)


@settings(max_examples=60, deadline=None)
@given(networks())
def test_text_round_trip_gives_the_canonical_form(net):
    assert from_text(to_text(net)) == canonical(net)


@settings(max_examples=60, deadline=None)
@given(networks())
def test_netlist_has_one_edge_per_part_and_the_same_value(net):
    # reference: nodal analysis (netsynth.nodal), which applies no series/parallel rule
    edges, nodes = to_netlist(net)
    assert len(edges) == part_count(net)
    assert equivalent_resistance(edges, nodes) == pytest.approx(resistance(net), rel=1e-9)


def test_drawing_shows_parallel_branches_between_rails():
    text = draw(from_text("1k + (2k2 || 4k7)"))
    assert text.splitlines() == [
        "A ──[1k]──┬─[2k2]─┬── B",
        "          └─[4k7]─┘",
    ]
