"""Resources estimated before a design allocates them; a run over the budget is refused.

``wallsched design`` needs memory for two things that grow faster than the stations:

- the least-cost search over the ``[sizing]`` grid (``engine/sizing.py``): about
  ``BYTES_PER_GEOMETRY`` per candidate geometry (toes x heels x footings x stems x key
  depths), measured
  as the growth of the peak RSS of a design between the default grid (1.1 million geometries)
  and grids of 10 and 20 million (about 75 bytes each), plus the per-height bar tables;
- the segments' recursion (``engine/segments.py``): its state arrays hold every station x
  every number of stations a segment may span x every footing lowering, and each block of
  stations compares every pair of states, a block x span^2 x lowering^2 temporaries; the
  groups of walls planned side by side in worker processes each need their own.

Both are estimated from the sampled stations and the grid, before anything is allocated, and
a run whose estimate exceeds ``[sizing] memory_budget_gb`` (default 2 GB) is refused with
one line naming what is too large and how to change it. The recursion plans the walls of a
batch together with their footings at the highest level (one lowering), and a wall whose
ground is too steep for that alone again with ``LOWERINGS_STEEP`` lowerings
(``engine.segments._plan_batch``); the estimate is the larger of the two passes, so it bounds
the run whatever the ground.
"""

from __future__ import annotations

import numpy as np

from .engine.segments import BATCH_STATIONS, LOWERINGS_STEEP, boundary_stations
from .errors import InputError

BYTES_PER_GEOMETRY = 80  # measured (see above), rounded up
BASE_BYTES = 0.3e9  # the interpreter, numpy/pandas/shapely, the stations and the results
PAIR_BYTES = 34  # per pair of states in a block: the differences, masks, penalties, sums


def state_bytes(lowerings: int) -> int:
    """Bytes per state [j, k] of the recursion with ``lowerings`` footing levels."""
    return 8 * (2 + 3 * lowerings) + 4 * 8 * lowerings + 9
GB = 1e9


def span_and_block(station_ft: np.ndarray, segment_min_ft: float, segment_max_ft: float
                   ) -> tuple[int, int]:
    """(states per station: the most stations one segment may span + 1, the block: the
    fewest stations any segment spans) of a run of stations."""
    s = np.asarray(station_ft, float)
    if s.size < 2:
        return 2, 1
    total = s[-1] - s[0]
    seg_max = max(segment_max_ft, min(total, segment_min_ft))
    idx = np.arange(s.size)
    first = np.searchsorted(s, s - seg_max - 1e-9, side="left")
    span = max(1, int(np.max(idx - first)))
    last_before = np.searchsorted(s, s - segment_min_ft + 1e-9, side="right") - 1
    k = (idx - last_before)[last_before >= 0]
    block = max(1, int(k.min())) if k.size else 1
    return span + 1, block


def segmenting_bytes(walls: list[tuple[int, int, int]]) -> float:
    """Peak bytes of the segments' recursion for walls given as (stations, states per
    station, block); the walls are solved together in batches of ``BATCH_STATIONS``."""
    if not walls:
        return 0.0
    n_max = max(n for n, _, _ in walls)
    k1 = max(k for _, k, _ in walls)
    block = min(b for _, _, b in walls)
    together = max(1, min(len(walls), BATCH_STATIONS // max(n_max, 1)))

    def one_pass(runs: int, lowerings: int) -> float:
        states = float(runs * n_max * k1)
        pairs = float(runs * block * k1 * k1 * lowerings ** 2)
        return states * state_bytes(lowerings) + pairs * PAIR_BYTES

    # the batch at the highest footings; a wall on steep ground again, alone
    return max(one_pass(together, 1), one_pass(1, LOWERINGS_STEEP))


def parallel_segmenting_bytes(walls: list[tuple[int, int, int]]) -> float:
    """:func:`segmenting_bytes` of the groups of walls the design plans side by side in
    worker processes (``wallsched.design``: up to ``2 x workers`` groups of neighbouring
    walls, ``workers`` at a time): the sum over the largest groups that run together."""
    from .engine.site_design import work_groups  # the design's own grouping
    from .parallel import worker_count

    if not walls:
        return 0.0
    workers = worker_count(len(walls))
    groups = work_groups(walls, 1 if workers <= 1 else 2 * workers)
    each = sorted((segmenting_bytes(g) for g in groups), reverse=True)
    return float(sum(each[:max(1, workers)]))


def sizing_bytes(sizing) -> tuple[float, int]:
    """(peak bytes, candidate geometries) of the least-cost search over the grid."""
    from .engine.sizing import SizingGrid

    g = SizingGrid.from_table(sizing)
    nt, nh = g.toe_ft.size, g.heel_ft.size
    n_t, n_s = g.footing_thickness_in.size, g.stem_base_in.size
    geometries = nt * nh * n_t * n_s * g.key_depth_in.size
    bars = g.bar_sizes.size * g.bar_spacings_in.size
    tables = 8.0 * 4 * (n_s * n_t + nh * n_t + nt * n_t) * bars
    return BYTES_PER_GEOMETRY * float(geometries) + tables, geometries


def check_budget(site, walls) -> float:
    """Refuse (InputError) a design estimated to need more than the budget; returns the
    estimate in bytes. ``walls``: the sampled ``WallStations``, in site-file order."""
    budget_gb = float(site.sizing.get("memory_budget_gb") or 2.0)
    budget = budget_gb * GB
    file = site.path.name
    key = f"[sizing] memory_budget_gb = {budget_gb:g}"
    grid, geometries = sizing_bytes(site.sizing)
    if BASE_BYTES + grid > budget:
        raise InputError(
            f"the [sizing] grid has {geometries:,} candidate geometries, about "
            f"{grid / GB:,.1f} GB to search; the limit is {key} - coarsen the grid "
            "(toe_heel_step_in, footing_thickness_step_in, stem_step_in) or narrow its "
            "ranges, or raise memory_budget_gb where the machine has the memory",
            file=file, where="[sizing]")
    shapes = []
    worst = None
    for spec, ws in zip(site.walls, walls, strict=True):
        c = spec.criteria
        # the recursion runs over the candidate segment ends (engine.segments: stations at
        # least BOUNDARY_GRID_FT apart), not over every station
        ends = np.asarray(ws.station_ft, float)
        ends = ends[boundary_stations(ends)] if ends.size else ends
        k1, block = span_and_block(ends, c["segment_min_ft"], c["segment_max_ft"])
        shapes.append((int(ends.size), k1, block))
        one = segmenting_bytes([shapes[-1]])
        if worst is None or one > worst[0]:
            worst = (one, spec, k1, len(ws))
    seg = parallel_segmenting_bytes(shapes)
    total = BASE_BYTES + max(grid, seg)
    if total > budget:
        _, spec, k1, n = worst
        c = spec.criteria
        raise InputError(
            f"wall {spec.id!r}: planning its segments would need about {seg / GB:,.1f} GB "
            f"({n:,} stations, a segment may span {k1 - 1:,} of them: station_interval_ft "
            f"{c['station_interval_ft']:g} and the grade breaks, segment_max_ft "
            f"{c['segment_max_ft']:g}); the limit is {key} - raise station_interval_ft, thin "
            "the grade points, or lower segment_max_ft (or raise memory_budget_gb where the "
            "machine has the memory)", file=file, where=f"walls[{spec.index + 1}]")
    return total
