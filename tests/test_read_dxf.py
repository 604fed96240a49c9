"""DXF readers: alignments, plan grade lines and profile views, built here with ezdxf from
known profiles and read back (stations and elevations within 0.01 ft of the known values)."""

from __future__ import annotations

import io
import math
import warnings
from pathlib import Path

import ezdxf
import numpy as np
import pandas as pd
import pytest
import shapely
from sitekit import SOIL, write
from wallsched.profile.core import ProfileWarning
from wallsched.profile.csvread import alignment_from_xy
from wallsched.profile.dxfread import (
    read_alignment_dxf,
    read_plan_grade,
    read_profile_view,
)

from wallsched.cli import main
from wallsched.errors import InputError, ProfileError
from wallsched.site import load_site

TOL_FT = 0.01  # the issue's round-trip tolerance
TOP = [(0.0, 100.0), (40.0, 106.0), (75.0, 104.5), (100.0, 103.0)]  # invented profile


def new_doc(units: int = 2):
    doc = ezdxf.new("R2010")
    doc.header["$INSUNITS"] = units
    return doc, doc.modelspace()


def save(doc, path: Path) -> Path:
    doc.saveas(path)
    return path


def plan_point(line: shapely.LineString, s_ft: float, offset_ft: float = 0.0):
    """The point at distance s along ``line``, ``offset_ft`` to its left (a helper of the test,
    computed with shapely's own interpolation)."""
    p = shapely.line_interpolate_point(line, s_ft)
    q = shapely.line_interpolate_point(line, min(s_ft + 0.01, line.length))
    r = shapely.line_interpolate_point(line, max(s_ft - 0.01, 0.0))
    ux, uy = q.x - r.x, q.y - r.y
    n = math.hypot(ux, uy)
    return p.x - uy / n * offset_ft, p.y + ux / n * offset_ft


# ------------------------------------------------------------------ alignments


def test_straight_lwpolyline_alignment(tmp_path):
    doc, msp = new_doc()
    msp.add_lwpolyline([(10.0, 20.0), (110.0, 20.0)], dxfattribs={"layer": "Wall Line"})
    a = read_alignment_dxf(save(doc, tmp_path / "a.dxf"), {"layer": "WALL LINE"}, "a.dxf")
    np.testing.assert_allclose(np.asarray(a.line.coords), [[10, 20], [110, 20]])
    assert a.length_ft == pytest.approx(100.0)


def test_bent_lines_shuffled_reversed_with_gap(tmp_path):
    # three LINEs of a bent wall drawn out of order, the middle one backwards, with a 0.04 ft
    # gap at one joint (inside the default 0.1 ft joint tolerance)
    doc, msp = new_doc()
    lay = {"layer": "W-B"}
    msp.add_line((60, 0), (60, 50), dxfattribs=lay)     # second leg, drawn forwards
    msp.add_line((40, 0), (0, 0), dxfattribs=lay)       # first leg, drawn backwards
    msp.add_line((40.04, 0), (60, 0), dxfattribs=lay)   # middle, starts 0.04 ft off
    path = save(doc, tmp_path / "b.dxf")
    a = read_alignment_dxf(path, {"layer": "W-B", "start": [0, 0]}, "b.dxf")
    xy = np.asarray(a.line.coords)
    np.testing.assert_allclose(xy[0], [0, 0])
    np.testing.assert_allclose(xy[-1], [60, 50])
    assert a.length_ft == pytest.approx(110.0, abs=0.05)
    # without a hint the path runs the way the first entity on the layer was drawn
    b = read_alignment_dxf(path, {"layer": "W-B"}, "b.dxf")
    np.testing.assert_allclose(np.asarray(b.line.coords)[-1], [60, 50])
    c = read_alignment_dxf(path, {"layer": "W-B", "start": [61, 52]}, "b.dxf")
    np.testing.assert_allclose(np.asarray(c.line.coords)[0], [60, 50])


def test_gap_beyond_tolerance_names_the_entity(tmp_path):
    doc, msp = new_doc()
    msp.add_line((0, 0), (50, 0), dxfattribs={"layer": "W"})
    far = msp.add_line((50.5, 0), (90, 0), dxfattribs={"layer": "W"})
    path = save(doc, tmp_path / "g.dxf")
    with pytest.raises(ProfileError, match=f"handle {far.dxf.handle}.*0.500 ft"):
        read_alignment_dxf(path, {"layer": "W"}, "g.dxf")
    a = read_alignment_dxf(path, {"layer": "W", "gap_tolerance_ft": 0.6}, "g.dxf")
    assert a.length_ft == pytest.approx(90.0)


