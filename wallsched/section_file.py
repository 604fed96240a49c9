"""The section file (one cantilever cross-section, for ``wallsched section``; DESIGN.md 4).

Tables ``[geometry]``, ``[soil]``, ``[loads]``, ``[materials]``, ``[criteria]``,
``[reinforcement]`` (and an optional ``[section]`` with a name). The soil, loads, materials and
criteria keys are those of the site file (``wallsched/keys.py``); every error is an InputError
naming the file, the key, the value and the allowed range.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path
from types import MappingProxyType
from typing import Any

from .errors import InputError
from .keys import (
    CRITERIA_KEYS,
    LOADS_KEYS,
    MATERIALS_KEYS,
    REINFORCEMENT_KEYS,
    SECTION_GEOMETRY_KEYS,
    SECTION_META_KEYS,
    SOIL_KEYS,
)
from .schema import check_table, did_you_mean, load_toml, where_text
from .site import OPTIONAL_TABLES, TABLE_VALUED_LOADS, check_strips, resolve_soil

TABLES = {"section": SECTION_META_KEYS, "geometry": SECTION_GEOMETRY_KEYS, "soil": SOIL_KEYS,
          "loads": LOADS_KEYS, "materials": MATERIALS_KEYS, "criteria": CRITERIA_KEYS,
          "reinforcement": REINFORCEMENT_KEYS}
# optional: [seismic] (the seismic case) and [water] (default drained)
REQUIRED_TABLES = ("geometry", "soil", "reinforcement")
BAR_KEYS = ("stem", "heel", "toe", "horizontal", "longitudinal")


@dataclass(frozen=True)
class SectionFile:
    """A validated section file: the tables as dicts and the engine's input objects."""

    path: Path
    name: str | None
    geometry: Mapping[str, Any]
    soil: Mapping[str, Any]
    loads: Mapping[str, Any]
    materials: Mapping[str, Any]
    criteria: Mapping[str, Any]
    reinforcement: Mapping[str, Any]

    def design_inputs(self):
        from .engine.section import DesignInputs

        return DesignInputs.from_tables(self.soil, self.loads, self.materials, self.criteria)

    def section_geometry(self):
        from .engine.section import SectionGeometry

        return SectionGeometry.from_mapping(self.geometry)

    def bars(self):
        from .engine.section import BarArrays, Reinforcement

        r = self.reinforcement
        b = {k: (BarArrays.parse(r[k]) if r.get(k) else None) for k in BAR_KEYS}
        return Reinforcement(stem=b["stem"], heel=b["heel"], toe=b["toe"],
                             horizontal=b["horizontal"], longitudinal=b["longitudinal"],
                             horizontal_layers=r["horizontal_layers"],
                             longitudinal_layers=r["longitudinal_layers"])


def _fail(msg, file, src, table, key):
    raise InputError(msg, file=file, where=where_text(src, table, key))


def load_section(path: str | Path) -> SectionFile:
    """Read and validate a section file; raises InputError with one clear line."""
    path = Path(path)
    data, src = load_toml(path)
    file = str(path)
    tables = _read_tables(data, src, file)
    _check_geometry(data, tables["geometry"], tables["criteria"], file, src)
    _check_bars(tables["reinforcement"], file, src)
    try:
        from .engine.section import DesignInputs

        DesignInputs.from_tables(tables["soil"], tables["loads"], tables["materials"],
                                 tables["criteria"])
    except ValueError as exc:  # cross-key rules not caught above
        raise InputError(str(exc), file=file, where="[soil]") from None
    frz = {t: MappingProxyType(v) for t, v in tables.items()}
    return SectionFile(path=path, name=tables["section"].get("name"), geometry=frz["geometry"],
                       soil=frz["soil"], loads=frz["loads"], materials=frz["materials"],
                       criteria=frz["criteria"], reinforcement=frz["reinforcement"])


