"""The least-cost search of one design table: a height at a time, column by column
(:mod:`.columns`) wherever that holds, else the branch and bound over the whole grid
(:func:`search_whole_grid`); the section found as :class:`~..model.SectionDims`; and the
plain reference :func:`exhaustive_optimum`.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..bars import BarSpec
from ..checks import check_section
from ..model import SectionDims
from ..section import BarArrays, DesignInputs, Reinforcement
from .columns import ColumnSearch
from .context import SearchContext
from .costs import CostRates, candidate_cost, fixed_bars, precompute
from .grid import Geometries, SizingGrid, grid_geometry, with_embedment
from .members import (
    FootingTables,
    better,
    evaluate_candidates,
    pair_table,
    stem_pair_table,
)
from .screen import StabilityScreen

BLOCK = 4096  # geometries evaluated at once in the branch and bound


@dataclass(frozen=True)
class Choice:
    """The optimum at one design height (``section`` None where nothing on the grid holds)."""

    design_height_ft: float
    section: SectionDims | None
    cost_per_ft: float


@dataclass(frozen=True)
class DesignTable:
    """The optimum section for each design height ``increment * k`` (k = 1..K)."""

    increment_ft: float
    embedment_ft: float  # the least embedment (min_embedment_ft or frost depth)
    freeboard_ft: float
    choices: tuple[Choice, ...]
    footing_cover_ft: float = 0.0

    @property
    def heights_ft(self) -> np.ndarray:
        return np.array([c.design_height_ft for c in self.choices])

    @property
    def max_height_ft(self) -> float:
        return float(self.heights_ft[-1]) if self.choices else 0.0

    def index(self, h_ft) -> np.ndarray:
        """Row of the table for each height (rounded up to the increment); -1 beyond it."""
        h = np.asarray(h_ft, float)
        k = np.ceil(np.maximum(h, 0.0) / self.increment_ft - 1e-9).astype(int)
        k = np.maximum(k, 1) - 1
        return np.where(k < len(self.choices), k, -1)

    def cost_per_ft(self, h_ft) -> np.ndarray:
        """$ per ft for each height; NaN where no section holds it."""
        costs = np.array([c.cost_per_ft for c in self.choices] + [np.nan])
        return costs[self.index(h_ft)]

    def embedment_of(self, h_ft) -> np.ndarray:
        """The embedment each height's section needs (ft): the least embedment, or deeper so
        that the footing stays ``footing_cover_ft`` below the front grade."""
        e = np.array([max(self.embedment_ft, c.section.footing_thickness_in / 12.0
                          + self.footing_cover_ft) if c.section is not None
                      else self.embedment_ft for c in self.choices] + [self.embedment_ft])
        return e[self.index(h_ft)]

    def section(self, h_ft: float) -> SectionDims | None:
        i = int(self.index(h_ft))
        return None if i < 0 else self.choices[i].section


def search_whole_grid(ctx: SearchContext, h: float, alive=None):
    """Exact optimum at one height over the whole grid: branch and bound, cheapest lower
    bound first, in blocks (``alive``: the geometries not yet certified to fail at every
    greater height; updated). Returns (geometry, stem bars, heel bars, toe bars, cost), or
    None where nothing holds."""
    g, codes, pre, toe_tab = ctx.g, ctx.codes, ctx.pre, ctx.toe_tab
    first = codes["stem_first"]
    s_pick_k, s_lb_k = stem_pair_table(ctx, first, h, pre["long_db_in"][first])
    heel_lb_pick = pair_table(ctx, codes["heel_first"], h, "heel")
    s_lb0 = np.min(s_lb_k, axis=1)  # the most room for the hook: a lower bound
    s_all = np.tile(s_lb0[codes["stem_of"]], g.nt)
    h_all = np.tile(heel_lb_pick[codes["heel_of"]], g.nt)
    keep = np.isfinite(s_all) & (h_all >= 0) & np.tile(pre["key_ok"], g.nt)
    if alive is not None:
        keep &= alive
    cand = np.nonzero(keep)[0]
    if cand.size == 0:
        return None
    # cost of each candidate without bars (linear in the stem height), and its lower bound
    c_of = g.column_of(cand)
    hst = h + pre["emb_ft"][c_of] + ctx.fb - pre["T_ft"][c_of]
    B = pre["B_ft"][cand]
    base = pre["cost0"][cand] + pre["cost_per_hst"][c_of] * hst
    w_min = float(np.min(toe_tab.w))
    lower = base + ctx.rates.steel_usd_per_lb * (
        s_all[cand] + (toe_tab.w[h_all[cand]] + w_min) * (B - 0.5))
    return _branch_and_bound(ctx, h, cand, base, lower, (s_pick_k, s_lb_k), alive)


def _branch_and_bound(ctx, h, cand, base, lower, stem_k, alive):
    """The candidates ``cand`` taken cheapest ``lower`` bound first in blocks, the stability
    screen applied lazily after the first block, until no bound is below the best found."""
    screen = ctx.screen
    screened = np.zeros(cand.size, bool)
    done = np.zeros(cand.size, bool)
    best_cost, best = math.inf, None
    while True:
        idx = np.nonzero(~done & (lower < best_cost))[0]
        if idx.size == 0:
            break
        if done.any() and not screened[idx].all():
            # after the first block: screen what could still beat the best, drop what fails
            todo = idx[~screened[idx]]
            screened[todo] = True
            fail = ~screen.passes(h, cand[todo])
            done[todo[fail]] = True
            if alive is not None and fail.any():  # certified failures leave for good
                gone = cand[todo[fail]]
                alive[gone[screen.doomed(h, gone)]] = False
            idx = idx[~done[idx]]
            if idx.size == 0:
                break
        if idx.size > BLOCK:
            idx = idx[np.argpartition(lower[idx], BLOCK)[:BLOCK]]
        done[idx] = True
        best_cost, best = better(evaluate_candidates(ctx, cand[idx], base[idx], h, *stem_k),
                                 best_cost, best)
    return None if best is None else (*best, best_cost)


def section_from(ctx: SearchContext, found, h: float) -> SectionDims:
    """The section of ``found`` = (geometry, stem, heel, toe bar options) at height ``h``,
    with its fixed bars and the anchorage of its footing bars as the engine details them."""
    g, bars, inputs = ctx.g, ctx.bars, ctx.inputs
    gi, si, hi, ti = found
    geo = grid_geometry(g, np.array([gi]), h, ctx.emb, ctx.fb)
    horiz, longi = fixed_bars(geo, inputs, g.spacings_in)

    def spec(b, i):
        return BarSpec(int(b.size[i]), float(b.spacing_in[i]))

    def one(i):
        return BarArrays(bars.size[i], bars.spacing_in[i])

    res = check_section(geo, inputs, Reinforcement(stem=one(si), heel=one(hi), toe=one(ti),
                                                   horizontal=horiz, longitudinal=longi))
    return SectionDims(
        stem_top_in=float(g.take("stem_top_in", gi)),
        stem_base_in=float(g.take("stem_base_in", gi)),
        footing_thickness_in=float(g.take("footing_thickness_in", gi)),
        toe_ft=float(g.take("toe_ft", gi)), heel_ft=float(g.take("heel_ft", gi)),
        batter_face=inputs.criteria.batter_face, **key_dims(g, gi),
        stem_bars=spec(bars, si), heel_bars=spec(bars, hi), toe_bars=spec(bars, ti),
        horizontal_bars=BarSpec(int(horiz.size[0]), float(horiz.spacing_in[0])),
        footing_long_bars=BarSpec(int(longi.size[0]), float(longi.spacing_in[0])),
        heel_hooked=bool(np.asarray(res.heel.hooked).reshape(-1)[0]),
        toe_hooked=bool(np.asarray(res.toe.hooked).reshape(-1)[0]),
    )


def key_dims(g: Geometries, gi: int) -> dict:
    """The key fields of :class:`~..model.SectionDims` for geometry ``gi`` (the key's front
    face under the stem's front face: offset = the toe)."""
    kw, kd = float(g.take("key_width_in", gi)), float(g.take("key_depth_in", gi))
    if kw > 0 and kd > 0:
        return {"key_width_in": kw, "key_depth_in": kd,
                "key_offset_ft": float(g.take("toe_ft", gi))}
    return {}


def pair_codes(g: Geometries, grid: SizingGrid, inputs: DesignInputs):
    """(geometries, codes): per column the stem and heel pair codes and the first column of
    each pair. On a slope with a battered stem the heel is paired with the stem too (the
    ground over the heel starts where the battered back face meets the retained grade, so the
    heel's load depends on the stem), on a copy of ``g``."""
    if (inputs.soil.backslope_deg or 0.0) != 0.0 and grid.stem_batter:
        n_s = grid.stem_base_in.size
        g = g.copy()
        g.col["heel_code"] = g.col["heel_code"] * n_s + np.searchsorted(grid.stem_base_in,
                                                                        g.col["stem_base_in"])
    codes = {}
    for name in ("stem", "heel"):
        code = g.col[f"{name}_code"]  # per column, dense: 0 .. number of pairs - 1
        first = np.zeros(int(code.max()) + 1, int)
        # the first column of each pair (toe index 0: its flat index is the column's)
        first[code[::-1]] = np.arange(code.size)[::-1]
        codes[f"{name}_first"], codes[f"{name}_of"] = first, code
    return g, codes


def design_table(inputs: DesignInputs, grid: SizingGrid, rates: CostRates, *,
                 max_height_ft: float, increment_ft: float, embedment_ft: float,
                 freeboard_ft: float, footing_cover_ft: float = 0.0,
                 footing_width_max_ft: float | None = None) -> DesignTable:
    """The least-cost section for every retained height up to ``max_height_ft``; each
    candidate's embedment is ``embedment_ft`` or deeper to bury its footing
    (:func:`~.grid.with_embedment`)."""
    g0 = with_embedment(grid.geometries(), embedment_ft, footing_cover_ft)
    bars = grid.bar_options()
    screen = StabilityScreen(g0, inputs, embedment_ft, freeboard_ft)
    # not yet certified to fail at greater heights, and within the room given for the footing
    alive = np.ones(g0.size, bool)
    toe_tab = FootingTables(g0, inputs, bars)
    g, codes = pair_codes(g0, grid, inputs)
    pre = precompute(g, inputs, rates, embedment_ft)
    if footing_width_max_ft is not None:
        alive &= pre["B_ft"] <= footing_width_max_ft + 1e-9
    ctx = SearchContext(g=g, grid=grid, inputs=inputs, rates=rates, bars=bars,
                        emb=embedment_ft, fb=freeboard_ft, codes=codes, pre=pre,
                        toe_tab=toe_tab, screen=screen, width_max_ft=footing_width_max_ft)
    columns = ColumnSearch(ctx) if ColumnSearch.applies(screen, pre) else None
    choices = []
    k_max = int(math.ceil(max_height_ft / increment_ft - 1e-9))
    for k in range(1, k_max + 1):
        h = k * increment_ft
        found = NotImplemented if columns is None else columns.search(h)
        if found is NotImplemented:
            found = search_whole_grid(ctx, h, alive)
        if found is None:
            choices.append(Choice(h, None, math.nan))
            continue
        choices.append(Choice(h, section_from(ctx, found[:4], h), found[4]))
    return DesignTable(increment_ft, embedment_ft, freeboard_ft, tuple(choices),
                       footing_cover_ft)


def exhaustive_optimum(inputs: DesignInputs, grid: SizingGrid, rates: CostRates, *, h: float,
                       emb: float, fb: float, footing_cover_ft: float = 0.0,
                       footing_width_max_ft: float | None = None):
    """Reference: every geometry x stem x heel x toe bar combination through check_section.

    Only for small grids (tests). Returns (cost, SectionDims) or (inf, None).
    """
    g = with_embedment(grid.geometries(), emb, footing_cover_ft)
    bars = grid.bar_options()
    n_g, n_b = g.size, bars.size.size
    gi, si, hi, ti = np.meshgrid(np.arange(n_g), np.arange(n_b), np.arange(n_b), np.arange(n_b),
                                 indexing="ij")
    gi, si, hi, ti = gi.ravel(), si.ravel(), hi.ravel(), ti.ravel()
    geo = grid_geometry(g, gi, h, emb, fb)
    horiz, longi = fixed_bars(geo, inputs, g.spacings_in)

    def sel(i):
        return BarArrays(bars.size[i], bars.spacing_in[i])

    res = check_section(geo, inputs, Reinforcement(stem=sel(si), heel=sel(hi), toe=sel(ti),
                                                   horizontal=horiz, longitudinal=longi))
    cost = candidate_cost(geo, inputs, rates, sel(si), sel(hi), sel(ti), horiz, longi, res)
    cost = np.where(res.passes, cost, np.inf)
    if footing_width_max_ft is not None:
        cost = np.where(geo.footing_width_ft <= footing_width_max_ft + 1e-9, cost, np.inf)
    k = int(np.argmin(cost))
    if not np.isfinite(cost[k]):
        return math.inf, None
    ctx = SearchContext(g=g, grid=grid, inputs=inputs, rates=rates, bars=bars, emb=emb, fb=fb)
    return float(cost[k]), section_from(ctx, (int(gi[k]), int(si[k]), int(hi[k]), int(ti[k])),
                                        h)
