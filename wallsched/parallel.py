"""The independent outputs of a run (each wall's drawings and plots, the calc package) written
side by side in worker processes.

Each task writes its own files and nothing else, so the outputs are byte-identical to a serial
run whatever the order the tasks finish in (``tests/test_parallel.py`` holds that). The workers
are forked from the finished design (POSIX ``fork``: the design is shared copy-on-write, never
pickled) and draw with matplotlib's Agg backend. ``WALLSCHED_WORKERS`` sets how many (default:
the CPUs this process may use, at most 4); ``1``, or a platform without ``fork``, runs the tasks
in this process, one after the other.
"""

from __future__ import annotations

import multiprocessing as mp
import os
import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass

WORKERS_ENV = "WALLSCHED_WORKERS"
MAX_DEFAULT_WORKERS = 4


@dataclass(frozen=True)
class Task:
    """One output: ``stage`` names it in the stage times; ``run`` writes it."""

    stage: str
    run: Callable[[], None]
    weight: float = 1.0  # a rough cost, so that the longest tasks start first


_TASKS: Sequence[Task] = ()  # the tasks of the current run, inherited by the forked workers


def worker_count(n_tasks: int) -> int:
    """Workers for ``n_tasks`` tasks: ``WALLSCHED_WORKERS`` or the usable CPUs (at most 4)."""
    raw = os.environ.get(WORKERS_ENV, "").strip()
    if raw:
        try:
            want = int(raw)
        except ValueError:
            want = 1
    else:
        try:
            want = len(os.sched_getaffinity(0))
        except AttributeError:  # not on every platform
            want = os.cpu_count() or 1
        want = min(want, MAX_DEFAULT_WORKERS)
    return max(1, min(want, n_tasks))


def _run_one(k: int) -> tuple[int, float]:
    t0 = time.perf_counter()
    _TASKS[k].run()
    return k, time.perf_counter() - t0


def run_tasks(tasks: Sequence[Task], *, progress: Callable[[int], None] | None = None
              ) -> dict[str, float]:
    """Run every task (in parallel where it pays); returns the seconds spent per stage name.

    An error in a task (an ``InputError``, say) is raised here, as a serial run would."""
    global _TASKS

    order = sorted(range(len(tasks)), key=lambda k: -tasks[k].weight)
    workers = worker_count(len(tasks))
    spent: dict[str, float] = {}

    def done(k: int, dt: float) -> None:
        spent[tasks[k].stage] = spent.get(tasks[k].stage, 0.0) + dt
        if progress is not None:
            progress(1)

    if workers <= 1 or "fork" not in mp.get_all_start_methods():
        for k in order:
            done(*_run_one_local(tasks[k], k))
        return spent
    _TASKS = tasks
    try:
        with mp.get_context("fork").Pool(workers) as pool:
            for k, dt in pool.imap_unordered(_run_one, order):
                done(k, dt)
    finally:
        _TASKS = ()
    return spent


def _run_one_local(task: Task, k: int) -> tuple[int, float]:
    t0 = time.perf_counter()
    task.run()
    return k, time.perf_counter() - t0
