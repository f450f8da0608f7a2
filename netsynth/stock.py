"""The user's stock bin: which resistor values are on hand, how many, and their ratings.

Map of the module
-----------------
``StockItem``        one line of the bin (frozen): value, count, tolerance, ratings, where it is
``StockBin``         the whole bin (frozen): items sorted by value, never empty
``kit_bin``          a full E-series kit over a range of values, built from IEC 60063 tables
``default_bin``      the built-in bin: E24 10 Ω..1 MΩ, 1 % ¼ W 200 V 100 ppm/K, as many as needed
``bin_from_values``  a bin from a list of values, for the API and tests
``load_bin``         read a bin file (CSV); lives in :mod:`netsynth.binfile`, re-exported here
``save_bin``         write a bin file atomically; lives in :mod:`netsynth.binfile`, re-exported here

The bin file format (columns, comments, merge rules, error messages) is described in
:mod:`netsynth.binfile`.  The merge rule itself (:func:`_merge`) lives here, because
``bin_from_values`` uses it too: lines with the same value and the same ratings (tolerance,
power, voltage limit, TCR, upper category temperature) are one part.
"""

from __future__ import annotations

import dataclasses
import functools
import math
import numbers
import re
from collections.abc import Iterable
from dataclasses import dataclass

from netsynth import eseries, values
from netsynth.errors import StockError

__all__ = [
    "COLUMNS",
    "DEFAULT_MAX_TEMP_C",
    "DEFAULT_MAX_VOLTS",
    "DEFAULT_POWER_W",
    "DEFAULT_TCR_PPM",
    "DEFAULT_TOLERANCE",
    "StockBin",
    "StockItem",
    "bin_from_values",
    "default_bin",
    "kit_bin",
    "load_bin",
    "save_bin",
]

# Defaults describe a common general-purpose part: a 1 % ¼ W metal-film leaded resistor or a
# 1206 thick-film chip.  Both are rated at a 70 °C ambient (Yageo CFR/MFR and Vishay D/CRCW
# datasheets).
DEFAULT_TOLERANCE = 0.01  #: fraction; 1 % is the usual metal-film / 1206 thick-film grade
DEFAULT_POWER_W = 0.25  #: W; ¼ W: Yageo MFR-25 leaded, Vishay D/CRCW 1206 chip (P70)
# 200 V is the lower of the two limiting element voltages: ¼ W leaded metal film is 250 V
# (Yageo MFR-25 datasheet) and the 1206 chip is 200 V (Vishay D/CRCW datasheet, doc. 20035),
# so a network checked against 200 V is safe with either part.
DEFAULT_MAX_VOLTS = 200.0  #: V, limiting element voltage
# ±100 ppm/K is the standard grade of both: Yageo MFR (±50/±100) and Vishay D/CRCW (±100/±200).
DEFAULT_TCR_PPM = 100.0  #: ppm/K, magnitude
# The temperature at which the derating line reaches zero power.  155 °C is the upper category
# temperature of common thick-film chips and leaded film resistors (Vishay D/CRCW, Yageo CFR/MFR
# datasheets, which rate power at 70 °C and derate linearly to 0 at 155 °C); some thin-film
# series use 125 °C.
DEFAULT_MAX_TEMP_C = 155.0  #: °C, upper category temperature

# IEC 60115-1: the rated ambient temperature, at or below which the full rated power applies
# (70 °C in the Yageo and Vishay datasheets above).  The derating line must end above it.
_RATED_AMBIENT_C = 70.0

#: The bin file's own columns, in the order ``save_bin`` writes them, before any extra
#: columns.  ``max_temp`` is written only when some line differs from the default.
COLUMNS = ("value", "qty", "tolerance", "watts", "max_volts", "tcr", "max_temp", "package", "location",
           "note")

_TEXT_FIELDS = ("package", "location", "note")
_JOIN = "; "  # joins the distinct texts of merged rows
_REL_TOL = 1e-12  # two values this close are the same value (float noise, not a real difference)


# --------------------------------------------------------------------------- checks
# Each returns None when the number is acceptable, else the reason and the way out.  They are
# shared by StockItem (programmatic use) and load_bin (which adds file, line and field).


def _real(x: object) -> bool:
    return isinstance(x, numbers.Real) and not isinstance(x, bool)


def _problem_ohms(ohms: object) -> str | None:
    if not _real(ohms) or not math.isfinite(ohms) or not ohms > 0:
        return ("a bin lists resistances that are finite and greater than zero; "
                "leave jumpers and open positions out")
    return None


