"""Output safety: file names from wall ids, what counts as an earlier output, the lock, signals,
leftovers of a killed run, a full disk, the umask, and ``diff --out``."""

from __future__ import annotations

import errno
import json
import os
import signal
from pathlib import Path

import pytest
from sitekit import SMALL_GRID, make_site
from wallsched.exporters.file_names import MAX_STEM, id_problem, wall_file_stems

from wallsched.cli import main
from wallsched.errors import InputError
from wallsched.outdir import RUN_FORMAT, read_manifest, recover, staged_output


def _tree(root: Path) -> dict[str, bytes]:
    return {str(p.relative_to(root)): p.read_bytes() for p in sorted(root.rglob("*"))
            if p.is_file()}


def _one_error_line(stderr: str, *fragments: str) -> str:
    assert "Traceback" not in stderr
    lines = stderr.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith("error: "), stderr
    for f in fragments:
        assert f in lines[0], lines[0]
    return lines[0]


# ---- file stems

@pytest.mark.parametrize("ids", [
    ["A B", "A_B"], ["W1.", "W1"], ["a", "A"], ["../../escaped", ".._.._escaped", "escaped"],
    ["/tmp/abs", "tmp/abs", "tmp_abs"], ["Mauer Ä", "Mauer A", "Mauer_A"], ["x" * 500, "x" * 499],
])
def test_stems_are_portable_and_unique(ids):
    stems = wall_file_stems(ids)
    assert list(stems) == ids  # every id, in order
    assert len({s.casefold() for s in stems.values()}) == len(ids)
    for s in stems.values():
        assert s and len(s) <= MAX_STEM + 3
        assert not s.startswith(".") and "/" not in s and "\\" not in s
        assert all(c.isascii() and (c.isalnum() or c in "._-") for c in s), s


def test_a_plain_id_is_its_own_stem():
    assert wall_file_stems(["W-12", "B.2"]) == {"W-12": "W-12", "B.2": "B.2"}


@pytest.mark.parametrize("bad", ["", "   ", "A\x00B", "A\tB", "W\u202e1", "A\nB"])
def test_empty_or_control_ids_are_refused(bad):
    assert id_problem(bad)
    with pytest.raises(InputError, match="wall id"):
        wall_file_stems([bad])


def _walls(folder: Path, ids) -> Path:
    """The small site with one wall per id (the same profiles)."""
    site = make_site(folder, extra=SMALL_GRID)
    text = site.read_text()
    head, wall = text[:text.index("[[walls]]")], text[text.index("[[walls]]"):]
    site.write_text(head + "\n".join(wall.replace('id = "A"', f"id = {json.dumps(i)}")
                                     for i in ids))
    return site


def test_hostile_ids_write_nothing_outside_out_and_never_share_a_file(runner, tmp_path: Path):
    deep = tmp_path / "a" / "b" / "c"
    site = _walls(deep, ("../../escaped", str(tmp_path / "abs"), "A B", "A_B"))
    inputs = _tree(tmp_path)
    res = runner.invoke(main, ["design", str(site), "--out", str(deep / "out")])
    assert res.exit_code in (0, 3), res.output
    after = _tree(tmp_path)
    new = {k for k in after if k not in inputs}
    assert new and all(k.startswith("a/b/c/out/") for k in new), sorted(new)
    assert all(after[k] == v for k, v in inputs.items())  # no input changed
    out = deep / "out"
    for suffix in ("-profile.png", "-elevation.dxf", "-elevation.png", "-utilization.png"):
        assert len(list(out.glob(f"*{suffix}"))) == 4, suffix  # one file per wall each
    import pandas as pd

    ids = set(pd.read_csv(out / "schedule.csv")["wall"])
    assert ids == {"../../escaped", str(tmp_path / "abs"), "A B", "A_B"}  # ids as written


@pytest.mark.parametrize("wall_id, what, where", [
    ("", "wall id is empty", "walls[1].id"),
    ("A\\u0007B", "control character (U+0007)", "line 15: [walls] id")])
