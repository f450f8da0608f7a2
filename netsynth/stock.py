"""The user's stock bin: which resistor values are on hand, how many, and their ratings.

Map of the module
-----------------
``StockItem``        one line of the bin (frozen): value, count, tolerance, ratings, where it is
``StockBin``         the whole bin (frozen): items sorted by value, never empty
``load_bin``         read a bin file (CSV, format below); every problem is one ``StockError`` line
``save_bin``         write the same format atomically (temp file in the same folder, fsync, replace)
``kit_bin``          a full E-series kit over a range of values, built from IEC 60063 tables
``default_bin``      the built-in bin: E24 10 Ω..1 MΩ, 1 % ¼ W 200 V 100 ppm/K, as many as needed
``bin_from_values``  a bin from a list of values, for the API and tests

Bin file format
---------------
A CSV file (UTF-8; a byte-order mark is tolerated) with a header row and one row per stock
line.  Columns come in any order and are matched without regard to case, surrounding spaces,
or a space/hyphen in place of the underscore (``Max Volts`` is ``max_volts``):

==========  ==============================================================================
column      meaning (blank cell: the default shown)
==========  ==============================================================================
value       required; a resistance as ``values.parse_resistance`` reads it: 4k7, 4.7k, R47, 1M
qty         whole number of parts on hand; blank means as many as needed
tolerance   e.g. ``1%``, ``0.1 %``, ``F`` (IEC 60062 letter); blank = 1 %
watts       power rating at the rated ambient (70 °C), e.g. ``0.25``, ``1/4W``; blank = 0.25 W
max_volts   limiting element voltage, e.g. ``200``, ``200V``; blank = 200 V
tcr         temperature coefficient magnitude in ppm/K, e.g. ``100``, ``50ppm``; blank = 100
package     free text (``0805``, ``axial``)
location    free text (``drawer A3``)
note        free text
(others)    kept in ``StockItem.extra`` and otherwise ignored
==========  ==============================================================================

* A line whose first cell starts with ``#`` is a comment; comments may come before the header.
  Fully blank lines (also ``,,,``) are skipped.
* A row may have fewer cells than the header (the missing cells are blank) but not more.
* Rows with ``qty`` 0 are read and checked but kept out of the bin: a labelled but empty
  drawer is a useful line in the file, yet nothing in it can go into a network.  Because of
  this, ``save_bin(load_bin(f))`` drops such rows.
* Rows with the same value **and** the same ratings (tolerance, watts, max_volts, tcr) are
  the same part and are merged on purpose: quantities are summed (a blank qty on any of them
  makes the merged line unlimited), and the text fields (package, location, note and extra
  columns) keep each distinct non-blank text, joined with ``"; "`` in file order.  Rows with
  the same value but different ratings stay separate items: they are different parts.
* Decimal commas: ``values`` decides; a quoted ``"4,7k"`` is passed to it and its reason for
  refusing is passed on.  An unquoted ``4,7k`` splits into two cells and usually shows up as a
  row with more cells than the header.

Every problem raises :class:`netsynth.errors.StockError` with one line naming the file, the
line number and the field, e.g.
``bins/shop.csv, line 7, field 'qty': cannot read 'ten': expected a whole number of parts, or
blank for as many as needed``.
"""

from __future__ import annotations

import csv
import dataclasses
import functools
import io
import math
import numbers
import os
import re
import secrets
import stat
from collections.abc import Callable, Iterable
from dataclasses import dataclass
from decimal import Decimal

from netsynth import eseries, values
from netsynth.errors import StockError, ValueParseError

__all__ = [
    "COLUMNS",
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

#: The columns ``save_bin`` writes, in this order, before any extra columns.
COLUMNS = ("value", "qty", "tolerance", "watts", "max_volts", "tcr", "package", "location", "note")

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
        )
        for field, check in checks:
            if problem := check(getattr(self, field)):
                raise StockError(f"StockItem {field}={getattr(self, field)!r}: {problem}")
        # Store plain Python numbers so equal items compare and hash equal whatever the
        # caller passed (int, numpy scalar, float).
        set_ = object.__setattr__
        for field in ("ohms", "tolerance", "power_rating_w", "max_volts", "tcr_ppm"):
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


