"""Time to the proven-optimal frontier, peak memory, and the ratio to a plain enumerator.

Run:  python benchmarks/search_speed.py            (about two minutes on 2 cores)
      python benchmarks/search_speed.py --quick    (k = 3, 4 only)

For each bin and k it runs the whole frontier search (every part count 1..k, proven)
for several targets in a fresh process, and prints the median wall time and the
process's peak resident memory. The plain enumerator lists every distinct value of
up to k parts with Python sets and picks the nearest; where that would take too long
its time is estimated from its measured rate and the number of combinations it
would have to form (marked "est.").

Targets to reach (issue: the main job): on the 169-value E24 bin, k = 4 under 1 s,
k = 5 under 10 s, peak memory under 2 GB.
"""

from __future__ import annotations

import argparse
import json
import statistics
import subprocess
import sys
import time

TARGETS = [3370.0, 1234.5, 47.123, 777e3, 12.34, 56789.0]  # inside both bins' value range

CHILD = r"""
import json, sys, time
from netsynth.stock import kit_bin, default_bin
from netsynth.search.frontier import search_frontier
bin_name, k, targets = sys.argv[1], int(sys.argv[2]), json.loads(sys.argv[3])
stock = default_bin() if bin_name == "default" else kit_bin("E24", 1.0, 10e6)
times = []
for t in targets:
    start = time.perf_counter()
    rows = search_frontier(t, stock, max_parts=k, alternatives=2).rows
    times.append(time.perf_counter() - start)
    assert all(r.proven for r in rows) and rows[-1].parts == k
# VmHWM (peak resident set) starts afresh at exec; ru_maxrss would inherit the parent's peak
peak_mb = next(int(l.split()[1]) for l in open("/proc/self/status") if l.startswith("VmHWM")) / 1024
print(json.dumps({"times": times, "peak_mb": peak_mb, "values": len(stock)}))
"""


def run_child(bin_name: str, k: int) -> dict:
    out = subprocess.run(
        [sys.executable, "-c", CHILD, bin_name, str(k), json.dumps(TARGETS)],
        check=True, capture_output=True, text=True,
    )
    return json.loads(out.stdout)


def plain_enumerator(values: list[float], k: int, target: float, budget_s: float) -> tuple[float, bool]:
    """Every distinct value of exactly n parts for n ≤ k, with Python sets; nearest wins.

    Returns (seconds, estimated). Stops early and extrapolates when the budget runs out.
    """
    start = time.perf_counter()
    tables: dict[int, set[float]] = {1: set(values)}
    done = 0
    best = min(values, key=lambda v: abs(v / target - 1))
    for n in range(2, k + 1):
        out: set[float] = set()
        todo = sum(len(tables[a]) * len(tables[n - a]) for a in range(1, n // 2 + 1))
        for a_n in range(1, n // 2 + 1):
            for a in tables[a_n]:
                for b in tables[n - a_n]:
                    out.add(a + b)
                    out.add(a * b / (a + b))
                done += len(tables[n - a_n])
                elapsed = time.perf_counter() - start
                if elapsed > budget_s:
                    rate = done / elapsed
                    remaining = todo - done + sum(
                        _estimate_pairs(tables, out, m, n) for m in range(n + 1, k + 1)
                    )
                    return elapsed + remaining / rate, True
        tables[n] = out
        best = min([best, *out], key=lambda v: abs(v / target - 1))
    return time.perf_counter() - start, False


def _estimate_pairs(tables, current, m, n) -> int:
    # sizes of the tables not yet built, assuming each grows like the last step (a lower bound)
    sizes = {i: len(t) for i, t in tables.items()}
    sizes[n] = max(len(current), 1)
    for i in range(n + 1, m + 1):
        sizes[i] = sum(2 * sizes[a] * sizes[i - a] for a in range(1, i // 2 + 1))
    return sum(sizes[a] * sizes[m - a] for a in range(1, m // 2 + 1))


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--quick", action="store_true", help="k = 3 and 4 only")
    args = parser.parse_args()
    ks = [3, 4] if args.quick else [3, 4, 5]
    from netsynth.stock import default_bin, kit_bin

    bins = {"default": list(default_bin().values), "E24 1 Ω..10 MΩ": list(kit_bin("E24", 1.0, 10e6).values)}
    print(f"{'bin':<16} {'k':>2} {'values':>6} {'median s':>9} {'max s':>7} {'peak MB':>8} {'plain s':>10} {'ratio':>8}")
    for label, values in bins.items():
        name = "default" if label == "default" else "e24"
        for k in ks:
            res = run_child(name, k)
            med = statistics.median(res["times"])
            plain, est = plain_enumerator(values, k, TARGETS[0], budget_s=20.0)
            plain_txt = f"{plain:.3g}{' est.' if est else ''}"
            print(
                f"{label:<16} {k:>2} {res['values']:>6} {med:>9.3f} {max(res['times']):>7.3f} "
                f"{res['peak_mb']:>8.0f} {plain_txt:>10} {plain / med:>8.0f}×",
                flush=True,
            )


if __name__ == "__main__":
    main()
