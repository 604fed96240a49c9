"""TW / BW spot labels: TEXT and MTEXT built here with ezdxf from known profiles, with noise
(other text, rotated text, a label off the wall, one that cannot be read)."""

from __future__ import annotations

import math

import ezdxf
import numpy as np
import pytest
import shapely
from ezdxf.enums import TextEntityAlignment
from wallsched.profile.csvread import alignment_from_xy
from wallsched.profile.labels import compile_pattern, default_pattern, parse_label
from wallsched.profile.labels import read_label_grade as read

from wallsched.errors import ProfileError

TW = [(0.0, 105.5), (35.0, 107.25), (80.0, 106.0), (120.0, 108.4)]  # invented profiles
BW = [(0.0, 100.0), (60.0, 99.2), (120.0, 100.4)]
START_FT = 300.0


@pytest.fixture
def bent():
    return alignment_from_xy(np.array([[500.0, 500.0], [570.0, 500.0], [610.0, 540.0]]), "a")


def at(al, s_ft, off_ft):
    """Point ``off_ft`` left of the wall at distance s (shapely interpolation, test helper)."""
    p = shapely.line_interpolate_point(al.line, s_ft)
    q = shapely.line_interpolate_point(al.line, min(s_ft + 0.01, al.length_ft))
    r = shapely.line_interpolate_point(al.line, max(s_ft - 0.01, 0.0))
    ux, uy = q.x - r.x, q.y - r.y
    n = math.hypot(ux, uy)
    return p.x - uy / n * off_ft, p.y + ux / n * off_ft, math.degrees(math.atan2(uy, ux))


def spot_plan(path, al, *, extra=None):
    doc = ezdxf.new("R2010")
    doc.header["$INSUNITS"] = 2
    msp = doc.modelspace()
    lay = {"layer": "SPOT ELEV"}
    forms = ["TW {:.2f}", "TW={:.2f}", "tw:{:.2f}", "TW EL {:.2f}"]
    handles = {}
    for k, (s, z) in enumerate(TW):
        x, y, ang = at(al, s, 3.0)
        if s == 0.0:  # both grades at the start: one MTEXT over two lines
            e = msp.add_mtext(f"TW {z:.2f}\\PBW {BW[0][1]:.2f}",
                              dxfattribs={**lay, "insert": (x, y), "char_height": 1.0})
            continue
        # rotated along the wall, like a drafter's labels
        e = msp.add_text(forms[k % 4].format(z), dxfattribs={**lay, "rotation": ang,
                                                            "height": 1.0})
        e.set_placement((x, y))
    for s, z in BW[1:]:
        x, y, _ = at(al, s, -2.0)
        e = msp.add_text(f"BW: {z:.2f}", dxfattribs={**lay, "height": 1.0})
        # justified text: it stands at its alignment point, not its insert point
        e.set_placement((x, y), align=TextEntityAlignment.MIDDLE_CENTER)
    # noise: other text, a number without a kind, a stray TW far off, an unreadable TW
    x, y, _ = at(al, 50.0, 5.0)
    msp.add_text("LOT 12 PAD 109.00", dxfattribs={**lay, "insert": (x, y), "rotation": 15})
    msp.add_text("105.75", dxfattribs={**lay, "insert": (x + 2, y)})
    x, y, _ = at(al, 30.0, -40.0)
    handles["far"] = msp.add_text("TW 111.00", dxfattribs={**lay, "insert": (x, y)}).dxf.handle
    x, y, _ = at(al, 90.0, 4.0)
    handles["bad"] = msp.add_text("TW (see detail)",
                                  dxfattribs={**lay, "insert": (x, y)}).dxf.handle
    msp.add_text("TW 999.00", dxfattribs={"layer": "OTHER", "insert": at(al, 40.0, 1.0)[:2]})
    if extra:
        extra(msp)
    doc.saveas(path)
    return handles


