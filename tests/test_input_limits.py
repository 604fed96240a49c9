"""Every number finite and in range; ranges checked as sets; resources bounded before they are
allocated; crossing grades flagged, never designed as ``ok``."""

from __future__ import annotations

import json

import numpy as np
import pytest
from sitekit import SMALL_GRID, make_site
from wallsched.engine.status import StatusCode
from wallsched.profile.csvread import alignment_from_xy, fold_back

from wallsched.budget import segmenting_bytes, span_and_block
from wallsched.cli import main
from wallsched.errors import ProfileError


def _one_line(res, *fragments: str) -> str:
    assert res.exit_code == 2, (res.output, res.exception)
    assert "Traceback" not in res.output
    lines = res.stderr.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith("error: "), res.stderr
    for f in fragments:
        assert f in lines[0], lines[0]
    return lines[0]


# ---- alignments that fold back on themselves

def test_a_hairpin_alignment_is_refused():
    xy = np.array([[0, 0], [100, 0], [100, 0.001], [0, 0.001]], float)
    with pytest.raises(ProfileError, match="folds back on itself"):
        alignment_from_xy(xy, "align.csv")


@pytest.mark.parametrize("radius", [3.0, 20.0, 500.0])
def test_a_curve_is_not_a_fold(radius):
    t = np.linspace(0, np.pi, 400)  # a half circle: its ends are 2 x radius apart
    assert fold_back(np.c_[radius * np.cos(t), radius * np.sin(t)]) is None


def test_a_doubled_stretch_in_the_middle_is_found():
    xy = np.array([[0, 0], [60, 0], [60, 0.2], [40, 0.2], [40, 10], [100, 10]], float)
    (x, y), gap, along = fold_back(xy)
    assert gap == pytest.approx(0.2) and along > 5.0


# ---- segmenting memory, estimated from the stations

def test_span_and_block_count_stations():
    s = np.arange(0, 100.01, 5.0)  # 5-ft stations, segments 10 to 90 ft
    assert span_and_block(s, 10.0, 90.0) == (19, 2)
    fine = np.arange(0, 100.0001, 0.1)
    k1, block = span_and_block(fine, 10.0, 90.0)
    assert k1 == 901 and block == 100


def test_the_estimate_grows_with_the_square_of_the_span():
    a = segmenting_bytes([(1000, 100, 10)])
    b = segmenting_bytes([(1000, 200, 10)])
    assert 3.0 < b / a < 4.0


# ---- through the command line

def _site(tmp_path, **kw):
    return make_site(tmp_path, extra=kw.pop("extra", SMALL_GRID), **kw)


def _design(runner, site, out, *extra):
    return runner.invoke(main, ["design", str(site), "--out", str(out), "--no-drawings",
                                *extra])


def _long_site(tmp_path, extra):
    # an invented 3,000 ft wall: the recursion runs over segment ends 2 ft apart, so only a
    # long wall whose segments may be very long needs much memory
    return make_site(tmp_path, extra=extra, xy=((0.0, 0.0), (3000.0, 0.0)),
                     top=((0, 100.0), (1500, 106.0), (3000, 103.0)),
                     bottom=((0, 99.0), (3000, 99.5)))


@pytest.mark.parametrize("criteria, fragment", [
    ("station_interval_ft = 1.0\nsegment_max_ft = 1000", "planning its segments would need"),
])
def test_a_fine_interval_is_refused_before_allocating(runner, tmp_path, criteria, fragment):
    site = _long_site(tmp_path, SMALL_GRID + f"\n[criteria]\n{criteria}\n")
    line = _one_line(_design(runner, site, tmp_path / "out"), fragment,
                     "memory_budget_gb = 2", "station_interval_ft", "site.toml")
    assert "walls[1]" in line
    assert not (tmp_path / "out").exists()


