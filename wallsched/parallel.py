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
import signal
import time
from collections.abc import Callable, Iterator, Sequence
from contextlib import contextmanager
from dataclasses import dataclass

WORKERS_ENV = "WALLSCHED_WORKERS"
MAX_DEFAULT_WORKERS = 4


@dataclass(frozen=True)
class Task:
    """One output: ``stage`` names it in the stage times; ``run`` writes it."""

    stage: str
    run: Callable[[], None]
    weight: float = 1.0  # a rough cost, so that the longest tasks start first


_JOB: tuple = ()  # (function, items) of the current map, inherited by the forked workers


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


def _worker_start() -> None:
    """A worker leaves the run's clean-up to the parent: the default action for SIGTERM and
    SIGHUP (the parent's handlers would unwind a stack that is not the worker's), Ctrl-C to
    the parent alone, and on Linux the worker ends with its parent (a parent killed outright
    leaves no worker writing on). The worker is forked with these signals blocked
    (:func:`fork_imap`), so that one arriving before this runs waits for it."""
    for name in ("SIGTERM", "SIGHUP"):
        if hasattr(signal, name):
            signal.signal(getattr(signal, name), signal.SIG_DFL)
    signal.signal(signal.SIGINT, signal.SIG_IGN)
    _end_with_parent()
    signal.pthread_sigmask(signal.SIG_UNBLOCK, _STOPPING)


def _end_with_parent() -> None:
    import ctypes
    import sys

    if not sys.platform.startswith("linux"):
        return
    try:
        libc = ctypes.CDLL(None, use_errno=True)
        libc.prctl(1, int(signal.SIGKILL), 0, 0, 0)  # PR_SET_PDEATHSIG (prctl(2))
    except (OSError, AttributeError):
        return
    if os.getppid() != _PARENT:  # the parent was gone before the request took hold
        os._exit(1)


_PARENT = os.getpid()  # the process that forks the workers (set again by fork_imap)
_STOPPING = {getattr(signal, n) for n in ("SIGTERM", "SIGHUP", "SIGINT") if hasattr(signal, n)}


@contextmanager
def _frozen_heap() -> Iterator[None]:
    """The objects alive now moved out of the garbage collector's sight while workers are
    forked (``gc.freeze``): a worker's collections then never walk the inherited design,
    nor touch (and so copy) its pages; this process sees them again afterwards. Measured on
    the 100,000-station benchmark: about 1.4 s less CPU in the collector and 1.3 s less
    system time (the copying of pages)."""
    import gc

    gc.freeze()
    try:
        yield
    finally:
        gc.unfreeze()


def _call(k: int):
    fn, items = _JOB
    return fn(items[k])


def _stop(executor) -> None:
    """End the workers now (a stop, an error): nothing more is written by them."""
    for proc in list(getattr(executor, "_processes", {}).values()):
        proc.terminate()
    executor.shutdown(wait=True, cancel_futures=True)


def fork_imap(fn: Callable, items: Sequence, *, workers: int | None = None) -> Iterator:
    """``fn(x) for x in items``, yielded in the order of ``items`` as they are done, from
    forked worker processes where there is more than one worker. ``fn`` and ``items`` are
    inherited by the workers (never pickled); the results come back pickled. A worker that
    dies makes this raise (``BrokenProcessPool``), never wait for ever."""
    global _JOB, _PARENT
    from concurrent.futures import ProcessPoolExecutor

    n = len(items)
    workers = worker_count(n) if workers is None else max(1, min(workers, n))
    if workers <= 1 or "fork" not in mp.get_all_start_methods():
        for x in items:
            yield fn(x)
        return
    _JOB, _PARENT = (fn, items), os.getpid()
    executor = None
    try:
        # the workers (forked as the tasks are handed out) and the executor's thread start
        # with the stopping signals blocked; a stop in that moment arrives after it
        old = signal.pthread_sigmask(signal.SIG_BLOCK, _STOPPING)
        try:
            with _frozen_heap():  # the fork start method forks every worker at the first task
                executor = ProcessPoolExecutor(workers, mp_context=mp.get_context("fork"),
                                               initializer=_worker_start)
                results = executor.map(_call, range(n))
        finally:
            signal.pthread_sigmask(signal.SIG_SETMASK, old)
        yield from results
        executor.shutdown(wait=True)
    except BaseException:
        if executor is not None:
            _stop(executor)
        raise
    finally:
        _JOB = ()


