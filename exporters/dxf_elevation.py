"""One DXF per wall for the drafter: the elevation, typical sections, schedule, bar list, notes.

Drawing units are feet (``$INSUNITS`` = 2), DXF R2010. The elevation is drawn at true scale in x
(x = station) and at ``vertical_exaggeration`` in y; text heights read at 1" = 20' plotted
(0.08" to 0.20" on paper). Typical sections are drawn enlarged by :data:`DETAIL_SCALE` so that they
read at 1" = 4'-0" on the same plot; their dimensions carry the true size as text in ft-in.

Layers (discipline-major-minor; colour and linetype on the layer, entities BYLAYER):
see :data:`LAYERS`. Only LWPOLYLINEs on the elevation: wall outline, footing, key and grades (the
tables and the sections use lines, arcs and circles).

Output is deterministic: fixed header dates and GUIDs, handles in creation order.
"""

from __future__ import annotations

import math
from fractions import Fraction
from pathlib import Path

import numpy as np

from ..cautions import CAUTIONS
from ..profile.stationing import format_station

DETAIL_SCALE = 5.0  # 1" = 4'-0" sections on a 1" = 20' plot
TEXT_FT = 2.0  # 0.10" at 1" = 20'
TEXT_SMALL_FT = 1.6  # 0.08" at 1" = 20'
TEXT_TITLE_FT = 4.0  # 0.20" at 1" = 20'
TEXT_STYLE = "Standard"
CHAR_W = 0.8  # text width per character, in text heights (for laying out tables)

# name: (ACI colour, linetype, what it holds)
LAYERS: dict[str, tuple[int, str, str]] = {
    "C-WALL-OTLN": (7, "Continuous", "stem outline and section concrete"),
    "C-WALL-FTNG": (4, "DASHED2", "footing and key below grade (hidden)"),
    "C-WALL-BNDY": (8, "CENTER", "segment boundaries"),
    "C-WALL-JNTC": (3, "DASHED", "contraction joints"),
    "C-WALL-JNTE": (6, "PHANTOM", "expansion joints"),
    "C-WALL-ELEV": (2, "Continuous", "TW, BW, TF, BF callouts"),
    "C-WALL-TAGS": (1, "Continuous", "segment and section-mark tags"),
    "C-WALL-GRID": (9, "Continuous", "elevation grid, station ticks and labels"),
    "C-WALL-DIMS": (1, "Continuous", "dimensions"),
    "C-WALL-RBAR": (1, "Continuous", "reinforcing bars and bar marks"),
    "C-WALL-TABL": (7, "Continuous", "schedule and bar list tables"),
    "C-WALL-NOTE": (7, "Continuous", "notes, cautions, titles"),
    "C-GRAD-RETD": (30, "DASHDOT", "retained grade"),
    "C-GRAD-FRNT": (3, "Continuous", "front grade"),
    "C-GRAD-EXST": (8, "DOT", "existing ground"),
}
# revision clouds and tags (drawn only when a comparison run gives changed station ranges)
REVISION_LAYER = "C-ANNO-REVS"
REVISION_LAYER_STYLE = (1, "Continuous", "revision clouds and revision tags")
CLOUD_CHORD_FT = 6.0  # scallop chord, drawn ft (0.3" at 1" = 20')
CLOUD_ARC_DEG = 120.0  # included angle of each scallop
POLYLINE_LAYERS = ("C-WALL-OTLN", "C-WALL-FTNG", "C-GRAD-RETD", "C-GRAD-FRNT", "C-GRAD-EXST")


def elevation_dxf_name(wall: str) -> str:
    return f"{wall}-elevation.dxf"


def format_ft_in(value_ft: float) -> str:
    """Feet as ft-in to the nearest 1/8 in: ``1.5 -> 1'-6"``, ``0.3125 -> 0'-3 3/4"``."""
    eighths = round(abs(value_ft) * 96)
    sign = "-" if value_ft < 0 and eighths else ""
    feet, rest = divmod(eighths, 96)
    inches = Fraction(rest, 8)
    whole = int(inches)
    frac = inches - whole
    text = f"{whole}" + (f" {frac.numerator}/{frac.denominator}" if frac else "")
    return f"{sign}{feet}'-{text}\""


def format_elev(value_ft: float) -> str:
    return f"{value_ft:.2f}"


def station_interval_ft(length_ft: float) -> float:
    """Station labels every 25, 50 or 100 ft by the wall's length."""
    if length_ft <= 300:
        return 25.0
    if length_ft <= 800:
        return 50.0
    return 100.0


def _grid_interval_ft(range_ft: float) -> float:
    return next(s for s in (1.0, 2.0, 5.0, 10.0, 20.0, 50.0) if range_ft / s <= 12)


