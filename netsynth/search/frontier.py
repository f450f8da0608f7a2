"""The frontier: for each part count, the best network of exactly that many parts.

Without an operating point this strings the exhaustive search (:mod:`.exact`) over
part counts 1..k; every row is proven best. With one, a network is acceptable only
if every part stays within its derated power and voltage limits:

* small counts (up to :data:`EXACT_PARTS_WITH_STRESS`) come from the exhaustive
  search, whose ranked candidates are screened by a nodal stress check; a row is
  proven when the unconstrained best already passes;
* larger counts come from the regular-array search (:mod:`.arrays`), best within its
  families (uniform s×p arrays, two-value strings and groups), not proven, and then from
  CP-SAT over two wider families (:mod:`.cpsat`: series strings of parallel banks, parallel
  sets of series strings, mixed values), whose rows say what the solver proved;
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
from dataclasses import dataclass, replace
from typing import Literal, get_args

from netsynth.analysis.conditions import Derating, OperatingPoint
from netsynth.analysis.lines import assign_lines, value_pool
from netsynth.analysis.stress import NetworkStress, network_stress
from netsynth.errors import ArgumentError, InfeasibleError
from netsynth.inputs import PREFERENCES, Preference
from netsynth.search.arrays import PartBound, part_lower_bound, search_arrays
from netsynth.search.exact import ExactSearch, Found
from netsynth.stock import StockBin
from netsynth.values import format_ohms


#: default part count for the exhaustive search without an operating point
DEFAULT_MAX_PARTS = 4
#: the exhaustive search covers up to this many parts, as far as its cost model
#: (ExactSearch.lookups) says it finishes quickly: 6 on a 169-value E24 bin, more on small bins
EXACT_PARTS_MAX = 8
#: with an operating point, the exhaustive search covers at most this many parts
EXACT_PARTS_WITH_STRESS = 4
#: arrays searched without an operating point are screened at this drive, i.e. not at all
NEGLIGIBLE_DRIVE = OperatingPoint(volts=1e-6)  # the smallest drive accepted (netsynth.limits.MIN_VOLTS)
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
#: how the part counts above the exhaustive range are searched (see :func:`search_frontier`)
Engine = Literal["auto", "exhaustive", "cpsat", "arrays"]
ENGINES: tuple[str, ...] = get_args(Engine)
#: seconds CP-SAT may spend on one request's family searches (both families together)
CPSAT_SECONDS = 10.0


@dataclass(frozen=True, slots=True)
class FrontierRow:
    """The best acceptable network of exactly ``parts`` parts, with runners-up.

    Every network here has its parts tied to stock lines (:mod:`netsynth.analysis.lines`).
    """

    parts: int
    best: Found
    alternatives: tuple[Found, ...]
    proven: bool  #: True: no network of this many parts from the bin does better
    method: str  #: "exhaustive", the array family, or "cp-sat banks" / "cp-sat strings"
    stress: NetworkStress | None = None  #: per-part stress of ``best`` at the operating point
    status: str = ""  #: a CP-SAT row's proof words ("proven best in family", "best found, bound 41 parts")
    note: str = ""  #: a CP-SAT row's family and what its status promises, in one sentence
    fewest: bool = False  #: no network of any shape with fewer parts lands as close within the limits

    @property
    def headroom(self) -> float | None:
        """The factor the drive may grow before a part of ``best`` reaches a limit."""
        return self.stress.headroom if self.stress is not None else None


@dataclass(frozen=True, slots=True)
class Reach:
    """How many parts the bin needs to reach the target at all, and what the whole bin can make.

    Above the bin's largest value only series parts help: n parts give at most the sum of
    the n largest values the bin holds; below the smallest value only parallel parts help:
    n parts give at least 1 / (sum of the n largest conductances). Both follow from
    Rayleigh's monotonicity law (a series string is the largest, a parallel bank the
    smallest network of a given set of parts).
    """

    target_ohms: float
    parts: int | None  #: the fewest parts whose networks reach the target; None: the whole bin cannot
    low_ohms: float  #: the smallest value the whole bin makes (every part in parallel); 0 when unlimited
    high_ohms: float  #: the largest value (every part in series); inf when unlimited
    direction: int = 0  #: -1 below the bin's smallest value, +1 above its largest, 0 between

    def explain(self) -> str:
        """One line for the report."""
        if self.parts is None:
            return (f"all the bin's parts together make {format_ohms(self.low_ohms, 4)} in parallel and "
                    f"{format_ohms(self.high_ohms, 4)} in series, so no network of them reaches "
                    f"{format_ohms(self.target_ohms, 6)}")
        how, side = ("in parallel", "above") if self.direction < 0 else ("in series", "below")
        return (f"networks reach {format_ohms(self.target_ohms, 6)} from {self.parts} parts on ({how}); "
                f"fewer parts stay {side} it")


def reach_of(target_ohms: float, stock: StockBin) -> Reach:
    """The fewest parts that reach ``target_ohms`` from ``stock`` (see :class:`Reach`)."""
    pool = [(v, c) for v, c in zip(*value_pool(stock))]
    if not pool:
        raise InfeasibleError("every line of the bin has a count of zero; add parts to the bin")
    unlimited = any(c is None for _, c in pool)
    high = math.inf if unlimited else sum(v * c for v, c in pool)
    low = 0.0 if unlimited else 1.0 / sum(c / v for v, c in pool)
    smallest, largest = min(v for v, _ in pool), max(v for v, _ in pool)
    if smallest <= target_ohms <= largest:
        return Reach(target_ohms, 1, low, high, 0)
    if target_ohms > largest:  # series: the largest values first
        order = sorted(pool, key=lambda vc: -vc[0])
        need = _fewest([v for v, _ in order], [c for _, c in order], target_ohms)
        return Reach(target_ohms, need, low, high, +1)
    order = sorted(pool, key=lambda vc: vc[0])  # parallel: the largest conductances first
    need = _fewest([1.0 / v for v, _ in order], [c for _, c in order], 1.0 / target_ohms)
    return Reach(target_ohms, need, low, high, -1)


def _fewest(sizes: list[float], counts: list[int | None], total: float) -> int | None:
    """The fewest items (largest first, each size up to its count) whose sizes add up to ``total``."""
    acc, n = 0.0, 0
    for size, count in zip(sizes, counts):
        # a hair of slack: 10 × 10 Ω computed as 99.99999999999999 still reaches 100 Ω
        k = max(1, math.ceil((total - acc) / size * (1 - 1e-12)))
        if count is None or k <= count:
            return n + k
        acc += size * count
        n += count
    return None


@dataclass(frozen=True, slots=True)
class Frontier:
    rows: tuple[FrontierRow, ...]
    bound: PartBound | None  #: lower bound on the part count from power and voltage (with an operating point)
    reach: Reach  #: how many parts reach the target at all
    limit: int = DEFAULT_MAX_PARTS  #: the largest part count searched
    exhaustive_parts: int = DEFAULT_MAX_PARTS  #: part counts up to this were searched exhaustively
    within_met: bool | None = None  #: with ``within``: whether some row lands inside it

    @property
    def value_parts(self) -> int:
        """The fewest parts that reach the target (the bin's total when it cannot)."""
        return self.reach.parts if self.reach.parts is not None else self.limit


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
    engine: Engine = "auto",
) -> Frontier:
    """Best acceptable network for each part count.

    Without an operating point there is a row for every part count from 1 to the limit,
    each the best network of exactly that many parts, proven by exhaustion where the
    exhaustive search reaches (whether or not it comes near the target). ``max_parts``
    None means 4, or, when the target needs more parts to reach, as many as that needs.
    With ``within`` (a fraction, e.g. 0.001 for ±0.1 %), the search stops at the first part
    count whose best network lands within it; if none does, every row is kept and
    ``within_met`` is False.

    ``engine`` says how counts above the
    exhaustive range are searched: ``arrays`` the regular arrays; ``cpsat`` CP-SAT over its two
    families (the arrays only seed it, and its model is solved however large); ``auto`` both, CP-SAT
    only where its pruned model stays small (:data:`netsynth.search.cpsat.OPTION_CAP`) and OR-Tools
    is installed; ``exhaustive`` none (the frontier stops where the exhaustive search does). CP-SAT
    looks for the fewest parts within ``within`` (±1 % without it), then the smallest error.

    Raises
    ------
    InfeasibleError
        Only with an operating point, when no network of the parts searched keeps every
        part within its limits: says which limit and what to relax.
    """
    if not (target_ohms > 0 and math.isfinite(target_ohms)):
        raise ArgumentError(f"target_ohms={target_ohms!r}: a target must be a finite resistance above zero")
    if max_parts is not None and (isinstance(max_parts, bool) or not isinstance(max_parts, int) or max_parts < 1):
        raise ArgumentError(f"max_parts={max_parts!r}: at least one part is needed")
    if within is not None and not within >= 0:
        raise ArgumentError(f"within={within!r}: an accuracy is a fraction of 0 or more")
    reach = reach_of(target_ohms, stock)
    bound = part_lower_bound(target_ohms, stock, point, derating) if point is not None else None
    floor = bound.count if bound else 1
    if max_parts is not None:
        limit = max_parts
    elif reach.parts is None:  # the closest networks use the whole bin
        limit = max(DEFAULT_MAX_PARTS, floor, _total_parts(stock))
    elif point is None and reach.parts <= DEFAULT_MAX_PARTS:
        limit = DEFAULT_MAX_PARTS
    else:
        limit = default_part_limit(max(floor, reach.parts))
    limit = min(limit, MAX_ARRAY_PARTS, _total_parts(stock))
    if bound is not None and floor > limit:
        why = bound.explain()
        raise InfeasibleError(
            f"no network of at most {limit} parts keeps every part within its derated limits ({why}); "
            + (f"allow {floor} parts or more" if floor <= MAX_ARRAY_PARTS and
               floor <= _total_parts(stock) else "use higher-rated parts")
            + ", or relax the derating"
        )
    cap = EXACT_PARTS_WITH_STRESS if point is not None else EXACT_PARTS_MAX
    chosen = engine
    if chosen not in ENGINES:
        raise ArgumentError(f"engine={chosen!r}: choose one of {', '.join(ENGINES)}")
    exact, exact_k = _exact_engine(stock, min(limit, cap))
    if chosen == "exhaustive":
        limit = exact_k
    rows = _exact_rows(exact, target_ohms, stock, exact_k, within, alternatives, on_progress, point, derating)
    interrupted = False  # Ctrl-C stopped CP-SAT (its rows are then what it had)
    reached = rows and within is not None and abs(rows[-1].best.error) <= within
    if limit > exact_k and not reached:
        if on_progress:
            on_progress(f"searching regular arrays of up to {limit} parts")
        screen = point if point is not None else NEGLIGIBLE_DRIVE
        first = max(exact_k + 1, floor, _rayleigh_floor(target_ohms, stock, reach, within))
        array_rows = []
        for design in search_arrays(target_ohms, stock, screen, derating, limit, within, min_parts=first):
            row = _array_row(design, stock, point, derating)
            if row is not None:
                array_rows.append(row)
        if chosen in ("auto", "cpsat"):
            family_rows, interrupted = _family_rows(target_ohms, stock, point, derating, limit, within,
                                                    rows + array_rows, chosen == "cpsat", on_progress)
            if chosen == "cpsat":
                array_rows = []
            array_rows, family_rows = _merge_proofs(array_rows, family_rows)
            rows += family_rows
        rows += array_rows
    # every exhaustive row stays (one per part count); array rows only where they improve on fewer parts
    exhaustive = [r for r in rows if r.method == "exhaustive"]
    rows = exhaustive + [r for r in _pareto(rows) if r.method != "exhaustive"]
    within_met = None
    if within is not None:
        within_met = False
        for i, row in enumerate(rows):
            if abs(row.best.error) <= within:
                rows, within_met = rows[: i + 1], True
                break
    if not rows and interrupted:
        raise InfeasibleError("interrupted (Ctrl-C) before the search found a network that keeps every part "
                              "within its derated limits; run it again and let it finish, or allow it more parts")
    if not rows:
        searched = {"arrays": "the array search uses at most two values, so stock counts can limit it",
                    "exhaustive": f"the exhaustive search stops at {exact_k} parts"}.get(
            chosen, "neither the arrays nor CP-SAT found one")
        if reach.parts is None or reach.parts > limit:  # the value itself needs more parts than allowed
            searched = reach.explain() + (f", more than the {limit} allowed" if reach.parts is not None else "")
        raise InfeasibleError(
            f"no network of up to {limit} parts keeps every part within its derated limits ({bound.explain()}; "
            f"{searched}); allow more parts, use higher-rated parts, or relax the derating"
        )
    rows = [replace(r, fewest=_fewest_possible(r, target_ohms, stock, point, derating, reach)) for r in rows]
    return Frontier(tuple(rows), bound, reach, limit, exact_k, within_met)


