"""The calc package for the reviewer: ``report.pdf`` (fpdf2, real extractable text).

Contents, in order: cover and design basis (site, date, version, input files with SHA-256, the
resolved soil, loads, materials and criteria per wall with where each value comes from, the
cautions); a site summary (walls, segments, heights, quantities, the most-utilised check per
wall, every segment with its factors of safety and status); one page or more per section mark,
worked at the mark's governing station (a dimensioned cross-section sketch, the station's
grades, every weight and lateral force with its arm, every check as formula -> numbers ->
result with its ratio and clause); the bar list; with a comparison run, the revision summary.
Page numbers and a contents list.

Nothing is computed here: the governing case of every section mark (its station, geometry,
weights, thrust, checks, heel load and stress blocks) is the engine's
(``SiteDesign.cases``, ``engine/governing.py``), the design basis rows and input hashes come
in the run information (``RunInfo``), and the numbers printed are theirs. A failing segment or
check is printed as failing.
"""

from __future__ import annotations

import datetime as _dt
import functools
import math
from dataclasses import dataclass
from pathlib import Path

from ..cautions import CAUTIONS
from ..profile.stationing import format_station
from .report_sketch import draw_section_sketch

FONT = "dejavu"
MONO = "dejavumono"
MARGIN_MM = 15.0


# ---------------------------------------------------------------- check texts


@dataclass(frozen=True)
class CheckText:
    """One check written out: formula, the numbers put in, and the result."""

    name: str
    title: str
    clause: str
    formula: str
    numbers: str
    result: str
    ratio: float
    passes: bool


def _n(v, fmt=",.0f") -> str:
    if v is None or not math.isfinite(float(v)):
        return "n/a"
    return format(float(v), fmt)


