"""The needs file: the resistances a board needs, one per row.

Format
------
A CSV file (UTF-8; a byte-order mark is tolerated) with a header row. Columns come in any order
and are matched without regard to case or surrounding spaces; unknown columns are ignored; a line
whose first cell starts with ``#`` is a comment; blank lines are skipped.

==========  ==============================================================================
column      meaning
==========  ==============================================================================
ref         required; the board's reference for the part, e.g. ``R7`` (unique in the file)
target      required; the resistance, any spelling ``values.parse_resistance`` reads: 3k37
within      the accuracy the network must meet, e.g. ``0.1%`` or ``50ppm``; blank: ±1 %
volts       optional operating point: the voltage across the network (``24``, ``1kV``) ...
amps        ... or the current through it (``2``, ``150mA``) ...
watts       ... or the power it dissipates (``0.5``, ``1/4W``); at most one of the three
==========  ==============================================================================

Every problem raises one line naming the file, the line and the field, e.g.
``needs.csv, line 4, field 'target': cannot read '3k3k': ...``: an unreadable value is a
:class:`~netsynth.errors.ValueParseError`, a file that cannot be used as a whole (missing, no
header, a missing column, a repeated reference) an :class:`~netsynth.errors.ArgumentError`.
"""

from __future__ import annotations

import os
from collections.abc import Iterable
from dataclasses import dataclass

from netsynth import limits
from netsynth.analysis.conditions import DEFAULT_AMBIENT_C, OperatingPoint
from netsynth.atomic import csv_rows, read_capped, utf8_text
from netsynth.errors import ArgumentError, ValueParseError
from netsynth.values import parse_current, parse_power, parse_ratio, parse_resistance, parse_voltage

#: accuracy of a need whose ``within`` cell is blank (fraction)
DEFAULT_WITHIN = 0.01
COLUMNS = ("ref", "target", "within", "volts", "amps", "watts")


@dataclass(frozen=True, slots=True)
class Need:
    """One resistance the board needs.

    Parameters
    ----------
    ref : str
        The board's reference, e.g. ``R7``.
    target_ohms : float
        The value, ohms.
    within : float
        The accuracy the network must meet, a fraction (0.01 = ±1 %).
    point : OperatingPoint or None
        What the network sees; with it, every part must stay within its derated limits.
    line : int
        The needs file's line number (0 when built in code).
    """

    ref: str
    target_ohms: float
    within: float = DEFAULT_WITHIN
    point: OperatingPoint | None = None
    line: int = 0

    def __post_init__(self) -> None:
        if not isinstance(self.ref, str) or not self.ref.strip():
            raise ArgumentError(f"ref={self.ref!r}: a need has a reference such as R7")
        if not (isinstance(self.target_ohms, (int, float)) and 0 < self.target_ohms < float("inf")):
            raise ArgumentError(f"target_ohms={self.target_ohms!r}: a target is a finite resistance above zero")
        if not (isinstance(self.within, (int, float)) and 0 <= self.within < 1):
            raise ArgumentError(f"within={self.within!r}: an accuracy is a fraction from 0 to below 1 (0.01 = 1 %)")


def load_needs(path: str | os.PathLike, ambient_c: float = DEFAULT_AMBIENT_C) -> tuple[Need, ...]:
    """Read a needs file (format in the module docstring).

    Parameters
    ----------
    path : the CSV file; its path, as given, starts every error message
    ambient_c : the air temperature (°C) of every need's operating point

    Returns
    -------
    tuple of Need
        In the file's order.

    Raises
    ------
    ArgumentError
        The file is missing or unreadable, has no header, lacks ``ref`` or ``target``, repeats a
        column or a reference, has more cells than the header, or lists no need.
    ValueParseError
        A cell cannot be read (named by file, line and field).
    """
    name = os.fsdecode(os.fspath(path))
    rows = _rows(_read_text(name), name)
    header_line, header = next(rows, (0, []))
    if not header:
        raise ArgumentError(f"{name}: the file has no header row; start it with a header such as ref,target,within")
    columns = [cell.strip().lower() for cell in header]
    for required in ("ref", "target"):
        if required not in columns:
            raise ArgumentError(f"{name}, line {header_line}: the header has no {required!r} column (columns found: "
                                f"{', '.join(repr(c) for c in header if c) or 'none'}); a needs file starts "
                                "with a header such as ref,target,within,watts")
    for i, key in enumerate(columns):
        if key and key in columns[:i]:
            raise ArgumentError(f"{name}, line {header_line}: the header names column {header[i]!r} twice; keep one")
    needs: list[Need] = []
    seen: dict[str, int] = {}
    for line, cells in rows:
        where = f"{name}, line {line}"
        if len(cells) > len(header):
            raise ArgumentError(f"{where}: the row has {len(cells)} cells but the header names {len(header)} "
                                "columns; remove the extra cells")
        row = dict(zip(columns, cells + [""] * (len(header) - len(cells))))
        need = _need(row, where, line, ambient_c)
        if need.ref in seen:
            raise ArgumentError(f"{where}, field 'ref': {need.ref!r} is already listed on line {seen[need.ref]}; "
                                "give each need its own reference")
        seen[need.ref] = line
        needs.append(need)
    if not needs:
        raise ArgumentError(f"{name}: the header is on line {header_line} but no row lists a need; "
                            "add rows such as R7,3k37,0.1%")
    return tuple(needs)


def _need(row: dict[str, str], where: str, line: int, ambient_c: float) -> Need:
    def fail(field: str, reason: str) -> ValueParseError:
        return ValueParseError(f"{where}, field '{field}': {reason}")

    ref = row.get("ref", "")
    if not ref:
        raise fail("ref", "the reference is blank; give each need a reference such as R7")
    text = row.get("target", "")
    if not text:
        raise fail("target", "the target is blank; give a resistance such as 3k37")
    try:
        target = parse_resistance(text)
    except ValueParseError as e:
        raise fail("target", str(e)) from None
    if not 0 < target < float("inf"):
        raise fail("target", f"{text!r} reads as {target!r} ohms; a target is a finite resistance above zero")
    within = DEFAULT_WITHIN
    if row.get("within", ""):
        try:
            within = parse_ratio(row["within"])
        except ValueParseError as e:
            raise fail("within", str(e)) from None
        if not 0 <= within < 1:
            raise fail("within", f"{row['within']!r}: an accuracy is below 100 %, such as 0.1%")
    drive = {}
    for field, parse in (("volts", parse_voltage), ("amps", parse_current), ("watts", parse_power)):
        if row.get(field, ""):
            try:
                drive[field] = parse(row[field])
            except ValueParseError as e:
                raise fail(field, str(e)) from None
            if not 0 < drive[field] < float("inf"):
                raise fail(field, f"{row[field]!r}: give a finite value above zero")
    if len(drive) > 1:
        raise fail(", ".join(drive), "give at most one of volts, amps or watts for a need")
    point = OperatingPoint(**drive, ambient_c=ambient_c) if drive else None
    return Need(ref, target, within, point, line)


def _read_text(path: str) -> str:
    return utf8_text(read_capped(path, limits.MAX_BIN_BYTES, error=ArgumentError, what="needs file"), path,
                     error=ArgumentError)


def _rows(text: str, path: str) -> Iterable[tuple[int, list[str]]]:
    """(line number, stripped cells) of each row that is not a comment or blank."""
    return csv_rows(text, path, error=ArgumentError)
