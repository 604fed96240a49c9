"""Readers for grading-plan DXF drawings: alignments, plan grade lines and profile views.

A drawing is read with ``ezdxf.recover`` (damaged files are repaired where possible), from
model space only. Layer names match without regard to case, as in CAD programs.

Units: ``$INSUNITS`` must say feet (2, or 21 for US survey feet) or be unset (0). A drawing in
other units is refused unless its source declares them with ``units = "m"`` (or ``"mm"``,
``"cm"``, ``"in"``, ``"ft"``, ``"us-ft"``); coordinates and elevations are then converted to
feet. A declared unit that contradicts a set ``$INSUNITS`` is refused too.

Limits (stated in the README): a drawing may be at most ``MAX_DXF_BYTES`` bytes with at most
``MAX_DXF_ENTITIES`` entities in model space and about ``MAX_DXF_POINTS`` points, and a
profile read from it at most ``MAX_PROFILE_POINTS`` points; larger drawings are refused
before (or right after) parsing, so time and memory stay bounded. Grade lines on a layer must
cover the wall without a gap wider than ``GRADE_GAP_MAX_FT`` (never bridged silently).

Warnings (vertices far from the wall, labels that cannot be used, entities ignored) are
issued with :func:`warnings.warn` as :class:`ProfileWarning` and also kept on the returned
object's ``warnings`` tuple.
"""

from __future__ import annotations

import math
import re
import weakref
from collections.abc import Mapping
from functools import lru_cache
from pathlib import Path
from typing import Any

import numpy as np

from ..errors import ProfileError
from .core import (
    Alignment,
    DrawingAlignment,
    DrawingProfile,
    Projector,
    checked_stat,
    project_polyline,
    warn,
)
from .csvread import (
    MAX_COORDINATE_FT,
    MAX_PROFILE_POINTS,
    alignment_from_xy,
    grade_jump,
    jump_limit_text,
)

# Arcs and bulges are flattened to this chord error (sagitta), finer than 0.01 ft so that
# stations along long arcs stay within 0.01 ft too: a run of chords is shorter than its arc
# by about (angle turned) x sagitta / 3.
ARC_CHORD_ERROR_FT = 0.002
GAP_TOLERANCE_FT = 0.1  # default: ends closer than this are one joint of the alignment
MAX_OFFSET_FT = 10.0  # default: grade vertices and labels farther from the wall are ignored
SAME_STATION_FT = 1e-3  # projected points closer than this are one station
SAME_ELEVATION_FT = 0.01  # ... and must agree within this
MAX_DXF_BYTES = 50 * 1024 * 1024  # larger drawings are refused unread (stated in the README)
MAX_DXF_ENTITIES = 200_000  # entities in model space (stated in the README)
MAX_DXF_POINTS = 500_000  # point tags (group code 10) in a text DXF, counted before parsing
GRADE_GAP_MAX_FT = 1.0  # grade lines on a layer may leave no wider gap along the wall

FT_PER_UNIT = {  # exact definitions: 1 ft = 0.3048 m; 1 US survey ft = 1200/3937 m
    "ft": 1.0,
    "us-ft": 1200 / 3937 / 0.3048,
    "in": 1 / 12,
    "m": 1 / 0.3048,
    "cm": 0.01 / 0.3048,
    "mm": 0.001 / 0.3048,
}
INSUNITS_NAMES = {1: "in", 2: "ft", 4: "mm", 5: "cm", 6: "m", 21: "us-ft"}  # DXF reference
INSUNITS_LABELS = {0: "unitless", 1: "inches", 2: "feet", 3: "miles", 4: "millimetres",
                   5: "centimetres", 6: "metres", 7: "kilometres", 8: "microinches", 9: "mils",
                   10: "yards", 14: "decimetres", 21: "US survey feet"}
LINEAR_TYPES = ("LWPOLYLINE", "POLYLINE", "LINE", "ARC")


# --------------------------------------------------------------------------- reading


