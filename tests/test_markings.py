"""netsynth.markings against the IEC 60062 marking tables and the EIA-96 code table.

Expected values come from the standards' tables and worked examples, typed here, or from
small decoders written in this file straight from those tables (never from netsynth code).
The E-series values for the round trips are read from tests/data/iec60063.txt, the IEC 60063
tables typed separately from netsynth/eseries.py.
"""

from __future__ import annotations

import math
from decimal import Decimal
from pathlib import Path

import pytest

from netsynth.errors import ArgumentError
from netsynth.markings import (
    Marking,
    color_bands,
    color_bands_problem,
    eia96_code,
    marking_of,
    rkm_code,
    smd_code,
)
from netsynth.values import parse_resistance

# --------------------------------------------------------------------------- reference data


def _iec60063() -> dict[str, tuple[str, ...]]:
    """The typed IEC 60063 tables: name -> the values of one decade as printed ('4.7', '475')."""
    tables = {}
    for line in (Path(__file__).parent / "data" / "iec60063.txt").read_text(encoding="utf-8").splitlines():
        if line.startswith("E"):
            name, _, values = line.partition(":")
            tables[name] = tuple(values.split())
    return tables


IEC60063 = _iec60063()


def _decades(name: str, low: Decimal, high: Decimal) -> list[Decimal]:
    """Every value of a series in [low, high] ohms, as exact decimals."""
    out = []
    for k in range(-4, 12):
        for v in IEC60063[name]:
            mantissa = Decimal(v) if "." in v else Decimal(v) / 100  # '475' is 4.75
            x = (mantissa * Decimal(10) ** k).normalize()
            if low <= x <= high:
                out.append(x)
    return sorted(set(out))


E24_10_TO_1M = _decades("E24", Decimal(10), Decimal(10) ** 6)
E96_ALL = _decades("E96", Decimal("0.1"), Decimal("97.6e6"))


def _exact(ohms: float) -> Decimal:
    return Decimal(repr(ohms)).normalize()


# IEC 60062:2016 colour code, as reproduced in the Wikipedia article "Electronic color code"
# (which cites IEC 60062) and in textbook tables: digit of each colour, power of ten of each
# multiplier colour (gold 10^-1, silver 10^-2), tolerance of each tolerance colour.
DIGIT = {"black": 0, "brown": 1, "red": 2, "orange": 3, "yellow": 4,
         "green": 5, "blue": 6, "violet": 7, "grey": 8, "white": 9}
MULTIPLIER = {**DIGIT, "gold": -1, "silver": -2}
TOLERANCE = {
    "brown": Decimal("0.01"),     # IEC 60062 colour code: ±1 %
    "red": Decimal("0.02"),       # IEC 60062 colour code: ±2 %
    "green": Decimal("0.005"),    # IEC 60062 colour code: ±0.5 %
    "blue": Decimal("0.0025"),    # IEC 60062 colour code: ±0.25 %
    "violet": Decimal("0.001"),   # IEC 60062 colour code: ±0.1 %
    "grey": Decimal("0.0005"),    # ±0.05 %: from memory (reproductions of IEC 60062:2016 disagree; some give orange)
    "gold": Decimal("0.05"),      # IEC 60062 colour code: ±5 %
    "silver": Decimal("0.1"),     # IEC 60062 colour code: ±10 %
}


def decode_bands(bands: tuple[str, ...]) -> tuple[Decimal, Decimal]:
    """(ohms, tolerance) of a 4- or 5-band resistor, read with the IEC 60062 table above."""
    *digits, multiplier, tolerance = bands
    significant = int("".join(str(DIGIT[c]) for c in digits))
    return (Decimal(significant) * Decimal(10) ** MULTIPLIER[multiplier]).normalize(), TOLERANCE[tolerance]


def decode_chip(code: str) -> Decimal:
    """Ohms of a 3- or 4-character chip code (IEC 60062): R is the decimal point, else the last
    digit is the number of zeros after the others."""
    if "R" in code:
        return Decimal(code.replace("R", ".")).normalize()
    return (Decimal(int(code[:-1])) * Decimal(10) ** int(code[-1])).normalize()


# EIA-96 code: the two digits index the E96 mantissas (01 = 100 ... 96 = 976), the letter multiplies.
EIA96_LETTER = {
    "Z": Decimal("0.001"), "Y": Decimal("0.01"), "R": Decimal("0.01"), "X": Decimal("0.1"),
    "S": Decimal("0.1"), "A": Decimal(1), "B": Decimal(10), "C": Decimal(100), "D": Decimal(1000),
    "E": Decimal(10) ** 4, "F": Decimal(10) ** 5,
}  # EIA-96 code table, multiplier letters


