"""Lateral earth pressure on a cantilever wall (this issue: level backfill, drained).

Structure, so that later cases are new functions and not edits everywhere:

- coefficient functions (``rankine_ka``, ``rankine_kp``; later ``coulomb_ka``,
  ``rankine_ka_sloping``, ``mononobe_okabe_kae``) take angles and return coefficients;
- :func:`earth_pressure` turns the validated soil inputs into one :class:`EarthPressure`
  (equivalent fluid pressures and Ka);
- thrust builders (``level_backfill_thrust``; later a sloping-backfill thrust with a vertical
  component, or a seismic increment at 0.6H) return :class:`ThrustComponent` tuples that
  :class:`Thrust` sums; stability only ever sees a :class:`Thrust`.

Units: pcf, psf, ft, lb and lb-ft per foot of wall. All functions broadcast over arrays.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np


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


@dataclass(frozen=True)
class EarthPressure:
    """Resolved pressures for one soil: equivalent fluid pressures (pcf) and Ka.

    ``active_efp_pcf`` = Ka * gamma; when the report gives an EFP, Ka = EFP / gamma (DESIGN.md
    section 7), so that the surcharge's lateral pressure is Ka * q. ``passive_efp_pcf`` is 0
    when passive resistance is not used.
    """

    active_efp_pcf: float
    ka: float
    passive_efp_pcf: float
    surcharge_psf: float
    basis: str  # "equivalent fluid pressure" or "Rankine, phi = .. deg"

    @property
    def surcharge_lateral_psf(self) -> float:
        """Uniform lateral pressure of the live surcharge, Ka * q."""
        return self.ka * self.surcharge_psf


def earth_pressure(inputs) -> EarthPressure:
    """The active/passive pressures of a :class:`~.section.DesignInputs` (level backfill)."""
    gamma = inputs.unit_weight_pcf
    if inputs.active_efp_pcf is not None:
        efp = float(inputs.active_efp_pcf)
        ka = efp / gamma
        basis = "equivalent fluid pressure"
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
    return EarthPressure(efp, ka, kp_efp, float(inputs.surcharge_psf), basis)


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


def level_backfill_thrust(efp_pcf, ka, surcharge_psf, height_ft) -> Thrust:
    """Active soil thrust EFP*H^2/2 at H/3 and surcharge thrust Ka*q*H at H/2.

    Triangular equivalent-fluid pressure and uniform surcharge pressure over the design height
    H (retained grade to bottom of footing); McCormac & Brown 9th ed. section 13.5.
    """
    H = np.asarray(height_ft, dtype=float)
    soil = ThrustComponent("active soil", 0.5 * efp_pcf * H * H, H / 3.0)
    sur = ThrustComponent("surcharge", ka * surcharge_psf * H, H / 2.0)
    return Thrust((soil, sur))


def design_thrust(geom, inputs, pressure: EarthPressure | None = None) -> Thrust:
    """The thrust the stability checks use for ``geom`` (level backfill; dispatch point for
    later backfill shapes and seismic increments)."""
    p = pressure or earth_pressure(inputs)
    return level_backfill_thrust(p.active_efp_pcf, p.ka, p.surcharge_psf, geom.design_height_ft)


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
