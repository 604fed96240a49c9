"""The surface type (profile/surface.py), DXF TINs and survey points (profile/tinread.py).

References: linear interpolation in a triangle reproduces a plane exactly (barycentric
coordinates sum to one - the defining property of the linear triangle); matplotlib's
LinearTriInterpolator (a general-purpose reference library) for the elevation of a TIN at a
plan point.
"""

from __future__ import annotations

import warnings

import numpy as np
import pytest
import shapely
import surfacekit as kit
from wallsched.profile.core import Alignment, ProfileWarning
from wallsched.profile.surface import make_surface, surface_grade
from wallsched.profile.tinread import read_dxf_tin, read_points

from wallsched.errors import ProfileError


def _random_tin(seed=1, n=80, plane=None):
    from matplotlib.tri import Triangulation

    rng = np.random.default_rng(seed)
    xy = rng.uniform([0, 0], [200, 100], size=(n, 2))
    xy = np.vstack([xy, [[0, 0], [200, 0], [200, 100], [0, 100]]])
    z = plane(xy) if plane else 100 + rng.uniform(-3, 3, len(xy))
    tri = Triangulation(xy[:, 0], xy[:, 1]).triangles
    return xy, z, tri


def test_any_triangle_of_a_planar_tin_returns_the_plane():
    def plane(p):
        return 12.5 + 0.031 * p[:, 0] - 0.047 * p[:, 1]

    xy, z, tri = _random_tin(plane=plane)
    s = make_surface(xy, z, tri, name="plane", label="t")
    rng = np.random.default_rng(7)
    w = rng.dirichlet([1, 1, 1], size=(len(tri), 5)).reshape(-1, 3)
    corners = np.repeat(xy[tri], 5, axis=0)
    p = np.einsum("ik,ikj->ij", w, corners)
    np.testing.assert_allclose(s.elevation(p), plane(p), atol=1e-9)  # exact on planes
    # the vertices themselves
    np.testing.assert_allclose(s.elevation(xy), z, atol=1e-9)


def test_elevation_agrees_with_matplotlib_linear_interpolation():
    xy, z, tri = _random_tin(seed=4)
    s = make_surface(xy, z, tri, name="rough", label="t")
    p = np.random.default_rng(5).uniform([0, 0], [200, 100], size=(500, 2))
    verts = np.column_stack([xy, z])
    np.testing.assert_allclose(s.elevation(p), kit.tin_reference(verts, tri, p), atol=1e-9)


@pytest.mark.parametrize("offset, sign", [(0.0, 1.0), (3.0, 1.0), (4.5, -1.0)])
def test_grade_along_a_bent_wall_is_exact_between_its_points(offset, sign):
    xy, z, tri = _random_tin(seed=9)
    s = make_surface(xy, z, tri, name="rough", label="t")
    al = Alignment(shapely.LineString([(20, 30), (90, 45), (150, 40), (185, 70)]), "a")
    g = surface_grade(s, al, start_station_ft=100.0, offset_ft=offset, sign=sign,
                      what="retained grade", side="left" if sign > 0 else "right")
    # at many stations, the profile's linear interpolation equals the TIN (matplotlib's
    # interpolation as the reference) at the point offset on the mitred parallel line
    st = np.linspace(100.0, 100.0 + al.length_ft, 1501)
    coords = np.asarray(al.line.coords)
    seg = np.hypot(*np.diff(coords, axis=0).T)
    cum = 100.0 + np.r_[0, np.cumsum(seg)]
    k = np.clip(np.searchsorted(cum, st, side="right") - 1, 0, len(seg) - 1)
    u = np.diff(coords, axis=0) / seg[:, None]
    n = np.column_stack([-u[:, 1], u[:, 0]])
    # the parallel line's vertices (each at the offset from both segments it joins)
    m = np.vstack([n[0], (n[:-1] + n[1:]) / (1 + np.sum(n[:-1] * n[1:], axis=1))[:, None],
                   n[-1]])
    q = coords + sign * offset * m
    t = (st - cum[k]) / seg[k]
    pts = q[k] + t[:, None] * (q[k + 1] - q[k])
    ref = kit.tin_reference(np.column_stack([xy, z]), tri, pts)
    np.testing.assert_allclose(g.at(st), ref, atol=1e-9)
    # every point of the profile is where the line crosses a triangle edge or bends: the
    # largest value of the piecewise-linear grade is one of its points
    assert g.elevation_ft.max() >= ref.max() - 1e-9
    # the perpendicular distance of a straight run's points to the wall is the offset
    d = shapely.distance(al.line, shapely.points(pts[(st > 110) & (st < 160)]))
    assert d.min() >= offset - 1e-6


