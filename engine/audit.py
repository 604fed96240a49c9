"""An independent re-check of one section in plain Python floats (``math`` only).

Written apart from the vectorized engine and sharing none of its formula code: only the ASTM
A615 bar table and the :class:`~.inputs.DesignInputs` container. The methods differ on
purpose so that an error in one is unlikely to be repeated in the other:

- weights and arms by the shoelace formula over polygons of concrete and soil (the engine
  adds rectangles and triangles);
- Ka and Kp from (1 - sin phi)/(1 + sin phi) (the engine uses tan^2);
- bearing from the resultant's distance to the toe (middle-third rule), the toe load by
  trapezoids between the breaks of the pressure diagram;
- flexural strength by bisection on the neutral axis with the steel stress from strain
  compatibility (the engine solves it in closed form);
- the cracked section for crack control from the transformed-area equation in kd.

``audit_section(inputs, geometry, bars)`` returns ``{check name: AuditRow(demand, capacity,
passes)}`` with the names of :data:`~.checks.CHECK_NAMES` and ``KEY_CHECK_NAMES`` (0 / 0
without a key); ``audit_details`` also returns
the headline values (the keys of the ``section --json`` object).
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from functools import cache, lru_cache
from typing import NamedTuple

from .bars import A615, parse_bars

E_STEEL = 29.0e6  # psi, ACI 318-19 20.2.2.2
STRAIN_CU = 0.003  # ACI 318-19 22.2.2.1
UP_FRACTIONS = (0.25, 0.5, 0.75)  # sections up a tapered stem, ACI 318-19 13.3.6.3 (from memory)


class AuditRow(NamedTuple):
    demand: float
    capacity: float
    passes: bool


def _bar(spec):
    if spec is None:
        return None
    if isinstance(spec, str):
        return _parsed(spec)
    size, spacing = spec
    return int(size), float(spacing)


@lru_cache(maxsize=256)
def _parsed(text: str) -> tuple[int, float]:
    """(size, spacing) of bar notation, read once per distinct text."""
    b = parse_bars(text)
    return b.size, b.spacing_in


def _polygon(pts):
    """Area and centroid x of a simple polygon (shoelace), any orientation."""
    area, cx, _ = _polygon_y(pts)
    return area, cx


def _polygon_y(pts):
    """Area and centroid (x, y) of a simple polygon (shoelace); zeros when degenerate.

    The shoelace sums: 2A = sum(x_i y_(i+1) - x_(i+1) y_i), centroid = sums / (3 * 2A)
    (common practice; exact plane geometry)."""
    a2 = cx = cy = 0.0
    n = len(pts)
    for k in range(n):
        x1, y1 = pts[k]
        x2, y2 = pts[(k + 1) % n]
        cross = x1 * y2 - x2 * y1
        a2 += cross
        cx += (x1 + x2) * cross
        cy += (y1 + y2) * cross
    if abs(a2) < 1e-15:
        return 0.0, 0.0, 0.0
    return abs(a2) / 2.0, cx / (3.0 * a2), cy / (3.0 * a2)


def _clip(pts, inside, cut):
    """Sutherland-Hodgman clip of a polygon against one half-plane: ``inside(p)`` tells the
    side, ``cut(p, q)`` the crossing point of the edge p-q."""
    out = []
    n = len(pts)
    for k in range(n):
        p, q = pts[k], pts[(k + 1) % n]
        if inside(q):
            if not inside(p):
                out.append(cut(p, q))
            out.append(q)
        elif inside(p):
            out.append(cut(p, q))
    return out


def _clip_y(pts, y0, below=True):
    """The part of a polygon below (or above) the line y = y0."""
    def inside(p):
        return p[1] <= y0 if below else p[1] >= y0

    def cut(p, q):
        t = (y0 - p[1]) / (q[1] - p[1])
        return (p[0] + t * (q[0] - p[0]), y0)
    return _clip(pts, inside, cut)


def _clip_x(pts, x0, right=True):
    """The part of a polygon right (or left) of the line x = x0."""
    def cut(p, q):
        t = (x0 - p[0]) / (q[0] - p[0])
        return (x0, p[1] + t * (q[1] - p[1]))
    return _clip(pts, (lambda p: p[0] >= x0) if right else (lambda p: p[0] <= x0), cut)


# one Simpson panel per piece between the breaks: Simpson's rule is exact for polynomials of
# degree three or less, and the pressures integrated with it are linear between their breaks
# (times a lever arm: quadratic); the strip loads' stresses are not, and take 200 panels
PANELS_EXACT = 1  # Simpson's rule exact for cubics: common practice (numerical analysis)


def _simpson(fn, a, b, breaks=(), n=64):
    """Composite Simpson integral of fn over [a, b], split at the break points inside it
    (exact for piecewise cubics between the breaks)."""
    if b <= a:
        return 0.0
    pts = sorted({a, b} | {x for x in breaks if a < x < b})
    total = 0.0
    for x1, x2 in zip(pts, pts[1:], strict=False):
        h = (x2 - x1) / (2 * n)
        acc = fn(x1) + fn(x2)
        for k in range(1, 2 * n):
            acc += (4 if k % 2 else 2) * fn(x1 + k * h)
        total += acc * h / 3.0
    return total


def _wedge_k(phi_deg, delta_deg, beta_deg, kh=0.0):
    """Active coefficient 2 max P / (gamma H^2) by trial wedges on a vertical back of unit
    height: ground at beta, failure plane at rho from the horizontal, wall friction delta
    (upward on the wedge), horizontal inertia kh W toward the wall; the maximum over rho by a
    scan and golden-section refinement. Coulomb for kh = 0; Mononobe-Okabe with kh."""
    tf = math.tan(math.radians(phi_deg))
    d = math.radians(delta_deg)
    tb = math.tan(math.radians(beta_deg))

    def force(rho):
        tr = math.tan(rho)
        if tr <= tb:
            return -math.inf
        w = 0.5 / (tr - tb)
        a1, b1, c1 = math.cos(d), tf * math.cos(rho) - math.sin(rho), kh * w
        a2, b2, c2 = math.sin(d), math.cos(rho) + tf * math.sin(rho), w
        return (c1 * b2 - c2 * b1) / (a1 * b2 - a2 * b1)

    lo, hi = math.radians(beta_deg) + 1e-9, math.pi / 2 - 1e-9
    n = 720
    xs = [lo + (hi - lo) * k / n for k in range(n + 1)]
    k = max(range(n + 1), key=lambda j: force(xs[j]))
    a, b = xs[max(k - 1, 0)], xs[min(k + 1, n)]
    r = (math.sqrt(5) - 1) / 2
    c, e = b - r * (b - a), a + r * (b - a)
    fc_, fe = force(c), force(e)
    for _ in range(200):
        if fc_ > fe:
            b, e, fe = e, c, fc_
            c = b - r * (b - a)
            fc_ = force(c)
        else:
            a, c, fc_ = c, e, fe
            e = a + r * (b - a)
            fe = force(e)
        if b - a < 1e-13:
            break
    return 2.0 * max(fc_, fe, force(xs[k]))


def _strip_sigma(q, off, width, z):
    """Rigid-wall strip-load pressure (2q/pi)(alpha - sin alpha cos 2 delta) at depth z."""
    t1 = math.atan2(off, z)
    t2 = math.atan2(off + width, z)
    alpha, bis = t2 - t1, (t1 + t2) / 2.0
    return 2.0 * q / math.pi * (alpha - math.sin(alpha) * math.cos(2.0 * bis))


def _strip_breaks(strips, top):
    out = set()
    for off, width, _ in strips:
        for x in (off, off + width):
            for f in (0.125, 0.25, 0.5, 1.0, 2.0, 4.0):
                out.add(x * f)
    return [z for z in out if 0 < z < top]


WATER = 62.4  # pcf, unit weight of fresh water (common practice)


@lru_cache(maxsize=4096)  # a pure function of its numbers: sections repeat along a wall
def _whitney_strength(As, d, fc, fy, b=12.0):
    """phi*Mn (lb-ft) by bisection on c: 0.85 f'c b beta1 c = As * min(fy, Es eps_s)."""
    if As <= 0 or d <= 0:
        return 0.0, 0.9
    if fc <= 4000:
        b1 = 0.85
    elif fc >= 8000:
        b1 = 0.65
    else:
        b1 = 0.85 - 0.05 * (fc - 4000) / 1000
    lo, hi = 1e-9 * d, d
    for _ in range(200):
        c = 0.5 * (lo + hi)
        eps = STRAIN_CU * (d - c) / c
        fs = min(fy, E_STEEL * eps)
        if 0.85 * fc * b * b1 * c > As * fs:
            hi = c
        else:
            lo = c
        if hi - lo < 1e-13 * d:
            break
    c = 0.5 * (lo + hi)
    eps = STRAIN_CU * (d - c) / c
    fs = min(fy, E_STEEL * eps)
    a = b1 * c
    mn = As * fs * (d - a / 2) / 12.0  # steel force times lever arm
    ety = fy / E_STEEL
    if eps >= ety + 0.003:
        phi = 0.90
    elif eps <= ety:
        phi = 0.65
    else:
        phi = 0.65 + 0.25 * (eps - ety) / 0.003
    return phi * mn, phi


