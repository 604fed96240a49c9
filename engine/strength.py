"""ACI 318-19 strength of the stem, heel and toe (per foot of wall, b = 12 in), vectorized.

Load factors (ASCE 7 section 2.3 as adopted by IBC 2021 section 1605; DESIGN.md section 7):

- stem: 1.6 on the lateral earth pressure and on the lateral pressure of the live surcharge;
- heel: 1.2 on the soil and concrete weight over it, 1.6 on the live surcharge; the upward soil
  pressure under the heel is neglected (conservative; McCormac & Brown 9th ed. section 13.10);
- toe: 1.6 on the service bearing pressure of the governing bearing case (the one reported
  with q_max; McCormac & Brown 13.10 factor the soil pressure by 1.6), less 0.9 times the
  footing and soil weight over the toe (dead load that resists).

Critical sections: stem moment at the top of footing and shear at d above it (7.4.3.2); heel
at the back face of the stem; toe at the front face (moment and shear, conservative); a
tapered stem is also checked up its height (13.3.6.3, from memory).

Flexure: Whitney block, 0.85 f'c over a = beta1 c (22.2.2), strain compatibility with
eps_cu = 0.003 (the steel stress is Es*eps_s where the bars do not yield), phi from the net
tensile strain (Table 21.2.2). Shear: Table 22.5.5.1 row (c) (no shear reinforcement,
A_v < A_v,min), lambda_s by Eq. 22.5.5.1.3 on the stem (a one-way slab, 13.3.6.1 / Ch. 7);
for the footing 13.2.6.2 permits neglecting lambda_s for one-way shallow foundations, and the
default does (``footing_shear_size_effect = false``); row (c) with rho_w^(1/3) still governs
there because a footing has no stirrups.

Functions here take geometry and bars and need no stability result except the toe, which takes
the bearing cases from :func:`~.stability.stability` (computed if not given).

How sure the clause texts are (REFERENCES.md section 3): Tables 21.2.2, 22.2.2.4.3, 22.5.5.1,
Eq. 22.5.5.1.3, 7.6.1.1 (0.0018 Ag), 13.2.6.2, 24.4.3 and Table 11.6.1 are from secondary
sources [S] (StructurePoint, ideCAD, the mento implementation); Table 20.5.1.3.1 is [C];
13.3.6.1/13.3.6.3, 24.3.2 and the 318-19 numbering of 7.7.2.3 are from memory [M].
"""

from __future__ import annotations

from dataclasses import dataclass, fields

import numpy as np

from .concrete import (
    B_IN,
    EPS_CU,
    ES_PSI,
    PHI_SHEAR,
    Flexure,
    beta1,
    cover_in,
    crack_control_spacing_in,
    flexural_strength,
    max_flexural_spacing_in,
    min_flexural_steel_in2,
    one_way_shear_strength,
    phi_flexure,
    required_steel_in2,
    service_steel_stress_psi,
    shrinkage_spacing_in,
    shrinkage_steel_in2,
    size_effect_factor,
    wall_horizontal_min_in2,
)
from .development import footing_development, hook_psi_r, hooked_development_in
from .pressure import (
    EarthPressure,
    design_thrust,
    earth_pressure,
    stem_seismic_shear_moment,
    stem_shear_moment,
)
from .section import BarArrays, DesignInputs, SectionGeometry

# the member strengths, and the strip strengths of engine/concrete.py they are built on
__all__ = [
    "B_IN", "COMBINATIONS", "EPS_CU", "ES_PSI", "FOOTING_END_COVER_IN", "Flexure", "FootingResult",
    "LF_DEAD_ADDS", "LF_DEAD_RESISTS", "LF_LATERAL", "LF_SEISMIC", "LIVE_THRUST", "MemberResult",
    "PHI_SHEAR", "STATIC_COMBINATIONS", "STEM_HEIGHT_FRACTIONS", "StemResult", "beta1",
    "clipped_line_load", "cover_in", "crack_control_spacing_in", "factored_pressure_line",
    "flexural_strength", "footing_member", "heel_demand", "heel_down_loads", "heel_loads_psf",
    "heel_room_in", "heel_strength", "max_flexural_spacing_in", "min_flexural_steel_in2",
    "one_way_shear_strength", "phi_flexure", "pressure_line", "required_steel_in2",
    "seismic_combination", "service_steel_stress_psi", "shrinkage_spacing_in",
    "shrinkage_steel_in2", "size_effect_factor", "stem_strength", "toe_room_in", "toe_strength",
    "wall_horizontal_min_in2"
]

