"""Pressure diagrams on a vertical plane: each profile function returns (force, moment about
the bottom of the plane) of one diagram on a plane ``height_ft`` tall, measured down from its
top; the moment over the force is the arm. The same functions serve the thrust plane
(stability) and the stem cut at any depth (strength).

Units: pcf, psf, ft, lb and lb-ft per foot of wall. All functions broadcast over arrays.
"""

from __future__ import annotations

import numpy as np

from .base import WATER_PCF, floats


def soil_profile(k, gamma_pcf, height_ft, water_height_ft=0.0, water_pcf=WATER_PCF,
                 gamma_sat_pcf=None):
    """Active soil pressure K * sigma_v' on a plane of height h with water ``water_height_ft``
    above its bottom (clipped to 0..h): gamma above the water, gamma_sat - gamma_w below it
    (gamma_sat = ``gamma_sat_pcf``, default gamma).

    Dry depth a = h - hw, submerged depth hw:
    F = K [g a^2/2 + g a hw + g' hw^2/2];  M = K [g a^2/2 (hw + a/3) + g a hw^2/2 + g' hw^3/6].
    """
    h = np.maximum(floats(height_ft), 0.0)
    hw = np.clip(floats(water_height_ft), 0.0, h)
    a = h - hw
    g = gamma_pcf
    gb = (gamma_pcf if gamma_sat_pcf is None else gamma_sat_pcf) - water_pcf
    f = k * (g * a * a / 2.0 + g * a * hw + gb * hw * hw / 2.0)
    m = k * (g * a * a / 2.0 * (hw + a / 3.0) + g * a * hw * hw / 2.0 + gb * hw ** 3 / 6.0)
    return f, m


def water_profile(height_ft, water_height_ft, water_pcf=WATER_PCF):
    """Hydrostatic water pressure below the level: F = gw hw^2/2 at hw/3."""
    hw = np.clip(floats(water_height_ft), 0.0, np.maximum(floats(height_ft), 0.0))
    return water_pcf * hw * hw / 2.0, water_pcf * hw ** 3 / 6.0


def uniform_profile(p_psf, height_ft):
    """A uniform pressure p over the plane: F = p h at h/2."""
    h = np.maximum(floats(height_ft), 0.0)
    return p_psf * h, p_psf * h * h / 2.0


def strip_pressure_psf(pressure_psf, offset_ft, width_ft, depth_ft):
    """Horizontal pressure at ``depth_ft`` below the loaded surface on a rigid wall from a
    strip load ``pressure_psf`` whose near edge is ``offset_ft`` from the wall:

    sigma_h = (2 q / pi) (alpha - sin alpha cos 2 delta), alpha the angle the strip subtends
    at the point and delta the angle of its bisector from the vertical; this is the elastic
    (Boussinesq) strip solution q/pi (...) doubled for a rigid, unyielding wall (Terzaghi's
    experiments; AASHTO LRFD Bridge Design Specifications 3.11.6.2, NAVFAC DM-7.02
    chapter 3 Fig. 11; from memory). Written as (2q/pi)[f(a+b) - f(a)] with
    f(x) = atan(x/z) - x z / (x^2 + z^2).
    """
    z = floats(depth_ft)

    def f(x):
        with np.errstate(divide="ignore", invalid="ignore"):
            return np.where(z > 0, np.arctan2(x, z) - x * z / (x * x + z * z),
                            np.where(x > 0, np.pi / 2.0, 0.0))

    a, b = floats(offset_ft), floats(width_ft)
    return 2.0 * pressure_psf / np.pi * (f(a + b) - f(a))


