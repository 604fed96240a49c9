"""A revision compared with an earlier run (issue 15): sections identical to the earlier run's
keep their letters, new sections take new letters, unchanged segments keep their ids."""

import pandas as pd
from sitekit import SMALL_GRID, make_site

from wallsched.cli import main

DIMS = ["stem_top_in", "stem_base_in", "footing_thickness_in", "toe_ft", "heel_ft",
        "stem_bars", "heel_bars", "toe_bars", "horizontal_bars", "footing_long_bars"]


def test_letters_and_ids_are_kept_across_a_revision(runner, tmp_path):
    top = ((0, 100.0), (60, 105.0), (140, 107.0), (220, 103.0), (300, 104.0))
    bottom = ((0, 99.0), (300, 99.5))
    xy = ((0.0, 0.0), (300.0, 0.0))
    a = make_site(tmp_path / "a", extra=SMALL_GRID, top=top, bottom=bottom, xy=xy)
    top2 = tuple((s, e + (2.5 if 120 <= s <= 160 else 0.0)) for s, e in top)
    b = make_site(tmp_path / "b", extra=SMALL_GRID, top=top2, bottom=bottom, xy=xy)
    oa, ob = tmp_path / "a" / "out", tmp_path / "b" / "out"
    assert runner.invoke(main, ["design", str(a), "--out", str(oa), "-q",
                                "--no-drawings"]).exit_code == 0
    res = runner.invoke(main, ["design", str(b), "--out", str(ob), "-q", "--no-drawings",
                               "--compare", str(oa)])
    assert res.exit_code == 0, res.output
    old, new = pd.read_csv(oa / "schedule.csv"), pd.read_csv(ob / "schedule.csv")
    letter = {tuple(r[DIMS]): r["mark"] for _, r in old.iterrows()}
    new_sections = 0
    for _, r in new.iterrows():
        key = tuple(r[DIMS])
        if key in letter:
            assert r["mark"] == letter[key]  # the same section keeps its letter
        else:
            new_sections += 1
            assert r["mark"] not in set(old["mark"])  # a new section takes a new letter
    assert new_sections >= 1  # the raised stretch needs a taller section
    ids = {(r.station_start_ft, r.station_end_ft, r.mark): r.segment
           for r in old.itertuples()}
    kept = 0
    for r in new.itertuples():
        sid = ids.get((r.station_start_ft, r.station_end_ft, r.mark))
        if sid is not None:
            assert r.segment == sid  # an unchanged segment keeps its id
            kept += 1
    assert kept >= 1
    assert new.segment.is_unique
    diff = pd.read_csv(ob / "diff.csv", dtype=str, keep_default_na=False)
    changed_ids = set(diff.segment_new) - {""}
    assert not changed_ids & {r.segment for r in new.itertuples()
                              if (r.station_start_ft, r.station_end_ft, r.mark) in ids}
