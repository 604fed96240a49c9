"""Readers for the two CSV forms: grade profiles (station, elevation) and alignments (x, y).

Every problem names the file and the line. Blank lines and lines starting with ``#`` are
skipped. A UTF-8 byte-order mark is accepted (spreadsheets write one).
"""

from __future__ import annotations

import csv
import io
import math
from dataclasses import dataclass
from pathlib import Path

import numpy as np
import shapely

from ..errors import ProfileError
from .stationing import parse_station

MAX_CSV_BYTES = 200 * 1024 * 1024  # refuse larger files (stated in the README)
MAX_CSV_ROWS = 2_000_000

STATION_NAMES = ("station", "sta", "station_ft", "sta_ft", "stationing")
ELEVATION_NAMES = ("elevation", "elev", "elevation_ft", "elev_ft", "z")
X_NAMES = ("x", "easting", "x_ft")
Y_NAMES = ("y", "northing", "y_ft")


@dataclass(frozen=True)
class GradeProfile:
    """A piecewise-linear profile: elevation (ft) against station (ft), stations increasing."""

    station_ft: np.ndarray
    elevation_ft: np.ndarray
    label: str  # file (and layer) for messages

    def at(self, station_ft) -> np.ndarray:
        return np.interp(station_ft, self.station_ft, self.elevation_ft)


@dataclass(frozen=True)
class Alignment:
    """A wall alignment in plan: a shapely LineString, vertices in up-station order."""

    line: shapely.LineString
    label: str

    @property
    def length_ft(self) -> float:
        return float(self.line.length)


def _read_rows(path: Path, label: str):
    try:
        size = path.stat().st_size
    except OSError as exc:
        raise ProfileError(f"cannot be read ({exc.strerror})", file=label) from None
    if size > MAX_CSV_BYTES:
        raise ProfileError(f"is {size / 2**20:.0f} MiB; the limit for a CSV is "
                           f"{MAX_CSV_BYTES // 2**20} MiB", file=label)
    raw = path.read_bytes()
    if b"\x00" in raw[:65536]:
        raise ProfileError("is not a text CSV file (binary content)", file=label)
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        raise ProfileError(f"is not UTF-8 text (byte {exc.start}); save it as UTF-8 CSV",
                           file=label) from None
    lines = [(i, line) for i, line in enumerate(text.splitlines(), 1)
             if line.strip() and not line.lstrip().startswith("#")]
    if not lines:
        raise ProfileError("is empty; it needs a header row and at least two data rows",
                           file=label)
    if len(lines) > MAX_CSV_ROWS:
        raise ProfileError(f"has {len(lines):,} rows; the limit is {MAX_CSV_ROWS:,}", file=label)
    head_no, head = lines[0]
    if ";" in head and "," not in head:
        raise ProfileError("uses ';' between columns; save it with commas as separators "
                           "(and '.' as the decimal mark)", file=label, where=f"line {head_no}")
    if "\t" in head and "," not in head:
        raise ProfileError("uses tabs between columns; save it with commas as separators",
                           file=label, where=f"line {head_no}")
    reader = csv.reader(io.StringIO("\n".join(line for _, line in lines)))
    rows = list(reader)
    numbered = [(lines[k][0], row) for k, row in enumerate(rows)]
    return numbered


def _columns(header_no: int, header: list[str], wanted: dict[str, tuple[str, ...]], label: str):
    names = [h.strip().lower() for h in header]
    found = {}
    for key, aliases in wanted.items():
        idx = [i for i, n in enumerate(names) if n in aliases]
        if not idx:
            raise ProfileError(
                f"no '{aliases[0]}' column (header is {', '.join(h.strip() for h in header)}); "
                f"name it one of: {', '.join(aliases)}", file=label, where=f"line {header_no}")
        if len(idx) > 1:
            raise ProfileError(f"more than one '{aliases[0]}' column", file=label,
                               where=f"line {header_no}")
        found[key] = idx[0]
    return found


def _number(cell: str, *, label: str, line: int, column: str) -> float:
    try:
        value = float(cell)
    except ValueError:
        raise ProfileError(f"{column} {cell.strip()!r} is not a number", file=label,
                           where=f"line {line}") from None
    if not math.isfinite(value):
        raise ProfileError(f"{column} {cell.strip()!r} is not a finite number", file=label,
                           where=f"line {line}")
    return value


