"""The outputs written side by side in worker processes are byte-identical to a serial run, and
an error in a worker reaches the caller as it would in a serial run."""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

import pytest
from bad_inputs.corpus import SMALL_GRID
from sitekit import make_site

from wallsched.errors import InputError
from wallsched.parallel import WORKERS_ENV, Task, run_tasks, worker_count

EXE = Path(sys.executable).with_name("wallsched")


def _run(site: Path, out: Path, workers: int) -> None:
    env = dict(os.environ, **{WORKERS_ENV: str(workers)})
    done = subprocess.run([str(EXE), "design", str(site), "--out", str(out), "-q"],
                          capture_output=True, text=True, timeout=600, env=env)
    assert done.returncode in (0, 3), done.stderr


def _three_walls(folder: Path) -> Path:
    site = make_site(folder, extra=SMALL_GRID)
    text = site.read_text()
    block = text[text.index("[[walls]]"):]
    for wid in ("B", "C"):  # the same invented grades under two more ids
        text += "\n" + block.replace('id = "A"', f'id = "{wid}"')
    site.write_text(text)
    return site


def test_parallel_outputs_byte_identical_to_serial(tmp_path: Path):
    site = _three_walls(tmp_path / "site")
    _run(site, tmp_path / "serial", 1)
    _run(site, tmp_path / "parallel", 3)
    names = sorted(p.name for p in (tmp_path / "serial").iterdir())
    assert names == sorted(p.name for p in (tmp_path / "parallel").iterdir())
    assert {"report.pdf", "A-elevation.dxf", "C-elevation.dxf", "A-profile.png",
            "B-utilization.png"} <= set(names)
    for name in names:
        a = (tmp_path / "serial" / name).read_bytes()
        b = (tmp_path / "parallel" / name).read_bytes()
        assert a == b, f"{name} differs between a serial and a parallel run"


def _write(path: Path, text: str) -> None:
    path.write_text(text)


def test_every_task_runs_once_and_times_add_up(tmp_path: Path, monkeypatch):
    monkeypatch.setenv(WORKERS_ENV, "2")
    tasks = [Task("a" if k % 2 else "b", lambda k=k: _write(tmp_path / f"{k}.txt", str(k)),
                  weight=float(k)) for k in range(7)]
    ticks = []
    spent = run_tasks(tasks, progress=ticks.append)
    assert sorted(p.read_text() for p in tmp_path.iterdir()) == [str(k) for k in range(7)]
    assert len(ticks) == 7 and set(spent) == {"a", "b"}


def _refuse() -> None:
    raise InputError("no such layer", file="site.toml", where="[[walls]] alignment")


@pytest.mark.parametrize("workers", ["1", "2"])
def test_an_error_in_a_task_reaches_the_caller(monkeypatch, workers):
    monkeypatch.setenv(WORKERS_ENV, workers)
    tasks = [Task("x", lambda: None), Task("y", _refuse)]
    with pytest.raises(InputError, match=r"site.toml: \[\[walls\]\] alignment: no such layer"):
        run_tasks(tasks)


def test_worker_count(monkeypatch):
    monkeypatch.setenv(WORKERS_ENV, "8")
    assert worker_count(3) == 3  # never more workers than tasks
    monkeypatch.setenv(WORKERS_ENV, "1")
    assert worker_count(5) == 1
    monkeypatch.delenv(WORKERS_ENV)
    assert 1 <= worker_count(100) <= 4


def _nap() -> None:
    import time

    time.sleep(3.0)


def test_sigterm_while_workers_run_stops_cleanly(monkeypatch, capfd):
    import signal
    import threading

    from wallsched.outdir import Stopped, install_signal_handlers

    monkeypatch.setenv(WORKERS_ENV, "2")
    old = {s: signal.getsignal(s) for s in (signal.SIGTERM, signal.SIGHUP)}
    install_signal_handlers()
    try:
        threading.Timer(0.5, os.kill, (os.getpid(), signal.SIGTERM)).start()
        with pytest.raises(Stopped):
            run_tasks([Task("x", _nap), Task("y", _nap)])
    finally:
        for s, h in old.items():
            signal.signal(s, h)
    # the workers were ended by the pool and said nothing: no traceback from a worker
    assert "Traceback" not in capfd.readouterr().err


def _die() -> None:
    os._exit(3)  # a worker killed (say, by the kernel for memory)


def test_a_worker_that_dies_is_an_error_not_a_wait(monkeypatch):
    from concurrent.futures.process import BrokenProcessPool

    monkeypatch.setenv(WORKERS_ENV, "2")
    with pytest.raises(BrokenProcessPool):
        run_tasks([Task("x", _nap), Task("y", _die)])


def _slow_write(path: Path) -> None:
    import time

    time.sleep(1.5)
    path.write_text("late")


@pytest.mark.parametrize("workers", ["1", "2"])
def test_background_tasks_run_once_and_report_their_time(tmp_path: Path, monkeypatch, workers):
    from wallsched.parallel import Background

    monkeypatch.setenv(WORKERS_ENV, workers)
    tasks = [Task("p", lambda k=k: _write(tmp_path / f"{k}.txt", str(k))) for k in range(3)]
    pid = tmp_path / "pid"
    tasks.append(Task("p", lambda: pid.write_text(str(os.getpid()))))
    with Background(tasks) as bg:
        spent = bg.finish()
    assert sorted(p.read_text() for p in tmp_path.glob("*.txt")) == ["0", "1", "2"]
    assert set(spent) == {"p"} and spent["p"] >= 0.0
    # with two workers the tasks ran in another process, with one in this one
    assert (pid.read_text() != str(os.getpid())) == (workers == "2")


def test_a_failing_background_task_raises_its_error_here(monkeypatch):
    from wallsched.parallel import Background

    monkeypatch.setenv(WORKERS_ENV, "2")
    with Background([Task("x", lambda: None), Task("y", _refuse)]) as bg, \
            pytest.raises(InputError, match="no such layer"):  # run again here, as serially
        bg.finish()


def test_leaving_early_ends_the_background_process(tmp_path: Path, monkeypatch):
    import time

    from wallsched.parallel import Background

    monkeypatch.setenv(WORKERS_ENV, "2")
    late = tmp_path / "late.txt"
    with pytest.raises(RuntimeError), Background([Task("s", lambda: _slow_write(late))]):
        raise RuntimeError("the design failed")  # the block is left before finish()
    time.sleep(2.0)  # longer than the task would take
    assert not late.exists()