def test_the_finest_grid_is_refused_naming_the_limit(runner, tmp_path):
    grid = """
[sizing]
toe_max_ft = 30
heel_max_ft = 40
toe_heel_step_in = 1
footing_thickness_min_in = 8
footing_thickness_max_in = 96
footing_thickness_step_in = 0.5
stem_min_in = 6
stem_max_in = 72
stem_step_in = 0.5
"""
    site = _site(tmp_path, extra=grid)
    _one_line(_design(runner, site, tmp_path / "out"), "candidate geometries",
              "memory_budget_gb", "[sizing]", "coarsen the grid")


def test_a_larger_budget_lets_the_same_site_run(runner, tmp_path):
    # 1-ft stations, segments up to 400 ft: well under 1 GB estimated (lowerings counted at
    # their most); refused under a 0.2 GB budget, run under the default
    extra = SMALL_GRID + "\n[criteria]\nstation_interval_ft = 1.0\nsegment_max_ft = 400\n"
    site = _long_site(tmp_path, extra.replace("[sizing]", "[sizing]\nmemory_budget_gb = 0.2"))
    _one_line(_design(runner, site, tmp_path / "out"), "memory_budget_gb = 0.2")
    site.write_text(site.read_text().replace("memory_budget_gb = 0.2\n", ""))
    res = _design(runner, site, tmp_path / "out")
    assert res.exit_code == 0, res.output


# ---- ranges as sets

@pytest.mark.parametrize("table, text, fragment, where", [
    ("criteria", "segment_min_ft = 60\nsegment_max_ft = 40", "segment_min_ft = 60 is more than "
     "segment_max_ft = 40", "[criteria] segment_min_ft"),
    ("criteria", "contraction_joint_max_ft = 100\nexpansion_joint_max_ft = 50",
     "contraction_joint_max_ft = 100 is more than", "[criteria] contraction_joint_max_ft"),
    ("criteria", "min_retained_height_ft = 4\nmax_retained_height_ft = 2",
     "min_retained_height_ft = 4 is more than", "[criteria] min_retained_height_ft"),
    ("sizing", "footing_thickness_min_in = 30\nfooting_thickness_max_in = 20",
     "footing thickness range is empty", "[sizing] footing_thickness_min_in"),
    ("sizing", "stem_min_in = 20\nstem_max_in = 10", "stem thickness range is empty",
     "[sizing] stem_min_in"),
    ("sizing", "toe_heel_step_in = 24\nheel_max_ft = 2", "smallest heel", "[sizing] heel_max_ft"),
    ("sizing", 'bar_sizes = "9-4"', "runs downward; write it 4-9", "[sizing] bar_sizes"),
    ("sizing", 'bar_sizes = "#4 to #99"', "cannot be read", "[sizing] bar_sizes"),
    ("sizing", 'bar_sizes = "4,99"', "cannot be read", "[sizing] bar_sizes"),
])
def test_ranges_are_checked_as_sets(runner, tmp_path, table, text, fragment, where):
    site = make_site(tmp_path, extra=f"[{table}]\n{text}\n")
    _one_line(_design(runner, site, tmp_path / "out"), fragment, where, "site.toml")


def test_a_wall_override_that_inverts_a_range_names_the_wall(runner, tmp_path):
    site = make_site(tmp_path, wall_extra="segment_min_ft = 95\n")
    _one_line(_design(runner, site, tmp_path / "out"), "segment_min_ft = 95 is more than",
              "walls[1] (id 'A')")


# ---- every number finite, wherever it comes from

@pytest.mark.parametrize("value, fragment", [
    ("nan", "must be a finite number"), ("inf", "must be a finite number"),
    ("-inf", "must be a finite number"), ("1" * 400, "a 400-digit number"),
])
def test_site_numbers_must_be_finite(runner, tmp_path, value, fragment):
    site = make_site(tmp_path)
    site.write_text(site.read_text().replace("unit_weight_pcf = 120",
                                             f"unit_weight_pcf = {value}"))
    _one_line(_design(runner, site, tmp_path / "out"), fragment, "[soil] unit_weight_pcf")


