"""An invented designed wall, built by hand, for the exporter and quantity tests.

Wall W1: 180 ft, three segments, two section marks (A twice, B once with a shear key), a step in
the footing and the top at each segment boundary, a sloped top on the last segment, contraction
and expansion joints, existing ground given. All numbers are invented.
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np
from wallsched.engine.bars import BarSpec
from wallsched.engine.bending import bending_schedule
from wallsched.engine.detailing import section_detail, wall_bar_list
from wallsched.engine.model import Joint, SectionDims, Segment, WallDesign
from wallsched.engine.quantities import wall_quantities
from wallsched.profile.sampling import WallStations

SECTION_A = SectionDims(
    stem_top_in=12.0, stem_base_in=12.0, footing_thickness_in=15.0, toe_ft=2.0, heel_ft=3.5,
    stem_bars=BarSpec(5, 12.0), heel_bars=BarSpec(5, 12.0), toe_bars=BarSpec(4, 12.0),
    horizontal_bars=BarSpec(4, 12.0), footing_long_bars=BarSpec(4, 12.0))

SECTION_B = SectionDims(
    stem_top_in=12.0, stem_base_in=16.0, footing_thickness_in=18.0, toe_ft=3.0, heel_ft=5.0,
    key_width_in=12.0, key_depth_in=12.0, key_offset_ft=4.0,
    stem_bars=BarSpec(6, 8.0), heel_bars=BarSpec(6, 10.0), toe_bars=BarSpec(5, 12.0),
    horizontal_bars=BarSpec(4, 12.0), footing_long_bars=BarSpec(5, 12.0))


def _segments(wall: str) -> tuple[Segment, ...]:
    return (
        Segment(wall=wall, segment=f"{wall}-01", mark="A", station_start_ft=100.0,
                station_end_ft=160.0, retained_height_max_ft=5.2, top_of_wall_ft=104.0,
                top_of_footing_ft=98.0, bottom_of_footing_ft=96.75, section=SECTION_A,
                design_height_ft=5.5, fs_overturning=2.1, fs_sliding=1.6, q_max_psf=1450.0,
                utilization_max=0.82, governing_check="sliding", governing_station_ft=155.0),
        Segment(wall=wall, segment=f"{wall}-02", mark="B", station_start_ft=160.0,
                station_end_ft=230.0, retained_height_max_ft=9.1, top_of_wall_ft=108.0,
                top_of_footing_ft=97.0, bottom_of_footing_ft=95.5, section=SECTION_B,
                design_height_ft=9.5, fs_overturning=1.9, fs_sliding=1.52, q_max_psf=2210.0,
                utilization_max=0.97, governing_check="sliding", governing_station_ft=200.0),
        Segment(wall=wall, segment=f"{wall}-03", mark="A", station_start_ft=230.0,
                station_end_ft=280.0, retained_height_max_ft=5.0, top_of_wall_ft=math.nan,
                top_of_footing_ft=98.5, bottom_of_footing_ft=97.25, section=SECTION_A,
                design_height_ft=5.5, fs_overturning=2.3, fs_sliding=1.7, q_max_psf=1320.0,
                utilization_max=0.78, governing_check="stem flexure", governing_station_ft=232.0,
                top_of_wall_start_ft=105.5, top_of_wall_end_ft=103.0),
    )


def _grades(st: np.ndarray):
    # invented profiles: front grade gently falling, retained grade rising to a crest
    front = np.interp(st, [100, 180, 230, 280], [99.2, 98.8, 98.6, 99.6])
    retained = np.interp(st, [100, 150, 200, 230, 280], [103.2, 103.8, 107.4, 105.0, 102.6])
    existing = np.interp(st, [100, 200, 280], [101.0, 102.5, 100.5])
    return retained, front, existing


def make_design(wall: str = "W1", *, existing_ground: bool = True) -> WallDesign:
    st = np.arange(100.0, 280.0 + 1e-9, 5.0)
    retained, front, existing = _grades(st)
    if not existing_ground:
        existing = np.full_like(st, np.nan)
    stations = WallStations(wall=wall, station_ft=st, x=st - 100.0, y=np.zeros_like(st),
                            retained_grade_ft=retained, front_grade_ft=front,
                            existing_ground_ft=existing, is_break=np.zeros(st.size, bool))
    segs = _segments(wall)
    idx = np.searchsorted([s.station_end_ft for s in segs], st, side="left")
    idx = np.minimum(idx, len(segs) - 1)
    util = np.array([segs[i].utilization_max * (0.7 + 0.3 * ((k % 7) / 6.0))
                     for k, i in enumerate(idx)])
    joints = (Joint(125.0, "contraction"), Joint(160.0, "expansion"), Joint(185.0, "contraction"),
              Joint(207.5, "contraction"), Joint(230.0, "expansion"),
              Joint(255.0, "contraction"))
    design = WallDesign(wall=wall, name="Invented lot wall", retained_side="left",
                      stations=stations, segments=segs, joints=joints,
                      station_segment=idx.astype(int), station_utilization=util,
                      station_governing=tuple(segs[i].governing_check for i in idx),
                      station_status=tuple("ok" for _ in idx),
                      station_checks={
                          "overturning": util * 0.75, "sliding": util,
                          "bearing": util * 0.88, "stem flexure": util * 0.8})
    # the engine's bar list, quantity frame and bar details, as the design stage attaches them
    bars = wall_bar_list(design)
    marked, bending = bending_schedule(bars)
    return replace(design, bars=marked, quantities=wall_quantities(design, bars),
                   details={m: section_detail(sec) for m, sec in design.marks().items()},
                   bending=bending)
