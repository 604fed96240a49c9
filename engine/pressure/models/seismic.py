"""The seismic case: the dynamic increment Delta P_AE (Seed-Whitman 0.375 kh gamma H'^2 or
Mononobe-Okabe (KAE - Ka) gamma H'^2/2) at 0.6 H' (a linear diagram with four times the base
pressure at the top), with the inertia kh W of the concrete parts (and, with
``soil_inertia``, of the soil over the heel) at their centroids, times the load factor; the
live surcharge and the strip loads are left out of the seismic case (IBC 2021 1807.2.3).
"""

from __future__ import annotations

import math

import numpy as np

from ..base import EarthPressure, ModelBase, ThrustComponent, floats
from ..coefficients import mononobe_okabe_kae
from ..planes import stem_face_x_at_grade, thrust_plane_height_ft, virtual_back_height_ft
from ..profiles import seismic_profile

SEISMIC_ARM_FRACTION = 0.6  # Seed & Whitman (1970): the increment acts at 0.6 H


def increment_lb(geom, inputs, pressure: EarthPressure):
    """The nominal dynamic increment Delta P_AE on the virtual back (along the thrust for
    Mononobe-Okabe, horizontal for Seed-Whitman), before the load factor.

    Seed-Whitman: 0.375 kh gamma H'^2 (UFC 3-220-20 Eq. 4-17 form); Mononobe-Okabe:
    (KAE - Ka) gamma H'^2 / 2 with kv = 0 and KAE for the same wall friction (beta for
    Rankine, the wall friction for Coulomb) so that kh -> 0 gives 0.
    """
    sz = inputs.loads.seismic
    Hv = thrust_plane_height_ft(geom, inputs)
    g = inputs.soil.unit_weight_pcf
    if sz.method == "seed-whitman":
        return 0.375 * sz.kh * g * Hv * Hv
    p = pressure
    kae = float(mononobe_okabe_kae(inputs.soil.friction_angle_deg, p.inclination_deg, sz.kh,
                                   p.backslope_deg))
    return 0.5 * (kae - p.ka) * g * Hv * Hv


def direction(inputs, pressure: EarthPressure):
    """(cos, sin) of the increment's direction: horizontal for Seed-Whitman, the static
    thrust direction for Mononobe-Okabe."""
    if inputs.loads.seismic.method == "seed-whitman":
        return 1.0, 0.0
    return pressure.cos_inclination, pressure.sin_inclination


def concrete_parts(geom, inputs):
    """Weights (lb) and centroid heights above the bottom of footing (ft) of the stem
    rectangle, stem batter triangle, footing and key (for the seismic inertia)."""
    gc = inputs.materials.concrete_unit_weight_pcf
    T = geom.footing_thickness_ft
    tt, tb = geom.stem_top_in / 12.0, geom.stem_base_in / 12.0
    hst = geom.stem_height_ft
    kd = np.where(geom.has_key, geom.key_depth_in / 12.0, 0.0)
    kw = np.where(geom.has_key, geom.key_width_in / 12.0, 0.0)
    return (
        ("stem", gc * tt * hst, T + hst / 2.0),
        ("stem batter", gc * 0.5 * (tb - tt) * hst, T + hst / 3.0),
        ("footing", gc * geom.footing_width_ft * T, T / 2.0),
        ("key", gc * kw * kd, -kd / 2.0),
    )


