"""Development and splices of deformed bars in tension, ACI 318-19 Chapter 25 (US units).

Vectorized: every argument may be an array (one element per bar); results broadcast. Bar
sizes are ASTM A615 numbers (``#6`` -> 6). The modification factors are arguments, with the
helpers below choosing them from the bar and its situation; each default says its source.

- :func:`straight_development_in` - l_d by Eq. 25.4.2.4a (section 25.4.2.4), >= 12 in;
- :func:`hooked_development_in` - l_dh by section 25.4.3.1, >= 8 d_b and 6 in;
- :func:`hook_extension_in`, :func:`hook_bend_diameter_in`, :func:`hook_length_in` -
  standard hook geometry, Table 25.3.1;
- :func:`lap_splice_in` - tension lap splices, section 25.5.2 (Class B = 1.3 l_d, >= 12 in);
- :func:`footing_development` - the footing bars beyond the stem face, straight or hooked.

Reference values (REFERENCES.md section 3, toolbox case [S]): #3, fy 40 ksi, f'c 3000 psi,
psi_t*psi_e = 1.7, psi_s = 0.8, (cb+Ktr)/db = 2.5 gives 11.17 in, so 12 in.
"""

from __future__ import annotations

import numpy as np

from .bars import bar_diameter_in
from .concrete import required_steel_in2

SQRT_FC_MAX_PSI = 100.0  # 25.4.1.4: sqrt(f'c) <= 100 psi


def _sqrt_fc(fc_psi):
    return np.minimum(np.sqrt(np.asarray(fc_psi, dtype=float)), SQRT_FC_MAX_PSI)


def psi_s(size):
    """Bar size factor (Table 25.4.2.5): 0.8 for No. 6 and smaller, 1.0 for No. 7 and larger."""
    return np.where(np.asarray(size) <= 6, 0.8, 1.0)


def psi_g(fy_psi):
    """Reinforcement grade factor (Table 25.4.2.5): 1.0 Grade 40/60, 1.15 Grade 80, 1.3 Grade
    100 (from memory, REFERENCES.md [M])."""
    fy = np.asarray(fy_psi, dtype=float)
    return np.where(fy <= 60000.0, 1.0, np.where(fy <= 80000.0, 1.15, 1.3))


def psi_t(top_bar):
    """Casting position factor (Table 25.4.2.5): 1.3 where more than 12 in of fresh concrete is
    placed below the bar (a top bar), else 1.0."""
    return np.where(np.asarray(top_bar, dtype=bool), 1.3, 1.0)


def confinement_term(size, cover_in, spacing_in, ktr=0.0):
    """(c_b + K_tr)/d_b, capped at 2.5 (section 25.4.2.4).

    c_b = the lesser of the cover to the bar centre and half the centre-to-centre spacing.

    Args:
        size: bar size; cover_in: clear cover to the bar, in; spacing_in: bar spacing, in;
        ktr: transverse reinforcement index K_tr, in (0 for wall and footing bars; allowed as a
            design simplification by 25.4.2.4).
    """
    db = bar_diameter_in(size)
    cb = np.minimum(np.asarray(cover_in, dtype=float) + db / 2.0,
                    np.asarray(spacing_in, dtype=float) / 2.0)
    return np.minimum((cb + ktr) / db, 2.5)


_psi_s_of, _psi_g_of = psi_s, psi_g  # the arguments below shadow these names


def straight_development_in(size, fc_psi, fy_psi, *, confinement=2.5, psi_t=1.0, psi_e=1.0,
                            psi_s=None, psi_g=None, lam=1.0, minimum_in=12.0):
    """Straight development length in tension l_d, in (ACI 318-19 Eq. 25.4.2.4a).

    l_d = (3/40) * fy / (lam sqrt(f'c)) * psi_t psi_e psi_s psi_g / ((cb + Ktr)/db) * db,
    with psi_t*psi_e <= 1.7 (25.4.2.5), sqrt(f'c) <= 100 psi (25.4.1.4), l_d >= 12 in (25.4.2.1).

    Args:
        size: bar size; fc_psi, fy_psi: materials, psi.
        confinement: (cb + Ktr)/db from :func:`confinement_term` (capped at 2.5 here too).
        psi_t: casting position (1.3 top bars, see :func:`psi_t`); psi_e: epoxy coating
            (1.0 uncoated; 1.5 or 1.2 coated, Table 25.4.2.5).
        psi_s, psi_g: size and grade factors; ``None`` picks them from ``size`` and ``fy_psi``.
        lam: lightweight-concrete factor (1.0 normal weight).
        minimum_in: the floor (12 in, 25.4.2.1).
    """
    db = bar_diameter_in(size)
    ps = _psi_s_of(size) if psi_s is None else psi_s
    pg = _psi_g_of(fy_psi) if psi_g is None else psi_g
    te = np.minimum(np.asarray(psi_t, dtype=float) * psi_e, 1.7)
    conf = np.minimum(np.asarray(confinement, dtype=float), 2.5)
    ld = 3.0 / 40.0 * np.asarray(fy_psi, dtype=float) / (lam * _sqrt_fc(fc_psi)) \
        * te * ps * pg / conf * db
    return np.maximum(ld, minimum_in)


