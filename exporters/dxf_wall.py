"""A wall's drawing set: model space (elevation, plan, true-size sections) and its sheets.

Sheets of one wall, in order: 1 plan and elevation; more elevation sheets where the wall is
longer than one strip; typical sections; the wall schedule and the bending schedule of the
wall's bars. Scales are standard: the elevation and plan at engineering scales (1" = N'),
the sections at an architectural scale; every text is sized for its view's plotted scale.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..profile.stationing import format_station
from .dxf_elev_view import draw_elevation, tw_ends
from .dxf_plan import draw_plan, plan_extent
from .dxf_sections import draw_sections, plan_grid
from .dxf_sheets import (
    Area,
    TitleInfo,
    add_viewport,
    check_sheet_size,
    draw_frame,
    draw_table,
    drawing_area,
    new_sheet,
    pages,
    rows_per_page,
    view_title,
)
from .dxf_style import ENGINEERING_SCALES_FT, TEXT_IN, TEXT_SMALL_IN, Pen, engineering_scale_text
from .label_layout import LabelLayout

ELEV_ROOM_IN = 3.6  # plotted room of an elevation strip beyond the wall: labels, tags, stations
TITLE_ROOM_IN = 0.75  # under a viewport: its title and scale


def elevation_scale(design, ve: float, strip_h_in: float) -> float:
    st = design.stations
    segs = [g for g in design.segments if g.section is not None] or list(design.segments)
    hi = max(max(st.retained_grade_ft), max(max(tw_ends(g)) for g in segs))
    lo = min(min(st.front_grade_ft), min(g.bottom_of_footing_ft for g in segs) - 2.0)
    rng = (hi - lo) * ve
    for s in ENGINEERING_SCALES_FT:
        if rng / s + ELEV_ROOM_IN <= strip_h_in:
            return s
    return ENGINEERING_SCALES_FT[-1]


def _plan_scale(design, area_w: float, area_h: float) -> float:
    x0, y0, x1, y1 = plan_extent(design)
    for s in ENGINEERING_SCALES_FT:
        if (x1 - x0) / s + 1.6 <= area_w and (y1 - y0) / s + 1.6 <= area_h:
            return s
    return ENGINEERING_SCALES_FT[-1]


def _strips(x0: float, x1: float, width_ft: float) -> list[tuple[float, float]]:
    n = max(1, math.ceil((x1 - x0) / width_ft - 1e-9))
    step = (x1 - x0) / n
    return [(x0 + i * step, x0 + (i + 1) * step) for i in range(n)]


@dataclass
class _Model:
    """What model space holds of one wall, and the scales its sheets show it at."""

    view: object  # the elevation (dxf_elev_view.ElevationView)
    plan: object  # the plan (dxf_plan.PlanView)
    grid: object  # the sections' cells (dxf_sections.SectionGrid)
    strips: list  # the elevation cut into sheet-wide strips (x0, x1)
    scale: float  # the elevation's, ft per plotted inch
    plan_scale: float
    plan_h_in: float  # the plan's room on sheet 1
    labels: LabelLayout


def _draw_model(msp, design, area, *, bars, ve, label_interval_ft, revisions,
                revision_tag) -> _Model:
    """The elevation, the plan above it and the true-size sections right of both."""
    model_labels = LabelLayout(TEXT_IN * 20.0)
    # sheet 1 holds the plan (upper part) and the first elevation strip (lower part)
    strip_h = (area.h - 2 * TITLE_ROOM_IN) * 0.55
    scale = elevation_scale(design, ve, strip_h)
    view = draw_elevation(Pen(msp, scale, model_labels), design, ve=ve,
                          interval_ft=label_interval_ft, revisions=revisions,
                          revision_tag=revision_tag)
    elev_h_in = (view.y1 - view.y0) / scale
    plan_h_in = area.h - elev_h_in - 2 * TITLE_ROOM_IN - 0.3
    plan_scale = _plan_scale(design, area.w, max(plan_h_in, 2.0))
    plan = draw_plan(Pen(msp, plan_scale, model_labels), design,
                     (view.x0 + 20 * plan_scale, view.y1 + 40 * plan_scale),
                     interval_ft=label_interval_ft)
    strips = _strips(view.x0, view.x1, area.w * scale)
    # sections: right of everything drawn so far
    grid = plan_grid(design, area.w, area.h - TITLE_ROOM_IN, (max(view.x1, plan.x1) + 60.0,
                                                             view.y0))
    draw_sections(lambda sc: Pen(msp, sc, model_labels), design, grid, bars)
    return _Model(view, plan, grid, strips, scale, plan_scale, plan_h_in, model_labels)


class _Sheets:
    """The wall's sheets, numbered "n of total" in the order they are made."""

    def __init__(self, doc, design, size, *, site_name, date, revision, notes, total):
        self.doc, self.size, self.total, self.number = doc, size, total, 0
        self.wall = design.wall
        self.wall_text = f"{design.wall}" + (f" - {design.name}" if design.name else "")
        self.site_name, self.date, self.revision, self.notes = site_name, date, revision, notes

    def new(self, title, scale_text):
        self.number += 1
        psp = new_sheet(self.doc, _layout_name(self.wall, self.number), self.size)
        info = TitleInfo(self.site_name, self.wall_text, title, scale_text, self.date,
                         self.revision, self.number, self.total)
        # the cautions on every sheet; the general notes once, on the first (common practice)
        ppen, _ = draw_frame(psp, self.size, info, self.notes if self.number == 1 else [
            f"General notes: sheet 1 of {self.total}."])
        return psp, ppen


