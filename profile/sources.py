"""Dispatch a site-file source (CSV path or inline table) to its reader.

A new reader goes here: add its option keys to ``OPTION_KEYS`` and a branch to
:func:`read_alignment` / :func:`read_grade`.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from typing import Any

from ..errors import InputError
from .core import Alignment, GradeProfile
from .csvread import MAX_COORDINATE_FT, read_alignment_csv, read_grade_csv

# Option keys an inline source table may carry besides its file key, per kind.
OPTION_KEYS: dict[str, tuple[str, ...]] = {
    "csv": (),
    "dxf": ("layer", "start", "gap_tolerance_ft", "units", "max_offset_ft", "labels",
            "pattern", "allowance_ft", "view", "origin_station_ft", "origin_elevation_ft",
            "vertical_exaggeration", "origin_xy", "offset_ft"),
    "gis": ("field", "value", "layer", "start", "units", "to_crs", "max_offset_ft"),
    "landxml": ("alignment", "surface", "profile", "offset_ft"),
    "points": ("offset_ft", "code", "max_edge_ft"),
}
UNIT_NAMES = ("ft", "us-ft", "m", "cm", "mm", "in")
# upper limits of the numeric options (larger is a typing error, never a drawing)
MAX_GAP_TOLERANCE_FT = 10.0  # ends of alignment pieces joined across at most this
MAX_OFFSET_LIMIT_FT = 1000.0  # grade vertices read at most this far from the wall
MAX_ALLOWANCE_FT = 100.0
MAX_VERTICAL_EXAGGERATION = 100.0
ALIGNMENT_ONLY = ("start", "gap_tolerance_ft")
GRADE_ONLY = ("max_offset_ft", "labels", "pattern", "allowance_ft", "view",
              "origin_station_ft", "origin_elevation_ft", "vertical_exaggeration", "origin_xy",
              "offset_ft", "surface", "profile", "code", "max_edge_ft")


def check_source_options(kind: str, options: Mapping[str, Any], *, file, key: str) -> None:
    """Refuse unknown option keys of an inline source (site-file validation time)."""
    import difflib

    allowed = OPTION_KEYS.get(kind, ())
    if kind not in OPTION_KEYS:  # a kind with no options is listed with ()
        raise InputError(f"{kind.upper()} sources are not supported by this version; "
                         "give a CSV path", file=file, where=key)
    for k in options:
        if k not in allowed:
            hint = difflib.get_close_matches(k, allowed, n=1)
            tail = f"did you mean '{hint[0]}'?" if hint else (
                "allowed: " + ", ".join(allowed) if allowed else "no options are allowed")
            raise InputError(f"unknown option '{k}' for a {kind} source; {tail}",
                             file=file, where=key)
    check_option_values(kind, options, file=file, key=key)


def _is_number(v) -> bool:
    return isinstance(v, (int, float)) and not isinstance(v, bool)


def _finite(v) -> bool:
    try:
        return math.isfinite(float(v))
    except OverflowError:  # an integer past a float
        return False


def _number(options, name, *, file, key, lo=None, hi=None, positive=False):
    v = options.get(name)
    if v is None:
        return
    if not _is_number(v):
        raise InputError(f"'{name}' must be a number, got {v!r:.60}", file=file,
                         where=f"{key}.{name}")
    hi = MAX_COORDINATE_FT if hi is None else hi
    if not _finite(v) or abs(v) > MAX_COORDINATE_FT:
        raise InputError(f"'{name}' must be a finite number of at most {MAX_COORDINATE_FT:.0e} "
                         f"in size, got {_text(v)}", file=file, where=f"{key}.{name}")
    if positive and not v > 0:
        raise InputError(f"'{name}' must be greater than 0, got {v!r:.60}", file=file,
                         where=f"{key}.{name}")
    if lo is not None and v < lo:
        raise InputError(f"'{name}' must be at least {lo:g}, got {v!r:.60}", file=file,
                         where=f"{key}.{name}")
    if v > hi:
        raise InputError(f"'{name}' must be at most {hi:g}, got {v:g}", file=file,
                         where=f"{key}.{name}")


def _text(v) -> str:
    if isinstance(v, int) and abs(v) >= 10 ** 15:
        return f"a {len(str(abs(v)))}-digit number"
    return repr(v)


def _point(options, name, *, file, key):
    v = options.get(name)
    if v is None:
        return
    ok = isinstance(v, list) and len(v) == 2 and all(_is_number(c) for c in v)
    if not ok:
        raise InputError(f"'{name}' must be a point [x, y] (two numbers), got {v!r:.60}",
                         file=file, where=f"{key}.{name}")
    if not all(_finite(c) and abs(c) <= MAX_COORDINATE_FT for c in v):
        raise InputError(f"'{name}' must be a point of finite coordinates of at most "
                         f"{MAX_COORDINATE_FT:.0e} in size, got [{', '.join(map(_text, v))}]",
                         file=file, where=f"{key}.{name}")


def check_surface_options(kind: str, options: Mapping[str, Any], *, file, key: str) -> None:
    """The LandXML and survey-point sources, and a DXF TIN (a DXF grade with offset_ft)."""
    is_alignment = key.endswith("alignment")
    for name in ("alignment", "surface", "profile", "code"):
        v = options.get(name)
        if v is not None and (not isinstance(v, str) or not v.strip()):
            raise InputError(f"'{name}' must be a non-empty string, got {v!r}", file=file,
                             where=f"{key}.{name}")
    _number(options, "offset_ft", file=file, key=key, lo=0.0)
    _number(options, "max_edge_ft", file=file, key=key, positive=True)
    existing = key.endswith("existing_ground")
    need_offset = ("offset_ft is required for a surface: the plan distance from the wall "
                   "line to where the grade is taken, on the grade's own side (the retained "
                   "side for retained_grade, the front for front_grade)")
    if kind == "points":
        if is_alignment:
            raise InputError("survey points are a surface, not an alignment; give the wall "
                             "line as a CSV, DXF, GIS or LandXML alignment", file=file,
                             where=key)
        if "offset_ft" not in options and not existing:
            raise InputError(need_offset, file=file, where=key)
        return
    if kind == "dxf":
        if "offset_ft" in options:
            for name in ("labels", "view", "max_offset_ft"):
                if name in options:
                    raise InputError(f"'{name}' does not apply to a TIN (a DXF grade with "
                                     "offset_ft)", file=file, where=f"{key}.{name}")
        return
    # landxml
    if is_alignment:
        if "alignment" not in options:
            raise InputError("a LandXML alignment needs alignment = \"...\" (its name in the "
                             "file)", file=file, where=key)
        return
    has_surface, has_profile = "surface" in options, "profile" in options
    if has_surface == has_profile:
        raise InputError("a LandXML grade needs either surface = \"...\" (a TIN, with "
                         "offset_ft) or profile = \"...\" (with alignment = \"...\")",
                         file=file, where=key)
    if has_surface:
        if "alignment" in options:
            raise InputError("'alignment' applies to a profile, not to a surface (the "
                             "surface is sampled along the wall's own alignment)", file=file,
                             where=f"{key}.alignment")
        if "offset_ft" not in options and not existing:
            raise InputError(need_offset, file=file, where=key)
    else:
        if "alignment" not in options:
            raise InputError("a LandXML profile needs alignment = \"...\" (the alignment "
                             "the profile belongs to)", file=file, where=key)
        if "offset_ft" in options:
            raise InputError("'offset_ft' applies to a surface; a profile is read by station",
                             file=file, where=f"{key}.offset_ft")


def check_option_values(kind: str, options: Mapping[str, Any], *, file, key: str) -> None:
    """Types, ranges and combinations of an inline source's options."""
    is_alignment = key.endswith("alignment")
    for name in options:
        if is_alignment and name in GRADE_ONLY:
            raise InputError(f"'{name}' applies to grade sources, not to an alignment",
                             file=file, where=f"{key}.{name}")
        if not is_alignment and name in ALIGNMENT_ONLY:
            raise InputError(f"'{name}' applies to an alignment, not to a grade",
                             file=file, where=f"{key}.{name}")
    if kind in ("landxml", "points") or "offset_ft" in options:
        check_surface_options(kind, options, file=file, key=key)
        if kind != "dxf":
            return
    _check_names_and_values(kind, options, file=file, key=key)
    _check_numbers(options, file=file, key=key)
    _check_label_options(options, file=file, key=key)
    _check_view(options, file=file, key=key)


