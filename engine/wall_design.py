"""One wall designed from its planned segments: every station of every segment checked with
the segment's section, footing and top at that station's own grades (``check_section``), and
checked again by the independent scalar implementation (``engine.audit``); a disagreement
between the two is a bug (DesignError, exit 1), never a silent pass.
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Mapping
from dataclasses import dataclass
from typing import Any

import numpy as np

from ..errors import DesignError
from .audit_selection import audit_stations as select_audit_stations
from .bars import BarSpec
from .checks import SectionChecks, check_section
from .model import Joint, SectionDims, Segment, StationSeries, WallDesign
from .section import BarArrays, DesignInputs, Reinforcement, SectionGeometry
from .segments import SegmentRules, place_joints, plan_segments
from .sizing import CostRates, DesignTable
from .status import OK, Status, StatusCode

CROSS_TOLERANCE_FT = 1e-6  # front grade above retained grade by more: the grades cross
CROSS_STATUS = Status(StatusCode.GRADES_CROSS, "the front grade is above the retained grade")
MIN_CHECK_HEIGHT_FT = 0.05  # a station with less (or a flipped side) is checked at this height
NO_WALL_STATUS = Status(StatusCode.NO_WALL, "retained height below min_retained_height_ft")
OVER_LIMIT_STATUS = Status(StatusCode.OVER_LIMIT,
                           "retained height exceeds max_retained_height_ft")


@dataclass(frozen=True)
class WallToDesign:
    """One wall as the design stage takes it: its id and side, its validated inputs and
    criteria (the ``[criteria]`` keys), and its sampled stations."""

    wall: str
    name: str | None
    retained_side: str
    inputs: DesignInputs
    criteria: Mapping[str, Any]
    stations: StationSeries


def lowering_ft(crit) -> float:
    """The footing lowering offered on steep ground: 0.5 ft, on the elevation grid."""
    step = crit["elevation_step_ft"]
    return step * math.ceil(0.5 / step - 1e-9)


def segment_rules(crit, rates: CostRates) -> SegmentRules:
    emb = max(crit["min_embedment_ft"], crit.get("frost_depth_ft") or 0.0)
    return SegmentRules(
        embedment_ft=emb, freeboard_ft=crit["freeboard_ft"],
        footing_step_max_ft=crit["footing_step_max_ft"],
        bf_round_ft=crit["elevation_step_ft"], bf_lowering_ft=lowering_ft(crit),
        top_of_wall=crit["top_of_wall"], top_step_in=crit["elevation_step_ft"] * 12.0,
        step_min_ft=crit["step_min_in"] / 12.0,
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
                         longitudinal=arr(sec.footing_long_bars),
                         heel_hooked=sec.heel_hooked, toe_hooked=sec.toe_hooked)


def station_cases(ws: StationSeries, idx, bf, tw, fb_crit, top_mode):
    """Retained height, embedment and freeboard at the stations ``idx`` of a segment."""
    rg, fg = ws.retained_grade_ft[idx], ws.front_grade_ft[idx]
    h = rg - fg
    emb = fg - bf
    fb = (tw - rg) if top_mode == "stepped" else np.full(idx.size, fb_crit)
    return h, emb, fb


def audit_stations(inputs, sec: SectionDims, h, emb, fb, res: SectionChecks, wall,
                   station_ft) -> tuple[float, ...]:
    """The scalar re-check of the segment's deciding stations (the rule of
    :func:`~.audit_selection.audit_stations`: ends, failures, every station within 5 % of a
    check's largest ratio, an even sample); raises DesignError where it disagrees and returns
    the stations it re-checked."""
    from .audit import audit_section

    geo = {"footing_thickness_in": sec.footing_thickness_in, "stem_top_in": sec.stem_top_in,
           "stem_base_in": sec.stem_base_in, "toe_ft": sec.toe_ft, "heel_ft": sec.heel_ft,
           "key_width_in": sec.key_width_in, "key_depth_in": sec.key_depth_in}
    if sec.has_key:
        geo["key_offset_ft"] = sec.key_offset_ft
    bars = {"stem": str(sec.stem_bars), "heel": str(sec.heel_bars), "toe": str(sec.toe_bars),
            "horizontal": str(sec.horizontal_bars), "longitudinal": str(sec.footing_long_bars),
            "heel_hooked": sec.heel_hooked, "toe_hooked": sec.toe_hooked}
    ratios = np.empty((len(res.rows),) + tuple(res.shape))
    row_passes = np.empty(ratios.shape, bool)
    for c, r in enumerate(res.rows):  # a row of the section alone is one value: broadcast
        ratios[c], row_passes[c] = r.ratio, r.passes
    ratios, row_passes = ratios.reshape(len(res.rows), -1), row_passes.reshape(len(res.rows), -1)
    passes = np.broadcast_to(np.asarray(res.passes, bool), res.shape).reshape(-1)
    chosen = select_audit_stations(ratios, passes)
    names = res.names
    for k in chosen:
        g = dict(geo, retained_height_ft=max(float(h[k]), MIN_CHECK_HEIGHT_FT),
                 embedment_ft=float(emb[k]), freeboard_ft=float(fb[k]))
        rows = audit_section(inputs, g, bars)
        for c, (name, want) in enumerate(zip(names, row_passes[:, k].tolist(), strict=True)):
            a = rows.get(name)
            if a is not None and a.passes != want:
                _disagree(a, name, float(ratios[c, k]), want, wall, float(station_ft[k]))
    return tuple(float(station_ft[k]) for k in chosen)


def _disagree(a, name: str, r: float, v_ok: bool, wall, station_ft: float) -> None:
    """Raise unless the two sit on the edge (within rounding of 1.0) and may fall either side."""
    ra = a.demand / a.capacity if a.capacity else math.inf
    if not (math.isfinite(r) and abs(r - 1.0) < 1e-6 and abs(ra - 1.0) < 1e-6):
        raise DesignError(
            f"audit disagrees with the engine on wall {wall} at station "
            f"{station_ft:.2f}, check {name}: engine ratio {r:.6f} "
            f"({'pass' if v_ok else 'fail'}), audit {a.demand:.6g} / "
            f"{a.capacity:.6g} ({'pass' if a.passes else 'fail'})")


def _same_section(table: DesignTable, h1: float, h2: float) -> bool:
    a, b = table.section(h1), table.section(h2)
    return a is not None and b is not None and a.signature() == b.signature()


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
                    and _same_section(table, hc, p[4])
                    and station_ft[i1] - station_ft[p[0]] <= segment_max_ft + 1e-9):
                p[1], p[4] = i1, max(p[4], hc)
                continue
        out.append([i0, i1, bf, tw, hc])
    return [tuple(p) for p in out]


def wall_run(ws: StationSeries, c) -> np.ndarray | None:
    """The stations of a wall from the first to the last that needs a wall (None if none)."""
    n = len(ws)
    need = np.nonzero(ws.retained_height_ft >= c["min_retained_height_ft"])[0]
    if need.size == 0:
        return None
    first, last = int(need[0]), int(need[-1])
    if first == last:  # one station needs a wall: give it a neighbour
        first, last = (first - 1, last) if first > 0 else (first, min(last + 1, n - 1))
    return np.arange(first, last + 1)


def section_for(table: DesignTable, hc: float, geometry_at, inputs: DesignInputs,
                first=None):
    """The envelope section of the design table for ``hc`` checked at the segment's stations;
    if a station still fails, the next larger section of a taller row (rare). Returns
    (section, checks, status, design height): section and checks None with a ``no_section``
    status when nothing on the grid holds; the design height is ``hc``, or the height of the
    taller row whose section holds (so that the sections still grow with it). ``first``:
    (section, checks) of the first candidate, already checked (:func:`_checked_first`)."""
    k0 = int(table.index(hc))
    tries = []
    seen = set()
    if first is not None:
        if bool(np.all(first[1].passes)):
            return first[0], first[1], OK, hc
        tries.append((first[0], first[1], hc))
        seen.add(first[0].signature())
    for k in range(k0 if k0 >= 0 else len(table.choices), len(table.choices)):
        cand = table.choices[k].section
        if cand is None:
            break
        if cand.signature() in seen:  # rows sharing a mark: checked once
            continue
        seen.add(cand.signature())
        r = check_section(geometry_at(cand), inputs, reinforcement(cand))
        tries.append((cand, r, max(hc, table.choices[k].design_height_ft) if tries else hc))
        if bool(np.all(r.passes)):
            break
    if not tries:
        return None, None, Status(StatusCode.NO_SECTION, (
            f"nothing on the sizing grid holds a design height of "
            f"{hc:.2f} ft; widen [sizing] (footing_thickness_max_in, heel_max_ft, "
            f"toe_max_ft, stem_max_in) or revisit the soil and loads")), hc
    sec, res, h = tries[-1] if bool(np.all(tries[-1][1].passes)) else tries[0]
    return sec, res, OK, h


@dataclass
class _StationResults:
    """The per-station arrays of a wall, filled segment by segment."""

    n: int

    def __post_init__(self):
        self.segment = np.full(self.n, -1)
        self.utilization = np.full(self.n, np.nan)
        self.checks: dict[str, np.ndarray] = {}
        self.governing = [""] * self.n
        self.status = [NO_WALL_STATUS] * self.n


def _segment_fields(res: SectionChecks, station_ft, design_height_ft) -> dict:
    """The segment's results: its least FS, largest q and ratio, and its governing station:
    the station of the largest stability or strength ratio (ties: the tallest design height),
    or of the largest ratio of all where a station fails."""
    st = res.stability
    ratio = np.asarray(res.utilization_max, float)
    shape = np.shape(station_ft)
    gov = np.broadcast_to(np.asarray(res.governing_ratio, float), shape)
    H = np.broadcast_to(np.asarray(design_height_ft, float), shape)
    fails = ~np.broadcast_to(np.asarray(res.passes), shape)
    if fails.any():
        key = np.where(fails, np.where(np.isfinite(ratio), ratio, np.inf), -np.inf)
        names = np.broadcast_to(res.worst, shape)
    else:
        key = np.round(gov, 9)  # a tie within rounding goes to the taller station
        names = np.broadcast_to(res.governing, shape)
    kmax = int(np.lexsort((H, key))[-1])
    return dict(
        fs_overturning=float(np.min(st.fs_overturning)),
        fs_sliding=float(np.min(st.fs_sliding)),
        q_max_psf=float(np.max(st.q_max_psf)),
        utilization_max=float(np.max(ratio)),
        governing_check=str(names[kmax]),
        governing_ratio=float(gov[kmax]),
        governing_station_ft=float(station_ft[kmax]),
        detailing_at_limit=" ".join(res.detailing_at_limit(None)))


def _record_stations(out: _StationResults, q, idx, own, over, res, status) -> None:
    """The segment's own stations into ``out``: the first ``len(own)`` of ``idx``, which are
    consecutive (its end station goes to the next segment)."""
    n_own = len(own)
    if n_own == 0:
        return
    first = int(idx[0])
    mine = slice(first, first + n_own)  # in the wall's arrays
    head = slice(0, n_own)  # in the segment's
    out.segment[mine] = q
    ov = np.asarray(over, bool)[head]
    if res is not None:
        def per_station(v, dtype=None):
            v = np.asarray(v, dtype)
            return v[head] if v.ndim else np.full(n_own, v)

        for row in res.rows:
            arr = out.checks.get(row.name)
            if arr is None:
                arr = out.checks[row.name] = np.full(out.n, np.nan)
            arr[mine] = per_station(row.ratio, float)
        util = per_station(res.utilization_max, float)
        out.utilization[mine] = np.where(ov, out.utilization[mine], util)
        gov, worst = per_station(res.governing).tolist(), per_station(res.worst).tolist()
        ok = per_station(res.passes, bool).tolist()
    for k in range(n_own):
        j = first + k
        if ov[k]:
            out.status[j] = OVER_LIMIT_STATUS
        elif res is None:
            out.status[j] = status
        else:
            out.governing[j] = str(gov[k])
            out.status[j] = OK if ok[k] else Status(StatusCode.FAILS, str(worst[k]))


BATCH_MIN_STATIONS = 64  # below this a wall's segments are checked one by one


def _take(obj, sl: slice, n: int):
    """``obj`` (check results: dataclasses, tuples and arrays over ``n`` stations) cut to the
    stations ``sl``; arrays of any other length, and scalars, as they are."""
    if isinstance(obj, np.ndarray):
        return obj[sl] if obj.ndim >= 1 and obj.shape[0] == n else obj
    if dataclasses.is_dataclass(obj) and not isinstance(obj, type):
        # a shallow copy with the cut fields (no __init__: the results were validated once)
        new = object.__new__(type(obj))
        new.__dict__.update({k: _take(v, sl, n) for k, v in vars(obj).items()})
        return new
    if isinstance(obj, tuple):
        items = [_take(x, sl, n) for x in obj]
        return type(obj)(*items) if hasattr(obj, "_fields") else tuple(items)
    if isinstance(obj, list):
        return [_take(x, sl, n) for x in obj]
    if isinstance(obj, dict):
        return {k: _take(v, sl, n) for k, v in obj.items()}
    return obj


def _checked_first(wall: WallToDesign, table: DesignTable, pieces) -> list:
    """For every piece, (section, checks) of its first candidate section of the table, the
    stations of all pieces checked in one vectorized call per kind of section (with and
    without a key) instead of one call per segment; None where a piece has no candidate."""
    c, ws = wall.criteria, wall.stations
    cases = []
    for i0, i1, bf, tw, hc in pieces:
        k0 = int(table.index(hc))
        sec = table.choices[k0].section if 0 <= k0 < len(table.choices) else None
        idx = np.arange(i0, i1 + 1)
        cases.append((sec, idx, *station_cases(ws, idx, bf, tw, c["freeboard_ft"],
                                               c["top_of_wall"])))
    got: list = [None] * len(pieces)
    for keyed in (False, True):
        group = [q for q, (sec, *_rest) in enumerate(cases)
                 if sec is not None and sec.has_key == keyed]
        if not group:
            continue
        sizes = [cases[q][1].size for q in group]
        n = int(sum(sizes))

        def per_station(name, group=group, sizes=sizes):
            return np.repeat([float(getattr(cases[q][0], name)) for q in group], sizes)

        def bars(member, group=group, sizes=sizes):
            specs = [getattr(cases[q][0], member) for q in group]
            return BarArrays(np.repeat([b.size for b in specs], sizes),
                             np.repeat([float(b.spacing_in) for b in specs], sizes))

        h = np.concatenate([cases[q][2] for q in group])
        geo = SectionGeometry(
            retained_height_ft=np.maximum(h, MIN_CHECK_HEIGHT_FT),
            embedment_ft=np.concatenate([cases[q][3] for q in group]),
            footing_thickness_in=per_station("footing_thickness_in"),
            stem_top_in=per_station("stem_top_in"), stem_base_in=per_station("stem_base_in"),
            toe_ft=per_station("toe_ft"), heel_ft=per_station("heel_ft"),
            key_width_in=per_station("key_width_in"), key_depth_in=per_station("key_depth_in"),
            key_offset_ft=per_station("key_offset_ft") if keyed else None,
            freeboard_ft=np.concatenate([cases[q][4] for q in group]))
        reinf = Reinforcement(stem=bars("stem_bars"), heel=bars("heel_bars"),
                              toe=bars("toe_bars"), horizontal=bars("horizontal_bars"),
                              longitudinal=bars("footing_long_bars"),
                              heel_hooked=per_station("heel_hooked") > 0.5,
                              toe_hooked=per_station("toe_hooked") > 0.5)
        res = check_section(geo, wall.inputs, reinf)
        at = 0
        for q, size in zip(group, sizes, strict=True):
            got[q] = (cases[q][0], _take(res, slice(at, at + size), n))
            at += size
    return got


def _design_segment(wall: WallToDesign, table: DesignTable, q, piece, last: bool, out,
                    audit: bool, first=None) -> Segment:
    i0, i1, bf, tw, hc = piece
    c, ws = wall.criteria, wall.stations
    idx = np.arange(i0, i1 + 1)  # both ends are checked
    own = idx if last else idx[:-1]  # the end station goes to the next
    hs, emb, fb = station_cases(ws, idx, bf, tw, c["freeboard_ft"], c["top_of_wall"])
    sec, res, status, hc = section_for(table, hc,
                                       lambda cand: station_geometry(cand, hs, emb, fb),
                                       wall.inputs, first=first)
    if res is not None and not bool(np.all(res.passes)):
        bad = int(np.argmax(~np.asarray(res.passes)))
        status = Status(StatusCode.FAILS,
                        f"{res.worst[bad]} at station {ws.station_ft[idx][bad]:.2f}; no "
                        f"larger section of the design table holds it (widen [sizing] or "
                        f"revisit the soil and loads)")
    cross = ws.retained_grade_ft[idx] < ws.front_grade_ft[idx] - CROSS_TOLERANCE_FT
    if cross.any() and (status.ok or status.code is StatusCode.FAILS):
        kk = int(np.argmin(ws.retained_grade_ft[idx] - ws.front_grade_ft[idx]))
        status = Status(StatusCode.GRADES_CROSS, (
            f"the front grade is {ws.front_grade_ft[idx][kk] - ws.retained_grade_ft[idx][kk]:.2f}"
            f" ft above the retained grade at station {ws.station_ft[idx][kk]:.2f} "
            f"({int(cross.sum())} station(s)): the soil is retained from the other side there; "
            "check the grades and retained_side, or end the wall before it"))
    over = hs > c["max_retained_height_ft"] + 1e-9
    if over.any():
        kk = int(np.argmax(hs))
        status = Status(StatusCode.OVER_LIMIT, (
            f"retained height {hs[kk]:.2f} ft at station "
            f"{ws.station_ft[idx][kk]:.2f} exceeds max_retained_height_ft "
            f"{c['max_retained_height_ft']:g}"))
    fields: dict = {}
    if res is not None:
        fields = _segment_fields(res, ws.station_ft[idx], ws.retained_grade_ft[idx] - bf)
        if audit:
            fields["audited_station_ft"] = audit_stations(wall.inputs, sec, hs, emb, fb, res,
                                                        wall.wall, ws.station_ft[idx])
    _record_stations(out, q, idx, own, over, res, status)
    for j in idx[cross]:
        if j in own:
            out.status[j] = CROSS_STATUS
    t_ft = (sec.footing_thickness_in / 12.0) if sec is not None else 0.0
    rg_seg = ws.retained_grade_ft[idx]
    tw_start = tw if c["top_of_wall"] == "stepped" else float(rg_seg[0] + c["freeboard_ft"])
    tw_end = tw if c["top_of_wall"] == "stepped" else float(rg_seg[-1] + c["freeboard_ft"])
    return Segment(
        wall=wall.wall, segment=f"{wall.wall}-{q + 1:02d}", mark="",
        station_start_ft=float(ws.station_ft[i0]), station_end_ft=float(ws.station_ft[i1]),
        retained_height_max_ft=float(np.max(hs)),
        top_of_wall_ft=tw, top_of_footing_ft=bf + t_ft, bottom_of_footing_ft=bf,
        section=sec, design_height_ft=hc, status=status,
        top_of_wall_start_ft=tw_start, top_of_wall_end_ft=tw_end, **fields)


def _joints(segments: list[Segment], c) -> tuple[Joint, ...]:
    boundaries = []
    for a, b in zip(segments[:-1], segments[1:], strict=True):
        # an expansion joint where the footing changes level (common practice)
        boundaries.append((b.station_start_ft,
                           abs(a.bottom_of_footing_ft - b.bottom_of_footing_ft) > 1e-9))
    joints = place_joints(segments[0].station_start_ft, segments[-1].station_end_ft, boundaries,
                          c["contraction_joint_max_ft"], c["expansion_joint_max_ft"])
    return tuple(Joint(st, k) for st, k in joints)


def design_wall(wall: WallToDesign, table: DesignTable, rates: CostRates, *,
                audit: bool = True, plan=None) -> WallDesign:
    """Segments, sections and per-station checks of one wall (``plan``: its segments from
    :func:`~.segments.plan_segments_many`, planned here when not given)."""
    c, ws = wall.criteria, wall.stations
    out = _StationResults(len(ws))
    run = wall_run(ws, c)
    if run is None:
        return WallDesign(wall.wall, wall.name, wall.retained_side, ws, (), (), out.segment,
                          out.utilization, tuple(out.governing), tuple(out.status))
    if plan is None:
        plan = plan_segments(ws.station_ft[run], ws.retained_grade_ft[run],
                             ws.front_grade_ft[run], segment_rules(c, rates),
                             table.cost_per_ft, table.embedment_of)
    pieces = merge_identical(plan, run, ws.station_ft, table, c["segment_max_ft"])
    batched = sum(p[1] - p[0] + 1 for p in pieces) >= BATCH_MIN_STATIONS
    firsts = _checked_first(wall, table, pieces) if batched else [None] * len(pieces)
    segments = [_design_segment(wall, table, q, piece, q == len(pieces) - 1, out, audit,
                                first=firsts[q])
                for q, piece in enumerate(pieces)]
    return WallDesign(
        wall=wall.wall, name=wall.name, retained_side=wall.retained_side, stations=ws,
        segments=tuple(segments), joints=_joints(segments, c),
        station_segment=out.segment, station_utilization=out.utilization,
        station_governing=tuple(out.governing), station_status=tuple(out.status),
        station_checks=out.checks)