def test_arc_alignment_length_and_grade_round_trip(tmp_path):
    # LINE 50 ft east, ARC radius 80 ft turning 90 deg left, LINE 40 ft north
    r = 80.0
    doc, msp = new_doc()
    lay = {"layer": "CURVED WALL"}
    msp.add_line((0, 0), (50, 0), dxfattribs=lay)
    msp.add_arc((50, r), r, 270, 360, dxfattribs=lay)  # from (50, 0) to (130, 80)
    msp.add_line((130 + 1e-4, 80), (130, 120), dxfattribs=lay)
    arc_len = r * math.pi / 2
    total = 50 + arc_len + 40
    # the grade as a 3D polyline 2 ft to the left, one vertex per profile point; the
    # points on the true arc are computed here analytically
    prof = [(0.0, 200.0), (30.0, 201.5), (70.0, 203.0), (110.0, 202.0), (150.0, 205.0),
            (total, 206.0)]

    def on_true_path(s, off):
        if s <= 50:
            return s, off
        if s <= 50 + arc_len:
            th = (s - 50) / r  # angle turned
            rad = r - off
            return 50 + rad * math.sin(th), r - rad * math.cos(th)
        return 130 - off, 80 + (s - 50 - arc_len)

    verts = [(*on_true_path(s, 2.0), z) for s, z in prof]
    msp.add_polyline3d(verts, dxfattribs={"layer": "TOP OF SLOPE"})
    path = save(doc, tmp_path / "arc.dxf")
    a = read_alignment_dxf(path, {"layer": "curved wall"}, "arc.dxf")
    assert a.length_ft == pytest.approx(total, abs=TOL_FT)
    # flattened to 0.01 ft chord error: every vertex of the arc part lies on the true arc
    xy = np.asarray(a.line.coords)
    on_arc = xy[(xy[:, 0] > 50.5) & (xy[:, 1] < 79.5)]
    assert len(on_arc) > 10
    np.testing.assert_allclose(np.hypot(on_arc[:, 0] - 50, on_arc[:, 1] - r), r, atol=1e-6)
    g = read_plan_grade(path, {"layer": "TOP OF SLOPE"}, "arc.dxf", alignment=a,
                        start_station_ft=500.0)
    np.testing.assert_allclose(g.station_ft, [500 + s for s, _ in prof], atol=TOL_FT)
    np.testing.assert_allclose(g.elevation_ft, [z for _, z in prof], atol=TOL_FT)


def test_lwpolyline_with_bulge_is_flattened(tmp_path):
    # a half circle of radius 10 as one bulge (bulge 1 = 180 deg)
    doc, msp = new_doc()
    msp.add_lwpolyline([(0, 0, 0, 0, 1.0), (20, 0)], dxfattribs={"layer": "W"})
    a = read_alignment_dxf(save(doc, tmp_path / "u.dxf"), {"layer": "W"}, "u.dxf")
    assert a.length_ft == pytest.approx(10 * math.pi, abs=TOL_FT)


# ------------------------------------------------------------------ plan grades


def _straight_alignment():
    return alignment_from_xy(np.array([[1000.0, 500.0], [1100.0, 500.0]]), "align")


def test_plan_3d_polyline_reverse_offsets_and_far_vertices(tmp_path):
    al = _straight_alignment()
    doc, msp = new_doc()
    # drawn down-station, on the right (-3 ft), running 6 ft past the far end
    verts = [(1000 + s, 497.0, z) for s, z in TOP] + [(1106.0, 497.0, 102.4)]
    msp.add_polyline3d(verts[::-1], dxfattribs={"layer": "TOP"})
    # a stray line on the layer 40 ft away (two vertices ignored with a warning)
    msp.add_polyline3d([(1020, 540, 150.0), (1060, 540, 151.0)], dxfattribs={"layer": "TOP"})
    path = save(doc, tmp_path / "p.dxf")
    with pytest.warns(ProfileWarning, match="2 vertex"):
        g = read_plan_grade(path, {"layer": "TOP"}, "p.dxf", alignment=al,
                            start_station_ft=10.0)
    np.testing.assert_allclose(g.station_ft, [10 + s for s, _ in TOP] + [116.0], atol=1e-9)
    np.testing.assert_allclose(g.elevation_ft, [z for _, z in TOP] + [102.4])
    assert any("2 vertex" in w for w in g.warnings)


