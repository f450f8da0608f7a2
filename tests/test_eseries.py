"""netsynth.eseries against the IEC 60063 tables typed in tests/data/iec60063.txt."""

from __future__ import annotations

import math
from decimal import Decimal
from pathlib import Path

import pytest

from netsynth.errors import ValueParseError
from netsynth.eseries import (
    SERIES_NAMES,
    mantissas,
    series_of,
    series_tolerance,
    series_values,
)


def _read_reference() -> dict[str, tuple[int, ...]]:
    """Parse the typed tables; E3..E24 are written 1.0 .. 9.1, E48.. as 100 .. 988."""
    tables = {}
    for line in (Path(__file__).parent / "data" / "iec60063.txt").read_text(encoding="utf-8").splitlines():
        if line.startswith("E"):
            name, _, values = line.partition(":")
            tables[name] = tuple(int(Decimal(v) * 10) if "." in v else int(v) for v in values.split())
    return tables


REFERENCE = _read_reference()


def _round_half_up(x: float) -> int:
    return math.floor(x + 0.5)


@pytest.mark.parametrize("name", SERIES_NAMES)
def test_tables_match_the_typed_standard(name):
    # IEC 60063:2015 tables (via Wikipedia "E series of preferred numbers")
    assert mantissas(name) == REFERENCE[name]


@pytest.mark.parametrize(
    "name, length",
    [
        ("E3", 3),  # IEC 60063: 3 values per decade
        ("E6", 6),  # IEC 60063
        ("E12", 12),  # IEC 60063
        ("E24", 24),  # IEC 60063
        ("E48", 48),  # IEC 60063
        ("E96", 96),  # IEC 60063
        ("E192", 192),  # IEC 60063
    ],
)
def test_length_and_strict_order(name, length):
    table = mantissas(name)
    assert len(table) == length
    assert all(a < b for a, b in zip(table, table[1:]))


@pytest.mark.parametrize(
    "small, large",
    [
        ("E3", "E6"),  # IEC 60063: each series contains the one with half the values
        ("E6", "E12"),  # IEC 60063
        ("E12", "E24"),  # IEC 60063
        ("E48", "E96"),  # IEC 60063
        ("E96", "E192"),  # IEC 60063
    ],
)
def test_subsets(small, large):
    assert set(mantissas(small)) < set(mantissas(large))


def test_e48_and_e96_are_every_4th_and_2nd_of_e192():
    # IEC 60063: E96 = every 2nd, E48 = every 4th E192 value (typed tables, not our code)
    assert REFERENCE["E96"] == REFERENCE["E192"][::2]
    assert REFERENCE["E48"] == REFERENCE["E192"][::4]


def test_e24_is_not_inside_e96():
    # IEC 60063 (reference notes): 1.1 is in E96 but 1.2 is not
    e96 = set(mantissas("E96"))
    assert 110 in e96 and 120 not in e96
    assert not {m * 10 for m in mantissas("E24")} <= e96


def test_e24_deviations_from_the_rounding_formula():
    # IEC 60063 E24 vs round-half-up(10^(i/24)) to 2 digits: i = 10..16 are +0.1,
    # i = 22 is 8.2 vs 8.3 (reference-values.md §2, [calc] consistent with [src])
    table = mantissas("E24")
    formula = [_round_half_up(10 * 10 ** (i / 24)) for i in range(24)]
    deviations = {i: table[i] - formula[i] for i in range(24) if table[i] != formula[i]}
    assert deviations == {10: 1, 11: 1, 12: 1, 13: 1, 14: 1, 15: 1, 16: 1, 22: -1}


def test_e192_920_quirk():
    # IEC 60063 E192 i = 185 is 9.20 where 10^(185/192) = 9.1948 rounds to 9.19;
    # the only E192 deviation (sci.electronics.design "E96 Series Computation", 2005)
    table = mantissas("E192")
    formula = [_round_half_up(100 * 10 ** (i / 192)) for i in range(192)]
    assert [i for i in range(192) if table[i] != formula[i]] == [185]
    assert (table[185], formula[185]) == (920, 919)


@pytest.mark.parametrize("name, n", [("E48", 48), ("E96", 96)])
def test_e48_e96_follow_the_formula(name, n):
    # IEC 60063: no deviations from round-half-up(10^(i/n)) in E48 and E96 (reference §2)
    assert mantissas(name) == tuple(_round_half_up(100 * 10 ** (i / n)) for i in range(n))


