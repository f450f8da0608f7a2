"""The frontier: for each part count n ≤ k, the best network of exactly n parts.

This module strings the exhaustive search (:mod:`.exact`) over part counts and
applies the stopping rule for a required accuracy. Scoring is by |relative error|
(value / target − 1); ties go to fewer parts.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

from netsynth.errors import InfeasibleError
from netsynth.search.exact import ExactSearch, Found
from netsynth.stock import StockBin


@dataclass(frozen=True, slots=True)
class FrontierRow:
    """The best network of exactly ``parts`` parts, with runners-up."""

    parts: int
    best: Found
    alternatives: tuple[Found, ...]
    proven: bool  # True: no network of this many parts from the bin does better


def search_frontier(
    target_ohms: float,
    stock: StockBin,
    max_parts: int = 4,
    within: float | None = None,
    alternatives: int = 3,
    on_progress: Callable[[str], None] | None = None,
) -> list[FrontierRow]:
    """Best network for each part count 1..``max_parts``, proven by exhaustive search.

    With ``within`` (a fraction, e.g. 0.001 for ±0.1 %), the search stops at the
    first part count whose best network lands within it.

    Raises
    ------
    InfeasibleError
        If ``within`` is given and no network of at most ``max_parts`` parts meets it,
        or the request is too large for an exhaustive search.
    """
    if not (target_ohms > 0 and target_ohms != float("inf")):
        raise InfeasibleError(f"target {target_ohms!r} Ω: a target must be a finite resistance above zero")
    if max_parts < 1:
        raise InfeasibleError(f"--max-parts {max_parts}: at least one part is needed")
    if within is not None and not within >= 0:
        raise InfeasibleError(f"accuracy {within!r}: must be zero or more")
    engine = ExactSearch(stock.values, stock.counts, max_parts)
    rows: list[FrontierRow] = []
    for n in range(1, max_parts + 1):
        if on_progress:
            on_progress(f"searching networks of {n} part{'s' if n > 1 else ''}")
        found = engine.best(n, target_ohms, alternatives)
        if not found:
            continue  # the bin holds fewer than n parts
        rows.append(FrontierRow(n, found[0], tuple(found[1:]), proven=True))
        if within is not None and abs(found[0].error) <= within:
            break
    if not rows:
        raise InfeasibleError("the bin cannot make any network")
    if within is not None and abs(rows[-1].best.error) > within:
        best = min(rows, key=lambda r: abs(r.best.error))
        raise InfeasibleError(
            f"no network of at most {max_parts} parts lands within ±{within:.4g} (relative) of the target; "
            f"the best has {best.parts} parts at {best.best.error:+.3g}; raise --max-parts or loosen --within"
        )
    return rows
