"""Bin files: read a stock bin from CSV (:func:`load_bin`) and write one back (:func:`save_bin`).

Both are re-exported by :mod:`netsynth.stock`, the public home of the bin API; the data types
(:class:`~netsynth.stock.items.StockItem`, :class:`~netsynth.stock.items.StockBin`), the
defaults and the merge rule live in :mod:`netsynth.stock.items`, the only module of the
package this one imports.

Map of the module
-----------------
``load_bin``   read a bin file (format below); every problem is one ``StockError`` line
``save_bin``   write the same format atomically (temp file in the same folder, fsync, replace)

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
max_temp    upper category temperature in °C, where derating reaches zero power, e.g.
            ``155``, ``155C``, ``155 °C``, ``125°C``; above 70; blank = 155
package     free text (``0805``, ``axial``)
location    free text (``drawer A3``)
note        free text
measured    an individually measured part's own value, e.g. ``4.6982k``; see below
uncertainty that measurement's uncertainty, e.g. ``0.01%``, ``50ppm``; required with ``measured``
(others)    kept in ``StockItem.extra`` and otherwise ignored
==========  ==============================================================================

* **Measured parts.** A row with a ``measured`` value is one part whose value is known: its
  ``qty`` must be 1 (blank counts as 1), and ``uncertainty`` is required.  The item's ``ohms``
  is the measured value and its ``tolerance`` the uncertainty, so the search, the bands and
  the pick list use what the part really is; the marked value (``value``) is kept in
  ``StockItem.extra`` as ``("nominal", text)``, which ``save_bin`` writes as a ``nominal``
  column (a file that has its own ``nominal`` column cannot use ``measured``).  The row's
  ``tolerance`` cell, the maker's band around the marked value, no longer applies and is
  ignored.  Two measured rows of the same value and ratings merge as any other rows do.

* A line whose first cell starts with ``#`` is a comment; comments may come before the header.
  Fully blank lines (also ``,,,``) are skipped.
* A row may have fewer cells than the header (the missing cells are blank) but not more.
* Rows with ``qty`` 0 are read and checked but kept out of the bin: a labelled but empty
  drawer is a useful line in the file, yet nothing in it can go into a network.  Because of
  this, ``save_bin(load_bin(f))`` drops such rows.
* Rows with the same value **and** the same ratings (tolerance, watts, max_volts, tcr,
  max_temp) are the same part and are merged on purpose: quantities are summed (a blank qty
  on any of them makes the merged line unlimited), and the text fields (package, location,
  note and extra columns) keep each distinct non-blank text, joined with ``"; "`` in file
  order.  Rows with the same value but different ratings stay separate items: they are
  different parts.
* Each item remembers where it came from: ``StockItem.line`` is the file's line number
  (1-based, counting every physical line, comments and blank lines included) of the first row
  merged into it (for a row whose quoted cell spans lines, the line the row starts on).  It is
  not a column: ``save_bin`` does not write it, and a saved file numbers its own lines.
* ``save_bin`` writes every column of :data:`~netsynth.stock.COLUMNS` except ``max_temp``,
  which it writes only when some line differs from the default (155 °C); a bin that never
  used the column saves exactly as before the column existed.
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
import io
import os
import re
from collections.abc import Callable, Iterable
from decimal import Decimal

from netsynth import limits, values
from netsynth.atomic import csv_rows, write_atomic
from netsynth.errors import StockError, ValueParseError
from netsynth.stock.items import (
    COLUMNS,
    DEFAULT_MAX_TEMP_C,
    DEFAULT_MAX_VOLTS,
    DEFAULT_POWER_W,
    DEFAULT_TCR_PPM,
    DEFAULT_TOLERANCE,
    StockBin,
    StockItem,
    _merge,
    _normalize_column,
    _problem_max_temp,
    _problem_ohms,
    _problem_power,
    _problem_tcr,
    _problem_tolerance,
    _problem_volts,
)

__all__ = ["MEASURED_COLUMNS", "load_bin", "save_bin"]

#: columns read only by ``load_bin``: an individually measured part (see the module docstring)
MEASURED_COLUMNS = ("measured", "uncertainty")
#: the extra column that keeps a measured part's marked value
NOMINAL_COLUMN = "nominal"


# --------------------------------------------------------------------------- reading


def _shown(path: str) -> str:
    """The path for a message: whole unless absurdly long, else its last 160 characters (the file's own name)."""
    if len(path) <= 160 and path.isprintable():
        return path
    flat = " ".join("".join(c if c.isprintable() else " " for c in path[-1000:]).split())
    return flat if len(flat) <= 160 else "..." + flat[-157:]


def _read_text(path: str) -> str:
    """The file's text, read with a size cap (limits.MAX_BIN_BYTES).

    At most cap + 1 bytes are read, so an endless device (``/dev/zero``) or pipe is refused,
    never read to the end. The file is opened without blocking (a FIFO nobody writes to then
    reads as empty instead of hanging), and then read blocking as usual.
    """
    shown = _shown(path)
    try:
        fd = os.open(path, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0) | getattr(os, "O_BINARY", 0))
        with os.fdopen(fd, "rb") as f:
            if hasattr(os, "set_blocking"):
                os.set_blocking(fd, True)
            data = f.read(limits.MAX_BIN_BYTES + 1)
    except ValueError:  # a NUL character: no file can have that name
        raise StockError(f"cannot open '{shown}': a file name cannot contain a NUL character") from None
    except FileNotFoundError:
        raise StockError(f"cannot open '{shown}': no such file; check the path, "
                         "or leave the bin out to use the built-in default") from None
    except IsADirectoryError:
        raise StockError(f"cannot open '{shown}': it is a folder; give the path of a bin file (.csv)") from None
    except PermissionError:
        raise StockError(f"cannot open '{shown}': permission denied; check the file's permissions") from None
    except OSError as e:
        raise StockError(f"cannot open '{shown}': {e.strerror or limits.excerpt(str(e))}") from None
    if len(data) > limits.MAX_BIN_BYTES:
        raise StockError(f"{shown}: the file is larger than {limits.MAX_BIN_BYTES // 2**20} MiB, the most a bin "
                         "file may hold (is it a bin file?)")
    try:
        text = data.decode("utf-8-sig")
    except UnicodeDecodeError as e:
        line = data[: e.start].count(b"\n") + 1
        raise StockError(f"{shown}, line {line}: byte 0x{data[e.start]:02x} is not UTF-8 text; "
                         "save the file as UTF-8 (CSV UTF-8 in a spreadsheet)") from None
    for number, physical in enumerate(text.split("\n"), start=1):
        if len(physical) > limits.MAX_BIN_LINE_CHARS:
            raise StockError(f"{shown}, line {number}: the line has {len(physical)} characters; a bin line "
                             f"holds at most {limits.MAX_BIN_LINE_CHARS}")
    return text


