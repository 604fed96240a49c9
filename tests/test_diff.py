"""``wallsched diff``: two run folders built here with pandas, as the pipeline writes them.

The sites, walls and numbers are invented. The column names and bar notation (``#6@12``) are
the run-folder format of DESIGN.md sections 3 and 5; the matching rules under test are the ones
stated in the docstring of ``wallsched.exporters.diff``.
"""

from __future__ import annotations

import math

import numpy as np
import pandas as pd
import pytest
from click.testing import CliRunner
from wallsched.exporters.diff import (
    DIFF_COLUMNS,
    RunTables,
    diff_runs,
    diff_tables,
    height_change_ranges,
    write_diff,
)
from wallsched.exporters.tables import write_csv
from wallsched.profile.stationing import format_stations

from wallsched.cautions import CAUTIONS
from wallsched.cli import main
from wallsched.errors import InputError


def seg(wall, segment, start, end, **kw):
    """One schedule row with plausible (invented) values; ``kw`` overrides any column."""
    row = {
        "wall": wall, "segment": segment, "station_start_ft": start, "station_end_ft": end,
        "length_ft": end - start, "retained_height_max_ft": 6.0, "top_of_wall_ft": 106.5,
        "top_of_footing_ft": 99.0, "bottom_of_footing_ft": 97.75, "stem_top_in": 10.0,
        "stem_base_in": 12.0, "footing_thickness_in": 15.0, "toe_ft": 1.5, "heel_ft": 3.5,
        "footing_width_ft": 6.0, "key_width_in": math.nan, "key_depth_in": math.nan,
        "key_offset_ft": math.nan, "stem_bars": "#5@12", "heel_bars": "#5@12",
        "toe_bars": "#4@12", "horizontal_bars": "#4@16", "fs_overturning": 2.1,
        "fs_sliding": 1.6, "q_max_psf": 1800.0, "utilization_max": 0.8,
        "concrete_cy": 0.05 * (end - start), "steel_lb": 1.9 * (end - start),
        "status": "ok", "cost": 30.0 * (end - start),
    }
    row.update(kw)
    return row


def flat_stations(wall, start, end, h=6.0, step=5.0, bump=None):
    """Stations every ``step`` ft; ``bump(s)`` adds to the retained height."""
    s = np.arange(start, end + step / 2, step)
    extra = np.zeros_like(s) if bump is None else np.array([bump(x) for x in s])
    front = np.full_like(s, 100.0)
    return pd.DataFrame({
        "wall": wall, "station_ft": s, "station": format_stations(s), "x": s, "y": 0.0,
        "retained_grade_ft": front + h + extra, "front_grade_ft": front,
        "retained_height_ft": h + extra, "is_break": False, "note": "",
    })


def write_run(folder, segments, stations=None):
    folder.mkdir(parents=True, exist_ok=True)
    frame = pd.DataFrame(segments)
    frame.insert(2, "station_start", format_stations(frame["station_start_ft"]))
    frame.insert(3, "station_end", format_stations(frame["station_end_ft"]))
    write_csv(frame, folder / "schedule.csv")
    if stations is not None:
        write_csv(pd.concat(stations, ignore_index=True), folder / "stations.csv")
    return folder


def base_segments():
    return [seg("W1", "W1-01", 0, 60), seg("W1", "W1-02", 60, 160, stem_bars="#6@12"),
            seg("W1", "W1-03", 160, 200), seg("W2", "W2-01", 0, 80)]


def base_stations():
    return [flat_stations("W1", 0, 200), flat_stations("W2", 0, 80, h=4.0)]


def named(d):
    """Set of (change, segment_old, segment_new) over the diff rows."""
    return set(zip(d.rows["change"], d.rows["segment_old"], d.rows["segment_new"], strict=True))


