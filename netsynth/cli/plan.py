"""The ``plan`` command: a board's values from one drawer.

Thin: parse options (:mod:`.shell`), call :func:`netsynth.plan.plan_board`, print
:mod:`netsynth.render.board`'s output, and save the leftover bin when asked.
"""

from __future__ import annotations

import click

from netsynth.analysis.conditions import DEFAULT_AMBIENT_C, DEFAULT_POWER_FACTOR, DEFAULT_VOLTAGE_FACTOR
from netsynth.cli.shell import AMBIENT, BIN_FILE, FACTOR, cli, echo_json, json_option, load_stock, progress, stock_options


@cli.command()
@click.argument("needs_file", metavar="NEEDS.csv")
@stock_options
@click.option("--max-parts", "-k", type=click.IntRange(min=1, max=6), default=4, show_default=True, metavar="K",
              help="Largest part count of each need's network, 1 to 6.")
@click.option("--leftover", "leftover_file", type=BIN_FILE, metavar="FILE",
              help="Save the stock the plan leaves as a bin file (written to a temporary file, then renamed).")
@click.option("--time-limit", type=click.FloatRange(min=0.1, max=3600.0), default=10.0, show_default=True,
              metavar="S", help="Seconds the solver may spend on the allocation (0.1 to 3600).")
@click.option("--workers", type=click.IntRange(min=1, max=64), default=2, show_default=True, metavar="N",
              help="Solver threads (1 where threads misbehave).")
@click.option("--seed", type=click.IntRange(min=0), default=1, show_default=True, metavar="N",
              help="Solver random seed: the same seed gives the same plan.")
@click.option("--ambient", type=AMBIENT, default=DEFAULT_AMBIENT_C, show_default=True, metavar="°C",
              help="Air temperature around the parts of needs with volts, amps or watts, in °C.")
@click.option("--derate", type=FACTOR, default=DEFAULT_POWER_FACTOR, show_default=True, metavar="F",
              help="Fraction of the (temperature-derated) power rating a part may use: 0.5 or 50%.")
@click.option("--volt-derate", type=FACTOR, default=DEFAULT_VOLTAGE_FACTOR, show_default=True, metavar="F",
              help="Fraction of the rated voltage min(max_volts, √(P·R)) a part may see: 0.8 or 80%.")
@json_option
def plan(needs_file, bin_file, series, value_range, qty, kit_tolerance, kit_power, max_parts, leftover_file,
         time_limit, workers, seed, ambient, derate, volt_derate, as_json):
    """Build every resistance a board needs from one shared bin.

    NEEDS.csv lists the needs, one per row, with a header: ref and target
    required; within (blank: ±1 %); volts, amps or watts (optional, at most
    one). Each need gets candidate networks of up to K parts from the
    exhaustive search; CP-SAT then picks one per need so that the bin's
    quantities cover all of them together: as many needs served as possible,
    then the fewest parts, then the smallest largest error. Needs it cannot
    serve are listed with the reason.

    \b
    Examples:
      netsynth plan bins/board-needs.csv --bin bins/makerspace-drawer.csv
      netsynth plan needs.csv --series E12 --range 10..1M --qty 3 -k 3
      netsynth plan needs.csv --bin drawer.csv --leftover drawer-after.csv --json

    Exit status: 0 done (also when some needs are not served), 1 a bad file
    or bin, 2 a bad command line.
    """
    from netsynth.analysis.conditions import Derating
    from netsynth.plan import load_needs, plan_board
    from netsynth.render.board import plan_dict, plan_text
    from netsynth.search.solver import SolverSettings
    from netsynth.stock import save_bin

    stock = load_stock(bin_file, series, value_range, qty, kit_tolerance, kit_power)
    needs = load_needs(needs_file, ambient_c=ambient)
    result = plan_board(needs, stock, max_parts=max_parts, derating=Derating(derate, volt_derate),
                        settings=SolverSettings(seconds=time_limit, workers=workers, seed=seed),
                        on_progress=None if as_json else progress)
    if leftover_file is not None:
        save_bin(result.leftover, leftover_file)
    if as_json:
        echo_json(plan_dict(result, needs_file))
    else:
        click.echo(plan_text(result, needs_file, leftover_file))
