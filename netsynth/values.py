"""Read and write resistances, tolerances, power and voltage as people write them.

Resistance spellings read by :func:`parse_resistance` (all give ohms as a float):

=============================  =================  =======================================
Spelling                       Value              Rule
=============================  =================  =======================================
``4700``, ``0.025``            4700, 0.025        plain number
``1.5e3``                      1500               exponent (no prefix letter after it)
``4.7k``, ``4.7K``             4700               number + multiplier letter as a suffix
``4.7 kΩ``, ``4.7kohm``        4700               a suffix letter may carry a unit word
``4.7 kohms``, ``4.7K ohm``    4700               (Ω, ohm, ohms in any case)
``470 Ω``, ``470ohm``          470                number + unit word
``47R``, ``470R``              47, 470            R used as a suffix (R means ×1)
``4k7``, ``4K7``, ``3k37``     4700, 3370         IEC 60062 RKM: the letter is the point
``R47``, ``0R22``, ``R010``    0.47, 0.22, 0.01   RKM below 1 Ω
``4R7``, ``1M0``, ``2M2``      4.7, 1e6, 2.2e6    RKM
``10m``, ``25mΩ``              0.01, 0.025        lowercase ``m`` is milli
``1M``                         1e6                uppercase ``M`` is mega
``1meg``, ``1MEG``             1e6                SPICE spelling of mega (suffix only)
``1G``                         1e9                giga
=============================  =================  =======================================

Multiplier letters: ``R``/``r`` ×1, ``m`` ×10⁻³, ``k``/``K`` ×10³, ``M`` ×10⁶,
``G`` ×10⁹ (IEC 60062 RKM code, plus the SI ``m``). At most one letter; a unit word may
follow a letter only when the letter is a suffix (``4.7 kΩ`` yes, ``4k7 Ω`` no).
Leading and trailing whitespace is ignored.

The number is built from its decimal text and converted once by ``float()``, which
rounds correctly, so ``parse_resistance('4k7') == 4700.0`` and
``parse_resistance('R47') == 0.47`` hold exactly. :func:`to_code` writes the shortest
digits that read back to the same float.

Decimal comma: rejected on purpose. ``4,7k`` could be a European decimal or a typo
for two CSV fields, and stock bins are CSV files, so guessing would silently turn
one field into two (or the reverse). The message offers ``4.7k`` and ``4k7``.

Other quantities:

* tolerance (:func:`parse_tolerance`): ``1%``, ``0.1 %``, ``±5%``, ``50ppm``, ``1e-3%`` or an
  IEC 60062 letter alone (B C D F G J K M); a bare number is rejected because
  ``0.01`` could mean 1 % or 0.01 %. Returned as a fraction.
* accuracy ratio (:func:`parse_ratio`): as tolerance, without the letters.
* power (:func:`parse_power`): ``0.25``, ``0.25W``, ``1/4W``, ``1/4``, ``250mW``, ``3 W``.
* voltage (:func:`parse_voltage`): ``200``, ``200V``, ``1kV``, ``1.5 kV``.
* TCR (:func:`parse_tcr`): ``100``, ``100ppm``, ``±50 ppm/K``, ``25ppm/°C``; ppm/K,
  magnitude only (a sign is read and dropped).
* range (:func:`parse_range`): ``10..1M``, ``1R..10M``.

Limits (:mod:`netsynth.limits`): every reader refuses text of more than 64 characters before
any pattern sees it, and values outside the accepted ranges (resistance 1 µΩ .. 1 TΩ, voltage
1 µV .. 1 MV, current 1 pA .. 10 kA, power 1 pW .. 1 MW, duty from 1 ppm, non-zero fractions
from 1e-12, TCR up to 1e4 ppm/K), with one :class:`~netsynth.errors.ValueParseError` line that
quotes at most 40 characters of the text.

Writers: :func:`format_ohms` (``4.7 kΩ``), :func:`to_code` (``4k7``),
:func:`format_quantity` (``1.5 pA``) and :func:`format_error` (``+0.12 %``, ``-3.2 ppm``);
all stay short at any magnitude (an engineering exponent beyond the prefixes: ``500e-09 Ω``).
"""

from __future__ import annotations

import math
import re
from decimal import ROUND_HALF_UP, Decimal
from fractions import Fraction

from netsynth import limits
from netsynth.errors import ValueParseError

