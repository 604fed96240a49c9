"""The wall schedule (``schedule.csv``, ``schedule.xlsx``), the designed ``stations.csv`` and the
run record (``run.json``): tables of what the engine designed, as-is."""

from __future__ import annotations

import json
import math
from pathlib import Path

import numpy as np
import pandas as pd

from ..cautions import CAUTIONS
from ..profile.stationing import format_station
from .tables import write_csv

SCHEDULE_COLUMNS = [  # DESIGN.md section 5, in this order
    "wall", "segment", "station_start_ft", "station_end_ft", "length_ft",
    "retained_height_max_ft", "top_of_wall_ft", "top_of_footing_ft", "bottom_of_footing_ft",
    "stem_top_in", "stem_base_in", "footing_thickness_in", "toe_ft", "heel_ft",
    "footing_width_ft", "key_width_in", "key_depth_in", "key_offset_ft", "stem_bars",
    "heel_bars", "toe_bars", "horizontal_bars", "fs_overturning", "fs_sliding", "q_max_psf",
    "utilization_max", "concrete_cy", "steel_lb", "status",
]
EXTRA_COLUMNS = ["station_start", "station_end", "mark", "design_height_ft", "governing_check",
                 "governing_station", "footing_long_bars", "formwork_sf", "excavation_cy",
                 "backfill_cy", "cost_usd", "governing_ratio", "detailing_at_limit",
                 "warnings", "earthwork_note"]
UNITS = {
    "station_start_ft": "ft", "station_end_ft": "ft", "length_ft": "ft",
    "retained_height_max_ft": "ft", "top_of_wall_ft": "ft (elev.)",
    "top_of_footing_ft": "ft (elev.)", "bottom_of_footing_ft": "ft (elev.)", "stem_top_in": "in",
    "stem_base_in": "in", "footing_thickness_in": "in", "toe_ft": "ft", "heel_ft": "ft",
    "footing_width_ft": "ft", "key_width_in": "in", "key_depth_in": "in", "key_offset_ft": "ft",
    "q_max_psf": "psf", "concrete_cy": "CY", "steel_lb": "lb", "design_height_ft": "ft",
    "formwork_sf": "SF", "excavation_cy": "CY", "backfill_cy": "CY", "cost_usd": "$",
}


def _bar(b) -> str:
    return "" if b is None else str(b)


def wall_warnings(wall: str, warnings) -> str:
    """The warning lines that name ``wall`` (the guard rails name walls as ``wall 'W1'``)."""
    import re

    pat = re.compile(rf"(?<![\w-]){re.escape(repr(wall))}(?![\w-])")
    return "; ".join(w for w in warnings if pat.search(w))


def schedule_frame(walls, warnings=()) -> pd.DataFrame:
    """One row per segment of every wall; ``warnings`` (guard rails, readers) go to the
    ``warnings`` column of the wall they name (the status stays ``ok`` for a passing
    segment)."""
    rows = []
    for w in walls:
        wall_warn = wall_warnings(w.wall, warnings)
        notes = {}
        if w.quantities is not None and "earthwork_note" in w.quantities.columns:
            notes = dict(zip(w.quantities["segment"], w.quantities["earthwork_note"],
                             strict=True))
        for s in w.segments:
            sec = s.section
            dims = {k: (getattr(sec, k) if sec is not None else math.nan) for k in (
                "stem_top_in", "stem_base_in", "footing_thickness_in", "toe_ft", "heel_ft",
                "key_width_in", "key_depth_in", "key_offset_ft")}
            if sec is not None and not sec.has_key:
                dims["key_offset_ft"] = 0.0
            rows.append({
                "wall": s.wall, "segment": s.segment, "station_start_ft": s.station_start_ft,
                "station_end_ft": s.station_end_ft, "length_ft": s.length_ft,
                "retained_height_max_ft": s.retained_height_max_ft,
                "top_of_wall_ft": s.top_of_wall_ft, "top_of_footing_ft": s.top_of_footing_ft,
                "bottom_of_footing_ft": s.bottom_of_footing_ft, **dims,
                "footing_width_ft": sec.footing_width_ft if sec is not None else math.nan,
                "stem_bars": _bar(sec and sec.stem_bars), "heel_bars": _bar(sec and sec.heel_bars),
                "toe_bars": _bar(sec and sec.toe_bars),
                "horizontal_bars": _bar(sec and sec.horizontal_bars),
                "fs_overturning": s.fs_overturning, "fs_sliding": s.fs_sliding,
                "q_max_psf": s.q_max_psf, "utilization_max": s.utilization_max,
                "concrete_cy": s.concrete_cy, "steel_lb": s.steel_lb, "status": s.status,
                "station_start": format_station(s.station_start_ft),
                "station_end": format_station(s.station_end_ft), "mark": s.mark,
                "design_height_ft": s.design_height_ft, "governing_check": s.governing_check,
                "governing_ratio": s.governing_ratio,
                "detailing_at_limit": s.detailing_at_limit,
                "governing_station": (format_station(s.governing_station_ft)
                                      if math.isfinite(s.governing_station_ft) else ""),
                "footing_long_bars": _bar(sec and sec.footing_long_bars),
                "formwork_sf": s.formwork_sf, "excavation_cy": s.excavation_cy,
                "backfill_cy": s.backfill_cy, "cost_usd": s.cost_usd, "warnings": wall_warn,
                "earthwork_note": notes.get(s.segment, ""),
            })
    return pd.DataFrame(rows, columns=SCHEDULE_COLUMNS + EXTRA_COLUMNS)


