"""The stations the scalar audit re-checks: ends, failures, the near-largest ratios, a sample."""

from __future__ import annotations

import numpy as np
from wallsched.engine.audit_selection import audit_stations


def test_ends_sample_and_the_largest_ratio_of_each_check():
    n = 101
    h = np.linspace(5.0, 10.0, n)
    grows = (h / 10.0) ** 3  # largest at the last station
    peaks = 0.5 + 0.4 * np.exp(-((np.arange(n) - 40) / 3.0) ** 2)  # largest at station 40
    const = np.full(n, 0.97)  # a detailing row: the same everywhere
    got = audit_stations(np.vstack([grows, peaks, const]), np.ones(n, bool), sample=3)
    assert {0, 100, 25, 50, 75, 40} <= set(got)
    # within 5 % of the largest: h^3 >= 0.95 -> h >= 9.830 ft -> the last 4 stations; the
    # band's first station is audited, the one before it is not
    assert {97, 100} <= set(got) and 96 not in got
    # the peak's band: 0.4 e^(-(d/3)^2) >= 0.4 - 0.045 -> |d| <= 1.05 -> stations 39..41
    assert {39, 40, 41} <= set(got) and not {38, 42} & set(got)
    # the constant row adds nothing beyond the ends and the sample
    assert len(got) < 20


def test_every_failing_station_is_audited():
    n = 50
    r = np.full((1, n), 0.5)
    r[0, [7, 33]] = 1.2
    passes = r[0] <= 1.0
    got = audit_stations(r, passes, sample=0)
    assert {0, 7, 33, 49} <= set(got)


def test_infinite_ratio_and_nan_rows():
    r = np.full((2, 10), np.nan)
    r[0, 4] = np.inf
    got = audit_stations(r, np.ones(10, bool), sample=0)
    assert set(got) == {0, 4, 9}


def test_deterministic():
    rng = np.random.default_rng(3)
    r = rng.random((6, 300))
    a = audit_stations(r, np.ones(300, bool))
    b = audit_stations(r.copy(), np.ones(300, bool))
    assert np.array_equal(a, b) and np.all(np.diff(a) > 0)


# ---- the rule as the design stage applies it -------------------------------------------------

def _long_site(folder):
    from sitekit import SMALL_GRID, make_site

    from wallsched.design import design_site
    from wallsched.pipeline import site_stations
    from wallsched.site import load_site

    # an invented 400 ft wall at 1 ft stations: long segments, so that the rule picks few
    site = load_site(make_site(
        folder, extra=SMALL_GRID + "\n[criteria]\nstation_interval_ft = 1.0\n",
        top=((0, 100.0), (150, 106.0), (400, 103.0)), bottom=((0, 99.0), (400, 99.5)),
        xy=((0.0, 0.0), (400.0, 0.0))))
    return site, site_stations(site), design_site


def test_the_design_stage_audits_the_deciding_stations_only(tmp_path):
    site, stations, design_site = _long_site(tmp_path)
    sd = design_site(site, stations)
    (w,) = sd.walls
    assert sd.audit_rule and "within 5 %" in sd.audit_rule
    assert 0 < w.stations_audited < w.stations_checked
    for s in w.segments:
        got = set(s.audited_station_ft)
        assert {s.station_start_ft, s.station_end_ft} <= got  # both ends
        assert s.governing_station_ft in got  # the station with the largest ratio


def test_a_disagreement_at_an_audited_station_is_still_a_bug(tmp_path, monkeypatch):
    import pytest
    from wallsched.engine import audit

    from wallsched.errors import DesignError

    site, stations, design_site = _long_site(tmp_path)
    real = audit.audit_section

    def wrong(inputs, geo, bars):  # the scalar side says every check fails
        rows = real(inputs, geo, bars)
        return {k: v._replace(passes=not v.passes) for k, v in rows.items()}

    monkeypatch.setattr(audit, "audit_section", wrong)
    with pytest.raises(DesignError, match="audit disagrees"):
        design_site(site, stations)


def test_no_audit_says_so(tmp_path):
    site, stations, design_site = _long_site(tmp_path)
    sd = design_site(site, stations, audit=False)
    assert sd.audit_rule == "" and sd.walls[0].stations_audited == 0


def test_segments_checked_in_one_call_equal_segments_checked_one_by_one(tmp_path, monkeypatch):
    from wallsched.engine import wall_design

    site, stations, design_site = _long_site(tmp_path)
    batched = design_site(site, stations).walls[0]
    monkeypatch.setattr(wall_design, "BATCH_MIN_STATIONS", 10**12)
    single = design_site(site, stations).walls[0]
    assert len(batched.segments) == len(single.segments) > 1
    for a, b in zip(batched.segments, single.segments, strict=True):
        assert (a.section, a.utilization_max, a.governing_check, a.fs_sliding, a.q_max_psf,
                a.status) == (b.section, b.utilization_max, b.governing_check, b.fs_sliding,
                              b.q_max_psf, b.status)
    assert np.array_equal(batched.station_utilization, single.station_utilization,
                          equal_nan=True)
    assert batched.station_status == single.station_status
    for name, ratios in single.station_checks.items():
        assert np.array_equal(batched.station_checks[name], ratios, equal_nan=True), name
