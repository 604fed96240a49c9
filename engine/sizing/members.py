"""The member checks on the grid: the pass masks of the stem, heel and toe rows of
:func:`~..checks.check_section`, the cheapest passing stem and heel bars per (member, footing)
pair, the heel and toe capacities per (footing thickness, bar option)
(:class:`FootingTables`), and the engine's checks of a block of candidates with their cheapest
bars (:func:`evaluate_candidates`). Shared by the whole-grid branch and bound
(:mod:`.search`) and the column search (:mod:`.columns`).
"""

from __future__ import annotations

import numpy as np

from ..bars import bar_diameter_in, bar_weight_plf
from ..development import (
    excess_reinforcement_factor,
    hook_psi_r,
    hook_vertical_in,
    hooked_development_equation_in,
    reduced_hooked_in,
    reduced_straight_in,
    straight_development_simple_in,
)
from ..section import BarArrays, SectionGeometry
from ..stability import stability
from ..strength import (
    cover_in,
    footing_member,
    heel_room_in,
    heel_strength,
    required_steel_in2,
    stem_strength,
    toe_room_in,
    toe_strength,
)
from .costs import footing_hook_extra_ft, stem_steel_lb
from .grid import as_column, grid_geometry

TOE_MIN_DEPTH_IN = 6.0  # ACI 318-19 13.3.1.2 (as in checks.py)


def at_most(a, b):
    with np.errstate(invalid="ignore", divide="ignore"):
        return np.asarray(a <= b * (1.0 + 1e-12))


def stem_passes(r, hook: bool = True) -> np.ndarray:
    """Every stem row of check_section (ratio <= 1); ``hook = False`` leaves out the hook's
    room (it depends on the bottom mat, see :func:`stem_pair_table`)."""
    ok = (at_most(r.mu_lbft, r.phi_mn_lbft) & at_most(r.vu_lb, r.phi_vn_lb)
          & at_most(r.height_mu_lbft, r.height_phi_mn_lbft)
          & at_most(r.height_vu_lb, r.height_phi_vn_lb)
          & at_most(r.as_min_in2, r.as_in2) & at_most(r.spacing_in, r.s_max_in))
    if hook:
        ok = ok & at_most(r.ldh_in, r.ldh_available_in)
    return ok


def footing_member_passes(r, toe: bool = False, demand: bool = True) -> np.ndarray:
    """The heel (or toe) rows of check_section (ratio <= 1) but development; ``demand =
    False`` keeps only the rows that do not depend on the loads (minimum steel, spacing)."""
    ok = at_most(r.as_min_in2, r.as_in2) & at_most(r.spacing_in, r.s_max_in)
    if demand:
        ok = ok & at_most(r.mu_lbft, r.phi_mn_lbft) & at_most(r.vu_lb, r.phi_vn_lb)
    if toe:
        ok = ok & at_most(TOE_MIN_DEPTH_IN, r.d_in)
    return ok


def pair_table(ctx, first, h, member: str) -> np.ndarray:
    """Cheapest passing bar option for each (member dims, footing) pair code; -1 where none.

    ``first`` holds one geometry index per code (the member check depends only on the pair);
    ``ctx`` is the :class:`~.context.SearchContext`.
    """
    inputs, bars = ctx.inputs, ctx.bars
    geo = as_column(grid_geometry(ctx.g, first, h, ctx.emb, ctx.fb))
    bb = BarArrays(bars.size[None, :], bars.spacing_in[None, :])
    if member == "stem":
        ok = stem_passes(stem_strength(geo, inputs, bb))
        lb = stem_steel_lb(geo, bb, inputs)
    else:  # heel: the bar length (footing width) is common to every option of a geometry
        # the rows that hold for every toe of the pair: with the net pressure the heel's demand
        # depends on the whole geometry, and the development on the toe (a lower bound then)
        ok = footing_member_passes(heel_strength(geo, inputs, bb),
                                   demand=not inputs.criteria.heel_upward_pressure)
        lb = np.broadcast_to(12.0 / bb.spacing_in * bar_weight_plf(bb.size), ok.shape)
    cost = np.where(ok, lb, np.inf)
    best = np.argmin(cost, axis=1)
    return np.where(np.isfinite(cost[np.arange(first.size), best]), best, -1)


def mat_classes(bars: BarArrays):
    """The distinct toe bar sizes of the options (ascending) and each option's class: the
    bottom mat the stem hooks rest on depends on the toe bar's size only."""
    sizes, cls = np.unique(np.asarray(bars.size), return_inverse=True)
    return sizes, cls


