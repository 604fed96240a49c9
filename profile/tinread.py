"""Surfaces from a DXF TIN (a layer of 3DFACEs or a polyface mesh) and from survey points.

DXF: the 3DFACEs and polyface POLYLINEs of one layer are the faces (a four-cornered face is
split into two triangles); corners that round to one point on a ``MERGE_FT`` grid are one
vertex, and a crack narrower than ``surface.LOCATE_TOL_FT`` between faces is not a hole. The
drawing's units are handled as for every DXF source (``$INSUNITS`` or ``units``).

Survey points: a text file of ``P,N,E,Z,D`` rows (point, northing, easting, elevation,
description; comma or white-space delimited), a header row optional; ``code`` keeps only the
points whose description's first word is that code (case-insensitive). The points are
triangulated (Delaunay, matplotlib's qhull) and every triangle with an edge longer than
``max_edge_ft`` (default ``MAX_EDGE_FT``) is dropped, so that gaps in the survey are never
bridged. Breaklines are not read: a survey that needs them should be triangulated in the
design program and given as a LandXML or DXF TIN.
"""

from __future__ import annotations

import math
import re
from collections.abc import Mapping
from functools import lru_cache
from pathlib import Path
from typing import Any

import numpy as np

from ..errors import ProfileError
from .core import warn
from .surface import Surface, make_surface

MERGE_FT = 1e-4  # DXF face corners on one 1e-4-ft grid cell are one vertex
MAX_EDGE_FT = 100.0  # survey triangles with a longer edge are dropped (common practice)
MAX_POINTS_BYTES = 50 * 1024 * 1024  # a larger points file is refused (stated in README)
MIN_SPREAD_FT = 0.01  # points whose spread across their best line is less are on one line
TIN_TYPES = ("3DFACE", "POLYLINE")


