"""Tests for netsynth.stock: bin files in and out, merge rules, kits and the default bin.

Expected numbers come from outside the project: resistance codes from IEC 60062 (RKM code
and tolerance letters), series values and counts from IEC 60063 (as tabulated in the
Wikipedia article "E series of preferred numbers"), SI prefixes from the SI Brochure
(BIPM, 9th ed., Table 7).  None is produced by running netsynth.
"""

from __future__ import annotations

import dataclasses
import os
import stat
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from netsynth.errors import StockError
from netsynth.stock import binfile
from netsynth.stock import (
    COLUMNS,
    DEFAULT_MAX_TEMP_C,
    DEFAULT_MAX_VOLTS,
    DEFAULT_POWER_W,
    DEFAULT_TCR_PPM,
    DEFAULT_TOLERANCE,
    StockBin,
    StockItem,
    bin_from_values,
    default_bin,
    kit_bin,
    load_bin,
    save_bin,
)

BINS = Path(__file__).resolve().parent.parent / "bins"
D = (DEFAULT_TOLERANCE, DEFAULT_POWER_W, DEFAULT_MAX_VOLTS, DEFAULT_TCR_PPM)


# IEC 60063 E192 mantissas, as tabulated in the Wikipedia article "E series of preferred
# numbers" (which cites IEC 60063); note 920, the table's value where the formula gives 919.
E192 = frozenset(int(x) for x in """
100 101 102 104 105 106 107 109 110 111 113 114 115 117 118 120 121 123 124 126 127 129 130 132
133 135 137 138 140 142 143 145 147 149 150 152 154 156 158 160 162 164 165 167 169 172 174 176
178 180 182 184 187 189 191 193 196 198 200 203 205 208 210 213 215 218 221 223 226 229 232 234
237 240 243 246 249 252 255 258 261 264 267 271 274 277 280 284 287 291 294 298 301 305 309 312
316 320 324 328 332 336 340 344 348 352 357 361 365 370 374 379 383 388 392 397 402 407 412 417
422 427 432 437 442 448 453 459 464 470 475 481 487 493 499 505 511 517 523 530 536 542 549 556
562 569 576 583 590 597 604 612 619 626 634 642 649 657 665 673 681 690 698 706 715 723 732 741
750 759 768 777 787 796 806 816 825 835 845 856 866 876 887 898 909 920 931 942 953 965 976 988
""".split())


def write(tmp_path: Path, content: str | bytes, name: str = "shop.csv") -> Path:
    path = tmp_path / name
    if isinstance(content, bytes):
        path.write_bytes(content)
    else:
        path.write_text(content, encoding="utf-8", newline="")
    return path


def summary(b: StockBin) -> list[tuple]:
    """(ohms, count, tolerance, watts, volts, tcr) of each item, in bin order."""
    return [(i.ohms, i.count, i.tolerance, i.power_rating_w, i.max_volts, i.tcr_ppm) for i in b.items]


# --------------------------------------------------------------------------- good files

GOOD_FILES = [
    # IEC 60062 RKM: 4K7 = 4.7 kΩ; no qty column means as many as needed; defaults apply
    ("minimal", "value\n4k7\n", [(4700.0, None, *D)]),
    # columns in any order, any case, spaces around names and cells; 5 % = 0.05
    ("any order", " QTY , Value ,Tolerance\n10, 4k7 , 5%\n", [(4700.0, 10, 0.05, *D[1:])]),
    # a UTF-8 byte-order mark (as spreadsheets write) is tolerated; IEC 60062: 470R = 470 Ω
    ("bom", "\ufeffvalue,qty\n470R,3\n", [(470.0, 3, *D)]),
    # comments before the header and between rows, blank and all-empty lines skipped
    ("comments", "# my bench\n\nvalue,qty\n# drawer A\n,\n1k,2\n\n", [(1000.0, 2, *D)]),
    # CRLF line endings, as written on Windows
    ("crlf", "value,qty\r\n1k,2\r\n", [(1000.0, 2, *D)]),
    # a row may be shorter than the header: missing cells are blank (defaults)
    ("short row", "value,qty,tolerance\n1k\n", [(1000.0, None, *D)]),
    # IEC 60062 tolerance letter F = ±1 %, B = ±0.1 %
    ("letters", "value,tolerance\n1k,F\n2k,B\n", [(1000.0, None, 0.01, *D[1:]), (2000.0, None, 0.001, *D[1:])]),
    # watts as a fraction (1/4 W = 0.25 W) and with the SI prefix m (250 mW = 0.25 W)
    ("watts", "value,watts\n1k,1/4W\n2k,250mW\n3k,2\n",
     [(1000.0, None, 0.01, 0.25, 200.0, 100.0), (2000.0, None, 0.01, 0.25, 200.0, 100.0),
      (3000.0, None, 0.01, 2.0, 200.0, 100.0)]),
    # SI prefix k: 1 kV = 1000 V; TCR in ppm/K with and without the unit
    ("volts tcr", "value,max_volts,tcr\n1k,1kV,50ppm\n2k,350,25\n",
     [(1000.0, None, 0.01, 0.25, 1000.0, 50.0), (2000.0, None, 0.01, 0.25, 350.0, 25.0)]),
    # header names with a space or hyphen for the underscore, any case
    ("header spellings", "Value,Max Volts,TCR\n1k,100V,10\n", [(1000.0, None, 0.01, 0.25, 100.0, 10.0)]),
    # IEC 60062 RKM below 1 Ω: R47 = 0.47 Ω; SI prefix m: 10m = 0.01 Ω; M = mega
    ("small and large", "value\n1M\nR47\n10m\n", [(0.01, None, *D), (0.47, None, *D), (1e6, None, *D)]),
    # items come out sorted by value whatever the file order
    ("sorted", "value,qty\n10k,1\n100,2\n1k,3\n", [(100.0, 2, *D), (1000.0, 3, *D), (10000.0, 1, *D)]),
    # a qty of 0 keeps the row out of the bin; the other rows stay
    ("qty zero", "value,qty\n1k,0\n2k,4\n", [(2000.0, 4, *D)]),
    # tolerance 0 % is allowed (a part measured and sorted by the user)
    ("zero tolerance", "value,tolerance\n1k,0%\n", [(1000.0, None, 0.0, *D[1:])]),
    # a quoted comma belongs to the cell, not the column count
    ("quoted comma", 'value,note\n1k,"red, blue"\n', [(1000.0, None, *D)]),
    # a quoted cell may span lines
    ("multi-line cell", 'value,note\n1k,"first\nsecond"\n2k,x\n', [(1000.0, None, *D), (2000.0, None, *D)]),
]


