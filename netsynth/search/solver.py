"""Running one CP-SAT model: parameters, a time limit, progress, Ctrl-C, and what the status promises.

OR-Tools is imported inside the functions that need it (importing ``cp_model`` takes about half a
second and pulls in pandas), so nothing on the path of a small ``make`` pays for it. The models
themselves are built by :mod:`.kitting` (a board's values from one drawer) and :mod:`.cpsat`
(large networks over structured families); this module only runs them.

What a status promises
----------------------
``optimal``
    The solver proved that no assignment of the model does better (CP-SAT ``OPTIMAL``, with no
    gap limit set). Callers say "proven" only on this status.
``feasible``
    A solution was found but the time limit (or Ctrl-C) stopped the proof: the objective is the
    best found, ``bound`` is the solver's proven bound (no solution of the model is better).
``infeasible``
    The model has no solution at all (proven).
``unknown``
    The time limit (or Ctrl-C) came before any solution.

Parameters always set (OR-Tools ``SatParameters``): ``num_workers`` (never 0, which means "every
core the machine has" and ignores CPU affinity), ``max_time_in_seconds``, ``random_seed``, and
``presolve_inclusion_work_limit = 0``, the upstream workaround for a 9.15 presolve rule that sums
large coefficients in 32 bits and can certify a wrong optimum or infeasibility (or-tools#5293; the
family models hit it, see ``tests/test_cpsat.py``).
With a fixed seed and a model solved to optimality the answer is the same on every run; a time
limit that stops a search part-way is not reproducible (parallel search is not deterministic),
which is why callers break ties inside the objective instead of leaving them to the search.

Progress and cancel
-------------------
The solve runs on a worker thread (``CpSolver.solve`` releases the GIL); the calling thread waits
in short joins, so Ctrl-C reaches it, calls ``CpSolver.stop_search`` and returns what the solver
has by then, with ``interrupted`` set. A solve that runs longer than a second reports the best
objective and bound once a second through ``on_progress``.

References
----------
OR-Tools CP-SAT parameters, ``ortools/sat/sat_parameters.proto`` (``num_workers``,
``max_time_in_seconds``, ``random_seed``); ``ortools/sat/python/cp_model.py`` (``CpSolver.solve``,
``stop_search``, ``CpSolverSolutionCallback``).
"""

from __future__ import annotations

import importlib.util
import math
import threading
import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from typing import Any, Literal

from netsynth.errors import ArgumentError, InfeasibleError

Status = Literal["optimal", "feasible", "infeasible", "unknown"]

#: default wall-clock limit of one request's solver time, seconds
DEFAULT_SECONDS = 10.0
#: default worker threads: the reference machine has two cores (see the module docstring)
DEFAULT_WORKERS = 2
#: default random seed: fixed, so that the same request gives the same answer
DEFAULT_SEED = 1
#: a solve quieter than this many seconds reports no progress
PROGRESS_AFTER = 1.0


@dataclass(frozen=True, slots=True)
class SolverSettings:
    """How long and how wide a CP-SAT solve may run.

    Parameters
    ----------
    seconds : float
        Wall-clock limit in seconds for a whole request (a request may run several solves; they
        share this budget).
    workers : int
        Solver threads, 1 to 64 (``num_workers``); 1 is the escape hatch where threads misbehave.
    seed : int
        ``random_seed``, 0 or more.
    """

    seconds: float = DEFAULT_SECONDS
    workers: int = DEFAULT_WORKERS
    seed: int = DEFAULT_SEED

    def __post_init__(self) -> None:
        if isinstance(self.seconds, bool) or not isinstance(self.seconds, (int, float)) or not (
                self.seconds > 0 and math.isfinite(self.seconds)):
            raise ArgumentError(f"seconds={self.seconds!r}: a time limit is a finite number of seconds above zero")
        if isinstance(self.workers, bool) or not isinstance(self.workers, int) or not 1 <= self.workers <= 64:
            raise ArgumentError(f"workers={self.workers!r}: give a whole number of solver threads from 1 to 64")
        if isinstance(self.seed, bool) or not isinstance(self.seed, int) or self.seed < 0:
            raise ArgumentError(f"seed={self.seed!r}: a random seed is a whole number, 0 or more")


@dataclass(frozen=True, slots=True)
class Solved:
    """What one solve returned."""

    status: Status
    objective: float | None  #: the best objective found (None without a solution)
    bound: float | None  #: the solver's proven bound on the objective (None if it had none)
    values: tuple[int, ...]  #: the requested variables' values in the best solution (empty without one)
    seconds: float  #: wall time of the solve
    interrupted: bool = False  #: Ctrl-C stopped it

    @property
    def has_solution(self) -> bool:
        return self.status in ("optimal", "feasible")


