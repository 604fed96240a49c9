"""The LandXML 1.2 reader (profile/landxml.py) against closed forms and the open standard.

Sources: the LandXML 1.2 schema (landxml.org): <P> and the points of <Line>/<Curve> are written
"northing easting [elevation]"; <Curve> has Start, Center, End and rot = "cw" | "ccw"; <F> holds
three point ids and i="1" marks an invisible face; <ParaCurve length> is a symmetric parabola
at its PVI; <Spiral> has Start, PI, End, length, radiusStart/radiusEnd (INF for a tangent);
<Units> linearUnit "foot", "USSurveyFoot", "meter". Circle: arc length s = R theta.
Vertical curves: a route-surveying textbook (e.g. Wolf & Ghilani, Elementary Surveying, the
chapter on vertical curves, from memory): y = y_BVC + g1 x + (g2 - g1) x^2 / (2L), mid-curve
offset from the PVI e = (g2 - g1) L / 8, the high or low point at x = -g1 L / (g2 - g1).
"""

from __future__ import annotations

import math
import warnings
from pathlib import Path

import numpy as np
import pytest
import surfacekit as kit
from wallsched.profile.core import ProfileWarning
from wallsched.profile.landxml import parse_landxml, read_alignment_landxml
from wallsched.profile.landxml_profile import read_profile_landxml
from wallsched.profile.landxml_surface import read_surface_landxml

from wallsched.errors import ProfileError


def _write(tmp_path: Path, text: str, name="g.xml") -> Path:
    p = tmp_path / name
    p.write_text(text)
    return p


@pytest.fixture
def grading(tmp_path):
    verts, tris = kit.grid_tin(kit.finished_grade)
    return _write(tmp_path, kit.landxml_text(verts, tris)), verts, tris


def test_arc_stationing_against_the_closed_form(grading):
    path, _, _ = grading
    al = read_alignment_landxml(path, {"alignment": "Wall A"}, "g.xml")
    # the whole length: two lines plus the arc R theta (circle, closed form)
    assert al.length_ft == pytest.approx(kit.LENGTH_FT, abs=2e-3)
    assert al.start_station_ft == pytest.approx(kit.STA_START_FT)
    import shapely

    s = np.linspace(0, kit.LENGTH_FT, 37)
    got = shapely.get_coordinates(shapely.line_interpolate_point(al.line, s))
    want, _ = kit.alignment_point(s)
    assert np.abs(got - want).max() < 3e-3  # within 0.003 ft everywhere along the wall
    # the end of the arc lies at station 5+00 + 60 + 80 * pi/3 (s = R theta)
    end_arc = kit.LINE1_FT + kit.RADIUS_FT * math.pi / 3
    p = shapely.get_coordinates(shapely.line_interpolate_point(al.line, end_arc))[0]
    c = kit.START_XY + [kit.LINE1_FT, kit.RADIUS_FT]
    assert math.hypot(*(p - c)) == pytest.approx(kit.RADIUS_FT, abs=2e-3)
    assert math.degrees(math.atan2(p[0] - c[0], -(p[1] - c[1]))) == pytest.approx(60.0, abs=2e-3)


def test_clockwise_arc_turns_right(tmp_path):
    # a cw quarter circle of radius 50 from (0, 0) heading north, centre at (50, 0)
    text = """<LandXML version="1.2"><Units><Imperial linearUnit="foot"/></Units><Alignments>
    <Alignment name="C" staStart="0"><CoordGeom><Curve rot="cw"><Start>0 0</Start>
    <Center>0 50</Center><End>50 50</End></Curve></CoordGeom></Alignment></Alignments></LandXML>"""
    al = read_alignment_landxml(_write(tmp_path, text), {"alignment": "C"}, "c.xml")
    assert al.length_ft == pytest.approx(50 * math.pi / 2, abs=2e-3)  # s = R theta
    mid = np.asarray(al.line.interpolate(al.length_ft / 2).coords)[0]
    # midpoint of the cw arc: centre + R (cos 135 deg, sin 135 deg) in (E, N)
    assert mid == pytest.approx([50 - 50 / math.sqrt(2), 50 / math.sqrt(2)], abs=2e-3)


