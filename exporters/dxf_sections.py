"""Typical sections, one per section mark, at true size (1 drawing unit = 1 ft) in model space,
laid out on a grid of equal cells; each sheet's viewport shows a block of cells at one
architectural scale.

Dimensions measure the drawn geometry and print what they measure (inches below 4 ft, decimal
feet above; :mod:`.dxf_style`); a zero length gets no dimension. Bar labels stand in columns
beyond the heel and the toe with leaders, placed clear of the grade labels and each other.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .dxf_style import (
    ARCHITECTURAL_SCALES,
    DIM_FOOT,
    DIM_INCH,
    DIM_INCH_BELOW_FT,
    TEXT_SMALL_IN,
    TEXT_TITLE_IN,
    Pen,
    format_dim,
)
from .label_layout import text_box, text_width

SECTIONS_PER_SHEET = 6  # typical sections wanted on one sheet (common practice: few sheets)
SMALLEST_SCALE_FT_PER_IN = 4.0  # 1/4" = 1'-0": below it bar marks crowd the section
LABEL_ROOM_IN = 2.5  # plotted room beside a section for its bar labels, each side (the reach
# of the leaders, 0.75", and the longest label, about 1.7" at 0.08")
BELOW_ROOM_IN = 1.25  # plotted room below a section: dimension rows and the title


@dataclass(frozen=True)
class SectionGrid:
    scale_ft_per_in: float
    scale_text: str
    cell_w_ft: float
    cell_h_ft: float
    cols: int
    rows: int
    origin: tuple[float, float]  # lower-left of the first sheet's block

    @property
    def per_sheet(self) -> int:
        return self.cols * self.rows

    def cell_origin(self, k: int) -> tuple[float, float]:
        """Lower-left of cell ``k``: blocks of ``per_sheet`` cells side by side, each filled
        left to right, top row first."""
        sheet, i = divmod(k, self.per_sheet)
        r, c = divmod(i, self.cols)
        x = self.origin[0] + sheet * (self.cols + 1) * self.cell_w_ft + c * self.cell_w_ft
        y = self.origin[1] + (self.rows - 1 - r) * self.cell_h_ft
        return x, y

    def block_window(self, sheet: int) -> tuple[float, float, float, float]:
        x0 = self.origin[0] + sheet * (self.cols + 1) * self.cell_w_ft
        return (x0, self.origin[1], x0 + self.cols * self.cell_w_ft,
                self.origin[1] + self.rows * self.cell_h_ft)


def _stem_height(design, mark) -> float:
    from .dxf_elev_view import tw_ends

    return max(max(tw_ends(g)) - g.top_of_footing_ft for g in design.segments
               if g.mark == mark and g.section is not None)


def plan_grid(design, area_w_in: float, area_h_in: float, origin) -> SectionGrid:
    """The largest architectural scale at which a cell holds the biggest section and a sheet
    holds :data:`SECTIONS_PER_SHEET` cells (or all, if fewer); where that needs a scale
    smaller than :data:`SMALLEST_SCALE_FT_PER_IN`, the largest at which it holds two."""
    marks = design.marks()
    widths = [sec.footing_width_ft for sec in marks.values()]
    heights = [_stem_height(design, m) + sec.footing_thickness_in / 12.0
               + (sec.key_depth_in / 12.0 if sec.has_key else 0.0) for m, sec in marks.items()]
    w_max, h_max = max(widths), max(heights)
    def fit(want):
        choice = None
        for ft_per_in, text in ARCHITECTURAL_SCALES:
            cw = w_max + 2 * LABEL_ROOM_IN * ft_per_in
            ch = h_max + (BELOW_ROOM_IN + 0.9) * ft_per_in
            cols = int(area_w_in * ft_per_in // cw)
            rows = int(area_h_in * ft_per_in // ch)
            choice = (ft_per_in, text, cw, ch, max(cols, 1), max(rows, 1))
            if cols >= 1 and rows >= 1 and cols * rows >= want:
                break
        return choice

    choice = fit(min(len(marks), SECTIONS_PER_SHEET))
    if choice[0] > SMALLEST_SCALE_FT_PER_IN:
        choice = fit(min(len(marks), 2))
    ft_per_in, text, cw, ch, cols, rows = choice
    cols = min(cols, len(marks)) if rows == 1 else cols
    return SectionGrid(ft_per_in, text, cw, ch, cols, rows, origin)


def draw_sections(msp_pen_factory, design, grid: SectionGrid, bars) -> list[str]:
    """Draw every mark of ``design`` into its cell; returns the marks in cell order."""
    marks = list(design.marks().items())
    for k, (mark, sec) in enumerate(marks):
        pen: Pen = msp_pen_factory(grid.scale_ft_per_in)
        x, y = grid.cell_origin(k)
        _draw_one(pen, design, mark, sec, x, y, grid, bars)
    return [m for m, _ in marks]


def _dim(pen: Pen, p1, p2, base, angle=0.0):
    length = float(np.hypot(p2[0] - p1[0], p2[1] - p1[1])) if angle == 90.0 else abs(
        p2[0] - p1[0])
    if length < 1e-6:
        return None
    style = DIM_INCH if length < DIM_INCH_BELOW_FT else DIM_FOOT
    d = pen.space.add_linear_dim(base=base, p1=p1, p2=p2, angle=angle, dimstyle=style,
                                 override={"dimscale": pen.scale},
                                 dxfattribs={"layer": "C-WALL-DIMS"})
    text = format_dim(length)
    h = TEXT_SMALL_IN * pen.scale
    w = text_width(text, h)
    # the text sits centred on the dimension line, above it (dimtad 1); move it clear of any
    # text already placed, along the dimension line
    off = 0.03 * pen.scale + 0.6 * h  # the text's middle, above the dimension line
    if angle == 0.0:
        lo, hi = sorted((p1[0], p2[0]))
        mid = ((lo + hi) / 2.0, base[1] + off)
        if hi - lo < w + 2 * h:  # no room between the extension lines: beside them
            mid = (hi + 0.6 * h + w / 2.0, mid[1])
        cands = [mid] + [(mid[0] + s * k * (w + h), mid[1]) for k in (1, 2, 3) for s in (1, -1)]
        cands += [(mid[0], mid[1] + 1.6 * h), (mid[0], mid[1] - 2.2 * h)]
        rot = 0.0
    else:
        lo, hi = sorted((p1[1], p2[1]))
        mid = (base[0] - off, (lo + hi) / 2.0)
        if hi - lo < w + 2 * h:
            mid = (mid[0], hi + 0.6 * h + w / 2.0)
        cands = [mid] + [(mid[0], mid[1] + s * k * (w + h)) for k in (1, 2, 3) for s in (1, -1)]
        rot = 90.0
    for c in cands:
        box = text_box(text, c, h, "MIDDLE", rot).grown(0.1 * h)
        if pen.labels.is_clear(box):
            pen.labels.reserve(box)
            break
    else:
        c = cands[0]
        pen.labels.dropped.append(text)
    d.set_location(c, leader=False)
    d.render()
    return d


@dataclass(frozen=True)
class _Frame:
    """One section drawn in its cell: the outline's key points in section coordinates (x from
    the toe edge, y up from the top of footing, ft) and where that origin sits in the drawing."""

    ox: float
    oy: float
    h: float  # stem height
    t: float  # footing thickness
    kd: float  # key depth (0: none)
    kw: float  # key width
    ko: float  # key offset from the toe edge
    width: float
    xf_base: float
    xb_base: float
    xf_top: float
    xb_top: float

    def P(self, x, y):
        return (self.ox + x, self.oy + y)

    def back_x(self, y: float) -> float:
        """The stem's back face at height ``y``."""
        return self.xb_base + (self.xb_top - self.xb_base) * y / self.h

    def front_x(self, y: float) -> float:
        """The stem's front face at height ``y``."""
        return self.xf_base + (self.xf_top - self.xf_base) * y / self.h