def fork_map(fn: Callable, items: Sequence, *, workers: int | None = None,
             progress: Callable[[int], None] | None = None) -> list:
    """``[fn(x) for x in items]`` by :func:`fork_imap`; ``progress(1)`` as each arrives."""
    out = []
    for r in fork_imap(fn, items, workers=workers):
        out.append(r)
        if progress is not None:
            progress(1)
    return out


def _timed(task: Task) -> float:
    t0 = time.perf_counter()
    task.run()
    return time.perf_counter() - t0


def run_tasks(tasks: Sequence[Task], *, progress: Callable[[int], None] | None = None
              ) -> dict[str, float]:
    """Run every task (in parallel where it pays), the heaviest first; returns the seconds
    spent per stage name. An error in a task (an ``InputError``, say) is raised here, as a
    serial run would."""
    order = sorted(range(len(tasks)), key=lambda k: -tasks[k].weight)
    took = fork_map(_timed, [tasks[k] for k in order], progress=progress)
    spent: dict[str, float] = {}
    for k, dt in zip(order, took, strict=True):
        spent[tasks[k].stage] = spent.get(tasks[k].stage, 0.0) + dt
    return spent


class Background:
    """Tasks run in one forked process while this one goes on (the profile plots, which need
    only the sampled stations, beside the design); a context manager.

    :meth:`finish` waits for it and returns the seconds spent per stage name. Where the process
    failed (or could not be forked), the tasks are run again here, so that their error is
    raised as a serial run would raise it; with one worker (``WALLSCHED_WORKERS=1``), or no
    ``fork``, they run here at :meth:`finish`. Leaving the block early (an error, a stop) ends
    the process: nothing more is written by it."""

    def __init__(self, tasks: Sequence[Task]):
        self.tasks = list(tasks)
        self.proc = None

    def __enter__(self) -> Background:
        global _PARENT
        if not self.tasks or worker_count(2) <= 1 or "fork" not in mp.get_all_start_methods():
            return self
        ctx = mp.get_context("fork")
        pipe_r, pipe_w = ctx.Pipe(duplex=False)
        _PARENT = os.getpid()
        old = signal.pthread_sigmask(signal.SIG_BLOCK, _STOPPING)
        try:
            proc = ctx.Process(target=_background_main, args=(self.tasks, pipe_w), daemon=True)
            with _frozen_heap():
                proc.start()
            self.proc, self._pipe = proc, pipe_r
        except OSError:  # no process: the tasks run here at finish()
            pipe_r.close()
        finally:
            signal.pthread_sigmask(signal.SIG_SETMASK, old)
            pipe_w.close()
        return self

    def finish(self) -> dict[str, float]:
        """Wait for the tasks (running them here where the process did not finish them)."""
        if self.proc is not None:
            try:
                spent = self._pipe.recv()  # the child's stage times; EOF when it failed
            except (EOFError, OSError):
                spent = None
            self._close(end=False)
            if isinstance(spent, dict):
                return spent
        return _run_all(self.tasks)

    def _close(self, *, end: bool) -> None:
        if end:
            self.proc.terminate()
        self.proc.join()
        self.proc = None
        self._pipe.close()

    def __exit__(self, *exc) -> None:
        if self.proc is not None:  # left before finish(): end it
            self._close(end=True)


def _run_all(tasks: Sequence[Task]) -> dict[str, float]:
    """Run the tasks here, one after the other; the seconds spent per stage name."""
    spent: dict[str, float] = {}
    for task in tasks:
        spent[task.stage] = spent.get(task.stage, 0.0) + _timed(task)
    return spent


def _background_main(tasks: Sequence[Task], pipe) -> None:
    _worker_start()
    try:
        spent = _run_all(tasks)
    except BaseException:
        os._exit(1)  # the parent runs the tasks again and raises the error itself
    pipe.send(spent)
    pipe.close()
