"""The governing case of every section mark: the mark checked at the station of the largest
check ratio of its most-utilised segment (a failing segment first), with the weights, the
thrust and every check behind the numbers, for the calc package to print as-is."""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence

import numpy as np

from .checks import check_section
from .model import GoverningCase, Segment, WallDesign
from .pressure import design_thrust, earth_pressure
from .section import DesignInputs, section_weights
from .strength import heel_loads_psf
from .wall_design import reinforcement, station_geometry


def mark_segments(walls: Sequence[WallDesign]) -> dict[str, list[tuple[str, Segment]]]:
    """Section mark -> [(wall id, segment)], marks in their natural order (A..Z, AA..)."""
    out: dict[str, list] = {}
    for w in walls:
        for s in w.segments:
            if s.section is not None and s.mark:
                out.setdefault(s.mark, []).append((w.wall, s))
    return dict(sorted(out.items(), key=lambda kv: (len(kv[0]), kv[0])))


def _worst(segs):
    """The segment a mark is written up at: a failing one first, then the largest stability
    or strength ratio, then the tallest."""
    def key(ws):
        s = ws[1]
        u = s.utilization_max if not s.ok else s.governing_ratio
        return (0 if s.ok else 1, round(u, 9) if math.isfinite(u) else math.inf,
                s.retained_height_max_ft)

    return max(segs, key=key)


def governing_case(mark: str, segs, walls: Sequence[WallDesign], inputs: DesignInputs,
                   criteria: Mapping) -> GoverningCase:
    """``mark`` checked at its governing station (``segs``: its (wall id, segment) pairs;
    ``inputs`` and ``criteria``: those of the wall of its most-utilised segment)."""
    wall_id, seg = _worst(segs)
    ws = next(x for x in walls if x.wall == wall_id).stations
    st = np.asarray(ws.station_ft, float)
    target = seg.governing_station_ft if math.isfinite(seg.governing_station_ft) else \
        seg.station_start_ft
    k = int(np.argmin(np.abs(st - target)))
    rg, fg = float(ws.retained_grade_ft[k]), float(ws.front_grade_ft[k])
    c = criteria
    tw = seg.top_of_wall_ft if c["top_of_wall"] == "stepped" else rg + c["freeboard_ft"]
    geom = station_geometry(seg.section, np.float64(rg - fg),
                            np.float64(fg - seg.bottom_of_footing_ft), np.float64(tw - rg))
    return GoverningCase(
        mark=mark, wall=wall_id, segment=seg, station_ft=float(st[k]), retained_grade_ft=rg,
        front_grade_ft=fg, top_of_wall_ft=float(tw), geometry=geom, inputs=inputs,
        checks=check_section(geom, inputs, reinforcement(seg.section)),
        weights=section_weights(geom, inputs),
        thrust=design_thrust(geom, inputs, earth_pressure(inputs)),
        heel_load_psf=float(heel_loads_psf(geom, inputs)), segments=tuple(segs))


def governing_cases(walls: Sequence[WallDesign], inputs: Mapping[str, DesignInputs],
                    criteria: Mapping[str, Mapping]) -> dict[str, GoverningCase]:
    """Section mark -> its governing case, marks in their natural order."""
    out = {}
    for mark, segs in mark_segments(walls).items():
        wall_id = _worst(segs)[0]
        out[mark] = governing_case(mark, segs, walls, inputs[wall_id], criteria[wall_id])
    return out
