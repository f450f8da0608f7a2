"""What the network sees (the operating point) and how hard its parts may be driven (derating).

Derating line (IEC 60115-1 style, as drawn in Yageo CFR/MFR and Vishay D/CRCW
datasheets): a part may dissipate its full rated power up to the rated ambient
temperature (70 °C) and linearly less above it, reaching zero at its upper
category temperature (155 °C for common film parts; a bin line may say otherwise)::

    P_allowed(T) = P_rated                                   T ≤ 70 °C
                 = P_rated · (T_max − T) / (T_max − 70 °C)   70 °C < T < T_max
                 = 0                                          T ≥ T_max

netsynth then applies the user's derating factors (design margins, common
practice): the part may run at ``power_factor`` of that line, and at
``voltage_factor`` of its rated voltage, which is the lower of the limiting element
voltage and √(P_rated·R) (the rated continuous working voltage; Yageo and KOA
datasheet notes).
"""

from __future__ import annotations

import math
import numbers
from dataclasses import dataclass

from netsynth import limits
from netsynth.errors import ArgumentError
from netsynth.values import format_quantity

#: °C; rated ambient temperature of IEC 60115-1, used by the datasheets above ("P70").
RATED_AMBIENT_C = 70.0
#: fraction of the derated power a part may dissipate. Common practice, no source:
#: hobby and industry margins of 50 % to 75 % are quoted; 50 % keeps a ¼ W part cool to touch.
DEFAULT_POWER_FACTOR = 0.5
#: fraction of the rated voltage a part may see. Common practice: 80 % is the voltage
#: stress ratio quoted for film resistors from NASA EEE-INST-002 (second-hand, verify).
DEFAULT_VOLTAGE_FACTOR = 0.8
#: °C; a bench at room temperature. Inside a warm enclosure, say so with --ambient.
DEFAULT_AMBIENT_C = 25.0
#: °C; absolute zero; no ambient lies below it (:data:`netsynth.limits.ABSOLUTE_ZERO_C`)
ABSOLUTE_ZERO_C = limits.ABSOLUTE_ZERO_C
#: °C; the ambient temperatures accepted (:mod:`netsynth.limits`, reason there)
MIN_AMBIENT_C = limits.MIN_AMBIENT_C
MAX_AMBIENT_C = limits.MAX_AMBIENT_C
#: the drive quantities of an operating point: (low, high, range as text), from :mod:`netsynth.limits`
DRIVE_RANGES = {
    "volts": (limits.MIN_VOLTS, limits.MAX_VOLTS, limits.VOLTS_RANGE),
    "amps": (limits.MIN_AMPS, limits.MAX_AMPS, limits.AMPS_RANGE),
    "watts": (limits.MIN_WATTS, limits.MAX_WATTS, limits.WATTS_RANGE),
}
#: V; above this the network or a part is treated as hazardous (the issue's threshold;
#: PCB-spacing practice treats 60 V DC / 30 V AC as hazardous).
CAUTION_VOLTS = 50.0
#: a part using more than this fraction of its derated limit is "near its rating".
NEAR_LIMIT = 0.8


