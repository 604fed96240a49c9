"""Strip surcharges (a road, a footing) near the wall: the elastic strip solution doubled for
a rigid wall (``profiles.strip_pressure_psf``), on the plane of the stem's back face over the
design height H; live: left out of the seismic case, their weight never resists."""

from __future__ import annotations

from ..base import ModelBase, ThrustComponent, arm
from ..profiles import strip_profile


class Strip(ModelBase):
    name = "strip"
    order = 30

    def applies(self, inputs) -> bool:
        return bool(inputs.loads.strip)

    def check(self, inputs, has_phi: bool) -> None:
        for off, width, q in inputs.loads.strip:
            if not (off >= 0 and width > 0 and q >= 0):
                raise ValueError("a strip load needs offset_ft >= 0, width_ft > 0 and "
                                 "pressure_psf >= 0")

    def components(self, geom, inputs, p, plane, *, live):
        if not live:
            return []
        out = []
        for i, (off, width, q) in enumerate(inputs.loads.strip):
            fs_, ms_ = strip_profile(q, off, width, geom.design_height_ft)
            out.append(ThrustComponent(f"strip load {i + 1}", fs_, arm(fs_, ms_)))
        return out

    def stem_loads(self, geom, inputs, p, z, plane_level, *, live):
        if not live:
            return []
        return [strip_profile(q, off, width, z) for off, width, q in inputs.loads.strip]

    def conventions(self, inputs, p, plain):
        return [f"strip load {n}: {q:g} psf, {width:g} ft wide, {off:g} ft behind the "
                "stem's back face: elastic strip solution doubled for a rigid wall, "
                "sigma_h = (2q/pi)(alpha - sin(alpha) cos(2 delta)) (AASHTO LRFD 3.11.6.2, "
                "NAVFAC DM-7.02; from memory), on the plane of the stem's back face over "
                "H; live: its weight never resists, left out of the seismic case"
                for n, (off, width, q) in enumerate(inputs.loads.strip, 1)]

    def formula(self, inputs, p, level):
        return ("M_strip (the strip solution's moment about the section)",
                "V_strip (its force above the section)")


MODEL = Strip()
