"""The site file (``site.toml``): read with tomllib, validated into frozen dataclasses.

Every message names the file and the key (and the line where it can be found); unknown keys
are refused with a did-you-mean hint; soil keys are never defaulted; paths are relative to
the site file and may not leave its folder.
"""

from __future__ import annotations

import hashlib
import re
from collections.abc import Mapping
from dataclasses import dataclass, field
from pathlib import Path
from types import MappingProxyType
from typing import Any

from .engine.inputs import Criteria
from .errors import InputError
from .keys import (
    COSTS_KEYS,
    CRITERIA_KEYS,
    DRAWING_KEYS,
    LOADS_KEYS,
    MATERIALS_KEYS,
    SEISMIC_KEYS,
    SITE_KEYS,
    SIZING_KEYS,
    SOIL_KEYS,
    STRIP_KEYS,
    WATER_KEYS,
)
from .schema import (
    REQUIRED,
    Key,
    SourceText,
    check_table,
    check_value,
    did_you_mean,
    load_toml,
    short_value,
)
from .schema import where_text as _where

# Tables a wall may override, with their declared keys.
OVERRIDABLE = {"soil": SOIL_KEYS, "loads": LOADS_KEYS, "materials": MATERIALS_KEYS,
               "criteria": CRITERIA_KEYS}
SITE_ONLY = {"costs": COSTS_KEYS, "sizing": SIZING_KEYS, "drawing": DRAWING_KEYS}  # site-wide
# [seismic] and [water]: optional tables a wall may also override; present only where given
OPTIONAL_TABLES = {"seismic": SEISMIC_KEYS, "water": WATER_KEYS}
TABLE_VALUED_LOADS = ("seismic", "water")  # filled from OPTIONAL_TABLES, never in [loads]
TOP_LEVEL = ("site", "soil", "loads", "materials", "criteria", "costs", "sizing", "seismic",
             "water", "walls", "drawing")
SOURCE_KINDS = ("csv", "dxf", "gis", "landxml", "points")

WALL_KEYS = {
    "id": Key(str, REQUIRED, doc="wall id, unique on the site"),
    "retained_side": Key(str, REQUIRED, choices=("left", "right"),
                         doc="side of the retained soil, looking up-station"),
    "start_station_ft": Key(float, None, lo=-1e7, hi=1e7,
                            doc="station at the alignment's start (default: a LandXML "
                                "alignment's staStart, else 0)"),
    "name": Key(str, None, doc="a longer name for the wall"),
}
WALL_SOURCES = ("alignment", "retained_grade", "front_grade", "existing_ground")


@dataclass(frozen=True)
class Source:
    """Where one line of a wall comes from: a CSV, a DXF layer or a GIS feature.

    ``options`` holds the remaining keys of an inline table; the reader of that kind
    validates them. ``key`` names the site-file key for messages.
    """

    kind: str
    path: Path
    key: str
    options: Mapping[str, Any] = field(default_factory=lambda: MappingProxyType({}))


@dataclass(frozen=True)
class WallSpec:
    """One ``[[walls]]`` entry with its resolved soil, loads, materials and criteria."""

    index: int
    id: str
    retained_side: str
    alignment: Source
    retained_grade: Source
    front_grade: Source
    existing_ground: Source | None
    start_station_ft: float | None  # None: the alignment's own (LandXML staStart), else 0
    soil: Mapping[str, Any]
    loads: Mapping[str, Any]
    materials: Mapping[str, Any]
    criteria: Mapping[str, Any]
    name: str | None = None


@dataclass(frozen=True)
class Site:
    """A whole validated site file."""

    path: Path
    folder: Path
    name: str
    meta: Mapping[str, Any]
    soil: Mapping[str, Any]
    loads: Mapping[str, Any]
    materials: Mapping[str, Any]
    criteria: Mapping[str, Any]
    walls: tuple[WallSpec, ...]
    raw: Mapping[str, Any]
    costs: Mapping[str, Any] = field(default_factory=dict)
    sizing: Mapping[str, Any] = field(default_factory=dict)
    drawing: Mapping[str, Any] = field(default_factory=dict)

    def input_files(self) -> list[Path]:
        """The site file and every file it points to, once each, in a stable order."""
        files = [self.path]
        for w in self.walls:
            for name in WALL_SOURCES:
                src = getattr(w, name)
                if src is not None and src.path not in files:
                    files.append(src.path)
        return files

    def input_hashes(self) -> dict[str, str]:
        """SHA-256 of every input file, keyed by its path relative to the site folder."""
        return {str(p.relative_to(self.folder)): sha256_of(p) for p in self.input_files()}