class _Sheet:
    """Model-space drawing helpers with a fixed style."""

    def __init__(self, msp):
        self.msp = msp

    def line(self, p, q, layer):
        self.msp.add_line(p, q, dxfattribs={"layer": layer})

    def poly(self, pts, layer, closed=False):
        self.msp.add_lwpolyline([(float(x), float(y)) for x, y in pts], close=closed,
                                dxfattribs={"layer": layer})

    def text(self, s, p, h, layer, align="LEFT", rotation=0.0):
        from ezdxf.enums import TextEntityAlignment

        t = self.msp.add_text(s, height=h, rotation=rotation,
                              dxfattribs={"layer": layer, "style": TEXT_STYLE})
        t.set_placement((float(p[0]), float(p[1])), align=TextEntityAlignment[align])
        return t

    def mtext(self, s, p, h, width, layer):
        m = self.msp.add_mtext(s, dxfattribs={"layer": layer, "style": TEXT_STYLE,
                                              "char_height": h, "width": width})
        m.set_location((float(p[0]), float(p[1])))
        return m

    def circle(self, c, r, layer):
        self.msp.add_circle((float(c[0]), float(c[1])), r, dxfattribs={"layer": layer})

    def dim(self, p1, p2, base, text, angle=0.0):
        d = self.msp.add_linear_dim(
            base=base, p1=p1, p2=p2, angle=angle, text=text, dimstyle="Standard",
            override={"dimtxt": TEXT_SMALL_FT, "dimasz": 1.0, "dimexo": 0.5, "dimexe": 0.8,
                      "dimgap": 0.4, "dimtad": 1, "dimtih": 0, "dimtoh": 0,
                      "dimtxsty": TEXT_STYLE},
            dxfattribs={"layer": "C-WALL-DIMS"})
        d.render()

    def table(self, x0, y0, headers, rows, h, layer="C-WALL-TABL", title=None):
        """Plain lines and text; returns (width, height)."""
        cols = len(headers)
        widths = []
        for c in range(cols):
            n = max([len(headers[c])] + [len(str(r[c])) for r in rows])
            widths.append(n * CHAR_W * h + 1.5 * h)
        row_h = 1.8 * h
        y = y0
        if title:
            self.text(title, (x0, y + 0.6 * h), 1.25 * h, "C-WALL-NOTE")
        total_w = sum(widths)
        n_rows = len(rows) + 1
        for i in range(n_rows + 1):
            self.line((x0, y - i * row_h), (x0 + total_w, y - i * row_h), layer)
        x = x0
        for w in [0.0, *widths]:
            x += w
            self.line((x, y), (x, y - n_rows * row_h), layer)
        for i, row in enumerate([headers, *rows]):
            x = x0
            for c, cell in enumerate(row):
                self.text(str(cell), (x + 0.6 * h, y - (i + 0.5) * row_h), h, layer,
                          align="MIDDLE_LEFT")
                x += widths[c]
        return total_w, n_rows * row_h


def _tw_ends(seg) -> tuple[float, float]:
    if math.isfinite(seg.top_of_wall_ft):
        return seg.top_of_wall_ft, seg.top_of_wall_ft
    return seg.top_of_wall_start_ft, seg.top_of_wall_end_ft


def _runs(segments):
    """Contiguous runs of segments (a gap where no wall is needed splits a run)."""
    runs, cur = [], []
    for s in segments:
        if cur and abs(s.station_start_ft - cur[-1].station_end_ft) > 1e-6:
            runs.append(cur)
            cur = []
        cur.append(s)
    if cur:
        runs.append(cur)
    return runs


def _bottom_ft(seg) -> float:
    sec = seg.section
    key = sec.key_depth_in / 12.0 if sec is not None and sec.has_key else 0.0
    return seg.bottom_of_footing_ft - key


def write_elevation_dxf(design, path, *, input_hash: str, site_name: str,
                        vertical_exaggeration: float = 1.0, bars=None, quantities=None,
                        revisions=None, revision_tag: str = "1") -> Path:
    """Write ``<wall>-elevation.dxf`` for one :class:`WallDesign`; returns the path written.

    ``path`` is a file path or a folder (then the file is named :func:`elevation_dxf_name`).
    ``bars`` is the wall's bar list and ``quantities`` its per-segment quantity frame, both
    the engine's (``design.bars`` and ``design.quantities`` when not given).
    ``revisions`` is a list of changed ``(station_start_ft, station_end_ft)`` ranges (e.g.
    ``RunDiff.changed_station_ranges(wall)``): each gets a revision cloud around that stretch
    of the elevation, with a revision tag (a triangle holding ``revision_tag``), on the layer
    :data:`REVISION_LAYER`. None or empty draws no revision layer.
    """
    import ezdxf

    if not vertical_exaggeration > 0:
        raise ValueError("vertical exaggeration must be positive")
    path = Path(path)
    if path.is_dir():
        path = path / elevation_dxf_name(design.wall)
    bars = design.bars if bars is None else bars
    quantities = design.quantities if quantities is None else quantities
    if bars is None or quantities is None:
        raise ValueError(f"wall {design.wall}: no bar list or quantities to draw (the engine's "
                         "design stage fills them)")
    bars = bars[bars["wall"] == design.wall].reset_index(drop=True)
    quantities = quantities[quantities["wall"] == design.wall].reset_index(drop=True)

    old = ezdxf.options.write_fixed_meta_data_for_testing
    ezdxf.options.write_fixed_meta_data_for_testing = True  # fixed dates, GUIDs and marker
    try:
        return _write(design, path, input_hash=input_hash, site_name=site_name,
                      ve=vertical_exaggeration, bars=bars, quantities=quantities,
                      revisions=list(revisions or ()), revision_tag=str(revision_tag))
    finally:
        ezdxf.options.write_fixed_meta_data_for_testing = old


