"""The stages of a run: progress on stderr for a person, and the time of each stage.

Progress is shown only when stderr is a terminal and ``--quiet`` is not given: one line per
stage (``designing 3 walls ... 1.2 s``), or a progress bar where a stage goes item by item.
The time of each stage is kept; with the environment variable ``WALLSCHED_STAGE_TIMES`` set to
a file path, the times are written there as JSON when the run ends (for
``tests/benchmarks/bench_pipeline.py``; nothing is written otherwise).
"""

from __future__ import annotations

import json
import os
import sys
import time
from collections.abc import Callable, Iterator
from contextlib import contextmanager
from pathlib import Path

TIMES_ENV = "WALLSCHED_STAGE_TIMES"


def progress_wanted(quiet: bool) -> bool:
    """Progress for a person: a terminal on stderr and no ``--quiet``."""
    return not quiet and sys.stderr.isatty()


class Stages:
    """Times the stages of one run and, when ``show``, reports them on stderr."""

    def __init__(self, *, show: bool = False) -> None:
        self.show = show
        self.times_s: dict[str, float] = {}

    @contextmanager
    def stage(self, name: str, detail: str = "") -> Iterator[None]:
        """One stage, timed; ``detail`` (e.g. ``"3 walls"``) is shown beside its name."""
        import click

        label = f"{name} {detail}".strip()
        if self.show:
            click.echo(f"{label} ...", err=True, nl=False)
        t0 = time.perf_counter()
        try:
            yield
        finally:
            dt = time.perf_counter() - t0
            self.times_s[name] = self.times_s.get(name, 0.0) + dt
            if self.show:
                click.echo(f" {dt:.1f} s", err=True)

    @contextmanager
    def items(self, name: str, count: int, unit: str) -> Iterator[Callable[[int], None]]:
        """A stage that goes item by item: yields ``tick(n)``, shown as a progress bar."""
        import click

        t0 = time.perf_counter()
        try:
            if self.show and count > 1:
                with click.progressbar(length=count, label=f"{name} {count} {unit}",
                                       file=sys.stderr) as bar:
                    yield bar.update
            else:
                with self.stage(name, f"{count} {unit}"):
                    yield lambda n=1: None
                return
        finally:
            self.times_s[name] = time.perf_counter() - t0

    def write_times(self) -> None:
        """The stage times as JSON to the file named by ``WALLSCHED_STAGE_TIMES``, if set."""
        target = os.environ.get(TIMES_ENV)
        if target:
            Path(target).write_text(json.dumps(self.times_s, indent=1) + "\n")


QUIET = Stages(show=False)
