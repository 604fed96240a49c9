"""Constructible segments: group a wall's stations into stretches that share one section, one
level bottom of footing and one top of wall, for least total cost.

Method (dynamic programming over stations)
-----------------------------------------
A segment runs from station ``i`` to station ``j`` (both ends are checked; station ``j`` is
assigned to the next segment). For each segment and each allowed bottom of footing ``BF`` the
*envelope case* is

    h_case = max(retained grade over i..j) - min(front grade over i..j) + m * bf_lowering_ft
             + bf_round_ft
    BF     = min(front grade over i..j) - embedment(h_case), rounded down to ``bf_round_ft``,
             - m * bf_lowering_ft      (m = 0..M-1: lowering only to meet step limits; M = 1
                                        unless the ground is too steep for footings at their
                                        highest, then 5)

where embedment(h) is what the section of the design table for h needs (the least embedment,
or deeper to keep its footing buried). The envelope case has the largest retained height of
the segment at the least embedment its section allows, so that section holds every station;
the pipeline then re-checks every station at its own grades.
The segment costs ``length * cost_per_ft(h_case)`` plus a step cost where its footing or top
differs from the previous segment's. Consecutive footings may differ by at most
``footing_step_max_ft`` (IBC 2021 1809.3: footings level, stepped where the top changes);
bottoms of footing lie on a grid of ``bf_round_ft`` and tops of wall on one of ``top_step_in``
(``elevation_step_ft``, 0.5 ft), and a step in either is 0 or at least ``step_min_ft`` (6 in,
common practice: a step a crew can form).
Segment length lies between ``segment_min_ft`` and ``segment_max_ft`` (a run shorter than the
minimum is one segment).

The state of the recursion is (end station j, length in stations k, lowering m) and its value
the least cost of covering the stations up to j with the last segment (j-k .. j, m); every
transition checks the footing step against the previous segment. The optimum over the states at
the last station, traced back, gives the segments. The search is exact over the candidate
boundaries (the stations) and lowerings; it is linear in the number of stations and quadratic in
the number of stations a segment may span. :func:`plan_segments_many` solves several runs
under the same rules together: the recursion steps a block of stations at a time (a block is
shorter than the shortest segment, so no segment has both ends in it) through every run at once.

Where stations are closer than ``BOUNDARY_GRID_FT`` (2 ft; a segment end needs no finer
placing than that on walls whose segments are 20 ft and longer), segments end only at the
stations of a coarser set (the first, the last, and each next one at least that far on); the
envelope of a segment still takes every station between its ends, so that every station is
covered exactly as before, and the recursion, cubic in the density of stations, costs about
an eighth at 1 ft stations. With stations that far apart or farther, every station is a
candidate end, as before.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

import numpy as np

BATCH_STATIONS = 100_000  # stations (padded) of the runs whose recursion is solved together
BOUNDARY_GRID_FT = 2.0  # segment ends at stations at least this far apart (common practice)
LOWERINGS_STEEP = 5  # lowerings offered when the highest footings cannot meet the step limit
INFEASIBLE_COST_PER_FT = 1.0e7  # $/ft for a segment no section can hold (flagged, never hidden)


@dataclass(frozen=True)
class SegmentRules:
    """The segment criteria (each an option in ``[criteria]``)."""

    embedment_ft: float  # required: max(min_embedment_ft, frost_depth_ft)
    freeboard_ft: float
    footing_step_max_ft: float = 2.0  # common practice
    bf_round_ft: float = 0.5  # elevation grid of the bottoms of footing (common practice)
    bf_lowering_ft: float = 0.5  # lowering steps offered to meet the step limit
    bf_lowerings: int = 1  # 1: footings at their highest; more only where steps need it
    top_of_wall: str = "stepped"  # or "follow_grade"
    top_step_in: float = 6.0  # elevation grid of the tops of wall (common practice)
    step_min_ft: float = 0.5  # a step is 0 or at least 6 in (common practice: formable)
    segment_min_ft: float = 20.0  # common practice
    segment_max_ft: float = 90.0  # common practice: at most one expansion-joint spacing
    step_cost_usd: float = 0.0  # cost of one step in footing or top (illustrative)


@dataclass(frozen=True)
class SegmentPlan:
    """The chosen segments of one run of stations (arrays, one element per segment)."""

    start_index: np.ndarray  # first station index
    end_index: np.ndarray  # last station index (shared with the next segment's start)
    bottom_of_footing_ft: np.ndarray
    top_of_wall_ft: np.ndarray  # NaN when the top follows the grade
    design_height_ft: np.ndarray  # h_case: the envelope retained height designed for
    cost_usd: np.ndarray
    total_cost_usd: float

    def __len__(self) -> int:
        return int(self.start_index.size)


def _floor_to(x, step):
    """Round down to a multiple of ``step``, never above ``x`` (so a limit stays met)."""
    x = np.asarray(x, float)
    out = np.round(np.floor(x / step + 1e-9) * step, 9)
    return np.where(out > x, np.round(out - step, 9), out)


def _ceil_to(x, step):
    """Round up to a multiple of ``step``, never below ``x``."""
    x = np.asarray(x, float)
    out = np.round(np.ceil(x / step - 1e-9) * step, 9)
    return np.where(out < x, np.round(out + step, 9), out)


def window_extremes(values: np.ndarray, kmax: int, fn) -> np.ndarray:
    """``out[j, k] = fn(values[j-k .. j])`` for k = 0..kmax (NaN where j-k < 0)."""
    n = values.size
    out = np.full((n, kmax + 1), np.nan)
    acc = values.astype(float).copy()
    out[:, 0] = acc
    for k in range(1, min(kmax, n - 1) + 1):  # beyond the run's first station: NaN
        acc = acc.copy()
        acc[k:] = fn(acc[k:], values[: n - k])
        acc[:k] = np.nan
        out[:, k] = acc
    return out


def plan_segments(
    station_ft: np.ndarray,
    retained_grade_ft: np.ndarray,
    front_grade_ft: np.ndarray,
    rules: SegmentRules,
    cost_per_ft: Callable[[np.ndarray], np.ndarray],
    embedment_of: Callable[[np.ndarray], np.ndarray] | None = None,
) -> SegmentPlan:
    """Least-cost segments for one run of stations (see the module docstring).

    Args:
        station_ft, retained_grade_ft, front_grade_ft: the run's stations (increasing) and grades.
        rules: segment criteria.
        cost_per_ft: design table look-up, design height (ft) array -> $/ft of wall (NaN or
            inf where no section holds that height).
        embedment_of: design height -> the embedment its section needs (ft); by default
            ``rules.embedment_ft`` everywhere.
    """
    return plan_segments_many([(station_ft, retained_grade_ft, front_grade_ft)], rules,
                              cost_per_ft, embedment_of)[0]


def plan_segments_many(runs, rules: SegmentRules, cost_per_ft, embedment_of=None
                       ) -> list[SegmentPlan]:
    """:func:`plan_segments` for several runs of stations under the same rules and design
    table, solved together: the recursion steps through the stations of every run at once."""
    # a run is (stations, retained, front) and, once thinned to its candidate ends, the
    # extremes of the stretches before each end; a full run's stretch is its own station
    runs = [tuple(np.asarray(x, float) for x in run) for run in runs]
    runs = [run if len(run) == 5 else run + run[1:3] for run in runs]
    for run in runs:
        if run[0].size < 2:
            raise ValueError("a run of stations needs at least two stations")
    ends = [boundary_stations(run[0]) for run in runs]
    if any(e.size < run[0].size for e, run in zip(ends, runs, strict=True)):
        coarse = [_coarse_run(run, e) for run, e in zip(runs, ends, strict=True)]
        plans = plan_segments_many(coarse, rules, cost_per_ft, embedment_of)
        return [_fine_plan(p, e) for p, e in zip(plans, ends, strict=True)]
    plans: list = [None] * len(runs)
    # batches of runs of similar length, at most BATCH_STATIONS (padded) stations each
    order = sorted(range(len(runs)), key=lambda r: runs[r][0].size)
    batch: list[int] = []
    for pos, r in enumerate(order):
        batch.append(r)
        last = pos == len(order) - 1
        if last or (len(batch) + 1) * runs[order[pos + 1]][0].size > BATCH_STATIONS:
            got = _plan_batch([runs[b] for b in batch], rules, cost_per_ft, embedment_of)
            for b, plan in zip(batch, got, strict=True):
                plans[b] = plan
            batch = []
    return plans


def boundary_stations(s: np.ndarray, grid_ft: float | None = None) -> np.ndarray:
    """Indices of the stations where a segment may end: all of them where they are at least
    ``grid_ft`` apart; else the first, each next one at least ``grid_ft`` on, and the last."""
    s = np.asarray(s, float)
    grid_ft = BOUNDARY_GRID_FT if grid_ft is None else grid_ft
    if s.size < 3 or float(np.min(np.diff(s))) >= grid_ft - 1e-9:
        return np.arange(s.size)
    keep = [0]
    for i in range(1, s.size - 1):  # one pass, plain: the kept stations are few
        if s[i] - s[keep[-1]] >= grid_ft - 1e-9:
            keep.append(i)
    if s[-1] - s[keep[-1]] < grid_ft - 1e-9 and len(keep) > 1:
        keep[-1] = s.size - 1  # the last station ends the run; drop the one just before it
    else:
        keep.append(s.size - 1)
    return np.asarray(keep)


def _coarse_run(run, ends: np.ndarray) -> tuple:
    """The run at its candidate ends: (stations, retained, front, the largest retained and the
    least front grade over the stretch of stations before each end: ends[p-1]+1 .. ends[p])."""
    s, rg, fg = run[:3]
    starts = np.concatenate([[0], ends[:-1] + 1])
    return (s[ends], rg[ends], fg[ends], np.maximum.reduceat(rg, starts),
            np.minimum.reduceat(fg, starts))


def _fine_plan(plan: SegmentPlan, ends: np.ndarray) -> SegmentPlan:
    from dataclasses import replace

    return replace(plan, start_index=ends[plan.start_index], end_index=ends[plan.end_index])


def _window_over_stretches(point: np.ndarray, before: np.ndarray, kmax: int, fn) -> np.ndarray:
    """``out[j, k]``: ``fn`` over every station from end j-k to end j (the end itself and the
    stretches before ends j-k+1 .. j); NaN where j-k < 0."""
    n = point.size
    out = np.full((n, kmax + 1), np.nan)
    out[:, 0] = point
    stretches = window_extremes(before, kmax, fn)  # [j, k]: stretches j-k .. j
    for k in range(1, min(kmax, n - 1) + 1):
        out[k:, k] = fn(point[: n - k], stretches[k:, k - 1])
    return out


def _plan_batch(runs, rules, cost_per_ft, embedment_of) -> list[SegmentPlan]:
    kmax = max(_span_stations(run[0], rules) for run in runs)
    preps = [_prepare(run, rules, cost_per_ft, embedment_of, kmax) for run in runs]
    solved = _solve(preps, rules, kmax)
    plans = []
    for run, prep, (final, back) in zip(runs, preps, solved, strict=True):
        if not np.isfinite(final).any():
            from dataclasses import replace

            def again(run=run, **relaxed):
                return plan_segments_many([run], replace(rules, **relaxed), cost_per_ft,
                                          embedment_of)[0]

            if rules.bf_lowerings < LOWERINGS_STEEP:  # steep ground: offer lowered footings
                plans.append(again(bf_lowerings=LOWERINGS_STEEP))
                continue
            if rules.segment_min_ft > 0:  # odd station spacing: relax the minimum length
                plans.append(again(segment_min_ft=0.0))
                continue
            if rules.step_min_ft > 0:  # an elevation grid finer than the least step
                plans.append(again(step_min_ft=0.0))
                continue
            raise ValueError("no segmentation meets the footing step limit")
        plans.append(_trace(prep, final, back))
    return plans


def _seg_max(s, rules):
    total = s[-1] - s[0]
    return max(rules.segment_max_ft, min(total, rules.segment_min_ft))


def _span_stations(s, rules) -> int:
    """How many stations a segment may span: the most within the longest segment."""
    first = np.searchsorted(s, s - _seg_max(s, rules) - 1e-9, side="left")
    return max(1, int(np.max(np.arange(s.size) - first)))


def _prepare(run, rules, cost_per_ft, embedment_of, kmax) -> dict:
    """Everything of one run that does not depend on the recursion's values, [j, k, m]."""
    s, rg, fg, rg_before, fg_before = run
    n = s.size
    total = s[-1] - s[0]
    seg_max = _seg_max(s, rules)
    M = max(1, rules.bf_lowerings)
    fg_min = _window_over_stretches(fg, fg_before, kmax, np.minimum)  # [j, k]: j-k..j
    rg_max = _window_over_stretches(rg, rg_before, kmax, np.maximum)
    k_idx = np.arange(kmax + 1)
    start = np.arange(n)[:, None] - k_idx[None, :]
    length = np.where(start >= 0, s[:, None] - s[np.clip(start, 0, None)], np.nan)
    ok_len = (length >= rules.segment_min_ft - 1e-9) & (length <= seg_max + 1e-9)
    if total < rules.segment_min_ft + 1e-9:
        ok_len[n - 1, n - 1] = True  # a run shorter than the minimum is one segment
    ok_len[:, 0] = False
    ok_len &= start >= 0
    lower = rules.bf_lowering_ft * np.arange(M)
    # the envelope: the largest retained grade over the least front grade, plus the lowering
    # and the rounding of the footing (so that every station's design height is covered)
    h_case = (rg_max - fg_min)[:, :, None] + lower[None, None, :] + rules.bf_round_ft
    h_look = np.where(np.isfinite(h_case), h_case, 0.0)
    emb = (np.full(h_case.shape, rules.embedment_ft) if embedment_of is None else
           np.asarray(embedment_of(h_look), float))
    emb = np.where(np.isfinite(emb), np.maximum(emb, rules.embedment_ft), rules.embedment_ft)
    bf = _floor_to(fg_min[:, :, None] - emb, rules.bf_round_ft) - lower[None, None, :]
    cpf = np.asarray(cost_per_ft(h_look), float)
    cpf = np.where(np.isfinite(cpf), cpf, INFEASIBLE_COST_PER_FT)
    seg_cost = np.where(ok_len[:, :, None], cpf * length[:, :, None], np.inf)
    if rules.top_of_wall == "stepped":
        tw = _ceil_to(rg_max + rules.freeboard_ft, rules.top_step_in / 12.0)  # [j, k]
    else:
        tw = np.full_like(rg_max, np.nan)
    return {"n": n, "M": M, "ok_len": ok_len, "bf": bf, "tw": tw, "seg_cost": seg_cost,
            "h_case": h_case}