def test_identical_runs_give_an_empty_diff(tmp_path):
    old = write_run(tmp_path / "a", base_segments(), base_stations())
    new = write_run(tmp_path / "b", base_segments(), base_stations())
    d = diff_runs(old, new)
    assert not d.changed
    assert d.rows.empty
    assert d.height_changes.empty
    assert set(d.segments["change"]) == {"unchanged"}
    assert (d.site_quantities["delta"] == 0).all()
    out = write_diff(d, tmp_path / "diff.csv")
    assert out.read_text().strip() == ",".join(DIFF_COLUMNS)
    res = CliRunner().invoke(main, ["diff", str(old), str(new), "--fail-on-change"])
    assert res.exit_code == 0, res.output
    assert (new / "diff.csv").is_file()
    assert res.output.strip().splitlines()[-1].startswith("CAUTION:")
    assert CAUTIONS[0] in res.output


def test_one_segment_bars_changed(tmp_path):
    old = write_run(tmp_path / "a", base_segments(), base_stations())
    segs = base_segments()
    segs[1]["stem_bars"] = "#6@8"
    new = write_run(tmp_path / "b", segs, base_stations())
    d = diff_runs(old, new)
    assert d.changed
    assert len(d.rows) == 1
    r = d.rows.iloc[0]
    assert (r["wall"], r["change"], r["segment_old"], r["segment_new"], r["field"]) == (
        "W1", "changed", "W1-02", "W1-02", "stem_bars")
    assert (r["old"], r["new"]) == ("#6@12", "#6@8")
    assert (r["station_start_ft"], r["station_end_ft"]) == (60.0, 160.0)
    res = CliRunner().invoke(main, ["diff", str(old), str(new), "--fail-on-change"])
    assert res.exit_code == 4, res.output
    assert "stem_bars #6@12 -> #6@8" in res.output
    back = pd.read_csv(new / "diff.csv", dtype=str)
    assert list(back.columns) == list(DIFF_COLUMNS)
    assert back.loc[0, "old"] == "#6@12" and back.loc[0, "new"] == "#6@8"


def test_numeric_change_reports_old_and_new_and_ignores_noise(tmp_path):
    old = write_run(tmp_path / "a", base_segments())
    segs = base_segments()
    segs[0]["heel_ft"] = 4.25                # a real change
    segs[0]["toe_ft"] = 1.5 + 0.002          # below the 0.005 ft tolerance
    segs[2]["stem_bars"] = "#5@12.0"         # same bar, other spelling
    segs[3]["fs_sliding"] = 1.9              # informational: not compared
    new = write_run(tmp_path / "b", segs)
    d = diff_runs(old, new)
    assert list(d.rows["field"]) == ["heel_ft"]
    assert d.rows.iloc[0]["old"] == pytest.approx(3.5)
    assert d.rows.iloc[0]["new"] == pytest.approx(4.25)
    assert d.rows.iloc[0]["segment_new"] == "W1-01"
    assert any("no stations.csv" in n for n in d.notes)


def test_segment_split_in_two(tmp_path):
    old = write_run(tmp_path / "a", base_segments(), base_stations())
    segs = base_segments()
    # W1-02 (60-160) becomes W1-02 (60-100) and W1-03 (100-160); old W1-03 is renumbered W1-04
    segs[1:3] = [seg("W1", "W1-02", 60, 100, stem_bars="#6@12"),
                 seg("W1", "W1-03", 100, 160, stem_bars="#6@10"),
                 seg("W1", "W1-04", 160, 200)]
    new = write_run(tmp_path / "b", segs, base_stations())
    d = diff_runs(old, new)
    # the larger overlap (60 ft, new W1-03) pairs with the old W1-02; 60-100 is added
    assert named(d) == {("changed", "W1-02", "W1-03"), ("added", "", "W1-02")}
    ch = d.rows[d.rows["change"] == "changed"]
    assert {"station_start_ft", "length_ft", "stem_bars", "concrete_cy", "steel_lb",
            "cost"} == set(ch["field"])
    start = ch[ch["field"] == "station_start_ft"].iloc[0]
    assert (start["old"], start["new"]) == (60.0, 100.0)
    added = d.rows[d.rows["change"] == "added"]
    assert set(added["old"]) == {""}
    assert added[added["field"] == "station_end_ft"]["new"].iloc[0] == 100.0
    # the renumbered segment W1-04 is identical to the old W1-03: unchanged, not named
    un = d.segments[d.segments["change"] == "unchanged"]
    assert ("W1-03", "W1-04") in set(zip(un["segment_old"], un["segment_new"], strict=True))
    assert d.changed_station_ranges("W1") == [(60.0, 160.0)]