def sha256_of(path: Path) -> str:
    h = hashlib.sha256()
    with path.open("rb") as f:
        for chunk in iter(lambda: f.read(1 << 20), b""):
            h.update(chunk)
    return h.hexdigest()


def resolve_inside(folder: Path, value: str, *, file, where: str) -> Path:
    """A path relative to the site folder that must stay inside it (symlinks resolved)."""
    if not value.strip():
        raise InputError("path is empty", file=file, where=where)
    if len(value) > 1000 or any(ord(c) < 32 or ord(c) == 127 for c in value):
        raise InputError(f"{value[:40]!r}... is not a usable path (too long, or a control "
                         "character); give the file's name relative to the site file",
                         file=file, where=where)
    p = Path(value)
    if p.is_absolute():
        raise InputError(f"'{value}' is an absolute path; give a path relative to the site file",
                         file=file, where=where)
    try:
        root = folder.resolve()
        full = (folder / p).resolve()
        try:
            full.relative_to(root)
        except ValueError:
            raise InputError(f"'{value}' leaves the site folder; keep every input file beside "
                             "or below the site file", file=file, where=where) from None
        if not full.exists():
            raise InputError(f"file '{value}' not found (looked in {folder})", file=file,
                             where=where)
        if not full.is_file():
            raise InputError(f"'{value}' is not a file", file=file, where=where)
    except OSError as exc:
        raise InputError(f"'{value[:60]}' cannot be used as a path ({exc.strerror}); give the "
                         "file's name relative to the site file", file=file,
                         where=where) from None
    return full


def resolve_soil(soil: dict[str, Any], criteria: Mapping[str, Any], *, file, table: str) -> dict:
    """Cross-key rules of [soil]: exactly one active-pressure basis; passive when used."""
    has_efp = soil.get("active_efp_pcf") is not None
    has_phi = soil.get("friction_angle_deg") is not None
    check_backslope(soil, file=file, table=table)
    if has_efp and has_phi:
        raise InputError("give either active_efp_pcf or friction_angle_deg, not both",
                         file=file, where=f"[{table}]")
    if not (has_efp or has_phi):
        raise InputError("missing the active pressure: give active_efp_pcf (equivalent fluid "
                         "pressure, pcf) or friction_angle_deg from the geotechnical report",
                         file=file, where=f"[{table}]")
    if soil.get("passive_from_friction_angle"):
        if not has_phi:
            raise InputError("passive_from_friction_angle needs friction_angle_deg",
                             file=file, where=f"[{table}] passive_from_friction_angle")
        if soil.get("passive_efp_pcf") is not None:
            raise InputError("give either passive_efp_pcf or passive_from_friction_angle, "
                             "not both", file=file, where=f"[{table}]")
    elif criteria.get("use_passive", Criteria.use_passive) and (
            soil.get("passive_efp_pcf") is None):
        raise InputError("missing passive_efp_pcf (or set passive_from_friction_angle = true, "
                         "or [criteria] use_passive = false)", file=file, where=f"[{table}]")
    return soil


def check_strips(value: Any, *, file, where: str) -> tuple:
    """Validate ``[[loads.strip]]`` entries (offset_ft, width_ft, pressure_psf, name)."""
    if value in (None, ()):
        return ()
    if not isinstance(value, list | tuple):
        raise InputError("must be an array of tables: write each strip load as "
                         "[[loads.strip]] with offset_ft, width_ft and pressure_psf",
                         file=file, where=where)
    out = []
    for n, item in enumerate(value, 1):
        if not isinstance(item, dict):
            raise InputError("each strip load must be a table with offset_ft, width_ft and "
                             "pressure_psf", file=file, where=f"{where}[{n}]")
        item = {k: v for k, v in item.items() if v is not None}
        out.append(check_table(item, STRIP_KEYS, table=f"loads.strip[{n}]", file=file))
    return tuple(out)


