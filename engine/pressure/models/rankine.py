"""Rankine active pressure on level backfill: Ka = tan^2(45 deg - phi/2), horizontal
(Rankine (1857); McCormac & Brown 9th ed. section 13.5)."""

from __future__ import annotations

from ..active import ActiveSoil
from ..coefficients import rankine_ka


class Rankine(ActiveSoil):
    name = "rankine"
    order = 1
    method = "rankine"

    def applies(self, inputs) -> bool:
        return super().applies(inputs) and not inputs.soil.backslope_deg

    def level(self, inputs) -> bool:
        return True

    def pressure(self, inputs):
        ka = float(rankine_ka(inputs.soil.friction_angle_deg))
        return ka, ka * inputs.soil.unit_weight_pcf, 0.0, \
            f"Rankine, phi = {inputs.soil.friction_angle_deg:g} deg"


MODEL = Rankine()
