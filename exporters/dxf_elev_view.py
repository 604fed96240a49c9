"""The wall elevation in model space (x = station, y = elevation with vertical exaggeration),
annotated by drafting practice.

Labels stand at the segment ends (both sides of a step), and every ``label_interval_ft``
between them: above the wall ``STA`` and ``TW``, below it ``BW``, ``TF`` and ``BF``, read
upward. Each label is offered positions beside its station, then higher tiers with a leader;
the interval labels give way to the segment-end labels. Segment tags (section mark in a
circle, segment id above) stand in a band above the labels; revision clouds are grown until
no edge runs through a text.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..profile.stationing import format_station
from .dxf_style import TEXT_IN, TEXT_SMALL_IN, Pen
from .envelope import drafted_line
from .label_layout import Box, text_box

REVISION_LAYER = "C-ANNO-REVS"


def tw_ends(seg) -> tuple[float, float]:
    if math.isfinite(seg.top_of_wall_ft):
        return seg.top_of_wall_ft, seg.top_of_wall_ft
    return seg.top_of_wall_start_ft, seg.top_of_wall_end_ft


def bottom_ft(seg) -> float:
    sec = seg.section
    key = sec.key_depth_in / 12.0 if sec is not None and sec.has_key else 0.0
    return seg.bottom_of_footing_ft - key


def wall_runs(segments):
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


def grid_interval_ft(range_ft: float) -> float:
    return next(s for s in (1.0, 2.0, 5.0, 10.0, 20.0, 50.0, 100.0) if range_ft / s <= 12)


def station_grid_ft(length_ft: float, scale_ft_per_in: float) -> float:
    """Station grid and labels about every inch and a half of paper."""
    want = 1.5 * scale_ft_per_in
    return next((s for s in (10.0, 25.0, 50.0, 100.0, 200.0, 500.0, 1000.0) if s >= want),
                1000.0)


@dataclass
class ElevationView:
    x0: float
    y0: float
    x1: float
    y1: float
    datum_ft: float
    ve: float
    label_count: int

    def y(self, elev_ft):
        return self.datum_ft + (np.asarray(elev_ft, dtype=float) - self.datum_ft) * self.ve


@dataclass(frozen=True)
class _Label:
    station_ft: float
    side: int  # -1 left of a step, +1 right of it, 0 on the station
    tw: float
    bw: float
    tf: float
    bf: float
    bottom: float
    required: bool


def label_stations(segs, s, fg, interval_ft: float) -> list[_Label]:
    """Where the elevation is labelled (the DXF and the PNG): both ends of every run of
    segments, both sides of a step (in footing or top), a segment joint without a step, and
    every ``interval_ft`` inside a segment (``required`` False: these give way)."""
    out: list[_Label] = []

    def lab(g, x, side, required):
        a, b = tw_ends(g)
        t = (x - g.station_start_ft) / max(g.length_ft, 1e-9)
        tw = a + (b - a) * t
        out.append(_Label(x, side, tw, float(np.interp(x, s, fg)), g.top_of_footing_ft,
                          g.bottom_of_footing_ft, bottom_ft(g), required))

    for i, g in enumerate(segs):
        prev = segs[i - 1] if i else None
        joined = prev is not None and abs(prev.station_end_ft - g.station_start_ft) < 1e-6
        if joined:
            step = (abs(prev.bottom_of_footing_ft - g.bottom_of_footing_ft) > 1e-9
                    or abs(tw_ends(prev)[1] - tw_ends(g)[0]) > 1e-9)
            if step:
                lab(prev, prev.station_end_ft, -1, True)
                lab(g, g.station_start_ft, +1, True)
            else:
                lab(g, g.station_start_ft, 0, True)
        else:
            if prev is not None:
                lab(prev, prev.station_end_ft, 0, True)
            lab(g, g.station_start_ft, 0, True)
    if segs:
        lab(segs[-1], segs[-1].station_end_ft, 0, True)
    if interval_ft > 0:
        for g in segs:
            x = math.ceil(g.station_start_ft / interval_ft + 1e-9) * interval_ft
            while x < g.station_end_ft - 1e-6:
                lab(g, x, 0, False)
                x += interval_ft
    return out


def draw_elevation(pen: Pen, design, *, ve: float, interval_ft: float,
                   revisions=(), revision_tag: str = "1") -> ElevationView:
    """Draw the elevation of ``design`` with ``pen`` (model space, its scale the elevation's
    horizontal scale); returns the view's extents."""
    st = design.stations
    s = np.asarray(st.station_ft, dtype=float)
    fg = np.asarray(st.front_grade_ft, dtype=float)
    rg = np.asarray(st.retained_grade_ft, dtype=float)
    segs = [g for g in design.segments if g.section is not None] or list(design.segments)
    h = pen.h(TEXT_SMALL_IN)
    gap = 0.6 * h
    hi = max(max(max(tw_ends(g)) for g in segs), float(np.nanmax(rg)))
    lo = min(min(bottom_ft(g) for g in segs), float(np.nanmin(fg)))
    step = grid_interval_ft(hi - lo)
    datum = math.floor(lo / step) * step - step
    view = ElevationView(0, 0, 0, 0, datum, ve, 0)
    Y = view.y
    s0, s1 = float(s[0]), float(s[-1])
    pad = 2.0 * pen.h(TEXT_IN) * 4
    gx0, gx1 = s0 - pad, s1 + pad
    # grades and the wall first: the geometry
    _draw_grades(pen, st, Y)
    _draw_wall(pen, segs, Y)
    _draw_grid(pen, Y, datum, math.ceil(hi / step) * step, step, (gx0, gx1), (s0, s1), h)
    view.label_count, band_top = _draw_labels(pen, segs, s, fg, interval_ft, Y, float(Y(hi)),
                                              h)
    _draw_joints(pen, design, segs, Y, h)
    band_top = _draw_tags(pen, segs, Y, band_top + 2 * gap)
    # revision clouds and their tags
    y_low = float(Y(datum)) - 3.5 * h
    for a, b in _ranges(revisions, s0, s1):
        _draw_cloud(pen, segs, Y, a, b, y_low + 1.8 * h, band_top, h, revision_tag)
    boxes = pen.labels.boxes
    view.x0 = min([gx0] + [bx.x0 for bx in boxes]) - h
    view.x1 = max([gx1] + [bx.x1 for bx in boxes]) + h
    view.y0 = min([y_low] + [bx.y0 for bx in boxes]) - h
    view.y1 = max([band_top] + [bx.y1 for bx in boxes]) + h
    return view