def _total_parts(stock: StockBin) -> int:
    """How many parts the bin holds in all (a large number when some line is unlimited)."""
    counts = [item.count for item in stock.items]
    return MAX_ARRAY_PARTS if any(c is None for c in counts) else max(1, sum(counts))


def _rayleigh_floor(target_ohms: float, stock: StockBin, reach: Reach, within: float | None) -> int:
    """The fewest parts whose networks can come within ``within`` (default :data:`DEFAULT_ACCEPT`) of a
    target beyond the bin's span; arrays of fewer parts are not evaluated.

    Outside the span the closest n-part network is bounded by Rayleigh's monotonicity law (see
    :class:`Reach`): at most the sum of the n largest values, at least the parallel bank of the n
    largest conductances. Those rows could only list networks far from the target.
    """
    if reach.direction == 0 or reach.parts is None:
        return 1
    accept = within if within is not None else DEFAULT_ACCEPT
    values, counts = value_pool(stock)
    if reach.direction > 0:  # series of the largest values: n parts reach at most their sum
        sizes, goal = sorted(zip(values, counts), key=lambda vc: -vc[0]), target_ohms * (1 - accept)
    else:  # parallel of the smallest: n parts reach down to 1 / (sum of conductances)
        sizes, goal = [(1.0 / v, c) for v, c in sorted(zip(values, counts))], (1.0 / target_ohms) / (1 + accept)
    need = _fewest([x for x, _ in sizes], [c for _, c in sizes], goal)
    return max(1, min(reach.parts, need if need is not None else reach.parts))


