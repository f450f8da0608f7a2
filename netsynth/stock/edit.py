"""Edit a bin file in place of the user's hand: take parts out, add stock; safely, as text.

A bin file is the user's document: comments, column order, spelling of values, extra columns
and blank lines are theirs. So this module never re-writes the file from a parsed bin (as
:func:`netsynth.stock.save_bin` does); it edits the TEXT:

* a take or an add changes only the ``qty`` cell of the rows it touches (the cell's own
  surrounding spaces kept), and
* an add of a part no row describes appends one row at the end of the file,

so every other byte of the file stays as it was. Before anything is planned the whole file is
read with :func:`netsynth.stock.load_bin`, so a bad file is refused with the same one-line
message (file, line, field) as everywhere else; each row is then read on its own with the same
reader to know which part it describes.

Map of the module
-----------------
``Change`` / ``BinEdit``       one row's quantity before and after; a planned edit of one file
:func:`plan_take`               take counts of stock lines (from ``load_bin``) out of the file
:func:`file_rows`               every row as the part it describes, empty rows included
:func:`plan_add`                add parts of one value and ratings (to a row or a new row)
:func:`apply_edit`              write the planned text: backup, temp file, fsync, rename
:func:`backup_path`             where the previous version goes: ``FILE.bak``
:func:`same_part`               two lines or rows of the same value and ratings

Which rows a stock line is
    A stock line of a loaded bin may merge several rows (same value and ratings; see
    :mod:`netsynth.stock.binfile`). A take draws from those rows in file order, each down to 0;
    rows with a blank ``qty`` (as many as needed) are never changed. An add goes to the first
    row with the same value and ratings, a row with ``qty`` 0 included (a labelled, empty
    drawer), unless that row's qty is blank (then nothing needs writing).

Writing (:func:`apply_edit`)
    1. the file is read again and compared with the text the plan was made from (someone
       else's edit in between is refused, not overwritten);
    2. the previous version is written to ``FILE.bak`` (temp file, fsync, rename);
    3. the new text is written to a temporary file in the same folder, flushed with fsync,
       given the old file's permission bits, and renamed over ``FILE`` (``os.replace``,
       atomic on POSIX and Windows for files on one volume); the folder is fsynced.

    A process killed at any moment leaves ``FILE`` either as it was or as planned, never
    half-written (tests/test_bin_edit.py kills writers at random moments). A kill between
    the temp file's creation and the rename can leave a stray ``.FILE.<hex>.tmp`` beside it,
    which is safe to delete.
"""

from __future__ import annotations

import csv
import dataclasses
import io
import math
import os
import re
import stat
from collections.abc import Mapping
from dataclasses import dataclass

from netsynth import values
from netsynth.atomic import write_atomic
from netsynth.errors import StockError
from netsynth.stock.binfile import _exact_text, _read_row, _value_text, load_bin
from netsynth.stock.items import (
    COLUMNS,
    DEFAULT_MAX_TEMP_C,
    DEFAULT_MAX_VOLTS,
    DEFAULT_POWER_W,
    DEFAULT_TCR_PPM,
    DEFAULT_TOLERANCE,
    StockItem,
    _normalize_column,
    _ratings,
    _value_key,
)

__all__ = ["BACKUP_SUFFIX", "BinEdit", "Change", "apply_edit", "backup_path", "file_rows", "plan_add", "plan_take", "same_part"]

#: appended to the file's name for the previous version (``drawer.csv`` -> ``drawer.csv.bak``)
BACKUP_SUFFIX = ".bak"


@dataclass(frozen=True, slots=True)
class Change:
    """One row of the file and its quantity before and after the edit.

    ``line`` is the file's line number of the row (for an appended row, the line it will be on);
    ``before`` is None for an appended row; ``item`` is the part the row describes (its
    ``count`` is the new quantity).
    """

    line: int
    before: int | None
    after: int
    item: StockItem

    @property
    def appended(self) -> bool:
        return self.before is None


@dataclass(frozen=True, slots=True)
class BinEdit:
    """A planned edit: the file's text now and after, and the rows that change."""

    path: str
    old_text: str
    new_text: str
    changes: tuple[Change, ...]

    @property
    def changed(self) -> bool:
        return self.old_text != self.new_text


@dataclass(frozen=True, slots=True)
class _Row:
    """One data row: where its text is, its cells' spans, and the part it describes."""

    first: int  #: index of its first physical line in the list of lines
    last: int  #: index of its last physical line
    item: StockItem  #: as binfile reads the row alone (count = the row's own qty)


