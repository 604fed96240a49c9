"""Atomic output folders: an interrupted run leaves nothing half-written; DIR.prev; --replace."""

from __future__ import annotations

from pathlib import Path

import pytest
from sitekit import make_site

from wallsched.cli import main
from wallsched.errors import InputError
from wallsched.outdir import staged_output

MARKED = '{"format": "wallsched-run", "files": ["run.json", "stations.csv"]}\n'


def _files(folder: Path) -> dict[str, bytes]:
    return {str(p.relative_to(folder)): p.read_bytes() for p in sorted(folder.rglob("*"))
            if p.is_file()}


def _previous(tmp_path: Path) -> Path:
    out = tmp_path / "out"
    out.mkdir()
    (out / "stations.csv").write_text("wall,station_ft\nA,0.0\n")
    (out / "run.json").write_text(MARKED)
    return out


@pytest.mark.parametrize("exc", [RuntimeError("disk full"), KeyboardInterrupt()])
def test_interrupted_run_leaves_target_as_it_was(tmp_path: Path, exc):
    out = _previous(tmp_path)
    before = _files(out)
    with pytest.raises(type(exc)), staged_output(out) as tmp:
        (tmp / "schedule.csv").write_text("half a sched")
        raise exc
    assert _files(out) == before
    assert not (tmp_path / "out.prev").exists()
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out"]  # no temporary folder left


def test_interrupted_first_run_creates_nothing(tmp_path: Path):
    with pytest.raises(RuntimeError), staged_output(tmp_path / "new") as tmp:
        (tmp / "stations.csv").write_text("x")
        raise RuntimeError("stop")
    assert list(tmp_path.iterdir()) == []


def test_success_keeps_previous_as_prev_and_replaces_old_prev(tmp_path: Path):
    out = _previous(tmp_path)
    old = _files(out)
    with staged_output(out) as tmp:
        (tmp / "stations.csv").write_text("run 2\n")
    assert _files(tmp_path / "out.prev") == old
    assert (out / "stations.csv").read_text() == "run 2\n"
    with staged_output(out) as tmp:
        (tmp / "stations.csv").write_text("run 3\n")
    assert (tmp_path / "out.prev" / "stations.csv").read_text() == "run 2\n"
    assert (out / "stations.csv").read_text() == "run 3\n"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out", "out.prev"]


def test_replace_drops_the_old_folder_and_keeps_prev_alone(tmp_path: Path):
    out = _previous(tmp_path)
    prev = tmp_path / "out.prev"
    prev.mkdir()
    (prev / "stations.csv").write_text("older\n")
    with staged_output(out, replace=True) as tmp:
        (tmp / "stations.csv").write_text("new\n")
    assert _files(out).keys() == {"stations.csv", "run.json"}
    assert (out / "stations.csv").read_text() == "new\n"
    assert (prev / "stations.csv").read_text() == "older\n"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out", "out.prev"]


def test_failure_while_swapping_restores_the_old_state(tmp_path: Path, monkeypatch):
    import os

    out = _previous(tmp_path)
    before = _files(out)
    real = os.replace
    calls = []

    def flaky(src, dst):
        calls.append((Path(src).name, Path(dst).name))
        if Path(dst) == out and Path(src).name.startswith(".out.tmp-"):  # the new folder
            raise OSError(28, "No space left on device")
        return real(src, dst)

    monkeypatch.setattr("wallsched.outdir.os.replace", flaky)
    with pytest.raises(InputError, match="No space left on device"), staged_output(out) as tmp:
        (tmp / "stations.csv").write_text("new\n")
    monkeypatch.undo()
    assert _files(out) == before
    assert not (tmp_path / "out.prev").exists()
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out"]
    assert calls  # the swap was attempted


def test_refuses_a_folder_that_is_not_an_output(tmp_path: Path):
    notes = tmp_path / "notes"
    notes.mkdir()
    (notes / "keep.txt").write_text("mine\n")
    with pytest.raises(InputError, match="not an earlier output"), staged_output(notes):
        pass
    assert (notes / "keep.txt").read_text() == "mine\n"


def test_cli_error_inside_the_stage_removes_it(runner, tmp_path: Path):
    # --compare pointing at a folder that is not a run: refused before anything is written
    site = make_site(tmp_path, extra="[sizing]\ntoe_max_ft = 3\nheel_max_ft = 6\n"
                                      "footing_thickness_max_in = 18\nstem_max_in = 12\n")
    out = _previous(tmp_path)
    before = _files(out)
    (tmp_path / "empty").mkdir()
    res = runner.invoke(main, ["design", str(site), "--out", str(out), "--compare",
                               str(tmp_path / "empty"), "--no-drawings"])
    assert res.exit_code == 2 and "--compare" in res.stderr
    assert _files(out) == before and not (tmp_path / "out.prev").exists()
    assert not list(tmp_path.glob(".out.*"))


def test_cli_rerun_and_replace(runner, tmp_path: Path):
    site = make_site(tmp_path)
    out = tmp_path / "out"
    args = ["stations", str(site), "--out", str(out), "--no-plots"]
    assert runner.invoke(main, args).exit_code == 0
    first = _files(out)
    assert runner.invoke(main, args).exit_code == 0
    assert _files(tmp_path / "out.prev") == first
    (tmp_path / "out.prev" / "marker.txt").write_text("prev of run 2\n")
    assert runner.invoke(main, [*args, "--replace"]).exit_code == 0
    assert (tmp_path / "out.prev" / "marker.txt").exists()  # --replace leaves .prev alone
    assert _files(out) == first