def _frame(pen: Pen, design, mark, sec, cx, cy, grid: SectionGrid) -> _Frame:
    h = _stem_height(design, mark)
    t = sec.footing_thickness_in / 12.0
    kd = sec.key_depth_in / 12.0 if sec.has_key else 0.0
    kw = sec.key_width_in / 12.0 if sec.has_key else 0.0
    base = sec.stem_base_in / 12.0
    top = sec.stem_top_in / 12.0
    xf_base, xb_base = sec.toe_ft, sec.toe_ft + base
    if sec.batter_face == "back":
        xf_top, xb_top = xf_base, xf_base + top
    else:
        xf_top, xb_top = xb_base - top, xb_base
    width = sec.footing_width_ft
    return _Frame(ox=cx + (grid.cell_w_ft - width) / 2.0,
                  oy=cy + BELOW_ROOM_IN * pen.scale + t + kd, h=h, t=t, kd=kd, kw=kw,
                  ko=sec.key_offset_ft, width=width, xf_base=xf_base, xb_base=xb_base,
                  xf_top=xf_top, xb_top=xb_top)


def _draw_one(pen: Pen, design, mark, sec, cx, cy, grid: SectionGrid, bars) -> None:
    f = _frame(pen, design, mark, sec, cx, cy, grid)
    segs = [g for g in design.segments if g.mark == mark and g.section is not None]
    _draw_outline(pen, f, sec)
    _draw_grades(pen, f, design, segs)
    rows = {r.mark: r for r in bars[bars["segment"] == segs[0].segment].itertuples()}

    def bar_mark(placing):
        r = rows.get(placing)
        bm = getattr(r, "bar_mark", None) if r is not None else None
        return f"{placing} ({bm})" if bm else placing

    det = design.details[mark]
    right, left = _draw_stem_bars(pen, f, sec, det, bar_mark, "S1" if "S1" in rows else "D1/S2")
    more_right, more_left = _draw_footing_bars(pen, f, sec, det, bar_mark)
    _bar_labels(pen, f, right + more_right, left + more_left)
    _title(pen, mark, segs, cx, cy, grid)
    _dimensions(pen, f, sec)


