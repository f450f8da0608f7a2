"""The ``netsynth`` group and what every command shares: value types, errors, bin and condition options.

Option values are read by click parameter types that call the :mod:`netsynth.values` parsers,
so a bad or empty option value is a usage error (exit status 2), like a missing argument or
conflicting options. Errors the library raises (:class:`~netsynth.errors.NetsynthError`)
exit with status 1.

Every error is reported in one place, :meth:`Shell.main`. Without ``--json`` it is
one ``Error: ...`` line on stderr (click adds the usage line for usage errors). With
``--json`` it is exactly one JSON object on stdout and nothing else there::

    {"error": {"kind": "usage", "message": "Invalid value for '--within': ..."}}

``kind`` is ``usage`` (exit 2), or for library errors (exit 1) ``parse``
(ValueParseError), ``stock`` (StockError), ``argument`` (ArgumentError),
``infeasible`` (InfeasibleError) or ``verification`` (VerificationError);
``message`` is one line.

This module imports nothing that needs numpy, so ``netsynth --help`` and usage errors stay
fast; the commands import the search and the renderers when they run.
"""

from __future__ import annotations

import importlib
import json
import sys
from collections.abc import Callable, Sequence
from typing import Any

import click
from click.shell_completion import CompletionItem

from netsynth.analysis.conditions import (
    DEFAULT_AMBIENT_C,
    DEFAULT_POWER_FACTOR,
    DEFAULT_VOLTAGE_FACTOR,
    MAX_AMBIENT_C,
    MIN_AMBIENT_C,
    Derating,
    OperatingPoint,
)
from netsynth.errors import (
    ArgumentError,
    InfeasibleError,
    NetsynthError,
    StockError,
    ValueParseError,
    VerificationError,
)
from netsynth.eseries import SERIES_NAMES
from netsynth.inputs import as_factor, as_temp_c
from netsynth.limits import MAX_QTY
from netsynth.stock import DEFAULT_POWER_W, DEFAULT_TOLERANCE, StockBin, default_bin, kit_bin, load_bin
from netsynth.values import (
    parse_current,
    parse_duty,
    parse_power,
    parse_range,
    parse_ratio,
    parse_resistance,
    parse_tolerance,
    parse_voltage,
)

# ------------------------------------------------------------------ option value types


class Parsed(click.ParamType):
    """An option value read by a netsynth parser; an unreadable or empty value is a usage error.

    `parse` turns the text into the value the library takes and raises
    ValueParseError or ArgumentError on bad text. `example` finishes the sentence
    "give ..." when the value is empty. `label` is the parameter name a parser from
    :mod:`netsynth.inputs` puts in front of its message; it is dropped, since click
    already names the option.
    """

    def __init__(self, name: str, parse: Callable[[str], Any], example: str, label: str = "") -> None:
        self.name = name
        self.parse = parse
        self.example = example
        self.label = label

    def convert(self, value: Any, param: click.Parameter | None, ctx: click.Context | None) -> Any:
        if not isinstance(value, str):
            return value  # a default, already in the library's form
        if not value.strip():
            self.fail(f"the value is empty; give {self.example}", param, ctx)
        try:
            return self.parse(value)
        except (ValueParseError, ArgumentError) as exc:
            message = str(exc)
            for prefix in (f"{self.label}: ", f"{self.label}="):
                if self.label and message.startswith(prefix):
                    message = message[len(prefix):]
            self.fail(message, param, ctx)


class BinPath(click.ParamType):
    """The path of a stock bin file: any non-empty text (the file is read by ``load_bin``)."""

    name = "file"

    def convert(self, value: Any, param: click.Parameter | None, ctx: click.Context | None) -> Any:
        if isinstance(value, str) and not value.strip():
            self.fail("the file name is empty; give the path of a bin file (.csv), or leave it out "
                      "to use the built-in default bin", param, ctx)
        return value

    def shell_complete(self, ctx: click.Context, param: click.Parameter, incomplete: str) -> list[CompletionItem]:
        return [CompletionItem(incomplete, type="file")]


def _ambient(text: str) -> float:
    celsius = as_temp_c(text, "ambient")
    if not MIN_AMBIENT_C <= celsius <= MAX_AMBIENT_C:
        raise ArgumentError(f"{text.strip()!r}: expected an ambient temperature from {MIN_AMBIENT_C:g} to "
                            f"{MAX_AMBIENT_C:g} °C")
    return celsius


