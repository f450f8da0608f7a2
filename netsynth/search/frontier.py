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
#: the exhaustive search always covers this many parts when asked (larger counts: regular arrays) ...
EXACT_PARTS = 5
#: ... and up to this many on small bins, as far as ExactSearch.lookups says it finishes quickly
EXACT_PARTS_MAX = 8
#: a bin with at most this many stock lines is "small"
SMALL_BIN = 40
#: with an operating point, the exhaustive search covers at most this many parts
EXACT_PARTS_WITH_STRESS = 4
#: arrays searched without an operating point are screened at this drive, i.e. not at all
NEGLIGIBLE_DRIVE = OperatingPoint(volts=1e-12)
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
    bound: PartBound | None  #: lower bound on the part count from power and voltage (with an operating point)
    value_parts: int = 1  #: the fewest parts that can reach the target from this bin's values
    limit: int = DEFAULT_MAX_PARTS  #: the largest part count searched
    exhaustive_parts: int = DEFAULT_MAX_PARTS  #: part counts up to this were searched exhaustively


def default_part_limit(bound: int) -> int:
    """How far the search goes without --max-parts: twice the bound plus slack (common practice, no source)."""
    return min(MAX_ARRAY_PARTS, max(DEFAULT_MAX_PARTS, 2 * bound + 8))


def parts_for_value(target_ohms: float, stock: StockBin) -> int:
    """The fewest parts that can reach the target at all: below the smallest value only
    parallel parts help (n parts of R give R/n at best), above the largest only series ones."""
    low, high = min(stock.values), max(stock.values)
    if target_ohms < low:
        return math.ceil(low / target_ohms * (1 - 1e-12))
    if target_ohms > high:
        return math.ceil(target_ohms / high * (1 - 1e-12))
    return 1


def _value_text(target_ohms: float, stock: StockBin, n: int) -> str:
    side = f"the smallest value, {min(stock.values):g} Ω, in parallel" if target_ohms < min(stock.values) \
        else f"the largest value, {max(stock.values):g} Ω, in series"
    return f"reaching {target_ohms:g} Ω takes at least {n} parts ({side})"


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

    ``max_parts`` None means 4 without an operating point, or as far as the physics
    (power, voltage and the target's distance from the bin's values) needs.
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
    needed = parts_for_value(target_ohms, stock)
    bound = part_lower_bound(target_ohms, stock, point, derating) if point is not None else None
    floor = max(needed, bound.count if bound else 1)
    why = bound.explain() if bound and bound.count >= needed else _value_text(target_ohms, stock, needed)
    if max_parts is not None and max_parts < floor:
        raise InfeasibleError(f"--max-parts {max_parts} is too small: {why}")
    if floor > MAX_ARRAY_PARTS:
        raise InfeasibleError(f"{why}; netsynth searches up to {MAX_ARRAY_PARTS} parts: use other parts")
    if max_parts is not None:
        limit = max_parts
    elif point is None and needed <= DEFAULT_MAX_PARTS:
        limit = DEFAULT_MAX_PARTS
    else:
        limit = default_part_limit(floor)
    cap = EXACT_PARTS_WITH_STRESS if point is not None else EXACT_PARTS_MAX if len(stock) <= SMALL_BIN else EXACT_PARTS
    exact_k = min(limit, cap)
    rows: list[FrontierRow] = []
    if floor <= exact_k:
        engine, exact_k = _exact_engine(stock, exact_k)
        rows = _exact_rows(engine, target_ohms, stock, floor, exact_k, within, alternatives, on_progress, point, derating)
    else:
        exact_k = 0  # no network small enough for the exhaustive search can meet the target
    reached = rows and within is not None and abs(rows[-1].best.error) <= within
    if limit > exact_k and not reached:
        if on_progress:
            on_progress(f"searching regular arrays of up to {limit} parts")
        screen = point if point is not None else NEGLIGIBLE_DRIVE
        for design in search_arrays(target_ohms, stock, screen, derating, limit, within):
            n = design.found.parts
            if n <= exact_k or n < floor:
                continue  # covered exhaustively, or too few parts to be near the target at this drive
            headroom = design.headroom if point is not None else None
            rows.append(FrontierRow(n, design.found, (), proven=False, method=design.family, headroom=headroom))
    if point is not None:
        rows = _pareto(rows)
    else:  # every exhaustive row stays (one per part count); array rows only where they improve
        exhaustive = [r for r in rows if r.parts <= exact_k]
        rows = exhaustive + [r for r in _pareto(rows) if r.parts > exact_k]
    if within is not None:
        for i, row in enumerate(rows):
            if abs(row.best.error) <= within:
                rows = rows[: i + 1]
                break
    if not rows:
        stress = f" keeps every part within its derated limits ({bound.explain()}; the array search uses at most " \
            "two values, so stock counts can limit it)" if bound else ""
        raise InfeasibleError(
            f"no network of {floor} to {limit} parts{stress}; raise --max-parts"
            + (", use higher-rated parts, or relax --derate" if bound else "")
        )
    _check_within(rows, within, max_parts)
    return Frontier(tuple(rows), bound, needed, limit, exact_k)


def _exact_engine(stock: StockBin, k: int) -> tuple[ExactSearch, int]:
    """The exhaustive engine for up to k parts, or for fewer when k would take too long on this bin."""
    while True:
        try:
            return ExactSearch(stock.values, stock.counts, k), k
        except InfeasibleError:
            if k <= EXACT_PARTS:
                raise
            k = max(EXACT_PARTS, k - 1)


def _exact_rows(engine, target, stock, first, k, within, alternatives, on_progress, point, derating) -> list[FrontierRow]:
    """Exhaustive rows for first..k parts; with an operating point, screened for stress."""
    rows: list[FrontierRow] = []
    for n in range(first, k + 1):
        _say(on_progress, n)
        if point is None:
            found = engine.best(n, target, alternatives)
            if found:
                rows.append(FrontierRow(n, found[0], tuple(found[1:]), proven=True, method="exhaustive"))
        else:
            found = engine.best(n, target, max(STRESS_CANDIDATES, alternatives))
            passing = []
            for i, f in enumerate(found):
                stress = network_stress(f.network, point, stock, derating)
                if not stress.violations:
                    passing.append((i, f, stress.headroom))
            if passing:
                first_ok, best, headroom = passing[0]
                alts = tuple(f for _, f, _ in passing[1 : alternatives + 1])
                rows.append(FrontierRow(n, best, alts, proven=first_ok == 0, method="exhaustive", headroom=headroom))
        if rows and rows[-1].parts == n and within is not None and abs(rows[-1].best.error) <= within:
            break
    return rows


def _pareto(rows: list[FrontierRow]) -> list[FrontierRow]:
    """Drop each row that a row with fewer parts makes pointless (see :func:`_dominates`)."""
    kept: list[FrontierRow] = []
    for row in sorted(rows, key=lambda r: r.parts):
        if not any(_dominates(k, row) for k in kept):
            kept.append(row)
    return kept


def _dominates(fewer: FrontierRow, more: FrontierRow) -> bool:
    """A row with fewer parts makes a larger one pointless: no worse error, and no clear headroom gain."""
    no_worse = abs(fewer.best.error) <= abs(more.best.error) + SAME_ERROR
    if fewer.headroom is None or more.headroom is None:
        return no_worse
    return no_worse and more.headroom < HEADROOM_STEP * fewer.headroom


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