@lru_cache(maxsize=8)
def _load(path: str, mtime_ns: int, size: int):
    import logging

    import ezdxf
    from ezdxf import recover

    log = logging.getLogger("ezdxf")
    level = log.level
    log.setLevel(logging.CRITICAL)  # repairs are reported as one ProfileWarning instead
    try:
        doc, auditor = recover.readfile(path)
    except ezdxf.DXFStructureError as exc:
        raise ProfileError(f"is not a readable DXF drawing ({exc}); export it again from the "
                           "CAD program as DXF", file=Path(path).name) from None
    except Exception as exc:  # noqa: BLE001 - any failure of the parser is bad input here
        raise ProfileError(f"is not a readable DXF drawing ({type(exc).__name__}); export it "
                           "again from the CAD program as DXF", file=Path(path).name) from None
    finally:
        log.setLevel(level)
    count = len(doc.modelspace())
    if count > MAX_DXF_ENTITIES:
        raise ProfileError(f"has {count:,} entities in model space; the limit is "
                           f"{MAX_DXF_ENTITIES:,} - export only the layers the walls need",
                           file=Path(path).name)
    return doc, len(auditor.fixes) + len(auditor.errors)


_REPAIRED_WARNED: set[tuple[str, int]] = set()
_CUT_SHORT: weakref.WeakSet = weakref.WeakSet()  # drawings whose file ends before its EOF


def open_layer(path: Path, options: Mapping[str, Any], label: str):
    """(warnings list, document, drawing units to ft, layer name) for a reader of one layer."""
    messages: list[str] = []
    doc = open_dxf(path, label, messages)
    return messages, doc, unit_factor(doc, options, label), options["layer"]


def open_dxf(path: Path, label: str, messages: list[str] | None = None):
    """The recovered ezdxf document of ``path`` (cached while the file is unchanged).

    A drawing that needed repairs gives one warning per file (into ``messages``)."""
    st = checked_stat(path, label, MAX_DXF_BYTES, "a drawing", "export only the layers the "
                      "walls need (e.g. with a layer filter or a cleaned-up copy)")
    try:
        raw = path.read_bytes()
    except OSError as exc:
        raise ProfileError(f"cannot be read ({exc.strerror})", file=label) from None
    if not _looks_like_dxf(raw[:4096]):
        raise ProfileError("is not a DXF drawing (no DXF section tags at its start); export "
                           "it from the CAD program as DXF", file=label)
    binary = raw.startswith(b"AutoCAD Binary")
    cut_short = not binary and raw.rstrip()[-3:].upper() != b"EOF"
    points = len(_POINT_TAG.findall(raw)) if not binary else 0
    del raw
    if points > MAX_DXF_POINTS:
        raise ProfileError(f"holds about {points:,} points; the limit is {MAX_DXF_POINTS:,} - "
                           "export only the layers the walls need, or simplify the lines",
                           file=label)
    try:
        doc, repairs = _load(str(path), st.st_mtime_ns, st.st_size)
    except ProfileError as exc:
        raise ProfileError(exc.message, file=label) from None
    if cut_short:
        _CUT_SHORT.add(doc)
    key = (str(path), st.st_mtime_ns)
    if repairs and messages is not None and key not in _REPAIRED_WARNED:
        _REPAIRED_WARNED.add(key)
        warn(messages, f"{label}: the drawing was damaged; {repairs} problem(s) were "
             "repaired while reading it - check the result, or save the drawing again")
    return doc


_POINT_TAG = re.compile(rb"\n[ \t]*10[ \t]*\r?\n")  # group code 10: the x of a point


def _looks_like_dxf(head: bytes) -> bool:
    if head.startswith(b"AutoCAD Binary DXF"):
        return True
    if b"\x00" in head:
        return False
    text = head.decode("latin-1").upper()
    return "SECTION" in text or "EOF" in text