def _solve(preps, rules, kmax):
    """The recursion over every run at once. Returns per run (value at its last station
    [k, m], back-pointers [j, k, m, 2] = (k', m') of the previous segment)."""
    R, M, K1 = len(preps), preps[0]["M"], kmax + 1
    n_max = max(p["n"] for p in preps)

    def stack(name, fill, trailing):
        out = np.full((R, n_max, K1) + trailing, fill)
        for r, p in enumerate(preps):
            out[r, : p["n"]] = p[name]
        return out

    ok_len = stack("ok_len", False, ())
    bf = stack("bf", np.nan, (M,))
    seg_cost = stack("seg_cost", np.inf, (M,))
    tw = stack("tw", np.nan, ())
    stepped_top = rules.top_of_wall == "stepped"
    value = np.full((R, n_max, K1, M), np.inf)
    back = np.full((R, n_max, K1, M, 2), -1, dtype=np.int32)
    back_k, back_m = back[..., 0], back[..., 1]  # views
    # the stations of a block never end a segment that starts inside the same block
    any_ok = ok_len.any(axis=2)
    first_ok = np.where(any_ok, np.argmax(ok_len, axis=2), K1)[:, 1:]
    block = max(1, int(first_ok.min())) if first_ok.size else 1
    ks = np.arange(1, K1)
    # rows of (run, station) flattened, read with np.take (faster than fancy indexing)
    value_rows = value.reshape(R * n_max, K1 * M)
    bf_rows = bf.reshape(R * n_max, K1 * M)
    tw_rows = tw.reshape(R * n_max, K1)
    run_row = (np.arange(R) * n_max)[:, None, None]
    for b0 in range(1, n_max, block):
        jb = np.arange(b0, min(b0 + block, n_max))
        ii = jb[:, None] - ks[None, :]  # [b, k]: the previous segment ends where this starts
        valid = ok_len[:, jb, 1:]  # [R, b, k]
        if not valid.any():
            continue
        rows = (run_row + np.maximum(ii, 0)[None]).reshape(-1)
        shape = (R, jb.size, K1 - 1)
        pen = _step_penalty(bf[:, jb, 1:], np.take(bf_rows, rows, axis=0).reshape(
            shape + (1, K1, M)), tw[:, jb, 1:], np.take(tw_rows, rows, axis=0).reshape(
            shape + (K1,)) if stepped_top else None, rules)
        prev = np.take(value_rows, rows, axis=0).reshape(shape + (1, K1 * M))
        flat = prev + pen.reshape(shape + (M, K1 * M))  # [R, b, k, m, (k', m')]
        best = np.argmin(flat, axis=-1)  # [R, b, k, m]
        bv = np.take_along_axis(flat, best[..., None], axis=-1)[..., 0]
        bv = np.where((ii == 0)[None, :, :, None], 0.0, bv)  # a first segment: no predecessor
        value[:, jb, 1:] = np.where(valid[..., None], seg_cost[:, jb, 1:] + bv, np.inf)
        back_k[:, jb, 1:] = best // M
        back_m[:, jb, 1:] = best % M
    return [(value[r, p["n"] - 1], back[r]) for r, p in enumerate(preps)]


