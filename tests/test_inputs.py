"""netsynth.inputs: the API's arguments read like the command line's, with typed errors naming the parameter."""

from __future__ import annotations

import math
from fractions import Fraction
from pathlib import Path

import pytest

from netsynth.errors import ArgumentError, NetsynthError, StockError, ValueParseError
from netsynth.inputs import as_bin, as_count, as_factor, as_fraction, as_ohms, as_temp_c, as_tolerance
from netsynth.stock import StockBin, default_bin

ROOT = Path(__file__).resolve().parent.parent


# ------------------------------------------------------------------ as_ohms


@pytest.mark.parametrize(
    "x, ohms",
    [
        (4700, 4700.0),  # int ohms
        (0.025, 0.025),  # float ohms
        (Fraction(1, 4), 0.25),  # any real number
        ("4k7", 4700.0),  # IEC 60062 RKM code: the letter is the decimal point
        ("R47", 0.47),  # IEC 60062 RKM code below 1 Ω
        ("4.7 kΩ", 4700.0),  # SI prefix and unit symbol (BIPM SI Brochure, 9th ed.)
        ("10m", 0.01),  # SI milli
        ("1.5e3", 1500.0),  # exponent form
    ],
)
def test_as_ohms_reads(x, ohms):
    assert as_ohms(x) == ohms


@pytest.mark.parametrize(
    "x, error, fragment",
    [
        (True, ArgumentError, "target=True: expected a resistance"),  # a bool is an int to Python, never ohms
        (False, ArgumentError, "not bool"),
        (None, ArgumentError, "not NoneType"),
        ([4700], ArgumentError, "not list"),
        (0, ArgumentError, "above zero"),
        (-10.0, ArgumentError, "above zero"),
        (math.nan, ArgumentError, "target=nan"),
        (math.inf, ArgumentError, "target=inf"),
        (-math.inf, ArgumentError, "above zero"),
        ("4k7k", ValueParseError, "target: cannot read '4k7k'"),  # text that cannot be read
        ("nan", ValueParseError, "cannot read 'nan'"),
        ("inf", ValueParseError, "cannot read 'inf'"),
        ("0", ValueParseError, "greater than zero"),
        ("", ValueParseError, "empty"),
    ],
)
def test_as_ohms_refuses(x, error, fragment):
    with pytest.raises(error, match=fragment):
        as_ohms(x)


def test_as_ohms_names_the_parameter():
    with pytest.raises(ArgumentError, match=r"^low_ohms=-1: "):
        as_ohms(-1, "low_ohms")
    with pytest.raises(ValueParseError, match=r"^high_ohms: "):
        as_ohms("abc", "high_ohms")


def test_errors_are_netsynth_errors_and_value_errors():
    # callers may catch either the project's base class or Python's ValueError
    for bad in (0, "abc"):
        with pytest.raises(NetsynthError):
            as_ohms(bad)
        with pytest.raises(ValueError):
            as_ohms(bad)


# ------------------------------------------------------------------ as_fraction, as_tolerance


@pytest.mark.parametrize(
    "x, fraction",
    [
        (None, None),  # not given
        (0.001, 0.001),  # a number is a fraction: 0.001 = 0.1 %
        (0, 0.0),  # exact match
        ("0.1%", 0.001),  # percent (hand arithmetic)
        ("50ppm", 5e-5),  # parts per million (hand arithmetic)
        ("1e-5%", 1e-7),  # exponent form: 1e-5 / 100 (hand arithmetic)
        ("0.001", 0.001),  # a bare number as text is a fraction, like the number
        ("1e-3", 0.001),  # bare number with an exponent
        (" 0.1 % ", 0.001),  # surrounding space
    ],
)
def test_as_fraction_reads(x, fraction):
    assert as_fraction(x, "within") == fraction


@pytest.mark.parametrize(
    "x, error, fragment",
    [
        (True, ArgumentError, "within=True"),  # bools refused
        (-0.001, ArgumentError, "0 or more"),
        (math.nan, ArgumentError, "within=nan"),
        (math.inf, ArgumentError, "within=inf"),
        ([0.1], ArgumentError, "not list"),
        ("-1%", ValueParseError, "within: cannot read '-1%'"),
        ("F", ValueParseError, "expected an accuracy"),  # letters are for part tolerances
        ("nan", ValueParseError, "cannot read 'nan'"),
        ("", ValueParseError, "expected an accuracy"),
    ],
)
def test_as_fraction_refuses(x, error, fragment):
    with pytest.raises(error, match=fragment):
        as_fraction(x, "within")


@pytest.mark.parametrize(
    "x, fraction",
    [
        (None, None),
        (0.01, 0.01),
        ("1%", 0.01),
        ("±0.5 %", 0.005),
        ("F", 0.01),  # IEC 60062 tolerance letter: ±1 %
        ("B", 0.001),  # IEC 60062 tolerance letter: ±0.1 %
        ("1e-1%", 0.001),  # exponent form (hand arithmetic)
        ("0.02", 0.02),  # bare number as text: a fraction
    ],
)
def test_as_tolerance_reads(x, fraction):
    assert as_tolerance(x, "spec") == fraction


