"""What a candidate costs: unit rates (``[costs]``), the fixed bars that follow from the
geometry (stem horizontal, footing longitudinal), steel by member, the cost of concrete,
formwork, excavation and the shear key, and the height-independent parts of every
geometry's cost (:func:`precompute`).
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from ..bars import bar_area_in2, bar_weight_plf
from ..defaults import COSTS
from ..key import key_passes
from ..pressure import earth_pressure
from ..section import BarArrays, DesignInputs, SectionGeometry
from ..strength import (
    max_flexural_spacing_in,
    shrinkage_spacing_in,
    shrinkage_steel_in2,
    wall_horizontal_min_in2,
)
from .grid import Geometries, axes_geometry, flat_of

CY_FT3 = 27.0


@dataclass(frozen=True)
class CostRates:
    """Unit costs (``[costs]``; illustrative defaults, not market prices)."""

    concrete_usd_per_cy: float = COSTS["concrete_usd_per_cy"]
    steel_usd_per_lb: float = COSTS["steel_usd_per_lb"]
    excavation_usd_per_cy: float = COSTS["excavation_usd_per_cy"]
    formwork_usd_per_sf: float = COSTS["formwork_usd_per_sf"]
    step_usd: float = COSTS["step_usd"]
    mark_usd: float = COSTS["mark_usd"]

    @classmethod
    def from_table(cls, t: Mapping) -> CostRates:
        return cls(**{k: float(t[k]) for k in cls.__dataclass_fields__ if k in t})


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
    h_size, h_sp = minimum_bars(wall_horizontal_min_in2(t_avg, 4, inputs.materials.fy_psi), 2,
                                max_flexural_spacing_in(geom.stem_top_in), sizes=(4, 5),
                                spacings_in=spacings_in)
    # a #5 or larger needs the 0.0025 ratio of Table 11.6.1: recheck with the size found
    h_req = wall_horizontal_min_in2(t_avg, h_size, inputs.materials.fy_psi)
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
    :class:`~..strength.FootingResult`) says the bar is hooked."""
    length = geom.footing_width_ft - 0.5
    if member is not None:
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
    (its :class:`~..checks.SectionChecks`) adds the hooks of the footing bars."""
    steel = (stem_steel_lb(geom, stem, inputs)
             + footing_bar_steel_lb(geom, heel, None if checks is None else checks.heel)
             + footing_bar_steel_lb(geom, toe, None if checks is None else checks.toe)
             + fixed_steel_lb(geom, horiz, longi))
    return geometry_cost(geom, rates) + rates.steel_usd_per_lb * steel


def stem_steel_lb(geom: SectionGeometry, bars: BarArrays, inputs: DesignInputs):
    """Stem vertical bars per ft of wall: full stem height, into the footing to the bottom
    mat, plus a 90-degree hook extension of 12 db (ACI 318-19 Table 25.3.1)."""
    L = (geom.stem_height_ft + (geom.footing_thickness_in - inputs.criteria.cover_toe_in) / 12.0
         + 12.0 * bars.diameter_in / 12.0)
    return 12.0 / bars.spacing_in * bar_weight_plf(bars.size) * L


def footing_hook_extra_ft(size, angle_deg):
    """What a standard hook adds to a footing bar's length beyond the straight bar that runs
    out to the end cover, ft: the arc and tail (Table 25.3.1) less the hook's out-to-out
    reach D/2 + db."""
    from ..bars import bar_diameter_in
    from ..development import hook_bend_diameter_in, hook_length_in

    reach = hook_bend_diameter_in(size) / 2.0 + bar_diameter_in(size)
    return (hook_length_in(size, np.where(np.asarray(angle_deg) == 90, 90, 180)) - reach) / 12.0


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
           "stem_anchor_ft": (geo.footing_thickness_in - inputs.criteria.cover_toe_in) / 12.0,
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
        monotone = monotone and rows_nondecreasing(rows, last)
        last = [r[-1:] for r in rows]
    out["toe_monotone"] = monotone
    return out


def rows_nondecreasing(rows, before=None) -> bool:
    """Each array of ``rows`` (toe x column) never decreases down its toes, nor from the
    matching row of ``before`` (the last toe of the previous piece), to rounding."""
    for i, r in enumerate(rows):
        x = r if before is None else np.concatenate([before[i], r])
        if x.shape[0] > 1:
            tol = 1e-9 * max(1.0, float(np.max(np.abs(x))))
            if float(np.min(x[1:] - x[:-1])) < -tol:
                return False
    return True
