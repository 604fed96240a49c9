"""Compare two run folders after a grading change: which segments changed, and by how much
(the comparison; ``exporters/diff.py`` writes it as ``diff.csv``).

The comparison reads only ``schedule.csv`` (required) and ``stations.csv`` (optional) of each
run folder (DESIGN.md section 5) and never looks at anything else; unknown columns are ignored,
and so are blank lines, lines starting with ``#`` and text lines (a footer) with no segment and
no stations. The rules, so that a person can predict the output:

Walls
    Matched by id (text, surrounding blanks ignored). A wall only in the new run has every
    segment *added*; a wall only in the old run has every segment *removed*.

Compared fields and tolerances (a numeric field changed when ``|new - old| > tol``; two blanks
are equal, a blank against a number is a change)
    - extents: ``station_start_ft, station_end_ft, length_ft`` - 0.005 ft;
    - ``retained_height_max_ft`` - 0.005 ft;
    - elevations: ``top_of_wall_ft, top_of_footing_ft, bottom_of_footing_ft`` - 0.005 ft;
    - dimensions: ``stem_top_in, stem_base_in, footing_thickness_in, key_width_in,
      key_depth_in`` - 0.01 in; ``toe_ft, heel_ft, footing_width_ft, key_offset_ft`` - 0.005 ft;
    - bars: ``stem_bars, heel_bars, toe_bars, horizontal_bars`` - as text, blanks removed and the
      spacing written without trailing zeros (``#6@12.0`` equals ``#6@12``);
    - quantities: ``concrete_cy, steel_lb`` and ``cost`` (or ``cost_usd``) when both runs have
      it - relative 1e-6 of the larger value, but never finer than 0.001 (the schedule is
      written to four decimals);
    - ``status`` - exact text.

    Factors of safety, bearing pressure and utilization (``fs_*``, ``q_max_psf``,
    ``utilization_max``) are not compared: they follow from the fields above, and a change in
    them alone leaves nothing for the drafter or the estimator to redo. A change of ``status``
    (e.g. a segment that now fails) is reported. The segment id is not a compared field either:
    a segment renumbered but otherwise identical is unchanged.

Segments (within one wall)
    1. A new segment whose extent and every compared field equal those of an old segment is
       *unchanged* (whatever its id).
    2. The remaining segments are paired by the greatest station overlap (longer than
       0.005 ft), largest overlap first; ties go to the lower old, then the lower new start
       station. Each segment is paired at most once. A pair is *changed*, with one row per
       field that differs.
    3. A remaining new segment is *added*, a remaining old one *removed*; each gives one row per
       compared field that has a value (the other side blank).

    So a segment split in two reports the pair with the larger overlap (the first piece on a
    tie) as *changed* (its end station and length at least) and the other piece as *added*;
    two segments merged into one report the larger as *changed* and the other as *removed*.

Retained height
    Each run's ``retained_height_ft`` is interpolated linearly onto the union of both runs'
    stations of the wall; a changed range is a contiguous station range where
    ``|h_new - h_old| > height_tol_ft`` (the ends found by linear interpolation between
    stations), or where only one run has the wall (the note says which). A paired segment
    (changed or unchanged) whose new extent overlaps a changed range by more than 0.005 ft gets
    a row ``retained_height_ft`` for that overlap, with the old and new heights at the station
    of the largest difference, and so is *changed* even if its design is not: its elevation
    drawing must be redone. Without ``stations.csv`` in both runs, heights are not compared
    and a note says so.

Rows (``diff.csv``)
    ``wall, change, segment_old, segment_new, station_start_ft, station_end_ft, field, old,
    new``: ``change`` is added / removed / changed; the stations are the new segment's extent
    (the old one's for *removed*; the overlap for ``retained_height_ft``). Walls in order of
    the new schedule, then walls only in the old; within a wall by start station, removed
    before changed before added; fields in the order listed above.

Quantities
    Per wall and for the site: the totals of ``concrete_cy``, ``steel_lb`` (and the cost column)
    in each schedule and their difference new - old (a wall missing from a run counts zero).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING

import numpy as np

from ..cautions import CAUTIONS
from ..errors import InputError
from ..profile.stationing import format_station
from .run_tables import (
    COST_COLUMNS,
    FIELDS,
    LENGTH_TOL_FT,
    Field,
    RunTables,
    as_number,
    field_value,
    is_blank,
    read_run,
)

if TYPE_CHECKING:  # pragma: no cover
    import pandas as pd

DIFF_COLUMNS = ("wall", "change", "segment_old", "segment_new", "station_start_ft",
                "station_end_ft", "field", "old", "new")
HEIGHT_COLUMNS = ("wall", "station_start_ft", "station_end_ft", "max_abs_delta_ft",
                  "station_at_max_ft", "old_ft", "new_ft", "note")
SEGMENT_COLUMNS = ("wall", "change", "segment_old", "segment_new", "station_start_ft",
                   "station_end_ft", "fields")
QUANTITY_COLUMNS = ("wall", "quantity", "old", "new", "delta")

DEFAULT_HEIGHT_TOL_FT = 0.05
HEIGHT_FIELD = "retained_height_ft"
SITE = "site"

# ---------------------------------------------------------------- the result


@dataclass(frozen=True, eq=False)
class RunDiff:
    """The differences between two runs.

    Attributes:
        rows: one row per changed field (``DIFF_COLUMNS``), as written to ``diff.csv``.
        segments: one row per segment outcome (``SEGMENT_COLUMNS``), unchanged ones included;
            ``fields`` lists the changed fields.
        height_changes: changed retained-height ranges (``HEIGHT_COLUMNS``).
        quantities: per wall and quantity: old and new totals and delta (``QUANTITY_COLUMNS``).
        site_quantities: the same for the whole site (``wall`` is ``"site"``).
        walls_added, walls_removed: wall ids only in the new / old run.
        notes: remarks (tables missing, cost only in one run).
    """

    rows: pd.DataFrame
    segments: pd.DataFrame
    height_changes: pd.DataFrame
    quantities: pd.DataFrame
    site_quantities: pd.DataFrame
    walls_added: tuple[str, ...] = ()
    walls_removed: tuple[str, ...] = ()
    notes: tuple[str, ...] = ()
    height_tol_ft: float = DEFAULT_HEIGHT_TOL_FT
    old_label: str = "old"
    new_label: str = "new"
    wall_order: tuple[str, ...] = field(default=())

    @property
    def changed(self) -> bool:
        """True when any segment or any retained height changed."""
        return not self.rows.empty or not self.height_changes.empty

    def changed_segments(self, wall: str | None = None) -> list[tuple[str, str, str]]:
        """``(change, segment_old, segment_new)`` of every segment that is not unchanged."""
        seg = self.segments[self.segments["change"] != "unchanged"]
        if wall is not None:
            seg = seg[seg["wall"] == wall]
        return [(r.change, r.segment_old, r.segment_new) for r in seg.itertuples(index=False)]

    def changed_station_ranges(self, wall: str) -> list[tuple[float, float]]:
        """Merged station ranges of a wall touched by any change (for revision marks)."""
        seg = self.segments[(self.segments["wall"] == wall)
                            & (self.segments["change"] != "unchanged")]
        hc = self.height_changes[self.height_changes["wall"] == wall]
        spans = [(float(r.station_start_ft), float(r.station_end_ft))
                 for r in seg.itertuples(index=False)]
        spans += [(float(r.station_start_ft), float(r.station_end_ft))
                  for r in hc.itertuples(index=False)]
        return _merge(sorted(spans))

    def summary_lines(self, extra: Sequence[str] = ()) -> list[str]:
        """A readable summary; ``extra`` lines go before the closing caution line."""
        lines = [f"compared {self.old_label} -> {self.new_label}"]
        for wall in self.wall_order:
            lines += self._wall_lines(wall)
        sq = self.site_quantities
        if not sq.empty:
            lines.append("site quantities: " + _quantity_text(sq))
        n_seg = int((self.segments["change"] != "unchanged").sum())
        if self.changed:
            lines.append(f"{n_seg} segment(s) changed, added or removed; {len(self.rows)} "
                         f"changed field(s); {len(self.height_changes)} retained-height "
                         f"range(s) over {self.height_tol_ft:g} ft")
        else:
            lines.append("no changes: every segment and retained height matches")
        lines += list(self.notes)
        lines += list(extra)
        lines.append(f"CAUTION: {CAUTIONS[0]} {CAUTIONS[2]}")
        return lines

    def _wall_lines(self, wall: str) -> list[str]:
        seg = self.segments[self.segments["wall"] == wall]
        counts = seg["change"].value_counts()
        tag = (" (new wall)" if wall in self.walls_added
               else " (wall removed)" if wall in self.walls_removed else "")
        parts = [f"{int(counts.get(k, 0))} {k}"
                 for k in ("changed", "added", "removed", "unchanged") if counts.get(k, 0)]
        lines = [f"{wall}{tag}: " + (", ".join(parts) if parts else "no segments")]
        rows = self.rows[self.rows["wall"] == wall]
        for s in seg[seg["change"] != "unchanged"].itertuples(index=False):
            span = f"{format_station(s.station_start_ft)} to {format_station(s.station_end_ft)}"
            if s.change == "added":
                lines.append(f"  added {s.segment_new} ({span})")
            elif s.change == "removed":
                lines.append(f"  removed {s.segment_old} ({span})")
            else:
                name = (s.segment_new if s.segment_new == s.segment_old
                        else f"{s.segment_old} -> {s.segment_new}")
                these = rows[(rows["segment_old"] == s.segment_old)
                             & (rows["segment_new"] == s.segment_new)]
                texts = [_change_text(r.field, r.old, r.new) for r in these.itertuples()]
                lines.append(f"  changed {name} ({span}): " + "; ".join(texts))
        for h in self.height_changes[self.height_changes["wall"] == wall].itertuples():
            span = f"{format_station(h.station_start_ft)} to {format_station(h.station_end_ft)}"
            if h.note:
                lines.append(f"  retained height {span}: {h.note}")
            else:
                lines.append(f"  retained height {span}: up to {h.max_abs_delta_ft:.2f} ft at "
                             f"{format_station(h.station_at_max_ft)} ({h.old_ft:.2f} -> "
                             f"{h.new_ft:.2f} ft)")
        q = self.quantities[self.quantities["wall"] == wall]
        if not q.empty:
            lines.append("  quantities: " + _quantity_text(q))
        return lines


def format_value(v) -> str:
    """A value for diff.csv and the summary: numbers without trailing zeros, blanks empty."""
    if isinstance(v, str):
        return v
    if v is None or (isinstance(v, float) and math.isnan(v)):
        return ""
    text = f"{float(v):.4f}".rstrip("0").rstrip(".")
    return "0" if text in ("-0", "") else text


def _change_text(name: str, old, new) -> str:
    text = f"{name} {format_value(old) or '(blank)'} -> {format_value(new) or '(blank)'}"
    if not isinstance(old, str) and not isinstance(new, str):
        d = as_number(new) - as_number(old)
        if math.isfinite(d):
            text += f" ({'+' if d >= 0 else ''}{format_value(d)})"
    return text


def _quantity_text(q) -> str:
    parts = []
    for r in q.itertuples(index=False):
        d = r.delta
        dt = "n/a" if not math.isfinite(d) else f"{'+' if d >= 0 else ''}{d:,.2f}"
        old, new = format_value(r.old) or "n/a", format_value(r.new) or "n/a"
        parts.append(f"{r.quantity} {old} -> {new} ({dt})")
    return ", ".join(parts)


def _merge(spans: list[tuple[float, float]]) -> list[tuple[float, float]]:
    out: list[tuple[float, float]] = []
    for s, e in spans:
        if out and s <= out[-1][1] + LENGTH_TOL_FT:
            out[-1] = (out[-1][0], max(out[-1][1], e))
        else:
            out.append((s, e))
    return out


# ---------------------------------------------------------------- retained height


STATION_TOL_FT = 1e-3  # stations this close are one (tables round to 0.0001 ft)


def height_change_ranges(old, new, wall: str, tol_ft: float) -> list[dict]:
    """Changed retained-height ranges of one wall from two stations tables (or None).

    Both are interpolated linearly onto the union of their stations; between two stations the
    difference is linear, so the ends of a range are where it crosses ``tol_ft``.
    """
    so, ho = _height_series(old, wall)
    sn, hn = _height_series(new, wall)
    grid = np.union1d(so, sn)
    if grid.size == 0:
        return []
    grid = grid[np.r_[True, np.diff(grid) > STATION_TOL_FT]]  # one station, written twice

    def on_grid(s, h):
        if s.size == 0:
            return np.full(grid.size, np.nan)
        v = np.interp(grid, s, h)
        v[(grid < s[0] - STATION_TOL_FT) | (grid > s[-1] + STATION_TOL_FT)] = np.nan
        return v

    go, gn = on_grid(so, ho), on_grid(sn, hn)
    pieces = sorted(_pieces(grid, go, gn, tol_ft))
    ranges: list[list] = []
    for s, e, note in pieces:
        if ranges and ranges[-1][2] == note and s <= ranges[-1][1] + 1e-9:
            ranges[-1][1] = max(ranges[-1][1], e)
        else:
            ranges.append([s, e, note])
    out = []
    for s, e, note in ranges:
        rec = {"wall": wall, "station_start_ft": float(s), "station_end_ft": float(e),
               "max_abs_delta_ft": math.nan, "station_at_max_ft": math.nan,
               "old_ft": math.nan, "new_ft": math.nan, "note": note}
        if not note:
            rec.update(_largest(grid, go, gn, s, e, tol_ft))
        out.append(rec)
    return out


def _pieces(grid, go, gn, tol_ft: float) -> list[tuple[float, float, str]]:
    """(start, end, note) of every grid interval, or part of one, where the heights differ by
    more than ``tol_ft`` or only one run has the wall."""
    pieces: list[tuple[float, float, str]] = []
    if grid.size == 1:
        d = gn[0] - go[0]
        if np.isnan(go[0]) != np.isnan(gn[0]) or abs(d) > tol_ft:
            pieces.append((grid[0], grid[0], _only_note(go[0], gn[0])))
    for i in range(grid.size - 1):
        a, b = grid[i], grid[i + 1]
        o_cov = not (np.isnan(go[i]) or np.isnan(go[i + 1]))
        n_cov = not (np.isnan(gn[i]) or np.isnan(gn[i + 1]))
        if o_cov != n_cov:
            pieces.append((a, b, "only in the new run" if n_cov else "only in the old run"))
            continue
        if not o_cov:
            continue
        d0, d1 = gn[i] - go[i], gn[i + 1] - go[i + 1]
        for sign in (1.0, -1.0):  # where sign * d > tol on the linear piece
            p0, p1 = sign * d0 - tol_ft, sign * d1 - tol_ft
            if p0 <= 0 and p1 <= 0:
                continue
            if p0 > 0 and p1 > 0:
                pieces.append((a, b, ""))
            else:
                x = a + (b - a) * p0 / (p0 - p1)
                pieces.append((a, x, "") if p0 > 0 else (x, b, ""))
    return pieces


def _only_note(o: float, n: float) -> str:
    if np.isnan(o) and not np.isnan(n):
        return "only in the new run"
    if np.isnan(n) and not np.isnan(o):
        return "only in the old run"
    return ""


def _largest(grid, go, gn, s: float, e: float, tol_ft: float) -> dict:
    """The station of the largest |difference| within [s, e] (grid points, else the ends)."""
    cand = [x for x in (s, e)] + [float(x) for x in grid[(grid >= s) & (grid <= e)]]
    best = None
    for x in cand:
        o, n = float(np.interp(x, grid, go)), float(np.interp(x, grid, gn))
        if best is None or abs(n - o) > best[0] + 1e-12:
            best = (abs(n - o), x, o, n)
    d, x, o, n = best
    return {"max_abs_delta_ft": d, "station_at_max_ft": x, "old_ft": o, "new_ft": n}


# ---------------------------------------------------------------- segments


def _overlap(a0: float, a1: float, b0: float, b1: float) -> float:
    return min(a1, b1) - max(a0, b0)


def _fields_present(old, new, old_label="old schedule.csv",
                    new_label="new schedule.csv") -> tuple[Field, ...]:
    """Compared fields: those in both schedules; the cost column only if in both."""
    cols_o, cols_n = set(old.columns), set(new.columns)
    fields = []
    for f in FIELDS:
        if f.name in cols_o and f.name in cols_n:
            fields.append(f)
        elif f.name in cols_o or f.name in cols_n:
            side = new_label if f.name in cols_n else old_label
            raise InputError(f"column {f.name} is in this schedule only; re-run both runs with "
                             "the same version of wallsched", file=side, where="line 1")
    cost = next((c for c in COST_COLUMNS if c in cols_o and c in cols_n), None)
    if cost:
        i = next(i for i, f in enumerate(fields) if f.name == "steel_lb") + 1 \
            if any(f.name == "steel_lb" for f in fields) else len(fields)
        fields.insert(i, Field(cost, "quantity", "qty"))
    return tuple(fields)


def _pair_segments(old_recs: list[dict], new_recs: list[dict], fields: Sequence[Field]):
    """Match the segments of one wall: returns (unchanged pairs, changed pairs, old, new left)."""
    free_o = list(range(len(old_recs)))
    free_n = list(range(len(new_recs)))
    ext = (Field("station_start_ft", "extent", "ft"), Field("station_end_ft", "extent", "ft"))
    same_pairs = []
    for j in list(free_n):
        n = new_recs[j]
        for i in free_o:
            o = old_recs[i]
            if all(f.same(o[f.name], n[f.name]) for f in ext) and all(
                    f.same(o[f.name], n[f.name]) for f in fields):
                same_pairs.append((i, j))
                free_o.remove(i)
                free_n.remove(j)
                break
    cands = []
    for i in free_o:
        o = old_recs[i]
        for j in free_n:
            n = new_recs[j]
            ov = _overlap(o["station_start_ft"], o["station_end_ft"], n["station_start_ft"],
                          n["station_end_ft"])
            if ov > LENGTH_TOL_FT:
                cands.append((-ov, o["station_start_ft"], n["station_start_ft"], i, j))
    cands.sort()
    pairs = []
    used_o: set[int] = set()
    used_n: set[int] = set()
    for _, _, _, i, j in cands:
        if i in used_o or j in used_n:
            continue
        used_o.add(i)
        used_n.add(j)
        pairs.append((i, j))
    left_o = [i for i in free_o if i not in used_o]
    left_n = [j for j in free_n if j not in used_n]
    return same_pairs, pairs, left_o, left_n


def diff_tables(old: RunTables, new: RunTables, *,
                height_tol_ft: float = DEFAULT_HEIGHT_TOL_FT) -> RunDiff:
    """Compare two runs' tables (pure; no files). See the module docstring for the rules."""
    import pandas as pd

    if not (math.isfinite(height_tol_ft) and height_tol_ft >= 0):
        raise InputError(f"must be a number >= 0, got {height_tol_ft!r}", where="--height-tol")
    so, sn = old.schedule, new.schedule
    fields = _fields_present(so, sn, *(str(t.folder / "schedule.csv") if t.folder else
                                       f"{lab} schedule.csv"
                                       for t, lab in ((old, "old"), (new, "new"))))
    walls_new = list(dict.fromkeys(sn["wall"]))
    walls_old = list(dict.fromkeys(so["wall"]))
    order = walls_new + [w for w in walls_old if w not in walls_new]
    heights_ok = old.stations is not None and new.stations is not None
    notes = []
    if not heights_ok:
        which = " and ".join(lab for lab, t in (("old", old), ("new", new))
                             if t.stations is None)
        notes.append(f"note: no stations.csv in the {which} run; retained heights at stations "
                     "were not compared")
    rows: list[dict] = []
    segs: list[dict] = []
    hc_all: list[dict] = []
    for wall in order:
        hc = height_change_ranges(old.stations, new.stations, wall, height_tol_ft) \
            if heights_ok else []
        hc_all += hc
        for r, seg in _wall_rows(wall, so[so["wall"] == wall].to_dict("records"),
                                 sn[sn["wall"] == wall].to_dict("records"), fields, hc,
                                 (old.stations, new.stations)):
            rows += r
            segs.append(seg)
    qty_cols = [f.name for f in fields if f.group == "quantity"]
    quantities, site = _quantities(so, sn, order, qty_cols, notes)
    return RunDiff(
        rows=pd.DataFrame(rows, columns=list(DIFF_COLUMNS)),
        segments=pd.DataFrame(segs, columns=list(SEGMENT_COLUMNS)),
        height_changes=pd.DataFrame(hc_all, columns=list(HEIGHT_COLUMNS)),
        quantities=quantities, site_quantities=site,
        walls_added=tuple(w for w in walls_new if w not in walls_old),
        walls_removed=tuple(w for w in walls_old if w not in walls_new),
        notes=tuple(notes), height_tol_ft=height_tol_ft,
        old_label=str(old.folder) if old.folder else "old",
        new_label=str(new.folder) if new.folder else "new",
        wall_order=tuple(order),
    )


