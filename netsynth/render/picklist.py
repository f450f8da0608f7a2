"""The pick list with markings: what to pull from which drawer, and how to recognise each part.

Per stock line: how many, the value, its ratings, where it lives, the bin line, and the marking
printed on the part per IEC 60062 (:mod:`netsynth.markings`), chosen by the line's ``package``:

* **chip** (package text names a chip size or says chip/SMD: ``0603``, ``0805``, ``1206``,
  ``chip``, ``SMD`` ...): the 3- or 4-character digit code (:func:`smd_code`) and, for E96
  values, the EIA-96 code;
* **leaded** (``axial``, ``leaded``, ``through-hole``, ``THT``, ``radial``): the colour bands;
* anything else, a blank package included: both.

The RKM code (``4K7``) is always shown: it is what drawings, labels and larger parts carry.

Which codes, when a value has several
    Colour bands: 4 bands (two digits) for tolerances of ±5 % and wider, 5 bands (three digits)
    for tighter ones, as parts are usually made (common practice, no source; IEC 60062 allows
    either); the other count when the value does not fit the first. Chip digit code: 4
    characters for ±1 % and tighter, 3 for wider (common practice, no source); again the other
    when the value does not fit. A code the value does not have is ``None`` (``-`` on screen,
    blank in CSV, ``null`` in JSON).

Map
---
``PickMarking`` / :func:`pick_marking`   the codes of one stock line, chosen as above
:func:`package_kind`                     ``chip``, ``leaded`` or ``any`` from the package text
:func:`pick_table`                       the on-screen pick list (rows and one marking line each)
:func:`pick_csv`                         the pick list as CSV text (:data:`CSV_COLUMNS`)
"""

from __future__ import annotations

import csv
import io
import math
import re
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Literal

from netsynth.design import PickLine
from netsynth.markings import Marking, marking_of
from netsynth.values import to_code

__all__ = ["CSV_COLUMNS", "PickMarking", "package_kind", "pick_csv", "pick_marking", "pick_table"]

Kind = Literal["chip", "leaded", "any"]

_CHIP = re.compile(r"\b(?:01005|0201|0402|0603|0805|1206|1210|1218|1812|2010|2512|chip|smd|smt|melf)\b", re.I)
_LEADED = re.compile(r"\b(?:axial|leaded|through[- ]?hole|tht|radial)\b", re.I)
#: tolerances from this up get 4 bands (gold ±5 %, silver ±10 %); tighter ones 5 bands
_FOUR_BANDS_FROM = 0.05
#: tolerances up to this get the 4-character chip code
_FOUR_DIGITS_UP_TO = 0.01
_REL = 1e-9  # float noise on a tolerance read from text


def package_kind(package: str) -> Kind:
    """``chip``, ``leaded`` or ``any`` (say nothing, show both) from a bin line's package text.

    >>> [package_kind(p) for p in ("0805", "axial", "cement 5W", "", "1206 thick film", "Axial 1W")]
    ['chip', 'leaded', 'any', 'any', 'chip', 'leaded']
    """
    if _CHIP.search(package):
        return "chip"
    if _LEADED.search(package):
        return "leaded"
    return "any"


@dataclass(frozen=True, slots=True)
class PickMarking:
    """The codes shown for one stock line.

    ``bands`` is 4 or 5 colour names, first band first, or None (no colour code for this
    value and tolerance); ``smd_code`` the chosen 3- or 4-character chip code or None;
    ``eia96`` the EIA-96 code or None; ``kind`` which of them the package calls for.
    """

    kind: Kind
    rkm: str
    bands: tuple[str, ...] | None
    smd_code: str | None
    eia96: str | None
    marking: Marking  #: every code, with the reasons for those that do not exist


def _at_least(x: float, bound: float) -> bool:
    return x > bound or math.isclose(x, bound, rel_tol=_REL)


def pick_marking(ohms: float, tolerance: float, package: str = "") -> PickMarking:
    """The codes of one stock line (see the module docstring for which are chosen).

    Examples
    --------
    >>> m = pick_marking(4700.0, 0.05, "axial")
    >>> m.rkm, m.bands, m.smd_code, m.eia96
    ('4K7', ('yellow', 'violet', 'red', 'gold'), '472', None)
    >>> pick_marking(4990.0, 0.001, "0805").smd_code, pick_marking(4990.0, 0.001, "0805").eia96
    ('4991', '68B')
    """
    m = marking_of(ohms, tolerance)
    if _at_least(tolerance, _FOUR_BANDS_FROM):
        bands = m.bands4 or m.bands5
    else:
        bands = m.bands5 or m.bands4
    if tolerance < _FOUR_DIGITS_UP_TO or math.isclose(tolerance, _FOUR_DIGITS_UP_TO, rel_tol=_REL):
        smd = m.smd4 or m.smd3
    else:
        smd = m.smd3 or m.smd4
    return PickMarking(package_kind(package), m.rkm, bands, smd, m.eia96, m)


def _marking_text(pm: PickMarking) -> str:
    parts = [f"marked {pm.rkm}"]
    if pm.kind in ("leaded", "any"):
        parts.append("bands " + ("-".join(pm.bands) if pm.bands else "none (" + _why_no_bands(pm) + ")"))
    if pm.kind in ("chip", "any"):
        parts.append("chip " + (pm.smd_code or "-") + (f", EIA-96 {pm.eia96}" if pm.eia96 else ""))
    return "; ".join(parts)


def _why_no_bands(pm: PickMarking) -> str:
    note = next((n for n in pm.marking.notes if n.startswith("4 bands: ")), "")
    return note.removeprefix("4 bands: ") or "no colour code"


def _watts_text(w: float) -> str:
    return {0.125: "⅛ W", 0.25: "¼ W", 0.5: "½ W"}.get(w, f"{w:g} W")


def pick_table(picks: Sequence[PickLine]) -> list[tuple[tuple[str, ...], str]]:
    """On-screen rows: (count, value, tolerance, power, voltage, location, bin line) and the marking line."""
    out = []
    for p in picks:
        cells = (f"{p.count} ×", to_code(p.ohms), f"±{p.line.tolerance * 100:g} %", _watts_text(p.line.power_rating_w),
                 f"{p.line.max_volts:g} V", p.location or "-", f"line {p.line.line}")
        out.append((cells, _marking_text(pick_marking(p.ohms, p.line.tolerance, p.line.package))))
    return out


#: the columns of :func:`pick_csv`, in order
CSV_COLUMNS = ("qty", "value", "ohms", "tolerance", "watts", "max_volts", "tcr_ppm", "package", "location",
               "bin_line", "rkm", "bands", "smd_code", "eia96")


def pick_csv(picks: Sequence[PickLine]) -> str:
    """The pick list as CSV text: a header (:data:`CSV_COLUMNS`) and one row per stock line.

    ``bands`` are joined with ``-`` (``yellow-violet-red-gold``); a code the value does not have
    is a blank cell. Every code is written whatever the package; the package is a column.
    """
    buffer = io.StringIO(newline="")
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(CSV_COLUMNS)
    for p in picks:
        line = p.line
        pm = pick_marking(p.ohms, line.tolerance, line.package)
        writer.writerow([p.count, to_code(p.ohms), repr(p.ohms), f"{line.tolerance * 100:g}%", f"{line.power_rating_w:g}",
                         f"{line.max_volts:g}", f"{line.tcr_ppm:g}", line.package, line.location, line.line, pm.rkm,
                         "-".join(pm.bands) if pm.bands else "", pm.smd_code or "", pm.eia96 or ""])
    return buffer.getvalue()
