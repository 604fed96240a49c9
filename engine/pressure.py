"""Lateral earth pressure on a cantilever wall: level or sloping backfill, Rankine, Coulomb or
an equivalent fluid pressure, water behind the wall, strip surcharges and a seismic increment.

Structure (new cases are new functions, not edits everywhere):

- coefficient functions (``rankine_ka``, ``rankine_kp``, ``rankine_ka_sloping``,
  ``coulomb_ka``, ``mononobe_okabe_kae``) take angles and return coefficients;
- :func:`earth_pressure` turns the validated soil inputs into one :class:`EarthPressure`
  (coefficient, its equivalent fluid pressure and the direction of the thrust);
- profile functions give the force and moment of one pressure diagram on a vertical plane of
  a given height (``soil_profile``, ``water_profile``, ``strip_profile``,
  ``seismic_profile``); the same functions serve the heel plane (stability) and the stem
  cut at any depth (strength);
- thrust builders return :class:`ThrustComponent` tuples that :class:`Thrust` sums; stability
  only ever sees a :class:`Thrust`: :func:`design_thrust` (static) and
  :func:`seismic_thrust` (the seismic case) are the dispatch points.

Conventions (each stated in the report):

- the active thrust acts on the virtual back, the vertical plane through the heel edge, over
  H' = bottom of footing to the ground at the heel edge (H' = H for level ground); the ground
  rises at the backslope angle from where the retained grade meets the stem's back face;
- Rankine with a backslope: thrust parallel to the slope (McCormac & Brown 9th ed. 13.5);
  Coulomb: inclined at the wall friction angle, Ka for a vertical back (theta = 0) since the
  thrust acts on the vertical virtual back (meant for short heels, where it nearly coincides
  with the stem's back face); an equivalent fluid pressure acts horizontally on H';
- a uniform surcharge q on the (level or sloping) ground, per horizontal foot, acts as an
  extra height q/gamma of soil: K q over the whole plane, in the direction of the thrust;
- water: hydrostatic 62.4 pcf below the level (at most the retained grade at the stem),
  effective stress with the buoyant unit weight gamma - 62.4 (the given unit weight taken as
  the saturated one) below it;
- strip surcharges: the elastic strip solution doubled for a rigid wall, on the vertical plane
  of the stem's back face over the design height H (see :func:`strip_pressure_psf`);
- seismic increment: Seed-Whitman 0.375 kh gamma H'^2 or Mononobe-Okabe (KAE - Ka) gamma H'^2/2,
  at 0.6 H' (a linear diagram with four times the base pressure at the top), times the load
  factor, with the inertia kh W of the concrete parts at their centroids; the live surcharge
  and the strip loads are left out of the seismic case (IBC 2021 1807.2.3).

Units: pcf, psf, ft, lb and lb-ft per foot of wall. All functions broadcast over arrays.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

WATER_PCF = 62.4  # unit weight of water, common practice
SEISMIC_ARM_FRACTION = 0.6  # Seed & Whitman (1970): the increment acts at 0.6 H


def _a(x):
    return np.asarray(x, dtype=float)


def rankine_ka(phi_deg):
    """Rankine active coefficient, level backfill: Ka = tan^2(45 deg - phi/2).

    Source: Rankine (1857); McCormac & Brown 9th ed. section 13.5.

    >>> round(float(rankine_ka(30.0)), 6)
    0.333333
    """
    return np.tan(np.radians(45.0 - 0.5 * np.asarray(phi_deg, dtype=float))) ** 2


def rankine_kp(phi_deg):
    """Rankine passive coefficient, level backfill: Kp = tan^2(45 deg + phi/2) = 1/Ka."""
    return np.tan(np.radians(45.0 + 0.5 * np.asarray(phi_deg, dtype=float))) ** 2


def rankine_ka_sloping(phi_deg, beta_deg):
    """Rankine active coefficient for a backfill sloping at beta (beta <= phi):

    Ka = cos b (cos b - sqrt(cos^2 b - cos^2 phi)) / (cos b + sqrt(cos^2 b - cos^2 phi)),
    the thrust 1/2 Ka gamma H^2 acting parallel to the slope (McCormac & Brown 9th ed. 13.5).
    NaN where beta > phi.

    >>> round(float(rankine_ka_sloping(30.0, 20.0)), 4)
    0.4142
    """
    cb = np.cos(np.radians(_a(beta_deg)))
    cp = np.cos(np.radians(_a(phi_deg)))
    with np.errstate(invalid="ignore"):
        r = np.sqrt(cb * cb - cp * cp)
    return cb * (cb - r) / (cb + r)


def coulomb_ka(phi_deg, delta_deg, beta_deg=0.0, theta_deg=0.0):
    """Coulomb active coefficient (UFC 3-220-20 Eq. 4-10 form; REFERENCES.md section 5):

    Ka = cos^2(phi - th) / (cos^2 th cos(th + d) [1 + sqrt(sin(phi + d) sin(phi - b)
    / (cos(th + d) cos(th - b)))]^2); th the back from vertical, d the wall friction, b the
    backfill slope. NaN where beta > phi.

    >>> round(float(coulomb_ka(30.0, 20.0)), 4)
    0.2973
    """
    p, d, b, t = (np.radians(_a(v)) for v in (phi_deg, delta_deg, beta_deg, theta_deg))
    with np.errstate(invalid="ignore"):
        root = np.sqrt(np.sin(p + d) * np.sin(p - b) / (np.cos(t + d) * np.cos(t - b)))
    return np.cos(p - t) ** 2 / (np.cos(t) ** 2 * np.cos(t + d) * (1.0 + root) ** 2)


def mononobe_okabe_kae(phi_deg, delta_deg, kh, beta_deg=0.0, theta_deg=0.0, kv=0.0):
    """Mononobe-Okabe active seismic coefficient (UFC 3-220-20 Eqs. 4-15, 4-16 form):

    KAE = cos^2(phi - th - psi) / (cos psi cos^2 th cos(d + th + psi) [1 + sqrt(sin(phi + d)
    sin(phi - b - psi) / (cos(d + th + psi) cos(b - th)))]^2), psi = atan(kh / (1 - kv));
    NaN where phi - b - psi < 0 (the method has no solution).

    >>> round(float(mononobe_okabe_kae(30.0, 0.0, 0.2)), 4)
    0.4733
    """
    p, d, b, t = (np.radians(_a(v)) for v in (phi_deg, delta_deg, beta_deg, theta_deg))
    psi = np.arctan(_a(kh) / (1.0 - _a(kv)))
    with np.errstate(invalid="ignore"):
        root = np.sqrt(np.sin(p + d) * np.sin(p - b - psi)
                       / (np.cos(d + t + psi) * np.cos(b - t)))
    return np.cos(p - t - psi) ** 2 / (np.cos(psi) * np.cos(t) ** 2 * np.cos(d + t + psi)
                                       * (1.0 + root) ** 2)


def backslope_from_ratio(text: str) -> float:
    """The angle (deg) of a slope given as "H:V" (horizontal:vertical), e.g. "2:1" -> 26.57.

    Raises ValueError on anything else (the site and section files turn it into an
    InputError).
    """
    parts = str(text).replace(" ", "").split(":")
    try:
        h, v = (float(x) for x in parts)
    except ValueError:
        raise ValueError(f"{text!r} is not a slope 'H:V' such as \"2:1\"") from None
    if not (np.isfinite(h) and np.isfinite(v)) or h <= 0 or v < 0:
        raise ValueError(f"{text!r}: a slope 'H:V' needs H > 0 and V >= 0, e.g. \"2:1\"")
    return float(np.degrees(np.arctan2(v, h)))


@dataclass(frozen=True)
class EarthPressure:
    """Resolved pressures for one soil.

    ``ka`` is the active coefficient in the direction of the thrust (``inclination_deg``
    above the horizontal) and ``active_efp_pcf`` = Ka * gamma; when the report gives an EFP,
    Ka = EFP / gamma (DESIGN.md section 7) and the thrust is horizontal. The horizontal parts
    are ``horizontal_efp_pcf`` and ``surcharge_horizontal_psf``. ``passive_efp_pcf`` is 0 when
    passive resistance is not used.
    """

    active_efp_pcf: float
    ka: float
    passive_efp_pcf: float
    surcharge_psf: float
    basis: str  # "equivalent fluid pressure", "Rankine, phi = .. deg", "Coulomb, ..."
    inclination_deg: float = 0.0
    backslope_deg: float = 0.0

    @property
    def surcharge_lateral_psf(self) -> float:
        """Uniform pressure of the live surcharge, Ka * q (in the direction of the thrust)."""
        return self.ka * self.surcharge_psf

    @property
    def cos_inclination(self) -> float:
        return float(np.cos(np.radians(self.inclination_deg)))

    @property
    def sin_inclination(self) -> float:
        return float(np.sin(np.radians(self.inclination_deg)))

    @property
    def horizontal_efp_pcf(self) -> float:
        return self.active_efp_pcf * self.cos_inclination

    @property
    def surcharge_horizontal_psf(self) -> float:
        return self.surcharge_lateral_psf * self.cos_inclination


def earth_pressure(inputs) -> EarthPressure:
    """The active/passive pressures of a :class:`~.section.DesignInputs`."""
    gamma = inputs.unit_weight_pcf
    beta = float(inputs.backslope_deg or 0.0)
    incl = 0.0
    if inputs.active_efp_pcf is not None:
        efp = float(inputs.active_efp_pcf)
        ka = efp / gamma
        basis = "equivalent fluid pressure"
    elif inputs.active_method == "coulomb":
        if inputs.coulomb_plane == "stem":
            # the thrust on concrete: the report's wall friction applies (DESIGN.md 7)
            delta = float(inputs.wall_friction_deg)
            plane = (f"wall friction {delta:g} deg on the stem's back face (the soil over the "
                     "heel counted as retained soil, not as resisting weight)")
        else:
            # on the plane through the heel edge the interface is soil against soil: its
            # friction is the backslope angle, never a wall friction (DESIGN.md 7)
            delta = beta
            plane = (f"interface friction = backslope {beta:.4g} deg on the plane through the "
                     "heel edge (soil against soil)")
            if inputs.wall_friction_deg is not None:
                plane += (f"; the report's wall friction {inputs.wall_friction_deg:g} deg "
                          "applies only with coulomb_plane = \"stem\"")
        ka = float(coulomb_ka(inputs.friction_angle_deg, delta, beta))
        efp = ka * gamma
        incl = delta
        basis = (f"Coulomb, phi = {inputs.friction_angle_deg:g} deg, backslope {beta:.4g} "
                 f"deg, {plane}")
    elif beta > 0.0:
        ka = float(rankine_ka_sloping(inputs.friction_angle_deg, beta))
        efp = ka * gamma
        incl = beta
        basis = (f"Rankine, phi = {inputs.friction_angle_deg:g} deg, backslope {beta:.4g} deg "
                 "(thrust parallel to the slope)")
    else:
        ka = float(rankine_ka(inputs.friction_angle_deg))
        efp = ka * gamma
        basis = f"Rankine, phi = {inputs.friction_angle_deg:g} deg"
    if not inputs.use_passive:
        kp_efp = 0.0
    elif inputs.passive_from_friction_angle:
        kp_efp = float(rankine_kp(inputs.friction_angle_deg)) * gamma
    else:
        kp_efp = float(inputs.passive_efp_pcf)
    return EarthPressure(efp, ka, kp_efp, float(inputs.surcharge_psf), basis, incl, beta)


@dataclass(frozen=True)
class ThrustComponent:
    """One lateral load on the heel plane: horizontal force, its height above the bottom of
    footing, and a vertical component acting down on the heel plane (x = B)."""

    name: str
    horizontal_lb: np.ndarray
    arm_ft: np.ndarray
    vertical_lb: np.ndarray | float = 0.0


@dataclass(frozen=True)
class Thrust:
    """The lateral loads on the vertical plane through the heel edge (service, per foot)."""

    components: tuple[ThrustComponent, ...]

    @property
    def horizontal_lb(self) -> np.ndarray:
        return sum(c.horizontal_lb for c in self.components)

    @property
    def moment_lbft(self) -> np.ndarray:
        """Overturning moment about the bottom of footing (toe)."""
        return sum(c.horizontal_lb * c.arm_ft for c in self.components)

    @property
    def vertical_lb(self) -> np.ndarray:
        return sum(np.asarray(c.vertical_lb, dtype=float) for c in self.components)

    def component(self, name: str) -> ThrustComponent | None:
        for c in self.components:
            if c.name == name:
                return c
        return None


def level_backfill_thrust(efp_pcf, ka, surcharge_psf, height_ft) -> Thrust:
    """Active soil thrust EFP*H^2/2 at H/3 and surcharge thrust Ka*q*H at H/2.

    Triangular equivalent-fluid pressure and uniform surcharge pressure over the design height
    H (retained grade to bottom of footing); McCormac & Brown 9th ed. section 13.5.
    """
    H = np.asarray(height_ft, dtype=float)
    soil = ThrustComponent("active soil", 0.5 * efp_pcf * H * H, H / 3.0)
    sur = ThrustComponent("surcharge", ka * surcharge_psf * H, H / 2.0)
    return Thrust((soil, sur))


# ------------------------------------------------------------------ pressure profiles --
# Each returns (force, moment about the bottom of the plane) of one diagram on a vertical
# plane ``height_ft`` tall, measured down from its top; the moment over the force is the arm.

def soil_profile(k, gamma_pcf, height_ft, water_height_ft=0.0, water_pcf=WATER_PCF,
                 gamma_sat_pcf=None):
    """Active soil pressure K * sigma_v' on a plane of height h with water ``water_height_ft``
    above its bottom (clipped to 0..h): gamma above the water, gamma_sat - gamma_w below it
    (gamma_sat = ``gamma_sat_pcf``, default gamma).

    Dry depth a = h - hw, submerged depth hw:
    F = K [g a^2/2 + g a hw + g' hw^2/2];  M = K [g a^2/2 (hw + a/3) + g a hw^2/2 + g' hw^3/6].
    """
    h = np.maximum(_a(height_ft), 0.0)
    hw = np.clip(_a(water_height_ft), 0.0, h)
    a = h - hw
    g = gamma_pcf
    gb = (gamma_pcf if gamma_sat_pcf is None else gamma_sat_pcf) - water_pcf
    f = k * (g * a * a / 2.0 + g * a * hw + gb * hw * hw / 2.0)
    m = k * (g * a * a / 2.0 * (hw + a / 3.0) + g * a * hw * hw / 2.0 + gb * hw ** 3 / 6.0)
    return f, m


def water_profile(height_ft, water_height_ft, water_pcf=WATER_PCF):
    """Hydrostatic water pressure below the level: F = gw hw^2/2 at hw/3."""
    hw = np.clip(_a(water_height_ft), 0.0, np.maximum(_a(height_ft), 0.0))
    return water_pcf * hw * hw / 2.0, water_pcf * hw ** 3 / 6.0


def uniform_profile(p_psf, height_ft):
    """A uniform pressure p over the plane: F = p h at h/2."""
    h = np.maximum(_a(height_ft), 0.0)
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
    z = _a(depth_ft)

    def f(x):
        with np.errstate(divide="ignore", invalid="ignore"):
            return np.where(z > 0, np.arctan2(x, z) - x * z / (x * x + z * z),
                            np.where(x > 0, np.pi / 2.0, 0.0))

    a, b = _a(offset_ft), _a(width_ft)
    return 2.0 * pressure_psf / np.pi * (f(a + b) - f(a))


def strip_profile(pressure_psf, offset_ft, width_ft, height_ft):
    """Force and moment about the bottom of a plane of height h of :func:`strip_pressure_psf`.

    With f(x, z) = d/dz [z atan(x/z)]: F = (2q/pi) h [atan((a+b)/h) - atan(a/h)] (the closed
    form of Jarquio (1981), from memory) and int_0^h f z dz = h^2/2 atan(x/h) - x h/2
    + x^2/2 atan(h/x), so M = (2q/pi) [h G1(h) - G2(h)] differenced between x = a+b and a.
    """
    h = np.maximum(_a(height_ft), 0.0)
    a, b = _a(offset_ft), _a(width_ft)

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
    Hp = _a(plane_height_ft)
    z = Hp if cut_depth_ft is None else np.clip(_a(cut_depth_ft), 0.0, Hp)
    with np.errstate(divide="ignore", invalid="ignore"):
        p1 = np.where(Hp > 0, 1.6 * total_lb / Hp, 0.0)
        p0 = np.where(Hp > 0, 0.4 * total_lb / Hp, 0.0)
        s = np.where(Hp > 0, (p1 - p0) / Hp, 0.0)
    return p1 * z - s * z * z / 2.0, p1 * z * z / 2.0 - s * z ** 3 / 6.0


# ---------------------------------------------------------------------- the thrusts --
def water_height_ft(geom, inputs):
    """The water level above the bottom of footing, at most the retained grade (H); 0 when
    drained."""
    if inputs.water_level_ft is None:
        return np.zeros(geom.shape)
    return np.clip(float(inputs.water_level_ft), 0.0, geom.design_height_ft)


def _stem_face_x_at_grade(geom, inputs):
    tb, tt = geom.stem_base_in / 12.0, geom.stem_top_in / 12.0
    if inputs.batter_face == "back":
        with np.errstate(divide="ignore", invalid="ignore"):
            w = np.where(geom.stem_height_ft > 0,
                         (tb - tt) * geom.soil_height_ft / geom.stem_height_ft, 0.0)
        return geom.toe_ft + tb - w
    return geom.toe_ft + tb


def virtual_back_height_ft(geom, inputs):
    """H' = bottom of footing to the ground at the heel edge: H + (B - x_grade) tan(beta),
    x_grade where the retained grade meets the stem's back face."""
    beta = float(inputs.backslope_deg or 0.0)
    H = geom.design_height_ft
    if beta <= 0.0:
        return H
    run = geom.footing_width_ft - _stem_face_x_at_grade(geom, inputs)
    return H + np.maximum(run, 0.0) * np.tan(np.radians(beta))


