"""Plan view of a wall in model space: the alignment with station ticks and labels, the
retained side marked by short ticks, segment ends and section marks.

The plan is drawn at true size, moved by a stated offset so that it lies clear of the
elevation (plan coordinates = drawn coordinates - offset); the offset is written on the sheet.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..profile.stationing import format_station
from .dxf_style import TEXT_SMALL_IN, Pen
from .envelope import drafted_line

PLAN_LAYER = "C-WALL-ALGN"


@dataclass(frozen=True)
class PlanView:
    x0: float
    y0: float
    x1: float
    y1: float
    shift: tuple[float, float]  # added to the plan coordinates


def plan_extent(design) -> tuple[float, float, float, float]:
    st = design.stations
    x, y = np.asarray(st.x, float), np.asarray(st.y, float)
    return float(x.min()), float(y.min()), float(x.max()), float(y.max())


def _frame(s, x, y, at):
    """Point and unit tangent of the alignment at station ``at``."""
    px, py = float(np.interp(at, s, x)), float(np.interp(at, s, y))
    k = int(np.clip(np.searchsorted(s, at), 1, len(s) - 1))
    dx, dy = x[k] - x[k - 1], y[k] - y[k - 1]
    n = math.hypot(dx, dy) or 1.0
    return px, py, dx / n, dy / n


@dataclass(frozen=True)
class _Drawn:
    """The alignment as drawn: stations, drawn coordinates, and which side is retained."""

    s: np.ndarray
    x: np.ndarray
    y: np.ndarray
    retained: float  # +1: left of up-station

    def at(self, station: float):
        """The drawn point at ``station`` and the unit normal toward the retained side."""
        px, py, tx, ty = _frame(self.s, self.x, self.y, station)
        return px, py, -ty * self.retained, tx * self.retained


def draw_plan(pen: Pen, design, origin, *, interval_ft: float) -> PlanView:
    """Draw the plan with its lower-left extent at ``origin``."""
    st = design.stations
    x0, y0, x1, y1 = plan_extent(design)
    shift = (origin[0] - x0, origin[1] - y0)
    line = _Drawn(np.asarray(st.station_ft, float), np.asarray(st.x, float) + shift[0],
                  np.asarray(st.y, float) + shift[1],
                  1.0 if design.retained_side == "left" else -1.0)
    pen.poly(drafted_line(line.x, line.y), PLAN_LAYER)
    h = pen.h(TEXT_SMALL_IN)
    _retained_ticks(pen, line, h)
    _station_labels(pen, line, interval_ft, h)
    _segment_ends_and_marks(pen, line, design.segments, h)
    if any(q.section is not None for q in design.segments):
        _retained_side_label(pen, line, h)
    pad = 8 * h
    return PlanView(origin[0] - pad, origin[1] - pad, origin[0] + (x1 - x0) + pad,
                    origin[1] + (y1 - y0) + pad, shift)


def _retained_ticks(pen: Pen, line: _Drawn, h: float) -> None:
    """Short ticks on the retained side, every ~0.2 in of paper."""
    s = line.s
    for at in np.arange(s[0], s[-1] + 1e-9, 0.2 * pen.scale):
        px, py, nx, ny = line.at(at)
        pen.line((px, py), (px + nx * 0.5 * h, py + ny * 0.5 * h), PLAN_LAYER)


def _station_labels(pen: Pen, line: _Drawn, interval_ft: float, h: float) -> None:
    """Station ticks and labels on the front side: both ends and every ``interval_ft``."""
    s = line.s
    at = math.ceil(s[0] / interval_ft - 1e-9) * interval_ft
    stations = sorted({float(s[0]), float(s[-1])}
                      | set(np.arange(at, s[-1] + 1e-9, interval_ft).tolist()))
    for at in stations:
        px, py, nx, ny = line.at(at)
        pen.line((px, py), (px - nx * h, py - ny * h), PLAN_LAYER)
        far = (px - nx * 1.6 * h, py - ny * 1.6 * h)
        pen.text(format_station(at, 0), far, PLAN_LAYER, size_in=TEXT_SMALL_IN,
                 align=_away(-nx, -ny),
                 alternatives=[(px - nx * 3.2 * h, py - ny * 3.2 * h),
                               (px - nx * 4.8 * h, py - ny * 4.8 * h)])


def _segment_ends_and_marks(pen: Pen, line: _Drawn, segments, h: float) -> None:
    """Segment ends across the line, section marks on the retained side."""
    for g in segments:
        for at in (g.station_start_ft, g.station_end_ft):
            px, py, nx, ny = line.at(at)
            pen.line((px - nx * 0.6 * h, py - ny * 0.6 * h), (px + nx * 1.4 * h, py + ny * 1.4 * h),
                     "C-WALL-BNDY")
        if g.section is None:
            continue
        px, py, nx, ny = line.at((g.station_start_ft + g.station_end_ft) / 2.0)
        pen.text(g.mark, (px + nx * 2.2 * h, py + ny * 2.2 * h), "C-WALL-TAGS",
                 size_in=TEXT_SMALL_IN, align=_away(nx, ny),
                 alternatives=[(px + nx * k * h, py + ny * k * h) for k in (3.6, 5.0, 6.4)])


def _retained_side_label(pen: Pen, line: _Drawn, h: float) -> None:
    """"RETAINED SIDE" on that side, where it fits first."""
    s = line.s
    cands = []
    for frac in (0.25, 0.75, 0.1, 0.9, 0.5):
        px, py, nx, ny = line.at(s[0] + frac * (s[-1] - s[0]))
        for k in (2.2, 4.0, 6.0):
            cands.append(((px + nx * k * h, py + ny * k * h), _away(nx, ny)))
    pen.text("RETAINED SIDE", cands[0][0], PLAN_LAYER, size_in=TEXT_SMALL_IN,
             align=cands[0][1], alternatives=cands[1:])


def _away(nx: float, ny: float) -> str:
    """The text alignment that puts a label on the side of its insert pointed to by (nx, ny)."""
    if abs(nx) >= abs(ny):
        return "MIDDLE_LEFT" if nx > 0 else "MIDDLE_RIGHT"
    return "BOTTOM_CENTER" if ny > 0 else "TOP_CENTER"