LF_LATERAL = 1.6  # ASCE 7 2.3: H (lateral earth pressure) and L (live surcharge)
LF_DEAD_ADDS = 1.2
LF_DEAD_RESISTS = 0.9
LF_SEISMIC = 1.0  # ASCE 7 2.3.6: E at 1.0 in strength design
STEM_HEIGHT_FRACTIONS = (0.25, 0.5, 0.75)  # sections up a stem, fractions of h_s


def _a(x):
    return np.asarray(x, dtype=float)


# ------------------------------------------------------------------------ member results --
@dataclass(frozen=True)
class MemberResult:
    """Strength of one member (stem, heel or toe) at its critical section, per foot.

    Moments lb-ft, shears lb, lengths in, areas in^2 per foot of wall.
    """

    mu_lbft: np.ndarray
    phi_mn_lbft: np.ndarray
    vu_lb: np.ndarray
    phi_vn_lb: np.ndarray
    d_in: np.ndarray
    thickness_in: np.ndarray
    as_in2: np.ndarray
    as_min_in2: np.ndarray
    spacing_in: np.ndarray
    s_max_in: np.ndarray
    cover_in: np.ndarray
    phi: np.ndarray
    eps_t: np.ndarray
    a_in: np.ndarray  # depth of the equivalent stress block (ACI 318-19 22.2.2.4.1)

    def to_frame(self):
        """One row per section, the fields as columns."""
        import pandas as pd

        arrs = {f.name: getattr(self, f.name) for f in fields(self)}
        shape = np.broadcast_shapes(*(np.shape(v) for v in arrs.values()))
        return pd.DataFrame({k: np.broadcast_to(v, shape).reshape(-1)
                             for k, v in arrs.items()})


@dataclass(frozen=True)
class StemResult(MemberResult):
    """Stem at the top of footing plus its service, hook and up-the-height values.

    ``height_*``: the section up the stem with the largest flexure (or shear) ratio, at
    ``height_*_y_ft`` above the top of footing (13.3.6.3). ``s_crack_in`` is the 24.3.2
    spacing limit (inf when crack control is off); ``ldh_available_in`` = T - bottom cover -
    bottom mat.
    """

    ms_lbft: np.ndarray
    fs_service_psi: np.ndarray
    s_crack_in: np.ndarray
    ldh_in: np.ndarray
    ldh_available_in: np.ndarray
    height_mu_lbft: np.ndarray
    height_phi_mn_lbft: np.ndarray
    height_flexure_y_ft: np.ndarray
    height_vu_lb: np.ndarray
    height_phi_vn_lb: np.ndarray
    height_shear_y_ft: np.ndarray


def stem_factored(geom, inputs, p, z):
    """Service and factored shear and moment on the stem at depth z below the retained grade:
    the larger of 1.6 (H + L) and, with [seismic], 1.6 H + 1.0 E (live loads left out)."""
    v, m = stem_shear_moment(geom, inputs, p, z)
    vu, mu = LF_LATERAL * v, LF_LATERAL * m
    if inputs.loads.seismic is not None:
        v0, m0 = stem_shear_moment(geom, inputs, p, z, live=False)
        ve, me = stem_seismic_shear_moment(geom, inputs, p, z)
        vu = np.maximum(vu, LF_LATERAL * v0 + LF_SEISMIC * ve)
        mu = np.maximum(mu, LF_LATERAL * m0 + LF_SEISMIC * me)
    return v, m, vu, mu


