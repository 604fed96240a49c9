"""Fuzzing: random CSV bytes and random profiles into the readers and the whole pipeline.

Every outcome is one of two: a ProfileError / exit 2 with one line naming the file, or a
complete output whose every row is checked. Never a traceback, never another exception.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pandas as pd
from bad_inputs.corpus import SMALL_GRID
from click.testing import CliRunner
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from sitekit import make_site
from wallsched.profile.csvread import read_alignment_csv, read_grade_csv

from wallsched.cli import main
from wallsched.errors import InputError

FUZZ = settings(deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])

CELLS = st.one_of(
    st.floats(allow_nan=True, allow_infinity=True).map(repr),
    st.integers(-10**12, 10**12).map(str),
    st.sampled_from(["", " ", "nan", "inf", "-inf", "1e308", "12+34.56", "0+5x", "abc", '"',
                     ";", "1,5", "\ufeff", "\x00", "#", "100.0", "-0"]),
    st.text(max_size=8),
)
HEADERS = st.sampled_from(["station,elevation", "sta,elev", "x,y", "station;elevation",
                           "elevation,station", "station", "", "\ufeffstation,elevation"])


@st.composite
def csv_bytes(draw) -> bytes:
    """Mostly CSV-shaped text (a header, rows of cells, odd separators), sometimes raw bytes."""
    if draw(st.integers(0, 4)) == 0:
        return draw(st.binary(max_size=300))
    rows = draw(st.lists(st.lists(CELLS, min_size=0, max_size=3), max_size=8))
    sep = draw(st.sampled_from([",", ",", ";", "\t"]))
    end = draw(st.sampled_from(["\n", "\r\n", "\r"]))
    text = draw(HEADERS) + end + end.join(sep.join(r) for r in rows)
    enc = draw(st.sampled_from(["utf-8", "utf-8", "utf-8-sig", "utf-16", "latin-1"]))
    return text.encode(enc, errors="replace")


def _one_line(exc: InputError, name: str) -> None:
    line = exc.one_line()
    assert "\n" not in line and name in line and line.strip()


@FUZZ
@given(data=csv_bytes())
def test_readers_raise_input_error_or_return_a_clean_profile(tmp_path: Path, data: bytes):
    path = tmp_path / "fuzz.csv"
    path.write_bytes(data)
    try:
        g = read_grade_csv(path, "fuzz.csv")
    except InputError as exc:
        _one_line(exc, "fuzz.csv")
    else:
        assert g.station_ft.size >= 2 and np.all(np.diff(g.station_ft) > 0)
        assert np.isfinite(g.station_ft).all() and np.isfinite(g.elevation_ft).all()
    try:
        a = read_alignment_csv(path, "fuzz.csv")
    except InputError as exc:
        _one_line(exc, "fuzz.csv")
    else:
        assert a.line.is_simple and a.length_ft > 0.01


def _check_cli(res, out: Path, folder: Path) -> str:
    assert "Traceback" not in res.output
    if res.exit_code == 2:
        assert isinstance(res.exception, SystemExit)
        lines = res.stderr.strip().splitlines()
        assert len(lines) == 1 and lines[0].startswith("error: "), res.stderr
        assert not out.exists() and not list(folder.glob(".out.*"))
        return "refused"
    assert res.exception is None or isinstance(res.exception, SystemExit), repr(res.exception)
    return "written"


@settings(FUZZ, max_examples=40)
@given(top=csv_bytes())
def test_stations_pipeline_on_random_csv(tmp_path_factory, top: bytes):
    folder = tmp_path_factory.mktemp("f")
    site = make_site(folder)
    (folder / "top.csv").write_bytes(top)
    out = folder / "out"
    res = CliRunner().invoke(main, ["stations", str(site), "--out", str(out), "--no-plots"])
    if _check_cli(res, out, folder) == "written":
        assert res.exit_code == 0
        frame = pd.read_csv(out / "stations.csv")
        assert len(frame) >= 2


PROFILE = st.lists(
    st.tuples(st.floats(-50, 150, allow_nan=False), st.floats(-200, 400, allow_nan=False)),
    min_size=0, max_size=12)


def _rows(points) -> str:
    return "".join(f"{s!r},{e!r}\n" for s, e in points)


@settings(FUZZ, max_examples=40)
@given(top=PROFILE, bottom=PROFILE)
def test_stations_pipeline_on_random_profiles(tmp_path_factory, top, bottom):
    folder = tmp_path_factory.mktemp("p")
    site = make_site(folder)
    (folder / "top.csv").write_text("station,elevation\n" + _rows(top))
    (folder / "bottom.csv").write_text("station,elevation\n" + _rows(bottom))
    out = folder / "out"
    res = CliRunner().invoke(main, ["stations", str(site), "--out", str(out), "--no-plots"])
    if _check_cli(res, out, folder) == "written":
        assert res.exit_code == 0
        frame = pd.read_csv(out / "stations.csv")
        # every station lies on the wall and its height is the difference of the two grades
        assert frame.station_ft.min() == 0.0 and frame.station_ft.max() == 100.0
        np.testing.assert_allclose(frame.retained_height_ft,
                                   frame.retained_grade_ft - frame.front_grade_ft, atol=1e-3)
        assert frame.retained_height_ft.abs().max() <= 60.0 + 1e-6  # the plausibility limit


HEIGHTS = st.lists(st.floats(-1.0, 12.0, allow_nan=False), min_size=2, max_size=6)


@settings(FUZZ, max_examples=6)
@given(heights=HEIGHTS)
def test_design_pipeline_on_random_profiles(tmp_path_factory, heights):
    folder = tmp_path_factory.mktemp("d")
    n = len(heights)
    stations = np.linspace(0.0, 100.0, n)
    top = [(float(s), 100.0 + float(h)) for s, h in zip(stations, heights, strict=True)]
    site = make_site(folder, extra=SMALL_GRID, top=top,
                     bottom=((0.0, 100.0), (100.0, 100.0)))
    out = folder / "out"
    res = CliRunner().invoke(main, ["design", str(site), "--out", str(out), "--no-drawings",
                                    "-q"])
    if _check_cli(res, out, folder) == "written":
        assert res.exit_code in (0, 3), (res.exit_code, repr(res.exception), res.output)
        schedule = pd.read_csv(out / "schedule.csv", comment="#")
        stations_csv = pd.read_csv(out / "stations.csv", comment="#")
        assert (out / "run.json").is_file() and (out / "rebar.csv").is_file()
        assert len(stations_csv) >= 2
        if len(schedule):
            ok = schedule["status"].astype(str) == "ok"
            # a segment reported ok meets IBC 2021 1807.2.3 (FS >= 1.5 by default) and the
            # bearing limit of the site file; exit 0 only when every segment is ok
            assert (schedule.loc[ok, "fs_overturning"] >= 1.5 - 1e-9).all()
            assert (schedule.loc[ok, "fs_sliding"] >= 1.5 - 1e-9).all()
            assert (schedule.loc[ok, "q_max_psf"] <= 2500 + 1e-6).all()
            failing = schedule["status"].astype(str).str.startswith(
                ("over_limit", "no_section", "fails"))
            assert not (ok & failing).any()
            if failing.any():
                assert res.exit_code == 3  # DESIGN.md section 6: outputs written, some fail
