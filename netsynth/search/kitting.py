"""Sharing one drawer between several needs: pick one candidate network per need so the stock covers them all.

A multiple-choice packing problem, solved with CP-SAT (:mod:`.solver`). The caller (the board plan,
:mod:`netsynth.plan`) has already found, for each need, its candidate networks that land within the
need's accuracy and keep every part within its limits; this module only decides which candidate
each need gets, and from which stock line each part comes, so that no line gives more than it holds.

Model
-----
Per need t and candidate c a 0/1 literal ``x[t,c]``, and a literal ``skip[t]`` (the need is left
unserved, which keeps the model always feasible); exactly one of them is true per need.

Parts are counted per *group*: the stock lines any part of the group may be taken from (all lines
of its value without an operating point; with one, the lines whose derated ratings that part
respects). A candidate demands ``d[c,g]`` parts of group g. Where a group holds one line, its demand
goes straight into that line's row; where it holds several, integer flows ``f[g,l] ≥ 0`` with
``Σ_l f[g,l] = Σ d[c,g]·x[t,c]`` share it among its lines (any split is realisable, because the
group's parts are interchangeable over its lines). Each limited line then gets the row
``Σ(its direct demand and flows) ≤ count``; rows that can never bind are left out, and a group with
an unlimited line needs no row at all.

Objective, lexicographic, solved as three stages (each stage's optimum becomes a constraint of the
next, so every coefficient stays small; see the 32-bit presolve issue or-tools#5293):

1. ``W·(unserved needs) + (total parts)`` with ``W`` = one more than the most parts any choice can
   use: serving one more need always outweighs any number of parts;
2. the largest |error| over the served needs, in whole ppm (rounded up);
3. ``S·(R·(sum of the served needs' |error| in ppm) + sum of the chosen candidates' ranks)`` plus
   ``n − t`` for each unserved need t of n (``R`` = one more than the longest list, ``S`` = one more
   than the largest possible sum of the ``n − t``): total error, then each need's candidates in their
   own order, then serving the earlier needs: fixed tie-breaks, so the same request gives the same
   answer.

The status is ``optimal`` only when all three stages are proven; otherwise the first stage that is
not proven gives ``bound``. A greedy allocation (needs with the fewest candidates first, each taking
its first candidate that still fits) is computed first: it is the solver's hint and the answer when
the solver finds nothing in the time limit.

References
----------
Multiple-choice knapsack / packing: Kellerer, Pferschy and Pisinger, *Knapsack Problems*
(Springer, 2004), ch. 11. OR-Tools CP-SAT: ``add_exactly_one``, ``add_hint``,
``LinearExpr.weighted_sum`` (``ortools/sat/python/cp_model.py``).
"""

from __future__ import annotations

import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass

from netsynth.search.solver import SolverSettings, Solved, Status, cp_model, solve

#: error unit of stages 2 and 3: one ppm (errors are rounded up to it)
ERROR_UNIT = 1e-6
STAGES = ("unserved and parts", "largest error", "total error")


@dataclass(frozen=True, slots=True)
class Option:
    """One candidate for one need: its part count, its |error| and the parts it takes per group."""

    parts: int
    error_ppm: int  #: |error| in whole ppm, rounded up
    demand: tuple[tuple[int, int], ...]  #: (group index, parts of that group), groups distinct


@dataclass(frozen=True, slots=True)
class Stage:
    """One stage of the lexicographic objective (see the module docstring)."""

    name: str
    status: Status
    objective: float | None
    bound: float | None
    seconds: float


@dataclass(frozen=True, slots=True)
class Kit:
    """The allocation: one candidate (or none) per need, and the stock line of each part it takes."""

    chosen: tuple[int | None, ...]  #: per need, the index of its candidate; None: not served
    #: per need, for each group its chosen candidate demands: (group, line index of each part)
    draws: tuple[tuple[tuple[int, tuple[int, ...]], ...], ...]
    stages: tuple[Stage, ...]  #: the stages that ran (empty when the greedy answer stands alone)
    skip_weight: int  #: W of stage 1
    interrupted: bool = False

    @property
    def status(self) -> Status:
        """``optimal`` when every stage is proven, else ``feasible`` (or ``unknown`` if none ran)."""
        if len(self.stages) == len(STAGES) and all(s.status == "optimal" for s in self.stages):
            return "optimal"
        return "feasible" if self.stages else "unknown"

    @property
    def open_stage(self) -> Stage | None:
        """The first stage that is not proven (its bound is the plan's bound), or None."""
        return next((s for s in self.stages if s.status != "optimal"), None)


