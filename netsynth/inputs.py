"""Arguments of the Python API, read the way the command line reads its options.

Each function takes what a caller may reasonably pass for one parameter — a number in
SI units, or the same text the command line accepts — and returns the plain value the
library works with, or raises a typed error that names the parameter:

=====================  ==========================================  =======================
function               accepts                                     returns
=====================  ==========================================  =======================
:func:`as_ohms`        ``4700``, ``"4k7"``, ``"4.7 kΩ"``            ohms, > 0
:func:`as_fraction`    ``0.001``, ``"0.1%"``, ``"50ppm"``, None     fraction >= 0, or None
:func:`as_tolerance`   as above, plus IEC 60062 letters (``"F"``)   fraction, or None
:func:`as_bin`         a StockBin, a bin file path, None            StockBin
:func:`as_count`       an int, None                                int in range, or None
:func:`as_temp_c`      ``85``, ``"85C"``, ``"85 °C"``, None          °C, or None
:func:`as_factor`      ``0.5``, ``"50%"``, None                    fraction in (0, 1]
=====================  ==========================================  =======================

Errors:

* :class:`~netsynth.errors.ValueParseError` when text cannot be read (the message of
  :mod:`netsynth.values`, prefixed with the parameter name);
* :class:`~netsynth.errors.ArgumentError` when a value is of the wrong type (``True``
  is an int to Python but never a resistance here) or out of range (zero, negative,
  NaN, infinite).

A number is always in SI base units or a fraction (0.001 = 0.1 %), as everywhere in the
library; text follows :mod:`netsynth.values`, except that a bare number written as text
(``"0.001"``) is read as the same number would be, a fraction.
"""

from __future__ import annotations

import math
import numbers
import os
import re
from collections.abc import Callable
from typing import Literal, get_args

from netsynth import limits
from netsynth.errors import ArgumentError, ValueParseError
from netsynth.stock import StockBin, default_bin, load_bin
from netsynth.values import parse_ratio, parse_resistance, parse_tolerance

#: what ranks the recommended network first (``make(prefer=...)``, ``--prefer``)
Preference = Literal["error", "parts", "headroom"]
PREFERENCES: tuple[str, ...] = get_args(Preference)

__all__ = [
    "ABSOLUTE_ZERO_C",
    "MAX_TEMP_C",
    "as_bin",
    "as_count",
    "as_factor",
    "as_fraction",
    "as_ohms",
    "as_temp_c",
    "as_tolerance",
]

#: °C; absolute zero; every temperature must lie above it (:data:`netsynth.limits.ABSOLUTE_ZERO_C`)
ABSOLUTE_ZERO_C = limits.ABSOLUTE_ZERO_C
#: °C; the practical ceiling on a temperature argument (:data:`netsynth.limits.MAX_TEMP_C`, reason there)
MAX_TEMP_C = limits.MAX_TEMP_C

# a plain decimal number, optionally signed, with an optional exponent: "0.001", "1e-3"
_PLAIN_NUMBER = re.compile(r"[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?")
# a temperature in °C: "85", "-40", "85C", "85 °C", "85°C", "85 ℃" (U+2103 DEGREE CELSIUS)
_TEMP_C = re.compile(r"(?P<num>[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(?:°\s*[Cc]|\u2103|[Cc])?")
# a fraction of a rating: "0.5", "1", "50%", "50 %"
_FACTOR = re.compile(r"(?P<num>\d+\.?\d*|\.\d+)\s*(?P<pct>%)?")


def _is_number(x: object) -> bool:
    """A real number that is not a bool."""
    return isinstance(x, numbers.Real) and not isinstance(x, bool)


def _shown(x: object) -> str:
    """A short repr of an argument for a message (a huge int has no repr in Python 3.11+)."""
    try:
        return limits.excerpt(repr(x))
    except ValueError:
        return f"<a {x.bit_length()}-bit integer>" if isinstance(x, int) else f"<a {type(x).__name__}>"


def _float(x: object) -> float:
    """``float(x)`` of a real number, with ±inf where it overflows (a huge int or Fraction)."""
    try:
        return float(x)  # type: ignore[arg-type]
    except OverflowError:
        return math.inf if x > 0 else -math.inf  # type: ignore[operator]


