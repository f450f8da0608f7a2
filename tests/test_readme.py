"""The README shows what the program really prints (see tests/readme_examples.py)."""

from __future__ import annotations

import pytest

from tests.readme_examples import README, examples, output_of

EXAMPLES = examples(README.read_text(encoding="utf-8"))


def test_the_readme_has_worked_examples():
    assert len(EXAMPLES) >= 3


@pytest.mark.parametrize("example", EXAMPLES, ids=[e.command for e in EXAMPLES])
def test_readme_example_matches_real_output(example):
    assert output_of(example) == example.shown, (
        "the README's example differs from the real output; if the change is deliberate, run "
        "`python -m tests.readme_examples --write`"
    )