def _write(design, path: Path, *, input_hash, site_name, ve, bars, quantities,
           revisions=(), revision_tag="1") -> Path:
    import ezdxf

    from ..engine.model import describe

    vertical_exaggeration = ve
    doc = ezdxf.new("R2010", setup=["linetypes"], units=2)
    doc.header["$INSUNITS"] = 2  # feet
    doc.header["$MEASUREMENT"] = 0
    doc.header["$LUNITS"] = 2
    doc.header["$LTSCALE"] = 4.0
    doc.header["$TEXTSTYLE"] = TEXT_STYLE
    doc.header["$TEXTSIZE"] = TEXT_FT
    for name, (colour, ltype, desc) in LAYERS.items():
        layer = doc.layers.add(name, color=colour, linetype=ltype)
        layer.description = desc
    sheet = _Sheet(doc.modelspace())
    extents = _draw_elevation(sheet, design, vertical_exaggeration, site_name)
    if revisions:
        colour, ltype, desc = REVISION_LAYER_STYLE
        doc.layers.add(REVISION_LAYER, color=colour, linetype=ltype).description = desc
        _draw_revisions(sheet, design, revisions, revision_tag)
    x_right, y_bottom, y_top = extents
    sec_x0 = x_right + 30.0
    _draw_sections(sheet, design, sec_x0, y_bottom, bars)
    _draw_tables(sheet, design, bars, quantities, x0=float(design.stations.station_ft[0]) - 30.0,
                 y0=y_bottom - 16.0, notes_x=max(sec_x0, x_right + 30.0),
                 input_hash=input_hash, site_name=site_name, ve=vertical_exaggeration,
                 describe=describe)
    path.parent.mkdir(parents=True, exist_ok=True)
    # ezdxf adds the CLASSES entries of the entity types in use from a set, whose order
    # changes with the process's hash seed: add them now, in a fixed order
    doc.classes.add_required_classes(doc.dxfversion)
    doc.classes.classes = dict(sorted(doc.classes.classes.items()))
    doc.saveas(path)
    return path


