"""At the bench: ``netsynth bin show|check|take|add`` (a bin file that keeps count).

``netsynth bin FILE`` (no subcommand) still lists the file, as ``bin show FILE`` does, and
``netsynth bin`` alone lists the built-in default bin: :class:`BinGroup` reads a first word that
is not a subcommand as the file of ``show``. (A bin file literally named ``show``, ``check``,
``take`` or ``add`` needs ``bin show ./take``.)

``take`` and ``add`` edit the file as text through :mod:`netsynth.stock.edit`: only the ``qty``
cells of the touched rows change (or one row is appended), the previous version is kept as
``FILE.bak``, and the write is atomic. Both ask before writing unless ``--yes``; ``--dry-run``
prints the change and writes nothing.
"""

from __future__ import annotations

import click

from netsynth.analysis.conditions import DEFAULT_AMBIENT_C, DEFAULT_POWER_FACTOR, DEFAULT_VOLTAGE_FACTOR
from netsynth.cli.shell import (
    AMBIENT,
    BIN_FILE,
    CURRENT,
    DUTY,
    FACTOR,
    POWER,
    RESISTANCE,
    TOLERANCE,
    VOLTAGE,
    Parsed,
    cli,
    conditions,
    echo_json,
)
from netsynth.inputs import as_temp_c
from netsynth.stock import default_bin, load_bin
from netsynth.values import format_ohms, parse_tcr, to_code

TCR = Parsed("tcr", parse_tcr, "a temperature coefficient in ppm/K such as 100 or 50ppm")
MAX_TEMP = Parsed("temperature", lambda text: as_temp_c(text, "max_temp"), "a temperature in °C such as 155 or 125C",
                  label="max_temp")


class BinGroup(click.Group):
    """A group whose first word, when it is no subcommand, is the file of ``show``."""

    def parse_args(self, ctx: click.Context, args: list[str]) -> list[str]:
        if not args or (args[0] not in self.commands and args[0] not in ctx.help_option_names):
            args = ["show", *args]
        return super().parse_args(ctx, args)


@cli.group(name="bin", cls=BinGroup)
def bin_group() -> None:
    """A stock bin file: list it, check it, take a build's parts out, add stock.

    \b
    netsynth bin show [FILE]          list what the bin holds (also: netsynth bin FILE)
    netsynth bin check FILE           read the file and report any problem
    netsynth bin take FILE --network EXPR [--dry-run] [--yes]
    netsynth bin add FILE VALUE --qty N [--tolerance ... --location ...]

    take and add change only the qty cells of the rows they touch (or append one row):
    comments, other rows and columns stay byte for byte. The previous version is kept
    as FILE.bak; the write is atomic (temp file, fsync, rename).
    """


def _json_option(fn):
    return click.option("--json", "as_json", is_flag=True, help="Print one JSON object (errors as {\"error\": ...}).")(fn)