def test_tw_and_bw_profiles_from_noisy_labels(tmp_path, bent):
    path = tmp_path / "spots.dxf"
    handles = spot_plan(path, bent)
    opts = {"layer": "SPOT ELEV", "labels": "TW"}
    with pytest.warns(Warning) as rec:
        tw = read(path, opts, "spots.dxf", alignment=bent, start_station_ft=START_FT)
    np.testing.assert_allclose(tw.station_ft, [START_FT + s for s, _ in TW], atol=0.01)
    np.testing.assert_allclose(tw.elevation_ft, [z for _, z in TW], atol=1e-9)
    text = " ".join(str(w.message) for w in rec)
    assert handles["far"] in text and "farther than 10 ft" in text
    assert handles["bad"] in text and "could not be read" in text
    assert tw.warnings and all(w in text for w in tw.warnings)
    bw = read(path, {"layer": "spot elev", "labels": "bw"}, "spots.dxf", alignment=bent,
              start_station_ft=START_FT)
    np.testing.assert_allclose(bw.station_ft, [START_FT + s for s, _ in BW], atol=0.01)
    np.testing.assert_allclose(bw.elevation_ft, [z for _, z in BW], atol=1e-9)
    assert bw.warnings == ()  # the TW noise is not the BW reader's concern


def test_allowance_and_wider_band(tmp_path, bent):
    path = tmp_path / "spots.dxf"
    spot_plan(path, bent)
    opts = {"layer": "SPOT ELEV", "labels": "TW", "allowance_ft": 0.5, "max_offset_ft": 50.0}
    with pytest.warns(Warning, match="could not be read"):
        tw = read(path, opts, "spots.dxf", alignment=bent, start_station_ft=START_FT)
    # the stray label 40 ft off now counts, at station 30
    expect = sorted([*TW, (30.0, 111.0)])
    np.testing.assert_allclose(tw.station_ft, [START_FT + s for s, _ in expect], atol=0.01)
    np.testing.assert_allclose(tw.elevation_ft, [z - 0.5 for _, z in expect], atol=1e-9)


def test_custom_pattern(tmp_path, bent):
    def extra(msp):
        for s, z in ((10.0, 101.0), (110.0, 102.0)):
            x, y, _ = at(bent, s, 1.0)
            msp.add_text(f"FG {z:.1f}", dxfattribs={"layer": "FG SPOTS", "insert": (x, y)})
        msp.add_mtext("FINISH GRADE\\PFG 101.5", dxfattribs={"layer": "FG SPOTS",
                                                             "insert": at(bent, 60.0, 2.0)[:2]})

    path = tmp_path / "fg.dxf"
    spot_plan(path, bent, extra=extra)
    g = read(path, {"layer": "FG SPOTS", "labels": "BW", "pattern": r"\bFG\s+(\d+\.\d+)"},
             "fg.dxf", alignment=bent, start_station_ft=0.0)
    np.testing.assert_allclose(g.station_ft, [10.0, 60.0, 110.0], atol=0.01)
    np.testing.assert_allclose(g.elevation_ft, [101.0, 101.5, 102.0])


def test_layer_with_no_readable_label(tmp_path, bent):
    path = tmp_path / "spots.dxf"
    spot_plan(path, bent)
    with pytest.raises(ProfileError, match="no BW label on layer 'OTHER'"):
        read(path, {"layer": "OTHER", "labels": "BW"}, "spots.dxf", alignment=bent,
             start_station_ft=0.0)


@pytest.mark.parametrize("text, kind, expect", [
    ("TW 105.50", "TW", ("ok", 105.5)),
    ("TW=105.5", "TW", ("ok", 105.5)),
    ("BW:98.00", "BW", ("ok", 98.0)),
    ("tw 105.5", "TW", ("ok", 105.5)),
    ("TW 105.50\nBW 99.00", "BW", ("ok", 99.0)),
    ("TW 105.50\nBW 99.00", "TW", ("ok", 105.5)),
    ("TWEED 105.5", "TW", ("none", None)),
    ("BW 99.0", "TW", ("none", None)),
    ("TW ??", "TW", ("bad", None)),
    ("TW 101.0 TW 102.0", "TW", ("bad", None)),
])
def test_default_patterns(text, kind, expect):
    assert parse_label(text, compile_pattern(default_pattern(kind)), kind) == expect


def test_pattern_needs_one_group():
    with pytest.raises(ValueError, match="capturing group"):
        compile_pattern(r"TW (\d+)\.(\d+)")
    assert compile_pattern(r"(?P<elevation>\d+) TOP").groups == 1
