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
``footing_step_max_ft`` (IBC 2021 1809.3: footings level, stepped where the top changes).
Segment length lies between ``segment_min_ft`` and ``segment_max_ft`` (a run shorter than the
minimum is one segment).

The state of the recursion is (end station j, length in stations k, lowering m) and its value
the least cost of covering the stations up to j with the last segment (j-k .. j, m); every
transition checks the footing step against the previous segment. The optimum over the states at
the last station, traced back, gives the segments. The search is exact over the candidate
boundaries (the stations) and lowerings; it is linear in the number of stations and quadratic in
the number of stations a segment may span.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

import numpy as np

CHUNK_STATIONS = 2048  # end stations prepared at once (bounds the memory of the recursion)
LOWERINGS_STEEP = 5  # lowerings offered when the highest footings cannot meet the step limit
INFEASIBLE_COST_PER_FT = 1.0e7  # $/ft for a segment no section can hold (flagged, never hidden)


@dataclass(frozen=True)
class SegmentRules:
    """The segment criteria (each an option in ``[criteria]``)."""

    embedment_ft: float  # required: max(min_embedment_ft, frost_depth_ft)
    freeboard_ft: float
    footing_step_max_ft: float = 2.0  # common practice
    bf_round_ft: float = 0.1  # bottom of footing elevations rounded down (common practice)
    bf_lowering_ft: float = 0.5  # lowering steps offered to meet the step limit
    bf_lowerings: int = 1  # 1: footings at their highest; more only where steps need it
    top_of_wall: str = "stepped"  # or "follow_grade"
    top_step_in: float = 6.0  # common practice
    segment_min_ft: float = 10.0  # common practice
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


def _recurse_flat(value, back, ii, pen, first, cost, start: int, block: int) -> None:
    """The recursion with one footing level (``value[j, k]``, ``back[j, k]`` = k' of the
    previous segment) for the end stations ``start ..`` of a prepared chunk, in place.

    ``first`` is 0 where the segment starts the run (no predecessor) and inf elsewhere;
    ``pen`` the step penalty (inf where the step is too high); ``cost`` the segment costs.
    """
    n_c = ii.shape[0]
    for b0 in range(0, n_c, block):
        b1 = min(b0 + block, n_c)
        tot = value[ii[b0:b1]] + pen[b0:b1]  # [b, k, k']
        best = tot.argmin(axis=-1)
        bv = np.take_along_axis(tot, best[..., None], axis=-1)[..., 0]
        value[start + b0:start + b1, 1:] = cost[b0:b1] + np.minimum(bv, first[b0:b1])
        back[start + b0:start + b1, 1:] = best