def thrust_plane_x_ft(geom, inputs):
    """Where the active thrust acts, from the toe edge: the heel edge (B), or the stem's back
    face at its base with ``coulomb_plane = "stem"``; its vertical component acts there."""
    if inputs.stem_plane:
        return geom.toe_ft + geom.stem_base_in / 12.0
    return geom.footing_width_ft


def thrust_plane_height_ft(geom, inputs):
    """Height of the plane the active thrust acts on: bottom of footing to the ground over
    it (H' at the heel edge; at the stem's back face with ``coulomb_plane = "stem"``)."""
    if not inputs.stem_plane:
        return virtual_back_height_ft(geom, inputs)
    beta = float(inputs.backslope_deg or 0.0)
    H = geom.design_height_ft
    if beta <= 0.0:
        return H + 0.0 * geom.toe_ft
    run = geom.toe_ft + geom.stem_base_in / 12.0 - _stem_face_x_at_grade(geom, inputs)
    return H + np.maximum(run, 0.0) * np.tan(np.radians(beta))


def _has_extras(inputs) -> bool:
    return bool(inputs.backslope_deg) or inputs.active_method != "rankine" or bool(
        inputs.strip) or inputs.water_level_ft is not None


def design_thrust(geom, inputs, pressure: EarthPressure | None = None, *,
                  live: bool = True) -> Thrust:
    """The static thrust the stability checks use for ``geom`` (the dispatch point).

    Level, drained, no strip loads: :func:`level_backfill_thrust` on H. Otherwise the soil
    (with water) and surcharge pressures on the virtual back H', split into horizontal and
    vertical parts by the thrust direction, the hydrostatic water pressure, and the strip
    loads on the plane of the stem's back face over H. ``live = False`` leaves out the live
    surcharge and the strip loads (the seismic case).
    """
    p = pressure or earth_pressure(inputs)
    if not _has_extras(inputs):
        th = level_backfill_thrust(p.active_efp_pcf, p.ka, p.surcharge_psf,
                                   geom.design_height_ft)
        return th if live else Thrust(th.components[:1])
    Hv = thrust_plane_height_ft(geom, inputs)
    hw = water_height_ft(geom, inputs)
    c, s = p.cos_inclination, p.sin_inclination
    f, m = soil_profile(p.ka, inputs.unit_weight_pcf, Hv, hw,
                        gamma_sat_pcf=inputs.gamma_below_water_pcf)
    with np.errstate(divide="ignore", invalid="ignore"):
        comps = [ThrustComponent("active soil", f * c, np.where(f > 0, m / f, 0.0), f * s)]
    if inputs.water_level_ft is not None:
        fw, mw = water_profile(Hv, hw)
        with np.errstate(divide="ignore", invalid="ignore"):
            comps.append(ThrustComponent("water", fw, np.where(fw > 0, mw / fw, 0.0)))
    if live:
        fq, mq = uniform_profile(p.surcharge_lateral_psf, Hv)
        comps.append(ThrustComponent("surcharge", fq * c, Hv / 2.0, fq * s))
        H = geom.design_height_ft
        for i, (off, width, q) in enumerate(inputs.strip):
            fs_, ms_ = strip_profile(q, off, width, H)
            with np.errstate(divide="ignore", invalid="ignore"):
                comps.append(ThrustComponent(f"strip load {i + 1}", fs_,
                                             np.where(fs_ > 0, ms_ / fs_, 0.0)))
    return Thrust(tuple(comps))