@lru_cache(maxsize=4096)  # a pure function of its numbers: sections repeat along a wall
def _shear_strength(As, d, fc, lam_s_used, b=12.0):
    """0.75 Vc, Table 22.5.5.1(c), Nu = 0."""
    if d <= 0:
        return 0.0
    root = min(math.sqrt(fc), 100.0)
    lam_s = min(1.0, math.sqrt(2.0 / (1.0 + d / 10.0))) if lam_s_used else 1.0
    vc = 8.0 * lam_s * (As / (b * d)) ** (1.0 / 3.0) * root * b * d
    return 0.75 * min(vc, 5.0 * root * b * d)


@lru_cache(maxsize=4096)  # a pure function of its numbers: sections repeat along a wall
def _ldh(size, fc, fy, spacing, psi_o):
    db = A615[size][0]
    root = min(math.sqrt(fc), 100.0)
    psi_r = 1.0 if (size <= 11 and spacing >= 6 * db) else 1.6
    psi_c = 0.6 + fc / 15000 if fc < 6000 else 1.0
    return max(fy * psi_r * psi_o * psi_c / (55 * root) * db ** 1.5, 8 * db, 6.0)


def _ratio(a, b):
    if b == 0:
        return 0.0 if a <= 0 else math.inf
    return a / b


def _cover(size, given):
    if given is not None:
        return float(given)
    return 2.0 if size >= 6 else 1.5


def _toe_load(x_bar, V, B, L):
    """Upward force and moment about x = L of the service base pressure over [0, L]."""
    if B / 3 <= x_bar <= 2 * B / 3:
        p_toe = V * (4 * B - 6 * x_bar) / B ** 2
        p_heel = V * (6 * x_bar - 2 * B) / B ** 2

        def p(x):
            return p_toe + (p_heel - p_toe) * x / B
        breaks = [0.0, L]
    elif x_bar < B / 3:
        n = 3 * x_bar  # triangle from the toe

        def p(x):
            return max(0.0, 2 * V / n * (1 - x / n))
        breaks = sorted({0.0, L, min(max(n, 0.0), L)})
    else:
        n = 3 * (B - x_bar)  # triangle from the heel

        def p(x):
            return max(0.0, 2 * V / n * (1 - (B - x) / n))
        breaks = sorted({0.0, L, min(max(B - n, 0.0), L)})
    force = moment = 0.0
    for x1, x2 in zip(breaks, breaks[1:], strict=False):
        p1, p2 = p(x1), p(x2)
        f = (p1 + p2) / 2 * (x2 - x1)
        if f > 0:
            xc = x1 + (x2 - x1) * (p1 + 2 * p2) / (3 * (p1 + p2))
            moment += f * (L - xc)
        force += f
    return force, moment


def _footing_audit(rows, name, mu, vu, size, sp, cover, T_in, fc, fy, i):
    """Flexure, shear, minimum steel (0.0018 Ag, 7.6.1.1) and spacing (3h, 18 in, 7.7.2.3)
    of a footing cantilever into ``rows``; returns (d, phi Mn, phi Vn)."""
    d = T_in - cover - A615[size][0] / 2
    As = A615[size][1] * 12 / sp
    pmn, _ = _whitney_strength(As, d, fc, fy)
    pvn = _shear_strength(As, d, fc, i.criteria.footing_shear_size_effect)
    rows[f"{name}_flexure"] = AuditRow(mu, pmn, mu <= pmn)
    rows[f"{name}_shear"] = AuditRow(vu, pvn, vu <= pvn)
    rows[f"{name}_min_steel"] = AuditRow(0.0018 * 12 * T_in, As, As >= 0.0018 * 12 * T_in)
    rows[f"{name}_spacing"] = AuditRow(sp, min(3 * T_in, 18.0), sp <= min(3 * T_in, 18.0))
    return d, pmn, pvn


def _key_audit(efp_p, neglect, emb, kd, width_in, fc):
    """The key as a plain-concrete cantilever from the bottom of the footing, loaded by
    1.6 x the passive pressure efp_p * z on its depth below the neglected depth (integrated
    numerically): ACI 318-19 14.5.2.1a Mn = 5 sqrt(f'c) S, 14.5.5.1a Vn = 4/3 sqrt(f'c) b h,
    phi 0.60 (Table 21.2.1), h = width - 2 in against soil (14.5.1.7) (from memory)."""
    y_a = max(neglect - emb, 0.0)  # the loaded part of the key, down from its root
    # ASCE 7-22 2.3.1: 1.6 on H (earth pressure), the factor the stem takes (engine/key.py)
    # the load is linear in y (its moment quadratic): one Simpson panel is exact
    vu = 1.6 * _simpson(lambda y: efp_p * (emb + y), y_a, kd, n=PANELS_EXACT)  # 1.6: 2.3.1
    mu = 1.6 * _simpson(lambda y: efp_p * (emb + y) * y, y_a, kd, n=PANELS_EXACT)  # 1.6: 2.3.1
    h = max(width_in - 2.0, 0.0)
    pmn = 0.60 * 5.0 * math.sqrt(fc) * (12.0 * h ** 2 / 6.0) / 12.0
    pvn = 0.60 * (4.0 / 3.0) * math.sqrt(fc) * 12.0 * h
    return {"key_flexure": AuditRow(mu, pmn, mu <= pmn),
            "key_shear": AuditRow(vu, pvn, vu <= pvn)}