def test_site_file_refuses_bad_ids(runner, tmp_path: Path, wall_id, what, where):
    site = make_site(tmp_path)
    site.write_text(site.read_text().replace('id = "A"', f'id = "{wall_id}"'))
    res = runner.invoke(main, ["stations", str(site), "--out", str(tmp_path / "out")])
    assert res.exit_code == 2
    _one_error_line(res.stderr, what, "site.toml", where)
    assert not (tmp_path / "out").exists()


# ---- what counts as an earlier output

def _stations(runner, site: Path, out: Path, *extra: str):
    return runner.invoke(main, ["stations", str(site), "--out", str(out), "--no-plots", *extra])


@pytest.mark.parametrize("replace", [False, True])
def test_a_user_folder_with_a_stations_csv_is_refused(runner, tmp_path: Path, replace):
    site = make_site(tmp_path / "site")
    mine = tmp_path / "mine"
    mine.mkdir()
    (mine / "stations.csv").write_text("my own survey\n")
    (mine / "field-notes.txt").write_text("notes\n")
    before = _tree(tmp_path)
    res = _stations(runner, site, mine, *(["--replace"] if replace else []))
    assert res.exit_code == 2
    _one_error_line(res.stderr, "not an earlier output", "--out")
    assert _tree(tmp_path) == before


def test_run_json_carries_the_marker_and_the_files(runner, tmp_path: Path):
    site = make_site(tmp_path)
    assert _stations(runner, site, tmp_path / "out").exit_code == 0
    data = json.loads((tmp_path / "out" / "run.json").read_text())
    assert data["format"] == RUN_FORMAT
    assert read_manifest(tmp_path / "out") == sorted(p.name for p in (tmp_path / "out").iterdir())


def test_a_file_added_to_out_is_named_and_kept_in_prev(runner, tmp_path: Path):
    site = make_site(tmp_path / "site")
    out = tmp_path / "out"
    assert _stations(runner, site, out).exit_code == 0
    (out / "field-notes.txt").write_text("mine\n")
    res = _stations(runner, site, out)
    assert res.exit_code == 0
    assert "field-notes.txt" in res.stdout and "warning:" in res.stdout
    assert (tmp_path / "out.prev" / "field-notes.txt").read_text() == "mine\n"
    res = _stations(runner, site, out)  # the next rotation drops the old .prev: not the file
    assert res.exit_code == 0 and "field-notes.txt" in res.stdout
    assert (tmp_path / "out.prev" / "field-notes.txt").read_text() == "mine\n"
    (out / "more.txt").write_text("also mine\n")
    res = _stations(runner, site, out, "--replace")
    assert res.exit_code == 2
    _one_error_line(res.stderr, "more.txt", "--replace")
    assert (out / "more.txt").read_text() == "also mine\n"


# ---- the lock, signals, leftovers, a full disk, the umask

def test_a_second_run_into_the_same_out_is_refused(runner, tmp_path: Path):
    import subprocess
    import sys

    site = make_site(tmp_path / "site")
    out = tmp_path / "out"
    hold = ("import fcntl, os, sys\n"
            "fd = os.open(sys.argv[1], os.O_RDWR | os.O_CREAT)\n"
            "fcntl.lockf(fd, fcntl.LOCK_EX)\n"
            "print('held', flush=True)\n"
            "sys.stdin.read()\n")
    other = subprocess.Popen([sys.executable, "-c", hold, str(tmp_path / ".out.lock")],
                             stdin=subprocess.PIPE, stdout=subprocess.PIPE, text=True)
    try:
        assert other.stdout.readline().strip() == "held"  # as a running wallsched holds it
        res = _stations(runner, site, out)
    finally:
        other.stdin.close()
        other.wait(timeout=60)
    assert res.exit_code == 2
    _one_error_line(res.stderr, "another wallsched run", "--out")
    assert not out.exists()
    assert _stations(runner, site, out).exit_code == 0  # released: runs
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out", "site"]


