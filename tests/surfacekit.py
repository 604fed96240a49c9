"""Invented surfaces for tests: a LandXML file (alignment, TIN, profile), a DXF TIN and a
survey-points file, written from closed-form geometry so that tests can compare with it.

The wall alignment "Wall A" (x = easting, y = northing, ft): a line due east from (1000, 2000)
for 60 ft, a counter-clockwise arc of radius 80 ft turning 60 degrees, and a line of 40 ft
on the new bearing. Its staStart is 5+00.
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np

START_XY = np.array([1000.0, 2000.0])
LINE1_FT, RADIUS_FT, TURN_DEG, LINE2_FT = 60.0, 80.0, 60.0, 40.0
STA_START_FT = 500.0
ARC_FT = RADIUS_FT * math.radians(TURN_DEG)  # s = R theta
LENGTH_FT = LINE1_FT + ARC_FT + LINE2_FT


def alignment_point(s: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Closed-form plan point and unit left normal at distance ``s`` along Wall A."""
    s = np.atleast_1d(np.asarray(s, dtype=float))
    pts = np.empty((s.size, 2))
    nrm = np.empty((s.size, 2))
    center = START_XY + [LINE1_FT, RADIUS_FT]
    th_end = math.radians(TURN_DEG)
    p_end_arc = center + RADIUS_FT * np.array([math.sin(th_end), -math.cos(th_end)])
    u2 = np.array([math.cos(th_end), math.sin(th_end)])
    for k, sk in enumerate(s):
        if sk <= LINE1_FT:
            pts[k] = START_XY + [sk, 0.0]
            nrm[k] = [0.0, 1.0]
        elif sk <= LINE1_FT + ARC_FT:
            th = (sk - LINE1_FT) / RADIUS_FT
            pts[k] = center + RADIUS_FT * np.array([math.sin(th), -math.cos(th)])
            nrm[k] = [-math.sin(th), math.cos(th)]
        else:
            pts[k] = p_end_arc + u2 * (sk - LINE1_FT - ARC_FT)
            nrm[k] = [-u2[1], u2[0]]
    return pts, nrm


def _ne(p) -> str:
    return f"{p[1]:.6f} {p[0]:.6f}"  # LandXML: northing before easting


def grid_tin(z_of, *, x0=960.0, x1=1160.0, y0=1960.0, y1=2140.0, step=10.0, jitter=0.0,
             seed=0):
    """A grid TIN over the site: vertices (n x 3) and triangles (m x 3)."""
    rng = np.random.default_rng(seed)
    xs = np.arange(x0, x1 + 1e-9, step)
    ys = np.arange(y0, y1 + 1e-9, step)
    gx, gy = np.meshgrid(xs, ys)
    x, y = gx.ravel(), gy.ravel()
    z = z_of(x, y) + (rng.uniform(-jitter, jitter, x.size) if jitter else 0.0)
    nx = xs.size
    tris = []
    for j in range(ys.size - 1):
        for i in range(nx - 1):
            a = j * nx + i
            b, c, d = a + 1, a + nx, a + nx + 1
            tris += [(a, b, d), (a, d, c)] if (i + j) % 2 else [(a, b, c), (b, d, c)]
    return np.column_stack([x, y, z]), np.array(tris)


def finished_grade(x, y):
    """The invented finished grade behind the wall (high side, north and west)."""
    return 110.0 + 0.03 * (y - 2000.0) - 0.01 * (x - 1000.0) + 0.5 * np.sin((x - 1000) / 25)


def front_grade(x, y):
    return 103.0 - 0.01 * (x - 1000.0) + 0.02 * (y - 2000.0)


def existing(x, y):
    return 104.5 + 0.025 * (y - 2000.0) - 0.008 * (x - 1000.0)