def _parse_qty(text: str) -> int | None:
    if not text:
        return None
    if not re.fullmatch(r"\+?[0-9]+", text):
        raise ValueParseError(f"cannot read '{limits.excerpt(text)}': expected a whole number of parts, "
                              "or blank for as many as needed")
    if len(text.lstrip("+0")) > len(str(limits.MAX_QTY)) or int(text) > limits.MAX_QTY:
        raise ValueParseError(f"cannot read '{limits.excerpt(text)}': a line holds at most {limits.MAX_QTY} "
                              "parts; leave qty blank for as many as needed")
    return int(text)


# A number of degrees Celsius, with or without the unit: 155, 155C, 155 °C, 125°C, 125 ℃.
_TEMP_RE = re.compile(r"(?P<num>[+-]?(?:\d+\.?\d*|\.\d+))\s*(?:°\s*[Cc]|\u2103|[Cc])?")


def _parse_temp_c(text: str) -> float:
    """Read a temperature in °C (``155``, ``155C``, ``155 °C``, ``125°C``); range checked apart."""
    s = text.strip()
    m = _TEMP_RE.fullmatch(s) if len(s) <= limits.MAX_VALUE_CHARS else None
    if not m:
        raise ValueParseError(f"cannot read '{limits.excerpt(s)}': expected a temperature in °C such as 155, "
                              "155C or 125 °C")
    return float(m["num"])


# field -> (parser of a non-blank cell, default for a blank cell, range check)
_FIELDS: dict[str, tuple[Callable[[str], float], float, Callable[[float], str | None]]] = {
    "tolerance": (values.parse_tolerance, DEFAULT_TOLERANCE, _problem_tolerance),
    "watts": (values.parse_power, DEFAULT_POWER_W, _problem_power),
    "max_volts": (values.parse_voltage, DEFAULT_MAX_VOLTS, _problem_volts),
    "tcr": (values.parse_tcr, DEFAULT_TCR_PPM, _problem_tcr),
    "max_temp": (_parse_temp_c, DEFAULT_MAX_TEMP_C, _problem_max_temp),
}