def _problem_count(count: object) -> str | None:
    if count is None:
        return None
    if not isinstance(count, numbers.Integral) or isinstance(count, bool) or count < 0:
        return "expected a whole number of parts (0 or more), or None for as many as needed"
    return None


def _problem_tolerance(tol: object) -> str | None:
    if not _real(tol) or not 0 <= tol < 1:
        return "a tolerance must be at least 0 % and less than 100 %, such as 1 % (0.01)"
    return None


def _problem_power(watts: object) -> str | None:
    if not _real(watts) or not math.isfinite(watts) or not watts > 0:
        return "a power rating must be greater than zero, such as 0.25 W"
    return None


def _problem_volts(volts: object) -> str | None:
    if not _real(volts) or not math.isfinite(volts) or not volts > 0:
        return "a voltage limit must be greater than zero, such as 200 V"
    return None


def _problem_tcr(tcr: object) -> str | None:
    if not _real(tcr) or not math.isfinite(tcr) or tcr < 0:
        return "a TCR here is a magnitude in ppm/K, 0 or more, such as 100 for ±100 ppm/K"
    return None


def _problem_max_temp(temp_c: object) -> str | None:
    if not _real(temp_c) or not math.isfinite(temp_c) or not temp_c > _RATED_AMBIENT_C:
        return ("an upper category temperature must be a finite number of °C above the 70 °C "
                "rated ambient (IEC 60115-1), such as 155 (thick film) or 125 (some thin film)")
    return None


def _normalize_column(name: str) -> str:
    """The key a header cell is matched by: lower case, stripped, spaces/hyphens -> '_'."""
    return re.sub(r"[\s\-]+", "_", name.strip().lower())


# --------------------------------------------------------------------------- data


@dataclass(frozen=True, slots=True)
class StockItem:
    """One line of the bin: a value you own, how many, and its ratings.

    Parameters
    ----------
    ohms : float
        Nominal resistance in ohms; finite and greater than zero.
    count : int or None
        Parts on hand; ``None`` means as many as needed.  Zero is allowed (nothing can be used).
    tolerance : float
        Fraction: 0.01 means ±1 %.  At least 0 and less than 1.
    power_rating_w : float
        Rated power in watts at or below the rated ambient temperature (70 °C in the
        Yageo and Vishay datasheets this project reads); greater than zero.
    max_volts : float
        Limiting element voltage in volts (IEC 60115-1 term); greater than zero.
    tcr_ppm : float
        Magnitude of the temperature coefficient in ppm/K; 0 or more.
    max_temp_c : float
        Upper category temperature in °C: where the linear derating line from the rated
        ambient (70 °C) reaches zero power.  Finite and above 70.  Keyword-only, so that
        positional calls written before the field existed keep their meaning.
    package, location, note : str
        Free text; stored without surrounding spaces.
    extra : tuple of (str, str)
        Columns of the bin file that netsynth does not use, as (column, text) pairs.  They
        are kept (sorted by column name, so column order in the file does not matter) and
        written back by ``save_bin``.  Names must not be one of :data:`COLUMNS`; texts must
        not be blank.

    Raises
    ------
    StockError
        If any field is out of range; the message names the field and a valid example.

    Examples
    --------
    >>> StockItem(4700.0, count=10).tolerance
    0.01
    >>> StockItem(0.0)
    Traceback (most recent call last):
    ...
    netsynth.errors.StockError: StockItem ohms=0.0: a bin lists resistances that are finite and greater than zero; leave jumpers and open positions out
    """

    ohms: float
    count: int | None = None  #: None means as many as needed
    tolerance: float = DEFAULT_TOLERANCE  #: fraction, 0.01 = ±1 %
    power_rating_w: float = DEFAULT_POWER_W  #: W, at or below the rated ambient (70 °C)
    max_volts: float = DEFAULT_MAX_VOLTS  #: V, limiting element voltage
    tcr_ppm: float = DEFAULT_TCR_PPM  #: ppm/K magnitude
    #: °C, where derating reaches zero power; keyword-only (dataclasses put it last in __init__)
    max_temp_c: float = dataclasses.field(default=DEFAULT_MAX_TEMP_C, kw_only=True)
    package: str = ""
    location: str = ""
    note: str = ""
    extra: tuple[tuple[str, str], ...] = ()  #: unknown columns, kept and ignored

    def __post_init__(self) -> None:
        checks = (
            ("ohms", _problem_ohms),
            ("count", _problem_count),
            ("tolerance", _problem_tolerance),
            ("power_rating_w", _problem_power),
            ("max_volts", _problem_volts),
            ("tcr_ppm", _problem_tcr),
            ("max_temp_c", _problem_max_temp),
        )
        for field, check in checks:
            if problem := check(getattr(self, field)):
                raise StockError(f"StockItem {field}={getattr(self, field)!r}: {problem}")
        # Store plain Python numbers so equal items compare and hash equal whatever the
        # caller passed (int, numpy scalar, float).
        set_ = object.__setattr__
        for field in ("ohms", "tolerance", "power_rating_w", "max_volts", "tcr_ppm", "max_temp_c"):
            set_(self, field, float(getattr(self, field)))
        if self.count is not None:
            set_(self, "count", int(self.count))
        for field in _TEXT_FIELDS:
            text = getattr(self, field)
            if not isinstance(text, str):
                raise StockError(f"StockItem {field}: expected text, got {text!r}")
            set_(self, field, text.strip())
        set_(self, "extra", _checked_extra(self.extra))


