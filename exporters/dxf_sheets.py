"""Paper-space sheets: sheet sizes, border, title block, the note block with the cautions,
viewports at standard scales, and tables drawn at plotted size.

Paper space is in inches. Every sheet has the same frame: a border (wider margin at the left
for binding), a title-block column at the right holding the notes and cautions, the project,
the wall, the sheet title, its scale, date, revision and "sheet n of m".
"""

from __future__ import annotations

from dataclasses import dataclass

from ..cautions import CAUTIONS
from .dxf_style import TEXT_IN, TEXT_SHEET_IN, TEXT_SMALL_IN, TEXT_TITLE_IN, Pen
from .label_layout import LabelLayout, text_width

SHEET_SIZES_IN = {"ARCH D": (36.0, 24.0), "ANSI D": (34.0, 22.0)}  # ASME Y14.1 / ANSI D
MARGIN_IN = 0.5
MARGIN_LEFT_IN = 1.0  # binding edge (common practice)
TITLE_W_IN = 4.0
SHEET_LAYER = "C-ANNO-TTLB"
VIEWPORT_LAYER = "C-ANNO-VPRT"


def check_sheet_size(name: str) -> tuple[float, float]:
    try:
        return SHEET_SIZES_IN[name]
    except KeyError:
        raise ValueError(f"sheet size {name!r} is not one of {', '.join(SHEET_SIZES_IN)}") \
            from None


@dataclass(frozen=True)
class Area:
    x0: float
    y0: float
    x1: float
    y1: float

    @property
    def w(self) -> float:
        return self.x1 - self.x0

    @property
    def h(self) -> float:
        return self.y1 - self.y0


def drawing_area(size: tuple[float, float]) -> Area:
    w, h = size
    return Area(MARGIN_LEFT_IN + 0.25, MARGIN_IN + 0.25, w - MARGIN_IN - TITLE_W_IN - 0.25,
                h - MARGIN_IN - 0.25)


@dataclass(frozen=True)
class TitleInfo:
    project: str
    wall: str
    title: str
    scale: str
    date: str
    revision: str
    number: int
    total: int


def new_sheet(doc, name: str, size: tuple[float, float]):
    """A paper-space layout of ``size`` inches, plotted 1:1."""
    psp = doc.layouts.new(name)
    psp.page_setup(size=size, margins=(0, 0, 0, 0), units="inch")
    # page_setup adds a main viewport; it stays (ezdxf needs it) and shows nothing extra
    return psp


def wrap(text: str, height: float, width: float) -> list[str]:
    words, lines, cur = text.split(), [], ""
    for w in words:
        trial = f"{cur} {w}".strip()
        if cur and text_width(trial, height) > width:
            lines.append(cur)
            cur = w
        else:
            cur = trial
    if cur:
        lines.append(cur)
    return lines


def draw_frame(psp, size, info: TitleInfo, notes: list[str]) -> tuple[Pen, Area]:
    """Border, title block and note block; returns the sheet's pen and its drawing area."""
    pen = Pen(psp, 1.0, LabelLayout(TEXT_IN))
    w, h = size
    bx0, by0, bx1, by1 = MARGIN_LEFT_IN, MARGIN_IN, w - MARGIN_IN, h - MARGIN_IN
    pen.poly([(bx0, by0), (bx1, by0), (bx1, by1), (bx0, by1)], SHEET_LAYER, closed=True)
    tx0 = bx1 - TITLE_W_IN
    pen.line((tx0, by0), (tx0, by1), SHEET_LAYER)
    pad = 0.12
    inner = TITLE_W_IN - 2 * pad
    # fields from the bottom up: (label, value, value size)
    fields = [("SHEET", f"{info.number} OF {info.total}", TEXT_SHEET_IN),
              ("REVISION", info.revision or "0", TEXT_IN),
              ("DATE", info.date or "NOT ISSUED", TEXT_IN),
              ("SCALE", info.scale, TEXT_IN),
              ("SHEET TITLE", info.title, TEXT_TITLE_IN),
              ("WALL", info.wall, TEXT_TITLE_IN),
              ("PROJECT", info.project, TEXT_TITLE_IN)]
    y = by0
    for label, value, size_in in fields:
        lines = wrap(value, size_in, inner)
        box_h = 0.12 + TEXT_SMALL_IN + 0.08 + len(lines) * 1.5 * size_in + 0.06
        pen.text_forced(label, (tx0 + pad, y + box_h - 0.1), SHEET_LAYER,
                        size_in=TEXT_SMALL_IN, align="TOP_LEFT")
        yy = y + box_h - 0.1 - TEXT_SMALL_IN - 0.1
        for line in lines:
            pen.text_forced(line, (tx0 + pad, yy), SHEET_LAYER, size_in=size_in,
                            align="TOP_LEFT")
            yy -= 1.5 * size_in
        y += box_h
        pen.line((tx0, y), (bx1, y), SHEET_LAYER)
    # the note block: the cautions first, then the drawing's notes, from the top down
    yy = by1 - pad
    pen.text_forced("PRELIMINARY - NOT FOR CONSTRUCTION", (tx0 + pad, yy), SHEET_LAYER,
                    size_in=TEXT_TITLE_IN, align="TOP_LEFT")
    yy -= 2.0 * TEXT_TITLE_IN
    pen.text_forced("CAUTIONS", (tx0 + pad, yy), SHEET_LAYER, size_in=TEXT_IN, align="TOP_LEFT")
    yy -= 1.8 * TEXT_IN
    for block, items in (("", CAUTIONS), ("NOTES", notes)):
        if block:
            yy -= 0.5 * TEXT_IN
            pen.text_forced(block, (tx0 + pad, yy), SHEET_LAYER, size_in=TEXT_IN,
                            align="TOP_LEFT")
            yy -= 1.8 * TEXT_IN
        for i, item in enumerate(items, 1):
            lines = wrap(f"{i}. {item}", TEXT_SMALL_IN, inner)
            for line in lines:
                if yy - TEXT_SMALL_IN < y + 0.1:
                    break  # the block is full (the notes are also in the README and report)
                pen.text_forced(line, (tx0 + pad, yy), "C-WALL-NOTE", size_in=TEXT_SMALL_IN,
                                align="TOP_LEFT")
                yy -= 1.55 * TEXT_SMALL_IN
            yy -= 0.4 * TEXT_SMALL_IN
    return pen, drawing_area(size)