def test_equal_split_goes_to_the_first_piece(tmp_path):
    old = write_run(tmp_path / "a", [seg("W1", "W1-01", 0, 100)])
    new = write_run(tmp_path / "b", [seg("W1", "W1-01", 0, 50), seg("W1", "W1-02", 50, 100)])
    d = diff_runs(old, new)
    assert named(d) == {("changed", "W1-01", "W1-01"), ("added", "", "W1-02")}


def test_two_segments_merged(tmp_path):
    old = write_run(tmp_path / "a", [seg("W1", "W1-01", 0, 30), seg("W1", "W1-02", 30, 100)])
    new = write_run(tmp_path / "b", [seg("W1", "W1-01", 0, 100)])
    d = diff_runs(old, new)
    assert named(d) == {("changed", "W1-02", "W1-01"), ("removed", "W1-01", "")}
    removed = d.rows[d.rows["change"] == "removed"]
    assert set(removed["new"]) == {""}
    assert (removed["station_end_ft"] == 30.0).all()


def test_wall_added_and_wall_removed(tmp_path):
    old = write_run(tmp_path / "a", base_segments(), base_stations())
    segs = [s for s in base_segments() if s["wall"] != "W2"]
    segs += [seg("W3", "W3-01", 0, 40), seg("W3", "W3-02", 40, 90, stem_bars="#6@10")]
    stations = [flat_stations("W1", 0, 200), flat_stations("W3", 0, 90)]
    new = write_run(tmp_path / "b", segs, stations)
    d = diff_runs(old, new)
    assert d.walls_added == ("W3",) and d.walls_removed == ("W2",)
    assert named(d) == {("removed", "W2-01", ""), ("added", "", "W3-01"),
                        ("added", "", "W3-02")}
    assert not (d.rows["wall"] == "W1").any()
    notes = set(d.height_changes["note"])
    assert notes == {"only in the old run", "only in the new run"}
    w3 = d.height_changes[d.height_changes["wall"] == "W3"].iloc[0]
    assert (w3["station_start_ft"], w3["station_end_ft"]) == (0.0, 90.0)
    text = "\n".join(d.summary_lines())
    assert "W3 (new wall)" in text and "W2 (wall removed)" in text


def test_quantity_deltas_equal_the_difference_of_totals(tmp_path):
    old_segs = base_segments()
    new_segs = base_segments()
    new_segs[1] = seg("W1", "W1-02", 60, 160, stem_bars="#6@12", concrete_cy=7.25,
                      steel_lb=260.5, cost=3300.0)
    new_segs.append(seg("W4", "W4-01", 0, 25))
    old = write_run(tmp_path / "a", old_segs)
    new = write_run(tmp_path / "b", new_segs)
    d = diff_runs(old, new)
    so, sn = pd.DataFrame(old_segs), pd.DataFrame(new_segs)
    for q in ("concrete_cy", "steel_lb", "cost"):
        site = d.site_quantities.set_index("quantity").loc[q]
        assert site["old"] == pytest.approx(so[q].sum())
        assert site["new"] == pytest.approx(sn[q].sum())
        assert site["delta"] == pytest.approx(sn[q].sum() - so[q].sum())
        for wall in ("W1", "W2", "W4"):
            row = d.quantities[(d.quantities["wall"] == wall)
                               & (d.quantities["quantity"] == q)].iloc[0]
            expect = sn.loc[sn["wall"] == wall, q].sum() - so.loc[so["wall"] == wall, q].sum()
            assert row["delta"] == pytest.approx(expect)
        # the rows of diff.csv account for the whole site delta
        rows = d.rows[d.rows["field"] == q]
        num = rows[["old", "new"]].replace("", 0.0).astype(float)
        assert (num["new"] - num["old"]).sum() == pytest.approx(site["delta"])
    w2 = d.quantities[(d.quantities["wall"] == "W2")]
    assert (w2["delta"] == 0).all()