def test_an_integer_past_the_toml_reader_is_one_line(runner, tmp_path):
    site = make_site(tmp_path)
    site.write_text(site.read_text().replace("surcharge_psf = 100",
                                             "surcharge_psf = " + "7" * 5000))
    _one_line(_design(runner, site, tmp_path / "out"), "cannot be read", "line 12")


def test_section_file_huge_integer_is_one_line(runner, tmp_path):
    from pathlib import Path

    example = Path(__file__).parents[1] / "sample_site" / "sections" / "example-section.toml"
    text = example.read_text()
    start = text.index("retained_height_ft")
    end = text.index("\n", start)
    (tmp_path / "s.toml").write_text(text[:start] + "retained_height_ft = " + "9" * 400
                                     + text[end:])
    res = runner.invoke(main, ["section", str(tmp_path / "s.toml")])
    _one_line(res, "must be a finite number", "retained_height_ft")


def _dxf_profile_site(tmp_path, **over):
    import ezdxf

    site = make_site(tmp_path, extra=SMALL_GRID)
    doc = ezdxf.new()
    doc.header["$INSUNITS"] = 2
    doc.modelspace().add_lwpolyline([(0, 10), (40, 22), (100, 16)], dxfattribs={"layer": "TW"})
    doc.saveas(tmp_path / "prof.dxf")
    opts = {"origin_station_ft": 0, "origin_elevation_ft": 95, "vertical_exaggeration": 2}
    opts.update(over)
    inline = ", ".join(f"{k} = {v}" for k, v in opts.items())
    site.write_text(site.read_text().replace(
        'retained_grade = "top.csv"',
        f'retained_grade = {{ dxf = "prof.dxf", layer = "TW", view = "profile", {inline} }}'))
    return site


@pytest.mark.parametrize("key, value", [
    ("origin_elevation_ft", "nan"), ("vertical_exaggeration", "inf"),
    ("origin_station_ft", "-inf"), ("vertical_exaggeration", "1e9"),
])
def test_inline_source_options_must_be_finite_and_in_range(runner, tmp_path, key, value):
    site = _dxf_profile_site(tmp_path, **{key: value})
    _one_line(_design(runner, site, tmp_path / "out"), f"'{key}' must be", f"retained_grade.{key}")


def test_a_profile_view_with_finite_options_runs(runner, tmp_path):
    site = _dxf_profile_site(tmp_path)
    res = _design(runner, site, tmp_path / "out")
    assert res.exit_code == 0, res.output


@pytest.mark.parametrize("opt", ["start = [nan, nan]", "start = [0, inf]",
                                 "gap_tolerance_ft = inf", "gap_tolerance_ft = 40"])
def test_alignment_options_must_be_finite(runner, tmp_path, opt):
    import ezdxf

    site = make_site(tmp_path, extra=SMALL_GRID)
    doc = ezdxf.new()
    doc.header["$INSUNITS"] = 2
    doc.modelspace().add_lwpolyline([(0, 0), (50, 0)], dxfattribs={"layer": "WALL"})
    doc.modelspace().add_lwpolyline([(90, 0), (140, 0)], dxfattribs={"layer": "WALL"})
    doc.saveas(tmp_path / "plan.dxf")
    site.write_text(site.read_text().replace(
        'alignment = "align.csv"', f'alignment = {{ dxf = "plan.dxf", layer = "WALL", {opt} }}'))
    name = opt.split(" ")[0]
    _one_line(_design(runner, site, tmp_path / "out"), f"'{name}' must be",
              f"alignment.{name}")


def test_csv_underscore_in_a_number_is_refused(runner, tmp_path):
    site = make_site(tmp_path)
    (tmp_path / "top.csv").write_text("station,elevation\n0,100\n50,10_3.5\n100,103\n")
    _one_line(_design(runner, site, tmp_path / "out"), "'10_3.5' is not a number", "top.csv",
              "line 3")


# ---- crossing grades