@pytest.mark.parametrize("content, expected", [c[1:] for c in GOOD_FILES], ids=[c[0] for c in GOOD_FILES])
def test_good_files(tmp_path: Path, content: str, expected: list[tuple]) -> None:
    path = write(tmp_path, content)
    b = load_bin(path)
    assert summary(b) == expected
    assert b.name == str(path)


def test_text_and_extra_columns(tmp_path: Path) -> None:
    # Unknown columns are kept (sorted by name) and text cells are stored stripped.
    path = write(tmp_path, 'value,Lot,package,location,note,Supplier\n1k, L42 ,0805,drawer A3,"red, blue",\n')
    (item,) = load_bin(path).items
    assert (item.package, item.location, item.note) == ("0805", "drawer A3", "red, blue")
    assert item.extra == (("Lot", "L42"),)  # the blank Supplier cell is not kept


def test_path_like_and_str(tmp_path: Path) -> None:
    path = write(tmp_path, "value\n1k\n")
    assert load_bin(path) == load_bin(str(path))


# --------------------------------------------------------------------------- bad files

# (id, content, line, field or None, fragment of the reason)
BAD_FILES = [
    # the example in the specification: a word where a count belongs, on line 7
    ("qty word", "# c\nvalue,qty\n1k,1\n2k,2\n3k,3\n# c\n4k7,ten\n", 7, "qty",
     "cannot read 'ten': expected a whole number of parts, or blank for as many as needed"),
    # a negative count
    ("qty negative", "value,qty\n1k,-3\n", 2, "qty", "cannot read '-3': expected a whole number"),
    # a count with a fraction
    ("qty fraction", "value,qty\n1k,2.5\n", 2, "qty", "cannot read '2.5'"),
    # a row with cells but no value
    ("value blank", "value,qty\n,5\n", 2, "value", "the value is blank"),
    # two multiplier letters: IEC 60062 RKM has one letter
    ("value garbage", "value\n4k7k\n", 2, "value", "cannot read '4k7k'"),
    # a quoted decimal comma: values.py refuses it and says why; the reason is passed on
    ("decimal comma", 'value\n"4,7k"\n', 2, "value", "use a point for decimals (4.7k) or the RKM code (4k7)"),
    # zero ohms is a jumper, not a resistor
    ("value zero", "value\n0R\n", 2, "value", "greater than zero"),
    # a bare number is ambiguous as a tolerance (fraction or percent)
    ("tolerance bare", "value,tolerance\n1k,1\n", 2, "tolerance", "add % or ppm"),
    # 100 % and above is not a tolerance
    ("tolerance 150%", "value,tolerance\n1k,150%\n", 2, "tolerance", "below 100 %"),
    # a word for a power rating
    ("watts word", "value,watts\n1k,lots\n", 2, "watts", "cannot read 'lots'"),
    # zero watts
    ("watts zero", "value,watts\n1k,0\n", 2, "watts", "greater than zero"),
    # amperes in the volts column
    ("volts unit", "value,max_volts\n1k,200A\n", 2, "max_volts", "cannot read '200A'"),
    # a word for a TCR
    ("tcr word", "value,tcr\n1k,fifty\n", 2, "tcr", "cannot read 'fifty'"),
    # an unquoted decimal comma splits one cell into two: more cells than the header
    ("too many cells", "value,qty\n4,7k,2\n", 2, None, "the row has 3 cells but the header names 2 columns"),
    # no value column
    ("no value column", "part,qty\n1k,2\n", 1, None, "the header has no 'value' column (columns found: 'part', 'qty')"),
    # the header is the first line that is not a comment
    ("header after comment", "# c\nqty\n2\n", 2, None, "the header has no 'value' column"),
    # the same column twice, in different case
    ("duplicate column", "value,qty,QTY\n1k,1,2\n", 1, None, "the header names column 'QTY' twice (columns 2 and 3)"),
    # a cell under a column with no name
    ("unnamed column", "value,\n1k,x\n", 2, None, "column 2: the cell 'x' is under a column with no name"),
    # bytes that are not UTF-8 (Latin-1 'µ')
    ("not utf-8", b"value\n1k\n4\xb5\n", 3, None, "byte 0xb5 is not UTF-8 text"),
    # an unclosed quote
    ("open quote", 'value,note\n1k,"abc\n', 2, None, "cannot read the CSV"),
    # a word for a temperature
    ("max_temp word", "value,max_temp\n1k,hot\n", 2, "max_temp", "cannot read 'hot': expected a temperature in °C"),
    # kelvin is not read: the column is in °C
    ("max_temp kelvin", "value,max_temp\n1k,428K\n", 2, "max_temp", "cannot read '428K'"),
    # exactly the 70 °C rated ambient (IEC 60115-1): derating could not reach zero above it
    ("max_temp 70", "value,max_temp\n1k,70\n", 2, "max_temp", "'70' reads as 70.0; an upper category temperature"),
    # a lower category temperature (−55 °C in the Vishay D/CRCW datasheet) in the wrong column
    ("max_temp negative", "value,qty,max_temp\n1k,1,155\n2k,1,-55 °C\n", 3, "max_temp", "above the 70 °C rated ambient"),
    # room temperature is below the rated ambient
    ("max_temp 25", "value,max_temp\n1k,25C\n", 2, "max_temp", "such as 155"),
]


@pytest.mark.parametrize("content, line, field, reason", [c[1:] for c in BAD_FILES], ids=[c[0] for c in BAD_FILES])
def test_bad_files(tmp_path: Path, content: str | bytes, line: int, field: str | None, reason: str) -> None:
    path = write(tmp_path, content)
    with pytest.raises(StockError) as info:
        load_bin(path)
    message = str(info.value)
    where = f"{path}, line {line}" + (f", field '{field}': " if field else "")
    assert message.startswith(where), message
    assert reason in message
    assert "\n" not in message


