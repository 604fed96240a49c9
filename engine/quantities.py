"""Quantities per segment, wall and site, from the engine's segment geometry as-is.

Method (stated here so the estimator can check it by hand):

- **Concrete** = stem + footing + key prisms over the segment length. Stem: trapezoid
  (stem_top + stem_base)/2 wide and TW - TF high; with a sloped top the height is the average of
  the two ends (exact for a straight sloped top). Footing: B x thickness. Key: width x depth.
- **Formwork** (contact area): both stem faces (the battered face measured along its slope), the
  stem's two end bulkheads, both long footing edges and the footing's two end bulkheads; the
  key is cast neat against the soil of its trench, unformed (common practice; the sizing costs
  it so). Each segment is a separate pour with a bulkhead at each end (conservative).
- **Excavation** (only with existing ground): a trench from existing ground down to the bottom
  of footing, its floor the footing width plus ``working_room_ft`` each side (default 2 ft,
  common practice), its sides laid back at ``side_slope_h_per_v`` horizontal to 1 vertical
  (default 1.0: 1H:1V, OSHA 29 CFR 1926 Subpart P Appendix B, Type B soil, from memory; 0 for
  vertical sides), plus the key trench; nothing where existing ground lies below the bottom of
  footing. Cross-section d x (floor + slope x d) at depth d; integrated along the segment
  (existing ground is linear between stations). No trench-end slopes (the wall runs on).
- **Structural backfill** (only with existing ground): the excavation refilled less the concrete
  inside it, plus the fill placed above existing ground behind the stem (from the back face to
  the heel edge plus working room, up to the retained grade but not above the top of wall).
  Fill below the footing where existing ground lies below it is a geotechnical item, not counted.
- Without existing ground both are blank (NaN) and the ``earthwork_note`` column says why
  (:data:`NO_EARTHWORK`). The cost then counts the same trench dug from the front grade
  (:func:`excavation_for_cost_cy`), the finished grade standing in for the ground: an
  estimate, said so wherever the cost is printed.
- ``working_room_ft`` and ``trench_side_slope_h_per_v`` are keys of ``[criteria]`` (a wall may
  override them); :func:`earthwork_options` reads them with these defaults.
- **Steel** is the bar list's weight (engine/detailing.py).

1 CY = 27 cf.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np
import pandas as pd

from .detailing import steel_by_segment_lb, stem_height_avg_ft, top_of_wall_ends_ft, wall_bar_list
from .model import Segment, WallDesign

CF_PER_CY = 27.0
WORKING_ROOM_FT = 2.0  # each side of the footing, for forming and inspection (common practice)
SIDE_SLOPE_H_PER_V = 1.0  # 1H:1V (OSHA 29 CFR 1926 Subpart P App. B, Type B; from memory)
INTEGRATION_STEP_FT = 0.25
NO_EARTHWORK = "no existing ground given (existing_ground in [[walls]])"
# a segment's note where its earthwork is blank: why, and what its cost counts instead
EARTHWORK_NOTE = (f"{NO_EARTHWORK}; excavation and backfill not computed, the cost counts the "
                  "trench dug from the front grade (an estimate)")

QUANTITY_COLUMNS = ["wall", "segment", "mark", "station_start_ft", "station_end_ft", "length_ft",
                    "stem_cy", "footing_cy", "key_cy", "concrete_cy", "steel_lb", "formwork_sf",
                    "excavation_cy", "backfill_cy", "earthwork_note"]


def earthwork_options(criteria=None) -> dict[str, float]:
    """The trench of the earthwork quantities from a wall's criteria (defaults where absent):
    keyword arguments of :func:`segment_quantities` and :func:`wall_quantities`."""
    c = criteria or {}
    room = c.get("working_room_ft")
    slope = c.get("trench_side_slope_h_per_v")
    return {"working_room_ft": WORKING_ROOM_FT if room is None else float(room),
            "side_slope_h_per_v": SIDE_SLOPE_H_PER_V if slope is None else float(slope)}


@dataclass(frozen=True)
class SegmentQuantities:
    stem_cy: float
    footing_cy: float
    key_cy: float
    formwork_sf: float
    excavation_cy: float  # NaN without existing ground
    backfill_cy: float  # NaN without existing ground

    @property
    def concrete_cy(self) -> float:
        return self.stem_cy + self.footing_cy + self.key_cy


def _trapezoid(y: np.ndarray, x: np.ndarray) -> float:
    return float(np.sum((y[1:] + y[:-1]) * np.diff(x)) / 2.0)


def _station_grid(stations, a: float, b: float) -> np.ndarray:
    n = max(int(math.ceil((b - a) / INTEGRATION_STEP_FT)), 1)
    grid = np.linspace(a, b, n + 1)
    st = np.asarray(stations.station_ft, dtype=float)
    inside = st[(st > a) & (st < b)]
    return np.unique(np.concatenate([grid, inside]))


def concrete_cf(seg: Segment) -> tuple[float, float, float]:
    """(stem, footing, key) concrete volumes in cf."""
    sec = seg.section
    if sec is None:
        return 0.0, 0.0, 0.0
    length = seg.length_ft
    h = stem_height_avg_ft(seg)
    stem = (sec.stem_top_in + sec.stem_base_in) / 2.0 / 12.0 * h * length  # trapezoid prism
    footing = sec.footing_width_ft * sec.footing_thickness_in / 12.0 * length  # rectangle prism
    key = (sec.key_width_in * sec.key_depth_in / 144.0 * length) if sec.has_key else 0.0
    return stem, footing, key


def formwork_sf(seg: Segment) -> float:
    """Contact area of forms for one segment (see the module docstring)."""
    sec = seg.section
    if sec is None:
        return 0.0
    length = seg.length_ft
    h = stem_height_avg_ft(seg)
    batter_ft = (sec.stem_base_in - sec.stem_top_in) / 12.0
    vertical_face = h * length
    battered_face = math.hypot(h, batter_ft) * length
    stem_ends = 2.0 * (sec.stem_top_in + sec.stem_base_in) / 2.0 / 12.0 * h
    t_ft = sec.footing_thickness_in / 12.0
    footing_edges = 2.0 * t_ft * length
    footing_ends = 2.0 * sec.footing_width_ft * t_ft
    return vertical_face + battered_face + stem_ends + footing_edges + footing_ends


def _earthwork_cf(seg: Segment, stations, working_room_ft: float,
                  side_slope_h_per_v: float = SIDE_SLOPE_H_PER_V,
                  ground_ft=None) -> tuple[float, float]:
    """(excavation, backfill) in cf from the existing ground (or ``ground_ft``, a surface
    per station)."""
    sec = seg.section
    st = np.asarray(stations.station_ft, dtype=float)
    eg_all = np.asarray(stations.existing_ground_ft if ground_ft is None else ground_ft,
                        dtype=float)
    if sec is None or np.isnan(eg_all).all():
        return math.nan, math.nan
    a, b = seg.station_start_ft, seg.station_end_ft
    ok = np.isfinite(eg_all)
    s = _station_grid(stations, a, b)
    eg = np.interp(s, st[ok], eg_all[ok])
    rg = np.interp(s, st, np.asarray(stations.retained_grade_ft, dtype=float))
    tw_a, tw_b = top_of_wall_ends_ft(seg)
    tw = tw_a + (tw_b - tw_a) * (s - a) / max(b - a, 1e-12)
    tf, bf = seg.top_of_footing_ft, seg.bottom_of_footing_ft
    t_ft = sec.footing_thickness_in / 12.0
    width = sec.footing_width_ft
    key_area = sec.key_width_in * sec.key_depth_in / 144.0 if sec.has_key else 0.0
    top_w, base_w = sec.stem_top_in / 12.0, sec.stem_base_in / 12.0
    h = np.maximum(tw - tf, 1e-9)

    depth = np.maximum(eg - bf, 0.0)
    cut = depth * (width + 2.0 * working_room_ft + side_slope_h_per_v * depth) + key_area
    # concrete inside the cut: footing, key, and the stem below existing ground
    y_stem = np.clip(eg - tf, 0.0, h)  # stem height below existing ground
    stem_below = base_w * y_stem - (base_w - top_w) * y_stem**2 / (2.0 * h)
    concrete_in_cut = width * np.clip(eg - bf, 0.0, t_ft) + key_area + stem_below
    # fill above existing ground behind the stem, up to the retained grade (not above TW)
    y0 = np.clip(eg - tf, 0.0, h)
    y1 = np.clip(rg - tf, 0.0, h)
    y1 = np.maximum(y1, y0)
    batter_back = (base_w - top_w) if sec.batter_face == "back" else 0.0
    # width behind the back face at height y: heel + working room + batter * y/h
    fill_above = (sec.heel_ft + working_room_ft) * (y1 - y0) + batter_back / h * (y1**2 - y0**2) / 2
    excavation = _trapezoid(cut, s)
    backfill = _trapezoid(cut - concrete_in_cut + fill_above, s)
    return excavation, backfill


def segment_quantities(seg: Segment, stations=None, *,
                       working_room_ft: float = WORKING_ROOM_FT,
                       side_slope_h_per_v: float = SIDE_SLOPE_H_PER_V) -> SegmentQuantities:
    """Concrete, formwork and (with ``stations`` holding existing ground) earthwork quantities."""
    stem, footing, key = concrete_cf(seg)
    exc, bkf = (math.nan, math.nan) if stations is None else _earthwork_cf(
        seg, stations, working_room_ft, side_slope_h_per_v)
    return SegmentQuantities(stem_cy=stem / CF_PER_CY, footing_cy=footing / CF_PER_CY,
                             key_cy=key / CF_PER_CY, formwork_sf=formwork_sf(seg),
                             excavation_cy=exc / CF_PER_CY, backfill_cy=bkf / CF_PER_CY)


def excavation_for_cost_cy(seg: Segment, stations, *,
                           working_room_ft: float = WORKING_ROOM_FT,
                           side_slope_h_per_v: float = SIDE_SLOPE_H_PER_V) -> float:
    """The excavation a segment's cost counts, CY: the takeoff's (``seg.excavation_cy``) when
    existing ground is given; otherwise the same trench dug from the front grade (an estimate:
    the finished grade in front of the wall stands in for the ground). NaN without a section."""
    if seg.section is None:
        return math.nan
    if math.isfinite(seg.excavation_cy):
        return seg.excavation_cy
    exc, _ = _earthwork_cf(seg, stations, working_room_ft, side_slope_h_per_v,
                           ground_ft=stations.front_grade_ft)
    return exc / CF_PER_CY


def wall_quantities(design: WallDesign, bars: pd.DataFrame | None = None, *,
                    working_room_ft: float = WORKING_ROOM_FT,
                    side_slope_h_per_v: float = SIDE_SLOPE_H_PER_V, **bar_kw) -> pd.DataFrame:
    """One row per segment (:data:`QUANTITY_COLUMNS`); steel from ``bars`` (or a new bar list)."""
    if bars is None:
        bars = wall_bar_list(design, **bar_kw)
    steel = steel_by_segment_lb(bars[bars["wall"] == design.wall] if len(bars) else bars)
    rows = []
    for seg in design.segments:
        q = segment_quantities(seg, design.stations, working_room_ft=working_room_ft,
                               side_slope_h_per_v=side_slope_h_per_v)
        rows.append({"wall": seg.wall, "segment": seg.segment, "mark": seg.mark,
                     "station_start_ft": seg.station_start_ft,
                     "station_end_ft": seg.station_end_ft, "length_ft": seg.length_ft,
                     "stem_cy": q.stem_cy, "footing_cy": q.footing_cy, "key_cy": q.key_cy,
                     "concrete_cy": q.concrete_cy, "steel_lb": steel.get(seg.segment, 0.0),
                     "formwork_sf": q.formwork_sf, "excavation_cy": q.excavation_cy,
                     "backfill_cy": q.backfill_cy,
                     "earthwork_note": "" if math.isfinite(q.excavation_cy) or seg.section is None
                     else EARTHWORK_NOTE})
    return pd.DataFrame(rows, columns=QUANTITY_COLUMNS)


def quantity_totals(frame: pd.DataFrame) -> pd.DataFrame:
    """Sums per wall and for the site (``wall="SITE"``); NaN earthwork stays NaN only if all are,
    and ``earthwork_note`` says which walls had no existing ground."""
    cols = ["length_ft", "stem_cy", "footing_cy", "key_cy", "concrete_cy", "steel_lb",
            "formwork_sf", "excavation_cy", "backfill_cy"]
    def note(g) -> str:
        blank = g.loc[g["excavation_cy"].isna() & (g["concrete_cy"] > 0), "wall"].unique()
        if not len(blank):
            return ""
        if len(blank) == g.loc[g["concrete_cy"] > 0, "wall"].nunique():
            return NO_EARTHWORK
        return (f"excavation and backfill of the walls with existing ground only; "
                f"{NO_EARTHWORK} for {', '.join(map(str, blank))}")

    out = []
    for wall, g in frame.groupby("wall", sort=False):
        out.append({"wall": wall, **{c: float(g[c].sum(min_count=1)) for c in cols},
                    "earthwork_note": note(g)})
    out.append({"wall": "SITE", **{c: float(frame[c].sum(min_count=1)) for c in cols},
                "earthwork_note": note(frame)})
    return pd.DataFrame(out, columns=["wall", *cols, "earthwork_note"])


def with_quantities(design: WallDesign, bars: pd.DataFrame | None = None, *,
                    working_room_ft: float = WORKING_ROOM_FT,
                    side_slope_h_per_v: float = SIDE_SLOPE_H_PER_V, **bar_kw) -> WallDesign:
    """The design with every segment's concrete_cy, steel_lb, formwork_sf, excavation_cy and
    backfill_cy filled from these quantities and the bar list."""
    q = wall_quantities(design, bars, working_room_ft=working_room_ft,
                        side_slope_h_per_v=side_slope_h_per_v, **bar_kw)
    return apply_quantities(design, q)


def apply_quantities(design: WallDesign, q: pd.DataFrame) -> WallDesign:
    """The design with every segment's quantities taken from the frame ``q``
    (:func:`wall_quantities` of it)."""
    by_id = {r.segment: r for r in q.itertuples(index=False)}
    segs = tuple(replace(s, concrete_cy=by_id[s.segment].concrete_cy,
                         steel_lb=by_id[s.segment].steel_lb,
                         formwork_sf=by_id[s.segment].formwork_sf,
                         excavation_cy=by_id[s.segment].excavation_cy,
                         backfill_cy=by_id[s.segment].backfill_cy) for s in design.segments)
    return replace(design, segments=segs)