def _header(rows: Iterable[tuple[int, list[str]]], path: str) -> tuple[int, list[str]]:
    """The first row that is not a comment or blank, as (line, cells)."""
    for line, cells in rows:
        return line, cells
    raise StockError(f"{path}: the file has no header row (it is empty, or only comments and "
                     "blank lines); start it with a header such as value,qty,tolerance")


def _rows(text: str, path: str) -> Iterable[tuple[int, list[str]]]:
    """(first line number, stripped cells) of each row that is not a comment or blank."""
    return csv_rows(text, path, error=StockError)


def load_bin(path: str | os.PathLike) -> StockBin:
    """Read a stock bin file (format in the module docstring).

    Parameters
    ----------
    path : str or os.PathLike
        The CSV file.  Its path, as given, names the bin and starts every error message.

    Returns
    -------
    StockBin
        One item per distinct (value, ratings); rows with qty 0 are left out.  Each item's
        ``line`` is the line number of the first row merged into it.

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
    shown = _shown(name)
    rows = _rows(_read_text(name), shown)
    header_line, header = _header(rows, shown)

    if len(header) > limits.MAX_BIN_COLUMNS:
        raise StockError(f"{shown}, line {header_line}: the header names {len(header)} columns; a bin file "
                         f"has at most {limits.MAX_BIN_COLUMNS}")
    columns = [_normalize_column(cell) for cell in header]
    if "value" not in columns:
        found = limits.excerpt(", ".join(repr(cell) for cell in header if cell) or "none", 60)
        raise StockError(f"{shown}, line {header_line}: the header has no 'value' column "
                         f"(columns found: {found}); the first row that is not a comment must "
                         "name the columns, e.g. value,qty,tolerance")
    first_of: dict[str, int] = {}
    for i, key in enumerate(columns):
        if key and key in first_of:
            raise StockError(f"{shown}, line {header_line}: the header names column "
                             f"'{limits.excerpt(header[i])}' twice (columns {first_of[key] + 1} and {i + 1}); "
                             "keep one")
        first_of.setdefault(key, i)

    items: list[StockItem] = []
    seen_row = False
    for line, cells in rows:
        seen_row = True
        if len(items) >= limits.MAX_BIN_ROWS:
            raise StockError(f"{shown}, line {line}: the file lists more than {limits.MAX_BIN_ROWS} rows, the most "
                             "a bin file may hold; split it")
        where = f"{shown}, line {line}"
        if len(cells) > len(header):
            raise StockError(f"{where}: the row has {len(cells)} cells but the header names "
                             f"{len(header)} column{'s' if len(header) > 1 else ''}; remove the "
                             "extra cells, or quote a cell that contains a comma")
        cells += [""] * (len(header) - len(cells))
        row = {}
        extra = []
        for number, (key, title, cell) in enumerate(zip(columns, header, cells), start=1):
            if key in COLUMNS or key in MEASURED_COLUMNS:
                row[key] = cell
            elif cell:
                if not key:
                    raise StockError(f"{where}, column {number}: the cell "
                                     f"'{limits.excerpt(cell)}' is under a column with no name; name the column "
                                     "in the header or remove the cell")
                extra.append((title, cell))
        items.append(_read_row(row, extra, where, line))

    if not seen_row:
        raise StockError(f"{shown}: the header is on line {header_line} but no row lists a part; "
                         "add rows such as 4k7,10")
    merged = [item for item in _merge(items) if item.count != 0]
    if not merged:
        raise StockError(f"{shown}: every row has qty 0, so the bin holds no parts; "
                         "give a quantity, or leave qty blank for as many as needed")
    return StockBin(tuple(merged), name=name)


def _read_row(row: dict[str, str], extra: list[tuple[str, str]], where: str, line: int) -> StockItem:
    def fail(field: str, reason: str) -> StockError:
        return StockError(f"{where}, field '{field}': {reason}")

    text = row.get("value", "")
    if not text:
        raise fail("value", "the value is blank; every row needs a resistance such as 4k7, "
                            "or a # at the start to make it a comment")
    ohms = _read_ohms(text, "value", fail)
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
            raise fail(field, f"'{limits.excerpt(cell)}' reads as {number!r}; {problem}")
        numbers_[field] = number

    tolerance = numbers_["tolerance"]
    measured = _read_measured(row, fail)
    if measured is not None:
        if count not in (None, 1):
            raise fail("qty", f"a measured part is one part: qty must be 1 or blank, not {count}; list each "
                              "measured part on its own row")
        if any(_normalize_column(name) == NOMINAL_COLUMN for name, _ in extra):
            raise fail("measured", f"the file has its own {NOMINAL_COLUMN!r} column, where a measured part keeps "
                                   "its marked value; rename that column")
        count = 1
        ohms, tolerance = measured
        extra = [*extra, (NOMINAL_COLUMN, text)]
    return StockItem(
        ohms=ohms,
        count=count,
        tolerance=tolerance,
        power_rating_w=numbers_["watts"],
        max_volts=numbers_["max_volts"],
        tcr_ppm=numbers_["tcr"],
        max_temp_c=numbers_["max_temp"],
        package=row.get("package", ""),
        location=row.get("location", ""),
        note=row.get("note", ""),
        extra=tuple(extra),
        line=line,
    )


def _read_ohms(text: str, field: str, fail: Callable[[str, str], StockError]) -> float:
    """The resistance in a cell, within the accepted range, or the row's error naming ``field``."""
    try:
        ohms = values.parse_resistance(text)
    except ValueParseError as e:
        raise fail(field, str(e)) from None
    if problem := _problem_ohms(ohms):
        raise fail(field, f"'{limits.excerpt(text)}' reads as {ohms!r} ohms; {problem}")
    return ohms