def check_backslope(soil: dict, *, file, table: str) -> None:
    """``backslope = "H:V"`` or ``backslope_deg``, not both; a well-formed ratio."""
    from .engine.pressure import backslope_from_ratio

    if soil.get("backslope") is None:
        return
    if soil.get("backslope_deg") is not None:
        raise InputError("give either backslope (\"H:V\") or backslope_deg, not both",
                         file=file, where=f"[{table}] backslope")
    try:
        deg = backslope_from_ratio(soil["backslope"])
    except ValueError as exc:
        raise InputError(f"{exc}; give horizontal:vertical, e.g. backslope = \"2:1\"",
                         file=file, where=f"[{table}] backslope") from None
    if deg >= 60.0:
        raise InputError(f"{short_value(soil['backslope'])} is {deg:.1f} deg; allowed: "
                         "flatter than 60 deg", file=file, where=f"[{table}] backslope")


def optional_table(base: Mapping | None, over: Any, keys: Mapping, *, file, where: str,
                   src: SourceText | None = None) -> dict | None:
    """A ``[seismic]`` / ``[water]`` table: ``base`` (the site's, or None) updated with
    ``over`` (a wall's); None where neither is given. Required keys must be present in the
    result."""
    if over is None:
        return None if base is None else dict(base)
    if not isinstance(over, dict):
        raise InputError("must be a table", file=file, where=where)
    for k in over:
        if k not in keys:
            raise InputError(f"unknown key '{k}'; {did_you_mean(k, list(keys))}", file=file,
                             where=f"{where}.{k}")
    merged = {k: v for k, v in (base or {}).items() if v is not None}
    for k, v in over.items():
        merged[k] = check_value(v, keys[k], file=file, where=f"{where}.{k}")
    return check_table(merged, keys, table=where.strip("[]"), file=file, src=src)


def _source(value: Any, *, folder: Path, file, key: str) -> Source:
    if isinstance(value, str):
        return Source("csv", resolve_inside(folder, value, file=file, where=key), key)
    if isinstance(value, dict):
        kinds = [k for k in SOURCE_KINDS if k in value]
        if len(kinds) != 1:
            raise InputError("an inline source needs exactly one of "
                             + ", ".join(f"'{k}'" for k in SOURCE_KINDS)
                             + " naming its file", file=file, where=key)
        kind = kinds[0]
        path_value = value[kind]
        if not isinstance(path_value, str):
            raise InputError(f"'{kind}' must be a path string", file=file, where=f"{key}.{kind}")
        path = resolve_inside(folder, path_value, file=file, where=f"{key}.{kind}")
        options = {k: v for k, v in value.items() if k != kind}
        from .profile.sources import check_source_options

        check_source_options(kind, options, file=file, key=key)
        return Source(kind, path, key, MappingProxyType(options))
    raise InputError(f"must be a CSV path or an inline table such as {{ dxf = \"plan.dxf\", "
                     f"layer = \"...\" }}, got {short_value(value)}", file=file, where=key)