def _step_penalty(bf_j, bf_i, tw_j, tw_i, rules):
    """The cost of the step between a segment [R, b, k, m] and its predecessor [.., 1, k', m']:
    0 without a step, the step cost with one, inf where the step is too tall or too small.
    ``tw_i`` is None unless the top of wall steps."""
    step_max = rules.footing_step_max_ft + 1e-9
    step_min = rules.step_min_ft - 1e-9
    diff = np.abs(bf_j[..., :, None, None] - bf_i)  # [R, b, k, m, k', m']
    stepped = diff > 1e-9
    allowed = (diff <= step_max) & ~(stepped & (diff < step_min))
    if tw_i is not None:
        t_diff = np.abs(tw_j[..., None] - tw_i)  # [R, b, k, k']
        t_step = t_diff > 1e-9
        stepped = stepped | t_step[..., None, :, None]
        allowed &= ~(t_step & (t_diff < step_min))[..., None, :, None]
    with np.errstate(invalid="ignore"):
        return np.where(allowed, rules.step_cost_usd * stepped, np.inf)


def _trace(prep, final, back) -> SegmentPlan:
    """The segments of the optimum, traced back from the last station."""
    bf, tw, h_case, seg_cost = prep["bf"], prep["tw"], prep["h_case"], prep["seg_cost"]
    k, m = np.unravel_index(int(np.argmin(final)), final.shape)
    total_cost = float(final[k, m])
    segs = []
    j = prep["n"] - 1
    while True:
        i = j - int(k)
        segs.append((i, j, int(k), int(m)))
        if i == 0:
            break
        k, m = back[j, k, m]
        j = i
    segs.reverse()
    st_i = np.array([a for a, _, _, _ in segs])
    en_i = np.array([b for _, b, _, _ in segs])
    ks = np.array([c for _, _, c, _ in segs])
    ms = np.array([d for _, _, _, d in segs])
    return SegmentPlan(
        start_index=st_i, end_index=en_i,
        bottom_of_footing_ft=bf[en_i, ks, ms], top_of_wall_ft=tw[en_i, ks],
        design_height_ft=h_case[en_i, ks, ms], cost_usd=seg_cost[en_i, ks, ms],
        total_cost_usd=total_cost,
    )