def test_crossing_grades_are_flagged_not_ok(runner, tmp_path):
    site = make_site(tmp_path, extra=SMALL_GRID, top=((0, 105.0), (50, 101.0), (100, 105.0)),
                     bottom=((0, 99.0), (50, 103.5), (100, 99.0)))
    res = _design(runner, site, tmp_path / "out")
    assert res.exit_code == 3, res.output  # not designed for soil on the other side
    assert "the front grade is above the retained grade" in res.stdout
    assert "2.50 ft above" in res.stdout
    from wallsched.exporters.run_tables import read_schedule

    sched = read_schedule(tmp_path / "out" / "schedule.csv")
    flagged = sched[sched["status"].str.startswith(StatusCode.GRADES_CROSS.value)]
    assert len(flagged) >= 1
    lo, hi = flagged["station_start_ft"].min(), flagged["station_end_ft"].max()
    assert lo <= 50.0 <= hi  # the segment over the crossing
    assert flagged["warnings"].str.contains("the front grade is above the retained grade").all()
    assert not (sched["status"] == "ok").all()
    record = json.loads((tmp_path / "out" / "run.json").read_text())
    assert any("the front grade is above the retained grade" in w for w in record["warnings"])
    from pypdf import PdfReader

    text = " ".join(p.extract_text() for p in PdfReader(tmp_path / "out" / "report.pdf").pages)
    assert "the front grade is above the retained grade" in " ".join(text.split())


def test_a_wall_at_the_station_limit_fits_the_default_budget():
    # 50,000 stations at the default 5-ft interval, segments 10 to 90 ft (a run of this size
    # completed at a peak RSS of 0.29 GB on the development machine)
    from wallsched.budget import BASE_BYTES, GB

    s = np.arange(50_000) * 5.0
    k1, block = span_and_block(s, 10.0, 90.0)
    assert BASE_BYTES + segmenting_bytes([(s.size, k1, block)]) < 2 * GB


def test_groups_planned_side_by_side_add_up(monkeypatch):
    from wallsched.budget import parallel_segmenting_bytes

    walls = [(1000, 50, 5)] * 8
    monkeypatch.setenv("WALLSCHED_WORKERS", "2")  # 8 walls in 4 groups of 2, 2 at a time
    assert parallel_segmenting_bytes(walls) == pytest.approx(
        2 * segmenting_bytes([(1000, 50, 5)] * 2))
    monkeypatch.setenv("WALLSCHED_WORKERS", "1")  # one process, one batch
    assert parallel_segmenting_bytes(walls) == pytest.approx(segmenting_bytes(walls))


def test_a_fine_interval_on_a_short_wall_runs(runner, tmp_path):
    # 0.1-ft stations on the 100 ft wall: the segments end only at stations 2 ft apart
    # (engine.segments.BOUNDARY_GRID_FT), so the recursion stays small and the run completes
    site = _site(tmp_path, extra=SMALL_GRID + "\n[criteria]\nstation_interval_ft = 0.1\n")
    res = _design(runner, site, tmp_path / "out")
    assert res.exit_code == 0, res.output
    assert (tmp_path / "out" / "schedule.csv").is_file()


def test_many_short_walls_fit_the_default_budget(monkeypatch):
    # 400 walls of 250 ft at 1 ft (126 candidate ends 2 ft apart, segments 20 to 90 ft): the
    # walls of a batch are planned together at their highest footings and a wall on steep
    # ground again alone with LOWERINGS_STEEP lowerings (engine.segments._plan_batch), so the
    # batch's estimate is not the steep pass times the walls (a run of this shape completed
    # at a peak RSS of 0.41 GB on the development machine)
    from wallsched.budget import BASE_BYTES, GB, parallel_segmenting_bytes

    s = np.arange(126) * 2.0
    k1, block = span_and_block(s, 20.0, 90.0)
    monkeypatch.setenv("WALLSCHED_WORKERS", "2")
    assert BASE_BYTES + parallel_segmenting_bytes([(s.size, k1, block)] * 400) < 2 * GB
    one = segmenting_bytes([(s.size, k1, block)])
    assert segmenting_bytes([(s.size, k1, block)] * 100) < 100 * one  # not 100 steep passes