def backup_path(path: str | os.PathLike) -> str:
    """Where :func:`apply_edit` keeps the previous version: the file's name plus ``.bak``."""
    return os.fsdecode(os.fspath(path)) + BACKUP_SUFFIX


def _key(item: StockItem) -> tuple:
    """The merge key of :mod:`netsynth.stock.items`: value and ratings, to 12 digits."""
    return (_value_key(item.ohms), *(_value_key(r) for r in _ratings(item)))


def same_part(a: StockItem, b: StockItem) -> bool:
    """Whether two stock lines (or rows) are the same part: the same value and ratings.

    >>> same_part(StockItem(4700.0, 3, location="A"), StockItem(4700.0, 9, location="B"))
    True
    >>> same_part(StockItem(4700.0, 3), StockItem(4700.0, 3, tolerance=0.05))
    False
    """
    return _key(a) == _key(b)


def _physical_lines(text: str) -> list[str]:
    """The file's lines with their endings, split where the CSV reader splits (\\r\\n, \\r, \\n)."""
    return re.findall(r"[^\r\n]*(?:\r\n|\r|\n)|[^\r\n]+$", text)


def _parse(name: str, text: str) -> tuple[list[str], list[str], int | None, list[_Row]]:
    """(physical lines, header cells, qty column index, data rows) of a bin file's text."""
    lines = _physical_lines(text)
    body = text[1:] if text.startswith("\ufeff") else text
    reader = csv.reader(io.StringIO(body, newline=""), strict=True)
    header: list[str] | None = None
    columns: list[str] = []
    rows: list[_Row] = []
    while True:
        first = reader.line_num  # 0-based index of the row's first physical line
        try:
            cells = next(reader)
        except StopIteration:
            break
        except csv.Error as e:
            raise StockError(f"{name}, line {first + 1}: cannot read the CSV ({e})") from None
        last = reader.line_num - 1
        stripped = [c.strip() for c in cells]
        if not any(stripped) or stripped[0].startswith("#"):
            continue
        if header is None:
            header, columns = stripped, [_normalize_column(c) for c in stripped]
            if "value" not in columns:
                raise StockError(f"{name}, line {first + 1}: the header has no 'value' column")
            continue
        if len(stripped) > len(columns):
            raise StockError(f"{name}, line {first + 1}: the row has more cells than the header names")
        stripped += [""] * (len(columns) - len(stripped))
        own = {k: c for k, c in zip(columns, stripped) if k in COLUMNS}
        extra = [(title, c) for k, title, c in zip(columns, header, stripped) if k not in COLUMNS and c]
        item = _read_row(own, extra, f"{name}, line {first + 1}", first + 1)
        rows.append(_Row(first, last, item))
    if header is None:
        raise StockError(f"{name}: the file has no header row")
    qty = columns.index("qty") if "qty" in columns else None
    return lines, header, qty, rows


def _read(path: str | os.PathLike) -> tuple[str, str, list[str], list[str], int | None, list[_Row]]:
    """(name, text, physical lines, header cells, qty column index, rows) of a valid bin file.

    Valid means :func:`load_bin` reads it, or (after taking the last parts) every row reads
    and holds 0 parts, which ``load_bin`` refuses as a bin but is still a file to add to.
    """
    name = os.fsdecode(os.fspath(path))
    try:
        load_bin(name)
        empty = False
    except StockError:
        empty = True  # decided below: a bad file re-raises load_bin's own message
    try:
        with open(name, "rb") as f:
            text = f.read().decode("utf-8")
        lines, header, qty, rows = _parse(name, text)
    except (OSError, UnicodeDecodeError, StockError):
        if empty:
            load_bin(name)  # raises the usual message
        raise
    if empty and not (rows and all(r.item.count == 0 for r in rows)):
        load_bin(name)  # raises the usual message
    return name, text, lines, header, qty, rows


def _checked(edit: BinEdit) -> BinEdit:
    """The edit, after reading its new text back: each changed row holds what the change says."""
    _, _, _, rows = _parse(edit.path, edit.new_text)
    held = {r.first + 1: r.item.count for r in rows}
    for change in edit.changes:
        if held.get(change.line) != change.after:
            raise StockError(f"{edit.path}, line {change.line}: the edited row does not read back as "
                             f"{change.after} parts; nothing was written (please report this)")
    return edit


def file_rows(path: str | os.PathLike) -> tuple[StockItem, ...]:
    """Every data row of a bin file as the part it describes, in file order, ``qty`` 0 rows included.

    Each item's ``count`` is the row's own quantity and ``line`` its line number. (``load_bin``
    merges rows and leaves out empty ones; an add must still find an empty drawer's row.)
    """
    return tuple(r.item for r in _read(path)[5])