def check_texts(case) -> list[CheckText]:
    """Every check row of the case as formula -> numbers -> result (ratio, clause)."""
    r = case.result
    g, inp = case.geometry, case.inputs
    p = case.checks.pressure
    f = float
    hs = f(g.soil_height_ft)
    B = f(g.footing_width_ft)
    ot, sl, br = r["overturning"], r["sliding"], r["bearing"]
    stem, heel, toe = r["stem"], r["heel"], r["toe"]
    st = case.checks.stability
    with_q = bool(st.bearing_with_surcharge)
    case_v = st.case_surcharge if with_q else st.case_dead
    wu_heel = case.heel_load_psf  # ACI 318-19 5.3.1 via ASCE 7 2.3 (the engine's heel load)
    def flex(m, member):
        a = float(member.a_in) if m["as_in2"] else math.nan  # the engine's stress block
        return (f"As = {_n(m['as_in2'], '.3f')} in²/ft, d = {_n(m['d_in'], '.2f')} in, "
                f"a = As·fy/(0.85·f'c·b) = {_n(a, '.2f')} in, φ = {_n(m['phi'], '.3f')} "
                f"(εt = {_n(m['eps_t'], '.4f')}), φMn = {_n(m['phi_mn_lbft'])} lb-ft/ft")

    def shear(m, size_effect):
        lam = "λs·" if size_effect else ""
        return (f"φVc = 0.75·8·{lam}ρw^(1/3)·√f'c·b·d ≤ 0.75·5·√f'c·b·d with d = "
                f"{_n(m['d_in'], '.2f')} in, f'c = {inp.fc_psi:,.0f} psi, b = 12 in: "
                f"φVc = {_n(m['phi_vn_lb'])} lb/ft")

    fs = {
        "overturning": (
            "FS_OT = ΣM_R / ΣM_O about the toe at the bottom of footing ≥ FS required; "
            "resultant inside the base",
            f"ΣM_R = {_n(ot['m_resisting_lbft'])} lb-ft/ft, ΣM_O = "
            f"{_n(ot['m_overturning_lbft'])} lb-ft/ft, FS_OT = {_n(ot['fs'], '.2f')} "
            f"(required {_n(ot['fs_required'], '.2f')}); resultant "
            f"{'inside' if ot['resultant_in_base'] else 'OUTSIDE'} the base"),
        "sliding": (
            "FS_SL = (μ·ΣV + P_p) / ΣH ≥ FS required",
            f"(μ = {inp.friction_coefficient:g} × ΣV = {_n(sl['sum_v_lb'])} lb/ft + P_p = "
            f"{_n(sl['passive_lb'])} lb/ft) / ΣH = {_n(sl['h_driving_lb'])} lb/ft: "
            f"FS_SL = {_n(sl['fs'], '.2f')} (required {_n(sl['fs_required'], '.2f')})"),
        "bearing": (
            "e = B/2 − (ΣM_R − ΣM_O)/ΣV; q_max = ΣV/B·(1 + 6e/B) for e ≤ B/6, else "
            "2ΣV/(3(B/2 − e)) ≤ q_allowable",
            f"case {br['case']}: ΣV = {_n(float(case_v.sum_v_lb))} lb/ft, B = {B:.2f} ft, "
            f"e = {_n(br['eccentricity_ft'], '.2f')} ft (B/6 = {B / 6:.2f} ft), q_max = "
            f"{_n(br['q_max_psf'])} psf, q_min = {_n(br['q_min_psf'])} psf, allowable "
            f"{_n(br['allowable_psf'])} psf"),
        "embedment": (
            "D = front grade − bottom of footing ≥ max(min_embedment_ft, frost_depth_ft)",
            f"D = {case.front_grade_ft:.2f} − {case.segment.bottom_of_footing_ft:.2f} = "
            f"{f(g.embedment_ft):.2f} ft"),
        "stem_flexure": (
            p.stem_moment_formula + "; φMn = φ·As·fy·(d − a/2)",
            f"h_s = {hs:.2f} ft, EFP = {p.active_efp_pcf:g} pcf, Ka = {p.ka:.3f}, q = "
            f"{p.surcharge_psf:g} psf: Mu = {_n(stem['mu_lbft'])} lb-ft/ft; "
            + flex(stem, case.checks.stem)),
        "stem_shear": (
            p.stem_shear_formula,
            f"Vu = {_n(stem['vu_lb'])} lb/ft; " + shear(stem, True)),
        "stem_flexure_height": (
            "Mu(y) ≤ φMn(y) at sections up the stem (bars full height, thickness tapering)",
            f"worst at y = {_n(float(case.checks.stem.height_flexure_y_ft), '.2f')} ft above "
            "the footing"),
        "stem_shear_height": (
            "Vu(y) ≤ φVc(y) at sections up the stem",
            f"worst at y = {_n(float(case.checks.stem.height_shear_y_ft), '.2f')} ft above "
            "the footing"),
        "stem_min_steel": ("As ≥ As,min = 0.0018·b·h (h = stem base thickness)",
                           f"h = {_n(stem['thickness_in'], '.1f')} in"),
        "stem_spacing": (
            "s ≤ min(3h, 18 in" + (", crack control 15(40,000/fs) − 2.5cc ≤ 12(40,000/fs))"
                                   if inp.crack_control else ")"),
            f"service bar stress fs = {_n(stem['fs_service_psi'])} psi, clear cover "
            f"{_n(stem['cover_in'], '.2f')} in"),
        "stem_hook": ("ℓdh ≤ footing thickness − bottom cover − bottom mat (toe + longitudinal "
                      "bars)",
                      f"ℓdh = {_n(stem['ldh_in'], '.1f')} in, available "
                      f"{_n(stem['ldh_available_in'], '.1f')} in"),
        "heel_flexure": ((
            "Mu at the back face of the stem = the combination's load on the heel less its "
            "factored bearing pressure under the heel, the largest of 1.2D+1.6H+1.6L, "
            "1.2D+1.6H, 0.9D+1.6H" + (", 1.2D+1.0E+1.6H" if inp.seismic is not None else ""))
            if inp.heel_upward_pressure else
            "wu = 1.2·(γ·h_s + γc·T) + 1.6·q; Mu = wu·L²/2 at the back face of the stem",
            (f"governing {heel['mu_combination']}, " if inp.heel_upward_pressure
             else f"wu = {wu_heel:,.0f} psf, ")
            + f"L = {f(g.heel_ft):.2f} ft: Mu = "
            f"{_n(heel['mu_lbft'])} lb-ft/ft; " + flex(heel, case.checks.heel)),
        "heel_shear": (("Vu at the back face of the stem, the largest of the combinations "
                        "(net of the factored bearing pressure)")
                       if inp.heel_upward_pressure else "Vu = wu·L at the back face of the stem",
                       (f"governing {heel['vu_combination']}: "
                        if inp.heel_upward_pressure else "")
                       + f"Vu = {_n(heel['vu_lb'])} lb/ft; "
                       + shear(heel, inp.footing_shear_size_effect)),
        "heel_development": (
            "top bars beyond the back face of the stem: ℓd (Table 25.4.2.3, ψt = 1.3 top bar) "
            "or ℓdh (25.4.3.1) × As,req/As,prov (25.4.10.1), ≥ 12 in / 8db and 6 in; ≤ stem "
            "+ toe − 3 in",
            f"{heel['anchorage']}: required {_n(heel['ld_required_in'], '.1f')} in (straight "
            f"{_n(heel['ld_straight_in'], '.1f')} in, hooked {_n(heel['ldh_in'], '.1f')} in; "
            f"As,req = {_n(heel['as_required_in2'], '.3f')} in²/ft), room "
            f"{_n(heel['ld_available_in'], '.1f')} in"),
        "toe_development": (
            "bottom bars beyond the front face of the stem: ℓd (Table 25.4.2.3) or ℓdh "
            "(25.4.3.1) × As,req/As,prov (25.4.10.1); ≤ stem + heel − 3 in",
            f"{toe['anchorage']}: required {_n(toe['ld_required_in'], '.1f')} in (straight "
            f"{_n(toe['ld_straight_in'], '.1f')} in, hooked {_n(toe['ldh_in'], '.1f')} in), "
            f"room {_n(toe['ld_available_in'], '.1f')} in"),
        "heel_min_steel": ("As ≥ 0.0018·b·T", f"T = {f(g.footing_thickness_in):g} in"),
        "heel_spacing": ("s ≤ min(3T, 18 in)", f"T = {f(g.footing_thickness_in):g} in"),
        "toe_flexure": (
            "Mu = 1.6·(bearing pressure moment over the toe) − 0.9·(footing + soil)·L²/2",
            f"L = {f(g.toe_ft):.2f} ft, pressure of the case {br['case']}: Mu = "
            f"{_n(toe['mu_lbft'])} lb-ft/ft; " + flex(toe, case.checks.toe)),
        "toe_shear": ("Vu at d from the front face of the stem = 1.6·(bearing force over the "
                      "toe to there) − 0.9·(footing + soil) over the same length",
                      f"Vu = {_n(toe['vu_lb'])} lb/ft; "
                      + shear(toe, inp.footing_shear_size_effect)),
        "toe_min_steel": ("As ≥ 0.0018·b·T", f"T = {f(g.footing_thickness_in):g} in"),
        "toe_spacing": ("s ≤ min(3T, 18 in)", f"T = {f(g.footing_thickness_in):g} in"),
        "toe_depth": ("d of the bottom bars ≥ 6 in", f"d = {_n(toe['d_in'], '.2f')} in"),
        "stem_horizontal_steel": (
            "2 faces × As ≥ ρt·b·t_avg (ρt 0.0020 for #5 and smaller, fy ≥ 60 ksi; else 0.0025)",
            f"t_avg = {(f(g.stem_top_in) + f(g.stem_base_in)) / 2:.1f} in"),
        "stem_horizontal_spacing": ("s ≤ min(3t, 18 in)", f"t = {f(g.stem_top_in):g} in"),
        "footing_longitudinal_steel": ("2 mats × As ≥ 0.0018·b·T",
                                       f"T = {f(g.footing_thickness_in):g} in"),
        "footing_longitudinal_spacing": ("s ≤ min(5T, 18 in)",
                                         f"T = {f(g.footing_thickness_in):g} in"),
    }
    out = []
    for row in r["checks"]:
        formula, numbers = fs.get(row["name"], ("demand ≤ capacity", ""))
        ratio = row["ratio"]
        unit = "" if row["unit"] == "-" else f" {row['unit']}"
        if row["name"] in ("overturning", "sliding"):
            dc = (f"required FS {_n(row['demand'], '.2f')} / provided "
                  f"{_n(row['capacity'], '.2f')}")
        else:
            fmt = ".3f" if row["unit"] in ("in2/ft",) else ",.2f" if row["unit"] in (
                "in", "ft") else ",.0f"
            dc = (f"demand {_n(row['demand'], fmt)}{unit} / capacity "
                  f"{_n(row['capacity'], fmt)}{unit}")
        rtxt = "inf" if ratio is None and not row["passes"] else _n(ratio, ".3f")
        verdict = "OK" if row["passes"] else "FAILS"
        out.append(CheckText(row["name"], row["title"], row["clause"], formula, numbers,
                             f"{dc} = ratio {rtxt} -> {verdict}",
                             math.inf if ratio is None else float(ratio), bool(row["passes"])))
    return out