def test_spec_message_exactly(tmp_path: Path) -> None:
    # The whole line, as written in the specification of the bin format.
    path = write(tmp_path, "value,qty\n1k,1\n2k,2\n3k,3\n4k,4\n5k,5\n4k7,ten\n")
    with pytest.raises(StockError) as info:
        load_bin(path)
    assert str(info.value) == (f"{path}, line 7, field 'qty': cannot read 'ten': expected a whole "
                               "number of parts, or blank for as many as needed")


# (id, content, fragment) for problems of the whole file, which have no line
FILE_PROBLEMS = [
    ("empty", "", "the file has no header row"),  # zero bytes
    ("only comments", "# nothing here\n\n# yet\n", "the file has no header row"),
    ("header only", "value,qty\n# none yet\n", "the header is on line 1 but no row lists a part"),
    ("all qty zero", "value,qty\n1k,0\n2k,0\n", "every row has qty 0, so the bin holds no parts"),
]


@pytest.mark.parametrize("content, fragment", [c[1:] for c in FILE_PROBLEMS], ids=[c[0] for c in FILE_PROBLEMS])
def test_file_problems(tmp_path: Path, content: str, fragment: str) -> None:
    path = write(tmp_path, content)
    with pytest.raises(StockError) as info:
        load_bin(path)
    assert str(info.value).startswith(f"{path}: ")
    assert fragment in str(info.value)
    assert "\n" not in str(info.value)


def test_missing_file(tmp_path: Path) -> None:
    with pytest.raises(StockError, match=r"cannot open '.*nope\.csv': no such file"):
        load_bin(tmp_path / "nope.csv")


def test_folder_instead_of_file(tmp_path: Path) -> None:
    with pytest.raises(StockError, match="it is a folder"):
        load_bin(tmp_path)


# --------------------------------------------------------------------------- merge rules

MERGES = [
    # same value, same ratings: one part; counts summed, locations joined in file order
    ("summed", "value,qty,location\n1k,2,A1\n1k,3,B2\n", [(1000.0, 5, "A1; B2")]),
    # IEC 60062: 4k7, 4.7k and 4700 are one value, so one part
    ("spellings", "value,qty\n4k7,1\n4.7k,2\n4700,3\n", [(4700.0, 6, "")]),
    # a blank qty on any row makes the merged part unlimited
    ("blank wins", "value,qty\n1k,2\n1k,\n", [(1000.0, None, "")]),
    # a qty-0 row adds nothing but does not hide the others
    ("zero plus three", "value,qty,location\n1k,0,A1\n1k,3,B2\n", [(1000.0, 3, "A1; B2")]),
    # the same location twice is written once
    ("same location", "value,qty,location\n1k,1,A1\n1k,1,A1\n", [(1000.0, 2, "A1")]),
    # different tolerance: different parts, kept apart
    ("tolerance differs", "value,qty,tolerance\n1k,1,1%\n1k,2,5%\n", [(1000.0, 1, ""), (1000.0, 2, "")]),
    # different power rating: different parts
    ("watts differ", "value,qty,watts\n1k,1,0.25\n1k,2,1W\n", [(1000.0, 1, ""), (1000.0, 2, "")]),
    # different voltage limit: different parts
    ("volts differ", "value,qty,max_volts\n1k,1,200\n1k,2,500\n", [(1000.0, 1, ""), (1000.0, 2, "")]),
    # different TCR: different parts (sorted by rating: 25 ppm/K before 100 ppm/K)
    ("tcr differs", "value,qty,tcr\n1k,1,100\n1k,2,25\n", [(1000.0, 2, ""), (1000.0, 1, "")]),
    # a rating written two ways (IEC 60062: F = 1 %) is the same rating
    ("same rating two spellings", "value,qty,tolerance\n1k,1,F\n1k,2,1%\n", [(1000.0, 3, "")]),
    # different upper category temperature (155 °C thick film, 125 °C thin film, Vishay
    # D/CRCW and TNPW datasheets): different parts, 125 sorts first
    ("max_temp differs", "value,qty,max_temp\n1k,1,155\n1k,2,125\n", [(1000.0, 2, ""), (1000.0, 1, "")]),
    # the same temperature written three ways is the same rating
    ("max_temp spellings", "value,qty,max_temp\n1k,1,155\n1k,2,155C\n1k,3,155 °C\n", [(1000.0, 6, "")]),
    # a blank cell is the 155 °C default, so it merges with an explicit 155
    ("max_temp blank is 155", "value,qty,max_temp\n1k,1,\n1k,2,155\n", [(1000.0, 3, "")]),
]


@pytest.mark.parametrize("content, expected", [c[1:] for c in MERGES], ids=[c[0] for c in MERGES])
def test_merge_rules(tmp_path: Path, content: str, expected: list[tuple]) -> None:
    b = load_bin(write(tmp_path, content))
    assert [(i.ohms, i.count, i.location) for i in b.items] == expected


def test_merge_joins_text_and_extra(tmp_path: Path) -> None:
    content = ("value,qty,package,note,lot\n"
               "1k,1,0805,new,L1\n"
               "1k,2,0805,old,L2\n"
               "1k,3,,new,\n")
    (item,) = load_bin(write(tmp_path, content)).items
    assert (item.count, item.package, item.note, item.extra) == (6, "0805", "new; old", (("lot", "L1; L2"),))


def test_different_ratings_order_is_stable(tmp_path: Path) -> None:
    # Same value, different ratings: two items, ordered by ratings (tolerance first).
    b = load_bin(write(tmp_path, "value,tolerance\n1k,5%\n1k,1%\n"))
    assert [i.tolerance for i in b.items] == [0.01, 0.05]
    assert b.item_for(1000.0).tolerance == 0.01  # the first item with that value


# --------------------------------------------------------------------------- round trip


