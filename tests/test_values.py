"""netsynth.values: tables of spellings, bad input, and the to_code round trip."""

from __future__ import annotations

import math

import pytest
from hypothesis import given
from hypothesis import strategies as st

from netsynth.errors import ValueParseError
from netsynth.values import (
    format_error,
    format_ohms,
    parse_current,
    parse_duty,
    parse_power,
    parse_range,
    parse_ratio,
    parse_resistance,
    parse_tcr,
    parse_tolerance,
    parse_voltage,
    to_code,
)


@pytest.mark.parametrize(
    "text, ohms",
    [
        # IEC 60062 RKM code examples (Wikipedia "RKM code", citing IEC 60062)
        ("R47", 0.47),  # IEC 60062 RKM code
        ("4R7", 4.7),  # IEC 60062 RKM code
        ("470R", 470.0),  # IEC 60062 RKM code
        ("4K7", 4700.0),  # IEC 60062 RKM code
        ("47K", 47000.0),  # IEC 60062 RKM code
        ("47K3", 47300.0),  # IEC 60062 RKM code
        ("470K", 470000.0),  # IEC 60062 RKM code
        ("4M7", 4.7e6),  # IEC 60062 RKM code
        ("R10", 0.1),  # IEC 60062 RKM code (secondary source)
        ("1K0", 1000.0),  # IEC 60062 RKM code (secondary source)
        ("2M2", 2.2e6),  # IEC 60062 RKM code (secondary source)
        # the same rule (letter = decimal point) with our lowercase and milli letters
        ("4k7", 4700.0),  # IEC 60062 RKM rule, lowercase k (SI kilo)
        ("3k37", 3370.0),  # IEC 60062 RKM rule, three digits
        ("0R22", 0.22),  # IEC 60062 RKM rule with a leading zero
        ("47R", 47.0),  # IEC 60062 RKM rule, R as a suffix
        ("R010", 0.01),  # IEC 60062 RKM rule, current-sense value
        ("1M0", 1e6),  # IEC 60062 RKM rule
        ("1G", 1e9),  # IEC 60062 RKM G = 10^9 (secondary source)
        ("4r7", 4.7),  # lowercase r accepted as R
        # SI prefixes (BIPM SI Brochure, 9th ed.): m 10^-3, k 10^3, M 10^6, G 10^9
        ("4.7k", 4700.0),  # SI prefix suffix
        ("4.7 kΩ", 4700.0),  # SI prefix + unit symbol
        ("4.7 k\u2126", 4700.0),  # U+2126 OHM SIGN instead of Greek omega
        ("4.7kohm", 4700.0),  # unit word
        ("4.7 kohms", 4700.0),  # plural unit word
        ("4.7K ohm", 4700.0),  # uppercase K, spaced unit
        ("1M", 1e6),  # uppercase M is mega
        ("10m", 0.01),  # lowercase m is milli (SI), not mega
        ("25mΩ", 0.025),  # milliohm with unit
        ("10mohm", 0.01),  # milliohm with unit word
        ("1meg", 1e6),  # SPICE spelling of mega (common practice, no source)
        ("1MEG", 1e6),  # SPICE spelling, upper case
        ("1.5meg", 1.5e6),  # SPICE spelling with decimals
        # plain numbers
        ("4700", 4700.0),  # plain ohms
        ("1.5e3", 1500.0),  # exponent form
        ("0.025", 0.025),  # plain fraction of an ohm
        ("470 Ω", 470.0),  # number + unit
        ("470ohm", 470.0),  # number + unit word
        ("  4k7\t", 4700.0),  # surrounding whitespace ignored
        ("+4k7", 4700.0),  # explicit plus sign
    ],
)
def test_parse_resistance(text, ohms):
    assert parse_resistance(text) == ohms  # exact: built from decimal text


