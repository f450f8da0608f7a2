"""Trimming a measured part: the series or parallel part that brings it to the target.

A calibration bench measures a base part (or a built network) and finds it slightly off; a
second, much larger (parallel) or much smaller (series) part pulls it onto the target, and
because that trim carries only a small share of the result, its own tolerance barely matters.

Map of the module
-----------------
``trim_target``    the trim value for a base and a target: series t = T − Rbase (Rbase < T),
                   parallel t = 1/(1/T − 1/Rbase) (Rbase > T)
``sensitivity``    S = ∂ln R/∂ln t of the trimmed result to the trim: series t/(Rbase + t),
                   parallel Rbase/(Rbase + t); the base's own is 1 − S
``combine``        the trimmed result, Rbase + t or Rbase·t/(Rbase + t)
``TrimResult``     base, trim network, result, its nodal check, sensitivity and band

Formulas: series and parallel resistance (OpenStax *University Physics* Vol. 2, §10.2); the
sensitivities follow by differentiating them. The band is exact, not first order: a resistor
network's value only grows when a part grows (Rayleigh's monotonicity law, P. G. Doyle and
J. L. Snell, *Random Walks and Electric Networks*, 1984), so the lowest result is the base at
its lowest with the trim at its lowest, and likewise the highest.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import TYPE_CHECKING, Literal, get_args

from netsynth.errors import ArgumentError

if TYPE_CHECKING:  # the formulas load without numpy (the command line's --help stays fast)
    from netsynth.design import Design

__all__ = ["TRIM_MODES", "TrimMode", "TrimResult", "combine", "sensitivity", "trim_result", "trim_target"]

#: how the trim joins the base; ``auto`` picks series below the target and parallel above it
TrimMode = Literal["auto", "series", "parallel"]
TRIM_MODES: tuple[str, ...] = get_args(TrimMode)


def _positive(x: object, name: str) -> float:
    if isinstance(x, bool) or not isinstance(x, (int, float)) or not math.isfinite(x) or not x > 0:
        raise ArgumentError(f"{name}={x!r}: expected a finite resistance above zero")
    return float(x)


def _mode(base: float, target: float, mode: str) -> str:
    if mode not in TRIM_MODES:
        raise ArgumentError(f"mode={mode!r}: choose one of {', '.join(TRIM_MODES)}")
    if base == target:
        raise ArgumentError(f"base_ohms={base!r}: the base is already on the target; no trim is needed")
    if mode == "auto":
        return "series" if base < target else "parallel"
    if mode == "series" and base > target:
        raise ArgumentError(f"mode='series': a series trim only adds; the base {base:g} Ω is above the target "
                            f"{target:g} Ω, so use a parallel trim")
    if mode == "parallel" and base < target:
        raise ArgumentError(f"mode='parallel': a parallel trim only lowers; the base {base:g} Ω is below the target "
                            f"{target:g} Ω, so use a series trim")
    return mode


def trim_target(base_ohms: float, target_ohms: float, mode: TrimMode = "auto") -> tuple[str, float]:
    """The trim that brings ``base_ohms`` exactly to ``target_ohms``: (mode, ohms).

    Raises
    ------
    ArgumentError
        When the base is on the target, or the mode cannot reach it (series above, parallel below).

    Examples
    --------
    >>> mode, t = trim_target(10_020.0, 10_000.0)  # trim a 10.02 k to 10.00 k
    >>> mode, round(t)
    ('parallel', 5010000)
    >>> trim_target(990.0, 1000.0)
    ('series', 10.0)
    """
    base = _positive(base_ohms, "base_ohms")
    target = _positive(target_ohms, "target_ohms")
    mode = _mode(base, target, mode)
    if mode == "series":
        return mode, target - base
    return mode, 1.0 / (1.0 / target - 1.0 / base)


def combine(base_ohms: float, trim_ohms: float, mode: str) -> float:
    """The trimmed value: base + trim (series) or base·trim/(base + trim) (parallel)."""
    if mode == "series":
        return base_ohms + trim_ohms
    return base_ohms * trim_ohms / (base_ohms + trim_ohms)


def sensitivity(base_ohms: float, trim_ohms: float, mode: str) -> float:
    """S = ∂ln R/∂ln t: the fraction by which the result moves per fraction the trim moves.

    Series: t/(Rbase + t); parallel: Rbase/(Rbase + t). A 1 % trim with S = 0.002 moves the
    result by 0.002 %.

    >>> round(sensitivity(10_020.0, 5_010_000.0, "parallel"), 6)
    0.001996
    """
    if mode == "series":
        return trim_ohms / (base_ohms + trim_ohms)
    if mode == "parallel":
        return base_ohms / (base_ohms + trim_ohms)
    raise ArgumentError(f"mode={mode!r}: expected 'series' or 'parallel'")


@dataclass(frozen=True, slots=True)
class TrimResult:
    """A base part, the trim network chosen for it, and the trimmed result."""

    base_ohms: float  #: Ω, as measured
    base_uncertainty: float  #: fraction, the measurement's uncertainty (± band)
    target_ohms: float
    mode: str  #: "series" or "parallel"
    ideal_trim_ohms: float  #: Ω, the trim that would land exactly
    design: Design  #: the trim network's design (its ``target_ohms`` is ``ideal_trim_ohms``)
    result_ohms: float  #: Ω, base and built trim combined
    verified_ohms: float  #: Ω, the combined network by nodal analysis
    sensitivity: float  #: ∂ln R/∂ln t of the result to the trim
    band_ohms: tuple[float, float]  #: (low, high): base ± its uncertainty and the trim's worst case

    @property
    def error(self) -> float:
        """Signed relative error of the result, result / target − 1."""
        return self.result_ohms / self.target_ohms - 1.0

    @property
    def trim_effect(self) -> float:
        """The largest relative move of the result from the trim's own worst case (a fraction)."""
        low, high = self.design.review.band.low_ohms, self.design.review.band.high_ohms
        lo = combine(self.base_ohms, low, self.mode) / self.result_ohms - 1.0
        hi = combine(self.base_ohms, high, self.mode) / self.result_ohms - 1.0
        return max(abs(lo), abs(hi))


