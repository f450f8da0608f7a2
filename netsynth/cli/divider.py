"""The divider and timing commands: ``divider`` (two arms searched jointly) and ``rc`` (τ or a corner frequency).

Thin: parse options (:mod:`.shell`), call :mod:`netsynth.jobs.divider` or :mod:`netsynth.api`,
print a renderer's output (:mod:`netsynth.render.divider`). The search and the renderers are
imported inside the commands, so ``netsynth --help`` loads no numpy.
"""

from __future__ import annotations

import click

from netsynth.cli.shell import (
    ACCURACY,
    RANGE,
    TOLERANCE,
    VOLTAGE,
    Parsed,
    cli,
    echo_json,
    json_option,
    load_stock,
    progress,
    stock_options,
)
from netsynth.errors import ValueParseError
from netsynth.inputs import PREFERENCES
from netsynth.jobs.rc import parse_capacitance, parse_frequency, parse_quantity, parse_time
from netsynth.values import parse_ratio


def _divider_ratio(text: str) -> float:
    """A ratio Rbottom/(Rtop + Rbottom): a plain number between 0 and 1 (``0.25``) or a percentage (``25%``)."""
    s = text.strip()
    try:
        value = parse_ratio(s) if s.endswith("%") else float(s)
    except ValueError:
        raise ValueParseError(f"cannot read {s!r}: expected a ratio such as 0.25 or 25%") from None
    if not 0 < value < 1:
        raise ValueParseError(f"{s!r}: a divider's ratio Rbottom/(Rtop + Rbottom) lies between 0 and 1")
    return value


def _amperes(text: str) -> float:
    return parse_quantity(text, ("A",), "a current", "2mA, 100uA or 20nA")


#: currents down to nanoamperes (feedback-pin bias currents): SI prefixes p..G, u for µ
SMALL_CURRENT = Parsed("current", _amperes, "a current such as 2mA, 100uA or 20nA")
RATIO = Parsed("ratio", _divider_ratio, "a ratio such as 0.25 or 25%")
CAPACITANCE = Parsed("capacitance", parse_capacitance, "a capacitance such as 100n, 4n7 or 2.2uF")
TIME = Parsed("time", parse_time, "a time such as 1ms, 250us or 2.5s")
FREQUENCY = Parsed("frequency", parse_frequency, "a frequency such as 1kHz or 159.2Hz")


@cli.command()
@click.option("--vin", type=VOLTAGE, metavar="V", help="Input voltage across the whole divider, in volts: 12, 5V, 1kV.")
@click.option("--vout", type=VOLTAGE, metavar="V",
              help="Output voltage wanted, in volts: at the middle node (with --vin), or the regulator's output "
              "(with --vref).")
@click.option("--vref", type=VOLTAGE, metavar="V",
              help="A regulator's feedback reference, in volts (0.8, 1.25): Vout = Vref·(1 + Rtop/Rbottom).")
@click.option("--ratio", type=RATIO, metavar="R",
              help="Ratio Rbottom/(Rtop + Rbottom) wanted: 0.25 or 25% (no voltages).")
@click.option("--total", "total", type=RANGE, metavar="LOW..HIGH",
              help="Bound Rtop + Rbottom, in ohms: 10k..100k, 50k..200k.")
@click.option("--min-current", type=SMALL_CURRENT, metavar="A",
              help="Divider current (in the bottom arm) at least this, in amperes: 2mA, 100uA, 10uA. "
              "A feedback divider's current is commonly kept at least 100 × the pin's bias current "
              "(common practice).")
@click.option("--pin-current", type=SMALL_CURRENT, metavar="A",
              help="Bias current into the feedback pin, in amperes (with --vref): 20nA, 0.1uA; adds Ipin·Rtop "
              "to Vout.")
@click.option("--vref-tol", type=TOLERANCE, metavar="TOL",
              help="The reference's tolerance (with --vref): 1%, 0.5 %, or a letter (F = 1 %); widens the Vout band.")
@click.option("--max-parts", "-k", type=click.IntRange(min=2, max=12), default=4, show_default=True, metavar="K",
              help="Parts of both arms together, 2 to 12.")