@cache
def _names(names: str) -> tuple[str, ...]:
    """The blank-separated names of a part's hand-over (split once per distinct text)."""
    return tuple(names.split())


def _take(ctx_: dict, names: str) -> tuple:
    """The values of ``names`` (blank-separated) from the parts computed so far (None for a
    name that was only a parameter there)."""
    return tuple(map(ctx_.get, _names(names)))


def _keep(scope: dict, names: str) -> dict:
    """What a part hands on to the later ones: its names (blank-separated) as it left them."""
    return {n: scope[n] for n in _names(names) if n in scope}


def _pressures(ctx_: dict) -> dict:
    """The inputs read and the soil's pressures (coefficient, direction, thrust plane)."""
    geometry, inputs = _take(ctx_, "geometry inputs")
    i = inputs
    g = {k: float(v) for k, v in geometry.items() if v is not None}
    h_ret, emb = g["retained_height_ft"], g["embedment_ft"]
    T_in, T = g["footing_thickness_in"], g["footing_thickness_in"] / 12.0
    tt, tb = g["stem_top_in"] / 12.0, g["stem_base_in"] / 12.0
    toe, heel = g["toe_ft"], g["heel_ft"]
    kw, kd = g.get("key_width_in", 0.0) / 12.0, g.get("key_depth_in", 0.0) / 12.0
    ko = g.get("key_offset_ft", toe)
    fb = g.get("freeboard_ft", 0.5)
    gam, gc, q = i.soil.unit_weight_pcf, i.materials.concrete_unit_weight_pcf, i.loads.surcharge_psf
    g_sat = i.gamma_below_water_pcf  # total unit weight below a water level
    fc, fy = i.materials.fc_psi, i.materials.fy_psi

    # pressures; the thrust's direction ``incl`` above the horizontal
    beta = i.soil.backslope_deg or 0.0
    strips = list(i.loads.strip)
    wl = None if i.loads.water is None else i.loads.water.level_ft
    sz = i.loads.seismic
    ext = beta > 0 or i.soil.active_method == "coulomb" or bool(strips) or wl is not None
    incl = 0.0
    if i.soil.active_efp_pcf is not None:
        efp = i.soil.active_efp_pcf
        ka = efp / gam
    elif i.soil.active_method == "coulomb":
        # soil against soil on the heel plane (friction = backslope); the report's wall
        # friction only on the stem's back face
        incl = i.soil.wall_friction_deg if i.soil.coulomb_plane == "stem" else beta
        ka = _wedge_k(i.soil.friction_angle_deg, incl, beta)
        efp = ka * gam
    elif beta > 0:
        incl = beta  # Rankine with a backslope = the wedge with delta = beta on a vertical back
        ka = _wedge_k(i.soil.friction_angle_deg, beta, beta)
        efp = ka * gam
    else:
        sn = math.sin(math.radians(i.soil.friction_angle_deg))
        ka = (1 - sn) / (1 + sn)
        efp = ka * gam
    ci, si_ = math.cos(math.radians(incl)), math.sin(math.radians(incl))
    if not i.criteria.use_passive:
        efp_p = 0.0
    elif i.soil.passive_from_friction_angle:
        sn = math.sin(math.radians(i.soil.friction_angle_deg))
        efp_p = (1 + sn) / (1 - sn) * gam
    else:
        efp_p = i.soil.passive_efp_pcf
    return _keep(locals(), """T T_in beta ci efp efp_p emb ext fb fc fy g g_sat gam gc h_ret
        heel i incl ka kd ko kw q si_ sn strips sz tb toe tt wl""")


def _soil_and_concrete(ctx_: dict) -> dict:
    """The concrete and soil polygons: weights and arms from the toe edge."""
    T, beta, emb, fb, gam, gc, h_ret, heel, i = _take(ctx_, "T beta emb fb gam gc h_ret heel i")
    kd, ko, kw, q, tb, toe, tt, wl = _take(ctx_, "kd ko kw q tb toe tt wl")
    # polygons: x from the toe edge, y up from the bottom of footing
    H = h_ret + emb
    B = toe + tb + heel
    y_top = H + fb
    x_front, x_back = toe, toe + tb
    if i.criteria.batter_face == "back":
        stem_poly = [(x_front, T), (x_back, T), (x_front + tt, y_top), (x_front, y_top)]
        x_face_at_grade = x_back - (tb - tt) * (H - T) / (y_top - T)
    else:
        stem_poly = [(x_front, T), (x_back, T), (x_back, y_top), (x_back - tt, y_top)]
        x_face_at_grade = x_back
    Hv = H + (B - x_face_at_grade) * math.tan(math.radians(beta))  # ground at the heel edge
    stem_plane = i.soil.active_method == "coulomb" and i.soil.coulomb_plane == "stem"
    if stem_plane:  # the thrust on the stem's back face at its base, the heel's soil retained
        x_p = x_back
        Hp = H + (x_back - x_face_at_grade) * math.tan(math.radians(beta))
    else:
        x_p, Hp = B, Hv
    hw = 0.0 if wl is None else min(max(wl, 0.0), H)
    concrete = [stem_poly, [(0, 0), (B, 0), (B, T), (0, T)]]
    if kw > 0 and kd > 0:
        concrete.append([(ko, 0), (ko, -kd), (ko + kw, -kd), (ko + kw, 0)])
    pieces = [(gc, c) for c in concrete]
    soil_region = [(x_back, T), (B, T), (B, Hv), (x_face_at_grade, H)]
    if H > T and stem_plane:  # only the soil left of the plane (over a battered face)
        pieces.append((gam, _clip_x(soil_region, x_back, right=False)))
    elif H > T:
        pieces.append((gam, soil_region))
        if hw > T and i.gamma_below_water_pcf != gam:  # saturated below the level (total
            pieces.append((i.gamma_below_water_pcf - gam, _clip_y(soil_region, hw)))  # weights)
    if hw > 0:  # uplift: the head at the heel edge falling to zero at the toe edge
        pieces.append((-1.0, [(0, 0), (B, 0), (B, WATER * hw)]))
    if i.criteria.count_toe_soil and emb > T:
        pieces.append((gam, [(0, T), (toe, T), (toe, emb), (0, emb)]))
    V_dead = M_dead = 0.0
    for unit, poly in pieces:
        area, xc = _polygon(poly) if len(poly) >= 3 else (0.0, 0.0)
        V_dead += unit * area
        M_dead += unit * area * xc
    Wq = 0.0 if stem_plane else q * heel  # the surcharge over the heel (from the back face)
    Mq = Wq * (x_back + B) / 2
    return _keep(locals(), """B H Hp Hv M_dead Mq V_dead Wq area concrete hw pieces poly
        soil_region stem_plane stem_poly unit x_back x_face_at_grade
        x_front x_p xc y_top""")