_RANK = {"removed": 0, "changed": 1, "unchanged": 1, "added": 2}


def _wall_rows(wall, recs_o, recs_n, fields, hc, stations) -> list[tuple[list, dict]]:
    """(rows, segment record) of every segment outcome of one wall, in the rows' order: by
    start station, removed before changed before added."""
    same, pairs, left_o, left_n = _pair_segments(recs_o, recs_n, fields)
    out: list[tuple] = []  # (sort key, rows, segment record)
    for i, j in [*same, *pairs]:
        o, n = recs_o[i], recs_n[j]
        r = _paired_rows(wall, o, n, fields) + _height_rows(wall, o, n, hc, stations,
                                                            len(fields))
        change = "changed" if r else "unchanged"
        out.append(((n["station_start_ft"], _RANK[change]), [x for _, x in r],
                    _seg(wall, change, o, n, n, [x["field"] for _, x in r])))
    for change, recs, left in (("removed", recs_o, left_o), ("added", recs_n, left_n)):
        for k in left:
            rec = recs[k]
            o, n = (rec, None) if change == "removed" else (None, rec)
            r = []
            for f in fields:
                v = field_value(rec[f.name], f)
                if not is_blank(v):
                    r.append(_row(wall, change, o, n, rec, f.name,
                                  *((v, "") if change == "removed" else ("", v))))
            out.append(((rec["station_start_ft"], _RANK[change]), r,
                        _seg(wall, change, o, n, rec, [x["field"] for x in r])))
    out.sort(key=lambda t: t[0])
    return [(r, seg) for _, r, seg in out]