def hook_psi_c(fc_psi):
    """Concrete strength factor for hooks (Table 25.4.3.2): f'c/15,000 + 0.6 below 6,000 psi,
    1.0 at and above (REFERENCES.md [S]/[M])."""
    fc = np.asarray(fc_psi, dtype=float)
    return np.where(fc < 6000.0, fc / 15000.0 + 0.6, 1.0)


def hook_psi_r(size, spacing_in, confined=False):
    """Confining reinforcement factor for hooks (Table 25.4.3.2): 1.0 for No. 11 and smaller
    with A_th >= 0.4 A_hs (``confined``) or centre-to-centre spacing >= 6 d_b; else 1.6."""
    size = np.asarray(size)
    ok = (size <= 11) & (np.asarray(confined, dtype=bool)
                         | (np.asarray(spacing_in, dtype=float) >= 6.0 * bar_diameter_in(size)))
    return np.where(ok, 1.0, 1.6)


def hooked_development_in(size, fc_psi, fy_psi, *, psi_e=1.0, psi_r=1.6, psi_o=1.25,
                          psi_c=None, lam=1.0):
    """Development length of a standard hook in tension l_dh, in (ACI 318-19 25.4.3.1).

    l_dh = greatest of (fy psi_e psi_r psi_o psi_c / (55 lam sqrt(f'c))) db^1.5, 8 db, 6 in.

    Args:
        size: bar size; fc_psi, fy_psi: psi.
        psi_e: epoxy (1.2 coated, 1.0 uncoated). psi_r: confining reinforcement (1.6 default,
            1.0 per :func:`hook_psi_r`). psi_o: location (1.25 default; 1.0 for No. 11 and
            smaller with side cover normal to the plane of the hook >= 6 db, or ending in a
            column/beam core with side cover >= 2.5 in). psi_c: ``None`` = :func:`hook_psi_c`.
        lam: lightweight-concrete factor.

    Reference [calc], REFERENCES.md: #5, fy 60 ksi, f'c 4000: 14.8 in with psi_r 1.6 and
    psi_o 1.25; 7.4 in with psi_r = psi_o = 1.0.
    """
    db = bar_diameter_in(size)
    pc = hook_psi_c(fc_psi) if psi_c is None else psi_c
    ldh = (np.asarray(fy_psi, dtype=float) * psi_e * psi_r * psi_o * pc
           / (55.0 * lam * _sqrt_fc(fc_psi)) * db ** 1.5)
    return np.maximum(np.maximum(ldh, 8.0 * db), 6.0)


def hook_bend_diameter_in(size):
    """Minimum inside bend diameter of a standard hook (Table 25.3.1): 6 db for No. 3 - 8,
    8 db for No. 9 - 11, 10 db for No. 14 and 18."""
    size = np.asarray(size)
    db = bar_diameter_in(size)
    return np.where(size <= 8, 6.0, np.where(size <= 11, 8.0, 10.0)) * db


def hook_extension_in(size, angle_deg=90):
    """Straight extension beyond the bend (Table 25.3.1): 12 db for a 90 deg hook; the greater
    of 4 db and 2.5 in for a 180 deg hook."""
    db = bar_diameter_in(size)
    angle = np.asarray(angle_deg)
    if not np.all(np.isin(angle, (90, 180))):
        raise ValueError("a standard hook is 90 or 180 degrees")
    return np.where(angle == 90, 12.0 * db, np.maximum(4.0 * db, 2.5))