@pytest.mark.parametrize(
    "text, fragment",
    [
        ("", "cannot read an empty value"),  # empty
        ("   ", "cannot read an empty value"),  # whitespace only
        ("4k7k", "cannot read '4k7k': expected a resistance such as 4k7"),  # two letters
        ("k", "cannot read 'k': expected a resistance"),  # letter without digits
        ("R", "cannot read 'R': expected a resistance"),  # letter without digits
        ("4.7.1k", "expected a resistance"),  # two decimal points
        ("4.7k7", "expected a resistance"),  # point and RKM letter together
        ("4k7 Ω", "expected a resistance"),  # unit after an infix letter (IEC 60062: the letter is the point)
        ("1e3k", "expected a resistance"),  # exponent and prefix together
        ("4x7", "expected a resistance"),  # unknown letter
        ("nan", "expected a resistance"),  # not a number
        ("inf", "expected a resistance"),  # not finite
        ("0", "a resistance must be greater than zero"),  # zero
        ("0R0", "a resistance must be greater than zero"),  # zero in RKM
        ("-4k7", "a resistance must be greater than zero"),  # negative
        ("-10", "a resistance must be greater than zero"),  # negative plain
        ("1e999", "from 1 µΩ to 1 TΩ"),  # overflows a float: outside the accepted range (netsynth.limits)
        (
            "4,7k",
            "cannot read '4,7k': use a point for decimals (4.7k) or the RKM code (4k7); "
            "a comma is the CSV field separator",
        ),  # decimal comma: rejected on purpose, with both ways out
        ("4,7", "use a point for decimals (4.7) or the RKM code (4R7)"),  # decimal comma, no letter
        ("1,000,000", "a comma is the CSV field separator"),  # thousands separators
    ],
)
def test_parse_resistance_rejects(text, fragment):
    with pytest.raises(ValueParseError) as info:
        parse_resistance(text)
    assert fragment in str(info.value)


@pytest.mark.parametrize(
    "ohms, code",
    [
        (4700.0, "4k7"),  # IEC 60062 RKM code 4K7 (we write SI lowercase k)
        (3370.0, "3k37"),  # IEC 60062 RKM rule
        (1000.0, "1k"),  # IEC 60062 RKM code 1K0, trailing zero dropped
        (470.0, "470"),  # plain below 1 kΩ
        (10.0, "10"),  # plain
        # below 1 Ω: IEC 60062 RKM with the leading zero the standard permits (0R47 for R47), so a
        # code never starts with a letter and cannot read as a reference designator (R1)
        (0.47, "0R47"),  # IEC 60062 RKM code R47, leading zero
        (0.1, "0R1"),  # IEC 60062 RKM code R10, leading zero, trailing zero dropped
        (0.022, "0R022"),  # IEC 60062 RKM rule (current-sense R022), leading zero
        (0.025, "0R025"),  # IEC 60062 RKM rule, leading zero
        (1e6, "1M"),  # IEC 60062 RKM M
        (2.2e6, "2M2"),  # IEC 60062 RKM code
        (4.7e6, "4M7"),  # IEC 60062 RKM code
        (1.5, "1R5"),  # IEC 60062 RKM rule
        (100000.0, "100k"),  # IEC 60062 RKM rule (470K pattern)
        (47300.0, "47k3"),  # IEC 60062 RKM code 47K3
        (1e9, "1G"),  # giga
    ],
)
def test_to_code(ohms, code):
    assert to_code(ohms) == code


@given(st.floats(min_value=1e-4, max_value=1e12, allow_nan=False, allow_infinity=False))
def test_to_code_round_trips_exactly(ohms):
    code = to_code(ohms)
    assert parse_resistance(code) == ohms
    assert "." not in code and sum(c.isalpha() for c in code) <= 1  # IEC 60062: one letter, no point
    assert code[0].isdigit()  # never a letter first: 0R47, not R47 (IEC 60062 permits the leading zero)


@pytest.mark.parametrize("bad", [0.0, -1.0, math.nan, math.inf])
def test_to_code_rejects(bad):
    with pytest.raises(ValueParseError, match="must be positive and finite"):
        to_code(bad)


@pytest.mark.parametrize(
    "ohms, digits, text",
    [
        (4700.0, 4, "4.7 kΩ"),  # SI prefix k (BIPM SI Brochure, 9th ed.)
        (3370.0, 4, "3.37 kΩ"),  # trailing zeros stripped
        (0.025, 4, "25 mΩ"),  # SI prefix m
        (1e6, 4, "1 MΩ"),  # SI prefix M
        (2.2e9, 4, "2.2 GΩ"),  # SI prefix G
        (470.0, 4, "470 Ω"),  # no prefix
        (1023.5, 4, "1.024 kΩ"),  # 4 significant digits, half up
        (1023.5, 2, "1 kΩ"),  # 2 significant digits
        (999.96, 4, "1 kΩ"),  # rounding carries into the next prefix
        (1e-4, 4, "0.1 mΩ"),  # below the smallest prefix
    ],
)
def test_format_ohms(ohms, digits, text):
    assert format_ohms(ohms, digits) == text