def _paired_rows(wall, o, n, fields) -> list[tuple[int, dict]]:
    """(field index, row) of every compared field that differs between two paired segments."""
    return [(k, _row(wall, "changed", o, n, n, f.name, field_value(o[f.name], f),
                     field_value(n[f.name], f)))
            for k, f in enumerate(fields) if not f.same(o[f.name], n[f.name])]


def _height_rows(wall, o, n, hc, stations, index) -> list[tuple[int, dict]]:
    """The ``retained_height_ft`` rows of a paired segment: one per changed height range its
    new extent overlaps by more than the length tolerance."""
    out = []
    s0, s1 = n["station_start_ft"], n["station_end_ft"]
    for h in hc:
        if h["note"]:
            continue
        if _overlap(s0, s1, h["station_start_ft"], h["station_end_ft"]) > LENGTH_TOL_FT:
            a, b = max(s0, h["station_start_ft"]), min(s1, h["station_end_ft"])
            big = _height_at_max(*stations, wall, a, b)
            row = _row(wall, "changed", o, n, n, HEIGHT_FIELD, big[0], big[1])
            row["station_start_ft"], row["station_end_ft"] = a, b
            out.append((index, row))
    return out


def _height_series(frame, wall: str) -> tuple[np.ndarray, np.ndarray]:
    """A wall's (station, retained height) from a stations table, by station, one per station
    (the last where a station repeats); empty without a table."""
    if frame is None:
        return np.empty(0), np.empty(0)
    f = frame[frame["wall"] == wall].sort_values("station_ft", kind="stable")
    f = f.drop_duplicates("station_ft", keep="last")
    return f["station_ft"].to_numpy(float), f["retained_height_ft"].to_numpy(float)


