"""Alignments (and 3D grade lines) from GIS files: GeoPackage, GeoJSON, Shapefile.

Read with geopandas. The feature is picked by ``field`` and ``value`` (both may be left out
when the file holds a single feature); ``layer`` names a layer of a multi-layer GeoPackage.

Coordinates must be lengths in feet: the file's CRS must be projected with a foot unit. A
projected CRS in another unit (metres) is converted when the source says so with
``units = "m"`` (the unit the CRS declares); ``to_crs = "EPSG:nnnn"`` reprojects first, which
is the way to use a file in a geographic CRS (degrees are angles, not lengths).
"""

from __future__ import annotations

import contextlib
from collections.abc import Mapping
from pathlib import Path
from typing import Any

import numpy as np
import shapely

from ..errors import ProfileError
from .core import (
    Alignment,
    DrawingAlignment,
    DrawingProfile,
    Projector,
    project_polyline,
    warn,
)
from .csvread import MAX_COORDINATE_FT, alignment_from_xy
from .dxfread import (
    FT_PER_UNIT,
    MAX_OFFSET_FT,
    build_profile,
    orient,
)

FOOT_UNITS = {"foot": "ft", "us survey foot": "us-ft", "metre": "m", "meter": "m"}


def _crs_scale(crs, options: Mapping[str, Any], label: str) -> float:
    """Feet per coordinate unit of a projected CRS, after the checks."""
    if crs is None:
        if options.get("units") is None:
            raise ProfileError("has no coordinate reference system (CRS); add one to the file "
                               "(e.g. a .prj beside a shapefile) or say units = \"ft\" in the "
                               "source", file=label)
        return FT_PER_UNIT[options["units"]]
    name = crs.name
    if crs.is_geographic:
        raise ProfileError(
            f"is in a geographic CRS ({name}): its coordinates are degrees of latitude and "
            "longitude, not lengths, so stations cannot be measured; reproject the file to a "
            "projected CRS in feet, or add to_crs = \"EPSG:....\" (a projected CRS) to the "
            "source", file=label)
    if not crs.is_projected:
        raise ProfileError(f"is in a CRS that is not projected ({name}); use a projected CRS "
                           "in feet", file=label)
    axis = crs.axis_info[0]
    unit = FOOT_UNITS.get(axis.unit_name.lower())
    factor_ft = axis.unit_conversion_factor / 0.3048  # metres per unit -> feet per unit
    declared = options.get("units")
    if unit in ("ft", "us-ft") and declared in (None, unit):
        return factor_ft
    if declared is None:
        raise ProfileError(
            f"is in {name}, whose unit is {axis.unit_name}, not feet; add units = "
            f"\"{unit or 'm'}\" to the source to convert, or reproject the file to a CRS in "
            "feet", file=label)
    if unit is not None and declared != unit:
        raise ProfileError(f"the source says units = \"{declared}\" but the CRS ({name}) is in "
                           f"{axis.unit_name}; correct the source", file=label)
    return factor_ft


def read_feature(path: Path, options: Mapping[str, Any], label: str):
    """(shapely geometry in feet, feature description) of the chosen feature."""
    frame = _read_frame(path, options, label)
    scale = _crs_scale(frame.crs, options, label)
    row, where = _pick_row(frame, options, label)
    geom = row.geometry
    if geom is None or geom.is_empty:
        raise ProfileError("the feature has no geometry", file=label, where=where)
    if geom.geom_type == "MultiLineString":
        geom = shapely.line_merge(geom)
    if geom.geom_type != "LineString":
        raise ProfileError(f"the feature is a {geom.geom_type}; a wall needs one connected "
                           "line", file=label, where=where)
    coords = np.asarray(geom.coords, dtype=float) * scale
    if not np.isfinite(coords).all() or np.abs(coords).max() > MAX_COORDINATE_FT:
        bad = int(np.argmax(~np.isfinite(coords).all(axis=1)
                            | (np.abs(np.nan_to_num(coords, nan=np.inf)) > MAX_COORDINATE_FT
                               ).any(axis=1)))
        raise ProfileError(f"vertex {bad + 1} of the feature is {tuple(coords[bad])}: a "
                           "coordinate or z that is not a finite number of at most "
                           f"{MAX_COORDINATE_FT:.0e} ft; fix the feature", file=label,
                           where=where)
    return coords, where, scale