def seismic_increment_lb(geom, inputs, pressure: EarthPressure | None = None):
    """The nominal dynamic increment Delta P_AE on the virtual back (along the thrust for
    Mononobe-Okabe, horizontal for Seed-Whitman), before the load factor.

    Seed-Whitman: 0.375 kh gamma H'^2 (UFC 3-220-20 Eq. 4-17 form); Mononobe-Okabe:
    (KAE - Ka) gamma H'^2 / 2 with kv = 0 and KAE for the same wall friction (beta for
    Rankine, the wall friction for Coulomb) so that kh -> 0 gives 0.
    """
    sz = inputs.seismic
    Hv = thrust_plane_height_ft(geom, inputs)
    g = inputs.unit_weight_pcf
    if sz.method == "seed-whitman":
        return 0.375 * sz.kh * g * Hv * Hv
    p = pressure or earth_pressure(inputs)
    kae = float(mononobe_okabe_kae(inputs.friction_angle_deg, p.inclination_deg, sz.kh,
                                   p.backslope_deg))
    return 0.5 * (kae - p.ka) * g * Hv * Hv


def seismic_direction(inputs, pressure: EarthPressure):
    """(cos, sin) of the increment's direction: horizontal for Seed-Whitman, the static
    thrust direction for Mononobe-Okabe."""
    if inputs.seismic.method == "seed-whitman":
        return 1.0, 0.0
    return pressure.cos_inclination, pressure.sin_inclination


