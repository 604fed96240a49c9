"""Segments: the dynamic programme against brute-force enumeration, and the joint rules."""

import itertools
import math
from unittest import mock

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from wallsched.engine import segments
from wallsched.engine.segments import (
    INFEASIBLE_COST_PER_FT,
    SegmentRules,
    place_joints,
    plan_segments,
    plan_segments_many,
)


def cost_table(h):
    """An invented cost per ft rising with design height (a stand-in design table)."""
    h = np.asarray(h, float)
    return np.where(h <= 18.0, 40.0 + 6.0 * h + 0.9 * h**2, np.nan)


def _floor(x: float, step: float) -> float:
    out = round(math.floor(x / step + 1e-9) * step, 9)
    return round(out - step, 9) if out > x else out


def _ceil(x: float, step: float) -> float:
    out = round(math.ceil(x / step - 1e-9) * step, 9)
    return round(out + step, 9) if out < x else out


def brute_force(s, rg, fg, rules, candidates=None):
    """Every way to cut the stations into segments (at the ``candidates`` station indices, by
    default every station), every lowering: the least total cost."""
    n = len(s)
    best = math.inf
    lowers = [rules.bf_lowering_ft * m for m in range(rules.bf_lowerings)]
    inner = [i for i in (range(1, n - 1) if candidates is None else candidates) if 0 < i < n - 1]
    for cuts in itertools.product([0, 1], repeat=len(inner)):
        bounds = [0] + [i for i, c in zip(inner, cuts, strict=True) if c] + [n - 1]
        segs = list(zip(bounds[:-1], bounds[1:], strict=True))
        lengths = [s[j] - s[i] for i, j in segs]
        if any(L < rules.segment_min_ft - 1e-9 or L > rules.segment_max_ft + 1e-9
               for L in lengths):
            continue
        for ms in itertools.product(range(len(lowers)), repeat=len(segs)):
            total, prev_bf, prev_tw = 0.0, None, None
            for (i, j), m in zip(segs, ms, strict=True):
                # the grids' rounding as the planner's (engine/segments.py _floor_to and
                # _ceil_to): the footing never above, the top never below the level asked
                # for, however little (a grade 1e-14 ft over a multiple takes the next one)
                bf_top = _floor(min(fg[i:j + 1]) - rules.embedment_ft, rules.bf_round_ft)
                bf = bf_top - lowers[m]
                h = max(rg[i:j + 1]) - min(fg[i:j + 1]) + lowers[m] + rules.bf_round_ft
                c = float(cost_table(h))
                c = INFEASIBLE_COST_PER_FT if math.isnan(c) else c  # flagged, never hidden
                step = rules.top_step_in / 12
                tw = _ceil(max(rg[i:j + 1]) + rules.freeboard_ft, step)
                if prev_bf is not None:
                    if abs(bf - prev_bf) > rules.footing_step_max_ft + 1e-9:
                        total = math.inf
                        break
                    # a step is 0 or at least step_min_ft, in the footing and in the top
                    if any(1e-9 < abs(x - y) < rules.step_min_ft - 1e-9
                           for x, y in ((bf, prev_bf), (tw, prev_tw))):
                        total = math.inf
                        break
                    if abs(bf - prev_bf) > 1e-9 or abs(tw - prev_tw) > 1e-9:
                        total += rules.step_cost_usd
                total += c * (s[j] - s[i])
                prev_bf, prev_tw = bf, tw
            best = min(best, total)
    return best


@settings(max_examples=40, deadline=None)
@given(st.lists(st.floats(-3, 3), min_size=8, max_size=9), st.lists(st.floats(-1, 1),
       min_size=8, max_size=9), st.sampled_from([0.0, 300.0]),
       st.sampled_from([(0.5, 6.0, 0.5), (0.5, 6.0, 1.0), (0.1, 3.0, 0.5), (0.1, 6.0, 0.0)]))