def _exact_engine(stock: StockBin, k: int) -> tuple[ExactSearch, int]:
    """The exhaustive engine over the bin's distinct values for up to k parts, or fewer when k would take too long."""
    values, counts = value_pool(stock)
    while True:
        try:
            return ExactSearch(values, counts, k), k
        except InfeasibleError:
            if k <= 1:
                raise
            k -= 1


def _tied(found: Found, stock: StockBin, point, derating) -> tuple[Found, NetworkStress | None] | None:
    """The value network of ``found`` with its parts tied to stock lines, and its stress; None if no
    assignment of lines keeps every part within its limits."""
    assigned = assign_lines(found.network, stock, point, derating)
    if assigned is None:
        return None
    if point is None:
        return replace(found, network=assigned.network), None
    stress = network_stress(assigned.network, point, derating)
    if stress.violations:
        return None
    return replace(found, network=assigned.network), stress


def _exact_rows(engine, target, stock, k, within, alternatives, on_progress, point, derating) -> list[FrontierRow]:
    """Exhaustive rows for 1..k parts; with an operating point, screened for stress."""
    rows: list[FrontierRow] = []
    for n in range(1, k + 1):
        _say(on_progress, n)
        wanted = alternatives if point is None else max(STRESS_CANDIDATES, alternatives)
        found = engine.best(n, target, wanted)
        passing = []
        for i, f in enumerate(found):
            tied = _tied(f, stock, point, derating)
            if tied is not None:
                passing.append((i, *tied))
                if len(passing) > alternatives:
                    break
        if passing:
            first_ok, best, stress = passing[0]
            alts = tuple(f for _, f, _ in passing[1 : alternatives + 1])
            rows.append(FrontierRow(n, best, alts, proven=first_ok == 0, method="exhaustive", stress=stress))
            if within is not None and abs(best.error) <= within:
                break
    return rows