def _wall(i: int, raw: Any, site: dict[str, dict], *, folder: Path, file, src: SourceText):
    label = f"walls[{i + 1}]"
    if not isinstance(raw, dict):
        raise InputError("each [[walls]] entry must be a table", file=file, where=label)
    own, nested, flat_override = _wall_keys(raw, file=file, src=src)
    base = check_table({k: v for k, v in own.items() if k in WALL_KEYS}, WALL_KEYS,
                       table="walls", file=file, src=src)
    wid = base["id"].strip()
    from .exporters.file_names import id_problem

    problem = id_problem(wid)
    if problem:
        raise InputError(problem, file=file, where=f"{label}.id")
    label = f"walls[{i + 1}] (id {wid!r})"
    resolved = {table: _wall_table(table, keys, site, nested, flat_override, file=file,
                                   label=label)
                for table, keys in OVERRIDABLE.items()}
    own_soil = bool(nested.get("soil")) or bool(flat_override.get("soil"))
    resolve_soil(resolved["soil"], resolved["criteria"], file=file,
                 table=f"{label}.soil" if own_soil else "soil")
    loads = resolved["loads"]
    loads["strip"] = check_strips(loads.get("strip"), file=file, where=f"{label}.loads.strip")
    for t, keys in OPTIONAL_TABLES.items():
        loads[t] = optional_table(site[t], nested.get(t), keys, file=file,
                                  where=f"{label}.{t}")
    _check_inputs(resolved, file=file, where=label)
    check_criteria_sets(resolved["criteria"], file=file, where=f"{label}.criteria")
    sources = _wall_sources(own, folder=folder, file=file, label=label)
    return WallSpec(
        index=i, id=wid, retained_side=base["retained_side"],
        start_station_ft=base["start_station_ft"], name=base["name"],
        soil=MappingProxyType(resolved["soil"]), loads=MappingProxyType(resolved["loads"]),
        materials=MappingProxyType(resolved["materials"]),
        criteria=MappingProxyType(resolved["criteria"]), **sources,
    )


def _wall_keys(raw: dict, *, file, src: SourceText):
    """A [[walls]] entry's keys sorted: its own (id, sources, ...), its nested tables, and the
    flat overrides by the table that owns them; an unknown key is refused with a hint."""
    flat_override = {}
    nested = {}
    own = {}
    allowed = set(WALL_KEYS) | set(WALL_SOURCES) | set(OVERRIDABLE) | set(OPTIONAL_TABLES)
    owner_of = {k: t for t, keys in OVERRIDABLE.items() for k in keys
                if k not in TABLE_VALUED_LOADS}
    for k, v in raw.items():
        if k in OVERRIDABLE or k in OPTIONAL_TABLES:
            nested[k] = v
        elif k in owner_of:
            flat_override.setdefault(owner_of[k], {})[k] = v
        elif k in allowed:
            own[k] = v
        else:
            hint = did_you_mean(k, sorted(allowed | set(owner_of)))
            raise InputError(f"unknown key '{k}'; {hint}", file=file,
                             where=_where(src, "walls", k))
    return own, nested, flat_override


def _wall_table(table: str, keys, site, nested, flat_override, *, file, label: str) -> dict:
    """One table of a wall: the site's values, the wall's overrides checked, the defaults."""
    if not isinstance(nested.get(table, {}), dict):
        raise InputError(f"'{table}' must be a table of keys, e.g. {table} = {{ ... }}, "
                         f"got {short_value(nested[table])}", file=file,
                         where=f"{label}.{table}")
    over = dict(nested.get(table, {}))
    over.update(flat_override.get(table, {}))
    for k in over:
        if table == "loads" and k in TABLE_VALUED_LOADS:
            raise InputError(f"give [{k}] as its own table ([walls.{k}] for one wall), "
                             "not inside [loads]", file=file, where=f"{label}.loads.{k}")
        if k not in keys:
            raise InputError(f"unknown key '{k}'; {did_you_mean(k, keys)}", file=file,
                             where=f"{label}.{table}")
    merged = dict(site[table])
    if table == "soil" and ({"active_efp_pcf", "friction_angle_deg"} & set(over)):
        merged.pop("active_efp_pcf", None)
        merged.pop("friction_angle_deg", None)
    if table == "soil" and ({"passive_efp_pcf", "passive_from_friction_angle"} & set(over)):
        merged.pop("passive_efp_pcf", None)
        merged.pop("passive_from_friction_angle", None)
    for k, v in over.items():
        merged[k] = check_value(v, keys[k], file=file, where=f"{label}.{k}")
    for k, spec in keys.items():
        if k not in merged:
            merged[k] = None if spec.default is REQUIRED else spec.default
    return merged


def _wall_sources(own: dict, *, folder: Path, file, label: str) -> dict:
    """The wall's alignment and grade sources (``existing_ground`` optional)."""
    sources = {}
    for name in WALL_SOURCES:
        if name not in own:
            if name == "existing_ground":
                sources[name] = None
                continue
            raise InputError(f"missing required key '{name}'", file=file, where=label)
        sources[name] = _source(own[name], folder=folder, file=file, key=f"{label}.{name}")
    return sources