def _checked_extra(extra: object) -> tuple[tuple[str, str], ...]:
    try:
        pairs = tuple((name, text) for name, text in extra)  # type: ignore[union-attr]
    except (TypeError, ValueError):
        raise StockError(f"StockItem extra: expected (column, text) pairs, got {extra!r}") from None
    seen: set[str] = set()
    for name, text in pairs:
        if not isinstance(name, str) or not isinstance(text, str):
            raise StockError(f"StockItem extra: expected (column, text) pairs of text, got {(name, text)!r}")
        key = _normalize_column(name)
        if not key or key in COLUMNS or key in seen:
            raise StockError(f"StockItem extra: column name {name!r} is blank, repeated or one of "
                             f"netsynth's own columns ({', '.join(COLUMNS)}); rename it")
        if not text.strip():
            raise StockError(f"StockItem extra: column {name!r} has blank text; leave the pair out instead")
        seen.add(key)
    return tuple(sorted((name.strip(), text.strip()) for name, text in pairs))


def _ratings(item: StockItem) -> tuple[float, float, float, float, float]:
    """The ratings that make two lines of the same value different parts."""
    return (item.tolerance, item.power_rating_w, item.max_volts, item.tcr_ppm, item.max_temp_c)


def _sort_key(item: StockItem) -> tuple:
    # None (as many as needed) sorts after every finite count.
    count_key = (1, 0) if item.count is None else (0, item.count)
    return (item.ohms, _ratings(item), count_key, item.package, item.location, item.note, item.extra)


@dataclass(frozen=True, slots=True)
class StockBin:
    """The whole stock bin: its items sorted by value, and where it came from.

    Parameters
    ----------
    items : iterable of StockItem
        Stored as a tuple sorted by ohms, then by ratings, count and text.  Never empty.
    name : str
        Where the bin came from: a file path, ``"kit E24 10 Ω..1 MΩ, ..."``, ``"default: ..."``.

    Raises
    ------
    StockError
        If there are no items, or an item is not a :class:`StockItem`.

    Examples
    --------
    >>> b = StockBin((StockItem(1000.0, 2), StockItem(100.0)))
    >>> b.values, b.counts
    ((100.0, 1000.0), (None, 2))
    >>> b.item_for(1e3).count
    2
    """

    items: tuple[StockItem, ...]
    name: str = ""

    def __post_init__(self) -> None:
        items = tuple(self.items)
        label = f"{self.name}: " if self.name else ""
        if not items:
            raise StockError(f"{label}the bin holds no parts; add at least one value")
        for item in items:
            if not isinstance(item, StockItem):
                raise StockError(f"{label}expected StockItem entries in the bin, got {item!r}")
        if not isinstance(self.name, str):
            raise StockError(f"a bin name is text, got {self.name!r}")
        object.__setattr__(self, "items", tuple(sorted(items, key=_sort_key)))

    @property
    def values(self) -> tuple[float, ...]:
        """Ohms of each item, in item order (duplicates possible for different ratings)."""
        return tuple(item.ohms for item in self.items)

    @property
    def counts(self) -> tuple[int | None, ...]:
        """Count of each item, in item order; ``None`` means as many as needed."""
        return tuple(item.count for item in self.items)

    def item_for(self, ohms: float) -> StockItem | None:
        """The first item whose value equals `ohms` (relative tolerance 1e-12), else None."""
        for item in self.items:
            if math.isclose(item.ohms, ohms, rel_tol=_REL_TOL):
                return item
        return None

    def __len__(self) -> int:
        return len(self.items)