def _height_at_max(old, new, wall: str, a: float, b: float) -> tuple[float, float]:
    """Old and new retained height at the station of largest difference within [a, b]."""
    so, ho = _height_series(old, wall)
    sn, hn = _height_series(new, wall)
    grid = np.union1d(so, sn)
    grid = np.union1d(grid[(grid >= a) & (grid <= b)], [a, b])
    go, gn = np.interp(grid, so, ho), np.interp(grid, sn, hn)
    k = int(np.argmax(np.abs(gn - go)))
    return float(go[k]), float(gn[k])


def _row(wall, change, o, n, ext, name, old_v, new_v) -> dict:
    return {"wall": wall, "change": change, "segment_old": o["segment"] if o else "",
            "segment_new": n["segment"] if n else "",
            "station_start_ft": float(ext["station_start_ft"]),
            "station_end_ft": float(ext["station_end_ft"]),
            "field": name, "old": old_v, "new": new_v}


def _seg(wall, change, o, n, ext, names) -> dict:
    return {"wall": wall, "change": change, "segment_old": o["segment"] if o else "",
            "segment_new": n["segment"] if n else "",
            "station_start_ft": float(ext["station_start_ft"]),
            "station_end_ft": float(ext["station_end_ft"]), "fields": ", ".join(names)}


