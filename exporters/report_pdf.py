"""The calc package's PDF machinery (fpdf2, real extractable text): the fonts, the page header
and footer with the cautions, a writer of paragraphs and ruled tables, and the contents list.
"""

from __future__ import annotations

import math
from pathlib import Path

from ..cautions import CAUTIONS

FONT = "dejavu"
MONO = "dejavumono"
MARGIN_MM = 15.0


def font_files() -> dict[str, Path]:
    import matplotlib

    d = Path(matplotlib.get_data_path()) / "fonts" / "ttf"
    return {"": d / "DejaVuSans.ttf", "B": d / "DejaVuSans-Bold.ttf",
            "I": d / "DejaVuSans-Oblique.ttf", "mono": d / "DejaVuSansMono.ttf"}


def make_pdf(site_name: str, version: str):
    from fpdf import FPDF

    class Report(FPDF):
        def header(self):
            if self.page_no() == 1:
                return
            self.set_font(FONT, "", 7)
            self.set_text_color(90)
            self.cell(0, 4, f"{site_name} - retaining wall calculations (wallsched {version})",
                      align="L")
            self.ln(6)
            self.set_text_color(0)

        def footer(self):
            self.set_y(-12)
            self.set_font(FONT, "", 6.5)
            self.set_text_color(90)
            self.cell(0, 3.5, CAUTIONS[0] + " " + CAUTIONS[2], align="L")
            self.ln(3.5)
            self.cell(0, 3.5, f"page {self.page_no()} of {{nb}}", align="R")
            self.set_text_color(0)

    pdf = Report(orientation="P", unit="mm", format="letter")
    fonts = font_files()
    pdf.add_font(FONT, "", str(fonts[""]))
    pdf.add_font(FONT, "B", str(fonts["B"]))
    pdf.add_font(FONT, "I", str(fonts["I"]))
    pdf.add_font(MONO, "", str(fonts["mono"]))
    pdf.set_margins(MARGIN_MM, MARGIN_MM, MARGIN_MM)
    pdf.set_auto_page_break(True, margin=16)
    return pdf


class Writer:
    """Paragraphs and tables drawn with ``cell`` and a word-wrap of our own (fpdf2's
    ``multi_cell`` is exact but slow for a package of a hundred pages)."""

    def __init__(self, pdf):
        self.pdf = pdf
        self._widths: dict = {}

    def width(self, text: str) -> float:
        p = self.pdf
        key = (p.font_family, p.font_style, p.font_size_pt, text)
        w = self._widths.get(key)
        if w is None:
            w = self._widths[key] = p.get_string_width(text)
        return w

    def wrap(self, text: str, width: float) -> list[str]:
        """Lines of ``text`` no wider than ``width`` (mm), broken at blanks; an over-long
        word is broken by characters."""
        out = []
        for raw in str(text).split("\n"):
            lead = len(raw) - len(raw.lstrip(" "))
            words = raw.split()
            line, lw = " " * lead, self.width(" " * lead) if lead else 0.0
            sp = self.width(" ")
            for word in words:
                ww = self.width(word)
                if line.strip() and lw + sp + ww > width:
                    out.append(line)
                    line, lw = " " * lead, self.width(" " * lead) if lead else 0.0
                while ww > width and len(word) > 1:
                    k = len(word) - 1
                    while k > 1 and self.width(word[:k]) > width - lw:
                        k -= 1
                    out.append(line + word[:k])
                    word = word[k:]
                    ww = self.width(word)
                    line, lw = " " * lead, self.width(" " * lead) if lead else 0.0
                if line.strip():
                    line, lw = line + " " + word, lw + sp + ww
                else:
                    line, lw = line + word, lw + ww
            out.append(line)
        return out

    def lines(self, text, h):
        p = self.pdf
        for line in self.wrap(text, p.w - p.l_margin - p.r_margin):
            if p.get_y() + h > p.page_break_trigger:
                p.add_page()
            p.cell(0, h, line, new_x="LMARGIN", new_y="NEXT")

    def h1(self, text):
        p = self.pdf
        p.start_section(text, level=0)
        p.set_font(FONT, "B", 14)
        self.lines(text, 7)
        p.ln(1)
        p.set_font(FONT, "", 9)

    def h2(self, text, *, toc=False):
        p = self.pdf
        if p.get_y() > p.h - 40:
            p.add_page()
        if toc:
            p.start_section(text, level=1)
        p.ln(1.5)
        p.set_font(FONT, "B", 10.5)
        self.lines(text, 5.5)
        p.set_font(FONT, "", 9)

    def para(self, text, size=9, style="", h=4.4, mono=False, color=None):
        p = self.pdf
        p.set_font(MONO if mono else FONT, "" if mono else style, size)
        if color:
            p.set_text_color(*color)
        self.lines(text, h)
        p.set_text_color(0)
        p.set_font(FONT, "", 9)

    def table(self, headers, rows, widths=None, size=7.5, bold_rows=()):
        """A ruled table; header repeated on each page; ``bold_rows`` in bold red."""
        p = self.pdf
        n = len(headers)
        avail = p.w - p.l_margin - p.r_margin
        widths = list(widths) if widths else [avail / n] * n
        scale = avail / sum(widths) if sum(widths) > avail else 1.0
        widths = [w * scale for w in widths]
        lh = size * 0.42
        pad = 0.8

        def draw(cells, style, color=None):
            p.set_font(FONT, style, size)
            wrapped = [self.wrap(str(c), w - 2 * pad) for c, w in zip(cells, widths,
                                                                       strict=True)]
            hgt = max(len(x) for x in wrapped) * lh + 2 * pad * 0.6
            if p.get_y() + hgt > p.page_break_trigger:
                p.add_page()
                if style != "B" or color:
                    draw(headers, "B")
                    p.set_font(FONT, style, size)
            x0, y0 = p.l_margin, p.get_y()
            if color:
                p.set_text_color(*color)
            x = x0
            for lines_, w in zip(wrapped, widths, strict=True):
                p.rect(x, y0, w, hgt)
                for i, line in enumerate(lines_):
                    p.set_xy(x + pad, y0 + pad * 0.6 + i * lh)
                    p.cell(w - 2 * pad, lh, line)
                x += w
            p.set_text_color(0)
            p.set_xy(x0, y0 + hgt)

        p.set_line_width(0.15)
        draw(headers, "B")
        bad = set(bold_rows)
        for i, r in enumerate(rows):
            if i in bad:
                draw(r, "B", (180, 0, 0))
            else:
                draw(r, "")
        p.set_font(FONT, "", 9)
        p.ln(1.5)


