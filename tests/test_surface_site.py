"""A site drawn only as surfaces: the wall from a LandXML alignment, the retained grade from
its TIN surface, the front grade from a DXF TIN and the existing ground from survey points.

`wallsched stations` must give plan positions and grades within 0.01 ft of the surfaces
that made them (closed-form alignment geometry: lines and the arc s = R theta; the TIN
elevations by matplotlib's LinearTriInterpolator, a general-purpose reference library; the
existing ground is a plane, returned exactly by any triangulation of points on it), and
`wallsched design` must run end to end with earthwork quantities from the existing ground.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pandas as pd
import pytest
import surfacekit as kit
from sitekit import SMALL_GRID, SOIL, write

from wallsched.cli import main

OFFSET_FT = 2.0


def make_surface_site(folder: Path, *, wall_extra: str = "", retained=None) -> Path:
    fg_v, fg_t = kit.grid_tin(kit.finished_grade)
    (folder / "grading.xml").write_text(kit.landxml_text(fg_v, fg_t))
    fr_v, fr_t = kit.grid_tin(kit.front_grade, jitter=0.2, seed=11)
    kit.write_dxf_tin(folder / "tin.dxf", fr_v, fr_t, layer="FG-TIN")
    eg_v, _ = kit.grid_tin(kit.existing, step=20.0)
    kit.write_points(folder / "survey.csv", eg_v)
    retained = retained or (f'{{ landxml = "grading.xml", surface = "FG", '
                            f'offset_ft = {OFFSET_FT} }}')
    write(folder / "site.toml", f"""
        [site]
        name = "Surface test site (invented)"
        {SOIL}
        [loads]
        surcharge_psf = 100
        {SMALL_GRID}
        [[walls]]
        id = "S1"
        retained_side = "left"
        alignment = {{ landxml = "grading.xml", alignment = "Wall A" }}
        retained_grade = {retained}
        front_grade = {{ dxf = "tin.dxf", layer = "FG-TIN", offset_ft = {OFFSET_FT} }}
        existing_ground = {{ points = "survey.csv", code = "EG", offset_ft = 0.0 }}
        {wall_extra}
        """)
    return folder / "site.toml"


def test_stations_match_the_surfaces_that_made_them(runner, tmp_path):
    site = make_surface_site(tmp_path)
    out = tmp_path / "out"
    res = runner.invoke(main, ["stations", str(site), "--out", str(out), "--no-plots"])
    assert res.exit_code == 0, res.output
    f = pd.read_csv(out / "stations.csv")
    # the LandXML staStart (5+00) is the start station; the wall's length is R theta + lines
    assert f.station_ft.iloc[0] == pytest.approx(kit.STA_START_FT)
    assert f.station_ft.iloc[-1] == pytest.approx(kit.STA_START_FT + kit.LENGTH_FT, abs=0.01)
    s = f.station_ft.to_numpy() - kit.STA_START_FT
    xy, n = kit.alignment_point(s)
    assert np.abs(f[["x", "y"]].to_numpy() - xy).max() < 0.01
    fg_v, fg_t = kit.grid_tin(kit.finished_grade)
    fr_v, fr_t = kit.grid_tin(kit.front_grade, jitter=0.2, seed=11)
    rg = kit.tin_reference(fg_v, fg_t, xy + OFFSET_FT * n)  # retained side: left
    fg = kit.tin_reference(fr_v, fr_t, xy - OFFSET_FT * n)  # front: right
    eg = kit.existing(xy[:, 0], xy[:, 1])
    assert np.abs(f.retained_grade_ft - rg).max() < 0.01
    assert np.abs(f.front_grade_ft - fg).max() < 0.01
    assert np.abs(f.existing_ground_ft - eg).max() < 0.01
    # every triangle-edge crossing is a station: the retained height between stations is
    # linear, so a fine sampling of the surfaces never exceeds the largest station value
    fine = np.linspace(0, kit.LENGTH_FT, 4001)
    pf, nf = kit.alignment_point(fine)
    h = (kit.tin_reference(fg_v, fg_t, pf + OFFSET_FT * nf)
         - kit.tin_reference(fr_v, fr_t, pf - OFFSET_FT * nf))
    assert f.retained_height_ft.max() >= h.max() - 0.01
    assert f.is_break.sum() > 40  # the crossings are marked as grade breaks


def test_start_station_ft_overrides_sta_start(runner, tmp_path):
    site = make_surface_site(tmp_path, wall_extra="start_station_ft = 1000.0")
    out = tmp_path / "out"
    res = runner.invoke(main, ["stations", str(site), "--out", str(out), "--no-plots"])
    assert res.exit_code == 0, res.output
    f = pd.read_csv(out / "stations.csv")
    assert f.station_ft.iloc[0] == 1000.0


def test_profile_source_gives_the_vertical_curve(runner, tmp_path):
    site = make_surface_site(
        tmp_path, retained='{ landxml = "grading.xml", alignment = "Wall A", profile = "TW" }')
    out = tmp_path / "out"
    res = runner.invoke(main, ["stations", str(site), "--out", str(out), "--no-plots"])
    assert res.exit_code == 0, res.output
    f = pd.read_csv(out / "stations.csv")
    # symmetric parabola, PVI 5+60 at 112.4, L = 60 (route-surveying closed form)
    g1, g2 = 2.4 / 60, -2.4 / 140
    x = f.station_ft - 530.0
    want = np.where(x < 0, 110 + g1 * (f.station_ft - 500),
                    np.where(x > 60, 112.4 + g2 * (f.station_ft - 560),
                             112.4 - g1 * 30 + g1 * x + (g2 - g1) * x**2 / 120))
    assert np.abs(f.retained_grade_ft - want).max() < 1e-3


@pytest.mark.slow
def test_design_runs_end_to_end_with_earthwork(runner, tmp_path):
    site = make_surface_site(tmp_path)
    out = tmp_path / "out"
    res = runner.invoke(main, ["design", str(site), "--out", str(out), "--quiet"])
    assert res.exit_code == 0, res.output
    sched = pd.read_csv(out / "schedule.csv")
    assert len(sched) >= 1
    assert (sched.excavation_cy > 0).all() and (sched.backfill_cy >= 0).all()
    assert (out / "S1-elevation.dxf").exists() and (out / "report.pdf").exists()


@pytest.mark.parametrize("edit, expect", [
    (("grading.xml", "Wall A\" length", "Wall Z\" length"),
     "grading.xml: has no alignment named 'Wall A'; alignments in the file: 'Wall Z', "
     "'Access Road'"),
    (("grading.xml", "<Surfaces>", "<Surfaces><Oops>"), "grading.xml: line "),
    (("grading.xml", "<?xml version=\"1.0\" encoding=\"UTF-8\"?>",
      "<?xml version=\"1.0\"?><!DOCTYPE x [<!ENTITY a \"aaaa\"><!ENTITY b \"&a;&a;\">]>"),
     "grading.xml: refused: the file declares an XML entity"),
])
def test_bad_surface_input_is_one_line_exit_2_nothing_written(runner, tmp_path, edit, expect):
    site = make_surface_site(tmp_path)
    name, old, new = edit
    p = tmp_path / name
    text = p.read_text()
    assert old in text
    p.write_text(text.replace(old, new, 1))
    out = tmp_path / "out"
    res = runner.invoke(main, ["stations", str(site), "--out", str(out)])
    assert res.exit_code == 2, res.output
    lines = [ln for ln in res.output.splitlines() if ln.strip()]
    assert len(lines) == 1 and lines[0].startswith("error: " + expect), lines
    assert "Traceback" not in res.output
    assert not out.exists()


def test_a_surface_short_of_the_wall_names_station_and_surface(runner, tmp_path):
    site = make_surface_site(tmp_path)
    # the DXF TIN cut back so that it stops short of the wall's end
    fr_v, fr_t = kit.grid_tin(kit.front_grade, x1=1090.0)
    kit.write_dxf_tin(tmp_path / "tin.dxf", fr_v, fr_t, layer="FG-TIN")
    out = tmp_path / "out"
    res = runner.invoke(main, ["design", str(site), "--out", str(out)])
    assert res.exit_code == 2, res.output
    line = res.output.strip()
    assert line.startswith("error: tin.dxf: TIN on layer 'FG-TIN' does not cover stations ")
    assert "of the front grade (2 ft to the right of the wall" in line
    assert not out.exists()


def test_offset_is_required_for_a_surface(runner, tmp_path):
    site = make_surface_site(tmp_path, retained='{ landxml = "grading.xml", surface = "FG" }')
    res = runner.invoke(main, ["stations", str(site), "--out", str(tmp_path / "o")])
    assert res.exit_code == 2
    assert "offset_ft is required for a surface" in res.output


@pytest.mark.parametrize("source, expect", [
    ('{ landxml = "grading.xml", surface = "FG", profile = "TW", offset_ft = 2.0 }',
     "either surface"),
    ('{ landxml = "grading.xml", surface = "FG", ofset_ft = 2.0 }', "did you mean 'offset_ft'"),
    ('{ landxml = "grading.xml", profile = "TW" }', "needs alignment"),
    ('{ landxml = "grading.xml", alignment = "Wall A", profile = "TW", offset_ft = 1.0 }',
     "'offset_ft' applies to a surface"),
    ('{ points = "survey.csv", offset_ft = -1.0 }', "must be at least 0"),
])
def test_surface_options_are_checked_in_the_site_file(runner, tmp_path, source, expect):
    site = make_surface_site(tmp_path, retained=source)
    res = runner.invoke(main, ["stations", str(site), "--out", str(tmp_path / "o")])
    assert res.exit_code == 2, res.output
    assert expect in res.output and "site.toml" in res.output
    assert not (tmp_path / "o").exists()


def test_points_are_not_an_alignment(runner, tmp_path):
    site = make_surface_site(tmp_path)
    text = site.read_text().replace('alignment = { landxml = "grading.xml", alignment = '
                                    '"Wall A" }', 'alignment = { points = "survey.csv" }')
    site.write_text(text)
    res = runner.invoke(main, ["stations", str(site), "--out", str(tmp_path / "o")])
    assert res.exit_code == 2 and "survey points are a surface, not an alignment" in res.output


def test_sample_site_surface_wall_follows_its_invented_grading():
    import importlib.util
    import math

    from wallsched.pipeline import wall_stations
    from wallsched.site import load_site

    root = Path(__file__).resolve().parents[1] / "sample_site"
    spec = importlib.util.spec_from_file_location("make_grading_xml",
                                                  root / "make_grading_xml.py")
    gen = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(gen)
    # the committed files are what the script writes
    assert (root / "grading.xml").read_text() == gen.grading_xml()
    assert (root / "survey.csv").read_text() == gen.survey_csv()
    site = load_site(root / "site.toml")
    w4 = next(w for w in site.walls if w.id == "W4")
    ws = wall_stations(site, w4)
    s = ws.station_ft - gen.STA_START_FT
    assert ws.station_ft[0] == gen.STA_START_FT
    assert s[-1] == pytest.approx(gen.LINE1_FT + gen.RADIUS_FT * math.radians(gen.TURN_DEG)
                                  + gen.LINE2_FT, abs=0.01)  # lines + R theta
    want_r = np.array([gen.finished_grade(v, 2.0) for v in s])
    want_f = np.array([gen.finished_grade(v, -2.0) for v in s])
    assert np.abs(ws.retained_grade_ft - want_r).max() < 0.01
    assert np.abs(ws.front_grade_ft - want_f).max() < 0.01
    xy = np.array([gen.wall_point(v)[0] for v in s])
    assert np.abs(np.column_stack([ws.x, ws.y]) - xy).max() < 0.01
    assert np.isfinite(ws.existing_ground_ft).all()


def test_a_dxf_tin_without_offset_says_to_give_one(runner, tmp_path):
    site = make_surface_site(tmp_path)
    site.write_text(site.read_text().replace(
        'layer = "FG-TIN", offset_ft = 2.0', 'layer = "FG-TIN"'))
    res = runner.invoke(main, ["stations", str(site), "--out", str(tmp_path / "o")])
    assert res.exit_code == 2, res.output
    assert "3DFACE" in res.output and "give offset_ft" in res.output


def test_a_profile_moves_with_its_alignment_when_the_start_station_is_given(runner, tmp_path):
    site = make_surface_site(
        tmp_path, retained='{ landxml = "grading.xml", alignment = "Wall A", profile = "TW" }',
        wall_extra="start_station_ft = 1000.0")
    out = tmp_path / "out"
    res = runner.invoke(main, ["stations", str(site), "--out", str(out), "--no-plots"])
    assert res.exit_code == 0, res.output
    assert "stations moved by +500.00 ft with the wall" in res.output
    f = pd.read_csv(out / "stations.csv")
    # the same physical place as before: the PVI at 5+00 of the file is now 10+00
    g1, g2 = 2.4 / 60, -2.4 / 140
    st = f.station_ft - 500.0
    x = st - 530.0
    want = np.where(x < 0, 110 + g1 * (st - 500),
                    np.where(x > 60, 112.4 + g2 * (st - 560),
                             112.4 - g1 * 30 + g1 * x + (g2 - g1) * x**2 / 120))
    assert np.abs(f.retained_grade_ft - want).max() < 1e-3