def stem_pair_table(ctx, first, h, long_db_in):
    """Cheapest passing stem bars of each stem pair code for each toe bar size class (the
    hook rests on the bottom mat: the toe bars and the longitudinal bars, ``long_db_in`` per
    pair): (picks, steel lb per ft of wall), both (pairs, classes); -1 / inf where none."""
    inputs, bars = ctx.inputs, ctx.bars
    geo = as_column(grid_geometry(ctx.g, first, h, ctx.emb, ctx.fb))
    bb = BarArrays(bars.size[None, :], bars.spacing_in[None, :])
    r = stem_strength(geo, inputs, bb)
    base_ok = stem_passes(r, hook=False)
    room = r.ldh_available_in - np.asarray(long_db_in, float).reshape(-1, 1)
    lb = np.broadcast_to(stem_steel_lb(geo, bb, inputs), base_ok.shape)
    sizes, _ = mat_classes(bars)
    picks = np.full((first.size, sizes.size), -1, np.int64)
    cost = np.full((first.size, sizes.size), np.inf)
    for k, size in enumerate(sizes):
        ok = base_ok & at_most(r.ldh_in, room - float(bar_diameter_in(int(size))))
        c = np.where(ok, lb, np.inf)
        best = np.argmin(c, axis=1)
        val = c[np.arange(first.size), best]
        picks[:, k] = np.where(np.isfinite(val), best, -1)
        cost[:, k] = val
    return picks, cost


class FootingTables:
    """Heel and toe capacities and development lengths (before the As,req/As,prov reduction)
    per (footing thickness, bar option): the loads do not enter them, so a candidate's heel
    and toe checks are its demands against a row of these (exactly the rows of
    check_section)."""

    def __init__(self, g, inputs, bars: BarArrays):
        self.inputs, self.bars = inputs, bars
        T_vals, self.T_of = np.unique(g.col["footing_thickness_in"], return_inverse=True)
        geo = SectionGeometry(retained_height_ft=1.0, embedment_ft=1.0,
                              footing_thickness_in=T_vals[:, None], stem_top_in=8.0,
                              stem_base_in=8.0, toe_ft=1.0, heel_ft=1.0)
        bb = BarArrays(bars.size[None, :], bars.spacing_in[None, :])
        shape = (T_vals.size, bars.size.size)
        fc, fy = inputs.materials.fc_psi, inputs.materials.fy_psi
        db = bar_diameter_in(bars.size)[None, :]
        self.tab = {}
        crit = inputs.criteria
        for name, cov_opt in (("heel", crit.cover_heel_in), ("toe", crit.cover_toe_in)):
            cov = cover_in(bb.size, cov_opt)
            r = footing_member(geo, inputs, bb, 0.0, 0.0, cov)
            top = name == "heel"
            below = T_vals[:, None] - cov - db
            pt = np.where(top & (below > 12.0), 1.3, 1.0)
            ld = straight_development_simple_in(bb.size, fc, fy, psi_t=pt,
                                                spacing_in=bb.spacing_in, cover_in=cov)
            ldh = hooked_development_equation_in(
                bb.size, fc, fy, psi_r=hook_psi_r(bb.size, bb.spacing_in),
                psi_o=inputs.criteria.hook_psi_o)
            other = inputs.criteria.cover_toe_in if top else (
                2.0 if inputs.criteria.cover_heel_in is None else inputs.criteria.cover_heel_in)
            depth = T_vals[:, None] - cov - other
            angle = np.where(hook_vertical_in(bb.size, 90) <= depth + 1e-9, 90, 180)
            extra_ft = footing_hook_extra_ft(bb.size, angle)
            fixed = footing_member_passes(r, toe=not top, demand=False)
            self.tab[name] = {k: np.ascontiguousarray(np.broadcast_to(v, shape)) for k, v in {
                "phi_mn": r.phi_mn_lbft, "phi_vn": r.phi_vn_lb, "fixed_ok": fixed,
                "d": r.d_in, "as": r.as_in2, "ld": ld, "ldh": ldh,
                "hook_extra_ft": extra_ft}.items()}
        self.db = bar_diameter_in(bars.size)
        self.w = 12.0 / bars.spacing_in * bar_weight_plf(bars.size)  # lb/ft per ft of wall
        _, self.mat_class = mat_classes(bars)

    def member(self, name, T_idx, mu, vu, room_in, width_ft):
        """(passes, steel lb per ft of wall) of every bar option for the candidates: flexure,
        shear, minimum steel, spacing (toe depth) and development, straight where it fits,
        else hooked (the hook's extra length in the steel)."""
        t = self.tab[name]
        rows = lambda k: np.take(t[k], T_idx, axis=0)  # noqa: E731
        mu = np.asarray(mu, float).reshape(-1, 1)
        vu = np.asarray(vu, float).reshape(-1, 1)
        ok = at_most(mu, rows("phi_mn")) & at_most(vu, rows("phi_vn")) & rows("fixed_ok")
        d = rows("d")
        mat = self.inputs.materials
        req = required_steel_in2(np.maximum(mu, 0.0), d, mat.fc_psi, mat.fy_psi)
        f = excess_reinforcement_factor(req, rows("as"))
        ld_s = reduced_straight_in(rows("ld"), f)
        ld_h = reduced_hooked_in(self.bars.size[None, :], rows("ldh"), f)
        room = np.asarray(room_in, float).reshape(-1, 1)
        hooked = ld_s > room
        ok = ok & (~hooked | at_most(ld_h, room))
        length = np.asarray(width_ft, float).reshape(-1, 1) - 0.5 + np.where(
            hooked, rows("hook_extra_ft"), 0.0)
        return ok, np.where(ok, self.w[None, :] * length, np.inf)

    def picks(self, sub, st, inputs, T_idx, stem_cost_k, one_bar):
        """The cheapest heel bars and the cheapest (toe bars, stem bars at that toe's mat)
        of each candidate: (heel pick, heel lb, toe pick, stem class pick, toe + stem lb)."""
        B = np.asarray(sub.footing_width_ft).reshape(-1)
        hr = heel_strength(sub, inputs, one_bar, st)
        h_ok, h_lb = self.member("heel", T_idx, hr.mu_lbft, hr.vu_lb,
                                 np.asarray(heel_room_in(sub)).reshape(-1), B)
        tr = toe_strength(sub, inputs, one_bar, st)
        t_ok, t_lb = self.member("toe", T_idx, tr.mu_lbft, tr.vu_lb,
                                 np.asarray(toe_room_in(sub)).reshape(-1), B)
        h_pick = np.argmin(h_lb, axis=1)
        n = h_pick.size
        h_best = h_lb[np.arange(n), h_pick]
        joint = t_lb + np.take_along_axis(stem_cost_k, np.broadcast_to(
            self.mat_class[None, :], (n, self.mat_class.size)), axis=1)
        t_pick = np.argmin(joint, axis=1)
        return h_pick, h_best, t_pick, joint[np.arange(n), t_pick]