def test_plan_grade_on_bent_wall_keeps_stations(tmp_path):
    # the sample-site shape: vertices at profile stations on a wall that bends between them
    xy = np.array([[0.0, 0.0], [260.0, 0.0], [400.0, 110.0]])
    al = alignment_from_xy(xy, "align")
    prof = [(0.0, 412.0), (60.0, 413.2), (140.0, 418.5), (210.0, 421.0), (290.0, 420.6),
            (360.0, 417.8), (al.length_ft, 416.4)]
    doc, msp = new_doc()
    msp.add_polyline3d([(*plan_point(al.line, s, 1.5), z) for s, z in prof],
                       dxfattribs={"layer": "G"})
    g = read_plan_grade(save(doc, tmp_path / "bent.dxf"), {"layer": "G"}, "bent.dxf",
                        alignment=al, start_station_ft=1000.0)
    np.testing.assert_allclose(g.station_ft, [1000 + s for s, _ in prof], atol=TOL_FT)
    np.testing.assert_allclose(g.elevation_ft, [z for _, z in prof], atol=1e-9)


def test_2d_polyline_with_elevation(tmp_path):
    al = _straight_alignment()
    doc, msp = new_doc()
    # a level 2D polyline at elevation 95.25 drawn 5 ft past both ends of the wall
    msp.add_lwpolyline([(995, 502), (1105, 502)], dxfattribs={"layer": "TOE",
                                                              "elevation": 95.25})
    g = read_plan_grade(save(doc, tmp_path / "t.dxf"), {"layer": "TOE"}, "t.dxf",
                        alignment=al, start_station_ft=0.0)
    np.testing.assert_allclose(g.station_ft, [-5.0, 105.0])
    np.testing.assert_allclose(g.at([0.0, 50.0, 100.0]), 95.25)


def test_chord_leaving_the_band_is_cut_at_its_edge(tmp_path):
    al = _straight_alignment()
    doc, msp = new_doc()
    # station 0 -> 50 along the wall 2 ft off, then away to 60 ft off at station 150:
    # offset 2 + 58 t reaches 10 ft at t = 8/58, station 50 + 100 t = 63.79
    msp.add_polyline3d([(1000, 502, 99.0), (1050, 502, 100.0), (1150, 560, 110.0)],
                       dxfattribs={"layer": "G"})
    with pytest.warns(ProfileWarning, match="1 vertex"):
        g = read_plan_grade(save(doc, tmp_path / "c.dxf"), {"layer": "G"}, "c.dxf",
                            alignment=al, start_station_ft=0.0)
    edge = 50 + 100 * 8 / 58
    assert edge - 0.3 < g.station_ft[-1] <= edge + 1e-9
    np.testing.assert_allclose(g.at([25.0, 60.0]), [99.5, 101.0], atol=1e-9)


def test_two_elevations_at_one_station_is_an_error(tmp_path):
    al = _straight_alignment()
    doc, msp = new_doc()
    msp.add_polyline3d([(1000, 501, 100), (1100, 501, 101)], dxfattribs={"layer": "G"})
    msp.add_polyline3d([(1050, 499, 107), (1100, 499, 101)], dxfattribs={"layer": "G"})
    msp.add_polyline3d([(1050, 498, 100.5), (1060, 498, 100.6)], dxfattribs={"layer": "G"})
    with pytest.raises(ProfileError, match="two elevations at station 50.00"):
        read_plan_grade(save(doc, tmp_path / "two.dxf"), {"layer": "G"}, "two.dxf",
                        alignment=al, start_station_ft=0.0)


def test_profile_view(tmp_path):
    # x = station, y = (elevation - 90) * 10 about the view origin at drawing (2000, 300)
    doc, msp = new_doc()
    pts = [(2000 + s - 100.0, 300 + (z - 90.0) * 10) for s, z in TOP]
    msp.add_lwpolyline(pts[::-1], dxfattribs={"layer": "PROF TOP"})
    opts = {"layer": "PROF TOP", "view": "profile", "origin_station_ft": 100.0,
            "origin_elevation_ft": 90.0, "vertical_exaggeration": 10.0,
            "origin_xy": [2000, 300]}
    g = read_profile_view(save(doc, tmp_path / "prof.dxf"), opts, "prof.dxf")
    np.testing.assert_allclose(g.station_ft, [s for s, _ in TOP], atol=1e-9)
    np.testing.assert_allclose(g.elevation_ft, [z for _, z in TOP], atol=1e-9)


# ------------------------------------------------------------------ units, damage, layers


