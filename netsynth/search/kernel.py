"""The compiled inner recursion of the exact search, when it was built, and how to call it.

``netsynth.search._kernel`` (C, built by ``pip install`` where a C compiler is found)
computes the floor and ceil of a family of networks one query row at a time, with the
same splits, cuts and floating-point expressions as the numpy engine of :mod:`.exact`,
for unlimited and limited bins, plus a window that narrows as each row's answer improves.
Both give the same values. Measured on two cores: π kΩ from the 169-value E24 bin at six
parts, 47 s in numpy and 1.9 s compiled, most of it from taking pairs x-first where fewer
x than a matter (700 M look-ups down to 57 M), not from compiling as such (about 1.2×).

Rows are shared out between threads (the module releases the GIL), interleaved so that
rows with much and little work spread evenly. The main thread only waits, so Ctrl-C reaches
it at once; it then tells the threads to stop and passes the interrupt on.

Set ``NETSYNTH_KERNEL=off`` to run the numpy engine instead (the tests compare the two).
"""

from __future__ import annotations

import os
from concurrent.futures import ThreadPoolExecutor, wait

import numpy as np

try:
    from netsynth.search import _kernel
except ImportError:  # built without a C compiler: the numpy engine does the work
    _kernel = None

#: rows from which a call is shared between threads; below it a thread costs more than it saves
THREAD_FROM = 64

_pool: tuple[int, ThreadPoolExecutor] | None = None  # (the process that made it, the pool)


def built() -> bool:
    """Whether the compiled module was built and imports."""
    return _kernel is not None


def enabled() -> bool:
    """Whether searches use it: built, and not turned off by ``NETSYNTH_KERNEL=off``."""
    return _kernel is not None and os.environ.get("NETSYNTH_KERNEL", "").lower() != "off"


def threads() -> int:
    """Threads a call may use: the cores this process may run on, at most four."""
    try:
        cores = len(os.sched_getaffinity(0))
    except AttributeError:  # not on every platform
        cores = os.cpu_count() or 1
    return max(1, min(4, cores))


#: tables shorter than this are bisected; an index pays from about here on
INDEX_FROM = 256
#: entries per run of equal leading bits the index aims at (see table_spec)
RUN_ENTRIES = 4


def table_spec(values: np.ndarray, parts: np.ndarray | None = None) -> tuple:
    """(values, index, kmin, shift, parts): a sorted table of positive ohms as :func:`bounds` takes it.

    The index splits the table by each value's leading bits (its float64 bit pattern shifted right
    by ``shift``: the exponent and the first mantissa bits, which grow with the value), so that a
    look-up reads the index, then a run of about :data:`RUN_ENTRIES` entries, instead of bisecting
    the whole table; ``index[k]`` is the first entry whose key is at least ``kmin + k``. None for
    short tables. ``parts`` (limited bins): the bin-value indices of each entry's parts.
    """
    values = np.ascontiguousarray(values, dtype=np.float64)
    parts = None if parts is None else np.ascontiguousarray(parts, dtype=np.int16)
    if len(values) < INDEX_FROM or not values[0] > 0:
        return values, None, 0, 0, parts
    bits = values.view(np.int64)
    exponents = int((bits[-1] >> 52) - (bits[0] >> 52)) + 1
    mantissa_bits = max(0, min(30, int(np.log2(len(values) / (RUN_ENTRIES * exponents)))))
    shift = 52 - mantissa_bits
    keys = bits >> shift
    kmin = int(keys[0])
    index = np.searchsorted(keys, np.arange(kmin, int(keys[-1]) + 2, dtype=np.int64)).astype(np.int32)
    return values, index, kmin, shift, parts


def _executor() -> ThreadPoolExecutor:
    """The threads of this process; a forked child (multiprocessing) makes its own, since the
    parent's threads do not exist in it and a pool that counts them would never run a job."""
    global _pool
    if _pool is None or _pool[0] != os.getpid():
        _pool = (os.getpid(), ThreadPoolExecutor(max_workers=4, thread_name_prefix="netsynth-search"))
    return _pool[1]


def bounds(tables: tuple, vmin: float, vmax: float, what: int, op: int, n: int, m: int,
           t: np.ndarray, bnd: np.ndarray, L: np.ndarray, U: np.ndarray,
           limits: np.ndarray | None = None, used: np.ndarray | None = None) -> tuple[np.ndarray, np.ndarray, int]:
    """(floor, ceil, look-ups) per row; ``what`` 0 is :meth:`.exact._Engine._family`, 1 ``_nodes``.

    ``tables``: for each level 1..h, the (ser, par, any) tables, each from :func:`table_spec`.
    A limited bin gives ``limits`` (how many of each bin value) and ``used`` (per row, the
    bin-value indices already taken), and its tables their parts.
    """
    if limits is not None:
        limits = np.ascontiguousarray(limits, dtype=np.int64)
        used = np.ascontiguousarray(used, dtype=np.int16)
    cols = [np.ascontiguousarray(a, dtype=np.float64) for a in (t, bnd, L, U)]
    count = len(cols[0])
    lo = np.empty(count)
    hi = np.empty(count)
    workers = threads() if count >= THREAD_FROM else 1
    stop = np.zeros(1, dtype=np.int32)
    # even one share runs on the pool: the main thread then waits where Ctrl-C reaches it
    jobs = [_executor().submit(_kernel.bounds, tables, vmin, vmax, what, op, n, m, *cols, lo, hi, k, workers, stop,
                               limits, used)
            for k in range(workers)]
    try:
        return lo, hi, sum(j.result() for j in jobs)
    except BaseException:  # Ctrl-C while waiting: tell the shares to stop, let them end, pass it on
        stop[0] = 1
        wait(jobs)
        raise
