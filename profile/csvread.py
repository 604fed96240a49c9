"""Readers for the two CSV forms: grade profiles (station, elevation) and alignments (x, y).

Every problem names the file and the line. Blank lines and lines starting with ``#`` are
skipped. A UTF-8 byte-order mark is accepted (spreadsheets write one); UTF-16 text (what some
spreadsheets call "Unicode text") is refused with a hint to save as UTF-8.

Limits (stated in the README): a CSV file may hold at most ``MAX_CSV_BYTES`` bytes and
``MAX_CSV_ROWS`` data rows; a profile or alignment at most ``MAX_PROFILE_POINTS`` points;
plan coordinates, stations and elevations at most ``MAX_COORDINATE_FT`` in size; adjacent points
of a grade may not differ by more than ``GRADE_JUMP_MAX_FT`` at a slope steeper than
``GRADE_JUMP_SLOPE`` (a value typed in metres, or a missing value written as 0).
"""

from __future__ import annotations

import csv
import math
from pathlib import Path

import numpy as np
import shapely

from ..errors import ProfileError
from .core import Alignment, GradeProfile, checked_stat
from .stationing import parse_station

MAX_CSV_BYTES = 20 * 1024 * 1024  # refuse larger files (stated in the README)
MAX_CSV_ROWS = 100_000  # data rows of one CSV (stated in the README)
MAX_PROFILE_POINTS = 100_000  # points of one profile or alignment, from any reader
MAX_COORDINATE_FT = 1e9  # |x|, |y|, |station|, |elevation|: larger is not a site in feet
MAX_LINE_CHARS = 4000  # one CSV line
GRADE_JUMP_MAX_FT = 10.0  # a grade may not jump more than this between adjacent points ...
GRADE_JUMP_SLOPE = 1.0  # ... at a slope steeper than 1 vertical : 1 horizontal
# an alignment may not come within FOLD_NEAR_FT of a part of itself more than FOLD_ALONG_FT
# away along it (a doubled line or a hairpin: a wall's footing is feet wide; common practice)
FOLD_NEAR_FT = 1.0
FOLD_ALONG_FT = 5.0

STATION_NAMES = ("station", "sta", "station_ft", "sta_ft", "stationing")
ELEVATION_NAMES = ("elevation", "elev", "elevation_ft", "elev_ft", "z")
X_NAMES = ("x", "easting", "x_ft")
Y_NAMES = ("y", "northing", "y_ft")


def _read_rows(path: Path, label: str):
    checked_stat(path, label, MAX_CSV_BYTES, "a CSV")
    try:
        raw = path.read_bytes()
    except OSError as exc:
        raise ProfileError(f"cannot be read ({exc.strerror})", file=label) from None
    if raw.startswith((b"\xff\xfe", b"\xfe\xff")):
        raise ProfileError("is UTF-16 text; save it as CSV UTF-8 (comma delimited)", file=label)
    if b"\x00" in raw:
        line = raw[:raw.index(b"\x00")].count(b"\n") + 1
        raise ProfileError("is not a text CSV file (binary content: a NUL byte); save it as "
                           "CSV UTF-8 text", file=label, where=f"line {line}")
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        raise ProfileError(f"is not UTF-8 text (byte {exc.start}); save it as UTF-8 CSV",
                           file=label) from None
    physical = text.replace("\r\n", "\n").replace("\r", "\n").split("\n")
    lines = [(i, line) for i, line in enumerate(physical, 1)
             if line.strip() and not line.lstrip().startswith("#")]
    if not lines:
        raise ProfileError("is empty; it needs a header row and at least two data rows",
                           file=label)
    if len(lines) > MAX_CSV_ROWS + 1:
        raise ProfileError(f"has {len(lines) - 1:,} data rows; the limit is {MAX_CSV_ROWS:,} - "
                           "thin the profile (a vertex every few feet is plenty)", file=label)
    head_no, head = lines[0]
    if ";" in head and "," not in head:
        raise ProfileError("uses ';' between columns; save it with commas as separators "
                           "(and '.' as the decimal mark)", file=label, where=f"line {head_no}")
    if "\t" in head and "," not in head:
        raise ProfileError("uses tabs between columns; save it with commas as separators",
                           file=label, where=f"line {head_no}")
    for line_no, line in lines:
        if len(line) > MAX_LINE_CHARS:
            raise ProfileError(f"the line is {len(line):,} characters long; a profile row holds "
                               "a few numbers", file=label, where=f"line {line_no}")
        if line.count('"') % 2:
            raise ProfileError("has an unclosed quote (\"); remove the quote mark", file=label,
                               where=f"line {line_no}")
    try:  # one row per line: no quoted field spans lines (checked above)
        rows = list(csv.reader([line for _, line in lines]))
    except csv.Error as exc:
        raise ProfileError(f"is not a readable CSV file ({exc})", file=label) from None
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
        if "_" in cell:  # float() reads "10_3.5" as 103.5: a typing error, not a number
            raise ValueError(cell)
        value = float(cell)
    except ValueError:
        raise ProfileError(f"{column} {cell.strip()!r} is not a number", file=label,
                           where=f"line {line}") from None
    if not math.isfinite(value):
        raise ProfileError(f"{column} {cell.strip()!r} is not a finite number", file=label,
                           where=f"line {line}")
    if abs(value) > MAX_COORDINATE_FT:
        raise ProfileError(f"{column} {cell.strip()!r} is out of range (more than "
                           f"{MAX_COORDINATE_FT:.0e} ft); check the column and the units",
                           file=label, where=f"line {line}")
    return value