def _cells(numbered, cols: dict[str, int], label: str):
    for line, row in numbered[1:]:
        if len(row) <= max(cols.values()):
            raise ProfileError(f"has {len(row)} value(s); expected at least "
                               f"{max(cols.values()) + 1}", file=label, where=f"line {line}")
        yield line, row


def read_grade_csv(path: Path, label: str | None = None) -> GradeProfile:
    """Read a ``station,elevation`` CSV (station notation allowed in the station column).

    Rows must run in station order, up or down (a wholly reversed file is sorted); a row out
    of order, or a repeated station with another elevation, is an error naming both lines.
    """
    label = label or str(path)
    numbered = _read_rows(path, label)
    head_no, header = numbered[0]
    cols = _columns(head_no, header, {"station": STATION_NAMES, "elevation": ELEVATION_NAMES},
                    label)
    st, el, ln = [], [], []
    for line, row in _cells(numbered, cols, label):
        cell = row[cols["station"]]
        try:
            s = parse_station(cell.strip())
        except ValueError:
            raise ProfileError(f"station {cell.strip()!r} is not a station (use 1234.56 or "
                               "12+34.56)", file=label, where=f"line {line}") from None
        st.append(s)
        el.append(_number(row[cols["elevation"]], label=label, line=line, column="elevation"))
        ln.append(line)
    return _profile(np.array(st), np.array(el), np.array(ln), label)


def _profile(st: np.ndarray, el: np.ndarray, ln: np.ndarray, label: str) -> GradeProfile:
    if st.size < 2:
        raise ProfileError(f"has {st.size} data row(s); a profile needs at least two",
                           file=label)
    d = np.diff(st)
    if (d < 0).any() and (d > 0).any():
        k = int(np.nonzero(d < 0)[0][0]) if d[0] > 0 else int(np.nonzero(d > 0)[0][0])
        raise ProfileError(
            f"station {st[k + 1]:.2f} comes after {st[k]:.2f} (line {ln[k]}); rows must run "
            "in station order", file=label, where=f"line {ln[k + 1]}")
    if (d < 0).any():  # wholly descending: the file was written down-station
        st, el, ln = st[::-1], el[::-1], ln[::-1]
        d = np.diff(st)
    dup = np.nonzero(d == 0)[0]
    if dup.size:
        bad = dup[el[dup] != el[dup + 1]]
        if bad.size:
            k = int(bad[0])
            raise ProfileError(
                f"station {st[k]:.2f} is given twice with different elevations "
                f"({el[k]:g} on line {ln[k]}, {el[k + 1]:g} on line {ln[k + 1]}); "
                "keep one", file=label, where=f"line {ln[k + 1]}")
        keep = np.ones(st.size, bool)
        keep[dup + 1] = False
        st, el = st[keep], el[keep]
    if st.size < 2:
        raise ProfileError("has only one distinct station; a profile needs at least two",
                           file=label)
    return GradeProfile(st.astype(float), el.astype(float), label)


def read_alignment_csv(path: Path, label: str | None = None) -> Alignment:
    """Read an ``x,y`` CSV of plan vertices (ft) in up-station order."""
    label = label or str(path)
    numbered = _read_rows(path, label)
    head_no, header = numbered[0]
    cols = _columns(head_no, header, {"x": X_NAMES, "y": Y_NAMES}, label)
    xy, ln = [], []
    for line, row in _cells(numbered, cols, label):
        xy.append((_number(row[cols["x"]], label=label, line=line, column="x"),
                   _number(row[cols["y"]], label=label, line=line, column="y")))
        ln.append(line)
    return alignment_from_xy(np.array(xy, dtype=float).reshape(-1, 2), label)


def alignment_from_xy(xy: np.ndarray, label: str) -> Alignment:
    """Build and check an alignment: at least two distinct vertices, no self-crossing."""
    if len(xy) >= 2:
        step = np.hypot(*np.diff(xy, axis=0).T)
        xy = xy[np.r_[True, step > 1e-9]]
    if len(xy) < 2:
        raise ProfileError("the alignment has zero length (fewer than two distinct vertices)",
                           file=label)
    line = shapely.LineString(xy)
    if line.length <= 0.01:
        raise ProfileError(f"the alignment is only {line.length:.3f} ft long", file=label)
    if not line.is_simple:
        raise ProfileError("the alignment crosses itself; a wall alignment must not "
                           "self-intersect (check the vertex order)", file=label)
    return Alignment(line, label)