def test_northing_is_written_before_easting(tmp_path):
    # one face far from the diagonal: N = 5000, E = 100 (LandXML 1.2: "N E Z")
    text = """<LandXML version="1.2"><Units><Imperial linearUnit="foot"/></Units><Surfaces>
    <Surface name="S"><Definition surfType="TIN"><Pnts>
    <P id="a">5000 100 10</P><P id="b">5000 200 20</P><P id="c">5100 100 30</P></Pnts>
    <Faces><F>a b c</F></Faces></Definition></Surface></Surfaces>
    <Alignments><Alignment name="L" staStart="0"><CoordGeom><Line><Start>5000 100</Start>
    <End>5000 200</End></Line></CoordGeom></Alignment></Alignments></LandXML>"""
    path = _write(tmp_path, text)
    s = read_surface_landxml(path, {"surface": "S"}, "s.xml")
    # plan x = easting, y = northing; z = 10 + 0.1 (E - 100) + 0.2 (N - 5000) on this plane
    assert s.elevation(np.array([[150.0, 5020.0]]))[0] == pytest.approx(10 + 5 + 4)
    assert np.isnan(s.elevation(np.array([[5020.0, 150.0]]))[0])
    al = read_alignment_landxml(path, {"alignment": "L"}, "s.xml")
    assert list(al.line.coords) == [(100.0, 5000.0), (200.0, 5000.0)]


def test_planar_landxml_tin_returns_the_plane_in_every_face(tmp_path):
    verts, tris = kit.grid_tin(lambda x, y: 50 + 0.04 * x - 0.02 * y, jitter=0.0)
    path = _write(tmp_path, kit.landxml_text(verts, tris))
    s = read_surface_landxml(path, {"surface": "FG"}, "g.xml")
    rng = np.random.default_rng(3)
    w = rng.dirichlet([1, 1, 1], size=len(tris))  # a random point inside every face
    xy = np.einsum("ik,ikj->ij", w, verts[tris][:, :, :2])
    # exactness on planes: linear interpolation reproduces a plane in any triangle
    np.testing.assert_allclose(s.elevation(xy), 50 + 0.04 * xy[:, 0] - 0.02 * xy[:, 1],
                               atol=1e-9)


def test_invisible_faces_are_skipped(tmp_path):
    verts, tris = kit.grid_tin(kit.finished_grade)
    path = _write(tmp_path, kit.landxml_text(verts, tris, hidden={0}))
    s = read_surface_landxml(path, {"surface": "FG"}, "g.xml")
    assert len(s.triangles) == len(tris) - 1
    inside0 = verts[tris[0], :2].mean(axis=0)
    assert np.isnan(s.elevation(inside0[None])[0])  # the hidden face is a hole


def test_parabolic_vertical_curve_against_the_closed_form(grading):
    path, _, _ = grading
    p = read_profile_landxml(path, {"alignment": "Wall A", "profile": "TW"}, "g.xml")
    g1, g2, length, bvc = 2.4 / 60, -2.4 / 140, 60.0, 530.0
    z_bvc = 112.4 - g1 * 30
    x = np.linspace(0, length, 25)
    np.testing.assert_allclose(p.at(bvc + x), z_bvc + g1 * x + (g2 - g1) * x**2 / (2 * length),
                               atol=1e-9)
    # mid-curve offset from the PVI: e = (g2 - g1) L / 8
    assert p.at(560.0) - 112.4 == pytest.approx((g2 - g1) * length / 8, abs=1e-9)
    # tangents outside the curve
    assert p.at(520.0) == pytest.approx(110.0 + g1 * 20)
    assert p.at(650.0) == pytest.approx(112.4 + g2 * 90)
    # the high point x = -g1 L / (g2 - g1) is a point of the profile
    hp = bvc - g1 * length / (g2 - g1)
    assert np.min(np.abs(p.station_ft - hp)) < 1e-9
    assert p.at(hp) == pytest.approx(z_bvc - g1**2 * length / (2 * (g2 - g1)))