__all__ = [
    "format_error",
    "format_ohms",
    "format_quantity",
    "parse_power",
    "parse_range",
    "parse_ratio",
    "parse_resistance",
    "parse_tcr",
    "parse_tolerance",
    "parse_voltage",
    "to_code",
]

_NUM = r"(?P<num>\d+\.?\d*|\.\d+)"
_OHM = "(?:\u03a9|\u2126|(?i:ohms?))"  # U+03A9 Greek capital omega, U+2126 ohm sign, words
_LETTER_EXP = {"R": 0, "r": 0, "m": -3, "k": 3, "K": 3, "M": 6, "G": 9}
_SUFFIX_RE = re.compile(
    rf"(?P<sign>[+-]?){_NUM}(?P<exp>[eE][+-]?\d+)?"
    rf"\s*(?P<letter>(?i:meg)|[RrmkKMG])?\s*(?P<unit>{_OHM})?"
)
_INFIX_RE = re.compile(r"(?P<sign>[+-]?)(?P<int>\d*)(?P<letter>[RrmkKMG])(?P<frac>\d+)")
_EXPECT_OHMS = "expected a resistance such as 4k7, 4.7k, 470R, R47 or 1M"
_EXAMPLES = {"a resistance": "4k7", "a tolerance": "1%", "an accuracy": "0.1%", "a power rating": "0.25W",
             "a voltage": "200V", "a current": "2A", "a duty cycle": "10%", "a temperature coefficient": "100ppm",
             "a range": "10..1M"}


def _fail(text: str, reason: str) -> ValueParseError:
    return ValueParseError(f"cannot read '{limits.excerpt(text)}': {reason}")


def _text(text: object, what: str) -> str:
    """`text` stripped, refused when it is not a string or longer than any value's spelling.

    The length check comes before any regular expression sees the text, so a hostile
    megabyte of digits costs nothing (and never reaches a pattern that could backtrack).
    """
    if not isinstance(text, str):
        raise ValueParseError(f"cannot read {what} from {type(text).__name__}: "
                              f"expected text such as {_EXAMPLES.get(what, '4k7')}")
    s = text.strip()
    if len(s) > limits.MAX_VALUE_CHARS:
        raise _fail(s, f"{what} is written in at most {limits.MAX_VALUE_CHARS} characters; "
                       f"this text has {len(s)}")
    return s


_OHMS_SPAN = (limits.MIN_OHMS, limits.MAX_OHMS, limits.OHMS_RANGE)


def _checked(text: str, value: float, sign: str, what: str, *, zero_ok: bool = False,
             span: tuple[float, float, str] | None = None) -> float:
    """Reject negative, zero (unless allowed) and overflowing values, and values outside `span`.

    `span` is ``(low, high, text)`` from :mod:`netsynth.limits`; a value that overflowed to
    infinity or underflowed to zero from non-zero digits is outside it too.
    """
    if sign == "-" and value != 0 or value == 0 and not zero_ok:
        if span is None or sign == "-" or not re.search(r"[1-9]", text.partition("e")[0].partition("E")[0]):
            raise _fail(text, f"{what} must be {'zero or more' if zero_ok else 'greater than zero'}")
    if span is not None:
        low, high, words = span
        if not (low <= value <= high) and not (zero_ok and value == 0 and sign != "-"):
            raise _fail(text, f"{what} must be from {words}")
    elif not math.isfinite(value):
        raise _fail(text, "the number is too large; use a value below 1e308")
    return value