def _array_row(design, stock, point, derating) -> FrontierRow | None:
    tied = _tied(design.found, stock, point, derating)
    if tied is None:
        return None
    found, stress = tied
    return FrontierRow(found.parts, found, (), proven=False, method=design.family, stress=stress)


def _family_rows(target, stock, point, derating, limit, within, known, force,
                 on_progress) -> tuple[list[FrontierRow], bool]:
    """CP-SAT rows: per family, the fewest parts within the accuracy, then the smallest error; and
    whether Ctrl-C stopped the search (the rows are then what the solver had).

    ``known`` rows seed the search: the fewest parts among them inside the accuracy window is the
    incumbent that lets :func:`netsynth.search.cpsat.family_search` prune options exactly.
    Without OR-Tools (``auto``) no rows are added.
    """
    from netsynth.search import cpsat, solver  # cpsat imports OR-Tools only when it solves

    accept = within if within is not None else DEFAULT_ACCEPT
    if not accept > 0 or (not force and not solver.available()):
        return [], False
    if not force and len(stock) > cpsat.AUTO_MAX_LINES:
        if on_progress:
            on_progress(f"CP-SAT skipped: {len(stock)} stock lines (auto uses it up to {cpsat.AUTO_MAX_LINES})")
        return [], False
    inside = [r.parts for r in known if abs(r.best.error) <= accept]
    incumbent = min(inside) if inside else None
    out: list[FrontierRow] = []
    deadline = CPSAT_SECONDS
    for i, family in enumerate(cpsat.FAMILIES):
        if on_progress:
            on_progress(f"CP-SAT: {cpsat.FAMILY_TEXT[family]}, up to {limit} parts")
        share = deadline / (len(cpsat.FAMILIES) - i)
        settings = solver.SolverSettings(seconds=max(share, 0.1))
        answer = cpsat.family_search(target, stock, family, accept, limit, point, derating, "parts", incumbent,
                                     settings, force, on_progress)
        deadline -= answer.seconds if answer is not None else 0.0
        if answer is not None and answer.interrupted and answer.found is None:
            return out, True  # Ctrl-C before a first solution: search no further
        if answer is None or answer.found is None:
            continue
        stop = answer.interrupted  # Ctrl-C: keep what this family found, search no further
        tied = _tied(answer.found, stock, point, derating)
        if tied is None:  # the model's filter and the nodal stress check disagree: never shown
            if stop:
                return out, True
            continue
        found, stress = tied
        note = (f"cp-sat {family}: {cpsat.FAMILY_TEXT[family]}, each of up to {cpsat.BANK_PARTS} parts from at most "
                f"two stock lines; {answer.describe()}: ")
        if answer.status == "optimal":
            note += (f"no network of the family with fewer parts lands within ±{accept * 100:g} %"
                     + (" and keeps every part within its limits" if point is not None else "")
                     + f", and none of {found.parts} parts lands closer by more than "
                     f"{answer.resolution * 1e6:.2g} ppm")
        elif answer.first_proven:
            note += f"no network of the family with fewer parts lands within ±{accept * 100:g} %; the error is the best found in the time limit"
        else:
            note += "not proven: the time limit came first, or the model was too large to prove"
        out.append(FrontierRow(found.parts, found, (), proven=False, method=f"cp-sat {family}", stress=stress,
                               status=answer.describe(), note=note))
        incumbent = found.parts if incumbent is None else min(incumbent, found.parts)
        if stop:
            return out, True
    return out, False