@pytest.mark.parametrize(
    "text, fraction",
    [
        ("1%", 0.01),  # percent
        ("0.1 %", 0.001),  # percent with a space
        ("±5%", 0.05),  # plus-minus sign
        ("+/-2%", 0.02),  # ASCII plus-minus
        ("50ppm", 5e-5),  # parts per million
        ("0%", 0.0),  # an ideal part
        ("1e-1%", 0.001),  # exponent form, as resistances accept 1.5e3: 1e-1 % = 0.1 % (hand arithmetic)
        ("2.5E1ppm", 2.5e-5),  # capital E; 25 ppm (hand arithmetic)
        # IEC 60062 tolerance letters (EN 60062:2005 colour table; Yageo, KOA datasheets)
        ("B", 0.001),  # IEC 60062 tolerance letter: ±0.1 %
        ("C", 0.0025),  # IEC 60062 tolerance letter: ±0.25 %
        ("D", 0.005),  # IEC 60062 tolerance letter: ±0.5 %
        ("F", 0.01),  # IEC 60062 tolerance letter: ±1 %
        ("G", 0.02),  # IEC 60062 tolerance letter: ±2 %
        ("J", 0.05),  # IEC 60062 tolerance letter: ±5 %
        ("K", 0.1),  # IEC 60062 tolerance letter: ±10 %
        ("M", 0.2),  # IEC 60062 tolerance letter: ±20 %
    ],
)
def test_parse_tolerance(text, fraction):
    assert parse_tolerance(text) == fraction


@pytest.mark.parametrize(
    "text, fragment",
    [
        ("0.01", "add % or ppm"),  # bare number: fraction or percent? rejected on purpose
        ("5", "add % or ppm"),  # bare number
        ("-1%", "must be zero or more"),  # negative
        ("100%", "must be below 100 %"),  # a tolerance of 100 % or more is no part
        ("L", "expected a tolerance"),  # L = 0.01 % in IEC 60062:2016 is unconfirmed (from memory), not accepted
        ("5%%", "expected a tolerance"),  # garbage
        ("", "expected a tolerance"),  # empty
        ("1e-2", "add % or ppm"),  # exponent form is still a bare number
        ("1e2%", "must be below 100 %"),  # 1e2 % = 100 %
        ("5e%", "expected a tolerance"),  # exponent without digits
    ],
)
def test_parse_tolerance_rejects(text, fragment):
    with pytest.raises(ValueParseError, match=fragment):
        parse_tolerance(text)


@pytest.mark.parametrize(
    "text, fraction",
    [
        ("0.1%", 0.001),  # percent
        ("50ppm", 5e-5),  # ppm
        ("1 PPM", 1e-6),  # unit case-insensitive
        ("1e-5%", 1e-7),  # exponent form: 1e-5 % = 1e-5 / 100 = 1e-7 (hand arithmetic)
        ("1E-5 %", 1e-7),  # capital E, spaced unit
        ("5e1ppm", 5e-5),  # 5e1 ppm = 50 ppm
        ("1.5e-1%", 0.0015),  # 0.15 % (hand arithmetic)
        ("+1e+1ppm", 1e-5),  # signed exponent: 10 ppm
        ("0e3%", 0.0),  # zero with an exponent is still an exact match
    ],
)
def test_parse_ratio(text, fraction):
    assert parse_ratio(text) == fraction


@pytest.mark.parametrize(
    "text, fragment",
    [
        ("1e-5", "add % or ppm"),  # a bare number in exponent form is as ambiguous as 0.001
        ("1.5e3%", "must be below 100 %"),  # 1500 %
        ("-1e-3%", "must be zero or more"),  # negative
        ("1e%", "expected an accuracy"),  # exponent without digits
        ("1e-5e2%", "expected an accuracy"),  # two exponents
        ("e-5%", "expected an accuracy"),  # no mantissa
    ],
)
def test_parse_ratio_rejects(text, fragment):
    with pytest.raises(ValueParseError, match=fragment):
        parse_ratio(text)


def test_parse_ratio_has_no_letters():
    with pytest.raises(ValueParseError, match="expected an accuracy"):
        parse_ratio("F")  # tolerance letters are for parts, not for an accuracy goal


@pytest.mark.parametrize(
    "text, watts",
    [
        ("0.25", 0.25),  # bare watts
        ("0.25W", 0.25),  # with unit
        ("1/4W", 0.25),  # fraction as printed on leaded parts (Yageo CFR-25: 1/4 W)
        ("1/4", 0.25),  # fraction without unit
        ("1/6 W", 1 / 6),  # Yageo CFR-12: 1/6 W
        ("250mW", 0.25),  # SI milli
        ("3W", 3.0),  # integer
        ("1 W", 1.0),  # spaced unit
    ],
)
def test_parse_power(text, watts):
    assert parse_power(text) == watts


