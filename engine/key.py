"""The shear key's own strength: a plain-concrete cantilever below the footing.

The key (``SectionGeometry.key_*``) hangs below the bottom of the footing and takes the
passive pressure on its front face over its depth, the part of the sliding resistance that
:func:`~.stability.stability` counts below the footing (passive from ``passive_neglect_ft``
below the front grade to the bottom of the key, DESIGN.md section 7). It is checked as a
cantilever fixed at the bottom of the footing:

- load: the passive pressure EFPp * z (z below the front grade) between
  max(embedment, passive_neglect_ft) and embedment + key depth, factored 1.6 (the factor the
  stem takes for lateral earth pressure, ASCE 7-22 2.3.1 H; conservative for a pressure that
  resists, which could be taken at 0.9);
- strength: plain concrete, ACI 318-19 chapter 14 (the stem's bars are not counted in the
  key): flexure Mn = 5 lambda sqrt(f'c) Sm (14.5.2.1a, tension governs), one-way shear
  Vn = (4/3) lambda sqrt(f'c) b h (14.5.5.1a), phi = 0.60 (Table 21.2.1(g)), with h the key
  width less 2 in, as the key is cast against the soil of its trench (14.5.1.7); lambda = 1
  (normal-weight concrete). Clause numbers and formulas from memory of ACI 318-19.

Where a section has no key, demand and capacity are 0 (the rows pass with ratio 0).

Limits: ACI 318-19 14.1.4 restricts plain concrete in structures assigned to Seismic Design
Category D, E or F (from memory): there the engineer confirms a plain key is permitted or
reinforces it (extending the stem bars into it, which this check does not count). Only the
key under the stem is modelled (see the sizing notes in DEVELOPERS.md).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .pressure import EarthPressure
from .section import DesignInputs, SectionGeometry

PHI_PLAIN = 0.60  # ACI 318-19 Table 21.2.1(g), plain concrete (from memory)
LOAD_FACTOR = 1.6  # ASCE 7-22 2.3.1, H (as the stem's lateral earth pressure)
CAST_AGAINST_SOIL_IN = 2.0  # ACI 318-19 14.5.1.7: h taken 2 in less (from memory)


@dataclass(frozen=True)
class KeyResult:
    """Factored demand and plain-concrete design strength of each key, per ft of wall."""

    passive_lb: np.ndarray  # service passive force on the key's front face
    mu_lbft: np.ndarray  # at the bottom of the footing
    phi_mn_lbft: np.ndarray
    vu_lb: np.ndarray
    phi_vn_lb: np.ndarray
    h_in: np.ndarray  # the thickness the strength is computed with (width less 2 in)


def key_passive(efp_pcf, neglect_ft, embedment_ft, key_depth_ft):
    """(force lb, moment lb-ft about the key's root) of the passive pressure EFPp*z on the key,
    z from za = max(embedment, neglect) to zb = embedment + key depth (0 where za >= zb):
    P = EFPp (zb^2 - za^2) / 2, M = EFPp [z^3/3 - e z^2/2] from za to zb (e = embedment)."""
    e = np.asarray(embedment_ft, float)
    zb = e + np.asarray(key_depth_ft, float)
    za = np.minimum(np.maximum(e, np.asarray(neglect_ft, float)), zb)
    force = 0.5 * efp_pcf * (zb * zb - za * za)
    moment = efp_pcf * ((zb ** 3 - za ** 3) / 3.0 - e * (zb * zb - za * za) / 2.0)
    return force, moment


def key_strength(geom: SectionGeometry, inputs: DesignInputs,
                 pressure: EarthPressure) -> KeyResult:
    """Flexure and shear of each section's key at the bottom of the footing (module notes)."""
    has = geom.has_key
    kd_ft = np.where(has, geom.key_depth_in / 12.0, 0.0)
    efp = pressure.passive_efp_pcf if inputs.criteria.use_passive else 0.0
    force, moment = key_passive(efp, inputs.criteria.passive_neglect_ft, geom.embedment_ft, kd_ft)
    h = np.where(has, np.maximum(geom.key_width_in - CAST_AGAINST_SOIL_IN, 0.0), 0.0)
    root = np.sqrt(inputs.materials.fc_psi)
    sm = 12.0 * h * h / 6.0  # in^3 per ft of wall
    phi_mn = PHI_PLAIN * 5.0 * root * sm / 12.0  # 14.5.2.1a, lb-ft
    phi_vn = PHI_PLAIN * 4.0 / 3.0 * root * 12.0 * h  # 14.5.5.1a, lb
    return KeyResult(passive_lb=np.where(has, force, 0.0),
                     mu_lbft=np.where(has, LOAD_FACTOR * moment, 0.0), phi_mn_lbft=phi_mn,
                     vu_lb=np.where(has, LOAD_FACTOR * force, 0.0), phi_vn_lb=phi_vn, h_in=h)


def key_passes(geom: SectionGeometry, inputs: DesignInputs, pressure: EarthPressure):
    """Where the key (if any) holds in flexure and shear (ratio <= 1, as the check rows)."""
    r = key_strength(geom, inputs, pressure)
    with np.errstate(invalid="ignore"):
        return ((r.mu_lbft <= r.phi_mn_lbft * (1.0 + 1e-12))
                & (r.vu_lb <= r.phi_vn_lb * (1.0 + 1e-12)))