def unit_factor(doc, options: Mapping[str, Any], label: str) -> float:
    """Feet per drawing unit, from ``$INSUNITS`` and the source's ``units`` option."""
    code = int(doc.header.get("$INSUNITS", 0) or 0)
    declared = options.get("units")
    if declared is None:
        if code in (0, 2, 21):
            return FT_PER_UNIT["us-ft"] if code == 21 else 1.0
        name = INSUNITS_LABELS.get(code, f"code {code}")
        if code not in INSUNITS_NAMES:  # miles, yards, ...: no unit option converts them
            raise ProfileError(
                f"the drawing's units ($INSUNITS) are {name}, which this reader does not "
                "convert; save the drawing in feet (or metres, with units = \"m\")",
                file=label)
        raise ProfileError(
            f"the drawing's units ($INSUNITS) are {name}, not feet; add units = "
            f"\"{INSUNITS_NAMES[code]}\" to the source to convert, or save the "
            "drawing in feet", file=label)
    if code not in (0, *INSUNITS_NAMES) or (code and INSUNITS_NAMES[code] != declared):
        name = INSUNITS_LABELS.get(code, f"code {code}")
        raise ProfileError(f"the source says units = \"{declared}\" but the drawing's "
                           f"$INSUNITS says {name}; correct one of them", file=label)
    return FT_PER_UNIT[declared]


def layer_entities(doc, layer: str, label: str, types=LINEAR_TYPES):
    """Model-space entities of ``types`` on ``layer``; a missing layer lists those present."""
    msp = doc.modelspace()
    want = layer.lower()
    on_layer = [e for e in msp if e.dxf.get("layer", "0").lower() == want]
    if not on_layer:
        names = {lay.dxf.name for lay in doc.layers} | {e.dxf.get("layer", "0") for e in msp}
        used = sorted(names, key=str.lower)
        exists = any(n.lower() == want for n in names)
        what = "has no entities in model space" if exists else "is not in the drawing"
        if doc in _CUT_SHORT:
            raise ProfileError(f"layer '{layer}' {what}, and the file ends before its "
                               "end-of-file marker (EOF): it is cut short (an interrupted "
                               "copy or export); export it again", file=label,
                               where=f"layer {layer}")
        raise ProfileError(f"layer '{layer}' {what}; layers present: {', '.join(used)}",
                           file=label, where=f"layer {layer}")
    found = [e for e in on_layer if e.dxftype() in types]
    if not found:
        kinds = sorted({e.dxftype() for e in on_layer})
        raise ProfileError(f"layer '{layer}' holds no {'/'.join(types)} entities (it has "
                           f"{', '.join(kinds)})", file=label, where=f"layer {layer}")
    return found, on_layer


def entity_points(entity, ft_per_unit: float = 1.0) -> np.ndarray:
    """WCS vertices (n x 3, drawing units) of a linear entity, arcs and bulges flattened
    with ezdxf to the chord error ``ARC_CHORD_ERROR_FT``."""
    from ezdxf import path as ezpath

    sagitta = ARC_CHORD_ERROR_FT / ft_per_unit
    if entity.dxftype() == "POLYLINE" and not (entity.is_2d_polyline or entity.is_3d_polyline):
        raise ProfileError("is a polygon mesh or polyface, not a line", where=_handle(entity))
    check_extent(entity, ft_per_unit)
    if entity.dxftype() == "ARC":  # points on the true circle
        verts = entity.flattening(sagitta)
    else:  # bulges become Bezier curves; 16 per quarter turn keep them on the circle
        verts = ezpath.make_path(entity, segments=16).flattening(sagitta)
    pts = np.array([tuple(v) for v in verts], dtype=float)
    closed = (entity.dxftype() == "LWPOLYLINE" and entity.closed) or (
        entity.dxftype() == "POLYLINE" and entity.is_closed)
    if closed and len(pts) and not np.allclose(pts[0], pts[-1]):
        pts = np.vstack([pts, pts[:1]])
    if pts.size == 0 or not np.isfinite(pts).all():
        raise ProfileError("has no usable vertices", where=_handle(entity))
    return pts.reshape(-1, 3)