def _wrong_type(name: str, x: object, expected: str) -> ArgumentError:
    return ArgumentError(f"{name}={_shown(x)}: expected {expected}, not {type(x).__name__}")


def _short_text(name: str, x: str) -> str:
    """`x` stripped; refused (one short line) when longer than any value's spelling."""
    s = x.strip()
    if len(s) > limits.MAX_VALUE_CHARS:
        raise ValueParseError(f"{name}: cannot read '{limits.excerpt(s)}': a value is written in at most "
                              f"{limits.MAX_VALUE_CHARS} characters; this text has {len(s)}")
    return s


def _read(name: str, text: str, parse: Callable[[str], float]) -> float:
    """Run a :mod:`netsynth.values` parser; its error gains the parameter name."""
    try:
        return parse(text)
    except ValueParseError as exc:
        raise ValueParseError(f"{name}: {exc}") from None


def as_ohms(x: float | str, name: str = "target") -> float:
    """A resistance in ohms from a number or any spelling :mod:`netsynth.values` reads.

    Parameters
    ----------
    x : float, int or str
        Ohms, or text such as ``"4k7"``, ``"4.7 kΩ"``, ``"R47"``, ``"1.5e3"``.
    name : str
        The parameter name used in error messages.

    Returns
    -------
    float
        Ohms, finite and above zero.

    Raises
    ------
    ValueParseError
        If the text cannot be read (or reads as zero, negative or overflowing).
    ArgumentError
        If `x` is a bool or another type, or a number outside 1 µΩ .. 1 TΩ
        (:data:`netsynth.limits.MIN_OHMS`, :data:`netsynth.limits.MAX_OHMS`).

    Examples
    --------
    >>> as_ohms("4k7"), as_ohms(3370), as_ohms("25m")
    (4700.0, 3370.0, 0.025)
    >>> as_ohms(0)
    Traceback (most recent call last):
    ...
    netsynth.errors.ArgumentError: target=0: must be a finite resistance above zero, in ohms
    """
    if isinstance(x, str):
        return _read(name, x, parse_resistance)
    if not _is_number(x):
        raise _wrong_type(name, x, "a resistance in ohms (a number, or text such as '4k7')")
    ohms = _float(x)
    if not (ohms > 0 and math.isfinite(ohms)):
        raise ArgumentError(f"{name}={_shown(x)}: must be a finite resistance above zero, in ohms")
    if not limits.MIN_OHMS <= ohms <= limits.MAX_OHMS:
        raise ArgumentError(f"{name}={_shown(x)}: must be a resistance from {limits.OHMS_RANGE}")
    return ohms


def _as_fraction(x: object, name: str, parse: Callable[[str], float], what: str, below_one: bool) -> float | None:
    if x is None:
        return None
    if isinstance(x, str):
        if _PLAIN_NUMBER.fullmatch(_short_text(name, x)):
            x = float(x)  # a bare number is a fraction in the Python API, as a float would be
        else:
            return _read(name, x, parse)
    if not _is_number(x):
        raise _wrong_type(name, x, f"{what} as a fraction (0.001 = 0.1 %) or text such as '0.1%' or '50ppm'")
    value = _float(x)
    if not (value >= 0 and math.isfinite(value)):
        raise ArgumentError(f"{name}={_shown(x)}: {what} is a finite fraction of 0 or more (0.001 = 0.1 %)")
    if below_one and value >= 1:
        raise ArgumentError(f"{name}={_shown(x)}: {what} is a fraction below 1 (100 %)")
    if 0 < value < limits.MIN_FRACTION:
        raise ArgumentError(f"{name}={_shown(x)}: {what} is 0, or from {limits.FRACTION_RANGE}")
    return value


