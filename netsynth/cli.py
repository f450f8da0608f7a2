"""The ``netsynth`` command: a thin shell over :mod:`netsynth.api`.

The only module that imports click. Library errors become one ``Error: ...`` line
and exit status 1; usage errors exit 2 through click.
"""

from __future__ import annotations

import json
import sys
from collections.abc import Callable
from functools import wraps

import click

from netsynth.analysis.conditions import (
    DEFAULT_AMBIENT_C,
    DEFAULT_POWER_FACTOR,
    DEFAULT_VOLTAGE_FACTOR,
    Derating,
    OperatingPoint,
)
from netsynth.api import check as check_network
from netsynth.api import make as make_design
from netsynth.errors import NetsynthError
from netsynth.eseries import SERIES_NAMES
from netsynth.render.json import check_dict, design_dict
from netsynth.render.report import check_text, design_text
from netsynth.search.frontier import PREFERENCES
from netsynth.stock import StockBin, default_bin, kit_bin, load_bin
from netsynth.values import (
    format_ohms,
    parse_current,
    parse_duty,
    parse_power,
    parse_range,
    parse_ratio,
    parse_resistance,
    parse_tolerance,
    parse_voltage,
    to_code,
)


def _friendly(fn: Callable) -> Callable:
    """Turn NetsynthError into one line on stderr and exit status 1."""

    @wraps(fn)
    def run(*args, **kwargs):
        try:
            return fn(*args, **kwargs)
        except NetsynthError as exc:
            click.echo(f"Error: {exc}", err=True)
            sys.exit(1)

    return run


@click.group(context_settings={"help_option_names": ["-h", "--help"], "max_content_width": 100})
@click.version_option(package_name="netsynth")
def cli() -> None:
    """Build a resistance your drawer does not hold from parts it does.

    netsynth searches every series/parallel network of your stock parts and
    reports, for each part count, the network closest to the target, proves
    that none of that size does better, and re-checks each answer with an
    independent nodal solver.

    \b
    Values are read as people write them: 4700, 4.7k, 4k7, 4K7, 4.7 kΩ,
    R47, 0R22, 47R, 1M0, 2M2, 10m (milliohm), 1.5e3.  Lowercase m is milli,
    uppercase M is mega.

    Start with:  netsynth make 3k37
    """


def _load_stock(bin_file: str | None, series: str | None, value_range: str | None, qty: int | None) -> StockBin:
    kit_given = series is not None or value_range is not None or qty is not None
    if bin_file and kit_given:
        raise click.UsageError("give either --bin FILE or kit options (--series/--range/--qty), not both")
    if bin_file:
        return load_bin(bin_file)
    if kit_given:
        low, high = parse_range(value_range) if value_range else (10.0, 1e6)
        return kit_bin(series or "E24", low, high, count=qty)
    return default_bin()


def _progress(message: str) -> None:
    if sys.stderr.isatty():
        click.echo(f"… {message}", err=True)


def operating_options(fn: Callable) -> Callable:
    """The options that state what the network sees and how hard its parts may work."""
    options = [
        click.option("--volts", metavar="V", help="Voltage across the network, e.g. 24, 1kV (peak when pulsed)."),
        click.option("--amps", metavar="A", help="Current through the network, e.g. 2, 150mA (peak when pulsed)."),
        click.option("--watts", metavar="W", help="Power the network dissipates, e.g. 5, 1/4W (peak when pulsed)."),
        click.option("--duty", metavar="PCT", help="Fraction of time driven, e.g. 10% (default 100 %): power limits "
                     "apply to the average, voltage limits to the peak."),
        click.option("--ambient", type=float, default=DEFAULT_AMBIENT_C, show_default=True, metavar="°C",
                     help="Air temperature around the parts; above 70 °C ratings derate linearly to zero at each "
                     "part's max_temp (IEC 60115-1 style curve)."),
        click.option("--derate", type=float, default=DEFAULT_POWER_FACTOR, show_default=True, metavar="F",
                     help="Fraction of the (temperature-derated) power rating a part may use (common practice)."),
        click.option("--volt-derate", type=float, default=DEFAULT_VOLTAGE_FACTOR, show_default=True, metavar="F",
                     help="Fraction of the rated voltage min(max_volts, √(P·R)) a part may see."),
        click.option("--mains", is_flag=True, help="The network is connected to mains: adds the mains caution."),
        click.option("--spec", metavar="TOL", help="Your acceptance band around the target, e.g. 1%: reports the "
                     "Monte Carlo yield."),
        click.option("--temp", type=float, metavar="°C", help="Report the value band at this temperature."),
    ]
    for option in reversed(options):
        fn = option(fn)
    return fn


