"""The jobs' commands: ``shunt``, ``multiplier``, ``sensor``, ``trim``.

Each works out the resistance its job needs (:mod:`netsynth.jobs`), synthesizes it from the bin
with :func:`netsynth.api.make` and reports it in the job's units. With ``--json`` each prints the
``make`` object (:func:`netsynth.render.json.design_dict`, ``target_ohms`` the computed
resistance) with these keys added:

``shunt``, ``multiplier``
    ``job`` (``"shunt"``/``"multiplier"``), ``movement`` ``{"full_scale_amps", "ohms",
    "full_scale_volts"}``, ``range_amps`` or ``range_volts``, ``full_scale_error`` (the reading's
    signed relative error at full scale with the recommended network, a fraction: 0.001 is
    0.1 % of reading) and ``operating_amps`` (what the resistor carries at full scale).
``sensor``
    ``job``, ``sensor`` (its name), ``temp_c`` (the set point), ``reads_as_c`` (the temperature
    the recommended network reads as), ``temp_error_c`` (``reads_as_c − temp_c``),
    ``reads_as_band_c`` ([low, high], the temperatures the tolerance band reads as) and
    ``slope_ohms_per_c``.
``trim``
    ``job``, ``trim`` ``{"base_ohms", "base_uncertainty", "target_ohms", "mode",
    "ideal_trim_ohms", "expression", "result_ohms", "verified_ohms", "error", "sensitivity",
    "band_ohms": [low, high]}``; the make object is the trim network's (its ``target_ohms`` is
    the ideal trim).

With several ranges (``shunt``, ``multiplier``) or temperatures (``sensor``) the networks are
built in turn from one bin (each takes its parts out before the next; greedy, not a joint
optimum) and ``--json`` prints ``{"job", "movement" or "sensor", "order", "networks": [...]}``
with one object as above per range, section or temperature; ring shunt and chain entries add
``section`` (1 = the section the lowest range adds), ``section_ohms`` and, for a ring,
``tap_ohms``; their ``full_scale_error`` is that range's with every section as built.
"""

from __future__ import annotations

import math
import re
from decimal import Decimal

import click

from netsynth.analysis.conditions import (
    CAUTION_VOLTS,
    DEFAULT_AMBIENT_C,
    DEFAULT_POWER_FACTOR,
    DEFAULT_VOLTAGE_FACTOR,
    Derating,
    OperatingPoint,
)
from netsynth.cli.shell import (
    AMBIENT,
    FACTOR,
    RESISTANCE,
    TEMPERATURE,
    TOLERANCE,
    VOLTAGE,
    cli,
    echo_json,
    json_option,
    load_stock,
    progress,
    stock_options,
)
from netsynth.cli.shell import Parsed
from netsynth.errors import ValueParseError
from netsynth.jobs.sensors import SENSOR_KINDS
from netsynth.jobs.trim import TRIM_MODES
from netsynth.values import parse_current

# a current with the micro prefix, which netsynth.values.parse_current does not read: 50uA, 50 µA
_MICRO = re.compile(r"(?P<num>\d+\.?\d*|\.\d+)\s*[uµμ]\s*A?")


def _movement_current(text: str) -> float:
    """A movement's current: what ``parse_current`` reads, plus ``u``/``µ`` (micro): 50uA, 50 µA, 1mA."""
    m = _MICRO.fullmatch(text.strip())
    if m:
        value = float(Decimal(m["num"]).scaleb(-6))  # decimal, so 50uA is exactly the float 5e-05
        if not value > 0:
            raise ValueParseError(f"cannot read {text.strip()!r}: a full-scale current must be above zero")
        return value
    return parse_current(text)


MOVEMENT_CURRENT = Parsed("current", _movement_current, "a current such as 50uA, 1mA or 0.001")

#: the caution for home-made current ranges (common practice, no source)
SHUNT_CAUTION = ("an ammeter goes in series with the load, never across a source: across a supply a shunt is a "
                 "short circuit; fuse home-made current ranges")


