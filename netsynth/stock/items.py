"""Stock items and the bin: the data types, their checks, the defaults and the merge rule.

Map of the module
-----------------
``StockItem``        one line of the bin (frozen): value, count, tolerance, ratings, where it is,
                     and the bin-file line it came from (``line``)
``StockBin``         the whole bin (frozen): items sorted by value, never empty; numbers the
                     lines of items that came from no file by their position
``DEFAULT_*``        the ratings of a part nobody described (1 % ¼ W 200 V 100 ppm/K, 155 °C)
``COLUMNS``          the bin file's own columns, in the order ``save_bin`` writes them
``_merge``           the merge rule: lines with the same value and the same ratings (tolerance,
                     power, voltage limit, TCR, upper category temperature) are one part

This module imports no other module of :mod:`netsynth.stock`: ``kits`` and ``binfile`` build
on it (the bin file format is described in :mod:`netsynth.stock.binfile`).
"""

from __future__ import annotations

import dataclasses
import math
import numbers
import re
from collections.abc import Iterable
from dataclasses import dataclass

from netsynth import limits
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
    if not limits.MIN_OHMS <= ohms <= limits.MAX_OHMS:
        return f"a bin lists resistances from {limits.OHMS_RANGE}"
    return None


def _problem_count(count: object) -> str | None:
    if count is None:
        return None
    if not isinstance(count, numbers.Integral) or isinstance(count, bool) or count < 0:
        return "expected a whole number of parts (0 or more), or None for as many as needed"
    if count > limits.MAX_QTY:
        return f"a line holds at most {limits.MAX_QTY} parts; leave the quantity blank for as many as needed"
    return None


def _problem_tolerance(tol: object) -> str | None:
    if not _real(tol) or not 0 <= tol < 1:
        return "a tolerance must be at least 0 % and less than 100 %, such as 1 % (0.01)"
    if 0 < tol < limits.MIN_FRACTION:
        return f"a tolerance is 0, or from {limits.FRACTION_RANGE}"
    return None


def _problem_power(watts: object) -> str | None:
    if not _real(watts) or not math.isfinite(watts) or not watts > 0:
        return "a power rating must be greater than zero, such as 0.25 W"
    if not limits.MIN_RATING_W <= watts <= limits.MAX_WATTS:
        return f"a power rating must be from {limits.RATING_RANGE}"
    return None


def _problem_volts(volts: object) -> str | None:
    if not _real(volts) or not math.isfinite(volts) or not volts > 0:
        return "a voltage limit must be greater than zero, such as 200 V"
    if not limits.MIN_VOLTS <= volts <= limits.MAX_VOLTS:
        return f"a voltage limit must be from {limits.VOLTS_RANGE}"
    return None


def _problem_tcr(tcr: object) -> str | None:
    if not _real(tcr) or not math.isfinite(tcr) or tcr < 0:
        return "a TCR here is a magnitude in ppm/K, 0 or more, such as 100 for ±100 ppm/K"
    if tcr > limits.MAX_TCR_PPM or 0 < tcr < limits.MIN_TCR_PPM:
        return f"a TCR here is {limits.TCR_RANGE}"
    return None


def _problem_max_temp(temp_c: object) -> str | None:
    if not _real(temp_c) or not math.isfinite(temp_c) or not temp_c > _RATED_AMBIENT_C:
        return ("an upper category temperature must be a finite number of °C above the 70 °C "
                "rated ambient (IEC 60115-1), such as 155 (thick film) or 125 (some thin film)")
    if temp_c > limits.MAX_TEMP_C:
        return f"an upper category temperature is at most {limits.MAX_TEMP_C:g} °C"
    return None


def _problem_line(line: object) -> str | None:
    if not isinstance(line, numbers.Integral) or isinstance(line, bool) or line < 0:
        return "a line number is a whole number, 1 or more, or 0 for not assigned yet"
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
    line : int
        Where the item is listed: the bin file's line number (1-based, the physical line) of
        the first row merged into it, set by ``load_bin``.  0 means not assigned yet;
        :class:`StockBin` then numbers the item by its position in the sorted bin.
        Keyword-only, and not part of equality, hashing, sorting or the merge rule: the same
        part read from another line is the same part.  ``save_bin`` does not write it.

    Raises
    ------
    StockError
        If any field is out of range; the message names the field and a valid example.

    Examples
    --------
    >>> StockItem(4700.0, count=10).tolerance
    0.01
    >>> StockItem(4700.0, line=7) == StockItem(4700.0)  # where it is listed is not what it is
    True
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
    #: bin-file line of the first row merged into this item; 0 = not assigned yet (keyword-only)
    line: int = dataclasses.field(default=0, kw_only=True, compare=False)

    def __post_init__(self) -> None:
        checks = (
            ("ohms", _problem_ohms),
            ("count", _problem_count),
            ("tolerance", _problem_tolerance),
            ("power_rating_w", _problem_power),
            ("max_volts", _problem_volts),
            ("tcr_ppm", _problem_tcr),
            ("max_temp_c", _problem_max_temp),
            ("line", _problem_line),
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
        set_(self, "line", int(self.line))
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


def bin_order(item: StockItem) -> tuple:
    """The key a bin sorts its lines by: value, ratings, count, then text (never the file's row order)."""
    # None (as many as needed) sorts after every finite count.  ``line`` is left out on
    # purpose: the order of a bin's items does not depend on the order of the file's rows.
    count_key = (1, 0) if item.count is None else (0, item.count)
    return (item.ohms, _ratings(item), count_key, item.package, item.location, item.note, item.extra)


@dataclass(frozen=True, slots=True)
class StockBin:
    """The whole stock bin: its items sorted by value, and where it came from.

    Parameters
    ----------
    items : iterable of StockItem
        Stored as a tuple sorted by ohms, then by ratings, count and text (never by
        ``line``).  Never empty.  An item whose ``line`` is 0 is stored with ``line`` set to
        its 1-based position in the sorted tuple, so a bin built in code (a kit, the default
        bin) numbers its lines in order.
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
    >>> [item.line for item in b.items]  # built in code: numbered by position
    [1, 2]
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
                raise StockError(f"{label}expected StockItem entries in the bin, got {limits.excerpt(repr(item))}")
        if len(items) > limits.MAX_BIN_ROWS:
            raise StockError(f"{label}the bin has {len(items)} stock lines; a bin holds at most {limits.MAX_BIN_ROWS}")
        per_value: dict[float, int] = {}
        for item in items:  # values equal to 12 digits are one value, as the search pools them
            key = float(f"{item.ohms:.12g}")
            per_value[key] = per_value.get(key, 0) + 1
        crowded = max(per_value, key=per_value.__getitem__)
        if per_value[crowded] > limits.MAX_LINES_PER_VALUE:
            raise StockError(f"{label}{per_value[crowded]} stock lines hold {crowded:g} Ω; a bin holds at most "
                             f"{limits.MAX_LINES_PER_VALUE} lines of one value (rows with the same ratings merge)")
        if not isinstance(self.name, str):
            raise StockError(f"a bin name is text, got {self.name!r}")
        ordered = sorted(items, key=bin_order)
        numbered = tuple(
            dataclasses.replace(item, line=position) if item.line == 0 else item
            for position, item in enumerate(ordered, start=1)
        )
        object.__setattr__(self, "items", numbered)

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