def available() -> bool:
    """Whether OR-Tools can be imported (without importing it)."""
    return importlib.util.find_spec("ortools") is not None


def cp_model() -> Any:
    """The ``ortools.sat.python.cp_model`` module, imported on first use.

    Raises
    ------
    InfeasibleError
        When OR-Tools is not installed: says how to install it.
    """
    try:
        from ortools.sat.python import cp_model as module
    except ImportError:
        raise InfeasibleError("this search needs OR-Tools (CP-SAT), which is not installed; "
                              "install it with: pip install ortools") from None
    return module


def solve(
    model: Any,
    variables: Sequence[Any],
    settings: SolverSettings,
    seconds: float | None = None,
    on_progress: Callable[[str], None] | None = None,
    label: str = "solving",
    gap: float = 0.0,
) -> Solved:
    """Solve ``model`` within the settings' limits and read back ``variables``.

    Parameters
    ----------
    model : cp_model.CpModel
        The model, objective included.
    variables : sequence of cp_model IntVar
        The variables whose values the caller needs.
    settings : SolverSettings
        Workers and seed; ``settings.seconds`` is the limit unless ``seconds`` is given.
    seconds : float or None
        The wall-clock limit of this solve (what is left of the request's budget).
    on_progress : callable or None
        Receives a line a second while the solve runs longer than a second.
    label : str
        What the progress lines say is running.
    gap : float
        ``absolute_gap_limit``: stop once the best found is within this of the bound; ``optimal``
        then means "within ``gap`` of the optimum", so only callers that state the gap set it.

    Returns
    -------
    Solved
        The status (see the module docstring), objective, bound and values.
    """
    cp = cp_model()
    limit = settings.seconds if seconds is None else seconds
    solver = cp.CpSolver()
    params = solver.parameters
    params.num_workers = settings.workers
    params.max_time_in_seconds = max(0.01, float(limit))
    params.random_seed = settings.seed
    params.log_search_progress = False
    # OR-Tools 9.15 presolve can certify a wrong INFEASIBLE or OPTIMAL when Boolean terms with large
    # coefficients add up past 2**31 (or-tools#5293; seen here on a 5-option family model whose rows
    # carry 2**41 coefficients). Switching that presolve rule off is the upstream workaround.
    params.presolve_inclusion_work_limit = 0
    # Ctrl-C is Python's to handle (see "Progress and cancel"): the solver's own SIGINT handler, on
    # by default, aborted the process with std::bad_function_call when the solve ran on a thread
    params.catch_sigint_signal = False
    if gap > 0:
        params.absolute_gap_limit = float(gap)

    latest: list[tuple[float, float]] = []  # (objective, bound), appended from the solver's thread

    class _Watch(cp.CpSolverSolutionCallback):
        def on_solution_callback(self) -> None:  # runs on a solver thread: keep it cheap
            latest.append((self.objective_value, self.best_objective_bound))

    result: list[int] = []
    start = time.perf_counter()
    worker = threading.Thread(target=lambda: result.append(solver.solve(model, _Watch())), daemon=True)
    worker.start()
    interrupted = False
    next_report = start + PROGRESS_AFTER
    try:
        while worker.is_alive():
            worker.join(0.1)
            now = time.perf_counter()
            if on_progress is not None and now >= next_report and worker.is_alive():
                next_report = now + 1.0
                if latest:
                    found, bound = latest[-1]
                    on_progress(f"{label}: best {found:g}, bound {bound:g} after {now - start:.0f} s")
                else:
                    on_progress(f"{label}: no solution yet after {now - start:.0f} s")
    except KeyboardInterrupt:
        interrupted = True
        solver.stop_search()
        worker.join()
    elapsed = time.perf_counter() - start
    code = result[0] if result else cp.UNKNOWN
    status: Status
    if code == cp.OPTIMAL:
        status = "optimal"
    elif code == cp.FEASIBLE:
        status = "feasible"
    elif code == cp.INFEASIBLE:
        status = "infeasible"
    elif code == cp.MODEL_INVALID:
        raise AssertionError(f"CP-SAT rejected the model: {model.validate()}")
    else:
        status = "unknown"
    if status in ("optimal", "feasible"):
        values = tuple(int(solver.value(v)) for v in variables)
        return Solved(status, solver.objective_value, solver.best_objective_bound, values, elapsed, interrupted)
    return Solved(status, None, None, (), elapsed, interrupted)