def _ratings(item: StockItem) -> tuple[float, float, float, float]:
    return (item.tolerance, item.power_rating_w, item.max_volts, item.tcr_ppm)


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


# --------------------------------------------------------------------------- reading


def _read_text(path: str) -> str:
    try:
        with open(path, "rb") as f:
            data = f.read()
    except FileNotFoundError:
        raise StockError(f"cannot open {path!r}: no such file; check the path, "
                         "or leave the bin out to use the built-in default") from None
    except IsADirectoryError:
        raise StockError(f"cannot open {path!r}: it is a folder; give the path of a bin file (.csv)") from None
    except PermissionError:
        raise StockError(f"cannot open {path!r}: permission denied; check the file's permissions") from None
    except OSError as e:
        raise StockError(f"cannot open {path!r}: {e.strerror or e}") from None
    try:
        return data.decode("utf-8-sig")
    except UnicodeDecodeError as e:
        line = data[: e.start].count(b"\n") + 1
        raise StockError(f"{path}, line {line}: byte 0x{data[e.start]:02x} is not UTF-8 text; "
                         "save the file as UTF-8 (CSV UTF-8 in a spreadsheet)") from None


def _parse_qty(text: str) -> int | None:
    if not text:
        return None
    if not re.fullmatch(r"\+?[0-9]+", text):
        raise ValueParseError(f"cannot read {text!r}: expected a whole number of parts, "
                              "or blank for as many as needed")
    return int(text)


# field -> (parser of a non-blank cell, default for a blank cell, range check)
_FIELDS: dict[str, tuple[Callable[[str], float], float, Callable[[float], str | None]]] = {
    "tolerance": (values.parse_tolerance, DEFAULT_TOLERANCE, _problem_tolerance),
    "watts": (values.parse_power, DEFAULT_POWER_W, _problem_power),
    "max_volts": (values.parse_voltage, DEFAULT_MAX_VOLTS, _problem_volts),
    "tcr": (values.parse_tcr, DEFAULT_TCR_PPM, _problem_tcr),
}


def _header(rows: Iterable[tuple[int, list[str]]], path: str) -> tuple[int, list[str]]:
    """The first row that is not a comment or blank, as (line, cells)."""
    for line, cells in rows:
        return line, cells
    raise StockError(f"{path}: the file has no header row (it is empty, or only comments and "
                     "blank lines); start it with a header such as value,qty,tolerance")


def _rows(text: str, path: str) -> Iterable[tuple[int, list[str]]]:
    """(first line number, stripped cells) of each row that is not a comment or blank."""
    reader = csv.reader(io.StringIO(text, newline=""), strict=True)
    while True:
        line = reader.line_num + 1
        try:
            cells = next(reader)
        except StopIteration:
            return
        except csv.Error as e:
            raise StockError(f"{path}, line {line}: cannot read the CSV ({e}); check the quotes "
                             "on this line") from None
        cells = [cell.strip() for cell in cells]
        if not any(cells) or cells[0].startswith("#"):
            continue
        yield line, cells


