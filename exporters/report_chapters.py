"""The chapters of the calc package (``exporters/report.py`` puts them in order): the cover,
the design basis, the site summary, a chapter per section mark worked at its governing
station, the bar list and the revision. They print what the engine and the run information
hold; nothing is computed here.
"""

from __future__ import annotations

import math
from dataclasses import fields

from ..profile.stationing import format_station
from .report_checks import check_texts, num_text
from .report_pdf import FONT, MARGIN_MM
from .report_sketch import draw_section_sketch

_n = num_text


# ---------------------------------------------------------------- cover and basis


def cover(wr, run, sd, date) -> None:
    """The cover: site, date, version, walls, the result, the cautions, the warnings and the
    input files with their SHA-256."""
    pdf = wr.pdf
    pdf.add_page()
    pdf.set_font(FONT, "B", 20)
    pdf.ln(10)
    pdf.multi_cell(0, 10, run.site_name, new_x="LMARGIN", new_y="NEXT")
    pdf.set_font(FONT, "", 13)
    pdf.multi_cell(0, 7, "Cantilevered reinforced-concrete site retaining walls - "
                         "calculation package", new_x="LMARGIN", new_y="NEXT")
    pdf.ln(3)
    pdf.set_font(FONT, "", 9.5)
    meta = [f"Date: {date.isoformat()}", f"Made with wallsched {run.version}",
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
    _cautions_box(wr, run.cautions)
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


def _cautions_box(wr, cautions) -> None:
    pdf = wr.pdf
    pdf.ln(3)
    pdf.set_draw_color(180, 0, 0)
    pdf.set_line_width(0.6)
    y0 = pdf.get_y()
    pdf.set_font(FONT, "B", 10)
    pdf.set_text_color(180, 0, 0)
    pdf.multi_cell(0, 5.5, "CAUTIONS", new_x="LMARGIN", new_y="NEXT")
    pdf.set_text_color(0)
    for i, line in enumerate(cautions, 1):
        wr.para(f"{i}. {line}", size=9)
    pdf.rect(MARGIN_MM - 2, y0 - 2, pdf.w - 2 * MARGIN_MM + 4, pdf.get_y() - y0 + 4)
    pdf.set_draw_color(0)
    pdf.set_line_width(0.2)


def basis(wr, run, sd) -> None:
    """The design basis: resolved values per wall with their sources, the load factors and
    methods, the audit."""
    n_walls = len(sd.walls)
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


# ---------------------------------------------------------------- site summary


def site_summary(wr, sd) -> None:
    """Walls, segments, heights, quantities and the most-utilised check per wall, every
    segment with its factors of safety and status, the failing segments in bold."""
    pdf = wr.pdf
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
        _wall_segments(wr, w)
    failing = [(w.wall, s) for w in sd.walls for s in w.segments if not s.ok]
    if failing:
        wr.h2("FAILING SEGMENTS")
        for wid, s in failing:
            wr.para(f"{wid} {s.segment} ({format_station(s.station_start_ft)} to "
                    f"{format_station(s.station_end_ft)}): FAILS - {s.status}", size=8.5,
                    style="B")


def _wall_segments(wr, w) -> None:
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


# ---------------------------------------------------------------- section marks


def section_mark(wr, mark, case) -> None:
    """One section mark worked at its governing station: the section and its sketch, the
    station's grades, every weight and lateral force with its arm, every check."""
    _mark_header(wr, mark, case)
    _governing_station(wr, case)
    _loads_table(wr, case)
    _checks(wr, case)


def _mark_header(wr, mark, case) -> None:
    from .dxf_elevation import format_ft_in

    pdf = wr.pdf
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


def _governing_station(wr, case) -> None:
    seg = case.segment
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
    wr.para(f"γ = {inp.soil.unit_weight_pcf:g} pcf, active {p.basis}: EFP = "
            f"{p.active_efp_pcf:.1f} pcf, Ka = {p.ka:.3f}; passive EFP = "
            f"{p.passive_efp_pcf:g} pcf from {inp.criteria.passive_neglect_ft:g} ft below front "
            f"grade; μ = {inp.soil.friction_coefficient:g}; q = {inp.loads.surcharge_psf:g} psf; "
            f"allowable bearing {inp.soil.allowable_bearing_psf:,.0f} psf; f'c = "
            f"{inp.materials.fc_psi:,.0f} psi, fy = {inp.materials.fy_psi:,.0f} psi, γc = "
            f"{inp.materials.concrete_unit_weight_pcf:g} pcf.", size=8.5)


def _loads_table(wr, case) -> None:
    inp = case.inputs
    wr.h2("Loads and forces (service, per foot of wall; arms from the toe)")
    wrows = []
    names = {"stem_rectangle": "stem, rectangle", "stem_batter": "stem, batter triangle",
             "footing": "footing", "key": "shear key", "soil_heel": "soil over heel",
             "soil_batter": "soil over battered face", "soil_toe": "soil over toe",
             "surcharge": "surcharge over heel (live)"}
    wt = case.weights
    for fld in fields(wt):
        k = fld.name
        wgt = getattr(wt, k)
        if wgt is None or not hasattr(wgt, "arm_ft"):
            continue
        label = names.get(k, k.replace("_", " "))
        lb_, arm = float(wgt.lb), float(wgt.arm_ft)
        if lb_ == 0:
            continue
        resists = k != "surcharge" or inp.criteria.surcharge_resists
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


def _checks(wr, case) -> None:
    pdf = wr.pdf
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


# ---------------------------------------------------------------- bar list and revision


def bar_list(wr, sd) -> None:
    """The bending schedule and the steel per wall."""
    wr.pdf.add_page()
    wr.h1("Bar list")
    bars = sd.bars if len(sd.bars) else None
    if bars is None:
        wr.para("No bars: no wall needed.")
    else:
        _bar_tables(wr, bars, sd.barlist)


def revision(wr, diff) -> None:
    """The summary of the comparison with an earlier run."""
    wr.pdf.add_page()
    wr.h1("Revision: changes against the earlier run")
    for line in diff.summary_lines():
        wr.para(line, size=8)


def _used_in(text: str, most: int = 6) -> str:
    parts = [p.strip() for p in str(text).split(",") if p.strip()]
    return ", ".join(parts) if len(parts) <= most else (
        ", ".join(parts[:most]) + f" and {len(parts) - most} more")


def _bar_tables(wr, bars, barlist) -> None:
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