def _draw_grades(pen: Pen, st, Y) -> None:
    s = np.asarray(st.station_ft, dtype=float)
    pen.poly(drafted_line(s, Y(np.asarray(st.front_grade_ft, dtype=float))), "C-GRAD-FRNT")
    pen.poly(drafted_line(s, Y(np.asarray(st.retained_grade_ft, dtype=float))), "C-GRAD-RETD")
    eg = np.asarray(st.existing_ground_ft, dtype=float)
    ok = np.isfinite(eg)
    if ok.sum() >= 2:
        pen.poly(drafted_line(s[ok], Y(eg[ok])), "C-GRAD-EXST")


def _draw_wall(pen: Pen, segs, Y) -> None:
    """The stem and footing outlines of every run of segments, the keys, and the segment
    boundaries."""
    for run in wall_runs(segs):
        top, tf, bf = [], [], []
        for g in run:
            a, b = tw_ends(g)
            top += [(g.station_start_ft, float(Y(a))), (g.station_end_ft, float(Y(b)))]
            tf += [(g.station_start_ft, float(Y(g.top_of_footing_ft))),
                   (g.station_end_ft, float(Y(g.top_of_footing_ft)))]
            bf += [(g.station_start_ft, float(Y(g.bottom_of_footing_ft))),
                   (g.station_end_ft, float(Y(g.bottom_of_footing_ft)))]
        pen.poly(top + tf[::-1], "C-WALL-OTLN", closed=True)
        pen.poly(tf + bf[::-1], "C-WALL-FTNG", closed=True)
        for g in run:
            if g.section is not None and g.section.has_key:
                kb = float(Y(g.bottom_of_footing_ft - g.section.key_depth_in / 12.0))
                b0 = float(Y(g.bottom_of_footing_ft))
                pen.poly([(g.station_start_ft, b0), (g.station_start_ft, kb),
                          (g.station_end_ft, kb), (g.station_end_ft, b0)], "C-WALL-FTNG")
    for i, g in enumerate(segs[1:], 1):
        prev = segs[i - 1]
        if abs(prev.station_end_ft - g.station_start_ft) < 1e-6:
            y0 = min(bottom_ft(prev), bottom_ft(g))
            y1 = max(tw_ends(prev)[1], tw_ends(g)[0])
            pen.line((g.station_start_ft, Y(y0)), (g.station_start_ft, Y(y1)), "C-WALL-BNDY")