def _arc_points(radius: float, angle_rad: float, sagitta: float) -> float:
    """About how many points flattening an arc to the chord error ``sagitta`` makes."""
    if radius <= sagitta:
        return 4.0
    return abs(angle_rad) / (2.0 * math.acos(1.0 - sagitta / radius)) + 2.0


def check_extent(entity, ft_per_unit: float = 1.0) -> None:
    """Refuse, before flattening, a linear entity with a coordinate beyond
    ``MAX_COORDINATE_FT`` or arcs (an ARC, or bulges) that would flatten to more than
    ``MAX_DXF_POINTS`` points (a radius of millions of feet is a unit error, not a wall)."""
    limit = MAX_COORDINATE_FT / ft_per_unit
    sag = ARC_CHORD_ERROR_FT / ft_per_unit
    kind = entity.dxftype()
    arcs: list[tuple[float, float]] = []  # (radius, angle) in drawing units
    if kind == "ARC":
        c = entity.dxf.center
        pts = [(c[0], c[1], c[2])]
        r = float(entity.dxf.radius)
        span = (float(entity.dxf.end_angle) - float(entity.dxf.start_angle)) % 360.0
        arcs.append((r, math.radians(span or 360.0)))
        pts.append((abs(c[0]) + abs(r), abs(c[1]) + abs(r), 0.0))
    elif kind == "LINE":
        pts = [tuple(entity.dxf.start), tuple(entity.dxf.end)]
    elif kind == "LWPOLYLINE":
        xyb = list(entity.get_points("xyb"))
        pts = [(x, y, 0.0) for x, y, _ in xyb]
        bulges = [b for _, _, b in xyb]
        arcs += _bulge_arcs(pts, bulges, closed=bool(entity.closed))
    elif kind == "POLYLINE":
        verts = list(entity.vertices)
        pts = [tuple(v.dxf.location) for v in verts]
        bulges = [float(v.dxf.get("bulge", 0.0) or 0.0) for v in verts]
        arcs += _bulge_arcs(pts, bulges, closed=bool(entity.is_closed))
    else:
        return
    a = np.asarray(pts, dtype=float).reshape(-1, 3)
    if a.size and (not np.isfinite(a).all() or np.abs(a).max() > limit):
        raise ProfileError(f"has a coordinate beyond {MAX_COORDINATE_FT:.0e} ft (or not a "
                           "number); a site drawing is never that large - check the units",
                           where=_handle(entity))
    total = sum(_arc_points(r, ang, sag) for r, ang in arcs if math.isfinite(r))
    if any(not math.isfinite(r) for r, _ in arcs) or total > MAX_DXF_POINTS:
        big = max((r for r, _ in arcs), default=0.0) * ft_per_unit
        raise ProfileError(f"has an arc of radius {big:.3g} ft that would be drawn with about "
                           f"{total:,.0f} points (the limit is {MAX_DXF_POINTS:,}); a wall's "
                           "arcs are never that large - check the units or the bulges",
                           where=_handle(entity))


def _bulge_arcs(pts, bulges, *, closed: bool) -> list[tuple[float, float]]:
    out = []
    n = len(pts)
    for i in range(n if closed else n - 1):
        b = bulges[i]
        if not b or not math.isfinite(b):
            if b and not math.isfinite(b):
                out.append((math.inf, 0.0))
            continue
        (x0, y0, *_), (x1, y1, *_) = pts[i], pts[(i + 1) % n]
        chord = math.hypot(x1 - x0, y1 - y0)
        out.append((chord * (1 + b * b) / (4 * abs(b)), 4 * math.atan(abs(b))))
    return out


def _handle(entity) -> str:
    return f"{entity.dxftype()} handle {entity.dxf.handle}"