def _merge_proofs(array_rows: list[FrontierRow], family_rows: list[FrontierRow]):
    """An array as close as a CP-SAT row of its part count keeps its place and takes that row's proof.

    The proof is about the family (no family network of fewer parts lands inside the accuracy, none
    of this count lands closer), so it holds for any network of that count at least as close.
    """
    kept: list[FrontierRow] = []
    arrays = list(array_rows)
    for row in family_rows:
        i = next((i for i, a in enumerate(arrays) if a.parts == row.parts
                  and abs(a.best.error) <= abs(row.best.error) + SAME_ERROR), None)
        if i is None:
            kept.append(row)
        else:
            arrays[i] = replace(arrays[i], status=row.status, note=row.note + "; the array shown lands as close")
    return arrays, kept


def _fewest_possible(row: FrontierRow, target, stock, point, derating, reach: Reach) -> bool:
    """Whether no network of any shape with fewer parts lands as close to the target within the limits.

    Two lower bounds, each holding for every series/parallel network: with an operating point, the
    power and voltage bound (:func:`netsynth.search.arrays.part_lower_bound`), taken at both ends of
    the row's own error window (power and voltage are monotone in the value, so the ends bound it);
    and the reach: beyond the bin's largest (smallest) value, n − 1 parts make at most (at least)
    the sum of the n − 1 largest values (conductances), Rayleigh's monotonicity law.
    """
    if row.parts <= 1:
        return False
    e = abs(row.best.error)
    if point is not None:
        ends = [target * (1 - e), target * (1 + e)] if e < 1 else [target * (1 + e)]
        if row.parts <= min(part_lower_bound(t, stock, point, derating).count for t in ends):
            return True
    if reach.direction == 0 or reach.parts is None or row.parts != reach.parts:
        return False
    # the extreme n − 1 parts reach: the largest values in series (above), conductances in parallel (below)
    series_up = reach.direction > 0
    pool = sorted(zip(*value_pool(stock)), key=lambda vc: -vc[0] if series_up else vc[0])
    left, total = row.parts - 1, 0.0
    for v, c in pool:
        take = left if c is None else min(c, left)
        total += take * (v if series_up else 1.0 / v)
        left -= take
        if left == 0:
            break
    closest_fewer = total / target - 1.0 if series_up else 1.0 / (total * target) - 1.0
    return e < abs(closest_fewer) - SAME_ERROR


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