def test_an_uncovered_station_names_the_station_and_the_surface():
    xy, z, tri = _random_tin(seed=2)
    s = make_surface(xy, z, tri, name="surface 'FG'", label="grading.xml")
    al = Alignment(shapely.LineString([(20, 50), (230, 50)]), "a")  # runs past x = 200
    with pytest.raises(ProfileError) as exc:
        surface_grade(s, al, start_station_ft=1000.0, offset_ft=2.0, sign=1.0,
                      what="retained grade", side="left")
    msg = exc.value.one_line()
    assert msg.startswith("grading.xml: surface 'FG' does not cover stations 11+80.00 to "
                          "12+10.00 of the retained grade")
    assert "retained grade" in msg and "2 ft to the left" in msg


def test_a_hole_in_the_surface_is_not_covered():
    verts, tris = kit.grid_tin(kit.finished_grade)
    # drop the faces around (1050, 2005): the wall passes over a hole
    centre = verts[tris, :2].mean(axis=1)
    keep = np.hypot(*(centre - [1050, 2005]).T) > 12
    s = make_surface(verts[:, :2], verts[:, 2], tris[keep], name="surface 'FG'", label="g")
    al = Alignment(shapely.LineString([(1000, 2000), (1100, 2000)]), "a")
    with pytest.raises(ProfileError, match="does not cover stations 0\\+40.00 to 0\\+60.00"):
        surface_grade(s, al, start_station_ft=0.0, offset_ft=5.0, sign=1.0,
                      what="retained grade", side="left")


def test_duplicate_faces_warn_and_are_dropped():
    xy = np.array([[0, 0], [10, 0], [0, 10]], float)
    with pytest.warns(ProfileWarning, match="duplicate"):
        s = make_surface(xy, [1, 2, 3], [[0, 1, 2], [2, 0, 1]], name="t", label="t")
    assert len(s.triangles) == 1


def test_dxf_3dface_tin_is_a_surface(tmp_path):
    verts, tris = kit.grid_tin(kit.front_grade, jitter=0.3, seed=3)
    path = kit.write_dxf_tin(tmp_path / "tin.dxf", verts, tris)
    s = read_dxf_tin(path, {"layer": "fg-tin"}, "tin.dxf")  # layer names match without case
    assert len(s.triangles) == len(tris)
    p = np.random.default_rng(1).uniform([965, 1965], [1155, 2135], size=(300, 2))
    np.testing.assert_allclose(s.elevation(p), kit.tin_reference(verts, tris, p), atol=1e-9)


def test_dxf_polyface_tin_is_a_surface(tmp_path):
    verts, tris = kit.grid_tin(kit.front_grade, jitter=0.3, seed=5, step=20.0)
    path = kit.write_dxf_tin(tmp_path / "pf.dxf", verts, tris, layer="EG", polyface=True)
    s = read_dxf_tin(path, {"layer": "EG"}, "pf.dxf")
    p = np.random.default_rng(2).uniform([965, 1965], [1155, 2135], size=(300, 2))
    np.testing.assert_allclose(s.elevation(p), kit.tin_reference(verts, tris, p), atol=1e-9)


def test_dxf_layer_without_faces_is_refused(tmp_path):
    import ezdxf

    doc = ezdxf.new("R2010")
    doc.header["$INSUNITS"] = 2
    doc.modelspace().add_line((0, 0), (10, 0), dxfattribs={"layer": "FG"})
    doc.saveas(tmp_path / "l.dxf")
    with pytest.raises(ProfileError, match="no 3DFACE"):
        read_dxf_tin(tmp_path / "l.dxf", {"layer": "FG"}, "l.dxf")


def test_survey_points_with_header_and_code(tmp_path):
    verts, _ = kit.grid_tin(kit.existing, step=20.0)
    path = kit.write_points(tmp_path / "pts.csv", verts)
    s = read_points(path, {"code": "eg"}, "pts.csv")
    # the planar invented ground is returned exactly; the TREE and MH rows were filtered out
    p = np.random.default_rng(3).uniform([965, 1965], [1155, 2135], size=(200, 2))
    np.testing.assert_allclose(s.elevation(p), kit.existing(p[:, 0], p[:, 1]), atol=1e-9)
    assert s.z.max() < 200 and s.z.min() > 0


def test_survey_points_without_header_space_delimited(tmp_path):
    verts, _ = kit.grid_tin(kit.existing, step=20.0)
    rows = [f"{k} {y} {x} {z} EG" for k, (x, y, z) in enumerate(verts, 1)]
    (tmp_path / "p.txt").write_text("\n".join(rows))
    s = read_points(tmp_path / "p.txt", {}, "p.txt")
    assert len(s.xy) == len(verts)


