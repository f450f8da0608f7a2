"""The ``netsynth`` command: a thin shell over :mod:`netsynth.api`.

The only package that imports click. Map:

``shell``     the group, option value types, error reporting (text or JSON), shared options
``commands``  ``make``, ``check``
``bench``     ``bin show|check|take|add``
``jobs``      ``shunt``, ``multiplier``, ``sensor``, ``trim``

Each command module registers its commands on :data:`shell.cli` when it is imported, which
happens only when one of its commands runs (see :class:`shell.Shell`): ``netsynth --help``
loads none of them.
"""

from __future__ import annotations

from netsynth.cli.shell import cli

#: command -> (the module that registers it, its one-line help as ``netsynth --help`` shows it, before
#: shortening to the terminal's width)
cli.lazy = {
    "bin": ("netsynth.cli.bench", "A stock bin file: list it, check it, take a build's parts out, add stock."),
    "check": ("netsynth.cli.commands", "Analyse a network you typed: value, bands, drift and per-part stress."),
    "divider": ("netsynth.cli.divider", "Find the two arms of a divider from your stock, searched together."),
    "make": ("netsynth.cli.commands", "Find the best networks for TARGET ohms from your stock."),
    "multiplier": ("netsynth.cli.jobs",
                   "The series multiplier that gives a movement a voltage range (several ranges: a chain)."),
    "plan": ("netsynth.cli.plan", "Build every resistance a board needs from one shared bin."),
    "rc": ("netsynth.cli.divider", "Find the resistor for an RC time constant or corner frequency."),
    "sensor": ("netsynth.cli.jobs", "A network that a controller reads as TEMP °C (sensor simulation)."),
    "shunt": ("netsynth.cli.jobs", "The shunt that gives a movement a current range (several ranges: a ring shunt)."),
    "trim": ("netsynth.cli.jobs", "The trim that brings a measured BASE to TARGET, from your stock."),
}


def main() -> None:
    cli(prog_name="netsynth")


__all__ = ["cli", "main"]
