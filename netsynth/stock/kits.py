"""Bins netsynth builds itself: E-series kits, the built-in default bin, a bin from a list.

Map of the module
-----------------
``kit_bin``          a full E-series kit over a range of values (IEC 60063 tables); 1 % ¼ W unless told
``default_bin``      the built-in bin: E24 10 Ω..1 MΩ, 1 % ¼ W 200 V 100 ppm/K, as many as needed
``bin_from_values``  a bin of default-rated parts from a list of values, for the API and tests

These bins come from no file, so :class:`~netsynth.stock.items.StockBin` numbers their lines
by position (``StockItem.line``: 1 for the lowest value).
"""

from __future__ import annotations

import functools
from collections.abc import Iterable

from netsynth import eseries, values
from netsynth.errors import StockError
from netsynth.stock.items import (
    DEFAULT_MAX_VOLTS,
    DEFAULT_POWER_W,
    DEFAULT_TCR_PPM,
    DEFAULT_TOLERANCE,
    StockBin,
    StockItem,
    _merge,
)

__all__ = ["bin_from_values", "default_bin", "kit_bin"]

_WATTS_TEXT = {0.125: "⅛ W", 0.25: "¼ W", 0.5: "½ W"}


def _describe(low_ohms: float, high_ohms: float, tolerance: float, power_w: float,
              count: int | None) -> str:
    watts = _WATTS_TEXT.get(power_w, f"{power_w:g} W")
    each = "unlimited" if count is None else f"{count} each"
    return (f"{values.format_ohms(low_ohms)}..{values.format_ohms(high_ohms)}, "
            f"{tolerance * 100:g} % {watts}, {each}")


def kit_bin(
    series: str = "E24",
    low_ohms: float = 10.0,
    high_ohms: float = 1e6,
    count: int | None = None,
    tolerance: float = DEFAULT_TOLERANCE,
    power_rating_w: float = DEFAULT_POWER_W,
    max_volts: float = DEFAULT_MAX_VOLTS,
    tcr_ppm: float = DEFAULT_TCR_PPM,
) -> StockBin:
    """A full E-series kit: every value of `series` from `low_ohms` to `high_ohms` inclusive.

    The series only picks the values.  Every part has the default bin's ratings (1 % ¼ W
    200 V 100 ppm/K) unless told otherwise: choosing E12, or a quantity, does not change the
    parts' grade.

    Parameters
    ----------
    series : str
        An IEC 60063 series name from ``eseries.SERIES_NAMES`` (E3 .. E192).
    low_ohms, high_ohms : float
        The range in ohms, both ends included.
    count : int or None
        Parts of each value; None means as many as needed.
    tolerance : float
        Fraction for every part; :data:`~netsynth.stock.items.DEFAULT_TOLERANCE` (1 %) unless
        given.  ``eseries.series_tolerance`` gives the grade a series is usually sold in, for
        a caller that wants it.
    power_rating_w, max_volts, tcr_ppm : float
        Ratings of every part: watts, volts, ppm/K (defaults ¼ W, 200 V, 100 ppm/K).

    Returns
    -------
    StockBin
        Named with the series, range, tolerance, power and count, like
        ``"kit E24 10 Ω..1 MΩ, 1 % ¼ W, unlimited"``.

    Raises
    ------
    StockError
        If the range holds no value of the series, or a rating is out of range.
    ValueParseError
        If the series name is unknown or the range is not ``0 < low <= high`` (from
        ``eseries.series_values``).

    References
    ----------
    IEC 60063:2015, preferred number series for resistors and capacitors.

    Examples
    --------
    >>> kit = kit_bin("E12", 100, 1000)  # 100, 120, ..., 820, 1000
    >>> len(kit), kit.name
    (13, 'kit E12 100 Ω..1 kΩ, 1 % ¼ W, unlimited')
    >>> kit_bin("E12", 100, 1000, count=2, tolerance=0.05).name
    'kit E12 100 Ω..1 kΩ, 5 % ¼ W, 2 each'
    """
    found = eseries.series_values(series, low_ohms, high_ohms)
    if not found:
        raise StockError(f"kit {series} from {low_ohms!r} to {high_ohms!r} ohms holds no "
                         "value of the series; widen the range")
    items = tuple(StockItem(ohms, count, tolerance, power_rating_w, max_volts, tcr_ppm) for ohms in found)
    return StockBin(items, name=f"kit {series} " + _describe(found[0], found[-1], tolerance,
                                                             power_rating_w, count))


@functools.cache
def default_bin() -> StockBin:
    """The built-in bin used when the user gives none.

    A full E24 kit from 10 Ω to 1 MΩ (121 values: 24 per decade over five decades, plus
    1 MΩ; IEC 60063), as many as needed of each, 1 % ¼ W 200 V 100 ppm/K: the parts a
    typical bench has drawers of (the constants in :mod:`netsynth.stock.items` explain the
    ratings).

    Examples
    --------
    >>> len(default_bin()), default_bin().name
    (121, 'default: E24 10 Ω..1 MΩ, 1 % ¼ W, unlimited')
    """
    kit = kit_bin("E24", 10.0, 1e6, None, DEFAULT_TOLERANCE, DEFAULT_POWER_W, DEFAULT_MAX_VOLTS,
                  DEFAULT_TCR_PPM)
    return StockBin(kit.items, name="default: E24 " + _describe(10.0, 1e6, DEFAULT_TOLERANCE,
                                                                DEFAULT_POWER_W, None))


def bin_from_values(ohms: Iterable[float | str], count: int | None = None, name: str = "") -> StockBin:
    """A bin of default-rated parts (1 % ¼ W 200 V 100 ppm/K) from a list of values.

    Parameters
    ----------
    ohms : iterable of float or str
        Values in ohms; text is read with ``values.parse_resistance`` (``"4k7"``).  A value
        given twice is one item with the counts added, as in a bin file.
    count : int or None
        Parts of each listed value; None means as many as needed.
    name : str
        The bin's name.

    Raises
    ------
    StockError
        If the list is empty or a value is not a positive finite resistance.
    ValueParseError
        If a text value cannot be read.

    Examples
    --------
    >>> bin_from_values(["4k7", 100, 100], count=2).counts
    (4, 2)
    """
    items = [
        StockItem(values.parse_resistance(o) if isinstance(o, str) else o, count)
        for o in ohms
    ]
    return StockBin(tuple(_merge(items)), name=name)