def stations_frame(walls) -> pd.DataFrame:
    """``stations.csv`` of the design: the sampled stations plus segment, section mark,
    utilisation and governing check per station."""
    frames = []
    for w in walls:
        f = w.stations.to_frame()
        idx = w.station_segment
        seg_ids = np.array([s.segment for s in w.segments] + [""], dtype=object)
        marks = np.array([s.mark for s in w.segments] + [""], dtype=object)
        f["segment"] = seg_ids[idx]
        f["mark"] = marks[idx]
        # the segment's footing and top of wall at each station, for re-checks by station
        bf = np.array([s.bottom_of_footing_ft for s in w.segments] + [np.nan])[idx]
        tw_seg = np.array([s.top_of_wall_ft for s in w.segments] + [np.nan])[idx]
        fb = np.array([(s.top_of_wall_start_ft - w.stations.retained_grade_ft[
            int(np.argmin(np.abs(w.stations.station_ft - s.station_start_ft)))])
            if s.top_of_wall_ft != s.top_of_wall_ft else np.nan
            for s in w.segments] + [np.nan])[idx]
        tw = np.where(np.isfinite(tw_seg), tw_seg, w.stations.retained_grade_ft + fb)
        f["top_of_wall_ft"] = np.where(idx >= 0, tw, np.nan)
        f["bottom_of_footing_ft"] = np.where(idx >= 0, bf, np.nan)
        f["embedment_ft"] = f["front_grade_ft"] - f["bottom_of_footing_ft"]
        f["utilization"] = w.station_utilization
        f["governing_check"] = list(w.station_governing)
        f["status"] = list(w.station_status)
        frames.append(f)
    return pd.concat(frames, ignore_index=True)


def write_schedule(walls, out: Path, warnings=()) -> pd.DataFrame:
    frame = schedule_frame(walls, warnings)
    write_csv(frame, out / "schedule.csv")
    return frame


def write_xlsx(schedule: pd.DataFrame, bars: pd.DataFrame, quantities: pd.DataFrame | None,
               path: Path, site_name: str, *, barlist: pd.DataFrame | None = None) -> None:
    """The schedule (and bar list, quantities) as a workbook formatted for printing: units in
    the header row, the cautions in the page footer and below the table.

    Written row by row (openpyxl's write-only workbook: the rows are streamed, not kept as
    cells): a sheet's title in row 1, the header with units in row 2, the rows from row 3,
    one empty row, then the cautions; an empty value (NaN, None) is an empty cell."""
    from openpyxl import Workbook

    sheets = [("schedule", schedule), ("bar list", bars)]
    if barlist is not None:
        sheets.append(("bending schedule", barlist))
    if quantities is not None:
        sheets.append(("quantities", quantities))
    wb = Workbook(write_only=True)
    for name, frame in sheets:
        _sheet(wb.create_sheet(name), frame, f"{site_name} - {name}")
    wb.save(path)
    _fix_workbook_times(path)


def _sheet(ws, frame: pd.DataFrame, title: str) -> None:
    from openpyxl.cell import WriteOnlyCell
    from openpyxl.styles import Alignment, Font
    from openpyxl.utils import get_column_letter

    def cell(value, **style):
        c = WriteOnlyCell(ws, value=value)
        for k, v in style.items():
            setattr(c, k, v)
        return c

    for j, col in enumerate(frame.columns, 1):
        ws.column_dimensions[get_column_letter(j)].width = max(9, min(24, len(col) + 2))
    ws.print_title_rows = "2:2"
    ws.page_setup.orientation = "landscape"
    ws.page_setup.fitToWidth = 1
    ws.page_setup.fitToHeight = 0
    ws.sheet_properties.pageSetUpPr.fitToPage = True
    ws.oddFooter.left.text = CAUTIONS[0] + " " + CAUTIONS[2]
    ws.oddFooter.left.size = 7
    ws.oddFooter.right.text = "page &P of &N"
    ws.freeze_panes = "C3"
    bold, head = Font(bold=True), Alignment(wrap_text=True, vertical="top")
    ws.append([cell(title, font=bold)])
    ws.append([cell(f"{col} [{UNITS[col]}]" if UNITS.get(col) else col, font=bold,
                    alignment=head) for col in frame.columns])
    for row in zip(*(_cell_values(frame[c]) for c in frame.columns), strict=True):
        ws.append(row)
    ws.append([])
    small = Font(italic=True, size=8)
    for line in CAUTIONS:
        ws.append([cell(line, font=small)])