def decode_eia96(code: str) -> Decimal:
    mantissa = Decimal(IEC60063["E96"][int(code[:2]) - 1])
    return (mantissa * EIA96_LETTER[code[2]]).normalize()


def test_typed_e96_table_matches_the_eia96_index():
    # EIA-96 code table: 01 = 100, 02 = 102, 47 = 301, 48 = 309, 96 = 976 (the index counts the
    # E96 values of IEC 60063 from 01, so 301, the 47th, is 47, not 48)
    e96 = IEC60063["E96"]
    assert (e96[0], e96[1], e96[46], e96[47], e96[95]) == ("100", "102", "301", "309", "976")
    assert len(e96) == 96


# --------------------------------------------------------------------------- RKM code


@pytest.mark.parametrize(
    "ohms, code",
    [
        (0.47, "R47"),  # IEC 60062 RKM code
        (4.7, "4R7"),  # IEC 60062 RKM code
        (470.0, "470R"),  # IEC 60062 RKM code
        (4700.0, "4K7"),  # IEC 60062 RKM code
        (47000.0, "47K"),  # IEC 60062 RKM code
        (47300.0, "47K3"),  # IEC 60062 RKM code
        (470000.0, "470K"),  # IEC 60062 RKM code
        (4.7e6, "4M7"),  # IEC 60062 RKM code
        (0.1, "R10"),  # IEC 60062 RKM code (secondary source)
        (1000.0, "1K0"),  # IEC 60062 RKM code (secondary source)
        (2.2e6, "2M2"),  # IEC 60062 RKM code (secondary source)
        (1e6, "1M0"),  # IEC 60062 RKM rule, as 1K0
        (100.0, "100R"),  # IEC 60062 RKM rule, as 470R
        (2200.0, "2K2"),  # IEC 60062 RKM rule, as 4K7
        (10000.0, "10K"),  # IEC 60062 RKM rule, as 47K
        (0.01, "R010"),  # IEC 60062 RKM rule, current-sense value (secondary source)
        (3370.0, "3K37"),  # IEC 60062 RKM rule, three digits as 47K3
        (1e9, "1G0"),  # IEC 60062 RKM G = 10^9 (secondary source)
    ],
)
def test_rkm_code_table(ohms, code):
    assert rkm_code(ohms) == code


@pytest.mark.parametrize("value", E24_10_TO_1M + E96_ALL, ids=str)
def test_rkm_code_reads_back(value):
    code = rkm_code(float(value))
    assert "k" not in code  # IEC 60062 marks kilo with K
    assert _exact(parse_resistance(code)) == value
    # the letter sits where the decimal point goes: swap it for '.' and scale by hand
    letter = next(c for c in code if c.isalpha())
    scale = {"R": 0, "K": 3, "M": 6, "G": 9}[letter]  # IEC 60062 RKM letters
    assert (Decimal(code.replace(letter, ".")) * Decimal(10) ** scale).normalize() == value


# --------------------------------------------------------------------------- colour bands


@pytest.mark.parametrize(
    "ohms, tolerance, bands, colours",
    [
        # IEC 60062 colour code, worked example: yellow-violet-red-gold = 4.7 kΩ ±5 %
        (4700.0, 0.05, 4, ("yellow", "violet", "red", "gold")),
        # IEC 60062 colour code by hand: 1 0 ×100 = 1 kΩ; 2 2 ×1000 = 22 kΩ
        (1000.0, 0.05, 4, ("brown", "black", "red", "gold")),
        (22000.0, 0.05, 4, ("red", "red", "orange", "gold")),
        # Wikipedia "Electronic color code", photo caption: 2260 Ω 1 % = 2-2-6-1-1
        (2260.0, 0.01, 5, ("red", "red", "blue", "brown", "brown")),
        # orange-orange-black-brown-violet = 3.3 kΩ ±0.1 % (university course notes on the colour code)
        (3300.0, 0.001, 5, ("orange", "orange", "black", "brown", "violet")),
        # IEC 60062 multipliers gold ×0.1 and silver ×0.01, by hand
        (4.7, 0.05, 4, ("yellow", "violet", "gold", "gold")),
        (0.47, 0.1, 4, ("yellow", "violet", "silver", "silver")),
        (10.0, 0.01, 5, ("brown", "black", "black", "gold", "brown")),
        # IEC 60062 white = ×10^9, by hand: 100 × 10^9 = 100 GΩ with three digits
        (1e11, 0.01, 5, ("brown", "black", "black", "white", "brown")),
        # every tolerance colour of the IEC 60062 table on 1 kΩ (5 bands)
        (1000.0, 0.02, 5, ("brown", "black", "black", "brown", "red")),
        (1000.0, 0.005, 5, ("brown", "black", "black", "brown", "green")),
        (1000.0, 0.0025, 5, ("brown", "black", "black", "brown", "blue")),
        (1000.0, 0.0005, 5, ("brown", "black", "black", "brown", "grey")),  # grey ±0.05 %: from memory
        (1000.0, 0.1, 5, ("brown", "black", "black", "brown", "silver")),
    ],
)
def test_color_bands_table(ohms, tolerance, bands, colours):
    assert color_bands(ohms, tolerance, bands) == colours
    assert color_bands_problem(ohms, tolerance, bands) is None


