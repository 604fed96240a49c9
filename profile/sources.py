"""Dispatch a site-file source (CSV path or inline table) to its reader.

A new reader goes here: add its option keys to ``OPTION_KEYS`` and a branch to
:func:`read_alignment` / :func:`read_grade`.
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any

from ..errors import InputError
from .csvread import Alignment, GradeProfile, read_alignment_csv, read_grade_csv

# Option keys an inline source table may carry besides its file key, per kind.
OPTION_KEYS: dict[str, tuple[str, ...]] = {
    "csv": (),
    "dxf": (),
    "gis": (),
}


def check_source_options(kind: str, options: Mapping[str, Any], *, file, key: str) -> None:
    """Refuse unknown option keys of an inline source (site-file validation time)."""
    import difflib

    allowed = OPTION_KEYS.get(kind, ())
    if kind != "csv" and not allowed:
        raise InputError(f"{kind.upper()} sources are not supported by this version; "
                         "give a CSV path", file=file, where=key)
    for k in options:
        if k not in allowed:
            hint = difflib.get_close_matches(k, allowed, n=1)
            tail = f"did you mean '{hint[0]}'?" if hint else (
                "allowed: " + ", ".join(allowed) if allowed else "no options are allowed")
            raise InputError(f"unknown option '{k}' for a {kind} source; {tail}",
                             file=file, where=key)


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
    raise InputError(f"{src.kind} alignments are not supported", file=label, where=src.key)


def read_grade(src, site_folder, *, alignment: Alignment, start_station_ft: float,
               retained_side: str) -> GradeProfile:
    """A station/elevation profile from its source (CSV, or a drawing along ``alignment``)."""
    label = _label(src, site_folder)
    if src.kind == "csv":
        return read_grade_csv(src.path, label)
    raise InputError(f"{src.kind} grades are not supported", file=label, where=src.key)
