"""The calc package read back with pypdf: marks, factors of safety, clauses, cautions, failures."""

from __future__ import annotations

import io
import math
import re

import pytest
from pypdf import PdfReader
from sitekit import SMALL_GRID, make_site
from wallsched.engine.checks import check_section
from wallsched.exporters import report as rp
from wallsched.exporters import report_pdf as rpdf
from wallsched.exporters.schedule import schedule_frame

from wallsched.basis import run_info
from wallsched.cautions import CAUTIONS
from wallsched.design import design_site
from wallsched.pipeline import site_stations
from wallsched.site import load_site


def _design(folder, extra=SMALL_GRID, **kw):
    site = load_site(make_site(folder, extra=extra, **kw))
    return site, design_site(site, site_stations(site))


def _text(path) -> tuple[str, PdfReader]:
    reader = PdfReader(str(path))
    text = "\n".join(page.extract_text() for page in reader.pages)
    return text, reader


def _flat(text: str) -> str:
    return " ".join(text.split())


@pytest.fixture(scope="module")
def made(tmp_path_factory):
    folder = tmp_path_factory.mktemp("report")
    site, sd = _design(folder / "site")
    path = rp.write_report(run_info(site), sd, folder / "report.pdf")
    text, reader = _text(path)
    return site, sd, path, text, reader


def test_every_section_mark_has_its_pages(made):
    _, sd, _, text, _ = made
    marks = {s.mark for w in sd.walls for s in w.segments if s.section is not None}
    assert marks
    flat = _flat(text)
    for m in marks:
        assert f"Section {m}" in flat
        assert re.search(rf"Section {m} at station \d+\+\d\d\.\d\d|Governing station", flat)
    assert "Contents" in flat and "Bar list" in flat and "Site summary" in flat


def test_every_segment_row_prints_the_schedule_fs_values(made):
    _, sd, _, text, _ = made
    sched = schedule_frame(sd.walls)
    lines = text.splitlines()
    for r in sched.itertuples():
        row = next((ln for ln in lines if ln.startswith(r.segment + " ")), None)
        assert row is not None, r.segment
        # the schedule's least FS over the segment, to the two decimals the report prints
        assert f"{r.fs_overturning:.2f}" in row and f"{r.fs_sliding:.2f}" in row, row
        assert ("OK" if r.status == "ok" else "FAIL") in row


def test_clauses_and_cautions_are_printed(made):
    _, sd, _, text, _ = made
    flat = _flat(text)
    for caution in CAUTIONS:  # DESIGN.md section 8: the report cover carries the cautions
        assert _flat(caution) in flat
    for clause in (
        "IBC 2021 1807.2.3",  # IBC 2021 1807.2.3: FS 1.5 overturning and sliding
        "IBC 2021 1806.1",  # IBC 2021 1806.1: allowable bearing from the geotechnical report
        "IBC 2021 1809.4",  # IBC 2021 1809.4: footing depth below grade
        "ACI 318-19 22.2, Table 21.2.2",  # ACI 318-19 22.2 flexural strength; phi Table 21.2.2
        "ACI 318-19 7.6.1.1",  # ACI 318-19 7.6.1.1 minimum flexural steel of a one-way slab
        "ACI 318-19 25.4.3.1",  # ACI 318-19 25.4.3.1 development of standard hooks
        "ACI 318-19 24.4.3.2",  # ACI 318-19 24.4.3.2 shrinkage and temperature steel
    ):
        assert clause in flat, clause
    # every clause of every check row the engine makes appears (rows of one section)
    case = next(iter(sd.cases.values()))
    for row in case.checks.rows:
        assert _flat(row.clause) in flat, row.clause
    for name, digest in made[0].input_hashes().items():
        assert name in flat and digest in flat.replace(" ", "")
    pages = len(made[4].pages)
    assert f"page 1 of {pages}" in flat and f"page {pages} of {pages}" in flat