def place_joints(start_ft: float, end_ft: float, boundaries: list[tuple[float, bool]],
                 contraction_max_ft: float = 30.0, expansion_max_ft: float = 90.0):
    """Joint stations along a wall: every segment boundary is a joint (an expansion joint where
    the footing steps), contraction joints evenly at most ``contraction_max_ft`` apart
    between them, and a contraction joint upgraded to an expansion joint wherever the distance
    from the last expansion joint would exceed ``expansion_max_ft`` (common practice).

    Args:
        boundaries: (station_ft, is_step) of every interior segment boundary, increasing.

    Returns:
        list of (station_ft, kind) with kind "contraction" or "expansion", increasing.
    """
    points = [start_ft] + [b for b, _ in boundaries] + [end_ft]
    steps = [False] + [st for _, st in boundaries] + [False]
    joints: list[list] = []
    for a, b, st_b in zip(points[:-1], points[1:], steps[1:], strict=True):
        panels = max(1, math.ceil((b - a) / contraction_max_ft - 1e-9))
        for p in range(1, panels):
            joints.append([a + (b - a) * p / panels, "contraction"])
        if b < end_ft:
            joints.append([b, "expansion" if st_b else "contraction"])
    last = start_ft
    for idx, jt in enumerate(joints):
        nxt = joints[idx + 1][0] if idx + 1 < len(joints) else end_ft
        if jt[1] == "expansion":
            last = jt[0]
        elif nxt - last > expansion_max_ft + 1e-9:
            jt[1] = "expansion"
            last = jt[0]
    return [(float(a), k) for a, k in joints]
