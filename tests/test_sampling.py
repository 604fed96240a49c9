"""Sampling grade profiles into stations, checked against numpy.interp as the reference."""

from pathlib import Path

import numpy as np
import pytest
import shapely
from hypothesis import assume, given, settings
from hypothesis import strategies as st
from sitekit import write
from wallsched.profile.csvread import (
    Alignment,
    GradeProfile,
    alignment_from_xy,
    read_alignment_csv,
    read_grade_csv,
)
from wallsched.profile.sampling import MERGE_TOL_FT, sample_wall

from wallsched.errors import ProfileError


def prof(st_, el):
    return GradeProfile(np.asarray(st_, float), np.asarray(el, float), "test")


def straight(length):
    return Alignment(shapely.LineString([(0, 0), (length, 0)]), "test")


@st.composite
def profiles(draw):
    """Random piecewise-linear retained/front profiles over a wall of random length."""
    length = draw(st.floats(10, 800))
    start = draw(st.floats(-500, 5000))
    def one():
        n = draw(st.integers(2, 12))
        inner = sorted(draw(st.lists(st.floats(0.01, 0.99), min_size=n - 2, max_size=n - 2,
                                     unique=True)))
        s = start + length * np.array([0.0, *inner, 1.0])
        assume((np.diff(s) > 1e-6).all())  # a valid profile: stations strictly increasing
        e = np.array(draw(st.lists(st.floats(90, 130), min_size=n, max_size=n)))
        return prof(s, e)
    return start, length, one(), one(), draw(st.sampled_from([1.0, 2.5, 5.0, 10.0, 25.0]))


@settings(max_examples=150, deadline=None)
@given(profiles())
def test_rows_equal_hand_interpolation_and_true_max(case):
    start, length, rg, fg, dx = case
    # true maximum of the piecewise-linear difference: at a vertex of either profile
    cand = np.unique(np.concatenate([rg.station_ft, fg.station_ft]))
    cand = cand[(cand >= start) & (cand <= start + length)]
    true_h = np.interp(cand, rg.station_ft, rg.elevation_ft) - np.interp(
        cand, fg.station_ft, fg.elevation_ft)
    if true_h.max() < 0:  # flipped over the whole wall: refused
        with pytest.raises(ProfileError, match="swapped"):
            sample_wall("A", straight(length), start, rg, fg, interval_ft=dx)
        return
    ws = sample_wall("A", straight(length), start, rg, fg, interval_ft=dx)
    # every row equals an independent interpolation (numpy.interp as the reference)
    np.testing.assert_allclose(ws.retained_grade_ft,
                               np.interp(ws.station_ft, rg.station_ft, rg.elevation_ft))
    np.testing.assert_allclose(ws.front_grade_ft,
                               np.interp(ws.station_ft, fg.station_ft, fg.elevation_ft))
    assert ws.retained_height_ft.max() == pytest.approx(true_h.max(), abs=1e-9)
    # ends included, stations strictly increasing, regular stations at exact multiples
    assert ws.station_ft[0] == start and ws.station_ft[-1] == pytest.approx(start + length)
    assert (np.diff(ws.station_ft) > 0).all()
    k = np.arange(int(np.floor(length / dx + 1e-9)) + 1)
    regular = start + k * dx
    for s in regular:
        # exact, or a grade break within the merge tolerance stands for it (sample_wall keeps
        # the first of stations closer than MERGE_TOL_FT, a break if any)
        near = np.abs(ws.station_ft - s)
        assert np.isclose(ws.station_ft, s, atol=1e-6).any() or (
            (near <= MERGE_TOL_FT) & ws.is_break).any()


def test_breaks_flagged_and_x_y_on_the_alignment():
    line = Alignment(shapely.LineString([(0, 0), (30, 0), (30, 40)]), "bent")  # 70 ft, a bend
    rg = prof([100, 117.3, 170], [10, 14, 11])
    fg = prof([99, 171], [9, 9])
    ws = sample_wall("A", line, 100.0, rg, fg, interval_ft=10)
    brk = ws.station_ft[ws.is_break]
    assert brk.tolist() == [117.3]
    i = int(np.nonzero(np.isclose(ws.station_ft, 150.0))[0][0])  # 50 ft along: 20 ft up the leg
    assert (ws.x[i], ws.y[i]) == pytest.approx((30.0, 20.0))