def add_viewport(psp, area: Area, window: tuple[float, float, float, float],
                 scale_ft_per_in: float) -> None:
    """A viewport filling ``area`` (paper in) centred on ``window`` (model ft) at
    ``scale_ft_per_in``; the viewport is shrunk to the window where the window is smaller."""
    x0, y0, x1, y1 = window
    w_in = min(area.w, (x1 - x0) / scale_ft_per_in)
    h_in = min(area.h, (y1 - y0) / scale_ft_per_in)
    cx = area.x0 + w_in / 2.0
    cy = area.y1 - h_in / 2.0
    vp = psp.add_viewport(center=(cx, cy), size=(w_in, h_in),
                          view_center_point=((x0 + x1) / 2.0, (y0 + y1) / 2.0),
                          view_height=h_in * scale_ft_per_in,
                          dxfattribs={"layer": VIEWPORT_LAYER})
    vp.dxf.flags = vp.dxf.flags | 16384  # display locked (DXF VIEWPORT flag)
    return Area(cx - w_in / 2.0, cy - h_in / 2.0, cx + w_in / 2.0, cy + h_in / 2.0)


def view_title(pen: Pen, x: float, y: float, title: str, detail: str) -> float:
    """A view's title under it (title, a rule, the scale); returns the y below it."""
    pen.text_forced(title, (x, y), "C-WALL-NOTE", size_in=TEXT_TITLE_IN, align="TOP_LEFT")
    w = text_width(title, TEXT_TITLE_IN)
    pen.line((x, y - 1.35 * TEXT_TITLE_IN), (x + w, y - 1.35 * TEXT_TITLE_IN), "C-WALL-NOTE")
    pen.text_forced(detail, (x, y - 1.6 * TEXT_TITLE_IN), "C-WALL-NOTE", size_in=TEXT_SMALL_IN,
                    align="TOP_LEFT")
    return y - 1.6 * TEXT_TITLE_IN - 2.0 * TEXT_SMALL_IN


def table_size(headers, rows, size_in=TEXT_SMALL_IN) -> tuple[list[float], float]:
    widths = []
    for c in range(len(headers)):
        wmax = max([text_width(str(headers[c]), size_in)]
                   + [text_width(str(r[c]), size_in) for r in rows])
        widths.append(wmax + 1.2 * size_in)
    return widths, 1.9 * size_in


def draw_table(pen: Pen, x0: float, y0: float, title: str, headers, rows,
               size_in=TEXT_SMALL_IN) -> tuple[float, float]:
    """A ruled table with its top-left at (x0, y0); returns (width, height) in inches."""
    widths, row_h = table_size(headers, rows, size_in)
    pen.text_forced(title, (x0, y0 + 0.4 * size_in), "C-WALL-NOTE", size_in=TEXT_IN,
                    align="LEFT")
    total_w = sum(widths)
    n = len(rows) + 1
    for i in range(n + 1):
        yy = y0 - i * row_h
        pen.line((x0, yy), (x0 + total_w, yy), "C-WALL-TABL")
    x = x0
    for w in [0.0, *widths]:
        x += w
        pen.line((x, y0), (x, y0 - n * row_h), "C-WALL-TABL")
    # one MTEXT per column, a line per row at the rows' exact spacing: a table of hundreds of
    # rows is tens of entities, not thousands
    x = x0
    for c, w in enumerate(widths):
        cells = [str(r[c]) for r in [headers, *rows]]
        if any(cells):
            pen.column_text(cells, (x + 0.6 * size_in, y0 - 0.5 * row_h), row_h,
                            "C-WALL-TABL", size_in=size_in, width=w - 0.6 * size_in)
        x += w
    return total_w, n * row_h + 2.0 * TEXT_IN


def rows_per_page(area_h: float, size_in=TEXT_SMALL_IN) -> int:
    return max(int((area_h - 3 * TEXT_IN) / (1.9 * size_in)) - 1, 1)


def pages(rows: list, per_page: int) -> list[list]:
    if not rows:
        return [[]]
    return [rows[i:i + per_page] for i in range(0, len(rows), per_page)]