@pytest.mark.parametrize(
    "x, error, fragment",
    [
        (False, ArgumentError, "spec=False"),
        (1.0, ArgumentError, "below 1"),  # a tolerance of 100 % is no part
        (-0.01, ArgumentError, "0 or more"),
        (math.nan, ArgumentError, "spec=nan"),
        ("100%", ValueParseError, "must be below 100 %"),
        ("L", ValueParseError, "spec: cannot read 'L'"),  # unconfirmed IEC 60062 letter, refused
    ],
)
def test_as_tolerance_refuses(x, error, fragment):
    with pytest.raises(error, match=fragment):
        as_tolerance(x, "spec")


# ------------------------------------------------------------------ as_bin


def test_as_bin_reads_a_path_relative_to_the_working_folder(monkeypatch):
    monkeypatch.chdir(ROOT)
    stock = as_bin("bins/makerspace-drawer.csv")
    assert isinstance(stock, StockBin)
    # the file's first row: 10R,3,5%,1/4W,250,... in drawer A1
    first = stock.item_for(10.0)
    assert (first.count, first.tolerance, first.power_rating_w, first.location) == (3, 0.05, 0.25, "drawer A1")


def test_as_bin_takes_a_pathlike_a_bin_or_none():
    from_path = as_bin(ROOT / "bins" / "makerspace-drawer.csv")
    assert from_path.item_for(10.0).count == 3  # the file's first row
    assert as_bin(from_path) is from_path
    assert as_bin(None).name == default_bin().name


@pytest.mark.parametrize(
    "x, error, fragment",
    [
        (42, ArgumentError, "stock=42"),
        (True, ArgumentError, "not bool"),
        (b"bins/x.csv", ArgumentError, "not bytes"),
        (["a.csv"], ArgumentError, "not list"),
        ("", ArgumentError, "empty"),
        ("  ", ArgumentError, "empty"),
        ("no-such-file.csv", StockError, "no-such-file.csv"),
    ],
)
def test_as_bin_refuses(x, error, fragment):
    with pytest.raises(error, match=fragment):
        as_bin(x)


# ------------------------------------------------------------------ as_count


@pytest.mark.parametrize(
    "x, low, high, n",
    [
        (None, 1, None, None),
        (1, 1, None, 1),
        (400, 1, 400, 400),
        (0, 0, 20, 0),
    ],
)
def test_as_count_reads(x, low, high, n):
    assert as_count(x, "max_parts", low, high) == n


@pytest.mark.parametrize(
    "x, low, high, fragment",
    [
        (True, 1, None, "max_parts=True: expected a whole number, not bool"),  # bools refused
        (4.0, 1, None, "not float"),  # a float, even a whole one, is refused
        ("4", 1, None, "not str"),
        (0, 1, None, "at least 1"),
        (-3, 1, None, "at least 1"),
        (401, 1, 400, "from 1 to 400"),
    ],
)
def test_as_count_refuses(x, low, high, fragment):
    with pytest.raises(ArgumentError, match=fragment):
        as_count(x, "max_parts", low, high)


# ------------------------------------------------------------------ as_temp_c


@pytest.mark.parametrize(
    "x, celsius",
    [
        (None, None),
        (85, 85.0),
        (-40.0, -40.0),
        ("85", 85.0),
        ("-40", -40.0),
        ("85C", 85.0),
        ("85 °C", 85.0),
        ("125°C", 125.0),
        ("85 \u2103", 85.0),  # U+2103 DEGREE CELSIUS
        ("-273.14", -273.14),  # just above absolute zero
        (1000, 1000.0),  # the stated ceiling itself
    ],
)
def test_as_temp_c_reads(x, celsius):
    assert as_temp_c(x, "temp_c") == celsius


@pytest.mark.parametrize(
    "x, error, fragment",
    [
        (True, ArgumentError, "temp_c=True"),
        (-273.15, ArgumentError, "absolute zero"),  # 0 K = -273.15 °C (SI Brochure, 9th ed., §2.3.1)
        (-300, ArgumentError, "absolute zero"),
        ("-300C", ArgumentError, "absolute zero"),
        (1000.5, ArgumentError, "at most 1000"),
        (math.nan, ArgumentError, "NaN"),
        (math.inf, ArgumentError, "at most 1000"),
        (-math.inf, ArgumentError, "absolute zero"),
        ("85K", ValueParseError, "temp_c: cannot read '85K'"),  # kelvin is not read as °C
        ("hot", ValueParseError, "cannot read 'hot'"),
        ("", ValueParseError, "cannot read ''"),
        ([85], ArgumentError, "not list"),
    ],
)
def test_as_temp_c_refuses(x, error, fragment):
    with pytest.raises(error, match=fragment):
        as_temp_c(x, "temp_c")


# ------------------------------------------------------------------ as_factor


@pytest.mark.parametrize(
    "x, f",
    [
        (None, None),
        (0.5, 0.5),
        (1, 1.0),
        ("0.8", 0.8),
        ("50%", 0.5),
        ("100 %", 1.0),
    ],
)
def test_as_factor_reads(x, f):
    assert as_factor(x, "power_factor") == f


@pytest.mark.parametrize(
    "x, error, fragment",
    [
        (True, ArgumentError, "power_factor=True"),
        (0, ArgumentError, "above 0"),
        (1.5, ArgumentError, "at most 1"),
        ("150%", ArgumentError, "at most 1"),
        (math.nan, ArgumentError, "power_factor=nan"),
        ("-0.5", ValueParseError, "cannot read '-0.5'"),
        ("half", ValueParseError, "cannot read 'half'"),
    ],
)
def test_as_factor_refuses(x, error, fragment):
    with pytest.raises(error, match=fragment):
        as_factor(x, "power_factor")
