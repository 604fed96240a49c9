"""The live surcharge q on the (level or sloping) ground, per horizontal foot, as an extra
height q/gamma of soil: K q over the whole plane, in the direction of the thrust, at half its
height. Also states how the stem and the heel take the retained loads."""

from __future__ import annotations

import numpy as np

from ..base import ModelBase, ThrustComponent
from ..profiles import uniform_cut, uniform_profile


def level_surcharge_component(ka, surcharge_psf, height_ft) -> ThrustComponent:
    """The surcharge thrust on level backfill: Ka*q*H at H/2."""
    H = np.asarray(height_ft, dtype=float)
    return ThrustComponent("surcharge", ka * surcharge_psf * H, H / 2.0)


class Surcharge(ModelBase):
    name = "surcharge"
    order = 20

    def applies(self, inputs) -> bool:
        return True  # q = 0 loads nothing

    def level(self, inputs) -> bool:
        return True

    def components(self, geom, inputs, p, plane, *, live):
        if not live:
            return []
        if plane.level:
            return [level_surcharge_component(p.ka, p.surcharge_psf, geom.design_height_ft)]
        Hv = plane.height_ft
        fq, _ = uniform_profile(p.surcharge_lateral_psf, Hv)
        return [ThrustComponent("surcharge", fq * p.cos_inclination, Hv / 2.0,
                                fq * p.sin_inclination)]

    def stem_loads(self, geom, inputs, p, z, plane_level, *, live):
        if not live:
            return []
        if plane_level:
            return [uniform_cut(p.surcharge_lateral_psf, z)]
        return [uniform_profile(p.surcharge_lateral_psf * p.cos_inclination, z)]

    def conventions(self, inputs, p, plain):
        if plain:
            return [f"surcharge {p.surcharge_psf:g} psf: lateral Ka*q = "
                    f"{p.surcharge_lateral_psf:.1f} psf over H"]
        return [
            f"surcharge {p.surcharge_psf:g} psf per horizontal foot of the (sloping) ground, "
            f"as extra soil height: K*q = {p.surcharge_lateral_psf:.1f} psf over H' in the "
            "direction of the thrust",
            "stem: the pressure on the stem itself, K*gamma*z (horizontal part) from the "
            "retained grade at the stem, plus K*q, water and strip loads; heel: the "
            "soil polygon (total unit weight) and footing, the surcharge and the "
            "thrust's vertical component at the heel edge, by the combination's factors"
            + (", less its factored bearing pressure under the heel"
               if inputs.criteria.heel_upward_pressure
               else " (1.2 D, 1.6 L and H, no upward pressure)"),
        ]

    def formula(self, inputs, p, level):
        if level or not p.inclination_deg:
            return "Ka·q·h_s²/2", "Ka·q·z"
        return "Ka·q·cos i·h_s²/2", "Ka·q·cos i·z"


MODEL = Surcharge()