def parse_resistance(text: str) -> float:
    """Read a resistance written by a person.

    Parameters
    ----------
    text : str
        Any spelling listed in the module docstring, e.g. ``4k7``, ``4.7 kΩ``, ``R47``.

    Returns
    -------
    float
        Resistance in ohms, greater than zero.

    Raises
    ------
    ValueParseError
        On empty text, garbage, a decimal comma, zero, a negative value, or a value outside
        :data:`netsynth.limits.MIN_OHMS` .. :data:`netsynth.limits.MAX_OHMS` (1 µΩ .. 1 TΩ);
        also on text longer than :data:`netsynth.limits.MAX_VALUE_CHARS`.

    References
    ----------
    IEC 60062:2016, marking codes for resistors and capacitors (RKM code).

    Examples
    --------
    >>> parse_resistance('4k7'), parse_resistance('R47'), parse_resistance('10m')
    (4700.0, 0.47, 0.01)
    >>> parse_resistance('4,7k')
    Traceback (most recent call last):
    ...
    netsynth.errors.ValueParseError: cannot read '4,7k': use a point for decimals (4.7k) or the RKM code (4k7); a comma is the CSV field separator
    """
    s = _text(text, "a resistance")
    if not s:
        raise ValueParseError(f"cannot read an empty value: {_EXPECT_OHMS}")
    if "," in s:
        raise _comma_error(s)
    m = _SUFFIX_RE.fullmatch(s)
    if m and not (m["exp"] and m["letter"]):
        exp = _LETTER_EXP.get(m["letter"] or "R", 6)  # 6: the only word prefix is "meg"
        number = m["num"] + (m["exp"] or f"e{exp}")
    elif m := _INFIX_RE.fullmatch(s):
        number = f"{m['int'] or 0}.{m['frac']}e{_LETTER_EXP[m['letter']]}"
    else:
        raise _fail(s, _EXPECT_OHMS)
    return _checked(s, float(number), m["sign"], "a resistance", span=_OHMS_SPAN)


def _comma_error(s: str) -> ValueParseError:
    why = "a comma is the CSV field separator"
    if s.count(",") == 1:
        point = s.replace(",", ".")
        try:
            code = to_code(parse_resistance(point))
        except ValueParseError:
            pass
        else:
            return _fail(s, f"use a point for decimals ({point}) or the RKM code ({code}); {why}")
    return _fail(s, f"use a point for decimals and no thousands separators; {why}")


def to_code(ohms: float) -> str:
    """Write a resistance as a compact RKM-style code that reads back exactly.

    The digits are Python's shortest round-trip digits (``repr``), placed around a
    multiplier letter: none or ``R`` from 1 Ω to 1 kΩ, ``k``, ``M``, ``G`` above.
    Below 1 Ω the code is ``0R`` and the decimals (``0R47``, ``0R1``, ``0R022``):
    IEC 60062 permits the leading zero, and a code that never starts with a letter
    cannot be mistaken for a reference designator such as ``R1``. No unit is appended.

    Parameters
    ----------
    ohms : float
        Resistance in ohms, positive and finite.

    Returns
    -------
    str
        A code such that ``parse_resistance(to_code(x)) == x``.

    Raises
    ------
    ValueParseError
        If `ohms` is not a positive finite number.

    Examples
    --------
    >>> [to_code(x) for x in (4700, 470, 0.47, 0.1, 0.022, 1.5, 2.2e6, 100000)]
    ['4k7', '470', '0R47', '0R1', '0R022', '1R5', '2M2', '100k']
    """
    x = float(ohms)
    if not (x > 0 and math.isfinite(x)):
        raise ValueParseError(f"cannot write {ohms!r} as a resistance code: it must be positive and finite")
    d = Decimal(repr(x))
    shift = next((e for e, low in ((9, "1e9"), (6, "1e6"), (3, "1e3")) if d >= Decimal(low)), 0)
    whole, _, frac = format(d.scaleb(-shift).normalize(), "f").partition(".")
    if shift == 0 and not frac:
        return whole
    return whole + {9: "G", 6: "M", 3: "k", 0: "R"}[shift] + frac


def _round_sig(d: Decimal, digits: int) -> Decimal:
    """Round to `digits` significant digits, half away from zero (as people round)."""
    if digits < 1:
        raise ValueParseError(f"digits={digits}: need at least one significant digit")
    return d.quantize(Decimal(1).scaleb(d.adjusted() - digits + 1), rounding=ROUND_HALF_UP)


