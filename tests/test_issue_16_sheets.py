"""Issue 16: sheets a drafter can use and a bending schedule an estimator can use.

Read back with ezdxf: audit clean, no two text extents overlap on any layout (``ezdxf.bbox``),
every dimension's measured length equals its text, each wall has a paper-space sheet with a
viewport and a title block; the bending schedule weighs what the placing list weighs.
"""

from __future__ import annotations

import ezdxf
import pytest
from designkit import make_design
from ezdxf import bbox
from wallsched.engine.bending import bar_legs_in, bending_schedule, natural_key
from wallsched.engine.detailing import wall_bar_list
from wallsched.exporters import dxf_elevation as de
from wallsched.exporters.dxf_style import dim_text_value_ft


@pytest.fixture(scope="module")
def doc(tmp_path_factory):
    folder = tmp_path_factory.mktemp("sheets")
    design = make_design()
    path = de.write_elevation_dxf(design, folder, input_hash="9f2c51d0aa", site_name="Test Site",
                                  vertical_exaggeration=2.0, revisions=[(150.0, 200.0)])
    return ezdxf.readfile(path)


def _layouts(doc):
    return [doc.modelspace()] + [doc.layouts.get(n) for n in doc.layout_names_in_taborder()
                                 if n != "Model"]


def _text_boxes(space):
    boxes = []
    for e in space.query("TEXT MTEXT"):
        b = bbox.extents([e])
        boxes.append((e.dxf.get("text", "") if e.dxftype() == "TEXT" else e.plain_text(), b))
    for d in space.query("DIMENSION"):
        for v in d.virtual_entities():
            if v.dxftype() in ("TEXT", "MTEXT"):
                boxes.append((v.plain_text() if v.dxftype() == "MTEXT" else v.dxf.text,
                              bbox.extents([v])))
    return boxes


def test_audit_clean(doc):
    auditor = doc.audit()
    assert not auditor.has_errors, [str(e) for e in auditor.errors]


def test_no_two_texts_overlap_on_any_layout(doc):
    for space in _layouts(doc):
        boxes = _text_boxes(space)
        assert len(boxes) > 10
        for i, (ta, a) in enumerate(boxes):
            for tb, b in boxes[i + 1:]:
                overlap_x = min(a.extmax.x, b.extmax.x) - max(a.extmin.x, b.extmin.x)
                overlap_y = min(a.extmax.y, b.extmax.y) - max(a.extmin.y, b.extmin.y)
                assert not (overlap_x > 1e-6 and overlap_y > 1e-6), (space.name, ta, tb)


def test_dimensions_measure_what_they_say(doc):
    dims = list(doc.modelspace().query("DIMENSION"))
    assert dims
    for d in dims:
        assert d.dxf.get("text", "") in ("", "<>")  # no text override
        texts = [v.plain_text() for v in d.virtual_entities() if v.dxftype() == "MTEXT"]
        assert len(texts) == 1
        measured = d.get_measurement()
        # the wall styles write inches to 0.1 in or feet to 0.01 ft (exporters/dxf_style.py)
        assert dim_text_value_ft(texts[0]) == pytest.approx(measured, abs=0.0051)


def test_sections_are_true_size(doc):
    # footing width B of section A = toe 2 + stem 1 + heel 3.5 = 6.5 ft (designkit), 78"
    dims = [d.get_measurement() for d in doc.modelspace().query("DIMENSION")]
    assert any(abs(m - 6.5) < 1e-9 for m in dims)


def test_each_wall_has_sheets_with_viewport_and_title_block(doc):
    sheets = [doc.layouts.get(n) for n in doc.layout_names_in_taborder() if n != "Model"]
    assert len(sheets) >= 3
    for i, psp in enumerate(sheets, 1):
        vps = [v for v in psp.query("VIEWPORT") if v.dxf.id > 1]
        texts = [t.dxf.text for t in psp.query("TEXT")]
        assert f"{i} OF {len(sheets)}" in texts
        for field in ("PROJECT", "WALL", "SCALE", "DATE", "REVISION", "SHEET"):
            assert field in texts
        assert any(t.startswith("1. PRELIMINARY DESIGN AID ONLY") for t in texts)
        if "TABLE" not in psp.name and i <= 2:
            assert vps, psp.name
    first = sheets[0]
    assert any(t.dxf.text.startswith("PLAN - WALL ") for t in first.query("TEXT"))


def test_bending_schedule_unique_marks_and_same_weight():
    bars = wall_bar_list(make_design())
    placing, barlist = bending_schedule(bars)
    assert barlist["mark"].is_unique
    assert barlist["weight_lb"].sum() == pytest.approx(bars["weight_lb"].sum(), rel=1e-12)
    # same size, shape and length = one mark (common practice)
    key = placing[["size", "shape", "length_ft"]].astype(str).agg("|".join, axis=1)
    assert (placing.groupby(key)["bar_mark"].nunique() == 1).all()
    assert list(barlist["mark"]) == sorted(barlist["mark"], key=natural_key)


def test_hook_legs():
    # ACI 315-99 Table 1 / ACI 318-19 Table 25.3.1: 90-degree hook of a #5, D = 6db = 3.75 in,
    # out-to-out G = D/2 + db + 12db = 1.875 + 0.625 + 7.5 = 10 in (from memory: 10" tabulated)
    legs = bar_legs_in(5, "HK90", 80.0)
    assert legs["g_in"] == pytest.approx(10.0)
    assert legs["bend_diameter_in"] == pytest.approx(3.75)
    # the cut length returns: A - (D/2 + db) + arc on the centreline + 12db tail
    import math

    back = legs["a_in"] - (1.875 + 0.625) + math.pi / 2 * (3.75 + 0.625) / 2 + 7.5
    assert back == pytest.approx(80.0)