def test_metres_refused_then_converted(tmp_path):
    doc, msp = new_doc(units=6)  # $INSUNITS 6 = metres (DXF reference)
    msp.add_lwpolyline([(0, 0), (30.48, 0)], dxfattribs={"layer": "W"})
    msp.add_polyline3d([(0, 1, 30.48), (30.48, 1, 31.0896)], dxfattribs={"layer": "G"})
    path = save(doc, tmp_path / "m.dxf")
    with pytest.raises(ProfileError, match=r"metres, not feet; add units = \"m\""):
        read_alignment_dxf(path, {"layer": "W"}, "m.dxf")
    with pytest.raises(ProfileError, match="contradict|says metres"):
        read_alignment_dxf(path, {"layer": "W", "units": "ft"}, "m.dxf")
    a = read_alignment_dxf(path, {"layer": "W", "units": "m"}, "m.dxf")
    assert a.length_ft == pytest.approx(100.0)  # 30.48 m = 100 ft exactly (1 ft = 0.3048 m)
    g = read_plan_grade(path, {"layer": "G", "units": "m"}, "m.dxf", alignment=a,
                        start_station_ft=0.0)
    np.testing.assert_allclose(g.station_ft, [0, 100])
    np.testing.assert_allclose(g.elevation_ft, [100, 102])


def test_damaged_dxf_is_recovered(tmp_path):
    doc, msp = new_doc()
    msp.add_lwpolyline([(0, 0), (80, 0), (80, 40)], dxfattribs={"layer": "W"})
    text = io.StringIO()
    doc.write(text)
    raw = text.getvalue()
    cut = raw.find("ENDSEC", raw.find("ENTITIES")) + len("ENDSEC")
    path = tmp_path / "cut.dxf"
    path.write_text(raw[:cut])  # the OBJECTS section and EOF are lost
    with pytest.raises(ezdxf.DXFStructureError):
        ezdxf.readfile(path)  # the plain reader refuses it: the file is damaged
    a = read_alignment_dxf(path, {"layer": "W"}, "cut.dxf")
    assert a.length_ft == pytest.approx(120.0)


def test_missing_layer_lists_layers(tmp_path):
    doc, msp = new_doc()
    doc.layers.add("WALL EAST")
    msp.add_line((0, 0), (10, 0), dxfattribs={"layer": "WALL EAST"})
    msp.add_text("NOTE", dxfattribs={"layer": "NOTES"})
    with pytest.raises(ProfileError) as err:
        read_alignment_dxf(save(doc, tmp_path / "l.dxf"), {"layer": "WALL WEST"}, "l.dxf")
    line = err.value.one_line()
    assert "'WALL WEST' is not in the drawing" in line
    assert "WALL EAST" in line and "NOTES" in line
    assert "\n" not in line


def test_layer_without_lines(tmp_path):
    doc, msp = new_doc()
    msp.add_text("TW 100", dxfattribs={"layer": "SPOTS"})
    with pytest.raises(ProfileError, match="holds no LWPOLYLINE.*TEXT"):
        read_alignment_dxf(save(doc, tmp_path / "s.dxf"), {"layer": "SPOTS"}, "s.dxf")


def test_garbage_named_dxf(tmp_path):
    path = tmp_path / "junk.dxf"
    path.write_bytes(bytes(range(256)) * 40)
    with pytest.raises(ProfileError, match="not a DXF drawing"):
        read_alignment_dxf(path, {"layer": "W"}, "junk.dxf")


# ------------------------------------------------------------------ site file and CLI


def _dxf_site(folder: Path, *, align_src: str, top_src: str, bottom_src: str) -> Path:
    return write(folder / "site.toml", f"""
        [site]
        name = "Drawing site"
        {SOIL}
        [[walls]]
        id = "A"
        retained_side = "left"
        start_station_ft = 100.0
        alignment = {align_src}
        retained_grade = {top_src}
        front_grade = {bottom_src}
        """)


def _plan(folder: Path) -> Path:
    doc, msp = new_doc()
    msp.add_lwpolyline([(0, 0), (60, 0), (100, 30)], dxfattribs={"layer": "WALL A"})
    al = alignment_from_xy(np.array([[0.0, 0.0], [60.0, 0.0], [100.0, 30.0]]), "a")
    top = [(0, 300.0), (30, 304.0), (80, 306.5), (al.length_ft, 305.0)]
    msp.add_polyline3d([(*plan_point(al.line, s, 2.0), z) for s, z in top],
                       dxfattribs={"layer": "TOP A"})
    bottom = [(0, 299.0), (50, 298.0), (al.length_ft, 298.5)]
    for s, z in bottom:
        x, y = plan_point(al.line, s, -2.5)
        msp.add_text(f"BW {z:.2f}", dxfattribs={"layer": "SPOTS", "insert": (x, y)})
    msp.add_text("LOT 4", dxfattribs={"layer": "SPOTS", "insert": (30, -5)})
    save(doc, folder / "plan.dxf")
    return top, bottom


