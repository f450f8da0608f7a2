"""Time to the proven frontier, whole process and in process, and the ratio to a plain enumerator.

Run:  python benchmarks/search_speed.py            (about five minutes on 2 cores)
      python benchmarks/search_speed.py --quick    (k = 3, 4 and the limited bins only)

For each bin and k it runs ``netsynth make T -k K --json`` in a fresh process for six targets
and prints the median and largest wall time of the whole process, its peak resident memory,
how many rows are proven (an exhaustive row; the cost model may stop the exhaustive search
earlier, and the rest then comes from arrays), the median time of the search alone
(``search_frontier`` in one process), and the time a plain set-based enumerator needs for the
same request (estimated from its measured rate where it would take too long, "est."), with the
ratio. The table cache lives in a fresh temporary folder: the "cold" column is the first run
(which builds and stores the bin's large tables), the medians include it.

Then ``make 25m --amps 3`` and ``--help`` (whole process), and the count of distinct values of
n unit resistors for n ≤ 20 (OEIS A048211: 24 599 577 at n = 20) with its time and memory.

Bars (issue "Exhaustive search 10× faster"), whole process, median over six targets: k = 5 on
the 169-value E24 bin under 0.5 s and 300 MB; k = 6 on it exhaustive and proven under 10 s and
2 GB; k = 5 on the E96 bin under 5 s; the limited 169-value bins at k = 5 under 2 s;
``make 25m --amps 3`` under 1 s; ``--help`` under 0.1 s; A048211 to n = 20 under 60 s and 4 GB.
"""

from __future__ import annotations

import argparse
import json
import os
import statistics
import subprocess
import sys
import tempfile
import time

TARGETS = ["3370", "1234.5", "47.123", "777k", "12.34", "56789"]  # inside every bin's value range
# targets no short network hits exactly, so no search stops early: the worst case, as in the rows "hard"
HARD = ["3141.5926", "2718.2818", "6180.3399", "1732.0508", "577.2156", "99.99991"]
E24 = ["--series", "E24", "--range", "1..10M"]
E96 = ["--series", "E96", "--range", "1..10M"]

# the whole process as a user runs it, reporting its own peak resident memory on stderr
# (VmHWM starts afresh at exec; ru_maxrss of children would keep the largest child's peak)
WRAPPER = r"""
import runpy, sys
sys.argv = ["netsynth", *sys.argv[1:]]
try:
    runpy.run_module("netsynth", run_name="__main__")
except SystemExit:
    pass
finally:
    peak = next(int(l.split()[1]) for l in open("/proc/self/status") if l.startswith("VmHWM"))
    sys.stderr.write(f"\nPEAK_KB {peak}\n")
"""

CHILD = r"""
import json, sys, time
from netsynth.stock import default_bin, kit_bin, load_bin
from netsynth.search.frontier import search_frontier
from netsynth.values import parse_resistance
spec, k, targets = json.loads(sys.argv[1]), int(sys.argv[2]), json.loads(sys.argv[3])
stock = default_bin() if not spec else load_bin(spec[1]) if spec[0] == "--bin" else kit_bin(
    spec[1], *[parse_resistance(x) for x in spec[3].split("..")], count=int(spec[5]) if len(spec) > 5 else None)
times = []
for t in targets:
    start = time.perf_counter()
    search_frontier(parse_resistance(t), stock, max_parts=k, alternatives=2)
    times.append(time.perf_counter() - start)
print(json.dumps({"times": times, "values": len(set(stock.values))}))
"""


def whole(args: list[str], env: dict) -> tuple[float, float, str]:
    """(seconds, peak MB, stdout) of one ``netsynth`` run in a fresh interpreter."""
    start = time.perf_counter()
    out = subprocess.run([sys.executable, "-c", WRAPPER, *args], capture_output=True, text=True, env=env)
    seconds = time.perf_counter() - start
    peak = next((int(l.split()[1]) for l in out.stderr.splitlines() if l.startswith("PEAK_KB")), 0) / 1024
    return seconds, peak, out.stdout


def in_process(spec: list[str], k: int, env: dict, targets: list[str]) -> float:
    out = subprocess.run([sys.executable, "-c", CHILD, json.dumps(spec), str(k), json.dumps(targets)],
                         check=True, capture_output=True, text=True, env=env)
    return statistics.median(json.loads(out.stdout)["times"])


