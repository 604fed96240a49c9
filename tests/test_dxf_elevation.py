"""The elevation DXF read back with ezdxf: audit, layers, extents, callouts, determinism."""

from __future__ import annotations

import math

import ezdxf
import numpy as np
import pytest
from designkit import make_design
from wallsched.exporters import dxf_elevation as de
from wallsched.exporters.dxf_render import render_dxf_png
from wallsched.profile.stationing import format_station

from wallsched.cautions import CAUTIONS


@pytest.fixture(scope="module")
def drawn(tmp_path_factory):
    folder = tmp_path_factory.mktemp("dxf")
    design = make_design()
    path = de.write_elevation_dxf(design, folder, input_hash="9f2c51d0aa", site_name="Test Site")
    return design, path, ezdxf.readfile(path)


def _texts(doc):
    out = []
    for space in [doc.modelspace()] + [doc.layouts.get(n) for n in doc.layout_names_in_taborder()
                                       if n != "Model"]:
        out += [t.dxf.text for t in space.query("TEXT")]
        # a table column is one MTEXT, a line per cell
        out += [line for m in space.query("MTEXT") for line in m.plain_text(split=True)]
    return out


def test_file_name_version_units(drawn):
    design, path, doc = drawn
    assert path.name == "W1-elevation.dxf"
    assert doc.dxfversion == "AC1024"  # DXF R2010
    assert doc.header["$INSUNITS"] == 2  # DXF header: 2 = feet


def test_audit_clean(drawn):
    _, _, doc = drawn
    auditor = doc.audit()
    assert not auditor.has_errors, [str(e) for e in auditor.errors]


def test_layers_exist_and_entities_bylayer(drawn):
    _, _, doc = drawn
    names = {layer.dxf.name for layer in doc.layers}
    assert set(de.LAYERS) <= names
    for name, (colour, ltype, _) in de.LAYERS.items():
        layer = doc.layers.get(name)
        assert layer.color == colour and layer.dxf.linetype == ltype
        assert ltype in doc.linetypes
    used = set()
    for e in doc.modelspace():
        used.add(e.dxf.layer)
        assert e.dxf.get("color", 256) == 256  # BYLAYER
        assert e.dxf.get("linetype", "BYLAYER").upper() == "BYLAYER"
    assert used <= names
    # national CAD layer convention form: discipline-major-minor
    assert all(len(n.split("-")) == 3 and n[0] == "C" for n in de.LAYERS)
    # joints are told apart by linetype
    assert doc.layers.get("C-WALL-JNTC").dxf.linetype != doc.layers.get("C-WALL-JNTE").dxf.linetype


def test_one_text_style_and_readable_heights(drawn):
    _, _, doc = drawn
    assert [s.dxf.name for s in doc.styles] == ["Standard"]
    sheets = [doc.layouts.get(n) for n in doc.layout_names_in_taborder() if n != "Model"]
    for psp in sheets:
        for t in psp.query("TEXT"):
            assert t.dxf.style == "Standard"
            # 0.08 in the least plotted text height (common practice); paper space is in inches
            assert t.dxf.height >= 0.08 - 1e-9


def test_polyline_extents_equal_station_range(drawn):
    design, _, doc = drawn
    xs = np.concatenate([np.array([p[0] for p in pl.get_points("xy")])
                         for pl in doc.modelspace().query("LWPOLYLINE")
                         if pl.dxf.layer in de.POLYLINE_LAYERS[2:]])  # the grades
    st = design.stations.station_ft
    assert xs.min() == pytest.approx(st[0])
    assert xs.max() == pytest.approx(st[-1])
    wall = doc.modelspace().query('LWPOLYLINE[layer=="C-WALL-OTLN"]')
    wx = np.concatenate([[p[0] for p in pl.get_points("xy")] for pl in wall])
    wx = wx[wx <= st[-1] + 1e-9]  # the elevation (the true-size sections lie to its right)
    assert wx.min() == design.segments[0].station_start_ft
    assert wx.max() == design.segments[-1].station_end_ft


