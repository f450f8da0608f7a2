"""The README's worked examples, run for real.

Every fenced ``text`` block of README.md whose first line is ``$ netsynth ...`` is an
example: the rest of the block is what the command prints. ``tests/test_readme.py`` checks
each block against the program's real output; after a deliberate change of output,
regenerate the blocks with::

    python -m tests.readme_examples --write

which reruns every command and rewrites only those blocks (never by hand).
"""

from __future__ import annotations

import re
import shlex
import sys
from dataclasses import dataclass
from pathlib import Path

from click.testing import CliRunner

from netsynth.cli import cli

README = Path(__file__).resolve().parent.parent / "README.md"
_BLOCK = re.compile(r"```text\n(\$ netsynth [^\n]*)\n(.*?)```", re.S)


@dataclass(frozen=True)
class Example:
    command: str  #: the line after "$ "
    shown: str  #: the output printed in the README
    start: int  #: span of the output in the README text
    end: int

    @property
    def args(self) -> list[str]:
        return shlex.split(self.command)[1:]


def examples(text: str) -> list[Example]:
    return [Example(m.group(1)[2:], m.group(2), m.start(2), m.end(2)) for m in _BLOCK.finditer(text)]


def output_of(example: Example) -> str:
    """What the command prints (stdout), run from the repository's folder so relative bin paths work."""
    import os

    here = os.getcwd()
    os.chdir(README.parent)
    try:
        result = CliRunner().invoke(cli, example.args, prog_name="netsynth")
    finally:
        os.chdir(here)
    if result.exception is not None and not isinstance(result.exception, SystemExit):
        raise result.exception
    text = result.output
    return text if text.endswith("\n") else text + "\n"


def rewrite(text: str) -> str:
    out, pos = [], 0
    for ex in examples(text):
        out += [text[pos:ex.start], output_of(ex)]
        pos = ex.end
    return "".join(out) + text[pos:]


if __name__ == "__main__":
    if "--write" not in sys.argv[1:]:
        sys.exit("usage: python -m tests.readme_examples --write   (reruns the README's examples and rewrites them)")
    README.write_text(rewrite(README.read_text(encoding="utf-8")), encoding="utf-8")
    print(f"rewrote {len(examples(README.read_text(encoding='utf-8')))} examples in {README.name}")
