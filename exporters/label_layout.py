"""Collision-avoiding placement of drawing text.

Every TEXT a drawing writes goes through one :class:`LabelLayout` per layout (model space,
each sheet): the layout measures the text with the font metrics ezdxf itself uses for text
extents (``ezdxf.fonts``), so a label placed here does not overlap another when read back
with ``ezdxf.bbox``. A label is offered a list of candidate positions and takes the first one
clear of every text and every reserved area (tag circles, revision clouds); a label with no
clear candidate is left out and counted in :attr:`LabelLayout.dropped`.

Boxes are kept in a uniform grid of cells, so a check touches only the boxes nearby.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

FONT = "txt"  # the font of the "Standard" text style that ezdxf measures
CELL = 8.0  # grid cell, in multiples of the layout's typical text height


@dataclass(frozen=True)
class Box:
    x0: float
    y0: float
    x1: float
    y1: float

    def grown(self, pad: float) -> Box:
        return Box(self.x0 - pad, self.y0 - pad, self.x1 + pad, self.y1 + pad)

    def overlaps(self, other: Box) -> bool:
        return (self.x0 < other.x1 and other.x0 < self.x1 and self.y0 < other.y1
                and other.y0 < self.y1)

    def union(self, other: Box) -> Box:
        return Box(min(self.x0, other.x0), min(self.y0, other.y0), max(self.x1, other.x1),
                   max(self.y1, other.y1))


_FONTS: dict = {}


def text_width(text: str, height: float) -> float:
    """Width of ``text`` at cap height ``height`` in the Standard style's font."""
    font = _FONTS.get("font")
    if font is None:
        from ezdxf.fonts import fonts

        font = _FONTS["font"] = fonts.make_font(FONT, 1.0)
    return font.text_width(text) * height


def _descender() -> float:
    d = _FONTS.get("descender")
    if d is None:
        text_width("", 1.0)
        d = _FONTS["descender"] = float(_FONTS["font"].measurements.descender_height)
    return d


def text_box(text: str, insert, height: float, align: str = "LEFT",
             rotation: float = 0.0) -> Box:
    """The extents of a TEXT entity as ezdxf measures them (rotation 0, 90 or 270)."""
    w = text_width(text, height)
    desc = _descender() * height
    v, _, hz = align.partition("_") if "_" in align else ("BASELINE", "", align)
    if align == "MIDDLE":  # DXF "middle": centred on the whole glyph height
        v, hz = "CENTRE", "CENTER"
    left = {"LEFT": 0.0, "CENTER": -w / 2.0, "RIGHT": -w}[hz]
    base = {"BASELINE": 0.0, "MIDDLE": -height / 2.0, "TOP": -height, "BOTTOM": desc,
            "CENTRE": -(height - desc) / 2.0}[v]
    lx0, lx1 = left, left + w
    ly0, ly1 = base - desc, base + height
    x, y = float(insert[0]), float(insert[1])
    r = round(rotation) % 360
    if r == 0:
        return Box(x + lx0, y + ly0, x + lx1, y + ly1)
    if r == 90:  # (u, v) -> (-v, u)
        return Box(x - ly1, y + lx0, x - ly0, y + lx1)
    if r == 270:  # (u, v) -> (v, -u)
        return Box(x + ly0, y - lx1, x + ly1, y - lx0)
    raise ValueError(f"text rotation {rotation} not supported by the layout")


class LabelLayout:
    """Placed text boxes and reserved areas of one layout.

    Args:
        height: the typical text height of the layout (sizes the grid), drawing units.
        pad: clear gap kept between boxes, drawing units (default 0.15 height).
    """

    def __init__(self, height: float, pad: float | None = None):
        self.cell = CELL * height
        self.pad = 0.15 * height if pad is None else pad
        self._grid: dict[tuple[int, int], list[Box]] = {}
        self.dropped: list[str] = []
        self.boxes: list[Box] = []

    def _cells(self, b: Box):
        c = self.cell
        for i in range(math.floor(b.x0 / c), math.floor(b.x1 / c) + 1):
            for j in range(math.floor(b.y0 / c), math.floor(b.y1 / c) + 1):
                yield i, j

    def is_clear(self, box: Box) -> bool:
        g = box.grown(self.pad)
        for key in self._cells(g):
            for other in self._grid.get(key, ()):
                if g.overlaps(other):
                    return False
        return True

    def reserve(self, box: Box) -> None:
        """Keep ``box`` clear of later labels (a text placed, a tag, a cloud's band)."""
        self.boxes.append(box)
        for key in self._cells(box):
            self._grid.setdefault(key, []).append(box)

    def first_clear(self, text: str, height: float, candidates, *, rotation: float = 0.0):
        """The first ``(insert, align)`` of ``candidates`` whose box is clear, reserved; or
        None (the text is recorded in :attr:`dropped`)."""
        for insert, align in candidates:
            box = text_box(text, insert, height, align, rotation)
            if self.is_clear(box):
                self.reserve(box)
                return insert, align
        self.dropped.append(text)
        return None

    def hits_line(self, p, q) -> bool:
        """Whether the straight line p-q passes through a reserved box (sampled)."""
        (x0, y0), (x1, y1) = p, q
        n = max(2, int(math.hypot(x1 - x0, y1 - y0) / (self.pad * 2 or 0.1)) + 1)
        n = min(n, 2000)
        for k in range(n + 1):
            t = k / n
            x, y = x0 + (x1 - x0) * t, y0 + (y1 - y0) * t
            probe = Box(x, y, x, y)
            for key in self._cells(probe):
                for other in self._grid.get(key, ()):
                    if other.x0 <= x <= other.x1 and other.y0 <= y <= other.y1:
                        return True
        return False
