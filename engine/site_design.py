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
from collections.abc import Mapping, Sequence
from dataclasses import replace

import numpy as np

from .audit_selection import AUDIT_RULE
from .checks import LOAD_FACTORS
from .governing import governing_cases
from .model import PreviousRun, SiteDesign, StationSeries, WallDesign
from .section import DesignInputs
from .segments import plan_segments_many
from .sizing import CostRates, DesignTable, SizingGrid, design_table
from .wall_design import WallToDesign, design_wall, lowering_ft, segment_rules, wall_run


def least_embedment_ft(crit) -> float:
    """The embedment every footing keeps at least: min_embedment_ft or the frost depth."""
    return max(crit["min_embedment_ft"], crit.get("frost_depth_ft") or 0.0)


def _table_key(inputs: DesignInputs, crit, emb, fb, top):
    return (inputs, emb, fb, crit["design_height_increment_ft"], top, crit["footing_cover_ft"],
            crit.get("footing_width_max_ft"))


def mark_name(i: int) -> str:
    """The ``i``-th mark letter: A .. Z, AA, AB, ..."""
    out = ""
    i += 1
    while i:
        i, r = divmod(i - 1, 26)
        out = chr(65 + r) + out
    return out


def mark_index(name: str) -> int:
    """The inverse of :func:`mark_name` (-1 for a name that is not a mark letter)."""
    if not name or not name.isalpha() or not name.isupper():
        return -1
    i = 0
    for ch in name:
        i = i * 26 + (ord(ch) - 64)
    return i - 1


def assign_marks(walls: list[WallDesign], previous: PreviousRun | None = None
                 ) -> list[WallDesign]:
    """Section marks A, B, ... site-wide, one per distinct section, in order of first use.
    With ``previous`` (a revision), a section identical to one of the earlier run keeps its
    letter and a new section takes a letter after every earlier one; a segment with the same
    stations and mark as one of the earlier run keeps its id, another takes a number after the
    wall's earlier ones."""
    marks: dict[tuple, str] = {}
    next_i = 0
    if previous is not None:
        for letter, sec in previous.marks.items():
            marks.setdefault(sec.signature(), letter)
            next_i = max(next_i, mark_index(letter) + 1)
    taken = set(marks.values())

    def new_letter() -> str:
        nonlocal next_i
        while mark_name(next_i) in taken:
            next_i += 1
        taken.add(mark_name(next_i))
        return mark_name(next_i)

    result = []
    for w in walls:
        segs = []
        for s in w.segments:
            if s.section is None:
                segs.append(s)
                continue
            sig = s.section.signature()
            if sig not in marks:
                marks[sig] = new_letter()
            segs.append(replace(s, mark=marks[sig]))
        if previous is not None:
            segs = _keep_segment_ids(w.wall, segs, previous)
        result.append(replace(w, segments=tuple(segs)))
    return result


def _keep_segment_ids(wall: str, segs, previous: PreviousRun):
    # the earlier run's stations as its tables wrote them (to 1e-4 ft): matched within 1e-3
    old = [(a, b, m, sid) for w, sid, a, b, m in previous.segments if w == wall]

    def earlier(s):
        for a, b, m, sid in old:
            if (m == s.mark and abs(a - s.station_start_ft) < 1e-3
                    and abs(b - s.station_end_ft) < 1e-3):
                return sid
        return None

    used = {sid for w, sid, _, _, _ in previous.segments if w == wall}
    nums = [int(sid.rsplit("-", 1)[1]) for sid in used
            if "-" in sid and sid.rsplit("-", 1)[1].isdigit()]
    nxt = max(nums, default=0) + 1
    out, mine = [], set()
    for s in segs:
        sid = earlier(s)
        if sid is None or sid in mine:
            while f"{wall}-{nxt:02d}" in used:
                nxt += 1
            sid = f"{wall}-{nxt:02d}"
            nxt += 1
        mine.add(sid)
        out.append(replace(s, segment=sid))
    return out


def segment_cost(seg, rates: CostRates, excavation_cy: float) -> float:
    """$ of a segment from its quantities; ``excavation_cy`` is the excavation it counts
    (``engine.quantities.excavation_for_cost_cy``: the takeoff's with existing ground, else
    the same trench dug from the front grade)."""
    if seg.section is None:
        return math.nan
    return (rates.concrete_usd_per_cy * seg.concrete_cy + rates.steel_usd_per_lb * seg.steel_lb
            + rates.formwork_usd_per_sf * seg.formwork_sf
            + rates.excavation_usd_per_cy * excavation_cy)


def needed_height_ft(ws: StationSeries, c) -> float:
    """The tallest design height any segment of the wall can ask the sizing for: the largest
    retained grade less the least front grade over any stretch of ``segment_max_ft``, plus
    the footing lowering and rounding the segments may add; at most the height limit plus 2 ft
    (beyond it every station is flagged anyway)."""
    from .segments import LOWERINGS_STEEP, window_extremes

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
    margin = (LOWERINGS_STEEP - 1) * lowering_ft(c) + c["elevation_step_ft"] + c[
        "design_height_increment_ft"]
    return float(min(max(span, 0.0) + margin, c["max_retained_height_ft"] + 2.0))


