"""Searches with an operating point: time, part count against the lower bound, headroom.

Run:  python benchmarks/constrained_search.py

Each case runs the whole ``make`` pipeline (search, nodal stress check of every row,
review of the recommended network) three times and prints the median wall time.
"""

from __future__ import annotations

import statistics
import time
from pathlib import Path

from netsynth.analysis.conditions import OperatingPoint
from netsynth.api import make
from netsynth.stock import kit_bin, load_bin

BINS = Path(__file__).resolve().parent.parent / "bins"

CASES = [
    # (label, target ohms, operating point, bin)
    ("10 Ω at 5 W, ¼ W E12 kit", 10.0, OperatingPoint(watts=5.0), lambda: load_bin(BINS / "quarter-watt-kit.csv")),
    ("10 Ω at 5 W, ¼ W E24 1 Ω..10 MΩ", 10.0, OperatingPoint(watts=5.0), lambda: kit_bin("E24", 1.0, 10e6)),
    ("1.8 MΩ at 1 kV, 200 V E24", 1.8e6, OperatingPoint(volts=1000.0), lambda: kit_bin("E24", 1.0, 10e6)),
    ("25 mΩ shunt at 3 A, ¼ W E24", 0.025, OperatingPoint(amps=3.0), lambda: kit_bin("E24", 1.0, 10e6)),
    ("3.37 kΩ at 24 V, default bin", 3370.0, OperatingPoint(volts=24.0), lambda: kit_bin("E24", 10.0, 1e6)),
    ("470 Ω at 12 V 10 % duty, 85 °C", 470.0, OperatingPoint(volts=12.0, duty=0.1, ambient_c=85.0),
     lambda: kit_bin("E24", 1.0, 10e6)),
]


def main() -> None:
    print(f"{'case':<34} {'median s':>9} {'bound':>6} {'parts':>6} {'error':>10} {'headroom':>9}")
    for label, target, point, make_bin in CASES:
        stock = make_bin()
        times = []
        for _ in range(3):
            start = time.perf_counter()
            design = make(target, stock, point=point, alternatives=0)
            times.append(time.perf_counter() - start)
        best = design.best
        headroom = design.review.stress.headroom
        print(
            f"{label:<34} {statistics.median(times):>9.3f} {design.bound.count:>6} {best.parts:>6} "
            f"{best.error:>+10.2e} {headroom:>8.2f}×",
            flush=True,
        )


if __name__ == "__main__":
    main()