# [criteria] keys that must not exceed their partner (each pair: least, greatest)
CRITERIA_ORDER = (("segment_min_ft", "segment_max_ft"),
                  ("contraction_joint_max_ft", "expansion_joint_max_ft"),
                  ("min_retained_height_ft", "max_retained_height_ft"))
# [sizing] ranges: (least, greatest, what)
SIZING_RANGES = (("footing_thickness_min_in", "footing_thickness_max_in", "footing thickness"),
                 ("stem_min_in", "stem_max_in", "stem thickness"))


def check_criteria_sets(c: Mapping[str, Any], *, file, where: str) -> None:
    """The [criteria] limits as a set: each least value at most its greatest."""
    for lo, hi in CRITERIA_ORDER:
        if c.get(lo) is not None and c.get(hi) is not None and c[lo] > c[hi]:
            raise InputError(f"{lo} = {c[lo]:g} is more than {hi} = {c[hi]:g}; the least "
                             "must not exceed the greatest - swap or correct them",
                             file=file, where=f"{where} {lo}")


def check_sizing_sets(t: Mapping[str, Any], *, file, src: SourceText | None = None) -> None:
    """The [sizing] grid as a set: every range from its least to its greatest value, a
    heel of at least two steps, and bar sizes that parse."""
    from .engine.bars import SIZES
    from .engine.sizing import parse_sizes

    for lo, hi, what in SIZING_RANGES:
        if t[lo] > t[hi]:
            raise InputError(f"{lo} = {t[lo]:g} is more than {hi} = {t[hi]:g}: the {what} "
                             "range is empty; swap or correct them", file=file,
                             where=_where(src, "sizing", lo))
    least_heel = 2 * t["toe_heel_step_in"] / 12.0
    if t["heel_max_ft"] < least_heel - 1e-9:
        raise InputError(f"heel_max_ft = {t['heel_max_ft']:g} is less than the smallest heel "
                         f"of the grid, two steps of toe_heel_step_in ({least_heel:g} ft); "
                         "raise heel_max_ft or lower toe_heel_step_in", file=file,
                         where=_where(src, "sizing", "heel_max_ft"))
    text = t["bar_sizes"]
    sizes = ", ".join(str(int(s)) for s in SIZES)
    backwards = [p for p in str(text).replace(" ", "").split(",")
                 if re.fullmatch(r"\d+-\d+", p) and int(p.split("-")[0]) > int(p.split("-")[1])]
    if backwards:
        a, b = backwards[0].split("-")
        raise InputError(f"bar_sizes = {text!r}: the range {backwards[0]} runs downward; "
                         f"write it {b}-{a}", file=file, where=_where(src, "sizing", "bar_sizes"))
    try:
        parse_sizes(text)
    except ValueError:
        raise InputError(f"bar_sizes = {text[:40]!r} cannot be read; give ASTM A615 bar "
                         f"numbers as a range \"4-9\" or a list \"4,5,6\" (sizes {sizes})",
                         file=file, where=_where(src, "sizing", "bar_sizes")) from None


def _check_inputs(tables: Mapping[str, Mapping], *, file, where: str) -> None:
    """The engine's cross-key rules (backslope against phi, Coulomb, seismic method, water)
    as one InputError line."""
    from .engine.section import DesignInputs

    if any(spec.default is REQUIRED and tables["soil"].get(k) is None
           for k, spec in SOIL_KEYS.items()):
        return  # reported by the per-wall soil check with its own message
    try:
        DesignInputs.from_tables(tables["soil"], tables["loads"], tables["materials"],
                                 tables["criteria"])
    except ValueError as exc:
        raise InputError(str(exc), file=file, where=where) from None