def design_tables(walls: Sequence[WallToDesign], grid: SizingGrid, rates: CostRates, *,
                  map_fn=None) -> tuple[dict[str, tuple], dict[tuple, DesignTable]]:
    """One design table per distinct set of inputs and criteria, tall enough for every wall
    that shares it: (wall id -> table key, table key -> table); ``map_fn(fn, items)`` (e.g.
    the hub's process pool) yields ``fn(item)`` for every item in order."""
    keys, need, first = {}, {}, {}
    for wall in walls:
        c = wall.criteria
        key = _table_key(wall.inputs, c, least_embedment_ft(c), c["freeboard_ft"],
                         c["top_of_wall"])
        keys[wall.wall] = key
        need[key] = max(need.get(key, 0.0), needed_height_ft(wall.stations, c))
        first.setdefault(key, wall)

    def table(key) -> DesignTable:
        wall = first[key]
        c = wall.criteria
        return design_table(
            wall.inputs, grid, rates, max_height_ft=need[key],
            increment_ft=c["design_height_increment_ft"],
            embedment_ft=least_embedment_ft(c), freeboard_ft=c["freeboard_ft"],
            footing_cover_ft=c["footing_cover_ft"],
            footing_width_max_ft=c.get("footing_width_max_ft"))

    order = list(first)
    mapper = map_fn if map_fn is not None and len(order) > 1 else map
    return keys, dict(zip(order, mapper(table, order), strict=True))


def plan_walls(walls: Sequence[WallToDesign], table_of: Mapping[str, DesignTable],
               rates: CostRates) -> dict:
    """The segments of the walls sharing a design table and rules, planned together
    (``table_of``: wall id -> its design table)."""
    groups: dict = {}
    for wall in walls:
        run = wall_run(wall.stations, wall.criteria)
        if run is not None:
            gk = (id(table_of[wall.wall]), segment_rules(wall.criteria, rates))
            groups.setdefault(gk, []).append((wall.wall, wall.stations, run))
    plans = {}
    for (_, rules), members in groups.items():
        table = table_of[members[0][0]]
        got = plan_segments_many(
            [(ws.station_ft[run], ws.retained_grade_ft[run], ws.front_grade_ft[run])
             for _, ws, run in members], rules, table.cost_per_ft, table.embedment_of)
        plans.update({wid: p for (wid, _, _), p in zip(members, got, strict=True)})
    return plans


def row_weights(plan, station_ft: np.ndarray, table: DesignTable) -> np.ndarray:
    """ft of wall the plan puts at each row of the design table."""
    w = np.zeros(len(table.choices))
    length = station_ft[plan.end_index] - station_ft[plan.start_index]
    rows = table.index(plan.design_height_ft)
    for r, L in zip(rows, length, strict=True):
        if r >= 0:
            w[int(r)] += float(L)
    return w


def _marks_used(previous: PreviousRun, walls, marks_per: str) -> set:
    """The earlier run's marks these walls may keep: every mark where the marks count for
    the site, else the ones these walls used (a mark counts per wall, so another wall's
    section is no free mark here; it stays a candidate as a row of the table)."""
    if marks_per == "site":
        return set(previous.marks)
    ids = {w.wall for w in walls}
    return {seg[4] for seg in previous.segments if seg[0] in ids}


def marked_tables(walls: Sequence[WallToDesign], keys, tables, plans, grid: SizingGrid,
                  rates: CostRates, previous: PreviousRun | None = None
                  ) -> dict[str, DesignTable]:
    """Wall id -> its design table restricted to at most ``grid.marks_max`` sections chosen
    for the wall's least-cost segments (``grid.marks_per = "site"``: one choice for the walls
    sharing a design table); with ``previous``, the earlier run's sections first."""
    from .marks import marked_table

    members: dict = {}
    for wall in walls:
        group = keys[wall.wall] if grid.marks_per == "site" else ("wall", wall.wall)
        members.setdefault(group, []).append(wall)
    out = {}
    for group_walls in members.values():
        key = keys[group_walls[0].wall]
        table = tables[key]
        weight = np.zeros(len(table.choices))
        for wall in group_walls:
            plan = plans.get(wall.wall)
            if plan is not None:
                run = wall_run(wall.stations, wall.criteria)
                weight += row_weights(plan, wall.stations.station_ft[run], table)
        old = () if previous is None else tuple(
            replace(sec, batter_face=group_walls[0].inputs.criteria.batter_face)
            for m, sec in previous.marks.items() if m in _marks_used(previous, group_walls,
                                                                     grid.marks_per))
        marked, _ = marked_table(table, group_walls[0].inputs, rates, weight, grid.marks_max,
                                 rates.mark_usd, previous=old)
        out.update({wall.wall: marked for wall in group_walls})
    return out


