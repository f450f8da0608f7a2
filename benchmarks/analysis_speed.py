"""Time to analyse one network: per-part stress (nodal), tolerance bands, Monte Carlo, tempco.

Run:  python benchmarks/analysis_speed.py

Bar (issue: operating conditions): the analysis of one 50-part network is instant,
under 10 ms, for the stress check. The full review adds a 20 000-build Monte Carlo.
"""

from __future__ import annotations

import statistics
import time

from netsynth.analysis.conditions import OperatingPoint
from netsynth.analysis.lines import assign_lines
from netsynth.analysis.review import review
from netsynth.analysis.stress import network_stress
from netsynth.analysis.tolerance import tolerance_band
from netsynth.network import parallel, series
from netsynth.stock import default_bin


def median_ms(fn, repeat: int = 30) -> float:
    fn()  # warm up
    times = []
    for _ in range(repeat):
        start = time.perf_counter()
        fn()
        times.append(time.perf_counter() - start)
    return statistics.median(times) * 1e3


def main() -> None:
    stock = default_bin()
    point = OperatingPoint(watts=5.0)
    cases = {
        "50 parts: 10 strings of 5": parallel(*[series(*[100.0] * 5)] * 10),
        "50 parts: 50 in series": series(*[100.0 + i for i in range(50)]),
        "50 parts: nested ladder": _ladder(25),
    }
    print(f"{'network':<28} {'stress ms':>10} {'bands ms':>9} {'review ms':>10} {'lines ms':>9}")
    for name, net in cases.items():
        lines = median_ms(lambda: assign_lines(net, stock, point, counts_bind=False, missing_ok=True))
        net = assign_lines(net, stock, point, counts_bind=False, missing_ok=True).network
        stress = median_ms(lambda: network_stress(net, point))
        bands = median_ms(lambda: tolerance_band(net, [0.01] * 50))
        full = median_ms(lambda: review(net, point), repeat=10)
        print(f"{name:<28} {stress:>10.2f} {bands:>9.2f} {full:>10.2f} {lines:>9.2f}")


def _ladder(rungs: int):
    net = parallel(100.0, 220.0)
    for _ in range(rungs - 1):
        net = parallel(100.0, series(220.0, net))
    return net


if __name__ == "__main__":
    main()