@stock_options
@json_option
def divider(vin, vout, vref, ratio, total, min_current, pin_current, vref_tol, max_parts, bin_file, series,
            value_range, qty, kit_tolerance, kit_power, as_json):
    """Find the two arms of a divider from your stock, searched together.

    Give one goal: --vin and --vout (an output voltage from an input), --vref
    and --vout (a regulator's feedback divider, Vout = Vref·(1 + Rtop/Rbottom)),
    or --ratio (Rbottom/(Rtop + Rbottom)). Both arms come from one bin and
    share its quantities; each arm may be a network. For every total part
    count the pair that lands nearest is reported, proven best by exhaustive
    search, with the output's worst-case band, its temperature coefficient,
    the divider current, the output resistance and the load on each part.

    \b
    Examples:
      netsynth divider --vref 0.8 --vout 3.3 --total 50k..200k
      netsynth divider --vin 12 --vout 3.3 --total 10k..100k -k 3
      netsynth divider --ratio 0.1 --bin bins/precision-kit.csv
      netsynth divider --vref 1.25 --vout 5 --pin-current 0.1uA --vref-tol 1% --json

    Exit status: 0 done, 1 no answer (bad bin, nothing meets the limits),
    2 a bad command line.
    """
    from netsynth.jobs.divider import design_divider, ratio_goal, regulator_goal, voltage_goal
    from netsynth.render.divider import divider_dict, divider_text

    if ratio is not None:
        if any(x is not None for x in (vin, vout, vref)):
            raise click.UsageError("give either --ratio or voltages (--vin/--vout or --vref/--vout), not both")
        goal = ratio_goal(ratio)
    elif vout is None or (vin is None) == (vref is None):
        raise click.UsageError("give --vin V --vout V, or --vref V --vout V, or --ratio R")
    elif vin is not None:
        goal = voltage_goal(vin, vout)
    else:
        goal = regulator_goal(vref, vout, pin_current or 0.0)
    if pin_current is not None and vref is None:
        raise click.UsageError("--pin-current belongs to a regulator's feedback divider: give it with --vref")
    if vref_tol is not None and vref is None:
        raise click.UsageError("--vref-tol needs --vref")
    if min_current is not None and ratio is not None:
        raise click.UsageError("--min-current needs voltages; with --ratio bound the resistance with --total")
    stock = load_stock(bin_file, series, value_range, qty, kit_tolerance, kit_power)
    design = design_divider(goal, stock, max_parts, total_ohms=total, min_current_a=min_current,
                            vref_tolerance=vref_tol or 0.0)
    if as_json:
        echo_json(divider_dict(design))
    else:
        click.echo(divider_text(design))


@cli.command()
@click.option("--tau", type=TIME, metavar="T", help="Time constant τ = R·C wanted, in seconds: 1ms, 250us, 2.5s.")
@click.option("--corner", type=FREQUENCY, metavar="F",
              help="Corner frequency f = 1/(2π·R·C) wanted, in hertz: 1kHz, 159.2Hz.")
@click.option("--cap", type=CAPACITANCE, required=True, metavar="C",
              help="The capacitor, in farads: 100n, 100nF, 4n7, 2.2uF (u for µ).")
@click.option("--cap-tol", type=TOLERANCE, metavar="TOL",
              help="The capacitor's tolerance: 5%, 10 %, or a letter (J = 5 %, K = 10 %); widens the band.")
@stock_options
@click.option("--max-parts", "-k", type=click.IntRange(min=1, max=400), metavar="K",
              help="Largest part count to search, 1 to 400 (default 4).")
@click.option("--within", type=ACCURACY, metavar="TOL",
              help="Required accuracy of the resistance: 0.1%, 50ppm. Stops at the fewest parts inside it.")
@click.option("--alternatives", type=click.IntRange(min=0, max=20), default=2, show_default=True, metavar="N",
              help="Runners-up to list per part count.")
@click.option("--prefer", type=click.Choice(PREFERENCES), default="error", show_default=True,
              help="What ranks the recommended network first.")
@json_option
def rc(tau, corner, cap, cap_tol, bin_file, series, value_range, qty, kit_tolerance, kit_power, max_parts, within,
       alternatives, prefer, as_json):
    """Find the resistor for an RC time constant or corner frequency.

    Give --tau (τ = R·C) or --corner (f = 1/(2π·R·C)) and the capacitor
    (--cap, and its tolerance with --cap-tol). netsynth computes the
    resistance, searches your stock for it as `make` does, and reports the
    τ or f the network achieves, with its worst-case band over the parts'
    and the capacitor's tolerances.

    \b
    Examples:
      netsynth rc --tau 1ms --cap 100n
      netsynth rc --corner 1kHz --cap 4n7 --cap-tol 5% -k 3
      netsynth rc --tau 2.5s --cap 220uF --bin bins/makerspace-drawer.csv --json

    Exit status: 0 done, 1 no answer, 2 a bad command line.
    """
    from netsynth.api import make as make_design
    from netsynth.jobs.rc import corner_goal, rc_result, tau_goal
    from netsynth.render.divider import rc_dict, rc_text
    from netsynth.render.json import design_dict
    from netsynth.render.report import design_text

    if (tau is None) == (corner is None):
        raise click.UsageError("give one of --tau T or --corner F")
    tolerance = cap_tol or 0.0
    goal = tau_goal(tau, cap, tolerance) if tau is not None else corner_goal(corner, cap, tolerance)
    stock = load_stock(bin_file, series, value_range, qty, kit_tolerance, kit_power)
    design = make_design(goal.resistance_ohms, stock, max_parts=max_parts, within=within, alternatives=alternatives,
                         on_progress=None if as_json else progress, prefer=prefer)
    band = design.review.band
    result = rc_result(goal, design.best.value_ohms, band.low_ohms, band.high_ohms)
    if as_json:
        echo_json(rc_dict(result, design_dict(design)))
    else:
        click.echo(rc_text(result, design_text(design, show_alternatives=alternatives > 0)))