def landxml_text(verts, tris, *, units="<Imperial linearUnit=\"foot\"/>", scale=1.0,
                 profile=True, hidden=()) -> str:
    """LandXML 1.2 with alignment "Wall A" (and profile "TW") and TIN surface "FG"."""
    th = math.radians(TURN_DEG)
    p1 = START_XY + [LINE1_FT, 0.0]
    center = START_XY + [LINE1_FT, RADIUS_FT]
    p2 = center + RADIUS_FT * np.array([math.sin(th), -math.cos(th)])
    p3 = p2 + LINE2_FT * np.array([math.cos(th), math.sin(th)])
    f = scale  # file units per foot
    pts = "\n".join(f'<P id="{k + 1}">{v[1] * f:.6f} {v[0] * f:.6f} {v[2] * f:.6f}</P>'
                    for k, v in enumerate(verts))
    hide = ' i="1"'
    faces = "\n".join(f'<F{hide if k in hidden else ""}>{a + 1} {b + 1} {c + 1}</F>'
                      for k, (a, b, c) in enumerate(tris))
    prof = """<Profile name="Wall A profiles">
  <ProfAlign name="TW">
    <PVI>500 110.0</PVI>
    <ParaCurve length="60">560 112.4</ParaCurve>
    <PVI>700 110.0</PVI>
  </ProfAlign>
</Profile>""" if profile else ""
    return f"""<?xml version="1.0" encoding="UTF-8"?>
<LandXML xmlns="http://www.landxml.org/schema/LandXML-1.2" version="1.2" date="2026-01-01"
 time="00:00:00">
<Units>{units}</Units>
<Alignments name="walls">
<Alignment name="Wall A" length="{LENGTH_FT * f:.6f}" staStart="{STA_START_FT * f:.6f}">
<CoordGeom>
  <Line><Start>{_ne(START_XY * f)}</Start><End>{_ne(p1 * f)}</End></Line>
  <Curve rot="ccw"><Start>{_ne(p1 * f)}</Start><Center>{_ne(center * f)}</Center>
    <End>{_ne(p2 * f)}</End></Curve>
  <Line><Start>{_ne(p2 * f)}</Start><End>{_ne(p3 * f)}</End></Line>
</CoordGeom>
{prof}
</Alignment>
<Alignment name="Access Road" staStart="0"><CoordGeom>
  <Line><Start>0 0</Start><End>0 100</End></Line></CoordGeom></Alignment>
</Alignments>
<Surfaces>
<Surface name="FG"><Definition surfType="TIN">
<Pnts>
{pts}
</Pnts>
<Faces>
{faces}
</Faces>
</Definition></Surface>
</Surfaces>
</LandXML>
"""


def write_dxf_tin(path: Path, verts, tris, layer="FG-TIN", polyface=False) -> Path:
    import ezdxf

    doc = ezdxf.new("R2010")
    doc.header["$INSUNITS"] = 2
    msp = doc.modelspace()
    if polyface:
        mesh = msp.add_polyface(dxfattribs={"layer": layer})
        mesh.append_faces([[tuple(verts[i]) for i in t] for t in tris])
    else:
        for t in tris:
            a, b, c = (tuple(verts[i]) for i in t)
            msp.add_3dface([a, b, c, c], dxfattribs={"layer": layer})
    doc.saveas(path)
    return path


def write_points(path: Path, verts, *, header=True, code="EG", noise_rows=True) -> Path:
    rows = ["P,N,E,Z,D"] if header else []
    for k, (x, y, z) in enumerate(verts, 1):
        rows.append(f"{k},{y:.4f},{x:.4f},{z:.4f},{code} shot")
    if noise_rows:  # other codes, far off the ground: must be filtered out by the code
        rows.append(f"9001,{2050.0:.4f},{1050.0:.4f},999.0,TREE oak")
        rows.append(f"9002,{2010.0:.4f},{1020.0:.4f},-50.0,MH rim")
    path.write_text("\n".join(rows) + "\n")
    return path


def tin_reference(verts, tris, xy: np.ndarray) -> np.ndarray:
    """The elevation of a TIN at plan points by matplotlib's LinearTriInterpolator (a
    general-purpose reference library, independent of the project's Surface)."""
    from matplotlib.tri import LinearTriInterpolator, Triangulation

    tri = Triangulation(verts[:, 0], verts[:, 1], tris)
    return np.asarray(LinearTriInterpolator(tri, verts[:, 2])(xy[:, 0], xy[:, 1]).filled(np.nan))
