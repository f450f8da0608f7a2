"""A bin's large search tables, kept on disk between runs.

Building the three-part tables of a 169-value bin takes about a second and 5 million
entries; reading them back takes a fraction of that. Only levels of at least
``cache_from`` entries (estimated) are stored: smaller ones build faster than a file opens.

Where
    ``$NETSYNTH_CACHE`` if set (empty or ``off``: no cache at all), else
    ``$XDG_CACHE_HOME/netsynth``, else ``~/.cache/netsynth``. Clearing it is always
    safe: ``rm -rf ~/.cache/netsynth`` (or :func:`clear`).
Key
    A SHA-256 of :data:`ENGINE_VERSION`, the part count, the bin's distinct values and
    their counts (when counts bind): one file per bin content and level, so renaming a
    bin file or reordering its rows reuses the entry, and changing a value does not.
Safety
    A file is written under a temporary name in the same folder and renamed into
    place (``os.replace`` is atomic), so concurrent runs never read half a file; the
    last writer wins with identical content. A file that cannot be read, is not ours,
    or fails the consistency checks is ignored and rebuilt.
Size
    At most :data:`MAX_BYTES` in all; beyond that the least recently used files go.
"""

from __future__ import annotations

import hashlib
import os
import json
import tempfile
import zlib
from pathlib import Path

import numpy as np

from netsynth.search.tables import KIND_ANY, KIND_PAR, KIND_SER, Level, Table, build_level

#: bump whenever the tables' layout or construction changes: old files are then never read.
ENGINE_VERSION = "netsynth-tables-2"
#: the cache's size cap: about four 169-value bins' three-part tables (250 MB each).
MAX_BYTES = 1_000_000_000
_KINDS = {"ser": KIND_SER, "par": KIND_PAR, "any": KIND_ANY}
_FIELDS = ("values", "op", "left_n", "left_kind", "left", "right_kind", "right", "parts")


def folder() -> Path | None:
    """The cache folder, or None when caching is off (see the module docstring)."""
    env = os.environ.get("NETSYNTH_CACHE")
    if env is not None:
        if env.strip() == "" or env.strip().lower() == "off":
            return None
        return Path(env).expanduser()
    base = os.environ.get("XDG_CACHE_HOME") or os.path.join(os.path.expanduser("~"), ".cache")
    return Path(base) / "netsynth"


def clear() -> int:
    """Remove every cache file; returns how many were removed."""
    where = folder()
    if where is None or not where.is_dir():
        return 0
    removed = 0
    for f in where.glob("*.tables"):
        try:
            f.unlink()
            removed += 1
        except OSError:
            pass
    return removed


def key(values: np.ndarray, limits: np.ndarray | None, n: int) -> str:
    h = hashlib.sha256()
    h.update(f"{ENGINE_VERSION}|{n}|{len(values)}|".encode())
    h.update(np.ascontiguousarray(values, dtype="<f8").tobytes())
    if limits is not None:
        h.update(b"|limits|")
        h.update(np.ascontiguousarray(limits, dtype="<i8").tobytes())
    return h.hexdigest()[:40]


def level(values: np.ndarray, limits: np.ndarray | None, n: int, levels: dict[int, Level],
          cache_from: int, estimate: int = 0) -> Level:
    """The n-part level: from the cache when there, else built (and stored when it pays)."""
    where = folder()
    if where is None or estimate < cache_from:
        return build_level(levels, n, limits)
    name = key(values, limits, n)
    path = where / f"{name}.tables"
    found = _read(path, name, n, levels)
    if found is not None:
        return found
    built = build_level(levels, n, limits)
    _write(where, path, name, built)
    return built


#: the first bytes of every cache file (a foreign file fails here)
MAGIC = b"NSTABLE1"
#: arrays start on multiples of this many bytes, as numpy prefers
_ALIGN = 64


