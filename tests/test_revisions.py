"""Two grading revisions of an invented site: the diff names the segments over the changed
stretch, the DXF gets a revision cloud around it, and ``--compare`` writes diff.csv."""

from __future__ import annotations

import math
import re

import ezdxf
import numpy as np
import pandas as pd
import pytest
from click.testing import CliRunner
from sitekit import SMALL_GRID, make_site
from wallsched.exporters import dxf_elevation as de
from wallsched.exporters.diff import DIFF_COLUMNS, LENGTH_TOL_FT, diff_runs
from wallsched.exporters.dxf_elev_view import cloud_arcs
from wallsched.exporters.dxf_render import render_dxf_png

from wallsched.cli import main

TOP_1 = ((0, 100.0), (40, 106.0), (100, 103.0))
# revision 2 (invented): the retained grade raised by 1.2 ft from station 60 to 80
RAISE_FROM_FT, RAISE_TO_FT, RAISE_FT = 60.0, 80.0, 1.2


def _top_2():
    s = np.array([0, 40, 55, RAISE_FROM_FT, RAISE_TO_FT, 85, 100], float)
    e = np.interp(s, [p[0] for p in TOP_1], [p[1] for p in TOP_1])
    e[(s >= RAISE_FROM_FT) & (s <= RAISE_TO_FT)] += RAISE_FT
    return tuple(zip(s.tolist(), e.tolist(), strict=True))


@pytest.fixture(scope="module")
def runs(tmp_path_factory):
    root = tmp_path_factory.mktemp("revisions")
    site1 = make_site(root / "rev1", extra=SMALL_GRID, top=TOP_1)
    site2 = make_site(root / "rev2", extra=SMALL_GRID, top=_top_2())
    runner = CliRunner()
    out1, out2 = root / "out1", root / "out2"
    r1 = runner.invoke(main, ["design", str(site1), "--out", str(out1), "-q"])
    assert r1.exit_code == 0, r1.output
    r2 = runner.invoke(main, ["design", str(site2), "--out", str(out2), "--compare", str(out1)])
    assert r2.exit_code == 0, r2.output
    return out1, out2, r2.output


def _overlaps(a0, a1, b0, b1) -> bool:
    return min(a1, b1) - max(a0, b0) > LENGTH_TOL_FT


def test_compare_writes_diff_csv_and_prints_the_summary(runs):
    out1, out2, output = runs
    assert not (out1 / "diff.csv").exists()
    diff = pd.read_csv(out2 / "diff.csv", dtype=str, keep_default_na=False)
    assert tuple(diff.columns) == DIFF_COLUMNS  # the column list of the issue
    assert len(diff) > 0
    assert set(diff["change"]) <= {"added", "removed", "changed"}
    assert "retained_height_ft" in set(diff["field"])
    assert "compared" in output and "CAUTION" in output
    # the file holds exactly what the diff of the two written folders gives
    again = diff_runs(out1, out2)
    assert len(again.rows) == len(diff)


def test_diff_names_exactly_the_segments_over_the_changed_stretch(runs):
    out1, out2, _ = runs
    d = diff_runs(out1, out2)
    hc = d.height_changes
    assert len(hc) == 1
    a, b = float(hc["station_start_ft"].iloc[0]), float(hc["station_end_ft"].iloc[0])
    # the grade change is 1.2 ft over 60-80, tapering to 0 at 55 and 85; the tolerance is
    # 0.05 ft, so the range ends where the linear taper crosses it (interpolation)
    assert a == pytest.approx(55.0 + 5.0 * 0.05 / RAISE_FT, abs=1e-6)
    assert b == pytest.approx(85.0 - 5.0 * 0.05 / RAISE_FT, abs=1e-6)
    assert float(hc["max_abs_delta_ft"].iloc[0]) == pytest.approx(RAISE_FT, abs=1e-9)
    new = pd.read_csv(out2 / "schedule.csv")
    old = pd.read_csv(out1 / "schedule.csv")
    want_new = {r.segment for r in new.itertuples()
                if _overlaps(r.station_start_ft, r.station_end_ft, a, b)}
    want_old_removed = {r.segment for r in old.itertuples()
                        if _overlaps(r.station_start_ft, r.station_end_ft, a, b)}
    named = d.segments[d.segments["change"] != "unchanged"]
    got_new = set(named.loc[named["change"] != "removed", "segment_new"])
    got_removed = set(named.loc[named["change"] == "removed", "segment_old"])
    assert want_new and want_new <= got_new
    # a segment named beyond the stretch is the rest of an earlier one over it (cut short
    # where the revision's segments begin): inside an old segment that overlaps the stretch
    over_old = [(r.station_start_ft, r.station_end_ft) for r in old.itertuples()
                if _overlaps(r.station_start_ft, r.station_end_ft, a, b)]
    for r in new[new.segment.isin(got_new - want_new)].itertuples():
        assert any(o0 - 1e-6 <= r.station_start_ft and r.station_end_ft <= o1 + 1e-6
                   for o0, o1 in over_old), r.segment
    assert got_removed <= want_old_removed
    # and the segments away from the stretch are reported unchanged
    same = d.segments[d.segments["change"] == "unchanged"]
    for r in same.itertuples():
        assert not _overlaps(r.station_start_ft, r.station_end_ft, a, b)