def _lateral(ctx_: dict) -> dict:
    """The lateral loads on the thrust plane and the thrust's vertical component."""
    H, Hp, M_dead, Mq, V_dead, Wq, ci, efp = _take(ctx_, "H Hp M_dead Mq V_dead Wq ci efp")
    efp_p, emb, ext, g_sat, gam, hw, i, ka = _take(ctx_, "efp_p emb ext g_sat gam hw i ka")
    kd, kw, q, si_, strips, x_p = _take(ctx_, "kd kw q si_ strips x_p")
    # lateral, on the heel plane over H (H' with a backslope)
    def heel_plane(live):
        """(horizontal force, moment about the base, vertical force) on the heel plane."""
        def p_soil(y):
            # effective vertical stress: total weights, less the pore pressure below the level
            # (Terzaghi's effective stress; DESIGN.md section 7 "Water"), times Ka
            return ka * (gam * (Hp - y) + (g_sat - gam - WATER) * max(hw - y, 0.0))

        brk = [hw]  # integrate from the base (y = 0) to the top of the plane (y = Hp)
        # linear between the breaks (times y: quadratic), so one Simpson panel each is exact
        f = _simpson(p_soil, 0.0, Hp, brk, PANELS_EXACT)
        m = _simpson(lambda y: p_soil(y) * y, 0.0, Hp, brk, PANELS_EXACT)
        fw = _simpson(lambda y: WATER * max(hw - y, 0.0), 0.0, Hp, brk, PANELS_EXACT)
        mw = _simpson(lambda y: WATER * max(hw - y, 0.0) * y, 0.0, Hp, brk, PANELS_EXACT)
        fh, mh, fv = f * ci + fw, m * ci + mw, f * si_
        if live:
            fh += ka * q * Hp * ci
            mh += ka * q * Hp * Hp / 2 * ci
            fv += ka * q * Hp * si_
            brs = _strip_breaks(strips, H)
            for sl in strips:
                fh += _simpson(lambda z, sl=sl: _strip_sigma(sl[2], sl[0], sl[1], z), 0.0, H,
                               brs, 200)
                mh += _simpson(lambda z, sl=sl: _strip_sigma(sl[2], sl[0], sl[1], z) * (H - z),
                               0.0, H, brs, 200)
        return fh, mh, fv

    if ext:
        H_drive, M_O, V_th = heel_plane(True)
    else:
        M_O = efp * H ** 3 / 6 + ka * q * H ** 2 / 2
        H_drive = efp * H ** 2 / 2 + ka * q * H
        V_th = 0.0
    # the vertical component of the thrust acts down on the heel plane, x = B
    V_perm, M_perm = V_dead, M_dead  # without the thrust (the seismic case adds its own)
    V_dead += V_th
    M_dead += V_th * x_p
    V_res, M_res = (V_dead + Wq, M_dead + Mq) if i.criteria.surcharge_resists else (V_dead, M_dead)
    fs_ot = M_res / M_O if M_O > 0 else math.inf
    z_bot = emb + (kd if (kw > 0 and kd > 0) else 0.0)
    z_top = min(i.criteria.passive_neglect_ft, z_bot)
    P_p = efp_p * (z_bot ** 2 - z_top ** 2) / 2 if i.criteria.use_passive else 0.0
    H_res = i.soil.friction_coefficient * V_res + P_p
    fs_sl = H_res / H_drive if H_drive > 0 else math.inf
    return _keep(locals(), """H_drive H_res M_O M_dead M_perm M_res P_p V_dead V_perm V_res
        V_th fs_ot fs_sl heel_plane z_bot z_top""")


def _stability(ctx_: dict) -> dict:
    """Overturning, sliding and bearing (with and without the surcharge weight)."""
    B, M_O, M_dead, M_res, Mq, V_dead = _take(ctx_, "B M_O M_dead M_res Mq V_dead")
    V_res, Wq, emb, fs_ot, fs_sl, i = _take(ctx_, "V_res Wq emb fs_ot fs_sl i")
    # bearing cases: (V, M_R) with and without the surcharge weight
    cases = [(V_res, M_res)] if i.criteria.surcharge_resists else [(V_dead, M_dead),
                                                          (V_dead + Wq, M_dead + Mq)]
    bearing = []
    for V, M in cases:
        xb = (M - M_O) / V
        if not (0 < xb < B):
            bearing.append((V, xb, None))
            continue
        if B / 3 <= xb <= 2 * B / 3:
            qmax = max(V * (4 * B - 6 * xb) / B ** 2, V * (6 * xb - 2 * B) / B ** 2)
        else:
            qmax = 2 * V / (3 * min(xb, B - xb))
        bearing.append((V, xb, qmax))
    in_base = all(c[2] is not None for c in bearing)
    if in_base:
        gov = max(bearing, key=lambda c: c[2])
        q_max = gov[2]
    else:
        gov = next(c for c in bearing if c[2] is None)
        q_max = None
    e_gov = B / 2 - gov[1]

    rows: dict[str, AuditRow] = {}
    rows["overturning"] = AuditRow(i.criteria.fs_overturning, fs_ot,
                                   fs_ot >= i.criteria.fs_overturning and in_base)
    rows["sliding"] = AuditRow(i.criteria.fs_sliding, fs_sl, fs_sl >= i.criteria.fs_sliding)
    rows["bearing"] = AuditRow(q_max if q_max is not None else math.nan,
                               i.soil.allowable_bearing_psf,
                               q_max is not None and q_max <= i.soil.allowable_bearing_psf)
    emb_req = max(i.criteria.min_embedment_ft, i.criteria.frost_depth_ft or 0.0)
    rows["embedment"] = AuditRow(emb_req, emb, emb >= emb_req)
    return _keep(locals(), """M V bearing cases e_gov emb_req gov in_base q_max qmax rows xb""")


