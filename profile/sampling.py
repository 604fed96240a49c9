"""Sample a wall's grade profiles into stations.

A station every ``interval`` from the wall's start, plus every vertex (break) of either grade
profile inside the wall, plus both ends. Between breaks both grades are linear, so the
retained height is linear too and its maximum over the wall lies at a row of the table.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import pandas as pd
import shapely

from ..errors import ProfileError
from .core import Alignment, GradeProfile
from .stationing import format_station, format_stations

MERGE_TOL_FT = 1e-3  # stations closer than this (0.012 in) are one: the first (a break if any)
MAX_STATIONS_PER_WALL = 50_000  # stated in the README: bounded time and memory per wall
# A retained height beyond this is a data error (a grade in metres, a file of another wall),
# not a wall: twice the top of the max_retained_height_ft range (40 ft) would not be a
# cantilever wall either.
PLAUSIBLE_RETAINED_HEIGHT_FT = 60.0


@dataclass(frozen=True)
class WallStations:
    """Equal-length arrays, one element per station of one wall."""

    wall: str
    station_ft: np.ndarray
    x: np.ndarray
    y: np.ndarray
    retained_grade_ft: np.ndarray
    front_grade_ft: np.ndarray
    existing_ground_ft: np.ndarray  # NaN where no existing ground was given
    is_break: np.ndarray

    @property
    def retained_height_ft(self) -> np.ndarray:
        return self.retained_grade_ft - self.front_grade_ft

    @property
    def flipped(self) -> np.ndarray:
        """Stations where the front grade stands above the retained grade."""
        return self.retained_height_ft < 0

    @property
    def length_ft(self) -> float:
        return float(self.station_ft[-1] - self.station_ft[0])

    def __len__(self) -> int:
        return int(self.station_ft.size)

    def to_frame(self) -> pd.DataFrame:
        """The ``stations.csv`` columns (DESIGN.md section 5), in the pinned order first."""
        h = self.retained_height_ft
        frame = pd.DataFrame({
            "wall": self.wall,
            "station_ft": self.station_ft,
            "station": format_stations(self.station_ft),
            "x": self.x,
            "y": self.y,
            "retained_grade_ft": self.retained_grade_ft,
            "front_grade_ft": self.front_grade_ft,
            "retained_height_ft": h,
            "is_break": self.is_break,
        })
        if not np.isnan(self.existing_ground_ft).all():
            frame["existing_ground_ft"] = self.existing_ground_ft
        frame["note"] = np.where(h < 0, "retained side flips: front grade above retained grade",
                                 "")
        return frame

    def summary(self) -> str:
        h = self.retained_height_ft
        k = int(np.argmax(h))
        j = int(np.argmin(h))
        text = (f"{self.wall}: {format_station(self.station_ft[0])} to "
                f"{format_station(self.station_ft[-1])}, {self.length_ft:.1f} ft, "
                f"{len(self)} stations; retained height {h[j]:.2f} ft at "
                f"{format_station(self.station_ft[j])} to {h[k]:.2f} ft at "
                f"{format_station(self.station_ft[k])}")
        n = int(self.flipped.sum())
        if n:
            text += f"; WARNING {n} station(s) where the retained side flips"
        return text


def check_coverage(profile: GradeProfile, start: float, end: float, tol: float, *,
                   wall: str, what: str) -> None:
    """Both ends of the wall must lie within the profile, less ``tol``."""
    lo, hi = float(profile.station_ft[0]), float(profile.station_ft[-1])
    gaps = []
    if lo > start + tol:
        gaps.append(f"{format_station(start)} to {format_station(lo)}")
    if hi < end - tol:
        gaps.append(f"{format_station(hi)} to {format_station(end)}")
    if gaps:
        raise ProfileError(
            f"wall {wall!r}: the {what} profile covers {format_station(lo)} to "
            f"{format_station(hi)} but the wall runs {format_station(start)} to "
            f"{format_station(end)}; uncovered {' and '.join(gaps)} (tolerance {tol:g} ft). "
            "Extend the profile or shorten the alignment", file=profile.label)


def regular_stations(start: float, end: float, interval: float) -> np.ndarray:
    """``start + k * interval`` up to ``end`` (computed by multiplication, not summation)."""
    n = int(np.floor((end - start) / interval + 1e-9))
    return start + interval * np.arange(n + 1)


def sample_wall(
    wall: str,
    alignment: Alignment,
    start_station_ft: float,
    retained: GradeProfile,
    front: GradeProfile,
    existing: GradeProfile | None = None,
    *,
    interval_ft: float = 5.0,
    tolerance_ft: float = 0.01,
) -> WallStations:
    """Sample one wall into stations. Raises ProfileError when a profile does not cover it."""
    start = float(start_station_ft)
    end = start + alignment.length_ft
    for prof, what in ((retained, "retained grade"), (front, "front grade"),
                       (existing, "existing ground")):
        if prof is not None:
            check_coverage(prof, start, end, tolerance_ft, wall=wall, what=what)
    count = (end - start) / interval_ft + retained.station_ft.size + front.station_ft.size
    if not np.isfinite(count) or count > MAX_STATIONS_PER_WALL:
        raise ProfileError(
            f"wall {wall!r}: {end - start:,.1f} ft at {interval_ft:g} ft station spacing with "
            f"{retained.station_ft.size + front.station_ft.size:,} grade points gives more than "
            f"{MAX_STATIONS_PER_WALL:,} stations; raise [criteria] station_interval_ft or thin "
            "the grade profiles", file=alignment.label)
    st, is_break = _stations(start, end, interval_ft, (retained, front))
    pts = shapely.line_interpolate_point(alignment.line, st - start)
    xy = shapely.get_coordinates(pts)
    rg = retained.at(st)
    fg = front.at(st)
    eg = existing.at(st) if existing is not None else np.full(st.size, np.nan)
    _check_heights(wall, st, rg, fg, retained.label)
    return WallStations(wall, st, xy[:, 0], xy[:, 1], rg, fg, eg, is_break)


def _stations(start: float, end: float, interval_ft: float, profiles):
    """Regular stations, every grade break of ``profiles`` between the ends, and both ends;
    stations closer than ``MERGE_TOL_FT`` merged (a break kept if any); (stations, is break)."""
    regular = regular_stations(start, end, interval_ft)
    breaks = np.concatenate([p.station_ft for p in profiles])
    breaks = breaks[(breaks > start) & (breaks < end)]
    st = np.concatenate([regular, breaks, [start, end]])
    is_break = np.concatenate([np.zeros(regular.size, bool), np.ones(breaks.size, bool),
                               [False, False]])
    order = np.lexsort((~is_break, st))  # by station; a break first among equals
    st, is_break = st[order], is_break[order]
    # merge stations closer than the tolerance: one station, the break's if any (a grade
    # break is where the height can peak), else the first
    first = np.r_[True, np.diff(st) > MERGE_TOL_FT]
    group = np.cumsum(first) - 1
    brk = np.zeros(int(group[-1]) + 1, bool)
    np.logical_or.at(brk, group, is_break)
    keep = np.flatnonzero(first)
    at_break = np.flatnonzero(is_break)  # a group with a break keeps the break's station
    groups, first_break = np.unique(group[at_break], return_index=True)
    keep[groups] = at_break[first_break]
    st = st[keep]
    # a break within the merge tolerance of an end keeps the exact end station
    st[0], st[-1] = start, end
    return st, brk


def _check_heights(wall: str, st, rg, fg, label: str) -> None:
    """Refuse retained heights no cantilever wall has (units or datum wrong) and a front
    grade above the retained grade everywhere (sides swapped)."""
    h = rg - fg
    k = int(np.argmax(np.abs(h)))
    if abs(h[k]) > PLAUSIBLE_RETAINED_HEIGHT_FT:
        raise ProfileError(
            f"wall {wall!r}: retained grade {rg[k]:.2f} and front grade {fg[k]:.2f} at station "
            f"{format_station(st[k])} differ by {abs(h[k]):.2f} ft, more than the plausible "
            f"{PLAUSIBLE_RETAINED_HEIGHT_FT:g} ft for a cantilever wall; check that both grade "
            "files are in feet (not metres), on the same datum and for this wall",
            file=label)
    if (h < 0).all():
        raise ProfileError(
            f"wall {wall!r}: the front grade is above the retained grade at every station "
            f"(retained height {h.max():.2f} ft at best); the retained side or the two grade "
            "files are swapped", file=label)
