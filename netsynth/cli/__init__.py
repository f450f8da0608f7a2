"""The ``netsynth`` command: a thin shell over :mod:`netsynth.api`.

The only package that imports click. Map:

``shell``     the group, option value types, error reporting (text or JSON), shared options
``commands``  ``make``, ``check``
``bench``     ``bin show|check|take|add``
``jobs``      ``shunt``, ``multiplier``, ``sensor``, ``trim``

Each command module registers its commands on :data:`shell.cli` when imported here.
"""

from __future__ import annotations

from netsynth.cli import bench, commands  # noqa: F401  (registers the commands)
from netsynth.cli import jobs  # noqa: F401  (registers shunt, multiplier, sensor, trim)
from netsynth.cli import divider  # noqa: F401  (registers divider, rc)
from netsynth.cli import plan  # noqa: F401  (registers plan)
from netsynth.cli.shell import cli


def main() -> None:
    cli(prog_name="netsynth")


__all__ = ["cli", "main"]
