"""Quantities recomputed independently from the schedule's dimensions (prism volumes)."""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np
import pytest
from designkit import make_design
from wallsched.engine import quantities as qt
from wallsched.engine.detailing import wall_bar_list

# ASTM A615 unit weights (McCormac & Brown 9th ed. Table A.2), lb/ft
A615_PLF = {3: 0.376, 4: 0.668, 5: 1.043, 6: 1.502, 7: 2.044, 8: 2.670}


def test_concrete_prisms_by_hand():
    q = qt.wall_quantities(make_design()).set_index("segment")
    # W1-01: stem 1 ft x 6 ft x 60 ft; footing (2 + 1 + 3.5) x 1.25 x 60; no key  # prism volumes
    assert q.loc["W1-01", "concrete_cy"] == pytest.approx((1 * 6 * 60 + 6.5 * 1.25 * 60) / 27)
    # W1-02: stem (12+16)/2 in x 11 ft x 70; footing (3 + 16/12 + 5) x 1.5 x 70; key 1 x 1 x 70
    stem = (14 / 12) * 11 * 70
    footing = (3 + 16 / 12 + 5) * 1.5 * 70
    assert q.loc["W1-02", "stem_cy"] == pytest.approx(stem / 27)
    assert q.loc["W1-02", "key_cy"] == pytest.approx(70 / 27)
    assert q.loc["W1-02", "concrete_cy"] == pytest.approx((stem + footing + 70) / 27)
    # W1-03: sloped top 105.5 -> 103.0 over TF 98.5: average stem height 5.75 ft
    assert q.loc["W1-03", "stem_cy"] == pytest.approx(1 * 5.75 * 50 / 27)


def test_formwork_by_hand():
    q = qt.wall_quantities(make_design()).set_index("segment")
    # W1-01: two 6 ft faces x 60, stem ends 2 x 1 x 6, footing edges 2 x 1.25 x 60,
    # footing ends 2 x 6.5 x 1.25  # contact areas, common practice
    expect = 2 * 6 * 60 + 2 * 6 + 2 * 1.25 * 60 + 2 * 6.5 * 1.25
    assert q.loc["W1-01", "formwork_sf"] == pytest.approx(expect)
    # W1-02 battered back face along its slope (4 in over 11 ft); the key is cast against
    # the soil of its trench, unformed  # common practice
    face = 11 * 70 + math.hypot(11, 4 / 12) * 70
    b = 3 + 16 / 12 + 5
    expect2 = face + 2 * (14 / 12) * 11 + 2 * 1.5 * 70 + 2 * b * 1.5
    assert q.loc["W1-02", "formwork_sf"] == pytest.approx(expect2)


def test_steel_equals_bar_list():
    design = make_design()
    bars = wall_bar_list(design)
    q = qt.wall_quantities(design, bars).set_index("segment")
    for seg in design.segments:
        mine = bars[bars["segment"] == seg.segment]
        # Σ count x length x ASTM A615 unit weight (McCormac & Brown 9th ed. Table A.2)
        hand = sum(r.count * r.length_ft * A615_PLF[r.size] for r in mine.itertuples())
        assert q.loc[seg.segment, "steel_lb"] == pytest.approx(hand)
    filled = qt.with_quantities(design, bars)
    assert [s.steel_lb for s in filled.segments] == pytest.approx(list(q["steel_lb"]))
    assert [s.concrete_cy for s in filled.segments] == pytest.approx(list(q["concrete_cy"]))


def test_earthwork_flat_existing_ground_prisms():
    design = make_design()
    st = design.stations
    flat = replace(st, existing_ground_ft=np.full_like(st.station_ft, 100.0),
                   retained_grade_ft=np.full_like(st.station_ft, 103.0))
    seg = design.segments[0]  # BF 96.75, TF 98.0, TW 104, B 6.5, heel 3.5, stem 1 ft
    q = qt.segment_quantities(seg, flat, working_room_ft=2.0, side_slope_h_per_v=0.0)
    # vertical cut: (B + 2 x 2) x (100 - 96.75) x 60  # prism, method in engine/quantities.py
    cut = (6.5 + 4) * 3.25 * 60
    assert q.excavation_cy == pytest.approx(cut / 27)
    # refill = cut - footing - stem below ground (1 x 2 ft) + fill above ground behind the stem
    # (heel 3.5 + 2 working room) x (103 - 100)
    refill = cut - 6.5 * 1.25 * 60 - 1 * 2 * 60 + 5.5 * 3 * 60
    assert q.backfill_cy == pytest.approx(refill / 27)


def test_earthwork_trench_with_sloped_sides():
    design = make_design()
    st = design.stations
    flat = replace(st, existing_ground_ft=np.full_like(st.station_ft, 100.0),
                   retained_grade_ft=np.full_like(st.station_ft, 103.0))
    seg = design.segments[0]  # BF 96.75, B 6.5, 60 ft long, depth 3.25 ft
    q = qt.segment_quantities(seg, flat, working_room_ft=2.0, side_slope_h_per_v=1.5)
    # trapezoid: floor 10.5 ft, each side out 1.5 x 3.25 at the top  # prismoid, flat ground
    area = 3.25 * (10.5 + 10.5 + 2 * 1.5 * 3.25) / 2
    assert q.excavation_cy == pytest.approx(area * 60 / 27)
    vertical = qt.segment_quantities(seg, flat, working_room_ft=2.0, side_slope_h_per_v=0.0)
    # the sloped sides add exactly their two wedges to the refill too
    wedges = 1.5 * 3.25**2 * 60 / 27
    assert q.backfill_cy - vertical.backfill_cy == pytest.approx(wedges)


