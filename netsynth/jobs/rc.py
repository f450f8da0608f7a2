"""RC timing: the resistance for a time constant or a corner frequency, and the bands of the result.

Map of the module
-----------------
:func:`parse_capacitance`, :func:`parse_time`, :func:`parse_frequency`
    Read ``100n``, ``4n7``, ``2.2 µF``; ``1ms``, ``250 us``; ``1kHz``, ``159.2 Hz``.
``RcGoal`` and :func:`tau_goal`, :func:`corner_goal`
    What is asked (a time constant in seconds or a corner frequency in hertz) with the
    capacitor (farads and its tolerance); :meth:`RcGoal.resistance_ohms` is the resistance to
    search for.
:func:`rc_result` / ``RcResult``
    What a network of a given value and worst-case band achieves with that capacitor: τ or f,
    its error, and its worst-case band including the capacitor's tolerance.

Formulas
--------
The time constant of a resistor R charging a capacitor C is ``τ = R·C`` and the corner
(−3 dB) frequency of the first-order RC low-pass or high-pass is ``f = 1/(2π·R·C)``
(OpenStax *University Physics* Vol. 2 §10.5 "RC Circuits"; the corner frequency from the
same time constant, ``ω = 1/τ``). So ``R = τ/C`` or ``R = 1/(2π·f·C)``. τ grows with R and C
and f falls with both, so the worst case of either is at the ends of the resistor's band and
the capacitor's band together (exact, no corner search).

This module imports no numpy: the command line reads its options with these parsers.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from typing import Literal

from netsynth import limits
from netsynth.errors import ArgumentError, ValueParseError

RcKind = Literal["tau", "corner"]

#: SI prefixes read by the parsers (SI Brochure, 9th ed., Table 7); ``u`` stands for µ
_PREFIX = {"p": -12, "n": -9, "u": -6, "µ": -6, "μ": -6, "m": -3, "k": 3, "K": 3, "M": 6, "G": 9}
_NUM = r"(?P<num>\d+\.?\d*|\.\d+)(?P<exp>[eE][+-]?\d+)?"
_PREFIXES = "pnuµμmkKMG"


def parse_quantity(text: str, units: tuple[str, ...], what: str, examples: str) -> float:
    """A positive quantity in SI base units from ``number [prefix] [unit]`` or IEC 60062 style ``4n7``.

    ``units`` are the unit symbols accepted after the prefix (none is needed); ``what`` and
    ``examples`` finish the error message.

    >>> parse_quantity("20nA", ("A",), "a current", "20nA"), parse_quantity("1u5", ("A",), "a current", "")
    (2e-08, 1.5e-06)
    """
    if not isinstance(text, str):
        raise ValueParseError(f"{what}: expected text such as {examples}, got {text!r}")
    s = text.strip()
    unit = "|".join(re.escape(u) for u in units)
    m = re.fullmatch(rf"{_NUM}\s*(?P<prefix>[{_PREFIXES}])?\s*(?:{unit})?", s)
    if m:
        exponent = int(m["exp"][1:] if m["exp"] else 0) + _PREFIX.get(m["prefix"], 0)
        value = float(f"{m['num']}e{exponent}")  # one correctly rounded conversion of the decimal text
    else:
        # IEC 60062 style: the prefix letter in place of the decimal point (4n7 = 4.7 n)
        m = re.fullmatch(rf"(?P<int>\d+)(?P<prefix>[{_PREFIXES}])(?P<frac>\d+)\s*(?:{unit})?", s)
        if not m:
            raise ValueParseError(f"cannot read {s!r}: expected {what} such as {examples}")
        value = float(f"{m['int']}.{m['frac']}e{_PREFIX[m['prefix']]}")
    if not (value > 0 and math.isfinite(value)):
        raise ValueParseError(f"cannot read {s!r}: {what} must be a finite value above zero")
    return value


def parse_capacitance(text: str) -> float:
    """Read a capacitance in farads: ``100n``, ``100nF``, ``4n7``, ``2.2 µF``, ``10u``, ``1e-6``.

    A bare number is farads. Lowercase ``m`` is milli and ``M`` mega, as for resistances.

    Examples
    --------
    >>> parse_capacitance("100nF"), parse_capacitance("4n7"), parse_capacitance("2.2 uF")
    (1e-07, 4.7e-09, 2.2e-06)
    """
    return parse_quantity(text, ("F",), "a capacitance", "100n, 100nF, 4n7 or 2.2uF")


def parse_time(text: str) -> float:
    """Read a time in seconds: ``1ms``, ``250 us``, ``2.5 s``, ``1e-3``.

    Examples
    --------
    >>> parse_time("1ms"), parse_time("250 us"), parse_time("2.5")
    (0.001, 0.00025, 2.5)
    """
    return parse_quantity(text, ("s",), "a time", "1ms, 250us or 2.5s")


def parse_frequency(text: str) -> float:
    """Read a frequency in hertz: ``1kHz``, ``159.2 Hz``, ``50``, ``2k``.

    Examples
    --------
    >>> parse_frequency("1kHz"), parse_frequency("159.2 Hz"), parse_frequency("2k")
    (1000.0, 159.2, 2000.0)
    """
    return parse_quantity(text, ("Hz", "hz", "HZ"), "a frequency", "1kHz, 159.2Hz or 50")


@dataclass(frozen=True, slots=True)
class RcGoal:
    """A time constant (seconds) or a corner frequency (hertz) with a given capacitor."""

    kind: RcKind
    value: float  #: τ in seconds, or f in hertz
    cap_farads: float
    cap_tolerance: float = 0.0  #: fraction: 0.05 = ±5 %

    @property
    def unit(self) -> str:
        return "s" if self.kind == "tau" else "Hz"

    @property
    def resistance_ohms(self) -> float:
        """The resistance that hits the goal exactly: ``τ/C`` or ``1/(2π·f·C)``.

        Examples
        --------
        >>> tau_goal(1.0, 100e-6).resistance_ohms           # 1 s with 100 µF: 10 kΩ
        10000.0
        >>> round(corner_goal(1000.0, 100e-9).resistance_ohms, 6)  # 1/(2π·1 kHz·100 nF)
        1591.549431
        """
        if self.kind == "tau":
            return self.value / self.cap_farads
        return 1.0 / (2.0 * math.pi * self.value * self.cap_farads)

    def achieved(self, ohms: float, cap_farads: float | None = None) -> float:
        """τ (s) or f (Hz) with ``ohms`` and the capacitor (its nominal value unless given)."""
        c = self.cap_farads if cap_farads is None else cap_farads
        return ohms * c if self.kind == "tau" else 1.0 / (2.0 * math.pi * ohms * c)

    def describe(self) -> str:
        what = f"time constant τ = {self.value:.6g} s" if self.kind == "tau" else f"corner frequency f = {self.value:.6g} Hz"
        tol = f" ±{self.cap_tolerance * 100:g} %" if self.cap_tolerance else ""
        return f"{what} with C = {self.cap_farads:.4g} F{tol}"


#: accepted ranges: 1 fF (a trimmer's stray) to 10 kF (the largest supercapacitor banks); τ from 1 ps to
#: about 4 months; f from 1 µHz to 1 THz. Beyond them no RC network of real parts exists.
CAP_RANGE_F = (1e-15, 1e4)
TAU_RANGE_S = (1e-12, 1e7)
CORNER_RANGE_HZ = (1e-6, 1e12)


def _goal(kind: RcKind, name: str, value: float, cap_farads: float, cap_tolerance: float) -> RcGoal:
    ranges = ((name, value, TAU_RANGE_S if kind == "tau" else CORNER_RANGE_HZ), ("cap_farads", cap_farads, CAP_RANGE_F))
    for label, x, (low, high) in ranges:
        if isinstance(x, bool) or not isinstance(x, (int, float)) or not (math.isfinite(x) and x > 0):
            raise ArgumentError(f"{label}={x!r}: must be a finite value above zero")
        if not low <= x <= high:
            raise ArgumentError(f"{label}={x!r}: netsynth takes {low:g} to {high:g}")
    if isinstance(cap_tolerance, bool) or not isinstance(cap_tolerance, (int, float)) or not 0 <= cap_tolerance < 1:
        raise ArgumentError(f"cap_tolerance={cap_tolerance!r}: a tolerance is a fraction from 0 up to 1 (0.05 = ±5 %)")
    goal = RcGoal(kind, float(value), float(cap_farads), float(cap_tolerance))
    r = goal.resistance_ohms
    if not limits.MIN_OHMS <= r <= limits.MAX_OHMS:
        raise ArgumentError(f"{name}={value!r} with cap_farads={cap_farads!r} needs R = {r:.3g} Ω, outside the "
                            f"{limits.MIN_OHMS:g} Ω to {limits.MAX_OHMS:g} Ω netsynth builds; choose another capacitor")
    return goal


def tau_goal(tau_s: float, cap_farads: float, cap_tolerance: float = 0.0) -> RcGoal:
    """A time constant τ (seconds) with a capacitor of ``cap_farads`` ± ``cap_tolerance``."""
    return _goal("tau", "tau_s", tau_s, cap_farads, cap_tolerance)


def corner_goal(corner_hz: float, cap_farads: float, cap_tolerance: float = 0.0) -> RcGoal:
    """A corner frequency f (hertz) with a capacitor of ``cap_farads`` ± ``cap_tolerance``."""
    return _goal("corner", "corner_hz", corner_hz, cap_farads, cap_tolerance)


@dataclass(frozen=True, slots=True)
class RcResult:
    """What a resistor network achieves with the goal's capacitor."""

    goal: RcGoal
    ohms: float
    achieved: float  #: τ in seconds or f in hertz, nominal parts
    error: float  #: achieved / goal − 1
    low: float  #: worst case over the network's band and the capacitor's tolerance
    high: float


def rc_result(goal: RcGoal, ohms: float, low_ohms: float, high_ohms: float) -> RcResult:
    """τ or f from a network of ``ohms`` whose worst-case band is ``low_ohms .. high_ohms``.

    τ = R·C grows with both, f = 1/(2πRC) falls with both, so the band's ends pair the
    resistor's and the capacitor's ends (exact).

    Examples
    --------
    10 kΩ ±1 % with 100 µF ±10 %: τ from 0.99·0.9 = 0.891 s to 1.01·1.1 = 1.111 s (hand arithmetic):

    >>> r = rc_result(tau_goal(1.0, 100e-6, 0.10), 10e3, 9.9e3, 10.1e3)
    >>> round(r.low, 12), round(r.high, 12), r.error
    (0.891, 1.111, 0.0)
    """
    c, t = goal.cap_farads, goal.cap_tolerance
    achieved = goal.achieved(ohms)
    ends = (goal.achieved(low_ohms, c * (1 - t)), goal.achieved(high_ohms, c * (1 + t)))
    return RcResult(goal, ohms, achieved, achieved / goal.value - 1.0, min(ends), max(ends))
