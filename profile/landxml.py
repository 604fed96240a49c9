"""LandXML 1.2 (an open standard) reader: alignments, profiles and TIN surfaces.

- The file is parsed with ``defusedxml`` after a size check (``MAX_LANDXML_BYTES``): entity
  declarations (the "billion laughs" expansion attack) and external entities are refused and
  named as such; malformed XML is reported with its line and column.
- Units: ``<Units>`` ``<Imperial linearUnit="foot">`` or ``"USSurveyFoot"`` (``"inch"``,
  ``"mile"``), or ``<Metric linearUnit="meter">`` (``"millimeter"``, ``"centimeter"``,
  ``"kilometer"``); everything is converted to feet and anything but feet is said in a
  warning. A file without ``<Units>`` is read as feet, with a warning.
- Coordinates are written northing before easting (``<P>`` is "N E Z"); plan x is the easting
  and y the northing.
- Alignment (``<CoordGeom>``): ``<Line>`` (Start, End), ``<Curve>`` (Start, Center, End,
  ``rot="cw"|"ccw"``), ``<IrregularLine>`` and clothoid ``<Spiral>`` (Start, PI, End,
  ``length``, ``radiusStart``/``radiusEnd``, INF for a tangent; other spiral types are
  refused). Its ``staStart`` is the station of its start unless the wall gives
  ``start_station_ft``. Arcs and spirals are flattened to chords within
  ``ARC_CHORD_ERROR_FT``.
- Profile (``<Profile><ProfAlign>``): ``<PVI>``, ``<ParaCurve length>`` (symmetric parabola),
  ``<CircCurve radius>`` (circular arc tangent to both grades); a ``<ProfSurf>`` (a list of
  station/elevation points) is read too. A profile's elevations are exact at every station.
- Surface (``<Surface><Definition surfType="TIN">``): ``<Pnts><P id>`` and ``<Faces><F>``;
  faces marked invisible (``i="1"``) are skipped.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path
from typing import Any

import numpy as np

from ..errors import ProfileError
from .core import DrawingAlignment, DrawingProfile, warn
from .csvread import alignment_from_xy
from .stationing import format_station

MAX_LANDXML_BYTES = 200 * 1024 * 1024  # larger files are refused unread (stated in README)
ARC_CHORD_ERROR_FT = 0.001  # chords of an arc stay this close to it; stations within ~0.001 ft
VERTICAL_CHORD_ERROR_FT = 0.001  # vertical curves: profile points this close to the curve
JOIN_TOL_FT = 0.01  # one alignment element must start where the last one ended
SPIRAL_END_TOL_FT = 0.05  # a clothoid computed from its start must meet its End this closely
FT_PER_UNIT = {  # exact definitions: 1 ft = 0.3048 m; 1 US survey ft = 1200/3937 m
    "foot": 1.0,
    "feet": 1.0,
    "USSurveyFoot": 1200 / 3937 / 0.3048,
    "inch": 1 / 12,
    "mile": 5280.0,
    "miles": 5280.0,
    "meter": 1 / 0.3048,
    "millimeter": 0.001 / 0.3048,
    "centimeter": 0.01 / 0.3048,
    "kilometer": 1000 / 0.3048,
}
UNIT_WORDS = {"foot": "feet", "feet": "feet", "USSurveyFoot": "US survey feet",
              "inch": "inches", "mile": "miles", "miles": "miles", "meter": "metres",
              "millimeter": "millimetres", "centimeter": "centimetres",
              "kilometer": "kilometres"}


@dataclass(frozen=True)
class LandXMLAlignment(DrawingAlignment):
    """An alignment from LandXML, with its own start station (``staStart``, ft)."""

    start_station_ft: float | None = None
    source: tuple[str, str] | None = None  # (file, alignment name), for its own profiles


@dataclass(frozen=True)
class CurvedProfile(DrawingProfile):
    """A profile with vertical curves: exact elevations at any station (``exact``); its
    points (``station_ft``) are the PVIs, curve ends, high and low points and enough points
    along each curve for drawing and stationing."""

    exact: Any = None

    def at(self, station_ft) -> np.ndarray:
        return self.exact(station_ft)


@dataclass(frozen=True)
class Document:
    root: Any
    ft_linear: float
    ft_elevation: float
    label: str
    messages: tuple[str, ...]


def _local(tag) -> str:
    return tag.rsplit("}", 1)[-1] if isinstance(tag, str) else ""


def _children(el, name: str) -> list:
    return [c for c in el if _local(c.tag) == name]


def _child(el, name: str):
    for c in el:
        if _local(c.tag) == name:
            return c
    return None


def _iter(el, name: str):
    return (c for c in el.iter() if _local(c.tag) == name)


# --------------------------------------------------------------------------- the file


def parse_landxml(raw: bytes, label: str):
    """The root element of LandXML text, parsed with defusedxml (no entities, no external
    references). Raises ProfileError naming what was refused or where the XML breaks."""
    import xml.etree.ElementTree as ET

    import defusedxml
    import defusedxml.ElementTree as DET

    try:
        root = DET.fromstring(raw, forbid_dtd=False, forbid_entities=True,
                              forbid_external=True)
    except defusedxml.EntitiesForbidden as exc:
        if exc.sysid or exc.pubid:
            raise ProfileError(
                f"refused: the file declares an external entity ({exc.name!r} -> "
                f"{exc.sysid or exc.pubid}); an external entity can read other files or the "
                "network, and LandXML needs none - export the file again from the design "
                "program", file=label) from None
        raise ProfileError(
            f"refused: the file declares an XML entity ({exc.name!r}); entity expansion (the "
            "'billion laughs' attack) can exhaust memory, and LandXML needs none - export the "
            "file again from the design program", file=label) from None
    except defusedxml.ExternalReferenceForbidden as exc:
        raise ProfileError(
            f"refused: the file refers to an external entity or document ({exc.sysid or exc.pubid}"
            "); LandXML needs none - export the file again from the design program",
            file=label) from None
    except defusedxml.DefusedXmlException as exc:
        raise ProfileError(f"refused: {exc}; export the file again from the design program",
                           file=label) from None
    except ET.ParseError as exc:
        line, col = exc.position
        text = str(exc).split(":")[0]
        raise ProfileError(f"is not well-formed XML ({text}, column {col}); export the file "
                           "again from the design program", file=label,
                           where=f"line {line}") from None
    if _local(root.tag) != "LandXML":
        raise ProfileError(f"is not a LandXML file (its root element is <{_local(root.tag)}>, "
                           "not <LandXML>)", file=label)
    return root


@lru_cache(maxsize=8)
def _load(path: str, mtime_ns: int, size: int, label: str) -> Document:
    raw = Path(path).read_bytes()
    root = parse_landxml(raw, label)
    del raw
    messages: list[str] = []
    units = _child(root, "Units")
    system = None
    if units is not None:
        system = next((c for c in units if _local(c.tag) in ("Imperial", "Metric")), None)
    if system is None:
        warn(messages, f"{label}: no <Units> in the LandXML file; read as feet - check the "
             "coordinates and elevations")
        return Document(root, 1.0, 1.0, label, tuple(messages))
    linear = system.get("linearUnit")
    if linear not in FT_PER_UNIT:
        raise ProfileError(f"<Units> linearUnit = {linear!r} is not a LandXML 1.2 length unit "
                           "(foot, USSurveyFoot, inch, mile, meter, millimeter, centimeter, "
                           "kilometer)", file=label, where="<Units>")
    elev = system.get("elevationUnit") or linear
    if elev not in FT_PER_UNIT:
        raise ProfileError(f"<Units> elevationUnit = {elev!r} is not a LandXML 1.2 elevation "
                           "unit (meter, kilometer, feet, miles)", file=label, where="<Units>")
    if FT_PER_UNIT[linear] != 1.0 or FT_PER_UNIT[elev] != 1.0:
        said = UNIT_WORDS[linear] if elev == linear else (
            f"{UNIT_WORDS[linear]} (elevations {UNIT_WORDS[elev]})")
        warn(messages, f"{label}: LandXML units are {said}; coordinates, stations and "
             "elevations converted to feet")
    return Document(root, FT_PER_UNIT[linear], FT_PER_UNIT[elev], label, tuple(messages))


def open_landxml(path: Path, label: str) -> Document:
    """The parsed file (cached while it is unchanged)."""
    try:
        st = path.stat()
    except OSError as exc:
        raise ProfileError(f"cannot be read ({exc.strerror})", file=label) from None
    if st.st_size > MAX_LANDXML_BYTES:
        raise ProfileError(f"is {st.st_size / 2**20:.0f} MiB; the limit for a LandXML file is "
                           f"{MAX_LANDXML_BYTES // 2**20} MiB - export only the alignments and "
                           "surfaces the walls need", file=label)
    try:
        return _load(str(path), st.st_mtime_ns, st.st_size, label)
    except OSError as exc:
        raise ProfileError(f"cannot be read ({exc.strerror})", file=label) from None


def _named(doc: Document, kind: str, name: str, within=None):
    """The element ``<kind name=...>``; a missing name lists those the file has."""
    found = list(_iter(within if within is not None else doc.root, kind))
    for el in found:
        if el.get("name") == name:
            return el
    names = [el.get("name") or "(unnamed)" for el in found]
    word = {"Alignment": "alignment", "Surface": "surface"}.get(kind, "profile")
    where = "" if within is None else f" under alignment {within.get('name')!r}"
    have = ", ".join(repr(n) for n in names) if names else "none"
    raise ProfileError(f"has no {word} named {name!r}{where}; {word}s in the file: {have}",
                       file=doc.label)


def _numbers(el, what: str, label: str, count: int | None = None) -> list[float]:
    text = (el.text or "").split()
    try:
        vals = [float(t) for t in text]
    except ValueError:
        raise ProfileError(f"{what}: {' '.join(text)[:60]!r} is not a list of numbers",
                           file=label) from None
    if count is not None and len(vals) < count:
        raise ProfileError(f"{what}: expected {count} numbers, found {len(vals)}", file=label)
    if not all(math.isfinite(v) for v in vals):
        raise ProfileError(f"{what}: a value is not a finite number", file=label)
    return vals


# --------------------------------------------------------------------------- alignments


def _point(el, what: str, doc: Document, cg: dict) -> np.ndarray:
    """Plan (x = easting, y = northing) of a point element written "N E [Z]" (ft)."""
    if el is None:
        raise ProfileError(f"{what} is missing", file=doc.label)
    if not (el.text or "").strip() and el.get("pntRef"):
        ref = el.get("pntRef")
        if ref not in cg:
            raise ProfileError(f"{what} refers to point {ref!r}, which is not among the "
                               "file's CgPoints", file=doc.label)
        el = cg[ref]
    n, e = _numbers(el, what, doc.label, 2)[:2]
    return np.array([e, n]) * doc.ft_linear


def _arc(start, center, end, rot: str, what: str, label: str) -> np.ndarray:
    r0 = float(np.hypot(*(start - center)))
    r1 = float(np.hypot(*(end - center)))
    if r0 <= 0 or abs(r0 - r1) > max(JOIN_TOL_FT, 1e-6 * r0):
        raise ProfileError(f"{what}: Start is {r0:.3f} ft and End {r1:.3f} ft from Center; "
                           "they must lie on one circle", file=label)
    a0 = math.atan2(*(start - center)[::-1])
    a1 = math.atan2(*(end - center)[::-1])
    if rot == "ccw":
        sweep = (a1 - a0) % (2 * math.pi)
    elif rot == "cw":
        sweep = -((a0 - a1) % (2 * math.pi))
    else:
        raise ProfileError(f"{what}: rot = {rot!r}; LandXML 1.2 writes \"cw\" or \"ccw\"",
                           file=label)
    if abs(sweep) * r0 < 1e-9:
        raise ProfileError(f"{what}: Start and End are the same point (a full circle is not "
                           "an alignment)", file=label)
    step = 2 * math.acos(max(-1.0, 1 - ARC_CHORD_ERROR_FT / r0)) if r0 > ARC_CHORD_ERROR_FT \
        else math.pi / 2
    n = max(1, math.ceil(abs(sweep) / min(step, math.pi / 36)))
    ang = a0 + sweep * np.arange(n + 1) / n
    pts = center + r0 * np.column_stack([np.cos(ang), np.sin(ang)])
    pts[0], pts[-1] = start, end
    return pts


def _radius_curvature(el, attr: str, where: str, doc: Document) -> float:
    text = (el.get(attr) or "").strip()
    if text.upper() in ("INF", "INFINITY", "+INF"):
        return 0.0
    try:
        r = float(text) * doc.ft_linear
    except ValueError:
        raise ProfileError(f"{where}: {attr} = {text!r} is not a radius (a number or INF)",
                           file=doc.label) from None
    if math.isinf(r):
        return 0.0
    if not r > 0:
        raise ProfileError(f"{where}: {attr} must be greater than 0 (or INF)", file=doc.label)
    return 1.0 / r


def _spiral(el, where: str, doc: Document, cg: dict) -> np.ndarray:
    """A clothoid (curvature linear in length) from Start, heading toward its PI, with
    ``radiusStart`` and ``radiusEnd`` (INF for a tangent) over ``length``; its computed end
    must meet End within ``SPIRAL_END_TOL_FT``."""
    kind = (el.get("spiType") or "clothoid").strip()
    if kind.lower() != "clothoid":
        raise ProfileError(f"{where}: spiType = {kind!r}; only clothoid spirals are read - "
                           "replace the spiral with arcs in the design program", file=doc.label)
    try:
        length = float(el.get("length", "nan")) * doc.ft_linear
    except ValueError:
        length = math.nan
    if not (math.isfinite(length) and length > 0):
        raise ProfileError(f"{where}: needs a length (a number greater than 0)", file=doc.label)
    rot = (el.get("rot") or "").strip()
    if rot not in ("cw", "ccw"):
        raise ProfileError(f"{where}: rot = {rot!r}; LandXML 1.2 writes \"cw\" or \"ccw\"",
                           file=doc.label)
    sign = 1.0 if rot == "ccw" else -1.0
    k0 = sign * _radius_curvature(el, "radiusStart", where, doc)
    k1 = sign * _radius_curvature(el, "radiusEnd", where, doc)
    start = _point(_child(el, "Start"), f"{where} Start", doc, cg)
    end = _point(_child(el, "End"), f"{where} End", doc, cg)
    if _child(el, "PI") is None:
        raise ProfileError(f"{where}: needs its PI (where the tangents at its ends meet), "
                           "which gives its direction at the start", file=doc.label)
    pi = _point(_child(el, "PI"), f"{where} PI", doc, cg)
    th0 = math.atan2(*(pi - start)[::-1])
    kmax = max(abs(k0), abs(k1))
    step = math.sqrt(8 * ARC_CHORD_ERROR_FT / kmax) if kmax else length
    n = max(2, math.ceil(length / min(step, length / 2)))
    fine = 16 * n  # heading integrated on a finer grid (trapezoid rule)
    s = length * np.arange(fine + 1) / fine
    th = th0 + k0 * s + (k1 - k0) * s**2 / (2 * length)  # clothoid: d(theta)/ds linear in s
    dx, dy = np.cos(th), np.sin(th)
    h = length / fine
    x = np.r_[0.0, np.cumsum((dx[1:] + dx[:-1]) * h / 2)]
    y = np.r_[0.0, np.cumsum((dy[1:] + dy[:-1]) * h / 2)]
    pts = start + np.column_stack([x, y])[::16]
    miss = float(np.hypot(*(pts[-1] - end)))
    if miss > SPIRAL_END_TOL_FT:
        raise ProfileError(f"{where}: a clothoid of length {length:.3f} ft from Start toward "
                           f"its PI ends {miss:.3f} ft from its End; check the radii, rot "
                           "and points (or replace the spiral with arcs)", file=doc.label)
    pts[0], pts[-1] = start, end
    return pts


def read_alignment_landxml(path: Path, options: dict, label: str) -> LandXMLAlignment:
    """The named ``<Alignment>`` as a plan polyline in up-station order."""
    doc = open_landxml(path, label)
    name = options["alignment"]
    al = _named(doc, "Alignment", name)
    what = f"alignment {name!r}"
    if _child(al, "StaEquation") is not None:
        raise ProfileError(f"{what} has station equations (StaEquation); they are not "
                           "supported - give the wall one continuous stationing", file=label)
    geom = _child(al, "CoordGeom")
    if geom is None or not len(geom):
        raise ProfileError(f"{what} has no <CoordGeom> geometry", file=label)
    cg = {p.get("name"): p for p in _iter(doc.root, "CgPoint") if p.get("name")}
    pieces = []
    for k, el in enumerate(geom, 1):
        kind = _local(el.tag)
        where = f"{what}, element {k} ({kind})"
        if kind == "Line":
            pts = np.vstack([_point(_child(el, "Start"), f"{where} Start", doc, cg),
                             _point(_child(el, "End"), f"{where} End", doc, cg)])
        elif kind == "Curve":
            pts = _arc(_point(_child(el, "Start"), f"{where} Start", doc, cg),
                       _point(_child(el, "Center"), f"{where} Center", doc, cg),
                       _point(_child(el, "End"), f"{where} End", doc, cg),
                       (el.get("rot") or "").strip(), where, label)
        elif kind == "IrregularLine":
            lst = _child(el, "PntList2D")
            if lst is None:
                raise ProfileError(f"{where} has no PntList2D", file=label)
            vals = _numbers(lst, where, label)
            if len(vals) < 4 or len(vals) % 2:
                raise ProfileError(f"{where}: PntList2D must hold pairs N E", file=label)
            ne = np.array(vals).reshape(-1, 2)
            pts = ne[:, ::-1] * doc.ft_linear
        elif kind == "Spiral":
            pts = _spiral(el, where, doc, cg)
        else:
            raise ProfileError(f"{where}: <{kind}> is not supported in an alignment (Line, "
                               "Curve and IrregularLine are)", file=label)
        if pieces:
            gap = float(np.hypot(*(pts[0] - pieces[-1][-1])))
            if gap > JOIN_TOL_FT:
                raise ProfileError(f"{where} starts {gap:.3f} ft from where the element "
                                   f"before it ends (tolerance {JOIN_TOL_FT:g} ft); the "
                                   "alignment must be continuous", file=label)
            pts = pts[1:]
        pieces.append(pts)
    xy = np.vstack(pieces)
    base = alignment_from_xy(xy, f"{label} [{what}]")
    messages = list(doc.messages)
    stated = al.get("length")
    if stated is not None:
        try:
            length = float(stated) * doc.ft_linear
        except ValueError:
            length = None
        if length is not None and abs(length - base.length_ft) > max(0.01, 1e-5 * length):
            warn(messages, f"{label} {what}: its length attribute says {length:.3f} ft but "
                 f"its geometry is {base.length_ft:.3f} ft long; the geometry is used")
    start = al.get("staStart")
    start_ft = None
    if start is not None:
        try:
            start_ft = float(start) * doc.ft_linear
        except ValueError:
            raise ProfileError(f"{what}: staStart = {start!r} is not a number",
                               file=label) from None
    return LandXMLAlignment(base.line, base.label, tuple(messages), start_ft,
                            (str(path.resolve()), name))


# --------------------------------------------------------------------------- profiles


@dataclass(frozen=True)
class VerticalAlignment:
    """PVIs (station, elevation, ft) with a vertical curve at each interior PVI: kind
    ``""`` (none), ``"para"`` (symmetric parabola, ``size`` = its length) or ``"circ"``
    (circular arc, ``size`` = its radius)."""

    station: np.ndarray
    elevation: np.ndarray
    kind: tuple[str, ...]
    size: np.ndarray

    @property
    def grades(self) -> np.ndarray:
        return np.diff(self.elevation) / np.diff(self.station)

    def curve_ends(self) -> np.ndarray:
        """(BVC, EVC) station of each PVI's curve (both the PVI where it has none)."""
        g = self.grades
        out = np.column_stack([self.station, self.station])
        for k in range(1, len(self.station) - 1):
            g1, g2 = g[k - 1], g[k]
            if self.kind[k] == "para":
                out[k] = self.station[k] - self.size[k] / 2, self.station[k] + self.size[k] / 2
            elif self.kind[k] == "circ":
                a1, a2 = math.atan(g1), math.atan(g2)
                t = self.size[k] * math.tan(abs(a2 - a1) / 2)
                out[k] = self.station[k] - t * math.cos(a1), self.station[k] + t * math.cos(a2)
        return out

    def elevation_at(self, station_ft) -> np.ndarray:
        """Exact elevation: the tangents, and each vertical curve where it runs."""
        shape = np.shape(station_ft)
        s = np.clip(np.atleast_1d(np.asarray(station_ft, dtype=float)), self.station[0],
                    self.station[-1])
        z = np.interp(s, self.station, self.elevation)
        g = self.grades
        ends = self.curve_ends()
        for k in range(1, len(self.station) - 1):
            if not self.kind[k]:
                continue
            bvc, evc = ends[k]
            on = (s > bvc) & (s < evc)
            if not on.any():
                continue
            g1, g2 = g[k - 1], g[k]
            sk, zk = self.station[k], self.elevation[k]
            if self.kind[k] == "para":
                # symmetric parabola: z = z_BVC + g1 x + (g2 - g1) x^2 / (2 L), x from BVC
                length = self.size[k]
                x = s[on] - bvc
                z[on] = zk - g1 * length / 2 + g1 * x + (g2 - g1) * x**2 / (2 * length)
            else:  # circle of radius R tangent to both grades
                r = self.size[k]
                a1, a2 = math.atan(g1), math.atan(g2)
                t = r * math.tan(abs(a2 - a1) / 2)
                p1 = np.array([sk - t * math.cos(a1), zk - t * math.sin(a1)])
                up = 1.0 if a2 > a1 else -1.0  # sag: centre above the curve
                c = p1 + up * r * np.array([-math.sin(a1), math.cos(a1)])
                z[on] = c[1] - up * np.sqrt(np.maximum(r**2 - (s[on] - c[0]) ** 2, 0.0))
        return float(z[0]) if shape == () else z.reshape(shape)

    def points(self) -> np.ndarray:
        """Stations along the profile: PVIs, curve ends, each curve's high or low point and
        points along each curve within ``VERTICAL_CHORD_ERROR_FT`` of it."""
        g = self.grades
        ends = self.curve_ends()
        out = [self.station]
        for k in range(1, len(self.station) - 1):
            if not self.kind[k]:
                continue
            bvc, evc = ends[k]
            g1, g2 = g[k - 1], g[k]
            if self.kind[k] == "para":
                curvature = abs(g2 - g1) / self.size[k]
            else:
                curvature = 1.0 / self.size[k]
            step = math.sqrt(8 * VERTICAL_CHORD_ERROR_FT / curvature) if curvature else evc - bvc
            n = max(1, math.ceil((evc - bvc) / step))
            out.append(bvc + (evc - bvc) * np.arange(n + 1) / n)
            if g1 * g2 < 0:  # the high or low point, where the grade is zero
                if self.kind[k] == "para":
                    out.append([bvc - g1 * self.size[k] / (g2 - g1)])
                else:
                    out.append([_circle_level_point(self, k)])
        st = np.unique(np.concatenate([np.asarray(o, dtype=float) for o in out]))
        return st[(st >= self.station[0]) & (st <= self.station[-1])]