def _si(x: float, unit: str, digits: int = 6) -> str:
    """A quantity with an SI prefix: 50 µA, 1.5 kV, 2 A."""
    if x == 0 or not math.isfinite(x):
        return f"{x:g} {unit}"
    e3 = min(max(int(math.floor(math.log10(abs(x)) / 3)) * 3, -9), 9)
    prefix = {-9: "n", -6: "µ", -3: "m", 0: "", 3: "k", 6: "M", 9: "G"}[e3]
    return f"{x / 10 ** e3:.{digits}g} {prefix}{unit}"


def _pct(rel: float) -> str:
    """A signed relative error in % or ppm; float noise of an exact hit (below 1e-12) is 0."""
    from netsynth.values import format_error

    return "0 %" if abs(rel) < 1e-12 else format_error(rel)


def _deg(x: float, digits: int = 4) -> str:
    """A signed temperature difference, never "-0.0000"."""
    return f"{round(x, digits) + 0.0:+.{digits}f}"


class _Listed(click.ParamType):
    """One argument that may hold several comma-separated values of ``inner``."""

    def __init__(self, inner: click.ParamType, name: str) -> None:
        self.inner = inner
        self.name = name

    def convert(self, value, param, ctx):
        if not isinstance(value, str):
            return value
        parts = value.split(",")
        if any(not p.strip() for p in parts):
            self.fail(f"{value!r} has an empty entry; give values such as 1A,5A,10A", param, ctx)
        return [self.inner.convert(p, param, ctx) for p in parts]


def _flat(groups) -> list[float]:
    return [x for group in groups for x in group]


def job_options(fn):
    """``-k/--max-parts``, ``--alternatives`` and the derating margins shared by the job commands."""
    options = [
        click.option("--max-parts", "-k", type=click.IntRange(min=1, max=400), metavar="K",
                     help="Largest part count per network, 1 to 400 (default 4; with an operating point, "
                     "as many as needed)."),
        click.option("--alternatives", type=click.IntRange(min=0, max=20), default=0, show_default=True, metavar="N",
                     help="Runners-up to list per part count."),
    ]
    for option in reversed(options):
        fn = option(fn)
    return fn


def load_options(fn):
    """The margins for the part stress at full scale (shunt and multiplier)."""
    options = [
        click.option("--ambient", type=AMBIENT, default=DEFAULT_AMBIENT_C, show_default=True, metavar="°C",
                     help="Air temperature around the parts in °C."),
        click.option("--derate", type=FACTOR, default=DEFAULT_POWER_FACTOR, show_default=True, metavar="F",
                     help="Fraction of the power rating a part may use at full scale."),
        click.option("--volt-derate", type=FACTOR, default=DEFAULT_VOLTAGE_FACTOR, show_default=True, metavar="F",
                     help="Fraction of the rated voltage a part may see at full scale."),
    ]
    for option in reversed(options):
        fn = option(fn)
    return fn


def movement_options(fn):
    options = [
        click.option("--movement", "ifs", type=MOVEMENT_CURRENT, required=True, metavar="IFS",
                     help="Full-scale current of the movement or front end: 50uA, 1mA, 0.001."),
        click.option("--movement-ohms", "rm", type=RESISTANCE, required=True, metavar="RM",
                     help="Internal resistance of the movement: 1k5, 500, 2k."),
    ]
    for option in reversed(options):
        fn = option(fn)
    return fn


def _make(stock, target, max_parts, alternatives, point, derating, as_json):
    from netsynth.api import make

    return make(target, stock, max_parts=max_parts, alternatives=alternatives,
                on_progress=None if as_json else progress, point=point, derating=derating)


def _movement_dict(movement) -> dict:
    return {"full_scale_amps": movement.full_scale_amps, "ohms": movement.ohms,
            "full_scale_volts": movement.full_scale_volts}


def _movement_text(movement) -> str:
    return (f"movement {_si(movement.full_scale_amps, 'A')} full scale, {_si(movement.ohms, 'Ω')} "
            f"({_si(movement.full_scale_volts, 'V')} at full scale)")


