"""Meter shunts and multipliers: the resistances that give a movement a current or voltage range.

A *movement* (a moving-coil meter, or any measuring front end) reads full scale at the current
``Ifs`` through its own resistance ``Rm``, so full scale is the voltage ``Vfs = Ifs·Rm`` across it.

Map of the module
-----------------
``Movement``            Ifs and Rm (validated)
``shunt_ohms``          Rs = Rm·Ifs/(I − Ifs): the parallel resistor for a current range I
``multiplier_ohms``     Rmult = V/Ifs − Rm: the series resistor for a voltage range V
``multiplier_chain``    several voltage ranges on one string: each range's multiplier is the previous
                        one plus a section (sections = differences of the multipliers)
``ring_shunt``          several current ranges on one tapped resistor (Ayrton or universal shunt)
``*_reading_error``     the full-scale reading error, relative to the reading, of a built value
``*_amps``              the current each resistor carries at full scale (its operating point)

Formulas
--------
Shunt: the movement and the shunt share one voltage, ``Ifs·Rm = (I − Ifs)·Rs`` (Kirchhoff's
current law at the junction), so ``Rs = Rm·Ifs/(I − Ifs)``; the shunt carries ``I − Ifs``.
Multiplier: at full scale ``Ifs`` flows through ``Rm + Rmult`` across ``V``, so
``Rmult = V/Ifs − Rm``. Both from T. R. Kuphaldt, *Lessons In Electric Circuits* Vol. I (DC),
ch. 8, "Ammeter design" and "Voltmeter design".

Ring shunt. One resistor of total ``R`` sits across the movement; range ``i`` feeds the current in
at tap ``i``, so the part of the ring between tap ``i`` and the common terminal (``R_tap_i``) is the
shunt and the rest of the ring (``R − R_tap_i``) is in series with the movement. The two paths
share one voltage at full scale::

    Ifs·(Rm + R − R_tap_i) = (I_i − Ifs)·R_tap_i   =>   R_tap_i = Ifs·(Rm + R)/I_i

The lowest range uses the whole ring as its shunt (``R_tap_1 = R``), which gives
``R = Ifs·Rm/(I_1 − Ifs)``, the single-shunt formula. Sections are the differences of adjacent
taps, the last (nearest the common terminal) being ``R_tap_k``. The treatment is the textbook
one of A. D. Helfrick and W. D. Cooper, *Modern Electronic Instrumentation and Measurement
Techniques*, §4-4 "Ayrton shunt" (from memory); the derivation above is ours from Kirchhoff's
laws and is checked in ``tests/test_meters.py`` by an independent nodal solve.

Reading error. A built resistance that is off moves the full-scale point: the reading, relative
to the true current or voltage, is off by the ratios below (exact, not first order).
"""

from __future__ import annotations

import math
from collections.abc import Iterable
from dataclasses import dataclass

from netsynth.errors import ArgumentError

__all__ = [
    "ChainSection",
    "Movement",
    "RingSection",
    "chain_reading_error",
    "multiplier_chain",
    "multiplier_ohms",
    "multiplier_reading_error",
    "ring_reading_error",
    "ring_shunt",
    "shunt_amps",
    "shunt_ohms",
    "shunt_reading_error",
]


def _positive(x: object, name: str) -> float:
    if isinstance(x, bool) or not isinstance(x, (int, float)) or not math.isfinite(x) or not x > 0:
        raise ArgumentError(f"{name}={x!r}: expected a finite number above zero")
    return float(x)


@dataclass(frozen=True, slots=True)
class Movement:
    """A meter movement or measuring front end: full-scale current (A) and internal resistance (Ω).

    >>> Movement(1e-3, 500.0).full_scale_volts
    0.5
    """

    full_scale_amps: float  #: A, the current that gives full-scale deflection
    ohms: float  #: Ω, the movement's own resistance

    def __post_init__(self) -> None:
        object.__setattr__(self, "full_scale_amps", _positive(self.full_scale_amps, "full_scale_amps"))
        object.__setattr__(self, "ohms", _positive(self.ohms, "movement_ohms"))

    @property
    def full_scale_volts(self) -> float:
        """V across the movement at full scale, Ifs·Rm."""
        return self.full_scale_amps * self.ohms