def test_height_ranges_found_by_linear_crossing():
    old = flat_stations("W1", 0, 200)
    # new grade: +0 at 100 rising linearly to +1.0 ft at 130, level to 150, back to 0 at 170
    def bump(s):
        return float(np.interp(s, [100, 130, 150, 170], [0, 1.0, 1.0, 0]))

    new = flat_stations("W1", 0, 200, bump=bump)
    (r,) = height_change_ranges(old, new, "W1", 0.05)
    # |dh| = (s - 100) / 30 exceeds 0.05 ft from s = 101.5; (170 - s) / 20 until s = 169
    assert r["station_start_ft"] == pytest.approx(101.5)
    assert r["station_end_ft"] == pytest.approx(169.0)
    assert r["max_abs_delta_ft"] == pytest.approx(1.0)
    assert r["new_ft"] - r["old_ft"] == pytest.approx(1.0)
    assert height_change_ranges(old, new, "W1", 1.5) == []
    # a drop is found as well as a rise
    low = flat_stations("W1", 0, 200, bump=lambda s: -bump(s))
    (r2,) = height_change_ranges(old, low, "W1", 0.05)
    assert r2["station_start_ft"] == pytest.approx(101.5)
    assert r2["new_ft"] - r2["old_ft"] == pytest.approx(-1.0)


def test_grading_change_names_exactly_the_overlapping_segments(tmp_path):
    """A grading change inside 70-110 ft: only the segment over it is named.

    The design of W1-02 does not change (its maximum height is elsewhere), yet its retained
    grade does, so it is reported with a ``retained_height_ft`` row.
    """
    old = write_run(tmp_path / "a", base_segments(), base_stations())

    def bump(s):
        return float(np.interp(s, [70, 85, 95, 110], [0, -0.8, -0.8, 0]))

    stations = [flat_stations("W1", 0, 200, bump=bump), flat_stations("W2", 0, 80, h=4.0)]
    new = write_run(tmp_path / "b", base_segments(), stations)
    d = diff_runs(old, new)
    assert named(d) == {("changed", "W1-02", "W1-02")}
    (row,) = d.rows.itertuples()
    assert row.field == "retained_height_ft"
    assert 70 < row.station_start_ft < 72 and 108 < row.station_end_ft < 110
    assert row.new - row.old == pytest.approx(-0.8)
    res = CliRunner().invoke(main, ["diff", str(old), str(new), "--height-tol", "1.0",
                                    "--fail-on-change", "-q"])
    assert res.exit_code == 0 and res.output == ""


def test_out_option_file_and_folder(tmp_path):
    old = write_run(tmp_path / "a", base_segments())
    segs = base_segments()
    segs[0]["status"] = "fails bearing"
    new = write_run(tmp_path / "b", segs)
    (tmp_path / "reports").mkdir()
    runner = CliRunner()
    res = runner.invoke(main, ["diff", str(old), str(new), "--out", str(tmp_path / "reports")])
    assert res.exit_code == 0, res.output
    assert (tmp_path / "reports" / "diff.csv").is_file()
    assert not (new / "diff.csv").exists()
    res = runner.invoke(main, ["diff", str(old), str(new), "--out", str(tmp_path / "x.csv")])
    assert res.exit_code == 0
    back = pd.read_csv(tmp_path / "x.csv", dtype=str, keep_default_na=False)
    assert back[["field", "old", "new"]].values.tolist() == [["status", "ok", "fails bearing"]]
    res = runner.invoke(main, ["diff", str(old), str(new), "--out",
                               str(tmp_path / "nowhere" / "x.csv")])
    assert res.exit_code == 2


@pytest.mark.parametrize("case", ["no_folder", "no_schedule", "missing_column", "not_number",
                                  "empty", "bad_extent"])