def window_extremes(values: np.ndarray, kmax: int, fn) -> np.ndarray:
    """``out[j, k] = fn(values[j-k .. j])`` for k = 0..kmax (NaN where j-k < 0)."""
    n = values.size
    out = np.full((n, kmax + 1), np.nan)
    acc = values.astype(float).copy()
    out[:, 0] = acc
    for k in range(1, kmax + 1):
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
    s = np.asarray(station_ft, float)
    rg = np.asarray(retained_grade_ft, float)
    fg = np.asarray(front_grade_ft, float)
    n = s.size
    if n < 2:
        raise ValueError("a run of stations needs at least two stations")
    total = s[-1] - s[0]
    seg_max = max(rules.segment_max_ft, min(total, rules.segment_min_ft))
    # how many stations a segment may span: the most stations within seg_max before any j
    first = np.searchsorted(s, s - seg_max - 1e-9, side="left")
    kmax = max(1, int(np.max(np.arange(n) - first)))
    M = max(1, rules.bf_lowerings)
    fg_min = window_extremes(fg, kmax, np.minimum)  # [j, k] over j-k..j
    rg_max = window_extremes(rg, kmax, np.maximum)
    k_idx = np.arange(kmax + 1)
    start = np.arange(n)[:, None] - k_idx[None, :]
    length = np.where(start >= 0, s[:, None] - s[np.clip(start, 0, None)], np.nan)
    ok_len = (length >= rules.segment_min_ft - 1e-9) & (length <= seg_max + 1e-9)
    if total < rules.segment_min_ft + 1e-9:
        ok_len[n - 1, n - 1] = True  # a run shorter than the minimum is one segment
    ok_len[:, 0] = False
    lower = rules.bf_lowering_ft * np.arange(M)
    # the envelope: the largest retained grade over the least front grade, plus the lowering
    # and the rounding of the footing (so that every station's design height is covered)
    h_case = (rg_max - fg_min)[:, :, None] + lower[None, None, :] + rules.bf_round_ft
    emb = (np.full(h_case.shape, rules.embedment_ft) if embedment_of is None else
           np.asarray(embedment_of(np.where(np.isfinite(h_case), h_case, 0.0)), float))
    emb = np.where(np.isfinite(emb), np.maximum(emb, rules.embedment_ft), rules.embedment_ft)
    bf = _floor_to(fg_min[:, :, None] - emb, rules.bf_round_ft) - lower[None, None, :]
    cpf = np.asarray(cost_per_ft(np.where(np.isfinite(h_case), h_case, 0.0)), float)
    cpf = np.where(np.isfinite(cpf), cpf, INFEASIBLE_COST_PER_FT)
    seg_cost = cpf * length[:, :, None]
    seg_cost = np.where(ok_len[:, :, None], seg_cost, np.inf)
    if rules.top_of_wall == "stepped":
        tw = _ceil_to(rg_max + rules.freeboard_ft, rules.top_step_in / 12.0)  # [j, k]
    else:
        tw = np.full_like(rg_max, np.nan)
    value = np.full((n, kmax + 1, M), np.inf)
    back = np.full((n, kmax + 1, M, 2), -1, dtype=np.int64)  # previous (k', m')
    step_max = rules.footing_step_max_ft + 1e-9
    # the stations of a block never end a segment that starts inside the same block
    first_ok = np.where(ok_len.any(axis=1), np.argmax(ok_len, axis=1), kmax + 1)
    block = max(1, int(first_ok[1:].min()))
    stepped_top = rules.top_of_wall == "stepped"
    ks = np.arange(1, kmax + 1)
    chunk = max(block, (CHUNK_STATIONS // block) * block)
    for C in range(1, n, chunk):
        # everything that does not depend on the values, for a chunk of end stations at once
        jc = np.arange(C, min(C + chunk, n))
        jj, kk = np.meshgrid(jc, ks, indexing="ij")  # [c, k]
        valid = (kk <= jj) & ok_len[jj, kk]
        ii = np.where(valid, jj - kk, 0)
        diff = np.abs(bf[jj, kk][..., :, None, None] - bf[ii][..., None, :, :])  # [c,k,m,k',m']
        stepped = diff > 1e-9
        if stepped_top:
            stepped = stepped | (np.abs(tw[jj, kk][..., None] - tw[ii]) > 1e-9)[
                ..., None, :, None]
        pen = np.where(diff <= step_max, rules.step_cost_usd * stepped, np.inf)
        first = (ii == 0)[..., None]
        cost_c = np.where(valid[..., None], seg_cost[jj, kk], np.inf)
        if M == 1:  # one footing level per segment: the same recursion on flat arrays
            back[jc, :, 0, 1] = 0
            _recurse_flat(value[:, :, 0], back[:, :, 0, 0], ii, pen[:, :, 0, :, 0],
                          np.where(first[..., 0], 0.0, np.inf), cost_c[..., 0], C, block)
            continue
        for b0 in range(0, jc.size, block):  # the recursion, a block of stations at a time
            sl = slice(b0, b0 + block)
            i_b = ii[sl]
            total_v = value[i_b][..., None, :, :] + pen[sl]
            flat = total_v.reshape(total_v.shape[:3] + (-1,))
            best = np.argmin(flat, axis=-1)  # [b, k, m]
            bv = np.take_along_axis(flat, best[..., None], axis=-1)[..., 0]
            j_b, k_b = jj[sl], kk[sl]
            value[j_b, k_b] = cost_c[sl] + np.where(first[sl], 0.0, bv)
            back[j_b, k_b, :, 0] = best // M
            back[j_b, k_b, :, 1] = best % M
    final = value[n - 1]
    if not np.isfinite(final).any():
        from dataclasses import replace

        if rules.bf_lowerings < LOWERINGS_STEEP:  # steep ground: offer lowered footings
            return plan_segments(s, rg, fg, replace(rules, bf_lowerings=LOWERINGS_STEEP),
                                 cost_per_ft, embedment_of)
        if rules.segment_min_ft > 0:  # odd station spacing: relax the minimum length
            return plan_segments(s, rg, fg, replace(rules, segment_min_ft=0.0), cost_per_ft,
                                 embedment_of)
        raise ValueError("no segmentation meets the footing step limit")
    k, m = np.unravel_index(int(np.argmin(final)), final.shape)
    total_cost = float(final[k, m])
    segs = []
    j = n - 1
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
    the footing or top steps), contraction joints evenly at most ``contraction_max_ft`` apart
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