def _seismic(ctx_: dict) -> dict:
    """The seismic case: static soil and water thrust, no live loads, + lf (dPAE + kh W)."""
    B, H, Hp, M_perm, P_p, T, V_perm, beta = _take(ctx_, "B H Hp M_perm P_p T V_perm beta")
    ci, concrete, efp, ext, gam, gc = _take(ctx_, "ci concrete efp ext gam gc")
    heel_plane, i, incl, ka, poly, rows = _take(ctx_, "heel_plane i incl ka poly rows")
    si_, soil_region, stem_plane, sz = _take(ctx_, "si_ soil_region stem_plane sz")
    unit, x_p, xb = _take(ctx_, "unit x_p xb")
    # ---- seismic case: static soil and water thrust, no live loads, + lf (dPAE + kh Wc)
    seis = {}
    if sz is not None:
        lf, kh = sz.load_factor, sz.kh
        if sz.method == "seed-whitman":
            dpae, dc, ds = 0.375 * kh * gam * Hp * Hp, 1.0, 0.0
        else:
            kae = _wedge_k(i.soil.friction_angle_deg, incl, beta, kh)
            dpae, dc, ds = (kae - ka) * gam * Hp * Hp / 2, ci, si_
        if ext:
            fh0, mh0, fv0 = heel_plane(False)
        else:
            fh0, mh0, fv0 = efp * H ** 2 / 2, efp * H ** 3 / 6, 0.0
        fi = mi = 0.0
        moving = [(gc, c) for c in concrete]
        if sz.soil_inertia and H > T and not stem_plane:  # the soil over the heel moves
            moving.append((gam, soil_region))  # with the wall
        for unit, poly in moving:
            a_c, _, y_c = _polygon_y(poly)
            fi += kh * unit * a_c
            mi += kh * unit * a_c * y_c
        HE = fh0 + lf * dpae * dc + lf * fi
        ME = mh0 + lf * dpae * dc * 0.6 * Hp + lf * mi
        VE = V_perm + fv0 + lf * dpae * ds
        MRE = M_perm + (fv0 + lf * dpae * ds) * x_p
        fs_ot_e = MRE / ME if ME > 0 else math.inf
        fs_sl_e = (i.soil.friction_coefficient * VE + P_p) / HE if HE > 0 else math.inf
        xb = (MRE - ME) / VE if VE > 0 else math.nan
        if VE > 0 and 0 < xb < B:
            if B / 3 <= xb <= 2 * B / 3:
                q_e = max(VE * (4 * B - 6 * xb) / B ** 2, VE * (6 * xb - 2 * B) / B ** 2)
            else:
                q_e = 2 * VE / (3 * min(xb, B - xb))
        else:
            q_e = None
        rows["seismic_overturning"] = AuditRow(sz.fs_overturning, fs_ot_e,
                                               fs_ot_e >= sz.fs_overturning and q_e is not None)
        rows["seismic_sliding"] = AuditRow(sz.fs_sliding, fs_sl_e, fs_sl_e >= sz.fs_sliding)
        rows["seismic_bearing"] = AuditRow(
            q_e if q_e is not None else math.nan, i.soil.allowable_bearing_psf,
            q_e is not None and q_e <= i.soil.allowable_bearing_psf)
        seis = {"seismic_delta_pae_lb": dpae, "seismic_fs_overturning": fs_ot_e,
                "seismic_fs_sliding": fs_sl_e, "seismic_q_max_psf": q_e,
                "seismic_h_driving_lb": HE, "seismic_m_overturning_lbft": ME,
                "seismic_sum_v_lb": VE}
    return _keep(locals(), """HE ME MRE VE _ a_c dc dpae ds fh0 fi fs_ot_e fs_sl_e fv0 kae
        kh lf mh0 mi moving poly q_e seis unit xb y_c""")


def _stem(ctx_: dict) -> dict:
    """The stem: flexure, shear (at d and up the height), steel, spacing, the hook."""
    H, T, T_in, a_c, bars, beta, ci, efp, ext = _take(ctx_, "H T T_in a_c bars beta ci efp ext")
    fc, fy, g, g_sat, gam, gc, hw, i, incl, ka = _take(ctx_, "fc fy g g_sat gam gc hw i incl ka")
    q, rows, stem_poly, strips, sz, y_c = _take(ctx_, "q rows stem_poly strips sz y_c")
    y_top, = _take(ctx_, "y_top")
    # ---- stem
    s_size, s_sp = _bar(bars["stem"])
    db = A615[s_size][0]
    As = A615[s_size][1] * 12 / s_sp
    cov = _cover(s_size, i.criteria.cover_stem_in)
    d = g["stem_base_in"] - cov - db / 2
    hs = max(H - T, 0.0)

    def stem_service(zc, live=True):
        """Horizontal service (M, V) on the stem zc below the retained grade."""
        zc = max(zc, 0.0)
        if not ext:
            lat = ka * q if live else 0.0
            return efp * zc ** 3 / 6 + lat * zc * zc / 2, efp * zc * zc / 2 + lat * zc

        def p(z):
            y = H - z
            # effective stress (Terzaghi; DESIGN.md section 7 "Water") plus the water pressure
            sv = gam * z + (g_sat - gam - WATER) * max(hw - y, 0.0)
            out = ka * ci * sv + WATER * max(hw - y, 0.0)
            if live:
                out += ka * q * ci + sum(_strip_sigma(qs, o, w, z) for o, w, qs in strips)
            return out

        brk = [H - hw] + (_strip_breaks(strips, zc) if live else [])
        # without strips the pressure is piecewise linear between the breaks (the water
        # level), so one Simpson panel per piece is exact; strip stresses are not
        n = 200 if (live and strips) else PANELS_EXACT
        return (_simpson(lambda z: p(z) * (zc - z), 0.0, zc, brk, n),
                _simpson(p, 0.0, zc, brk, n))

    stem_poly_up = stem_poly

    def stem_seismic(zc):
        """Nominal seismic (M, V) at zc below the grade: the increment on h_s as a linear
        diagram with its resultant at 0.6 h_s, plus kh x the stem above the cut."""
        if hs <= 0:
            return 0.0, 0.0
        if sz.method == "seed-whitman":
            tot = 0.375 * sz.kh * gam * hs * hs
        else:
            k_ae = _wedge_k(i.soil.friction_angle_deg, incl, beta, sz.kh)
            tot = (k_ae - ka) * gam * hs * hs / 2 * ci

        def p(z):
            return tot / hs * (1.6 - 1.2 * z / hs)

        zc = min(max(zc, 0.0), hs)
        m = _simpson(lambda z: p(z) * (zc - z), 0.0, zc, n=PANELS_EXACT)  # linear p: exact
        v = _simpson(p, 0.0, zc, n=PANELS_EXACT)
        y_cut = H - zc
        a_c, _, y_c = _polygon_y(_clip_y(stem_poly_up, y_cut, below=False))
        return m + sz.kh * gc * a_c * (y_c - y_cut), v + sz.kh * gc * a_c

    def stem_mv(z):
        m, v = stem_service(z)
        mu, vu = 1.6 * m, 1.6 * v
        if sz is not None:
            m0, v0 = stem_service(z, live=False)
            me, ve = stem_seismic(z)
            mu, vu = max(mu, 1.6 * m0 + me), max(vu, 1.6 * v0 + ve)
        return mu, vu

    mu_s, _ = stem_mv(hs)
    _, vu_s = stem_mv(hs - d / 12)
    pmn_s, _ = _whitney_strength(As, d, fc, fy)
    pvn_s = _shear_strength(As, d, fc, True)
    rows["stem_flexure"] = AuditRow(mu_s, pmn_s, mu_s <= pmn_s)
    rows["stem_shear"] = AuditRow(vu_s, pvn_s, vu_s <= pvn_s)
    best_f = best_v = None
    for f in UP_FRACTIONS:
        y = f * hs
        t_in = g["stem_base_in"] - (g["stem_base_in"] - g["stem_top_in"]) * min(
            y / (y_top - T), 1.0)
        dy = t_in - cov - db / 2
        mu_y, vu_y = stem_mv(hs - y)
        pm, _ = _whitney_strength(As, dy, fc, fy)
        pv = _shear_strength(As, dy, fc, True)
        if best_f is None or _ratio(mu_y, pm) > _ratio(*best_f):
            best_f = (mu_y, pm)
        if best_v is None or _ratio(vu_y, pv) > _ratio(*best_v):
            best_v = (vu_y, pv)
    rows["stem_flexure_height"] = AuditRow(best_f[0], best_f[1], best_f[0] <= best_f[1])
    rows["stem_shear_height"] = AuditRow(best_v[0], best_v[1], best_v[0] <= best_v[1])
    as_min = 0.0018 * 12 * g["stem_base_in"]
    rows["stem_min_steel"] = AuditRow(as_min, As, As >= as_min)
    s_lim = min(3 * g["stem_base_in"], 18.0)
    if i.criteria.crack_control:
        ms = stem_service(hs)[0]
        n = E_STEEL / (57000 * math.sqrt(fc))
        # transformed section: 12 kd^2 / 2 = n As (d - kd)
        aq, bq, cq = 6.0, n * As, -n * As * d
        kd_ = (-bq + math.sqrt(bq * bq - 4 * aq * cq)) / (2 * aq)
        fs_serv = ms * 12 / (As * (d - kd_ / 3))
        if fs_serv > 0:
            s_lim = max(0.0, min(s_lim, 15 * 40000 / fs_serv - 2.5 * cov,
                                 12 * 40000 / fs_serv))
    rows["stem_spacing"] = AuditRow(s_sp, s_lim, s_sp <= s_lim)
    ldh = _ldh(s_size, fc, fy, s_sp, i.criteria.hook_psi_o)
    # the hook rests on the bottom mat: the toe bars and the longitudinal bars (when given)
    mat = A615[_bar(bars["toe"])[0]][0]
    if bars.get("longitudinal") is not None:
        mat += A615[_bar(bars["longitudinal"])[0]][0]
    room_hook = T_in - i.criteria.cover_toe_in - mat
    rows["stem_hook"] = AuditRow(ldh, room_hook, ldh <= room_hook)
    return _keep(locals(), """As _ aq as_min best_f best_v bq cov cq d db dy f fs_serv hs
        kd_ ldh mat ms mu_s mu_y n pm pmn_s pv pvn_s room_hook s_lim
        s_size s_sp stem_mv stem_poly_up stem_seismic stem_service
        t_in vu_s vu_y y""")