def crafted_bin() -> StockBin:
    return StockBin((
        StockItem(4700.0, 10, 0.05, 0.25, 250.0, 500.0, "axial", "drawer A3", "carbon film"),
        StockItem(4700.0, None, 0.001, 0.125, 150.0, 25.0, "0805", "strip 1", ""),
        StockItem(0.01, 3, 0.07, 5.0, 350.0, 250.0, "", "", 'note with "quotes", comma'),
        StockItem(2.2e9, 1, 0.0025, 0.5, 1500.0, 0.0, extra=(("lot", "L1"), ("bin", "B7"))),
        StockItem(1234.5678, 0, 0.0, 1 / 3, 12.5, 5e-3, note="count 0 items can be built in code"),
        StockItem(0.47, 7, 5e-5, 3.0, 1e4, 15.0, extra=(("Supplier", "a; b"),)),
    ), name="crafted")


def test_round_trip_crafted(tmp_path: Path) -> None:
    b = crafted_bin()
    b = StockBin(tuple(i for i in b.items if i.count != 0), name=b.name)  # qty 0 is dropped on load
    path = tmp_path / "out.csv"
    save_bin(b, path)
    assert load_bin(path) == StockBin(b.items, name=str(path))


def test_round_trip_drops_qty_zero(tmp_path: Path) -> None:
    path = tmp_path / "out.csv"
    save_bin(crafted_bin(), path)
    assert 1234.5678 not in load_bin(path).values
    assert len(load_bin(path)) == len(crafted_bin()) - 1


@pytest.mark.parametrize("make", [
    default_bin,  # 121 E24 values
    lambda: kit_bin("E192", 1.0, 10e6, count=5),  # every three-digit value, seven decades
    lambda: kit_bin("E12", 0.1, 1e9),  # sub-ohm to giga codes
    lambda: load_bin(BINS / "makerspace-drawer.csv"),
    lambda: load_bin(BINS / "precision-kit.csv"),
    lambda: load_bin(BINS / "power-shelf.csv"),
], ids=["default", "E192 kit", "E12 wide kit", "makerspace", "precision", "power shelf"])
def test_round_trip_bins(tmp_path: Path, make) -> None:
    b = make()
    path = tmp_path / "out.csv"
    save_bin(b, path)
    assert load_bin(path).items == b.items


def test_saved_format(tmp_path: Path) -> None:
    # The header and RKM codes a person sees (IEC 60062: 4K7, 0R47; 1 % written as 1%).
    path = tmp_path / "out.csv"
    save_bin(StockBin((StockItem(4700.0, 10), StockItem(0.47, None, 0.05, 1.0, 500.0, 250.0, location="A1"))), path)
    assert path.read_text(encoding="utf-8") == (
        "value,qty,tolerance,watts,max_volts,tcr,package,location,note\n"
        "0R47,,5%,1,500,250,,A1,\n"
        "4k7,10,1%,0.25,200,100,,,\n"
    )


items = st.builds(
    StockItem,
    ohms=st.floats(1e-3, 1e12),
    count=st.none() | st.integers(1, 10**6),
    tolerance=st.just(0.0) | st.floats(1e-12, 0.99),  # 0, or within netsynth.limits
    power_rating_w=st.floats(1e-3, 1e4),
    max_volts=st.floats(1e-1, 1e5),
    tcr_ppm=st.just(0.0) | st.floats(1e-6, 1e4),  # 0, or within netsynth.limits
    package=st.sampled_from(["", "0805", "axial"]),
    note=st.text(st.characters(codec="utf-8", exclude_categories=("Cs", "Cc", "Zs", "Zl", "Zp")), max_size=8),
)


@settings(max_examples=60, deadline=None)
@given(st.lists(items, min_size=1, max_size=6))
def test_round_trip_property(tmp_path_factory, parts: list[StockItem]) -> None:
    # Any bin without duplicates (which load merges) reads back equal.
    b = StockBin(tuple(parts))
    # duplicates as load's merge rule sees them: equal to 12 significant digits (float noise is one value)
    keys = [tuple(f"{x:.12g}" for x in (i.ohms, i.tolerance, i.power_rating_w, i.max_volts, i.tcr_ppm, i.max_temp_c))
            for i in b.items]
    if len(set(keys)) != len(keys):
        return
    path = tmp_path_factory.mktemp("rt") / "out.csv"
    save_bin(b, path)
    assert load_bin(path).items == b.items


# --------------------------------------------------------------------------- atomic save


@pytest.mark.parametrize("target", [
    "fsync",  # fails after the data is written to the temp file
    "replace",  # fails at the very last step
    "chmod",  # fails while copying the old file's permissions
])
def test_atomic_save_failure_leaves_original(tmp_path: Path, monkeypatch, target: str) -> None:
    path = write(tmp_path, "value,qty\n1k,1\n", "bin.csv")
    original = path.read_bytes()

    def boom(*args, **kwargs):
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(binfile.os, target, boom)
    with pytest.raises(StockError, match="cannot write .*No space left on device"):
        save_bin(default_bin(), path)
    monkeypatch.undo()
    assert path.read_bytes() == original
    assert sorted(os.listdir(tmp_path)) == ["bin.csv"]  # no temp file left behind


def test_save_creates_and_replaces(tmp_path: Path) -> None:
    path = tmp_path / "bin.csv"
    save_bin(bin_from_values([100.0]), path)
    save_bin(bin_from_values([200.0]), path)
    assert load_bin(path).values == (200.0,)
    assert sorted(os.listdir(tmp_path)) == ["bin.csv"]


@pytest.mark.skipif(os.name != "posix", reason="permission bits are POSIX")
def test_save_keeps_permissions(tmp_path: Path) -> None:
    path = write(tmp_path, "value\n1k\n", "bin.csv")
    path.chmod(0o640)
    save_bin(bin_from_values([200.0]), path)
    assert stat.S_IMODE(path.stat().st_mode) == 0o640


def test_save_into_missing_folder(tmp_path: Path) -> None:
    with pytest.raises(StockError, match="cannot write"):
        save_bin(default_bin(), tmp_path / "no" / "such" / "bin.csv")


# --------------------------------------------------------------------------- kits


