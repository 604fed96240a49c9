"""Drafting style shared by the wall drawings: plotted text sizes, standard scales, dimension
styles, and a pen that writes every text through a :class:`~.label_layout.LabelLayout`.

Model space is in feet. A view drawn for a viewport at ``scale_ft_per_in`` (feet of model per
plotted inch) writes its text at ``paper height x scale`` so that it plots at the paper height.
"""

from __future__ import annotations

from .label_layout import Box, LabelLayout, text_box

TEXT_STYLE = "Standard"
MTEXT_LINE_PITCH = 5.0 / 3.0  # DXF: an MTEXT line at spacing factor 1 is 5/3 of the text height
# plotted text heights, in (common practice: 0.08 in the least that stays legible)
TEXT_SMALL_IN = 0.08
TEXT_IN = 0.10
TEXT_TITLE_IN = 0.14
TEXT_SHEET_IN = 0.20

# engineering scales for plans and elevations: 1" = N' (common practice)
ENGINEERING_SCALES_FT = (10.0, 20.0, 30.0, 40.0, 50.0, 60.0, 100.0, 200.0, 500.0, 1000.0)
# architectural scales for details: (feet per plotted inch, as written) (common practice)
ARCHITECTURAL_SCALES = ((1.0, "1\" = 1'-0\""), (4.0 / 3.0, "3/4\" = 1'-0\""),
                        (2.0, "1/2\" = 1'-0\""), (8.0 / 3.0, "3/8\" = 1'-0\""),
                        (4.0, "1/4\" = 1'-0\""), (16.0 / 3.0, "3/16\" = 1'-0\""),
                        (8.0, "1/8\" = 1'-0\""))

# dimension styles: short lengths in inches, longer ones in decimal feet; the text is always
# the measured length (no overrides), so a dimension reads what it measures
DIM_INCH = "WALL-IN"
DIM_FOOT = "WALL-FT"
DIM_INCH_BELOW_FT = 4.0  # lengths below this are dimensioned in inches


def engineering_scale_text(ft_per_in: float) -> str:
    return f"1\" = {ft_per_in:g}'"


def setup_dimstyles(doc) -> None:
    """Two dimension styles (drawing units ft): inches (``dimlfac`` 12, ``"`` suffix) and
    decimal feet (two decimals, ``'`` suffix); sizes in drawing units are set per view by
    ``dimscale`` on each dimension."""
    common = {"dimtxsty": TEXT_STYLE, "dimtad": 1, "dimtih": 0, "dimtoh": 0, "dimzin": 8,
              "dimexo": 0.04, "dimexe": 0.06, "dimgap": 0.03, "dimasz": 0.08,
              "dimtxt": TEXT_SMALL_IN, "dimblk": "", "dimdsep": ord(".")}
    ds = doc.dimstyles.new(DIM_INCH)
    for k, v in {**common, "dimlfac": 12.0, "dimdec": 1, "dimpost": "<>\""}.items():
        ds.set_dxf_attrib(k, v)
    ds = doc.dimstyles.new(DIM_FOOT)
    for k, v in {**common, "dimlfac": 1.0, "dimdec": 2, "dimzin": 0, "dimpost": "<>'"}.items():
        ds.set_dxf_attrib(k, v)


def dim_text_value_ft(text: str) -> float:
    """A dimension text written by these styles, in feet (``8"`` -> 0.667, ``6.50'`` -> 6.5)."""
    t = text.strip()
    if t.endswith('"'):
        return float(t[:-1]) / 12.0
    if t.endswith("'"):
        return float(t[:-1])
    raise ValueError(f"not a dimension text of the wall styles: {text!r}")


def format_dim(length_ft: float) -> str:
    """What a wall dimension style writes for ``length_ft`` (the style chosen by length)."""
    if length_ft < DIM_INCH_BELOW_FT:
        v = round(length_ft * 12.0, 1)
        return f"{v:g}\""
    return f"{length_ft:.2f}'"


