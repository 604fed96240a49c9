"""What the active models (EFP, Rankine, backslope, Coulomb) share: the soil's own load on
the thrust plane and on the stem, once the model has given its coefficient and direction.

Level backfill (every model in use level): EFP H^2/2 at H/3 on the design height H
(McCormac & Brown 9th ed. section 13.5). Otherwise K sigma_v' on the thrust plane H' (effective
stress below the water level, the soil there at ``gamma_below_water_pcf``), split into
horizontal and vertical parts by the thrust direction.
"""

from __future__ import annotations

import numpy as np

from .base import ModelBase, ThrustComponent, arm
from .planes import water_height_ft
from .profiles import soil_profile, triangle_cut


def level_soil_component(efp_pcf, height_ft) -> ThrustComponent:
    """The active soil thrust on level backfill: EFP*H^2/2 at H/3 (McCormac & Brown 9th ed.
    section 13.5)."""
    H = np.asarray(height_ft, dtype=float)
    return ThrustComponent("active soil", 0.5 * efp_pcf * H * H, H / 3.0)


class ActiveSoil(ModelBase):
    """An active model: subclasses give ``pressure`` (coefficient, EFP, direction, basis) and
    their formula terms; the soil load and its conventions are common."""

    active = True
    symbol = ""  # how the formula names the thrust direction ("cos β", "cos δ"), "" if none

    def applies(self, inputs) -> bool:
        """A coefficient from the friction angle by the model's ``active_method``."""
        return inputs.soil.active_efp_pcf is None and inputs.soil.active_method == self.method

    def components(self, geom, inputs, p, plane, *, live):
        if plane.level:
            return [level_soil_component(p.active_efp_pcf, geom.design_height_ft)]
        c, s = p.cos_inclination, p.sin_inclination
        f, m = soil_profile(p.ka, inputs.soil.unit_weight_pcf, plane.height_ft, plane.water_ft,
                            gamma_sat_pcf=inputs.gamma_below_water_pcf)
        return [ThrustComponent("active soil", f * c, arm(f, m), f * s)]

    def stem_loads(self, geom, inputs, p, z, plane_level, *, live):
        if plane_level:
            return [triangle_cut(p.active_efp_pcf, z)]
        hw_cut = water_height_ft(geom, inputs) - (geom.design_height_ft - z)  # above the cut
        return [soil_profile(p.ka * p.cos_inclination, inputs.soil.unit_weight_pcf, z, hw_cut,
                             gamma_sat_pcf=inputs.gamma_below_water_pcf)]

    def conventions(self, inputs, p, plain):
        if plain:
            return [f"active pressure: {p.basis}, EFP {p.active_efp_pcf:.1f} pcf "
                    f"(Ka = {p.ka:.4f}), on the vertical plane through the heel edge over the "
                    "design height H (retained grade to bottom of footing)"]
        lines = [
            f"active pressure: {p.basis}; Ka = {p.ka:.4f}, EFP {p.active_efp_pcf:.1f} pcf "
            f"acting {p.inclination_deg:.4g} deg above the horizontal (horizontal part "
            f"{p.horizontal_efp_pcf:.1f} pcf) "
            + ("on the vertical plane through the stem's back face at its base, from the "
               "bottom of footing to the ground there (coulomb_plane = \"stem\": the soil and "
               "surcharge over the heel are retained, not resisting; the vertical component "
               "acts at the back face)" if inputs.stem_plane else
               "on the virtual back: the vertical plane through the heel edge, from the bottom "
               "of footing to the ground at the heel edge (H')"),
        ]
        if p.backslope_deg > 0:
            lines.append(f"backslope {p.backslope_deg:.4g} deg rising from where the retained "
                         "grade meets the stem's back face; soil over the heel is the polygon "
                         "stem back face - top of footing - heel plane - sloping ground; the "
                         "thrust's vertical component acts on the heel plane and counts in the "
                         "vertical load and the resisting moment")
        return lines

    def formula(self, inputs, p, level):
        if level:
            return "EFP·h_s³/6", "EFP·z²/2"
        k = f"Ka·{self.symbol}·γ" if self.symbol else "Ka·γ"
        return f"{k}·h_s³/6", f"{k}·z²/2"
