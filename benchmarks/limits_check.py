"""The largest inputs netsynth accepts, each run under a 2 GB address-space limit: time and memory.

Run:  python benchmarks/limits_check.py           (all cases, about a minute)
      python benchmarks/limits_check.py --quick   (the network and file cases, no search)

Bar (issue 11): every command finishes or refuses within 10 s and 2 GB for any input within
``netsynth.limits``. Each case runs ``python -m netsynth ...`` in a fresh process whose address
space is capped with ``resource.setrlimit(RLIMIT_AS, 2 GB)`` (so an allocation beyond it fails
instead of swapping); the script prints the wall time, the peak resident memory (``wait4``'s
``ru_maxrss``), the exit status and the first line of the answer, and marks a case "over" when
it takes more than 10 s, dies of the memory cap, or prints a traceback. POSIX only (resource).
"""

from __future__ import annotations

import argparse
import os
import resource
import subprocess
import sys
import tempfile
import threading
import time
from pathlib import Path

from netsynth import limits

#: the bars of issue 11
MEMORY_BYTES = 2 * 2**30
SECONDS = 10.0
ROOT = Path(__file__).resolve().parent.parent


def _cap_memory() -> None:
    resource.setrlimit(resource.RLIMIT_AS, (MEMORY_BYTES, MEMORY_BYTES))


def run(label: str, args: list[str]) -> bool:
    """One case in a capped child process; prints one line of figures; True when within the bars."""
    with tempfile.TemporaryFile("w+") as out, tempfile.TemporaryFile("w+") as err:
        start = time.perf_counter()
        child = subprocess.Popen([sys.executable, "-m", "netsynth", *args], cwd=ROOT, preexec_fn=_cap_memory,
                                 stdin=subprocess.DEVNULL, stdout=out, stderr=err)
        timer = threading.Timer(10 * SECONDS, child.kill)  # a runaway case is stopped, and shows as over
        timer.start()
        _, status, usage = os.wait4(child.pid, 0)  # wait4: the child's own peak memory
        timer.cancel()
        seconds = time.perf_counter() - start
        child.returncode = code = os.waitstatus_to_exitcode(status)
        out.seek(0)
        err.seek(0)
        stdout, stderr = out.read(), err.read()
    peak_mb = usage.ru_maxrss / 1024  # Linux reports KiB
    first = (stdout.strip().splitlines() or stderr.strip().splitlines() or [""])[0]
    traceback = "Traceback" in stderr
    ok = seconds <= SECONDS and peak_mb * 2**20 <= MEMORY_BYTES and code in (0, 1, 2) and not traceback
    shown = ("TRACEBACK: " + stderr.strip().splitlines()[-1]) if traceback else first
    print(f"{'ok  ' if ok else 'OVER'} {label:<44} {seconds:6.2f} s {peak_mb:6.0f} MB  exit {code:>2}  {shown[:80]}")
    return ok


def largest_bin(path: Path) -> None:
    """A bin file at the limits: MAX_BIN_ROWS rows, padded with comments to MAX_BIN_BYTES."""
    rows = [f"{1 + i / 1000:.4f}k,{i % 50 + 1},1%,0.25,200,100,shelf {i // 100} box {i % 100},row {i}"
            for i in range(limits.MAX_BIN_ROWS)]
    text = "value,qty,tolerance,watts,max_volts,tcr,location,note\n" + "\n".join(rows) + "\n"
    pad = limits.MAX_BIN_BYTES - len(text.encode())
    line = "#" + "x" * (limits.MAX_BIN_LINE_CHARS - 1) + "\n"
    text += line * (pad // len(line)) + "#" * (pad % len(line))
    path.write_text(text, encoding="utf-8")
    assert path.stat().st_size == limits.MAX_BIN_BYTES


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--quick", action="store_true", help="skip the searches (make) on the largest bin")
    options = parser.parse_args()
    n = limits.MAX_PARTS
    deepest = "1k + (1k || (" * (limits.MAX_NESTING // 2) + "1k" + "))" * (limits.MAX_NESTING // 2)
    full = " + ".join(["4.7 kΩ"] * n)
    print(f"limits: {n} parts, {limits.MAX_NESTING} nested levels, bin {limits.MAX_BIN_BYTES // 2**20} MiB / "
          f"{limits.MAX_BIN_ROWS} rows; bars {SECONDS:g} s and {MEMORY_BYTES // 2**30} GB (RLIMIT_AS)")
    results = []
    with tempfile.TemporaryDirectory() as folder:
        big = Path(folder) / "largest.csv"
        largest_bin(big)
        cases = [
            ("check: 10 000 parts in series, at 10 V", ["check", f"{n}s(1k)", "--volts", "10", "--spec", "1%",
                                                        "--temp", "85"]),
            ("check: 100 strings of 100, JSON", ["check", "100p(100s(1k))", "--amps", "1", "--json"]),
            ("check: 10 000 parts written out in full", ["check", full, "--json"]),
            ("check: 100 levels deep", ["check", deepest, "--volts", "1"]),
            ("check: 10 001 parts (refused)", ["check", f"{n + 1}s(1k)"]),
            ("check: 101 parentheses (refused)", ["check", "(" * 101 + "1k" + ")" * 101]),
            ("bin: the largest bin file", ["bin", str(big), "--json"]),
            ("check: on the largest bin file", ["check", "1k + 1k", "--bin", str(big), "--watts", "1"]),
            ("bin: /dev/zero (refused at 8 MiB + 1 byte)", ["bin", "/dev/zero"]),
            ("make: extreme target 1 µΩ", ["make", "1e-6", "--json"]),
            ("make: extreme target 1 TΩ", ["make", "1e12", "--json"]),
        ]
        if not options.quick:
            cases += [
                ("make: on the largest bin file", ["make", "3k37", "--bin", str(big), "--alternatives", "0"]),
                ("make: E192 1 Ω..10 MΩ kit at 2 W", ["make", "3k37", "--series", "E192", "--range", "1..10M",
                                                     "--watts", "2", "--alternatives", "0"]),
            ]
        for label, args in cases:
            results.append(run(label, args))
    print(f"{sum(results)} of {len(results)} cases within {SECONDS:g} s and {MEMORY_BYTES // 2**30} GB")


if __name__ == "__main__":
    main()