def soil_inertia_parts(geom, inputs):
    """Weight (lb, at the total unit weight: the mass that moves) and centroid height above
    the bottom of footing (ft) of the soil between the stem's back face and the plane through
    the heel edge (over the heel and a battered back face): it moves with the wall when the
    increment acts on that plane (DESIGN.md section 7, seismic case). The region is the
    quadrilateral (x_back, T), (B, T), (B, H'), (x_grade, H), by the shoelace formula."""
    T, B, H = geom.footing_thickness_ft, geom.footing_width_ft, geom.design_height_ft
    x_back = geom.toe_ft + geom.stem_base_in / 12.0
    pts = ((x_back, T), (B, T), (B, virtual_back_height_ft(geom, inputs)),
           (stem_face_x_at_grade(geom, inputs), H))
    a2 = cy = 0.0
    for k in range(4):
        (x1, y1), (x2, y2) = pts[k], pts[(k + 1) % 4]
        cr = floats(x1) * floats(y2) - floats(x2) * floats(y1)
        a2 = a2 + cr
        cy = cy + (floats(y1) + floats(y2)) * cr
    has = (H > T) & (np.abs(a2) > 1e-14)
    with np.errstate(divide="ignore", invalid="ignore"):
        y = np.where(has, cy / (3.0 * np.where(has, a2, 1.0)), 0.0)
    w = np.where(has, inputs.soil.unit_weight_pcf * np.abs(a2) / 2.0, 0.0)
    return (("soil over heel", w, y),)


def inertia_components(geom, inputs, factor):
    """``factor`` x kh W of each concrete part and, with ``soil_inertia``, of the soil over
    the heel and the battered face, at their centroids (horizontal, toward the front)."""
    sz = inputs.loads.seismic
    parts = list(concrete_parts(geom, inputs))
    if sz.soil_inertia and not inputs.stem_plane:  # (stem plane: the soil is retained)
        parts += list(soil_inertia_parts(geom, inputs))
    return [ThrustComponent(f"inertia {name}", factor * sz.kh * w, y) for name, w, y in parts]


def e_components(geom, inputs, pressure: EarthPressure, weights=None):
    """The earthquake load E at 1.0 for the footing's strength combination 1.2D + 1.0E +
    1.6H (ASCE 7-22 2.3.6): (horizontal force, overturning moment about the bottom of
    footing, vertical force at the heel edge, (force, moment about the stem's back face) of
    E acting directly on the heel). E = Delta P_AE at 0.6 H' (its vertical part, Mononobe-Okabe
    with an inclined thrust, down at the heel edge) plus kh W of the concrete and, with
    ``soil_inertia``, the soil over the heel (horizontal: no load on the heel itself)."""
    dp = increment_lb(geom, inputs, pressure)
    c, s = direction(inputs, pressure)
    Hv = thrust_plane_height_ft(geom, inputs)
    h = dp * c
    m = dp * c * SEISMIC_ARM_FRACTION * Hv
    for comp in inertia_components(geom, inputs, 1.0):
        h = h + comp.horizontal_lb
        m = m + comp.horizontal_lb * comp.arm_ft
    v = dp * s
    on_heel = 0.0 if inputs.stem_plane else 1.0  # (stem plane: it acts on the stem)
    return h, m, v, (v * on_heel, v * on_heel * geom.heel_ft)


def stem_shear_moment(geom, inputs, pressure: EarthPressure, depth_ft):
    """Nominal seismic shear and moment on the stem ``depth_ft`` below the retained grade:
    the increment on the stem's own height h_s (Seed-Whitman 0.375 kh gamma h_s^2 or
    (KAE - Ka) gamma h_s^2/2 horizontal part, as the same linear diagram, resultant at 0.6 h_s)
    plus the inertia kh W of the stem above the cut at its centroid (E at 1.0)."""
    sz = inputs.loads.seismic
    p = pressure
    hs = geom.soil_height_ft
    g = inputs.soil.unit_weight_pcf
    if sz.method == "seed-whitman":
        tot = 0.375 * sz.kh * g * hs * hs
    else:
        kae = float(mononobe_okabe_kae(inputs.soil.friction_angle_deg, p.inclination_deg, sz.kh,
                                       p.backslope_deg))
        tot = 0.5 * (kae - p.ka) * g * hs * hs * p.cos_inclination
    z = np.clip(floats(depth_ft), 0.0, hs)
    v, m = seismic_profile(tot, hs, z)
    # stem inertia above the cut: a trapezoid of thickness t_y (cut) to t_top over L
    hst = geom.stem_height_ft
    y = hs - z  # cut above the top of footing
    L = np.maximum(hst - y, 0.0)
    t_y = geom.stem_thickness_in(y) / 12.0
    t_t = geom.stem_top_in / 12.0
    w = inputs.materials.concrete_unit_weight_pcf * sz.kh
    v = v + w * (t_y + t_t) / 2.0 * L
    m = m + w * L * L * (t_y / 6.0 + t_t / 3.0)
    return v, m


