"""Write sample_site/grading.xml and sample_site/survey.csv: the sample site's invented
grading model around wall W4 (lot 12 pad), as a designer's program would exchange it.

- grading.xml (LandXML 1.2, feet): alignment "W4 wall line" (a line, a 45-degree arc of
  radius 120 ft turning left, a line; staStart 30+00) and the TIN surface "FG", the
  finished grade: the lot 12 pad on the left of the wall (rising 1.2 % along it), the drive
  below it on the right, and a steep strip 1 ft either side of the wall line between them.
  Coordinates are written northing before easting, as the standard does.
- survey.csv: the invented existing-ground survey, P,N,E,Z,D rows on a 25-ft grid coded
  "EG", with a few shots of other codes (trees, a manhole) that the site file filters out.

The wall's grades are then read from the surface 2 ft either side of the wall line.

Run: .venv/bin/python sample_site/make_grading_xml.py
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np

HERE = Path(__file__).resolve().parent
START = np.array([5500.0, 8400.0])  # x = easting, y = northing, ft
LINE1_FT, RADIUS_FT, TURN_DEG, LINE2_FT = 80.0, 120.0, 45.0, 60.0
STA_START_FT = 3000.0
OFFSETS_FT = (-40.0, -20.0, -6.0, -1.0, 1.0, 6.0, 20.0, 40.0)  # left of the wall positive


def wall_point(s: float) -> tuple[np.ndarray, np.ndarray]:
    """Plan point and unit left normal at distance ``s`` along the wall line (straight on
    past its ends)."""
    th = math.radians(TURN_DEG)
    arc = RADIUS_FT * th
    centre = START + [LINE1_FT, RADIUS_FT]
    if s <= LINE1_FT:
        return START + [s, 0.0], np.array([0.0, 1.0])
    if s <= LINE1_FT + arc:
        a = (s - LINE1_FT) / RADIUS_FT
        return (centre + RADIUS_FT * np.array([math.sin(a), -math.cos(a)]),
                np.array([-math.sin(a), math.cos(a)]))
    end = centre + RADIUS_FT * np.array([math.sin(th), -math.cos(th)])
    u = np.array([math.cos(th), math.sin(th)])
    return end + u * (s - LINE1_FT - arc), np.array([-u[1], u[0]])


def finished_grade(s: float, offset: float) -> float:
    """The invented finished grade (ft) at distance ``s`` along the wall, ``offset`` left."""
    if offset > 0:  # lot 12 pad, rising along the wall, draining toward it at 1 %
        return 423.0 + 0.012 * s + 0.01 * (offset - 1.0)
    return 416.0 + 0.004 * s - 0.02 * (abs(offset) - 1.0)  # the drive, falling away


def existing_ground(x: float, y: float) -> float:
    """The invented natural ground before grading."""
    return 418.5 + 0.02 * (y - 8400.0) - 0.006 * (x - 5500.0) + 0.4 * math.sin((x - 5500) / 40)


def stations() -> np.ndarray:
    """Distances along the wall for the TIN's rows: 10 ft on the lines, 3 degrees on the arc,
    running 20 ft past both ends."""
    arc = RADIUS_FT * math.radians(TURN_DEG)
    total = LINE1_FT + arc + LINE2_FT
    rows = np.concatenate([np.arange(-20.0, LINE1_FT, 10.0),
                           LINE1_FT + arc * np.arange(0, 15) / 15,
                           np.arange(LINE1_FT + arc, total + 20.0 + 1e-9, 10.0)])
    return np.unique(np.round(rows, 6))


def _ne(p) -> str:
    return f"{p[1]:.4f} {p[0]:.4f}"


def grading_xml() -> str:
    st = stations()
    pts, faces = [], []
    for s in st:
        p, n = wall_point(float(s))
        for o in OFFSETS_FT:
            q = p + o * n
            pts.append((q[0], q[1], finished_grade(float(s), o)))
    m = len(OFFSETS_FT)
    for i in range(len(st) - 1):
        for j in range(m - 1):
            a = i * m + j
            b, c, d = a + 1, a + m, a + m + 1
            faces += [(a, c, d), (a, d, b)]
    th = math.radians(TURN_DEG)
    p1 = START + [LINE1_FT, 0.0]
    centre = START + [LINE1_FT, RADIUS_FT]
    p2 = centre + RADIUS_FT * np.array([math.sin(th), -math.cos(th)])
    p3 = p2 + LINE2_FT * np.array([math.cos(th), math.sin(th)])
    length = LINE1_FT + RADIUS_FT * th + LINE2_FT
    p_text = "\n".join(f'      <P id="{k + 1}">{y:.4f} {x:.4f} {z:.4f}</P>'
                       for k, (x, y, z) in enumerate(pts))
    f_text = "\n".join(f"      <F>{a + 1} {b + 1} {c + 1}</F>" for a, b, c in faces)
    return f"""<?xml version="1.0" encoding="UTF-8"?>
<!-- Invented sample grading model (Tansy Hollow sample site): ILLUSTRATIVE only. -->
<LandXML xmlns="http://www.landxml.org/schema/LandXML-1.2" version="1.2"
         date="2026-01-15" time="09:00:00">
  <Units>
    <Imperial areaUnit="squareFoot" linearUnit="foot" volumeUnit="cubicYard"
              temperatureUnit="fahrenheit" pressureUnit="inHG" angularUnit="decimal degrees"
              directionUnit="decimal degrees"/>
  </Units>
  <Project name="Tansy Hollow sample grading (invented)"/>
  <Alignments name="Site walls">
    <Alignment name="W4 wall line" length="{length:.4f}" staStart="{STA_START_FT:.4f}">
      <CoordGeom>
        <Line><Start>{_ne(START)}</Start><End>{_ne(p1)}</End></Line>
        <Curve rot="ccw" radius="{RADIUS_FT:.4f}">
          <Start>{_ne(p1)}</Start><Center>{_ne(centre)}</Center><End>{_ne(p2)}</End>
        </Curve>
        <Line><Start>{_ne(p2)}</Start><End>{_ne(p3)}</End></Line>
      </CoordGeom>
    </Alignment>
  </Alignments>
  <Surfaces>
    <Surface name="FG" desc="finished grade, lot 12 pad and drive">
      <Definition surfType="TIN">
        <Pnts>
{p_text}
        </Pnts>
        <Faces>
{f_text}
        </Faces>
      </Definition>
    </Surface>
  </Surfaces>
</LandXML>
"""


def survey_csv() -> str:
    rows = ["P,N,E,Z,D"]
    k = 100
    for y in np.arange(8300.0, 8601.0, 25.0):
        for x in np.arange(5440.0, 5800.0 + 1, 25.0):
            k += 1
            rows.append(f"{k},{y:.3f},{x:.3f},{existing_ground(x, y):.3f},EG")
    rows += ["9001,8450.000,5560.000,431.2,TREE oak 18in",
             "9002,8380.000,5600.000,417.9,MH rim",
             "9003,8470.000,5660.000,436.0,TREE"]
    return "\n".join(rows) + "\n"


def build() -> None:
    (HERE / "grading.xml").write_text(grading_xml())
    (HERE / "survey.csv").write_text(survey_csv())


if __name__ == "__main__":
    build()
    print(f"wrote {HERE / 'grading.xml'} and {HERE / 'survey.csv'}")