def allocate(
    options: Sequence[Sequence[Option]],
    groups: Sequence[Sequence[int]],
    capacity: Sequence[int | None],
    settings: SolverSettings = SolverSettings(),
    on_progress: Callable[[str], None] | None = None,
) -> Kit:
    """Choose one option per need (or none) so that no stock line gives more than it holds.

    Parameters
    ----------
    options : per need, its candidates (see :class:`Option`), best first
    groups : per group, the indices of the stock lines its parts may come from (non-empty)
    capacity : per stock line, the parts it holds (None: as many as needed)
    settings : the solver's time limit, workers and seed (the time limit covers all three stages)
    on_progress : receives a progress line a second during a solve longer than a second

    Returns
    -------
    Kit
        The allocation and the status of each stage.

    Examples
    --------
    Two needs, one line holding a single part that either could use; the second need also has a
    two-part candidate from an unlimited line. Serving both takes three parts:

    >>> kit = allocate([[Option(1, 0, ((0, 1),))], [Option(1, 0, ((0, 1),)), Option(2, 5, ((1, 2),))]],
    ...                groups=[(0,), (1,)], capacity=[1, None])
    >>> kit.chosen, kit.status
    ((0, 1), 'optimal')
    """
    start = time.perf_counter()
    greedy = _greedy(options, groups, capacity)
    skip_weight = 1 + sum(max((o.parts for o in opts), default=0) for opts in options)
    if not any(options):
        return _kit(options, groups, capacity, [None] * len(options), (), skip_weight, False)
    cp = cp_model()
    model = cp.CpModel()
    LE = cp.LinearExpr
    x = [[model.new_bool_var(f"x{t}_{c}") for c in range(len(opts))] for t, opts in enumerate(options)]
    skip = [model.new_bool_var(f"skip{t}") for t in range(len(options))]
    for t in range(len(options)):
        model.add_exactly_one(x[t] + [skip[t]])

    # demand per group, then per line
    demand: dict[int, list[tuple[object, int]]] = {}
    for t, opts in enumerate(options):
        for c, opt in enumerate(opts):
            for g, d in opt.demand:
                demand.setdefault(g, []).append((x[t][c], d))
    line_terms: dict[int, list[tuple[object, int]]] = {}
    line_most: dict[int, int] = {}
    flows: dict[tuple[int, int], object] = {}
    for g, terms in demand.items():
        lines = groups[g]
        if any(capacity[l] is None for l in lines):
            continue  # an unlimited line takes whatever the group needs
        most = sum(d for _, d in terms)
        if len(lines) == 1:
            line_terms.setdefault(lines[0], []).extend(terms)
            line_most[lines[0]] = line_most.get(lines[0], 0) + most
            continue
        total = LE.weighted_sum([v for v, _ in terms], [d for _, d in terms])
        fs = []
        for l in lines:
            f = model.new_int_var(0, min(most, capacity[l]), f"f{g}_{l}")
            flows[(g, l)] = f
            fs.append(f)
            line_terms.setdefault(l, []).append((f, 1))
            line_most[l] = line_most.get(l, 0) + min(most, capacity[l])
        model.add(LE.sum(fs) == total)
    for l, terms in line_terms.items():
        if line_most[l] > capacity[l]:  # only rows that can bind
            model.add(LE.weighted_sum([v for v, _ in terms], [k for _, k in terms]) <= capacity[l])

    everything = [v for row in x for v in row] + skip
    if greedy is not None:
        for t, row in enumerate(x):
            for c, v in enumerate(row):
                model.add_hint(v, 1 if greedy[t] == c else 0)
            model.add_hint(skip[t], 1 if greedy[t] is None else 0)

    # stage 1: unserved needs first, then parts
    served_parts = LE.weighted_sum(
        [v for row in x for v in row] + skip,
        [o.parts for opts in options for o in opts] + [skip_weight] * len(skip))
    stages: list[Stage] = []
    chosen: list[int | None] | None = None
    interrupted = False
    budget = settings.seconds
    objectives = [served_parts]
    # stage 2: the largest error
    worst_error = max((o.error_ppm for opts in options for o in opts), default=0)
    largest = model.new_int_var(0, worst_error, "largest_error")
    for t, opts in enumerate(options):
        model.add(largest >= LE.weighted_sum(x[t], [o.error_ppm for o in opts]))
    objectives.append(largest)
    # stage 3: total error, then each choice's rank, then serving earlier needs (fixed tie-breaks)
    ranks = 1 + max((len(opts) for opts in options), default=0)
    order = 1 + len(options) * (len(options) + 1) // 2
    objectives.append(LE.weighted_sum(
        [v for row in x for v in row] + skip,
        [(o.error_ppm * ranks + c) * order for opts in options for c, o in enumerate(opts)]
        + [len(options) - t for t in range(len(options))]))
    for name, objective in zip(STAGES, objectives):
        left = budget - (time.perf_counter() - start)
        if left <= 0.01 or interrupted:
            break
        model.minimize(objective)
        solved = solve(model, everything, settings, seconds=left, on_progress=on_progress,
                       label=f"allocating ({name})")
        stages.append(Stage(name, solved.status, solved.objective, solved.bound, solved.seconds))
        interrupted = solved.interrupted
        if not solved.has_solution:
            break
        chosen = _decode(solved, options)
        value = round(solved.objective)
        model.add(objective <= value)  # keep this stage's optimum (or best found) in later stages
        model.clear_hints()
        for v, val in zip(everything, solved.values):
            model.add_hint(v, val)
        if solved.status != "optimal":
            break
    if chosen is None:
        chosen = greedy if greedy is not None else [None] * len(options)
    return _kit(options, groups, capacity, chosen, tuple(stages), skip_weight, interrupted)