def _up_the_stem(geom, inputs, p, As, d, cover_db, fractions) -> dict:
    """The worst flexure and shear ratios at the sections up the stem (``fractions`` of h_s
    above the top of footing; d there = the stem's thickness - cover - db/2, ``cover_db`` =
    (cover, db))."""
    cov, db = cover_db
    fc, fy = inputs.materials.fc_psi, inputs.materials.fy_psi
    hs = geom.soil_height_ft
    nd = len(np.broadcast_shapes(np.shape(hs), np.shape(d), np.shape(As), geom.shape))
    fr = np.asarray(fractions, dtype=float).reshape((-1,) + (1,) * nd)
    y = fr * hs  # above the top of footing; hs - y below the retained grade
    d_y = geom.stem_thickness_in(y) - cov - db / 2.0
    _, _, vu_y, mu_y = stem_factored(geom, inputs, p, hs - y)
    pmn_y = flexural_strength(As, d_y, fc, fy).phi_mn_lbft
    pvn_y = one_way_shear_strength(As, d_y, fc, size_effect=True)
    with np.errstate(divide="ignore", invalid="ignore"):
        r_f, r_v = mu_y / pmn_y, vu_y / pvn_y
    i_f = np.argmax(r_f, axis=0)[None]
    i_v = np.argmax(r_v, axis=0)[None]

    def pick(arr, idx):
        arr = np.broadcast_to(arr, (arr.shape[0],) + idx.shape[1:])
        return np.take_along_axis(arr, idx, axis=0)[0]

    return dict(height_mu_lbft=pick(mu_y, i_f), height_phi_mn_lbft=pick(pmn_y, i_f),
                height_flexure_y_ft=pick(y, i_f), height_vu_lb=pick(vu_y, i_v),
                height_phi_vn_lb=pick(pvn_y, i_v), height_shear_y_ft=pick(y, i_v))


def stem_strength(geom: SectionGeometry, inputs: DesignInputs, bars: BarArrays, *,
                  pressure: EarthPressure | None = None,
                  fractions=STEM_HEIGHT_FRACTIONS, bottom_mat_in=0.0) -> StemResult:
    """Stem flexure, shear, minimum steel, spacing, crack control and hook development.

    Mu = 1.6 x the stem load of the pressure models in use (level backfill: EFP h_s^3/6 +
    Ka q h_s^2/2) with h_s = retained grade - top of footing; Vu at d
    above the footing (7.4.3.2); d = stem base - cover - db/2 (bars at the back face);
    lambda_s applies (one-way slab). The stem bars are hooked into the footing, the hook
    resting on the bottom mat: l_dh (25.4.3.1; psi_r from the bar spacing, psi_o from the
    criteria) must fit in T - bottom cover - ``bottom_mat_in`` (the toe bars and the
    longitudinal bars of the bottom mat). ``fractions`` of h_s give the sections checked up
    the stem (bars run full height).
    """
    p = pressure or earth_pressure(inputs)
    fc, fy = inputs.materials.fc_psi, inputs.materials.fy_psi
    hs = geom.soil_height_ft
    tb = geom.stem_base_in
    cov = cover_in(bars.size, inputs.criteria.cover_stem_in)
    db = bars.diameter_in
    d = tb - cov - db / 2.0
    As = bars.area_in2_per_ft

    _, ms, _, mu_base = stem_factored(geom, inputs, p, hs)
    _, _, vu_d, _ = stem_factored(geom, inputs, p, hs - d / 12.0)
    fl = flexural_strength(As, d, fc, fy)
    pvn = one_way_shear_strength(As, d, fc, size_effect=True)
    s_max = max_flexural_spacing_in(tb)
    if inputs.criteria.crack_control:
        fs = service_steel_stress_psi(ms, As, d, fc)
        s_cr = crack_control_spacing_in(fs, cov)
    else:
        fs = np.full(np.shape(ms), np.nan)
        s_cr = np.full(np.shape(ms), np.inf)
    ldh = hooked_development_in(bars.size, fc, fy, psi_e=1.0,
                                psi_r=hook_psi_r(bars.size, bars.spacing_in),
                                psi_o=inputs.criteria.hook_psi_o)
    up = _up_the_stem(geom, inputs, p, As, d, (cov, db), fractions)
    return StemResult(
        mu_lbft=mu_base, phi_mn_lbft=fl.phi_mn_lbft, vu_lb=vu_d,
        phi_vn_lb=pvn, d_in=d, thickness_in=tb, as_in2=As,
        as_min_in2=min_flexural_steel_in2(tb), spacing_in=bars.spacing_in,
        s_max_in=np.minimum(s_max, s_cr), cover_in=cov, phi=fl.phi, eps_t=fl.eps_t,
        a_in=fl.a_in, ms_lbft=ms, fs_service_psi=fs, s_crack_in=s_cr, ldh_in=ldh,
        ldh_available_in=(geom.footing_thickness_in - inputs.criteria.cover_toe_in
                          - _a(bottom_mat_in)),
        **up,
    )


