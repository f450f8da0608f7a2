"""Temperature sensors as resistances: platinum RTDs and NTC thermistors, both ways.

A controller or transmitter is tested by putting a fixed network where its sensor would be;
the network must have the sensor's resistance at the temperature to be shown. This module
gives that resistance, the temperature a resistance reads as (the inverse), the slope dR/dT,
and so the error of a built network as an equivalent temperature error in °C.

Map of the module
-----------------
``Sensor``                the protocol: ``ohms(t_c)``, ``temp_c(ohms)``, ``slope(t_c)``, ``name``, range
``PlatinumRTD``           Callendar–Van Dusen with the IEC 60751 coefficients; Pt100, Pt1000, any R0
``BetaNTC``               R = R25·exp(B·(1/T − 1/T25)), T in kelvin
``SteinhartHartNTC``      1/T = a + b·ln R + c·(ln R)³
``temperature_error_c``   the error of a built value in °C: the temperature it reads as, minus the set point
``calibration_ladder``    several set points from one bin, in turn (greedy; see :mod:`.shared`)
``SENSOR_KINDS``          the kinds the command line names (pt100, pt1000, rtd, ntc)

Formulas
--------
Platinum (IEC 60751:2022, §5.1.3 and Table 1; coefficients A = 3.9083e-3 °C⁻¹, B = −5.775e-7 °C⁻²,
C = −4.183e-12 °C⁻⁴)::

    R(t) = R0·(1 + A·t + B·t² + C·(t − 100)·t³)    −200 °C ≤ t < 0 °C
    R(t) = R0·(1 + A·t + B·t²)                     0 °C ≤ t ≤ 850 °C

The inverse is the quadratic's root above 0 °C (R ≥ R0) and Newton's method on the quartic
below (started from the quadratic's root; R(t) is strictly increasing on the whole range, so
it converges in a few steps).

Thermistor, Beta model (a maker's "B25/85" style constant; T in kelvin, T25 = 298.15 K)::

    R(T) = R25·exp(B·(1/T − 1/T25)),   T = 1/(1/T25 + ln(R/R25)/B)

Steinhart–Hart (J. S. Steinhart and S. R. Hart, "Calibration curves for thermistors",
Deep-Sea Research 15 (1968) 497–503)::

    1/T = a + b·ln R + c·(ln R)³

whose inverse is the real root of the depressed cubic c·x³ + b·x + (a − 1/T) = 0 in x = ln R
(Cardano's formula; one real root whenever b and c are positive).

Temperatures are °C at the interface (kelvin = °C + 273.15, SI Brochure 9th ed. §2.3.1).
"""

from __future__ import annotations

import math
from collections.abc import Callable, Iterable
from dataclasses import dataclass
from typing import TYPE_CHECKING, Literal, Protocol, get_args

from netsynth import limits
from netsynth.errors import ArgumentError

if TYPE_CHECKING:  # the models load without numpy (the command line's --help stays fast)
    from netsynth.design import Design
    from netsynth.stock import StockBin

__all__ = [
    "BetaNTC",
    "IEC60751_A",
    "IEC60751_B",
    "IEC60751_C",
    "KELVIN_OFFSET",
    "PlatinumRTD",
    "SENSOR_KINDS",
    "Sensor",
    "SensorKind",
    "SteinhartHartNTC",
    "calibration_ladder",
    "temperature_error_c",
]

#: IEC 60751:2022 Callendar–Van Dusen coefficients (°C⁻¹, °C⁻², °C⁻⁴); C applies below 0 °C only
IEC60751_A = 3.9083e-3
IEC60751_B = -5.775e-7
IEC60751_C = -4.183e-12
#: the range IEC 60751 defines the equation over, °C
RTD_LOW_C, RTD_HIGH_C = -200.0, 850.0
#: K at 0 °C (SI Brochure, 9th ed., §2.3.1)
KELVIN_OFFSET = 273.15
#: the reference temperature of R25, °C
T25_C = 25.0
#: the temperatures a thermistor model is evaluated over, °C: far beyond any thermistor's
#: rated range (about −55..+150 °C for common epoxy NTCs, from memory), only a guard against typos
NTC_LOW_C, NTC_HIGH_C = -100.0, 300.0

