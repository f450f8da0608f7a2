"""How a part of one value and tolerance is marked: RKM code, colour bands, chip codes.

Map of the module
-----------------
:func:`rkm_code`
    The IEC 60062 letter-and-digit code printed on parts and drawings: ``4K7``, ``R47``,
    ``1M0``, ``100R``.
:func:`color_bands` / :func:`color_bands_problem`
    The IEC 60062 colour code, 4 bands (two digits) or 5 bands (three digits), first band
    first; the second function says why there is none.
:func:`smd_code`
    The digit code of chip resistors: 3 characters (``472``, ``4R7``) or 4 (``4701``, ``4R70``).
:func:`eia96_code`
    The EIA-96 code of E96 values: two-digit index and a multiplier letter (``01C`` = 10 kΩ).
``Marking`` / :func:`marking_of`
    All of the above for one stock line, with the reason for every code that does not exist.

Every function reads the value through its shortest decimal form (``repr``), so ``4700.0`` has the
digits ``47`` and ``4750.0`` the digits ``475``; a value is coded only when the code gives it back
*exactly* (no rounding to the nearest marking: a part marked with another value is another part).

Marking versus display
----------------------
:func:`netsynth.values.to_code` writes netsynth's display code (lowercase ``k``, ``0R47``). This
module writes what is printed on the part, as IEC 60062 writes it: uppercase ``K`` for kilo, and
below 1 Ω the ``R`` first with no leading zero (``R47``, ``R10``, ``R010``), as in the standard's
examples and as the 3-character chip code must (``R47`` is three characters; ``0R47`` would be four).
Both spellings read back with :func:`netsynth.values.parse_resistance`.

References
----------
IEC 60062:2016, Marking codes for resistors and capacitors (RKM code, colour code, 3- and
4-character codes). The colour table here stops at silver (×0.01); reproductions of the 2016
edition also list pink (×0.001) and tolerance colours orange and yellow, and disagree on grey
(from memory; not written here). The EIA-96 code indexes the 96 E96 mantissas of IEC 60063 in
order (01 = 100, 47 = 301, 96 = 976), taken from :mod:`netsynth.eseries`.
"""

from __future__ import annotations

import math
import numbers
from dataclasses import dataclass
from decimal import Decimal

from netsynth.errors import ArgumentError
from netsynth.eseries import mantissas
from netsynth.values import format_ohms

__all__ = [
    "BAND_COLORS",
    "EIA96_LETTERS",
    "MULTIPLIER_COLORS",
    "TOLERANCE_COLORS",
    "Marking",
    "color_bands",
    "color_bands_problem",
    "eia96_code",
    "marking_of",
    "rkm_code",
    "smd_code",
]

#: IEC 60062 colour of each digit 0..9 (index = digit)
BAND_COLORS: tuple[str, ...] = (
    "black", "brown", "red", "orange", "yellow", "green", "blue", "violet", "grey", "white",
)
#: IEC 60062 multiplier colours: power of ten -> colour (gold ×0.1, silver ×0.01)
MULTIPLIER_COLORS: dict[int, str] = {-2: "silver", -1: "gold", **{k: BAND_COLORS[k] for k in range(10)}}
#: IEC 60062 tolerance colours (fraction -> colour); ±20 % has no band (a 3-band part), so no entry
TOLERANCE_COLORS: dict[float, str] = {
    0.01: "brown", 0.02: "red", 0.005: "green", 0.0025: "blue", 0.001: "violet",
    0.0005: "grey", 0.05: "gold", 0.1: "silver",
}
#: EIA-96 multiplier letters this module writes: power of ten -> letter. Decoders also meet
#: R (= Y, ×0.01) and S (= X, ×0.1); netsynth writes the first spelling only.
EIA96_LETTERS: dict[int, str] = {-3: "Z", -2: "Y", -1: "X", 0: "A", 1: "B", 2: "C", 3: "D", 4: "E", 5: "F"}

_RKM_LETTERS = ((9, "G"), (6, "M"), (3, "K"))
_E96 = mantissas("E96")
_TOL_REL = 1e-9  # a tolerance this close to a table entry is that entry (float noise)


