"""What every reader of profile/ shares: the grade profile and alignment types (and their
drawing variants carrying reading warnings), ``ProfileWarning``, and the projection of points
onto an alignment (station, offset) used by the DXF, GIS and label readers, and the size
check of an input file before it is read."""

from __future__ import annotations

import math
import warnings as _warnings
from dataclasses import dataclass

import numpy as np
import shapely

from ..errors import ProfileError

DENSIFY_STEP_FT = 0.25  # a grade chord that leaves the band is cut at this resolution
EXTENSION_FT = 1000.0  # the alignment is extended straight past both ends for projection


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


class ProfileWarning(UserWarning):
    """Something in a drawing or GIS file was ignored; the run goes on."""


@dataclass(frozen=True)
class DrawingProfile(GradeProfile):
    """A grade profile read from a drawing, with the warnings raised while reading it."""

    warnings: tuple[str, ...] = ()


@dataclass(frozen=True)
class DrawingAlignment(Alignment):
    """An alignment read from a drawing or GIS file, with its reading warnings."""

    warnings: tuple[str, ...] = ()


def checked_stat(path, label: str, limit_bytes: int, what: str, advice: str = ""):
    """``path.stat()`` of an input file no larger than ``limit_bytes``; else one clear
    ProfileError naming ``what`` the file is and ``advice`` (what to do)."""
    try:
        st = path.stat()
    except OSError as exc:
        raise ProfileError(f"cannot be read ({exc.strerror})", file=label) from None
    if st.st_size > limit_bytes:
        raise ProfileError(f"is {st.st_size / 2**20:.0f} MiB; the limit for {what} is "
                           f"{limit_bytes // 2**20} MiB" + (f" - {advice}" if advice else ""),
                           file=label)
    return st


def warn(messages: list[str], text: str) -> None:
    """Record one warning and issue it as a ProfileWarning."""
    messages.append(text)
    _warnings.warn(text, ProfileWarning, stacklevel=3)


@dataclass(frozen=True)
class Projector:
    """Station and signed offset (left of up-station positive) of plan points on a wall."""

    alignment: Alignment
    start_station_ft: float

    def __post_init__(self):
        xy = np.asarray(self.alignment.line.coords, dtype=float)[:, :2]
        d0 = xy[1] - xy[0]
        d1 = xy[-1] - xy[-2]
        d0 /= np.hypot(*d0)
        d1 /= np.hypot(*d1)
        ext = np.vstack([xy[0] - EXTENSION_FT * d0, xy, xy[-1] + EXTENSION_FT * d1])
        object.__setattr__(self, "_xy", ext)
        object.__setattr__(self, "_line", shapely.LineString(ext))
        seg = np.hypot(*np.diff(ext, axis=0).T)
        object.__setattr__(self, "_cum", np.r_[0.0, np.cumsum(seg)])

    def project(self, xy: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """(station_ft, offset_ft) of each point (n x 2)."""
        xy = np.asarray(xy, dtype=float).reshape(-1, 2)
        pts = shapely.points(xy)
        s = shapely.line_locate_point(self._line, pts)
        k = np.clip(np.searchsorted(self._cum, s, side="right") - 1, 0, len(self._cum) - 2)
        a, b = self._xy[k], self._xy[k + 1]
        t = (s - self._cum[k]) / (self._cum[k + 1] - self._cum[k])
        foot = a + (b - a) * t[:, None]
        dirn = b - a
        rel = xy - foot
        cross = dirn[:, 0] * rel[:, 1] - dirn[:, 1] * rel[:, 0]
        dist = np.hypot(rel[:, 0], rel[:, 1])
        offset = np.where(cross < 0, -dist, dist)
        return self.start_station_ft + s - EXTENSION_FT, offset


def project_polyline(proj: Projector, pts: np.ndarray, max_offset_ft: float):
    """Project one grade polyline's vertices (n x 3); return (station, elevation, dropped).

    Vertices within ``max_offset_ft`` of the wall (extended straight past its ends) count.
    A chord from a counted vertex to one farther out is densified and cut where it leaves
    the band, so a line drawn longer than the wall still covers the wall's ends.
    """
    st, off = proj.project(pts[:, :2])
    inside = np.abs(off) <= max_offset_ft
    out_st = list(st[inside])
    out_el = list(pts[inside, 2])
    for k in range(len(pts) - 1):
        if inside[k] == inside[k + 1]:
            continue
        a, b = (pts[k], pts[k + 1]) if inside[k] else (pts[k + 1], pts[k])
        n = int(math.ceil(np.hypot(*(b[:2] - a[:2])) / DENSIFY_STEP_FT))
        if n < 2:
            continue
        t = np.arange(1, n) / n
        mid = a + (b - a) * t[:, None]
        mst, moff = proj.project(mid[:, :2])
        ok = np.abs(moff) <= max_offset_ft
        stop = int(np.argmin(ok)) if not ok.all() else ok.size
        out_st.extend(mst[:stop])
        out_el.extend(mid[:stop, 2])
    return np.array(out_st), np.array(out_el), int((~inside).sum())
