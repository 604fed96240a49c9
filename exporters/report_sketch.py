"""The dimensioned cross-section of a section mark, drawn straight into the calc package with
the PDF's own vector primitives (no raster image: crisp at any zoom, and a page costs
milliseconds, so the calc package's time follows the number of marks, not a plotting library).

Everything is laid out in section coordinates (ft, x from the toe edge, y up from the bottom of
footing) and mapped into a box on the page by one uniform scale, so that the sketch keeps its
proportions; the dimensions carry their values as text.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..profile.stationing import format_station

CONCRETE_RGB = (217, 217, 217)
RETAINED_RGB = (139, 90, 43)
FRONT_RGB = (46, 125, 50)
THRUST_RGB = (198, 40, 40)
TEXT_PT = 6.5


@dataclass(frozen=True)
class _Frame:
    """Section coordinates (ft) -> page (mm)."""

    x0_mm: float
    y0_mm: float
    xmin: float
    ymax: float
    scale: float  # mm per ft

    def __call__(self, x: float, y: float) -> tuple[float, float]:
        return (self.x0_mm + (x - self.xmin) * self.scale,
                self.y0_mm + (self.ymax - y) * self.scale)


def _geometry(case):
    sec, g = case.segment.section, case.geometry
    t = sec.footing_thickness_in / 12.0
    tb, tt = sec.stem_base_in / 12.0, sec.stem_top_in / 12.0
    hst = float(g.stem_height_ft)
    xf0, xb0 = sec.toe_ft, sec.toe_ft + tb
    if sec.batter_face == "back":
        xf1, xb1 = xf0, xf0 + tt
    else:
        xf1, xb1 = xb0 - tt, xb0
    kd = sec.key_depth_in / 12.0 if sec.has_key else 0.0
    return sec, g, t, hst, (xf0, xb0, xf1, xb1), kd


def sketch_extent(case) -> tuple[float, float, float, float]:
    """(xmin, xmax, ymin, ymax) of the sketch in section coordinates (ft)."""
    sec, _, t, hst, _, kd = _geometry(case)
    yb = -kd - 0.5
    return -3.9, sec.footing_width_ft + 7.5, yb - 2.0, t + hst + 1.0


def draw_section_sketch(pdf, case, *, x_mm: float, y_mm: float, w_mm: float,
                        h_mm: float, font: str) -> float:
    """Draw the sketch of ``case`` into the box (x, y, w, h) of the current page; returns the
    height used (mm)."""
    sec, g, t, hst, (xf0, xb0, xf1, xb1), kd = _geometry(case)
    b = sec.footing_width_ft
    d, hh = float(g.embedment_ft), float(g.design_height_ft)
    xmin, xmax, ymin, ymax = sketch_extent(case)
    title_mm = 5.0
    scale = min(w_mm / (xmax - xmin), (h_mm - title_mm) / (ymax - ymin))
    used_w = (xmax - xmin) * scale
    f = _Frame(x_mm + (w_mm - used_w) / 2, y_mm + title_mm, xmin, ymax, scale)
    pen = _Pen(pdf, f, font)

    pdf.set_font(font, "", 8)
    pdf.set_text_color(0)
    pdf.text(x_mm, y_mm + 3.0, f"Section {case.mark} at station {format_station(case.station_ft)}"
             f" (wall {case.wall}, segment {case.segment.segment})")
    with pdf.local_context():
        pdf.set_fill_color(*CONCRETE_RGB)
        pdf.set_draw_color(0)
        pdf.set_line_width(0.35)
        pen.polygon([(0, 0), (b, 0), (b, t), (0, t)])
        pen.polygon([(xf0, t), (xb0, t), (xb1, t + hst), (xf1, t + hst)])
        if sec.has_key:
            kw, ko = sec.key_width_in / 12.0, sec.key_offset_ft
            pen.polygon([(ko, 0), (ko + kw, 0), (ko + kw, -kd), (ko, -kd)])
    _grades_and_thrust(pen, case, sec, t, hst, (xf0, xb0, xf1, xb1), b, d, hh)
    _dimensions(pen, sec, g, t, hst, (xf0, xb0, xf1, xb1), b, d, hh, kd)
    pdf.set_text_color(0)
    pdf.set_draw_color(0)
    return title_mm + (ymax - ymin) * scale


def _grades_and_thrust(pen, case, sec, t, hst, faces, b, d, hh) -> None:
    """Both grades and the thrust components on the plane through the heel edge."""
    xf0, xb0, xf1, xb1 = faces
    x_back_at_h = xb0 + (xb1 - xb0) * (hh - t) / hst if hst > 0 else xb0
    pen.line(x_back_at_h, hh, b + 1.5, hh, rgb=RETAINED_RGB, width=0.5)
    pen.label(b + 1.55, hh, "retained grade", anchor="left")
    pen.line(-2.0, d, xf0, d, rgb=FRONT_RGB, width=0.5)
    pen.label(xf0 - 0.15, d + 0.08, "front grade", anchor="right", valign="bottom")
    # the thrust on the plane through the heel edge
    pen.line(b, 0, b, hh, rgb=(128, 128, 128), width=0.2, dash=True)
    for comp in case.thrust.components:
        y = float(comp.arm_ft)
        if float(comp.horizontal_lb) > 0:
            pen.arrow(b + 1.2, y, b, y, rgb=THRUST_RGB)
            pen.label(b + 1.25, y, f"{comp.name} {float(comp.horizontal_lb):,.0f} lb/ft @ "
                      f"{y:.2f} ft", anchor="left", rgb=THRUST_RGB)


def _dimensions(pen, sec, g, t, hst, faces, b, d, hh, kd) -> None:
    """The footing, stem, embedment and height dimensions, and the key's size."""
    from .dxf_elevation import format_ft_in

    xf0, xb0, xf1, xb1 = faces
    yb = -kd - 0.5
    pen.dim_h(0, sec.toe_ft, yb, f"toe {format_ft_in(sec.toe_ft)}")
    pen.dim_h(xf0, xb0, yb - 0.55, f"stem {sec.stem_base_in:g}\"")
    pen.dim_h(xb0, b, yb, f"heel {format_ft_in(sec.heel_ft)}")
    pen.dim_h(0, b, yb - 1.1, f"B = {format_ft_in(b)}")
    pen.dim_h(xf1, xb1, t + hst + 0.35, f"{sec.stem_top_in:g}\"")
    pen.dim_v(-0.4, 0, t, f"T {sec.footing_thickness_in:g}\"")
    pen.dim_v(-2.3, 0, d, f"D {d:.2f}'")
    pen.dim_v(-2.3, d, hh, f"h {float(g.retained_height_ft):.2f}'")
    pen.dim_v(-3.2, 0, hh, f"H {hh:.2f}'")
    pen.dim_v(xf0 - 0.35 if sec.toe_ft > 0.8 else xf0 + (xb1 - xf0) / 2, t, t + hst,
              f"stem {hst:.2f}'")
    if sec.has_key:
        kw, ko = sec.key_width_in / 12.0, sec.key_offset_ft
        pen.label(ko + kw / 2, -kd - 0.1, f"key {sec.key_width_in:g}\" x {sec.key_depth_in:g}\"",
                  anchor="center", valign="top")