def test_natural_order_of_marks():
    assert sorted(["AA", "B", "Z", "A"], key=natural_key) == ["A", "B", "Z", "AA"]
    assert sorted(["W1-10", "W1-2"], key=natural_key) == ["W1-2", "W1-10"]


def test_sheets_say_why_earthwork_is_blank(tmp_path):
    bare = make_design(existing_ground=False)
    for design, said in ((bare, True), (make_design(), False)):
        path = de.write_elevation_dxf(design, tmp_path / f"{said}.dxf", input_hash="h",
                                      site_name="S")
        first = ezdxf.readfile(path).layouts.get(
            [n for n in ezdxf.readfile(path).layout_names_in_taborder() if n != "Model"][0])
        notes = " ".join(t.dxf.text for t in first.query("TEXT"))
        assert ("EXCAV CY and BACKFILL CY blank: no existing ground given" in notes) is said


def _viewport_windows(doc):
    """(sheet name, (x0, y0, x1, y1) of model space it shows) of every sheet viewport."""
    out = []
    for name in doc.layout_names_in_taborder():
        if name == "Model":
            continue
        for vp in doc.layouts.get(name).query("VIEWPORT"):
            if vp.dxf.id <= 1:
                continue  # the sheet's own main viewport
            scale = vp.dxf.view_height / vp.dxf.height  # model ft per paper inch
            cx, cy = vp.dxf.view_center_point.x, vp.dxf.view_center_point.y
            hw, hh = vp.dxf.width * scale / 2.0, vp.dxf.height * scale / 2.0
            out.append((name, (cx - hw, cy - hh, cx + hw, cy + hh)))
    return out


def test_every_viewport_shows_something_and_every_model_text_is_on_a_sheet(doc):
    windows = _viewport_windows(doc)
    assert windows
    msp = doc.modelspace()
    boxes = [bbox.extents([e]) for e in msp.query("TEXT LINE LWPOLYLINE CIRCLE")]
    for name, (x0, y0, x1, y1) in windows:
        inside = [b for b in boxes if b.has_data and x0 <= b.center.x <= x1
                  and y0 <= b.center.y <= y1]
        assert len(inside) >= 5, name  # not an empty viewport
    # no model text is cropped: each lies wholly inside some viewport's window
    for t in msp.query("TEXT"):
        b = bbox.extents([t])
        assert any(x0 - 1e-6 <= b.extmin.x and b.extmax.x <= x1 + 1e-6
                   and y0 - 1e-6 <= b.extmin.y and b.extmax.y <= y1 + 1e-6
                   for _, (x0, y0, x1, y1) in windows), t.dxf.text


def test_viewports_at_standard_scales_and_text_sized_for_the_plot(doc):
    from wallsched.exporters.dxf_style import ARCHITECTURAL_SCALES, ENGINEERING_SCALES_FT

    standard = set(ENGINEERING_SCALES_FT) | {s for s, _ in ARCHITECTURAL_SCALES}
    scales = []
    for name in doc.layout_names_in_taborder():
        if name == "Model":
            continue
        psp = doc.layouts.get(name)
        for vp in psp.query("VIEWPORT"):
            if vp.dxf.id > 1:
                s = vp.dxf.view_height / vp.dxf.height
                assert any(abs(s - k) < 1e-9 for k in standard), (name, s)
                scales.append(s)
        for t in psp.query("TEXT"):
            assert 0.079 <= t.dxf.height <= 0.21, (name, t.dxf.text)  # plotted inches
    # model text plots at 0.08" to 0.14" in the viewport that shows it
    windows = _viewport_windows(doc)
    for t in doc.modelspace().query("TEXT"):
        p = t.dxf.insert
        seen = [(s, w) for (_, w), s in zip(windows, scales, strict=True)
                if w[0] <= p.x <= w[2] and w[1] <= p.y <= w[3]]
        assert seen, t.dxf.text
        for s, _ in seen:
            assert 0.079 <= t.dxf.height / s <= 0.141, (t.dxf.text, t.dxf.height, s)


def test_dimensions_on_every_layout_measure_what_they_say(doc):
    for space in _layouts(doc):
        for d in space.query("DIMENSION"):
            assert d.dxf.get("text", "") in ("", "<>"), space.name
            texts = [v.plain_text() for v in d.virtual_entities() if v.dxftype() == "MTEXT"]
            assert dim_text_value_ft(texts[0]) == pytest.approx(d.get_measurement(), abs=0.0051)


def test_sample_like_wall_audit_and_overlaps(tmp_path):
    """A designed wall of the invented test site (engine to DXF): audit clean, no two texts
    overlap on any layout, a sheet with a viewport and a title block."""
    from sitekit import SMALL_GRID, make_site

    from wallsched.design import design_site
    from wallsched.pipeline import site_stations
    from wallsched.site import load_site

    site = load_site(make_site(tmp_path, extra=SMALL_GRID, top=(
        (0, 100.0), (30, 104.0), (60, 109.0), (90, 106.0), (150, 102.0)), bottom=(
        (0, 99.0), (70, 98.0), (150, 99.5)), xy=((0.0, 0.0), (80.0, 30.0), (140.0, 20.0))))
    wall = design_site(site, site_stations(site), audit=False).walls[0]
    path = de.write_elevation_dxf(wall, tmp_path, input_hash="h", site_name="Test site",
                                  vertical_exaggeration=2.0)
    got = ezdxf.readfile(path)
    assert not got.audit().has_errors
    test_no_two_texts_overlap_on_any_layout(got)
    test_each_wall_has_sheets_with_viewport_and_title_block(got)
    test_every_viewport_shows_something_and_every_model_text_is_on_a_sheet(got)
