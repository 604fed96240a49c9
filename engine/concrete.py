"""ACI 318-19 strength of a one-foot strip of reinforced concrete (b = 12 in), vectorized:
flexure, one-way shear, the least and largest steel, spacing and crack control, the wall and
shrinkage steel, cover. The members (stem, heel, toe) are ``engine/strength.py``.

Flexure: Whitney block, 0.85 f'c over a = beta1 c (22.2.2), strain compatibility with
eps_cu = 0.003 (the steel stress is Es*eps_s where the bars do not yield), phi from the net
tensile strain (Table 21.2.2). Shear: Table 22.5.5.1 row (c) (no shear reinforcement,
A_v < A_v,min), lambda_s by Eq. 22.5.5.1.3.

How sure the clause texts are: see ``engine/strength.py`` (REFERENCES.md section 3).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

ES_PSI = 29_000_000.0  # 20.2.2.2
EPS_CU = 0.003  # 22.2.2.1
PHI_SHEAR = 0.75  # Table 21.2.1
B_IN = 12.0  # one foot of wall


def _a(x):
    return np.asarray(x, dtype=float)


# ---------------------------------------------------------------- section-level helpers --
def beta1(fc_psi):
    """Stress-block depth factor (Table 22.2.2.4.3): 0.85 to 4000 psi, -0.05 per 1000 psi,
    0.65 from 8000 psi."""
    fc = _a(fc_psi)
    return np.clip(0.85 - 0.05 * (fc - 4000.0) / 1000.0, 0.65, 0.85)


def phi_flexure(eps_t, fy_psi):
    """Strength reduction factor from the net tensile strain (Table 21.2.2, 318-19): 0.65 at
    eps_t <= eps_ty, 0.90 at eps_t >= eps_ty + 0.003, linear between (other than spirals)."""
    eps_ty = _a(fy_psi) / ES_PSI
    return np.clip(0.65 + 0.25 * (_a(eps_t) - eps_ty) / 0.003, 0.65, 0.90)


@dataclass(frozen=True)
class Flexure:
    """Flexural strength of a singly reinforced rectangle."""

    phi_mn_lbft: np.ndarray
    mn_lbft: np.ndarray
    phi: np.ndarray
    eps_t: np.ndarray
    c_in: np.ndarray
    a_in: np.ndarray


def flexural_strength(as_in2, d_in, fc_psi, fy_psi, b_in=B_IN) -> Flexure:
    """phi*Mn of a singly reinforced rectangle, lb-ft (ACI 318-19 22.2, Table 21.2.2).

    Equilibrium 0.85 f'c b beta1 c = As fs with fs = min(fy, Es eps_s): first with the steel
    yielding; where eps_s < eps_ty the quadratic 0.85 f'c b beta1 c^2 + As Es eps_cu c
    - As Es eps_cu d = 0 gives c (steel elastic).
    """
    As, d, fc, fy = _a(as_in2), _a(d_in), _a(fc_psi), _a(fy_psi)
    b1 = beta1(fc)
    k = 0.85 * fc * b_in * b1
    with np.errstate(divide="ignore", invalid="ignore"):
        c = As * fy / k
        eps = EPS_CU * (d - c) / c
        elastic = eps < fy / ES_PSI
        m = As * ES_PSI * EPS_CU
        c_el = (-m + np.sqrt(m * m + 4.0 * k * m * d)) / (2.0 * k)
        c = np.where(elastic, c_el, c)
        eps = EPS_CU * (d - c) / c
    a = b1 * c
    mn = 0.85 * fc * b_in * a * (d - a / 2.0) / 12.0
    phi = phi_flexure(eps, fy)
    return Flexure(phi * mn, mn, phi, eps, c, a)


def size_effect_factor(d_in):
    """lambda_s = sqrt(2 / (1 + d/10)) <= 1.0, d in inches (Eq. 22.5.5.1.3)."""
    return np.minimum(np.sqrt(2.0 / (1.0 + _a(d_in) / 10.0)), 1.0)


def one_way_shear_strength(as_in2, d_in, fc_psi, b_in=B_IN, *, size_effect=True, lam=1.0):
    """phi*Vc, lb, of a member without shear reinforcement (Table 22.5.5.1 row (c), Nu = 0):
    Vc = 8 lambda_s lam rho_w^(1/3) sqrt(f'c) b d <= 5 lam sqrt(f'c) b d (22.5.5.1.1), with
    sqrt(f'c) <= 100 psi (22.5.3.1) and phi = 0.75 (Table 21.2.1).

    Args:
        as_in2: flexural tension steel in the width b, in^2; d_in: effective depth, in.
        size_effect: apply lambda_s (False where 13.2.6.2 permits neglecting it).
    """
    As, d = _a(as_in2), _a(d_in)
    sq = np.minimum(np.sqrt(_a(fc_psi)), 100.0)
    with np.errstate(divide="ignore", invalid="ignore"):
        rho = As / (b_in * d)
    ls = size_effect_factor(d) if size_effect else 1.0
    vc = 8.0 * ls * lam * np.cbrt(rho) * sq * b_in * d
    vc = np.minimum(vc, 5.0 * lam * sq * b_in * d)
    return PHI_SHEAR * vc


def required_steel_in2(mu_lbft, d_in, fc_psi, fy_psi, b_in=B_IN, phi=0.9):
    """Steel area for ``mu_lbft`` with the Whitney block, assuming yield and ``phi`` (sizing
    aid; NaN where the section cannot carry it). Check the result with flexural_strength."""
    mu = _a(mu_lbft) * 12.0 / phi
    fc, fy, d = _a(fc_psi), _a(fy_psi), _a(d_in)
    k = 0.85 * fc * b_in
    with np.errstate(invalid="ignore"):
        a = d - np.sqrt(d * d - 2.0 * mu / k)
    return k * a / fy


def cover_in(size, override=None):
    """Clear cover to bars formed and exposed to earth or weather (Table 20.5.1.3.1): 2 in for
    No. 6 - 18, 1.5 in for No. 5 and smaller; ``override`` (a criteria option) replaces it."""
    if override is not None:
        return np.full(np.shape(size), float(override))
    return np.where(np.asarray(size) >= 6, 2.0, 1.5)


def min_flexural_steel_in2(thickness_in, b_in=B_IN):
    """As,min = 0.0018 Ag of a one-way slab (7.6.1.1, 318-19 [S]); also used for the footing
    (13.3.2.1 routes one-way shallow foundations to Ch. 7)."""
    return 0.0018 * b_in * _a(thickness_in)


def max_flexural_spacing_in(thickness_in):
    """Maximum spacing of flexural bars in a slab: the lesser of 3h and 18 in (7.7.2.3)."""
    return np.minimum(3.0 * _a(thickness_in), 18.0)


def service_steel_stress_psi(ms_lbft, as_in2, d_in, fc_psi, b_in=B_IN):
    """Bar stress under the service moment, cracked elastic section, psi (for 24.3.2).

    n = Es/Ec with Ec = 57,000 sqrt(f'c) (19.2.2.1(b), normal-weight concrete);
    k = sqrt(2 rho n + (rho n)^2) - rho n; fs = Ms / (As (d - kd/3)).
    """
    As, d = _a(as_in2), _a(d_in)
    n = ES_PSI / (57000.0 * np.sqrt(_a(fc_psi)))
    with np.errstate(divide="ignore", invalid="ignore"):
        rn = As / (b_in * d) * n
        k = np.sqrt(2.0 * rn + rn * rn) - rn
        return _a(ms_lbft) * 12.0 / (As * d * (1.0 - k / 3.0))


def crack_control_spacing_in(fs_psi, clear_cover_in):
    """Maximum bar spacing for crack control (24.3.2, Table 24.3.2; from memory):
    s = 15 (40,000/fs) - 2.5 cc <= 12 (40,000/fs), >= 0; infinite where fs = 0."""
    fs = _a(fs_psi)
    with np.errstate(divide="ignore"):
        r = 40000.0 / fs
    return np.maximum(np.minimum(15.0 * r - 2.5 * _a(clear_cover_in), 12.0 * r), 0.0)


def wall_horizontal_min_in2(thickness_in, size, fy_psi, b_in=B_IN):
    """Minimum horizontal (transverse) wall steel per foot of height, Table 11.6.1 (via
    11.1.6 for cantilever retaining walls; [S]): rho_t = 0.0020 for No. 5 and smaller with
    fy >= 60 ksi, else 0.0025, of b times the thickness given (use the average thickness)."""
    rho = np.where((np.asarray(size) <= 5) & (_a(fy_psi) >= 60000.0), 0.0020, 0.0025)
    return rho * b_in * _a(thickness_in)


def shrinkage_steel_in2(thickness_in, b_in=B_IN):
    """Shrinkage and temperature steel, 0.0018 Ag (24.4.3.2, 318-19 [S])."""
    return 0.0018 * b_in * _a(thickness_in)


def shrinkage_spacing_in(thickness_in):
    """Maximum spacing of shrinkage and temperature bars: lesser of 5h and 18 in (24.4.3.3)."""
    return np.minimum(5.0 * _a(thickness_in), 18.0)