def load_site(path: str | Path) -> Site:
    """Read and validate a site file. Raises InputError with one clear line."""
    path = Path(path)
    data, src = load_toml(path)
    file = path.name if path.parent == Path(".") else str(path)
    for k in data:
        if k not in TOP_LEVEL:
            raise InputError(f"unknown table or key '{k}'; {did_you_mean(k, list(TOP_LEVEL))}",
                             file=file, where=_where(src, None, k))
    if "site" not in data:
        raise InputError("missing the [site] table (name = \"...\")", file=file)
    meta = check_table(data["site"], SITE_KEYS, table="site", file=file, src=src)
    if "soil" not in data:
        raise InputError("missing the [soil] table; soil parameters must come from the "
                         "geotechnical report and are never assumed", file=file)
    tables = _site_tables(data, file, src)
    walls = _walls(data, tables, path.parent, file, src)
    folder = path.parent
    site_only = {t: MappingProxyType(check_table(data.get(t, {}), keys, table=t, file=file,
                                                 src=src))
                 for t, keys in SITE_ONLY.items()}
    check_sizing_sets(site_only["sizing"], file=file, src=src)
    # the site-level soil, for the record (validated per wall above)
    return Site(costs=site_only["costs"], sizing=site_only["sizing"],
        drawing=site_only["drawing"],
        path=path.resolve(), folder=folder.resolve(), name=meta["name"],
        meta=MappingProxyType(meta), soil=MappingProxyType(tables["soil"]),
        loads=MappingProxyType(tables["loads"]), materials=MappingProxyType(tables["materials"]),
        criteria=MappingProxyType(tables["criteria"]), walls=tuple(walls),
        raw=MappingProxyType(data),
    )


def _site_tables(data: dict, file: str, src) -> dict:
    """The site-wide tables, checked; [soil] completed per wall later."""
    # Soil keys may be completed per wall, so a site-level [soil] may leave some out only
    # when every wall gives them; the per-wall check below enforces presence.
    tables = {}
    for t, keys in OVERRIDABLE.items():
        tables[t] = check_table(data.get(t, {}), keys, table=t, file=file, src=src,
                                fill_defaults=True) if t != "soil" else None
    loads_raw = data.get("loads", {})
    if isinstance(loads_raw, dict):
        for k in TABLE_VALUED_LOADS:
            if k in loads_raw:
                raise InputError(f"give [{k}] as its own table, not inside [loads]",
                                 file=file, where=f"[loads] {k}")
        tables["loads"]["strip"] = check_strips(loads_raw.get("strip"), file=file,
                                                where="[loads] strip")
    for t, keys in OPTIONAL_TABLES.items():
        tables[t] = (check_table(data[t], keys, table=t, file=file, src=src)
                     if t in data else None)
    check_criteria_sets(tables["criteria"], file=file, where="[criteria]")
    soil_raw = data["soil"]
    soil = check_table(soil_raw, SOIL_KEYS, table="soil", file=file, src=src,
                       fill_defaults=False)
    tables["soil"] = {k: soil.get(k, None if SOIL_KEYS[k].default is REQUIRED
                                  else SOIL_KEYS[k].default) for k in SOIL_KEYS}
    return tables


def _walls(data: dict, tables: dict, folder: Path, file: str, src) -> list:
    """Every [[walls]] entry checked, ids unique, each with its required soil keys."""
    walls_raw = data.get("walls")
    if not walls_raw:
        raise InputError("no [[walls]] entries; add at least one wall", file=file)
    if not isinstance(walls_raw, list):
        raise InputError("'walls' must be an array of tables ([[walls]])", file=file,
                         where="walls")
    walls = []
    seen: dict[str, int] = {}
    for i, w in enumerate(walls_raw):
        spec = _wall(i, w, tables, folder=folder, file=file, src=src)
        if spec.id in seen:
            raise InputError(f"wall id {spec.id!r} is used twice (walls[{seen[spec.id] + 1}] "
                             f"and walls[{i + 1}]); wall ids must be unique",
                             file=file, where=f"walls[{i + 1}].id")
        seen[spec.id] = i
        for k, spec_k in SOIL_KEYS.items():
            if spec_k.default is REQUIRED and spec.soil.get(k) is None:
                raise InputError(
                    f"missing required soil key '{k}' ({spec_k.doc}) for wall {spec.id!r}; "
                    "soil parameters are never defaulted - give it in [soil] or in the wall",
                    file=file, where="[soil]")
        walls.append(spec)
    return walls