def concrete_parts(geom, inputs):
    """Weights (lb) and centroid heights above the bottom of footing (ft) of the stem
    rectangle, stem batter triangle, footing and key (for the seismic inertia)."""
    gc = inputs.concrete_unit_weight_pcf
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
           (_stem_face_x_at_grade(geom, inputs), H))
    a2 = cy = 0.0
    for k in range(4):
        (x1, y1), (x2, y2) = pts[k], pts[(k + 1) % 4]
        cr = _a(x1) * _a(y2) - _a(x2) * _a(y1)
        a2 = a2 + cr
        cy = cy + (_a(y1) + _a(y2)) * cr
    has = (H > T) & (np.abs(a2) > 1e-14)
    with np.errstate(divide="ignore", invalid="ignore"):
        y = np.where(has, cy / (3.0 * np.where(has, a2, 1.0)), 0.0)
    w = np.where(has, inputs.unit_weight_pcf * np.abs(a2) / 2.0, 0.0)
    return (("soil over heel", w, y),)


def seismic_inertia_components(geom, inputs, factor):
    """``factor`` x kh W of each concrete part and, with ``soil_inertia``, of the soil over
    the heel and the battered face, at their centroids (horizontal, toward the front)."""
    sz = inputs.seismic
    parts = list(concrete_parts(geom, inputs))
    if sz.soil_inertia and not inputs.stem_plane:  # (stem plane: the soil is retained)
        parts += list(soil_inertia_parts(geom, inputs))
    return [ThrustComponent(f"inertia {name}", factor * sz.kh * w, y) for name, w, y in parts]