class Seismic(ModelBase):
    name = "seismic"
    order = 40
    case = "seismic"

    def applies(self, inputs) -> bool:
        return inputs.loads.seismic is not None

    def check(self, inputs, has_phi: bool) -> None:
        sz = inputs.loads.seismic
        if sz is None or sz.method != "mononobe-okabe":
            return
        if not has_phi:
            raise ValueError("seismic method 'mononobe-okabe' needs friction_angle_deg; "
                             "use 'seed-whitman' with active_efp_pcf")
        beta = inputs.soil.backslope_deg or 0.0
        psi = math.degrees(math.atan(sz.kh))
        if inputs.soil.friction_angle_deg - beta - psi < 0:
            raise ValueError(f"Mononobe-Okabe has no solution: phi - backslope - "
                             f"atan(kh) = "
                             f"{inputs.soil.friction_angle_deg - beta - psi:.3g} deg < 0 "
                             "(lower kh or the slope)")

    def components(self, geom, inputs, p, plane, *, live):
        """load_factor x (Delta P_AE at 0.6 H', and kh W of each part at its centroid)."""
        lf = inputs.loads.seismic.load_factor
        Hv = thrust_plane_height_ft(geom, inputs)
        dp = lf * increment_lb(geom, inputs, p)
        c, s = direction(inputs, p)
        return [ThrustComponent("seismic increment", dp * c, SEISMIC_ARM_FRACTION * Hv, dp * s),
                *inertia_components(geom, inputs, lf)]

    def stem_loads(self, geom, inputs, p, z, plane_level, *, live):
        return [stem_shear_moment(geom, inputs, p, z)]

    def conventions(self, inputs, p, plain):
        sz, i = inputs.loads.seismic, inputs
        inc = ("Seed-Whitman 0.375 kh gamma H'^2 (limited by its authors to level backfill, a "
               "vertical wall and no wall friction)" if sz.method == "seed-whitman" else
               "Mononobe-Okabe (KAE - Ka) gamma H'^2/2, kv = 0, along the static thrust")
        return [f"seismic kh = {sz.kh:g}: increment {inc} at 0.6 H', plus kh x the weight "
                "of stem, footing and key"
                + (" and of the soil over the heel (it moves with the wall)"
                   if sz.soil_inertia and not i.stem_plane else "")
                + f" at their centroids, both x {sz.load_factor:g} "
                "(IBC 2021 1807.2.3); live surcharge and strip loads left out; required "
                f"FS {sz.fs_overturning:g} overturning, {sz.fs_sliding:g} sliding; bearing "
                "against the same allowable; stem also for 1.6 H + 1.0 E; heel and toe "
                "also for 1.2D + 1.0E + 1.6H with its own factored bearing pressure"]

    def formula(self, inputs, p, level):
        inc = ("0.375·kh·γ·h_s²" if inputs.loads.seismic.method == "seed-whitman"
               else "(KAE − Ka)·γ·h_s²/2·cos i")
        e = (f"E = {inc} at 0.6 h_s (the part above the section) + kh·(stem weight above the "
             "section)")
        return (f"; with [seismic] the larger of that and 1.6·(the same without the live "
                f"loads) + 1.0·E, {e}",
                "; with [seismic] the larger of that and 1.6·(the same without the live "
                "loads) + 1.0·E")


MODEL = Seismic()