# ------------------------------------------------------------------ shunt


@cli.command()
@click.argument("ranges", nargs=-1, required=True, type=_Listed(MOVEMENT_CURRENT, "current"), metavar="RANGE...")
@movement_options
@stock_options
@job_options
@load_options
@json_option
def shunt(ranges, ifs, rm, bin_file, series, value_range, qty, kit_tolerance, kit_power, max_parts, alternatives,
          ambient, derate, volt_derate, as_json):
    """The shunt that gives a movement a current range (several ranges: a ring shunt).

    RANGE is a full-scale current such as 2A or 500mA. Rs = Rm·Ifs/(I − Ifs); the
    shunt carries I − Ifs at full scale and every part is checked at that current.
    Several ranges (repeated or comma-separated) make one tapped ring (Ayrton
    shunt): the report gives each section, built in turn from one bin.

    \b
    Examples:
      netsynth shunt 2A --movement 50uA --movement-ohms 1k5
      netsynth shunt 100mA,1A,10A --movement 1mA --movement-ohms 500
    """
    from netsynth.jobs.meters import Movement, ring_reading_error, ring_shunt, shunt_amps, shunt_ohms, \
        shunt_reading_error
    from netsynth.jobs.shared import in_turn
    from netsynth.render.json import design_dict
    from netsynth.render.report import design_text

    movement = Movement(ifs, rm)
    amps = _flat(ranges)
    stock = load_stock(bin_file, series, value_range, qty, kit_tolerance, kit_power)
    derating = Derating(derate, volt_derate)
    if len(amps) == 1:
        target = shunt_ohms(movement, amps[0])
        flow = shunt_amps(movement, amps[0])
        point = OperatingPoint(amps=flow, ambient_c=ambient)
        design = _make(stock, target, max_parts, alternatives, point, derating, as_json)
        error = shunt_reading_error(movement, amps[0], design.best.value_ohms)
        if as_json:
            echo_json({**design_dict(design), "job": "shunt", "movement": _movement_dict(movement),
                       "range_amps": amps[0], "full_scale_error": error, "operating_amps": flow})
            return
        click.echo(f"Shunt for {_si(amps[0], 'A')} on a {_movement_text(movement)}: "
                   f"Rs = {_si(target, 'Ω')}, carrying {_si(flow, 'A')} at full scale")
        click.echo(design_text(design, show_alternatives=alternatives > 0))
        click.echo(f"Full scale with the recommended network: reads {_pct(error)} of reading at {_si(amps[0], 'A')}")
        _shunt_cautions(design.best.value_ohms,
                        shunt_reading_error(movement, amps[0], design.best.value_ohms + LEAD_OHMS) - error, amps[0])
        return

    ring = ring_shunt(movement, amps)

    def build(target, left, index):
        point = OperatingPoint(amps=ring[index].section_amps, ambient_c=ambient)
        return _make(left, target, max_parts, alternatives, point, derating, as_json)

    designs = in_turn([s.section_ohms for s in ring], stock, build)
    errors = ring_reading_error(movement, ring, [d.best.value_ohms for d in designs])
    if as_json:
        _echo_sections_json("shunt", movement, designs, [
            {"range_amps": s.amps, "tap_ohms": s.tap_ohms, "section_ohms": s.section_ohms, "full_scale_error": e,
             "operating_amps": s.section_amps} for s, e in zip(ring, errors)])
        return
    _echo_sections(
        f"Ring (Ayrton) shunt for {', '.join(_si(a, 'A') for a in amps)} on a {_movement_text(movement)}: "
        f"ring {_si(ring[0].tap_ohms, 'Ω')}, {len(ring)} sections", designs,
        [f"{_si(s.section_ohms, 'Ω')} (tap of the {_si(s.amps, 'A')} range to the next; up to "
         f"{_si(s.section_amps, 'A')} at full scale)" for s in ring],
        [(_si(s.amps, 'A'), e) for s, e in zip(ring, errors)], alternatives)
    built = [d.best.value_ohms for d in designs]
    # the highest range's tap is the last section: LEAD_OHMS more there, with the ring as built
    leaded = ring_reading_error(movement, ring, built[:-1] + [built[-1] + LEAD_OHMS])[-1]
    _shunt_cautions(built[-1], leaded - errors[-1], ring[-1].amps)