def _spans(raw: str) -> list[tuple[int, int]]:
    """(start, end) of each cell of one CSV row's text (no line ending), quotes included."""
    spans, start, quoted, i = [], 0, False, 0
    while i < len(raw):
        c = raw[i]
        if quoted:
            if c == '"':
                if raw[i + 1:i + 2] == '"':
                    i += 1
                else:
                    quoted = False
        elif c == '"':
            quoted = True
        elif c == ",":
            spans.append((start, i))
            start = i + 1
        i += 1
    spans.append((start, len(raw)))
    return spans


def _ending(line: str) -> tuple[str, str]:
    """A physical line split into (text, line ending)."""
    body = line.rstrip("\r\n")
    return body, line[len(body):]


def _set_qty(lines: list[str], row: _Row, qty_col: int, qty: int, name: str) -> None:
    """Write `qty` into the row's qty cell, leaving every other byte of its line as it was."""
    if row.first != row.last:
        raise StockError(f"{name}, line {row.first + 1}: a quoted cell of this row spans several lines; "
                         "netsynth edits such rows only by hand (put the cell on one line)")
    body, end = _ending(lines[row.first])
    spans = _spans(body)
    if qty_col >= len(spans):  # a short row: add the missing cells
        body += "," * (qty_col - len(spans) + 1) + str(qty)
    else:
        start, stop = spans[qty_col]
        cell = body[start:stop]
        inner = cell.strip()
        lead = cell[: len(cell) - len(cell.lstrip())]
        trail = cell[len(cell.rstrip()):]
        if inner and not inner.strip('"').strip().lstrip("+").isdigit():
            raise StockError(f"{name}, line {row.first + 1}, field 'qty': cannot edit {inner!r} safely")
        body = body[:start] + lead + str(qty) + trail + body[stop:]
    lines[row.first] = body + end


def _describe(item: StockItem) -> str:
    where = f" at {item.location}" if item.location else ""
    return (f"{values.to_code(item.ohms)} ±{item.tolerance * 100:g} % {item.power_rating_w:g} W"
            f"{where}")


def plan_take(path: str | os.PathLike, counts: Mapping[StockItem, int]) -> BinEdit:
    """Plan taking ``counts[line]`` parts of each stock line out of the bin file at `path`.

    Parameters
    ----------
    path : str or os.PathLike
        The bin file; it is read, never written (see :func:`apply_edit`).
    counts : mapping of StockItem to int
        Stock lines of ``load_bin(path)`` (matched by value and ratings) and how many parts of
        each to take (1 or more).

    Returns
    -------
    BinEdit
        The new text and one :class:`Change` per row whose quantity changes; rows with a blank
        qty (as many as needed) give parts without changing.

    Raises
    ------
    StockError
        If the file is not a valid bin, no row of the file is that stock line, or the rows of a
        line hold fewer parts than asked (naming the line, what it holds and what is asked):
        the file never goes negative.
    """
    name, text, lines, _, qty_col, rows = _read(path)
    changes: list[Change] = []
    for line, need in counts.items():
        if isinstance(need, bool) or not isinstance(need, int) or need < 1:
            raise StockError(f"take {need!r} of {_describe(line)}: a count is a whole number, 1 or more")
        mine = [r for r in rows if _key(r.item) == _key(line)]
        if not mine:
            raise StockError(f"{name}: no row holds {_describe(line)}; take parts only from lines of this file")
        if any(r.item.count is None for r in mine):
            continue  # as many as needed: nothing to count down
        held = sum(r.item.count for r in mine)  # type: ignore[misc]
        if held < need:
            raise StockError(f"{name}, line {mine[0].first + 1}: {_describe(line)} holds {held}, the network "
                             f"takes {need}; nothing was changed (top the line up with 'netsynth bin add')")
        assert qty_col is not None  # a finite count comes from a qty column
        left = need
        for r in mine:
            if left == 0:
                break
            before = r.item.count
            take = min(before, left)  # type: ignore[type-var]
            if take == 0:
                continue
            left -= take
            _set_qty(lines, r, qty_col, before - take, name)
            changes.append(Change(r.first + 1, before, before - take,
                                  _with_count(r.item, before - take)))
    changes.sort(key=lambda c: c.line)
    return _checked(BinEdit(name, text, "".join(lines), tuple(changes)))


def _with_count(item: StockItem, count: int) -> StockItem:
    return dataclasses.replace(item, count=count)