def _circle_level_point(va: VerticalAlignment, k: int) -> float:
    """Station of the centre of PVI ``k``'s circular curve (where its grade is zero)."""
    g = va.grades
    a1 = math.atan(g[k - 1])
    a2 = math.atan(g[k])
    t = va.size[k] * math.tan(abs(a2 - a1) / 2)
    up = 1.0 if a2 > a1 else -1.0
    return va.station[k] - t * math.cos(a1) - up * va.size[k] * math.sin(a1)


def _vertical(prof, what: str, doc: Document) -> VerticalAlignment:
    rows = []
    for el in prof:
        kind = _local(el.tag)
        if kind not in ("PVI", "ParaCurve", "CircCurve", "UnsymParaCurve"):
            continue
        where = f"{what}, <{kind}> {len(rows) + 1}"
        if kind == "UnsymParaCurve":
            raise ProfileError(f"{where}: unsymmetrical vertical curves are not supported; "
                               "use symmetric ParaCurves", file=doc.label)
        sta, elev = _numbers(el, where, doc.label, 2)[:2]
        size = 0.0
        if kind != "PVI":
            attr = "length" if kind == "ParaCurve" else "radius"
            try:
                size = float(el.get(attr, "nan"))
            except ValueError:
                size = math.nan
            if not (math.isfinite(size) and size >= 0):
                raise ProfileError(f"{where}: needs a {attr} (a number, ft or file units)",
                                   file=doc.label)
            size *= doc.ft_linear
        code = {"PVI": "", "ParaCurve": "para", "CircCurve": "circ"}[kind]
        rows.append((sta * doc.ft_linear, elev * doc.ft_elevation, code if size > 0 else "",
                     size))
    if len(rows) < 2:
        raise ProfileError(f"{what} has fewer than two PVIs", file=doc.label)
    st = np.array([r[0] for r in rows])
    if (np.diff(st) <= 0).any():
        k = int(np.argmax(np.diff(st) <= 0)) + 1
        raise ProfileError(f"{what}: PVI {k + 1} at station {format_station(st[k])} does not "
                           "come after the one before it; PVIs must be in station order",
                           file=doc.label)
    kinds = tuple(r[2] for r in rows)
    if kinds[0] or kinds[-1]:
        raise ProfileError(f"{what}: a vertical curve at the first or last PVI has no grade "
                           "on one side; end the profile with a plain PVI", file=doc.label)
    va = VerticalAlignment(st, np.array([r[1] for r in rows]), kinds,
                           np.array([r[3] for r in rows]))
    ends = va.curve_ends()
    for k in range(1, len(st)):
        if ends[k, 0] < ends[k - 1, 1] - 1e-6:
            raise ProfileError(f"{what}: the vertical curves at stations "
                               f"{format_station(st[k - 1])} and {format_station(st[k])} "
                               "overlap (or a curve runs past the profile's end); shorten one",
                               file=doc.label)
    return va