def _cell_values(col: pd.Series) -> list:
    """A column as plain Python values, None where it is empty (NaN, None, NA)."""
    values = col.tolist()
    if isinstance(col.dtype, np.dtype) and col.dtype.kind in "iub":  # never empty
        return values
    empty = col.isna().to_numpy()
    if empty.any():
        values = [None if e else v for v, e in zip(values, empty, strict=True)]
    return values


def _fix_workbook_times(path: Path) -> None:
    """Rewrite the workbook's document properties with a fixed time (reproducible bytes)."""
    import zipfile

    fixed = (1980, 1, 1, 0, 0, 0)
    with zipfile.ZipFile(path) as zin:
        items = [(i, zin.read(i.filename)) for i in zin.infolist()]
    tmp = path.with_suffix(".tmp")
    with zipfile.ZipFile(tmp, "w", zipfile.ZIP_DEFLATED) as zout:
        for info, data in items:
            if info.filename == "docProps/core.xml":
                import re

                data = re.sub(rb"<dcterms:(created|modified)([^>]*)>[^<]*<",
                              rb"<dcterms:\1\2>2000-01-01T00:00:00Z<", data)
            zi = zipfile.ZipInfo(info.filename, date_time=fixed)
            zi.compress_type = zipfile.ZIP_DEFLATED
            zout.writestr(zi, data)
    tmp.replace(path)


def _jsonable(v):
    if isinstance(v, float | np.floating):
        v = float(v)
        return v if math.isfinite(v) else None
    if isinstance(v, np.integer):
        return int(v)
    if isinstance(v, np.bool_):
        return bool(v)
    return v


def run_record(run, sd, schedule: pd.DataFrame) -> dict:
    """Inputs with hashes, the resolved criteria, versions, every segment's full design
    (``run``: the :class:`~.run_info.RunInfo`, ``sd``: the engine's ``SiteDesign``)."""
    import platform
    from importlib import metadata

    versions = {"wallsched": run.version, "python": platform.python_version()}
    for lib in ("numpy", "pandas", "shapely", "ezdxf", "matplotlib", "click", "geopandas",
                "openpyxl"):
        try:
            versions[lib] = metadata.version(lib)
        except metadata.PackageNotFoundError:
            versions[lib] = None
    walls = []
    for wall_id, w in zip(run.wall_ids, sd.walls, strict=True):
        tables = run.wall_tables[wall_id]
        segs = schedule[schedule["wall"] == w.wall].to_dict(orient="records")
        walls.append({
            "id": w.wall, "name": w.name, "retained_side": w.retained_side,
            "soil": dict(tables["soil"]), "loads": dict(tables["loads"]),
            "materials": dict(tables["materials"]), "criteria": dict(tables["criteria"]),
            "joints": [{"station_ft": j.station_ft, "kind": j.kind} for j in w.joints],
            "audit": {"stations_checked": w.stations_checked,
                      "stations_audited": w.stations_audited,
                      "rule": sd.audit_rule},
            "marks": sorted({s.mark for s in w.segments if s.mark}),
            # the segments' objective with at most marks_max marks, and the least cost with
            # every section of the design table (no mark rule)
            "plan_cost_usd": w.plan_cost_usd, "least_cost_usd": w.least_cost_usd,
            "segments": [{k: _jsonable(v) for k, v in s.items()} for s in segs],
        })
    return {
        "site": dict(run.meta), "cautions": list(run.cautions),
        "inputs": dict(run.input_hashes), "versions": versions,
        "costs": dict(run.costs), "sizing": dict(run.sizing),
        "passes": bool(sd.ok), "warnings": list(sd.warnings), "walls": walls,
    }


def write_run_json(record: dict, path: Path) -> None:
    def clean(o):
        if isinstance(o, dict):
            return {k: clean(v) for k, v in o.items()}
        if isinstance(o, list | tuple):
            return [clean(v) for v in o]
        return _jsonable(o)

    path.write_text(json.dumps(clean(record), indent=2, sort_keys=False, allow_nan=False) + "\n")
