"""LandXML 1.2 (an open standard) reader: the document and its alignments (profiles in
:mod:`.landxml_profile`, TIN surfaces in :mod:`.landxml_surface`).

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
from .core import DrawingAlignment, DrawingProfile, checked_stat, warn
from .csvread import alignment_from_xy

MAX_LANDXML_BYTES = 200 * 1024 * 1024  # larger files are refused unread (stated in README)
ARC_CHORD_ERROR_FT = 0.001  # chords of an arc stay this close to it; stations within ~0.001 ft
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


def local_name(tag) -> str:
    return tag.rsplit("}", 1)[-1] if isinstance(tag, str) else ""


def children(el, name: str) -> list:
    return [c for c in el if local_name(c.tag) == name]


def child(el, name: str):
    for c in el:
        if local_name(c.tag) == name:
            return c
    return None


def iter_named(el, name: str):
    return (c for c in el.iter() if local_name(c.tag) == name)


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
    if local_name(root.tag) != "LandXML":
        raise ProfileError(f"is not a LandXML file (its root element is <{local_name(root.tag)}>, "
                           "not <LandXML>)", file=label)
    return root


@lru_cache(maxsize=8)
def load_document(path: str, mtime_ns: int, size: int, label: str) -> Document:
    raw = Path(path).read_bytes()
    root = parse_landxml(raw, label)
    del raw
    messages: list[str] = []
    units = child(root, "Units")
    system = None
    if units is not None:
        system = next((c for c in units if local_name(c.tag) in ("Imperial", "Metric")), None)
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
    st = checked_stat(path, label, MAX_LANDXML_BYTES, "a LandXML file",
                      "export only the alignments and surfaces the walls need")
    try:
        return load_document(str(path), st.st_mtime_ns, st.st_size, label)
    except OSError as exc:
        raise ProfileError(f"cannot be read ({exc.strerror})", file=label) from None


def named(doc: Document, kind: str, name: str, within=None):
    """The element ``<kind name=...>``; a missing name lists those the file has."""
    found = list(iter_named(within if within is not None else doc.root, kind))
    for el in found:
        if el.get("name") == name:
            return el
    names = [el.get("name") or "(unnamed)" for el in found]
    word = {"Alignment": "alignment", "Surface": "surface"}.get(kind, "profile")
    where = "" if within is None else f" under alignment {within.get('name')!r}"
    have = ", ".join(repr(n) for n in names) if names else "none"
    raise ProfileError(f"has no {word} named {name!r}{where}; {word}s in the file: {have}",
                       file=doc.label)


def numbers(el, what: str, label: str, count: int | None = None) -> list[float]:
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
    n, e = numbers(el, what, doc.label, 2)[:2]
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
    start = _point(child(el, "Start"), f"{where} Start", doc, cg)
    end = _point(child(el, "End"), f"{where} End", doc, cg)
    if child(el, "PI") is None:
        raise ProfileError(f"{where}: needs its PI (where the tangents at its ends meet), "
                           "which gives its direction at the start", file=doc.label)
    pi = _point(child(el, "PI"), f"{where} PI", doc, cg)
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
    al = named(doc, "Alignment", name)
    what = f"alignment {name!r}"
    if child(al, "StaEquation") is not None:
        raise ProfileError(f"{what} has station equations (StaEquation); they are not "
                           "supported - give the wall one continuous stationing", file=label)
    geom = child(al, "CoordGeom")
    if geom is None or not len(geom):
        raise ProfileError(f"{what} has no <CoordGeom> geometry", file=label)
    cg = {p.get("name"): p for p in iter_named(doc.root, "CgPoint") if p.get("name")}
    pieces = []
    for k, el in enumerate(geom, 1):
        where = f"{what}, element {k} ({local_name(el.tag)})"
        pts = _element_points(el, where, doc, cg, label)
        if pieces:
            gap = float(np.hypot(*(pts[0] - pieces[-1][-1])))
            if gap > JOIN_TOL_FT:
                raise ProfileError(f"{where} starts {gap:.3f} ft from where the element "
                                   f"before it ends (tolerance {JOIN_TOL_FT:g} ft); the "
                                   "alignment must be continuous", file=label)
            pts = pts[1:]
        pieces.append(pts)
    base = alignment_from_xy(np.vstack(pieces), f"{label} [{what}]")
    messages = list(doc.messages)
    _check_stated_length(al, base.length_ft, doc, messages, f"{label} {what}")
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


def _element_points(el, where: str, doc: Document, cg: dict, label: str) -> np.ndarray:
    """One ``<CoordGeom>`` element as plan points (x, y) in ft, arcs and spirals as chords."""
    kind = local_name(el.tag)
    if kind == "Line":
        return np.vstack([_point(child(el, "Start"), f"{where} Start", doc, cg),
                          _point(child(el, "End"), f"{where} End", doc, cg)])
    if kind == "Curve":
        return _arc(_point(child(el, "Start"), f"{where} Start", doc, cg),
                    _point(child(el, "Center"), f"{where} Center", doc, cg),
                    _point(child(el, "End"), f"{where} End", doc, cg),
                    (el.get("rot") or "").strip(), where, label)
    if kind == "IrregularLine":
        lst = child(el, "PntList2D")
        if lst is None:
            raise ProfileError(f"{where} has no PntList2D", file=label)
        vals = numbers(lst, where, label)
        if len(vals) < 4 or len(vals) % 2:
            raise ProfileError(f"{where}: PntList2D must hold pairs N E", file=label)
        return np.array(vals).reshape(-1, 2)[:, ::-1] * doc.ft_linear
    if kind == "Spiral":
        return _spiral(el, where, doc, cg)
    raise ProfileError(f"{where}: <{kind}> is not supported in an alignment (Line, "
                       "Curve and IrregularLine are)", file=label)


def _check_stated_length(al, length_ft: float, doc: Document, messages: list, what: str):
    """A warning where the alignment's ``length`` attribute disagrees with its geometry."""
    stated = al.get("length")
    if stated is None:
        return
    try:
        length = float(stated) * doc.ft_linear
    except ValueError:
        return
    if abs(length - length_ft) > max(0.01, 1e-5 * length):
        warn(messages, f"{what}: its length attribute says {length:.3f} ft but "
             f"its geometry is {length_ft:.3f} ft long; the geometry is used")
