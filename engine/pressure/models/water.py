"""Water behind the wall: hydrostatic 62.4 pcf below the level (at most the retained grade
at the stem), on the thrust plane and on the stem; the soil below the level in effective
stress (``engine/pressure/active.py``). Drained backfill (no [water]): no water load."""

from __future__ import annotations

from ..base import WATER_PCF, ModelBase, ThrustComponent, arm
from ..planes import water_height_ft
from ..profiles import water_profile


class Water(ModelBase):
    name = "water"
    order = 10
    text_order = 25  # stated after the surcharge and how the stem takes the loads

    def applies(self, inputs) -> bool:
        return True  # drained backfill is stated, and loads nothing

    def level(self, inputs) -> bool:
        return inputs.water_level_ft is None

    def check(self, inputs, has_phi: bool) -> None:
        if inputs.loads.water is not None and inputs.gamma_below_water_pcf <= WATER_PCF:
            raise ValueError("with [water] the unit weight must exceed 62.4 pcf (the buoyant "
                             "unit weight is gamma - 62.4)")

    def components(self, geom, inputs, p, plane, *, live):
        if inputs.water_level_ft is None:
            return []
        fw, mw = water_profile(plane.height_ft, plane.water_ft)
        return [ThrustComponent("water", fw, arm(fw, mw))]

    def stem_loads(self, geom, inputs, p, z, plane_level, *, live):
        if inputs.water_level_ft is None:
            return []
        hw_cut = water_height_ft(geom, inputs) - (geom.design_height_ft - z)  # above the cut
        return [water_profile(z, hw_cut)]

    def conventions(self, inputs, p, plain):
        if plain:
            return []
        i = inputs
        if i.loads.water is None:
            return ["backfill drained (no water pressure, no uplift)"]
        return [f"water level {i.loads.water.level_ft:g} ft above the bottom of footing (at "
                "most the retained grade), one free body: the soil over the heel at its "
                f"total unit weight ({i.gamma_below_water_pcf:g} pcf below the level), "
                "the earth pressure from effective stress (buoyant below the level), "
                "hydrostatic 62.4 pcf below it, the uplift on the base from the full head "
                "at the heel edge to zero at the toe edge (no water in front); heel: the "
                "water pressure on its underside neglected (conservative); toe: 1.6 x the "
                "uplift under it added to the bearing pressure (conservative)"]

    def formula(self, inputs, p, level):
        if inputs.water_level_ft is None:
            return "", ""
        return ("γw·hw³/6 (hw the water above the section; the soil below it at γsat − γw)",
                "γw·hw²/2")


MODEL = Water()