#: the sensor kinds the command line offers
SensorKind = Literal["pt100", "pt1000", "rtd", "ntc"]
SENSOR_KINDS: tuple[str, ...] = get_args(SensorKind)


class Sensor(Protocol):
    """What a sensor model offers: resistance at a temperature, the inverse and the slope."""

    name: str
    low_c: float
    high_c: float

    def ohms(self, t_c: float) -> float: ...

    def temp_c(self, ohms: float, extrapolate: bool = False) -> float: ...

    def slope(self, t_c: float) -> float: ...


def _number(x: object, name: str) -> float:
    if isinstance(x, bool) or not isinstance(x, (int, float)) or not math.isfinite(x):
        raise ArgumentError(f"{name}={x!r}: expected a finite number")
    return float(x)


def _positive(x: object, name: str) -> float:
    x = _number(x, name)
    if not x > 0:
        raise ArgumentError(f"{name}={x!r}: expected a value above zero")
    return x


def _in_range(t_c: object, low: float, high: float, what: str) -> float:
    t = _number(t_c, "t_c")
    if not low <= t <= high:
        raise ArgumentError(f"t_c={t!r}: {what} is defined from {low:g} to {high:g} °C")
    return t


# ------------------------------------------------------------------ platinum RTD


@dataclass(frozen=True, slots=True)
class PlatinumRTD:
    """An industrial platinum resistance thermometer to IEC 60751 (R0 Ω at 0 °C).

    Examples
    --------
    >>> round(PlatinumRTD(100.0).ohms(100.0), 3)
    138.505
    >>> round(PlatinumRTD(100.0).temp_c(138.505), 2)  # the table's value, rounded to 1 mΩ
    100.0
    """

    r0: float = 100.0  #: Ω at 0 °C: 100 for Pt100, 1000 for Pt1000
    low_c: float = RTD_LOW_C
    high_c: float = RTD_HIGH_C

    def __post_init__(self) -> None:
        object.__setattr__(self, "r0", _positive(self.r0, "r0"))

    @property
    def name(self) -> str:
        known = {100.0: "Pt100", 1000.0: "Pt1000"}
        return known.get(self.r0, f"Pt RTD, R0 {self.r0:g} Ω") + " (IEC 60751)"

    def ohms(self, t_c: float) -> float:
        """Ω at ``t_c`` °C by the Callendar–Van Dusen equation (module docstring)."""
        t = _in_range(t_c, self.low_c, self.high_c, "the IEC 60751 equation")
        a, b, c = IEC60751_A, IEC60751_B, IEC60751_C
        if t < 0:
            return self.r0 * (1 + a * t + b * t * t + c * (t - 100) * t ** 3)
        return self.r0 * (1 + a * t + b * t * t)

    def slope(self, t_c: float) -> float:
        """dR/dt in Ω/°C at ``t_c`` (the derivative of the equation above)."""
        t = _in_range(t_c, self.low_c, self.high_c, "the IEC 60751 equation")
        a, b, c = IEC60751_A, IEC60751_B, IEC60751_C
        if t < 0:
            return self.r0 * (a + 2 * b * t + c * (4 * t ** 3 - 300 * t * t))
        return self.r0 * (a + 2 * b * t)

    def temp_c(self, ohms: float, extrapolate: bool = False) -> float:
        """The temperature (°C) a resistance reads as: closed form at or above R0, Newton below.

        With ``extrapolate`` a resistance just outside the range reads as the equation continued
        beyond it (what an instrument that applies the equation shows for a simulator a little
        off at an end of the range); otherwise it is refused.

        Raises
        ------
        ArgumentError
            For a resistance outside R(−200 °C)..R(850 °C), unless ``extrapolate``.
        """
        r = _positive(ohms, "ohms")
        low, high = self.ohms(self.low_c), self.ohms(self.high_c)
        # a few ulps of slack at the ends, so the ends themselves read back
        if not extrapolate and not low * (1 - 1e-12) <= r <= high * (1 + 1e-12):
            raise ArgumentError(f"ohms={r!r}: outside what a {self.name} reads "
                                f"({low:.6g} Ω at {self.low_c:g} °C .. {high:.6g} Ω at {self.high_c:g} °C)")
        a, b = IEC60751_A, IEC60751_B
        # root of B·t² + A·t + (1 − r/R0) = 0 near the origin; written to avoid cancellation
        q = 1 - r / self.r0
        t = -2 * q / (a + math.sqrt(a * a - 4 * b * q))
        if r >= self.r0:
            return t + 0.0  # never -0.0
        c = IEC60751_C
        for _ in range(50):  # Newton on the quartic (the equation is not range-checked in between)
            value = self.r0 * (1 + a * t + b * t * t + c * (t - 100) * t ** 3) - r
            step = value / (self.r0 * (a + 2 * b * t + c * (4 * t ** 3 - 300 * t * t)))
            t -= step
            if abs(step) < 1e-12:
                break
        return min(t, 0.0) if extrapolate else min(max(t, self.low_c), 0.0)