TOC_ROW_MM = 4.6  # height of a contents row, at most
TOC_ROW_MIN_MM = 2.2  # and at least (the rows shrink to fit the pages reserved)


def toc_pages(pdf, n_entries: int) -> int:
    """Pages the contents need at full row height (the title takes the top of the first)."""
    first = math.floor((pdf.page_break_trigger - (MARGIN_MM + 16)) / TOC_ROW_MM)
    later = math.floor((pdf.page_break_trigger - pdf.t_margin) / TOC_ROW_MM)
    return 1 if n_entries <= first else 1 + math.ceil((n_entries - first) / later)


def render_toc(pdf, outline, *, pages: int):
    """The contents on exactly ``pages`` pages (what ``insert_toc_placeholder`` reserved):
    rows shrink to fit when there are more entries than the pages hold at full height, and
    blank pages follow when there are fewer."""
    start = pdf.page
    pdf.set_xy(MARGIN_MM, MARGIN_MM + 6)
    pdf.set_font(FONT, "B", 14)
    pdf.cell(0, 8, "Contents", new_x="LMARGIN", new_y="NEXT")
    pdf.ln(2)
    first = pdf.page_break_trigger - pdf.get_y()
    later = pdf.page_break_trigger - pdf.t_margin
    row = TOC_ROW_MM
    while row > TOC_ROW_MIN_MM and (
            math.floor(first / row) + (pages - 1) * math.floor(later / row) < len(outline)):
        row = round(row - 0.1, 2)
    scale = row / TOC_ROW_MM
    for entry in outline:
        size = (9 if entry.level == 0 else 8.5) * max(scale, 0.6)
        pdf.set_font(FONT, "B" if entry.level == 0 else "", size)
        indent = 6 * entry.level
        pdf.set_x(MARGIN_MM + indent)
        w = pdf.w - 2 * MARGIN_MM - indent - 12
        pdf.cell(w, row, entry.name, link=pdf.add_link(page=entry.page_number))
        pdf.cell(12, row, str(entry.page_number), align="R", new_x="LMARGIN", new_y="NEXT")
    while pdf.page < start + pages - 1:
        pdf.add_page()
