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
    assert any(t.dxf.text.startswith("PLAN - WALL W1") for t in first.query("TEXT"))


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