KITS = [
    # IEC 60063: 24 per decade × 7 decades (1 Ω..9.1 MΩ) + 10 MΩ
    ("E24", 1.0, 10e6, 169),
    # IEC 60063: 24 per decade × 5 decades + 1 MΩ
    ("E24", 10.0, 1e6, 121),
    # IEC 60063: 12 per decade × 1 decade + 1 kΩ
    ("E12", 100.0, 1000.0, 13),
    # IEC 60063: E96 has 96 per decade, + the next decade's 100
    ("E96", 100.0, 1000.0, 97),
    # IEC 60063: E192 has 192 per decade, + 1 kΩ
    ("E192", 100.0, 1000.0, 193),
    # IEC 60063 E3 = 1.0, 2.2, 4.7: 10, 22, 47 Ω only between 5 and 50 Ω
    ("E3", 5.0, 50.0, 3),
]


@pytest.mark.parametrize("series, low, high, n", KITS)
def test_kit_sizes(series: str, low: float, high: float, n: int) -> None:
    assert len(kit_bin(series, low, high)) == n


def test_kit_values_e12() -> None:
    # IEC 60063 E12: 1.0 1.2 1.5 1.8 2.2 2.7 3.3 3.9 4.7 5.6 6.8 8.2
    assert kit_bin("E12", 100, 1000).values == (
        100.0, 120.0, 150.0, 180.0, 220.0, 270.0, 330.0, 390.0, 470.0, 560.0, 680.0, 820.0, 1000.0)


# The series picks the values only; the parts keep the default bin's grade, 1 % (metal film,
# Yageo MFR datasheet), even where IEC 60063 practice sells the series at 5 % (E24), 10 % (E12)
# or 20 % (E6) (Wikipedia "E series of preferred numbers").
KIT_TOLERANCES = [
    ("E24", {}, 0.01),  # sold at 5 %: still 1 %
    ("E12", {"count": 2}, 0.01),  # sold at 10 %, and a quantity given: still 1 %
    ("E6", {}, 0.01),  # sold at 20 %
    ("E3", {}, 0.01),  # IEC 60063 gives E3 no tolerance (">20 %")
    ("E96", {}, 0.01),  # sold at 1 %
    ("E24", {"tolerance": 0.05}, 0.05),  # an explicit tolerance is used as given
    ("E192", {"tolerance": 0.001}, 0.001),  # 0.1 %, IEC 60062 letter B
]


@pytest.mark.parametrize("series, kwargs, expected", KIT_TOLERANCES)
def test_kit_tolerance(series: str, kwargs: dict, expected: float) -> None:
    b = kit_bin(series, 10, 100, **kwargs)
    assert {i.tolerance for i in b.items} == {expected}


def test_kit_name_states_tolerance_and_power() -> None:
    # IEC 60063 E12 holds 1.0 and its decades, so 100 Ω and 10 kΩ are both ends (SI prefix k =
    # 10^3, SI Brochure Table 7); 1 % ¼ W are the default bin's ratings (Yageo MFR-25 datasheet).
    assert kit_bin("E12", 100, 10_000).name == "kit E12 100 Ω..10 kΩ, 1 % ¼ W, unlimited"
    # what the caller gives is what the name says: 5 % ½ W, 2 of each
    assert kit_bin("E12", 100, 10_000, count=2, tolerance=0.05, power_rating_w=0.5).name == (
        "kit E12 100 Ω..10 kΩ, 5 % ½ W, 2 each")


def test_kit_ratings_and_count() -> None:
    b = kit_bin("E6", 1000, 10000, count=3, power_rating_w=0.125, max_volts=150.0)
    assert set(b.counts) == {3}
    assert {(i.power_rating_w, i.max_volts, i.tcr_ppm) for i in b.items} == {(0.125, 150.0, DEFAULT_TCR_PPM)}
    assert b.name.startswith("kit E6 1 kΩ..10 kΩ")
    # ±25 ppm/K, a thin-film grade (Vishay TNPW datasheet)
    assert {i.tcr_ppm for i in kit_bin("E6", 1000, 10000, tcr_ppm=25.0).items} == {25.0}


@pytest.mark.parametrize("series, low, high", [
    ("E3", 5.0, 9.0),  # IEC 60063 E3 = 1.0, 2.2, 4.7: nothing between 4.7 and 10 Ω
    ("E24", 5.2, 5.5),  # IEC 60063 E24 has 5.1 then 5.6: nothing in between
])
def test_kit_empty_range(series: str, low: float, high: float) -> None:
    with pytest.raises(StockError, match="holds no value of the series; widen the range"):
        kit_bin(series, low, high)


def test_default_bin() -> None:
    b = default_bin()
    assert len(b) == 121  # IEC 60063: E24, 24 per decade × 5 decades + 1 MΩ
    assert b.values[0] == 10.0 and b.values[-1] == 1e6
    assert 910_000.0 in b.values and 8200.0 in b.values  # E24 9.1 and 8.2 (IEC 60063)
    assert set(b.counts) == {None}
    assert {(i.tolerance, i.power_rating_w, i.max_volts, i.tcr_ppm) for i in b.items} == {(0.01, 0.25, 200.0, 100.0)}
    assert b.name == "default: E24 10 Ω..1 MΩ, 1 % ¼ W, unlimited"


# --------------------------------------------------------------------------- data classes