class Pen:
    """Draws on one layout; every text goes through the layout's label placement.

    Args:
        space: an ezdxf layout (model space or a paper-space layout).
        scale: drawing units per plotted inch of this view (1.0 on paper in inches).
        labels: the :class:`LabelLayout` of ``space`` (shared by every view on it).
    """

    def __init__(self, space, scale: float, labels: LabelLayout):
        self.space = space
        self.scale = scale
        self.labels = labels

    def h(self, paper_in: float = TEXT_IN) -> float:
        return paper_in * self.scale

    def line(self, p, q, layer):
        self.space.add_line((float(p[0]), float(p[1])), (float(q[0]), float(q[1])),
                            dxfattribs={"layer": layer})

    def poly(self, pts, layer, closed=False):
        self.space.add_lwpolyline([(float(x), float(y)) for x, y in pts], close=closed,
                                  dxfattribs={"layer": layer})

    def circle(self, c, r, layer):
        self.space.add_circle((float(c[0]), float(c[1])), r, dxfattribs={"layer": layer})

    def _add_text(self, s, insert, h, layer, align, rotation):
        from ezdxf.enums import TextEntityAlignment

        t = self.space.add_text(s, height=h, rotation=rotation,
                                dxfattribs={"layer": layer, "style": TEXT_STYLE})
        t.set_placement((float(insert[0]), float(insert[1])), align=TextEntityAlignment[align])
        return t

    def text(self, s, insert, layer, *, size_in=TEXT_IN, align="LEFT", rotation=0.0,
             alternatives=()):
        """Place ``s`` at ``insert`` or the first clear of ``alternatives`` (each an insert,
        or an ``(insert, align)`` pair); returns the insert used, or None when none is
        clear (the text is then left out)."""
        h = self.h(size_in)
        cands = [(insert, align)]
        for a in alternatives:
            if len(a) == 2 and isinstance(a[1], str):
                cands.append(a)
            else:
                cands.append((a, align))
        got = self.labels.first_clear(s, h, cands, rotation=rotation)
        if got is None:
            return None
        self._add_text(s, got[0], h, layer, got[1], rotation)
        return got[0]

    def text_forced(self, s, insert, layer, *, size_in=TEXT_IN, align="LEFT", rotation=0.0):
        """A text whose place is fixed (a table cell, a title): reserved, never moved."""
        h = self.h(size_in)
        self.labels.reserve(text_box(s, insert, h, align, rotation))
        return self._add_text(s, insert, h, layer, align, rotation)

    def column_text(self, lines, first_middle, spacing, layer, *, size_in=TEXT_IN,
                    width: float):
        """A column of one-line cells as one MTEXT: line ``i`` centred on
        ``first_middle[1] - i * spacing`` (exact line spacing), left-aligned at
        ``first_middle[0]``; the column's extent (``width`` wide) reserved in the layout."""
        from ezdxf.enums import MTextEntityAlignment

        h = self.h(size_in)
        x, y = float(first_middle[0]), float(first_middle[1])
        top = y + h / 2.0  # the cap line of the first row
        self.labels.reserve(Box(x, y - (len(lines) - 1) * spacing - h, x + width, top + 0.1 * h))
        text = "\\P".join(_mtext_escape(t) for t in lines)
        m = self.space.add_mtext(text, dxfattribs={
            "layer": layer, "style": TEXT_STYLE, "char_height": h, "insert": (x, top),
            "attachment_point": MTextEntityAlignment.TOP_LEFT,
            "line_spacing_style": 2,  # exact
            "line_spacing_factor": spacing / (MTEXT_LINE_PITCH * h)})
        return m

    def width(self, s, size_in=TEXT_IN) -> float:
        from .label_layout import text_width

        return text_width(s, self.h(size_in))


def _mtext_escape(text: str) -> str:
    """``text`` as literal MTEXT content (backslash and braces are its control characters)."""
    return text.replace("\\", "\\\\").replace("{", "\\{").replace("}", "\\}")
