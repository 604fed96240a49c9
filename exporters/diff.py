"""``diff.csv``: the comparison of two run folders (``exporters/compare.py``, where the rules
are) written as rows ``wall, change, segment_old, segment_new, station_start_ft,
station_end_ft, field, old, new``. The names of the comparison are re-exported here for the
callers that read a diff and write it in one place.
"""

from __future__ import annotations

from pathlib import Path

from .compare import (
    DIFF_COLUMNS,
    LENGTH_TOL_FT,
    RunDiff,
    RunTables,
    diff_runs,
    diff_tables,
    format_value,
    height_change_ranges,
    read_run,
)

__all__ = ["DIFF_COLUMNS", "LENGTH_TOL_FT", "RunDiff", "RunTables", "diff_frame", "diff_runs",
           "diff_tables", "height_change_ranges", "read_run", "write_diff"]


def diff_frame(diff: RunDiff):
    """The rows as text, exactly as ``diff.csv`` holds them."""
    out = diff.rows.copy()
    for c in ("station_start_ft", "station_end_ft"):
        out[c] = [f"{float(v):.4f}" for v in out[c]]
    for c in ("old", "new"):
        out[c] = [format_value(v) for v in out[c]]
    return out[list(DIFF_COLUMNS)]


def write_diff(diff: RunDiff, path: Path) -> Path:
    """Write ``diff.csv`` (header only when nothing changed) atomically; returns the path."""
    path = Path(path)
    tmp = path.with_name(f".{path.name}.tmp")
    try:
        diff_frame(diff).to_csv(tmp, index=False, lineterminator="\n")
        tmp.replace(path)
    except BaseException:
        tmp.unlink(missing_ok=True)
        raise
    return path