def _read_tables(data: dict, src, file: str) -> dict[str, dict]:
    """Each table checked against its keys; the soil resolved; the load tables nested."""
    known = list(TABLES) + list(OPTIONAL_TABLES)
    for k in data:
        if k not in known:
            raise InputError(f"unknown table or key '{k}'; {did_you_mean(k, known)}",
                             file=file, where=where_text(src, None, k))
    loads_raw = data.get("loads", {})
    if isinstance(loads_raw, dict):
        for k in TABLE_VALUED_LOADS:
            if k in loads_raw:
                raise InputError(f"give [{k}] as its own table, not inside [loads]",
                                 file=file, where=where_text(src, "loads", k))
    for t in REQUIRED_TABLES:
        if t not in data:
            extra = ("; soil parameters must come from the geotechnical report and are never "
                     "assumed") if t == "soil" else ""
            raise InputError(f"missing the [{t}] table{extra}", file=file)
    tables = {t: check_table(data.get(t, {}), keys, table=t, file=file, src=src)
              for t, keys in TABLES.items()}
    resolve_soil(tables["soil"], tables["criteria"], file=file, table="soil")
    tables["loads"]["strip"] = check_strips(loads_raw.get("strip") if isinstance(
        loads_raw, dict) else None, file=file, where="[loads] strip")
    for t, keys in OPTIONAL_TABLES.items():
        tables["loads"][t] = (check_table(data[t], keys, table=t, file=file, src=src)
                              if t in data else None)
    return tables


def _check_geometry(data: dict, g: dict, c: dict, file: str, src) -> None:
    """The rules between the geometry's keys; fills freeboard_ft and key_offset_ft."""
    # freeboard: [geometry] (the section's own) or [criteria] (the site-file default), not both
    if "freeboard_ft" in data.get("geometry", {}) and "freeboard_ft" in data.get("criteria", {}):
        _fail("freeboard_ft is given in both [geometry] and [criteria]; give it once",
              file, src, "geometry", "freeboard_ft")
    if g["freeboard_ft"] is None:
        g["freeboard_ft"] = c["freeboard_ft"]
    if g["stem_base_in"] < g["stem_top_in"]:
        _fail(f"{g['stem_base_in']:g} is less than stem_top_in = {g['stem_top_in']:g}; "
              "allowed: stem_base_in >= stem_top_in (the stem tapers upward)",
              file, src, "geometry", "stem_base_in")
    H = g["retained_height_ft"] + g["embedment_ft"]
    if H <= g["footing_thickness_in"] / 12.0:
        _fail(f"{g['footing_thickness_in']:g} in reaches above the retained grade "
              f"(retained height + embedment = {H:g} ft); allowed: footing_thickness_in < "
              f"{H * 12:g}", file, src, "geometry", "footing_thickness_in")
    kw, kd = g["key_width_in"], g["key_depth_in"]
    if (kw > 0) != (kd > 0):
        bad = "key_depth_in" if kw > 0 else "key_width_in"
        _fail(f"{g[bad]:g}: a shear key needs both key_width_in and key_depth_in > 0 "
              "(or both 0 for no key)", file, src, "geometry", bad)
    B = g["toe_ft"] + g["stem_base_in"] / 12.0 + g["heel_ft"]
    if g["key_offset_ft"] is None:
        g["key_offset_ft"] = g["toe_ft"]  # key below the stem's front face (common practice)
    elif kw > 0 and g["key_offset_ft"] + kw / 12.0 > B + 1e-9:
        _fail(f"{g['key_offset_ft']:g} ft puts the key past the heel edge; allowed: 0 to "
              f"{B - kw / 12.0:g} ft (footing width {B:g} ft less the key width)",
              file, src, "geometry", "key_offset_ft")
    if B <= 0:
        _fail("toe_ft + stem + heel_ft must be positive", file, src, "geometry", "toe_ft")


def _check_bars(r: dict, file: str, src) -> None:
    """Every bar key given reads as "#N@S"."""
    from .engine.bars import parse_bars

    for k in BAR_KEYS:
        if r.get(k) is None:
            continue
        try:
            parse_bars(r[k])
        except ValueError as exc:
            _fail(f"{exc}; allowed: bar notation \"#N@S\" with an ASTM A615 size and a spacing "
                  "of 2 to 48 in", file, src, "reinforcement", k)