#: Ω of lead or contact resistance the low-ohm caution puts a number on (a solder joint or a few
#: centimetres of lead are each in the milliohm range; common practice, no source)
LEAD_OHMS = 1e-3


def _shunt_cautions(built_ohms: float, extra: float, amps: float) -> None:
    """The low-ohm caution (``extra``: how far LEAD_OHMS more in the shunt path moves the range) and the fuse one."""
    if built_ohms < 1.0:
        click.echo("Caution: below 1 Ω, lead and contact resistance in the shunt's path count as shunt: 1 mΩ more "
                   f"moves the {_si(amps, 'A')} range's full scale by {_pct(extra)}; wire the movement to the shunt's own ends "
                   "with separate sense leads (four-terminal, Kelvin connection)")
    click.echo(f"Caution: {SHUNT_CAUTION}")


# ------------------------------------------------------------------ multiplier


@cli.command()
@click.argument("ranges", nargs=-1, required=True, type=_Listed(VOLTAGE, "voltage"), metavar="RANGE...")
@movement_options
@stock_options
@job_options
@load_options
@json_option
def multiplier(ranges, ifs, rm, bin_file, series, value_range, qty, kit_tolerance, kit_power, max_parts,
               alternatives, ambient, derate, volt_derate, as_json):
    """The series multiplier that gives a movement a voltage range (several ranges: a chain).

    RANGE is a full-scale voltage such as 30V or 1kV. Rmult = V/Ifs − Rm; the
    multiplier carries Ifs at full scale and every part is checked at that current
    (so a high range is split for voltage). Several ranges (repeated or
    comma-separated) make one string with taps: each range adds a section to the
    one below, built in turn from one bin.

    \b
    Examples:
      netsynth multiplier 30V --movement 50uA --movement-ohms 1k5
      netsynth multiplier 1,10,100,1000 --movement 1mA --movement-ohms 500
    """
    from netsynth.jobs.meters import Movement, chain_reading_error, multiplier_chain, multiplier_ohms, \
        multiplier_reading_error
    from netsynth.jobs.shared import in_turn
    from netsynth.render.json import design_dict
    from netsynth.render.report import design_text

    movement = Movement(ifs, rm)
    volts = _flat(ranges)
    stock = load_stock(bin_file, series, value_range, qty, kit_tolerance, kit_power)
    derating = Derating(derate, volt_derate)
    point = OperatingPoint(amps=movement.full_scale_amps, ambient_c=ambient)
    if len(volts) == 1:
        target = multiplier_ohms(movement, volts[0])
        design = _make(stock, target, max_parts, alternatives, point, derating, as_json)
        error = multiplier_reading_error(movement, volts[0], design.best.value_ohms)
        if as_json:
            echo_json({**design_dict(design), "job": "multiplier", "movement": _movement_dict(movement),
                       "range_volts": volts[0], "full_scale_error": error,
                       "operating_amps": movement.full_scale_amps})
            return
        click.echo(f"Multiplier for {_si(volts[0], 'V')} on a {_movement_text(movement)}: "
                   f"Rmult = {_si(target, 'Ω')}, carrying {_si(movement.full_scale_amps, 'A')} at full scale")
        click.echo(design_text(design, show_alternatives=alternatives > 0))
        click.echo(f"Full scale with the recommended network: reads {_pct(error)} of reading at {_si(volts[0], 'V')}")
        _volt_caution(volts[0])
        return

    chain = multiplier_chain(movement, volts)
    designs = in_turn([s.section_ohms for s in chain], stock,
                      lambda target, left, index: _make(left, target, max_parts, alternatives, point, derating,
                                                        as_json))
    errors = chain_reading_error(movement, chain, [d.best.value_ohms for d in designs])
    if as_json:
        _echo_sections_json("multiplier", movement, designs, [
            {"range_volts": s.volts, "multiplier_ohms": s.multiplier_ohms, "section_ohms": s.section_ohms,
             "full_scale_error": e, "operating_amps": s.amps} for s, e in zip(chain, errors)])
        return
    _echo_sections(
        f"Multiplier chain for {', '.join(_si(v, 'V') for v in volts)} on a {_movement_text(movement)}: "
        f"{len(chain)} sections, {_si(chain[-1].multiplier_ohms, 'Ω')} in all", designs,
        [f"{_si(s.section_ohms, 'Ω')} (the {_si(s.volts, 'V')} range: {_si(s.multiplier_ohms, 'Ω')} in series "
         "with the movement)" for s in chain],
        [(_si(s.volts, 'V'), e) for s, e in zip(chain, errors)], alternatives)
    _volt_caution(max(volts))


