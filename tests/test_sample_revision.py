"""The sample site's grading revision (rev 2 changes W1 and W2 only) run with ``--compare``:
the walls the revision leaves alone come out exactly as before — the same segments, ids,
sections (their footing-bar anchorage included) and marks — and the diff names none of them.
"""

from __future__ import annotations

import csv
import shutil
import subprocess
import sys
from pathlib import Path

EXE = Path(sys.executable).with_name("wallsched")
SAMPLE = Path(__file__).resolve().parents[1] / "sample_site"


def _run(args) -> None:
    done = subprocess.run([str(EXE), *map(str, args), "-q", "--no-drawings"],
                          capture_output=True, text=True, timeout=900)
    assert done.returncode == 0, done.stderr


def _rows(path: Path, wall: str) -> list[dict]:
    with path.open(newline="") as f:
        return [r for r in csv.DictReader(f) if r["wall"] == wall]


def test_walls_the_revision_leaves_alone_are_unchanged(tmp_path):
    site = tmp_path / "sample"
    shutil.copytree(SAMPLE, site, ignore=shutil.ignore_patterns("out*"))
    _run(["design", site / "site.toml", "--out", tmp_path / "rev1"])
    _run(["design", site / "site-rev2.toml", "--out", tmp_path / "rev2",
          "--compare", tmp_path / "rev1"])
    for wall in ("W3", "W4"):  # grades, alignment and inputs the same in both revisions
        old = _rows(tmp_path / "rev1" / "schedule.csv", wall)
        new = _rows(tmp_path / "rev2" / "schedule.csv", wall)
        assert old and old == new, wall
    with (tmp_path / "rev2" / "diff.csv").open(newline="") as f:
        walls = {r["wall"] for r in csv.DictReader(f)}
    assert not walls & {"W3", "W4"}
    assert walls & {"W1", "W2"}  # the revision did change something
