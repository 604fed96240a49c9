"""The governing check is the stability or strength check of the largest ratio; detailing rows
at their limits are listed apart; each mark is written up where its governing ratio is largest
(issue 15)."""

import numpy as np
import pytest
from pypdf import PdfReader
from sitekit import SMALL_GRID, make_site
from wallsched.engine.checks import check_section, is_detailing
from wallsched.engine.section import BarArrays, DesignInputs, Reinforcement, SectionGeometry
from wallsched.exporters import report as rp
from wallsched.exporters.schedule import schedule_frame

from wallsched.basis import run_info
from wallsched.design import design_site
from wallsched.pipeline import site_stations
from wallsched.site import load_site


def inputs():
    return DesignInputs.of(unit_weight_pcf=120, active_efp_pcf=35, passive_efp_pcf=300,
                        friction_coefficient=0.4, allowable_bearing_psf=2500,
                        surcharge_psf=100)


def test_detailing_rows_never_govern():
    rng = np.random.default_rng(7)
    n = 200
    geo = SectionGeometry(
        retained_height_ft=rng.uniform(2, 12, n), embedment_ft=2.0,
        footing_thickness_in=rng.choice([12.0, 15.0, 18.0], n), stem_top_in=10.0,
        stem_base_in=rng.choice([10.0, 12.0, 14.0], n), toe_ft=rng.uniform(1, 4, n),
        heel_ft=rng.uniform(2, 8, n))
    bars = BarArrays(rng.choice([4, 5, 6], n), rng.choice([8.0, 12.0, 18.0], n))
    res = check_section(geo, inputs(), Reinforcement(stem=bars, heel=bars, toe=bars,
                                                     horizontal=BarArrays(4, 12.0),
                                                     longitudinal=BarArrays(4, 12.0)))
    # by hand: the largest ratio of the rows that are not detailing rows
    strength = [r for r in res.rows if not is_detailing(r.name)]
    stack = np.stack([np.where(np.isnan(r.ratio), np.inf, np.broadcast_to(r.ratio, (n,)))
                      for r in strength])
    want = np.array([r.name for r in strength], dtype=object)[np.argmax(stack, axis=0)]
    assert (res.governing == want).all()
    assert np.allclose(res.governing_ratio, stack.max(axis=0))
    assert not any(is_detailing(g) for g in res.governing)
    # the detailing rows exist and are recognised as such
    assert {"stem_spacing", "embedment", "stem_horizontal_spacing"} <= {
        r.name for r in res.rows if is_detailing(r.name)}
    assert not is_detailing("bearing") and not is_detailing("stem_flexure")


@pytest.fixture(scope="module")
def designed(tmp_path_factory):
    folder = tmp_path_factory.mktemp("gov")
    site = load_site(make_site(folder, extra=SMALL_GRID,
                               top=((0, 100.0), (60, 106.0), (120, 104.0), (200, 101.0)),
                               bottom=((0, 99.0), (200, 99.0)),
                               xy=((0.0, 0.0), (200.0, 0.0))))
    return site, design_site(site, site_stations(site)), folder


def test_schedule_governing_and_detailing_columns(designed):
    _, sd, _ = designed
    sched = schedule_frame(sd.walls)
    assert not sched.governing_check.map(is_detailing).any()
    assert (sched.governing_ratio <= sched.utilization_max + 1e-9).all()
    listed = [n for cell in sched.detailing_at_limit for n in str(cell).split()]
    assert listed and all(is_detailing(n) for n in listed)


def test_each_mark_is_written_up_where_its_governing_ratio_is_largest(designed):
    _, sd, _ = designed
    for mark, case in sd.cases.items():
        best = -np.inf
        for w in sd.walls:
            strength = [v for k, v in w.station_checks.items() if not is_detailing(k)]
            ratio = np.nanmax(np.stack(strength), axis=0)
            for q, s in enumerate(w.segments):
                if s.mark == mark:
                    best = max(best, float(np.nanmax(ratio[w.station_segment == q])))
        # the chapter's station holds the largest ratio of the mark's stations (its segments'
        # end stations included)
        assert case.segment.governing_ratio >= best - 1e-9
        got = float(np.broadcast_to(case.checks.governing_ratio, ()))
        assert got == pytest.approx(case.segment.governing_ratio, abs=1e-9)


def test_calc_package_defines_both_design_heights(designed):
    site, sd, folder = designed
    path = rp.write_report(run_info(site), sd, folder / "report.pdf")
    text = " ".join(" ".join(p.extract_text() for p in PdfReader(str(path)).pages).split())
    assert "design_height_ft" in text and "Detailing rows at their limits" in text
    for case in sd.cases.values():
        assert f"design_height_ft = {case.segment.design_height_ft:.2f} ft" in text