# ------------------------------------------------------------------ thermistors


@dataclass(frozen=True, slots=True)
class BetaNTC:
    """An NTC thermistor by its R25 (Ω at 25 °C) and Beta constant (K).

    Examples
    --------
    >>> round(BetaNTC(10_000.0, 3950.0).ohms(25.0), 6)
    10000.0
    """

    r25: float
    beta: float
    low_c: float = NTC_LOW_C
    high_c: float = NTC_HIGH_C

    def __post_init__(self) -> None:
        object.__setattr__(self, "r25", _positive(self.r25, "r25"))
        object.__setattr__(self, "beta", _positive(self.beta, "beta"))

    @property
    def name(self) -> str:
        return f"NTC {self.r25:g} Ω at 25 °C, B {self.beta:g} K"

    def ohms(self, t_c: float) -> float:
        t = _in_range(t_c, self.low_c, self.high_c, "the thermistor model") + KELVIN_OFFSET
        return _exp_ohms(math.log(self.r25) + self.beta * (1 / t - 1 / (T25_C + KELVIN_OFFSET)),
                         f"t_c={t_c!r}, r25={self.r25!r}, beta={self.beta!r}")

    def slope(self, t_c: float) -> float:
        """dR/dT in Ω/°C: −B·R/T²."""
        t = _in_range(t_c, self.low_c, self.high_c, "the thermistor model") + KELVIN_OFFSET
        return -self.beta * self.ohms(t_c) / (t * t)

    def temp_c(self, ohms: float, extrapolate: bool = False) -> float:
        """°C a resistance reads as: T = 1/(1/T25 + ln(R/R25)/B) − 273.15."""
        r = _positive(ohms, "ohms")
        inverse = 1 / (T25_C + KELVIN_OFFSET) + math.log(r / self.r25) / self.beta
        if not inverse > 0:
            raise ArgumentError(f"ohms={ohms!r}: the model gives no temperature above absolute zero here")
        return _reads_within(1 / inverse - KELVIN_OFFSET, self, r, extrapolate)


@dataclass(frozen=True, slots=True)
class SteinhartHartNTC:
    """An NTC thermistor by its Steinhart–Hart coefficients (1/T = a + b·ln R + c·(ln R)³, T in K)."""

    a: float
    b: float
    c: float
    low_c: float = NTC_LOW_C
    high_c: float = NTC_HIGH_C

    def __post_init__(self) -> None:
        for field in ("a", "b", "c"):
            object.__setattr__(self, field, _number(getattr(self, field), f"sh_{field}"))
        if not (self.b > 0 and self.c >= 0):
            raise ArgumentError(f"sh_b={self.b!r}, sh_c={self.c!r}: an NTC thermistor has b above zero and c "
                                "zero or above (1/T must grow with ln R)")

    @property
    def name(self) -> str:
        return f"NTC, Steinhart–Hart a {self.a:.6g}, b {self.b:.6g}, c {self.c:.6g}"

    def temp_c(self, ohms: float, extrapolate: bool = False) -> float:
        """°C a resistance reads as: 1/(a + b·ln R + c·(ln R)³) − 273.15."""
        x = math.log(_positive(ohms, "ohms"))
        inverse = self.a + self.b * x + self.c * x ** 3
        if not inverse > 0:
            raise ArgumentError(f"ohms={ohms!r}: the coefficients give no temperature above absolute zero here")
        return _reads_within(1 / inverse - KELVIN_OFFSET, self, ohms, extrapolate)

    def ohms(self, t_c: float) -> float:
        """Ω at ``t_c``: the real root of c·x³ + b·x + (a − 1/T) = 0, x = ln R (Cardano)."""
        t = _in_range(t_c, self.low_c, self.high_c, "the thermistor model") + KELVIN_OFFSET
        d = self.a - 1 / t
        what = f"t_c={t_c!r} with these Steinhart–Hart coefficients"
        if self.c == 0:
            return _exp_ohms(-d / self.b, what)
        p, q = self.b / self.c, d / self.c  # x³ + p·x + q = 0, p > 0: one real root
        root = math.sqrt(q * q / 4 + p ** 3 / 27)
        x = math.copysign(abs(-q / 2 + root) ** (1 / 3), -q / 2 + root) + \
            math.copysign(abs(-q / 2 - root) ** (1 / 3), -q / 2 - root)
        for _ in range(3):  # polish the cube roots' rounding with Newton on the cubic
            x -= (self.c * x ** 3 + self.b * x + d) / (3 * self.c * x * x + self.b)
        return _exp_ohms(x, what)

    def slope(self, t_c: float) -> float:
        """dR/dT in Ω/°C: from d(1/T)/d(ln R) = b + 3c·(ln R)², so dR/dT = −R/(T²·(b + 3c·(ln R)²))."""
        r = self.ohms(t_c)
        t = t_c + KELVIN_OFFSET
        x = math.log(r)
        return -r / (t * t * (self.b + 3 * self.c * x * x))