@pytest.mark.parametrize("value", E24_10_TO_1M, ids=str)
def test_color_bands_round_trip_e24(value):
    four = color_bands(float(value), 0.05, 4)
    five = color_bands(float(value), 0.01, bands=5)
    assert four is not None and len(four) == 4
    assert five is not None and len(five) == 5
    assert decode_bands(four) == (value, Decimal("0.05"))
    assert decode_bands(five) == (value, Decimal("0.01"))


@pytest.mark.parametrize("value", E96_ALL, ids=str)
def test_color_bands_round_trip_e96(value):
    five = color_bands(float(value), 0.01, 5)
    if value < 1:  # three digits × silver (10^-2) start at 1.00 Ω: below it no multiplier colour fits
        assert five is None and "multiplier" in color_bands_problem(float(value), 0.01, 5)
        return
    assert five is not None and decode_bands(five) == (value, Decimal("0.01"))
    # a three-digit mantissa (E96 but not E24, e.g. 102) has no two-digit code
    if len(value.as_tuple().digits) == 3:
        assert color_bands(float(value), 0.01, 4) is None


@pytest.mark.parametrize(
    "ohms, tolerance, bands",
    [
        (4750.0, 0.01, 4),  # three significant digits in two digit bands
        (4753.0, 0.01, 5),  # four significant digits in three digit bands
        (0.0047, 0.05, 4),  # 47 × 10^-4: below silver (×0.01)
        (0.047, 0.05, 5),  # 470 × 10^-4: below silver
        (1e11, 0.05, 4),  # 10 × 10^10: beyond white (×10^9)
        (4700.0, 0.2, 4),  # ±20 % is marked by no band at all
        (4700.0, 0.03, 4),  # ±3 % has no IEC 60062 colour
        (4700.0, 0.0, 5),  # an exact part has no colour
    ],
)
def test_color_bands_none_with_a_reason(ohms, tolerance, bands):
    assert color_bands(ohms, tolerance, bands) is None
    reason = color_bands_problem(ohms, tolerance, bands)
    assert isinstance(reason, str) and reason


def test_color_bands_reasons_name_the_cause():
    assert "significant digits" in color_bands_problem(4750.0, 0.01, 4)
    assert "multiplier" in color_bands_problem(0.0047, 0.05, 4)
    assert "tolerance" in color_bands_problem(4700.0, 0.2, 4)


# --------------------------------------------------------------------------- chip codes


@pytest.mark.parametrize(
    "ohms, digits, code",
    [
        (4700.0, 3, "472"),  # IEC 60062 3-character code: 47 and two zeros
        (10000.0, 3, "103"),  # IEC 60062 3-character code: 10 and three zeros
        (4.7, 3, "4R7"),  # IEC 60062 3-character code: R is the decimal point
        (0.47, 3, "R47"),  # IEC 60062 3-character code, R first below 1 Ω
        (10.0, 3, "100"),  # IEC 60062 3-character code: 10 and no zeros
        (4700.0, 4, "4701"),  # IEC 60062 4-character code: 470 and one zero
        (10000.0, 4, "1002"),  # IEC 60062 4-character code: 100 and two zeros
        (100.0, 4, "1000"),  # IEC 60062 4-character code: 100 and no zeros
        (10.0, 4, "10R0"),  # IEC 60062 4-character code with R (from memory)
        (0.01, 4, "R010"),  # current-sense chip marking R010 = 10 mΩ (from memory)
    ],
)
def test_smd_code_table(ohms, digits, code):
    assert smd_code(ohms, digits) == code


@pytest.mark.parametrize("value", E24_10_TO_1M, ids=str)
def test_smd_codes_round_trip_e24(value):
    three, four = smd_code(float(value)), smd_code(float(value), 4)
    assert three is not None and len(three) == 3 and decode_chip(three) == value
    assert four is not None and len(four) == 4 and decode_chip(four) == value


@pytest.mark.parametrize("value", E96_ALL, ids=str)
def test_smd_codes_round_trip_e96(value):
    four = smd_code(float(value), 4)
    assert four is not None and len(four) == 4 and decode_chip(four) == value
    three = smd_code(float(value), 3)
    if len(value.as_tuple().digits) == 3:
        assert three is None  # two digits cannot hold 1.02, 102, ...
    else:
        assert three is not None and decode_chip(three) == value


