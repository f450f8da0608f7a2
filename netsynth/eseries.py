"""IEC 60063 preferred-number series E3..E192, stored as data tables.

Each series is a tuple of integer mantissas per decade: two digits for E3..E24
(``47`` means 4.7 × 10^k), three digits for E48..E192 (``475`` means 4.75 × 10^k).
The tables are data, not the rounding formula round(10^(i/n)): the standard differs
from the formula at E24 i = 10..16 and 22 (2.7 .. 4.7, 8.2) and at E192 i = 185
(9.20, formula 9.19), so the formula would give wrong parts.

E192 is stored once; E96 is every 2nd entry and E48 every 4th entry of it, as the
standard defines them. ``tests/data/iec60063.txt`` holds separately typed copies.

Public API: :data:`SeriesName`, :data:`SERIES_NAMES`, :func:`mantissas`,
:func:`series_values`, :func:`series_tolerance`, :func:`series_of`.

References
----------
IEC 60063:2015, Preferred number series for resistors and capacitors (edition year
from memory); tables as reproduced in the Wikipedia article "E series of preferred
numbers", which cites IEC 60063.
"""

from __future__ import annotations

import math
from decimal import Decimal
from typing import Literal, get_args

from netsynth.errors import ValueParseError

__all__ = ["SERIES_NAMES", "SeriesName", "mantissas", "series_of", "series_tolerance", "series_values"]

SeriesName = Literal["E3", "E6", "E12", "E24", "E48", "E96", "E192"]
SERIES_NAMES: tuple[str, ...] = get_args(SeriesName)

# IEC 60063 two-digit series (mantissa × 10^(k-1)).
_E3 = (10, 22, 47)
_E6 = (10, 15, 22, 33, 47, 68)
_E12 = (10, 12, 15, 18, 22, 27, 33, 39, 47, 56, 68, 82)
_E24 = (
    10, 11, 12, 13, 15, 16, 18, 20, 22, 24, 27, 30,
    33, 36, 39, 43, 47, 51, 56, 62, 68, 75, 82, 91,
)
# IEC 60063 E192 (mantissa × 10^(k-2)); note 920, not the formula's 919.
_E192 = (
    100, 101, 102, 104, 105, 106, 107, 109, 110, 111, 113, 114, 115, 117, 118, 120,
    121, 123, 124, 126, 127, 129, 130, 132, 133, 135, 137, 138, 140, 142, 143, 145,
    147, 149, 150, 152, 154, 156, 158, 160, 162, 164, 165, 167, 169, 172, 174, 176,
    178, 180, 182, 184, 187, 189, 191, 193, 196, 198, 200, 203, 205, 208, 210, 213,
    215, 218, 221, 223, 226, 229, 232, 234, 237, 240, 243, 246, 249, 252, 255, 258,
    261, 264, 267, 271, 274, 277, 280, 284, 287, 291, 294, 298, 301, 305, 309, 312,
    316, 320, 324, 328, 332, 336, 340, 344, 348, 352, 357, 361, 365, 370, 374, 379,
    383, 388, 392, 397, 402, 407, 412, 417, 422, 427, 432, 437, 442, 448, 453, 459,
    464, 470, 475, 481, 487, 493, 499, 505, 511, 517, 523, 530, 536, 542, 549, 556,
    562, 569, 576, 583, 590, 597, 604, 612, 619, 626, 634, 642, 649, 657, 665, 673,
    681, 690, 698, 706, 715, 723, 732, 741, 750, 759, 768, 777, 787, 796, 806, 816,
    825, 835, 845, 856, 866, 876, 887, 898, 909, 920, 931, 942, 953, 965, 976, 988,
)
_TABLES: dict[str, tuple[int, ...]] = {
    "E3": _E3, "E6": _E6, "E12": _E12, "E24": _E24,
    "E48": _E192[::4], "E96": _E192[::2], "E192": _E192,
}