# --------------------------------------------------------------------------- merging


def _value_key(ohms: float) -> float:
    # 12 significant digits: '4k7' and '4700' are one value even if a parser leaves 1-ulp noise.
    return float(f"{ohms:.12g}")


def _join_texts(texts: Iterable[str]) -> str:
    out: list[str] = []
    for text in texts:
        if text and text not in out:
            out.append(text)
    return _JOIN.join(out)


def _merge(items: Iterable[StockItem]) -> list[StockItem]:
    """Merge items with the same value and the same ratings; keep first-seen order."""
    groups: dict[tuple, list[StockItem]] = {}
    for item in items:
        key = (_value_key(item.ohms), *(_value_key(r) for r in _ratings(item)))
        groups.setdefault(key, []).append(item)
    merged = []
    for group in groups.values():
        first = group[0]
        if len(group) == 1:
            merged.append(first)
            continue
        counts = [it.count for it in group]
        count = None if None in counts else sum(counts)  # type: ignore[arg-type]
        extra_names: dict[str, None] = {}
        for it in group:
            extra_names.update(dict.fromkeys(name for name, _ in it.extra))
        extra = tuple(
            (name, _join_texts(dict(it.extra).get(name, "") for it in group)) for name in extra_names
        )
        merged.append(dataclasses.replace(
            first,
            count=count,
            extra=extra,
            **{f: _join_texts(getattr(it, f) for it in group) for f in _TEXT_FIELDS},
        ))
    return merged


# --------------------------------------------------------------------------- built-in bins

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
    tolerance: float | None = None,
    power_rating_w: float = DEFAULT_POWER_W,
    max_volts: float = DEFAULT_MAX_VOLTS,
) -> StockBin:
    """A full E-series kit: every value of `series` from `low_ohms` to `high_ohms` inclusive.

    Parameters
    ----------
    series : str
        An IEC 60063 series name from ``eseries.SERIES_NAMES`` (E3 .. E192).
    low_ohms, high_ohms : float
        The range in ohms, both ends included.
    count : int or None
        Parts of each value; None means as many as needed.
    tolerance : float or None
        Fraction.  None takes the series' own tolerance (``eseries.series_tolerance``: E24 5 %,
        E96 1 %, ...), or 1 % for E3, which IEC 60063 gives no tolerance.
    power_rating_w, max_volts : float
        Ratings of every part, in watts and volts.  TCR is the default, 100 ppm/K.

    Returns
    -------
    StockBin
        Named like ``"kit E24 10 Ω..1 MΩ, 5 % ¼ W, unlimited"``.

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
    >>> len(kit_bin("E12", 100, 1000))  # 100, 120, ..., 820, 1000
    13
    """
    if tolerance is None:
        tolerance = eseries.series_tolerance(series)
        if tolerance is None:
            tolerance = DEFAULT_TOLERANCE  # E3 has no tolerance in IEC 60063 (">20 %")
    found = eseries.series_values(series, low_ohms, high_ohms)
    if not found:
        raise StockError(f"kit {series} from {low_ohms!r} to {high_ohms!r} ohms holds no "
                         "value of the series; widen the range")
    items = tuple(StockItem(ohms, count, tolerance, power_rating_w, max_volts) for ohms in found)
    return StockBin(items, name=f"kit {series} " + _describe(found[0], found[-1], tolerance,
                                                             power_rating_w, count))


@functools.cache
def default_bin() -> StockBin:
    """The built-in bin used when the user gives none.

    A full E24 kit from 10 Ω to 1 MΩ (121 values: 24 per decade over five decades, plus
    1 MΩ; IEC 60063), as many as needed of each, 1 % ¼ W 200 V 100 ppm/K: the parts a
    typical bench has drawers of (module constants explain the ratings).

    Examples
    --------
    >>> len(default_bin()), default_bin().name
    (121, 'default: E24 10 Ω..1 MΩ, 1 % ¼ W, unlimited')
    """
    kit = kit_bin("E24", 10.0, 1e6, None, DEFAULT_TOLERANCE, DEFAULT_POWER_W, DEFAULT_MAX_VOLTS)
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


# --------------------------------------------------------------------------- re-export

# Reading and writing bin files is netsynth.binfile's job, but the public API stays in one
# place: ``from netsynth.stock import load_bin, save_bin`` works as it always has.  This import
# sits at the end because binfile imports this module's names at its top; by now they all exist.
from netsynth.binfile import load_bin, save_bin  # noqa: E402
