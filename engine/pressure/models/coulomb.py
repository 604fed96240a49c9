"""Coulomb active pressure (UFC 3-220-20 Eq. 4-10 form; REFERENCES.md section 5), Ka for a
vertical back: on the plane through the heel edge (``coulomb_plane = "heel"``) the interface
is soil against soil, its friction the backslope angle; on the stem's back face
(``coulomb_plane = "stem"``) the report's wall friction applies (DESIGN.md section 7)."""

from __future__ import annotations

from ..active import ActiveSoil
from ..coefficients import coulomb_ka


class Coulomb(ActiveSoil):
    name = "coulomb"
    order = 3
    method = "coulomb"
    symbol = "cos δ"

    def check(self, inputs, has_phi: bool) -> None:
        phi = inputs.soil.friction_angle_deg
        if inputs.soil.active_method != "coulomb":
            if inputs.soil.wall_friction_deg is not None:
                raise ValueError("wall_friction_deg is used only with active_method = "
                                 "'coulomb'")
            if inputs.soil.coulomb_plane != "heel":
                raise ValueError("coulomb_plane is used only with active_method = 'coulomb'")
            return
        if not has_phi:
            raise ValueError("active_method = 'coulomb' needs friction_angle_deg (not "
                             "active_efp_pcf)")
        if inputs.soil.coulomb_plane not in ("heel", "stem"):
            raise ValueError("coulomb_plane must be 'heel' or 'stem', got "
                             f"{inputs.soil.coulomb_plane!r}")
        if inputs.soil.wall_friction_deg is None and inputs.soil.coulomb_plane == "stem":
            raise ValueError("coulomb_plane = 'stem' needs wall_friction_deg (the "
                             "wall friction angle from the geotechnical report)")
        delta = inputs.soil.wall_friction_deg
        if delta is not None and not (0.0 <= delta <= phi):
            raise ValueError(f"wall_friction_deg {delta:g} must be "
                             f"between 0 and friction_angle_deg {phi:g}")

    def pressure(self, inputs):
        beta = float(inputs.soil.backslope_deg or 0.0)
        if inputs.soil.coulomb_plane == "stem":
            # the thrust on concrete: the report's wall friction applies (DESIGN.md 7)
            delta = float(inputs.soil.wall_friction_deg)
            plane = (f"wall friction {delta:g} deg on the stem's back face (the soil over the "
                     "heel counted as retained soil, not as resisting weight)")
        else:
            # on the plane through the heel edge the interface is soil against soil: its
            # friction is the backslope angle, never a wall friction (DESIGN.md 7)
            delta = beta
            plane = (f"interface friction = backslope {beta:.4g} deg on the plane through the "
                     "heel edge (soil against soil)")
            if inputs.soil.wall_friction_deg is not None:
                plane += (f"; the report's wall friction {inputs.soil.wall_friction_deg:g} deg "
                          "applies only with coulomb_plane = \"stem\"")
        ka = float(coulomb_ka(inputs.soil.friction_angle_deg, delta, beta))
        return ka, ka * inputs.soil.unit_weight_pcf, delta, (
            f"Coulomb, phi = {inputs.soil.friction_angle_deg:g} deg, backslope {beta:.4g} deg, "
            f"{plane}")


MODEL = Coulomb()
