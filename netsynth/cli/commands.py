"""The main job's commands: ``make`` (search) and ``check`` (analyse a typed network); ``bin`` is in :mod:`.bench`.

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


def drawing_options(fn):
    """``--svg FILE`` and ``--ascii``: the recommended network as a schematic file, the drawing in ASCII."""
    fn = click.option("--ascii", "ascii_drawing", is_flag=True,
                      help="Draw the network with -, + and | only (plain ASCII).")(fn)
    return click.option("--svg", "svg_file", type=click.Path(dir_okay=False), metavar="FILE",
                        help="Also write the network as an SVG schematic with a title block to FILE "
                        "(written atomically: a temporary file, then renamed).")(fn)


def spice_option(fn):
    """``--spice FILE``: the recommended (or checked) network as a SPICE subcircuit."""
    return click.option("--spice", "spice_file", type=click.Path(dir_okay=False), metavar="FILE",
                        help="Also write the network as a SPICE subcircuit (.subckt NETSYNTH A B, one R per part, "
                        "tolerance and tcr as comments) to FILE (written atomically).")(fn)


def _save(path: str, text: str) -> None:
    """Write one of the command's output files atomically (temp file, fsync, rename)."""
    from netsynth.errors import ArgumentError
    from netsynth.atomic import write_atomic

    write_atomic(path, text.encode("utf-8"), error=ArgumentError)


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
# the choices are netsynth.search.frontier.ENGINES, written out so that --help loads no numpy (a test compares them)
@click.option("--engine", type=click.Choice(("auto", "exhaustive", "cpsat", "arrays")), default="auto",
              show_default=True,
              help="How part counts above the exhaustive range are searched: auto (regular arrays, then CP-SAT "
              "where its model stays small), cpsat (CP-SAT over its two families, however large), arrays "
              "(regular arrays only) or exhaustive (stop where the exhaustive search stops).")
@operating_options
@drawing_options
@spice_option
@click.option("--pick-csv", "pick_csv_file", type=click.Path(dir_okay=False), metavar="FILE",
              help="Also write the pick list (quantity, value, ratings, location, bin line, RKM code, colour bands, "
              "chip codes) as CSV to FILE (written atomically).")
@json_option
def make(target, bin_file, series, value_range, qty, kit_tolerance, kit_power, max_parts, within, alternatives,
         prefer, engine, volts, amps, watts, duty, ambient, derate, volt_derate, mains, spec, temp, as_json, svg_file,
         ascii_drawing, spice_file, pick_csv_file):
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
                         on_progress=None if as_json else progress, point=point, derating=derating,
                         prefer=prefer, spec=spec, temp_c=temp, engine=engine)
    if svg_file is not None:
        from netsynth.render.svg import design_svg, save_svg

        save_svg(design_svg(design), svg_file)
    if spice_file is not None:
        from netsynth.render.spice import to_spice

        _save(spice_file, to_spice(design.best.network))
    if pick_csv_file is not None:
        from netsynth.render.picklist import pick_csv

        _save(pick_csv_file, pick_csv(design.pick_list))
    if as_json:
        echo_json(design_dict(design))
    else:
        click.echo(design_text(design, show_alternatives=alternatives > 0, ascii=ascii_drawing))


@cli.command()
@click.argument("expression", required=False)
@click.option("--netlist", "netlist_file", type=click.Path(dir_okay=False), metavar="FILE",
              help="Check the network in FILE instead of an EXPRESSION: a SPICE netlist or subcircuit (R elements) "
              "or an edge list (node, node, value per line).")
@click.option("--between", nargs=2, metavar="A B",
              help="With --netlist: the two terminal nodes (default: the subcircuit's two ports).")
@click.option("--bin", "bin_file", type=BIN_FILE, metavar="FILE",
              help="Stock bin the parts come from (ratings, tolerance, tcr), e.g. bins/power-shelf.csv; "
              "default: the built-in bin.")
@click.option("--target", type=RESISTANCE, metavar="OHMS",
              help="The value the network is meant to have, e.g. 3k37 (for its error and yield).")
@operating_options
@drawing_options
@spice_option
@json_option
def check(expression, netlist_file, between, bin_file, target, volts, amps, watts, duty, ambient, derate,
          volt_derate, mains, spec, temp, as_json, svg_file, ascii_drawing, spice_file):
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
      netsynth check --netlist bridge.cir --between A B --volts 10

    With --netlist, any two-terminal network is checked, bridges too: parts
    that carry no current are named, and a series/parallel network is also
    given (and checked) in its + / || form.
    """
    from netsynth.api import check as check_network
    from netsynth.render.json import check_dict
    from netsynth.render.report import check_text

    if (expression is None) == (netlist_file is None):
        raise click.UsageError("give a network EXPRESSION or --netlist FILE (one of them)")
    if between is not None and netlist_file is None:
        raise click.UsageError("--between names the terminals of a --netlist FILE")
    stock = load_bin(bin_file) if bin_file is not None else default_bin()
    point, derating = conditions(volts, amps, watts, duty, ambient, derate, volt_derate, mains)
    if netlist_file is not None:
        _check_netlist(netlist_file, between, stock, point, derating, spec, temp, target, as_json, svg_file,
                       ascii_drawing, spice_file)
        return
    candidate, verdict = check_network(expression, stock, point, derating, spec=spec, temp_c=temp, target=target)
    if spice_file is not None:
        from netsynth.render.spice import to_spice

        _save(spice_file, to_spice(candidate.network))
    if svg_file is not None:
        from netsynth.render.svg import check_svg, save_svg

        save_svg(check_svg(candidate, verdict, stock.name, target), svg_file)
    if as_json:
        echo_json(check_dict(candidate, verdict))
    else:
        click.echo(check_text(candidate, verdict, ascii=ascii_drawing))


def _check_netlist(netlist_file, between, stock, point, derating, spec, temp, target, as_json, svg_file,
                   ascii_drawing, spice_file):
    """``check --netlist``: read, analyse, write the files asked for, print."""
    from netsynth.api import check_netlist
    from netsynth.errors import ArgumentError
    from netsynth.render.netlist import netlist_dict, netlist_text

    general, candidate, verdict = check_netlist(netlist_file, between, stock, point, derating, spec=spec, temp_c=temp,
                                                target=target)
    if candidate is None and (svg_file is not None or spice_file is not None):
        option = "--svg" if svg_file is not None else "--spice"
        raise ArgumentError(f"{option} writes a series/parallel network; {netlist_file} is not one between "
                            f"{' and '.join(general.topology.between)}")
    if spice_file is not None:
        from netsynth.render.spice import to_spice

        _save(spice_file, to_spice(candidate.network))
    if svg_file is not None:
        from netsynth.render.svg import check_svg, save_svg

        save_svg(check_svg(candidate, verdict, stock.name, target), svg_file)
    if as_json:
        echo_json(netlist_dict(general, candidate, verdict))
    else:
        click.echo(netlist_text(general, candidate, verdict, ascii=ascii_drawing))