def test_coverage_error_names_wall_profile_and_range():
    rg = prof([0, 80], [10, 12])
    fg = prof([0, 100], [9, 9])
    with pytest.raises(ProfileError, match=r"wall 'A'.*retained grade.*0\+80\.00 to 1\+00\.00"):
        sample_wall("A", straight(100), 0.0, rg, fg)


def test_coverage_within_tolerance_is_accepted():
    rg = prof([0.004, 99.995], [10, 12])  # rounded ends, inside the 0.01 ft default
    fg = prof([0, 100], [9, 9])
    ws = sample_wall("A", straight(100), 0.0, rg, fg)
    assert ws.retained_grade_ft[0] == 10 and ws.retained_grade_ft[-1] == 12


def test_flipped_side_flagged_per_station_not_clipped():
    rg = prof([0, 50, 100], [10, 8, 10])
    fg = prof([0, 100], [9, 9])
    ws = sample_wall("A", straight(100), 0.0, rg, fg, interval_ft=10)
    frame = ws.to_frame()
    assert (frame["retained_height_ft"] < 0).any()  # not clipped to zero
    flagged = frame.loc[frame["retained_height_ft"] < 0, "note"]
    assert flagged.str.contains("flips").all()
    assert "WARNING" in ws.summary()


def test_whole_wall_flipped_is_an_error():
    with pytest.raises(ProfileError, match="swapped"):
        sample_wall("A", straight(100), 0.0, prof([0, 100], [9, 9]), prof([0, 100], [10, 11]))


def test_csv_reversed_rows_are_sorted(tmp_path: Path):
    p = write(tmp_path / "g.csv", "sta,elev\n2+00,5\n1+00,4\n0+00,3\n")
    g = read_grade_csv(p)
    assert g.station_ft.tolist() == [0, 100, 200] and g.elevation_ft.tolist() == [3, 4, 5]


def test_csv_rows_out_of_order_are_refused(tmp_path: Path):
    p = write(tmp_path / "g.csv", "station,elevation\n0,3\n200,5\n100,4\n")
    with pytest.raises(ProfileError, match=r"line 4.*station order"):
        read_grade_csv(p)


def test_csv_duplicate_station_with_other_elevation(tmp_path: Path):
    p = write(tmp_path / "g.csv", "station,elevation\n0,3\n100,4\n100,4.5\n")
    with pytest.raises(ProfileError, match=r"line 4.*given twice"):
        read_grade_csv(p)
    q = write(tmp_path / "h.csv", "station,elevation\n0,3\n100,4\n100,4\n200,5\n")
    assert read_grade_csv(q).station_ft.tolist() == [0, 100, 200]  # an exact repeat is merged


@pytest.mark.parametrize(("body", "pattern"), [
    ("station,elevation\n0,3\n10,abc\n", r"line 3.*'abc' is not a number"),
    ("station,elevation\n0,3\n10,nan\n", r"line 3.*not a finite number"),
    ("station,elevation\n0,3\n10,inf\n", r"line 3.*not a finite number"),
    ("station,height\n0,3\n10,4\n", r"line 1.*no 'elevation' column"),
    ("", r"is empty"),
    ("station;elevation\n0;3\n10;4\n", r"';' between columns"),
    ("station,elevation\n0,3\n", r"at least two"),
    ("station,elevation\n0,3\n12+3,4\n", r"line 3.*not a station"),
])
def test_csv_errors_name_the_line(tmp_path: Path, body, pattern):
    p = tmp_path / "g.csv"
    p.write_text(body)
    with pytest.raises(ProfileError, match=pattern) as err:
        read_grade_csv(p)
    assert str(p) in str(err.value)


def test_csv_byte_order_mark_accepted(tmp_path: Path):
    p = tmp_path / "g.csv"
    p.write_bytes("\ufeffstation,elevation\n0,3\n10,4\n".encode())
    assert read_grade_csv(p).elevation_ft.tolist() == [3, 4]


def test_alignment_checks(tmp_path: Path):
    with pytest.raises(ProfileError, match="zero length"):
        alignment_from_xy(np.array([[1.0, 1.0], [1.0, 1.0]]), "a")
    with pytest.raises(ProfileError, match="crosses itself"):
        alignment_from_xy(np.array([[0, 0], [10, 10], [10, 0], [0, 10.0]]), "a")
    p = write(tmp_path / "a.csv", "x,y\n0,0\n30,0\n30,40\n")
    assert read_alignment_csv(p).length_ft == pytest.approx(70.0)