def heel_loads_psf(geom: SectionGeometry, inputs: DesignInputs):
    """Factored downward load on the heel, psf: 1.2 (soil + footing) + 1.6 surcharge."""
    dead = inputs.soil.unit_weight_pcf * geom.soil_height_ft \
        + inputs.materials.concrete_unit_weight_pcf * geom.footing_thickness_ft
    return LF_DEAD_ADDS * dead + LF_LATERAL * inputs.loads.surcharge_psf


# the factored load combinations of the footing (ASCE 7-22 2.3.1 with H; DESIGN.md section 7)
# and the two conventions kept from the textbook; a member result names its governing one by
# its index in COMBINATIONS
COMBINATIONS = (
    "1.2D + 1.6H + 1.6L",  # C1
    "1.2D + 1.6H",  # C2
    "0.9D + 1.6H",  # C3
    "1.2D + 1.0E + 1.6H",  # the seismic combination (ASCE 7-22 2.3.6), with [seismic]
    "1.2D + 1.6L + 1.6H, upward pressure neglected",  # heel_upward_pressure = false
    "1.6 x service bearing pressure - 0.9D",  # the toe's static case
)
STATIC_COMBINATIONS = ((0, 1.2, 1.6, 1.6), (1, 1.2, 1.6, 0.0), (2, 0.9, 1.6, 0.0))
HEEL_TEXTBOOK, TOE_SERVICE, SEISMIC_COMBINATION = 4, 5, 3
FOOTING_END_COVER_IN = 3.0  # Table 20.5.1.3.1: footing ends cast against earth
LIVE_THRUST = ("surcharge", "strip load")  # the thrust components that are live load L


@dataclass(frozen=True)
class FootingResult(MemberResult):
    """A footing cantilever (heel or toe) with its governing combinations and the
    development of its bars beyond the stem face (ACI 318-19 25.4).

    ``mu_combination`` / ``vu_combination``: index into :data:`COMBINATIONS`;
    ``ld_straight_in`` / ``ldh_in``: the straight and hooked lengths required (reduced by
    As,req/As,prov, 25.4.10, never below the minimums); ``hooked``: the anchorage used (a hook
    where the straight bar does not fit, unless given); ``ld_required_in`` its length,
    ``ld_available_in`` the room from the stem face to the far footing edge less its cover;
    ``hook_angle_deg``: 90, or 180 where a 90-degree tail does not fit in the depth.
    """

    mu_combination: np.ndarray
    vu_combination: np.ndarray
    as_required_in2: np.ndarray
    ld_straight_in: np.ndarray
    ldh_in: np.ndarray
    hooked: np.ndarray
    ld_required_in: np.ndarray
    ld_available_in: np.ndarray
    hook_angle_deg: np.ndarray


def footing_member(geom, inputs, bars, mu, vu, cov):
    fc, fy = inputs.materials.fc_psi, inputs.materials.fy_psi
    T = geom.footing_thickness_in
    d = T - cov - bars.diameter_in / 2.0
    As = bars.area_in2_per_ft
    fl = flexural_strength(As, d, fc, fy)
    pvn = one_way_shear_strength(As, d, fc, size_effect=inputs.criteria.footing_shear_size_effect)
    return MemberResult(
        mu_lbft=mu, phi_mn_lbft=fl.phi_mn_lbft, vu_lb=vu, phi_vn_lb=pvn, d_in=d,
        thickness_in=T, as_in2=As, as_min_in2=min_flexural_steel_in2(T),
        spacing_in=bars.spacing_in, s_max_in=max_flexural_spacing_in(T), cover_in=cov,
        phi=fl.phi, eps_t=fl.eps_t, a_in=fl.a_in)


def _footing_result(geom, inputs, bars, mu, vu, cov, mu_c, vu_c, *, room_in, top,
                    hooked) -> FootingResult:
    """The footing member for the governing (Mu, Vu) with the development of its bars."""
    member = footing_member(geom, inputs, bars, mu, vu, cov)
    dev = footing_development(bars.size, bars.spacing_in, member.as_in2, member.d_in,
                              member.mu_lbft, member.thickness_in, cov, room_in, inputs, top=top,
                              hooked=hooked)
    kw = {f.name: getattr(member, f.name) for f in fields(MemberResult)}
    return FootingResult(**kw, mu_combination=np.asarray(mu_c), vu_combination=np.asarray(vu_c),
                         **dev)


