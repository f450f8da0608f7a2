"""The frontier: for each part count, the best network of exactly that many parts.

Without an operating point this strings the exhaustive search (:mod:`.exact`) over
part counts 1..k; every row is proven best. With one, a network is acceptable only
if every part stays within its derated power and voltage limits:

* small counts (up to :data:`EXACT_PARTS_WITH_STRESS`) come from the exhaustive
  search, whose ranked candidates are screened by a nodal stress check; a row is
  proven when the unconstrained best already passes;
* larger counts come from the regular-array search (:mod:`.arrays`), best within its
  families (uniform s×p arrays, two-value strings and groups), not proven;
* the search starts at the lower bound on the part count (total power over the best
  derated part power, total voltage over the best part voltage limit) and, without an
  explicit limit, goes as far as :func:`default_part_limit` of that bound;
* the rows kept are those that improve on every smaller count (a Pareto frontier
  of error against parts).

Scoring and the stopping rule for a required accuracy live in :func:`pick`.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass
from typing import Literal, get_args

from netsynth.analysis.conditions import Derating, OperatingPoint
from netsynth.analysis.stress import network_stress
from netsynth.errors import InfeasibleError
from netsynth.search.arrays import PartBound, part_lower_bound, search_arrays
from netsynth.search.exact import ExactSearch, Found
from netsynth.stock import StockBin

Preference = Literal["error", "parts", "headroom"]
PREFERENCES: tuple[str, ...] = get_args(Preference)

#: default part count for the exhaustive search without an operating point
DEFAULT_MAX_PARTS = 4
#: with an operating point, the exhaustive search covers at most this many parts
EXACT_PARTS_WITH_STRESS = 4
#: candidates per part count screened for stress before a row is called "best found"
STRESS_CANDIDATES = 60
#: the array search never goes beyond this many parts
MAX_ARRAY_PARTS = 400
#: errors closer than this are the same (float noise of equal values, a few ulps)
SAME_ERROR = 1e-12
#: a larger network with no better error is listed only if its headroom is this many times larger
HEADROOM_STEP = 1.25
#: "close enough" for --prefer parts/headroom when no --within is given (common practice, no source)
DEFAULT_ACCEPT = 0.01


@dataclass(frozen=True, slots=True)
class FrontierRow:
    """The best acceptable network of exactly ``parts`` parts, with runners-up."""

    parts: int
    best: Found
    alternatives: tuple[Found, ...]
    proven: bool  #: True: no network of this many parts from the bin does better
    method: str  #: "exhaustive" or the array family that produced it
    headroom: float | None = None  #: smallest part headroom at the operating point


@dataclass(frozen=True, slots=True)
class Frontier:
    rows: tuple[FrontierRow, ...]
    bound: PartBound | None  #: lower bound on the part count (with an operating point)


def default_part_limit(bound: int) -> int:
    """How far the search goes without --max-parts: twice the bound plus slack (common practice, no source)."""
    return min(MAX_ARRAY_PARTS, max(DEFAULT_MAX_PARTS, 2 * bound + 8))


def search_frontier(
    target_ohms: float,
    stock: StockBin,
    max_parts: int | None = None,
    within: float | None = None,
    alternatives: int = 3,
    on_progress: Callable[[str], None] | None = None,
    point: OperatingPoint | None = None,
    derating: Derating = Derating(),
) -> Frontier:
    """Best acceptable network for each part count.

    With ``within`` (a fraction, e.g. 0.001 for ±0.1 %), the search stops at the
    first part count whose best network lands within it.

    Raises
    ------
    InfeasibleError
        If no network meets the limits: says which limit and what to relax.
    """
    if not (target_ohms > 0 and math.isfinite(target_ohms)):
        raise InfeasibleError(f"target {target_ohms!r} Ω: a target must be a finite resistance above zero")
    if max_parts is not None and max_parts < 1:
        raise InfeasibleError(f"--max-parts {max_parts}: at least one part is needed")
    if within is not None and not within >= 0:
        raise InfeasibleError(f"accuracy {within!r}: must be zero or more")
    if point is None:
        rows = _unconstrained(target_ohms, stock, max_parts or DEFAULT_MAX_PARTS, within, alternatives, on_progress)
        frontier = Frontier(tuple(rows), None)
    else:
        frontier = _constrained(target_ohms, stock, max_parts, within, alternatives, on_progress, point, derating)
    _check_within(frontier.rows, within, max_parts)
    return frontier


def _unconstrained(target, stock, k, within, alternatives, on_progress) -> list[FrontierRow]:
    engine = ExactSearch(stock.values, stock.counts, k)
    rows: list[FrontierRow] = []
    for n in range(1, k + 1):
        _say(on_progress, n)
        found = engine.best(n, target, alternatives)
        if not found:
            continue  # the bin holds fewer than n parts
        rows.append(FrontierRow(n, found[0], tuple(found[1:]), proven=True, method="exhaustive"))
        if within is not None and abs(found[0].error) <= within:
            break
    if not rows:
        raise InfeasibleError("the bin cannot make any network")
    return rows


def _constrained(target, stock, max_parts, within, alternatives, on_progress, point, derating) -> Frontier:
    bound = part_lower_bound(target, stock, point, derating)
    if max_parts is not None and max_parts < bound.count:
        raise InfeasibleError(f"--max-parts {max_parts} is too small: {bound.explain()}")
    if bound.count > MAX_ARRAY_PARTS:
        raise InfeasibleError(f"{bound.explain()}; netsynth searches up to {MAX_ARRAY_PARTS} parts: use higher-rated parts")
    limit = max_parts if max_parts is not None else default_part_limit(bound.count)
    by_count: dict[int, FrontierRow] = {}
    exact_k = min(limit, EXACT_PARTS_WITH_STRESS)
    if bound.count <= exact_k:
        engine = ExactSearch(stock.values, stock.counts, exact_k)
        for n in range(bound.count, exact_k + 1):
            _say(on_progress, n)
            found = engine.best(n, target, max(STRESS_CANDIDATES, alternatives))
            passing = []
            for i, f in enumerate(found):
                stress = network_stress(f.network, point, stock, derating)
                if not stress.violations:
                    passing.append((i, f, stress.headroom))
            if passing:
                first, best, headroom = passing[0]
                alts = tuple(f for _, f, _ in passing[1 : alternatives + 1])
                by_count[n] = FrontierRow(n, best, alts, proven=first == 0, method="exhaustive", headroom=headroom)
    if on_progress:
        on_progress(f"searching regular arrays of {bound.count} to {limit} parts")
    for design in search_arrays(target, stock, point, derating, limit, within):
        n = design.found.parts
        if n < bound.count:
            continue  # far from the target: it passes only by drawing less power than the target would
        if n not in by_count or abs(design.found.error) < abs(by_count[n].best.error):
            by_count[n] = FrontierRow(n, design.found, (), proven=False, method=design.family, headroom=design.headroom)
    rows: list[FrontierRow] = []
    for n in sorted(by_count):
        row = by_count[n]
        if any(_dominates(kept, row) for kept in rows):
            continue  # fewer parts do as well
        rows.append(row)
        if within is not None and abs(row.best.error) <= within:
            break
    if not rows:
        raise InfeasibleError(
            f"no network of {bound.count} to {limit} parts keeps every part within its derated limits "
            f"({bound.explain()}; the array search uses at most two values, so stock counts can limit it); "
            "raise --max-parts, use higher-rated parts, or relax --derate"
        )
    return Frontier(tuple(rows), bound)


def _dominates(fewer: FrontierRow, more: FrontierRow) -> bool:
    """A row with fewer parts makes a larger one pointless: no worse error, and no clear headroom gain."""
    no_worse = abs(fewer.best.error) <= abs(more.best.error) + SAME_ERROR
    return no_worse and (more.headroom or 0.0) < HEADROOM_STEP * (fewer.headroom or 0.0)


def _check_within(rows, within, max_parts) -> None:
    if within is None or abs(rows[-1].best.error) <= within:
        return
    best = min(rows, key=lambda r: abs(r.best.error))
    limit = f"at most {max_parts} parts" if max_parts else "the parts searched"
    raise InfeasibleError(
        f"no network of {limit} lands within ±{within:.4g} (relative) of the target; "
        f"the best has {best.parts} parts at {best.best.error:+.3g}; raise --max-parts or loosen --within"
    )


def pick(rows: tuple[FrontierRow, ...], prefer: Preference = "error", within: float | None = None) -> FrontierRow:
    """The recommended row.

    * ``error``: smallest |error|; ties to fewer parts, then more headroom.
      With ``within``, the fewest parts inside it (the search stopped there).
    * ``parts``: the fewest parts within ``within`` (default ±1 %), else the smallest error.
    * ``headroom``: the most headroom within ``within`` (default ±1 %), else the smallest error.
    """
    if prefer not in PREFERENCES:
        raise InfeasibleError(f"prefer {prefer!r}: choose one of {', '.join(PREFERENCES)}")
    accept = within if within is not None else DEFAULT_ACCEPT
    inside = [r for r in rows if abs(r.best.error) <= accept]
    if prefer == "error" and within is not None and inside:
        return min(inside, key=lambda r: r.parts)
    if prefer == "parts" and inside:
        return min(inside, key=lambda r: (r.parts, abs(r.best.error)))
    if prefer == "headroom" and inside:
        return max(inside, key=lambda r: (r.headroom or 0.0, -abs(r.best.error), -r.parts))
    least = min(abs(r.best.error) for r in rows)
    tied = [r for r in rows if abs(r.best.error) <= least + SAME_ERROR]
    return min(tied, key=lambda r: (r.parts, -(r.headroom or 0.0)))


def _say(on_progress, n: int) -> None:
    if on_progress:
        on_progress(f"searching networks of {n} part{'s' if n > 1 else ''}")