def _check_names_and_values(kind: str, options, *, file, key: str) -> None:
    """The layer, field and value that pick the drawn or mapped feature; the units."""
    for name in ("layer", "field", "to_crs", "pattern"):
        v = options.get(name)
        if v is not None and (not isinstance(v, str) or not v.strip()):
            raise InputError(f"'{name}' must be a non-empty string, got {v!r:.60}", file=file,
                             where=f"{key}.{name}")
    if kind == "dxf" and "layer" not in options:
        raise InputError("a DXF source needs layer = \"...\" (the drawing's layer name)",
                         file=file, where=key)
    if kind == "gis" and ("field" in options) != ("value" in options):
        raise InputError("give field and value together (the attribute that picks the "
                         "feature and its value)", file=file, where=key)
    v = options.get("value")
    if v is not None and (isinstance(v, bool) or not isinstance(v, (str, int, float))):
        raise InputError(f"'value' must be a string or a number, got {v!r:.60}", file=file,
                         where=f"{key}.value")
    u = options.get("units")
    if u is not None and u not in UNIT_NAMES:
        raise InputError(f"units = {u!r:.60} is not known; use one of "
                         + ", ".join(f'"{n}"' for n in UNIT_NAMES), file=file,
                         where=f"{key}.units")


def _check_numbers(options, *, file, key: str) -> None:
    start = options.get("start")
    if start is not None and not (isinstance(start, str) and start.lower() in (
            "first vertex", "last vertex")):
        _point(options, "start", file=file, key=key)
    _point(options, "origin_xy", file=file, key=key)
    _number(options, "gap_tolerance_ft", file=file, key=key, lo=0.0, hi=MAX_GAP_TOLERANCE_FT)
    _number(options, "max_offset_ft", file=file, key=key, positive=True, hi=MAX_OFFSET_LIMIT_FT)
    _number(options, "allowance_ft", file=file, key=key, lo=0.0, hi=MAX_ALLOWANCE_FT)
    _number(options, "origin_station_ft", file=file, key=key)
    _number(options, "origin_elevation_ft", file=file, key=key)
    _number(options, "vertical_exaggeration", file=file, key=key, positive=True,
            hi=MAX_VERTICAL_EXAGGERATION)