def _arc_ends(arc):
    c, r = arc.dxf.center, arc.dxf.radius
    return [(c.x + r * math.cos(math.radians(t)), c.y + r * math.sin(math.radians(t)))
            for t in (arc.dxf.start_angle, arc.dxf.end_angle)]


def test_dxf_has_a_revision_cloud_around_the_changed_range(runs, tmp_path):
    out1, out2, _ = runs
    d = diff_runs(out1, out2)
    ranges = d.changed_station_ranges("A")
    assert len(ranges) == 1
    a, b = ranges[0]
    doc = ezdxf.readfile(out2 / "A-elevation.dxf")
    assert de.REVISION_LAYER in {layer.dxf.name for layer in doc.layers}
    # national CAD layer convention form, discipline-major-minor
    assert len(de.REVISION_LAYER.split("-")) == 3 and de.REVISION_LAYER[0] == "C"
    arcs = doc.modelspace().query(f'ARC[layer=="{de.REVISION_LAYER}"]')
    assert len(arcs) >= 8
    ends = np.array([p for arc in arcs for p in _arc_ends(arc)])
    # the cloud surrounds the changed range (its sides moved out until clear of every text)
    assert ends[:, 0].min() < a and ends[:, 0].max() > b
    # the cloud encloses the wall between those stations: the outline drawn on C-WALL-OTLN
    wall = doc.modelspace().query('LWPOLYLINE[layer=="C-WALL-OTLN"]')
    ys = [y for pl in wall for x, y in pl.get_points("xy") if a <= x <= b]
    assert ends[:, 1].min() < min(ys) and ends[:, 1].max() > max(ys)
    tags = [t.dxf.text for t in doc.modelspace().query(f'TEXT[layer=="{de.REVISION_LAYER}"]')]
    assert tags == ["1"]
    assert len(doc.modelspace().query(f'LINE[layer=="{de.REVISION_LAYER}"]')) == 3  # triangle
    # the first run, compared with nothing, has no revision layer
    doc1 = ezdxf.readfile(out1 / "A-elevation.dxf")
    assert de.REVISION_LAYER not in {layer.dxf.name for layer in doc1.layers}
    assert doc.audit().has_errors is False
    png = render_dxf_png(out2 / "A-elevation.dxf", tmp_path / "rev.png", dpi=40, width_in=12)
    assert png.stat().st_size > 1000


def test_cloud_arcs_meet_on_the_outline_and_bulge_outward():
    x0, y0, x1, y1 = 10.0, 5.0, 40.0, 17.0
    arcs = cloud_arcs(x0, y0, x1, y1, chord_ft=6.0, arc_deg=120.0)
    # sides of 30 and 12 ft in chords of about 6 ft: 5 + 2 + 5 + 2 scallops
    assert len(arcs) == 14
    prev_end = None
    for cx, cy, r, a0, a1 in arcs:
        p0 = (cx + r * math.cos(math.radians(a0)), cy + r * math.sin(math.radians(a0)))
        p1 = (cx + r * math.cos(math.radians(a1)), cy + r * math.sin(math.radians(a1)))
        for px, py in (p0, p1):  # on the rectangle
            on_x = abs(px - x0) < 1e-9 or abs(px - x1) < 1e-9
            on_y = abs(py - y0) < 1e-9 or abs(py - y1) < 1e-9
            assert on_x or on_y
        if prev_end is not None:
            assert p0 == pytest.approx(prev_end)
        prev_end = p1
        # included angle (counter-clockwise) is the 120 deg asked for
        assert (a1 - a0) % 360.0 == pytest.approx(120.0)
        mid = math.radians(a0 + 60.0)
        mx, my = cx + r * math.cos(mid), cy + r * math.sin(mid)
        assert not (x0 < mx < x1 and y0 < my < y1)  # the bulge is outside the outline
    first = arcs[0]
    start = (first[0] + first[2] * math.cos(math.radians(first[3])),
             first[1] + first[2] * math.sin(math.radians(first[3])))
    assert start == pytest.approx(prev_end)  # closed


def test_compare_with_an_unchanged_run_finds_nothing(runs, tmp_path):
    """The same site designed again with --compare against its first run: no segment, field
    or retained height changed and every quantity's delta is exactly zero (the new run is
    compared as written, with the same rounding as the earlier run's files)."""
    out1, _, _ = runs
    site1 = out1.parent / "rev1" / "site.toml"
    out3 = tmp_path / "out3"
    r = CliRunner().invoke(main, ["design", str(site1), "--out", str(out3), "--compare",
                                  str(out1)])
    assert r.exit_code == 0, r.output
    totals = re.findall(r"(\w+) ([\d.]+) -> ([\d.]+) \(([-+][\d,.]+)\)", r.output)
    assert totals and all(old == new for _, old, new, _ in totals), totals
    d = diff_runs(out1, out3)
    assert len(d.rows) == 0 and len(d.height_changes) == 0
    assert len(d.quantities) > 0 and (d.quantities["delta"] == 0).all()
    assert pd.read_csv(out3 / "diff.csv").empty
