"""`wallsched design` end to end: every station of every segment re-checked from the written
tables by the independent scalar implementation, coverage, steps, joints, stability of the
optimum under reversal and local changes."""

import math
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from sitekit import SMALL_GRID, make_site
from wallsched.engine.audit import audit_section
from wallsched.engine.section import DesignInputs
from wallsched.exporters.schedule import SCHEDULE_COLUMNS

from wallsched.cli import main
from wallsched.site import load_site


def design(runner, site: Path, out: Path):
    res = runner.invoke(main, ["design", str(site), "--out", str(out), "--no-drawings", "-q"])
    return res


def recheck_from_tables(site_path: Path, out: Path) -> int:
    """Re-check every station from stations.csv + schedule.csv with engine/audit.py (plain
    floats, written apart from the vectorized engine). Returns the stations checked."""
    site = load_site(site_path)
    stations = pd.read_csv(out / "stations.csv")
    sched = pd.read_csv(out / "schedule.csv").set_index("segment")
    checked = 0
    for wall in site.walls:
        inputs = DesignInputs.from_tables(wall.soil, wall.loads, wall.materials, wall.criteria)
        rows = stations[stations.wall == wall.id]
        # every segment that says ok must hold at every one of its stations
        for seg_id, seg in sched[(sched.wall == wall.id) & (sched.status == "ok")].iterrows():
            # both ends of a segment are checked (the end station starts the next segment)
            m = (rows.station_ft >= seg.station_start_ft - 1e-6) & (
                rows.station_ft <= seg.station_end_ft + 1e-6)
            for r in rows[m].itertuples():
                h = r.retained_grade_ft - r.front_grade_ft
                tw = seg.top_of_wall_ft if math.isfinite(seg.top_of_wall_ft) else \
                    r.retained_grade_ft + wall.criteria["freeboard_ft"]  # top follows grade
                geo = {"retained_height_ft": max(h, 0.05),
                       "embedment_ft": r.front_grade_ft - seg.bottom_of_footing_ft,
                       "freeboard_ft": tw - r.retained_grade_ft,
                       "footing_thickness_in": seg.footing_thickness_in,
                       "stem_top_in": seg.stem_top_in, "stem_base_in": seg.stem_base_in,
                       "toe_ft": seg.toe_ft, "heel_ft": seg.heel_ft}
                if seg.key_width_in > 0 and seg.key_depth_in > 0:  # a shear key
                    geo.update(key_width_in=seg.key_width_in, key_depth_in=seg.key_depth_in,
                               key_offset_ft=seg.key_offset_ft)
                bars = {"stem": seg.stem_bars, "heel": seg.heel_bars, "toe": seg.toe_bars,
                        "horizontal": seg.horizontal_bars,
                        "longitudinal": seg.footing_long_bars}
                res = audit_section(inputs, geo, bars)
                failing = [k for k, v in res.items() if not v.passes]
                assert not failing, (seg_id, r.station_ft, failing)
                # the footing is level and at least min embedment below the front grade
                assert geo["embedment_ft"] >= wall.criteria["min_embedment_ft"] - 1e-6
                assert geo["freeboard_ft"] >= wall.criteria["freeboard_ft"] - 1e-6
                checked += 1
    return checked


