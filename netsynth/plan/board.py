"""A board's values from one drawer: one network per need, all from the same limited stock.

Chain
-----
1. **Candidates.** For each need, the exhaustive search (:class:`~netsynth.search.exact.ExactSearch`
   over the bin's pooled values) lists, for every part count up to ``max_parts``, the best network
   and up to ``alternatives`` runners-up. Those within the need's accuracy are kept. With an
   operating point each candidate is solved once by the nodal solver, and every part gets the set
   of stock lines of its value whose derated ratings it respects (:func:`~netsynth.analysis.stress.part_stress`);
   a candidate with a part no line can carry is dropped.
2. **Allocation.** :func:`netsynth.search.kitting.allocate` picks one candidate per need (or none)
   so that no stock line gives more parts than it holds: serve as many needs as possible, then use
   the fewest parts, then make the largest error smallest (its docstring gives the model and the
   weights).
3. **Lines and checks.** Each chosen network is tied to the lines the allocation gave it with
   :func:`~netsynth.analysis.lines.assign_lines` (over a bin of exactly those lines and counts, so
   the tie cannot take a part from elsewhere), re-checked part by part against its own line with
   :func:`~netsynth.analysis.stress.network_stress`, and its value verified by the nodal solver
   (:func:`netsynth.api.checked`).

What "proven" means here
------------------------
``status == "optimal"`` means CP-SAT proved the allocation optimal *over the candidates listed*:
no other choice among them serves more needs, or as many with fewer parts, or with a smaller
largest error. Networks outside the candidate lists (more runners-up, more parts) are not part
of that promise.
"""

from __future__ import annotations

import math
import time
from collections import Counter
from collections.abc import Callable, Sequence
from dataclasses import dataclass, replace

from netsynth.analysis.conditions import Derating
from netsynth.analysis.lines import assign_lines, value_key, value_pool
from netsynth.analysis.stress import NetworkStress, network_load, network_stress, part_stress
from netsynth.api import checked
from netsynth.design import Candidate, PickLine
from netsynth.errors import ArgumentError, VerificationError
from netsynth.inputs import as_bin, as_count
from netsynth.network import Network, Part, Series, parallel, parts_in_order, series, to_text
from netsynth.plan.needs import Need
from netsynth.search.exact import ExactSearch, Found
from netsynth.search.kitting import ERROR_UNIT, Kit, Option, Stage, allocate
from netsynth.search.solver import SolverSettings, Status
from netsynth.stock import StockBin, StockItem, bin_order
from netsynth.values import format_error, format_ohms

#: default largest part count of one need's network
DEFAULT_MAX_PARTS = 4
#: the exhaustive search behind the candidates is asked for at most this many parts
MAX_PLAN_PARTS = 6
#: runners-up asked of the exhaustive search per part count (so up to 13 candidates per count)
ALTERNATIVES = 12
#: errors closer than this to the accuracy still count as inside it (float noise of an exact edge)
SAME_ERROR = 1e-12


@dataclass(frozen=True, slots=True)
class NeedResult:
    """What the plan gives one need: its verified network, or the reason it has none."""

    need: Need
    candidate: Candidate | None  #: the network with its parts tied to lines, nodally verified
    stress: NetworkStress | None  #: per-part stress at the need's operating point (None without one)
    reason: str | None  #: why the need is not served (None when it is)
    candidates: int  #: candidate networks within its accuracy and limits

    @property
    def served(self) -> bool:
        return self.candidate is not None


@dataclass(frozen=True, slots=True)
class BoardPlan:
    """The plan for a whole board: one result per need, the combined pick list and what is left."""

    results: tuple[NeedResult, ...]
    pick_list: tuple[PickLine, ...]  #: every part the plan takes, one entry per stock line, in bin order
    users: tuple[tuple[str, ...], ...]  #: per pick-list entry, the refs that take from that line
    leftover: StockBin  #: every line of the bin with what the plan leaves (0 where it takes all)
    kit: Kit  #: the allocation and its stages
    bin_name: str
    max_parts: int
    seconds: float

    @property
    def status(self) -> Status:
        """``optimal`` (every stage of the allocation proven) or ``feasible``/``unknown``."""
        return self.kit.status

    @property
    def served(self) -> int:
        return sum(r.served for r in self.results)

    @property
    def parts(self) -> int:
        return sum(p.count for p in self.pick_list)

    @property
    def largest_error(self) -> float | None:
        errors = [abs(r.candidate.error) for r in self.results if r.candidate is not None]
        return max(errors) if errors else None

    @property
    def bound(self) -> tuple[str, float] | None:
        """(stage, the solver's bound on that stage's objective) for the first unproven stage."""
        stage = self.kit.open_stage
        if stage is None or stage.bound is None:
            return None
        return stage.name, stage.bound

    def bound_text(self) -> str:
        """The bound in words, for a plan that is not proven optimal."""
        stage: Stage | None = self.kit.open_stage
        if stage is None:
            return ""
        if stage.bound is None:
            return f"the solver found no bound ({stage.name}) in the time limit"
        if stage.name == "unserved and parts":
            w = self.kit.skip_weight
            unserved, parts = divmod(math.ceil(stage.bound - 1e-9), w)
            return (f"bound: no plan of these candidates does better than {unserved} unserved and {parts} parts "
                    f"(objective unserved × {w} + parts ≥ {stage.bound:g})")
        if stage.name == "largest error":
            return f"bound: the largest error is at least {stage.bound:g} ppm with as many served and parts"
        return f"bound: {stage.bound:g} on the total error (ppm × tie-break weight)"