def _quantities(so, sn, order, qty_cols, notes):
    import pandas as pd

    cols = list(qty_cols)
    for c in COST_COLUMNS:
        if c not in cols and ((c in so.columns) != (c in sn.columns)):
            cols.append(c)
            side = "new" if c in sn.columns else "old"
            notes.append(f"note: column {c} is only in the {side} schedule; its delta is n/a")
            break
    recs = []
    for wall in order:
        for c in cols:
            o = so.loc[so["wall"] == wall, c].sum() if c in so.columns else math.nan
            n = sn.loc[sn["wall"] == wall, c].sum() if c in sn.columns else math.nan
            recs.append({"wall": wall, "quantity": c, "old": float(o), "new": float(n),
                         "delta": float(n - o)})
    site = []
    for c in cols:
        o = float(so[c].sum()) if c in so.columns else math.nan
        n = float(sn[c].sum()) if c in sn.columns else math.nan
        site.append({"wall": SITE, "quantity": c, "old": o, "new": n, "delta": n - o})
    return (pd.DataFrame(recs, columns=list(QUANTITY_COLUMNS)),
            pd.DataFrame(site, columns=list(QUANTITY_COLUMNS)))


# ---------------------------------------------------------------- entry points


def diff_runs(old_dir: Path, new_dir: Path, *,
              height_tol_ft: float = DEFAULT_HEIGHT_TOL_FT) -> RunDiff:
    """Compare the run folders ``old_dir`` and ``new_dir`` (see the module docstring)."""
    return diff_tables(read_run(Path(old_dir)), read_run(Path(new_dir)),
                       height_tol_ft=height_tol_ft)