# ------------------------------------------------------------------ single ranges


def shunt_ohms(movement: Movement, amps: float) -> float:
    """The shunt for a current range: Rs = Rm·Ifs/(I − Ifs), in ohms.

    Parameters
    ----------
    movement : the movement (Ifs in A, Rm in Ω)
    amps : the range, A; above the movement's full-scale current

    Raises
    ------
    ArgumentError
        When ``amps`` is not above Ifs (a shunt can only widen a range).

    References
    ----------
    Kuphaldt, *Lessons In Electric Circuits* Vol. I, ch. 8 "Ammeter design".

    Examples
    --------
    >>> round(shunt_ohms(Movement(1e-3, 500.0), 100.0), 8)  # the book's 100 A range
    0.00500005
    """
    amps = _positive(amps, "amps")
    if not amps > movement.full_scale_amps:
        raise ArgumentError(f"amps={amps!r}: a shunt range must be above the movement's full-scale current "
                            f"({movement.full_scale_amps!r} A)")
    return movement.ohms * movement.full_scale_amps / (amps - movement.full_scale_amps)


def shunt_amps(movement: Movement, amps: float) -> float:
    """A through the shunt at full scale of range ``amps``: I − Ifs."""
    return _positive(amps, "amps") - movement.full_scale_amps


def multiplier_ohms(movement: Movement, volts: float) -> float:
    """The series multiplier for a voltage range: Rmult = V/Ifs − Rm, in ohms.

    Raises
    ------
    ArgumentError
        When V/Ifs ≤ Rm: the movement alone already reads that voltage or more.

    References
    ----------
    Kuphaldt, *Lessons In Electric Circuits* Vol. I, ch. 8 "Voltmeter design".

    Examples
    --------
    >>> multiplier_ohms(Movement(1e-3, 500.0), 10.0)
    9500.0
    """
    volts = _positive(volts, "volts")
    total = volts / movement.full_scale_amps
    if not total > movement.ohms:
        raise ArgumentError(f"volts={volts!r}: V/Ifs = {total:g} Ω is not above the movement's {movement.ohms:g} Ω; "
                            f"a multiplier can only widen a range above {movement.full_scale_volts:g} V")
    return total - movement.ohms


def shunt_reading_error(movement: Movement, amps: float, built_ohms: float) -> float:
    """Relative full-scale reading error of range ``amps`` with a shunt of ``built_ohms``.

    At the true range current I the movement carries I·Rs'/(Rs' + Rm) and the scale says
    (that / Ifs)·I, so the reading is off by Rs'·(Rs + Rm)/(Rs·(Rs' + Rm)) − 1 (Rs the ideal shunt).
    """
    ideal = shunt_ohms(movement, amps)
    built = _positive(built_ohms, "built_ohms")
    return built * (ideal + movement.ohms) / (ideal * (built + movement.ohms)) - 1.0


def multiplier_reading_error(movement: Movement, volts: float, built_ohms: float) -> float:
    """Relative full-scale reading error of range ``volts`` with a multiplier of ``built_ohms``.

    The movement carries V/(Rm + Rmult') instead of V/(Rm + Rmult), so the reading is off by
    (Rm + Rmult)/(Rm + Rmult') − 1.
    """
    ideal = multiplier_ohms(movement, volts)
    built = _positive(built_ohms, "built_ohms")
    return (movement.ohms + ideal) / (movement.ohms + built) - 1.0


# ------------------------------------------------------------------ several ranges


def _ranges(values: Iterable[float], name: str) -> tuple[float, ...]:
    out = tuple(sorted(_positive(v, name) for v in values))
    if not out:
        raise ArgumentError(f"{name}: give at least one range")
    if len(set(out)) != len(out):
        raise ArgumentError(f"{name}={out!r}: a range is given twice; give each range once")
    return out