RESISTANCE = Parsed("resistance", parse_resistance, "a resistance such as 4k7, 4.7k, 470R or R47")
ACCURACY = Parsed("accuracy", parse_ratio, "an accuracy such as 0.1%, 50ppm or 1e-5%")
TOLERANCE = Parsed("tolerance", parse_tolerance, "a tolerance such as 1%, 0.5 %, 50ppm or F")
VOLTAGE = Parsed("voltage", parse_voltage, "a voltage such as 24, 24V or 1kV")
CURRENT = Parsed("current", parse_current, "a current such as 2, 2A or 150mA")
POWER = Parsed("power", parse_power, "a power such as 5, 0.25W, 1/4W or 250mW")
DUTY = Parsed("duty", parse_duty, "a duty cycle such as 10% or 0.1")
RANGE = Parsed("range", parse_range, "a range LOW..HIGH such as 10..1M")
AMBIENT = Parsed("temperature", _ambient, "a temperature in °C such as 25, -40 or 85C", label="ambient")
TEMPERATURE = Parsed("temperature", lambda text: as_temp_c(text, "temp"),
                     "a temperature in °C such as 85, -40 or 85C", label="temp")
FACTOR = Parsed("factor", lambda text: as_factor(text, "factor"), "a fraction such as 0.5 or 50%", label="factor")
BIN_FILE = BinPath()


# ------------------------------------------------------------------ errors, in one place

#: library error classes and their ``kind`` in a JSON error object
ERROR_KINDS: tuple[tuple[type[NetsynthError], str], ...] = (
    (ValueParseError, "parse"),
    (StockError, "stock"),
    (ArgumentError, "argument"),
    (InfeasibleError, "infeasible"),
    (VerificationError, "verification"),
)


def _error_kind(exc: NetsynthError) -> str:
    # none raises a bare NetsynthError; should one appear, it is "no network could be made"
    return next((kind for cls, kind in ERROR_KINDS if isinstance(exc, cls)), "infeasible")


#: click's "usage error" that carries the help text of a command given no arguments (click 8.2+)
_HELP_ERRORS = getattr(click.exceptions, "NoArgsIsHelpError", ())
#: characters of an error message at most: the library's messages quote short excerpts and stay
#: well below; this only cuts what click itself may echo back (an unknown option of a megabyte)
MAX_MESSAGE_CHARS = 400


def _one_line(text: str) -> str:
    line = " ".join(text[: 4 * MAX_MESSAGE_CHARS].split())
    return line if len(line) <= MAX_MESSAGE_CHARS and len(text) <= 4 * MAX_MESSAGE_CHARS \
        else line[: MAX_MESSAGE_CHARS - 3] + "..."


def _asks_for_json(args: Sequence[str]) -> bool:
    """Whether ``--json`` is on the command line (before a ``--`` that ends the options)."""
    for arg in args:
        if arg == "--":
            return False
        if arg == "--json" or arg.startswith("--json="):
            return True
    return False


def _json_error(kind: str, message: str) -> None:
    click.echo(json.dumps({"error": {"kind": kind, "message": _one_line(message)}}, ensure_ascii=False,
                          allow_nan=False))


def _shortened(text: str, limit: int) -> str:
    """The first sentence of ``text`` in at most ``limit`` characters, ending in "..." when cut.

    The rule click applies to a loaded command's help, so a listed command reads the same
    whether or not its module is loaded: whole words while they fit; when they do not, drop
    words until they and "..." fit.
    """
    words = text.split()
    total = 0
    for i, word in enumerate(words):
        total += len(word) + (i > 0)
        if total > limit:
            break
        if word.endswith("."):
            return " ".join(words[: i + 1])
        if total == limit and i != len(words) - 1:
            break
    else:
        return " ".join(words)
    total += 3
    while i > 0:
        total -= len(words[i]) + 1
        if total <= limit:
            break
        i -= 1
    return " ".join(words[:i]) + "..."