@dataclass(frozen=True, slots=True)
class _Choice:
    """One candidate of one need, before allocation."""

    found: Found
    option: Option


def plan_board(
    needs: Sequence[Need],
    stock: StockBin | str | None = None,
    max_parts: int = DEFAULT_MAX_PARTS,
    derating: Derating = Derating(),
    settings: SolverSettings = SolverSettings(),
    alternatives: int = ALTERNATIVES,
    on_progress: Callable[[str], None] | None = None,
) -> BoardPlan:
    """One network per need from one shared bin, or the reason a need cannot be served.

    Parameters
    ----------
    needs : the needs (see :func:`netsynth.plan.needs.load_needs`); references must be unique
    stock : the bin: a :class:`StockBin`, a bin file's path, or None for the built-in default bin
    max_parts : the largest part count of each need's network (1 to 6)
    derating : the margins on each part's ratings (for needs with an operating point)
    settings : the allocation's time limit, solver workers and seed
    alternatives : runners-up per part count asked of the exhaustive search (0 to 50)
    on_progress : receives progress lines

    Returns
    -------
    BoardPlan

    Raises
    ------
    ArgumentError
        No needs, a repeated reference, or a bad argument.
    InfeasibleError
        ``max_parts`` too large for the exhaustive search on this bin (names the count that fits).
    VerificationError
        A chosen network fails its nodal or per-part check (a bug; never shown as an answer).

    Examples
    --------
    Two needs for 2 kΩ and one line holding a single 2k: one need gets it, the other a pair of 1k.

    >>> drawer = StockBin((StockItem(1000.0, 2), StockItem(2000.0, 1)))
    >>> plan = plan_board([Need("R1", 2000.0), Need("R2", 2000.0)], drawer, max_parts=2)
    >>> sorted(r.candidate.expression for r in plan.results), plan.status
    (['1k + 1k', '2k'], 'optimal')
    """
    start = time.perf_counter()
    needs = tuple(needs)
    if not needs or not all(isinstance(n, Need) for n in needs):
        raise ArgumentError(f"needs={needs!r}: give at least one Need")
    refs = Counter(n.ref for n in needs)
    if repeated := [r for r, k in refs.items() if k > 1]:
        raise ArgumentError(f"needs: reference {repeated[0]!r} is listed {refs[repeated[0]]} times; give each need "
                            "its own reference")
    stock = as_bin(stock)
    max_parts = as_count(max_parts, "max_parts", 1, MAX_PLAN_PARTS)
    alternatives = as_count(alternatives, "alternatives", 0, 50)
    lines = [item for item in stock.items if item.count is None or item.count > 0]
    of_value: dict[float, list[int]] = {}
    for i, item in enumerate(lines):
        of_value.setdefault(value_key(item.ohms), []).append(i)
    values, counts = value_pool(stock)
    if on_progress:
        on_progress(f"finding candidates for {len(needs)} needs (networks of up to {max_parts} parts)")
    engine = ExactSearch(values, counts, max_parts)
    groups: dict[tuple[int, ...], int] = {}
    choices: list[list[_Choice]] = []
    reasons: list[str | None] = []
    for need in needs:
        found, why = _candidates(need, engine, max_parts, alternatives, lines, of_value, groups, derating)
        choices.append(found)
        reasons.append(why)
    if on_progress:
        on_progress(f"allocating the drawer: {sum(map(len, choices))} candidates for {len(needs)} needs")
    group_lines = [g for g, _ in sorted(groups.items(), key=lambda kv: kv[1])]
    kit = allocate([[c.option for c in cs] for cs in choices], group_lines, [item.count for item in lines],
                   settings, on_progress)
    results: list[NeedResult] = []
    for t, need in enumerate(needs):
        c = kit.chosen[t]
        if c is None:
            results.append(NeedResult(need, None, None, reasons[t], len(choices[t])))
            continue
        taken = Counter(line for _, where in kit.draws[t] for line in where)
        candidate, stress = _tied(choices[t][c].found, need, taken, lines, derating)
        results.append(NeedResult(need, candidate, stress, None, len(choices[t])))
    picks, users, left = _accounts(results, stock)
    results = [r if r.served or r.reason is not None else
               replace(r, reason=_taken_reason(r, choices[i], group_lines, lines, left, users, picks, kit))
               for i, r in enumerate(results)]
    leftover = StockBin(tuple(replace(item, count=left.get(id(item), item.count)) for item in stock.items),
                        name=f"{stock.name}, left over after the plan")
    return BoardPlan(tuple(results), picks, users, leftover, kit, stock.name, max_parts,
                     time.perf_counter() - start)