class _Pen:
    """Lines, arrows, dimensions and labels in section coordinates."""

    def __init__(self, pdf, frame: _Frame, font: str):
        self.pdf, self.f, self.font = pdf, frame, font

    def polygon(self, pts) -> None:
        self.pdf.polygon([self.f(x, y) for x, y in pts], style="DF")

    def line(self, x0, y0, x1, y1, *, rgb=(0, 0, 0), width=0.2, dash=False) -> None:
        pdf = self.pdf
        with pdf.local_context():
            pdf.set_draw_color(*rgb)
            pdf.set_line_width(width)
            if dash:
                pdf.set_dash_pattern(dash=0.6, gap=0.6)
            pdf.line(*self.f(x0, y0), *self.f(x1, y1))

    def arrow(self, x0, y0, x1, y1, *, rgb=(0, 0, 0), width=0.3, both=False) -> None:
        """A line from (x0, y0) with a filled head at (x1, y1) (and at the start if ``both``)."""
        self.line(x0, y0, x1, y1, rgb=rgb, width=width)
        self._head(x0, y0, x1, y1, rgb)
        if both:
            self._head(x1, y1, x0, y0, rgb)

    def _head(self, x0, y0, x1, y1, rgb) -> None:
        (px0, py0), (px1, py1) = self.f(x0, y0), self.f(x1, y1)
        ln = math.hypot(px1 - px0, py1 - py0)
        if ln <= 1e-9:
            return
        ux, uy = (px1 - px0) / ln, (py1 - py0) / ln
        size = min(1.4, 0.4 * ln)
        bx, by = px1 - ux * size, py1 - uy * size
        pts = [(px1, py1), (bx - uy * size * 0.35, by + ux * size * 0.35),
               (bx + uy * size * 0.35, by - ux * size * 0.35)]
        with self.pdf.local_context():
            self.pdf.set_fill_color(*rgb)
            self.pdf.set_draw_color(*rgb)
            self.pdf.polygon(pts, style="F")

    def label(self, x, y, text, *, anchor="left", valign="center", rgb=(0, 0, 0),
              rotate=False) -> None:
        pdf = self.pdf
        pdf.set_font(self.font, "", TEXT_PT)
        pdf.set_text_color(*rgb)
        px, py = self.f(x, y)
        w = pdf.get_string_width(text)
        asc = TEXT_PT * 0.3528 * 0.72  # cap height of the font, mm
        shift_x = {"left": 0.0, "center": -w / 2, "right": -w}[anchor]
        shift_y = {"center": asc / 2, "bottom": 0.0, "top": asc}[valign]
        if rotate:
            with pdf.rotation(90, px, py):
                pdf.text(px + shift_x, py + shift_y, text)
        else:
            pdf.text(px + shift_x, py + shift_y, text)

    def dim_h(self, x0, x1, y, text) -> None:
        if abs(x1 - x0) < 1e-6:  # nothing to dimension (e.g. no toe): say nothing
            return
        self.arrow(x0, y, x1, y, width=0.15, both=True)
        self.label((x0 + x1) / 2, y - 0.12, text, anchor="center", valign="top")

    def dim_v(self, x, y0, y1, text) -> None:
        self.arrow(x, y0, x, y1, width=0.15, both=True)
        # rotated text reads upward, centred on the dimension, just left of its line
        self.label(x - 0.1, (y0 + y1) / 2, text, anchor="center", valign="bottom", rotate=True)
