"""Designs a contractor can build, with the default rules, on invented sites of several shapes:
few marks per wall, segments inside a wall at least segment_min_ft, steps 0 or at least 6 in on
the 0.5-ft elevation grid, standard bar spacings, a toe of at least toe_min_ft, and sections
that grow with the design height."""

import json

import numpy as np
import pandas as pd
import pytest
from sitekit import SMALL_GRID, make_site

from wallsched.cli import main

STANDARD_SPACINGS_IN = {4.0, 6.0, 8.0, 9.0, 10.0, 12.0, 15.0, 16.0, 18.0}  # issue 15 default
BAR_COLUMNS = ("stem_bars", "heel_bars", "toe_bars", "horizontal_bars", "footing_long_bars")


def shapes():
    """(name, retained grade points, front grade points, alignment) of invented walls."""
    s = np.arange(0, 421, 20.0)
    yield ("hump", tuple(zip(s, 100 + 8 * np.exp(-((s - 210) / 90) ** 2) + 1, strict=True)),
           ((0, 100.0), (420, 100.0)), ((0.0, 0.0), (420.0, 0.0)))
    s = np.arange(0, 301, 15.0)
    fg = 100 + 0.06 * s  # the front grade climbs 18 ft: the footings step
    yield ("climb", tuple(zip(s, fg + 3 + 3 * np.abs(np.sin(s / 45)), strict=True)),
           tuple(zip(s, fg, strict=True)), ((0.0, 0.0), (150.0, 0.0), (250.0, 100.0)))
    s = np.arange(0, 361, 10.0)
    yield ("sawtooth", tuple(zip(s, 100 + 2 + (s % 90) / 15, strict=True)),
           ((0, 99.5), (360, 100.5)), ((0.0, 0.0), (360.0, 0.0)))


def check_buildable(sched: pd.DataFrame, toe_min_ft=1.0):
    for _, g in sched.groupby("wall", sort=False):
        g = g.sort_values("station_start_ft").reset_index(drop=True)
        assert g["mark"].nunique() <= 6  # marks_max default (issue 15)
        inner = g.length_ft.iloc[1:-1]
        assert (inner >= 20.0 - 1e-6).all()  # segment_min_ft default (common practice)
        for col in ("bottom_of_footing_ft", "top_of_wall_ft"):
            v = g[col].to_numpy()
            assert np.allclose(v * 2, np.round(v * 2), atol=1e-6)  # the 0.5-ft grid
            step = np.abs(np.diff(v))
            assert ((step < 1e-6) | (step >= 0.5 - 1e-6)).all()  # 0 or at least 6 in
        # IBC 2021 1809.3 (the step limit of the footings, 2 ft default)
        assert (np.abs(np.diff(g.bottom_of_footing_ft)) <= 2.0 + 1e-6).all()
        for c in BAR_COLUMNS:
            assert {float(b.split("@")[1]) for b in g[c]} <= STANDARD_SPACINGS_IN
        assert (g.toe_ft >= toe_min_ft - 1e-9).all()
        # the sections grow with the design height
        o = g.sort_values(["design_height_ft", "station_start_ft"])
        for c in ("footing_width_ft", "footing_thickness_in", "stem_base_in", "stem_top_in"):
            assert (np.diff(o[c].to_numpy()) >= -1e-6).all(), c


@pytest.mark.parametrize("shape", list(shapes()), ids=lambda s: s[0])
def test_invented_walls_are_buildable_with_the_defaults(runner, tmp_path, shape):
    _, top, bottom, xy = shape
    site = make_site(tmp_path, extra=SMALL_GRID, top=top, bottom=bottom, xy=xy)
    out = tmp_path / "out"
    res = runner.invoke(main, ["design", str(site), "--out", str(out), "--no-drawings", "-q"])
    assert res.exit_code == 0, res.output
    sched = pd.read_csv(out / "schedule.csv")
    assert (sched.status == "ok").all()
    check_buildable(sched)
    wall = json.loads((out / "run.json").read_text())["walls"][0]
    # the marks cost something over the least cost with every section of the table, and
    # never less (the least cost is the optimum without the mark rule)
    assert wall["plan_cost_usd"] >= wall["least_cost_usd"] - 1e-6
    assert wall["plan_cost_usd"] <= 1.08 * wall["least_cost_usd"]