class Shell(click.Group):
    """The ``netsynth`` group: reports every error once, as text or (with ``--json``) as JSON.

    Commands may be registered lazily (:attr:`lazy`: name -> (module, one-line help)): the
    module that defines a command is imported only when the command runs, and ``--help`` lists
    it from the one-line help, so ``netsynth --help`` imports none of the command modules.
    ``tests/test_cli.py`` checks that each one-line help is the command's own.
    """

    lazy: dict[str, tuple[str, str]] = {}

    def list_commands(self, ctx: click.Context) -> list[str]:
        return sorted(set(self.commands) | set(self.lazy))

    def get_command(self, ctx: click.Context | None, cmd_name: str) -> click.Command | None:
        if cmd_name not in self.commands and cmd_name in self.lazy:
            importlib.import_module(self.lazy[cmd_name][0])  # registers the command on this group
        return self.commands.get(cmd_name)

    def format_commands(self, ctx: click.Context, formatter: click.HelpFormatter) -> None:
        names = [n for n in self.list_commands(ctx) if not (n in self.commands and self.commands[n].hidden)]
        if not names:
            return
        limit = formatter.width - 6 - max(len(n) for n in names)
        rows = [(n, self.commands[n].get_short_help_str(limit) if n in self.commands
                 else _shortened(self.lazy[n][1], limit)) for n in names]
        with formatter.section("Commands"):
            formatter.write_dl(rows)

    def main(self, args: Sequence[str] | None = None, prog_name: str | None = None,
             complete_var: str | None = None, standalone_mode: bool = True, **extra: Any) -> Any:
        if not standalone_mode:  # a caller who wants the exceptions gets them
            return super().main(args, prog_name, complete_var, standalone_mode, **extra)
        as_json = _asks_for_json(sys.argv[1:] if args is None else list(args))
        try:
            code = super().main(args, prog_name, complete_var, False, **extra)
        except click.ClickException as exc:  # usage errors (exit 2); click raises no other kind here
            if as_json:
                _json_error("usage", exc.format_message())
            else:
                if not isinstance(exc, _HELP_ERRORS):  # the help shown for a bare command stays whole
                    full = exc.format_message
                    exc.format_message = lambda: _one_line(full())  # type: ignore[method-assign]
                exc.show()
            sys.exit(exc.exit_code)
        except NetsynthError as exc:
            if as_json:
                _json_error(_error_kind(exc), str(exc))
            else:
                click.echo(f"Error: {_one_line(str(exc))}", err=True)
            sys.exit(1)
        except click.Abort:
            click.echo("Aborted!", err=True)
            sys.exit(1)
        # --help and --version end with an exit code; a finished command returns None
        sys.exit(code if isinstance(code, int) else 0)