def _draw_elevation(sh: _Sheet, design, ve: float, site_name: str):
    st = design.stations
    s = np.asarray(st.station_ft, dtype=float)
    s0, s1 = float(s[0]), float(s[-1])
    segs = [g for g in design.segments if g.section is not None] or list(design.segments)
    tops = [max(_tw_ends(g)) for g in segs]
    bottoms = [_bottom_ft(g) for g in segs]
    grades = np.concatenate([st.retained_grade_ft, st.front_grade_ft])
    hi = max(max(tops), float(np.nanmax(grades)))
    lo = min(min(bottoms), float(np.nanmin(grades)))
    margin = 18.0 / ve  # room for callouts and tags (drawn ft, as real elevation)
    step = _grid_interval_ft(hi - lo + 2 * margin)
    datum = math.floor((lo - margin) / step) * step
    top_el = math.ceil((hi + margin) / step) * step

    def Y(e):
        return datum + (e - datum) * ve

    pad = 10.0
    gx0, gx1 = s0 - pad, s1 + pad
    sh.elev_y = Y  # the elevation's vertical transform, for the revision clouds
    # elevation grid with labels both sides
    e = datum
    while e <= top_el + 1e-9:
        sh.line((gx0, Y(e)), (gx1, Y(e)), "C-WALL-GRID")
        label = f"{e:.0f}" if step >= 1 else f"{e:.1f}"
        sh.text(label, (gx0 - 1.0, Y(e)), TEXT_FT, "C-WALL-GRID", align="MIDDLE_RIGHT")
        sh.text(label, (gx1 + 1.0, Y(e)), TEXT_FT, "C-WALL-GRID", align="MIDDLE_LEFT")
        e += step
    # station ticks and labels
    interval = station_interval_ft(s1 - s0)
    x = math.ceil(s0 / interval - 1e-9) * interval
    while x <= s1 + 1e-9:
        sh.line((x, Y(datum)), (x, Y(top_el)), "C-WALL-GRID")
        sh.line((x, Y(datum)), (x, Y(datum) - 1.5), "C-WALL-GRID")
        sh.text(format_station(x, 0), (x, Y(datum) - 2.0), TEXT_FT, "C-WALL-GRID",
                align="TOP_CENTER")
        x += interval
    # grades
    sh.poly(zip(s, Y(np.asarray(st.front_grade_ft)), strict=True), "C-GRAD-FRNT")
    sh.poly(zip(s, Y(np.asarray(st.retained_grade_ft)), strict=True), "C-GRAD-RETD")
    eg = np.asarray(st.existing_ground_ft, dtype=float)
    ok = np.isfinite(eg)
    if ok.sum() >= 2:
        sh.poly(zip(s[ok], Y(eg[ok]), strict=True), "C-GRAD-EXST")
    # wall: stem outline (above TF) and footing (hidden), per contiguous run
    for run in _runs(segs):
        top = []
        tf = []
        bf = []
        for g in run:
            a, b = _tw_ends(g)
            top += [(g.station_start_ft, Y(a)), (g.station_end_ft, Y(b))]
            tf += [(g.station_start_ft, Y(g.top_of_footing_ft)),
                   (g.station_end_ft, Y(g.top_of_footing_ft))]
            bf += [(g.station_start_ft, Y(g.bottom_of_footing_ft)),
                   (g.station_end_ft, Y(g.bottom_of_footing_ft))]
        sh.poly(top + tf[::-1], "C-WALL-OTLN", closed=True)
        sh.poly(tf + bf[::-1], "C-WALL-FTNG", closed=True)
        for g in run:
            if g.section is not None and g.section.has_key:
                kb = g.bottom_of_footing_ft - g.section.key_depth_in / 12.0
                sh.poly([(g.station_start_ft, Y(g.bottom_of_footing_ft)),
                         (g.station_start_ft, Y(kb)), (g.station_end_ft, Y(kb)),
                         (g.station_end_ft, Y(g.bottom_of_footing_ft))], "C-WALL-FTNG")
    # segment boundaries, callouts, tags
    h = TEXT_SMALL_FT
    for i, g in enumerate(segs):
        a, b = _tw_ends(g)
        for x, tw, side in ((g.station_start_ft, a, +1), (g.station_end_ft, b, -1)):
            col = [x + side * 0.6 + (h if side > 0 else 0.0) + side * k * 1.5 * h
                   for k in range(3)]
            bw = float(np.interp(x, s, st.front_grade_ft))
            sh.text(f"TW {format_elev(tw)}", (col[0], Y(tw) + 1.0), h, "C-WALL-ELEV",
                    rotation=90.0)
            sh.text(f"STA {format_station(x)}", (col[1], Y(tw) + 1.0), h, "C-WALL-ELEV",
                    rotation=90.0)
            bottom = Y(_bottom_ft(g)) - 1.0
            for k, label in enumerate((f"BW {format_elev(bw)}",
                                       f"TF {format_elev(g.top_of_footing_ft)}",
                                       f"BF {format_elev(g.bottom_of_footing_ft)}")):
                sh.text(label, (col[k], bottom), h, "C-WALL-ELEV", align="RIGHT", rotation=90.0)
        if i > 0 and abs(segs[i - 1].station_end_ft - g.station_start_ft) < 1e-6:
            prev = segs[i - 1]
            y0 = min(_bottom_ft(prev), _bottom_ft(g))
            y1 = max(max(_tw_ends(prev)), a)
            sh.line((g.station_start_ft, Y(y0)), (g.station_start_ft, Y(y1) + 0.5), "C-WALL-BNDY")
        mid = (g.station_start_ft + g.station_end_ft) / 2.0
        ty = Y(max(a, b)) + 7.0
        sh.circle((mid, ty), 2.0, "C-WALL-TAGS")
        sh.text(g.mark, (mid, ty), TEXT_FT, "C-WALL-TAGS", align="MIDDLE_CENTER")
        sh.text(g.segment, (mid, ty + 2.8), TEXT_SMALL_FT, "C-WALL-TAGS", align="BOTTOM_CENTER")
    # joints
    for j in design.joints:
        g = next((q for q in segs
                  if q.station_start_ft - 1e-6 <= j.station_ft <= q.station_end_ft + 1e-6), None)
        if g is None:
            continue
        near = [q for q in segs
                if q.station_start_ft - 1e-6 <= j.station_ft <= q.station_end_ft + 1e-6]
        tw = max(np.interp(j.station_ft, [q.station_start_ft, q.station_end_ft], _tw_ends(q))
                 for q in near)
        expansion = j.kind == "expansion"
        layer = "C-WALL-JNTE" if expansion else "C-WALL-JNTC"
        low = (min(q.bottom_of_footing_ft for q in near) if expansion
               else max(q.top_of_footing_ft for q in near))
        sh.line((j.station_ft, Y(low)), (j.station_ft, Y(tw)), layer)
        tf = max(q.top_of_footing_ft for q in near)
        sh.text("EJ" if expansion else "CJ", (j.station_ft + 0.4, Y(tf) + 0.4), TEXT_SMALL_FT,
                layer, align="BOTTOM_LEFT")
    # title and legend
    name = f" ({design.name})" if design.name else ""
    ty = Y(top_el) + 3.0
    sh.text(f"WALL {design.wall}{name} - ELEVATION", (gx0, ty + 8.0), TEXT_TITLE_FT,
            "C-WALL-NOTE")
    view = ("VIEWED FROM THE FRONT (LOW) SIDE, STATIONS INCREASING TO THE RIGHT"
            if design.retained_side == "left" else
            "DRAWN WITH STATIONS INCREASING TO THE RIGHT (VIEWED FROM THE RETAINED SIDE)")
    sh.text(f"{site_name.upper()}  -  {view}  -  HORIZONTAL 1\" = 20'  -  VERTICAL EXAGGERATION "
            f"{ve:g}:1", (gx0, ty + 4.5), TEXT_FT, "C-WALL-NOTE")
    legend = [("C-GRAD-RETD", "RETAINED GRADE"), ("C-GRAD-FRNT", "FRONT GRADE"),
              ("C-GRAD-EXST", "EXISTING GROUND"), ("C-WALL-FTNG", "FOOTING / KEY (BELOW GRADE)"),
              ("C-WALL-JNTC", "CJ CONTRACTION JOINT"), ("C-WALL-JNTE", "EJ EXPANSION JOINT"),
              ("C-WALL-BNDY", "SEGMENT BOUNDARY")]
    x = gx0
    for layer, label in legend:
        sh.line((x, ty + 1.0), (x + 10.0, ty + 1.0), layer)
        sh.text(label, (x + 11.0, ty + 1.0), TEXT_SMALL_FT, "C-WALL-NOTE", align="MIDDLE_LEFT")
        x += 13.0 + len(label) * CHAR_W * TEXT_SMALL_FT
    return max(gx1 + 12.0, x), Y(datum) - 6.0, ty + 12.0