def _echo_sections(heading: str, designs, titles: list[str], readings: list[tuple[str, float]],
                   alternatives: int) -> None:
    """A chain of sections (ring shunt, multiplier): each section's design, then the full-scale
    reading error of every range with the sections as built."""
    from netsynth.jobs.shared import GREEDY_NOTE
    from netsynth.render.report import design_text

    click.echo(heading)
    for k, (d, title) in enumerate(zip(designs, titles)):
        click.echo(f"\n=== Section {k + 1}: {title}")
        click.echo(design_text(d, show_alternatives=alternatives > 0))
    click.echo("\nFull scale with the sections as built:")
    for label, e in readings:
        click.echo(f"  {label:>10}  reads {_pct(e)} of reading")
    click.echo(f"Note: {GREEDY_NOTE}")


def _echo_sections_json(job: str, movement, designs, sections: list[dict]) -> None:
    from netsynth.jobs.shared import GREEDY_NOTE
    from netsynth.render.json import design_dict

    echo_json({"job": job, "movement": _movement_dict(movement), "order": GREEDY_NOTE, "networks": [
        {**design_dict(d), "section": k + 1, **extra} for k, (d, extra) in enumerate(zip(designs, sections))]})


def _volt_caution(volts: float) -> None:
    if volts > CAUTION_VOLTS:
        click.echo(f"Caution: the {_si(volts, 'V')} range puts up to {_si(volts, 'V')} on the meter's terminals and "
                   "the string: a shock hazard; insulate the string, keep clearances, and discharge before touching")


# ------------------------------------------------------------------ sensor


def _sensor(kind, r0, r25, beta, sh_a, sh_b, sh_c):
    from netsynth.jobs.sensors import BetaNTC, PlatinumRTD, SteinhartHartNTC

    kind = kind.lower()
    if kind != "rtd" and r0 is not None:
        raise click.UsageError("--r0 belongs to KIND rtd (pt100 and pt1000 fix R0)")
    if kind != "ntc" and any(x is not None for x in (r25, beta, sh_a, sh_b, sh_c)):
        raise click.UsageError("--r25, --beta and --sh-a/--sh-b/--sh-c belong to KIND ntc")
    if kind == "pt100":
        return PlatinumRTD(100.0)
    if kind == "pt1000":
        return PlatinumRTD(1000.0)
    if kind == "rtd":
        if r0 is None:
            raise click.UsageError("KIND rtd needs --r0, the resistance at 0 °C (e.g. --r0 500)")
        return PlatinumRTD(r0)
    sh = (sh_a, sh_b, sh_c)
    if all(x is not None for x in sh) and r25 is None and beta is None:
        return SteinhartHartNTC(*sh)
    if r25 is not None and beta is not None and all(x is None for x in sh):
        return BetaNTC(r25, beta)
    raise click.UsageError("KIND ntc needs either --r25 and --beta, or all of --sh-a, --sh-b and --sh-c")