def _draw_grid(pen: Pen, Y, datum, top_el, step, gx, span, h) -> None:
    """The elevation grid with its labels both sides; the station grid and its labels below
    the datum."""
    gx0, gx1 = gx
    s0, s1 = span
    gap = 0.6 * h
    e = datum
    while e <= top_el + 1e-9:
        pen.line((gx0, Y(e)), (gx1, Y(e)), "C-WALL-GRID")
        pen.text_forced(f"{e:.0f}", (gx0 - gap, Y(e)), "C-WALL-GRID", size_in=TEXT_SMALL_IN,
                        align="MIDDLE_RIGHT")
        pen.text_forced(f"{e:.0f}", (gx1 + gap, Y(e)), "C-WALL-GRID", size_in=TEXT_SMALL_IN,
                        align="MIDDLE_LEFT")
        e += step
    interval = station_grid_ft(s1 - s0, pen.scale)
    x = math.ceil(s0 / interval - 1e-9) * interval
    while x <= s1 + 1e-9:
        pen.line((x, Y(datum)), (x, Y(datum) - h), "C-WALL-GRID")
        pen.text(format_station(x, 0), (x, Y(datum) - 1.5 * h), "C-WALL-GRID",
                 size_in=TEXT_SMALL_IN, align="TOP_CENTER")
        x += interval


def _draw_labels(pen: Pen, segs, s, fg, interval_ft, Y, band_top, h) -> tuple[int, float]:
    """The station labels (TW above the wall, BW TF BF below it): the segment ends first,
    then the interval labels where they fit; returns how many texts were placed and the
    highest one's top."""
    gap = 0.6 * h
    labels = label_stations(segs, s, fg, interval_ft)
    labels.sort(key=lambda q: (not q.required, q.station_ft))
    count = 0
    for q in labels:
        above = f"STA {format_station(q.station_ft)}  TW {q.tw:.2f}"
        below = f"BW {q.bw:.2f}  TF {q.tf:.2f}  BF {q.bf:.2f}"
        for text, y_start, up in ((above, float(Y(q.tw)) + gap, True),
                                  (below, float(Y(min(q.bottom, q.bw))) - gap, False)):
            got = _place_vertical(pen, text, q, y_start, up, h, required=q.required)
            if got is not None:
                count += 1
                if up:
                    band_top = max(band_top, got)
    return count, band_top


def _place_vertical(pen: Pen, text, q: _Label, y_start, up, h, *, required):
    """A label read upward beside ``q.station_ft``; returns the far end's y, or None."""
    x = q.station_ft
    cap_off = (1.0 - 0.2853) / 2.0 * h  # centres the glyph box on the insert's x
    width = pen.width(text, TEXT_SMALL_IN)
    shifts = [0.0]
    for k in range(1, 6):
        shifts += [k * 1.25 * h, -k * 1.25 * h]
    if q.side:
        shifts = [q.side * (0.9 * h + abs(d)) for d in shifts if d * q.side >= 0]
    tiers = range(4) if required else range(1)
    for tier in tiers:
        y0 = y_start + (tier * (width + h) if up else -tier * (width + h))
        for d in shifts:
            insert = (x + d + cap_off, y0)
            align = "LEFT" if up else "RIGHT"
            got = pen.labels.first_clear(text, h, [(insert, align)], rotation=90.0)
            if got is None:
                pen.labels.dropped.pop()
                continue
            pen._add_text(text, insert, h, "C-WALL-ELEV", align, 90.0)
            if d or tier:
                pen.line((x, y_start), (x + d, y0), "C-WALL-ELEV")
            return y0 + width if up else y0 - width
    pen.labels.dropped.append(text)
    return None


def _draw_joints(pen: Pen, design, segs, Y, h) -> None:
    for j in design.joints:
        near = [q for q in segs
                if q.station_start_ft - 1e-6 <= j.station_ft <= q.station_end_ft + 1e-6]
        if not near:
            continue
        tw = max(np.interp(j.station_ft, [q.station_start_ft, q.station_end_ft], tw_ends(q))
                 for q in near)
        expansion = j.kind == "expansion"
        layer = "C-WALL-JNTE" if expansion else "C-WALL-JNTC"
        low = (min(q.bottom_of_footing_ft for q in near) if expansion
               else max(q.top_of_footing_ft for q in near))
        pen.line((j.station_ft, Y(low)), (j.station_ft, Y(tw)), layer)
        tf = float(Y(max(q.top_of_footing_ft for q in near)))
        x = j.station_ft
        pen.text("EJ" if expansion else "CJ", (x + 0.3 * h, tf + 0.3 * h), layer,
                 size_in=0.08, align="BOTTOM_LEFT",
                 alternatives=[((x - 0.3 * h, tf + 0.3 * h), "BOTTOM_RIGHT"),
                               ((x + 0.3 * h, tf + 1.8 * h), "BOTTOM_LEFT")])