def read_profile_landxml(path: Path, options: dict, label: str, *, alignment=None,
                         start_station_ft: float | None = None) -> DrawingProfile:
    """The named ``<ProfAlign>`` (or ``<ProfSurf>``) of the named alignment.

    Its stations are the alignment's own. Where the wall is that very alignment
    (``alignment``, from the same file) and its start station was moved from the file's
    ``staStart`` (``start_station_ft``), the profile moves with it, and a warning says so."""
    profile = _read_profile(path, options, label)
    source = getattr(alignment, "source", None)
    sta_start = getattr(alignment, "start_station_ft", None)
    if (source != (str(path.resolve()), options["alignment"]) or sta_start is None
            or start_station_ft is None or abs(start_station_ft - sta_start) < 1e-9):
        return profile
    shift = float(start_station_ft - sta_start)
    messages = list(profile.warnings)
    warn(messages, f"{profile.label}: stations moved by {shift:+.2f} ft with the wall "
         f"(start_station_ft {format_station(start_station_ft)} instead of the alignment's "
         f"staStart {format_station(sta_start)})")
    st = profile.station_ft + shift
    if isinstance(profile, CurvedProfile):
        exact = profile.exact
        return CurvedProfile(st, profile.elevation_ft, profile.label, tuple(messages),
                             lambda s: exact(np.asarray(s, dtype=float) - shift))
    return DrawingProfile(st, profile.elevation_ft, profile.label, tuple(messages))