def test_the_lock_is_not_held_by_forked_children(tmp_path: Path):
    # a worker forked during the run (the drawing pool) must not keep the lock after the
    # run's own process is gone
    import subprocess
    import sys

    code = ("import os, sys\n"
            "from wallsched.outdir import output_lock\n"
            "with output_lock(sys.argv[1]):\n"
            "    if os.fork() == 0:\n"
            "        sys.stdin.read()  # a child that lives on until the test lets it go\n"
            "        os._exit(0)\n"
            "    print('forked', flush=True)\n"
            "    os._exit(0)  # the run's process dies without unlocking\n")
    run = subprocess.Popen([sys.executable, "-c", code, str(tmp_path / "out")],
                           stdin=subprocess.PIPE, stdout=subprocess.PIPE, text=True)
    try:
        assert run.stdout.readline().strip() == "forked"
        run.wait(timeout=60)
        from wallsched.outdir import output_lock

        with output_lock(tmp_path / "out"):  # taken while the child still holds the file
            pass
    finally:
        run.stdin.close()


@pytest.mark.parametrize("signum", [signal.SIGTERM, signal.SIGHUP])
def test_sigterm_and_sighup_clean_up(runner, tmp_path: Path, monkeypatch, signum):
    site = make_site(tmp_path / "site")
    out = tmp_path / "out"
    assert _stations(runner, site, out).exit_code == 0
    before = _tree(out)

    def killed(walls, folder, **kw):
        (folder / "stations.csv").write_text("half")
        os.kill(os.getpid(), signum)

    monkeypatch.setattr("wallsched.pipeline.write_stations", killed)
    res = _stations(runner, site, out)
    assert res.exit_code == 128 + signum
    _one_error_line(res.stderr, signal.Signals(signum).name)
    assert _tree(out) == before
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out", "site"]


def test_a_full_disk_is_one_line_and_keeps_out_and_prev(runner, tmp_path: Path, monkeypatch):
    site = make_site(tmp_path / "site")
    out = tmp_path / "out"
    assert _stations(runner, site, out).exit_code == 0
    assert _stations(runner, site, out).exit_code == 0
    before = _tree(tmp_path)

    def full(walls, folder, **kw):
        raise OSError(errno.ENOSPC, "No space left on device")

    monkeypatch.setattr("wallsched.pipeline.write_stations", full)
    res = _stations(runner, site, out)
    assert res.exit_code == 2
    _one_error_line(res.stderr, "No space left on device", "--out")
    assert _tree(tmp_path) == before
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out", "out.prev", "site"]


def _killed_run(tmp_path: Path, runner, site: Path) -> tuple[Path, Path]:
    """Two runs into out, then the pieces a third leaves when killed at each rename."""
    out = tmp_path / "out"
    assert _stations(runner, site, out).exit_code == 0
    assert _stations(runner, site, out).exit_code == 0
    new = tmp_path / ".out.tmp-abcd1234"
    with staged_output(tmp_path / "staging") as tmp:
        (tmp / "stations.csv").write_text("the new run\n")
    os.replace(tmp_path / "staging", new)
    return out, new


def test_a_kill_after_setting_prev_aside_is_undone(runner, tmp_path: Path):
    site = make_site(tmp_path / "site")
    out, new = _killed_run(tmp_path, runner, site)
    prev_before, out_before = _tree(tmp_path / "out.prev"), _tree(out)
    trash = tmp_path / ".out.old-efgh5678"
    trash.mkdir()
    os.replace(tmp_path / "out.prev", trash / "prev")
    recover(out)
    assert _tree(tmp_path / "out.prev") == prev_before and _tree(out) == out_before
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out", "out.prev", "site"]