def _conditions(volts, amps, watts, duty, ambient, derate, volt_derate, mains):
    given = [x for x in (volts, amps, watts) if x is not None]
    if len(given) > 1:
        raise click.UsageError("give only one of --volts, --amps or --watts")
    derating = Derating(derate, volt_derate)
    if not given:
        if duty is not None or mains:
            raise click.UsageError("--duty and --mains need an operating point: --volts, --amps or --watts")
        return None, derating
    point = OperatingPoint(
        volts=parse_voltage(volts) if volts is not None else None,
        amps=parse_current(amps) if amps is not None else None,
        watts=parse_power(watts) if watts is not None else None,
        duty=parse_duty(duty) if duty is not None else 1.0,
        ambient_c=ambient,
        mains=mains,
    )
    return point, derating


@cli.command()
@click.argument("target")
@click.option("--bin", "bin_file", type=click.Path(dir_okay=False), metavar="FILE",
              help="Stock bin CSV (columns value, qty, tolerance, watts, max_volts, tcr, package, location, note).")
@click.option("--series", type=click.Choice(SERIES_NAMES, case_sensitive=False),
              help="Use a kit of one E-series instead of a bin file (IEC 60063).")
@click.option("--range", "value_range", metavar="LOW..HIGH",
              help="Kit value range, e.g. 10..1M (default 10..1M).")
@click.option("--qty", type=click.IntRange(min=1), metavar="N",
              help="Kit parts per value (default: as many as needed).")
@click.option("--max-parts", "-k", type=click.IntRange(min=1, max=400), metavar="K",
              help="Largest part count to search (default 4; with an operating point, as many as needed).")
@click.option("--within", metavar="TOL",
              help="Required accuracy, e.g. 0.1% or 50ppm: stop at the fewest parts inside it.")
@click.option("--alternatives", type=click.IntRange(min=0, max=20), default=2, show_default=True,
              help="Runners-up to list per part count.")
@click.option("--prefer", type=click.Choice(PREFERENCES), default="error", show_default=True,
              help="What ranks the recommended network first: smallest error, fewest parts, or most headroom "
              "(the last two among networks within --within, default ±1 %).")
@operating_options
@click.option("--json", "as_json", is_flag=True, help="Print one JSON object for scripts.")
@_friendly
def make(target, bin_file, series, value_range, qty, max_parts, within, alternatives, prefer, volts, amps, watts,
         duty, ambient, derate, volt_derate, mains, spec, temp, as_json):
    """Find the best networks for TARGET ohms from your stock.

    TARGET is a resistance such as 3k37, 25m or 1.8M. Without --bin or kit
    options the built-in default bin is used: a full E24 kit from 10 Ω to
    1 MΩ, 1 % ¼ W parts, as many of each as needed.

    \b
    Examples:
      netsynth make 3k37
      netsynth make 25m --bin bins/power-shelf.csv
      netsynth make 1k234 --series E12 --range 100..100k --qty 2 -k 5
      netsynth make 3k37 --within 0.1% --json
      netsynth make 10 --watts 5 --bin bins/power-shelf.csv
      netsynth make 1M8 --volts 1kV --series E24 --range 10k..1M

    With --volts, --amps or --watts every part must stay within its derated
    power and voltage limits; the search then goes to as many parts as the
    physics needs, and reports the lower bound on the count.
    """
    stock = _load_stock(bin_file, series, value_range, qty)
    target_ohms = parse_resistance(target)
    tol = parse_ratio(within) if within is not None else None
    point, derating = _conditions(volts, amps, watts, duty, ambient, derate, volt_derate, mains)
    design = make_design(target_ohms, stock, max_parts=max_parts, within=tol, alternatives=alternatives,
                         on_progress=None if as_json else _progress, point=point, derating=derating, prefer=prefer,
                         spec=parse_tolerance(spec) if spec else None, temp_c=temp)
    if as_json:
        click.echo(json.dumps(design_dict(design), indent=2, ensure_ascii=False))
    else:
        click.echo(design_text(design, show_alternatives=alternatives > 0))