def _decode(solved: Solved, options: Sequence[Sequence[Option]]) -> list[int | None]:
    out: list[int | None] = []
    i = 0
    for opts in options:
        row = solved.values[i:i + len(opts)]
        i += len(opts)
        out.append(next((c for c, v in enumerate(row) if v), None))
    return out


def _kit(options, groups, capacity, chosen, stages, skip_weight, interrupted) -> Kit:
    """The allocation with a stock line for every part (raises if the choice overdraws a line)."""
    draws = _draw(options, groups, capacity, chosen)
    if draws is None:
        raise AssertionError("the chosen candidates overdraw a stock line")
    return Kit(tuple(chosen), draws, stages, skip_weight, interrupted)


def _draw(options, groups, capacity, chosen) -> tuple | None:
    """Lines for every part of the chosen options, or None when they do not fit.

    Groups of one line, or with an unlimited line, are direct. Groups of several limited lines are
    a transportation problem: parts of a group may go to any of its lines; solved as a bipartite
    b-matching by augmenting paths (each part of a group is one node, each line has its count).
    """
    left = [None if c is None else c for c in capacity]
    wanted: list[tuple[int, int, int]] = []  # (need, group, part number within the group)
    for t, c in enumerate(chosen):
        if c is None:
            continue
        for g, d in options[t][c].demand:
            wanted += [(t, g, k) for k in range(d)]
    holder: dict[int, list[int]] = {}  # line -> indices into wanted
    match = [-1] * len(wanted)

    def augment(i: int, seen: set[int]) -> bool:
        for line in groups[wanted[i][1]]:
            if line in seen:
                continue
            seen.add(line)
            taken = holder.setdefault(line, [])
            if left[line] is None or len(taken) < left[line] or any(augment(j, seen) for j in list(taken)):
                if match[i] >= 0:
                    holder[match[i]].remove(i)
                match[i] = line
                holder[line].append(i)
                return True
        return False

    # parts of single-line groups first: they have no choice
    for i in sorted(range(len(wanted)), key=lambda i: len(groups[wanted[i][1]])):
        if not augment(i, set()):
            return None
    out = []
    for t, c in enumerate(chosen):
        if c is None:
            out.append(())
            continue
        per_need = []
        for g, d in options[t][c].demand:
            lines = tuple(match[i] for i, w in enumerate(wanted) if w[0] == t and w[1] == g)
            per_need.append((g, lines))
        out.append(tuple(per_need))
    return tuple(out)


def _greedy(options, groups, capacity) -> list[int | None] | None:
    """Needs with the fewest candidates first; each takes its first candidate that still fits."""
    chosen: list[int | None] = [None] * len(options)
    for t in sorted(range(len(options)), key=lambda t: (len(options[t]), t)):
        for c in range(len(options[t])):
            chosen[t] = c
            if _draw(options, groups, capacity, chosen) is not None:
                break
            chosen[t] = None
    return chosen