def _read(path: Path, name: str, n: int, levels: dict[int, Level]) -> Level | None:
    """The level stored at ``path``, mapped into memory (pages load as the search touches
    them), or None if the file is missing, foreign, truncated or fails its checksum."""
    try:
        with open(path, "rb") as f:
            head = f.read(16)
            if len(head) != 16 or head[:8] != MAGIC:
                return None
            size = int.from_bytes(head[8:], "little")
            if not 0 < size < 1 << 20:
                return None
            header = json.loads(f.read(size).decode("utf-8"))
        if header.get("meta") != f"{ENGINE_VERSION}|{name}|{n}":
            return None
        raw = np.memmap(path, dtype=np.uint8, mode="r")
        start, end = int(header["data"]), int(header["end"])
        if len(raw) != end or zlib.crc32(raw[start:end]) != int(header["crc"]):
            return None
        tables: dict[str, dict[str, np.ndarray]] = {label: {} for label in _KINDS}
        for label, field, dtype, shape, offset in header["arrays"]:
            dt = np.dtype(dtype)
            count = int(np.prod(shape)) if shape else 1
            if label not in tables or field not in _FIELDS or offset + count * dt.itemsize > end:
                return None
            tables[label][field] = raw[offset: offset + count * dt.itemsize].view(dt).reshape(shape)
        level = Level(n, *(Table(n, **tables[label]) for label in ("ser", "par", "any")))
    except (OSError, ValueError, KeyError, TypeError, UnicodeDecodeError):
        return None
    if not all(_consistent(t, levels) for t in (level.ser, level.par, level.any)):
        return None
    try:
        os.utime(path)  # least recently *used* goes first
    except OSError:
        pass
    return level


def _consistent(t: Table, levels: dict[int, Level]) -> bool:
    """Every array present with the table's length (the checksum vouches for the content)."""
    size = len(t.values)
    arrays = [t.op, t.left_n, t.left_kind, t.left, t.right_kind, t.right]
    if any(a is None or len(a) != size for a in arrays) or t.values.dtype != np.float64:
        return False
    if t.parts is not None and (t.parts.shape != (size, t.n) or t.parts.dtype != np.int16):
        return False
    return True


def _write(where: Path, path: Path, name: str, built: Level) -> None:
    entries = []
    offset = 0
    for label, kind in _KINDS.items():
        for field, a in built.table(kind).arrays().items():
            a = np.ascontiguousarray(a)
            entries.append((label, field, a))
    layout = []
    for label, field, a in entries:
        layout.append([label, field, a.dtype.str, list(a.shape), offset])
        offset += -(-a.nbytes // _ALIGN) * _ALIGN
    # the header's own length moves the data; fix it with room to spare, then shift the offsets
    header = {"meta": f"{ENGINE_VERSION}|{name}|{built.n}", "arrays": layout, "data": 0, "end": 0, "crc": 0}
    room = -(-(len(json.dumps(header)) + 200 + 16 * len(layout)) // _ALIGN) * _ALIGN
    data = 16 + room
    for item in layout:
        item[4] += data
    blob = bytearray(offset)
    for (label, field, a), item in zip(entries, layout):
        start = item[4] - data
        blob[start: start + a.nbytes] = a.tobytes()
    header.update(data=data, end=data + offset, crc=zlib.crc32(blob))
    text = json.dumps(header).encode("utf-8")
    if len(text) > room:
        return  # cannot happen with the room above; never write a file we could not read
    try:
        where.mkdir(parents=True, exist_ok=True)
        fd, tmp = tempfile.mkstemp(prefix=f".{name}.", suffix=".tmp", dir=where)
        try:
            with os.fdopen(fd, "wb") as f:
                f.write(MAGIC + len(text).to_bytes(8, "little"))
                f.write(text.ljust(room, b" "))
                f.write(blob)
            os.replace(tmp, path)
        except BaseException:
            try:
                os.unlink(tmp)
            except OSError:
                pass
            raise
        _evict(where, keep=path)
    except OSError:
        pass  # a read-only or full disk only costs the next run the build


def _evict(where: Path, keep: Path) -> None:
    """Remove the least recently used files until the folder is within :data:`MAX_BYTES`."""
    files = []
    for f in where.glob("*.tables"):
        try:
            st = f.stat()
        except OSError:
            continue
        files.append((st.st_mtime, st.st_size, f))
    total = sum(s for _, s, _ in files)
    for _, size, f in sorted(files, key=lambda x: x[0]):
        if total <= MAX_BYTES:
            break
        if f == keep:
            continue
        try:
            f.unlink()
            total -= size
        except OSError:
            pass