def test_a_property_line_wall_may_have_no_toe(runner, tmp_path):
    site = make_site(tmp_path, extra=SMALL_GRID + "toe_min_ft = 0.0\n")
    out = tmp_path / "out"
    res = runner.invoke(main, ["design", str(site), "--out", str(out), "--no-drawings", "-q"])
    assert res.exit_code == 0, res.output
    sched = pd.read_csv(out / "schedule.csv")
    check_buildable(sched, toe_min_ft=0.0)


def test_one_mark_when_marks_max_is_one(runner, tmp_path):
    site = make_site(tmp_path, extra=SMALL_GRID + "marks_max = 1\n")
    out = tmp_path / "out"
    res = runner.invoke(main, ["design", str(site), "--out", str(out), "--no-drawings", "-q"])
    assert res.exit_code == 0, res.output
    sched = pd.read_csv(out / "schedule.csv")
    assert sched["mark"].nunique() == 1 and (sched.status == "ok").all()


def test_spacing_list_is_validated(runner, tmp_path):
    site = make_site(tmp_path, extra=SMALL_GRID + "bar_spacings_in = [6, 99]\n")
    res = runner.invoke(main, ["design", str(site), "--out", str(tmp_path / "out"), "-q"])
    assert res.exit_code == 2
    assert "bar_spacings_in" in res.output and "Traceback" not in res.output
    assert not (tmp_path / "out").exists()


def test_starter_site_with_a_raised_retained_grade_point_designs(runner, tmp_path):
    # issue 15: one retained-grade point of the starter site raised 10 ft (15.4 ft retained,
    # inside the grid) designs with every segment ok
    assert runner.invoke(main, ["init", str(tmp_path / "s")]).exit_code == 0
    top = tmp_path / "s" / "wall-a-top.csv"
    lines = top.read_text().splitlines()
    data = [i for i, ln in enumerate(lines) if ln and ln[0].isdigit()]
    for k in data:
        st, el = lines[k].split(",")
        edited = lines.copy()
        edited[k] = f"{st},{float(el) + 10.0:.1f}"
        top.write_text("\n".join(edited) + "\n")
        out = tmp_path / f"out{k}"
        res = runner.invoke(main, ["design", str(tmp_path / "s" / "site.toml"), "--out",
                                   str(out), "--no-drawings", "-q"])
        assert res.exit_code == 0, (k, res.output)
        sched = pd.read_csv(out / "schedule.csv")
        assert (sched.status == "ok").all()
        check_buildable(sched)


def test_a_failing_station_gets_the_next_larger_section():
    # issue 15 item 7: where the envelope section fails at a station, the next larger section
    # of a taller row holds it, and the segment is reported at that row's height
    from wallsched.engine.bars import BarSpec
    from wallsched.engine.checks import check_section
    from wallsched.engine.model import SectionDims
    from wallsched.engine.section import DesignInputs
    from wallsched.engine.sizing import Choice, DesignTable
    from wallsched.engine.wall_design import reinforcement, section_for, station_geometry

    inputs = DesignInputs.of(unit_weight_pcf=120, active_efp_pcf=35, passive_efp_pcf=300,
                          friction_coefficient=0.4, allowable_bearing_psf=2500)
    bars = dict(stem_bars=BarSpec(5, 12.0), heel_bars=BarSpec(5, 12.0),
                toe_bars=BarSpec(5, 12.0), horizontal_bars=BarSpec(4, 12.0),
                footing_long_bars=BarSpec(4, 12.0))
    small = SectionDims(stem_top_in=8, stem_base_in=8, footing_thickness_in=12, toe_ft=1.0,
                        heel_ft=0.75, **bars)
    large = SectionDims(stem_top_in=12, stem_base_in=12, footing_thickness_in=18, toe_ft=2.0,
                        heel_ft=4.0, **dict(bars, heel_bars=BarSpec(6, 8.0),
                                            toe_bars=BarSpec(6, 8.0),
                                            footing_long_bars=BarSpec(5, 12.0)))
    table = DesignTable(1.0, 1.0, 0.5, (Choice(1.0, small, 50.0), Choice(2.0, small, 50.0),
                                        Choice(3.0, large, 90.0)))
    h = np.array([1.0, 6.0])  # the second station is taller than the envelope said

    def at(sec):
        return station_geometry(sec, h, np.full(2, 2.0), np.full(2, 0.5))

    small_checks = check_section(at(small), inputs, reinforcement(small))
    large_checks = check_section(at(large), inputs, reinforcement(large))
    assert not small_checks.passes.all() and large_checks.passes.all()  # the premise
    sec, res, status, height = section_for(table, 1.0, at, inputs)
    assert sec == large and res.passes.all() and status.code.name == "OK"
    assert height == 3.0