@cli.command(context_settings={"ignore_unknown_options": True})
@click.argument("kind", type=click.Choice(SENSOR_KINDS, case_sensitive=False))
@click.argument("temps", nargs=-1, required=True, type=TEMPERATURE, metavar="TEMP...")
@click.option("--r0", type=RESISTANCE, metavar="OHMS", help="KIND rtd: resistance at 0 °C, e.g. 500 or 2k.")
@click.option("--r25", type=RESISTANCE, metavar="OHMS", help="KIND ntc: resistance at 25 °C, e.g. 10k.")
@click.option("--beta", type=click.FloatRange(min=0, min_open=True), metavar="K",
              help="KIND ntc: the Beta constant in kelvin, e.g. 3950.")
@click.option("--sh-a", type=float, metavar="A", help="KIND ntc: Steinhart–Hart a (1/K).")
@click.option("--sh-b", type=float, metavar="B", help="KIND ntc: Steinhart–Hart b (1/K).")
@click.option("--sh-c", type=float, metavar="C", help="KIND ntc: Steinhart–Hart c (1/K).")
@stock_options
@job_options
@json_option
def sensor(kind, temps, r0, r25, beta, sh_a, sh_b, sh_c, bin_file, series, value_range, qty, kit_tolerance,
           kit_power, max_parts, alternatives, as_json):
    """A network that a controller reads as TEMP °C (sensor simulation).

    KIND is pt100 or pt1000 (IEC 60751), rtd with --r0, or ntc with --r25 and
    --beta (or --sh-a/--sh-b/--sh-c). TEMP is in °C; a negative one is typed
    plainly (-200). Several temperatures make a calibration ladder built in turn
    from one bin. The error is reported as the temperature the network reads as.

    \b
    Examples:
      netsynth sensor pt100 37
      netsynth sensor pt100 -200
      netsynth sensor pt1000 0 25 37 100 --bin bins/precision-kit.csv
      netsynth sensor ntc 25 60 --r25 10k --beta 3950
    """
    from netsynth.jobs.sensors import calibration_ladder, temperature_error_c
    from netsynth.jobs.shared import GREEDY_NOTE
    from netsynth.render.json import design_dict
    from netsynth.render.report import design_text

    model = _sensor(kind, r0, r25, beta, sh_a, sh_b, sh_c)
    stock = load_stock(bin_file, series, value_range, qty, kit_tolerance, kit_power)
    designs = calibration_ladder(model, temps, stock, lambda target, left, index: _make(
        left, target, max_parts, alternatives, None, Derating(), as_json))
    rows = []
    for t, d in zip(temps, designs):
        band = sorted(model.temp_c(x, extrapolate=True) for x in (d.review.band.low_ohms, d.review.band.high_ohms))
        rows.append({"temp_c": t, "reads_as_c": model.temp_c(d.best.verified_ohms, extrapolate=True),
                     "temp_error_c": temperature_error_c(model, t, d.best.verified_ohms),
                     "reads_as_band_c": band, "slope_ohms_per_c": model.slope(t)})
    if as_json:
        objects = [{**design_dict(d), "job": "sensor", "sensor": model.name, **row} for d, row in zip(designs, rows)]
        echo_json(objects[0] if len(objects) == 1 else
                  {"job": "sensor", "sensor": model.name, "order": GREEDY_NOTE, "networks": objects})
        return
    for k, (d, row) in enumerate(zip(designs, rows)):
        if k:
            click.echo("")
        click.echo(f"{model.name} at {row['temp_c']:g} °C: {_si(d.target_ohms, 'Ω', 7)} "
                   f"(slope {row['slope_ohms_per_c']:.5g} Ω/°C)")
        click.echo(design_text(d, show_alternatives=alternatives > 0))
        low, high = row["reads_as_band_c"]
        click.echo(f"Reads as: {row['reads_as_c']:.4f} °C (error {_deg(row['temp_error_c'])} °C); over the parts' "
                   f"tolerance band {low:.3f} .. {high:.3f} °C")
    if len(designs) > 1:
        click.echo("\nLadder:")
        for t, d, row in zip(temps, designs, rows):
            click.echo(f"  {t:>8g} °C  {_si(d.target_ohms, 'Ω', 7):>12}  {d.best.expression:<28}  "
                       f"reads {row['reads_as_c']:.4f} °C ({_deg(row['temp_error_c'])} °C)")
        click.echo(f"Note: {GREEDY_NOTE}")


