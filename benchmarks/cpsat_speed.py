"""CP-SAT's bars: a board plan, scarce-stock power arrays, a mixed network under a power limit.

Run:  python benchmarks/cpsat_speed.py            (about a minute)
      python benchmarks/cpsat_speed.py --quick    (the three bars only)

Prints, for each case, the wall time (median of three runs), the status and the answer, once
with two solver workers and once with one. Bars on the reference 2-core machine: the 20-need plan
from a 100-line limited bin proven optimal in under 2 s; 10 Ω at 5 W from ¼ W parts with at most
15 of each value proven within the family in under 5 s; a 12-part mixed-value network under a
power limit in under 10 s; ``netsynth --help`` and a k = 4 ``make`` import no solver.

The last table compares CP-SAT with plain enumeration on the same request (fewest parts within the
accuracy, within one family) as the part limit grows, to show where the solver starts to win.
"""

from __future__ import annotations

import math
import random
import statistics
import subprocess
import sys
import time

from netsynth.analysis.conditions import OperatingPoint
from netsynth.api import make
from netsynth.plan import Need, plan_board
from netsynth.search.cpsat import FAMILIES, family_search
from netsynth.search.solver import SolverSettings
from netsynth.stock import StockBin, StockItem, kit_bin


def timed(fn, runs: int = 3):
    times, out = [], None
    for _ in range(runs):
        start = time.perf_counter()
        out = fn()
        times.append(time.perf_counter() - start)
    return statistics.median(times), out


def plan_case(workers: int) -> None:
    rng = random.Random(20)
    kit = kit_bin("E24", 1.0, 1e6)
    stock = StockBin(tuple(StockItem(i.ohms, rng.randint(1, 4)) for i in kit.items[:100]), name="100 lines")
    targets = sorted(round(10 ** rng.uniform(1.3, 3.7), 1) for _ in range(20))
    needs = [Need(f"R{i + 1}", t, 0.005) for i, t in enumerate(targets)]
    settings = SolverSettings(seconds=10.0, workers=workers)
    seconds, plan = timed(lambda: plan_board(needs, stock, max_parts=4, settings=settings))
    alloc = sum(s.seconds for s in plan.kit.stages)
    print(f"  plan, 20 needs ±0.5 %, 100-line bin (1..4 each), k=4, workers={workers}: {seconds:.2f} s "
          f"(allocation {alloc:.2f} s), {plan.status}, {plan.served}/20 served, {plan.parts} parts")


def tight_plan_case(workers: int) -> None:
    # the same bin with one or two of each value, and the needs clustered in 900 Ω .. 2.5 kΩ, so they compete
    rng = random.Random(21)
    kit = kit_bin("E24", 1.0, 1e6)
    stock = StockBin(tuple(StockItem(i.ohms, rng.randint(1, 2)) for i in kit.items[:100]), name="100 lines")
    needs = [Need(f"R{i + 1}", round(rng.uniform(900.0, 2500.0), 1), 0.002) for i in range(20)]
    settings = SolverSettings(seconds=10.0, workers=workers)
    seconds, plan = timed(lambda: plan_board(needs, stock, max_parts=4, settings=settings))
    alloc = sum(s.seconds for s in plan.kit.stages)
    print(f"  plan, 20 needs ±0.2 % in 900..2500 Ω, 100-line bin (1..2 each), k=4, workers={workers}: "
          f"{seconds:.2f} s (allocation {alloc:.2f} s), {plan.status}, {plan.served}/20 served, {plan.parts} parts")


def scarce_bin() -> StockBin:
    rng = random.Random(3)
    kit = kit_bin("E24", 1.0, 910.0)
    return StockBin(tuple(StockItem(i.ohms, c) for i in kit.items if (c := rng.randint(0, 15))),
                    name="E24 1..910 Ω, 0..15 each")


def power_case(workers: int) -> None:
    stock = scarce_bin()
    settings = SolverSettings(seconds=10.0, workers=workers)
    for family in FAMILIES:
        seconds, ans = timed(lambda: family_search(10.0, stock, family, 0.01, 88, OperatingPoint(watts=5.0),
                                                   settings=settings))
        print(f"  10 Ω at 5 W, ¼ W, ≤15 each, {family:<7} workers={workers}: {seconds:.2f} s, {ans.status} "
              f"({ans.describe()}), {ans.found.parts} parts, {ans.found.error * 1e6:+.1f} ppm, {ans.options} options")
    seconds, design = timed(lambda: make(10.0, stock, point=OperatingPoint(watts=5.0), alternatives=0), runs=1)
    best = next(e for e in design.frontier if e.best is design.best)
    print(f"  whole make (auto engine, 2 workers): {seconds:.2f} s, {best.parts} parts ({best.method}, "
          f"{best.row.status or best.method}), bound {design.bound.count}")