@click.group(cls=Shell, context_settings={"help_option_names": ["-h", "--help"], "max_content_width": 100})
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

    \b
    Other quantities, with or without their unit:
      accuracy, tolerance  0.1%, 50ppm, 1e-5%  (tolerances also F = 1 %)
      voltage, current     24, 1kV, 150mA
      power                5, 1/4W, 250mW
      temperature          85, -40, 85C  (°C)

    \b
    Exit status: 0 done; 1 no answer (unreadable expression, bad bin,
    nothing meets the limits); 2 a bad command line.  With --json every
    error is one object on stdout:
      {"error": {"kind": "usage", "message": "..."}}

    Start with:  netsynth make 3k37
    """


KIT_OPTIONS = "--series/--range/--qty/--kit-tolerance/--kit-power"


def load_stock(bin_file: str | None, series: str | None, value_range: tuple[float, float] | None,
                qty: int | None, kit_tolerance: float | None, kit_power: float | None) -> StockBin:
    kit_given = any(x is not None for x in (series, value_range, qty, kit_tolerance, kit_power))
    if bin_file is not None and kit_given:
        raise click.UsageError(f"give either --bin FILE or kit options ({KIT_OPTIONS}), not both")
    if bin_file is not None:
        return load_bin(bin_file)
    if kit_given:
        low, high = value_range if value_range is not None else (10.0, 1e6)
        return kit_bin(series or "E24", low, high, count=qty,
                       tolerance=DEFAULT_TOLERANCE if kit_tolerance is None else kit_tolerance,
                       power_rating_w=DEFAULT_POWER_W if kit_power is None else kit_power)
    return default_bin()


def progress(message: str) -> None:
    if sys.stderr.isatty():
        click.echo(f"… {message}", err=True)


def operating_options(fn: Callable) -> Callable:
    """The options that state what the network sees and how hard its parts may work."""
    options = [
        click.option("--volts", type=VOLTAGE, metavar="V",
                     help="Voltage across the network, in volts: 24, 24V, 1.5 kV (peak when pulsed)."),
        click.option("--amps", type=CURRENT, metavar="A",
                     help="Current through the network, in amperes: 2, 2A, 150mA (peak when pulsed)."),
        click.option("--watts", type=POWER, metavar="W",
                     help="Power the network dissipates, in watts: 5, 5W, 1/4W, 250mW (peak when pulsed)."),
        click.option("--duty", type=DUTY, metavar="PCT",
                     help="Fraction of time driven: 10% or 0.1 (default 100 %). Power limits apply to the "
                     "average, voltage limits to the peak."),
        click.option("--ambient", type=AMBIENT, default=DEFAULT_AMBIENT_C, show_default=True, metavar="°C",
                     help=f"Air temperature around the parts in °C: 40, -20, 85C ({MIN_AMBIENT_C:g} to "
                     f"{MAX_AMBIENT_C:g}). Above 70 °C ratings derate linearly to zero at each part's max_temp "
                     "(IEC 60115-1 style curve)."),
        click.option("--derate", type=FACTOR, default=DEFAULT_POWER_FACTOR, show_default=True, metavar="F",
                     help="Fraction of the (temperature-derated) power rating a part may use: 0.5 or 50% "
                     "(above 0, at most 1; a common margin)."),
        click.option("--volt-derate", type=FACTOR, default=DEFAULT_VOLTAGE_FACTOR, show_default=True, metavar="F",
                     help="Fraction of the rated voltage min(max_volts, √(P·R)) a part may see: 0.8 or 80% "
                     "(above 0, at most 1)."),
        click.option("--mains", is_flag=True, help="The network is connected to mains: adds the mains caution."),
        click.option("--spec", type=TOLERANCE, metavar="TOL",
                     help="Your acceptance band around the target: 1%, 0.5 %, 500ppm or a letter (F = 1 %). "
                     "Reports the Monte Carlo yield."),
        click.option("--temp", type=TEMPERATURE, metavar="°C",
                     help="Report the value band at this temperature in °C: 85, -40, 125C."),
    ]
    for option in reversed(options):
        fn = option(fn)
    return fn


def conditions(volts, amps, watts, duty, ambient, derate, volt_derate, mains):
    given = [x for x in (volts, amps, watts) if x is not None]
    if len(given) > 1:
        raise click.UsageError("give only one of --volts, --amps or --watts")
    derating = Derating(derate, volt_derate)
    if not given:
        if duty is not None or mains:
            raise click.UsageError("--duty and --mains need an operating point: --volts, --amps or --watts")
        return None, derating
    point = OperatingPoint(volts=volts, amps=amps, watts=watts, duty=1.0 if duty is None else duty,
                           ambient_c=ambient, mains=mains)
    return point, derating


def stock_options(fn: Callable) -> Callable:
    """``--bin FILE`` or a kit (``--series/--range/--qty/--kit-tolerance/--kit-power``); read with :func:`load_stock`."""
    options = [
        click.option("--bin", "bin_file", type=BIN_FILE, metavar="FILE",
                     help="Stock bin CSV (columns value, qty, tolerance, watts, max_volts, tcr, max_temp, package, "
                     "location, note), e.g. bins/makerspace-drawer.csv."),
        click.option("--series", type=click.Choice(SERIES_NAMES, case_sensitive=False),
                     help="Use a kit of one E-series instead of a bin file (IEC 60063)."),
        click.option("--range", "value_range", type=RANGE, metavar="LOW..HIGH",
                     help="Kit value range, both ends included: 10..1M, 1R..10k, 100..100k (default 10..1M)."),
        click.option("--qty", type=click.IntRange(min=1, max=MAX_QTY), metavar="N",
                     help=f"Kit parts per value, 1 to {MAX_QTY} (default: as many as needed)."),
        click.option("--kit-tolerance", type=TOLERANCE, metavar="TOL",
                     help=f"Kit part tolerance: 1%, 0.1 %, or a letter (F = 1 %, B = 0.1 %) "
                     f"(default {DEFAULT_TOLERANCE * 100:g} %, as the default bin)."),
        click.option("--kit-power", type=POWER, metavar="W",
                     help=f"Kit part power rating at 70 °C: 0.25, 1/4W, 250mW, 1W (default {DEFAULT_POWER_W:g} W, "
                     "as the default bin)."),
    ]
    for option in reversed(options):
        fn = option(fn)
    return fn


def json_option(fn: Callable) -> Callable:
    return click.option("--json", "as_json", is_flag=True,
                        help="Print one JSON object for scripts; errors too: "
                        "{\"error\": {\"kind\": ..., \"message\": ...}}.")(fn)


def echo_json(data: object) -> None:
    """One JSON document on stdout (UTF-8 text, indented); strict JSON, never ``NaN`` or ``Infinity``.

    The renderers write ``null`` where a figure is legitimately unbounded (the headroom of a part
    that sees no stress, the reach of an unlimited bin; see :mod:`netsynth.render.json`), and the
    limits of :mod:`netsynth.limits` keep every other figure finite; ``allow_nan=False`` makes a
    non-finite number that slipped through a loud bug instead of output no JSON reader accepts.
    """
    click.echo(json.dumps(data, indent=2, ensure_ascii=False, allow_nan=False))