def _heel(ctx_: dict) -> dict:
    """The heel: a cantilever from the stem's back face, by the combinations."""
    B, H, Hp, M, M_perm, Mq, T, T_in, V = _take(ctx_, "B H Hp M M_perm Mq T T_in V")
    V_perm, Wq, a_c, bars, beta, ci = _take(ctx_, "V_perm Wq a_c bars beta ci")
    concrete, efp, ext, fc, fy, g_sat, gam = _take(ctx_, "concrete efp ext fc fy g_sat gam")
    gc, heel, heel_plane, hs, hw, i, incl = _take(ctx_, "gc heel heel_plane hs hw i incl")
    ka, poly, pv, q, rows, si_, soil_region = _take(ctx_, "ka poly pv q rows si_ soil_region")
    stem_plane, sz, unit, x_back, x_p, y = _take(ctx_, "stem_plane sz unit x_back x_p y")
    y_c, = _take(ctx_, "y_c")
    # ---- heel: cantilever from the back face
    h_size, h_sp = _bar(bars["heel"])
    t_size, t_sp = _bar(bars["toe"])
    # dead and live parts of the thrust on the heel plane: (horizontal, moment, vertical)
    if ext:
        th_all = heel_plane(True)
        th_h = heel_plane(False)
    else:
        th_h = (efp * H ** 2 / 2, efp * H ** 3 / 6, 0.0)
        th_all = (th_h[0] + ka * q * H, th_h[1] + ka * q * H * H / 2, 0.0)
    th_l = tuple(x - y for x, y in zip(th_all, th_h, strict=True))
    # the heel's own downward loads: soil right of the stem's back face, heel concrete
    if ext:
        a_h, x_h, _ = (_polygon_y(_clip_x(soil_region, x_back)) if H > T
                       else (0.0, 0.0, 0.0))
        dead_f = gam * a_h + gc * T * heel
        dead_m = gam * a_h * (x_h - x_back) + gc * T * heel ** 2 / 2
        if hw > T and H > T and g_sat != gam:  # the saturated part over the heel
            a_s, x_s, _ = _polygon_y(_clip_y(_clip_x(soil_region, x_back), hw))
            dead_f += (g_sat - gam) * a_s
            dead_m += (g_sat - gam) * a_s * (x_s - x_back)
    else:
        dead_f = (gam * hs + gc * T) * heel
        dead_m = dead_f * heel / 2

    def pressure_fn(V, M, MO):
        """q(x) of a factored combination from its resultant's distance to the toe (none
        outside the base), and the break of the diagram (where a triangle ends)."""
        if V <= 0:
            return (lambda x: 0.0), ()
        xr = (M - MO) / V
        if not (0 < xr < B):
            return (lambda x: 0.0), ()
        if B / 3 <= xr <= 2 * B / 3:
            p0 = V * (4 * B - 6 * xr) / B ** 2
            p1 = V * (6 * xr - 2 * B) / B ** 2
            return (lambda x: p0 + (p1 - p0) * x / B), ()
        if xr < B / 3:
            n3 = 3 * xr
            return (lambda x: max(0.0, 2 * V / n3 * (1 - x / n3))), (n3,)
        n3 = 3 * (B - xr)
        return (lambda x: max(0.0, 2 * V / n3 * (1 - (B - x) / n3))), (B - n3,)

    def e_loads():
        """E at 1.0 (ASCE 7-22 2.3.6): horizontal, moment about the base, vertical at the heel
        edge: the increment at 0.6 H' and kh W of the concrete (and the soil region)."""
        if sz.method == "seed-whitman":
            dp, cc, ss = 0.375 * sz.kh * gam * Hp * Hp, 1.0, 0.0
        else:
            dp = (_wedge_k(i.soil.friction_angle_deg, incl, beta, sz.kh) - ka) * gam * Hp * Hp / 2
            cc, ss = ci, si_
        fh_, mh_ = dp * cc, dp * cc * 0.6 * Hp
        mass = [(gc, c) for c in concrete]
        if sz.soil_inertia and H > T and not stem_plane:
            mass.append((gam, soil_region))
        for unit, poly in mass:
            a_c, _, y_c = _polygon_y(poly)
            fh_ += sz.kh * unit * a_c
            mh_ += sz.kh * unit * a_c * y_c
        return fh_, mh_, dp * ss

    combos = [("1.2D + 1.6H + 1.6L", 1.2, 1.6, 1.6, None), ("1.2D + 1.6H", 1.2, 1.6, 0.0, None),
              ("0.9D + 1.6H", 0.9, 1.6, 0.0, None)]
    if sz is not None:
        combos.append(("1.2D + 1.0E + 1.6H", 1.2, 1.6, 0.0, e_loads()))

    def combo_pressure(fd, fh, fl, e):
        V = fd * V_perm + fh * th_h[2] + fl * (Wq + th_l[2])
        M = fd * M_perm + (fh * th_h[2] + fl * th_l[2]) * x_p + fl * Mq
        MO = fh * th_h[1] + fl * th_l[1]
        if e is not None:
            V, M, MO = V + e[2], M + e[2] * x_p, MO + e[1]
        return pressure_fn(V, M, MO)

    if not i.criteria.heel_upward_pressure:
        pv_t = 0.0 if stem_plane else th_all[2]  # (stem plane: on the stem, not the heel)
        mu_h = 1.2 * dead_m + 1.6 * (q * heel ** 2 / 2 + pv_t * heel)
        vu_h = 1.2 * dead_f + 1.6 * (q * heel + pv_t)
        heel_combo = "1.2D + 1.6L + 1.6H, upward pressure neglected"
    else:
        mu_h = vu_h = -math.inf
        heel_combo = ""
        for name, fd, fh, fl, e in combos:
            pf, brk = combo_pressure(fd, fh, fl, e)
            up_f = _simpson(pf, x_back, B, brk, PANELS_EXACT)
            up_m = _simpson(lambda x, pf=pf: pf(x) * (x - x_back), x_back, B, brk, PANELS_EXACT)
            pv = 0.0 if stem_plane else (fh * th_h[2] + fl * th_l[2]
                                         + (e[2] if e is not None else 0.0))
            v_c = fd * dead_f + fl * q * heel + pv - up_f
            m_c = fd * dead_m + fl * q * heel ** 2 / 2 + pv * heel - up_m
            if v_c > vu_h:
                heel_combo = name
            mu_h, vu_h = max(mu_h, m_c), max(vu_h, v_c)
    cov_h = _cover(h_size, i.criteria.cover_heel_in)
    d_h, pmn_h, pvn_h = _footing_audit(rows, "heel", mu_h, vu_h, h_size, h_sp, cov_h, T_in, fc,
                                       fy, i)
    return _keep(locals(), """_ a_h a_s brk combo_pressure combos cov_h d_h dead_f dead_m e
        e_loads fd fh fl h_size h_sp heel_combo m_c mu_h name pf pmn_h
        pressure_fn pv pv_t pvn_h t_size t_sp th_all th_h th_l up_f
        up_m v_c vu_h x_h x_s""")