@cli.command()
@click.argument("expression")
@click.option("--bin", "bin_file", type=click.Path(dir_okay=False), metavar="FILE",
              help="Stock bin the parts come from (ratings, tolerance, tcr); default: the built-in bin.")
@click.option("--target", metavar="OHMS", help="The value the network is meant to have (for its error and yield).")
@operating_options
@click.option("--json", "as_json", is_flag=True, help="Print one JSON object for scripts.")
@_friendly
def check(expression, bin_file, target, volts, amps, watts, duty, ambient, derate, volt_derate, mains, spec, temp,
          as_json):
    """Analyse a network you typed: value, bands, drift and per-part stress.

    EXPRESSION uses + for series and || for parallel, with parentheses around
    every compound part: "1k + (2k2 || 4k7)". Values in any accepted spelling.
    Parts are matched to the bin by value for their ratings.

    \b
    Examples:
      netsynth check "1k + (2k2 || 4k7)"
      netsynth check "(100 + 100) || (100 + 100)" --volts 24 --bin bins/power-shelf.csv
      netsynth check "470k + 470k + 470k + 470k" --volts 1kV --ambient 50 --json
    """
    stock = load_bin(bin_file) if bin_file else default_bin()
    point, derating = _conditions(volts, amps, watts, duty, ambient, derate, volt_derate, mains)
    candidate, verdict = check_network(expression, stock, point, derating,
                                       spec=parse_tolerance(spec) if spec else None, temp_c=temp, target=target)
    if as_json:
        click.echo(json.dumps(check_dict(candidate, verdict), indent=2, ensure_ascii=False))
    else:
        click.echo(check_text(candidate, verdict))


@cli.command(name="bin")
@click.argument("bin_file", required=False, type=click.Path(dir_okay=False), metavar="FILE")
@click.option("--json", "as_json", is_flag=True, help="Print the bin as JSON.")
@_friendly
def show_bin(bin_file, as_json):
    """Check a stock bin file and list what it holds (the default bin without FILE)."""
    stock = load_bin(bin_file) if bin_file else default_bin()
    if as_json:
        items = [
            {"value_ohms": i.ohms, "qty": i.count, "tolerance": i.tolerance, "watts": i.power_rating_w,
             "max_volts": i.max_volts, "tcr_ppm": i.tcr_ppm, "package": i.package, "location": i.location,
             "note": i.note}
            for i in stock.items
        ]
        click.echo(json.dumps({"bin": stock.name, "items": items}, indent=2, ensure_ascii=False))
        return
    click.echo(f"{stock.name}: {len(stock)} stock lines")
    for i in stock.items:
        qty = "any" if i.count is None else str(i.count)
        click.echo(
            f"  {to_code(i.ohms):>8}  {format_ohms(i.ohms):>10}  qty {qty:>4}  ±{i.tolerance * 100:g} %  "
            f"{i.power_rating_w:g} W  {i.max_volts:g} V  {i.location}".rstrip()
        )


def main() -> None:
    cli(prog_name="netsynth")


if __name__ == "__main__":
    main()