def seismic_thrust(geom, inputs, pressure: EarthPressure | None = None) -> Thrust:
    """The thrust of the seismic case: the static soil (and water) thrust without the live
    loads, plus load_factor x (Delta P_AE at 0.6 H', and kh W of each concrete part and, with
    ``soil_inertia``, of the soil over the heel at its centroid) (IBC 2021 1807.2.3: 0.7 on
    nominal earthquake loads)."""
    p = pressure or earth_pressure(inputs)
    sz = inputs.seismic
    lf = sz.load_factor
    comps = list(design_thrust(geom, inputs, p, live=False).components)
    Hv = thrust_plane_height_ft(geom, inputs)
    dp = lf * seismic_increment_lb(geom, inputs, p)
    c, s = seismic_direction(inputs, p)
    comps.append(ThrustComponent("seismic increment", dp * c, SEISMIC_ARM_FRACTION * Hv, dp * s))
    comps += seismic_inertia_components(geom, inputs, lf)
    return Thrust(tuple(comps))


def seismic_e_components(geom, inputs, pressure: EarthPressure, weights=None):
    """The earthquake load E at 1.0 for the footing's strength combination 1.2D + 1.0E +
    1.6H (ASCE 7-22 2.3.6): (horizontal force, overturning moment about the bottom of
    footing, vertical force at the heel edge, (force, moment about the stem's back face) of
    E acting directly on the heel). E = Delta P_AE at 0.6 H' (its vertical part, Mononobe-Okabe
    with an inclined thrust, down at the heel edge) plus kh W of the concrete and, with
    ``soil_inertia``, the soil over the heel (horizontal: no load on the heel itself)."""
    dp = seismic_increment_lb(geom, inputs, pressure)
    c, s = seismic_direction(inputs, pressure)
    Hv = thrust_plane_height_ft(geom, inputs)
    h = dp * c
    m = dp * c * SEISMIC_ARM_FRACTION * Hv
    for comp in seismic_inertia_components(geom, inputs, 1.0):
        h = h + comp.horizontal_lb
        m = m + comp.horizontal_lb * comp.arm_ft
    v = dp * s
    on_heel = 0.0 if inputs.stem_plane else 1.0  # (stem plane: it acts on the stem)
    return h, m, v, (v * on_heel, v * on_heel * geom.heel_ft)