def hook_length_in(size, angle_deg=90):
    """Bar length a standard hook adds beyond the tangent point of its bend, measured along the
    bar centreline: the bend arc plus the straight extension (for bar lists and weights).

    Arc = angle * (D/2 + db/2) with D the inside bend diameter (Table 25.3.1).
    """
    db = bar_diameter_in(size)
    radius = hook_bend_diameter_in(size) / 2.0 + db / 2.0
    return np.radians(np.asarray(angle_deg, dtype=float)) * radius + hook_extension_in(
        size, angle_deg)


def lap_splice_in(size, fc_psi, fy_psi, *, splice_class="B", **ld_kwargs):
    """Tension lap splice length, in (ACI 318-19 25.5.2): Class A 1.0 l_d, Class B 1.3 l_d,
    both >= 12 in. l_d from :func:`straight_development_in` (keyword arguments passed on),
    without the As,req/As,prov reduction (25.5.2.1). No lap splices of bars larger than No. 11
    (25.5.1.1): those give NaN.
    """
    factor = {"A": 1.0, "B": 1.3}.get(splice_class)
    if factor is None:
        raise ValueError(f"splice_class must be 'A' or 'B', got {splice_class!r}")
    ld = straight_development_in(size, fc_psi, fy_psi, **ld_kwargs)
    return np.where(np.asarray(size) <= 11, np.maximum(factor * ld, 12.0), np.nan)


def straight_development_simple_in(size, fc_psi, fy_psi, *, psi_t=1.0, psi_e=1.0, psi_g=None,
                                   lam=1.0, spacing_in=None, cover_in=None, minimum_in=12.0):
    """Straight development length in tension l_d, in, by the simplified Table 25.4.2.3
    (ACI 318-19; the table itself is from memory, REFERENCES.md [M]):

    - clear spacing >= 2 db and clear cover >= db (or >= db with minimum stirrups):
      l_d = fy psi_t psi_e psi_g / (25 lam sqrt(f'c)) db for No. 6 and smaller,
      / (20 lam sqrt(f'c)) db for No. 7 and larger;
    - other cases: 3 fy psi_t psi_e psi_g / (50 lam sqrt(f'c)) db, and 3/40 for No. 7 and up;

    psi_t psi_e <= 1.7 (25.4.2.5), sqrt(f'c) <= 100 psi (25.4.1.4), l_d >= 12 in (25.4.2.1).
    ``spacing_in`` (centre to centre) and ``cover_in`` (clear) choose the row; None takes the
    first row.
    """
    size = np.asarray(size)
    db = bar_diameter_in(size)
    pg = _psi_g_of(fy_psi) if psi_g is None else psi_g
    te = np.minimum(np.asarray(psi_t, dtype=float) * psi_e, 1.7)
    good = np.ones(np.shape(size), bool)
    if spacing_in is not None:
        good = good & (np.asarray(spacing_in, dtype=float) - db >= 2.0 * db)
    if cover_in is not None:
        good = good & (np.asarray(cover_in, dtype=float) >= db)
    small = size <= 6
    den = np.where(good, np.where(small, 25.0, 20.0), np.where(small, 50.0 / 3.0, 40.0 / 3.0))
    ld = np.asarray(fy_psi, dtype=float) * te * pg / (den * lam * _sqrt_fc(fc_psi)) * db
    return np.maximum(ld, minimum_in)