def as_fraction(x: float | str | None, name: str) -> float | None:
    """A relative accuracy as a fraction, from a number or text such as ``"0.1%"``.

    Parameters
    ----------
    x : float, int, str or None
        A fraction (0.001 = 0.1 %), or text read by :func:`netsynth.values.parse_ratio`
        (``"0.1%"``, ``"50ppm"``, ``"1e-5%"``); a bare number as text (``"0.001"``) is
        a fraction like the number itself. None passes through.
    name : str
        The parameter name used in error messages.

    Returns
    -------
    float or None
        A finite fraction, 0 or more.

    Raises
    ------
    ValueParseError
        If the text cannot be read.
    ArgumentError
        If `x` is a bool or another type, negative, NaN or infinite.

    Examples
    --------
    >>> as_fraction("0.1%", "within"), as_fraction("1e-5%", "within"), as_fraction(0.001, "within")
    (0.001, 1e-07, 0.001)
    >>> as_fraction(None, "within") is None
    True
    >>> as_fraction(-0.1, "within")
    Traceback (most recent call last):
    ...
    netsynth.errors.ArgumentError: within=-0.1: an accuracy is a finite fraction of 0 or more (0.001 = 0.1 %)
    """
    return _as_fraction(x, name, parse_ratio, "an accuracy", below_one=False)


def as_tolerance(x: float | str | None, name: str) -> float | None:
    """A tolerance as a fraction, from a number, text such as ``"1%"`` or an IEC 60062 letter.

    Parameters
    ----------
    x : float, int, str or None
        A fraction (0.01 = 1 %), or text read by :func:`netsynth.values.parse_tolerance`
        (``"1%"``, ``"±0.5 %"``, ``"50ppm"``, ``"F"``); a bare number as text is a
        fraction. None passes through.
    name : str
        The parameter name used in error messages.

    Returns
    -------
    float or None
        A fraction, 0 or more and below 1 (a tolerance of 100 % or more is no part).

    Raises
    ------
    ValueParseError
        If the text cannot be read.
    ArgumentError
        If `x` is a bool or another type, negative, 1 or more, NaN or infinite.

    Examples
    --------
    >>> as_tolerance("F", "spec"), as_tolerance("0.5%", "spec"), as_tolerance(0.02, "spec")
    (0.01, 0.005, 0.02)
    """
    return _as_fraction(x, name, parse_tolerance, "a tolerance", below_one=True)


def as_bin(x: StockBin | str | os.PathLike | None) -> StockBin:
    """The stock bin to build from: a bin, the path of a bin file, or None for the default.

    Parameters
    ----------
    x : StockBin, str, os.PathLike or None
        A :class:`~netsynth.stock.StockBin` passes through; a path is loaded with
        :func:`~netsynth.stock.load_bin`; None gives :func:`~netsynth.stock.default_bin`.

    Returns
    -------
    StockBin

    Raises
    ------
    StockError
        If the file cannot be read or holds a bad row (file, line and field named).
    ArgumentError
        If `x` is an empty path or of another type.

    Examples
    --------
    >>> as_bin(None).name
    'default: E24 10 Ω..1 MΩ, 1 % ¼ W, unlimited'
    >>> as_bin(42)
    Traceback (most recent call last):
    ...
    netsynth.errors.ArgumentError: stock=42: expected a StockBin, the path of a bin file or None, not int
    """
    if x is None:
        return default_bin()
    if isinstance(x, StockBin):
        return x
    if isinstance(x, (str, os.PathLike)):
        if not os.fspath(x).strip():
            raise ArgumentError("stock='': the path of the bin file is empty; give a file, or None for the default bin")
        return load_bin(x)
    raise _wrong_type("stock", x, "a StockBin, the path of a bin file or None")


def as_count(x: int | None, name: str, low: int = 1, high: int | None = None) -> int | None:
    """A whole count (parts, runners-up) in ``low .. high``; None passes through.

    Parameters
    ----------
    x : int or None
        The count. A bool or a float (even ``4.0``) is refused.
    name : str
        The parameter name used in error messages.
    low, high : int
        The inclusive range; `high` None means no upper limit.

    Returns
    -------
    int or None

    Raises
    ------
    ArgumentError
        If `x` is not an int, or outside the range.

    Examples
    --------
    >>> as_count(4, "max_parts"), as_count(None, "max_parts")
    (4, None)
    >>> as_count(0, "max_parts")
    Traceback (most recent call last):
    ...
    netsynth.errors.ArgumentError: max_parts=0: must be a whole number of at least 1
    """
    if x is None:
        return None
    if isinstance(x, bool) or not isinstance(x, numbers.Integral):
        raise _wrong_type(name, x, "a whole number")
    n = int(x)
    if n < low or high is not None and n > high:
        span = f"of at least {low}" if high is None else f"from {low} to {high}"
        raise ArgumentError(f"{name}={_shown(x)}: must be a whole number {span}")
    return n