def _check_label_options(options, *, file, key: str) -> None:
    """Spot labels (TW or BW), their pattern and the TW allowance."""
    labels = options.get("labels")
    if labels is not None and (not isinstance(labels, str) or labels.upper() not in ("TW", "BW")):
        raise InputError(f"labels = {labels!r:.60}; use \"TW\" (top of wall / retained grade) or "
                         "\"BW\" (bottom of wall / front grade)", file=file,
                         where=f"{key}.labels")
    for name in ("pattern", "allowance_ft"):
        if name in options and labels is None:
            raise InputError(f"'{name}' applies to spot labels; add labels = \"TW\" or "
                             "\"BW\"", file=file, where=f"{key}.{name}")
    if "allowance_ft" in options and labels.upper() != "TW":
        raise InputError("'allowance_ft' applies to TW labels only", file=file,
                         where=f"{key}.allowance_ft")
    if "pattern" in options:
        from .labels import compile_pattern

        try:
            compile_pattern(options["pattern"])
        except ValueError as exc:
            raise InputError(f"pattern {exc}", file=file, where=f"{key}.pattern") from None


PROFILE_VIEW_KEYS = ("origin_station_ft", "origin_elevation_ft", "vertical_exaggeration",
                     "origin_xy")


def _check_view(options, *, file, key: str) -> None:
    """A plan source, or a profile view with its origin."""
    view = options.get("view", "plan")
    if view not in ("plan", "profile"):
        raise InputError(f"view = {view!r:.60}; use \"plan\" (lines drawn in plan, the default) or "
                         "\"profile\" (a profile view)", file=file, where=f"{key}.view")
    if view == "profile":
        if options.get("labels") is not None:
            raise InputError("labels are read in plan; remove view = \"profile\" or labels",
                             file=file, where=key)
        for name in ("origin_station_ft", "origin_elevation_ft"):
            if name not in options:
                raise InputError(f"a profile view needs '{name}' (the station and elevation "
                                 "at the view's origin)", file=file, where=key)
        if "max_offset_ft" in options:
            raise InputError("'max_offset_ft' applies to plan sources, not to a profile view",
                             file=file, where=f"{key}.max_offset_ft")
    else:
        for name in PROFILE_VIEW_KEYS:
            if name in options:
                raise InputError(f"'{name}' applies to a profile view; add view = \"profile\"",
                                 file=file, where=f"{key}.{name}")