# ------------------------------------------------------------------ trim


@cli.command()
@click.argument("base", type=RESISTANCE)
@click.argument("target", type=RESISTANCE)
@click.option("--mode", type=click.Choice(TRIM_MODES), default="auto", show_default=True,
              help="How the trim joins the base: series (base below target), parallel (base above), or auto.")
@click.option("--base-uncertainty", type=TOLERANCE, default=0.0, metavar="TOL",
              help="Uncertainty of the base's measurement: 0.01%, 50ppm (default 0).")
@stock_options
@job_options
@json_option
def trim(base, target, mode, base_uncertainty, bin_file, series, value_range, qty, kit_tolerance, kit_power,
         max_parts, alternatives, as_json):
    """The trim that brings a measured BASE to TARGET, from your stock.

    BASE is the value you measured (a part or a built network), TARGET the value
    it should have. Below the target a small series trim adds (t = T − Rbase);
    above it a large parallel trim lowers (t = 1/(1/T − 1/Rbase)). The report
    shows how little the trim's own tolerance moves the result (its sensitivity).

    \b
    Examples:
      netsynth trim 10.02k 10k
      netsynth trim 8.635 8.5 --base-uncertainty 0.05%
      netsynth trim 4k98 4k99 --mode series --bin bins/precision-kit.csv
    """
    from netsynth.jobs.trim import trim_result, trim_target
    from netsynth.render.json import design_dict
    from netsynth.render.report import design_text

    mode, ideal = trim_target(base, target, mode)
    stock = load_stock(bin_file, series, value_range, qty, kit_tolerance, kit_power)
    design = _make(stock, ideal, max_parts, alternatives, None, Derating(), as_json)
    result = trim_result(base, target, design, mode, base_uncertainty)
    if as_json:
        echo_json({**design_dict(design), "job": "trim", "trim": {
            "base_ohms": result.base_ohms, "base_uncertainty": result.base_uncertainty,
            "target_ohms": result.target_ohms, "mode": result.mode, "ideal_trim_ohms": result.ideal_trim_ohms,
            "expression": design.best.expression, "result_ohms": result.result_ohms,
            "verified_ohms": result.verified_ohms, "error": result.error, "sensitivity": result.sensitivity,
            "band_ohms": list(result.band_ohms)}})
        return
    from netsynth.values import format_error, format_ohms

    joint = "+" if mode == "series" else "||"
    click.echo(f"Base {format_ohms(base, 7)} (measured ±{base_uncertainty * 100:.3g} %), target "
               f"{format_ohms(target, 7)}: {mode} trim of {format_ohms(ideal, 7)}")
    click.echo(design_text(design, show_alternatives=alternatives > 0))
    click.echo("")
    shown = design.best.expression if design.best.parts == 1 else f"({design.best.expression})"
    off = "exact" if abs(result.error) < 1e-12 else format_error(result.error)
    click.echo(f"Trimmed: base {joint} {shown} = {format_ohms(result.result_ohms, 7)} ({off}); "
               f"nodal analysis gives {format_ohms(result.verified_ohms, 9)}")
    click.echo(f"Sensitivity to the trim: S = {result.sensitivity:.3g}: the trim's worst case moves the result by at "
               f"most ±{result.trim_effect * 100:.3g} %")
    low, high = result.band_ohms
    click.echo(f"Band (base ±{base_uncertainty * 100:.3g} %, trim at its worst case): {format_ohms(low, 7)} .. "
               f"{format_ohms(high, 7)} ({format_error(low / target - 1)} .. {format_error(high / target - 1)})")
