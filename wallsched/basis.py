"""The run information the exporters receive (``exporters.run_info.RunInfo``), from the site:
version, input hashes, resolved tables per wall, and the design basis rows of the calc package
(each value with where it comes from: the site file, some walls, or the documented default)."""

from __future__ import annotations

from . import __version__
from .exporters.run_info import RunInfo
from .keys import CRITERIA_KEYS, LOADS_KEYS, MATERIALS_KEYS, SOIL_KEYS
from .site import Site, WallSpec

BASIS_TABLES = {"soil": SOIL_KEYS, "loads": LOADS_KEYS, "materials": MATERIALS_KEYS,
                "criteria": CRITERIA_KEYS}


def _given(site: Site, wall_spec: WallSpec, table: str, key: str) -> bool:
    raw = site.raw
    if key in (raw.get(table) or {}):
        return True
    for w in raw.get("walls") or []:
        if (isinstance(w, dict) and str(w.get("id", "")).strip() == wall_spec.id
                and (key in w or key in (w.get(table) or {}))):
            return True
    return False


def _fmt_value(v) -> str:
    if v is None:
        return "-"
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, float):
        return f"{v:g}"
    return str(v)


def parameter_rows(site: Site, table: str, keys: dict) -> list[list[str]]:
    """Rows ``key | value per wall | source`` of one resolved table."""
    rows = []
    for k, spec in keys.items():
        if table == "soil" and k == "source":
            continue
        vals = [w.__getattribute__(table).get(k) for w in site.walls]
        if table == "soil" and all(v is None for v in vals):
            continue
        given = [_given(site, w, table, k) for w in site.walls]
        if table == "soil":
            src = "site file; see the stated source below" if all(given) else "site file"
        elif all(given):
            src = "site file"
        elif any(given):
            src = "site file (some walls); else default: " + spec.doc
        else:
            src = "default: " + spec.doc
        rows.append([k, *(_fmt_value(v) for v in vals), src])
    return rows


def run_info(site: Site) -> RunInfo:
    """Everything the exporters are told about this run besides the design."""
    return RunInfo(
        version=__version__, site_name=site.name, meta=dict(site.meta),
        input_hashes=site.input_hashes(),
        wall_tables={w.id: {"soil": dict(w.soil), "loads": dict(w.loads),
                            "materials": dict(w.materials), "criteria": dict(w.criteria)}
                     for w in site.walls},
        costs=dict(site.costs), sizing=dict(site.sizing),
        basis={t: parameter_rows(site, t, keys) for t, keys in BASIS_TABLES.items()},
        soil_sources=tuple(sorted({str(w.soil.get("source")) for w in site.walls
                                   if w.soil.get("source")})))