def test_governing_station_rechecked_equals_the_design(made):
    site, sd, _, text, _ = made
    flat = _flat(text)
    for case in sd.cases.values():
        segs = case.segments
        worst = max(s.utilization_max for _, s in segs)
        # the design stage checked this station with this section: same ratio
        assert float(case.checks.utilization_max) == pytest.approx(worst, rel=1e-9)
        res = case.result
        H = float(case.geometry.design_height_ft)
        # McCormac & Brown 9th ed. 13.5: M_O = EFP H^3/6 + Ka q H^2/2 (Ka = EFP/gamma,
        # DESIGN.md section 7); sitekit: EFP 35 pcf, gamma 120 pcf, q 100 psf
        m_o = 35.0 * H ** 3 / 6.0 + (35.0 / 120.0) * 100.0 * H ** 2 / 2.0
        assert res["overturning"]["m_overturning_lbft"] == pytest.approx(m_o, rel=1e-12)
        assert f"ΣM_O = {m_o:,.0f} lb-ft/ft" in flat
        fs = res["overturning"]["m_resisting_lbft"] / m_o
        assert f"FS_OT = {fs:.2f}" in flat
        # sum of the weights' moments about the toe is the resisting moment (level backfill)
        w = case.weights
        mr = sum(float(getattr(w, n).moment_lbft) for n in w.DEAD
                 if getattr(w, n, None) is not None)
        assert res["overturning"]["m_resisting_lbft"] == pytest.approx(mr, rel=1e-12)


def test_check_texts_cover_every_row_with_its_verdict(made):
    site, sd, _, _, _ = made
    case = next(iter(sd.cases.values()))
    texts = rp.check_texts(case)
    assert [t.name for t in texts] == list(case.checks.names)
    for t, row in zip(texts, case.checks.rows, strict=True):
        assert t.passes == bool(row.passes)
        assert t.result.endswith("OK" if t.passes else "FAILS")
        assert t.formula and t.clause == row.clause
        r = float(row.ratio)
        if math.isfinite(r):
            assert f"ratio {r:.3f}" in t.result


def test_a_failing_segment_is_shown_as_failing(tmp_path):
    # a heel limited to 1 ft and no shear key cannot hold this wall: no section on the grid
    # (a failure)
    extra = SMALL_GRID.replace("heel_max_ft = 8.0", "heel_max_ft = 1.0\nkey_depths_in = [0]")
    site, sd = _design(tmp_path / "site", extra=extra)
    bad = [s for w in sd.walls for s in w.segments if not s.ok]
    assert bad, "the invented site should fail with this grid"
    path = rp.write_report(run_info(site), sd, tmp_path / "report.pdf")
    text, _ = _text(path)
    flat = _flat(text)
    assert "SOME SEGMENTS FAIL" in flat and "FAILING SEGMENTS" in flat
    for s in bad:
        assert f"{s.segment}" in flat
        assert _flat(f"FAILS - {s.status}") in flat
    lines = text.splitlines()
    for s in bad:
        row = next(ln for ln in lines if ln.startswith(s.segment + " "))
        assert "FAIL" in row


def test_section_check_fails_when_forced(made):
    """A section that fails a check at the governing station prints FAILS for that row."""
    site, sd, _, _, _ = made
    case = next(iter(sd.cases.values()))
    from dataclasses import replace

    from wallsched.engine.wall_design import reinforcement

    weak = case.inputs.but(allowable_bearing_psf=100.0)  # far below any q_max
    checks = check_section(case.geometry, weak, reinforcement(case.segment.section))
    forced = replace(case, inputs=weak, checks=checks)
    texts = {t.name: t for t in rp.check_texts(forced)}
    assert not texts["bearing"].passes and texts["bearing"].result.endswith("FAILS")


def test_stem_formula_is_the_engines_for_the_models_in_use(made):
    """The stem rows print the formula the engine's pressure models give, not the
    level-backfill one whatever the model."""
    site, sd, _, _, _ = made
    case = next(iter(sd.cases.values()))
    from dataclasses import replace

    from wallsched.engine.section import WaterTable
    from wallsched.engine.wall_design import reinforcement

    wet = case.inputs.but(water=WaterTable(level_ft=2.0))
    checks = check_section(case.geometry, wet, reinforcement(case.segment.section))
    texts = {t.name: t for t in rp.check_texts(replace(case, inputs=wet, checks=checks))}
    assert texts["stem_flexure"].formula.startswith(checks.pressure.stem_moment_formula)
    assert "γw·hw³/6" in texts["stem_flexure"].formula
    assert texts["stem_shear"].formula == checks.pressure.stem_shear_formula
    assert "γw·hw²/2" in texts["stem_shear"].formula