def test_sample_like_site_designs_and_every_station_rechecks(runner, tmp_path):
    site = make_site(tmp_path, extra=SMALL_GRID, top=((0, 100.0), (35, 104.5), (70, 106.0),
                                                      (120, 103.0)),
                     bottom=((0, 99.0), (60, 98.0), (120, 99.5)),
                     xy=((0.0, 0.0), (60.0, 0.0), (96.0, 48.0)))
    out = tmp_path / "out"
    res = design(runner, site, out)
    assert res.exit_code == 0, res.output
    sched = pd.read_csv(out / "schedule.csv")
    assert list(sched.columns[: len(SCHEDULE_COLUMNS)]) == SCHEDULE_COLUMNS  # DESIGN.md 5
    assert (sched.status == "ok").all()
    assert recheck_from_tables(site, out) >= 20
    stations = pd.read_csv(out / "stations.csv")
    need = stations[stations.retained_height_ft >= 0.5]
    assert need.segment.notna().all()  # every station that needs a wall has one segment
    # segments chain end to start: nothing uncovered, nothing covered twice
    assert np.allclose(sched.station_start_ft.iloc[1:].values,
                       sched.station_end_ft.iloc[:-1].values)
    # footings level per segment, steps at most footing_step_max_ft (IBC 2021 1809.3)
    assert (np.abs(np.diff(sched.bottom_of_footing_ft)) <= 2.0 + 1e-9).all()
    import json

    rec = json.loads((out / "run.json").read_text())
    assert set(rec["inputs"]) == {"site.toml", "align.csv", "top.csv", "bottom.csv"}
    assert all(len(v) == 64 for v in rec["inputs"].values())
    joints = rec["walls"][0]["joints"]
    pts = [sched.station_start_ft.iloc[0], *[j["station_ft"] for j in joints],
           sched.station_end_ft.iloc[-1]]
    assert max(np.diff(pts)) <= 30.0 + 1e-9  # contraction joints (common practice)
    exp = [pts[0], *[j["station_ft"] for j in joints if j["kind"] == "expansion"], pts[-1]]
    assert max(np.diff(exp)) <= 90.0 + 1e-9  # expansion joints (common practice)
    steps = {round(s, 6) for s, a, b in zip(sched.station_start_ft.iloc[1:],
                                             sched.bottom_of_footing_ft.iloc[1:],
                                             sched.bottom_of_footing_ft.iloc[:-1], strict=True)
             if abs(a - b) > 1e-9}
    exp_at = {round(j["station_ft"], 6) for j in joints if j["kind"] == "expansion"}
    assert steps <= exp_at  # an expansion joint at every footing step