def _entity_points(entity, label: str, layer: str, scale: float) -> np.ndarray:
    try:
        pts = entity_points(entity, scale)
    except ProfileError as exc:
        raise ProfileError(exc.message, file=label,
                           where=f"layer {layer}, {_handle(entity)}") from None
    return pts * scale


# --------------------------------------------------------------------------- alignment


def chain_pieces(pieces: list[np.ndarray], handles: list[str], *, tol_ft: float, label: str,
                 where: str) -> tuple[np.ndarray, list[str]]:
    """Join polylines end to end (either way round) into one path.

    The path runs the way the first piece was drawn. Raises when a piece is left over
    (a gap wider than ``tol_ft``) or when more than one piece meets at a joint.
    """
    pieces = [p[:, :2] for p in pieces]
    used = [False] * len(pieces)
    path = [pieces[0]]
    order = [handles[0]]
    used[0] = True
    for _ in range(len(pieces) - 1):
        head, tail = path[0][0], path[-1][-1]
        best = []
        for i, p in enumerate(pieces):
            if used[i]:
                continue
            for end_name, end in (("tail", tail), ("head", head)):
                for rev, q in ((False, p[0]), (True, p[-1])):
                    d = float(np.hypot(*(q - end)))
                    if d <= tol_ft:
                        best.append((d, i, end_name, rev))
        if not best:
            break
        best.sort()
        d, i, end_name, rev = best[0]
        rivals = {b[1] for b in best if b[2] == end_name} - {i}
        if rivals:
            others = ", ".join(handles[j] for j in sorted(rivals))
            raise ProfileError(f"the alignment branches: {handles[i]} and {others} both start "
                               "at the same joint; keep one line per wall on the layer",
                               file=label, where=where)
        p = pieces[i][::-1] if rev else pieces[i]
        if end_name == "tail":
            path.append(p)
            order.append(handles[i])
        else:
            p = p[::-1]
            path.insert(0, p)
            order.insert(0, handles[i])
        used[i] = True
    left = [handles[i] for i, u in enumerate(used) if not u]
    if left:
        ends = np.array([[p[0], p[-1]] for p in path]).reshape(-1, 2)[[0, -1]]
        gaps = []
        for i, u in enumerate(used):
            if not u:
                qs = pieces[i][[0, -1]]
                gaps.append(float(np.min(np.hypot(*(qs[:, None, :] - ends[None]).T))))
        raise ProfileError(
            f"{len(left)} entit{'y does' if len(left) == 1 else 'ies do'} not join the "
            f"alignment ({', '.join(left)}; nearest end {min(gaps):.3f} ft away, joint "
            f"tolerance {tol_ft:g} ft); close the gap or raise gap_tolerance_ft",
            file=label, where=where)
    xy = np.vstack([seg if k == 0 else seg[1:] if np.hypot(*(seg[0] - path[k - 1][-1]))
                    < 1e-9 else seg for k, seg in enumerate(path)])
    return xy, order


def orient(xy: np.ndarray, start: Any, *, label: str, where: str) -> np.ndarray:
    """Run the path from the end nearest ``start`` ([x, y], ft) or keep it ("first vertex")."""
    if start is None or (isinstance(start, str) and start.lower() == "first vertex"):
        return xy
    if isinstance(start, str) and start.lower() == "last vertex":
        return xy[::-1]
    p = np.asarray(start, dtype=float)
    d0, d1 = np.hypot(*(xy[0] - p)), np.hypot(*(xy[-1] - p))
    if math.isclose(d0, d1, rel_tol=1e-9, abs_tol=1e-9):
        raise ProfileError(f"start = {list(start)} is as near one end of the alignment as the "
                           "other; give a point near the up-station start", file=label,
                           where=where)
    return xy if d0 < d1 else xy[::-1]