def heel_room_in(geom: SectionGeometry):
    """Room for the heel's top bars beyond the stem's back face: stem base + toe less the end
    cover at the toe edge, in."""
    return geom.stem_base_in + 12.0 * geom.toe_ft - FOOTING_END_COVER_IN


def toe_room_in(geom: SectionGeometry):
    """Room for the toe's bottom bars beyond the stem's front face: stem base + heel less the
    end cover at the heel edge, in."""
    return geom.stem_base_in + 12.0 * geom.heel_ft - FOOTING_END_COVER_IN


def _split_thrust(th):
    """(dead-side H, live L) sums of a Thrust: horizontal, moment, vertical each."""
    h = [0.0, 0.0, 0.0]
    live = [0.0, 0.0, 0.0]
    for c in th.components:
        dst = live if c.name.startswith(LIVE_THRUST) else h
        dst[0] = dst[0] + _a(c.horizontal_lb)
        dst[1] = dst[1] + _a(c.horizontal_lb) * _a(c.arm_ft)
        dst[2] = dst[2] + _a(c.vertical_lb)
    return h, live


def factored_pressure_line(geom, inputs, weights, thrust, f_d, f_h, f_l, extra=None):
    """Base pressure of a factored combination as (q0, s) of q(x) = max(0, q0 + s x), x from
    the toe; no pressure (zeros) where the combination's resultant leaves the base.

    Sum Vu = f_d D + f_h Pv_H + f_l (W_L + Pv_L); the factored moment about the toe
    = f_d M_D + (f_h Pv_H + f_l Pv_L) B + f_l M_L - f_h M_H - f_l M_HL, then the kern or
    triangle rule (DESIGN.md section 7). ``extra`` = (V, M_resisting, M_overturning) added
    (the seismic combination's inertia and increment).
    """
    from .pressure import thrust_plane_x_ft
    from .stability import bearing_pressure

    B = geom.footing_width_ft
    xv = thrust_plane_x_ft(geom, inputs)  # where the vertical component acts
    vd, md = weights.dead()
    (hh, mh, vh), (hl, ml, vl) = _split_thrust(thrust)
    v = f_d * vd + f_h * vh + f_l * (weights.surcharge.lb + vl)
    mr = f_d * md + (f_h * vh + f_l * vl) * xv + f_l * weights.surcharge.moment_lbft
    mo = f_h * mh + f_l * ml
    if extra is not None:
        v, mr, mo = v + extra[0], mr + extra[1], mo + extra[2]
    with np.errstate(divide="ignore", invalid="ignore"):
        case = bearing_pressure(v, B / 2.0 - (mr - mo) / v, B)
    q0, s = pressure_line(case, B)
    return np.where(case.in_base, q0, 0.0), np.where(case.in_base, s, 0.0), case


def heel_down_loads(geom: SectionGeometry, inputs: DesignInputs, thrust):
    """The heel's downward loads as (force, moment about the stem's back face) pairs: dead
    (soil over the heel at its full unit weight and the heel concrete), the live surcharge
    q L, and the vertical thrust components at the heel edge (H and L parts)."""
    from .pressure import stem_face_x_at_grade, virtual_back_height_ft

    L = geom.heel_ft
    T = geom.footing_thickness_ft
    g, gc, q = (inputs.soil.unit_weight_pcf, inputs.materials.concrete_unit_weight_pcf,
                inputs.loads.surcharge_psf)
    if inputs.extended:
        x_back = geom.toe_ft + geom.stem_base_in / 12.0
        tanb = np.tan(np.radians(inputs.soil.backslope_deg or 0.0))
        H = geom.design_height_ft
        d0 = np.maximum(H + (x_back - stem_face_x_at_grade(geom, inputs)) * tanb - T, 0.0)
        d1 = np.maximum(virtual_back_height_ft(geom, inputs) - T, 0.0)
        fd = g * (d0 + d1) * L / 2.0 + gc * T * L
        md = g * (d0 * L * L / 2.0 + (d1 - d0) * L * L / 3.0) + gc * T * L * L / 2.0
        if inputs.loads.water is not None:  # saturated below the level (total weight, no buoyancy)
            from .pressure import water_height_ft

            sub = np.clip(water_height_ft(geom, inputs) - T, 0.0, np.minimum(d0, d1))
            extra = inputs.gamma_below_water_pcf - g
            fd = fd + extra * sub * L
            md = md + extra * sub * L * L / 2.0
    else:
        hs = geom.soil_height_ft
        fd = (g * hs + gc * T) * L
        md = fd * L / 2.0
    (_, _, vh), (_, _, vl) = _split_thrust(thrust)
    if inputs.stem_plane:  # the vertical component acts on the stem, not on the heel
        vh, vl = 0.0 * vh, 0.0 * vl
    return {"dead": (fd, md), "live": (q * L, q * L * L / 2.0),
            "pv_h": (vh, vh * L), "pv_l": (vl, vl * L)}


