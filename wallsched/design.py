"""The design stage: stations -> design table -> segments -> checked, audited wall designs.

For each wall: the least-cost section for every design height (``engine.sizing``), the
least-cost segments (``engine.segments``), then every station of every segment checked with
the segment's section, footing and top at that station's own grades (``engine.checks``), and
checked again by the independent scalar implementation (``engine.audit``); a disagreement
between the two is a bug (DesignError, exit 1), never a silent pass.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace

import numpy as np

from .engine.bars import BarSpec
from .engine.checks import check_section
from .engine.model import Joint, SectionDims, Segment, WallDesign
from .engine.section import BarArrays, DesignInputs, Reinforcement, SectionGeometry
from .engine.segments import SegmentRules, place_joints, plan_segments, plan_segments_many
from .engine.sizing import CostRates, DesignTable, SizingGrid, design_table
from .errors import DesignError, InputError
from .profile.sampling import WallStations
from .site import Site, WallSpec

MIN_CHECK_HEIGHT_FT = 0.05  # a station with less (or a flipped side) is checked at this height
AUDIT_REL_TOL = 1e-6


@dataclass
class SiteDesign:
    """Every wall designed, with the tables and inputs behind them."""

    site: Site
    walls: list[WallDesign]
    inputs: dict[str, DesignInputs]
    tables: dict[str, DesignTable]
    warnings: list[str] = field(default_factory=list)

    @property
    def ok(self) -> bool:
        return all(w.ok for w in self.walls) and all(
            not s.startswith(("over_limit", "no_section", "fails")) for w in self.walls
            for s in w.station_status)


def wall_inputs(site: Site, wall: WallSpec) -> DesignInputs:
    try:
        return DesignInputs.from_tables(wall.soil, wall.loads, wall.materials, wall.criteria)
    except ValueError as exc:  # cross-key rules are checked at load time; this is a backstop
        raise InputError(str(exc), file=site.path.name, where=f"wall {wall.id!r}") from None


def _table_key(inputs: DesignInputs, crit, emb, fb, top):
    return (inputs, emb, fb, crit["design_height_increment_ft"], top, crit["footing_cover_ft"],
            crit.get("footing_width_max_ft"))


def segment_rules(crit, rates: CostRates) -> SegmentRules:
    emb = max(crit["min_embedment_ft"], crit.get("frost_depth_ft") or 0.0)
    return SegmentRules(
        embedment_ft=emb, freeboard_ft=crit["freeboard_ft"],
        footing_step_max_ft=crit["footing_step_max_ft"],
        bf_round_ft=crit["bottom_of_footing_round_ft"],
        top_of_wall=crit["top_of_wall"], top_step_in=crit["top_step_in"],
        segment_min_ft=crit["segment_min_ft"], segment_max_ft=crit["segment_max_ft"],
        step_cost_usd=rates.step_usd)


def station_geometry(sec: SectionDims, h, emb, fb) -> SectionGeometry:
    return SectionGeometry(
        retained_height_ft=np.maximum(h, MIN_CHECK_HEIGHT_FT), embedment_ft=emb,
        footing_thickness_in=sec.footing_thickness_in, stem_top_in=sec.stem_top_in,
        stem_base_in=sec.stem_base_in, toe_ft=sec.toe_ft, heel_ft=sec.heel_ft,
        key_width_in=sec.key_width_in, key_depth_in=sec.key_depth_in,
        key_offset_ft=sec.key_offset_ft if sec.has_key else None, freeboard_ft=fb)


def reinforcement(sec: SectionDims) -> Reinforcement:
    def arr(b: BarSpec):
        return BarArrays(b.size, b.spacing_in)

    return Reinforcement(stem=arr(sec.stem_bars), heel=arr(sec.heel_bars), toe=arr(sec.toe_bars),
                         horizontal=arr(sec.horizontal_bars),
                         longitudinal=arr(sec.footing_long_bars))


def _station_cases(ws: WallStations, idx, bf, tw, fb_crit, top_mode):
    rg, fg = ws.retained_grade_ft[idx], ws.front_grade_ft[idx]
    h = rg - fg
    emb = fg - bf
    fb = (tw - rg) if top_mode == "stepped" else np.full(idx.size, fb_crit)
    return h, emb, fb


def _audit(inputs, sec: SectionDims, h, emb, fb, res, wall, station_ft):
    """The scalar re-check of every station; raises DesignError where it disagrees."""
    from .engine.audit import audit_section

    geo = {"footing_thickness_in": sec.footing_thickness_in, "stem_top_in": sec.stem_top_in,
           "stem_base_in": sec.stem_base_in, "toe_ft": sec.toe_ft, "heel_ft": sec.heel_ft,
           "key_width_in": sec.key_width_in, "key_depth_in": sec.key_depth_in}
    if sec.has_key:
        geo["key_offset_ft"] = sec.key_offset_ft
    bars = {"stem": str(sec.stem_bars), "heel": str(sec.heel_bars), "toe": str(sec.toe_bars),
            "horizontal": str(sec.horizontal_bars), "longitudinal": str(sec.footing_long_bars)}
    names = res.names
    for k in range(h.size):
        g = dict(geo, retained_height_ft=max(float(h[k]), MIN_CHECK_HEIGHT_FT),
                 embedment_ft=float(emb[k]), freeboard_ft=float(fb[k]))
        rows = audit_section(inputs, g, bars)
        for name in names:
            if name not in rows:
                continue
            a = rows[name]
            row = res.row(name)
            v_ok = bool(np.broadcast_to(row.passes, res.shape)[k])
            if a.passes != v_ok:
                r = float(np.broadcast_to(row.ratio, res.shape)[k])
                ra = a.demand / a.capacity if a.capacity else math.inf
                # a ratio on the edge (within rounding of 1.0) may fall either side
                if not (math.isfinite(r) and abs(r - 1.0) < 1e-6 and abs(ra - 1.0) < 1e-6):
                    raise DesignError(
                        f"audit disagrees with the engine on wall {wall} at station "
                        f"{station_ft[k]:.2f}, check {name}: engine ratio {r:.6f} "
                        f"({'pass' if v_ok else 'fail'}), audit {a.demand:.6g} / "
                        f"{a.capacity:.6g} ({'pass' if a.passes else 'fail'})")


def merge_identical(plan, run, station_ft, table: DesignTable, segment_max_ft: float):
    """The plan's segments as (first station, last station, BF, TW, design height), with
    neighbours that came out identical (same section, footing and top: a boundary without a
    step or a change costs nothing, so the optimum may split anywhere) joined again while the
    joined length stays within ``segment_max_ft``."""
    out: list[list] = []
    for q in range(len(plan)):
        i0, i1 = int(run[plan.start_index[q]]), int(run[plan.end_index[q]])
        bf, tw = float(plan.bottom_of_footing_ft[q]), float(plan.top_of_wall_ft[q])
        hc = float(plan.design_height_ft[q])
        if out:
            p = out[-1]
            same_top = (math.isnan(tw) and math.isnan(p[3])) or abs(tw - p[3]) < 1e-9
            if (abs(bf - p[2]) < 1e-9 and same_top
                    and int(table.index(hc)) == int(table.index(p[4]))
                    and station_ft[i1] - station_ft[p[0]] <= segment_max_ft + 1e-9):
                p[1], p[4] = i1, max(p[4], hc)
                continue
        out.append([i0, i1, bf, tw, hc])
    return [tuple(p) for p in out]


def wall_run(ws: WallStations, c) -> np.ndarray | None:
    """The stations of a wall from the first to the last that needs a wall (None if none)."""
    n = len(ws)
    need = np.nonzero(ws.retained_height_ft >= c["min_retained_height_ft"])[0]
    if need.size == 0:
        return None
    first, last = int(need[0]), int(need[-1])
    if first == last:  # one station needs a wall: give it a neighbour
        first, last = (first - 1, last) if first > 0 else (first, min(last + 1, n - 1))
    return np.arange(first, last + 1)


def design_wall(site: Site, wall: WallSpec, ws: WallStations, inputs: DesignInputs,
                table: DesignTable, *, audit: bool = True, plan=None) -> WallDesign:
    """Segments, sections and per-station checks of one wall (``plan``: its segments from
    :func:`~.engine.segments.plan_segments_many`, planned here when not given)."""
    c = wall.criteria
    rates = CostRates.from_table(site.costs)
    rules = segment_rules(c, rates)
    n = len(ws)
    seg_of = np.full(n, -1)
    util = np.full(n, np.nan)
    per_check: dict[str, np.ndarray] = {}
    gov = [""] * n
    status = ["no_wall: retained height below min_retained_height_ft"] * n
    run = wall_run(ws, c)
    if run is None:
        return WallDesign(wall.id, wall.name, wall.retained_side, ws, (), (), seg_of, util,
                          tuple(gov), tuple(status))
    if plan is None:
        plan = plan_segments(ws.station_ft[run], ws.retained_grade_ft[run],
                             ws.front_grade_ft[run], rules, table.cost_per_ft,
                             table.embedment_of)
    segments: list[Segment] = []
    pieces = merge_identical(plan, run, ws.station_ft, table, c["segment_max_ft"])
    for q, (i0, i1, bf, tw, hc) in enumerate(pieces):
        idx = np.arange(i0, i1 + 1)  # both ends are checked
        own = idx if q == len(pieces) - 1 else idx[:-1]  # the end station goes to the next
        seg_id = f"{wall.id}-{q + 1:02d}"
        hs, emb, fb = _station_cases(ws, idx, bf, tw, c["freeboard_ft"], c["top_of_wall"])
        sec, res, reason = None, None, ""
        k0 = int(table.index(hc))
        tries = []
        # the envelope section; if a station still fails, the next taller one (rare)
        for k in range(k0 if k0 >= 0 else len(table.choices), len(table.choices)):
            cand = table.choices[k].section
            if cand is None:
                break
            r = check_section(station_geometry(cand, hs, emb, fb), inputs, reinforcement(cand))
            tries.append((cand, r))
            if bool(np.all(r.passes)):
                break
        if not tries:
            reason = (f"no_section: nothing on the sizing grid holds a design height of "
                      f"{hc:.2f} ft; widen [sizing] (footing_thickness_max_in, heel_max_ft, "
                      f"toe_max_ft, stem_max_in) or revisit the soil and loads")
        else:
            sec, res = tries[-1] if bool(np.all(tries[-1][1].passes)) else tries[0]
            if not bool(np.all(res.passes)):
                bad = int(np.argmax(~np.asarray(res.passes)))
                reason = (f"fails: {res.governing[bad]} at station "
                          f"{ws.station_ft[idx][bad]:.2f}")
        over = hs > c["max_retained_height_ft"] + 1e-9
        if over.any():
            kk = int(np.argmax(hs))
            reason = (f"over_limit: retained height {hs[kk]:.2f} ft at station "
                      f"{ws.station_ft[idx][kk]:.2f} exceeds max_retained_height_ft "
                      f"{c['max_retained_height_ft']:g}")
        fields: dict = {}
        local = {int(j): jl for jl, j in enumerate(idx)}
        if res is not None:
            st = res.stability
            ratio = np.asarray(res.utilization_max, float)
            g_names = res.governing
            kmax = int(np.argmax(np.where(np.isfinite(ratio), ratio, np.inf)))
            fields = dict(
                fs_overturning=float(np.min(st.fs_overturning)),
                fs_sliding=float(np.min(st.fs_sliding)),
                q_max_psf=float(np.max(st.q_max_psf)),
                utilization_max=float(np.max(ratio)),
                governing_check=str(g_names[kmax]),
                governing_station_ft=float(ws.station_ft[idx][kmax]))
            if audit:
                _audit(inputs, sec, hs, emb, fb, res, wall.id, ws.station_ft[idx])
            own_local = np.array([local[int(j)] for j in own])
            for row in res.rows:
                arr = per_check.setdefault(row.name, np.full(n, np.nan))
                arr[own] = np.broadcast_to(row.ratio, res.shape)[own_local]
        for j in own:
            jl = local[int(j)]
            seg_of[j] = q
            if over[jl]:
                status[j] = "over_limit: retained height exceeds max_retained_height_ft"
            elif res is None:
                status[j] = reason
            else:
                util[j] = float(ratio[jl])
                gov[j] = str(g_names[jl])
                status[j] = "ok" if bool(np.asarray(res.passes)[jl]) else f"fails: {g_names[jl]}"
        t_ft = (sec.footing_thickness_in / 12.0) if sec is not None else 0.0
        rg_seg = ws.retained_grade_ft[idx]
        tw_start = tw if c["top_of_wall"] == "stepped" else float(rg_seg[0] + c["freeboard_ft"])
        tw_end = tw if c["top_of_wall"] == "stepped" else float(rg_seg[-1] + c["freeboard_ft"])
        segments.append(Segment(
            wall=wall.id, segment=seg_id, mark="", station_start_ft=float(ws.station_ft[i0]),
            station_end_ft=float(ws.station_ft[i1]),
            retained_height_max_ft=float(np.max(hs)),
            top_of_wall_ft=tw, top_of_footing_ft=bf + t_ft, bottom_of_footing_ft=bf,
            section=sec, design_height_ft=hc, status=reason or "ok",
            top_of_wall_start_ft=tw_start, top_of_wall_end_ft=tw_end, **fields))
    boundaries = []
    for a, b in zip(segments[:-1], segments[1:], strict=True):
        step = (abs(a.bottom_of_footing_ft - b.bottom_of_footing_ft) > 1e-9
                or (c["top_of_wall"] == "stepped" and abs(a.top_of_wall_ft - b.top_of_wall_ft)
                    > 1e-9))
        boundaries.append((b.station_start_ft, step))
    joints = place_joints(segments[0].station_start_ft, segments[-1].station_end_ft, boundaries,
                          c["contraction_joint_max_ft"], c["expansion_joint_max_ft"])
    return WallDesign(
        wall=wall.id, name=wall.name, retained_side=wall.retained_side, stations=ws,
        segments=tuple(segments), joints=tuple(Joint(st, k) for st, k in joints),
        station_segment=seg_of, station_utilization=util, station_governing=tuple(gov),
        station_status=tuple(status), extra={"station_checks": per_check})


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


def segment_cost(seg: Segment, rates: CostRates, front_grade_avg_ft: float) -> float:
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


def needed_height_ft(ws: WallStations, c) -> float:
    """The tallest design height any segment of the wall can ask the sizing for: the largest
    retained grade less the least front grade over any stretch of ``segment_max_ft``, plus
    the footing lowering and rounding the segments may add; at most the height limit plus 2 ft
    (beyond it every station is flagged anyway)."""
    from .engine.segments import LOWERINGS_STEEP, SegmentRules, window_extremes

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


def design_site(site: Site, walls_stations: list[WallStations], *, audit: bool = True,
                progress=None) -> SiteDesign:
    """Design every wall of the site."""
    import pandas as pd

    from .engine.detailing import wall_bar_list
    from .engine.quantities import with_quantities

    grid = SizingGrid.from_table(site.sizing)
    rates = CostRates.from_table(site.costs)
    tables: dict = {}
    inputs_by_wall: dict[str, DesignInputs] = {}
    tables_by_wall: dict[str, DesignTable] = {}
    designs = []
    keys, need = {}, {}
    for wall, ws in zip(site.walls, walls_stations, strict=True):
        c = wall.criteria
        inputs = wall_inputs(site, wall)
        emb = max(c["min_embedment_ft"], c.get("frost_depth_ft") or 0.0)
        key = _table_key(inputs, c, emb, c["freeboard_ft"], c["top_of_wall"])
        keys[wall.id] = (key, inputs, emb)
        need[key] = max(need.get(key, 0.0), needed_height_ft(ws, c))
    for wall in site.walls:
        c = wall.criteria
        key, inputs, emb = keys[wall.id]
        if key not in tables:
            tables[key] = design_table(
                inputs, grid, rates, max_height_ft=need[key],
                increment_ft=c["design_height_increment_ft"], embedment_ft=emb,
                freeboard_ft=c["freeboard_ft"], footing_cover_ft=c["footing_cover_ft"],
                footing_width_max_ft=c.get("footing_width_max_ft"))
        inputs_by_wall[wall.id] = inputs
        tables_by_wall[wall.id] = tables[key]
    # the segments of the walls sharing a design table and rules, planned together
    groups: dict = {}
    for wall, ws in zip(site.walls, walls_stations, strict=True):
        run = wall_run(ws, wall.criteria)
        if run is not None:
            gk = (keys[wall.id][0], segment_rules(wall.criteria, rates))
            groups.setdefault(gk, []).append((wall.id, ws, run))
    plans = {}
    for (key, rules), members in groups.items():
        table = tables[key]
        got = plan_segments_many(
            [(ws.station_ft[run], ws.retained_grade_ft[run], ws.front_grade_ft[run])
             for _, ws, run in members], rules, table.cost_per_ft, table.embedment_of)
        plans.update({wid: p for (wid, _, _), p in zip(members, got, strict=True)})
    for wall, ws in zip(site.walls, walls_stations, strict=True):
        key, inputs, _ = keys[wall.id]
        designs.append(design_wall(site, wall, ws, inputs, tables[key], audit=audit,
                                   plan=plans.get(wall.id)))
        if progress is not None:
            progress(1)
    designs = assign_marks(designs)
    out = []
    for wall, d in zip(site.walls, designs, strict=True):
        bars = wall_bar_list(d, fc_psi=wall.materials["fc_psi"], fy_psi=wall.materials["fy_psi"])
        d = with_quantities(d, bars if len(bars) else pd.DataFrame(columns=bars.columns))
        fg = d.stations.front_grade_ft
        st = d.stations.station_ft
        segs = []
        for s in d.segments:
            m = (st >= s.station_start_ft) & (st <= s.station_end_ft)
            segs.append(replace(s, cost_usd=segment_cost(s, rates, float(np.mean(fg[m])))))
        out.append(replace(d, segments=tuple(segs), extra={**d.extra, "bars": bars}))
    return SiteDesign(site, out, inputs_by_wall, tables_by_wall)
