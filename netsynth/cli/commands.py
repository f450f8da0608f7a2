"""The main job's commands: ``make`` (search), ``check`` (analyse a typed network), ``bin`` (list a bin).

Thin: parse options (:mod:`.shell`), call :mod:`netsynth.api`, print a renderer's output.
"""

from __future__ import annotations

import click

from netsynth.cli.shell import (
    ACCURACY,
    BIN_FILE,
    RESISTANCE,
    cli,
    conditions,
    echo_json,
    json_option,
    load_stock,
    operating_options,
    progress,
    stock_options,
)
from netsynth.inputs import PREFERENCES
from netsynth.stock import default_bin, load_bin
from netsynth.values import format_ohms, to_code


@cli.command()
@click.argument("target", type=RESISTANCE)
@stock_options
@click.option("--max-parts", "-k", type=click.IntRange(min=1, max=400), metavar="K",
              help="Largest part count to search, 1 to 400 (default 4; with an operating point, as many as needed).")
@click.option("--within", type=ACCURACY, metavar="TOL",
              help="Required accuracy: 0.1%, 50ppm, 1e-5% (a bare number is refused: fraction or percent?). "
              "Stops at the fewest parts inside it.")
@click.option("--alternatives", type=click.IntRange(min=0, max=20), default=2, show_default=True, metavar="N",
              help="Runners-up to list per part count.")
@click.option("--prefer", type=click.Choice(PREFERENCES), default="error", show_default=True,
              help="What ranks the recommended network first: smallest error, fewest parts, or most headroom "
              "(the last two among networks within --within, default ±1 %).")
@operating_options
@json_option
def make(target, bin_file, series, value_range, qty, kit_tolerance, kit_power, max_parts, within, alternatives,
         prefer, volts, amps, watts, duty, ambient, derate, volt_derate, mains, spec, temp, as_json):
    """Find the best networks for TARGET ohms from your stock.

    TARGET is a resistance such as 3k37, 25m (milliohm) or 1M8. Without --bin
    or kit options the built-in default bin is used: a full E24 kit from
    10 Ω to 1 MΩ, 1 % ¼ W parts, as many of each as needed.

    \b
    Examples:
      netsynth make 3k37
      netsynth make 25m --bin bins/power-shelf.csv
      netsynth make 1k234 --series E12 --range 100..100k --qty 2 -k 5
      netsynth make 4k99 --series E96 --kit-tolerance 0.1% --kit-power 1/8W
      netsynth make 3k37 --within 0.1% --json
      netsynth make 10 --watts 5 --bin bins/power-shelf.csv
      netsynth make 1M8 --volts 1kV --series E24 --range 10k..1M

    With --volts, --amps or --watts every part must stay within its derated
    power and voltage limits; the search then goes to as many parts as the
    physics needs, and reports the lower bound on the count.

    Exit status: 0 done, 1 no answer (bad bin, nothing meets the limits),
    2 a bad command line.
    """
    from netsynth.api import make as make_design
    from netsynth.render.json import design_dict
    from netsynth.render.report import design_text

    stock = load_stock(bin_file, series, value_range, qty, kit_tolerance, kit_power)
    point, derating = conditions(volts, amps, watts, duty, ambient, derate, volt_derate, mains)
    design = make_design(target, stock, max_parts=max_parts, within=within, alternatives=alternatives,
                         on_progress=None if as_json else progress, point=point, derating=derating, prefer=prefer,
                         spec=spec, temp_c=temp)
    if as_json:
        echo_json(design_dict(design))
    else:
        click.echo(design_text(design, show_alternatives=alternatives > 0))


@cli.command()
@click.argument("expression")
@click.option("--bin", "bin_file", type=BIN_FILE, metavar="FILE",
              help="Stock bin the parts come from (ratings, tolerance, tcr), e.g. bins/power-shelf.csv; "
              "default: the built-in bin.")
@click.option("--target", type=RESISTANCE, metavar="OHMS",
              help="The value the network is meant to have, e.g. 3k37 (for its error and yield).")
@operating_options
@json_option
def check(expression, bin_file, target, volts, amps, watts, duty, ambient, derate, volt_derate, mains, spec, temp,
          as_json):
    """Analyse a network you typed: value, bands, drift and per-part stress.

    EXPRESSION uses + for series and || for parallel, with parentheses around
    every compound part: "1k + (2k2 || 4k7)". Values in any accepted spelling.
    Parts are matched to the bin by value for their ratings.

    \b
    Examples:
      netsynth check "1k + (2k2 || 4k7)"
      netsynth check "680 + 2k7" --target 3k37 --spec 0.5% --temp 85
      netsynth check "(100 + 100) || (100 + 100)" --volts 24 --bin bins/power-shelf.csv
      netsynth check "470k + 470k + 470k + 470k" --volts 1kV --ambient 50 --json
    """
    from netsynth.api import check as check_network
    from netsynth.render.json import check_dict
    from netsynth.render.report import check_text

    stock = load_bin(bin_file) if bin_file is not None else default_bin()
    point, derating = conditions(volts, amps, watts, duty, ambient, derate, volt_derate, mains)
    candidate, verdict = check_network(expression, stock, point, derating, spec=spec, temp_c=temp, target=target)
    if as_json:
        echo_json(check_dict(candidate, verdict))
    else:
        click.echo(check_text(candidate, verdict))


@cli.command(name="bin")
@click.argument("bin_file", required=False, type=BIN_FILE, metavar="FILE")
@click.option("--json", "as_json", is_flag=True, help="Print the bin as JSON (errors as {\"error\": ...}).")
def show_bin(bin_file, as_json):
    """Check a stock bin file and list what it holds (the default bin without FILE).

    \b
    Examples:
      netsynth bin bins/precision-kit.csv
      netsynth bin --json
    """
    stock = load_bin(bin_file) if bin_file is not None else default_bin()
    if as_json:
        items = [
            {"value_ohms": i.ohms, "qty": i.count, "tolerance": i.tolerance, "watts": i.power_rating_w,
             "max_volts": i.max_volts, "tcr_ppm": i.tcr_ppm, "package": i.package, "location": i.location,
             "note": i.note, "line": i.line}
            for i in stock.items
        ]
        echo_json({"bin": stock.name, "items": items})
        return
    click.echo(f"{stock.name}: {len(stock)} stock lines")
    for i in stock.items:
        qty = "any" if i.count is None else str(i.count)
        click.echo(
            f"  {to_code(i.ohms):>8}  {format_ohms(i.ohms):>10}  qty {qty:>4}  ±{i.tolerance * 100:g} %  "
            f"{i.power_rating_w:g} W  {i.max_volts:g} V  {i.location}".rstrip()
        )
