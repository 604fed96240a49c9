"""Least-cost sizing: the cheapest section on the candidate grid that passes every check.

The grid (``[sizing]``, common-practice increments): toe and heel in 3-in steps, footing
thickness in 1-in steps from 12 in, stem at least 8 in in 1-in steps (optionally battered on
the back face, top at the minimum), bars #4-#11 at 6 to 18 in for the stem, heel and toe. The
stem horizontal bars and the footing longitudinal bars follow from the geometry (the least
area and widest spacing ACI 318-19 allows, in #4 or #5).

Design heights are taken in increments of ``design_height_increment_ft`` (rounded up; walls
are tabulated by height in common practice), so one *design table* per wall holds the optimum
for every height the wall needs: :func:`design_table`. For each height the search is exact
over the whole grid:

1. the checks decompose: stability depends on the geometry alone, the stem on the stem
   thickness and footing thickness and its bars, the heel on heel length and footing thickness
   and its bars, the toe on the geometry (through the bearing pressure) and its bars. So the
   cheapest passing stem bars are found once per (stem, footing) pair and the cheapest heel
   bars once per (heel, footing) pair; the toe bars per geometry;
2. branch and bound: a geometry's cost with its cheapest stem and heel bars and the cheapest
   toe bar option that could exist is a lower bound on any full candidate of that geometry;
   geometries are evaluated cheapest bound first, in blocks, until no bound is below the best
   full candidate found;
3. heights are processed in increasing order, and a geometry that fails stability at one
   height fails at every greater height (loads grow with height), so it is dropped for good;
4. wherever the cost without bars grows with the toe (checked), the same branch and bound
   runs column by column (:mod:`.column_search`), over far fewer candidates.

:func:`exhaustive_optimum` is the plain reference (every combination through
:func:`~.checks.check_section`), which the tests hold the fast search to on small grids.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass, field, replace

import numpy as np

from .bars import SIZES, bar_area_in2, bar_weight_plf
from .checks import check_section
from .grid_sections import (
    FootingTables,
    axes_geometry,
    evaluate_candidates,
    flat_of,
    grid_geometry,
    pair_table,
    stem_pair_table,
    stem_steel_lb,
)
from .key import key_passes
from .model import SectionDims
from .pressure import earth_pressure
from .section import BarArrays, DesignInputs, Reinforcement, SectionGeometry
from .strength import (
    max_flexural_spacing_in,
    shrinkage_spacing_in,
    shrinkage_steel_in2,
    wall_horizontal_min_in2,
)

CY_FT3 = 27.0
# bar spacings a detailer uses, in (common practice: 4-in steps to 12 in, 15, 16, 18)
STANDARD_SPACINGS_IN = (4.0, 6.0, 8.0, 9.0, 10.0, 12.0, 15.0, 16.0, 18.0)
BLOCK = 4096  # geometries evaluated at once in the branch and bound
# shear key depths below the footing, in (0 = no key; common practice: keys of 1 to 2 ft)
KEY_DEPTHS_DEFAULT_IN = np.array([0.0, 12.0, 24.0])


def _steps(lo, hi, step):
    n = int(math.floor((hi - lo) / step + 1e-9))
    return lo + step * np.arange(n + 1)


def parse_sizes(text: str) -> np.ndarray:
    """``"4-9"`` or ``"4,5,6"`` -> bar sizes (ASTM A615 numbers). Raises ValueError."""
    out: list[int] = []
    for part in str(text).replace(" ", "").split(","):
        if "-" in part:
            a, b = part.split("-", 1)
            out += [s for s in SIZES if int(a) <= s <= int(b)]
        elif part:
            out.append(int(part))
    bad = [s for s in out if s not in SIZES]
    if not out or bad:
        raise ValueError(f"bar sizes {text!r}: use ASTM A615 numbers like \"4-9\"")
    return np.array(sorted(set(out)))


@dataclass(frozen=True)
class CostRates:
    """Unit costs (``[costs]``; illustrative defaults, not market prices)."""

    concrete_usd_per_cy: float = 250.0
    steel_usd_per_lb: float = 1.25
    excavation_usd_per_cy: float = 30.0
    formwork_usd_per_sf: float = 12.0
    step_usd: float = 500.0
    mark_usd: float = 1000.0

    @classmethod
    def from_table(cls, t: Mapping) -> CostRates:
        return cls(**{k: float(t[k]) for k in cls.__dataclass_fields__ if k in t})


@dataclass(frozen=True)
class SizingGrid:
    """The candidate dimensions and bars (``[sizing]``)."""

    toe_ft: np.ndarray
    heel_ft: np.ndarray
    footing_thickness_in: np.ndarray
    stem_base_in: np.ndarray
    stem_top_min_in: float
    stem_batter: bool
    bar_sizes: np.ndarray
    bar_spacings_in: np.ndarray
    marks_max: int = 6  # sections per wall (or site) chosen from the design table
    marks_per: str = "wall"  # or "site"
    # the shear key below the stem (0 = no key; the site file's default is
    # KEY_DEPTHS_DEFAULT_IN); its width: the stem's base (0) or this width, in
    key_depth_in: np.ndarray = field(default_factory=lambda: np.zeros(1))
    key_width_in: float = 0.0

    @classmethod
    def from_table(cls, t: Mapping) -> SizingGrid:
        st = float(t.get("toe_heel_step_in", 3.0)) / 12.0
        smin = float(t.get("stem_min_in", 8.0))
        return cls(
            toe_ft=_steps(min(float(t.get("toe_min_ft", 1.0)), float(t.get("toe_max_ft", 8.0))),
                          float(t.get("toe_max_ft", 8.0)), st),
            heel_ft=_steps(st * 2, float(t.get("heel_max_ft", 14.0)), st),
            footing_thickness_in=_steps(float(t.get("footing_thickness_min_in", 12.0)),
                                        float(t.get("footing_thickness_max_in", 48.0)),
                                        float(t.get("footing_thickness_step_in", 1.0))),
            stem_base_in=_steps(smin, float(t.get("stem_max_in", 24.0)),
                                float(t.get("stem_step_in", 1.0))),
            stem_top_min_in=smin,
            stem_batter=bool(t.get("stem_batter", False)),
            bar_sizes=parse_sizes(t.get("bar_sizes", "4-11")),
            bar_spacings_in=np.array(sorted(set(float(x) for x in t.get(
                "bar_spacings_in", STANDARD_SPACINGS_IN)))),
            marks_max=int(t.get("marks_max", 6)),
            marks_per=str(t.get("marks_per", "wall")),
            key_depth_in=np.array(sorted({float(x) for x in t.get(
                "key_depths_in", KEY_DEPTHS_DEFAULT_IN)} | {0.0})),
            key_width_in=float(t.get("key_width_in", 0.0)),
        )

    def geometries(self) -> Geometries:
        """Every (toe, heel, footing, stem) combination (:class:`Geometries`)."""
        return Geometries(self)

    def bar_options(self) -> BarArrays:
        size, sp = np.meshgrid(self.bar_sizes, self.bar_spacings_in, indexing="ij")
        return BarArrays(size.ravel(), sp.ravel())


class Geometries:
    """The grid's geometries, flattened with the toe as the slowest axis: geometry
    ``i = toe_index * ncol + column``, a *column* being one (heel, footing, stem, key)
    combination. The key sits below the stem, its front face under the stem's front face
    (``key_offset_ft`` = the toe), as wide as the stem's base or ``key_width_in``.

    Only the toe varies along a column's flat indices, so every value but the toe is held once
    per column (``col``); :meth:`take` reads any value at flat indices. ``axes`` are the
    broadcasting axes of the grid.
    """

    def __init__(self, grid: SizingGrid):
        nt, nh = grid.toe_ft.size, grid.heel_ft.size
        nT, nS = grid.footing_thickness_in.size, grid.stem_base_in.size
        kd = np.asarray(grid.key_depth_in, float)
        nK = kd.size
        self.shape = (nt, nh, nT, nS, nK)
        self.ncol = nh * nT * nS * nK
        self.nt, self.size = nt, nt * self.ncol
        self.toe_axis = np.asarray(grid.toe_ft, float)
        self.spacings_in = np.asarray(grid.bar_spacings_in, float)  # for the fixed bars
        i_h, i_T, i_S, i_K = (a.ravel() for a in np.meshgrid(
            np.arange(nh), np.arange(nT), np.arange(nS), np.arange(nK), indexing="ij"))
        tb = grid.stem_base_in[i_S]
        self.col = {
            "heel_ft": grid.heel_ft[i_h], "footing_thickness_in": grid.footing_thickness_in[i_T],
            "stem_base_in": tb,
            "stem_top_in": np.full(tb.shape, grid.stem_top_min_in) if grid.stem_batter else tb,
            "key_depth_in": kd[i_K], "key_width_in": key_width(grid, tb, kd[i_K]),
            "stem_code": i_T * nS + i_S, "heel_code": i_h * nT + i_T, "T_index": i_T,
            "key_index": i_K,
        }
        tb_ax = grid.stem_base_in[None, None, None, :, None]
        kd_ax = kd[None, None, None, None, :]
        self.axes = {"toe_ft": self.toe_axis[:, None, None, None, None],
                     "heel_ft": grid.heel_ft[None, :, None, None, None],
                     "footing_thickness_in": grid.footing_thickness_in[None, None, :, None, None],
                     "stem_base_in": tb_ax,
                     "stem_top_in": (np.full((1, 1, 1, 1, 1), grid.stem_top_min_in)
                                     if grid.stem_batter else tb_ax),
                     "key_depth_in": kd_ax, "key_width_in": key_width(grid, tb_ax, kd_ax)}

    def copy(self) -> Geometries:
        out = object.__new__(Geometries)
        out.__dict__.update(self.__dict__)
        out.col, out.axes = dict(self.col), dict(self.axes)
        return out

    def __contains__(self, name) -> bool:
        return name == "toe_ft" or name in self.col

    def column_of(self, idx):
        return np.asarray(idx) % self.ncol

    def take(self, name: str, idx):
        """Values of ``name`` at flat indices ``idx`` (an array or an int)."""
        if name == "toe_ft":
            return self.toe_axis[np.asarray(idx) // self.ncol]
        return self.col[name][np.asarray(idx) % self.ncol]

    def toe_chunks(self, n_toes: int = 4):
        """(toe slice, flat slice) pieces covering the grid, ``n_toes`` toes at a time."""
        for a in range(0, self.nt, n_toes):
            b = min(a + n_toes, self.nt)
            yield slice(a, b), slice(a * self.ncol, b * self.ncol)


def key_width(grid: SizingGrid, stem_base_in, key_depth_in):
    """The key's width, in: ``grid.key_width_in``, or the stem's base where that is 0 (the
    key under the stem, as wide as it: common practice); 0 where there is no key."""
    w = grid.key_width_in if grid.key_width_in > 0 else stem_base_in
    return np.where(np.asarray(key_depth_in) > 0, w, 0.0)


# ------------------------------------------------------------------------------ costs --
def minimum_bars(required_in2, layers, s_max_in, sizes=(4, 5, 6), spacings_in=None):
    """The lightest of #4/#5/#6 at a spacing <= s_max giving ``required_in2`` per foot over
    ``layers`` layers (for stem horizontal and footing longitudinal bars): a spacing of
    ``spacings_in`` (the standard spacings of ``[sizing] bar_spacings_in``), or a whole inch
    of at least 3 where none is given or none of them fits."""
    req = np.asarray(required_in2, float)
    smax = np.floor(np.asarray(s_max_in, float) + 1e-9)
    best_size = np.zeros(req.shape, int)
    best_sp = np.zeros(req.shape)
    best_w = np.full(req.shape, np.inf)
    listed = None if spacings_in is None else np.sort(np.asarray(spacings_in, float))
    for s in sizes:
        a = float(bar_area_in2(s))
        sp = np.minimum(np.floor(layers * a * 12.0 / np.maximum(req, 1e-12) + 1e-9), smax)
        ok = sp >= 3.0
        if listed is not None:  # the widest standard spacing within the limit
            at = np.searchsorted(listed, sp + 1e-9, side="right") - 1
            std = at >= 0
            sp = np.where(std, listed[np.clip(at, 0, None)], sp)
            ok = std
        w = layers * 12.0 / np.maximum(sp, 1.0) * float(bar_weight_plf(s))
        better = ok & (w < best_w - 1e-12)
        best_size = np.where(better, s, best_size)
        best_sp = np.where(better, sp, best_sp)
        best_w = np.where(better, w, best_w)
    return best_size, best_sp


def fixed_bars(geom: SectionGeometry, inputs: DesignInputs, spacings_in=None):
    """Stem horizontal (2 faces) and footing longitudinal (2 mats) bars of each geometry, at
    the standard spacings ``spacings_in`` where given."""
    t_avg = (geom.stem_top_in + geom.stem_base_in) / 2.0
    h_size, h_sp = minimum_bars(wall_horizontal_min_in2(t_avg, 4, inputs.fy_psi), 2,
                                max_flexural_spacing_in(geom.stem_top_in), sizes=(4, 5),
                                spacings_in=spacings_in)
    # a #5 or larger needs the 0.0025 ratio of Table 11.6.1: recheck with the size found
    h_req = wall_horizontal_min_in2(t_avg, h_size, inputs.fy_psi)
    h_size, h_sp = minimum_bars(h_req, 2, max_flexural_spacing_in(geom.stem_top_in),
                                sizes=(4, 5), spacings_in=spacings_in)
    T = geom.footing_thickness_in
    l_size, l_sp = minimum_bars(shrinkage_steel_in2(T), 2, shrinkage_spacing_in(T),
                                spacings_in=spacings_in)
    return BarArrays(h_size, h_sp), BarArrays(l_size, l_sp)


def geometry_cost(geom: SectionGeometry, rates: CostRates):
    """$ per ft of wall for concrete, formwork and excavation (no steel); the key is cast
    against the soil of its trench (no forms), its trench dug as well (:func:`key_cost`)."""
    hst = geom.stem_height_ft
    T = geom.footing_thickness_ft
    B = geom.footing_width_ft
    concrete = ((geom.stem_top_in + geom.stem_base_in) / 24.0 * hst + B * T) / CY_FT3
    formwork = 2.0 * hst + 2.0 * T
    excavation = B * np.maximum(geom.embedment_ft, T) / CY_FT3
    return (rates.concrete_usd_per_cy * concrete + rates.formwork_usd_per_sf * formwork
            + rates.excavation_usd_per_cy * excavation + key_cost(geom, rates))


def key_cost(geom: SectionGeometry, rates: CostRates):
    """$ per ft of wall of the shear key: its concrete and the excavation of its trench
    (cast neat against the trench's soil, no formwork: common practice)."""
    cy = np.where(geom.has_key, geom.key_width_in * geom.key_depth_in / 144.0, 0.0) / CY_FT3
    return (rates.concrete_usd_per_cy + rates.excavation_usd_per_cy) * cy


def footing_bar_steel_lb(geom: SectionGeometry, bars: BarArrays, member=None):
    """Heel top or toe bottom bars per ft of wall: the footing width less 3-in end covers,
    plus a standard hook's extra length where ``member`` (the heel's or toe's
    :class:`~.strength.FootingResult`) says the bar is hooked."""
    length = geom.footing_width_ft - 0.5
    if member is not None:
        from .grid_sections import footing_hook_extra_ft

        length = length + np.where(member.hooked, footing_hook_extra_ft(
            bars.size, member.hook_angle_deg), 0.0)
    return 12.0 / bars.spacing_in * bar_weight_plf(bars.size) * length


def fixed_steel_lb(geom: SectionGeometry, horiz: BarArrays, longi: BarArrays):
    """Stem horizontal bars (2 faces over the stem height) and footing longitudinal bars
    (2 mats over the footing width), per ft of wall."""
    return (2.0 * geom.stem_height_ft * 12.0 / horiz.spacing_in * bar_weight_plf(horiz.size)
            + 2.0 * geom.footing_width_ft * 12.0 / longi.spacing_in * bar_weight_plf(longi.size))


def candidate_cost(geom, inputs, rates, stem, heel, toe, horiz, longi, checks=None):
    """Total $ per ft of wall of a full candidate (the objective of the search); ``checks``
    (its :class:`~.checks.SectionChecks`) adds the hooks of the footing bars."""
    steel = (stem_steel_lb(geom, stem, inputs)
             + footing_bar_steel_lb(geom, heel, None if checks is None else checks.heel)
             + footing_bar_steel_lb(geom, toe, None if checks is None else checks.toe)
             + fixed_steel_lb(geom, horiz, longi))
    return geometry_cost(geom, rates) + rates.steel_usd_per_lb * steel


# ---------------------------------------------------------------- member pass masks --
# ------------------------------------------------------------------------- the search --
@dataclass(frozen=True)
class Choice:
    """The optimum at one design height (``section`` None where nothing on the grid holds)."""

    design_height_ft: float
    section: SectionDims | None
    cost_per_ft: float


def with_embedment(g: Geometries, embedment_ft: float, footing_cover_ft: float) -> Geometries:
    """Each geometry's embedment: at least ``embedment_ft``, and deep enough that the top of
    footing lies ``footing_cover_ft`` below the front grade (the footing stays buried)."""
    g = g.copy()
    g.col["embedment_ft"] = np.maximum(embedment_ft, g.col["footing_thickness_in"] / 12.0
                                       + footing_cover_ft)
    g.axes["embedment_ft"] = np.maximum(
        embedment_ft, g.axes["footing_thickness_in"] / 12.0 + footing_cover_ft)
    return g


def precompute(g: Geometries, inputs: DesignInputs, rates: CostRates, emb: float) -> dict:
    """The height-independent parts of every geometry's cost: the cost is
    ``cost0 + cost_per_hst * stem height`` plus the stem, heel and toe bars.

    ``cost0`` and ``B_ft`` are per geometry (flat); ``T_ft``, ``cost_per_hst``, ``emb_ft``,
    ``stem_anchor_ft`` and ``key_ok`` (the key's flexure and shear hold, or no key) do not
    depend on the toe and are per column (index with ``g.column_of``)."""
    def parts(toes):
        # on the grid's broadcasting axes (each term on the axes it needs)
        geo = axes_geometry(g, 1.0, emb, 0.0, toes)
        T = geo.footing_thickness_ft
        B = geo.footing_width_ft
        horiz, longi = fixed_bars(geo, inputs, g.spacings_in)
        w_h = 2.0 * 12.0 / horiz.spacing_in * bar_weight_plf(horiz.size)  # lb/ft per ft of stem
        w_l = 2.0 * 12.0 / longi.spacing_in * bar_weight_plf(longi.size)  # lb/ft per ft of width
        t_avg_ft = (geo.stem_top_in + geo.stem_base_in) / 24.0
        exc = B * np.maximum(geo.embedment_ft, T) / CY_FT3
        cost0 = (rates.concrete_usd_per_cy * B * T / CY_FT3 + rates.formwork_usd_per_sf * 2.0 * T
                 + rates.excavation_usd_per_cy * exc + rates.steel_usd_per_lb * w_l * B
                 + key_cost(geo, rates))
        per_hst = (rates.concrete_usd_per_cy * t_avg_ft / CY_FT3
                   + rates.formwork_usd_per_sf * 2.0 + rates.steel_usd_per_lb * w_h)
        return geo, T, B, cost0, per_hst

    col_shape = (1, *g.shape[1:])
    geo, T, _, _, per_hst = parts(slice(0, 1))
    _, longi = fixed_bars(geo, inputs)
    out = {"T_ft": T, "cost_per_hst": per_hst, "emb_ft": geo.embedment_ft,
           "stem_anchor_ft": (geo.footing_thickness_in - inputs.cover_toe_in) / 12.0,
           "long_db_in": longi.diameter_in + 0.0 * T,
           # the key's own strength (the passive on it does not depend on the height)
           "key_ok": key_passes(geo, inputs, earth_pressure(inputs))}
    out = {k: flat_of(v, col_shape).copy() for k, v in out.items()}
    out["cost0"], out["B_ft"] = np.empty(g.size), np.empty(g.size)
    monotone, last = True, None  # the cost without bars never decreases as the toe grows
    for toes, flat in g.toe_chunks():
        _, _, B, cost0, _ = parts(toes)
        n = toes.stop - toes.start
        out["cost0"][flat] = flat_of(cost0, (n, *g.shape[1:]))
        out["B_ft"][flat] = flat_of(B, (n, *g.shape[1:]))
        rows = [out["cost0"][flat].reshape(n, -1)]
        monotone = monotone and _rows_nondecreasing(rows, last)
        last = [r[-1:] for r in rows]
    out["toe_monotone"] = monotone
    return out


def _rows_nondecreasing(rows, before=None) -> bool:
    """Each array of ``rows`` (toe x column) never decreases down its toes, nor from the
    matching row of ``before`` (the last toe of the previous piece), to rounding."""
    for i, r in enumerate(rows):
        x = r if before is None else np.concatenate([before[i], r])
        if x.shape[0] > 1:
            tol = 1e-9 * max(1.0, float(np.max(np.abs(x))))
            if float(np.min(x[1:] - x[:-1])) < -tol:
                return False
    return True


class StabilityScreen:
    """A fast necessary condition for stability at one height, for every geometry at once.

    The weights are linear in the design height (stem, soil over the heel and the battered
    face grow with it; footing, key, toe soil and surcharge do not) and the thrust and passive
    resistance are the same for every geometry at a height. The weights come from the engine's
    own :func:`~.section.section_weights` at two heights, with linearity verified at a third;
    where it does not hold (a pressure model whose weights are not linear) the screen passes
    everything. The screen only discards: every candidate is then checked by the engine.
    """

    SLACK = 1e-9
    DH = 0.01  # ft, the backward difference of the certificate

    def __init__(self, g, inputs: DesignInputs, emb: float, fb: float):
        from .pressure import earth_pressure
        from .section import section_weights

        self.inputs = inputs
        self._g = g
        self.emb, self.fb = emb, fb
        self.p = earth_pressure(inputs)
        hs = (4.0, 12.0, 7.0)
        d = hs[1] - hs[0]
        n = g.size
        self.ncol = g.ncol
        # intercepts and slopes side by side (one gather reads a geometry's four)
        self.vm = np.empty((n, 4))
        self.v0, self.v1, self.m0, self.m1 = (self.vm[:, i] for i in range(4))
        self.vq, self.mq, self.B = (np.empty(n) for _ in range(3))
        lin = True
        # whether the weights, their moments about the toe and the widths never decrease as
        # the toe grows (what the column search needs; checked as they are computed)
        self.toe_monotone, last_rows = bool(np.all(np.diff(g.toe_axis) > 0)), None
        # toe by toe (a few at a time): the weights on the grid's axes, slopes and intercepts
        for toes, flat in g.toe_chunks():
            sh = (toes.stop - toes.start, *g.shape[1:])
            geo_a = axes_geometry(g, hs[0], emb, fb, toes)
            wa = section_weights(geo_a, inputs)
            wb = section_weights(axes_geometry(g, hs[1], emb, fb, toes), inputs)
            va, ma = (flat_of(x, sh) for x in wa.dead())
            vb, mb = (flat_of(x, sh) for x in wb.dead())
            v1, m1 = (vb - va) / d, (mb - ma) / d
            v0, m0 = va - v1 * hs[0], ma - m1 * hs[0]
            self.v1[flat], self.m1[flat], self.v0[flat], self.m0[flat] = v1, m1, v0, m0
            # the surcharge's weight does not change with the height (compared on the axes
            # its terms have)
            lin = lin and all(np.allclose(getattr(wa.surcharge, k), getattr(wb.surcharge, k),
                                          rtol=1e-12) for k in ("lb", "moment_lbft"))
            qa, qma = flat_of(wa.surcharge.lb, sh), flat_of(wa.surcharge.moment_lbft, sh)
            self.vq[flat], self.mq[flat] = qa, qma
            B = flat_of(geo_a.footing_width_ft, sh)
            self.B[flat] = B
            rows = [x.reshape(sh[0], -1) for x in (
                (v0, v1, m0, m1, B, qa, qma) if inputs.surcharge_resists else (v0, v1, m0, m1, B))]
            self.toe_monotone = self.toe_monotone and _rows_nondecreasing(rows, last_rows)
            last_rows = [r[-1:] for r in rows]
        # linearity verified at a third height on a spread of the grid
        probe = np.unique(np.linspace(0, n - 1, min(n, 4096)).astype(int))
        wc = section_weights(grid_geometry(g, probe, hs[2], emb, fb), inputs)
        vc, mc = wc.dead()
        lin = lin and all(np.allclose(c, x0[probe] + x1[probe] * hs[2], rtol=1e-9, atol=1e-6)
                          for c, x0, x1 in ((vc, self.v0, self.v1), (mc, self.m0, self.m1)))
        # the thrust must not depend on the geometry (level backfill on the heel plane of
        # height H): compare two different sections at one height
        from .pressure import design_thrust

        T_index = g.col["T_index"]
        last = int(np.nonzero(T_index == T_index[0])[0][-1]) + (g.nt - 1) * g.ncol
        two = grid_geometry(g, np.array([0, last]), 8.0, emb, fb)
        th = design_thrust(two, inputs, self.p)
        same = all(np.allclose(np.broadcast_to(getattr(th, k), (2,))[0],
                               np.broadcast_to(getattr(th, k), (2,))[1], rtol=1e-12)
                   for k in ("horizontal_lb", "moment_lbft", "vertical_lb"))
        # the embedment depends on the footing thickness alone, the passive also on the key's
        # depth: one value per (thickness, key depth), and one of them per column
        combo = T_index * (int(g.col["key_index"].max()) + 1) + g.col["key_index"]
        n_c = int(combo.max()) + 1
        first = np.zeros(n_c, int)
        first[combo[::-1]] = np.arange(combo.size)[::-1]
        self.e_vals = np.broadcast_to(g.take("embedment_ft", first) if "embedment_ft" in g
                                      else np.full(n_c, emb), (n_c,))
        # the depth of the passive's bottom below the front grade: the bottom of the key
        self.passive_depth = self.e_vals + g.take("key_depth_in", first) / 12.0
        self.e_col = combo
        # below a water level the soil is buoyant: its weight is linear in the height only
        # where the level lies at or below the retained grade of every geometry (the design
        # height plus the least embedment reaches the level), the fitting heights included
        self.h_min = (-math.inf if inputs.water is None
                      else float(inputs.water.level_ft) - float(np.min(self.e_vals)))
        # (the screen puts a vertical thrust at the heel edge: not with the stem plane)
        self.linear = bool(lin and same and hs[0] >= self.h_min and not inputs.stem_plane)
        self._probe, self._valid = probe, {}
        # failures that hold at every greater height can be certified only where the thrust
        # is the level-backfill one (no vertical part, convex in the height)
        self.certify = self.linear and not inputs.extended

    def e_of(self, idx):
        """The (embedment, key depth) value (index into ``e_vals``) of the geometries ``idx``."""
        if isinstance(idx, slice):
            idx = np.arange(self.B.size)[idx]
        return self.e_col[np.asarray(idx) % self.ncol]

    def _forces(self, h: float):
        """Per (embedment, key depth) value: overturning moment, driving force, vertical
        thrust, passive (to the bottom of the footing or key, as in the engine)."""
        from .pressure import design_thrust, passive_resistance_lb

        i = self.inputs
        one = SectionGeometry(retained_height_ft=h, embedment_ft=self.e_vals,
                              footing_thickness_in=12.0, stem_top_in=8.0, stem_base_in=8.0,
                              toe_ft=1.0, heel_ft=1.0, freeboard_ft=self.fb)
        th = design_thrust(one, i, self.p)  # one thrust per embedment (design height)
        shape = self.e_vals.shape
        pp = (passive_resistance_lb(self.p.passive_efp_pcf, i.passive_neglect_ft,
                                    self.passive_depth)
              if i.use_passive else np.zeros(shape))
        return (np.broadcast_to(th.moment_lbft, shape), np.broadcast_to(th.horizontal_lb, shape),
                np.broadcast_to(th.vertical_lb, shape), np.broadcast_to(pp, shape))

    def valid_at(self, h: float) -> bool:
        """The screen holds at height ``h``: linear, within the heights where it is (with
        [water], at and above ``h_min``), and its weights equal the engine's at ``h`` on the
        probe spread over the grid (checked once per height)."""
        if not self.linear or h < self.h_min - 1e-9:
            return False
        if h not in self._valid:
            from .section import section_weights

            w = section_weights(grid_geometry(self._g, self._probe, h, self.emb, self.fb),
                                self.inputs)
            v, m = w.dead()
            p = self._probe
            self._valid[h] = bool(
                np.allclose(v, self.v0[p] + self.v1[p] * h, rtol=1e-9, atol=1e-6)
                and np.allclose(m, self.m0[p] + self.m1[p] * h, rtol=1e-9, atol=1e-6))
        return self._valid[h]

    def passes(self, h: float, idx=slice(None)) -> np.ndarray:
        """The screen at height ``h`` for the geometries ``idx`` (all by default)."""
        if not self.valid_at(h):
            return np.ones(self.B[idx].shape, bool)
        i = self.inputs
        m_o, h_d, v_th, pp = self._forces(h)
        e_ix = self.e_of(idx)
        m_o, h_d, v_th, pp = m_o[e_ix], h_d[e_ix], v_th[e_ix], pp[e_ix]
        B = self.B[idx]
        v = self.v0[idx] + self.v1[idx] * h + v_th
        m = self.m0[idx] + self.m1[idx] * h + v_th * B
        vq, mq = self.vq[idx], self.mq[idx]
        if i.surcharge_resists:
            v, m = v + vq, m + mq
        k = 1.0 - self.SLACK
        ok = (m >= i.fs_overturning * m_o * k) & (
            i.friction_coefficient * v + pp >= i.fs_sliding * h_d * k)
        cases = [(v, m)] if i.surcharge_resists else [(v, m), (v + vq, m + mq)]
        for vv, mm in cases:
            with np.errstate(divide="ignore", invalid="ignore"):
                e = np.abs(B / 2.0 - (mm - m_o) / vv)
                a = B / 2.0 - e
                q = np.where(e <= B / 6.0, vv / B * (1.0 + 6.0 * e / B), 2.0 * vv / (3.0 * a))
            ok &= (a > 0) & (vv > 0) & (q * k <= i.allowable_bearing_psf)
        return ok

    def doomed(self, h: float, idx) -> np.ndarray:
        """Geometries ``idx`` that fail overturning or sliding at ``h`` and at every greater
        height. The margins M_R - FS M_O and mu V + P_p - FS H are concave in the height (the
        resisting side is linear, the driving side convex), so a negative margin whose slope is
        not positive stays negative; the slope of the driving side is taken by a backward
        difference, which is no more than its true slope."""
        out = np.zeros(np.shape(idx), bool)
        if not self.certify or h <= 2 * self.DH or not self.valid_at(h):
            return out
        i = self.inputs
        m_o, h_d, _, pp = self._forces(h)
        m_o0, h_d0, _, _ = self._forces(h - self.DH)
        e_ix = self.e_of(idx)
        sm = (m_o - m_o0)[e_ix] / self.DH
        sh = (h_d - h_d0)[e_ix] / self.DH
        v = self.v0[idx] + self.v1[idx] * h
        m = self.m0[idx] + self.m1[idx] * h
        v1, m1 = self.v1[idx], self.m1[idx]
        if i.surcharge_resists:
            v, m = v + self.vq[idx], m + self.mq[idx]
        ot = (m < i.fs_overturning * m_o[e_ix] * (1 - 1e-6)) & (m1 <= i.fs_overturning * sm)
        sl = ((i.friction_coefficient * v + pp[e_ix] < i.fs_sliding * h_d[e_ix] * (1 - 1e-6))
              & (i.friction_coefficient * v1 <= i.fs_sliding * sh))
        return ot | sl


def stem_tables(g, codes, h, emb, fb, inputs, bars, pre):
    """Per stem pair and toe bar size class: the cheapest passing stem bars and their cost
    lb per ft of wall (:func:`~.grid_sections.stem_pair_table`)."""
    first = codes["stem_first"]
    return stem_pair_table(g, first, h, emb, fb, inputs, bars, pre["long_db_in"][first])


def _search_height(g, codes, pre, toe_tab, screen, h, emb, fb, inputs, rates, bars,
                   alive=None):
    """Exact optimum at one height over the whole grid.

    Returns (geometry, stem bars, heel bars, toe bars, cost), or None where nothing holds.
    ``toe_tab`` is the :class:`~.grid_sections.FootingTables` of the grid.
    """
    cs = rates.steel_usd_per_lb
    s_pick_k, s_lb_k = stem_tables(g, codes, h, emb, fb, inputs, bars, pre)
    heel_lb_pick = pair_table(g, codes["heel_first"], h, emb, fb, inputs, bars, "heel")
    s_lb0 = np.min(s_lb_k, axis=1)  # the most room for the hook: a lower bound
    col_stem = codes["stem_of"]
    s_all = np.tile(s_lb0[col_stem], g.nt)
    h_all = np.tile(heel_lb_pick[codes["heel_of"]], g.nt)
    keep = np.isfinite(s_all) & (h_all >= 0) & np.tile(pre["key_ok"], g.nt)
    if alive is not None:
        keep &= alive
    cand = np.nonzero(keep)[0]
    if cand.size == 0:
        return None
    h_b = h_all[cand]
    screened = np.zeros(cand.size, bool)  # the stability screen is applied lazily
    # cost of each candidate without bars (linear in the stem height), and its lower bound
    c_of = g.column_of(cand)
    hst = h + pre["emb_ft"][c_of] + fb - pre["T_ft"][c_of]
    B = pre["B_ft"][cand]
    base = pre["cost0"][cand] + pre["cost_per_hst"][c_of] * hst
    w_min = float(np.min(toe_tab.w))
    lower = base + cs * (s_all[cand] + (toe_tab.w[h_b] + w_min) * (B - 0.5))
    one_bar = BarArrays(bars.size[:1], bars.spacing_in[:1])
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
        found = evaluate_candidates(g, cand[idx], base[idx], h, emb, fb, inputs, cs, toe_tab,
                                    s_pick_k, s_lb_k, col_stem, one_bar)
        if found is None:
            continue
        if best is None or (found[0], found[1][0]) < (best_cost, best[0]):
            best_cost, best = found
    if best is None:
        return None
    return (*best, best_cost)


def section_from(g, gi, bars: BarArrays, si, hi, ti, inputs, h, emb, fb) -> SectionDims:
    from .bars import BarSpec

    geo = grid_geometry(g, np.array([gi]), h, emb, fb)
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
        batter_face=inputs.batter_face, **key_dims(g, gi),
        stem_bars=spec(bars, si), heel_bars=spec(bars, hi), toe_bars=spec(bars, ti),
        horizontal_bars=BarSpec(int(horiz.size[0]), float(horiz.spacing_in[0])),
        footing_long_bars=BarSpec(int(longi.size[0]), float(longi.spacing_in[0])),
        heel_hooked=bool(np.asarray(res.heel.hooked).reshape(-1)[0]),
        toe_hooked=bool(np.asarray(res.toe.hooked).reshape(-1)[0]),
    )