def _merge(corners: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Unique vertices (n x 3) and the index of each corner."""
    key = np.round(corners / MERGE_FT).astype(np.int64)
    _, first, inverse = np.unique(key, axis=0, return_index=True, return_inverse=True)
    return corners[first], inverse.reshape(-1)


def read_dxf_tin(path: Path, options: Mapping[str, Any], label: str) -> Surface:
    """The TIN drawn on ``options["layer"]``."""
    st = path.stat()
    return _dxf_tin(str(path), st.st_mtime_ns, st.st_size, label, options["layer"],
                    options.get("units"))


@lru_cache(maxsize=8)
def _dxf_tin(path: str, mtime_ns: int, size: int, label: str, layer: str, units) -> Surface:
    from ezdxf.render import MeshBuilder

    from .dxfread import layer_entities, open_dxf, unit_factor

    messages: list[str] = []
    doc = open_dxf(Path(path), label, messages)
    scale = unit_factor(doc, {"units": units} if units else {}, label)
    found, on_layer = layer_entities(doc, layer, label, types=TIN_TYPES)
    tris = []
    lines = 0
    for e in found:
        if e.dxftype() == "3DFACE":
            v = np.array([tuple(e.dxf.get(f"vtx{i}")) for i in range(4)], dtype=float)
            tris.append(v[[0, 1, 2]])
            if not np.allclose(v[3], v[2]) and not np.allclose(v[3], v[0]):
                tris.append(v[[0, 2, 3]])
        elif e.is_poly_face_mesh:
            mesh = MeshBuilder.from_polyface(e)
            verts = np.array([tuple(p) for p in mesh.vertices], dtype=float)
            for face in mesh.faces:
                for k in range(1, len(face) - 1):
                    tris.append(verts[[face[0], face[k], face[k + 1]]])
        else:
            lines += 1
    skipped = len(on_layer) - len(found) + lines
    if skipped:
        warn(messages, f"{label} layer {layer}: {skipped} entit{'y' if skipped == 1 else 'ies'}"
             " that are not 3DFACEs or polyface meshes ignored for the surface")
    if not tris:
        raise ProfileError(f"layer '{layer}' holds no 3DFACE or polyface mesh faces (a TIN)",
                           file=label, where=f"layer {layer}")
    corners = np.array(tris, dtype=float).reshape(-1, 3) * scale
    verts, idx = _merge(corners)
    return make_surface(verts[:, :2], verts[:, 2], idx.reshape(-1, 3),
                        name=f"TIN on layer {layer!r}", label=label, messages=messages)


# --------------------------------------------------------------------------- survey points

_SPLIT_WS = re.compile(r"\s+")


def _fields(line: str) -> list[str]:
    if "," in line:
        return [f.strip() for f in line.split(",")]
    return _SPLIT_WS.split(line.strip(), maxsplit=4)


def _float(text: str) -> float | None:
    try:
        v = float(text)
    except ValueError:
        return None
    return v if math.isfinite(v) else None


HEADER_NAMES = {  # a header row may name the columns in another order
    "n": ("n", "northing", "north", "y"),
    "e": ("e", "easting", "east", "x"),
    "z": ("z", "elevation", "elev", "el"),
    "d": ("d", "description", "desc", "code", "descriptor"),
}


def _header_columns(fields: list[str], label: str, line: int) -> tuple[int, ...] | None:
    """Column indexes (N, E, Z, D) named by a header row, or None where it names none."""
    names = [f.strip().lower() for f in fields]
    found = {}
    for key, options in HEADER_NAMES.items():
        hits = [i for i, n in enumerate(names) if n in options]
        if hits:
            found[key] = hits[0]
    if not found:
        return None
    missing = [k.upper() for k in ("n", "e", "z") if k not in found]
    if missing:
        raise ProfileError(f"the header names some columns but not {', '.join(missing)} "
                           "(northing, easting, elevation); name them all, or leave the "
                           "header out for P,N,E,Z,D order", file=label, where=f"line {line}")
    return found["n"], found["e"], found["z"], found.get("d", len(names) + 99)


def read_points(path: Path, options: Mapping[str, Any], label: str) -> Surface:
    """Survey points, filtered by ``code``, triangulated without bridging gaps."""
    st = path.stat()
    return _points(str(path), st.st_mtime_ns, st.st_size, label, options.get("code"),
                   float(options.get("max_edge_ft", MAX_EDGE_FT)))


@lru_cache(maxsize=8)
def _points(path: str, mtime_ns: int, size: int, label: str, code, max_edge: float) -> Surface:
    from matplotlib.tri import Triangulation

    if size > MAX_POINTS_BYTES:
        raise ProfileError(f"is {size / 2**20:.0f} MiB; the limit for a points file is "
                           f"{MAX_POINTS_BYTES // 2**20} MiB", file=label)
    raw = Path(path).read_bytes()
    if raw.startswith((b"\xff\xfe", b"\xfe\xff")) or b"\x00" in raw:
        raise ProfileError("is not a text file (UTF-16 or binary); save the points as CSV "
                           "UTF-8 text (P,N,E,Z,D)", file=label)
    want = code.upper() if isinstance(code, str) else None
    rows = _point_rows(raw.decode("utf-8-sig", errors="replace"), want, label)
    what = f"points{f' coded {code!r}' if want else ''}"
    if len(rows) < 3:
        raise ProfileError(f"has {len(rows)} {what}; a surface needs at least three (not all on "
                           "one line)" + ("; check the code" if want else ""), file=label)
    messages: list[str] = []
    pts = _distinct_spread(np.array([r[:3] for r in rows], dtype=float), what, label,
                           messages)
    tri = Triangulation(pts[:, 0], pts[:, 1]).triangles
    corners = pts[tri, :2]
    edge = np.hypot(*np.moveaxis(corners - np.roll(corners, 1, axis=1), 2, 0)).max(axis=1)
    keep = edge <= max_edge
    if not keep.any():
        raise ProfileError(f"no triangle of the {what} has all its edges within max_edge_ft = "
                           f"{max_edge:g} ft; the points are too far apart (raise max_edge_ft "
                           "if the ground between them is known to be even)", file=label)
    if not keep.all():
        warn(messages, f"{label}: {int((~keep).sum())} triangle(s) with an edge longer than "
             f"{max_edge:g} ft dropped (gaps in the survey are not bridged)")
    return make_surface(pts[:, :2], pts[:, 2], tri[keep], name=f"survey {what}", label=label,
                        messages=messages)


def _point_rows(text: str, want: str | None, label: str) -> list[tuple]:
    """(x, y, z, line) of every point row (coded ``want`` when given); a first row that is
    not numbers is a header and may name the columns."""
    rows = []
    seen_data = False
    cols = (1, 2, 3, 4)  # P,N,E,Z,D: northing, easting, elevation, description
    for n, line in enumerate(text.splitlines(), 1):
        if not line.strip() or line.lstrip().startswith("#"):
            continue
        f = _fields(line)
        vals = [_float(f[c]) if c < len(f) else None for c in cols[:3]]
        if any(v is None for v in vals):
            if not seen_data:  # a header row: it may name the columns
                seen_data = True
                cols = _header_columns(f, label, n) or cols
                continue
            raise ProfileError("is not a point row P,N,E,Z,D (point, northing, easting, "
                               f"elevation, description): {line.strip()[:60]!r}", file=label,
                               where=f"line {n}")
        seen_data = True
        desc = f[cols[3]] if cols[3] < len(f) else ""
        if want is not None and (desc.split() or [""])[0].upper() != want:
            continue
        rows.append((vals[1], vals[0], vals[2], n))  # x = easting, y = northing
    return rows


def _distinct_spread(pts: np.ndarray, what: str, label: str, messages: list) -> np.ndarray:
    """The points without repeats of a plan position (the first kept, with a warning);
    refused when they lie on one line."""
    key = np.round(pts[:, :2] / MERGE_FT).astype(np.int64)
    _, first = np.unique(key, axis=0, return_index=True)
    if len(first) < len(pts):
        first.sort()
        dup = len(pts) - len(first)
        warn(messages, f"{label}: {dup} point(s) at the plan position of an earlier point "
             "ignored (the first is used)")
        pts = pts[first]
    centred = pts[:, :2] - pts[:, :2].mean(axis=0)
    spread = np.linalg.svd(centred, compute_uv=False)
    if len(pts) < 3 or spread[-1] / math.sqrt(len(pts)) < MIN_SPREAD_FT:
        raise ProfileError(f"its {len(pts)} {what} lie on one line (or at one place); a "
                           "surface needs points spread in plan", file=label)
    return pts