def as_temp_c(x: float | str | None, name: str) -> float | None:
    """A temperature in °C from a number or text such as ``"85"``, ``"85C"``, ``"85 °C"``.

    Parameters
    ----------
    x : float, int, str or None
        Degrees Celsius. None passes through.
    name : str
        The parameter name used in error messages.

    Returns
    -------
    float or None
        °C, above absolute zero (:data:`ABSOLUTE_ZERO_C`) and at most :data:`MAX_TEMP_C`.

    Raises
    ------
    ValueParseError
        If the text cannot be read.
    ArgumentError
        If `x` is a bool or another type, NaN, at or below absolute zero, or above the ceiling.

    Examples
    --------
    >>> as_temp_c("85 °C", "temp_c"), as_temp_c("-40", "temp_c"), as_temp_c(125, "temp_c")
    (85.0, -40.0, 125.0)
    >>> as_temp_c(-300, "temp_c")
    Traceback (most recent call last):
    ...
    netsynth.errors.ArgumentError: temp_c=-300: must be above absolute zero (-273.15 °C)
    """
    if x is None:
        return None
    if isinstance(x, str):
        m = _TEMP_C.fullmatch(_short_text(name, x))
        if not m:
            raise ValueParseError(f"{name}: cannot read '{limits.excerpt(x.strip())}': expected a temperature in °C "
                                  "such as 85, -40, 85C or 85 °C")
        value = float(m["num"])
    elif _is_number(x):
        value = _float(x)
    else:
        raise _wrong_type(name, x, "a temperature in °C (a number, or text such as '85C')")
    if math.isnan(value):
        raise ArgumentError(f"{name}={_shown(x)}: expected a temperature in °C, not NaN")
    if not value > ABSOLUTE_ZERO_C:
        raise ArgumentError(f"{name}={_shown(x)}: must be above absolute zero ({ABSOLUTE_ZERO_C:g} °C)")
    if value > MAX_TEMP_C:
        raise ArgumentError(f"{name}={_shown(x)}: must be at most {MAX_TEMP_C:g} °C, beyond any resistor's "
                            "rating (is it in kelvin?)")
    return value


def as_factor(x: float | str | None, name: str) -> float | None:
    """A derating factor: a fraction of a rating, above 0 and at most 1 (``0.5``, ``"50%"``).

    Parameters
    ----------
    x : float, int, str or None
        A fraction, or text: a plain number (``"0.5"``) or a percentage (``"50%"``).
        None passes through.
    name : str
        The parameter name used in error messages.

    Returns
    -------
    float or None

    Raises
    ------
    ValueParseError
        If the text cannot be read.
    ArgumentError
        If `x` is a bool or another type, or not above 0 and at most 1.

    Examples
    --------
    >>> as_factor("50%", "power_factor"), as_factor(0.8, "voltage_factor"), as_factor("1", "power_factor")
    (0.5, 0.8, 1.0)
    >>> as_factor(2, "power_factor")
    Traceback (most recent call last):
    ...
    netsynth.errors.ArgumentError: power_factor=2: a derating factor is a fraction above 0 and at most 1 (100 %)
    """
    if x is None:
        return None
    if isinstance(x, str):
        m = _FACTOR.fullmatch(_short_text(name, x))
        if not m:
            raise ValueParseError(f"{name}: cannot read '{limits.excerpt(x.strip())}': "
                                  "expected a fraction such as 0.5 or 50%")
        value = float(f"{m['num']}e{-2 if m['pct'] else 0}")  # one correctly rounded conversion
    elif _is_number(x):
        value = _float(x)
    else:
        raise _wrong_type(name, x, "a fraction such as 0.5, or text such as '50%'")
    if not 0 < value <= 1:
        raise ArgumentError(f"{name}={_shown(x)}: a derating factor is a fraction above 0 and at most 1 (100 %)")
    if value < limits.MIN_DERATE:
        raise ArgumentError(f"{name}={_shown(x)}: a derating factor is at least {limits.MIN_DERATE:g} (1 %); "
                            "a smaller margin asks for a different part")
    return value
