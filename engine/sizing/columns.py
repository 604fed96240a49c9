"""The exact least-cost search at one height, column by column (the fast path of sizing).

A *column* of the grid is one (heel, footing thickness, stem, key depth) combination with
every toe length. The toes of a column that pass the static overturning and sliding checks are the
ones from a least toe up: where the stability screen's weights are linear in the height and,
like their moments about the toe, never decrease as the toe grows (verified on the whole
grid, not assumed), the least toe is found by bisection on the screen; where the screen
holds but is not monotone, from the screen over the whole grid; elsewhere (a battered stem,
a backslope) from the engine's weights and thrust over the whole grid at that height; in
both the run structure is verified for every column. The cost lower bound of a candidate is linear
and increasing in its toe, so each column is a sorted list of candidates and the search is a
merge of the columns by lower bound, in blocks, until no column's next bound is below the
best full candidate found: branch and bound as in :mod:`.search`, over far fewer candidates.

The lower bound of a candidate uses its heel bars (cheapest passing, exact: the heel demand
against a capacity table per footing thickness), its stem bars (exact once a column of that
stem pair has been evaluated; before, the cheapest bars that pass the stem's base flexure,
minimum steel, spacing and hook length, a necessary part of the stem check) and the
lightest toe bars there are. Every candidate kept is checked by the engine itself
(:func:`~..stability.stability`, the stem and heel pair tables, the toe demands), so the
screen and the bounds only decide the order and what may be skipped.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..bars import bar_weight_plf
from ..pressure import design_thrust, passive_resistance_lb, thrust_plane_x_ft
from ..section import BarArrays, SectionGeometry, section_weights
from ..strength import (
    heel_strength,
    max_flexural_spacing_in,
    min_flexural_steel_in2,
    stem_strength,
)
from .context import SearchContext
from .grid import as_column, axes_geometry, grid_geometry
from .members import at_most, better, evaluate_candidates, stem_pair_table

COLUMNS_PER_BLOCK = 256
TOES_PER_COLUMN = 4


class ColumnSearch:
    """The per-design-table set-up of the column search; :meth:`search` runs one height.

    ``ctx`` holds the structures of :func:`~.search.design_table` (flat geometries with the
    toe as the slowest axis).
    """

    def __init__(self, ctx: SearchContext):
        g, pre, bars = ctx.g, ctx.pre, ctx.bars
        self.ctx = ctx
        self.g, self.codes, self.pre, self.toe_tab = g, ctx.codes, pre, ctx.toe_tab
        self.screen, self.inputs, self.rates, self.bars = ctx.screen, ctx.inputs, ctx.rates, bars
        self.emb, self.fb = ctx.emb, ctx.fb
        codes, width_max_ft = ctx.codes, ctx.width_max_ft
        self.nt, self.ncol = g.nt, g.ncol
        nc = self.ncol
        self.stem_of, self.heel_of = codes["stem_of"], codes["heel_of"]  # per column
        self.bars_w = 12.0 / bars.spacing_in * bar_weight_plf(bars.size)  # lb/ft per ft
        self.w_min = float(np.min(self.bars_w))
        # the room for the footing: the toes of each column whose width fits
        self.toe_hi = np.full(nc, self.nt, np.int64)
        if width_max_ft is not None:
            fits = (pre["B_ft"] <= width_max_ft + 1e-9).reshape(self.nt, nc)
            # widths grow with the toe: the fitting toes are a leading run of each column
            self.toe_hi = fits.sum(axis=0).astype(np.int64)
        self._heel_capacity()
        self._stem_capacity()
        self._hint = None  # the least toes of the last height searched (a starting guess)
        self.least = self.mode(ctx.screen, pre)

    @staticmethod
    def mode(screen, pre) -> str | None:
        """How the least toes are found: ``"screen"`` where the screen is linear and its
        weights, their moments and the widths never decrease as the toe grows (bisection on
        the screen), ``"grid"`` otherwise (the static overturning and sliding checks over the
        whole grid at each height); None where the cost without bars can decrease as the toe
        grows (the column search does not apply). Checked on the whole grid as the screen and
        the costs are computed."""
        if not pre["toe_monotone"]:
            return None
        return "screen" if screen.linear and screen.toe_monotone else "grid"

    @staticmethod
    def applies(screen, pre) -> bool:
        return ColumnSearch.mode(screen, pre) is not None

    # ------------------------------------------------------------------- set-up tables --
    def _heel_capacity(self):
        """Heel capacities per (footing thickness, bar option); the demand does not depend
        on the bars, so a heel pair's cheapest bars are a look-up against this table."""
        g, inp, bars = self.g, self.inputs, self.bars
        T_vals = np.unique(g.col["footing_thickness_in"])
        geo = SectionGeometry(retained_height_ft=1.0, embedment_ft=1.0,
                              footing_thickness_in=T_vals[:, None], stem_top_in=8.0,
                              stem_base_in=8.0, toe_ft=1.0, heel_ft=1.0)
        r = heel_strength(geo, inp, BarArrays(bars.size[None, :], bars.spacing_in[None, :]))
        self.heel_T = T_vals
        shape = (T_vals.size, bars.size.size)
        self.heel_phi_mn = np.broadcast_to(r.phi_mn_lbft, shape).copy()
        self.heel_phi_vn = np.broadcast_to(r.phi_vn_lb, shape).copy()
        self.heel_fixed = np.broadcast_to(
            at_most(r.as_min_in2, r.as_in2) & at_most(r.spacing_in, r.s_max_in), shape).copy()
        first = self.codes["heel_first"]
        self.heel_T_of = np.searchsorted(T_vals, g.col["footing_thickness_in"][first])

    def _stem_capacity(self):
        """Necessary parts of the stem check per (stem pair, bar option) that do not depend
        on the height: minimum steel, spacing, the hook's room; and the base capacity."""
        g, inp, bars = self.g, self.inputs, self.bars
        first = self.codes["stem_first"]
        geo = SectionGeometry(retained_height_ft=4.0, embedment_ft=self.emb,
                              footing_thickness_in=g.col["footing_thickness_in"][first][:, None],
                              stem_top_in=g.col["stem_top_in"][first][:, None],
                              stem_base_in=g.col["stem_base_in"][first][:, None],
                              toe_ft=1.0, heel_ft=1.0, freeboard_ft=self.fb)
        bb = BarArrays(bars.size[None, :], bars.spacing_in[None, :])
        r = stem_strength(geo, inp, bb)
        tb = geo.stem_base_in
        shape = (first.size, bars.size.size)
        fixed = (at_most(min_flexural_steel_in2(tb), r.as_in2)
                 & at_most(bars.spacing_in[None, :], max_flexural_spacing_in(tb))
                 & at_most(r.ldh_in, r.ldh_available_in))
        self.stem_fixed = np.broadcast_to(fixed, shape)
        self.stem_phi_mn = np.broadcast_to(r.phi_mn_lbft, shape)

    # ------------------------------------------------------------------------ one height --
    def _pair_geoms(self, first, h):
        return as_column(grid_geometry(self.g, first, h, self.emb, self.fb))

    def _heel_picks(self, h):
        """Per heel pair the cheapest heel bars that can pass (-1 where none): a lower bound
        (the development, and with the net pressure the demand, depend on the whole
        geometry; the candidates are checked exactly in :func:`evaluate_candidates`)."""
        ti = self.heel_T_of
        ok = _rows(self.heel_fixed, ti)
        # the demand of the pair holds for its toes
        if not self.inputs.criteria.heel_upward_pressure:
            one = BarArrays(self.bars.size[:1], self.bars.spacing_in[:1])
            r = heel_strength(self._pair_geoms(self.codes["heel_first"], h), self.inputs, one)
            ok = ok & (at_most(r.mu_lbft, _rows(self.heel_phi_mn, ti))
                       & at_most(r.vu_lb, _rows(self.heel_phi_vn, ti)))
        return _cheapest(ok, self.bars_w[None, :])

    def _stem_bounds(self, h):
        """Per stem pair: the least stem steel (lb per ft of wall) any passing bars can have,
        from the necessary part of the check; inf where no bars can pass."""
        first = self.codes["stem_first"]
        geo = self._pair_geoms(first, h)
        one = BarArrays(self.bars.size[:1], self.bars.spacing_in[:1])
        mu = stem_strength(geo, self.inputs, one).mu_lbft  # the base moment: no bar in it
        ok = self.stem_fixed & at_most(mu, self.stem_phi_mn)
        length = self._stem_bar_length(h, first)
        lb = self.bars_w[None, :] * (length[:, None] + self.bars.diameter_in[None, :])
        return np.min(np.where(ok, lb, np.inf), axis=1)

    def _stem_bar_length(self, h, cols):
        """Stem bar length (ft) less the hook extension: stem height plus the anchorage into
        the footing, for the columns ``cols`` (as :func:`~.costs.stem_steel_lb`)."""
        pre = self.pre
        return (h + pre["emb_ft"][cols] + self.fb - pre["T_ft"][cols]
                + pre["stem_anchor_ft"][cols])

    def _ot_sliding(self, h, forces, idx):
        """The screen's overturning and sliding parts (monotone in the toe) at ``idx``."""
        s, i = self.screen, self.inputs
        m_o, h_d, v_th, pp = forces
        e = s.e_of(idx)
        vm = _rows(s.vm, idx)
        v = vm[:, 0] + vm[:, 1] * h
        m = vm[:, 2] + vm[:, 3] * h
        if self._thrust_has_v:
            v = v + v_th[e]
            m = m + v_th[e] * s.B[idx]
        if i.criteria.surcharge_resists:
            v, m = v + s.vq[idx], m + s.mq[idx]
        k = 1.0 - s.SLACK
        return (m >= i.criteria.fs_overturning * m_o[e] * k) & (
            i.soil.friction_coefficient * v + pp[e] >= i.criteria.fs_sliding * h_d[e] * k)

    def _least_toes(self, h, forces, hint=None):
        """Per column, the least toe index passing overturning and sliding (``toe_hi`` where
        none does): checked first at ``hint`` and next to it (the least toes of the height
        before, mostly unchanged), then by bisection where the hint is off."""
        nc = self.ncol
        lo = np.zeros(nc, np.int64)
        hi = self.toe_hi.copy()
        if hint is not None:
            c = np.nonzero(hint < hi)[0]
            at = hint[c]
            ok = self._ot_sliding(h, forces, at * nc + c)
            # passing at the hint: the answer is the hint unless the toe below passes too
            hi[c[ok]] = at[ok]
            below = c[ok & (at > 0)]
            if below.size:
                ok_b = self._ot_sliding(h, forces, (hi[below] - 1) * nc + below)
                lo[below[~ok_b]] = hi[below[~ok_b]]
                hi[below[ok_b]] -= 1
            # failing at the hint: the answer is above it
            lo[c[~ok]] = at[~ok] + 1
        act = np.nonzero(lo < hi)[0]
        while act.size:
            mid = (lo[act] + hi[act]) // 2
            ok = self._ot_sliding(h, forces, mid * nc + act)
            hi[act[ok]] = mid[ok]
            lo[act[~ok]] = mid[~ok] + 1
            act = act[lo[act] < hi[act]]
        return lo

    def _grid_ot_sliding(self, h, toes):
        """The static overturning and sliding checks at ``h`` (as
        :func:`~..stability.stability` makes them, with the screen's slack) for the toes
        ``toes`` of every column, from the engine's weights and thrust: (toes, columns)."""
        g, i, p = self.g, self.inputs, self.screen.p
        k = 1.0 - self.screen.SLACK
        n = toes.stop - toes.start
        geo = axes_geometry(g, h, self.emb, self.fb, toes)
        w = section_weights(geo, i)
        v, m = w.dead()
        th = design_thrust(geo, i, p)
        v = v + th.vertical_lb
        m = m + th.vertical_lb * thrust_plane_x_ft(geo, i)
        if i.criteria.surcharge_resists:
            v, m = v + w.surcharge.lb, m + w.surcharge.moment_lbft
        # passive to the bottom of the footing or key (as in the engine's stability)
        key_ft = np.where(geo.has_key, geo.key_depth_in / 12.0, 0.0)
        pp = (passive_resistance_lb(p.passive_efp_pcf, i.criteria.passive_neglect_ft,
                                    geo.embedment_ft + key_ft) if i.criteria.use_passive else 0.0)
        ok = (m >= i.criteria.fs_overturning * th.moment_lbft * k) & (
            i.soil.friction_coefficient * v + pp >= i.criteria.fs_sliding * th.horizontal_lb * k)
        return np.broadcast_to(ok, (n, *g.shape[1:])).reshape(n, self.ncol)

    def _first_passing_toes(self, passing):
        """Per column, the least toe index passing ``passing(toes, flat)`` (a (toes, columns)
        boolean array for a few toes at a time, over the whole grid); None where in some
        column a passing toe is followed by a failing one."""
        first = np.full(self.ncol, -1, np.int64)
        before = None
        for toes, flat in self.g.toe_chunks():
            ok = passing(toes, flat)
            rows = ok if before is None else np.concatenate([before, ok])
            if np.any(rows[1:] < rows[:-1]):
                return None
            new = (first < 0) & ok[-1]  # passing in this piece for the first time
            first[new] = toes.start + np.argmax(ok[:, new], axis=0)
            before = ok[-1:]
        return np.where(first < 0, self.toe_hi, np.minimum(first, self.toe_hi))

    def search(self, h):
        """Exact optimum at height ``h``: (geometry, stem bars, heel bars, toe bars, cost),
        or None where nothing on the grid holds; NotImplemented where the passing toes of
        some column are not a run from a least toe up (the whole-grid search then runs)."""
        ptr = self._first_toes(h)
        if ptr is None:
            return NotImplemented
        hs = self._height_tables(h)
        live = ((ptr < self.toe_hi) & np.isfinite(hs.heel_w[self.heel_of])
                & np.isfinite(hs.stem_lb[self.stem_of]) & self.pre["key_ok"])
        cols = np.nonzero(live)[0]
        nc = self.ncol
        best_cost, best = math.inf, None
        while cols.size:
            gi = ptr[cols] * nc + cols
            lower = self._lower(gi, cols, h, hs.stem_lb, hs.heel_w)
            keep = lower < best_cost
            cols, gi, lower = cols[keep], gi[keep], lower[keep]
            if cols.size == 0:
                break
            if cols.size > COLUMNS_PER_BLOCK:
                part = np.argpartition(lower, COLUMNS_PER_BLOCK)[:COLUMNS_PER_BLOCK]
                take = np.zeros(cols.size, bool)
                take[part] = True
                now, rest = cols[take], cols[~take]
            else:
                now, rest = cols, cols[:0]
            cand, ccol, now = self._next_toes(ptr, now)
            cols = np.concatenate([rest, now])
            best_cost, best = better(self._evaluate(h, hs, cand, ccol, best_cost),
                                     best_cost, best)
        return None if best is None else (*best, best_cost)

    def _first_toes(self, h):
        """Per column the least toe index passing the static overturning and sliding checks
        at ``h`` (``toe_hi`` where none does); None where they are not a run from it up."""
        forces = None
        if self.screen.valid_at(h):
            forces = self.screen.forces(h)
            self._thrust_has_v = bool(np.any(forces[2] != 0))
        if self.least == "screen" and self.screen.valid_at(h) and not np.any(forces[2] < 0):
            ptr = self._least_toes(h, forces, self._hint)  # (an upward thrust: not monotone)
            self._hint = ptr.copy()
            return ptr
        if self.screen.valid_at(h):  # the screen over the whole grid, then the run check
            return self._first_passing_toes(
                lambda toes, flat: self._ot_sliding(h, forces, np.arange(
                    flat.start, flat.stop)).reshape(toes.stop - toes.start, -1))
        return self._first_passing_toes(lambda toes, _: self._grid_ot_sliding(h, toes))

    def _height_tables(self, h) -> _HeightTables:
        """The heel picks and the stem bounds of one height (the stem pairs' exact bars
        filled in as the pairs are met)."""
        heel_pick = self._heel_picks(h)
        heel_w = np.where(heel_pick >= 0, self.bars_w[np.maximum(heel_pick, 0)], np.inf)
        stem_lb = self._stem_bounds(h)  # replaced by the exact value once a pair is known
        n_pairs = stem_lb.size
        n_k = int(self.toe_tab.mat_class.max()) + 1
        return _HeightTables(heel_pick, heel_w, stem_lb,
                             np.full((n_pairs, n_k), -2, np.int64),  # -2: not yet evaluated
                             np.full((n_pairs, n_k), np.inf))

    def _next_toes(self, ptr, now):
        """The next toes of the columns ``now`` as candidates (flat index, column); moves
        their pointers on and returns the columns that have toes left."""
        nc = self.ncol
        start = ptr[now]
        steps = np.arange(TOES_PER_COLUMN)
        toe_i = start[:, None] + steps[None, :]
        ok_t = toe_i < self.toe_hi[now][:, None]
        cand = (toe_i * nc + now[:, None])[ok_t]
        ccol = np.broadcast_to(now[:, None], toe_i.shape)[ok_t]
        ptr[now] = start + TOES_PER_COLUMN
        return cand, ccol, now[ptr[now] < self.toe_hi[now]]

    def _evaluate(self, h, hs: _HeightTables, cand, ccol, best_cost):
        """The candidates that can still beat ``best_cost``, past the screen, checked by the
        engine (:func:`~.members.evaluate_candidates`); the exact stem bars of the pairs met
        for the first time go into ``hs``."""
        pre, nc = self.pre, self.ncol
        pairs = self.stem_of[ccol]
        new = np.unique(pairs[hs.s_pick_k[pairs, 0] == -2])
        if new.size:
            first = self.codes["stem_first"][new]
            pk, lbk = stem_pair_table(self.ctx, first, h, pre["long_db_in"][first])
            hs.s_pick_k[new], hs.s_lb_k[new] = pk, lbk
            hs.stem_lb[new] = np.min(lbk, axis=1)
        fine = np.isfinite(hs.stem_lb[pairs]) & (hs.heel_pick[self.heel_of[ccol]] >= 0)
        cand, ccol = cand[fine], ccol[fine]
        if cand.size == 0:
            return None
        c_of = cand % nc
        hst = h + pre["emb_ft"][c_of] + self.fb - pre["T_ft"][c_of]
        B = pre["B_ft"][cand]
        base = pre["cost0"][cand] + pre["cost_per_hst"][c_of] * hst
        low = base + self.rates.steel_usd_per_lb * (
            hs.stem_lb[self.stem_of[c_of]]
            + (hs.heel_w[self.heel_of[c_of]] + self.w_min) * (B - 0.5))
        fine = low < best_cost
        if not fine.all():
            cand, base = cand[fine], base[fine]
        if cand.size == 0:
            return None
        fine = self.screen.passes(h, cand)
        if not fine.all():
            cand, base = cand[fine], base[fine]
        if cand.size == 0:
            return None
        return evaluate_candidates(self.ctx, cand, base, h, hs.s_pick_k, hs.s_lb_k)

    def _lower(self, gi, cols, h, stem_lb, heel_w):
        pre, cs = self.pre, self.rates.steel_usd_per_lb
        hst = h + pre["emb_ft"][cols] + self.fb - pre["T_ft"][cols]
        B = pre["B_ft"][gi]
        return (pre["cost0"][gi] + pre["cost_per_hst"][cols] * hst
                + cs * (stem_lb[self.stem_of[cols]]
                        + (heel_w[self.heel_of[cols]] + self.w_min) * (B - 0.5)))


def _rows(table, idx):
    """``table[idx]`` along the first axis (np.take: much faster than fancy indexing of
    rows of a 2-d array)."""
    return np.take(table, idx, axis=0)


def _cheapest(ok, weight):
    """Index of the lightest passing option per row (-1 where none)."""
    cost = np.where(ok, weight, np.inf)
    best = np.argmin(cost, axis=1)
    return np.where(np.isfinite(cost[np.arange(cost.shape[0]), best]), best, -1)


@dataclass
class _HeightTables:
    """One height's heel picks and stem bounds, and the stem pairs' exact bars as found."""

    heel_pick: np.ndarray
    heel_w: np.ndarray
    stem_lb: np.ndarray
    s_pick_k: np.ndarray
    s_lb_k: np.ndarray
