"""Files the user owns: written so that a crash leaves the old version or the new one, never a mix;
read with a size cap, so an endless device or a pipe is refused instead of read forever; decoded
as UTF-8 and split into CSV rows with errors that name the file and line.

:func:`write_atomic` is the one way netsynth writes files: bin files (``save_bin``, ``bin take``,
``bin add``), and the SVG, SPICE and CSV files the command line writes.

Steps: a temp file in the same folder (a rename across file systems would not be atomic) gets
the data and is flushed with ``fsync``; it gets the permission bits of the file it replaces; it
is renamed over the target with ``os.replace`` (atomic on POSIX and Windows); then the folder is
fsynced so the rename itself survives a power cut.
"""

from __future__ import annotations

import csv
import io
import os
import secrets
import stat
from collections.abc import Iterator

from netsynth.errors import NetsynthError


def write_atomic(path: str | os.PathLike, data: bytes, mode: int | None = None, *,
                 error: type[NetsynthError], what: str = "") -> None:
    """Write `data` to `path` atomically (see the module docstring).

    Parameters
    ----------
    path : the file to write
    data : its new content
    mode : permission bits; by default those of an existing `path`, else the process's default
    error : the error class raised on failure (``StockError`` for bin files, ``ArgumentError`` for
        an output path the user gave)
    what : what is written, for the message (``"the SVG"``); empty for a plain "cannot write"

    Raises
    ------
    NetsynthError
        Of type `error`, one line naming `path` and the reason, when the file cannot be written;
        an existing file is then unchanged.
    """
    name = os.fsdecode(os.fspath(path))
    folder, base = os.path.split(os.path.abspath(name))
    tmp = None
    label = f"cannot write {what}" if what else "cannot write"
    try:
        if mode is None:
            try:
                mode = stat.S_IMODE(os.stat(name).st_mode)
            except FileNotFoundError:
                mode = None
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
        raise error(f"{label} {name!r}: {e.strerror or e}; check that the folder exists and is writable "
                    "(the old file, if any, is unchanged)") from None
    finally:
        if tmp is not None:
            try:
                os.unlink(tmp)
            except OSError:
                pass  # best effort: the error above is the one to report
    sync_folder(folder)


def sync_folder(folder: str) -> None:
    """fsync the folder so a rename in it survives a power cut (POSIX; skipped where refused)."""
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


def read_capped(path: str, cap: int, *, error: type[NetsynthError], what: str = "file") -> bytes:
    """At most `cap` bytes of `path`; a longer file (or an endless device such as ``/dev/zero``) is refused.

    At most cap + 1 bytes are read. The file is opened without blocking, so a FIFO nobody writes
    to reads as empty instead of hanging, and is then read blocking as usual.

    Raises
    ------
    NetsynthError
        Of type `error`, one line: missing file, a folder, no permission, a NUL in the name, or
        larger than `cap`.
    """
    shown = path if len(path) <= 60 else path[:57] + "..."
    try:
        fd = os.open(path, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0) | getattr(os, "O_BINARY", 0))
        with os.fdopen(fd, "rb") as f:
            if hasattr(os, "set_blocking"):
                os.set_blocking(fd, True)
            data = f.read(cap + 1)
    except ValueError:  # a NUL character: no file can have that name
        raise error(f"cannot open {what} '{shown}': a file name cannot contain a NUL character") from None
    except FileNotFoundError:
        raise error(f"cannot open {what} '{shown}': no such file; check the path") from None
    except IsADirectoryError:
        raise error(f"cannot open {what} '{shown}': it is a folder; give the path of a file") from None
    except PermissionError:
        raise error(f"cannot open {what} '{shown}': permission denied; check the file's permissions") from None
    except OSError as e:
        raise error(f"cannot open {what} '{shown}': {e.strerror or 'cannot be read'}") from None
    if len(data) > cap:
        raise error(f"{shown}: the {what} is larger than {cap / 2**20:.3g} MiB, more than it can "
                    "sensibly hold; check that it is the right file")
    return data


def utf8_text(data: bytes, path: str, *, error: type[NetsynthError]) -> str:
    """The file's bytes as text (UTF-8, a byte-order mark tolerated); the first bad byte's line named."""
    try:
        return data.decode("utf-8-sig")
    except UnicodeDecodeError as e:
        line = data[: e.start].count(b"\n") + 1
        raise error(f"{path}, line {line}: byte 0x{data[e.start]:02x} is not UTF-8 text; save the file "
                    "as UTF-8 (CSV UTF-8 in a spreadsheet)") from None


def csv_rows(text: str, path: str, *, error: type[NetsynthError]) -> Iterator[tuple[int, list[str]]]:
    """(first line number, stripped cells) of each CSV row that is neither blank nor a ``#`` comment."""
    reader = csv.reader(io.StringIO(text, newline=""), strict=True)
    while True:
        line = reader.line_num + 1
        try:
            cells = next(reader)
        except StopIteration:
            return
        except csv.Error as e:
            raise error(f"{path}, line {line}: cannot read the CSV ({e}); check the quotes on this line") from None
        cells = [cell.strip() for cell in cells]
        if not any(cells) or cells[0].startswith("#"):
            continue
        yield line, cells