def _checked_ohms(ohms: object) -> float:
    if isinstance(ohms, bool) or not isinstance(ohms, numbers.Real) or not (math.isfinite(ohms) and ohms > 0):
        raise ArgumentError(f"ohms={ohms!r}: a marking needs a resistance that is finite and above zero")
    return float(ohms)


def _digits(ohms: float) -> tuple[str, int]:
    """The significant digits of the shortest decimal form and the power of ten of the first one.

    ``4700.0`` -> ``("47", 3)``; ``0.047`` -> ``("47", -2)``; value = 0.d1d2... × 10^(power + 1).
    """
    d = Decimal(repr(ohms)).normalize()
    digits = "".join(map(str, d.as_tuple().digits))
    return digits, d.adjusted()


def _fixed(ohms: float, width: int) -> tuple[str, int] | None:
    """``width`` significant digits (zero-padded) and the power of ten that multiplies them, or None."""
    digits, top = _digits(ohms)
    if len(digits) > width:
        return None
    return digits.ljust(width, "0"), top - (width - 1)


# --------------------------------------------------------------------------- RKM


def rkm_code(ohms: float) -> str:
    """The IEC 60062 RKM marking: the multiplier letter stands where the decimal point goes.

    Letters: ``R`` (×1, below 1 kΩ), ``K`` (kilo), ``M`` (mega), ``G`` (giga, also for anything
    larger). The code carries every significant digit of the value and at least two: a single
    digit gets a trailing zero (``1K0``, ``1M0``, ``1R0``, ``R10``). Whole ohms from 10 Ω to 999 Ω
    end in ``R`` (``47R``, ``100R``); below 1 Ω the code starts with ``R`` (``R47``, ``R010``), as
    IEC 60062 prints it (netsynth's display code :func:`~netsynth.values.to_code` writes ``0R47``).

    Raises
    ------
    ArgumentError
        If `ohms` is not a finite number above zero.

    Examples
    --------
    >>> [rkm_code(x) for x in (4700, 0.47, 1e6, 100, 2200, 10000, 4.7, 0.01, 47300)]
    ['4K7', 'R47', '1M0', '100R', '2K2', '10K', '4R7', 'R010', '47K3']
    """
    x = _checked_ohms(ohms)
    digits, top = _digits(x)
    if len(digits) < 2:
        digits += "0"
    shift, letter = next(((s, c) for s, c in _RKM_LETTERS if top >= s), (0, "R"))
    point = top - shift + 1  # digits before the letter
    if point <= 0:  # below 1 Ω: R, then zeros, then the digits
        return "R" + "0" * -point + digits
    whole, frac = digits[:point].ljust(point, "0"), digits[point:]
    return whole + letter + frac


# --------------------------------------------------------------------------- colour bands


def _band_parts(ohms: float, tolerance: float, bands: int) -> tuple[tuple[str, ...] | None, str | None]:
    if bands not in (4, 5):
        raise ArgumentError(f"bands={bands!r}: the colour code here has 4 bands (two digits) or 5 (three digits)")
    x = _checked_ohms(ohms)
    if isinstance(tolerance, bool) or not isinstance(tolerance, numbers.Real) or not 0 <= tolerance < 1:
        raise ArgumentError(f"tolerance={tolerance!r}: expected a fraction from 0 up to 1, such as 0.01 for 1 %")
    width = bands - 2
    tol_color = next((c for t, c in TOLERANCE_COLORS.items() if math.isclose(tolerance, t, rel_tol=_TOL_REL)), None)
    if tol_color is None:
        return None, (f"a tolerance of {tolerance * 100:g} % has no colour band "
                      "(IEC 60062 colours: 0.05, 0.1, 0.25, 0.5, 1, 2, 5 and 10 %)")
    fixed = _fixed(x, width)
    if fixed is None:
        return None, (f"{format_ohms(x, 12)} has {len(_digits(x)[0])} significant digits; "
                      f"{bands} bands hold {width}")
    digits, power = fixed
    if power not in MULTIPLIER_COLORS:
        return None, (f"{format_ohms(x, 12)} with {bands} bands needs a multiplier of 10^{power}; "
                      "the colours run from silver (×0.01) to white (×10^9)")
    return (*(BAND_COLORS[int(c)] for c in digits), MULTIPLIER_COLORS[power], tol_color), None