def read_alignment_dxf(path: Path, options: Mapping[str, Any], label: str) -> DrawingAlignment:
    """A wall alignment from the LWPOLYLINE/POLYLINE/LINE/ARC entities of one layer."""
    messages, doc, scale, layer = open_layer(path, options, label)
    where = f"layer {layer}"
    found, on_layer = layer_entities(doc, layer, label)
    skipped = len(on_layer) - len(found)
    if skipped:
        kinds = sorted({e.dxftype() for e in on_layer if e.dxftype() not in LINEAR_TYPES})
        warn(messages, f"{label} layer {layer}: {skipped} entit{'y' if skipped == 1 else 'ies'}"
             f" ({', '.join(kinds)}) ignored for the alignment")
    pieces = [_entity_points(e, label, layer, scale) for e in found]
    handles = [_handle(e) for e in found]
    tol = float(options.get("gap_tolerance_ft", GAP_TOLERANCE_FT))
    xy, _order = chain_pieces(pieces, handles, tol_ft=tol, label=label, where=where)
    start = options.get("start")
    if start is not None and not isinstance(start, str):
        start = [float(v) * scale for v in start]
    xy = orient(xy, start, label=label, where=where)
    base = alignment_from_xy(xy, f"{label} [{where}]")
    return DrawingAlignment(base.line, base.label, tuple(messages))


# --------------------------------------------------------------------------- projection


def build_profile(st: np.ndarray, el: np.ndarray, tags: list[str], *, label: str,
                  what: str, messages: list[str]) -> DrawingProfile:
    """Sort projected points into a station/elevation profile; tags name each point's source.

    Points at one station (within 0.001 ft) must agree within 0.01 ft.
    """
    st = np.round(np.asarray(st, dtype=float), 6)  # drop float noise of the projection
    el = np.asarray(el, dtype=float)
    if st.size == 0:
        raise ProfileError(f"no {what} lies near the wall", file=label)
    order = np.lexsort((el, st))
    st, el = st[order], el[order]
    tags = [tags[i] for i in order]
    keep = np.r_[True, np.diff(st) > SAME_STATION_FT]
    group = np.cumsum(keep) - 1
    for g in np.nonzero(np.bincount(group) > 1)[0]:
        idx = np.nonzero(group == g)[0]
        if el[idx].max() - el[idx].min() > SAME_ELEVATION_FT:
            i, j = int(idx[0]), int(idx[-1])
            raise ProfileError(
                f"two elevations at station {st[i]:.2f}: {el[i]:.2f} ({tags[i]}) and "
                f"{el[j]:.2f} ({tags[j]}); a grade has one elevation per station - remove "
                "one, or move the other line off the wall", file=label)
    st_u = st[keep]
    el_u = np.bincount(group, weights=el) / np.bincount(group)
    if st_u.size < 2:
        raise ProfileError(f"only one station of {what} lies near the wall; a profile needs "
                           "at least two", file=label)
    if st_u.size > MAX_PROFILE_POINTS:
        raise ProfileError(f"{st_u.size:,} points of {what} lie near the wall; the limit is "
                           f"{MAX_PROFILE_POINTS:,} - simplify the lines", file=label)
    k = grade_jump(st_u, el_u)
    if k is not None:
        first = int(np.nonzero(group == k)[0][0])
        nxt = int(np.nonzero(group == k + 1)[0][0])
        raise ProfileError(
            f"the elevation jumps from {el_u[k]:.2f} ({tags[first]}) to {el_u[k + 1]:.2f} "
            f"({tags[nxt]}) between stations {st_u[k]:.2f} and {st_u[k + 1]:.2f}; "
            f"{jump_limit_text()} - check for elevations in metres or a stray line",
            file=label)
    return DrawingProfile(st_u, el_u, label, tuple(messages))