@pytest.mark.parametrize(
    "text, fragment",
    [
        ("0W", "greater than zero"),  # zero
        ("-1W", "greater than zero"),  # negative
        ("1/0W", "expected a power rating"),  # division by zero
        ("quarter", "expected a power rating"),  # garbage
        ("1/4V", "expected a power rating"),  # wrong unit
    ],
)
def test_parse_power_rejects(text, fragment):
    with pytest.raises(ValueParseError, match=fragment):
        parse_power(text)


@pytest.mark.parametrize(
    "text, volts",
    [
        ("200", 200.0),  # bare volts (Vishay D/CRCW 1206: 200 V)
        ("200V", 200.0),  # with unit
        ("1kV", 1000.0),  # SI kilo
        ("1.5 kV", 1500.0),  # spaced
        ("500 V", 500.0),  # Yageo CFR100: 500 V
    ],
)
def test_parse_voltage(text, volts):
    assert parse_voltage(text) == volts


@pytest.mark.parametrize("text", ["0V", "-5V", "200W", "V", ""])
def test_parse_voltage_rejects(text):
    with pytest.raises(ValueParseError, match="cannot read"):
        parse_voltage(text)


@pytest.mark.parametrize(
    "text, ppm",
    [
        ("100", 100.0),  # bare number is ppm/K
        ("100ppm", 100.0),  # unit
        ("±50 ppm/K", 50.0),  # Vishay TNPW style
        ("25ppm/°C", 25.0),  # per degree Celsius = per kelvin
        ("-500 ppm/°C", 500.0),  # Yageo CFR carbon film is negative; magnitude kept
        ("0", 0.0),  # ideal
    ],
)
def test_parse_tcr(text, ppm):
    assert parse_tcr(text) == ppm


@pytest.mark.parametrize("text", ["ppm", "50 %", "+350/-500", "fast"])
def test_parse_tcr_rejects(text):
    with pytest.raises(ValueParseError, match="expected a temperature coefficient"):
        parse_tcr(text)


@pytest.mark.parametrize(
    "text, low, high",
    [
        ("10..1M", 10.0, 1e6),  # plain and SI
        ("1R..10M", 1.0, 1e7),  # IEC 60062 RKM ends
        ("4k7..4k7", 4700.0, 4700.0),  # one point
        (" R1 .. 1G ", 0.1, 1e9),  # spaces around
    ],
)
def test_parse_range(text, low, high):
    assert parse_range(text) == (low, high)


@pytest.mark.parametrize(
    "text, fragment",
    [
        ("1M..10", "write 10..1M"),  # reversed
        ("10-1M", "expected a range LOW..HIGH"),  # no separator
        ("10..", "cannot read an empty value"),  # missing high end
        ("10..x", "cannot read 'x'"),  # bad high end
    ],
)
def test_parse_range_rejects(text, fragment):
    with pytest.raises(ValueParseError, match=fragment):
        parse_range(text)


@pytest.mark.parametrize(
    "rel, text",
    [
        (0.0, "0"),  # exactly on target
        (0.0012, "+0.12 %"),  # 1.2e-3 >= 1e-3: percent
        (0.001, "+0.1 %"),  # the switch point is percent
        (-0.05, "-5 %"),  # negative percent
        (1.2e-4, "+120 ppm"),  # below 1e-3: ppm
        (-3.2e-6, "-3.2 ppm"),  # small negative
        (-0.0123456, "-1.23 %"),  # three significant digits
    ],
)
def test_format_error(rel, text):
    assert format_error(rel) == text


@pytest.mark.parametrize(
    "text, amps",
    [
        ("2", 2.0),  # bare number: amperes
        ("2A", 2.0),
        ("1.5 A", 1.5),
        ("150mA", 0.15),  # SI prefix milli (BIPM SI Brochure, from memory)
    ],
)
def test_parse_current(text, amps):
    assert parse_current(text) == pytest.approx(amps)


@pytest.mark.parametrize(
    "text, fraction",
    [("10%", 0.1), ("100 %", 1.0), ("0.25", 0.25), ("2.5%", 0.025)],  # percent means hundredths
)
def test_parse_duty(text, fraction):
    assert parse_duty(text) == pytest.approx(fraction)


@pytest.mark.parametrize("text", ["0", "150%", "-5%", "half", "1.5"])
def test_parse_duty_rejects(text):
    with pytest.raises(ValueParseError, match="duty cycle"):
        parse_duty(text)