def test_dynamic_programme_equals_brute_force(drg, dfg, step_cost, grid):
    n = min(len(drg), len(dfg))
    s = np.arange(n) * 5.0
    fg = 100 + np.cumsum(dfg[:n])
    rg = fg + 4 + np.abs(np.cumsum(drg[:n]))
    bf_round, top_step, step_min = grid  # elevation grids finer than the least step, too
    rules = SegmentRules(embedment_ft=1.5, freeboard_ft=0.5, segment_min_ft=10,
                         segment_max_ft=25, step_cost_usd=step_cost, bf_lowerings=3,
                         bf_round_ft=bf_round, top_step_in=top_step, step_min_ft=step_min)
    plan = plan_segments(s, rg, fg, rules, cost_table)
    want = brute_force(s, rg, fg, rules)
    if math.isfinite(want):
        assert plan.total_cost_usd == pytest.approx(want, rel=1e-9)
    else:  # a grid finer than the least step can leave no way: the rules are relaxed, in
        # turn (lowered footings, shorter segments, smaller steps), never the step limit
        assert step_min > bf_round and math.isfinite(plan.total_cost_usd)
    # cover every station once: segments chain end to start from the first to the last
    assert plan.start_index[0] == 0 and plan.end_index[-1] == n - 1
    assert (plan.start_index[1:] == plan.end_index[:-1]).all()
    steps = np.abs(np.diff(plan.bottom_of_footing_ft))
    assert (steps <= rules.footing_step_max_ft + 1e-9).all()  # IBC 2021 1809.3 step limit


def test_boundary_stations_keep_ends_at_least_the_grid_apart():
    s = np.arange(0.0, 10.01, 0.5)
    got = segments.boundary_stations(s, 2.0)
    assert got[0] == 0 and got[-1] == s.size - 1
    assert np.all(np.diff(s[got]) >= 2.0 - 1e-9)
    assert list(s[got]) == [0.0, 2.0, 4.0, 6.0, 8.0, 10.0]
    wide = np.arange(0.0, 50.0, 5.0)  # stations the grid apart or farther: every one
    assert np.array_equal(segments.boundary_stations(wide, 2.0), np.arange(wide.size))
    odd = np.array([0.0, 0.7, 2.5, 2.9, 7.0, 7.5])  # the last kept end moves to the run's end
    assert list(odd[segments.boundary_stations(odd, 2.0)]) == [0.0, 2.5, 7.5]


@settings(max_examples=25, deadline=None)
@given(st.lists(st.floats(-3, 3), min_size=14, max_size=14),
       st.lists(st.sampled_from([0.4, 0.9, 1.3, 3.0, 5.0]), min_size=13, max_size=13),
       st.sampled_from([0.0, 300.0]))
def test_close_stations_end_segments_only_at_the_coarser_set(drg, gaps, step_cost):
    """With stations closer than the boundary grid, the plan is the least cost over cuts at
    the coarser set of stations, and its envelopes still take every station between."""
    s = np.concatenate([[0.0], np.cumsum(gaps)])
    fg = 100 + 0.05 * s
    rg = fg + 4 + np.abs(np.cumsum(drg))
    rules = SegmentRules(embedment_ft=1.5, freeboard_ft=0.5, segment_min_ft=4,
                         segment_max_ft=14, step_cost_usd=step_cost, bf_lowerings=2,
                         step_min_ft=0.0)
    plan = plan_segments(s, rg, fg, rules, cost_table)
    ends = segments.boundary_stations(s)
    want = brute_force(s, rg, fg, rules, candidates=list(ends))
    if math.isfinite(want):
        assert plan.total_cost_usd == pytest.approx(want, rel=1e-9)
    assert set(plan.start_index) | set(plan.end_index) <= set(ends)
    for i, j, h in zip(plan.start_index, plan.end_index, plan.design_height_ft, strict=True):
        assert h >= float(np.max(rg[i:j + 1] - np.min(fg[i:j + 1]))) - 1e-9  # every station


def test_embedment_and_freeboard_hold_at_every_station():
    s = np.arange(0, 200.1, 5.0)
    fg = 100 + 0.08 * s  # a rising front grade: 16 ft over the wall
    rg = fg + 6 + 2 * np.sin(s / 30)
    rules = SegmentRules(embedment_ft=2.0, freeboard_ft=0.5, step_cost_usd=200.0)
    plan = plan_segments(s, rg, fg, rules, cost_table)
    for i, j, bf, tw in zip(plan.start_index, plan.end_index, plan.bottom_of_footing_ft,
                            plan.top_of_wall_ft, strict=True):
        assert (fg[i:j + 1] - bf >= 2.0 - 1e-9).all()
        assert (tw - rg[i:j + 1] >= 0.5 - 1e-9).all()
        assert tw * 12 % 6 == pytest.approx(0, abs=1e-6)  # stepped in 6-in steps
    assert (np.abs(np.diff(plan.bottom_of_footing_ft)) <= 2.0 + 1e-9).all()