def _toe(ctx_: dict) -> dict:
    """The toe: a cantilever from the stem's front face, by the bearing pressure."""
    B, T, T_in, brk, combo_pressure = _take(ctx_, "B T T_in brk combo_pressure")
    combos, emb, fc, fy, gam, gc, gov, hw, i = _take(ctx_, "combos emb fc fy gam gc gov hw i")
    in_base, pf, rows, sz, t_size, t_sp = _take(ctx_, "in_base pf rows sz t_size t_sp")
    toe, = _take(ctx_, "toe")
    # ---- toe: 1.6 x service bearing pressure - 0.9 x weight over the toe; Mu at the front
    # face, Vu at d from it (7.4.3.2 by 13.2.7); with [seismic] also 1.2D + 1.0E + 1.6H
    w_toe = gc * T + (gam * max(emb - T, 0.0) if i.criteria.count_toe_soil else 0.0)
    cov_t = _cover(t_size, i.criteria.cover_toe_in)
    d_t0 = T_in - cov_t - A615[t_size][0] / 2
    lv = max(toe - d_t0 / 12, 0.0)
    if in_base:
        _, m_up = _toe_load(gov[1], gov[0], B, toe)  # the governing bearing case
        f_up, _ = _toe_load(gov[1], gov[0], B, lv)
        if hw > 0:  # uplift under the toe

            def u(x):
                return WATER * hw * x / B
            f_up += _simpson(u, 0.0, lv, n=PANELS_EXACT)
            m_up += _simpson(lambda x: u(x) * (toe - x), 0.0, toe, n=PANELS_EXACT)
        mu_t = 1.6 * m_up - 0.9 * w_toe * toe ** 2 / 2
        vu_t = 1.6 * f_up - 0.9 * w_toe * lv
    else:
        mu_t = vu_t = math.nan
    if sz is not None:
        pf, brk = combo_pressure(1.2, 1.6, 0.0, combos[-1][4])
        m_e = (_simpson(lambda x: pf(x) * (toe - x), 0.0, toe, brk, PANELS_EXACT)
               - 1.2 * w_toe * toe ** 2 / 2)
        v_e = _simpson(pf, 0.0, lv, brk, PANELS_EXACT) - 1.2 * w_toe * lv
        mu_t = max(mu_t, m_e) if not math.isnan(mu_t) else math.nan  # static case outside
        vu_t = max(vu_t, v_e) if not math.isnan(vu_t) else math.nan  # the base: no number
    d_t, pmn_t, pvn_t = _footing_audit(rows, "toe", mu_t, vu_t, t_size, t_sp, cov_t, T_in, fc,
                                       fy, i)
    rows["toe_depth"] = AuditRow(6.0, d_t, d_t >= 6.0)
    return _keep(locals(), """_ brk cov_t d_t d_t0 f_up lv m_e m_up mu_t pf pmn_t pvn_t u
        v_e vu_t w_toe""")