def _candidates(need, engine, max_parts, alternatives, lines, of_value, groups, derating):
    """The need's candidates (within its accuracy and limits, best first) and, if none, why."""
    found: list[Found] = []
    seen: set[Network] = set()
    for n in range(1, max_parts + 1):
        for f in engine.best(n, need.target_ohms, alternatives):
            if f.network not in seen:
                seen.add(f.network)
                found.append(f)
    if not found:
        return [], f"the bin cannot make any network of up to {max_parts} parts"
    inside = sorted((f for f in found if abs(f.error) <= need.within + SAME_ERROR),
                    key=lambda f: (f.parts, abs(f.error), to_text(f.network)))
    accuracy = f"±{format_error(need.within).lstrip('+')}"
    if not inside:
        best = min(found, key=lambda f: (abs(f.error), f.parts))
        return [], (f"no candidate within accuracy: no network of up to {max_parts} parts from the bin lands "
                    f"within {accuracy} (closest: {to_text(best.network)} = {format_ohms(best.value_ohms, 6)}, "
                    f"{format_error(best.error)})")
    out: list[_Choice] = []
    for f in inside:
        parts = parts_in_order(f.network)
        if need.point is None:
            allowed = [tuple(of_value[value_key(p.ohms)]) for p in parts]
        else:
            load = network_load(f.network, need.point)
            allowed = [tuple(l for l in of_value[value_key(p.ohms)]
                             if part_stress(pl, lines[l], True, need.point, derating).ok)
                       for p, pl in zip(parts, load.parts)]
            if not all(allowed):
                continue
        demand = Counter(groups.setdefault(a, len(groups)) for a in allowed)
        error_ppm = math.ceil(abs(f.error) / ERROR_UNIT - 1e-9)
        out.append(_Choice(f, Option(f.parts, error_ppm, tuple(sorted(demand.items())))))
    if not out:
        return [], (f"nothing within its limits: none of the {len(inside)} networks of up to {max_parts} parts "
                    f"within {accuracy} keeps every part within its derated limits at {need.point.describe()}")
    return out, None


def _tied(found: Found, need: Need, taken: Counter, lines: list[StockItem], derating: Derating):
    """The candidate tied to exactly the lines the allocation gave it, checked part by part and nodally."""
    own = {l: replace(lines[l], count=k) for l, k in taken.items()}
    original = {id(item): lines[l] for l, item in own.items()}
    assigned = assign_lines(found.network, StockBin(tuple(own.values())), need.point, derating)
    if assigned is None:
        raise VerificationError(f"{need.ref}: the allocated lines cannot supply {to_text(found.network)}")
    net = _retie(assigned.network, original)
    stress = None
    if need.point is not None:
        stress = network_stress(net, need.point, derating)
        if stress.violations:
            raise VerificationError(f"{need.ref}: {to_text(net)} has a part over its derated limit on its "
                                    "allocated line")
    return checked(replace(found, network=net), need.target_ohms), stress


def _retie(net: Network, original: dict[int, StockItem]) -> Network:
    """The same tree with each part's line replaced by the bin's own line object."""
    if isinstance(net, Part):
        return Part(net.ohms, original[id(net.line)])
    kids = [_retie(c, original) for c in net.children]
    return series(*kids) if isinstance(net, Series) else parallel(*kids)


def _accounts(results: list[NeedResult], stock: StockBin):
    """The combined pick list (bin order), who takes from each line, and what each limited line keeps."""
    counts: dict[int, int] = {}
    by_id: dict[int, StockItem] = {}
    refs: dict[int, list[str]] = {}
    for r in results:
        if r.candidate is None:
            continue
        for part in r.candidate.components:
            key = id(part.line)
            by_id[key] = part.line
            counts[key] = counts.get(key, 0) + 1
            if r.need.ref not in refs.setdefault(key, []):
                refs[key].append(r.need.ref)
    order = sorted(counts, key=lambda k: bin_order(by_id[k]))
    picks = tuple(PickLine(by_id[k], counts[k]) for k in order)
    users = tuple(tuple(refs[k]) for k in order)
    left = {id(item): item.count - counts.get(id(item), 0) for item in stock.items if item.count is not None}
    if any(v < 0 for v in left.values()):
        raise VerificationError("the plan takes more parts of a line than the bin holds")
    return picks, users, left


def _taken_reason(result, choices, group_lines, lines, left, users, picks, kit) -> str:
    """Why a need with candidates was left out: its best candidate needs more than the plan leaves."""
    best = choices[0]
    short: list[int] = []  # lines of the groups that fall short
    for g, d in best.option.demand:
        there = [left.get(id(lines[l])) for l in group_lines[g]]
        if None not in there and sum(there) < d:
            short += group_lines[g]
    takers: list[str] = []
    for pick, refs in zip(picks, users):
        if any(pick.line is lines[l] for l in short):
            takers += [r for r in refs if r not in takers]
    head = ("stock taken by others" if kit.status == "optimal" else
            "not served in the best plan found in the time limit")
    detail = f"its best candidate, {to_text(best.found.network)}, needs parts the other needs use"
    if takers:
        detail += f" ({', '.join(takers)})"
    return f"{head}: {detail}; none of its {len(choices)} candidates fits in what is left"