def test_circular_vertical_curve_against_the_closed_form(tmp_path):
    text = """<LandXML version="1.2"><Units><Imperial linearUnit="foot"/></Units><Alignments>
    <Alignment name="A" staStart="0"><CoordGeom><Line><Start>0 0</Start><End>0 400</End></Line>
    </CoordGeom><Profile><ProfAlign name="G"><PVI>0 100</PVI>
    <CircCurve length="99.99" radius="2000">200 96</CircCurve><PVI>400 100</PVI></ProfAlign>
    </Profile></Alignment></Alignments></LandXML>"""
    p = read_profile_landxml(_write(tmp_path, text), {"alignment": "A", "profile": "G"}, "c")
    # a sag circle of R = 2000 tangent to -2 % and +2 %: symmetric about the PVI, tangent
    # length T = R tan(a); its lowest point z_BVC - R (1 - cos a), its centre R above that
    a = math.atan(0.02)
    t = 2000 * math.tan(a)
    bvc = 200 - t * math.cos(a)
    z_low = (100 - 0.02 * bvc) - 2000 * (1 - math.cos(a))
    assert p.at(200.0) == pytest.approx(z_low, abs=1e-9)
    for s in (bvc + 5, 190.0, 230.0):
        assert p.at(s) == pytest.approx(z_low + 2000 - math.sqrt(2000**2 - (s - 200) ** 2),
                                        abs=1e-9)
    assert p.at(bvc - 1) == pytest.approx(100 - 0.02 * (bvc - 1))


def test_metres_are_converted_and_said(tmp_path):
    verts, tris = kit.grid_tin(kit.finished_grade)
    text = kit.landxml_text(verts, tris, units='<Metric linearUnit="meter"/>', scale=0.3048)
    path = _write(tmp_path, text)
    with pytest.warns(ProfileWarning, match="metres"):
        al = read_alignment_landxml(path, {"alignment": "Wall A"}, "m.xml")
    assert al.length_ft == pytest.approx(kit.LENGTH_FT, abs=2e-3)
    s = read_surface_landxml(path, {"surface": "FG"}, "m.xml")
    np.testing.assert_allclose(s.z, verts[:, 2], atol=1e-5)  # written in metres, read in ft


def test_us_survey_feet_are_converted(tmp_path):
    verts, tris = kit.grid_tin(kit.finished_grade)
    # 1 US survey ft = 1200/3937 m = 1.000002 ft (exact definitions)
    f = 1200 / 3937 / 0.3048
    text = kit.landxml_text(verts, tris, units='<Imperial linearUnit="USSurveyFoot"/>',
                            scale=1 / f)
    with pytest.warns(ProfileWarning, match="US survey feet"):
        al = read_alignment_landxml(_write(tmp_path, text), {"alignment": "Wall A"}, "u")
    assert al.length_ft == pytest.approx(kit.LENGTH_FT, abs=2e-3)


BILLION_LAUGHS = """<?xml version="1.0"?>
<!DOCTYPE lolz [
 <!ENTITY lol "lol">
 <!ENTITY lol2 "&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;">
 <!ENTITY lol3 "&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;">
 <!ENTITY lol4 "&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;">
 <!ENTITY lol5 "&lol4;&lol4;&lol4;&lol4;&lol4;&lol4;&lol4;&lol4;&lol4;&lol4;">
 <!ENTITY lol6 "&lol5;&lol5;&lol5;&lol5;&lol5;&lol5;&lol5;&lol5;&lol5;&lol5;">
 <!ENTITY lol7 "&lol6;&lol6;&lol6;&lol6;&lol6;&lol6;&lol6;&lol6;&lol6;&lol6;">
 <!ENTITY lol8 "&lol7;&lol7;&lol7;&lol7;&lol7;&lol7;&lol7;&lol7;&lol7;&lol7;">
 <!ENTITY lol9 "&lol8;&lol8;&lol8;&lol8;&lol8;&lol8;&lol8;&lol8;&lol8;&lol8;">
]>
<LandXML><Units><Imperial linearUnit="foot"/></Units><Project name="&lol9;"/></LandXML>
"""


def test_billion_laughs_is_refused():
    # the classic entity-expansion attack (the defusedxml documentation's example)
    with pytest.raises(ProfileError, match="refused.*entity.*billion laughs"):
        parse_landxml(BILLION_LAUGHS.encode(), "bomb.xml")


def test_external_entity_is_refused():
    text = b"""<?xml version="1.0"?><!DOCTYPE x [<!ENTITY ext SYSTEM "file:///etc/passwd">]>
    <LandXML><Project name="&ext;"/></LandXML>"""
    with pytest.raises(ProfileError, match="refused.*external entity"):
        parse_landxml(text, "ext.xml")


def test_malformed_xml_names_the_line():
    with pytest.raises(ProfileError) as exc:
        parse_landxml(b"<LandXML>\n<Units>\n<Imperial linearUnit='foot'>\n</Units></LandXML>",
                      "bad.xml")
    assert exc.value.where == "line 4" and "not well-formed" in exc.value.message