def key_dims(g: Geometries, gi: int) -> dict:
    """The key fields of :class:`~.model.SectionDims` for geometry ``gi`` (the key's front
    face under the stem's front face: offset = the toe)."""
    kw, kd = float(g.take("key_width_in", gi)), float(g.take("key_depth_in", gi))
    if kw > 0 and kd > 0:
        return {"key_width_in": kw, "key_depth_in": kd,
                "key_offset_ft": float(g.take("toe_ft", gi))}
    return {}


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


def design_table(inputs: DesignInputs, grid: SizingGrid, rates: CostRates, *,
                 max_height_ft: float, increment_ft: float, embedment_ft: float,
                 freeboard_ft: float, footing_cover_ft: float = 0.0,
                 footing_width_max_ft: float | None = None) -> DesignTable:
    """The least-cost section for every retained height up to ``max_height_ft``; each
    candidate's embedment is ``embedment_ft`` or deeper to bury its footing
    (:func:`with_embedment`)."""
    g = with_embedment(grid.geometries(), embedment_ft, footing_cover_ft)
    bars = grid.bar_options()
    screen = StabilityScreen(g, inputs, embedment_ft, freeboard_ft)
    # not yet certified to fail at greater heights, and within the room given for the footing
    alive = np.ones(g.size, bool)
    toe_tab = FootingTables(g, inputs, bars)
    if (inputs.backslope_deg or 0.0) != 0.0 and grid.stem_batter:
        # on a slope the ground over the heel starts where the battered back face meets the
        # retained grade, so the heel's load depends on the stem too: pair it with the stem
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
    pre = precompute(g, inputs, rates, embedment_ft)
    if footing_width_max_ft is not None:
        alive &= pre["B_ft"] <= footing_width_max_ft + 1e-9
    from .column_search import ColumnSearch  # (it builds on this module)

    columns = None
    if ColumnSearch.applies(screen, pre):
        columns = ColumnSearch(g, grid, codes, pre, toe_tab, screen, inputs, rates, bars,
                               embedment_ft, freeboard_ft, footing_width_max_ft)
    choices = []
    k_max = int(math.ceil(max_height_ft / increment_ft - 1e-9))
    for k in range(1, k_max + 1):
        h = k * increment_ft
        found = NotImplemented if columns is None else columns.search(h)
        if found is NotImplemented:
            found = _search_height(g, codes, pre, toe_tab, screen, h, embedment_ft,
                                   freeboard_ft, inputs, rates, bars, alive)
        if found is None:
            choices.append(Choice(h, None, math.nan))
            continue
        gi, si, hi, ti, cost = found
        choices.append(Choice(h, section_from(g, gi, bars, si, hi, ti, inputs, h, embedment_ft,
                                              freeboard_ft), cost))
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
    return float(cost[k]), section_from(g, int(gi[k]), bars, int(si[k]), int(hi[k]), int(ti[k]),
                                        inputs, h, emb, fb)


__all__ = ["Choice", "CostRates", "DesignTable", "SizingGrid", "design_table",
           "exhaustive_optimum", "replace"]