def passive_resistance_lb(passive_efp_pcf, neglect_ft, bottom_depth_ft):
    """Passive force EFPp*(z2^2 - z1^2)/2 between depth z1 = neglect_ft and z2 (below the
    front grade, ft); 0 where the neglected depth reaches below z2."""
    z2 = np.asarray(bottom_depth_ft, dtype=float)
    z1 = np.minimum(np.asarray(neglect_ft, dtype=float), z2)
    return 0.5 * passive_efp_pcf * (z2 * z2 - z1 * z1)


def cantilever_shear_moment(efp_pcf, lateral_psf, depth_ft):
    """Service shear (lb) and moment (lb-ft) on a horizontal section of the stem ``depth_ft``
    below the retained grade: triangular EFP pressure plus uniform ``lateral_psf`` (Ka*q).

    V = EFP*z^2/2 + p*z;  M = EFP*z^3/6 + p*z^2/2  (DESIGN.md section 7).
    """
    z = np.maximum(np.asarray(depth_ft, dtype=float), 0.0)
    v = 0.5 * efp_pcf * z * z + lateral_psf * z
    m = efp_pcf * z ** 3 / 6.0 + 0.5 * lateral_psf * z * z
    return v, m


def stem_shear_moment(geom, inputs, pressure: EarthPressure, depth_ft, *, live=True):
    """Service horizontal shear and moment on the stem ``depth_ft`` below the retained grade
    (the pressure on the stem itself): the horizontal part of K gamma z (Rankine with a
    backslope: the Rankine pressure parallel to the slope that starts at the stem; Coulomb:
    inclined at the wall friction), effective stress and water below the level, the live
    surcharge K q, and the strip loads (``live`` = False leaves out the last two).
    """
    p = pressure
    z = np.maximum(_a(depth_ft), 0.0)
    if not _has_extras(inputs):
        v, m = cantilever_shear_moment(p.active_efp_pcf, p.surcharge_lateral_psf if live
                                       else 0.0, z)
        return v, m
    c = p.cos_inclination
    H = geom.design_height_ft
    hw_cut = water_height_ft(geom, inputs) - (H - z)  # water above the cut
    v, m = soil_profile(p.ka * c, inputs.unit_weight_pcf, z, hw_cut,
                        gamma_sat_pcf=inputs.gamma_below_water_pcf)
    if inputs.water_level_ft is not None:
        vw, mw = water_profile(z, hw_cut)
        v, m = v + vw, m + mw
    if live:
        vq, mq = uniform_profile(p.surcharge_lateral_psf * c, z)
        v, m = v + vq, m + mq
        for off, width, q in inputs.strip:
            vs, ms = strip_profile(q, off, width, z)
            v, m = v + vs, m + ms
    return v, m