def trim_result(base_ohms: float, target_ohms: float, design: Design, mode: str,
                base_uncertainty: float = 0.0) -> TrimResult:
    """Combine a measured base with the trim network ``design`` found for it, and check the result.

    The base and the trim are joined into one network (the base as a part of no stock line)
    and solved by the nodal solver.

    Raises
    ------
    ArgumentError
        Bad arguments (names the parameter).
    VerificationError
        The nodal solve disagrees with the series/parallel value (a bug).
    """
    base = _positive(base_ohms, "base_ohms")
    target = _positive(target_ohms, "target_ohms")
    if isinstance(base_uncertainty, bool) or not isinstance(base_uncertainty, (int, float)) \
            or not 0 <= base_uncertainty < 1:
        raise ArgumentError(f"base_uncertainty={base_uncertainty!r}: expected a fraction from 0 to below 1")
    from netsynth.network import Part, parallel, resistance, series, to_netlist
    from netsynth.nodal import VERIFY_RTOL, verify_resistance

    mode = _mode(base, target, mode)
    ideal = trim_target(base, target, mode)[1]
    trim = design.best.value_ohms
    join = series if mode == "series" else parallel
    net = join(Part(base), design.best.network)
    value = resistance(net)
    edges, nodes = to_netlist(net)
    verified = verify_resistance(value, edges, nodes, rtol=VERIFY_RTOL)
    low_t, high_t = design.review.band.low_ohms, design.review.band.high_ohms
    band = (combine(base * (1 - base_uncertainty), low_t, mode), combine(base * (1 + base_uncertainty), high_t, mode))
    return TrimResult(base, float(base_uncertainty), target, mode, ideal, design, value, verified,
                      sensitivity(base, trim, mode), band)
