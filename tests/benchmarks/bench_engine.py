"""Benchmark of the engine (not part of the test run).

    .venv/bin/python tests/benchmarks/bench_engine.py --stations 100000

Generates an invented site of N stations (walls of at most 2,000 stations at 5 ft, grades
from a seeded random walk), then times

- ``single_pass_s``: one vectorized pass of every check over N given sections;
- ``sizing_s``: the least-cost sizing of every station (the design table and its look-up);
- ``segmenting_s``: the least-cost segments of every wall;

and prints one JSON line with ``stations, single_pass_s, sizing_s, segmenting_s,
stations_per_s, ratio_sizing_to_single_pass, peak_rss_mb``.
"""

from __future__ import annotations

import argparse
import json
import resource
import sys
import time

import numpy as np


def invented_site(n: int, seed: int = 7, per_wall: int = 2000):
    """Walls of grades: retained height 1-16 ft by a bounded random walk, gentle fall."""
    rng = np.random.default_rng(seed)
    walls = []
    left = n
    while left > 0:
        m = min(per_wall, left)
        s = 5.0 * np.arange(m)
        fg = 300 + np.cumsum(rng.normal(0, 0.05, m)) - 0.01 * s
        h = np.clip(8 + np.cumsum(rng.normal(0, 0.15, m)), 1.0, 16.0)
        walls.append((s, fg + h, fg))
        left -= m
    return walls


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--stations", type=int, default=100_000)
    ap.add_argument("--seed", type=int, default=7)
    args = ap.parse_args(argv)

    from wallsched.engine.checks import check_section
    from wallsched.engine.section import DesignInputs
    from wallsched.engine.segments import plan_segments, plan_segments_many
    from wallsched.engine.sizing import CostRates, SizingGrid, design_table
    from wallsched.engine.wall_design import reinforcement, segment_rules, station_geometry

    from wallsched.keys import CRITERIA_KEYS

    crit = {k: v.default for k, v in CRITERIA_KEYS.items()}
    crit["min_embedment_ft"] = 2.0
    inputs = DesignInputs.of(unit_weight_pcf=120, friction_coefficient=0.40,
                          allowable_bearing_psf=3000, active_efp_pcf=35, passive_efp_pcf=300,
                          surcharge_psf=250, min_embedment_ft=2.0)
    walls = invented_site(args.stations, args.seed)
    n = sum(w[0].size for w in walls)
    rates = CostRates()
    grid = SizingGrid.from_table({})

    # warm-up (imports and first calls), not timed
    tiny = SizingGrid.from_table({"toe_max_ft": 1.0, "heel_max_ft": 2.0,
                                  "footing_thickness_max_in": 14.0, "stem_max_in": 9.0})
    design_table(inputs, tiny, rates, max_height_ft=2.0, increment_ft=1.0, embedment_ft=2.0,
                 freeboard_ft=crit["freeboard_ft"])
    plan_segments(walls[0][0][:50], walls[0][1][:50], walls[0][2][:50], segment_rules(crit, rates),
                  lambda h: np.full(np.shape(h), 100.0))

    # sizing: the design table for the heights the site needs, then every station's look-up
    t0 = time.perf_counter()
    from wallsched.engine.site_design import needed_height_ft
    from wallsched.profile.sampling import WallStations

    need = max(needed_height_ft(WallStations("B", s, s, s, rg, fg, np.full(s.size, np.nan),
                                             np.zeros(s.size, bool)), crit)
               for s, rg, fg in walls)
    table = design_table(inputs, grid, rates, max_height_ft=need,
                         increment_ft=crit["design_height_increment_ft"], embedment_ft=2.0,
                         freeboard_ft=crit["freeboard_ft"])
    h_all = np.concatenate([rg - fg for _, rg, fg in walls])
    rows = table.index(h_all)
    sizing_s = time.perf_counter() - t0

    # one vectorized pass of all checks over N given sections (the stations' own)
    secs = [c.section for c in table.choices]
    secs = [sec if sec is not None else secs[0] for sec in secs]  # rows no station uses
    pick = np.maximum(rows, 0)

    def col(attr):
        return np.array([getattr(sec, attr) for sec in secs])[pick]

    from wallsched.engine.section import BarArrays, Reinforcement, SectionGeometry

    def bars(attr):
        size = np.array([getattr(sec, attr).size for sec in secs])[pick]
        sp = np.array([getattr(sec, attr).spacing_in for sec in secs])[pick]
        return BarArrays(size, sp)

    geo = SectionGeometry(retained_height_ft=h_all, embedment_ft=table.embedment_of(h_all),
                          footing_thickness_in=col("footing_thickness_in"),
                          stem_top_in=col("stem_top_in"), stem_base_in=col("stem_base_in"),
                          toe_ft=col("toe_ft"), heel_ft=col("heel_ft"),
                          key_width_in=col("key_width_in"), key_depth_in=col("key_depth_in"),
                          key_offset_ft=col("key_offset_ft"),
                          freeboard_ft=crit["freeboard_ft"])
    reinf = Reinforcement(stem=bars("stem_bars"), heel=bars("heel_bars"), toe=bars("toe_bars"),
                          horizontal=bars("horizontal_bars"),
                          longitudinal=bars("footing_long_bars"),
                          heel_hooked=col("heel_hooked"), toe_hooked=col("toe_hooked"))
    t0 = time.perf_counter()
    res = check_section(geo, inputs, reinf)
    single_pass_s = time.perf_counter() - t0
    assert bool(np.all(res.passes)), "a sized station fails its own checks"

    rules = segment_rules(crit, rates)
    t0 = time.perf_counter()
    # as the pipeline does: the walls of one design table and set of rules together
    plans = plan_segments_many(walls, rules, table.cost_per_ft, table.embedment_of)
    n_segments = sum(len(p) for p in plans)
    segmenting_s = time.perf_counter() - t0
    del station_geometry, reinforcement

    peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0
    out = {
        "stations": int(n), "walls": len(walls), "segments": n_segments,
        "single_pass_s": round(single_pass_s, 4), "sizing_s": round(sizing_s, 4),
        "segmenting_s": round(segmenting_s, 4),
        "stations_per_s": round(n / (sizing_s + segmenting_s), 1),
        "ratio_sizing_to_single_pass": round(sizing_s / single_pass_s, 2),
        "peak_rss_mb": round(peak, 1),
    }
    print(json.dumps(out))
    return 0


if __name__ == "__main__":
    sys.exit(main())