def one_bar(bars: BarArrays) -> BarArrays:
    """The first bar option alone (for the demands, which do not depend on the bars)."""
    return BarArrays(bars.size[:1], bars.spacing_in[:1])


def better(found, best_cost, best):
    """(cost, candidate) after a block's ``found``: the cheaper, a tie to the lower geometry
    index (the order of the exhaustive reference)."""
    if found is not None and (best is None or (found[0], found[1][0]) < (best_cost, best[0])):
        return found
    return best_cost, best


def evaluate_candidates(ctx, cand, base, h, s_pick_k, s_lb_k):
    """The engine's checks of the candidates ``cand`` (flat geometry indices) with their
    cheapest bars: stability, then the heel and the toe with the stem at the toe's bottom
    mat (``s_pick_k``, ``s_lb_k``: the stem pairs' picks and steel per mat class; ``base``:
    the candidates' cost without bars). Returns (cost, (geometry, stem, heel, toe bar
    options)) of the cheapest, or None."""
    g, tabs, col_stem = ctx.g, ctx.toe_tab, ctx.codes["stem_of"]
    sub = as_column(grid_geometry(g, cand, h, ctx.emb, ctx.fb))
    st = stability(sub, ctx.inputs)
    ok = np.asarray(st.passes & sub.valid).reshape(-1)
    if not ok.any():
        return None
    T_idx = tabs.T_of[g.column_of(cand)]
    stem_k = s_lb_k[col_stem[g.column_of(cand)]]
    h_pick, h_lb, t_pick, ts_lb = tabs.picks(sub, st, ctx.inputs, T_idx, stem_k,
                                             one_bar(ctx.bars))
    total = np.where(ok, base + ctx.rates.steel_usd_per_lb * (h_lb + ts_lb), np.inf)
    if not np.isfinite(total).any():
        return None
    k = int(np.lexsort((cand, total))[0])  # least cost, ties to the lower index
    s_b = int(s_pick_k[col_stem[g.column_of(cand[k])], tabs.mat_class[t_pick[k]]])
    return float(total[k]), (int(cand[k]), s_b, int(h_pick[k]), int(t_pick[k]))
