"""Network trees: canonical form, text form, values, netlists."""

from __future__ import annotations

import re
from fractions import Fraction

import pytest
from hypothesis import given, settings

from netsynth.errors import ValueParseError
from netsynth.network import (
    MAX_TEXT_PARTS,
    Part,
    Series,
    canonical,
    exact_resistance,
    from_text,
    parallel,
    part_count,
    parts_in_order,
    resistance,
    series,
    to_netlist,
    to_text,
    value_network,
)
from netsynth.nodal import equivalent_resistance
from netsynth.render.compact import compact
from netsynth.render.diagram import draw
from netsynth.stock import StockItem
from netsynth.values import parse_power, parse_resistance, to_code
from tests.strategies import networks, repeated_networks

TEXT_CASES = [
    # (typed text, canonical text, ohms by hand arithmetic)
    ("1k + (2k2 || 4k7)", "1k + (2k2 || 4k7)", 1000 + 2200 * 4700 / 6900),
    ("(4.7 kΩ || 2k2) + 1000", "1k + (2k2 || 4k7)", 1000 + 2200 * 4700 / 6900),  # spelling and order do not matter
    ("10 + 20 + 30", "10 + 20 + 30", 60.0),
    ("(10 + 20) + 30", "10 + 20 + 30", 60.0),  # nested series flattens
    ("1k || 1k || 1k", "1k || 1k || 1k", 1000 / 3),
    ("R47 ∥ 0R47", "0R47 || 0R47", 0.235),  # ∥ is accepted as parallel; IEC 60062 R47 = 0R47, printed 0R47
    ("25m", "0R025", 0.025),  # SI milli in; IEC 60062 RKM with a leading zero out
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

# ---- repeats: Ns(X) is N copies of X in series, Np(X) N copies in parallel

NOTATION_CASES = [
    # (typed text, the tree it means, ohms by hand arithmetic)
    ("7s(10)", series(*[10.0] * 7), 70.0),  # 7 × 10 Ω
    ("7p(10)", parallel(*[10.0] * 7), 10 / 7),  # 10 Ω / 7
    ("7p(7s(10))", parallel(*[series(*[10.0] * 7)] * 7), 10.0),  # 70 Ω / 7
    ("10p(4s(10) + 5s(12))", parallel(*[series(*[10.0] * 4, *[12.0] * 5)] * 10), 10.0),  # (40 + 60) / 10
    ("470 + 2s(1k)", series(470.0, 1000.0, 1000.0), 2470.0),
    ("1k + 3p(4k7)", series(1000.0, parallel(4700.0, 4700.0, 4700.0)), 1000 + 4700 / 3),
    ("(2s(1k)) || 3k3", parallel(series(1000.0, 1000.0), 3300.0), 2000 * 3300 / 5300),
    ("2s(1k || 1k)", series(parallel(1000.0, 1000.0), parallel(1000.0, 1000.0)), 1000.0),  # 2 × 500 Ω
    ("3p(2p(1k))", parallel(*[1000.0] * 6), 1000 / 6),  # nested parallel flattens
    ("2s( R47 )", series(0.47, 0.47), 0.94),  # spaces are free; R47 is IEC 60062 RKM for 0.47 Ω
    ("2s (1k)", series(1000.0, 1000.0), 2000.0),  # a space before '(' too
    ("0R47 ∥ 2p(R47)", parallel(0.47, 0.47, 0.47), 0.47 / 3),
    ("1k + (2k2 || 4k7)", series(1000.0, parallel(2200.0, 4700.0)), 1000 + 2200 * 4700 / 6900),  # full form
    ("100p(100s(1k))", parallel(*[series(*[1000.0] * 100)] * 100), 1000.0),  # 100 kΩ / 100; 10 000 parts
]


@pytest.mark.parametrize("typed, tree, ohms", NOTATION_CASES)
def test_repeats_read_as_copies(typed, tree, ohms):
    net = from_text(typed)
    assert net == tree
    assert resistance(net) == pytest.approx(ohms, rel=1e-12)


COMPACT_CASES = [
    # (tree, what the table prints)
    (series(*[10.0] * 7), "7s(10)"),
    (parallel(*[10.0] * 7), "7p(10)"),
    (parallel(*[series(*[10.0] * 7)] * 7), "7p(7s(10))"),
    (parallel(*[series(*[10.0] * 4, *[12.0] * 5)] * 10), "10p(4s(10) + 5s(12))"),
    (series(470.0, 1000.0, 1000.0), "470 + 2s(1k)"),
    (series(1000.0, parallel(4700.0, 4700.0, 4700.0)), "1k + 3p(4k7)"),  # a repeat needs no extra parentheses
    (parallel(3300.0, series(1000.0, 1000.0)), "3k3 || 2s(1k)"),
    (series(1000.0, parallel(2200.0, 4700.0)), "1k + (2k2 || 4k7)"),  # nothing repeats: the full form
    (parallel(0.1, 0.1, 0.1, 0.1), "4p(0R1)"),  # never R1, which reads as a part reference
    (parallel(*[1000.0] * 4), "4p(1k)"),  # never 1k/4, which reads as a fraction
]


@pytest.mark.parametrize("tree, text", COMPACT_CASES)
def test_compact_form(tree, text):
    assert compact(tree) == text
    assert from_text(text) == tree


def test_equal_values_from_different_stock_lines_are_not_counted_together():
    a, b = (Part(1000.0, StockItem(1000.0, location=where)) for where in ("A1", "B2"))
    net = series(a, a, b)
    assert compact(net) == "2s(1k) + 1k"
    assert from_text(compact(net)) == series(1000.0, 1000.0, 1000.0)


BAD_NOTATION = [
    ("7×10", "'7×10' is not a value"),  # the old display form
    ("10/7", "'10/7' is not a value"),
    ("(4×10 + 5×12)/10", "'4×10' is not a value"),
    ("1k + R7 + 7x10", "'7x10' is not a value"),
    ("7S(10)", "not a repeat"),  # lowercase s and p only
    ("7x(10)", "not a repeat"),
    ("1s(10)", "a repeat count is 2 or more"),
    ("0p(10)", "a repeat count is 2 or more"),
    ("7s10", "is not a value"),  # a repeat always has parentheses
    ("7s", "is not a value"),
    ("2s()", "expected a part before ')'"),
    ("1k (2k)", "expected '+' or '||' before '('"),
    ("2s(1k) 3", "expected '+' or '||' before '3'"),
    ("2s(1k + 1k || 1k)", "mixed at one level"),
    ("2s(1k", "never closed"),
    ("1k + 0", "greater than zero"),
    ("1000000p(10)", f"more than {MAX_TEXT_PARTS} parts"),
    ("10001s(1k)", f"more than {MAX_TEXT_PARTS} parts"),
    ("2s(5001p(1k))", f"more than {MAX_TEXT_PARTS} parts"),  # counts multiply
    ("101p(100s(1k))", f"more than {MAX_TEXT_PARTS} parts"),
    ("9" * 5000 + "p(1k)", f"more than {MAX_TEXT_PARTS} parts"),  # a count too long for int()
    (" + ".join(["1k"] * (MAX_TEXT_PARTS + 1)), f"more than {MAX_TEXT_PARTS} parts"),
    ("x" * 10_000, "is not a value"),
]


@pytest.mark.parametrize("text, fragment", BAD_NOTATION, ids=lambda v: v[:20])
def test_bad_notation_is_a_short_error(text, fragment):
    with pytest.raises(ValueParseError) as info:
        from_text(text)
    message = str(info.value)
    assert fragment in message
    assert "\n" not in message and len(message) < 160
    quoted = re.fullmatch(r"cannot read network '(.*?)': .*", message)[1]
    assert len(quoted) <= 40


@pytest.mark.parametrize(
    "deep",
    [
        "(" * 5000 + "1k" + ")" * 5000,
        "2s(" * 5000 + "1k" + ")" * 5000,
        "1k + (1k || (" * 2500 + "1k" + "))" * 2500,
        "(" * 5000,
    ],
    ids=["parentheses", "repeats", "alternating", "unclosed"],
)
def test_deep_nesting_is_a_parse_error_not_a_crash(deep):
    with pytest.raises(ValueParseError, match="nested more than"):
        from_text(deep)


def _text_pieces(text: str) -> list[str]:
    return [p for p in re.split(r"[\s()]+|\+|\|\|", text) if p]


@settings(max_examples=80, deadline=None)
@given(repeated_networks())
def test_printed_forms_read_back_to_the_same_network(net):
    values_only = canonical(value_network(net))
    assert from_text(compact(net)) == values_only
    assert from_text(to_text(net)) == values_only


@settings(max_examples=80, deadline=None)
@given(repeated_networks())
def test_compact_form_has_no_token_that_reads_as_a_value_or_a_wattage(net):
    text = compact(net)
    assert "/" not in text and "×" not in text and text.isascii()
    codes = {to_code(p.ohms) for p in parts_in_order(net)}
    for piece in _text_pieces(text):
        if piece in codes:
            continue  # a part, written as to_code writes it
        assert re.fullmatch(r"[0-9]+[sp]", piece), piece  # otherwise only a repeat count
        for reader in (parse_resistance, parse_power):
            with pytest.raises(ValueParseError):
                reader(piece)
    for chunk in text.split():  # and no run between spaces reads as one quantity unless it is a part
        if chunk not in codes:
            for reader in (parse_resistance, parse_power):
                with pytest.raises(ValueParseError):
                    reader(chunk)


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