BAD_ITEMS = [
    ({"ohms": 0.0}, "ohms"),  # zero is a jumper
    ({"ohms": -10.0}, "ohms"),  # negative
    ({"ohms": float("nan")}, "ohms"),  # not a number
    ({"ohms": float("inf")}, "ohms"),  # open circuit
    ({"ohms": True}, "ohms"),  # a bool is not a resistance
    ({"ohms": 1.0, "count": -1}, "count"),  # negative count
    ({"ohms": 1.0, "count": 2.5}, "count"),  # fractional count
    ({"ohms": 1.0, "tolerance": 1.0}, "tolerance"),  # 100 %
    ({"ohms": 1.0, "tolerance": -0.01}, "tolerance"),  # negative
    ({"ohms": 1.0, "power_rating_w": 0.0}, "power_rating_w"),  # zero watts
    ({"ohms": 1.0, "max_volts": -5.0}, "max_volts"),  # negative volts
    ({"ohms": 1.0, "tcr_ppm": -1.0}, "tcr_ppm"),  # TCR is a magnitude
    ({"ohms": 1.0, "extra": (("qty", "3"),)}, "extra"),  # collides with a real column
    ({"ohms": 1.0, "extra": (("lot", ""),)}, "extra"),  # blank text would not survive a save
    ({"ohms": 1.0, "extra": (("Max Temp", "125"),)}, "extra"),  # the max_temp column, respelled
    ({"ohms": 1.0, "max_temp_c": 70.0}, "max_temp_c"),  # the rated ambient itself (IEC 60115-1)
    ({"ohms": 1.0, "max_temp_c": 25.0}, "max_temp_c"),  # room temperature, below the rated ambient
    ({"ohms": 1.0, "max_temp_c": float("nan")}, "max_temp_c"),  # not a number
    ({"ohms": 1.0, "max_temp_c": float("inf")}, "max_temp_c"),  # never derates
    ({"ohms": 1.0, "max_temp_c": True}, "max_temp_c"),  # a bool is not a temperature
    ({"ohms": 1.0, "max_temp_c": "155"}, "max_temp_c"),  # text: read it with load_bin instead
    ({"ohms": 1.0, "line": -1}, "line"),  # lines count from 1; 0 means not assigned yet
    ({"ohms": 1.0, "line": 2.5}, "line"),  # not a whole line
    ({"ohms": 1.0, "line": True}, "line"),  # a bool is not a line number
    ({"ohms": 1.0, "line": "7"}, "line"),  # text
]


@pytest.mark.parametrize("kwargs, field", BAD_ITEMS)
def test_bad_items(kwargs: dict, field: str) -> None:
    with pytest.raises(StockError, match=f"StockItem {field}"):
        StockItem(**kwargs)


def test_item_defaults_and_normalisation() -> None:
    item = StockItem(4700, count=0, tolerance=0, package=" 0805 ", extra=[("b", "2"), ("a", "1")])
    assert (item.ohms, item.count, item.tolerance) == (4700.0, 0, 0.0)
    assert isinstance(item.ohms, float) and isinstance(item.tolerance, float)
    assert item.package == "0805"
    assert item.extra == (("a", "1"), ("b", "2"))
    assert StockItem(1.0) == StockItem(1.0, None, 0.01, 0.25, 200.0, 100.0)


def test_empty_bin() -> None:
    with pytest.raises(StockError, match="the bin holds no parts"):
        StockBin(())


def test_bin_basics() -> None:
    b = StockBin((StockItem(1000.0, 2), StockItem(100.0), StockItem(10.0, 0)), name="x")
    assert b.values == (10.0, 100.0, 1000.0)
    assert b.counts == (0, None, 2)
    assert len(b) == 3
    assert b.item_for(1000.0 * (1 + 1e-14)) is b.items[2]  # float noise is the same value
    assert b.item_for(1001.0) is None
    assert StockBin(list(b.items), "x") == b  # any iterable; stored as a sorted tuple


def test_bin_from_values() -> None:
    # "4k7" is read as 4.7 kΩ (IEC 60062); a repeated value adds its counts.
    b = bin_from_values(["4k7", 100, 100.0], count=2, name="bench")
    assert summary(b) == [(100.0, 4, *D), (4700.0, 2, *D)]
    assert b.name == "bench"
    assert bin_from_values([10.0]).counts == (None,)
    with pytest.raises(StockError, match="holds no parts"):
        bin_from_values([])


# --------------------------------------------------------------------------- demo bins


@pytest.mark.parametrize("name", ["makerspace-drawer.csv", "precision-kit.csv", "power-shelf.csv"])
def test_demo_bins_load(name: str) -> None:
    path = BINS / name
    first = path.read_text(encoding="utf-8").splitlines()[0]
    assert first.startswith("# Invented scenario:")  # each says what it is
    assert len(load_bin(path)) >= 10


def test_makerspace_drawer() -> None:
    b = load_bin(BINS / "makerspace-drawer.csv")
    assert len(b) == 36  # 38 rows: the 8k2 row has qty 0, and the two 5 % 10k rows merge
    assert 8200.0 not in b.values
    ten_k = b.item_for(10_000.0)  # the 1 % and 5 % 10k are different parts; 1 % sorts first
    assert (ten_k.tolerance, ten_k.count) == (0.01, 10)
    merged = b.items[b.items.index(ten_k) + 1]
    assert (merged.ohms, merged.tolerance, merged.count) == (10_000.0, 0.05, 52)
    assert merged.location == "drawer B2; drawer B2 overflow bag"
    assert all(c is not None for c in b.counts)  # a drawer has limited quantities


def test_precision_kit() -> None:
    b = load_bin(BINS / "precision-kit.csv")
    assert 20 <= len(b) <= 30
    assert {(i.count, i.tolerance, i.power_rating_w, i.max_volts, i.tcr_ppm, i.package) for i in b.items} == {
        (5, 0.001, 0.125, 150.0, 25.0, "0805")}
    # every value is an E192 value: three significant digits from the IEC 60063 table
    for v in b.values:
        digits = f"{v:.6e}"  # d.dddddde+XX
        assert digits[4:8] == "0000", v  # no fourth significant digit
        assert int(digits[0] + digits[2:4]) in E192, v


def test_power_shelf() -> None:
    b = load_bin(BINS / "power-shelf.csv")
    assert {i.power_rating_w for i in b.items} == {0.25, 1.0, 5.0}
    assert b.values[0] == 0.1  # IEC 60062 RKM: R1 = 0.1 Ω
    assert len([i for i in b.items if i.ohms == 10.0]) == 3  # same value, three different parts


# --------------------------------------------------------------------------- upper category temperature

# (id, cell, °C read)
MAX_TEMP_CELLS = [
    # Yageo CFR/MFR and Vishay D/CRCW datasheets: derate linearly to 0 W at 155 °C
    ("bare", "155", 155.0),
    # the same, with the unit letter
    ("C", "155C", 155.0),
    # with a space and the degree sign
    ("space degree", "155 °C", 155.0),
    # Vishay TNPW thin film, climatic category 55/125/56: 125 °C
    ("degree", "125°C", 125.0),
    # the single character U+2103 DEGREE CELSIUS
    ("celsius sign", "125 \u2103", 125.0),
    # a decimal temperature is read as written
    ("decimal", "130.5", 130.5),
    # blank: the project default, 155 °C (the datasheets above)
    ("blank", "", 155.0),
]