def _development(ctx_: dict) -> dict:
    """The footing bars' development, the key, the horizontal and longitudinal bars."""
    T_in, aq, bars, cov_h, cov_t, d_h, d_t = _take(ctx_, "T_in aq bars cov_h cov_t d_h d_t")
    db, efp_p, emb, fc, fy, g, h_size, h_sp = _take(ctx_, "db efp_p emb fc fy g h_size h_sp")
    heel, i, kd, kw, mu_h, mu_t, n, rows = _take(ctx_, "heel i kd kw mu_h mu_t n rows")
    t_size, t_sp, toe = _take(ctx_, "t_size t_sp toe")
    # ---- development of the footing bars beyond the stem faces (25.4.2.3, 25.4.3.1, 25.4.10)
    def develop(size, sp, mu, d_, cover, room, top, given):
        db = A615[size][0]
        As_p = A615[size][1] * 12 / sp
        # As,req for Mu at phi = 0.9: 0.9 fy As (d - As fy / (1.7 f'c b)) = 12 Mu, the root
        # of a quadratic in As (the engine solves for the block depth instead)
        mu_in = max(mu, 0.0) * 12 if not math.isnan(mu) else math.nan
        aq = 0.9 * fy * fy / (1.7 * fc * 12)
        disc = (0.9 * fy * d_) ** 2 - 4 * aq * mu_in if not math.isnan(mu_in) else -1.0
        as_req = (0.9 * fy * d_ - math.sqrt(disc)) / (2 * aq) if disc >= 0 else math.nan
        ratio = as_req / As_p if (As_p > 0 and not math.isnan(as_req)) else 1.0
        ratio = min(max(ratio, 0.0), 1.0)
        root = min(math.sqrt(fc), 100.0)
        psi_t = 1.3 if (top and T_in - cover - db > 12.0) else 1.0
        psi_g = 1.0 if fy <= 60000 else (1.15 if fy <= 80000 else 1.3)
        roomy = (sp - db >= 2 * db) and (cover >= db)
        k = (25.0 if roomy else 50.0 / 3.0) if size <= 6 else (20.0 if roomy else 40.0 / 3.0)
        ld = max(fy * min(psi_t, 1.7) * psi_g / (k * root) * db, 12.0)
        ld_s = max(ld * ratio, 12.0)
        psi_r = 1.0 if (size <= 11 and sp >= 6 * db) else 1.6
        psi_c = 0.6 + fc / 15000 if fc < 6000 else 1.0
        ldh_eq = fy * psi_r * i.criteria.hook_psi_o * psi_c / (55 * root) * db ** 1.5
        ld_h = max(ldh_eq * ratio, 8 * db, 6.0)
        hooked = (ld_s > room + 1e-9) if given is None else bool(given)
        return (ld_h if hooked else ld_s), hooked

    room_h = g["stem_base_in"] + 12 * toe - 3.0
    room_t = g["stem_base_in"] + 12 * heel - 3.0
    need_h, hooked_h = develop(h_size, h_sp, mu_h, d_h, cov_h, room_h, True,
                               bars.get("heel_hooked"))
    need_t, hooked_t = develop(t_size, t_sp, mu_t, d_t, cov_t, room_t, False,
                               bars.get("toe_hooked"))
    rows["heel_development"] = AuditRow(need_h, room_h, need_h <= room_h)
    rows["toe_development"] = AuditRow(need_t, room_t, need_t <= room_t)
    if kw > 0 and kd > 0:
        rows.update(_key_audit(efp_p, i.criteria.passive_neglect_ft, emb, kd, kw * 12.0, fc))
    else:  # no key: nothing to carry (the engine's rows, where a batch has them, are 0 / 0)
        rows.update({n: AuditRow(0.0, 0.0, True) for n in ("key_flexure", "key_shear")})

    hz = _bar(bars.get("horizontal"))
    if hz is not None:
        size, sp = hz
        rho = 0.0020 if (size <= 5 and fy >= 60000) else 0.0025
        need = rho * 12 * (g["stem_top_in"] + g["stem_base_in"]) / 2
        have = bars.get("horizontal_layers", 2) * A615[size][1] * 12 / sp
        rows["stem_horizontal_steel"] = AuditRow(need, have, have >= need)
        lim = min(3 * g["stem_top_in"], 18.0)
        rows["stem_horizontal_spacing"] = AuditRow(sp, lim, sp <= lim)
    lg = _bar(bars.get("longitudinal"))
    if lg is not None:
        size, sp = lg
        need = 0.0018 * 12 * T_in
        have = bars.get("longitudinal_layers", 2) * A615[size][1] * 12 / sp
        rows["footing_longitudinal_steel"] = AuditRow(need, have, have >= need)
        lim = min(5 * T_in, 18.0)
        rows["footing_longitudinal_spacing"] = AuditRow(sp, lim, sp <= lim)
    return _keep(locals(), """develop have hooked_h hooked_t hz lg lim need need_h need_t
        rho room_h room_t size sp""")


def audit_details(inputs, geometry: Mapping[str, float], bars: Mapping[str, object]):
    """The checks of one section and its headline values, independently of the engine.

    Args:
        inputs: a :class:`~.inputs.DesignInputs`.
        geometry: the ``[geometry]`` keys as floats (key and freeboard keys optional).
        bars: ``{"stem": "#6@12" or (size, spacing_in), "heel": ..., "toe": ...}``, optionally
            ``"horizontal"``, ``"horizontal_layers"``, ``"longitudinal"``,
            ``"longitudinal_layers"``.

    Returns:
        (rows, values): ``rows`` maps check names to AuditRow; ``values`` holds
        footing_width_ft, m_overturning_lbft, m_resisting_lbft, fs_overturning, h_driving_lb,
        h_resisting_lb, fs_sliding, q_max_psf (None outside the base), eccentricity_ft, and
        stem_/heel_/toe_ mu_lbft, phi_mn_lbft, vu_lb, phi_vn_lb, d_in.
    """
    ctx_ = {"inputs": inputs, "geometry": geometry, "bars": bars}
    for part in (_pressures, _soil_and_concrete, _lateral, _stability, _seismic, _stem, _heel,
                 _toe, _development):
        ctx_.update(part(ctx_))
    B, H_drive, H_res, Hv, M_O, M_res = _take(ctx_, "B H_drive H_res Hv M_O M_res")
    V_res, d, d_h, d_t, e_gov, fs_ot, fs_sl = _take(ctx_, "V_res d d_h d_t e_gov fs_ot fs_sl")
    heel_combo, hooked_h, hooked_t, ka = _take(ctx_, "heel_combo hooked_h hooked_t ka")
    mu_h, mu_s, mu_t, pmn_h, pmn_s, pmn_t = _take(ctx_, "mu_h mu_s mu_t pmn_h pmn_s pmn_t")
    pvn_h, pvn_s, pvn_t, q_max, rows, seis = _take(ctx_, "pvn_h pvn_s pvn_t q_max rows seis")
    vu_h, vu_s, vu_t = _take(ctx_, "vu_h vu_s vu_t")
    values = {
        "footing_width_ft": B, "m_overturning_lbft": M_O, "m_resisting_lbft": M_res,
        "fs_overturning": fs_ot, "h_driving_lb": H_drive, "h_resisting_lb": H_res,
        "fs_sliding": fs_sl, "q_max_psf": q_max, "eccentricity_ft": e_gov,
        "stem_mu_lbft": mu_s, "stem_phi_mn_lbft": pmn_s, "stem_vu_lb": vu_s,
        "stem_phi_vn_lb": pvn_s, "stem_d_in": d,
        "heel_mu_lbft": mu_h, "heel_phi_mn_lbft": pmn_h, "heel_vu_lb": vu_h,
        "heel_phi_vn_lb": pvn_h, "heel_d_in": d_h,
        "toe_mu_lbft": mu_t, "toe_phi_mn_lbft": pmn_t, "toe_vu_lb": vu_t,
        "toe_phi_vn_lb": pvn_t, "toe_d_in": d_t,
        "virtual_back_height_ft": Hv, "ka": ka, "sum_v_lb": V_res, **seis,
        "heel_combination": heel_combo, "heel_hooked": hooked_h, "toe_hooked": hooked_t,
    }
    return rows, values


def audit_section(inputs, geometry: Mapping[str, float],
                  bars: Mapping[str, object]) -> dict[str, AuditRow]:
    """Every check of one section, independently: ``{name: (demand, capacity, passes)}``."""
    return audit_details(inputs, geometry, bars)[0]
