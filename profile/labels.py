"""TW / BW spot-elevation labels in a grading plan: TEXT, MTEXT (and block attributes).

Each label on the source's layer is read by a regular expression (case-insensitive). The
default for kind ``TW`` accepts ``TW 105.50``, ``TW=105.5``, ``TW:105.5``, ``TW105.5`` and
``TW EL 105.5``; the same for ``BW``. An MTEXT may carry both kinds on separate lines. A
``pattern`` option replaces the default: it must hold one capturing group (or a group named
``elevation``) for the number.

A label stands where it is inserted (the alignment point of a justified TEXT) and is
projected onto the wall like a plan grade vertex. Labels farther than ``max_offset_ft`` from
the wall, and labels that name the kind but give no readable number, are listed with their
handles in a warning. ``allowance_ft`` is taken off TW values when TW marks the top of the
wall rather than the retained grade.
"""

from __future__ import annotations

import re
from collections.abc import Mapping
from pathlib import Path
from typing import Any

import numpy as np
import shapely

from ..errors import ProfileError
from .core import Alignment, DrawingProfile, Projector, warn
from .dxfread import (
    MAX_OFFSET_FT,
    build_profile,
    layer_entities,
    open_layer,
)

LABEL_KINDS = ("TW", "BW")
LABEL_TYPES = ("TEXT", "MTEXT", "INSERT")
NUMBER = r"[-+]?(?:\d+(?:\.\d*)?|\.\d+)"
MAX_LISTED = 12  # handles listed in one warning


def default_pattern(kind: str) -> str:
    """The default regular expression for one label kind (``TW`` or ``BW``)."""
    return (rf"(?<![A-Za-z0-9]){kind}(?![A-Za-z])\s*(?:EL(?:EV)?\.?\s*)?[:=]?\s*"
            rf"(?P<elevation>{NUMBER})(?![\d.])")


def compile_pattern(pattern: str) -> re.Pattern:
    """Compile a label pattern; raise ValueError with a plain reason when it is unusable."""
    try:
        rx = re.compile(pattern, re.IGNORECASE)
    except re.error as exc:
        raise ValueError(f"is not a valid regular expression ({exc})") from None
    if "elevation" not in rx.groupindex and rx.groups != 1:
        raise ValueError("needs exactly one capturing group (or one named 'elevation') "
                         "around the number")
    return rx


def parse_label(text: str, rx: re.Pattern, kind: str) -> tuple[str, float | None]:
    """``("ok", value)``, ``("none", None)`` (not a label of this kind) or ``("bad", None)``."""
    values = []
    for m in rx.finditer(text):
        raw = m.group("elevation") if "elevation" in rx.groupindex else m.group(1)
        try:
            values.append(float(raw))
        except (TypeError, ValueError):
            return "bad", None
    if values:
        if len(set(values)) > 1 or not np.isfinite(values[0]):
            return "bad", None
        return "ok", values[0]
    if re.search(rf"(?<![A-Za-z0-9]){kind}(?![A-Za-z0-9])", text, re.IGNORECASE):
        return "bad", None
    return "none", None


def _text_and_point(e):
    """(plain text, WCS insertion point) of a TEXT, MTEXT or INSERT with attributes."""
    kind = e.dxftype()
    if kind == "MTEXT":
        return e.plain_text(), tuple(e.dxf.insert)
    if kind == "TEXT":
        p = e.dxf.insert
        if (e.dxf.get("halign", 0), e.dxf.get("valign", 0)) != (0, 0) and e.dxf.hasattr(
                "align_point"):
            p = e.dxf.align_point
        return e.dxf.get("text", ""), tuple(e.ocs().to_wcs(p))
    text = "\n".join(a.dxf.get("text", "") for a in e.attribs)
    return text, tuple(e.ocs().to_wcs(e.dxf.insert))


def _listed(items: list[str]) -> str:
    head = ", ".join(items[:MAX_LISTED])
    return head + (f" and {len(items) - MAX_LISTED} more" if len(items) > MAX_LISTED else "")


def read_label_grade(path: Path, options: Mapping[str, Any], label: str, *,
                     alignment: Alignment, start_station_ft: float) -> DrawingProfile:
    """The TW (retained grade) or BW (front grade) profile from spot labels on a layer."""
    messages, doc, scale, layer = open_layer(path, options, label)
    kind = str(options["labels"]).upper()
    lab = f"{label} [layer {layer}, {kind} labels]"
    try:
        rx = compile_pattern(options.get("pattern") or default_pattern(kind))
    except ValueError as exc:
        raise ProfileError(f"pattern {exc}", file=label, where="pattern") from None
    allowance = float(options.get("allowance_ft", 0.0))
    max_off = float(options.get("max_offset_ft", MAX_OFFSET_FT))
    found, _ = layer_entities(doc, layer, label, types=LABEL_TYPES)
    pts, values, tags, bad = [], [], [], []
    for e in found:
        text, p = _text_and_point(e)
        status, value = parse_label(text, rx, kind)
        tag = f"{e.dxftype()} handle {e.dxf.handle}"
        if status == "bad":
            bad.append(f"{e.dxf.handle} {' '.join(text.split())[:40]!r}")
        elif status == "ok":
            pts.append(p[:2])
            values.append(value * scale - (allowance if kind == "TW" else 0.0))
            tags.append(f"{tag} {' '.join(text.split())[:40]!r}")
    if bad:
        warn(messages, f"{lab}: {len(bad)} label(s) could not be read and were ignored "
             f"(handles {_listed(bad)})")
    if not pts:
        raise ProfileError(f"no {kind} label on layer '{layer}' could be read (looked at "
                           f"{len(found)} text entities); check the layer and the labels' "
                           "form, or give a pattern", file=label, where=f"layer {layer}")
    xy = np.asarray(pts, dtype=float) * scale
    proj = Projector(alignment, start_station_ft)
    st, _off = proj.project(xy)
    # distance to the wall itself: a label past either end counts only within the band
    dist = shapely.distance(alignment.line, shapely.points(xy))
    near = dist <= max_off
    far = [f"{tags[i].split()[2]} ({dist[i]:.1f} ft)" for i in np.nonzero(~near)[0]]
    if far:
        warn(messages, f"{lab}: {len(far)} label(s) farther than {max_off:g} ft from the wall "
             f"ignored (handles {_listed(far)})")
    keep = np.nonzero(near)[0]
    return build_profile(st[keep], np.asarray(values)[keep], [tags[i] for i in keep],
                         label=lab, what=f"{kind} label", messages=messages)