# ---------------------------------------------------------------- the PDF


def _font_files() -> dict[str, Path]:
    import matplotlib

    d = Path(matplotlib.get_data_path()) / "fonts" / "ttf"
    return {"": d / "DejaVuSans.ttf", "B": d / "DejaVuSans-Bold.ttf",
            "I": d / "DejaVuSans-Oblique.ttf", "mono": d / "DejaVuSansMono.ttf"}


def _make_pdf(site_name: str, version: str):
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
    fonts = _font_files()
    pdf.add_font(FONT, "", str(fonts[""]))
    pdf.add_font(FONT, "B", str(fonts["B"]))
    pdf.add_font(FONT, "I", str(fonts["I"]))
    pdf.add_font(MONO, "", str(fonts["mono"]))
    pdf.set_margins(MARGIN_MM, MARGIN_MM, MARGIN_MM)
    pdf.set_auto_page_break(True, margin=16)
    return pdf


class _Writer:
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


def _toc_pages(pdf, n_entries: int) -> int:
    """Pages the contents need at full row height (the title takes the top of the first)."""
    first = math.floor((pdf.page_break_trigger - (MARGIN_MM + 16)) / TOC_ROW_MM)
    later = math.floor((pdf.page_break_trigger - pdf.t_margin) / TOC_ROW_MM)
    return 1 if n_entries <= first else 1 + math.ceil((n_entries - first) / later)