def test_bad_input_is_one_line_and_exit_2(tmp_path, case):
    good = write_run(tmp_path / "good", base_segments())
    bad = tmp_path / "bad"
    bad.mkdir()
    frame = pd.DataFrame(base_segments())
    if case == "no_folder":
        bad = tmp_path / "missing"
    elif case == "missing_column":
        frame.drop(columns=["station_end_ft"]).to_csv(bad / "schedule.csv", index=False)
    elif case == "not_number":
        frame["heel_ft"] = frame["heel_ft"].astype(object)
        frame.loc[2, "heel_ft"] = "four"
        frame.to_csv(bad / "schedule.csv", index=False)
    elif case == "empty":
        (bad / "schedule.csv").write_text("")
    elif case == "bad_extent":
        frame.loc[1, "station_end_ft"] = 10.0
        frame.to_csv(bad / "schedule.csv", index=False)
    with pytest.raises(InputError) as info:
        diff_runs(good, bad)
    if case in ("not_number", "bad_extent"):
        assert info.value.where == f"line {4 if case == 'not_number' else 3}"
    res = CliRunner().invoke(main, ["diff", str(good), str(bad)])
    assert res.exit_code == 2
    assert res.output.count("\n") == 1 and res.output.startswith("error: ")
    assert "Traceback" not in res.output
    assert not (bad / "diff.csv").exists()


def test_negative_height_tolerance_is_refused(tmp_path):
    run = write_run(tmp_path / "a", base_segments())
    res = CliRunner().invoke(main, ["diff", str(run), str(run), "--height-tol", "-1"])
    assert res.exit_code == 2
    assert "--height-tol" in res.output


def test_footer_and_comment_lines_are_not_segments(tmp_path):
    old = write_run(tmp_path / "a", base_segments())
    new = write_run(tmp_path / "b", base_segments())
    path = new / "schedule.csv"
    lines = path.read_text().splitlines()
    lines.insert(1, "# revision B grading")
    lines.append("")
    lines.append("PRELIMINARY DESIGN AID ONLY - review required")
    path.write_text("\n".join(lines) + "\n")
    assert not diff_runs(old, new).changed
    # a bad number is still reported at its own line of the file
    lines[3] = lines[3].replace(",3.5000,", ",four,", 1)
    path.write_text("\n".join(lines) + "\n")
    with pytest.raises(InputError) as info:
        diff_runs(old, new)
    assert info.value.where == "line 4"
    assert "heel_ft" in info.value.message


def test_tables_in_memory_compare_like_folders(tmp_path):
    """The entry point a re-run with a comparison can call without writing files."""
    segs = base_segments()
    changed = base_segments()
    changed[3]["toe_bars"] = "#5@12"
    d = diff_tables(RunTables.from_frames(pd.DataFrame(segs)),
                    RunTables.from_frames(pd.DataFrame(changed)))
    assert named(d) == {("changed", "W2-01", "W2-01")}
    assert list(d.rows["field"]) == ["toe_bars"]
    assert d.changed_segments("W2") == [("changed", "W2-01", "W2-01")]
    assert d.changed_segments("W1") == []


def test_schedule_columns_must_agree_but_cost_is_optional(tmp_path):
    segs = base_segments()
    old = write_run(tmp_path / "a", [{k: v for k, v in s.items() if k != "cost"} for s in segs])
    new = write_run(tmp_path / "b", segs)
    d = diff_runs(old, new)
    assert not d.changed
    cost = d.site_quantities.set_index("quantity").loc["cost"]
    assert math.isnan(cost["delta"])
    assert any("cost" in n and "new" in n for n in d.notes)
    lacking = write_run(tmp_path / "c", [{k: v for k, v in s.items() if k != "heel_ft"}
                                        for s in segs])
    res = CliRunner().invoke(main, ["diff", str(lacking), str(new)])
    assert res.exit_code == 2
    assert "heel_ft" in res.output


def test_a_mark_change_is_listed_as_field_mark():
    # issue 15: the same segment with another section mark is a change of the field "mark"
    segs = [dict(s, mark="A") for s in base_segments()]
    changed = [dict(s, mark="A") for s in base_segments()]
    changed[3]["mark"] = "C"
    d = diff_tables(RunTables.from_frames(pd.DataFrame(segs)),
                    RunTables.from_frames(pd.DataFrame(changed)))
    assert list(d.rows["field"]) == ["mark"]
    assert list(d.rows["old"]) == ["A"] and list(d.rows["new"]) == ["C"]