def _read_measured(row: dict[str, str], fail: Callable[[str, str], StockError]) -> tuple[float, float] | None:
    """(measured ohms, uncertainty) of a row with a ``measured`` cell, else None."""
    text, unc = row.get("measured", ""), row.get("uncertainty", "")
    if not text:
        if unc:
            raise fail("uncertainty", "an uncertainty belongs to a measured value; fill in 'measured' or "
                                      "clear the cell")
        return None
    ohms = _read_ohms(text, "measured", fail)
    if not unc:
        raise fail("uncertainty", "a measured value needs its measurement uncertainty, such as 0.01% or 50ppm")
    try:
        uncertainty = values.parse_tolerance(unc)
    except ValueParseError as e:
        raise fail("uncertainty", str(e)) from None
    if problem := _problem_tolerance(uncertainty):
        raise fail("uncertainty", f"{unc!r} reads as {uncertainty!r}; {problem}")
    return ohms, uncertainty


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


def _row(item: StockItem, columns: Iterable[str], extra_names: list[str]) -> list[str]:
    own = {
        "value": _value_text(item.ohms),
        "qty": "" if item.count is None else str(item.count),
        "tolerance": _exact_text(item.tolerance, 2, "%", values.parse_tolerance),
        "watts": _exact_text(item.power_rating_w, 0, "", values.parse_power),
        "max_volts": _exact_text(item.max_volts, 0, "", values.parse_voltage),
        "tcr": _exact_text(item.tcr_ppm, 0, "", values.parse_tcr),
        "max_temp": _exact_text(item.max_temp_c, 0, "", _parse_temp_c),
        "package": item.package,
        "location": item.location,
        "note": item.note,
    }
    extra = dict(item.extra)
    return [*(own[column] for column in columns), *(extra.get(name, "") for name in extra_names)]


def _columns(stock: StockBin) -> tuple[str, ...]:
    """:data:`COLUMNS`, without ``max_temp`` when every line has the default (blank reads so)."""
    if any(item.max_temp_c != DEFAULT_MAX_TEMP_C for item in stock.items):
        return COLUMNS
    return tuple(column for column in COLUMNS if column != "max_temp")


def save_bin(stock: StockBin, path: str | os.PathLike) -> None:
    """Write `stock` as a bin file that :func:`load_bin` reads back equal (apart from the name).

    The file is written to a temporary file in the same folder, flushed to disk with fsync,
    and moved over `path` with ``os.replace``, so a crash or error leaves either the old file
    or the new one, never half of one.  An existing file's permission bits are kept.

    Parameters
    ----------
    stock : StockBin
        The bin.  Values are written as RKM codes (``values.to_code``), or with every digit
        where the code would round; the ratings are written even when they are the defaults,
        except ``max_temp``, written only when some line differs from 155 °C.
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
    columns = _columns(stock)
    writer.writerow([*columns, *extra_names])
    for item in stock.items:
        writer.writerow(_row(item, columns, list(extra_names)))
    data = buffer.getvalue().encode("utf-8")

    write_atomic(name, data, error=StockError)