def check_grade_gaps(spans: list[tuple[float, float, str]], start: float, end: float, *,
                     label: str, what: str) -> None:
    """Refuse a gap along the wall between the station spans of the lines of one grade.

    ``spans`` holds (first station, last station, handle) of each line's points near the wall.
    Lines that overlap or meet within ``GRADE_GAP_MAX_FT`` are one grade; a wider gap inside
    the wall (``start`` to ``end``) is an error, never bridged by interpolation.
    """
    spans = sorted(sp for sp in spans if sp[1] >= sp[0])
    if not spans:
        return
    reach, last = spans[0][1], spans[0][2]
    for lo, hi, handle in spans[1:]:
        gap_lo, gap_hi = max(reach, start), min(lo, end)
        if lo - reach > GRADE_GAP_MAX_FT and gap_hi - gap_lo > GRADE_GAP_MAX_FT:
            raise ProfileError(
                f"the {what} has a gap from station {reach:.2f} ({last}) to {lo:.2f} "
                f"({handle}), wider than {GRADE_GAP_MAX_FT:g} ft; draw the grade across the "
                "gap (it is not bridged by interpolation)", file=label)
        if hi > reach:
            reach, last = hi, handle


def read_plan_grade(path: Path, options: Mapping[str, Any], label: str, *,
                    alignment: Alignment, start_station_ft: float) -> DrawingProfile:
    """A grade from 3D polylines (or 2D ones with an elevation) drawn in plan on a layer."""
    messages, doc, scale, layer = open_layer(path, options, label)
    lab = f"{label} [layer {layer}]"
    found, on_layer = layer_entities(doc, layer, label)
    max_off = float(options.get("max_offset_ft", MAX_OFFSET_FT))
    proj = Projector(alignment, start_station_ft)
    sts, els, tags = [], [], []
    spans: list[tuple[float, float, str]] = []
    dropped = 0
    flat = []
    for e in found:
        pts = _entity_points(e, label, layer, scale)
        if np.all(pts[:, 2] == 0.0):
            flat.append(e.dxf.handle)
        s, z, n = project_polyline(proj, pts, max_off)
        if s.size:
            spans.append((float(s.min()), float(s.max()), _handle(e)))
        dropped += n
        sts.append(s)
        els.append(z)
        tags.extend([_handle(e)] * len(s))
    if flat:
        warn(messages, f"{lab}: {len(flat)} line(s) lie at elevation 0.00 (handles "
             f"{', '.join(flat)}); a 2D polyline needs its elevation set")
    if dropped:
        warn(messages, f"{lab}: {dropped} vertex(es) farther than {max_off:g} ft from the "
             "wall ignored")
    check_grade_gaps(spans, start_station_ft, start_station_ft + alignment.length_ft,
                     label=lab, what=f"grade on layer {layer}")
    return build_profile(np.concatenate(sts), np.concatenate(els), tags, label=lab,
                         what=f"line on layer {layer}", messages=messages)


def read_profile_view(path: Path, options: Mapping[str, Any], label: str) -> DrawingProfile:
    """A grade drawn in a profile view: x = station, y = elevation (exaggerated) about an origin.

    A drawing point (x, y) is station ``origin_station_ft + (x - x0)`` and elevation
    ``origin_elevation_ft + (y - y0) / vertical_exaggeration``, with (x0, y0) the
    ``origin_xy`` option (default 0, 0), in drawing units converted to feet.
    """
    messages, doc, scale, layer = open_layer(path, options, label)
    lab = f"{label} [layer {layer}]"
    found, _ = layer_entities(doc, layer, label)
    x0, y0 = (float(v) * scale for v in options.get("origin_xy", (0.0, 0.0)))
    ve = float(options.get("vertical_exaggeration", 1.0))
    s0 = float(options["origin_station_ft"])
    z0 = float(options["origin_elevation_ft"])
    sts, els, tags = [], [], []
    for e in found:
        pts = _entity_points(e, label, layer, scale)
        sts.append(s0 + (pts[:, 0] - x0))
        els.append(z0 + (pts[:, 1] - y0) / ve)
        tags.extend([_handle(e)] * len(pts))
    return build_profile(np.concatenate(sts), np.concatenate(els), tags, label=lab,
                         what=f"line on layer {layer}", messages=messages)