def test_steep_grade_forces_lowered_footings_within_the_step_limit():
    s = np.arange(0, 60.1, 5.0)
    fg = np.where(s < 30, 100.0, 104.5)  # a 4.5 ft jump in the front grade
    rg = fg + 5
    rules = SegmentRules(embedment_ft=1.0, freeboard_ft=0.5, segment_min_ft=10)
    plan = plan_segments(s, rg, fg, rules, cost_table)
    assert (np.abs(np.diff(plan.bottom_of_footing_ft)) <= 2.0 + 1e-9).all()
    assert len(plan) >= 2


def test_joints_spacing_and_steps():
    joints = place_joints(0.0, 200.0, [(70.0, True), (130.0, False)], 30.0, 90.0)
    where = [j for j, _ in joints]
    kinds = dict(joints)
    assert kinds[70.0] == "expansion" and 130.0 in kinds
    pts = [0.0, *where, 200.0]
    assert max(np.diff(pts)) <= 30.0 + 1e-9  # contraction joints at most 30 ft (common practice)
    exp = [0.0] + [j for j, k in joints if k == "expansion"] + [200.0]
    assert max(np.diff(exp)) <= 90.0 + 1e-9  # expansion joints at most 90 ft (common practice)


def test_reversed_stations_give_the_same_least_cost():
    s = np.arange(0, 160.1, 5.0)
    fg = 100 + 1.2 * np.sin(s / 25)
    rg = fg + 3 + 4 * np.abs(np.sin(s / 40))
    rules = SegmentRules(embedment_ft=1.5, freeboard_ft=0.5, step_cost_usd=400.0)
    fwd = plan_segments(s, rg, fg, rules, cost_table)
    rev = plan_segments(s, rg[::-1], fg[::-1], rules, cost_table)
    assert fwd.total_cost_usd == pytest.approx(rev.total_cost_usd, rel=1e-12)


@settings(max_examples=25, deadline=None)
@given(st.lists(st.tuples(st.integers(2, 60), st.floats(0.5, 5.0), st.integers(0, 2**31 - 1)),
                min_size=1, max_size=5),
       st.sampled_from([0.0, 300.0]), st.sampled_from([1, 3]))
def test_runs_planned_together_equal_runs_planned_alone(shapes, step_cost, lowerings):
    """The recursion over several runs at once (as the pipeline plans the walls of one design
    table) gives every run exactly the plan it gets alone: runs of different lengths and
    station spacings, some too short for the minimum segment, some steep."""
    runs = []
    for n, spacing, seed in shapes:
        rng = np.random.default_rng(seed)
        s = np.round(np.cumsum(np.r_[0.0, rng.uniform(0.5, 1.5, n - 1) * spacing]), 3)
        fg = 100 + np.cumsum(rng.normal(0, 0.4, n))
        rg = fg + 2 + np.abs(np.cumsum(rng.normal(0, 0.5, n)))
        runs.append((s, rg, fg))
    rules = SegmentRules(embedment_ft=1.5, freeboard_ft=0.5, step_cost_usd=step_cost,
                         bf_lowerings=lowerings)
    together = plan_segments_many(runs, rules, cost_table)
    with mock.patch.object(segments, "BATCH_STATIONS", 70):  # the runs split into batches
        batched = plan_segments_many(runs, rules, cost_table)
    assert len(together) == len(batched) == len(runs)
    for (s, rg, fg), plan, other in zip(runs, together, batched, strict=True):
        alone = plan_segments(s, rg, fg, rules, cost_table)
        for p in (plan, other):
            assert p.total_cost_usd == alone.total_cost_usd
            for name in ("start_index", "end_index", "bottom_of_footing_ft",
                         "design_height_ft"):
                assert np.array_equal(getattr(p, name), getattr(alone, name))
        assert plan.start_index[0] == 0 and plan.end_index[-1] == s.size - 1
