"""`wallsched stations` and `wallsched init` through click's CliRunner and as a subprocess."""

import shutil
import subprocess
import sys
from pathlib import Path

import numpy as np
import pandas as pd
from sitekit import make_site

from wallsched.cli import main

PINNED = ["wall", "station_ft", "station", "x", "y", "retained_grade_ft", "front_grade_ft",
          "retained_height_ft", "is_break"]  # DESIGN.md section 5 / the stations stage


def test_stations_writes_table_and_plot(runner, site_dir: Path):
    out = site_dir / "out"
    res = runner.invoke(main, ["stations", str(site_dir / "site.toml"), "--out", str(out)])
    assert res.exit_code == 0, res.output
    frame = pd.read_csv(out / "stations.csv")
    assert list(frame.columns[: len(PINNED)]) == PINNED
    # the hand interpolation of the invented profiles (numpy.interp as the reference)
    rg = np.interp(frame.station_ft, [0, 40, 100], [100, 106, 103])
    fg = np.interp(frame.station_ft, [0, 60, 100], [99, 98.5, 99.5])
    np.testing.assert_allclose(frame.retained_height_ft, rg - fg, atol=1e-4)
    assert frame.retained_height_ft.max() == (106 - np.interp(40, [0, 60], [99, 98.5])).round(4)
    assert (out / "A-profile.png").stat().st_size > 10_000
    assert "A: 0+00.00 to 1+00.00, 100.0 ft" in res.output
    assert not list(site_dir.glob(".out.tmp-*"))


def test_rerun_keeps_previous_as_prev(runner, site_dir: Path):
    out = site_dir / "out"
    args = ["stations", str(site_dir / "site.toml"), "--out", str(out), "--no-plots"]
    assert runner.invoke(main, args).exit_code == 0
    assert runner.invoke(main, args).exit_code == 0
    assert (site_dir / "out.prev" / "stations.csv").exists()


def test_bad_input_one_line_exit_2_nothing_written(runner, tmp_path: Path):
    site = make_site(tmp_path, top=((0, 100.0), (80, 104.0)))  # does not cover the wall
    out = tmp_path / "out"
    res = runner.invoke(main, ["stations", str(site), "--out", str(out)])
    assert res.exit_code == 2
    lines = [ln for ln in res.output.splitlines() if ln.strip()]
    assert len(lines) == 1 and lines[0].startswith("error: top.csv: wall 'A'")
    assert "Traceback" not in res.output
    assert not out.exists() and not list(tmp_path.glob(".out.tmp-*"))


def test_bad_input_leaves_previous_output_untouched(runner, site_dir: Path):
    out = site_dir / "out"
    site = site_dir / "site.toml"
    assert runner.invoke(main, ["stations", str(site), "--out", str(out)]).exit_code == 0
    before = (out / "stations.csv").read_bytes()
    site.write_text(site.read_text().replace("unit_weight_pcf = 120\n", ""))
    res = runner.invoke(main, ["stations", str(site), "--out", str(out)])
    assert res.exit_code == 2 and "unit_weight_pcf" in res.output
    assert (out / "stations.csv").read_bytes() == before and not (site_dir / "out.prev").exists()


def test_help_carries_the_cautions(runner):
    res = runner.invoke(main, ["--help"])
    assert res.exit_code == 0 and "licensed professional engineer" in res.output
    assert "geotechnical investigation" in res.output


def test_init_starter_runs_unchanged(runner, tmp_path: Path):
    folder = tmp_path / "starter"
    assert runner.invoke(main, ["init", str(folder)]).exit_code == 0
    res = runner.invoke(main, ["stations", str(folder / "site.toml"), "--out",
                               str(folder / "out")])
    assert res.exit_code == 0, res.output
    again = runner.invoke(main, ["init", str(folder)])
    assert again.exit_code == 2 and "already holds" in again.output


def test_console_script_as_a_real_subprocess(tmp_path: Path):
    exe = Path(sys.executable).with_name("wallsched")
    if not exe.exists():  # installed elsewhere on PATH (CI installs into .venv)
        exe = Path(shutil.which("wallsched"))
    site = make_site(tmp_path)
    done = subprocess.run([str(exe), "stations", str(site), "--out", str(tmp_path / "o")],
                          capture_output=True, text=True, timeout=120)
    assert done.returncode == 0, done.stderr
    assert (tmp_path / "o" / "stations.csv").exists()
    bad = subprocess.run([str(exe), "stations", str(tmp_path / "none.toml"), "--out",
                          str(tmp_path / "x")], capture_output=True, text=True, timeout=120)
    assert bad.returncode == 2 and bad.stderr.count("\n") == 1 and "not found" in bad.stderr
    ver = subprocess.run([str(exe), "--version"], capture_output=True, text=True, timeout=60)
    assert ver.returncode == 0 and "wallsched, version" in ver.stdout