def _draw_outline(pen: Pen, f: _Frame, sec) -> None:
    t, kd, kw, ko = f.t, f.kd, f.kw, f.ko
    outline = [(0, -t)]
    if sec.has_key:
        outline += [(ko, -t), (ko, -t - kd), (ko + kw, -t - kd), (ko + kw, -t)]
    outline += [(f.width, -t), (f.width, 0), (f.xb_base, 0), (f.xb_top, f.h),
                (f.xf_top, f.h), (f.xf_base, 0), (0, 0)]
    pen.poly([f.P(*p) for p in outline], "C-WALL-OTLN", closed=True)


def _reach(pen: Pen) -> float:
    """How far the grade lines run beyond the footing's ends."""
    return 0.6 * pen.scale


def _draw_grades(pen: Pen, f: _Frame, design, segs) -> None:
    """Both grades at the tallest station of the mark, with their names."""
    st = design.stations
    s = np.asarray(st.station_ft, dtype=float)
    small = pen.h(TEXT_SMALL_IN)
    seg_hi = max(segs, key=lambda g: g.retained_height_max_ft)
    inside = (s >= seg_hi.station_start_ft) & (s <= seg_hi.station_end_ft)
    rg = float(np.max(np.asarray(st.retained_grade_ft)[inside])) - seg_hi.top_of_footing_ft
    fg = float(np.min(np.asarray(st.front_grade_ft)[inside])) - seg_hi.top_of_footing_ft
    rg = min(rg, f.h)
    reach, P, width = _reach(pen), f.P, f.width
    pen.line(P(f.back_x(rg), rg), P(width + reach, rg), "C-GRAD-RETD")
    pen.text("RETAINED GRADE", P(width + reach, rg + 0.3 * small), "C-WALL-NOTE",
             size_in=TEXT_SMALL_IN, align="BOTTOM_RIGHT",
             alternatives=[(P(width + reach, rg - 0.3 * small), "TOP_RIGHT")])
    fgy = max(fg, -f.t)
    pen.line(P(-reach, fgy), P(f.front_x(max(fgy, 0)), fgy), "C-GRAD-FRNT")
    pen.text("FRONT GRADE", P(-reach, fgy + 0.3 * small), "C-WALL-NOTE",
             size_in=TEXT_SMALL_IN, align="BOTTOM_LEFT",
             alternatives=[(P(-reach, fgy - 0.3 * small), "TOP_LEFT")])


