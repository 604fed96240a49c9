"""The sizing grid as sections: its geometries as broadcasting axes or gathered by index, as a
column against the bar options, the pass masks of the member checks, and the cheapest passing
stem and heel bars per (member, footing) pair. Shared by the branch and bound
(``engine/sizing.py``) and the column search (``engine/column_search.py``).
"""

from __future__ import annotations

import numpy as np

from .bars import bar_weight_plf
from .section import BarArrays, DesignInputs, SectionGeometry
from .strength import heel_strength, stem_strength

TOE_MIN_DEPTH_IN = 6.0  # ACI 318-19 13.3.1.2 (as in checks.py)


def at_most(a, b):
    with np.errstate(invalid="ignore", divide="ignore"):
        return np.asarray(a <= b * (1.0 + 1e-12))


def stem_passes(r) -> np.ndarray:
    """Every stem row of check_section (ratio <= 1)."""
    return (at_most(r.mu_lbft, r.phi_mn_lbft) & at_most(r.vu_lb, r.phi_vn_lb)
            & at_most(r.height_mu_lbft, r.height_phi_mn_lbft)
            & at_most(r.height_vu_lb, r.height_phi_vn_lb)
            & at_most(r.as_min_in2, r.as_in2) & at_most(r.spacing_in, r.s_max_in)
            & at_most(r.ldh_in, r.ldh_available_in))


def footing_member_passes(r, toe: bool = False) -> np.ndarray:
    """Every heel (or toe) row of check_section (ratio <= 1)."""
    ok = (at_most(r.mu_lbft, r.phi_mn_lbft) & at_most(r.vu_lb, r.phi_vn_lb)
          & at_most(r.as_min_in2, r.as_in2) & at_most(r.spacing_in, r.s_max_in))
    if toe:
        ok = ok & at_most(TOE_MIN_DEPTH_IN, r.d_in)
    return ok


def stem_steel_lb(geom: SectionGeometry, bars: BarArrays, inputs: DesignInputs):
    """Stem vertical bars per ft of wall: full stem height, into the footing to the bottom
    mat, plus a 90-degree hook extension of 12 db (ACI 318-19 Table 25.3.1)."""
    L = (geom.stem_height_ft + (geom.footing_thickness_in - inputs.cover_toe_in) / 12.0
         + 12.0 * bars.diameter_in / 12.0)
    return 12.0 / bars.spacing_in * bar_weight_plf(bars.size) * L


def axes_geometry(g, h, emb, fb, toes=slice(None)) -> SectionGeometry:
    """The grid (or the toes ``toes`` of it) as broadcasting axes (toe, heel, footing, stem):
    the engine's functions then compute each term on the axes it depends on (much less work
    than on every element)."""
    a = g.axes
    return SectionGeometry(
        retained_height_ft=h, embedment_ft=a.get("embedment_ft", emb),
        footing_thickness_in=a["footing_thickness_in"], stem_top_in=a["stem_top_in"],
        stem_base_in=a["stem_base_in"], toe_ft=a["toe_ft"][toes], heel_ft=a["heel_ft"],
        freeboard_ft=fb)


def flat_of(x, shape) -> np.ndarray:
    return np.broadcast_to(x, shape).reshape(-1)


def grid_geometry(g, idx, h, emb, fb) -> SectionGeometry:
    if "embedment_ft" in g:
        emb = g.take("embedment_ft", idx)
    return SectionGeometry(
        retained_height_ft=h, embedment_ft=emb,
        footing_thickness_in=g.take("footing_thickness_in", idx),
        stem_top_in=g.take("stem_top_in", idx), stem_base_in=g.take("stem_base_in", idx),
        toe_ft=g.take("toe_ft", idx), heel_ft=g.take("heel_ft", idx), freeboard_ft=fb)


def as_column(geo: SectionGeometry) -> SectionGeometry:
    """The same sections as a column (n, 1), to broadcast against bar options (1, n_b)."""
    return SectionGeometry(**{k: np.asarray(getattr(geo, k))[..., None] if np.ndim(
        getattr(geo, k)) else getattr(geo, k) for k in (
        "retained_height_ft", "embedment_ft", "footing_thickness_in", "stem_top_in",
        "stem_base_in", "toe_ft", "heel_ft", "key_width_in", "key_depth_in", "key_offset_ft",
        "freeboard_ft")})


def pair_table(g, first, h, emb, fb, inputs, bars: BarArrays, member: str) -> np.ndarray:
    """Cheapest passing bar option for each (member dims, footing) pair code; -1 where none.

    ``first`` holds one geometry index per code (the member check depends only on the pair).
    """
    geo = as_column(grid_geometry(g, first, h, emb, fb))
    bb = BarArrays(bars.size[None, :], bars.spacing_in[None, :])
    if member == "stem":
        ok = stem_passes(stem_strength(geo, inputs, bb))
        lb = stem_steel_lb(geo, bb, inputs)
    else:  # heel: the bar length (footing width) is common to every option of a geometry
        ok = footing_member_passes(heel_strength(geo, inputs, bb))
        lb = np.broadcast_to(12.0 / bb.spacing_in * bar_weight_plf(bb.size), ok.shape)
    cost = np.where(ok, lb, np.inf)
    best = np.argmin(cost, axis=1)
    return np.where(np.isfinite(cost[np.arange(first.size), best]), best, -1)