@pytest.mark.parametrize("cell, temp_c", [c[1:] for c in MAX_TEMP_CELLS], ids=[c[0] for c in MAX_TEMP_CELLS])
def test_max_temp_cells(tmp_path: Path, cell: str, temp_c: float) -> None:
    (item,) = load_bin(write(tmp_path, f"value,max_temp\n1k,{cell}\n")).items
    assert item.max_temp_c == temp_c


def test_max_temp_header_spelling_and_missing_column(tmp_path: Path) -> None:
    # 'Max Temp' is the max_temp column (space for underscore, any case); no column = default.
    (item,) = load_bin(write(tmp_path, "Value,Max Temp\n1k,125\n")).items
    assert item.max_temp_c == 125.0  # Vishay TNPW: 55/125/56
    (item,) = load_bin(write(tmp_path, "value\n1k\n", "plain.csv")).items
    assert item.max_temp_c == 155.0 and item.extra == ()


def test_max_temp_default_and_field() -> None:
    # Yageo CFR/MFR and Vishay D/CRCW: rated at 70 °C, derated linearly to 0 W at 155 °C.
    assert DEFAULT_MAX_TEMP_C == 155.0
    assert StockItem(1.0).max_temp_c == 155.0
    assert StockItem(1.0, max_temp_c=125).max_temp_c == 125.0
    assert isinstance(StockItem(1.0, max_temp_c=125).max_temp_c, float)
    assert StockItem(1.0, max_temp_c=70.5).max_temp_c == 70.5  # anything above 70 °C is accepted
    # Declared right after tcr_ppm, but keyword-only: positional calls keep their meaning.
    names = [f.name for f in dataclasses.fields(StockItem)]
    assert names[names.index("tcr_ppm") + 1] == "max_temp_c"
    assert StockItem(1.0, 2, 0.01, 0.25, 200.0, 100.0, "0805").package == "0805"
    assert StockItem(1.0, max_temp_c=125.0) != StockItem(1.0)  # part of equality
    assert COLUMNS.index("max_temp") == COLUMNS.index("tcr") + 1


def test_max_temp_error_names_file_line_field(tmp_path: Path) -> None:
    path = write(tmp_path, "# drawer C\nvalue,qty,max_temp\n1k,1,155\n2k2,4,65\n")
    with pytest.raises(StockError) as info:
        load_bin(path)
    assert str(info.value) == (
        f"{path}, line 4, field 'max_temp': '65' reads as 65.0; an upper category temperature must be "
        "a finite number of °C above the 70 °C rated ambient (IEC 60115-1), such as 155 (thick film) "
        "or 125 (some thin film)")


def test_saved_format_with_max_temp(tmp_path: Path) -> None:
    # A line away from the default writes the column (after tcr) for every line.
    path = tmp_path / "out.csv"
    save_bin(StockBin((StockItem(4700.0, 10), StockItem(0.47, 2, max_temp_c=125.0))), path)
    assert path.read_text(encoding="utf-8") == (
        "value,qty,tolerance,watts,max_volts,tcr,max_temp,package,location,note\n"
        "0R47,2,1%,0.25,200,100,125,,,\n"
        "4k7,10,1%,0.25,200,100,155,,,\n"
    )


def test_round_trip_max_temp(tmp_path: Path) -> None:
    b = StockBin((
        StockItem(1000.0, 1, max_temp_c=125.0, location="A1"),  # Vishay TNPW thin film
        StockItem(1000.0, 2, location="A2"),  # default 155 °C: a different part, kept apart
        StockItem(10.0, None, 0.05, 1.0, 500.0, 250.0, "axial", max_temp_c=70.0 + 1e-9),
        StockItem(0.1, 3, max_temp_c=275.0),  # a wirewound-style high rating, made up
    ), name="temps")
    path = tmp_path / "out.csv"
    save_bin(b, path)
    assert load_bin(path).items == b.items


@settings(max_examples=60, deadline=None)
@given(st.lists(st.tuples(items, st.floats(70, 1000, exclude_min=True)), min_size=1, max_size=6))
def test_round_trip_property_max_temp(tmp_path_factory, parts: list[tuple[StockItem, float]]) -> None:
    # As test_round_trip_property, with any upper category temperature above 70 °C.
    b = StockBin(tuple(dataclasses.replace(item, max_temp_c=t) for item, t in parts))
    keys = [tuple(f"{x:.12g}" for x in (i.ohms, i.tolerance, i.power_rating_w, i.max_volts, i.tcr_ppm, i.max_temp_c))
            for i in b.items]  # as the merge rule sees them (12 significant digits)
    if len(set(keys)) != len(keys):
        return
    path = tmp_path_factory.mktemp("rt") / "out.csv"
    save_bin(b, path)
    assert load_bin(path).items == b.items


# --------------------------------------------------------------------------- line numbers
# Expected line numbers are counted by hand in the file text of each test: every physical
# line counts, comments and blank ones too (a CSV record may span lines inside quotes, RFC 4180
# section 2 rule 6; its line is the one it starts on).

LINES = [
    # header on line 1, rows on 2 and 3; items sort by value, lines stay with their rows
    ("plain", "value,qty\n10k,1\n1k,2\n", [(1000.0, 3), (10_000.0, 2)]),
    # comments and blank lines before and between rows count as lines
    ("comments", "# drawer A\n\nvalue,qty\n# resistors\n1k,2\n,\n\n4k7,1\n", [(1000.0, 5), (4700.0, 8)]),
    # CRLF ends a line like LF (RFC 4180 section 2 rule 1)
    ("crlf", "value,qty\r\n1k,2\r\n\r\n2k,1\r\n", [(1000.0, 2), (2000.0, 4)]),
    # a quoted note over three lines: the next row is on line 5
    ("multi-line cell", 'value,note\n1k,"a\nb\nc"\n2k,x\n', [(1000.0, 2), (2000.0, 5)]),
    # a qty-0 row keeps its line out of the bin, but later rows keep their own numbers
    ("qty zero", "value,qty\n1k,0\n2k,4\n", [(2000.0, 3)]),
    # merged rows: the first row's line (2), also when it is the qty-0 one
    ("merged", "value,qty\n1k,0\n2k,1\n1k,3\n", [(1000.0, 2), (2000.0, 3)]),
    # same value, different ratings: two parts, each with its own line
    ("ratings differ", "value,tolerance\n1k,5%\n1k,1%\n", [(1000.0, 3), (1000.0, 2)]),
]


