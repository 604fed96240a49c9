"""Triangulated surfaces (TINs) and the grade they give along a wall.

A :class:`Surface` is a set of plan triangles with an elevation at each vertex; the elevation
at a plan point is the barycentric interpolation in the triangle that holds it (a plane per
triangle). Points are located in bulk with a shapely ``STRtree`` of the triangles.

A grade is sampled along the line at ``offset_ft`` from the alignment on its side (the
mitred parallel polyline: each alignment segment maps to one parallel segment, so a station
keeps its meaning). The profile's points are every vertex of that line and every place where
it crosses a triangle edge: between two of them the line lies in one triangle, the grade is
linear, and the piecewise-linear profile is the surface itself (its largest retained height
is one of its points, which the sampler makes stations). A stretch of the line outside the
surface is an error naming the station and the surface.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import shapely

from ..errors import ProfileError
from .core import Alignment, DrawingProfile, warn
from .stationing import format_station

NODE_MERGE_FT = 1e-6  # profile points closer than this (in station) are one
# a point this close outside a triangle is on it: rounding, or a crack between two faces
# whose corners were written a hair apart
LOCATE_TOL_FT = 1e-4
AREA_MIN_SQFT = 1e-9  # a triangle with less plan area is degenerate (its points collinear)
MAX_TRIANGLES = 2_000_000  # stated in the README: bounded time and memory per surface


@dataclass(frozen=True)
class Surface:
    """A TIN: plan vertices ``xy`` (n x 2, x east, y north, ft), elevations ``z`` (ft) and
    ``triangles`` (m x 3 vertex indices). Build it with :func:`make_surface`."""

    xy: np.ndarray
    z: np.ndarray
    triangles: np.ndarray
    name: str  # for messages: 'surface "FG"', 'layer "EG-TIN"', ...
    label: str  # the file
    warnings: tuple[str, ...] = ()

    def __post_init__(self):
        corners = self.xy[self.triangles]  # m x 3 x 2
        ring = np.concatenate([corners, corners[:, :1]], axis=1)
        polys = shapely.polygons(ring)
        object.__setattr__(self, "_tree", shapely.STRtree(polys))

    def locate(self, xy: np.ndarray) -> np.ndarray:
        """The triangle holding each point (the first in file order where faces overlap),
        -1 outside the surface."""
        xy = np.asarray(xy, dtype=float).reshape(-1, 2)
        pts = shapely.points(xy)
        found = np.full(len(xy), -1, dtype=np.int64)
        if not len(xy):
            return found
        hit_pt, hit_tri = self._tree.query(pts, predicate="intersects")
        if hit_pt.size:
            best = np.full(len(xy), np.iinfo(np.int64).max, dtype=np.int64)
            np.minimum.at(best, hit_pt, hit_tri)
            found = np.where(best == np.iinfo(np.int64).max, -1, best)
        missing = np.flatnonzero(found < 0)
        if missing.size:  # on an edge but just outside by rounding
            near_pt, near_tri = self._tree.query_nearest(pts[missing], max_distance=LOCATE_TOL_FT)
            found[missing[near_pt]] = near_tri
        return found

    def elevation(self, xy: np.ndarray) -> np.ndarray:
        """Elevation (ft) at each plan point: barycentric in its triangle; NaN outside."""
        xy = np.asarray(xy, dtype=float).reshape(-1, 2)
        tri = self.locate(xy)
        out = np.full(len(xy), np.nan)
        ok = tri >= 0
        if ok.any():
            v = self.triangles[tri[ok]]
            a, b, c = self.xy[v[:, 0]], self.xy[v[:, 1]], self.xy[v[:, 2]]
            p = xy[ok]
            det = ((b[:, 0] - a[:, 0]) * (c[:, 1] - a[:, 1])
                   - (c[:, 0] - a[:, 0]) * (b[:, 1] - a[:, 1]))
            l1 = ((p[:, 0] - a[:, 0]) * (c[:, 1] - a[:, 1])
                  - (c[:, 0] - a[:, 0]) * (p[:, 1] - a[:, 1])) / det
            l2 = ((b[:, 0] - a[:, 0]) * (p[:, 1] - a[:, 1])
                  - (p[:, 0] - a[:, 0]) * (b[:, 1] - a[:, 1])) / det
            out[ok] = (1 - l1 - l2) * self.z[v[:, 0]] + l1 * self.z[v[:, 1]] + l2 * self.z[v[:, 2]]
        return out

    def edges(self) -> np.ndarray:
        """The unique triangle edges (k x 2 vertex indices)."""
        t = self.triangles
        e = np.sort(np.concatenate([t[:, [0, 1]], t[:, [1, 2]], t[:, [2, 0]]]), axis=1)
        return np.unique(e, axis=0)


def make_surface(xy, z, triangles, *, name: str, label: str,
                 messages: list[str] | None = None) -> Surface:
    """Check and clean a TIN: degenerate and duplicate faces are dropped, folded faces
    (a face on the same side of a shared edge as its neighbour, or an edge shared by more than
    two faces) are reported; each as one warning. Raises when no face is left."""
    messages = [] if messages is None else messages
    xy = np.asarray(xy, dtype=float).reshape(-1, 2)
    z = np.asarray(z, dtype=float).reshape(-1)
    tri = np.asarray(triangles, dtype=np.int64).reshape(-1, 3)
    if len(tri) > MAX_TRIANGLES:
        raise ProfileError(f"{name} has {len(tri):,} faces; the limit is {MAX_TRIANGLES:,} - "
                           "export only the area around the walls", file=label)
    if not (np.isfinite(xy).all() and np.isfinite(z).all()):
        raise ProfileError(f"{name} has a point that is not a number", file=label)
    if len(tri) and (tri.min() < 0 or tri.max() >= len(xy)):
        raise ProfileError(f"{name} has a face that refers to a missing point", file=label)
    a, b, c = xy[tri[:, 0]], xy[tri[:, 1]], xy[tri[:, 2]]
    cross = (b[:, 0] - a[:, 0]) * (c[:, 1] - a[:, 1]) - (c[:, 0] - a[:, 0]) * (b[:, 1] - a[:, 1])
    flat = np.abs(cross) / 2 <= AREA_MIN_SQFT
    if flat.any():
        warn(messages, f"{label} {name}: {int(flat.sum())} face(s) with no plan area (points "
             f"on one line or repeated, first face {int(np.argmax(flat)) + 1}) ignored")
    key = np.sort(tri, axis=1)
    _, first = np.unique(key, axis=0, return_index=True)
    dup = np.ones(len(tri), bool)
    dup[first] = False
    dup &= ~flat
    if dup.any():
        warn(messages, f"{label} {name}: {int(dup.sum())} duplicate face(s) (the same three "
             f"points as an earlier face, first face {int(np.argmax(dup)) + 1}) ignored")
    tri = tri[~(flat | dup)]
    if not len(tri):
        raise ProfileError(f"{name} has no usable faces (triangles)", file=label)
    folds = _folded_faces(xy, tri)
    if folds:
        warn(messages, f"{label} {name}: {folds} folded or overlapping face(s) (a face "
             "on the same side of a shared edge as its neighbour, or an edge shared by more "
             "than two faces); where faces overlap the first in the file is used - check the "
             "surface in the design program")
    return Surface(xy, z, tri, name, label, tuple(messages))


def _folded_faces(xy: np.ndarray, tri: np.ndarray) -> int:
    """How many faces fold over a neighbour across a shared edge (or share an edge with more
    than one other face)."""
    m = len(tri)
    third = np.concatenate([tri[:, 2], tri[:, 0], tri[:, 1]])
    e = np.concatenate([tri[:, [0, 1]], tri[:, [1, 2]], tri[:, [2, 0]]])
    face = np.tile(np.arange(m), 3)
    e = np.sort(e, axis=1)
    order = np.lexsort((e[:, 1], e[:, 0]))
    e, face, third = e[order], face[order], third[order]
    same = np.all(e[1:] == e[:-1], axis=1)
    bad = np.zeros(m, bool)
    # an edge used three or more times
    triple = same[1:] & same[:-1]
    for k in np.flatnonzero(triple):
        bad[face[k:k + 3]] = True
    k = np.flatnonzero(same)
    if k.size:
        p, q = xy[e[k, 0]], xy[e[k, 1]]
        d = q - p

        def side(v):
            r = xy[v] - p
            return np.sign(d[:, 0] * r[:, 1] - d[:, 1] * r[:, 0])

        fold = side(third[k]) == side(third[k + 1])
        bad[face[k[fold]]] = True
        bad[face[k[fold] + 1]] = True
    return int(bad.sum())


# --------------------------------------------------------------------------- along a wall


def offset_line(alignment: Alignment, offset_ft: float, sign: float, *, label: str,
                start_station_ft: float) -> tuple[np.ndarray, np.ndarray]:
    """The mitred parallel of the alignment at ``offset_ft`` (``sign`` +1 left, -1 right,
    looking up-station): its vertices (n x 2) and the station of each (the alignment's)."""
    xy = np.asarray(alignment.line.coords, dtype=float)[:, :2]
    d = np.diff(xy, axis=0)
    seg = np.hypot(d[:, 0], d[:, 1])
    u = d / seg[:, None]
    n = np.column_stack([-u[:, 1], u[:, 0]])  # left normals
    stations = start_station_ft + np.r_[0.0, np.cumsum(seg)]
    if offset_ft == 0:
        return xy.copy(), stations
    m = np.empty_like(xy)
    m[0], m[-1] = n[0], n[-1]
    if len(xy) > 2:
        na, nb = n[:-1], n[1:]
        denom = 1.0 + np.einsum("ij,ij->i", na, nb)
        sharp = denom < 0.1  # a turn sharper than about 150 degrees
        if sharp.any():
            k = int(np.argmax(sharp)) + 1
            raise ProfileError(f"the alignment turns back on itself at station "
                               f"{format_station(stations[k])}; a grade cannot be taken at an "
                               "offset there", file=label)
        m[1:-1] = (na + nb) / denom[:, None]
    q = xy + sign * offset_ft * m
    dq = np.diff(q, axis=0)
    back = np.einsum("ij,ij->i", dq, u) <= 0
    if back.any():
        k = int(np.argmax(back))
        raise ProfileError(f"offset_ft = {offset_ft:g} is larger than the radius of the "
                           f"alignment's bend near station {format_station(stations[k])}: the "
                           "parallel line folds back there; use a smaller offset", file=label)
    return q, stations


def surface_grade(surface: Surface, alignment: Alignment, *, start_station_ft: float,
                  offset_ft: float, sign: float, what: str, side: str) -> DrawingProfile:
    """The grade of ``surface`` along the wall, ``offset_ft`` to ``side`` (``sign``), as a
    profile exact between its points (every vertex and every triangle-edge crossing)."""
    messages = list(surface.warnings)
    q, st = offset_line(alignment, offset_ft, sign, label=alignment.label,
                        start_station_ft=start_station_ft)
    cross_st, cross_xy = _edge_crossings(surface, q, st)
    all_st = np.concatenate([st, cross_st])
    all_xy = np.concatenate([q, cross_xy])
    order = np.argsort(all_st, kind="stable")
    all_st, all_xy = all_st[order], all_xy[order]
    first = np.r_[True, np.diff(all_st) > NODE_MERGE_FT]
    all_st, all_xy = all_st[first], all_xy[first]
    all_st[0], all_st[-1] = st[0], st[-1]
    mid_xy = (all_xy[:-1] + all_xy[1:]) / 2
    z = surface.elevation(np.vstack([all_xy, mid_xy]))
    zn, zm = z[:len(all_st)], z[len(all_st):]
    if np.isnan(zn).any() or np.isnan(zm).any():
        _not_covered(surface, all_st, all_xy, mid_xy, np.isnan(zn), np.isnan(zm),
                     what=what, offset_ft=offset_ft, side=side)
    return DrawingProfile(all_st, zn, f"{surface.label} [{surface.name}]", tuple(messages))


def _edge_crossings(surface: Surface, q: np.ndarray, st: np.ndarray):
    """Stations and plan points where the polyline ``q`` (at stations ``st``) crosses a
    triangle edge of ``surface`` (both ends of an edge that runs along it)."""
    edges = surface.edges()
    a, b = q[:-1], q[1:]
    lines = shapely.linestrings(np.stack([a, b], axis=1))
    tree = shapely.STRtree(shapely.linestrings(surface.xy[edges]))
    i, j = tree.query(lines, predicate="intersects")
    if not i.size:
        return np.empty(0), np.empty((0, 2))
    p, r = a[i], b[i] - a[i]
    e0 = surface.xy[edges[j, 0]]
    s = surface.xy[edges[j, 1]] - e0
    rxs = r[:, 0] * s[:, 1] - r[:, 1] * s[:, 0]
    w = e0 - p
    par = np.abs(rxs) <= 1e-12 * np.hypot(r[:, 0], r[:, 1]) * np.hypot(s[:, 0], s[:, 1])
    t = np.empty(i.size)
    ok = ~par
    t[ok] = (w[ok, 0] * s[ok, 1] - w[ok, 1] * s[ok, 0]) / rxs[ok]
    ts = [t[ok]]
    segs = [i[ok]]
    if par.any():  # an edge along the line: both its ends
        rr = np.einsum("ij,ij->i", r[par], r[par])
        for end in (edges[j[par], 0], edges[j[par], 1]):
            ts.append(np.einsum("ij,ij->i", surface.xy[end] - p[par], r[par]) / rr)
            segs.append(i[par])
    t = np.clip(np.concatenate(ts), 0.0, 1.0)
    k = np.concatenate(segs)
    return st[k] + t * (st[k + 1] - st[k]), a[k] + t[:, None] * (b[k] - a[k])


def _not_covered(surface: Surface, all_st, all_xy, mid_xy, out_node, out_mid, *, what: str,
                 offset_ft: float, side: str):
    """The error naming the first stretch of the line that ``surface`` does not cover."""
    # the uncovered stretches, in station order
    bad = np.zeros(2 * len(all_st) - 1, bool)
    bad[0::2], bad[1::2] = out_node, out_mid
    pos = np.empty(2 * len(all_st) - 1)
    pos[0::2] = all_st
    pos[1::2] = (all_st[:-1] + all_st[1:]) / 2
    k = int(np.argmax(bad))
    lo_k = k - 1 if k > 0 else k  # from the last covered point before it
    hi_k = k
    while hi_k + 1 < bad.size and bad[hi_k]:
        hi_k += 1
    xy_at = all_xy[k // 2] if k % 2 == 0 else mid_xy[k // 2]
    raise ProfileError(
        f"{surface.name} does not cover stations {format_station(pos[lo_k])} to "
        f"{format_station(pos[hi_k])} of the {what} ({offset_ft:g} ft to the {side} of "
        f"the wall; e.g. plan point {xy_at[0]:.2f}, {xy_at[1]:.2f} at station "
        f"{format_station(pos[k])}) - extend the surface past the wall or check "
        "offset_ft and the coordinates", file=surface.label)