def detailed(design: WallDesign, inputs: DesignInputs, rates: CostRates | None = None,
             criteria=None) -> WallDesign:
    """The design with its bar list, quantities (per segment and as a frame; the trench of
    the earthwork from ``criteria``), the bar details of its section marks and, given
    ``rates``, the cost of every segment."""
    import pandas as pd

    from .detailing import section_detail, wall_bar_list
    from .quantities import (
        apply_quantities,
        earthwork_options,
        excavation_for_cost_cy,
        wall_quantities,
    )

    trench = earthwork_options(criteria)
    bars = wall_bar_list(design, fc_psi=inputs.materials.fc_psi, fy_psi=inputs.materials.fy_psi)
    if not len(bars):
        bars = pd.DataFrame(columns=bars.columns)
    q = wall_quantities(design, bars, **trench)
    d = apply_quantities(design, q)
    if rates is not None:
        d = replace(d, segments=tuple(
            replace(s, cost_usd=segment_cost(s, rates, excavation_for_cost_cy(
                s, d.stations, **trench))) for s in d.segments))
    details = {mark: section_detail(sec) for mark, sec in d.marks().items()}
    return replace(d, bars=bars, quantities=q if d.segments else None, details=details)


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


def work_groups(items: Sequence, chunks: int) -> list[list]:
    """``items`` cut into at most ``chunks`` runs of neighbours of about equal size."""
    chunks = max(1, min(chunks, len(items)))
    edges = np.linspace(0, len(items), chunks + 1).round().astype(int)
    return [list(items[a:b]) for a, b in zip(edges[:-1], edges[1:], strict=True) if b > a]


def design_site(walls: Sequence[WallToDesign], grid: SizingGrid, rates: CostRates, *,
                audit: bool = True, progress=None, map_fn=None, chunks: int = 1,
                previous: PreviousRun | None = None) -> SiteDesign:
    """Design every wall of the site (``progress(n)`` as ``n`` more walls are designed).

    The walls are designed in up to ``chunks`` groups of neighbouring walls (each group's
    segments planned together, as :func:`plan_walls` does); ``map_fn(fn, groups)`` (e.g. the
    hub's process pool) yields ``fn(group)`` for every group in order — by default in this
    process. The result does not depend on the grouping. Each wall's segments are planned
    with the whole design table, its marks chosen (:func:`marked_tables`; for
    ``marks_per = "site"`` over every wall first, in this process) and its segments planned
    again with them. With ``previous`` (a revision of an earlier run) its sections, mark
    letters and segment ids are kept where they still serve."""
    keys, tables = design_tables(walls, grid, rates, map_fn=map_fn)
    base = {w.wall: tables[keys[w.wall]] for w in walls}
    site_marks = None
    if grid.marks_per == "site":
        least_all = plan_walls(walls, base, rates)
        site_marks = (least_all, marked_tables(walls, keys, tables, least_all, grid, rates,
                                               previous))

    def design_group(group: Sequence[WallToDesign]) -> list[WallDesign]:
        if site_marks is None:
            least = plan_walls(group, base, rates)
            table_of = marked_tables(group, keys, tables, least, grid, rates, previous)
        else:
            least, table_of = site_marks
        plans = plan_walls(group, table_of, rates)
        out = []
        for wall in group:
            d = design_wall(wall, table_of[wall.wall], rates, audit=audit,
                            plan=plans.get(wall.wall))
            if wall.wall in plans:
                d = replace(d, least_cost_usd=least[wall.wall].total_cost_usd,
                            plan_cost_usd=plans[wall.wall].total_cost_usd)
            out.append(d)
        return out

    designs: list[WallDesign] = []
    for got in (map_fn or map)(design_group, work_groups(walls, chunks)):
        designs.extend(got)
        if progress is not None:
            progress(len(got))
    designs = assign_marks(designs, previous)
    by_wall = {wall.wall: wall for wall in walls}

    def detail_group(group: Sequence[WallDesign]) -> list[WallDesign]:
        return [detailed(d, by_wall[d.wall].inputs, rates,
                         by_wall[d.wall].criteria) for d in group]

    out = tuple(d for got in (map_fn or map)(detail_group, work_groups(designs, chunks))
                for d in got)
    out, marked, barlist = _bar_marks(out)
    inputs = {wall.wall: wall.inputs for wall in walls}
    criteria = {wall.wall: wall.criteria for wall in walls}
    return SiteDesign(
        walls=out, cases=governing_cases(out, inputs, criteria), inputs=inputs,
        bars=marked, barlist=barlist, quantity_totals=_quantity_totals(out),
        load_factors=tuple(LOAD_FACTORS), audit_rule=AUDIT_RULE if audit else "")
