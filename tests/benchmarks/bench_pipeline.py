"""Benchmark of the whole job, end to end (not part of the test run).

    .venv/bin/python tests/benchmarks/bench_pipeline.py --walls 20 --length-ft 5000 --interval-ft 1

Builds an invented site in a temporary folder (``--walls`` straight walls of ``--length-ft``,
retained heights from a seeded, bounded random walk between 1 and 16 ft), runs
``wallsched design`` on it as a user would (a child process, every output written), and prints
one JSON object: the number of walls and stations, the time of each stage as the pipeline
reports it (``WALLSCHED_STAGE_TIMES``), the wall time end to end, stations per second end to
end, the child's peak RSS and its exit code.

Other shapes of site: ``--walls 2 --length-ft 50000`` (few long walls), ``--walls 400
--length-ft 250`` (many short ones).
"""

from __future__ import annotations

import argparse
import json
import os
import resource
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

SITE_HEAD = """\
# Invented benchmark site: every value is illustrative, not from a geotechnical report.
[site]
name = "Benchmark site (invented)"

[soil]
source = "illustrative values for a benchmark; not from a geotechnical report"
unit_weight_pcf = 120
active_efp_pcf = 35
passive_efp_pcf = 300
friction_coefficient = 0.40
allowable_bearing_psf = 3000

[loads]
surcharge_psf = 250

[materials]
fc_psi = 4000
fy_psi = 60000

[criteria]
fs_overturning = 1.5
fs_sliding = 1.5
min_embedment_ft = 2.0
station_interval_ft = {interval}
"""

WALL = """
[[walls]]
id = "B{i:03d}"
retained_side = "left"
alignment = "b{i:03d}-alignment.csv"
retained_grade = "b{i:03d}-top.csv"
front_grade = "b{i:03d}-bottom.csv"
"""


def write_site(folder: Path, walls: int, length_ft: float, interval_ft: float,
               seed: int) -> int:
    """Write the site file and its CSVs into ``folder``; return the number of stations."""
    rng = np.random.default_rng(seed)
    text = SITE_HEAD.format(interval=interval_ft)
    n_vertex = max(int(length_ft // 25.0), 2)  # a grade break every 25 ft
    stations = 0
    for i in range(walls):
        y0 = 200.0 * i
        (folder / f"b{i:03d}-alignment.csv").write_text(
            f"x,y\n1000.0,{y0 + 1000.0:.2f}\n{1000.0 + length_ft:.2f},{y0 + 1000.0:.2f}\n")
        s = np.linspace(0.0, length_ft, n_vertex + 1)
        fg = 300.0 + np.cumsum(rng.normal(0.0, 0.08, s.size)) - 0.005 * s
        h = np.clip(8.0 + np.cumsum(rng.normal(0.0, 0.6, s.size)), 1.0, 16.0)
        rows = zip(s, fg, fg + h, strict=True)
        bottom, top = "station,elevation\n", "station,elevation\n"
        for a, b, t in rows:
            bottom += f"{a:.2f},{b:.3f}\n"
            top += f"{a:.2f},{t:.3f}\n"
        (folder / f"b{i:03d}-bottom.csv").write_text(bottom)
        (folder / f"b{i:03d}-top.csv").write_text(top)
        text += WALL.format(i=i)
        stations += int(length_ft // interval_ft) + 1
    (folder / "site.toml").write_text(text)
    return stations


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--walls", type=int, default=20)
    ap.add_argument("--length-ft", type=float, default=5000.0)
    ap.add_argument("--interval-ft", type=float, default=1.0)
    ap.add_argument("--seed", type=int, default=7)
    ap.add_argument("--keep", type=Path, default=None,
                    help="build the site in this folder and keep it (default: a temporary one)")
    args = ap.parse_args(argv)

    exe = Path(sys.executable).with_name("wallsched")
    with tempfile.TemporaryDirectory(prefix="wallsched-bench-") as tmp:
        folder = args.keep or Path(tmp)
        folder.mkdir(parents=True, exist_ok=True)
        stations = write_site(folder, args.walls, args.length_ft, args.interval_ft, args.seed)
        times_path = Path(tmp) / "stage-times.json"
        env = dict(os.environ, WALLSCHED_STAGE_TIMES=str(times_path))
        t0 = time.perf_counter()
        proc = subprocess.run([str(exe), "design", str(folder / "site.toml"),
                               "--out", str(folder / "out"), "--replace", "--quiet"],
                              env=env, capture_output=True, text=True)
        wall_s = time.perf_counter() - t0
        peak_kb = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss
        stages = json.loads(times_path.read_text()) if times_path.is_file() else {}
    result = {
        "walls": args.walls, "stations": stations, "interval_ft": args.interval_ft,
        "stages_s": {k: round(v, 3) for k, v in stages.items()},
        "end_to_end_s": round(wall_s, 3),
        "stations_per_s": round(stations / wall_s, 1),
        "peak_rss_mb": round(peak_kb / 1024.0, 1),
        "exit_code": proc.returncode,
    }
    if proc.returncode not in (0, 3):
        result["stderr_tail"] = proc.stderr.strip().splitlines()[-3:]
    print(json.dumps(result))
    return 0 if proc.returncode in (0, 3) else 1


if __name__ == "__main__":
    raise SystemExit(main())