def _up_on_heel(geom, q0, s):
    """Upward force and moment about the stem's back face of q(x) over the heel."""
    x_back = geom.toe_ft + geom.stem_base_in / 12.0
    L = geom.heel_ft
    f, m_edge = clipped_line_load(q0 + s * x_back, s, L)
    return f, f * L - m_edge


def heel_strength(geom: SectionGeometry, inputs: DesignInputs, bars: BarArrays, stab=None, *,
                  pressure=None, weights=None, hooked=None) -> FootingResult:
    """Heel as a cantilever from the stem's back face, top bars in tension.

    ``heel_upward_pressure`` (default): for each of C1-C3 (and the seismic combination with
    [seismic]) the combination's factors on the soil over the heel and the heel concrete (D),
    the surcharge (L) and the thrust's vertical component at the heel edge (H, L), less the
    combination's factored bearing pressure under the heel (none where its resultant leaves
    the base); Vu and Mu at the back face, each the largest. Otherwise the textbook method:
    wu = 1.2 (gamma h_s + gamma_c T) + 1.6 q, Mu = wu L^2/2 and Vu = wu L (upward pressure
    neglected; McCormac & Brown 13.10), with a backslope the soil trapezoid and 1.6 Pv.
    Cover per Table 20.5.1.3.1 (top face: 2 / 1.5 in) unless ``cover_heel_in``.
    """
    from .section import section_weights

    p = pressure or earth_pressure(inputs)
    cov = cover_in(bars.size, inputs.criteria.cover_heel_in)
    th = design_thrust(geom, inputs, p)
    loads = heel_down_loads(geom, inputs, th)
    (fd, md), (fl, ml) = loads["dead"], loads["live"]
    (fh, mh), (flv, mlv) = loads["pv_h"], loads["pv_l"]
    shape = np.broadcast_shapes(np.shape(fd), np.shape(fh), geom.shape)
    if not inputs.criteria.heel_upward_pressure:
        mu = LF_DEAD_ADDS * md + LF_LATERAL * (ml + mh + mlv)
        vu = LF_DEAD_ADDS * fd + LF_LATERAL * (fl + fh + flv)
        mu_c = vu_c = np.full(shape, HEEL_TEXTBOOK)
    else:
        w = weights if weights is not None else section_weights(geom, inputs)
        mu = np.full(shape, -np.inf)
        vu = np.full(shape, -np.inf)
        mu_c = np.zeros(shape, int)
        vu_c = np.zeros(shape, int)
        cases = [(i, f_d, f_h, f_l, None) for i, f_d, f_h, f_l in STATIC_COMBINATIONS]
        if inputs.loads.seismic is not None:
            cases.append(seismic_combination(geom, inputs, p, w))
        for i, f_d, f_h, f_l, extra in cases:
            q0, s, _ = factored_pressure_line(geom, inputs, w, th if extra is None
                                              else extra["thrust"], f_d, f_h, f_l,
                                              None if extra is None else extra["base"])
            fu, mu_up = _up_on_heel(geom, q0, s)
            m_i = f_d * md + f_h * mh + f_l * (ml + mlv) - mu_up
            v_i = f_d * fd + f_h * fh + f_l * (fl + flv) - fu
            if extra is not None:
                m_i, v_i = m_i + extra["heel"][1], v_i + extra["heel"][0]
            mu_c = np.where(m_i > mu, i, mu_c)
            vu_c = np.where(v_i > vu, i, vu_c)
            mu, vu = np.maximum(mu, m_i), np.maximum(vu, v_i)
    return _footing_result(geom, inputs, bars, mu, vu, cov, mu_c, vu_c,
                           room_in=heel_room_in(geom), top=True, hooked=hooked)