def test_cli_stations_from_dxf_sources(runner, tmp_path):
    top, bottom = _plan(tmp_path)
    site = _dxf_site(tmp_path, align_src='{ dxf = "plan.dxf", layer = "WALL A" }',
                     top_src='{ dxf = "plan.dxf", layer = "TOP A" }',
                     bottom_src='{ dxf = "plan.dxf", layer = "SPOTS", labels = "BW" }')
    out = tmp_path / "out"
    res = runner.invoke(main, ["stations", str(site), "--out", str(out), "--no-plots"])
    assert res.exit_code == 0, res.output
    frame = pd.read_csv(out / "stations.csv")
    st = frame.station_ft.to_numpy() - 100.0
    # numpy.interp of the known profiles as the reference
    rg = np.interp(st, [s for s, _ in top], [z for _, z in top])
    fg = np.interp(st, [s for s, _ in bottom], [z for _, z in bottom])
    np.testing.assert_allclose(frame.retained_grade_ft, rg, atol=TOL_FT)
    np.testing.assert_allclose(frame.retained_height_ft, rg - fg, atol=TOL_FT)
    assert frame.station_ft.iloc[-1] == pytest.approx(100 + 60 + 50, abs=1e-6)


def test_cli_garbage_dxf_exits_2_with_one_line(runner, tmp_path):
    (tmp_path / "plan.dxf").write_bytes(b"\x00\x9f\xffPK\x03\x04" * 500)
    site = _dxf_site(tmp_path, align_src='{ dxf = "plan.dxf", layer = "WALL A" }',
                     top_src='{ dxf = "plan.dxf", layer = "TOP A" }',
                     bottom_src='{ dxf = "plan.dxf", layer = "BOT A" }')
    out = tmp_path / "out"
    res = runner.invoke(main, ["stations", str(site), "--out", str(out)])
    assert res.exit_code == 2
    lines = [ln for ln in res.output.splitlines() if ln.strip()]
    assert len(lines) == 1 and "plan.dxf" in lines[0] and "not a DXF" in lines[0]
    assert "Traceback" not in res.output
    assert not out.exists()


@pytest.mark.parametrize("src, message", [
    ('{ dxf = "plan.dxf" }', "needs layer"),
    ('{ dxf = "plan.dxf", layer = "TOP A", colour = 3 }', "unknown option 'colour'"),
    ('{ dxf = "plan.dxf", layer = "TOP A", view = "profile" }', "origin_station_ft"),
    ('{ dxf = "plan.dxf", layer = "SPOTS", labels = "TOP" }', "labels"),
    ('{ dxf = "plan.dxf", layer = "SPOTS", labels = "BW", allowance_ft = 0.5 }', "TW labels"),
    ('{ dxf = "plan.dxf", layer = "SPOTS", labels = "TW", pattern = "TW (" }', "regular"),
    ('{ dxf = "plan.dxf", layer = "TOP A", units = "yards" }', "units"),
    ('{ dxf = "plan.dxf", layer = "TOP A", max_offset_ft = -1 }', "greater than 0"),
])
def test_site_file_refuses_bad_dxf_options(tmp_path, src, message):
    _plan(tmp_path)
    site = _dxf_site(tmp_path, align_src='{ dxf = "plan.dxf", layer = "WALL A" }',
                     top_src=src, bottom_src='{ dxf = "plan.dxf", layer = "TOP A" }')
    with pytest.raises(InputError, match=message):
        load_site(site)


def test_profile_view_through_the_site_file(tmp_path):
    _plan(tmp_path)
    doc, msp = new_doc()
    msp.add_lwpolyline([(s, (z - 290.0) * 5) for s, z in TOP], dxfattribs={"layer": "PV"})
    save(doc, tmp_path / "prof.dxf")
    site = _dxf_site(
        tmp_path, align_src='{ dxf = "plan.dxf", layer = "WALL A" }',
        top_src='{ dxf = "prof.dxf", layer = "PV", view = "profile", origin_station_ft = 100.0,'
                ' origin_elevation_ft = 290.0, vertical_exaggeration = 5.0 }',
        bottom_src='{ dxf = "plan.dxf", layer = "SPOTS", labels = "BW" }')
    from wallsched.profile.sources import read_grade

    spec = load_site(site).walls[0]
    with warnings.catch_warnings():
        warnings.simplefilter("error", ProfileWarning)
        g = read_grade(spec.retained_grade, tmp_path, alignment=None, start_station_ft=100.0,
                       retained_side="left")
    np.testing.assert_allclose(g.station_ft, [100 + s for s, _ in TOP])
    np.testing.assert_allclose(g.elevation_ft, [z for _, z in TOP])
