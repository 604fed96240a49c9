"""LandXML 1.2 profiles (``<Profile><ProfAlign>`` and ``<ProfSurf>``) along an alignment of the
same file: PVIs, symmetric parabolas and circular arcs, each exact at every station (the
document layer is :mod:`.landxml`)."""

from __future__ import annotations

import math
from dataclasses import dataclass
from pathlib import Path

import numpy as np

from ..errors import ProfileError
from .core import DrawingProfile, warn
from .landxml import (
    CurvedProfile,
    Document,
    children,
    iter_named,
    local_name,
    named,
    numbers,
    open_landxml,
)
from .stationing import format_station

VERTICAL_CHORD_ERROR_FT = 0.001  # vertical curves: profile points this close to the curve


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
        kind = local_name(el.tag)
        if kind not in ("PVI", "ParaCurve", "CircCurve", "UnsymParaCurve"):
            continue
        where = f"{what}, <{kind}> {len(rows) + 1}"
        if kind == "UnsymParaCurve":
            raise ProfileError(f"{where}: unsymmetrical vertical curves are not supported; "
                               "use symmetric ParaCurves", file=doc.label)
        sta, elev = numbers(el, where, doc.label, 2)[:2]
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
    al = named(doc, "Alignment", options["alignment"])
    name = options["profile"]
    found = [el for p in children(al, "Profile") for el in p
             if local_name(el.tag) in ("ProfAlign", "ProfSurf")]
    prof = next((el for el in found if el.get("name") == name), None)
    if prof is None:
        have = ", ".join(repr(el.get("name") or "(unnamed)") for el in found) or "none"
        raise ProfileError(f"alignment {options['alignment']!r} has no profile named {name!r};"
                           f" its profiles: {have}", file=label)
    what = f"profile {name!r} of alignment {options['alignment']!r}"
    tag = f"{label} [{what}]"
    if local_name(prof.tag) == "ProfSurf":
        vals = [v for lst in iter_named(prof, "PntList2D") for v in numbers(lst, what, label)]
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