def heel_demand(geom: SectionGeometry, inputs: DesignInputs, pressure=None):
    """Textbook factored heel moment and shear at the stem's back face (upward pressure
    neglected): 1.2 (soil, full unit weight; footing) + 1.6 q + 1.6 x the vertical component
    Pv of the static thrust at the heel edge (see :func:`heel_down_loads`)."""
    p = pressure or earth_pressure(inputs)
    loads = heel_down_loads(geom, inputs, design_thrust(geom, inputs, p))
    (fd, md), (fl, ml) = loads["dead"], loads["live"]
    (fh, mh), (flv, mlv) = loads["pv_h"], loads["pv_l"]
    return (LF_DEAD_ADDS * md + LF_LATERAL * (ml + mh + mlv),
            LF_DEAD_ADDS * fd + LF_LATERAL * (fl + fh + flv))


def seismic_combination(geom, inputs, pressure, weights):
    """The seismic combination 1.2D + 1.0E + 1.6H of the footing (ASCE 7-22 2.3.6; DESIGN.md
    section 7): H the static thrust without the live loads, E the increment Delta P_AE at
    0.6 H' and the inertia kh W of the concrete (and, with ``soil_inertia``, of the soil over
    the heel) at 1.0. Returns (index, f_d, f_h, f_l, extra) for :func:`heel_strength`."""
    from .pressure import seismic_e_components

    th = design_thrust(geom, inputs, pressure, live=False)
    e_h, e_m, e_v, heel_e = seismic_e_components(geom, inputs, pressure, weights)
    from .pressure import thrust_plane_x_ft

    xv = thrust_plane_x_ft(geom, inputs)
    return (SEISMIC_COMBINATION, LF_DEAD_ADDS, LF_LATERAL, 0.0,
            {"thrust": th, "base": (e_v, e_v * xv, e_m), "heel": heel_e})


def pressure_line(case, width_ft):
    """Base pressure of a bearing case as q(x) = max(0, q0 + s x), x from the toe (psf, psf/ft).

    Trapezoid inside the kern; triangle of length 3a at the toe (e > B/6) or at the heel
    (e < -B/6); NaN outside the base.
    """
    B, V, e = _a(width_ft), case.sum_v_lb, case.eccentricity_ft
    with np.errstate(divide="ignore", invalid="ignore"):
        a = B / 2.0 - np.abs(e)
        q_toe, q_heel = V / B * (1.0 + 6.0 * e / B), V / B * (1.0 - 6.0 * e / B)
        qm = 2.0 * V / (3.0 * a)
        inside = np.abs(e) <= B / 6.0
        q0 = np.where(inside, q_toe, np.where(e > 0, qm, qm * (1.0 - B / (3.0 * a))))
        s = np.where(inside, (q_heel - q_toe) / B, np.where(e > 0, -qm, qm) / (3.0 * a))
    bad = ~case.in_base
    return np.where(bad, np.nan, q0), np.where(bad, np.nan, s)


def clipped_line_load(q0, s, length_ft):
    """Force (lb) and moment about x = L (lb-ft) of q(x) = max(0, q0 + s x) over [0, L]."""
    q0, s, L = _a(q0), _a(s), _a(length_ft)
    with np.errstate(divide="ignore", invalid="ignore"):
        r = np.where(s != 0, -q0 / s, np.where(q0 > 0, -np.inf, np.inf))
    u = np.where(s > 0, np.clip(r, 0.0, L), 0.0)
    v = np.where(s > 0, L, np.where(s < 0, np.clip(r, 0.0, L), np.where(q0 > 0, L, 0.0)))
    v = np.maximum(u, v)
    d1, d2, d3 = v - u, (v * v - u * u) / 2.0, (v ** 3 - u ** 3) / 3.0
    force = q0 * d1 + s * d2
    moment = q0 * (L * d1 - d2) + s * (L * d2 - d3)
    return force, moment