def draw_wall(doc, design, *, bars, site_name: str, ve: float, sheet_size: str,
              label_interval_ft: float, revisions, revision_tag: str, date: str,
              revision: str, notes: list[str], schedule_rows, bending_rows,
              schedule_headers, bending_headers) -> dict:
    """Everything of one wall into ``doc``; returns counts for the caller (labels, sheets)."""
    size = check_sheet_size(sheet_size)
    area = drawing_area(size)
    m = _draw_model(doc.modelspace(), design, area, bars=bars, ve=ve,
                    label_interval_ft=label_interval_ft, revisions=revisions,
                    revision_tag=revision_tag)
    sec_sheets = max(1, math.ceil(len(design.marks()) / m.grid.per_sheet))
    sched_pages = pages(schedule_rows, rows_per_page(area.h / 2.0 - 0.2))
    bend_pages = pages(bending_rows, rows_per_page(area.h / 2.0 - 0.2))
    table_sheets = max(len(sched_pages), len(bend_pages))
    elev_sheets = 1 + math.ceil((len(m.strips) - 1) / 2)
    sheets = _Sheets(doc, design, size, site_name=site_name, date=date, revision=revision,
                     notes=notes, total=elev_sheets + sec_sheets + table_sheets)
    _elevation_sheets(sheets, design, m, area, ve)
    _section_sheets(sheets, design, m.grid, area, sec_sheets)
    _table_sheets(sheets, design, area, table_sheets, sched_pages, bend_pages,
                  schedule_headers, bending_headers)
    if "Layout1" in doc.layouts and len(doc.layouts) > 2:
        doc.layouts.delete("Layout1")  # ezdxf's default sheet, empty
    return {"sheets": sheets.total, "labels": m.view.label_count,
            "dropped": list(m.labels.dropped)}