def _cell_text(column: str, item: StockItem) -> str:
    """The text of `column` for a new row of `item` (values written so they read back exactly)."""
    own = {
        "value": _value_text(item.ohms),
        "qty": str(item.count),
        "tolerance": _exact_text(item.tolerance, 2, "%", values.parse_tolerance),
        "watts": _exact_text(item.power_rating_w, 0, "", values.parse_power),
        "max_volts": _exact_text(item.max_volts, 0, "", values.parse_voltage),
        "tcr": _exact_text(item.tcr_ppm, 0, "", values.parse_tcr),
        "max_temp": _exact_text(item.max_temp_c, 0, "", float),
        "package": item.package,
        "location": item.location,
        "note": item.note,
    }
    return own.get(column, "")


#: column -> (StockItem field, default): a rating that differs from its default needs its column
_RATED = {
    "tolerance": ("tolerance", DEFAULT_TOLERANCE),
    "watts": ("power_rating_w", DEFAULT_POWER_W),
    "max_volts": ("max_volts", DEFAULT_MAX_VOLTS),
    "tcr": ("tcr_ppm", DEFAULT_TCR_PPM),
    "max_temp": ("max_temp_c", DEFAULT_MAX_TEMP_C),
}


def plan_add(path: str | os.PathLike, item: StockItem) -> BinEdit:
    """Plan adding ``item.count`` parts of ``item``'s value and ratings to the bin file at `path`.

    The parts go to the first row with the same value and ratings (its qty grows; a row with a
    blank qty already holds as many as needed and is left alone); when no row has them, one row
    is appended at the end of the file, its cells in the header's order (columns netsynth does
    not know are left blank). Text fields (package, location, note) only matter for a new row.

    Raises
    ------
    StockError
        If the file is not a valid bin, has no ``qty`` column, ``item.count`` is not 1 or more,
        or a rating differs from its default but the file has no column to write it in.
    """
    if item.count is None or item.count < 1:
        raise StockError(f"add {item.count!r} parts: give a whole number of parts, 1 or more")
    name, text, lines, header, qty_col, rows = _read(path)
    if qty_col is None:
        raise StockError(f"{name}: the header has no 'qty' column, so every line holds as many as needed; "
                         "add a qty column to count parts")
    mine = [r for r in rows if _key(r.item) == _key(item)]
    if mine:
        r = mine[0]
        before = r.item.count
        if before is None:
            return BinEdit(name, text, text, ())
        _set_qty(lines, r, qty_col, before + item.count, name)
        change = Change(r.first + 1, before, before + item.count, _with_count(r.item, before + item.count))
        return _checked(BinEdit(name, text, "".join(lines), (change,)))
    columns = [_normalize_column(c) for c in header]
    for column, (field, default) in _RATED.items():
        value = getattr(item, field)
        if column not in columns and not math.isclose(value, default, rel_tol=1e-12):
            raise StockError(f"{name}: the header has no '{column}' column for the new line's "
                             f"{column} ({value:g}); add the column to the header first")
    for column in ("package", "location", "note"):
        if column not in columns and getattr(item, column):
            raise StockError(f"{name}: the header has no '{column}' column for the new line's "
                             f"{column} ({getattr(item, column)!r}); add the column to the header first")
    buffer = io.StringIO(newline="")
    newline = "\r\n" if lines and lines[0].endswith("\r\n") else "\n"
    csv.writer(buffer, lineterminator=newline).writerow([_cell_text(c, item) for c in columns])
    body = "".join(lines)
    if body and not body.endswith(("\n", "\r")):
        body += newline
    new_line = body.count("\n") + 1 if body else 1
    new_text = body + buffer.getvalue()
    appended = Change(new_line, None, item.count, item)
    return _checked(BinEdit(name, text, new_text, (appended,)))


# --------------------------------------------------------------------------- writing


def apply_edit(edit: BinEdit, backup: bool = True) -> str | None:
    """Write a planned edit (see the module docstring for the steps); return the backup's path.

    Nothing is written when the edit changes nothing (None is returned).

    Raises
    ------
    StockError
        If the file changed since the edit was planned (nothing is written then), or a write
        fails (the file is left as it was).
    """
    if not edit.changed:
        return None
    name = edit.path
    try:
        with open(name, "rb") as f:
            current = f.read()
        mode = stat.S_IMODE(os.stat(name).st_mode)
    except OSError as e:
        raise StockError(f"cannot read {name!r}: {e.strerror or e}") from None
    if current != edit.old_text.encode("utf-8"):
        raise StockError(f"{name} changed since netsynth read it; nothing was written, run the command again")
    saved = None
    if backup:
        saved = backup_path(name)
        write_atomic(saved, current, mode, error=StockError)
    write_atomic(name, edit.new_text.encode("utf-8"), mode, error=StockError)
    return saved

