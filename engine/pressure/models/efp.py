"""An equivalent fluid pressure from the geotechnical report: horizontal, Ka = EFP / gamma
(DESIGN.md section 7); on the design height H for level ground, on H' with a backslope."""

from __future__ import annotations

from ..active import ActiveSoil


class EquivalentFluid(ActiveSoil):
    name = "efp"
    order = 0

    def applies(self, inputs) -> bool:
        return inputs.soil.active_efp_pcf is not None

    def level(self, inputs) -> bool:
        return not inputs.soil.backslope_deg

    def pressure(self, inputs):
        efp = float(inputs.soil.active_efp_pcf)
        return efp / inputs.soil.unit_weight_pcf, efp, 0.0, "equivalent fluid pressure"


MODEL = EquivalentFluid()
