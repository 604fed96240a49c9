"""Rankine active pressure on a backfill sloping at beta (beta <= phi): the thrust parallel
to the slope on the virtual back H' (McCormac & Brown 9th ed. 13.5). The slope's own rules
(0 <= beta < 90, beta <= phi) hold for every active model."""

from __future__ import annotations

from ..active import ActiveSoil
from ..coefficients import rankine_ka_sloping


class Backslope(ActiveSoil):
    name = "backslope"
    order = 2
    method = "rankine"
    symbol = "cos β"

    def applies(self, inputs) -> bool:
        return super().applies(inputs) and bool(inputs.soil.backslope_deg)

    def check(self, inputs, has_phi: bool) -> None:
        beta = inputs.soil.backslope_deg or 0.0
        phi = inputs.soil.friction_angle_deg
        if not (0.0 <= beta < 90.0):
            raise ValueError(f"backslope must be between 0 and 90 deg, got {beta:g}")
        if has_phi and beta > phi:
            raise ValueError(f"backslope {beta:.4g} deg is steeper than friction_angle_deg "
                             f"{phi:g}; no active state exists (give a flatter slope or an "
                             "active_efp_pcf from the geotechnical report)")

    def pressure(self, inputs):
        beta = float(inputs.soil.backslope_deg)
        ka = float(rankine_ka_sloping(inputs.soil.friction_angle_deg, beta))
        return ka, ka * inputs.soil.unit_weight_pcf, beta, (
            f"Rankine, phi = {inputs.soil.friction_angle_deg:g} deg, backslope {beta:.4g} deg "
            "(thrust parallel to the slope)")


MODEL = Backslope()