def _read_frame(path: Path, options: Mapping[str, Any], label: str):
    """The file's layer as a GeoDataFrame, reprojected by ``to_crs`` when given."""
    import geopandas as gpd

    kw = {}
    if options.get("layer") is not None:
        kw["layer"] = options["layer"]
    try:
        frame = gpd.read_file(path, **kw)
    except Exception as exc:  # noqa: BLE001 - any failure of the driver is bad input here
        text = " ".join(str(exc).split())[:160]
        raise ProfileError(f"cannot be read as a GIS file ({text})", file=label) from None
    if options.get("to_crs") is not None:
        if frame.crs is None:
            raise ProfileError("has no CRS, so to_crs cannot reproject it", file=label)
        try:
            frame = frame.to_crs(options["to_crs"])
        except Exception as exc:  # noqa: BLE001 - pyproj refuses an unknown CRS its own way
            text = " ".join(str(exc).split())[:120]
            raise ProfileError(f"to_crs = {options['to_crs']!r:.40} cannot be used ({text}); "
                               "give a projected CRS such as \"EPSG:2227\"", file=label,
                               where="to_crs") from None
    return frame


def _pick_row(frame, options: Mapping[str, Any], label: str):
    """The one feature the options choose (the only one, or ``field`` = ``value``) and its
    description."""
    field = options.get("field")
    if field is None:
        if len(frame) != 1:
            raise ProfileError(f"holds {len(frame)} features; pick one with field = \"...\" "
                               "and value = ...", file=label)
        return frame.iloc[0], "feature 1"
    if field not in frame.columns:
        cols = [c for c in frame.columns if c != frame.geometry.name]
        raise ProfileError(f"has no field '{field}'; fields: {', '.join(map(str, cols))}",
                           file=label, where=f"field {field}")
    value = options["value"]
    col = frame[field]
    hit = col.astype(str) == str(value)
    if isinstance(value, (int, float)) and not isinstance(value, bool):
        with contextlib.suppress(TypeError, ValueError):
            hit = hit | (col.astype(float) == float(value))
    where = f"{field} = {value!r}"
    if int(hit.sum()) != 1:
        some = ", ".join(sorted({str(v) for v in col})[:12])
        what = "no feature has" if not hit.any() else f"{int(hit.sum())} features have"
        raise ProfileError(f"{what} {where}; values present: {some}", file=label,
                           where=where)
    return frame[hit].iloc[0], where


def read_alignment_gis(path: Path, options: Mapping[str, Any], label: str) -> DrawingAlignment:
    """A wall alignment from one line feature of a GIS file."""
    coords, where, scale = read_feature(path, options, label)
    start = options.get("start")
    if start is not None and not isinstance(start, str):
        start = [float(v) * scale for v in start]
    xy = orient(coords[:, :2], start, label=label, where=where)
    base = alignment_from_xy(xy, f"{label} [{where}]")
    return DrawingAlignment(base.line, base.label, ())


def read_grade_gis(path: Path, options: Mapping[str, Any], label: str, *,
                   alignment: Alignment, start_station_ft: float) -> DrawingProfile:
    """A grade from one 3D line feature (z = elevation) projected onto the wall."""
    coords, where, _scale = read_feature(path, options, label)
    if coords.shape[1] < 3:
        raise ProfileError("the feature has no z values; a grade line needs elevations",
                           file=label, where=where)
    messages: list[str] = []
    max_off = float(options.get("max_offset_ft", MAX_OFFSET_FT))
    st, el, dropped = project_polyline(Projector(alignment, start_station_ft), coords[:, :3],
                                       max_off)
    lab = f"{label} [{where}]"
    if dropped:
        warn(messages, f"{lab}: {dropped} vertex(es) farther than {max_off:g} ft from the "
             "wall ignored")
    return build_profile(st, el, [where] * len(st), label=lab, what="vertex",
                         messages=messages)