def test_missing_names_list_what_the_file_has(grading):
    path, _, _ = grading
    with pytest.raises(ProfileError, match="no alignment named 'Wall B'.*'Wall A', 'Access Road'"):
        read_alignment_landxml(path, {"alignment": "Wall B"}, "g.xml")
    with pytest.raises(ProfileError, match="no surface named 'EG'.*'FG'"):
        read_surface_landxml(path, {"surface": "EG"}, "g.xml")
    with pytest.raises(ProfileError, match="no profile named 'BW'.*'TW'"):
        read_profile_landxml(path, {"alignment": "Wall A", "profile": "BW"}, "g.xml")


def _spiral_text(length, radius, end, pi, spi_type="clothoid") -> str:
    return f"""<LandXML><Units><Imperial linearUnit="foot"/></Units><Alignments>
    <Alignment name="S" staStart="0"><CoordGeom><Line><Start>0 -50</Start><End>0 0</End></Line>
    <Spiral length="{length}" radiusStart="INF" radiusEnd="{radius}" rot="ccw"
     spiType="{spi_type}"><Start>0 0</Start><PI>{pi[1]} {pi[0]}</PI><End>{end[1]} {end[0]}</End>
    </Spiral></CoordGeom></Alignment></Alignments></LandXML>"""


def test_clothoid_spiral_against_the_series_of_the_textbook(tmp_path):
    # clothoid from a tangent (east) into R = 200 over L = 100, turning left. Route-surveying
    # series (e.g. Wolf & Ghilani, spirals; from memory): theta = s^2 / (2 R L),
    # x = s (1 - theta^2/10 + theta^4/216), y = s (theta/3 - theta^3/42 + theta^5/1320)
    length, radius = 100.0, 200.0

    def xy(s):
        th = s**2 / (2 * radius * length)
        return np.array([s * (1 - th**2 / 10 + th**4 / 216),
                         s * (th / 3 - th**3 / 42 + th**5 / 1320)])

    end = xy(length)
    delta = length / (2 * radius)
    pi = np.array([end[0] - end[1] / math.tan(delta), 0.0])  # the tangents meet here
    al = read_alignment_landxml(_write(tmp_path, _spiral_text(length, radius, end, pi)),
                                {"alignment": "S"}, "s.xml")
    assert al.length_ft == pytest.approx(50 + length, abs=2e-3)
    for s in (25.0, 50.0, 75.0, 100.0):
        p = np.asarray(al.line.interpolate(50 + s).coords)[0]
        assert p == pytest.approx(xy(s), abs=3e-3)


def test_a_spiral_that_misses_its_end_or_is_not_a_clothoid_is_refused(tmp_path):
    with pytest.raises(ProfileError, match="ends .* ft from its End"):
        read_alignment_landxml(_write(tmp_path, _spiral_text(100, 200, (99.0, 9.0), (60, 0))),
                               {"alignment": "S"}, "s.xml")
    text = _spiral_text(100, 200, (99.0, 9.0), (60, 0), spi_type="cubic")
    with pytest.raises(ProfileError, match="only clothoid spirals"):
        read_alignment_landxml(_write(tmp_path, text, "c.xml"), {"alignment": "S"}, "c.xml")


def test_duplicate_and_folded_faces_warn(tmp_path):
    text = """<LandXML><Units><Imperial linearUnit="foot"/></Units><Surfaces>
    <Surface name="S"><Definition surfType="TIN"><Pnts>
    <P id="1">0 0 1</P><P id="2">0 10 1</P><P id="3">10 0 1</P><P id="4">10 10 1</P>
    <P id="5">2 2 1</P></Pnts>
    <Faces><F>1 2 3</F><F>2 3 1</F><F>2 4 3</F><F>2 3 5</F></Faces>
    </Definition></Surface></Surfaces></LandXML>"""
    with warnings.catch_warnings(record=True) as rec:
        warnings.simplefilter("always")
        s = read_surface_landxml(_write(tmp_path, text), {"surface": "S"}, "s.xml")
    text_w = " ".join(str(w.message) for w in rec if issubclass(w.category, ProfileWarning))
    assert "1 duplicate face" in text_w
    assert "folded" in text_w
    assert len(s.triangles) == 3