def _render_toc(pdf, outline, *, pages: int):
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


def _used_in(text: str, most: int = 6) -> str:
    parts = [p.strip() for p in str(text).split(",") if p.strip()]
    return ", ".join(parts) if len(parts) <= most else (
        ", ".join(parts[:most]) + f" and {len(parts) - most} more")


def _bar_list_chapter(wr, bars, barlist) -> None:
    """The bending schedule (one row per bar mark, site-wide) and the steel per wall; the
    placing list per segment is ``rebar.csv`` (a table that grows with the segments)."""
    from .dxf_elevation import format_ft_in

    if barlist is not None and len(barlist):
        rows = [[str(r.mark), f"#{r.size}", f"{r.count}", format_ft_in(r.length_ft), r.shape,
                 f"{r.weight_lb:,.1f}", _used_in(r.used_in)] for r in barlist.itertuples()]
        wr.table(["mark", "size", "count", "length", "shape", "weight lb", "used in"], rows,
                 [14, 12, 14, 20, 16, 22, 82], size=7)
        wr.para("Bending schedule: one row per bar mark (same size, shape and dimensions), "
                "with its leg dimensions in barlist.csv; the placing list of every segment is "
                "rebar.csv.", size=8)
    per_wall = [[wid, f"{int(b['count'].sum())}", f"{b['weight_lb'].sum():,.1f}"]
                for wid, b in bars.groupby("wall", sort=False)]
    per_wall.append(["SITE", f"{int(bars['count'].sum())}", f"{bars['weight_lb'].sum():,.1f}"])
    wr.table(["wall", "bars", "weight lb"], per_wall, [30, 25, 30], size=7)
    wr.para("ASTM A615 Grade 60. Hooks per ACI 318-19 Table 25.3.1; laps Class B per "
            "ACI 318-19 25.5.2.", size=8)