@pytest.mark.parametrize(
    "ohms, digits",
    [
        (4750.0, 3),  # three significant digits
        (4753.0, 4),  # four significant digits
        (0.005, 3),  # R05 would need a third place: R005 is four characters
        (0.0005, 4),  # below R001
        (1e11, 3),  # 10 and ten zeros: the zero count is one digit
        (1e12, 4),  # 100 and ten zeros
    ],
)
def test_smd_code_none(ohms, digits):
    assert smd_code(ohms, digits) is None


# --------------------------------------------------------------------------- EIA-96


@pytest.mark.parametrize(
    "ohms, code",
    [
        (100.0, "01A"),  # EIA-96 code table: 01 = 100, A = ×1
        (102.0, "02A"),  # EIA-96 code table: 02 = 102
        (301.0, "47A"),  # EIA-96 code table: 47 = 301 (the 47th E96 value)
        (309.0, "48A"),  # EIA-96 code table: 48 = 309
        (976.0, "96A"),  # EIA-96 code table: 96 = 976
        (97600.0, "96C"),  # EIA-96: 976 × 100 (C)
        (10000.0, "01C"),  # EIA-96: 100 × 100 (C)
        (0.1, "01Z"),  # EIA-96 letter Z = ×0.001
        (1.02, "02Y"),  # EIA-96 letter Y = ×0.01
        (30.9, "48X"),  # EIA-96 letter X = ×0.1
        (1000.0, "01B"),  # EIA-96 letter B = ×10
        (301000.0, "47D"),  # EIA-96 letter D = ×1000
        (1.02e6, "02E"),  # EIA-96 letter E = ×10^4
        (9.76e7, "96F"),  # EIA-96 letter F = ×10^5
    ],
)
def test_eia96_code_table(ohms, code):
    assert eia96_code(ohms) == code


@pytest.mark.parametrize("value", E96_ALL, ids=str)
def test_eia96_round_trip(value):
    code = eia96_code(float(value))
    assert code is not None and len(code) == 3
    assert decode_eia96(code) == value


@pytest.mark.parametrize(
    "ohms",
    [
        4700.0,  # 470 is E24, not E96
        101.0,  # E192 only
        0.0976,  # 976 × 10^-4: below Z
        9.76e8,  # 976 × 10^6: beyond F
        1000.5,  # not a series value at all
    ],
)
def test_eia96_none(ohms):
    assert eia96_code(ohms) is None


# --------------------------------------------------------------------------- one stock line


def test_marking_of_a_5_percent_e24_part():
    m = marking_of(4700.0, 0.05)
    assert isinstance(m, Marking)
    assert m.rkm == "4K7"  # IEC 60062 RKM code
    assert m.bands4 == ("yellow", "violet", "red", "gold")  # IEC 60062 colour code example
    assert m.bands5 == ("yellow", "violet", "black", "brown", "gold")  # 470 × 10 by hand from the table
    assert (m.smd3, m.smd4) == ("472", "4701")  # IEC 60062 3- and 4-character codes
    assert m.eia96 is None  # 470 is not in the EIA-96 table
    assert len(m.notes) == 1 and "EIA-96" in m.notes[0]


def test_marking_of_an_e96_part():
    m = marking_of(10200.0, 0.01)
    assert m.rkm == "10K2"  # IEC 60062 RKM rule, as 47K3
    assert m.bands4 is None and m.bands5 == ("brown", "black", "red", "red", "brown")  # 102 × 100, by hand
    assert m.smd3 is None and m.smd4 == "1022"  # 102 and two zeros
    assert m.eia96 == "02C"  # EIA-96 table: 02 = 102, C = ×100
    assert len(m.notes) == 2  # one line for each code that does not exist


def test_marking_is_frozen():
    m = marking_of(1000.0, 0.01)
    with pytest.raises(AttributeError):
        m.rkm = "1K"  # type: ignore[misc]


@pytest.mark.parametrize(
    "call",
    [
        lambda: rkm_code(0.0),
        lambda: rkm_code(-4700.0),
        lambda: rkm_code(math.nan),
        lambda: rkm_code(math.inf),
        lambda: color_bands(4700.0, 0.05, 6),
        lambda: color_bands(4700.0, 1.5),
        lambda: color_bands(4700.0, -0.01),
        lambda: smd_code(4700.0, 5),
        lambda: eia96_code(0.0),
        lambda: marking_of(4700.0, 2.0),
    ],
)
def test_bad_arguments_raise(call):
    with pytest.raises(ArgumentError):
        call()