def load_bin(path: str | os.PathLike) -> StockBin:
    """Read a stock bin file (format in the module docstring).

    Parameters
    ----------
    path : str or os.PathLike
        The CSV file.  Its path, as given, names the bin and starts every error message.

    Returns
    -------
    StockBin
        One item per distinct (value, ratings); rows with qty 0 are left out.

    Raises
    ------
    StockError
        One line naming the file, the line and the field, for a missing or unreadable file,
        an empty file, a header without ``value``, a repeated column, a row with more cells
        than the header, a cell that cannot be read, or a file with no parts.
    """
    name = os.fspath(path)
    if isinstance(name, bytes):
        name = os.fsdecode(name)
    rows = _rows(_read_text(name), name)
    header_line, header = _header(rows, name)

    columns = [_normalize_column(cell) for cell in header]
    if "value" not in columns:
        found = ", ".join(repr(cell) for cell in header if cell) or "none"
        raise StockError(f"{name}, line {header_line}: the header has no 'value' column "
                         f"(columns found: {found}); the first row that is not a comment must "
                         "name the columns, e.g. value,qty,tolerance")
    for i, key in enumerate(columns):
        if key and key in columns[:i]:
            raise StockError(f"{name}, line {header_line}: the header names column "
                             f"{header[i]!r} twice (columns {columns.index(key) + 1} and {i + 1}); "
                             "keep one")

    items: list[StockItem] = []
    seen_row = False
    for line, cells in rows:
        seen_row = True
        where = f"{name}, line {line}"
        if len(cells) > len(header):
            raise StockError(f"{where}: the row has {len(cells)} cells but the header names "
                             f"{len(header)} column{'s' if len(header) > 1 else ''}; remove the "
                             "extra cells, or quote a cell that contains a comma")
        cells += [""] * (len(header) - len(cells))
        row = {}
        extra = []
        for number, (key, title, cell) in enumerate(zip(columns, header, cells), start=1):
            if key in COLUMNS:
                row[key] = cell
            elif cell:
                if not key:
                    raise StockError(f"{where}, column {number}: the cell "
                                     f"{cell!r} is under a column with no name; name the column "
                                     "in the header or remove the cell")
                extra.append((title, cell))
        items_row = _read_row(row, extra, where)
        if items_row is not None:
            items.append(items_row)

    if not seen_row:
        raise StockError(f"{name}: the header is on line {header_line} but no row lists a part; "
                         "add rows such as 4k7,10")
    merged = [item for item in _merge(items) if item.count != 0]
    if not merged:
        raise StockError(f"{name}: every row has qty 0, so the bin holds no parts; "
                         "give a quantity, or leave qty blank for as many as needed")
    return StockBin(tuple(merged), name=name)


def _read_row(row: dict[str, str], extra: list[tuple[str, str]], where: str) -> StockItem:
    def fail(field: str, reason: str) -> StockError:
        return StockError(f"{where}, field '{field}': {reason}")

    text = row.get("value", "")
    if not text:
        raise fail("value", "the value is blank; every row needs a resistance such as 4k7, "
                            "or a # at the start to make it a comment")
    try:
        ohms = values.parse_resistance(text)
    except ValueParseError as e:
        raise fail("value", str(e)) from None
    if problem := _problem_ohms(ohms):
        raise fail("value", f"{text!r} reads as {ohms!r} ohms; {problem}")
    try:
        count = _parse_qty(row.get("qty", ""))
    except ValueParseError as e:
        raise fail("qty", str(e)) from None

    numbers_: dict[str, float] = {}
    for field, (parse, default, check) in _FIELDS.items():
        cell = row.get(field, "")
        if not cell:
            numbers_[field] = default
            continue
        try:
            number = parse(cell)
        except ValueParseError as e:
            raise fail(field, str(e)) from None
        if problem := check(number):
            raise fail(field, f"{cell!r} reads as {number!r}; {problem}")
        numbers_[field] = number

    return StockItem(
        ohms=ohms,
        count=count,
        tolerance=numbers_["tolerance"],
        power_rating_w=numbers_["watts"],
        max_volts=numbers_["max_volts"],
        tcr_ppm=numbers_["tcr"],
        package=row.get("package", ""),
        location=row.get("location", ""),
        note=row.get("note", ""),
        extra=tuple(extra),
    )


# --------------------------------------------------------------------------- writing


def _plain(x: float) -> str:
    """Positional decimal text of a float, without exponent or trailing zeros."""
    return _plain_decimal(Decimal(repr(x)))


def _plain_decimal(d: Decimal) -> str:
    text = format(d, "f")
    if "." in text:
        text = text.rstrip("0").rstrip(".")
    return text


def _exact_text(x: float, shift: int, suffix: str, parse: Callable[[str], float]) -> str:
    """The shortest decimal text t such that ``parse(t + suffix) == x`` exactly.

    ``shift`` moves the decimal point of the stored number to the written one (2 for a
    fraction written in %).  The last candidate is the exact shifted digits of ``repr(x)``,
    which the parsers in ``values`` read back to the same float.
    """
    exact = Decimal(repr(x)).scaleb(shift)
    candidates = [float(f"{exact:.{p}g}") for p in range(1, 18)]
    for candidate in candidates:
        text = _plain(candidate) + suffix
        try:
            if parse(text) == x:
                return text
        except ValueParseError:
            continue
    return _plain_decimal(exact) + suffix