DOT_R_FT = 0.35 / 12.0 * 1.5  # a bar seen end-on


def _draw_stem_bars(pen: Pen, f: _Frame, sec, det, bar_mark, stem_mark):
    """The stem's vertical bars (with the hook into the footing) and its horizontal bars seen
    end-on; returns the labels (text, target point) right and left of the section."""
    right, left = [], []
    P, h, t = f.P, f.h, f.t
    if det.stem is not None:
        b, sd_ = sec.stem_bars, det.stem
        c = (sd_.formed_cover_in + sd_.diameter_in / 2) / 12.0
        y_top = h - sd_.formed_cover_in / 12.0
        y_bot = -t + (det.earth_cover_in + sd_.diameter_in / 2) / 12.0

        def xb(y, c=c):
            return f.back_x(y) - c

        tail = sd_.hook_tail_in / 12.0 + 0.25
        pen.line(P(xb(y_top), y_top), P(xb(y_bot), y_bot), "C-WALL-RBAR")
        pen.line(P(xb(y_bot), y_bot), P(xb(y_bot) - tail, y_bot), "C-WALL-RBAR")
        right.append((f"{bar_mark(stem_mark)} {b}", P(xb(0.6 * h), 0.6 * h)))
    if det.horizontal is not None:
        b, hd = sec.horizontal_bars, det.horizontal
        sb = det.stem if det.stem is not None else hd
        cb = (sb.formed_cover_in + sb.diameter_in + hd.diameter_in / 2) / 12.0
        cf = (hd.formed_cover_in + hd.diameter_in / 2) / 12.0
        n = max(int((h - 0.5) // (b.spacing_in / 12.0)), 1)
        for i in range(n + 1):
            y = 0.25 + i * (h - 0.5) / n
            pen.circle(P(f.back_x(y) - cb, y), DOT_R_FT, "C-WALL-RBAR")
            pen.circle(P(f.front_x(y) + cf, y), DOT_R_FT, "C-WALL-RBAR")
        y = 0.25 + (n // 2) * (h - 0.5) / n
        right.append((f"{bar_mark('H1')} {b} EARTH FACE", P(f.back_x(y) - cb, y)))
        left.append((f"{bar_mark('H2')} {b} FRONT FACE", P(f.front_x(y) + cf, y)))
    return right, left


def _draw_footing_bars(pen: Pen, f: _Frame, sec, det, bar_mark):
    """The heel's top bars, the toe's bottom bars and the longitudinal mats seen end-on;
    returns the labels (text, target point) right and left of the section."""
    right, left = [], []
    P, t, width = f.P, f.t, f.width
    c_top, c_bot = det.top_cover_in / 12.0, det.earth_cover_in / 12.0
    if det.heel is not None:
        y = -c_top - det.heel.diameter_in / 24.0
        pen.line(P(c_bot, y), P(width - c_bot, y), "C-WALL-RBAR")
        right.append((f"{bar_mark('F1')} {sec.heel_bars} TOP", P(width - 0.3, y)))
    if det.toe is not None:
        y = -t + c_bot + det.toe.diameter_in / 24.0
        pen.line(P(c_bot, y), P(width - c_bot, y), "C-WALL-RBAR")
        left.append((f"{bar_mark('F2')} {sec.toe_bars} BOTTOM", P(0.3, y)))
    if det.longitudinal is not None:
        b = sec.footing_long_bars
        yt = -c_top - (det.heel.diameter_in if det.heel else 0) / 12.0 - 0.08
        yb = -t + c_bot + (det.toe.diameter_in if det.toe else 0) / 12.0 + 0.08
        n = max(int((width - 2 * c_bot) // (b.spacing_in / 12.0)), 1)
        for i in range(n + 1):
            x = c_bot + 0.1 + i * (width - 2 * c_bot - 0.2) / n
            pen.circle(P(x, yt), DOT_R_FT, "C-WALL-RBAR")
            pen.circle(P(x, yb), DOT_R_FT, "C-WALL-RBAR")
        right.append((f"{bar_mark('L1')} {b} TOP MAT", P(width - c_bot - 0.1, yt)))
        left.append((f"{bar_mark('L2')} {b} BOTTOM MAT", P(c_bot + 0.1, yb)))
    return right, left


def _bar_labels(pen: Pen, f: _Frame, right, left) -> None:
    """The bar labels in a column each side of the section, each with its leader."""
    k_in, reach = pen.scale, _reach(pen)
    step = 1.8 * pen.h(TEXT_SMALL_IN)
    for labels, x_col, align, sgn in (
            (right, f.ox + f.width + reach + 0.15 * k_in, "MIDDLE_LEFT", 1),
            (left, f.ox - reach - 0.15 * k_in, "MIDDLE_RIGHT", -1)):
        y = f.oy + f.h * 0.85
        for text, target in labels:
            cands = [(x_col, y - i * step) for i in range(40)]
            got = pen.text(text, cands[0], "C-WALL-RBAR", size_in=TEXT_SMALL_IN, align=align,
                           alternatives=cands[1:])
            if got is not None:
                pen.line((got[0] - sgn * 0.05 * k_in, got[1]), target, "C-WALL-RBAR")
                y = got[1] - step


def _title(pen: Pen, mark, segs, cx, cy, grid: SectionGrid) -> None:
    """The section's name, the segments it serves and its scale, under the cell."""
    k_in, small = pen.scale, pen.h(TEXT_SMALL_IN)
    used = ", ".join(g.segment for g in segs)
    ty = cy + 0.1 * k_in
    mid = cx + grid.cell_w_ft / 2
    pen.text_forced(f"SECTION {mark}", (mid, ty + 0.32 * k_in), "C-WALL-NOTE",
                    size_in=TEXT_TITLE_IN, align="BOTTOM_CENTER")
    seg_text = f"TYPICAL - SEGMENTS {used}"
    if text_width(seg_text, small) > grid.cell_w_ft * 0.95:
        seg_text = f"TYPICAL - {len(segs)} SEGMENTS, {segs[0].segment} TO {segs[-1].segment}"
    pen.text_forced(seg_text, (mid, ty + 0.15 * k_in), "C-WALL-NOTE",
                    size_in=TEXT_SMALL_IN, align="BOTTOM_CENTER")
    pen.text_forced(f"SCALE {grid.scale_text}", (mid, ty), "C-WALL-NOTE",
                    size_in=TEXT_SMALL_IN, align="BOTTOM_CENTER")


def _dimensions(pen: Pen, f: _Frame, sec) -> None:
    """Measured dimensions (no text overrides): toe, stem, heel and width below; the key,
    the footing thickness, the stem's top and height."""
    k_in, P, ox, oy = pen.scale, f.P, f.ox, f.oy
    t, kd, kw, ko, h = f.t, f.kd, f.kw, f.ko, f.h
    yd = oy - t - kd
    row1, row2 = yd - 0.25 * k_in, yd - 0.45 * k_in
    for a, b in ((0.0, f.xf_base), (f.xf_base, f.xb_base), (f.xb_base, f.width)):
        _dim(pen, P(a, -t - kd), P(b, -t - kd), (ox, row1))
    _dim(pen, P(0, -t - kd), P(f.width, -t - kd), (ox, row2))
    if sec.has_key:
        _dim(pen, P(ko + kw, -t), P(ko + kw, -t - kd), (ox + ko + kw + 0.25 * k_in, yd),
             angle=90.0)
    _dim(pen, P(0, 0), P(0, -t), (ox - 0.3 * k_in, oy), angle=90.0)
    _dim(pen, P(f.xf_top, h), P(f.xb_top, h), (ox, oy + h + 0.25 * k_in))
    _dim(pen, P(f.xf_base, 0), P(f.xf_top, h), (ox + f.xf_base - 0.3 * k_in, oy), angle=90.0)