def _draw_tags(pen: Pen, segs, Y, y_band: float) -> float:
    """Mark in a circle and segment id above it, per segment, in rows above ``y_band``;
    returns the top of the band."""
    h = pen.h(TEXT_IN)
    r = 0.9 * h
    top = y_band
    for g in segs:
        mid = (g.station_start_ft + g.station_end_ft) / 2.0
        a, b = tw_ends(g)
        wall_top = float(Y(max(a, b)))
        small = pen.h(TEXT_SMALL_IN)
        for row in range(6):
            cy = y_band + r + row * (2 * r + 2.2 * small)
            done = False
            for dx in (0.0, 2.4 * r, -2.4 * r, 4.8 * r, -4.8 * r):
                c = (mid + dx, cy)
                circle = Box(c[0] - r, c[1] - r, c[0] + r, c[1] + r)
                idb = text_box(g.segment, (c[0], c[1] + r + 0.3 * small), small, "BOTTOM_CENTER")
                if pen.labels.is_clear(circle) and pen.labels.is_clear(idb):
                    pen.labels.reserve(circle)
                    pen.circle(c, r, "C-WALL-TAGS")
                    pen.text_forced(g.mark, c, "C-WALL-TAGS", align="MIDDLE_CENTER")
                    pen.text_forced(g.segment, (c[0], c[1] + r + 0.3 * small), "C-WALL-TAGS",
                                    size_in=TEXT_SMALL_IN, align="BOTTOM_CENTER")
                    if dx or row:
                        pen.line((c[0], c[1] - r), (mid, wall_top), "C-WALL-TAGS")
                    top = max(top, idb.y1)
                    done = True
                    break
            if done:
                break
        else:
            pen.labels.dropped.append(g.segment)
    return top


def _ranges(revisions, s_lo, s_hi):
    out = []
    for a, b in sorted((float(min(r[0], r[1])), float(max(r[0], r[1]))) for r in revisions):
        if b - a < 0.01:
            continue
        a, b = max(a, s_lo), min(b, s_hi)
        if b - a < 2.0:
            mid = min(max((a + b) / 2.0, s_lo), s_hi)
            a, b = mid - 1.0, mid + 1.0
        out.append((a, b))
    return out


def _draw_cloud(pen: Pen, segs, Y, a, b, y_low, y_high, h, tag) -> None:
    """A cloud around stations a-b from ``y_low`` to above the tags, each side moved out
    until it runs through no text."""
    x0, x1, y0, y1 = a - h, b + h, y_low, y_high + h
    lab = pen.labels
    for _ in range(60):
        moved = False
        if lab.hits_line((x0, y0), (x0, y1)):
            x0 -= 0.6 * h
            moved = True
        if lab.hits_line((x1, y0), (x1, y1)):
            x1 += 0.6 * h
            moved = True
        if lab.hits_line((x0, y1), (x1, y1)):
            y1 += 0.6 * h
            moved = True
        if lab.hits_line((x0, y0), (x1, y0)):
            y0 -= 0.6 * h
            moved = True
        if not moved:
            break
    chord = 2.5 * h
    for cx, cy, r, a0, a1 in cloud_arcs(x0, y0, x1, y1, chord_ft=chord):
        pen.space.add_arc((cx, cy), r, a0, a1, dxfattribs={"layer": REVISION_LAYER})
    side = 2.6 * h
    for k in range(8):
        tx, ty = x1 + 0.5 * h + k * side, y1 + 0.5 * h
        tri = Box(tx, ty, tx + side, ty + side)
        if lab.is_clear(tri):
            break
    lab.reserve(tri)
    pts = [(tx, ty), (tx + side, ty), (tx + side / 2.0, ty + side * math.sqrt(3) / 2.0)]
    for p, q in zip(pts, pts[1:] + pts[:1], strict=True):
        pen.line(p, q, REVISION_LAYER)
    pen._add_text(tag, (tx + side / 2.0, ty + side * 0.3), pen.h(TEXT_SMALL_IN),
                  REVISION_LAYER, "MIDDLE_CENTER", 0.0)


def cloud_arcs(x0: float, y0: float, x1: float, y1: float, *, chord_ft: float = 6.0,
               arc_deg: float = 120.0):
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