def _value_text(ohms: float) -> str:
    code = values.to_code(ohms)  # documented to read back exactly; checked, as it is cheap
    try:
        if values.parse_resistance(code) == ohms:
            return code
    except ValueParseError:
        pass
    # The RKM code rounds this value: write every digit so the file reads back exactly.
    return _exact_text(ohms, 0, "", values.parse_resistance)


def _row(item: StockItem, extra_names: list[str]) -> list[str]:
    extra = dict(item.extra)
    return [
        _value_text(item.ohms),
        "" if item.count is None else str(item.count),
        _exact_text(item.tolerance, 2, "%", values.parse_tolerance),
        _exact_text(item.power_rating_w, 0, "", values.parse_power),
        _exact_text(item.max_volts, 0, "", values.parse_voltage),
        _exact_text(item.tcr_ppm, 0, "", values.parse_tcr),
        item.package,
        item.location,
        item.note,
        *(extra.get(name, "") for name in extra_names),
    ]


def save_bin(stock: StockBin, path: str | os.PathLike) -> None:
    """Write `stock` as a bin file that :func:`load_bin` reads back equal (apart from the name).

    The file is written to a temporary file in the same folder, flushed to disk with fsync,
    and moved over `path` with ``os.replace``, so a crash or error leaves either the old file
    or the new one, never half of one.  An existing file's permission bits are kept.

    Parameters
    ----------
    stock : StockBin
        The bin.  Values are written as RKM codes (``values.to_code``), or with every digit
        where the code would round; the ratings are written even when they are the defaults.
    path : str or os.PathLike
        The file to create or replace.

    Raises
    ------
    StockError
        If the file cannot be written (the old file, if any, is left as it was).
    """
    name = os.fsdecode(os.fspath(path))
    extra_names: dict[str, None] = {}
    for item in stock.items:
        extra_names.update(dict.fromkeys(n for n, _ in item.extra))
    buffer = io.StringIO(newline="")
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow([*COLUMNS, *extra_names])
    for item in stock.items:
        writer.writerow(_row(item, list(extra_names)))
    data = buffer.getvalue().encode("utf-8")

    folder, base = os.path.split(os.path.abspath(name))
    try:
        mode = stat.S_IMODE(os.stat(name).st_mode)
    except FileNotFoundError:
        mode = None
    except OSError as e:
        raise StockError(f"cannot write {name!r}: {e.strerror or e}") from None
    tmp = None
    try:
        while tmp is None:
            candidate = os.path.join(folder, f".{base}.{secrets.token_hex(4)}.tmp")
            try:
                fd = os.open(candidate, os.O_WRONLY | os.O_CREAT | os.O_EXCL, 0o666)
            except FileExistsError:
                continue
            tmp = candidate
        with os.fdopen(fd, "wb") as f:
            f.write(data)
            f.flush()
            os.fsync(f.fileno())
        if mode is not None:
            os.chmod(tmp, mode)
        os.replace(tmp, name)
        tmp = None
    except OSError as e:
        raise StockError(f"cannot write {name!r}: {e.strerror or e}; check that the folder "
                         "exists and is writable (the old file, if any, is unchanged)") from None
    finally:
        if tmp is not None:
            try:
                os.unlink(tmp)
            except OSError:
                pass  # best effort: the original error is the one to report
    _sync_folder(folder)


def _sync_folder(folder: str) -> None:
    """fsync the folder so the rename itself survives a power cut (POSIX; skipped elsewhere)."""
    try:
        fd = os.open(folder, os.O_RDONLY)
    except OSError:
        return
    try:
        os.fsync(fd)
    except OSError:
        pass  # some file systems refuse fsync on a folder; the data itself is already synced
    finally:
        os.close(fd)


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