def test_tags_and_every_step_elevation_as_text(drawn):
    design, _, doc = drawn
    texts = _texts(doc)
    joined = "\n".join(texts)
    for seg in design.segments:
        assert seg.segment in texts
        assert seg.mark in texts
        if math.isfinite(seg.top_of_wall_ft):
            tws = [seg.top_of_wall_ft]
        else:
            tws = [seg.top_of_wall_start_ft, seg.top_of_wall_end_ft]
        for tw in tws:
            assert f"TW {tw:.2f}" in joined
        assert f"TF {seg.top_of_footing_ft:.2f}" in joined
        assert f"BF {seg.bottom_of_footing_ft:.2f}" in joined
        assert f"STA {format_station(seg.station_start_ft)}" in joined
    # BW = front grade at the segment ends, recomputed from the stations
    st = design.stations
    bw = np.interp(design.segments[1].station_start_ft, st.station_ft, st.front_grade_ft)
    assert f"BW {bw:.2f}" in joined
    for mark in design.marks():
        assert f"SECTION {mark}" in texts
    # station grid labels on a 180 ft wall, 12+00 notation
    for s in (100, 150, 200, 250):
        assert format_station(s, 0) in texts
    for caution in CAUTIONS:  # wrapped over lines in every sheet's note block
        assert caution.split()[-1] in joined
    assert "9f2c51d0aa" in joined


def test_schedule_and_bar_list_drawn(drawn):
    design, _, doc = drawn
    texts = _texts(doc)
    assert "WALL W1 SCHEDULE" in texts and "WALL W1 BENDING SCHEDULE" in texts
    assert "#6@8" in texts  # stem bars of section B in the schedule
    from wallsched.engine.detailing import wall_bar_list

    total = wall_bar_list(design)["weight_lb"].sum()
    assert f"{total:.1f}" in texts


def test_section_dimensions_in_ft_in(drawn):
    design, _, doc = drawn
    dims = [d.get_measurement() for d in doc.modelspace().query("DIMENSION")]
    a = design.marks()["A"]
    # footing width B = toe + stem base + heel = 2 + 1 + 3.5 = 6.5 ft (DESIGN.md section 3)
    assert any(abs(m - 6.5) < 1e-9 for m in dims)
    assert any(abs(m - a.footing_thickness_in / 12) < 1e-9 for m in dims)
    assert any(abs(m - 1.0) < 1e-9 for m in dims)  # key depth 12 in on section B


def test_joints_by_kind(drawn):
    design, _, doc = drawn
    msp = doc.modelspace()
    for kind, layer in (("contraction", "C-WALL-JNTC"), ("expansion", "C-WALL-JNTE")):
        lines = [ln for ln in msp.query(f'LINE[layer=="{layer}"]')
                 if ln.dxf.start.x == ln.dxf.end.x]  # vertical: the joints (not the legend)
        xs = sorted({round(ln.dxf.start.x, 6) for ln in lines})
        want = sorted(j.station_ft for j in design.joints if j.kind == kind)
        assert xs == pytest.approx(want)


def test_byte_identical_runs(tmp_path):
    design = make_design()
    a = de.write_elevation_dxf(design, tmp_path / "a.dxf", input_hash="x", site_name="S")
    b = de.write_elevation_dxf(design, tmp_path / "b.dxf", input_hash="x", site_name="S")
    assert a.read_bytes() == b.read_bytes()
    # a fixed creation time in the header, not the clock (ezdxf sets the clock on loading,
    # so read the written text itself)
    text = a.read_text()
    k = text.index("$TDCREATE")
    assert text[k:k + 40].split()[2] == "2451545.0"


def test_vertical_exaggeration(tmp_path):
    design = make_design()

    def wall_height(ve):
        p = de.write_elevation_dxf(design, tmp_path / f"ve{ve}.dxf", input_hash="x",
                                   site_name="S", vertical_exaggeration=ve)
        pl = ezdxf.readfile(p).modelspace().query('LWPOLYLINE[layer=="C-WALL-OTLN"]')
        ys = [y for e in pl for x, y in e.get_points("xy") if x <= 280.0]  # the elevation
        return max(ys) - min(ys)

    # outline spans lowest TF 97.0 to highest TW 108.0 = 11 ft at true scale
    assert wall_height(1.0) == pytest.approx(11.0)
    assert wall_height(2.0) == pytest.approx(22.0)
    with pytest.raises(ValueError):
        de.write_elevation_dxf(design, tmp_path / "bad.dxf", input_hash="x", site_name="S",
                               vertical_exaggeration=0)


def test_format_ft_in():
    assert de.format_ft_in(1.5) == "1'-6\""
    assert de.format_ft_in(9 + 4 / 12) == "9'-4\""
    assert de.format_ft_in(0.3125) == "0'-3 3/4\""


def test_render_png(drawn, tmp_path):
    _, path, _ = drawn
    from wallsched.exporters.dxf_render import sheet_names

    png = render_dxf_png(path, tmp_path / "W1-elevation.png", dpi=60, width_in=20,
                         layout=sheet_names(path)[0])
    import matplotlib.image as mpimg

    img = mpimg.imread(png)
    assert img.shape[0] > 100 and img.shape[1] > 200
    dark = (img[..., :3].mean(axis=2) < 0.5).mean()
    assert 0.001 < dark < 0.5  # lines and text drawn on a white sheet