def _toe_seismic(geom, inputs, pressure, weights, w, Lv):
    """(combination index, Mu, Vu) of the toe for 1.2D + 1.0E + 1.6H: its own factored
    bearing pressure over the toe (to the face; to ``Lv`` for the shear) less f_D x ``w``."""
    from .section import section_weights

    L = geom.toe_ft
    p = pressure or earth_pressure(inputs)
    wts = weights if weights is not None else section_weights(geom, inputs)
    i, f_d, f_h, f_l, extra = seismic_combination(geom, inputs, p, wts)
    q0e, se, _ = factored_pressure_line(geom, inputs, wts, extra["thrust"], f_d, f_h, f_l,
                                        extra["base"])
    _, m_e = clipped_line_load(q0e, se, L)
    f_e, _ = clipped_line_load(q0e, se, Lv)
    return i, m_e - f_d * w * L * L / 2.0, f_e - f_d * w * Lv


def toe_strength(geom: SectionGeometry, inputs: DesignInputs, bars: BarArrays,
                 stab=None, *, pressure=None, weights=None, hooked=None) -> FootingResult:
    """Toe as a cantilever from the stem's front face, bottom bars in tension.

    1.6 x (service bearing pressure over the toe) - 0.9 x (footing + soil over the toe, the
    soil only with ``count_toe_soil``), the pressure being that of the governing bearing case
    (the larger q_max, as reported by stability); with [seismic] also 1.2D + 1.0E + 1.6H with
    its own factored bearing pressure, less 1.2 x the same weights; the larger of the two.
    Mu at the front face, Vu at d from it (7.4.3.2 by 13.2.7: the wall is a compression
    support for the toe). Bottom cover 3 in (cast against earth) unless ``cover_toe_in``.
    ``stab`` is a :class:`~.stability.StabilityResult` (computed if omitted).
    """
    if stab is None:
        from .stability import stability

        stab = stability(geom, inputs)
    L, B = geom.toe_ft, geom.footing_width_ft
    cov = cover_in(bars.size, inputs.criteria.cover_toe_in)
    d = geom.footing_thickness_in - cov - bars.diameter_in / 2.0
    Lv = np.maximum(L - d / 12.0, 0.0)  # the shear's critical section, from the toe edge
    # the pressure diagram of the governing bearing case (the one reported with q_max)
    q0d, sd = pressure_line(stab.case_dead, B)
    q0s, ss = pressure_line(stab.case_surcharge, B)
    pick = stab.bearing_with_surcharge
    q0, s = np.where(pick, q0s, q0d), np.where(pick, ss, sd)
    _, m_up = clipped_line_load(q0, s, L)
    f_up, _ = clipped_line_load(q0, s, Lv)
    w = inputs.materials.concrete_unit_weight_pcf * geom.footing_thickness_ft
    if inputs.criteria.count_toe_soil:
        w = w + inputs.soil.unit_weight_pcf * geom.toe_soil_depth_ft
    if inputs.loads.water is not None:
        # uplift under the toe (the triangle of the stability case: 0 at the toe edge to the
        # full head at the heel edge), water pressure: 1.6 as H
        from .pressure import WATER_PCF, water_height_ft

        u_b = WATER_PCF * water_height_ft(geom, inputs)
        f_up = f_up + u_b * Lv * Lv / (2.0 * B)
        m_up = m_up + u_b * L ** 3 / (6.0 * B)
    mu = LF_LATERAL * m_up - LF_DEAD_RESISTS * w * L * L / 2.0
    vu = LF_LATERAL * f_up - LF_DEAD_RESISTS * w * Lv
    shape = np.broadcast_shapes(np.shape(mu), np.shape(vu))
    mu_c = np.full(shape, TOE_SERVICE)
    vu_c = np.full(shape, TOE_SERVICE)
    if inputs.loads.seismic is not None:
        i, m_e, f_e = _toe_seismic(geom, inputs, pressure, weights, w, Lv)
        mu_c = np.where(m_e > mu, i, mu_c)
        vu_c = np.where(f_e > vu, i, vu_c)
        mu, vu = np.maximum(mu, m_e), np.maximum(vu, f_e)
    return _footing_result(geom, inputs, bars, mu, vu, cov, mu_c, vu_c,
                           room_in=toe_room_in(geom), top=False, hooked=hooked)
