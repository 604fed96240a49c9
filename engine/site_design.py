"""The design stage: the walls of a site -> design tables -> segments -> checked, audited wall
designs -> section marks, bar lists, quantities, costs and the governing case of every mark.

Takes the validated inputs of every wall with its sampled stations (:class:`WallToDesign`),
the sizing grid and the unit costs, and returns one :class:`~.model.SiteDesign` that the
exporters only read. The least-cost section for every design height comes from
``engine.sizing``, the least-cost segments from ``engine.segments``, the per-station checks
and their audit from ``engine.wall_design``.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import replace

import numpy as np

from .audit_selection import AUDIT_RULE
from .checks import LOAD_FACTORS
from .governing import governing_cases
from .model import SiteDesign, StationSeries, WallDesign
from .section import DesignInputs
from .segments import plan_segments_many
from .sizing import CostRates, DesignTable, SizingGrid, design_table
from .wall_design import WallToDesign, design_wall, segment_rules, wall_run


def least_embedment_ft(crit) -> float:
    """The embedment every footing keeps at least: min_embedment_ft or the frost depth."""
    return max(crit["min_embedment_ft"], crit.get("frost_depth_ft") or 0.0)


def _table_key(inputs: DesignInputs, crit, emb, fb, top):
    return (inputs, emb, fb, crit["design_height_increment_ft"], top, crit["footing_cover_ft"],
            crit.get("footing_width_max_ft"))


def assign_marks(walls: list[WallDesign]) -> list[WallDesign]:
    """Section marks A, B, ... site-wide, one per distinct section, in order of first use."""
    marks: dict[tuple, str] = {}

    def name(i: int) -> str:
        out = ""
        i += 1
        while i:
            i, r = divmod(i - 1, 26)
            out = chr(65 + r) + out
        return out

    result = []
    for w in walls:
        segs = []
        for s in w.segments:
            if s.section is None:
                segs.append(s)
                continue
            sig = s.section.signature()
            if sig not in marks:
                marks[sig] = name(len(marks))
            segs.append(replace(s, mark=marks[sig]))
        result.append(replace(w, segments=tuple(segs)))
    return result


def segment_cost(seg, rates: CostRates, front_grade_avg_ft: float) -> float:
    """$ of a segment from its quantities (excavation estimated from the front grade when no
    existing ground is given: the footing footprint down from the front grade)."""
    if seg.section is None:
        return math.nan
    exc = seg.excavation_cy
    if not math.isfinite(exc):
        depth = max(front_grade_avg_ft - seg.bottom_of_footing_ft,
                    seg.section.footing_thickness_in / 12.0)
        exc = seg.section.footing_width_ft * depth * seg.length_ft / 27.0
    return (rates.concrete_usd_per_cy * seg.concrete_cy + rates.steel_usd_per_lb * seg.steel_lb
            + rates.formwork_usd_per_sf * seg.formwork_sf + rates.excavation_usd_per_cy * exc)


def needed_height_ft(ws: StationSeries, c) -> float:
    """The tallest design height any segment of the wall can ask the sizing for: the largest
    retained grade less the least front grade over any stretch of ``segment_max_ft``, plus
    the footing lowering and rounding the segments may add; at most the height limit plus 2 ft
    (beyond it every station is flagged anyway)."""
    from .segments import LOWERINGS_STEEP, SegmentRules, window_extremes

    s = ws.station_ft
    if s.size < 2:
        return c["design_height_increment_ft"]
    first = np.searchsorted(s, s - c["segment_max_ft"] - 1e-9, side="left")
    kmax = max(1, int(np.max(np.arange(s.size) - first)))
    rg = window_extremes(ws.retained_grade_ft, kmax, np.maximum)
    fg = window_extremes(ws.front_grade_ft, kmax, np.minimum)
    k = np.arange(kmax + 1)[None, :]
    ok = k <= (np.arange(s.size) - first)[:, None]
    span = np.nanmax(np.where(ok, rg - fg, -np.inf))
    margin = (LOWERINGS_STEEP - 1) * SegmentRules.bf_lowering_ft + c[
        "bottom_of_footing_round_ft"] + c["design_height_increment_ft"]
    return float(min(max(span, 0.0) + margin, c["max_retained_height_ft"] + 2.0))


def design_tables(walls: Sequence[WallToDesign], grid: SizingGrid,
                  rates: CostRates) -> tuple[dict[str, tuple], dict[tuple, DesignTable]]:
    """One design table per distinct set of inputs and criteria, tall enough for every wall
    that shares it: (wall id -> table key, table key -> table)."""
    keys, need = {}, {}
    for wall in walls:
        c = wall.criteria
        key = _table_key(wall.inputs, c, least_embedment_ft(c), c["freeboard_ft"],
                         c["top_of_wall"])
        keys[wall.wall] = key
        need[key] = max(need.get(key, 0.0), needed_height_ft(wall.stations, c))
    tables: dict[tuple, DesignTable] = {}
    for wall in walls:
        c = wall.criteria
        key = keys[wall.wall]
        if key not in tables:
            tables[key] = design_table(
                wall.inputs, grid, rates, max_height_ft=need[key],
                increment_ft=c["design_height_increment_ft"],
                embedment_ft=least_embedment_ft(c), freeboard_ft=c["freeboard_ft"],
                footing_cover_ft=c["footing_cover_ft"],
                footing_width_max_ft=c.get("footing_width_max_ft"))
    return keys, tables


def plan_walls(walls: Sequence[WallToDesign], keys, tables, rates: CostRates) -> dict:
    """The segments of the walls sharing a design table and rules, planned together."""
    groups: dict = {}
    for wall in walls:
        run = wall_run(wall.stations, wall.criteria)
        if run is not None:
            gk = (keys[wall.wall], segment_rules(wall.criteria, rates))
            groups.setdefault(gk, []).append((wall.wall, wall.stations, run))
    plans = {}
    for (key, rules), members in groups.items():
        table = tables[key]
        got = plan_segments_many(
            [(ws.station_ft[run], ws.retained_grade_ft[run], ws.front_grade_ft[run])
             for _, ws, run in members], rules, table.cost_per_ft, table.embedment_of)
        plans.update({wid: p for (wid, _, _), p in zip(members, got, strict=True)})
    return plans


def detailed(design: WallDesign, inputs: DesignInputs, rates: CostRates | None = None
             ) -> WallDesign:
    """The design with its bar list, quantities (per segment and as a frame), the bar details
    of its section marks and, given ``rates``, the cost of every segment."""
    import pandas as pd

    from .detailing import section_detail, wall_bar_list
    from .quantities import wall_quantities, with_quantities

    bars = wall_bar_list(design, fc_psi=inputs.fc_psi, fy_psi=inputs.fy_psi)
    d = with_quantities(design, bars if len(bars) else pd.DataFrame(columns=bars.columns))
    if rates is not None:
        fg = d.stations.front_grade_ft
        st = d.stations.station_ft
        segs = []
        for s in d.segments:
            m = (st >= s.station_start_ft) & (st <= s.station_end_ft)
            segs.append(replace(s, cost_usd=segment_cost(s, rates, float(np.mean(fg[m])))))
        d = replace(d, segments=tuple(segs))
    quantities = wall_quantities(d, bars) if d.segments else None
    details = {mark: section_detail(sec) for mark, sec in d.marks().items()}
    return replace(d, bars=bars, quantities=quantities, details=details)


def _site_bars(walls: Sequence[WallDesign]):
    import pandas as pd

    from .model import REBAR_COLUMNS

    frames = [w.bars for w in walls if w.bars is not None and len(w.bars)]
    if not frames:
        return pd.DataFrame(columns=REBAR_COLUMNS)
    return pd.concat(frames, ignore_index=True)


def _bar_marks(walls):
    """Bar marks site-wide (engine/bending.py): each wall's placing rows with their
    ``bar_mark`` and the wall's own bending rows (``bending``); the site's placing
    list and bending schedule."""
    from .bending import bending_rows_of, bending_schedule

    marked, barlist = bending_schedule(_site_bars(walls))
    out = []
    for w in walls:
        if w.bars is None:
            out.append(w)
            continue
        own = marked[marked["wall"] == w.wall].reset_index(drop=True)
        out.append(replace(w, bars=own, bending=bending_rows_of(own)))
    return tuple(out), marked, barlist


def _quantity_totals(walls: Sequence[WallDesign]):
    import pandas as pd

    from .quantities import quantity_totals

    frames = [w.quantities for w in walls if w.segments]
    if not frames:
        return None
    return quantity_totals(pd.concat(frames, ignore_index=True))


def _groups(items: Sequence, chunks: int) -> list[list]:
    """``items`` cut into at most ``chunks`` runs of neighbours of about equal size."""
    chunks = max(1, min(chunks, len(items)))
    edges = np.linspace(0, len(items), chunks + 1).round().astype(int)
    return [list(items[a:b]) for a, b in zip(edges[:-1], edges[1:], strict=True) if b > a]


def design_site(walls: Sequence[WallToDesign], grid: SizingGrid, rates: CostRates, *,
                audit: bool = True, progress=None, map_fn=None, chunks: int = 1) -> SiteDesign:
    """Design every wall of the site (``progress(n)`` as ``n`` more walls are designed).

    The walls are designed in up to ``chunks`` groups of neighbouring walls (each group's
    segments planned together, as :func:`plan_walls` does); ``map_fn(fn, groups)`` (e.g. the
    hub's process pool) yields ``fn(group)`` for every group in order — by default in this
    process. The result does not depend on the grouping."""
    keys, tables = design_tables(walls, grid, rates)

    def design_group(group: Sequence[WallToDesign]) -> list[WallDesign]:
        plans = plan_walls(group, keys, tables, rates)
        return [design_wall(wall, tables[keys[wall.wall]], rates, audit=audit,
                            plan=plans.get(wall.wall)) for wall in group]

    designs: list[WallDesign] = []
    for got in (map_fn or map)(design_group, _groups(walls, chunks)):
        designs.extend(got)
        if progress is not None:
            progress(len(got))
    designs = assign_marks(designs)
    by_wall = {wall.wall: wall for wall in walls}

    def detail_group(group: Sequence[WallDesign]) -> list[WallDesign]:
        return [detailed(d, by_wall[d.wall].inputs, rates) for d in group]

    out = tuple(d for got in (map_fn or map)(detail_group, _groups(designs, chunks))
                for d in got)
    out, marked, barlist = _bar_marks(out)
    inputs = {wall.wall: wall.inputs for wall in walls}
    criteria = {wall.wall: wall.criteria for wall in walls}
    return SiteDesign(
        walls=out, cases=governing_cases(out, inputs, criteria), inputs=inputs,
        bars=marked, barlist=barlist, quantity_totals=_quantity_totals(out),
        load_factors=tuple(LOAD_FACTORS), audit_rule=AUDIT_RULE if audit else "")