def _read_profile(path: Path, options: dict, label: str) -> DrawingProfile:
    doc = open_landxml(path, label)
    al = _named(doc, "Alignment", options["alignment"])
    name = options["profile"]
    found = [el for p in _children(al, "Profile") for el in p
             if _local(el.tag) in ("ProfAlign", "ProfSurf")]
    prof = next((el for el in found if el.get("name") == name), None)
    if prof is None:
        have = ", ".join(repr(el.get("name") or "(unnamed)") for el in found) or "none"
        raise ProfileError(f"alignment {options['alignment']!r} has no profile named {name!r};"
                           f" its profiles: {have}", file=label)
    what = f"profile {name!r} of alignment {options['alignment']!r}"
    tag = f"{label} [{what}]"
    if _local(prof.tag) == "ProfSurf":
        vals = [v for lst in _iter(prof, "PntList2D") for v in _numbers(lst, what, label)]
        if len(vals) < 4 or len(vals) % 2:
            raise ProfileError(f"{what}: PntList2D must hold at least two pairs of station "
                               "elevation", file=label)
        se = np.array(vals).reshape(-1, 2)
        st, el = se[:, 0] * doc.ft_linear, se[:, 1] * doc.ft_elevation
        order = np.argsort(st, kind="stable")
        st, el = st[order], el[order]
        keep = np.r_[True, np.diff(st) > 1e-9]
        return DrawingProfile(st[keep], el[keep], tag, doc.messages)
    va = _vertical(prof, what, doc)
    st = va.points()
    return CurvedProfile(st, va.elevation_at(st), tag, doc.messages, va.elevation_at)