def _cells(numbered, cols: dict[str, int], label: str):
    width = len(numbered[0][1])
    for line, row in numbered[1:]:
        if len(row) <= max(cols.values()):
            raise ProfileError(f"has {len(row)} value(s); expected at least "
                               f"{max(cols.values()) + 1}", file=label, where=f"line {line}")
        if any(c.strip() for c in row[width:]):
            raise ProfileError(f"has {len(row)} values but the header has {width} columns (a "
                               "decimal comma?); use '.' as the decimal mark", file=label,
                               where=f"line {line}")
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
        if abs(s) > MAX_COORDINATE_FT:
            raise ProfileError(f"station {cell.strip()!r} is out of range (more than "
                               f"{MAX_COORDINATE_FT:.0e} ft)", file=label, where=f"line {line}")
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
        ln = ln[keep]
    if st.size < 2:
        raise ProfileError("has only one distinct station; a profile needs at least two",
                           file=label)
    k = grade_jump(st, el)
    if k is not None:
        raise ProfileError(
            f"the elevation jumps from {el[k]:g} (line {ln[k]}) to {el[k + 1]:g} over "
            f"{st[k + 1] - st[k]:.2f} ft of station; {jump_limit_text()} - check for a value "
            "in metres, a typing error or a missing value", file=label,
            where=f"line {ln[k + 1]}")
    return GradeProfile(st.astype(float), el.astype(float), label)


def jump_limit_text() -> str:
    return (f"a grade may not change by more than {GRADE_JUMP_MAX_FT:g} ft between adjacent "
            f"points at a slope steeper than {GRADE_JUMP_SLOPE:g}:1 (vertical:horizontal)")


def grade_jump(st: np.ndarray, el: np.ndarray) -> int | None:
    """Index ``k`` of the first implausible jump from point ``k`` to ``k + 1``, or None."""
    dz = np.abs(np.diff(el))
    ds = np.diff(st)
    bad = np.nonzero((dz > GRADE_JUMP_MAX_FT) & (dz > GRADE_JUMP_SLOPE * ds))[0]
    return int(bad[0]) if bad.size else None


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
    if len(xy) > MAX_PROFILE_POINTS:
        raise ProfileError(f"the alignment has {len(xy):,} vertices; the limit is "
                           f"{MAX_PROFILE_POINTS:,} - simplify the line", file=label)
    if not np.isfinite(xy).all() or np.abs(xy).max() > MAX_COORDINATE_FT:
        raise ProfileError(f"the alignment has a coordinate beyond {MAX_COORDINATE_FT:.0e} ft "
                           "(or not a number); check the units and the coordinate columns",
                           file=label)
    line = shapely.LineString(xy)
    if line.length <= 0.01:
        raise ProfileError(f"the alignment is only {line.length:.3f} ft long", file=label)
    if not line.is_simple:
        raise ProfileError("the alignment crosses itself; a wall alignment must not "
                           "self-intersect (check the vertex order)", file=label)
    fold = fold_back(xy)
    if fold is not None:
        (x, y), gap, along = fold
        raise ProfileError(f"the alignment folds back on itself: at ({x:.2f}, {y:.2f}) it "
                           f"passes {gap:.3f} ft from its own line {along:.1f} ft farther "
                           "along; a wall alignment may not overlap itself (check for a "
                           "doubled line or the vertex order)", file=label)
    return Alignment(line, label)


def fold_back(xy: np.ndarray, near_ft: float = FOLD_NEAR_FT, along_ft: float = FOLD_ALONG_FT):
    """Where a (simple) polyline comes within ``near_ft`` of itself at a part more than
    ``along_ft`` away along it: ((x, y), plan distance, distance along) or None.

    Two segments that do not intersect are closest at an end of one of them, so testing every
    vertex against every segment finds the closest approach of any two parts."""
    seg = np.diff(xy, axis=0)
    seg_len = np.hypot(*seg.T)
    s0 = np.r_[0.0, np.cumsum(seg_len)]  # distance along at each vertex
    lines = shapely.linestrings(np.stack([xy[:-1], xy[1:]], axis=1))
    tree = shapely.STRtree(lines)
    v_idx, s_idx = tree.query(shapely.points(xy), predicate="dwithin", distance=near_ft)
    if v_idx.size == 0:
        return None
    p, a = xy[v_idx], xy[s_idx]
    d = seg[s_idx]
    t = np.clip(np.einsum("ij,ij->i", p - a, d) / np.maximum(seg_len[s_idx] ** 2, 1e-300), 0, 1)
    along = np.abs(s0[v_idx] - (s0[s_idx] + t * seg_len[s_idx]))
    gap = np.hypot(*(a + t[:, None] * d - p).T)
    bad = np.nonzero(along > along_ft)[0]
    if bad.size == 0:
        return None
    k = bad[np.argmin(gap[bad])]
    return (float(p[k, 0]), float(p[k, 1])), float(gap[k]), float(along[k])