def cloud_arcs(x0: float, y0: float, x1: float, y1: float, *, chord_ft: float = CLOUD_CHORD_FT,
               arc_deg: float = CLOUD_ARC_DEG):
    """Scallops of a revision cloud around the rectangle (x0, y0)-(x1, y1): a list of
    ``(centre_x, centre_y, radius, start_deg, end_deg)`` arcs, counter-clockwise, each bulging
    outward and meeting the next at a point of the rectangle."""
    corners = [(x0, y0), (x1, y0), (x1, y1), (x0, y1)]
    half = math.radians(arc_deg) / 2.0
    out = []
    for (ax, ay), (bx, by) in zip(corners, corners[1:] + corners[:1], strict=True):
        side = math.hypot(bx - ax, by - ay)
        n = max(1, round(side / chord_ft))
        dx, dy = (bx - ax) / side, (by - ay) / side
        nx, ny = dy, -dx  # outward normal of a counter-clockwise outline
        c = side / n
        r = c / (2.0 * math.sin(half))
        off = r * math.cos(half)  # the centre lies inside the outline
        for i in range(n):
            px, py = ax + dx * c * i, ay + dy * c * i
            qx, qy = px + dx * c, py + dy * c
            cx, cy = (px + qx) / 2 - nx * off, (py + qy) / 2 - ny * off
            a0 = math.degrees(math.atan2(py - cy, px - cx)) % 360.0
            a1 = math.degrees(math.atan2(qy - cy, qx - cx)) % 360.0
            out.append((cx, cy, r, a0, a1))
    return out


def _draw_revisions(sh: _Sheet, design, ranges, tag: str) -> None:
    """A revision cloud around each changed station range of the elevation, and its tag."""
    Y = sh.elev_y
    st = design.stations
    s = np.asarray(st.station_ft, dtype=float)
    s_lo, s_hi = float(s[0]), float(s[-1])
    segs = [g for g in design.segments if g.section is not None] or list(design.segments)
    grades = np.vstack([np.asarray(st.retained_grade_ft, float),
                        np.asarray(st.front_grade_ft, float)])
    for a, b in sorted((float(min(r[0], r[1])), float(max(r[0], r[1]))) for r in ranges):
        if b - a < 0.01:  # a single station (rounding at a wall end): nothing to cloud
            continue
        a, b = max(a, s_lo), min(b, s_hi)
        if b - a < 2.0:  # a point, or a stretch beyond the wall's end: mark it as a short one
            mid = min(max((a + b) / 2.0, s_lo), s_hi)
            a, b = mid - 1.0, mid + 1.0
        inside = (s >= a) & (s <= b)
        near = [g for g in segs if g.station_start_ft < b and g.station_end_ft > a]
        hi = [float(np.nanmax(grades[:, inside]))] if inside.any() else []
        lo = [float(np.nanmin(grades[:, inside]))] if inside.any() else []
        hi += [max(_tw_ends(g)) for g in near]
        lo += [_bottom_ft(g) for g in near]
        if not hi:
            hi = lo = [float(np.interp((a + b) / 2.0, s, st.retained_grade_ft))]
        x0, x1 = a - 3.0, b + 3.0
        y0 = Y(min(lo)) - 3.0
        y1 = Y(max(hi)) + (12.0 if near else 3.0)  # the segment tags sit above the wall
        for cx, cy, r, a0, a1 in cloud_arcs(x0, y0, x1, y1):
            sh.msp.add_arc((cx, cy), r, a0, a1, dxfattribs={"layer": REVISION_LAYER})
        # revision tag: an equilateral triangle at the cloud's top right corner
        side = 5.0
        tx, ty = x1 + 1.5, y1 + 1.5
        pts = [(tx, ty), (tx + side, ty), (tx + side / 2.0, ty + side * math.sqrt(3) / 2.0)]
        for p, q in zip(pts, pts[1:] + pts[:1], strict=True):
            sh.line(p, q, REVISION_LAYER)
        sh.text(tag, (tx + side / 2.0, ty + side * 0.3), TEXT_FT, REVISION_LAYER,
                align="MIDDLE_CENTER")