def strip_profile(pressure_psf, offset_ft, width_ft, height_ft):
    """Force and moment about the bottom of a plane of height h of :func:`strip_pressure_psf`.

    With f(x, z) = d/dz [z atan(x/z)]: F = (2q/pi) h [atan((a+b)/h) - atan(a/h)] (the closed
    form of Jarquio (1981), from memory) and int_0^h f z dz = h^2/2 atan(x/h) - x h/2
    + x^2/2 atan(h/x), so M = (2q/pi) [h G1(h) - G2(h)] differenced between x = a+b and a.
    """
    h = np.maximum(floats(height_ft), 0.0)
    a, b = floats(offset_ft), floats(width_ft)

    def g1(x):  # int_0^h f dz
        return h * np.arctan2(x, h)

    def g2(x):  # int_0^h f z dz
        return h * h / 2.0 * np.arctan2(x, h) - x * h / 2.0 + x * x / 2.0 * np.arctan2(h, x)

    c = 2.0 * pressure_psf / np.pi
    force = c * (g1(a + b) - g1(a))
    moment = c * (h * (g1(a + b) - g1(a)) - (g2(a + b) - g2(a)))
    return force, moment


def seismic_profile(total_lb, plane_height_ft, cut_depth_ft=None):
    """The seismic increment as a linear diagram on a plane of height Hp with its resultant
    ``total_lb`` at 0.6 Hp: p_top = 1.6 P/Hp, p_bottom = 0.4 P/Hp (the top four times the
    bottom gives the 0.6 Hp arm). Returns the force and moment (about the cut) of the part
    of the diagram above ``cut_depth_ft`` below the top (default: the whole plane).
    """
    Hp = floats(plane_height_ft)
    z = Hp if cut_depth_ft is None else np.clip(floats(cut_depth_ft), 0.0, Hp)
    with np.errstate(divide="ignore", invalid="ignore"):
        p1 = np.where(Hp > 0, 1.6 * total_lb / Hp, 0.0)
        p0 = np.where(Hp > 0, 0.4 * total_lb / Hp, 0.0)
        s = np.where(Hp > 0, (p1 - p0) / Hp, 0.0)
    return p1 * z - s * z * z / 2.0, p1 * z * z / 2.0 - s * z ** 3 / 6.0


def passive_resistance_lb(passive_efp_pcf, neglect_ft, bottom_depth_ft):
    """Passive force EFPp*(z2^2 - z1^2)/2 between depth z1 = neglect_ft and z2 (below the
    front grade, ft); 0 where the neglected depth reaches below z2."""
    z2 = np.asarray(bottom_depth_ft, dtype=float)
    z1 = np.minimum(np.asarray(neglect_ft, dtype=float), z2)
    return 0.5 * passive_efp_pcf * (z2 * z2 - z1 * z1)


def triangle_cut(efp_pcf, depth_ft):
    """Shear and moment at ``depth_ft`` below the top of a triangular pressure EFP*z:
    V = EFP*z^2/2, M = EFP*z^3/6."""
    z = np.maximum(np.asarray(depth_ft, dtype=float), 0.0)
    return 0.5 * efp_pcf * z * z, efp_pcf * z ** 3 / 6.0


def uniform_cut(p_psf, depth_ft):
    """Shear and moment at ``depth_ft`` below the top of a uniform pressure p:
    V = p*z, M = p*z^2/2."""
    z = np.maximum(np.asarray(depth_ft, dtype=float), 0.0)
    return p_psf * z, 0.5 * p_psf * z * z


def cantilever_shear_moment(efp_pcf, lateral_psf, depth_ft):
    """Service shear (lb) and moment (lb-ft) on a horizontal section of the stem ``depth_ft``
    below the retained grade: triangular EFP pressure plus uniform ``lateral_psf`` (Ka*q).

    V = EFP*z^2/2 + p*z;  M = EFP*z^3/6 + p*z^2/2  (DESIGN.md section 7); the level-backfill
    models' stem loads (the active soil and the surcharge) are its two terms.
    """
    vs, ms = triangle_cut(efp_pcf, depth_ft)
    vq, mq = uniform_cut(lateral_psf, depth_ft)
    return vs + vq, ms + mq