def excess_reinforcement_factor(as_required_in2, as_provided_in2):
    """As,required / As,provided for the reduction of 25.4.10.1 (between 0 and 1; 1 where the
    requirement is unknown (NaN) or the provided area is nil)."""
    req = np.asarray(as_required_in2, dtype=float)
    prov = np.asarray(as_provided_in2, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        r = np.where(prov > 0, req / prov, 1.0)
    return np.clip(np.where(np.isfinite(r), r, 1.0), 0.0, 1.0)


def reduced_straight_in(ld_in, factor, minimum_in=12.0):
    """l_d times As,req/As,prov (25.4.10.1), never below the minimum of 25.4.2.1 (12 in)."""
    return np.maximum(np.asarray(ld_in, dtype=float) * factor, minimum_in)


def reduced_hooked_in(size, ldh_equation_in, factor):
    """l_dh by the equation of 25.4.3.1(a) times As,req/As,prov (25.4.10.1), never below
    8 db and 6 in (25.4.3.1(b), (c))."""
    db = bar_diameter_in(size)
    return np.maximum(np.maximum(np.asarray(ldh_equation_in, dtype=float) * factor, 8.0 * db),
                      6.0)


def hooked_development_equation_in(size, fc_psi, fy_psi, *, psi_e=1.0, psi_r=1.6, psi_o=1.25,
                                   psi_c=None, lam=1.0):
    """The equation part of 25.4.3.1(a) alone (no minimums), in: fy psi_e psi_r psi_o psi_c
    / (55 lam sqrt(f'c)) db^1.5 (for the reduction of 25.4.10)."""
    db = bar_diameter_in(size)
    pc = hook_psi_c(fc_psi) if psi_c is None else psi_c
    return (np.asarray(fy_psi, dtype=float) * psi_e * psi_r * psi_o * pc
            / (55.0 * lam * _sqrt_fc(fc_psi)) * db ** 1.5)


def hook_vertical_in(size, angle_deg=90):
    """Out-to-out depth of a standard hook turned down (or up) from a horizontal bar, from
    the bar's outer face: D/2 + db to the end of the bend plus the 12 db tail of a 90 deg
    hook; D + 2 db for a 180 deg hook (geometry of Table 25.3.1)."""
    db = bar_diameter_in(size)
    D = hook_bend_diameter_in(size)
    angle = np.asarray(angle_deg)
    return np.where(angle == 90, D / 2.0 + db + hook_extension_in(size, 90), D + 2.0 * db)


def _a(x):
    return np.asarray(x, dtype=float)


def footing_development(size, spacing_in, as_in2, d_in, mu_lbft, thickness_in, cover_in,
                        room_in, inputs, *, top: bool, hooked=None):
    """Development of footing bars beyond the stem face (ACI 318-19 25.4; DESIGN.md 7).

    Straight: Table 25.4.2.3 (row by clear spacing >= 2 db and cover >= db), psi_t = 1.3 for
    top bars with more than 12 in of fresh concrete below them (25.4.2.5); hooked: 25.4.3.1
    with psi_r from the spacing (Table 25.4.3.2), psi_o = ``hook_psi_o``, psi_c from f'c.
    Both reduced by As,req/As,prov (25.4.10.1; As,req for Mu with phi = 0.9) and never below
    12 in (straight) or 8 db and 6 in (hooked). A bar is hooked where the straight length does
    not fit in ``room_in`` (unless ``hooked`` says which). ``inputs`` is the
    :class:`~.inputs.DesignInputs`. Returns a dict of arrays.
    """
    fc, fy = inputs.materials.fc_psi, inputs.materials.fy_psi
    size = np.asarray(size)
    db = bar_diameter_in(size)
    T = _a(thickness_in)
    below = T - _a(cover_in) - db  # fresh concrete cast below a top bar
    pt = np.where(top & (below > 12.0), 1.3, 1.0)
    req = required_steel_in2(np.maximum(_a(mu_lbft), 0.0), d_in, fc, fy)
    factor = excess_reinforcement_factor(req, as_in2)
    ld = straight_development_simple_in(size, fc, fy, psi_t=pt, spacing_in=spacing_in,
                                        cover_in=cover_in)
    ldh_eq = hooked_development_equation_in(size, fc, fy, psi_r=hook_psi_r(size, spacing_in),
                                            psi_o=inputs.criteria.hook_psi_o)
    ld_s = reduced_straight_in(ld, factor)
    ld_h = reduced_hooked_in(size, ldh_eq, factor)
    room = _a(room_in)
    hk = (ld_s > room + 1e-9) if hooked is None else np.asarray(hooked, dtype=bool)
    other = inputs.criteria.cover_toe_in if top else (2.0 if inputs.criteria.cover_heel_in is None
                                             else inputs.criteria.cover_heel_in)
    depth = T - _a(cover_in) - other  # a hook turned down (top bar) or up (bottom bar)
    angle = np.where(hook_vertical_in(size, 90) <= depth + 1e-9, 90, 180)
    return {"as_required_in2": req, "ld_straight_in": ld_s, "ldh_in": ld_h,
            "hooked": np.asarray(hk), "ld_required_in": np.where(hk, ld_h, ld_s),
            "ld_available_in": room, "hook_angle_deg": angle}