def _label(src, site_folder) -> str:
    try:
        return str(src.path.relative_to(site_folder))
    except ValueError:
        return str(src.path)


def read_alignment(src, site_folder, *, start_hint=None) -> Alignment:
    """The plan alignment of a wall from its source."""
    label = _label(src, site_folder)
    if src.kind == "csv":
        return read_alignment_csv(src.path, label)
    options = dict(src.options)
    if start_hint is not None and "start" not in options:
        options["start"] = start_hint
    if src.kind == "dxf":
        from .dxfread import read_alignment_dxf

        return read_alignment_dxf(src.path, options, label)
    if src.kind == "gis":
        from .gisread import read_alignment_gis

        return read_alignment_gis(src.path, options, label)
    if src.kind == "landxml":
        from .landxml import read_alignment_landxml

        return read_alignment_landxml(src.path, options, label)
    raise InputError(f"{src.kind} alignments are not supported", file=label, where=src.key)


def read_surface(src, site_folder):
    """The TIN of a surface source (LandXML surface, DXF TIN or survey points)."""
    label = _label(src, site_folder)
    if src.kind == "landxml":
        from .landxml_surface import read_surface_landxml

        return read_surface_landxml(src.path, src.options, label)
    if src.kind == "dxf":
        from .tinread import read_dxf_tin

        return read_dxf_tin(src.path, src.options, label)
    from .tinread import read_points

    return read_points(src.path, src.options, label)


def is_surface(src) -> bool:
    """Whether a grade source is a surface, sampled at an offset from the wall."""
    return src.kind == "points" or (src.kind == "landxml" and "surface" in src.options) or (
        src.kind == "dxf" and "offset_ft" in src.options)


def side_of(src, retained_side: str) -> tuple[float, str]:
    """(sign, side) of a grade's offset: +1 left, -1 right, looking up-station. The retained
    grade and existing ground are taken on the retained side, the front grade on the other."""
    front = src.key.endswith("front_grade")
    left = (retained_side == "left") != front
    return (1.0, "left") if left else (-1.0, "right")


def read_grade(src, site_folder, *, alignment: Alignment, start_station_ft: float,
               retained_side: str) -> GradeProfile:
    """A station/elevation profile from its source (CSV, or a drawing along ``alignment``)."""
    label = _label(src, site_folder)
    if src.kind == "csv":
        return read_grade_csv(src.path, label)
    options = src.options
    along = dict(alignment=alignment, start_station_ft=start_station_ft)
    if is_surface(src):
        from .surface import surface_grade

        sign, side = side_of(src, retained_side)
        what = src.key.rsplit(".", 1)[-1].replace("_", " ")
        return surface_grade(read_surface(src, site_folder), alignment,
                             start_station_ft=start_station_ft,
                             offset_ft=float(options.get("offset_ft", 0.0)), sign=sign,
                             what=what, side=side)
    if src.kind == "landxml":
        from .landxml_profile import read_profile_landxml

        return read_profile_landxml(src.path, options, label, **along)
    if src.kind == "dxf":
        if options.get("labels") is not None:
            from .labels import read_label_grade

            return read_label_grade(src.path, options, label, **along)
        from . import dxfread

        if options.get("view", "plan") == "profile":
            return dxfread.read_profile_view(src.path, options, label)
        try:
            return dxfread.read_plan_grade(src.path, options, label, **along)
        except InputError as exc:
            if "3DFACE" not in exc.message and "polyface" not in exc.message:
                raise
            raise InputError(exc.message + "; to read the layer as a TIN surface, give "
                             "offset_ft (the distance from the wall to take the grade at)",
                             file=exc.file, where=exc.where) from None
    if src.kind == "gis":
        from .gisread import read_grade_gis

        return read_grade_gis(src.path, options, label, **along)
    raise InputError(f"{src.kind} grades are not supported", file=label, where=src.key)