def test_a_kill_between_the_renames_is_finished_by_the_next_run(runner, tmp_path: Path):
    site = make_site(tmp_path / "site")
    out, new = _killed_run(tmp_path, runner, site)
    old_out = _tree(out)
    trash = tmp_path / ".out.old-efgh5678"
    trash.mkdir()
    os.replace(tmp_path / "out.prev", trash / "prev")
    os.replace(out, tmp_path / "out.prev")  # killed here: no out
    res = _stations(runner, site, out)
    assert res.exit_code == 0, res.output
    assert "finished the earlier run" in res.stdout
    assert (tmp_path / "out.prev" / "stations.csv").read_text() == "the new run\n"
    assert _tree(out) == old_out  # the same inputs: the same stations
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out", "out.prev", "site"]


def test_an_unfinished_staging_folder_is_removed_by_the_next_run(runner, tmp_path: Path):
    site = make_site(tmp_path / "site")
    out = tmp_path / "out"
    stale = tmp_path / ".out.tmp-zz99yy88"
    stale.mkdir()
    (stale / "schedule.csv").write_text("half a schedule")
    other = tmp_path / ".other.tmp-zz99yy88"  # another output's: not ours to touch
    other.mkdir()
    assert _stations(runner, site, out).exit_code == 0
    assert sorted(p.name for p in tmp_path.iterdir()) == [".other.tmp-zz99yy88", "out", "site"]


@pytest.mark.parametrize("mask", [0o022, 0o077, 0o002])
def test_the_output_follows_the_umask(runner, tmp_path: Path, mask):
    site = make_site(tmp_path / "site")
    old = os.umask(mask)
    try:
        assert _stations(runner, site, tmp_path / "out").exit_code == 0
    finally:
        os.umask(old)
    assert (tmp_path / "out").stat().st_mode & 0o777 == 0o777 & ~mask
    assert (tmp_path / "out" / "stations.csv").stat().st_mode & 0o777 == 0o666 & ~mask


def test_init_on_a_read_only_folder_is_one_line(runner, tmp_path: Path):
    ro = tmp_path / "ro"
    ro.mkdir()
    ro.chmod(0o500)
    try:
        if os.access(ro, os.W_OK):  # running as root: a read-only file system is not at hand
            target = ro / "sub" / "x"
            (ro / "sub").write_text("a file, not a folder\n")
        else:
            target = ro / "site"
        res = runner.invoke(main, ["init", str(target)])
    finally:
        ro.chmod(0o700)
    assert res.exit_code == 2
    _one_error_line(res.stderr, "cannot create the folder")


# ---- diff --out

def test_diff_out_may_not_name_a_file_of_either_run(runner, tmp_path: Path):
    site = make_site(tmp_path / "site", extra=SMALL_GRID)
    old = tmp_path / "old"
    res = runner.invoke(main, ["design", str(site), "--out", str(old), "--no-drawings"])
    assert res.exit_code == 0, res.output
    import shutil

    new = tmp_path / "new"
    shutil.copytree(old, new)
    before = _tree(tmp_path)
    for out in (old / "schedule.csv", old, new / "schedule.csv", new / "sub.csv",
                old / "diff.csv"):
        res = runner.invoke(main, ["diff", str(old), str(new), "--out", str(out)])
        assert res.exit_code == 2, out
        _one_error_line(res.stderr, "inside the compared run", "--out")
    assert _tree(tmp_path) == before
    for out in (tmp_path / "d.csv", new):  # outside both, or the default NEW_DIR/diff.csv
        res = runner.invoke(main, ["diff", str(old), str(new), "--out", str(out)])
        assert res.exit_code == 0, res.output
    assert (tmp_path / "d.csv").is_file() and (new / "diff.csv").is_file()


@pytest.mark.parametrize("a, b, same", [("inf", "inf", True), (float("inf"), "inf", True),
                                        ("inf", "3.0", False), ("-inf", "inf", False),
                                        ("2.0", "2.0", True)])
def test_diff_inf_to_inf_is_no_change(a, b, same):
    from wallsched.exporters.run_tables import Field

    assert Field("fs_sliding", "stability", "qty").same(a, b) is same
    assert Field("toe_ft", "dimension", "ft").same(a, b) is same