def _draw_sections(sh: _Sheet, design, x0: float, y_base: float, bars) -> float:
    """One typical section per mark, left to right from ``x0``; returns the right edge (bars
    placed by the engine's covers, ``design.details``)."""
    k = DETAIL_SCALE
    st = design.stations
    s = np.asarray(st.station_ft, dtype=float)
    x_cursor = x0
    for mark, sec in design.marks().items():
        segs = [g for g in design.segments if g.mark == mark and g.section is not None]
        h = max(max(_tw_ends(g)) - g.top_of_footing_ft for g in segs)
        t = sec.footing_thickness_in / 12.0
        kd = sec.key_depth_in / 12.0 if sec.has_key else 0.0
        kw = sec.key_width_in / 12.0 if sec.has_key else 0.0
        ko = sec.key_offset_ft
        width = sec.footing_width_ft
        base = sec.stem_base_in / 12.0
        top = sec.stem_top_in / 12.0
        xf_base, xb_base = sec.toe_ft, sec.toe_ft + base
        if sec.batter_face == "back":
            xf_top, xb_top = xf_base, xf_base + top
        else:
            xf_top, xb_top = xb_base - top, xb_base
        ox = x_cursor + 14.0  # room for the left dimensions and labels
        oy = y_base + 26.0 + k * (t + kd)

        def P(x, y, ox=ox, oy=oy):
            return (ox + k * x, oy + k * y)

        outline = [(0, -t)]
        if sec.has_key:
            outline += [(ko, -t), (ko, -t - kd), (ko + kw, -t - kd), (ko + kw, -t)]
        outline += [(width, -t), (width, 0), (xb_base, 0), (xb_top, h), (xf_top, h),
                    (xf_base, 0), (0, 0)]
        for p, q in zip(outline, outline[1:] + outline[:1], strict=True):
            sh.line(P(*p), P(*q), "C-WALL-OTLN")
        # grades at the tallest station of the mark
        seg_hi = max(segs, key=lambda g: max(_tw_ends(g)) - g.top_of_footing_ft)
        inside = (s >= seg_hi.station_start_ft) & (s <= seg_hi.station_end_ft)
        rg = float(np.max(np.asarray(st.retained_grade_ft)[inside])) - seg_hi.top_of_footing_ft
        fg = float(np.min(np.asarray(st.front_grade_ft)[inside])) - seg_hi.top_of_footing_ft
        rg = min(rg, h)
        sh.line(P(xb_base + (xb_top - xb_base) * rg / h, rg), P(width + 2.0, rg), "C-GRAD-RETD")
        sh.text("RETAINED GRADE", P(width + 2.2, rg), TEXT_SMALL_FT, "C-WALL-NOTE",
                align="MIDDLE_LEFT")
        sh.line(P(-2.0, fg), P(xf_base + (xf_top - xf_base) * max(fg, 0) / h, fg), "C-GRAD-FRNT")
        sh.text("FRONT GRADE", P(-2.2, fg), TEXT_SMALL_FT, "C-WALL-NOTE", align="MIDDLE_RIGHT")
        # bars
        rows = {r.mark: r for r in bars[bars["segment"] == segs[0].segment].itertuples()}
        labels_right, labels_left = [], []
        dot_r = 0.35
        det = design.details[mark]
        if det.stem is not None:
            b, sd_ = sec.stem_bars, det.stem
            c = (sd_.formed_cover_in + sd_.diameter_in / 2) / 12.0
            y_top = h - sd_.formed_cover_in / 12.0
            y_bot = -t + (det.earth_cover_in + sd_.diameter_in / 2) / 12.0

            def xb(y, c=c, x0=xb_base, x1=xb_top, h=h):
                return x0 + (x1 - x0) * y / h - c

            tail = (sd_.hook_tail_in / 12.0 + 0.25)
            sh.line(P(xb(y_top), y_top), P(xb(y_bot), y_bot), "C-WALL-RBAR")
            sh.line(P(xb(y_bot), y_bot), P(xb(y_bot) - tail, y_bot), "C-WALL-RBAR")
            mk = "S1" if "S1" in rows else "D1/S2"
            labels_right.append((f"{mk} {b}", P(xb(0.6 * h), 0.6 * h)))
            sh.text(f"{sd_.formed_cover_in:g}\" CLR", P(xb(y_top) + 0.3, y_top + 0.25),
                    TEXT_SMALL_FT * 0.8, "C-WALL-RBAR")
        if det.horizontal is not None:
            b, hd = sec.horizontal_bars, det.horizontal
            sb = det.stem if det.stem is not None else hd
            cb = (sb.formed_cover_in + sb.diameter_in + hd.diameter_in / 2) / 12.0
            cf = (hd.formed_cover_in + hd.diameter_in / 2) / 12.0
            n = max(int((h - 0.5) // (b.spacing_in / 12.0)), 1)
            for i in range(n + 1):
                y = 0.25 + i * (h - 0.5) / n
                xback = xb_base + (xb_top - xb_base) * y / h - cb
                xfront = xf_base + (xf_top - xf_base) * y / h + cf
                sh.circle(P(xback, y), dot_r, "C-WALL-RBAR")
                sh.circle(P(xfront, y), dot_r, "C-WALL-RBAR")
            y = 0.25 + (n // 2) * (h - 0.5) / n
            labels_right.append((f"H1 {b} EARTH FACE",
                                 P(xb_base + (xb_top - xb_base) * y / h - cb, y)))
            labels_left.append((f"H2 {b} FRONT FACE",
                                P(xf_base + (xf_top - xf_base) * y / h + cf, y)))
        c_top = det.top_cover_in / 12.0
        c_bot = det.earth_cover_in / 12.0
        if det.heel is not None:
            b = sec.heel_bars
            y = -c_top - det.heel.diameter_in / 24.0
            sh.line(P(c_bot, y), P(width - c_bot, y), "C-WALL-RBAR")
            labels_right.append((f"F1 {b} TOP", P(width - 0.6, y)))
        if det.toe is not None:
            b = sec.toe_bars
            y = -t + c_bot + det.toe.diameter_in / 24.0
            sh.line(P(c_bot, y), P(width - c_bot, y), "C-WALL-RBAR")
            labels_left.append((f"F2 {b} BOTTOM", P(0.5, y)))
            sh.text("3\" CLR", P(width * 0.72, -t + 0.05), TEXT_SMALL_FT * 0.8, "C-WALL-RBAR")
        if det.longitudinal is not None:
            b = sec.footing_long_bars
            yt = -c_top - (det.heel.diameter_in if det.heel else 0) / 12.0 - 0.08
            yb = -t + c_bot + (det.toe.diameter_in if det.toe else 0) / 12.0 + 0.08
            n = max(int((width - 2 * c_bot) // (b.spacing_in / 12.0)), 1)
            for i in range(n + 1):
                x = c_bot + 0.1 + i * (width - 2 * c_bot - 0.2) / n
                sh.circle(P(x, yt), dot_r, "C-WALL-RBAR")
                sh.circle(P(x, yb), dot_r, "C-WALL-RBAR")
            labels_right.append((f"L1 {b} TOP MAT", P(width - c_bot - 0.1, yt)))
            labels_left.append((f"L2 {b} BOTTOM MAT", P(c_bot + 0.1, yb)))
        # bar labels with leaders: right column beyond the heel, left column beyond the toe
        xr = ox + k * (width + 2.0)
        yr = oy + k * h * 0.85
        for text, target in labels_right:
            sh.line((xr - 0.5, yr), target, "C-WALL-RBAR")
            sh.text(text, (xr, yr), TEXT_SMALL_FT, "C-WALL-RBAR", align="MIDDLE_LEFT")
            yr -= 3.0 * TEXT_SMALL_FT
        xl = ox - 4.0
        yl = oy + k * h * 0.5
        for text, target in labels_left:
            sh.line((xl + 0.5, yl), target, "C-WALL-RBAR")
            sh.text(text, (xl, yl), TEXT_SMALL_FT, "C-WALL-RBAR", align="MIDDLE_RIGHT")
            yl -= 3.0 * TEXT_SMALL_FT
        # dimensions (true sizes as text, ft-in)
        yd = oy - k * (t + kd)
        sh.dim(P(0, -t - kd), P(width, -t - kd), (ox, yd - 11.0), format_ft_in(width))
        chain = [(0.0, xf_base), (xf_base, xb_base), (xb_base, width)]
        for a, b in chain:
            sh.dim(P(a, -t - kd), P(b, -t - kd), (ox, yd - 7.0), format_ft_in(b - a))
        if sec.has_key:
            sh.dim(P(0, -t), P(ko, -t), (ox, yd - 3.0), format_ft_in(ko))
            sh.dim(P(ko, -t - kd), P(ko + kw, -t - kd), (ox, yd - 3.0), format_ft_in(kw))
            sh.dim(P(ko + kw, -t), P(ko + kw, -t - kd), (ox + k * (ko + kw) + 3.0, yd),
                   format_ft_in(kd), angle=90.0)
        sh.dim(P(0, 0), P(0, -t), (ox - 3.0, oy), format_ft_in(t), angle=90.0)
        sh.dim(P(xf_top, h), P(xb_top, h), (ox, oy + k * h + 3.0), format_ft_in(top))
        sh.dim(P(xf_base, 0), P(xf_top, h), (ox + k * xf_base - 6.0, oy),
               f"{format_ft_in(h)} MAX", angle=90.0)
        # title
        used = ", ".join(g.segment for g in segs)
        sh.text(f"SECTION {mark}", (ox, yd - 18.0), TEXT_TITLE_FT, "C-WALL-NOTE")
        sh.text(f"TYPICAL - SEGMENTS {used}", (ox, yd - 21.5), TEXT_FT, "C-WALL-NOTE")
        sh.text("SCALE 1\" = 4'-0\" WHEN PLOTTED AT 1\" = 20'", (ox, yd - 24.5), TEXT_SMALL_FT,
                "C-WALL-NOTE")
        label_w = max([len(t_) for t_, _ in labels_right] or [0]) * CHAR_W * TEXT_SMALL_FT
        x_cursor = ox + k * (width + 2.0) + label_w + 30.0
    return x_cursor


def _bars_text(spec) -> str:
    return str(spec) if spec is not None else "-"


def _draw_tables(sh: _Sheet, design, bars, quantities, *, x0, y0, notes_x, input_hash,
                 site_name, ve, describe):
    h = TEXT_SMALL_FT
    q = quantities.set_index("segment") if len(quantities) else None
    headers = ["SEGMENT", "SECTION", "FROM STA", "TO STA", "LENGTH FT", "H MAX FT", "TW",
               "TF", "BF", "STEM TOP/BASE IN", "FTG IN", "TOE", "HEEL", "WIDTH B",
               "KEY W x D IN", "STEM BARS", "HEEL BARS", "TOE BARS", "HORIZ BARS", "CONC CY",
               "STEEL LB", "STATUS"]
    rows = []
    for g in design.segments:
        a, b = _tw_ends(g)
        tw = format_elev(a) if a == b else f"{format_elev(a)}-{format_elev(b)}"
        sec = g.section
        conc = steel = "-"
        if q is not None and g.segment in q.index:
            conc = f"{q.loc[g.segment, 'concrete_cy']:.1f}"
            steel = f"{q.loc[g.segment, 'steel_lb']:.0f}"
        if sec is None:
            dims = ["-"] * 10
        else:
            dims = [f"{sec.stem_top_in:g}/{sec.stem_base_in:g}", f"{sec.footing_thickness_in:g}",
                    format_ft_in(sec.toe_ft), format_ft_in(sec.heel_ft),
                    format_ft_in(sec.footing_width_ft),
                    f"{sec.key_width_in:g} x {sec.key_depth_in:g}" if sec.has_key else "-",
                    _bars_text(sec.stem_bars), _bars_text(sec.heel_bars),
                    _bars_text(sec.toe_bars), _bars_text(sec.horizontal_bars)]
        rows.append([g.segment, g.mark, format_station(g.station_start_ft),
                     format_station(g.station_end_ft), f"{g.length_ft:.2f}",
                     f"{g.retained_height_max_ft:.2f}", tw, format_elev(g.top_of_footing_ft),
                     format_elev(g.bottom_of_footing_ft), *dims, conc, steel,
                     g.status.upper()])
    if q is not None:
        rows.append(["WALL TOTAL", "", "", "", f"{quantities['length_ft'].sum():.2f}", "", "",
                     "", "", "", "", "", "", "", "", "", "", "", "",
                     f"{quantities['concrete_cy'].sum():.1f}",
                     f"{quantities['steel_lb'].sum():.0f}", ""])
    w1, h1 = sh.table(x0, y0, headers, rows, h, title=f"WALL {design.wall} SCHEDULE")
    bar_rows = [[r.segment, r.mark, f"#{r.size}", f"{r.spacing_in:g}", f"{r.count}",
                 format_ft_in(r.length_ft), r.shape, f"{r.weight_lb:.1f}", describe(r.mark).upper()]
                for r in bars.itertuples()]
    bar_rows.append(["WALL TOTAL", "", "", "", f"{int(bars['count'].sum())}", "", "",
                     f"{bars['weight_lb'].sum():.1f}", "ASTM A615 GRADE 60"])
    y_bars = y0 - h1 - 14.0
    w2, h2 = sh.table(x0, y_bars, ["SEGMENT", "MARK", "SIZE", "SPACING IN", "COUNT",
                                   "CUT LENGTH", "SHAPE", "WEIGHT LB", "BAR"], bar_rows, h,
                      title=f"WALL {design.wall} BAR LIST")
    nx = max(x0 + w1, x0 + w2, notes_x) + 20.0
    nx = max(nx, notes_x)
    ny = y0
    sh.text("NOTES", (nx, ny + 0.6 * h), 1.25 * TEXT_FT, "C-WALL-NOTE")
    notes = list(CAUTIONS) + [
        "Elevations in feet; stations in feet along the wall alignment (12+00 notation).",
        "TW top of wall, BW bottom of wall (finished grade at the front face), TF top of "
        "footing, BF bottom of footing.",
        f"Vertical exaggeration {ve:g}:1 on the elevation; typical sections at 1\" = 4'-0\".",
        "Bars ASTM A615 Grade 60. Standard hooks per ACI 318-19 Table 25.3.1; laps Class B "
        "per ACI 318-19 25.5.2. Cover 3\" cast against earth, 2\" formed (#6 and larger), "
        "1.5\" formed (#5 and smaller).",
        "Bar marks: S1 stem vertical (hooked), D1/S2 dowel and upper stem bar, F1 heel top, "
        "F2 toe bottom, L1/L2 footing longitudinal, H1/H2 stem horizontal.",
        "CJ contraction joint, EJ expansion joint.",
    ]
    y = ny - 2.0 * h
    width = 160.0
    for i, note in enumerate(notes, 1):
        sh.mtext(f"{i}. {note}", (nx, y), h, width, "C-WALL-NOTE")
        lines = max(1, math.ceil(len(note) * CHAR_W * h / width))
        y -= (lines + 0.8) * 1.7 * h
    sh.text(f"SITE: {site_name}", (nx, y - h), h, "C-WALL-NOTE")
    sh.text(f"INPUT HASH: {input_hash}", (nx, y - 3.0 * h), h, "C-WALL-NOTE")
    sh.text("MADE WITH WALLSCHED", (nx, y - 5.0 * h), h, "C-WALL-NOTE")
