"""Everything a builder should know about one network: stress, bands, drift and cautions.

:func:`review` gathers the per-part stress (nodal), the tolerance bands (worst case,
RSS, Monte Carlo), the temperature coefficient and the cautions into one record.
"""

from __future__ import annotations

from dataclasses import dataclass

from netsynth.analysis.conditions import CAUTION_VOLTS, NEAR_LIMIT, Derating, OperatingPoint
from netsynth.analysis.stress import NetworkStress, line_of, network_stress
from netsynth.analysis.thermal import temperature_coefficient, value_at
from netsynth.analysis.tolerance import MonteCarlo, ToleranceBand, monte_carlo, tolerance_band
from netsynth.network import Network, parts_in_order, resistance

#: the caution shown wherever power nears a rating, voltages pass 50 V, or mains is involved
SAFETY_NOTE = (
    "ratings are derated per the part maker's data; local codes and licensed practice govern the build"
)
#: Monte Carlo builds per review: the yield's standard error is at most 0.5 % (√(p(1−p)/N) at p = ½)
MC_SAMPLES = 10_000
#: a value error smaller than this fraction of the worst-case band is "far below" it
FAR_BELOW = 0.1


@dataclass(frozen=True, slots=True)
class Review:
    """One network, analysed. ``stress`` is None without an operating point."""

    network: Network | None  #: None for a netlist that does not reduce to + and || (a bridge)
    value_ohms: float
    band: ToleranceBand
    monte_carlo: MonteCarlo
    tcr_ppm: float  #: worst-case magnitude of the network's temperature coefficient, ppm/K
    temp_c: float | None  #: temperature asked about, °C
    at_temp_ohms: tuple[float, float] | None  #: (low, high) at ``temp_c``
    stress: NetworkStress | None
    point: OperatingPoint | None
    cautions: tuple[str, ...]  #: safety cautions (burns, shock, mains)
    notes: tuple[str, ...]  #: advice that is not about safety (tolerance vs error)
    not_in_bin: tuple[float, ...]  #: values of parts tied to no stock line (bin defaults assumed)

    @property
    def ok(self) -> bool:
        """True unless a part is over a derated limit."""
        return self.stress is None or not self.stress.violations


def review(
    net: Network,
    point: OperatingPoint | None = None,
    derating: Derating = Derating(),
    target_ohms: float | None = None,
    spec: float | None = None,
    temp_c: float | None = None,
    samples: int = MC_SAMPLES,
    seed: int = 1,
    stress: NetworkStress | None = None,
) -> Review:
    """Analyse ``net`` at ``point``; each part's tolerance, tcr and ratings come from its own stock line.

    ``spec`` is the builder's acceptance band (fraction) around ``target_ohms``
    (the nominal value when no target is given) for the Monte Carlo yield.
    ``stress``, when the caller already solved ``net`` at ``point``, is used as is.
    """
    parts = parts_in_order(net)
    items = [line_of(p) for p in parts]
    tolerances = [item.tolerance for item, _ in items]
    tcrs = [item.tcr_ppm for item, _ in items]
    value = resistance(net)
    target = target_ohms if target_ohms is not None else value
    band = tolerance_band(net, tolerances)
    mc = monte_carlo(net, tolerances, target, spec=spec, samples=samples, seed=seed)
    tcr = temperature_coefficient(net, tcrs)
    at_temp = value_at(net, tcrs, temp_c) if temp_c is not None else None
    if stress is None and point is not None:
        stress = network_stress(net, point, derating)
    missing = tuple(sorted({p.ohms for p, (_, held) in zip(parts, items) if not held}))
    return assemble(net, value, band, mc, tcr, temp_c, at_temp, stress, point, target_ohms, missing)


def assemble(net: Network | None, value: float, band: ToleranceBand, mc: MonteCarlo, tcr: float,
             temp_c: float | None, at_temp: tuple[float, float] | None, stress: NetworkStress | None,
             point: OperatingPoint | None, target_ohms: float | None, missing: tuple[float, ...]) -> Review:
    """The review record from its figures, with the cautions and notes they call for.

    Shared by :func:`review` (series/parallel trees) and the netlist review (any two-terminal
    network, figures from nodal solves), so both say the same things the same way.
    """
    return Review(
        network=net,
        value_ohms=value,
        band=band,
        monte_carlo=mc,
        tcr_ppm=tcr,
        temp_c=temp_c,
        at_temp_ohms=at_temp,
        stress=stress,
        point=point,
        cautions=_cautions(stress, point),
        notes=(_notes(value, target_ohms, band) if target_ohms is not None else ()) + _low_ohm_note(value),
        not_in_bin=missing,
    )


def _cautions(stress: NetworkStress | None, point: OperatingPoint | None) -> tuple[str, ...]:
    if stress is None or point is None:
        return ()
    out = []
    over = stress.violations
    if over:
        out.append(f"{len(over)} part(s) over a derated limit: this network will overheat or break down as built")
    else:
        if any(p.power_use > NEAR_LIMIT for p in stress.parts):
            out.append(f"a part uses more than {NEAR_LIMIT:.0%} of its derated power limit: it will run hot")
        if any(p.voltage_use > NEAR_LIMIT for p in stress.parts):
            out.append(
                f"a part sees more than {NEAR_LIMIT:.0%} of its derated voltage limit: tolerance shifts the share "
                "between parts, so little margin is left for surges"
            )
    highest = max([stress.volts] + [p.volts for p in stress.parts])
    if highest > CAUTION_VOLTS:
        out.append(f"{highest:.4g} V is present: a shock hazard; keep clearances and discharge before touching")
    if point.mains:
        out.append("mains-connected: isolate, fuse, and keep creepage and clearance distances")
    if out:
        out.append(SAFETY_NOTE[0].upper() + SAFETY_NOTE[1:])
    return tuple(out)


#: Ω; below this, wiring adds a noticeable share (common practice, no source: a solder joint or a few
#: centimetres of trace or lead are each in the milliohm range)
LOW_OHMS = 1.0


def _low_ohm_note(value: float) -> tuple[str, ...]:
    if value >= LOW_OHMS:
        return ()
    return (
        "below 1 Ω, leads, solder joints and traces add milliohms of their own: keep them short and equal, "
        "and measure (and use the network) through separate sense connections (Kelvin, 4-wire)",
    )


def _notes(value: float, target: float, band: ToleranceBand) -> tuple[str, ...]:
    low, high = band.worst_rel
    half = max(-low, high)
    error = abs(value / target - 1)
    if half > 0 and error < FAR_BELOW * half:
        band_text = f"the parts' tolerance band (±{half * 100:.3g} %)"
        if error < 1e-12:
            lead = f"the nominal value is exact, but {band_text} is what the build will show"
        else:
            lead = f"the value error ({error * 1e6:.3g} ppm) is far below {band_text}"
        return (f"{lead}: the built network lands anywhere in that band; measure it and trim, or pick tighter parts",)
    return ()