def test_every_section_mark_has_its_dimensioned_sketch(made):
    site, sd, _, _, reader = made
    pages = [p.extract_text() for p in reader.pages]
    sketched = [t for t in pages if re.search(r"Section \S+ at station", t)]
    assert len(sketched) == len(sd.cases)  # one sketch per section mark
    assert all("retained grade" in t and "front grade" in t for t in sketched)
    for mark, case in sd.cases.items():
        page = next(t for t in sketched if f"Section {mark} at station" in t)
        sec = case.segment.section
        # the dimensions carry the section's own values
        assert f"T {sec.footing_thickness_in:g}\"" in page
        assert f"stem {sec.stem_base_in:g}\"" in page
        assert f"H {float(case.geometry.design_height_ft):.2f}'" in page


def test_the_sketch_stays_inside_its_box(made):
    from fpdf import FPDF
    from wallsched.exporters.report_sketch import draw_section_sketch, sketch_extent

    _, sd, _, _, _ = made
    case = next(iter(sd.cases.values()))
    pdf = FPDF()
    pdf.add_page()
    pdf.set_font("helvetica", "", 8)
    used = draw_section_sketch(pdf, case, x_mm=20, y_mm=30, w_mm=125, h_mm=80, font="helvetica")
    xmin, xmax, ymin, ymax = sketch_extent(case)
    assert 0 < used <= 80 + 1e-9
    assert xmax - xmin > case.segment.section.footing_width_ft  # room for the dimensions


def test_revision_chapter_with_a_diff(tmp_path):
    from wallsched.exporters.diff import RunTables, diff_tables
    from wallsched.exporters.schedule import stations_frame

    site, sd = _design(tmp_path / "site")
    tables = RunTables.from_frames(schedule_frame(sd.walls), stations_frame(sd.walls))
    d = diff_tables(tables, tables)
    text, _ = _text(rp.write_report(run_info(site), sd, tmp_path / "r.pdf", diff=d))
    flat = _flat(text)
    assert "Revision: changes against the earlier run" in flat
    assert "no changes: every segment and retained height matches" in flat


@pytest.mark.parametrize("n_entries,reserved", [(3, 1), (3, 3), (60, 1), (150, 2), (48, 2)])
def test_contents_fill_exactly_the_pages_reserved(n_entries, reserved):
    """However many chapters a site gives, the contents end on the last page reserved for
    them (fpdf2 refuses anything else): rows shrink when the pages are full, blank pages
    follow when they are not, and every entry is listed with its page."""
    import functools

    pdf = rpdf.make_pdf("Invented site", "test")
    pdf.add_page()
    pdf.insert_toc_placeholder(functools.partial(rpdf.render_toc, pages=reserved),
                               pages=reserved)  # and a page break: the first chapter's page
    for i in range(n_entries):
        if i:
            pdf.add_page()
        pdf.start_section(f"Chapter {i + 1}", level=0)
        pdf.set_font(rpdf.FONT, "", 9)
        pdf.cell(0, 5, f"text of chapter {i + 1}")
    reader = PdfReader(io.BytesIO(bytes(pdf.output())))
    assert len(reader.pages) == reserved + n_entries
    contents = "\n".join(reader.pages[k].extract_text() for k in range(reserved))
    for i in range(n_entries):
        assert re.search(rf"Chapter {i + 1}\s*{i + 1 + reserved}\b", contents)


def test_contents_pages_estimate_holds_the_outline():
    pdf = rpdf.make_pdf("Invented site", "test")
    pdf.add_page()
    one = rpdf.toc_pages(pdf, 1)
    assert one == 1 and rpdf.toc_pages(pdf, 200) >= 4  # about 50 rows a page at full height
