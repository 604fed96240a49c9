"""Write sample_site/plan.dxf, the invented grading plan of the sample site, with ezdxf.

Built from the sample site's CSV profiles, so the drawing and the CSVs agree:

- layer WALL-W1, WALL-W3: the wall alignments (lines in plan);
- layer GRADE-W1-TOP: W1's retained grade as a 3D polyline 1.5 ft behind the wall, one
  vertex per profile point at its station;
- layer SPOTS-W3: W3's grades as TW / BW spot labels (TEXT and MTEXT) beside the wall, with
  some other text on the same layer, a TW label that belongs to no wall and one that cannot
  be read (the reader warns about both).

Run: .venv/bin/python sample_site/make_plan_dxf.py
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import shapely

HERE = Path(__file__).resolve().parent


def _read(name: str):
    from wallsched.profile.csvread import read_alignment_csv, read_grade_csv

    path = HERE / name
    return read_alignment_csv(path) if "alignment" in name else read_grade_csv(path)


def point_at(line: shapely.LineString, s_ft: float, offset_ft: float = 0.0):
    """The plan point at distance ``s_ft`` along ``line`` (straight on past its ends),
    ``offset_ft`` to the left looking along it; and the direction there (radians)."""
    xy = np.asarray(line.coords)
    if s_ft <= 0:
        a, b, t = xy[0], xy[1], s_ft
    elif s_ft >= line.length:
        a, b, t = xy[-2], xy[-1], s_ft - line.length + math.dist(xy[-2], xy[-1])
    else:
        cum = np.r_[0, np.cumsum(np.hypot(*np.diff(xy, axis=0).T))]
        k = int(np.searchsorted(cum, s_ft, side="right") - 1)
        a, b, t = xy[k], xy[k + 1], s_ft - cum[k]
    u = (b - a) / math.dist(a, b)
    p = a + u * t + np.array([-u[1], u[0]]) * offset_ft
    return (float(p[0]), float(p[1])), math.atan2(u[1], u[0])


def build(path: Path = HERE / "plan.dxf") -> Path:
    import ezdxf

    doc = ezdxf.new("R2010", units=ezdxf.units.FT)
    doc.header["$INSUNITS"] = 2  # feet
    for name, color in (("WALL-W1", 1), ("WALL-W3", 1), ("GRADE-W1-TOP", 3),
                        ("SPOTS-W3", 2), ("NOTES", 7)):
        doc.layers.add(name, color=color)
    msp = doc.modelspace()

    w1 = _read("w1-alignment.csv").line
    w3 = _read("w3-alignment.csv").line
    msp.add_lwpolyline(list(w1.coords), dxfattribs={"layer": "WALL-W1"})
    msp.add_lwpolyline(list(w3.coords), dxfattribs={"layer": "WALL-W3"})

    # W1 retained grade: 3D polyline on the retained (left) side, 1.5 ft off the wall
    top = _read("w1-top.csv")
    verts = []
    for s, z in zip(top.station_ft, top.elevation_ft, strict=True):
        (x, y), _ = point_at(w1, s - 1000.0, 1.5)
        verts.append((x, y, float(z)))
    msp.add_polyline3d(verts, dxfattribs={"layer": "GRADE-W1-TOP"})

    # W3 spot labels: TW 3 ft on the retained (left) side, BW 3 ft in front (right)
    start = 2000.0
    tw = dict(zip(_read("w3-top.csv").station_ft, _read("w3-top.csv").elevation_ft,
                  strict=True))
    bw = dict(zip(_read("w3-bottom.csv").station_ft, _read("w3-bottom.csv").elevation_ft,
                  strict=True))
    forms = ["TW {:.2f}", "TW={:.2f}", "tw {:.1f}", "TW: {:.2f}"]
    spots = {"layer": "SPOTS-W3", "height": 1.0}
    for k, (s, z) in enumerate(sorted(tw.items())):
        if s in bw:  # both grades at this station: one two-line MTEXT on the wall line
            (x, y), _ = point_at(w3, s - start, 0.0)
            msp.add_mtext(f"TW {z:.2f}\\PBW {bw[s]:.2f}",
                          dxfattribs={"layer": "SPOTS-W3", "insert": (x, y),
                                      "char_height": 1.0})
            continue
        (x, y), ang = point_at(w3, s - start, 3.0)
        msp.add_text(forms[k % len(forms)].format(z),
                     dxfattribs={**spots, "insert": (x, y), "rotation": math.degrees(ang)})
    for s, z in sorted(bw.items()):
        if s in tw:
            continue
        (x, y), _ = point_at(w3, s - start, -3.0)
        msp.add_text(f"BW:{z:.2f}", dxfattribs={**spots, "insert": (x, y)})
    # other text on the layer: a lot note, a pad grade, an unreadable TW and a stray one
    (x, y), _ = point_at(w3, 60.0, 6.0)
    msp.add_text("LOT 17", dxfattribs={**spots, "insert": (x, y)})
    (x, y), _ = point_at(w3, 90.0, 8.0)
    msp.add_text("PAD 433.50", dxfattribs={**spots, "insert": (x, y), "rotation": 30.0})
    (x, y), _ = point_at(w3, 120.0, 4.0)
    msp.add_text("TW SEE DETAIL 4", dxfattribs={**spots, "insert": (x, y)})
    (x, y), _ = point_at(w3, 70.0, 45.0)
    msp.add_text("TW 436.00", dxfattribs={**spots, "insert": (x, y)})
    msp.add_text("INVENTED SAMPLE GRADING PLAN - NOT FOR CONSTRUCTION",
                 dxfattribs={"layer": "NOTES", "height": 2.0, "insert": (4800.0, 8400.0)})
    doc.saveas(path)
    return path


if __name__ == "__main__":
    print(f"wrote {build()}")
