"""The same inputs give byte-identical outputs: two runs of `wallsched design` compared."""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

from bad_inputs.corpus import SMALL_GRID
from sitekit import make_site

EXE = Path(sys.executable).with_name("wallsched")


def _run(site: Path, out: Path) -> None:
    done = subprocess.run([str(EXE), "design", str(site), "--out", str(out), "-q"],
                          capture_output=True, text=True, timeout=600)
    assert done.returncode in (0, 3), done.stderr


def test_two_runs_byte_identical(tmp_path: Path):
    site = make_site(tmp_path / "site", extra=SMALL_GRID)
    _run(site, tmp_path / "run1")
    _run(site, tmp_path / "run2")  # a second process: no state shared with the first
    names = sorted(p.name for p in (tmp_path / "run1").iterdir())
    assert names == sorted(p.name for p in (tmp_path / "run2").iterdir())
    compared = [n for n in names if n.endswith((".csv", ".json", ".dxf"))]
    assert {"schedule.csv", "stations.csv", "rebar.csv", "run.json", "A-elevation.dxf"} <= set(
        compared)
    for name in compared:
        a = (tmp_path / "run1" / name).read_bytes()
        b = (tmp_path / "run2" / name).read_bytes()
        assert a == b, f"{name} differs between two runs of the same inputs"


def _header_value(dxf_text: str, name: str) -> str:
    lines = dxf_text.splitlines()
    k = lines.index(name)
    return lines[k + 2].strip()  # name, group code, value (DXF reference: HEADER section)


def test_dxf_header_dates_are_fixed_not_the_clock(tmp_path: Path):
    # two different sites written at different times carry the same fixed dates
    site = make_site(tmp_path / "site", extra=SMALL_GRID)
    _run(site, tmp_path / "run")
    site2 = make_site(tmp_path / "site2", extra=SMALL_GRID, top=((0, 100.0), (100, 104.0)))
    _run(site2, tmp_path / "run2")
    a = (tmp_path / "run" / "A-elevation.dxf").read_text()
    b = (tmp_path / "run2" / "A-elevation.dxf").read_text()
    for name in ("$TDCREATE", "$TDUPDATE", "$FINGERPRINTGUID", "$VERSIONGUID"):
        assert _header_value(a, name) == _header_value(b, name), name