@dataclass(frozen=True, slots=True)
class OperatingPoint:
    """What the whole network sees: exactly one of ``volts``, ``amps`` or ``watts``.

    Each within its range of :mod:`netsynth.limits` (volts 1 µV .. 1 MV, amps 1 pA .. 10 kA,
    watts 1 pW .. 1 MW), ``duty`` from 1 ppm to 1 and ``ambient_c`` from −100 to 300 °C;
    anything else raises :class:`~netsynth.errors.ArgumentError`.

    ``duty`` is the fraction of time the network is driven (1 for continuous): power
    limits are checked against the average power ``duty × peak``, voltage limits
    against the peak. Short pulses can exceed the average rating only as far as the
    part maker's pulse-load curve allows; netsynth does not model that.
    """

    volts: float | None = None
    amps: float | None = None
    watts: float | None = None
    duty: float = 1.0
    ambient_c: float = DEFAULT_AMBIENT_C
    mains: bool = False

    def __post_init__(self) -> None:
        given = [(n, v) for n, v in (("volts", self.volts), ("amps", self.amps), ("watts", self.watts)) if v is not None]
        if len(given) != 1:
            raise ArgumentError("give exactly one of volts, amps or watts for the operating point")
        name, value = given[0]
        if not (_is_number(value) and value > 0 and _finite(value)):
            raise ArgumentError(f"{name}={_shown(value)}: must be a finite value above zero")
        low, high, span = DRIVE_RANGES[name]
        if not low <= value <= high:
            raise ArgumentError(f"{name}={_shown(value)}: must be from {span}")
        if not (_is_number(self.duty) and 0 < self.duty <= 1):
            raise ArgumentError(f"duty={_shown(self.duty)}: the duty cycle is a fraction above 0 and at most 1 (100 %)")
        if self.duty < limits.MIN_DUTY:
            raise ArgumentError(f"duty={_shown(self.duty)}: the duty cycle must be from {limits.DUTY_RANGE}")
        if not _is_number(self.ambient_c) or not _finite(self.ambient_c) and math.isnan(self.ambient_c):
            raise ArgumentError(f"ambient_c={_shown(self.ambient_c)}: expected a temperature in °C (a number)")
        if not self.ambient_c > ABSOLUTE_ZERO_C:
            raise ArgumentError(f"ambient_c={_shown(self.ambient_c)}: below absolute zero ({ABSOLUTE_ZERO_C:g} °C)")
        if not (MIN_AMBIENT_C <= self.ambient_c <= MAX_AMBIENT_C):
            raise ArgumentError(f"ambient_c={_shown(self.ambient_c)}: expected an ambient temperature from "
                                f"{MIN_AMBIENT_C:g} to {MAX_AMBIENT_C:g} °C")

    def volts_across(self, ohms: float) -> float:
        """Peak voltage across a network of ``ohms`` at this operating point (Ohm's law)."""
        if self.volts is not None:
            return self.volts
        if self.amps is not None:
            return self.amps * ohms
        return math.sqrt(self.watts * ohms)  # P = V²/R

    def describe(self) -> str:
        """Short text: '24 V', '2 A', '5 W', '150 mA', with the duty when pulsed, and the ambient.

        >>> OperatingPoint(amps=1.5e-12, duty=0.1).describe()
        '1.5 pA at 10 % duty, ambient 25 °C'
        """
        if self.volts is not None:
            text = format_quantity(self.volts, "V", 6)
        elif self.amps is not None:
            text = format_quantity(self.amps, "A", 6)
        else:
            text = format_quantity(self.watts, "W", 6)
        if self.duty < 1:
            text += f" at {self.duty * 100:.6g} % duty"
        return text + f", ambient {self.ambient_c:.6g} °C"


@dataclass(frozen=True, slots=True)
class Derating:
    """The user's margins on each part's ratings (fractions, 0 < f ≤ 1)."""

    power_factor: float = DEFAULT_POWER_FACTOR
    voltage_factor: float = DEFAULT_VOLTAGE_FACTOR

    def __post_init__(self) -> None:
        for name, f in (("power_factor", self.power_factor), ("voltage_factor", self.voltage_factor)):
            if not (_is_number(f) and 0 < f <= 1):
                raise ArgumentError(f"{name}={_shown(f)}: a derating factor is a fraction above 0 and at most 1")
            if f < limits.MIN_DERATE:
                raise ArgumentError(f"{name}={_shown(f)}: a derating factor is at least {limits.MIN_DERATE:g} (1 %); "
                                    "a smaller margin asks for a different part")


def _is_number(x: object) -> bool:
    """A real number that is not a bool (``True`` is an int to Python, never a voltage here)."""
    return isinstance(x, numbers.Real) and not isinstance(x, bool)


def _finite(x: numbers.Real) -> bool:
    """``math.isfinite`` that also answers for an int too large for a float (it is finite)."""
    try:
        return math.isfinite(x)
    except OverflowError:
        return True


def _shown(x: object) -> str:
    """A short repr of an argument for a message (a huge int has no repr in Python 3.11+)."""
    try:
        return limits.excerpt(repr(x))
    except ValueError:
        return f"<a {type(x).__name__} too long to print>"


def temperature_fraction(ambient_c: float, max_temp_c: float, rated_ambient_c: float = RATED_AMBIENT_C) -> float:
    """Fraction of rated power allowed at ``ambient_c`` on the linear derating line.

    >>> temperature_fraction(70.0, 155.0), temperature_fraction(155.0, 155.0)
    (1.0, 0.0)
    """
    if ambient_c <= rated_ambient_c:
        return 1.0
    if ambient_c >= max_temp_c:
        return 0.0
    return (max_temp_c - ambient_c) / (max_temp_c - rated_ambient_c)


def limit_watts(power_rating_w: float, max_temp_c: float, ambient_c: float, derating: Derating) -> float:
    """Average power (W) a part may dissipate: rating × derating line × power factor."""
    return power_rating_w * temperature_fraction(ambient_c, max_temp_c) * derating.power_factor


def limit_volts(ohms: float, power_rating_w: float, max_volts: float, derating: Derating) -> float:
    """Peak voltage (V) a part may see: voltage factor × min(LEV, √(P_rated·R))."""
    return derating.voltage_factor * min(max_volts, math.sqrt(power_rating_w * ohms))
