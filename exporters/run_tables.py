"""The tables of a run folder as the comparison reads them (``exporters/compare.py``, where
the rules are): the compared schedule fields with their tolerances, and ``schedule.csv`` and
``stations.csv`` read and checked (an InputError names the file and the line).
"""

from __future__ import annotations

import math
import re
from collections.abc import Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING

import numpy as np

from ..errors import InputError

if TYPE_CHECKING:  # pragma: no cover
    import pandas as pd

LENGTH_TOL_FT = 0.005  # about 1/16 in
INCH_TOL_IN = 0.01
QTY_REL_TOL = 1e-6
QTY_ABS_TOL = 0.001
COST_COLUMNS = ("cost", "cost_usd")

_BAR = re.compile(r"^#(\d+)@(\d+(?:\.\d*)?|\.\d+)(.*)$")


@dataclass(frozen=True)
class Field:
    """One compared schedule column: its group and how it is compared (ft, in, qty, bar, text)."""

    name: str
    group: str
    kind: str

    def same(self, a, b) -> bool:
        """True when ``a`` and ``b`` are equal within this field's tolerance."""
        if self.kind in ("bar", "text"):
            return as_text(a, self.kind) == as_text(b, self.kind)
        a, b = as_number(a), as_number(b)
        if math.isnan(a) or math.isnan(b):
            return math.isnan(a) and math.isnan(b)
        if math.isinf(a) or math.isinf(b):  # "inf -> inf" is no change; inf -> 3 is one
            return a == b
        if self.kind == "qty":
            tol = max(QTY_REL_TOL * max(abs(a), abs(b)), QTY_ABS_TOL)
        else:
            tol = INCH_TOL_IN if self.kind == "in" else LENGTH_TOL_FT
        return abs(a - b) <= tol


FIELDS: tuple[Field, ...] = (
    *(Field(n, "extent", "ft") for n in ("station_start_ft", "station_end_ft", "length_ft")),
    Field("retained_height_max_ft", "height", "ft"),
    *(Field(n, "elevation", "ft")
      for n in ("top_of_wall_ft", "top_of_footing_ft", "bottom_of_footing_ft")),
    Field("stem_top_in", "dimension", "in"),
    Field("stem_base_in", "dimension", "in"),
    Field("footing_thickness_in", "dimension", "in"),
    Field("toe_ft", "dimension", "ft"),
    Field("heel_ft", "dimension", "ft"),
    Field("footing_width_ft", "dimension", "ft"),
    Field("key_width_in", "dimension", "in"),
    Field("key_depth_in", "dimension", "in"),
    Field("key_offset_ft", "dimension", "ft"),
    *(Field(n, "bars", "bar")
      for n in ("stem_bars", "heel_bars", "toe_bars", "horizontal_bars")),
    Field("concrete_cy", "quantity", "qty"),
    Field("steel_lb", "quantity", "qty"),
    Field("mark", "mark", "text"),
    Field("status", "status", "text"),
)
REQUIRED_COLUMNS = ("wall", "segment", "station_start_ft", "station_end_ft")
QUANTITIES = ("concrete_cy", "steel_lb")


def as_number(v) -> float:
    if v is None or isinstance(v, str):
        try:
            return float(v) if v not in (None, "") else math.nan
        except ValueError:
            return math.nan
    return float(v)


def as_text(v, kind: str = "text") -> str:
    if v is None or (isinstance(v, float) and math.isnan(v)):
        return ""
    s = " ".join(str(v).split())
    if kind == "bar":
        s = s.replace(" ", "")
        m = _BAR.match(s)
        if m:
            s = f"#{int(m.group(1))}@{float(m.group(2)):g}{m.group(3)}"
    return s


def field_value(v, f: Field):
    """The value as it goes into a row: float (NaN for blank) or text."""
    return as_number(v) if f.kind in ("ft", "in", "qty") else as_text(v, f.kind)


def is_blank(v) -> bool:
    return v == "" or (isinstance(v, float) and math.isnan(v))


# ---------------------------------------------------------------- reading run folders


@dataclass(frozen=True, eq=False)
class RunTables:
    """The tables of one run folder: ``schedule`` and (when present) ``stations``."""

    schedule: pd.DataFrame
    stations: pd.DataFrame | None
    folder: Path | None = None

    @classmethod
    def from_frames(cls, schedule, stations=None, folder: Path | None = None) -> RunTables:
        """Tables held in memory (e.g. a run just designed), checked as if read from files."""
        return cls(check_schedule(schedule),
                   None if stations is None else check_stations(stations), folder)


def read_csv(path: Path, text_columns: Sequence[str], key_columns: Sequence[str]):
    """Read a run table; note lines are skipped (see :func:`read_schedule`).

    The frame gets a column ``source_line``: the line number of each row in the file.
    """
    import io

    import pandas as pd

    try:
        text = path.read_text(encoding="utf-8-sig")
    except UnicodeDecodeError:
        raise InputError("is not UTF-8 text", file=path) from None
    except OSError as exc:
        raise InputError(f"cannot be read ({exc.strerror})", file=path) from None
    kept = [(n, line) for n, line in enumerate(text.splitlines(), 1)
            if line.strip() and not line.lstrip().lstrip('"').startswith("#")]
    if not kept:
        raise InputError("is empty; expected a header line and one row per item", file=path)
    try:
        frame = pd.read_csv(io.StringIO("\n".join(line for _, line in kept)),
                            dtype={c: str for c in text_columns}, keep_default_na=False,
                            na_values=[""], skipinitialspace=True, skip_blank_lines=False)
    except (pd.errors.ParserError, pd.errors.EmptyDataError, ValueError) as exc:
        msg = " ".join(str(exc).split())
        raise InputError(f"is not a readable CSV table ({msg})", file=path) from None
    frame.columns = [str(c).strip() for c in frame.columns]
    if len(frame) == len(kept) - 1:
        frame["source_line"] = [n for n, _ in kept[1:]]
    else:  # a quoted field over several lines: count rows instead
        frame["source_line"] = np.arange(len(frame)) + 2
    keys = [c for c in key_columns if c in frame.columns]
    if keys:  # a text line (e.g. a footer) with none of the key columns is not a row
        blank = frame[keys].isna() | (frame[keys].astype(str).apply(lambda c: c.str.strip())
                                      == "")
        frame = frame[~blank.all(axis=1)].reset_index(drop=True)
    return frame