@settings(max_examples=6, deadline=None,
          suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(st.lists(st.floats(0.5, 9.0), min_size=3, max_size=6), st.floats(-4, 4),
       st.integers(0, 10**6))
def test_random_sites_every_segment_passes_everywhere(runner, tmp_path_factory, heights, fall,
                                                      seed):
    folder = tmp_path_factory.mktemp("rand")
    n = len(heights)
    s = np.linspace(0, 20 * (n - 1) + 15, n)
    fg = 100 + fall * s / s[-1]
    top = tuple(zip(s.tolist(), (fg + np.array(heights)).tolist(), strict=True))
    bottom = tuple(zip(s.tolist(), fg.tolist(), strict=True))
    site = make_site(folder, extra=SMALL_GRID, top=top, bottom=bottom,
                     xy=((0.0, 0.0), (float(s[-1]), 0.0)))
    out = folder / "out"
    res = design(runner, site, out)
    assert res.exit_code in (0, 3), res.output
    sched = pd.read_csv(out / "schedule.csv")
    ok = sched[sched.status == "ok"]
    if res.exit_code == 0:
        assert len(ok) == len(sched)
    # every segment that says ok holds at every one of its stations (independent re-check)
    assert recheck_from_tables(site, out) >= 2 * len(ok)


def test_reversed_alignment_gives_the_same_design_mirrored(runner, tmp_path):
    top = ((0, 100.0), (40, 105.0), (100, 103.5), (160, 101.0))
    bottom = ((0, 99.0), (80, 98.0), (160, 98.6))
    a = make_site(tmp_path / "a", extra=SMALL_GRID, top=top, bottom=bottom,
                  xy=((0.0, 0.0), (160.0, 0.0)))
    rtop = tuple((160 - s, e) for s, e in reversed(top))
    rbot = tuple((160 - s, e) for s, e in reversed(bottom))
    b = make_site(tmp_path / "b", extra=SMALL_GRID, top=rtop, bottom=rbot,
                  xy=((160.0, 0.0), (0.0, 0.0)))
    assert design(runner, a, tmp_path / "a" / "out").exit_code == 0
    assert design(runner, b, tmp_path / "b" / "out").exit_code == 0
    sa = pd.read_csv(tmp_path / "a" / "out" / "schedule.csv")
    sb = pd.read_csv(tmp_path / "b" / "out" / "schedule.csv")
    # the optimum is the same problem mirrored: the same total length and, station for
    # station, the same retained heights designed for
    assert sa.length_ft.sum() == pytest.approx(sb.length_ft.sum())
    ha = pd.read_csv(tmp_path / "a" / "out" / "stations.csv")
    hb = pd.read_csv(tmp_path / "b" / "out" / "stations.csv")
    np.testing.assert_allclose(ha.retained_height_ft.values,
                               hb.retained_height_ft.values[::-1], atol=1e-4)
    assert (sa.status == "ok").all() and (sb.status == "ok").all()


def test_local_grading_change_moves_only_nearby_segments(runner, tmp_path):
    s = np.arange(0, 601, 40.0)
    fg = 100 + 0.01 * s
    h = 5 + 2 * np.sin(s / 60)
    top = tuple(zip(s, fg + h, strict=True))
    bottom = tuple(zip(s, fg, strict=True))
    a = make_site(tmp_path / "a", extra=SMALL_GRID, top=top, bottom=bottom,
                  xy=((0.0, 0.0), (600.0, 0.0)))
    top2 = tuple((x, e + (1.5 if 280 <= x <= 320 else 0.0)) for x, e in top)  # 240 to 360
    b = make_site(tmp_path / "b", extra=SMALL_GRID, top=top2, bottom=bottom,
                  xy=((0.0, 0.0), (600.0, 0.0)))
    assert design(runner, a, tmp_path / "a" / "out").exit_code == 0
    # the revision compared with the earlier run: the marks a wall may have are few and
    # shared along it, so the earlier run's sections are kept wherever they still serve
    res = runner.invoke(main, ["design", str(b), "--out", str(tmp_path / "b" / "out"),
                               "--no-drawings", "-q", "--compare", str(tmp_path / "a" / "out")])
    assert res.exit_code == 0, res.output
    cols = ["station_start_ft", "station_end_ft", "bottom_of_footing_ft", "top_of_wall_ft",
            "stem_bars", "footing_thickness_in", "toe_ft", "heel_ft", "mark", "segment"]
    sa = pd.read_csv(tmp_path / "a" / "out" / "schedule.csv")[cols]
    sb = pd.read_csv(tmp_path / "b" / "out" / "schedule.csv")[cols]
    # farther than one longest segment (90 ft) and a margin from the changed stretch
    far_a = sa[(sa.station_end_ft < 140) | (sa.station_start_ft > 460)]
    far_b = sb[(sb.station_end_ft < 140) | (sb.station_start_ft > 460)]
    assert len(far_a) >= 4
    pd.testing.assert_frame_equal(far_a.reset_index(drop=True), far_b.reset_index(drop=True))
    changed = sb.merge(sa, how="left", indicator=True)
    moved = changed[changed["_merge"] == "left_only"]
    assert len(moved) >= 1
    assert (moved.station_end_ft > 140).all() and (moved.station_start_ft < 460).all()


def test_top_following_the_grade(runner, tmp_path):
    site = make_site(tmp_path, extra=SMALL_GRID + '[criteria]\ntop_of_wall = "follow_grade"\n')
    out = tmp_path / "out"
    res = design(runner, site, out)
    assert res.exit_code == 0, res.output
    sched = pd.read_csv(out / "schedule.csv")
    assert sched.top_of_wall_ft.isna().all()  # no level top: it follows the grade
    st = pd.read_csv(out / "stations.csv")
    walled = st[st.segment.notna()]
    np.testing.assert_allclose(walled.top_of_wall_ft - walled.retained_grade_ft, 0.5)
    assert recheck_from_tables(site, out) >= len(walled)


def test_over_the_limit_is_flagged_and_exit_3(runner, tmp_path):
    site = make_site(tmp_path, extra=SMALL_GRID + "[criteria]\nmax_retained_height_ft = 5.0\n",
                     top=((0, 100.0), (50, 107.0), (100, 101.0)),
                     bottom=((0, 99.0), (100, 99.0)))
    out = tmp_path / "out"
    res = design(runner, site, out)
    assert res.exit_code == 3
    sched = pd.read_csv(out / "schedule.csv")
    bad = sched[sched.status != "ok"]
    assert len(bad) >= 1 and bad.status.str.startswith("over_limit").all()
    assert (sched.loc[sched.status == "ok", "retained_height_max_ft"] <= 5.0 + 1e-9).all()
    assert not math.isnan(sched.fs_overturning.iloc[0])


def test_guard_rail_warnings_reach_the_schedule_and_run_record(runner, tmp_path):
    from sitekit import SOIL

    soil = SOIL.replace("friction_coefficient = 0.40", "friction_coefficient = 0.75")
    site = make_site(tmp_path, extra=SMALL_GRID, soil=soil)
    out = tmp_path / "out"
    res = runner.invoke(main, ["design", str(site), "--out", str(out), "--no-drawings"])
    assert res.exit_code == 0, res.output
    assert "warning:" in res.output and "0.7" in res.output
    sched = pd.read_csv(out / "schedule.csv")
    assert (sched.status == "ok").all()  # a warning is not a failure
    assert sched.warnings.str.contains("friction").all()
    import json

    assert any("friction" in w for w in json.loads((out / "run.json").read_text())["warnings"])
