"""Earth pressure coefficients: angles in, coefficients out (and a slope "H:V" as an angle).

All functions broadcast over arrays.
"""

from __future__ import annotations

import numpy as np

from .base import floats


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
    cb = np.cos(np.radians(floats(beta_deg)))
    cp = np.cos(np.radians(floats(phi_deg)))
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
    p, d, b, t = (np.radians(floats(v)) for v in (phi_deg, delta_deg, beta_deg, theta_deg))
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
    p, d, b, t = (np.radians(floats(v)) for v in (phi_deg, delta_deg, beta_deg, theta_deg))
    psi = np.arctan(floats(kh) / (1.0 - floats(kv)))
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