def _elevation_sheets(sheets: _Sheets, design, m: _Model, area, ve: float) -> None:
    """Sheet 1 (the plan above, the first strip below) and two strips a sheet after it."""
    hscale = engineering_scale_text(m.scale)
    vscale = engineering_scale_text(m.scale / ve)
    elev_detail = (f"HORIZONTAL {hscale}, VERTICAL {vscale} (VERTICAL EXAGGERATION {ve:g}:1); "
                   + ("VIEWED FROM THE FRONT (LOW) SIDE" if design.retained_side == "left"
                      else "STATIONS TO THE RIGHT, VIEWED FROM THE RETAINED SIDE"))
    plan = m.plan
    psp, ppen = sheets.new("PLAN AND ELEVATION", "AS NOTED")
    plan_area = Area(area.x0, area.y1 - m.plan_h_in, area.x1, area.y1)
    got = add_viewport(psp, plan_area, (plan.x0, plan.y0, plan.x1, plan.y1), m.plan_scale)
    view_title(ppen, got.x0, got.y0 - 0.1, f"PLAN - WALL {design.wall}",
               f"SCALE {engineering_scale_text(m.plan_scale)}; PLAN COORDINATES = DRAWN - "
               f"({plan.shift[0]:.2f}, {plan.shift[1]:.2f}) FT; TICKS ON THE RETAINED SIDE")
    top = got.y0 - TITLE_ROOM_IN - 0.2
    strip_list = list(m.strips)
    first = [strip_list.pop(0)]
    _elev_strips(psp, ppen, first, m.view, m.scale, area, top, design, elev_detail,
                 total=len(m.strips))
    k = 1
    while strip_list:
        chunk, strip_list = strip_list[:2], strip_list[2:]
        psp, ppen = sheets.new("ELEVATION", f"H {hscale}, V {vscale}")
        _elev_strips(psp, ppen, chunk, m.view, m.scale, area, area.y1, design, elev_detail,
                     total=len(m.strips), first_index=k)
        k += len(chunk)


def _section_sheets(sheets: _Sheets, design, grid, area, count: int) -> None:
    marks = list(design.marks())
    for i in range(count):
        psp, ppen = sheets.new("TYPICAL SECTIONS", grid.scale_text)
        window = grid.block_window(i)
        got = add_viewport(psp, Area(area.x0, area.y0 + TITLE_ROOM_IN, area.x1, area.y1),
                           window, grid.scale_ft_per_in)
        shown = marks[i * grid.per_sheet:(i + 1) * grid.per_sheet]
        view_title(ppen, got.x0, got.y0 - 0.1, f"TYPICAL SECTIONS {', '.join(shown)}",
                   f"SCALE {grid.scale_text}; LOOKING UP-STATION; DIMENSIONS IN INCHES (\") "
                   "AND FEET (')")


def _table_sheets(sheets: _Sheets, design, area, count: int, sched_pages, bend_pages,
                  schedule_headers, bending_headers) -> None:
    for i in range(count):
        psp, ppen = sheets.new("WALL SCHEDULE AND BENDING SCHEDULE", "NONE")
        y = area.y1 - 0.3
        if i < len(sched_pages) and sched_pages[i]:
            more = f" ({i + 1} OF {len(sched_pages)})" if len(sched_pages) > 1 else ""
            _, th = draw_table(ppen, area.x0, y, f"WALL {design.wall} SCHEDULE{more}",
                               schedule_headers, sched_pages[i])
            y -= th + 0.4
        if i < len(bend_pages) and bend_pages[i]:
            more = f" ({i + 1} OF {len(bend_pages)})" if len(bend_pages) > 1 else ""
            draw_table(ppen, area.x0, y, f"WALL {design.wall} BENDING SCHEDULE{more}",
                       bending_headers, bend_pages[i])


def _elev_strips(psp, ppen, strips, view, scale, area, top, design, detail, *, total,
                 first_index=0):
    h_in = (view.y1 - view.y0) / scale
    y_top = top
    for j, (a, b) in enumerate(strips):
        strip_area = Area(area.x0, y_top - h_in, area.x1, y_top)
        got = add_viewport(psp, strip_area, (a, view.y0, b, view.y1), scale)
        n = first_index + j + 1
        part = f" ({n} OF {total})" if total > 1 else ""
        lo = max(a, float(design.stations.station_ft[0]))
        hi = min(b, float(design.stations.station_ft[-1]))
        view_title(ppen, got.x0, got.y0 - 0.1,
                   f"ELEVATION - WALL {design.wall}, STA {format_station(lo)} TO "
                   f"{format_station(hi)}{part}", detail)
        y_top = got.y0 - TITLE_ROOM_IN - 0.2


def _layout_name(wall: str, n: int) -> str:
    keep = "".join(c if c.isalnum() or c in "-_ ." else "_" for c in wall)
    return f"{keep} sheet {n}"


__all__ = ["draw_wall", "elevation_scale", "TEXT_SMALL_IN"]