@dataclass(frozen=True, slots=True)
class ChainSection:
    """One range of a multiplier chain and the section of string it adds."""

    volts: float  #: V, the range
    multiplier_ohms: float  #: Ω, everything in series with the movement on this range
    section_ohms: float  #: Ω, the resistor this range adds to the one below it
    amps: float  #: A through the section at full scale (Ifs on every range that uses it)


def multiplier_chain(movement: Movement, volts: Iterable[float]) -> tuple[ChainSection, ...]:
    """Several voltage ranges on one string, lowest range first.

    Range i switches the movement to the end of sections 1..i, so its multiplier is the sum of
    those sections and each section is the difference of adjacent multipliers.

    Examples
    --------
    >>> [s.section_ohms for s in multiplier_chain(Movement(1e-3, 500.0), [1, 10, 100, 1000])]
    [500.0, 9000.0, 90000.0, 900000.0]
    """
    ranges = _ranges(volts, "volts")
    sections = []
    below = 0.0
    for v in ranges:
        total = multiplier_ohms(movement, v)
        sections.append(ChainSection(v, total, total - below, movement.full_scale_amps))
        below = total
    return tuple(sections)


def chain_reading_error(movement: Movement, chain: tuple[ChainSection, ...], built: Iterable[float]) -> tuple[float, ...]:
    """Relative full-scale error of every range of ``chain`` when its sections are built as ``built`` (Ω)."""
    built = tuple(_positive(b, "built_ohms") for b in built)
    if len(built) != len(chain):
        raise ArgumentError(f"built_ohms: expected {len(chain)} sections, got {len(built)}")
    out, total = [], 0.0
    for section, b in zip(chain, built):
        total += b
        out.append(multiplier_reading_error(movement, section.volts, total))
    return tuple(out)


@dataclass(frozen=True, slots=True)
class RingSection:
    """One range of a ring (Ayrton) shunt: its tap and the section between its tap and the next."""

    amps: float  #: A, the range
    tap_ohms: float  #: Ω, ring resistance between this range's tap and the common terminal (its shunt)
    section_ohms: float  #: Ω, this tap to the next one toward the common terminal
    section_amps: float  #: A, the largest current the section carries at full scale of any range


def ring_shunt(movement: Movement, amps: Iterable[float]) -> tuple[RingSection, ...]:
    """Several current ranges on one tapped ring, lowest range first (see the module docstring).

    Section ``i`` lies between tap ``i`` and tap ``i + 1``; it is in the shunt path of ranges
    1..i (carrying I − Ifs of that range) and in series with the movement on the others
    (carrying Ifs), so its largest current is max(I_i − Ifs, Ifs).

    Examples
    --------
    >>> [round(s.section_ohms, 9) for s in ring_shunt(Movement(1e-3, 50.0), [1, 5, 10])]
    [0.04004004, 0.005005005, 0.005005005]
    """
    ranges = _ranges(amps, "amps")
    ifs = movement.full_scale_amps
    total = shunt_ohms(movement, ranges[0])
    taps = [ifs * (movement.ohms + total) / i for i in ranges]
    taps[0] = total  # the same number; written so that the sections add up to the ring exactly
    sections = []
    for k, (i, tap) in enumerate(zip(ranges, taps)):
        nxt = taps[k + 1] if k + 1 < len(taps) else 0.0
        sections.append(RingSection(i, tap, tap - nxt, max(i - ifs, ifs)))
    return tuple(sections)


def ring_reading_error(movement: Movement, ring: tuple[RingSection, ...], built: Iterable[float]) -> tuple[float, ...]:
    """Relative full-scale error of every range of ``ring`` when its sections are built as ``built`` (Ω).

    On range i the movement carries I_i·R_tap'/(R_tap' + Rm + R_rest') and the scale reads that
    times I_i/Ifs.
    """
    built = tuple(_positive(b, "built_ohms") for b in built)
    if len(built) != len(ring):
        raise ArgumentError(f"built_ohms: expected {len(ring)} sections, got {len(built)}")
    whole = sum(built)
    out = []
    for k, section in enumerate(ring):
        tap = sum(built[k:])
        meter = section.amps * tap / (whole + movement.ohms)
        out.append(meter / movement.full_scale_amps - 1.0)
    return tuple(out)