def numeric_column(frame, column: str, path: Path):
    import pandas as pd

    raw = frame[column]
    values = pd.to_numeric(raw, errors="coerce")
    bad = values.isna() & raw.notna() & (raw.astype(str).str.strip() != "")
    if bad.any():
        i = int(np.flatnonzero(bad.to_numpy())[0])
        raise InputError(f"{column} must be a number, got {raw.iloc[i]!r}", file=path,
                         where=f"line {frame['source_line'].iloc[i]}")
    return values.astype(float)


SCHEDULE_TEXT = ("wall", "segment", *(f.name for f in FIELDS if f.kind in ("bar", "text")))


def read_schedule(path: Path):
    """Read and check a ``schedule.csv``; raises InputError naming the file and line."""
    frame = read_csv(path, SCHEDULE_TEXT, ["segment", "station_start_ft", "station_end_ft"])
    return check_schedule(frame, path)


def check_schedule(frame, path: Path | str = "schedule.csv"):
    """Check and normalize a schedule frame (as read, or as the pipeline holds it in memory).

    Numbers become floats (blank = NaN), text is stripped (blank = ""); returns a new frame.
    """
    frame = frame.copy()
    text = SCHEDULE_TEXT
    if "source_line" not in frame.columns:
        frame["source_line"] = np.arange(len(frame)) + 2
    missing = [c for c in REQUIRED_COLUMNS if c not in frame.columns]
    if missing:
        raise InputError(f"missing column(s) {', '.join(missing)}; not a wall schedule written "
                         "by wallsched design", file=path, where="line 1")
    numeric = [f.name for f in FIELDS if f.kind in ("ft", "in", "qty")] + list(COST_COLUMNS)
    for c in numeric:
        if c in frame.columns:
            frame[c] = numeric_column(frame, c, path)
    for c in text:
        if c in frame.columns:
            frame[c] = frame[c].fillna("").astype(str).str.strip()
    for row in frame.itertuples(index=False):
        where = f"line {row.source_line}"
        if not row.wall or not row.segment:
            raise InputError("wall and segment must not be blank", file=path, where=where)
        s, e = row.station_start_ft, row.station_end_ft
        if not (math.isfinite(s) and math.isfinite(e)):
            raise InputError("station_start_ft and station_end_ft must be given", file=path,
                             where=where)
        if e < s:
            raise InputError(f"station_end_ft {e:g} is before station_start_ft {s:g}",
                             file=path, where=where)
    dup = frame.duplicated(["wall", "segment"])
    if dup.any():
        i = int(np.flatnonzero(dup.to_numpy())[0])
        raise InputError(f"segment {frame['segment'].iloc[i]!r} of wall "
                         f"{frame['wall'].iloc[i]!r} appears twice", file=path,
                         where=f"line {frame['source_line'].iloc[i]}")
    return frame


def read_stations(path: Path):
    """Read and check a ``stations.csv`` (wall, station_ft, retained_height_ft; rest ignored)."""
    return check_stations(read_csv(path, ["wall", "station", "note"], ["station_ft"]), path)


def check_stations(frame, path: Path | str = "stations.csv"):
    """Check a stations frame; returns ``wall, station_ft, retained_height_ft``."""
    frame = frame.copy()
    if "source_line" not in frame.columns:
        frame["source_line"] = np.arange(len(frame)) + 2
    if "retained_height_ft" not in frame.columns and {
            "retained_grade_ft", "front_grade_ft"} <= set(frame.columns):
        frame["retained_height_ft"] = (numeric_column(frame, "retained_grade_ft", path)
                                       - numeric_column(frame, "front_grade_ft", path))
    missing = [c for c in ("wall", "station_ft", "retained_height_ft") if c not in frame.columns]
    if missing:
        raise InputError(f"missing column(s) {', '.join(missing)}; not a stations table "
                         "written by wallsched", file=path, where="line 1")
    frame["wall"] = frame["wall"].fillna("").astype(str).str.strip()
    for c in ("station_ft", "retained_height_ft"):
        frame[c] = numeric_column(frame, c, path)
        bad = ~np.isfinite(frame[c].to_numpy())
        if bad.any():
            i = int(np.flatnonzero(bad)[0])
            raise InputError(f"{c} must be given", file=path,
                             where=f"line {frame['source_line'].iloc[i]}")
    return frame[["wall", "station_ft", "retained_height_ft"]]


def read_run(folder: Path) -> RunTables:
    """Read a run folder (``schedule.csv`` required, ``stations.csv`` optional)."""
    folder = Path(folder)
    if not folder.is_dir():
        what = "does not exist" if not folder.exists() else "is a file"
        raise InputError(f"{what}; give a run folder written by wallsched design --out",
                         file=folder)
    sched = folder / "schedule.csv"
    if not sched.is_file():
        raise InputError("is not a run folder (no schedule.csv); give a folder written by "
                         "wallsched design --out", file=folder)
    st = folder / "stations.csv"
    stations = read_stations(st) if st.is_file() else None
    return RunTables(read_schedule(sched), stations, folder)