def stem_seismic_shear_moment(geom, inputs, pressure: EarthPressure, depth_ft):
    """Nominal seismic shear and moment on the stem ``depth_ft`` below the retained grade:
    the increment on the stem's own height h_s (Seed-Whitman 0.375 kh gamma h_s^2 or
    (KAE - Ka) gamma h_s^2/2 horizontal part, as the same linear diagram, resultant at 0.6 h_s)
    plus the inertia kh W of the stem above the cut at its centroid (E at 1.0)."""
    sz = inputs.seismic
    p = pressure
    hs = geom.soil_height_ft
    g = inputs.unit_weight_pcf
    if sz.method == "seed-whitman":
        tot = 0.375 * sz.kh * g * hs * hs
    else:
        kae = float(mononobe_okabe_kae(inputs.friction_angle_deg, p.inclination_deg, sz.kh,
                                       p.backslope_deg))
        tot = 0.5 * (kae - p.ka) * g * hs * hs * p.cos_inclination
    z = np.clip(_a(depth_ft), 0.0, hs)
    v, m = seismic_profile(tot, hs, z)
    # stem inertia above the cut: a trapezoid of thickness t_y (cut) to t_top over L
    hst = geom.stem_height_ft
    y = hs - z  # cut above the top of footing
    L = np.maximum(hst - y, 0.0)
    t_y = geom.stem_thickness_in(y) / 12.0
    t_t = geom.stem_top_in / 12.0
    w = inputs.concrete_unit_weight_pcf * sz.kh
    v = v + w * (t_y + t_t) / 2.0 * L
    m = m + w * L * L * (t_y / 6.0 + t_t / 3.0)
    return v, m