def color_bands(ohms: float, tolerance: float, bands: int = 4) -> tuple[str, ...] | None:
    """IEC 60062 colour bands, first band first: digits, multiplier, tolerance.

    ``bands=4`` gives two digit bands, ``bands=5`` three. ``None`` when the value has more
    significant digits than the bands hold, needs a multiplier outside silver (×0.01) .. white
    (×10^9), or the tolerance has no colour (±20 % is marked by leaving the band off, which this
    function does not write); :func:`color_bands_problem` gives the reason. Which band count a
    part uses is the maker's choice (two digits for 5 % and wider is the usual pairing).

    Raises
    ------
    ArgumentError
        On a band count other than 4 or 5, a value that is not finite and above zero, or a
        tolerance outside 0 ≤ t < 1.

    Examples
    --------
    >>> color_bands(4700, 0.05)
    ('yellow', 'violet', 'red', 'gold')
    >>> color_bands(4750, 0.01, bands=5)
    ('yellow', 'violet', 'green', 'brown', 'brown')
    >>> color_bands(4750, 0.01) is None
    True
    """
    return _band_parts(ohms, tolerance, bands)[0]


def color_bands_problem(ohms: float, tolerance: float, bands: int = 4) -> str | None:
    """Why :func:`color_bands` gives ``None`` for these arguments; ``None`` when it gives bands.

    Examples
    --------
    >>> color_bands_problem(4750, 0.01)
    '4.75 kΩ has 3 significant digits; 4 bands hold 2'
    >>> color_bands_problem(4700, 0.2)
    'a tolerance of 20 % has no colour band (IEC 60062 colours: 0.05, 0.1, 0.25, 0.5, 1, 2, 5 and 10 %)'
    """
    return _band_parts(ohms, tolerance, bands)[1]


# --------------------------------------------------------------------------- chip codes


def smd_code(ohms: float, digits: int = 3) -> str | None:
    """The digit code printed on chip resistors, or ``None`` where the value does not fit.

    ``digits=3``: two significant digits and the number of zeros (``472`` = 4.7 kΩ, ``100`` =
    10 Ω); below 10 Ω two digits with ``R`` at the decimal point (``4R7``, ``R47``, ``R05``).
    ``digits=4``: three significant digits and the number of zeros (``4701`` = 4.7 kΩ, ``1002`` =
    10 kΩ); below 100 Ω three digits with ``R`` (``47R0``, ``4R70``, ``R010``). The zero count is
    one digit, 0..9. Values with more significant digits, or too small for the ``R`` form
    (below 0.01 Ω with 3 characters, 0.001 Ω with 4), give ``None``.

    Raises
    ------
    ArgumentError
        On ``digits`` other than 3 or 4, or a value that is not finite and above zero.

    Examples
    --------
    >>> smd_code(4700), smd_code(4.7), smd_code(0.47), smd_code(10)
    ('472', '4R7', 'R47', '100')
    >>> smd_code(4700, 4), smd_code(10000, 4), smd_code(4.7, 4), smd_code(0.01, 4)
    ('4701', '1002', '4R70', 'R010')
    >>> smd_code(4750) is None, smd_code(4750, 4)
    (True, '4751')
    """
    if digits not in (3, 4):
        raise ArgumentError(f"digits={digits!r}: chip codes here have 3 or 4 characters")
    x = _checked_ohms(ohms)
    width = digits - 1
    fixed = _fixed(x, width)
    if fixed is None:
        return None
    sig, power = fixed
    if 0 <= power <= 9:
        return sig + str(power)
    # below 10 Ω (3 characters) or 100 Ω (4): `width` digits with R at the decimal point
    d = Decimal(repr(x))
    point = max(d.adjusted() + 1, 0)  # digits before the R: the whole part's digits, none below 1 Ω
    units = d.scaleb(width - point)  # the value in units of the last place the code holds
    if point >= width or units != units.to_integral_value():
        return None
    text = str(int(units)).rjust(width, "0")
    return text[:point] + "R" + text[point:]