def test_e24_from_1_ohm_to_10_megohm():
    # IEC 60063 E24: 7 decades × 24 values + 10 MΩ itself = 169 [calc]
    values = series_values("E24", 1.0, 10e6)
    assert len(values) == 169
    assert values[0] == 1.0 and values[-1] == 10e6
    assert all(a < b for a, b in zip(values, values[1:]))


@pytest.mark.parametrize(
    "name, low, high, expected",
    [
        ("E6", 1000.0, 10000.0, (1000.0, 1500.0, 2200.0, 3300.0, 4700.0, 6800.0, 10000.0)),  # IEC 60063 E6, both ends inclusive
        ("E3", 0.1, 0.5, (0.1, 0.22, 0.47)),  # IEC 60063 E3 below 1 Ω
        ("E12", 4700.0, 4700.0, (4700.0,)),  # IEC 60063 E12 4.7; a single-point range
        ("e24", 9000.0, 11000.0, (9100.0, 10000.0, 11000.0)),  # IEC 60063 E24 9.1, 1.0, 1.1; name case-insensitive
        ("E192", 9150.0, 9250.0, (9200.0,)),  # IEC 60063 E192 9.20 (not 9.19)
        ("E96", 100e3, 103e3, (100e3, 102e3)),  # IEC 60063 E96 1.00, 1.02
        ("E3", 5.0, 9.0, ()),  # IEC 60063 E3 has nothing between 4.7 and 10
    ],
)
def test_series_values(name, low, high, expected):
    assert series_values(name, low, high) == expected


def test_series_values_are_exact_decimals():
    # IEC 60062 RKM 4K7 = 4.7 kΩ and E24 4.7: the float must be the one 4700.0 denotes
    assert 4700.0 in series_values("E24", 4000.0, 5000.0)
    assert 0.47 in series_values("E24", 0.4, 0.5)  # float('0.47'), not 47 * 0.01
    assert 3.3e-3 in series_values("E6", 1e-3, 1e-2)  # 3.3 mΩ, not 33 * 1e-4


@pytest.mark.parametrize(
    "name, low, high, fragment",
    [
        ("E5", 1.0, 10.0, "unknown series 'E5'"),  # not an IEC 60063 series
        ("E24", 10.0, 1.0, "invalid range"),  # low above high
        ("E24", 0.0, 10.0, "invalid range"),  # zero is not a resistance
        ("E24", -1.0, 10.0, "invalid range"),  # negative
        ("E24", 1.0, math.inf, "invalid range"),  # unbounded
        ("E24", math.nan, 10.0, "invalid range"),  # nan compares false everywhere
    ],
)
def test_series_values_rejects(name, low, high, fragment):
    with pytest.raises(ValueParseError, match=fragment):
        series_values(name, low, high)


@pytest.mark.parametrize(
    "name, tolerance",
    [
        ("E3", None),  # IEC 60063 practice: ">20 %", none assigned
        ("E6", 0.2),  # IEC 60063 practice: 20 %
        ("E12", 0.1),  # 10 %
        ("E24", 0.05),  # 5 %
        ("E48", 0.02),  # 2 %
        ("E96", 0.01),  # 1 %
        ("E192", 0.005),  # 0.5 % (and tighter)
    ],
)
def test_series_tolerance(name, tolerance):
    assert series_tolerance(name) == tolerance


@pytest.mark.parametrize(
    "ohms, name",
    [
        (4700.0, "E3"),  # IEC 60063 E3 4.7
        (0.15, "E6"),  # E6 1.5
        (82e3, "E12"),  # E12 8.2
        (1100.0, "E24"),  # E24 1.1
        (10.5, "E48"),  # E48 1.05
        (10.2, "E96"),  # E96 1.02 (not in E48: 1.00, 1.05)
        (1.01, "E192"),  # E192 1.01
        (9.2e6, "E192"),  # E192 9.20, the quirk
        (9.19e6, None),  # 9.19 is in no series
        (1.2e5, "E12"),  # E12 1.2 (three-digit 120 is not in E96, but E12 comes first)
        (1234.0, None),  # four digits
        (-4700.0, None),  # not a resistance
    ],
)
def test_series_of(ohms, name):
    assert series_of(ohms) == name