# Tolerance customarily paired with each series (IEC 60063 practice, as tabulated in
# the Wikipedia article "E series of preferred numbers"). E3 has none (">20 %");
# E192 serves 0.5 % and tighter (0.25 %, 0.1 %).
_TOLERANCES: dict[str, float | None] = {
    "E3": None, "E6": 0.2, "E12": 0.1, "E24": 0.05, "E48": 0.02, "E96": 0.01, "E192": 0.005,
}


def _table(name: str) -> tuple[int, ...]:
    key = name.strip().upper() if isinstance(name, str) else name
    if key not in _TABLES:
        raise ValueParseError(f"unknown series {name!r}: choose one of {', '.join(SERIES_NAMES)}")
    return _TABLES[key]


def mantissas(name: SeriesName | str) -> tuple[int, ...]:
    """Integer mantissas of one decade of a series, ascending.

    Parameters
    ----------
    name : str
        ``"E3"`` .. ``"E192"`` (case-insensitive).

    Returns
    -------
    tuple of int
        Two-digit (E3..E24, 10..91) or three-digit (E48..E192, 100..988) mantissas.

    Raises
    ------
    ValueParseError
        If the series name is unknown.

    Examples
    --------
    >>> mantissas("E6")
    (10, 15, 22, 33, 47, 68)
    """
    return _table(name)


def series_values(name: SeriesName | str, low_ohms: float, high_ohms: float) -> tuple[float, ...]:
    """All values of a series in ``[low_ohms, high_ohms]``, ascending.

    Each value is built from its decimal text (``float("47e2")``), so it equals
    the float that :func:`netsynth.values.parse_resistance` reads for ``4k7``.
    A valid range that holds no series value gives an empty tuple.

    Parameters
    ----------
    name : str
        Series name, ``"E3"`` .. ``"E192"``.
    low_ohms, high_ohms : float
        Inclusive bounds in ohms; positive, finite, ``low_ohms <= high_ohms``.

    Returns
    -------
    tuple of float
        Values in ohms.

    Raises
    ------
    ValueParseError
        If the name is unknown or the bounds are not a valid range.

    Examples
    --------
    >>> series_values("E6", 1000, 10000)
    (1000.0, 1500.0, 2200.0, 3300.0, 4700.0, 6800.0, 10000.0)
    """
    table = _table(name)
    if not (0 < low_ohms <= high_ohms and math.isfinite(high_ohms)):
        raise ValueParseError(
            f"invalid range {low_ohms!r}..{high_ohms!r} ohms: need 0 < low <= high, both finite"
        )
    shift = len(str(table[0])) - 1  # 1 for two-digit mantissas, 2 for three-digit
    first = math.floor(math.log10(low_ohms)) - 1
    last = math.floor(math.log10(high_ohms)) + 1
    values = (float(f"{m}e{k - shift}") for k in range(first, last + 1) for m in table)
    return tuple(v for v in values if low_ohms <= v <= high_ohms)


def series_tolerance(name: SeriesName | str) -> float | None:
    """Tolerance customarily paired with a series, as a fraction (E24 -> 0.05).

    Returns ``None`` for E3, which has no assigned tolerance.

    Examples
    --------
    >>> series_tolerance("E96"), series_tolerance("E3")
    (0.01, None)
    """
    _table(name)
    return _TOLERANCES[name.strip().upper()]


def series_of(ohms: float) -> str | None:
    """The first of E3, E6, .. E192 that contains `ohms` in some decade, else None.

    Examples
    --------
    >>> series_of(4700.0), series_of(1100.0), series_of(105.0), series_of(123.4)
    ('E3', 'E24', 'E48', None)
    """
    if not (ohms > 0 and math.isfinite(ohms)):
        return None
    digits = Decimal(repr(float(ohms))).normalize().as_tuple().digits
    if len(digits) > 3:
        return None
    two = int("".join(map(str, digits)).ljust(2, "0")) if len(digits) <= 2 else None
    three = int("".join(map(str, digits)).ljust(3, "0"))
    for name in SERIES_NAMES:
        if (two if len(str(_TABLES[name][0])) == 2 else three) in _TABLES[name]:
            return name
    return None