# --------------------------------------------------------------------------- surfaces


@lru_cache(maxsize=8)
def _surface(path: str, mtime_ns: int, size: int, label: str, name: str):
    from .surface import make_surface

    doc = _load(path, mtime_ns, size, label)
    surf = _named(doc, "Surface", name)
    what = f"surface {name!r}"
    defs = _children(surf, "Definition")
    if not defs:
        raise ProfileError(f"{what} has no <Definition> (points and faces)", file=label)
    d = defs[0]
    kind = d.get("surfType", "TIN")
    if kind.upper() != "TIN":
        raise ProfileError(f"{what} is surfType={kind!r}; only TIN surfaces are read",
                           file=label)
    ids: dict[str, int] = {}
    coords = []
    for p in (p for pn in _children(d, "Pnts") for p in _children(pn, "P")):
        pid = p.get("id")
        vals = _numbers(p, f"{what} point {pid}", label, 3)
        if pid in ids:
            raise ProfileError(f"{what}: point id {pid} is used twice", file=label)
        ids[pid] = len(coords)
        coords.append(vals[:3])
    if len(coords) < 3:
        raise ProfileError(f"{what} has fewer than three points", file=label)
    faces = []
    hidden = 0
    for k, f in enumerate((f for fc in _children(d, "Faces") for f in _children(fc, "F")), 1):
        if (f.get("i") or "0").strip() == "1":
            hidden += 1
            continue
        refs = (f.text or "").split()
        if len(refs) != 3:
            raise ProfileError(f"{what}: face {k} has {len(refs)} points; a TIN face has "
                               "three", file=label)
        try:
            faces.append([ids[r] for r in refs])
        except KeyError as exc:
            raise ProfileError(f"{what}: face {k} refers to point {exc.args[0]}, which is "
                               "not among its points", file=label) from None
    if not faces:
        raise ProfileError(f"{what} has no visible faces", file=label)
    pts = np.array(coords, dtype=float)
    xy = pts[:, [1, 0]] * doc.ft_linear  # "N E Z": x = easting, y = northing
    z = pts[:, 2] * doc.ft_elevation
    messages = list(doc.messages)
    return make_surface(xy, z, faces, name=f"surface {name!r}", label=label,
                        messages=messages)


def read_surface_landxml(path: Path, options: dict, label: str):
    """The named TIN ``<Surface>`` as a :class:`~.surface.Surface`."""
    doc_stat = path.stat()
    open_landxml(path, label)  # size check, parse, units
    return _surface(str(path), doc_stat.st_mtime_ns, doc_stat.st_size, label, options["surface"])