def plain_enumerator(values: list[float], k: int, target: float, budget_s: float) -> tuple[float, bool]:
    """Every distinct value of exactly n parts for n ≤ k, with Python sets; nearest wins.

    Counts are ignored (a lower bound on its work for a limited bin). Returns (seconds,
    estimated). Stops early and extrapolates when the budget runs out.
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


def limited_bin(folder: str, values: list[float]) -> str:
    """The 169 E24 values with one or two of each, alternately (a drawer with thin stock)."""
    path = os.path.join(folder, "e24-one-or-two.csv")
    with open(path, "w", encoding="utf-8") as f:
        f.write("value,qty\n")
        f.writelines(f"{v!r},{1 + i % 2}\n" for i, v in enumerate(values))
    return path


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--quick", action="store_true", help="k = 3, 4 and the limited bins only")
    parser.add_argument("--budget", type=float, default=5.0, help="seconds for the plain enumerator per row")
    args = parser.parse_args()
    from netsynth.stock import default_bin, kit_bin

    cache = tempfile.mkdtemp(prefix="netsynth-bench-cache-")
    env = {**os.environ, "NETSYNTH_CACHE": cache}
    e24 = sorted(set(kit_bin("E24", 1.0, 10e6).values))
    rows = [
        ("default", [], sorted(set(default_bin().values)), [3, 4, 5]),
        ("E24 1 Ω..10 MΩ", E24, e24, [3, 4, 5, 6]),
        ("E96 1 Ω..10 MΩ", E96, sorted(set(kit_bin("E96", 1.0, 10e6).values)), [4, 5]),
        ("E24, 1 of each", [*E24, "--qty", "1"], e24, [5, 6]),
        ("E24, 2 of each", [*E24, "--qty", "2"], e24, [5]),
        ("E24, 1 or 2", ["--bin", limited_bin(cache, e24)], e24, [5]),
    ]
    from netsynth.search import kernel

    print(f"exact search engine: {'compiled' if kernel.enabled() else 'numpy'} "
          f"(NETSYNTH_KERNEL=off for numpy), {kernel.threads()} threads")
    print(f"{'bin':<16} {'k':>2} {'values':>6} {'median s':>9} {'max s':>6} {'cold s':>6} {'peak MB':>8} "
          f"{'proven':>7} {'search s':>9} {'plain s':>12} {'ratio':>9}")
    cases = [(label, spec, values, k, "") for label, spec, values, ks in rows for k in ks]
    cases += [(label, spec, values, k, "hard") for label, spec, values, ks in rows[1:4] for k in ks if k >= 5]
    for label, spec, values, k, kind in cases:
        if args.quick and k > 4 and "of each" not in label and "or 2" not in label:
            continue
        targets = HARD if kind else TARGETS
        runs = [whole(["make", t, "-k", str(k), "--json", *spec], env) for t in targets]
        times = [r[0] for r in runs]
        proven = min(sum(row["proven"] for row in json.loads(r[2])["frontier"]) for r in runs)
        search = in_process(spec, k, env, targets)
        plain, est = plain_enumerator(values, k, 3370.0, budget_s=args.budget)
        med = statistics.median(times)
        label = f"{label}{', ' + kind if kind else ''}"
        print(f"{label:<16} {k:>2} {len(values):>6} {med:>9.3f} {max(times):>6.2f} {times[0]:>6.2f} "
              f"{max(r[1] for r in runs):>8.0f} {proven:>5}/{k} {search:>9.3f} "
              f"{plain:>8.3g}{' est.' if est else '     '} {plain / med:>8.0f}×", flush=True)
    for label, cmd in (("make 25m --amps 3", ["make", "25m", "--amps", "3", "--json"]), ("--help", ["--help"])):
        runs = [whole(cmd, env) for _ in range(3)]
        print(f"{label:<19} median {statistics.median(r[0] for r in runs):.3f} s, peak "
              f"{max(r[1] for r in runs):.0f} MB (whole process, 3 runs)", flush=True)
    if not args.quick:
        counting = ("import json, time\nfrom netsynth.search.tables import all_tables\nt = time.perf_counter()\n"
                    "sizes = [len(x) for x in all_tables([1.0], None, 20)]\n"
                    "peak = next(int(l.split()[1]) for l in open('/proc/self/status') if l.startswith('VmHWM'))\n"
                    "print(json.dumps([sizes, time.perf_counter() - t, peak / 1024]))")
        out = subprocess.run([sys.executable, "-c", counting], check=True, capture_output=True, text=True, env=env)
        sizes, seconds, peak = json.loads(out.stdout)
        plain, est = plain_enumerator([1.0], 20, 1.0, budget_s=args.budget)
        print(f"A048211 to n = 20: {sizes[-1]} values (OEIS: 24599577) in {seconds:.1f} s, peak {peak:.0f} MB; "
              f"plain sets {plain:.3g} s{' est.' if est else ''} ({plain / seconds:.0f}×)")


if __name__ == "__main__":
    main()
