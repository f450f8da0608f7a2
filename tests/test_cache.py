"""The on-disk table cache: same answers as a cold run, robust to bad files, off when told.

Every test points ``NETSYNTH_CACHE`` at its own temporary folder (never the user's cache) and
lowers the size from which a level is cached, so small bins exercise it.
"""

from __future__ import annotations

import os

import pytest

# pytest imports every test module before it runs any test, so this keeps the whole session's
# tables out of the user's cache (``make 25m`` searches six parts and would store its tables);
# the tests below point the cache at their own temporary folders.
os.environ["NETSYNTH_CACHE"] = "off"

from netsynth.search import cache, exact
from netsynth.search.exact import ExactSearch

VALUES = [10.0, 15.0, 22.0, 33.0, 47.0, 68.0, 100.0, 150.0, 220.0, 330.0, 470.0, 680.0]  # E6, two decades
TARGETS = [123.4, 56.78, 1000.0, 3.3]  # inside, inside, above and below the bin's span


@pytest.fixture
def cache_dir(tmp_path, monkeypatch):
    folder = tmp_path / "cache"
    monkeypatch.setenv("NETSYNTH_CACHE", str(folder))
    monkeypatch.setattr(exact, "CACHE_FROM", 0)  # cache every level from two parts up
    return folder


def answers(counts=None, k=6):
    counts = counts or [None] * len(VALUES)
    search = ExactSearch(VALUES, counts, k, table_parts=3)
    return [[(str(f.network), f.value_ohms, f.error) for f in search.best(n, t, alternatives=2)]
            for t in TARGETS for n in range(1, k + 1)]


def test_cached_run_gives_the_cold_run_answers(cache_dir, monkeypatch):
    first = answers()  # builds and stores the two- and three-part levels
    files = sorted(cache_dir.glob("*.tables"))
    assert len(files) == 2
    second = answers()  # reads them back
    assert second == first
    monkeypatch.setenv("NETSYNTH_CACHE", "off")
    assert answers() == first


def test_limited_bin_has_its_own_entries(cache_dir):
    unlimited = answers()
    limited = answers(counts=[1] * len(VALUES), k=5)
    assert len(list(cache_dir.glob("*.tables"))) >= 3  # the limited tables are keyed by the counts too
    assert answers(counts=[1] * len(VALUES), k=5) == limited
    assert answers() == unlimited


@pytest.mark.parametrize("damage", ["garbage", "truncated", "flipped", "foreign", "empty"])
def test_a_damaged_or_foreign_file_is_ignored_and_rebuilt(cache_dir, damage):
    first = answers()
    path = max(cache_dir.glob("*.tables"), key=lambda p: p.stat().st_size)
    data = path.read_bytes()
    if damage == "garbage":
        path.write_bytes(os.urandom(4096))
    elif damage == "truncated":
        path.write_bytes(data[: len(data) // 2])
    elif damage == "flipped":  # one byte in the middle of the tables: the checksum catches it
        middle = len(data) // 2
        path.write_bytes(data[:middle] + bytes([data[middle] ^ 0xFF]) + data[middle + 1:])
    elif damage == "foreign":
        path.write_bytes(b"PK\x03\x04 not ours" + data[16:])
    else:
        path.write_bytes(b"")
    assert answers() == first
    assert path.read_bytes() == data  # rebuilt and stored again, identical


def test_nothing_is_written_when_the_cache_is_off(tmp_path, monkeypatch):
    monkeypatch.setattr(exact, "CACHE_FROM", 0)
    for off in ("off", "", "OFF "):
        monkeypatch.setenv("NETSYNTH_CACHE", off)
        assert cache.folder() is None
        answers(k=5)
    assert list(tmp_path.iterdir()) == []


def test_default_folder_follows_xdg(tmp_path, monkeypatch):
    monkeypatch.delenv("NETSYNTH_CACHE", raising=False)
    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path))
    assert cache.folder() == tmp_path / "netsynth"


def test_the_oldest_files_go_beyond_the_size_cap(cache_dir, monkeypatch):
    answers()
    first = sorted(cache_dir.glob("*.tables"))
    for i, f in enumerate(first):
        os.utime(f, (1_000_000 + i, 1_000_000 + i))  # long unused
    monkeypatch.setattr(cache, "MAX_BYTES", max(f.stat().st_size for f in first) * 2 + 1)
    answers(counts=[2] * len(VALUES))  # two new files; the old ones must make room
    left = set(cache_dir.glob("*.tables"))
    assert not set(first) <= left
    assert sum(f.stat().st_size for f in left) <= cache.MAX_BYTES


def test_clear_removes_every_file(cache_dir):
    answers()
    assert cache.clear() == 2
    assert list(cache_dir.glob("*.tables")) == []