def format_ohms(ohms: float, digits: int = 4) -> str:
    """Write a resistance for people: engineering prefix, unit, no trailing zeros.

    Parameters
    ----------
    ohms : float
        Resistance in ohms.
    digits : int
        Significant digits kept (rounded half up on the shortest decimal form).

    Returns
    -------
    str
        For example ``4.7 kΩ``; prefixes m, k, M, G (SI Brochure prefixes).

    Examples
    --------
    >>> format_ohms(3370), format_ohms(0.025), format_ohms(1023.5)
    ('3.37 kΩ', '25 mΩ', '1.024 kΩ')
    """
    if not math.isfinite(ohms) or ohms == 0:
        return f"{ohms:g} Ω"
    r = _round_sig(Decimal(repr(float(ohms))), digits)
    if not -6 <= r.adjusted() <= 14:  # more than three zeros beyond the prefixes: engineering exponent
        return f"{_engineering(r)} Ω"
    e3 = min(max(r.adjusted() // 3 * 3, -3), 9)
    prefix = {-3: "m", 0: "", 3: "k", 6: "M", 9: "G"}[e3]
    return f"{format(r.scaleb(-e3).normalize(), 'f')} {prefix}Ω"


def _engineering(d: Decimal) -> str:
    """``d`` as mantissa and an exponent that is a multiple of 3: ``1.5e-09``, ``-22e+15``."""
    e3 = d.adjusted() // 3 * 3
    return f"{format(d.scaleb(-e3).normalize(), 'f')}e{e3:+03d}"


def format_quantity(x: float, unit: str, digits: int = 4) -> str:
    """Write a quantity for people: SI prefix from p to T, ``digits`` significant digits.

    Outside the prefixes (or not finite) an engineering exponent is used, so the text stays
    short whatever the magnitude.

    Examples
    --------
    >>> format_quantity(24.0, "V"), format_quantity(1.5e-12, "A"), format_quantity(0.0002512, "W", 3)
    ('24 V', '1.5 pA', '251 µW')
    >>> format_quantity(3e20, "W")
    '300e+18 W'
    """
    if not math.isfinite(x) or x == 0:
        return f"{x:g} {unit}"
    r = _round_sig(Decimal(repr(float(x))), digits)
    e3 = r.adjusted() // 3 * 3
    prefix = {-12: "p", -9: "n", -6: "\u00b5", -3: "m", 0: "", 3: "k", 6: "M", 9: "G", 12: "T"}.get(e3)
    if prefix is None:
        return f"{_engineering(r)} {unit}"
    return f"{format(r.scaleb(-e3).normalize(), 'f')} {prefix}{unit}"


def format_error(rel: float, digits: int = 3) -> str:
    """Write a signed relative error: ``%`` from 1e-3 (0.1 %) up, ``ppm`` below.

    Parameters
    ----------
    rel : float
        Relative error as a fraction, e.g. ``(achieved - target) / target``.
    digits : int
        Significant digits kept.

    Examples
    --------
    >>> format_error(0.0012), format_error(-3.2e-6), format_error(0.0)
    ('+0.12 %', '-3.2 ppm', '0')
    """
    if rel == 0:
        return "0"
    if not math.isfinite(rel):
        return str(rel)
    d = Decimal(repr(float(rel)))
    value, unit = (d.scaleb(2), "%") if abs(d) >= Decimal("1e-3") else (d.scaleb(6), "ppm")
    rounded = _round_sig(value, digits)
    # beyond a million % (or below 1e-6 ppm) an exponent keeps the text short
    text = _engineering(rounded) if not -6 <= rounded.adjusted() <= 6 else format(rounded.normalize(), "f")
    return f"{'+' if rel > 0 else ''}{text} {unit}"


# --- fractions: tolerance and accuracy ------------------------------------------------

# IEC 60062:2016 tolerance letters; only those confirmed in a source are accepted
# (EN 60062:2005 colour table; Yageo, KOA datasheets). W P L E N are unconfirmed.
_TOLERANCE_LETTERS = {
    "B": 0.001, "C": 0.0025, "D": 0.005, "F": 0.01,
    "G": 0.02, "J": 0.05, "K": 0.1, "M": 0.2,
}
_SIGN = r"(?P<sign>±|\+/-|\+-|[+-])?\s*"
_FRACTION_RE = re.compile(rf"{_SIGN}{_NUM}(?P<exp>[eE][+-]?\d+)?\s*(?P<unit>%|(?i:ppm))?")


def _parse_fraction(text: str, what: str, *, letters: bool) -> float:
    s = _text(text, what)
    if letters and s.upper() in _TOLERANCE_LETTERS:
        return _TOLERANCE_LETTERS[s.upper()]
    example = "1%, 0.1 %, 50ppm" + (" or a letter such as F" if letters else "")
    m = _FRACTION_RE.fullmatch(s)
    if not m:
        raise _fail(s, f"expected {what} such as {example}")
    if not m["unit"]:
        raise _fail(s, f"add % or ppm ({s}% or {s}ppm); a bare number could be a fraction or a percentage")
    # one float() of the decimal text with the exponents added: correctly rounded, so
    # '0.1%' == 0.001 and '1e-5%' == 1e-7 exactly as written
    exponent = int(m["exp"][1:] if m["exp"] else 0) + (-2 if m["unit"] == "%" else -6)
    value = float(f"{m['num']}e{exponent}")
    _checked(s, value, m["sign"], what, zero_ok=True)
    if value >= 1:
        raise _fail(s, f"{what} must be below 100 %")
    if 0 < value < limits.MIN_FRACTION or value == 0 and re.search(r"[1-9]", m["num"]):
        raise _fail(s, f"{what} is 0, or from {limits.FRACTION_RANGE}")
    return value


def parse_tolerance(text: str) -> float:
    """Read a part tolerance as a fraction (``1%`` -> 0.01).

    Parameters
    ----------
    text : str
        ``1%``, ``0.1 %``, ``±5%``, ``50ppm``, or one IEC 60062 letter:
        B 0.1 %, C 0.25 %, D 0.5 %, F 1 %, G 2 %, J 5 %, K 10 %, M 20 %.

    Returns
    -------
    float
        Tolerance as a fraction, 0 <= t < 1.

    Raises
    ------
    ValueParseError
        On a bare number (unit required), garbage, a negative value or 100 % and up.

    Examples
    --------
    >>> parse_tolerance('±5%'), parse_tolerance('F'), parse_tolerance('50ppm'), parse_tolerance('1e-2%')
    (0.05, 0.01, 5e-05, 0.0001)
    """
    return _parse_fraction(text, "a tolerance", letters=True)


def parse_ratio(text: str) -> float:
    """Read a relative accuracy as a fraction (``0.1%`` -> 0.001, ``50ppm`` -> 5e-5).

    Same rules as :func:`parse_tolerance` but without the letter codes; 0 is allowed
    and means an exact match. The number may carry an exponent, as resistances do.

    Examples
    --------
    >>> parse_ratio('0.1%'), parse_ratio('50ppm'), parse_ratio('1e-5%')
    (0.001, 5e-05, 1e-07)
    """
    return _parse_fraction(text, "an accuracy", letters=False)


# --- power, voltage, TCR, range ------------------------------------------------------

_QUANTITY = (
    rf"(?P<sign>[+-]?){_NUM}(?:\s*/\s*(?P<den>\d+))?(?P<exp>[eE][+-]?\d+)?"
    r"\s*(?P<prefix>[mkK])?\s*(?P<unit>{unit})?"
)
_POWER_RE = re.compile(_QUANTITY.format(unit="[Ww]"))
_VOLTAGE_RE = re.compile(_QUANTITY.format(unit="[Vv]"))
_CURRENT_RE = re.compile(_QUANTITY.format(unit="[A]"))


def _parse_quantity(text: str, pattern: re.Pattern[str], what: str, examples: str,
                    span: tuple[float, float, str]) -> float:
    s = _text(text, what)
    m = pattern.fullmatch(s)
    if not m or m["den"] == "0" or m["den"] and m["exp"]:
        raise _fail(s, f"expected {what} such as {examples}")
    exp = {"m": -3, "k": 3, "K": 3}.get(m["prefix"], 0) + int(m["exp"][1:] if m["exp"] else 0)
    if abs(exp) > 400:  # far outside every range; Fraction would build a 10**exp of that many digits
        value = 0.0 if exp < 0 else math.inf
    else:
        try:
            value = float(Fraction(m["num"]) / int(m["den"] or 1) * Fraction(10) ** exp)
        except OverflowError:  # beyond float range (1e309): outside every range
            value = math.inf
    return _checked(s, value, m["sign"], what, span=span)


def parse_power(text: str) -> float:
    """Read a power rating in watts: ``0.25``, ``0.25W``, ``1/4W``, ``1/4``, ``250mW``, ``3 W``.

    Returns
    -------
    float
        Watts, greater than zero.

    Raises
    ------
    ValueParseError
        On garbage, zero or a negative value.

    Examples
    --------
    >>> parse_power('1/4W'), parse_power('250mW')
    (0.25, 0.25)
    """
    return _parse_quantity(text, _POWER_RE, "a power rating", "0.25W, 1/4W or 250mW",
                           (limits.MIN_WATTS, limits.MAX_WATTS, limits.WATTS_RANGE))


def parse_voltage(text: str) -> float:
    """Read a voltage in volts: ``200``, ``200V``, ``1kV``, ``1.5 kV``, ``500 V``.

    Returns
    -------
    float
        Volts, greater than zero.

    Examples
    --------
    >>> parse_voltage('1.5 kV')
    1500.0
    """
    return _parse_quantity(text, _VOLTAGE_RE, "a voltage", "200V, 500 V or 1kV",
                           (limits.MIN_VOLTS, limits.MAX_VOLTS, limits.VOLTS_RANGE))


def parse_current(text: str) -> float:
    """Read a current in amperes: ``2``, ``2A``, ``150mA``, ``1.5 A``.

    Examples
    --------
    >>> parse_current('150mA'), parse_current('2 A')
    (0.15, 2.0)
    """
    return _parse_quantity(text, _CURRENT_RE, "a current", "2A, 1.5 A or 150mA",
                           (limits.MIN_AMPS, limits.MAX_AMPS, limits.AMPS_RANGE))


def parse_duty(text: str) -> float:
    """Read a duty cycle as a fraction: ``10%``, ``100 %``, ``0.25``; above 0 and at most 1.

    Examples
    --------
    >>> parse_duty('10%'), parse_duty('0.25'), parse_duty('100%')
    (0.1, 0.25, 1.0)
    """
    s = _text(text, "a duty cycle")
    m = re.fullmatch(rf"{_NUM}\s*(?P<pct>%)?", s)
    if not m:
        raise _fail(s, "expected a duty cycle such as 10% or 0.1")
    value = float(Fraction(m["num"]) / (100 if m["pct"] else 1))
    if not 0 < value <= 1:
        raise _fail(s, "a duty cycle is above 0 and at most 100 %")
    if value < limits.MIN_DUTY:
        raise _fail(s, f"a duty cycle must be from {limits.DUTY_RANGE}; a single short pulse is "
                       "the part maker's pulse-load curve, not modelled here")
    return value


_TCR_RE = re.compile(rf"{_SIGN}{_NUM}\s*(?P<unit>(?i:ppm)(?:\s*/\s*(?:K|°C|℃|C))?)?")


def parse_tcr(text: str) -> float:
    """Read a temperature coefficient in ppm/K: ``100``, ``±50 ppm/K``, ``25ppm/°C``.

    A bare number is taken as ppm/K (TCR is always quoted in ppm). Only the
    magnitude is kept: the worst-case analysis treats a TCR as a ± band, so a
    written sign (``-500`` for carbon film) is read and dropped.

    Returns
    -------
    float
        |TCR| in ppm/K, zero or more.

    Examples
    --------
    >>> parse_tcr('±50 ppm/K'), parse_tcr('-25ppm/°C')
    (50.0, 25.0)
    """
    s = _text(text, "a temperature coefficient")
    m = _TCR_RE.fullmatch(s)
    if not m:
        raise _fail(s, "expected a temperature coefficient such as 100, 50ppm or ±25 ppm/K")
    tcr = _checked(s, float(m["num"]), "", "a temperature coefficient", zero_ok=True,
                   span=(0.0, limits.MAX_TCR_PPM, limits.TCR_RANGE))
    if 0 < tcr < limits.MIN_TCR_PPM:
        raise _fail(s, f"a temperature coefficient is {limits.TCR_RANGE}")
    return tcr


def parse_range(text: str) -> tuple[float, float]:
    """Read a resistance range ``LOW..HIGH`` such as ``10..1M`` or ``1R..10M``.

    Returns
    -------
    tuple of float
        ``(low_ohms, high_ohms)`` with ``low <= high``.

    Examples
    --------
    >>> parse_range('10..1M')
    (10.0, 1000000.0)
    """
    if isinstance(text, str) and len(text.strip()) > 2 * limits.MAX_VALUE_CHARS + 2:
        raise _fail(text.strip(), f"a range is written in at most {2 * limits.MAX_VALUE_CHARS + 2} characters")
    s = _text(text, "a range") if not isinstance(text, str) else text.strip()
    low_text, dots, high_text = s.partition("..")
    if not dots:
        raise _fail(s, "expected a range LOW..HIGH such as 10..1M")
    low, high = parse_resistance(low_text), parse_resistance(high_text)
    if low > high:
        raise _fail(s, f"the low end is above the high end; write {high_text.strip()}..{low_text.strip()}")
    return low, high