@bin_group.command(name="show")
@click.argument("bin_file", required=False, type=BIN_FILE, metavar="FILE")
@_json_option
def show(bin_file, as_json):
    """Check a stock bin file and list what it holds (the default bin without FILE).

    \b
    Examples:
      netsynth bin bins/precision-kit.csv
      netsynth bin show --json
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


@bin_group.command(name="check")
@click.argument("bin_file", type=BIN_FILE, metavar="FILE")
@_json_option
def check_bin(bin_file, as_json):
    """Read a bin file and say whether netsynth can use it (exit 1 and one line naming the problem if not).

    \b
    Example:
      netsynth bin check bins/makerspace-drawer.csv
    """
    stock = load_bin(bin_file)
    counted = [i.count for i in stock.items if i.count is not None]
    unlimited = len(stock.items) - len(counted)
    if as_json:
        echo_json({"bin": stock.name, "ok": True, "lines": len(stock.items), "parts": sum(counted),
                   "unlimited_lines": unlimited})
        return
    extra = f", and {unlimited} line{'s' if unlimited != 1 else ''} with as many as needed" if unlimited else ""
    click.echo(f"{stock.name}: ok, {len(stock.items)} stock lines holding {sum(counted)} parts{extra}")


def _row_text(item) -> str:
    where = item.location or "-"
    watts = {0.125: "⅛ W", 0.25: "¼ W", 0.5: "½ W"}.get(item.power_rating_w, f"{item.power_rating_w:g} W")
    return f"{to_code(item.ohms)}  ±{item.tolerance * 100:g} %  {watts}  {where}"


def _apply(edit, dry_run: bool, yes: bool, as_json: bool, question: str):
    """Write the edit unless a dry run (asking first unless --yes); return (written, backup path)."""
    from netsynth.stock.edit import apply_edit

    if dry_run or not edit.changed:
        return False, None
    if not yes:
        click.confirm(question, abort=True, err=True)
    return True, apply_edit(edit)


def _changes_json(edit) -> list[dict]:
    return [{"line": c.line, "value_ohms": c.item.ohms, "location": c.item.location, "before": c.before,
             "after": c.after, "appended": c.appended} for c in edit.changes]


def _finish(edit, written: bool, backup: str | None, dry_run: bool) -> None:
    if dry_run:
        click.echo("Dry run: nothing written.")
    elif written:
        click.echo(f"Written: {edit.path} (previous version: {backup})")
    elif not edit.changed:
        click.echo("Nothing to write.")


@bin_group.command(name="take")
@click.argument("bin_file", type=BIN_FILE, metavar="FILE")
@click.option("--network", "expression", required=True, metavar="EXPR",
              help="The network you built, as make prints it: \"10 + 360 + 3k\", \"2p(10)\".")
@click.option("--volts", type=VOLTAGE, metavar="V", help="The operating point make was given (so the same lines "
              "are taken): volts ...")
@click.option("--amps", type=CURRENT, metavar="A", help="... or amperes ...")
@click.option("--watts", type=POWER, metavar="W", help="... or watts.")
@click.option("--duty", type=DUTY, metavar="PCT", help="Duty cycle, as given to make.")
@click.option("--ambient", type=AMBIENT, default=DEFAULT_AMBIENT_C, show_default=True, metavar="°C",
              help="Ambient, as given to make.")
@click.option("--derate", type=FACTOR, default=DEFAULT_POWER_FACTOR, show_default=True, metavar="F",
              help="Power derating, as given to make.")
@click.option("--volt-derate", type=FACTOR, default=DEFAULT_VOLTAGE_FACTOR, show_default=True, metavar="F",
              help="Voltage derating, as given to make.")
@click.option("--dry-run", is_flag=True, help="Print what would change; write nothing.")
@click.option("--yes", "-y", is_flag=True, help="Write without asking.")
@_json_option
def take(bin_file, expression, volts, amps, watts, duty, ambient, derate, volt_derate, dry_run, yes, as_json):
    """Take a built network's parts out of the bin FILE (its qty cells count down).

    The parts are tied to the file's lines as make ties them (with the same
    operating point, the same lines); a line never goes below 0: if the file
    holds too few, nothing is written and the line is named (exit 1).

    \b
    Examples:
      netsynth bin take drawer.csv --network "10 + 360 + 3k" --dry-run
      netsynth bin take shelf.csv --network "2p(10)" --watts 3 --yes
    """
    from netsynth.api import take_list
    from netsynth.stock.edit import plan_take, same_part

    stock = load_bin(bin_file)
    point, derating = conditions(volts, amps, watts, duty, ambient, derate, volt_derate, False)
    picks = take_list(expression, stock, point, derating)
    edit = plan_take(bin_file, {p.line: p.count for p in picks})
    if as_json and not (dry_run or yes):
        raise click.UsageError("with --json, give --dry-run or --yes (there is no one to ask)")
    if not as_json:
        click.echo(f"Take {expression} from {edit.path}:")
        for p in picks:
            rows = [c for c in edit.changes if same_part(c.item, p.line)]
            counted = "; ".join(f"line {c.line}: qty {c.before} -> {c.after}" for c in rows) or "as many as needed"
            click.echo(f"  {p.count} ×  {_row_text(p.line)}   {counted}")
    written, backup = _apply(edit, dry_run, yes, as_json, f"Write the new counts to {edit.path}?")
    if as_json:
        echo_json({"bin": edit.path, "network": expression, "dry_run": dry_run, "written": written,
                   "backup": backup,
                   "take": [{"ohms": p.ohms, "count": p.count, "line": p.line.line, "location": p.location}
                            for p in picks],
                   "changes": _changes_json(edit)})
        return
    _finish(edit, written, backup, dry_run)


@bin_group.command(name="add")
@click.argument("bin_file", type=BIN_FILE, metavar="FILE")
@click.argument("value", type=RESISTANCE)
@click.option("--qty", type=click.IntRange(min=1), required=True, metavar="N", help="How many parts to add.")
@click.option("--tolerance", type=TOLERANCE, metavar="TOL", help="1%, 5 %, F ...")
@click.option("--watts", type=POWER, metavar="W", help="Power rating at 70 °C: 0.25, 1/4W, 1W.")
@click.option("--max-volts", type=VOLTAGE, metavar="V", help="Limiting element voltage: 200, 250V.")
@click.option("--tcr", type=TCR, metavar="PPM", help="Temperature coefficient magnitude, ppm/K: 100, 50ppm.")
@click.option("--max-temp", type=MAX_TEMP, metavar="°C", help="Upper category temperature: 155, 125C.")
@click.option("--package", metavar="TEXT", help="Package text for a new line: 0805, axial.")
@click.option("--location", metavar="TEXT", help="Where a new line lives: \"drawer B2\".")
@click.option("--note", metavar="TEXT", help="A note for a new line.")
@click.option("--dry-run", is_flag=True, help="Print what would change; write nothing.")
@click.option("--yes", "-y", is_flag=True, help="Write without asking.")
@_json_option
def add(bin_file, value, qty, tolerance, watts, max_volts, tcr, max_temp, package, location, note, dry_run, yes,
        as_json):
    """Add N parts of VALUE to the bin FILE.

    Ratings not given are those of the file's one line of VALUE that agrees
    with the ones given (several such lines: give more ratings to pick one;
    none: the bin defaults, 1 % ¼ W 200 V 100 ppm/K). The parts go to that
    line's first row, or a new row at the end of the file.

    \b
    Examples:
      netsynth bin add drawer.csv 4k7 --qty 10
      netsynth bin add drawer.csv 2k2 --qty 5 --tolerance 5% --watts 1/4W --location "drawer A4"
    """
    from netsynth.stock.edit import plan_add

    item = _new_line(bin_file, value, qty, tolerance=tolerance, power_rating_w=watts, max_volts=max_volts,
                     tcr_ppm=tcr, max_temp_c=max_temp, package=package, location=location, note=note)
    edit = plan_add(bin_file, item)
    if as_json and not (dry_run or yes):
        raise click.UsageError("with --json, give --dry-run or --yes (there is no one to ask)")
    if not as_json:
        click.echo(f"Add {qty} × {_row_text(item)} to {edit.path}:")
        for c in edit.changes:
            click.echo(f"  line {c.line}: " + (f"new row, qty {c.after}" if c.appended else
                                               f"qty {c.before} -> {c.after}"))
        if not edit.changed:
            click.echo("  its line holds as many as needed (blank qty): nothing to count")
    written, backup = _apply(edit, dry_run, yes, as_json, f"Write the new count to {edit.path}?")
    if as_json:
        echo_json({"bin": edit.path, "dry_run": dry_run, "written": written, "backup": backup,
                   "changes": _changes_json(edit)})
        return
    _finish(edit, written, backup, dry_run)


def _new_line(bin_file, ohms, qty, **given):
    """The stock line to add: ratings given, the rest from the file's one matching line, else defaults."""
    import dataclasses

    from netsynth.analysis.lines import value_key
    from netsynth.errors import StockError
    from netsynth.stock import StockItem

    ratings = ("tolerance", "power_rating_w", "max_volts", "tcr_ppm", "max_temp_c")
    texts = ("package", "location", "note")
    from netsynth.stock.edit import file_rows, same_part

    same: list = []
    for row in file_rows(bin_file):  # rows with qty 0 too: an empty drawer is refilled, not duplicated
        if (value_key(row.ohms) == value_key(ohms) and not any(same_part(row, s) for s in same)
                and all(given[r] is None or value_key(getattr(row, r)) == value_key(given[r]) for r in ratings)):
            same.append(row)
    if len(same) > 1 and any(given[r] is None for r in ratings):
        lines = "; ".join(f"line {i.line}: {_row_text(i)}" for i in same)
        raise StockError(f"{bin_file} has {len(same)} lines of {to_code(ohms)} ({lines}); give --tolerance, "
                         "--watts, --max-volts or --tcr to say which")
    base = same[0] if same else StockItem(ohms)
    chosen = {r: getattr(base, r) if given[r] is None else given[r] for r in ratings}
    text = {t: (getattr(base, t) if same else "") if given[t] is None else given[t] for t in texts}
    return dataclasses.replace(StockItem(ohms), count=qty, **chosen, **text)