def _exp_ohms(x: float, what: str) -> float:
    """e^x as a resistance within the accepted range (netsynth.limits), else a one-line error."""
    if not -700.0 < x < 700.0:  # beyond float range either way: no real part has such a value
        raise ArgumentError(f"{what}: the model gives a resistance beyond any part (e^{x:.3g} Ω)")
    r = math.exp(x)
    if not limits.MIN_OHMS <= r <= limits.MAX_OHMS:
        raise ArgumentError(f"{what}: the model gives {r:.3g} Ω, outside the {limits.MIN_OHMS:g} Ω to "
                            f"{limits.MAX_OHMS:g} Ω netsynth builds")
    return r


def _reads_within(t_c: float, sensor: Sensor, ohms: float, extrapolate: bool) -> float:
    if not extrapolate and not sensor.low_c - 1e-9 <= t_c <= sensor.high_c + 1e-9:
        raise ArgumentError(f"ohms={ohms!r}: reads as {t_c:.4g} °C, outside the model's {sensor.low_c:g} to "
                            f"{sensor.high_c:g} °C")
    return t_c


def temperature_error_c(sensor: Sensor, t_c: float, ohms: float) -> float:
    """°C the value ``ohms`` reads as, minus the set point ``t_c`` (exact, through the inverse).

    To first order this is (ohms − R(t))/(dR/dt); the inverse is used so that large errors
    are right too. A value just beyond an end of the sensor's range reads as the equation
    continued (``extrapolate``), since a built network near −200 °C may land a little below.

    Examples
    --------
    >>> round(temperature_error_c(PlatinumRTD(100.0), 0.0, 100.0 + 0.39083), 3)  # one slope step
    1.0
    """
    return sensor.temp_c(ohms, extrapolate=True) - t_c


def calibration_ladder(sensor: Sensor, temps_c: Iterable[float], stock: StockBin,
                       synthesize: Callable[[float, StockBin, int], Design]) -> tuple[Design, ...]:
    """One network per set point, all from one bin, in the order given.

    Each set point is searched in the bin the earlier ones left (:func:`.shared.in_turn`): the
    parts a network uses are gone before the next search. This greedy order is not a joint
    optimum: an earlier set point may take a part a later one needed more.

    Parameters
    ----------
    sensor : the sensor model; ``sensor.ohms(t)`` is each target
    temps_c : the set points, °C, in the order they get their pick of the bin
    stock : the bin
    synthesize : ``synthesize(target_ohms, stock, index)`` -> Design (e.g. :func:`netsynth.api.make`)

    Raises
    ------
    ArgumentError
        A set point outside the sensor's range, or no set point.
    InfeasibleError
        The bin runs out before the last set point.
    """
    temps = tuple(_number(t, "temps_c") for t in temps_c)
    if not temps:
        raise ArgumentError("temps_c: give at least one temperature")
    targets = [sensor.ohms(t) for t in temps]
    from netsynth.jobs.shared import in_turn  # here, so that the models alone need no numpy

    return in_turn(targets, stock, synthesize)