def test_earthwork_needs_existing_ground():
    design = make_design(existing_ground=False)
    q = qt.wall_quantities(design)
    assert q["excavation_cy"].isna().all() and q["backfill_cy"].isna().all()
    assert (q["concrete_cy"] > 0).all()


def test_totals_per_wall_and_site():
    frames = [qt.wall_quantities(make_design(w)) for w in ("W1", "W2")]
    import pandas as pd

    q = pd.concat(frames, ignore_index=True)
    tot = qt.quantity_totals(q).set_index("wall")
    assert tot.loc["SITE", "concrete_cy"] == pytest.approx(q["concrete_cy"].sum())
    assert tot.loc["W1", "concrete_cy"] == pytest.approx(frames[0]["concrete_cy"].sum())
    assert tot.loc["SITE", "length_ft"] == pytest.approx(360.0)


# --- issue 16: earthwork for every segment with existing ground; a reason without it ------


def _design_site(folder, *, wall_extra: str = "", extra: str = "", existing=True):
    from sitekit import SMALL_GRID, make_site, write

    from wallsched.design import design_site
    from wallsched.pipeline import site_stations
    from wallsched.site import load_site

    if existing:
        write(folder / "eg.csv", "station,elevation\n0,101.5\n50,104.0\n100,101.0\n")
        wall_extra = 'existing_ground = "eg.csv"\n' + wall_extra
    site = load_site(make_site(folder, extra=SMALL_GRID + extra, wall_extra=wall_extra))
    return site, design_site(site, site_stations(site), audit=False)


def test_every_segment_has_earthwork_with_existing_ground(tmp_path):
    from wallsched.exporters.schedule import schedule_frame

    _, sd = _design_site(tmp_path)
    frame = schedule_frame(sd.walls)
    assert len(frame) >= 1
    assert frame["excavation_cy"].gt(0).all() and frame["backfill_cy"].gt(0).all()
    assert (frame["earthwork_note"] == "").all()
    tot = sd.quantity_totals.set_index("wall")
    assert tot.loc["SITE", "excavation_cy"] == pytest.approx(frame["excavation_cy"].sum())
    assert tot.loc["SITE", "earthwork_note"] == ""


def test_without_existing_ground_blank_with_the_reason(tmp_path):
    from wallsched.exporters.schedule import schedule_frame

    _, sd = _design_site(tmp_path, existing=False)
    frame = schedule_frame(sd.walls)
    assert frame["excavation_cy"].isna().all() and frame["backfill_cy"].isna().all()
    assert (frame["earthwork_note"] == qt.EARTHWORK_NOTE).all()
    assert "no existing ground given" in qt.EARTHWORK_NOTE
    assert sd.quantity_totals.set_index("wall").loc["SITE", "earthwork_note"] == \
        qt.NO_EARTHWORK


def test_site_total_names_the_walls_without_existing_ground():
    import pandas as pd

    with_eg = qt.wall_quantities(make_design("W1"))
    without = qt.wall_quantities(make_design("W2", existing_ground=False))
    tot = qt.quantity_totals(pd.concat([with_eg, without], ignore_index=True)).set_index("wall")
    assert tot.loc["SITE", "excavation_cy"] == pytest.approx(with_eg["excavation_cy"].sum())
    assert tot.loc["SITE", "earthwork_note"].endswith(f"{qt.NO_EARTHWORK} for W2")
    assert tot.loc["W1", "earthwork_note"] == ""


def test_the_cost_counts_the_takeoffs_excavation(tmp_path):
    from wallsched.engine.sizing import CostRates

    site, sd = _design_site(tmp_path)
    rates = CostRates.from_table(site.costs)
    for s in sd.walls[0].segments:
        # $ = concrete + steel + formwork + excavation at the unit rates  # [costs]
        hand = (rates.concrete_usd_per_cy * s.concrete_cy + rates.steel_usd_per_lb * s.steel_lb
                + rates.formwork_usd_per_sf * s.formwork_sf
                + rates.excavation_usd_per_cy * s.excavation_cy)
        assert s.cost_usd == pytest.approx(hand)


def test_without_existing_ground_the_cost_counts_the_trench_from_the_front_grade(tmp_path):
    from wallsched.engine.sizing import CostRates

    site, sd = _design_site(tmp_path, existing=False)
    rates = CostRates.from_table(site.costs)
    w = sd.walls[0]
    # the same trench, with the front grade given as the existing ground
    as_ground = replace(w.stations, existing_ground_ft=w.stations.front_grade_ft.copy())
    for s in w.segments:
        exc = qt.segment_quantities(s, as_ground).excavation_cy
        assert exc > 0
        hand = (rates.concrete_usd_per_cy * s.concrete_cy + rates.steel_usd_per_lb * s.steel_lb
                + rates.formwork_usd_per_sf * s.formwork_sf + rates.excavation_usd_per_cy * exc)
        assert s.cost_usd == pytest.approx(hand)


def test_trench_keys_of_the_site_file_reach_the_quantities(tmp_path):
    site, sd = _design_site(tmp_path / "a", wall_extra="working_room_ft = 3.5\n"
                                                       "trench_side_slope_h_per_v = 0.5\n")
    assert site.walls[0].criteria["working_room_ft"] == 3.5
    w = sd.walls[0]
    for s in w.segments:
        q = qt.segment_quantities(s, w.stations, working_room_ft=3.5, side_slope_h_per_v=0.5)
        assert s.excavation_cy == pytest.approx(q.excavation_cy)
        assert s.backfill_cy == pytest.approx(q.backfill_cy)
        default = qt.segment_quantities(s, w.stations)
        assert s.excavation_cy != pytest.approx(default.excavation_cy)