def eia96_code(ohms: float) -> str | None:
    """The EIA-96 code of an E96 value: index 01..96 of its mantissa, then the multiplier letter.

    The index counts the 96 mantissas of IEC 60063 E96 (100, 102, ... 976) from 01; the letter
    multiplies the three-digit mantissa: Z ×0.001, Y ×0.01, X ×0.1, A ×1, B ×10, C ×100,
    D ×1000, E ×10^4, F ×10^5 (this function writes Y and X, never their other spellings R and S).
    So the code covers 100 mΩ (``01Z``) to 97.6 MΩ (``96F``). ``None`` for any other value
    (not an E96 value, or outside that range).

    Raises
    ------
    ArgumentError
        If `ohms` is not a finite number above zero.

    Examples
    --------
    >>> eia96_code(100), eia96_code(97600), eia96_code(10000)
    ('01A', '96C', '01C')
    >>> eia96_code(4700) is None  # 470 is not an E96 mantissa
    True
    """
    x = _checked_ohms(ohms)
    fixed = _fixed(x, 3)
    if fixed is None:
        return None
    sig, power = fixed
    if int(sig) not in _E96 or power not in EIA96_LETTERS:
        return None
    return f"{_E96.index(int(sig)) + 1:02d}{EIA96_LETTERS[power]}"


# --------------------------------------------------------------------------- one stock line


@dataclass(frozen=True, slots=True)
class Marking:
    """Every marking of one value and tolerance; ``None`` where a code does not exist.

    Attributes
    ----------
    ohms, tolerance : float
        The value in ohms and the tolerance as a fraction.
    rkm : str
        IEC 60062 RKM code (:func:`rkm_code`).
    bands4, bands5 : tuple of str or None
        Colour bands (:func:`color_bands`), 4 and 5 bands.
    smd3, smd4 : str or None
        Chip digit codes (:func:`smd_code`), 3 and 4 characters.
    eia96 : str or None
        EIA-96 code (:func:`eia96_code`).
    notes : tuple of str
        One line for each code that is ``None``, saying why.
    """

    ohms: float
    tolerance: float
    rkm: str
    bands4: tuple[str, ...] | None
    bands5: tuple[str, ...] | None
    smd3: str | None
    smd4: str | None
    eia96: str | None
    notes: tuple[str, ...] = ()


def marking_of(ohms: float, tolerance: float) -> Marking:
    """All markings of one stock line (value in ohms, tolerance as a fraction).

    Raises
    ------
    ArgumentError
        On a value that is not finite and above zero, or a tolerance outside 0 ≤ t < 1.

    Examples
    --------
    >>> m = marking_of(4700.0, 0.05)
    >>> m.rkm, m.bands4, m.smd3, m.smd4, m.eia96
    ('4K7', ('yellow', 'violet', 'red', 'gold'), '472', '4701', None)
    >>> m.notes
    ('EIA-96: 4.7 kΩ is not an E96 value in 100 mΩ .. 97.6 MΩ',)
    """
    x = _checked_ohms(ohms)
    bands4, why4 = _band_parts(x, tolerance, 4)
    bands5, why5 = _band_parts(x, tolerance, 5)
    smd3, smd4, eia96 = smd_code(x, 3), smd_code(x, 4), eia96_code(x)
    value = format_ohms(x, 12)
    notes = [
        *([f"4 bands: {why4}"] if why4 else []),
        *([f"5 bands: {why5}"] if why5 else []),
        *([f"3-character chip code: {value} does not fit two digits and a zero count"] if smd3 is None else []),
        *([f"4-character chip code: {value} does not fit three digits and a zero count"] if smd4 is None else []),
        *([f"EIA-96: {value} is not an E96 value in 100 mΩ .. 97.6 MΩ"] if eia96 is None else []),
    ]
    return Marking(x, float(tolerance), rkm_code(x), bands4, bands5, smd3, smd4, eia96, tuple(notes))