def mixed_case() -> None:
    # 1k234 ±0.1 % at 1.5 W: at least 1.5 / 0.125 = 12 ¼ W parts; three of each E24 value
    stock = kit_bin("E24", 10.0, 100e3, count=3)
    for engine in ("arrays", "cpsat", "auto"):
        try:
            seconds, design = timed(lambda: make(1234.0, stock, point=OperatingPoint(watts=1.5), within=0.001,
                                                 alternatives=0, engine=engine), runs=1)
        except Exception as e:  # noqa: BLE001 - a benchmark prints what happened
            print(f"  1k234 ±0.1 % at 1.5 W, ≤3 each, engine {engine}: {type(e).__name__}: {e}")
            continue
        best = design.frontier[-1]
        print(f"  1k234 ±0.1 % at 1.5 W, ≤3 each, engine {engine}: {seconds:.2f} s, {best.parts} parts "
              f"({best.method}: {best.row.status or 'not proven'}), {best.best.error * 1e6:+.1f} ppm, "
              f"bound {design.bound.count}")


def startup() -> None:
    for args in (["--help"], ["make", "3k37"]):
        code = ("import sys, time; t = time.perf_counter(); from netsynth.cli import cli\n"
                "try:\n    cli(" + repr(args) + ", standalone_mode=False)\nexcept SystemExit:\n    pass\n"
                "print(time.perf_counter() - t, 'ortools' in sys.modules, file=sys.stderr)")
        out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True)
        seconds, loaded = out.stderr.split()[-2:]
        print(f"  netsynth {' '.join(args)}: {float(seconds):.2f} s, OR-Tools imported: {loaded}")


def family_networks(values, counts, target, within, max_parts, watts, limit_w):
    """Enumeration: the fewest parts of any series string of parallel banks (≤ 2 values per bank, up to
    max_parts parts, within the counts) inside ±within whose every part stays under limit_w at a
    ``watts`` drive (each part: P·r_bank² / (R·R_part), the string current squared being P/R)."""
    banks = []
    n = len(values)
    for a in range(n):
        for k in range(1, max_parts + 1):
            banks.append(((a, k),))
        for b in range(a + 1, n):
            for ka in range(1, max_parts):
                for kb in range(1, max_parts - ka + 1):
                    banks.append(((a, ka), (b, kb)))
    r = [1.0 / sum(k / values[i] for i, k in bank) for bank in banks]
    size = [sum(k for _, k in bank) for bank in banks]
    worst = [max(r[j] ** 2 / values[i] for i, _ in bank) for j, bank in enumerate(banks)]
    best = None

    def walk(start, used, parts, total, stress):
        nonlocal best
        if parts and abs(total / target - 1) <= within and watts * stress / total <= limit_w * (1 + 1e-9):
            if best is None or parts < best:
                best = parts
        for j in range(start, len(banks)):
            if parts + size[j] > max_parts or total + r[j] > target * (1 + within):
                continue
            if best is not None and parts + size[j] >= best:
                continue
            need = list(used)
            for i, k in banks[j]:
                need[i] += k
            if any(need[i] > counts[i] for i in range(n)):
                continue
            walk(j, need, parts + size[j], total + r[j], max(stress, worst[j]))

    walk(0, [0] * n, 0, 0.0, 0.0)
    return best


def crossover() -> None:
    values = [1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2, 10.0, 12.0, 15.0]
    counts = [2] * len(values)
    stock = StockBin(tuple(StockItem(v, c) for v, c in zip(values, counts)))
    print("  10 Ω ±1 % at n × 0.12 W from ¼ W parts (at least n parts), E12 1..15 Ω, two of each;")
    print("  same request both ways: the fewest parts of a series string of parallel banks")
    for n in (3, 4, 5, 6, 7, 10):
        watts = n * 0.12
        budget = 120.0
        enum, t_enum = "-", math.nan
        if n <= 6:  # enumeration grows about 7x per part: n = 7 took 287 s on the reference machine
            start = time.perf_counter()
            enum = family_networks(values, counts, 10.0, 0.01, n + 3, watts, 0.125)
            t_enum = time.perf_counter() - start
        start = time.perf_counter()
        ans = family_search(10.0, stock, "banks", 0.01, n + 3, OperatingPoint(watts=watts),
                            settings=SolverSettings(seconds=budget), force=True)
        t_cp = time.perf_counter() - start
        cp = ans.found.parts if ans and ans.found else None
        print(f"    n = {n}, up to {n + 3:>2} parts: enumeration {t_enum:7.2f} s -> {enum}   "
              f"CP-SAT {t_cp:6.2f} s -> {cp} ({ans.status if ans else 'skipped'})", flush=True)


def main() -> None:
    quick = "--quick" in sys.argv[1:]
    print("Bars")
    for workers in (2, 1):
        plan_case(workers)
        tight_plan_case(workers)
    for workers in (2, 1):
        power_case(workers)
    mixed_case()
    startup()
    if not quick:
        print("Where CP-SAT starts to beat enumeration")
        crossover()


if __name__ == "__main__":
    main()
