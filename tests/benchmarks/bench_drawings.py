"""Benchmark of the drawings of one long wall (not part of the test run).

    .venv/bin/python tests/benchmarks/bench_drawings.py --length-ft 5000 --interval-ft 1

Builds the invented site of ``bench_pipeline.py`` with one wall, designs it in this process
(not timed), then times writing the wall's DXF sheet set and its design plots (best of
``--repeat`` runs each, wall clock and CPU) and prints one JSON object: stations, segments,
the entities in the DXF by type, and the seconds of each writer.
"""

from __future__ import annotations

import argparse
import json
import sys
import tempfile
import time
from collections import Counter
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))

from bench_pipeline import write_site  # noqa: E402


def _best(fn, repeat: int) -> tuple[float, float]:
    """The least wall-clock and the least CPU seconds of ``repeat`` calls (on a shared
    machine the CPU time is the steadier of the two)."""
    wall = cpu = float("inf")
    for _ in range(repeat):
        t0, c0 = time.perf_counter(), time.process_time()
        fn()
        wall = min(wall, time.perf_counter() - t0)
        cpu = min(cpu, time.process_time() - c0)
    return wall, cpu


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--length-ft", type=float, default=5000.0)
    ap.add_argument("--interval-ft", type=float, default=1.0)
    ap.add_argument("--seed", type=int, default=7)
    ap.add_argument("--repeat", type=int, default=3)
    args = ap.parse_args(argv)

    import ezdxf
    from wallsched.exporters.design_plots import write_design_plots
    from wallsched.exporters.dxf_elevation import write_elevation_dxf

    from wallsched.design import design_site
    from wallsched.pipeline import site_stations
    from wallsched.site import load_site

    with tempfile.TemporaryDirectory(prefix="wallsched-bench-dxf-") as tmp:
        folder = Path(tmp)
        stations = write_site(folder, 1, args.length_ft, args.interval_ft, args.seed)
        site = load_site(folder / "site.toml")
        t0 = time.perf_counter()
        sd = design_site(site, site_stations(site), audit=False)
        design_s = time.perf_counter() - t0
        wall = sd.walls[0]
        dxf = folder / "wall.dxf"
        dxf_s = _best(lambda: write_elevation_dxf(wall, dxf, input_hash="bench",
                                                  site_name="Benchmark site"), args.repeat)
        plots_s = _best(lambda: write_design_plots(wall, folder), args.repeat)
        doc = ezdxf.readfile(dxf)
        kinds = Counter(e.dxftype() for e in doc.modelspace())
        for name in doc.layout_names_in_taborder():
            if name != "Model":
                kinds.update(f"paper {e.dxftype()}" for e in doc.layouts.get(name))
        print(json.dumps({
            "length_ft": args.length_ft, "interval_ft": args.interval_ft, "stations": stations,
            "segments": len(wall.segments), "design_s (not timed as drawing)": round(design_s, 2),
            "dxf_s": round(dxf_s[0], 3), "dxf_cpu_s": round(dxf_s[1], 3),
            "dxf_kb": round(dxf.stat().st_size / 1024.0, 1),
            "plots_s": round(plots_s[0], 3), "plots_cpu_s": round(plots_s[1], 3),
            "sheets": len(doc.layout_names_in_taborder()) - 1,
            "entities": dict(sorted(kinds.items()))}))
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
