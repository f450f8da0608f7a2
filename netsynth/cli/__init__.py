"""The ``netsynth`` command: a thin shell over :mod:`netsynth.api`.

The only package that imports click. Map:

``shell``     the group, option value types, error reporting (text or JSON), shared options
``commands``  ``make``, ``check``, ``bin``

Each command module registers its commands on :data:`shell.cli` when imported here.
"""

from __future__ import annotations

from netsynth.cli import commands  # noqa: F401  (registers the commands)
from netsynth.cli.shell import cli


def main() -> None:
    cli(prog_name="netsynth")


__all__ = ["cli", "main"]