def test_gaps_in_the_survey_are_not_bridged(tmp_path):
    verts, _ = kit.grid_tin(kit.existing, step=10.0)
    gap = (verts[:, 0] > 1030) & (verts[:, 0] < 1090)  # a 70-ft strip not surveyed
    path = kit.write_points(tmp_path / "gap.csv", verts[~gap], noise_rows=False)
    with pytest.warns(ProfileWarning, match="not bridged"):
        s = read_points(path, {"max_edge_ft": 30.0}, "gap.csv")
    assert np.isnan(s.elevation(np.array([[1060.0, 2050.0]]))[0])
    assert not np.isnan(s.elevation(np.array([[1010.0, 2050.0]]))[0])
    bridged = read_points(path, {"max_edge_ft": 500.0}, "gap.csv")
    assert not np.isnan(bridged.elevation(np.array([[1060.0, 2050.0]]))[0])


def test_too_few_points_and_collinear_points_are_refused(tmp_path):
    (tmp_path / "two.csv").write_text("1,0,0,10,EG\n2,0,10,11,EG\n3,5,5,12,TREE\n")
    with pytest.raises(ProfileError, match="2 points coded 'EG'; a surface needs at least"):
        read_points(tmp_path / "two.csv", {"code": "EG"}, "two.csv")
    rows = [f"{k},{2 * k},{3 * k},{100 + k},EG" for k in range(1, 30)]
    (tmp_path / "line.csv").write_text("\n".join(rows))
    with pytest.raises(ProfileError, match="lie on one line"):
        read_points(tmp_path / "line.csv", {}, "line.csv")


def test_a_bad_point_row_names_its_line(tmp_path):
    (tmp_path / "bad.csv").write_text("P,N,E,Z,D\n1,0,0,10,EG\n2,0,x,11,EG\n")
    with pytest.raises(ProfileError) as exc:
        read_points(tmp_path / "bad.csv", {}, "bad.csv")
    assert exc.value.where == "line 3"


def test_folded_faces_warn_once():
    xy = np.array([[0, 0], [10, 0], [0, 10], [2, 2]], float)
    with warnings.catch_warnings(record=True) as rec:
        warnings.simplefilter("always")
        make_surface(xy, [1, 1, 1, 1], [[0, 1, 2], [1, 2, 3]], name="t", label="t")
    msgs = [str(w.message) for w in rec if issubclass(w.category, ProfileWarning)]
    assert len(msgs) == 1 and "2 folded" in msgs[0]


def test_a_header_may_name_the_columns_in_another_order(tmp_path):
    verts, _ = kit.grid_tin(kit.existing, step=20.0)
    rows = ["Point,Easting,Northing,Elevation,Description"]
    rows += [f"{k},{x},{y},{z},EG" for k, (x, y, z) in enumerate(verts, 1)]
    (tmp_path / "pe.csv").write_text("\n".join(rows))
    s = read_points(tmp_path / "pe.csv", {"code": "EG"}, "pe.csv")
    p = np.array([[1010.0, 2050.0]])
    assert s.elevation(p)[0] == pytest.approx(kit.existing(1010.0, 2050.0))
    (tmp_path / "bad.csv").write_text("Point,Easting,Level\n1,2,3\n")
    with pytest.raises(ProfileError, match="not N, Z"):
        read_points(tmp_path / "bad.csv", {}, "bad.csv")


def test_faces_written_a_hair_apart_leave_no_hole(tmp_path):
    import ezdxf

    verts, tris = kit.grid_tin(kit.front_grade)
    rng = np.random.default_rng(8)
    doc = ezdxf.new("R2010")
    doc.header["$INSUNITS"] = 2
    msp = doc.modelspace()
    for t in tris:  # each face's corners rounded on its own, up to 3e-5 ft apart
        c = verts[t] + rng.uniform(-3e-5, 3e-5, (3, 3))
        msp.add_3dface([*map(tuple, c), tuple(c[2])], dxfattribs={"layer": "T"})
    doc.saveas(tmp_path / "hair.dxf")
    s = read_dxf_tin(tmp_path / "hair.dxf", {"layer": "T"}, "hair.dxf")
    al = Alignment(shapely.LineString([(1000, 2000), (1100, 2060)]), "a")
    g = surface_grade(s, al, start_station_ft=0.0, offset_ft=2.0, sign=-1.0,
                      what="front grade", side="right")
    st = np.linspace(0, al.length_ft, 200)
    p = shapely.get_coordinates(shapely.line_interpolate_point(al.line, st))
    u = np.array([100, 60]) / np.hypot(100, 60)
    q = p - 2.0 * np.array([-u[1], u[0]])
    np.testing.assert_allclose(g.at(st), kit.front_grade(q[:, 0], q[:, 1]), atol=1e-3)