@pytest.mark.parametrize("content, expected", [c[1:] for c in LINES], ids=[c[0] for c in LINES])
def test_load_sets_lines(tmp_path: Path, content: str, expected: list[tuple[float, int]]) -> None:
    b = load_bin(write(tmp_path, content))
    assert [(i.ohms, i.line) for i in b.items] == expected


def test_row_order_does_not_change_item_order(tmp_path: Path) -> None:
    # The same four rows in two orders: the same parts in the same order; only the lines and
    # the order of merged texts follow the file.
    rows = ["1k,1,5%,A", "1k,2,1%,B", "470R,3,1%,C", "1k,4,1%,D"]
    one = load_bin(write(tmp_path, "value,qty,tolerance,location\n" + "\n".join(rows) + "\n", "one.csv"))
    two = load_bin(write(tmp_path, "value,qty,tolerance,location\n" + "\n".join(rows[::-1]) + "\n", "two.csv"))
    # 470R (IEC 60062: 470 Ω) first; the two 1 % 1k rows merge (2 + 4), then the 5 % 1k
    parts = [(470.0, 0.01, 3), (1000.0, 0.01, 6), (1000.0, 0.05, 1)]
    assert [(i.ohms, i.tolerance, i.count) for i in one.items] == parts
    assert [(i.ohms, i.tolerance, i.count) for i in two.items] == parts
    assert [(i.line, i.location) for i in one.items] == [(4, "C"), (3, "B; D"), (2, "A")]
    assert [(i.line, i.location) for i in two.items] == [(3, "C"), (2, "D; B"), (5, "A")]


def test_built_bins_number_lines_by_position() -> None:
    # No file: line = 1-based position in the sorted bin.  IEC 60063 E12 from 100 Ω to 1 kΩ is
    # 13 values (100, 120, ..., 820, 1000).
    assert [i.line for i in kit_bin("E12", 100, 1000).items] == list(range(1, 14))
    assert [i.line for i in default_bin().items] == list(range(1, 122))  # 121 values (IEC 60063)
    b = bin_from_values([1000.0, 10.0, 100.0, 10.0])  # 10 given twice: one item
    assert [(i.ohms, i.line) for i in b.items] == [(10.0, 1), (100.0, 2), (1000.0, 3)]


def test_bin_keeps_given_lines_and_numbers_the_rest() -> None:
    b = StockBin((StockItem(300.0, line=9), StockItem(100.0), StockItem(200.0, line=4)))
    assert [(i.ohms, i.line) for i in b.items] == [(100.0, 1), (200.0, 4), (300.0, 9)]
    assert StockBin(b.items) == b  # already numbered: unchanged


def test_line_is_not_part_of_the_item() -> None:
    # where a part is listed does not make it a different part
    assert StockItem(1000.0, 2, line=3) == StockItem(1000.0, 2, line=8)
    assert hash(StockItem(1000.0, 2, line=3)) == hash(StockItem(1000.0, 2, line=8))
    assert StockItem(1000.0, line=3) != StockItem(1000.0, 2, line=3)  # the count still counts
    # keyword-only: a positional call means what it meant before the field existed
    with pytest.raises(TypeError):
        StockItem(1.0, 2, 0.01, 0.25, 200.0, 100.0, "0805", "A1", "n", (), 5)  # type: ignore[misc]
    assert StockItem(1.0, line=7).line == 7 and StockItem(1.0).line == 0
    line = StockItem(1.0, line=np.int64(7)).line  # any whole number type, stored as int
    assert line == 7 and type(line) is int


def test_save_does_not_write_lines(tmp_path: Path) -> None:
    # A bin read from line 9 saves as the file's own line 2 (header on line 1), no column added.
    src = write(tmp_path, "# a\n# b\n\nvalue,qty\n\n\n\n\n4k7,2\n", "src.csv")
    assert [i.line for i in load_bin(src).items] == [9]
    out = tmp_path / "out.csv"
    save_bin(load_bin(src), out)
    assert out.read_text(encoding="utf-8") == (
        "value,qty,tolerance,watts,max_volts,tcr,package,location,note\n"
        "4k7,2,1%,0.25,200,100,,,\n"
    )
    assert [i.line for i in load_bin(out).items] == [2]


# --------------------------------------------------------------------------- module split

STOCK_MODULES = ["netsynth.stock", "netsynth.stock.items", "netsynth.stock.kits", "netsynth.stock.binfile"]


@pytest.mark.parametrize("first", STOCK_MODULES)
def test_stock_modules_import_in_any_order(first: str) -> None:
    # The package imports kits and binfile, both import items, items imports neither: a fresh
    # interpreter imports any of them first, and the package re-exports the same objects.
    rest = ", ".join(m for m in STOCK_MODULES if m != first)
    code = (f"import {first}; import {rest}\n"
            "from netsynth import stock as s\n"
            "from netsynth.stock import binfile as b, items as i, kits as k\n"
            "assert s.load_bin is b.load_bin and s.save_bin is b.save_bin\n"
            "assert s.kit_bin is k.kit_bin and s.default_bin is k.default_bin\n"
            "assert s.StockBin is i.StockBin and s.StockItem is i.StockItem and s.COLUMNS is i.COLUMNS\n"
            "assert b.StockBin is i.StockBin and k.StockItem is i.StockItem\n")
    root = Path(__file__).resolve().parent.parent
    env = {**os.environ, "PYTHONPATH": str(root)}
    done = subprocess.run([sys.executable, "-c", code], cwd=root, env=env, capture_output=True, text=True)
    assert done.returncode == 0, done.stderr