def write_report(run, sd, path, *, diff=None, date: _dt.date | None = None) -> Path:
    """Write the calc package to ``path`` (``report.pdf``); returns the path.

    ``run`` is the :class:`~.run_info.RunInfo`, ``sd`` the engine's ``SiteDesign``; ``diff``
    is a :class:`~wallsched.exporters.diff.RunDiff` against an earlier run (its summary
    becomes the last chapter); ``date`` defaults to today.
    """
    from .dxf_elevation import format_ft_in

    path = Path(path)
    date = date or _dt.date.today()
    cases = sd.cases
    version = run.version
    pdf = _make_pdf(run.site_name, version)
    pdf.set_title(f"{run.site_name} - retaining wall calculations")
    pdf.set_author("wallsched " + version)
    pdf.set_creator("wallsched " + version)
    pdf.set_creation_date(_dt.datetime(date.year, date.month, date.day,
                                       tzinfo=_dt.UTC))
    wr = _Writer(pdf)
    n_walls = len(sd.walls)

    # ---- cover
    pdf.add_page()
    pdf.set_font(FONT, "B", 20)
    pdf.ln(10)
    pdf.multi_cell(0, 10, run.site_name, new_x="LMARGIN", new_y="NEXT")
    pdf.set_font(FONT, "", 13)
    pdf.multi_cell(0, 7, "Cantilevered reinforced-concrete site retaining walls - "
                         "calculation package", new_x="LMARGIN", new_y="NEXT")
    pdf.ln(3)
    pdf.set_font(FONT, "", 9.5)
    meta = [f"Date: {date.isoformat()}", f"Made with wallsched {version}",
            f"Walls: {', '.join(w.wall for w in sd.walls)}"]
    if run.meta.get("engineer"):
        meta.append(f"Engineer: {run.meta['engineer']}")
    if run.meta.get("notes"):
        meta.append(f"Notes: {run.meta['notes']}")
    overall = "every segment passes every check" if sd.ok else \
        "SOME SEGMENTS FAIL OR COULD NOT BE DESIGNED - see the site summary"
    meta.append(f"Result: {overall}")
    for line in meta:
        wr.para(line, size=9.5)
    pdf.ln(3)
    pdf.set_draw_color(180, 0, 0)
    pdf.set_line_width(0.6)
    y0 = pdf.get_y()
    pdf.set_font(FONT, "B", 10)
    pdf.set_text_color(180, 0, 0)
    pdf.multi_cell(0, 5.5, "CAUTIONS", new_x="LMARGIN", new_y="NEXT")
    pdf.set_text_color(0)
    for i, line in enumerate(run.cautions, 1):
        wr.para(f"{i}. {line}", size=9)
    pdf.rect(MARGIN_MM - 2, y0 - 2, pdf.w - 2 * MARGIN_MM + 4, pdf.get_y() - y0 + 4)
    pdf.set_draw_color(0)
    pdf.set_line_width(0.2)
    pdf.ln(6)
    if sd.warnings:
        wr.h2("Warnings (legal but suspicious inputs; check them)")
        for line in sd.warnings:
            wr.para("- " + line, size=8.5)
        pdf.ln(2)
    wr.h2("Input files (SHA-256)")
    for name, digest in run.input_hashes.items():
        wr.para(name, size=8)
        wr.para("    " + digest, size=7, mono=True, h=3.6)

    # ---- contents
    pdf.add_page()
    # the outline: three chapters and the revision, a chapter per section mark, and three
    # entries of the basis and one per wall of the summary
    n_entries = 6 + n_walls + len(cases) + (1 if diff is not None else 0)
    toc_pages = _toc_pages(pdf, n_entries)
    pdf.insert_toc_placeholder(functools.partial(_render_toc, pages=toc_pages),
                               pages=toc_pages)  # and a page break: the basis starts a page

    # ---- design basis
    wr.h1("Design basis")
    wr.para("Resolved values per wall (site-file values, per-wall overrides and the "
            "documented defaults), with where each comes from.", size=8.5, style="I")
    heads = ["key", *run.wall_ids, "source"]
    widths = [34, *([14] * n_walls), 186 - 34 - 14 * n_walls]
    srcs = list(run.soil_sources)
    wr.h2("Soil (from the geotechnical report; never defaulted)", toc=True)
    wr.table(heads, run.basis["soil"], widths)
    wr.para("Stated source of the soil values: " + ("; ".join(srcs) if srcs else
            "NONE STATED - the site file gives no [soil] source; the values must be confirmed "
            "against the geotechnical report"), size=8.5, style="B")
    wr.h2("Loads and materials", toc=True)
    wr.table(heads, run.basis["loads"] + run.basis["materials"], widths)
    wr.h2("Criteria", toc=True)
    wr.table(heads, run.basis["criteria"], widths, size=7)
    wr.h2("Load factors and methods")
    for line in sd.load_factors:
        wr.para("- " + line, size=8.5)
    wr.para("- Active pressure on the vertical plane through the heel edge over the design "
            "height H (retained grade to bottom of footing); surcharge lateral pressure Ka·q "
            "over H (Ka = EFP/γ when an EFP is given). Overturning about the toe; sliding "
            "resistance μ·ΣV plus passive below the neglected depth; bearing by the kern rule "
            "(IBC 2021 1807.2.3; DESIGN basis of this program).", size=8.5)
    checked = sum(w.stations_checked for w in sd.walls)
    audited = sum(w.stations_audited for w in sd.walls)
    if sd.audit_rule:
        wr.para(f"- Audit: {audited:,} of {checked:,} stations re-checked; {sd.audit_rule}.",
                size=8.5)
    else:
        wr.para("- Audit: the independent scalar audit was not run.", size=8.5)

    # ---- site summary
    pdf.add_page()
    wr.h1("Site summary")
    rows, bad_rows = [], []
    for w in sd.walls:
        segs = w.segments
        if not segs:
            rows.append([w.wall, w.name or "", "0", "-", "-", "-", "-", "-",
                         "no wall needed"])
            continue
        length = sum(s.length_ft for s in segs)
        hmax = max(s.retained_height_max_ft for s in segs)
        cy = sum(s.concrete_cy for s in segs if math.isfinite(s.concrete_cy))
        lb = sum(s.steel_lb for s in segs if math.isfinite(s.steel_lb))
        top = max(segs, key=lambda s: s.governing_ratio if math.isfinite(s.governing_ratio)
                  else -1.0)
        nbad = sum(not s.ok for s in segs)
        gov = (f"{top.governing_check} {top.governing_ratio:.3f} at "
               f"{format_station(top.governing_station_ft)} ({top.segment})"
               if math.isfinite(top.governing_ratio) else "-")
        status = "OK" if nbad == 0 else f"{nbad} FAIL"
        if nbad:
            bad_rows.append(len(rows))
        rows.append([w.wall, w.name or "", str(len(segs)), f"{length:.1f}", f"{hmax:.2f}",
                     f"{cy:.1f}", f"{lb:,.0f}", gov, status])
    wr.table(["wall", "name", "segments", "length ft", "H max ft", "concrete CY", "steel lb",
              "governing check (ratio, station)", "status"], rows,
             [10, 38, 14, 15, 14, 17, 16, 48, 14], bold_rows=bad_rows)
    for w in sd.walls:
        wr.h2(f"Wall {w.wall} segments" + (f" - {w.name}" if w.name else ""), toc=True)
        srows, sbad = [], []
        for i, s in enumerate(w.segments):
            if not s.ok:
                sbad.append(i)
            srows.append([s.segment, s.mark or "-",
                          f"{format_station(s.station_start_ft)} - "
                          f"{format_station(s.station_end_ft)}",
                          f"{s.retained_height_max_ft:.2f}",
                          _n(s.fs_overturning, ".2f"), _n(s.fs_sliding, ".2f"),
                          _n(s.q_max_psf, ",.0f"), _n(s.utilization_max, ".3f"),
                          (f"{s.governing_check} {_n(s.governing_ratio, '.2f')}"
                           if s.governing_check else "-"), _n(s.concrete_cy, ".1f"),
                          "OK" if s.ok else "FAIL: " + s.status])
        wr.table(["segment", "mark", "stations", "H max ft", "FS OT", "FS SL", "q max psf",
                  "ratio max", "governing check", "conc. CY", "status"], srows,
                 [15, 10, 34, 13, 11, 11, 14, 13, 33, 12, 20], size=7, bold_rows=sbad)
    failing = [(w.wall, s) for w in sd.walls for s in w.segments if not s.ok]
    if failing:
        wr.h2("FAILING SEGMENTS")
        for wid, s in failing:
            wr.para(f"{wid} {s.segment} ({format_station(s.station_start_ft)} to "
                    f"{format_station(s.station_end_ft)}): FAILS - {s.status}", size=8.5,
                    style="B")

    # ---- section marks
    for mark, case in cases.items():
        pdf.add_page()
        seg = case.segment
        sec = seg.section
        wr.h1(f"Section {mark}" + ("" if case.passes else " - FAILS"))
        used = ", ".join(s.segment for _, s in case.segments)
        wr.para(f"Used by segments {used}.", size=8.5)
        wr.para(f"Stem {sec.stem_top_in:g}\" top / {sec.stem_base_in:g}\" base "
                f"({sec.batter_face} face battered), footing {sec.footing_thickness_in:g}\" "
                f"thick, toe {format_ft_in(sec.toe_ft)}, heel {format_ft_in(sec.heel_ft)}, "
                f"B = {format_ft_in(sec.footing_width_ft)}"
                + (f", key {sec.key_width_in:g}\" wide x {sec.key_depth_in:g}\" deep at "
                   f"{format_ft_in(sec.key_offset_ft)} from the toe" if sec.has_key else
                   ", no key")
                + f". Bars: stem {sec.stem_bars}, heel top {sec.heel_bars}, toe bottom "
                  f"{sec.toe_bars}, stem horizontal {sec.horizontal_bars} each face, footing "
                  f"longitudinal {sec.footing_long_bars} each mat.", size=8.5)
        top = pdf.get_y() + 1.0
        used = draw_section_sketch(pdf, case, x_mm=MARGIN_MM + 15, y_mm=top, w_mm=125,
                                   h_mm=80, font=FONT)
        pdf.set_y(top + used + 2.0)
        wr.h2(f"Governing station {format_station(case.station_ft)} (wall {case.wall}, "
              f"segment {seg.segment})")
        g = case.geometry
        wr.para(f"Retained grade {case.retained_grade_ft:.2f}, front grade "
                f"{case.front_grade_ft:.2f}, top of wall {case.top_of_wall_ft:.2f}, top of "
                f"footing {seg.top_of_footing_ft:.2f}, bottom of footing "
                f"{seg.bottom_of_footing_ft:.2f} (ft). Retained height h = "
                f"{float(g.retained_height_ft):.2f} ft, embedment D = {float(g.embedment_ft):.2f}"
                f" ft, design height H = {float(g.design_height_ft):.2f} ft, freeboard "
                f"{float(g.freeboard_ft):.2f} ft. Governing check of the segment "
                f"{seg.governing_check} at ratio {_n(seg.governing_ratio, '.3f')} (the "
                f"stability or strength check of the largest ratio; this station is where it is "
                f"largest, the tallest of equals); largest ratio of all checks "
                f"{_n(seg.utilization_max, '.3f')}.", size=8.5)
        wr.para(f"Design height, two senses: the schedule's design_height_ft = "
                f"{seg.design_height_ft:.2f} ft is the retained height segment {seg.segment} "
                f"was sized for (the largest retained grade less the least front grade over "
                f"the segment, plus the bottom of footing's elevation step; the section is the "
                f"design table's for that height, rounded up to a table row, with the least "
                f"embedment); H = {float(g.design_height_ft):.2f} ft above is this station's "
                f"retained grade less the bottom of footing (h + D), the height the pressures "
                f"act over here.", size=8.5)
        wr.para("Detailing rows at their limits (a spacing, least steel or least embedment "
                "met exactly by the chosen bars and dimensions; they do not govern): "
                + (", ".join(seg.detailing_at_limit.split()) or "none") + ".", size=8.5)
        p = case.checks.pressure
        inp = case.inputs
        wr.para(f"γ = {inp.unit_weight_pcf:g} pcf, active {p.basis}: EFP = "
                f"{p.active_efp_pcf:.1f} pcf, Ka = {p.ka:.3f}; passive EFP = "
                f"{p.passive_efp_pcf:g} pcf from {inp.passive_neglect_ft:g} ft below front "
                f"grade; μ = {inp.friction_coefficient:g}; q = {inp.surcharge_psf:g} psf; "
                f"allowable bearing {inp.allowable_bearing_psf:,.0f} psf; f'c = "
                f"{inp.fc_psi:,.0f} psi, fy = {inp.fy_psi:,.0f} psi, γc = "
                f"{inp.concrete_unit_weight_pcf:g} pcf.", size=8.5)
        wr.h2("Loads and forces (service, per foot of wall; arms from the toe)")
        wrows = []
        names = {"stem_rectangle": "stem, rectangle", "stem_batter": "stem, batter triangle",
                 "footing": "footing", "key": "shear key", "soil_heel": "soil over heel",
                 "soil_batter": "soil over battered face", "soil_toe": "soil over toe",
                 "surcharge": "surcharge over heel (live)"}
        wt = case.weights
        from dataclasses import fields as _fields

        for fld in _fields(wt):
            k = fld.name
            wgt = getattr(wt, k)
            if wgt is None or not hasattr(wgt, "arm_ft"):
                continue
            label = names.get(k, k.replace("_", " "))
            lb_, arm = float(wgt.lb), float(wgt.arm_ft)
            if lb_ == 0:
                continue
            resists = k != "surcharge" or inp.surcharge_resists
            wrows.append([label, "vertical", f"{lb_:,.0f}", f"{arm:.2f}",
                          f"{lb_ * arm:,.0f}", "resisting" if resists else
                          "bearing case only"])
        for comp in case.thrust.components:
            hl, arm = float(comp.horizontal_lb), float(comp.arm_ft)
            if hl == 0:
                continue
            wrows.append([comp.name, "horizontal", f"{hl:,.0f}", f"{arm:.2f} above BF",
                          f"{hl * arm:,.0f}", "overturning"])
        st = case.checks.stability
        if float(st.passive_lb) > 0:
            wrows.append(["passive on the front", "horizontal", f"{float(st.passive_lb):,.0f}",
                          "-", "-", "sliding only"])
        wr.table(["load", "direction", "force lb/ft", "arm ft", "moment lb-ft/ft", "role"],
                 wrows, [52, 20, 22, 26, 28, 38])
        wr.h2("Checks (formula -> numbers -> result)")
        for ct in check_texts(case):
            if pdf.get_y() > pdf.h - 34:
                pdf.add_page()
            wr.para(f"{ct.title} [{ct.clause}]", size=8.5, style="B", h=4.2,
                    color=None if ct.passes else (180, 0, 0))
            wr.para("    " + ct.formula, size=7.8, h=3.8)
            if ct.numbers:
                wr.para("    " + ct.numbers, size=7.8, h=3.8)
            wr.para("    " + ct.result, size=7.8, h=3.8, style="" if ct.passes else "B",
                    color=None if ct.passes else (180, 0, 0))
        verdict = ("All checks pass at the governing station." if case.passes else
                   "THIS SECTION FAILS at the governing station (see the FAILS lines).")
        wr.para(verdict, size=9, style="B")

    # ---- bar list
    pdf.add_page()
    wr.h1("Bar list")
    bars = sd.bars if len(sd.bars) else None
    if bars is None:
        wr.para("No bars: no wall needed.")
    else:
        _bar_list_chapter(wr, bars, sd.barlist)

    # ---- revision
    if diff is not None:
        pdf.add_page()
        wr.h1("Revision: changes against the earlier run")
        for line in diff.summary_lines():
            wr.para(line, size=8)

    path.parent.mkdir(parents=True, exist_ok=True)
    pdf.output(str(path))
    return path
