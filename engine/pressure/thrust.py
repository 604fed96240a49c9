"""The dispatch points: the models in use (``registry.py``) summed in their order.

- :func:`earth_pressure`: the active model's coefficient, the passive pressure and the
  stem's formula text, one :class:`~.base.EarthPressure`;
- :func:`design_thrust` (static) and :func:`seismic_thrust`: stability only ever sees a
  :class:`~.base.Thrust`;
- :func:`stem_shear_moment` and :func:`stem_seismic_shear_moment`: the loads on the stem;
- :func:`conventions`: the stated conventions of the models in use.
"""

from __future__ import annotations

import dataclasses

import numpy as np

from .active import level_soil_component
from .base import EarthPressure, Plane, Thrust, floats
from .coefficients import rankine_kp
from .models import seismic
from .models.surcharge import level_surcharge_component
from .planes import thrust_plane_height_ft, water_height_ft
from .registry import active_model, in_use, is_level

LF_LATERAL_TEXT = "1.6"  # ASCE 7 2.3: H and L, as the stem's formula prints it


def level_backfill_thrust(efp_pcf, ka, surcharge_psf, height_ft) -> Thrust:
    """Active soil thrust EFP*H^2/2 at H/3 and surcharge thrust Ka*q*H at H/2.

    Triangular equivalent-fluid pressure and uniform surcharge pressure over the design height
    H (retained grade to bottom of footing); McCormac & Brown 9th ed. section 13.5.
    """
    return Thrust((level_soil_component(efp_pcf, height_ft),
                   level_surcharge_component(ka, surcharge_psf, height_ft)))


def stem_formulas(inputs, p: EarthPressure) -> tuple[str, str]:
    """The stem's factored moment and shear as the models in use compute them."""
    level = is_level(inputs)
    terms = [m.formula(inputs, p, level) for m in in_use(inputs)]
    mo = " + ".join(t[0] for t in terms if t[0])
    sh = " + ".join(t[1] for t in terms if t[1])
    mu = f"Mu = {LF_LATERAL_TEXT}·({mo})"
    vu = f"Vu = {LF_LATERAL_TEXT}·({sh}) at z = h_s − d (d above the footing)"
    for m in in_use(inputs, "seismic"):
        em, ev = m.formula(inputs, p, level)
        mu, vu = mu + em, vu + ev
    return mu, vu


def earth_pressure(inputs) -> EarthPressure:
    """The active/passive pressures of a :class:`~.inputs.DesignInputs`."""
    ka, efp, incl, basis = active_model(inputs).pressure(inputs)
    gamma = inputs.soil.unit_weight_pcf
    if not inputs.criteria.use_passive:
        kp_efp = 0.0
    elif inputs.soil.passive_from_friction_angle:
        kp_efp = float(rankine_kp(inputs.soil.friction_angle_deg)) * gamma
    else:
        kp_efp = float(inputs.soil.passive_efp_pcf)
    p = EarthPressure(efp, ka, kp_efp, float(inputs.loads.surcharge_psf), basis, incl,
                      float(inputs.soil.backslope_deg or 0.0))
    mu, vu = stem_formulas(inputs, p)
    return dataclasses.replace(p, stem_moment_formula=mu, stem_shear_formula=vu)


def _plane(geom, inputs) -> Plane:
    if is_level(inputs):
        return Plane(geom.design_height_ft, 0.0, True)
    return Plane(thrust_plane_height_ft(geom, inputs), water_height_ft(geom, inputs), False)


def design_thrust(geom, inputs, pressure: EarthPressure | None = None, *,
                  live: bool = True) -> Thrust:
    """The static thrust the stability checks use for ``geom``: the loads of every static
    model in use on the thrust plane. ``live = False`` leaves out the live surcharge and the
    strip loads (the seismic case)."""
    p = pressure or earth_pressure(inputs)
    plane = _plane(geom, inputs)
    comps = []
    for m in in_use(inputs):
        comps += m.components(geom, inputs, p, plane, live=live)
    return Thrust(tuple(comps))


def seismic_thrust(geom, inputs, pressure: EarthPressure | None = None) -> Thrust:
    """The thrust of the seismic case: the static soil (and water) thrust without the live
    loads, plus the seismic models' loads (IBC 2021 1807.2.3: 0.7 on nominal earthquake
    loads)."""
    p = pressure or earth_pressure(inputs)
    comps = list(design_thrust(geom, inputs, p, live=False).components)
    plane = _plane(geom, inputs)
    for m in in_use(inputs, "seismic"):
        comps += m.components(geom, inputs, p, plane, live=False)
    return Thrust(tuple(comps))


def _sum_parts(parts):
    (v, m), *rest = parts
    for vp, mp in rest:
        v, m = v + vp, m + mp
    return v, m


def stem_shear_moment(geom, inputs, pressure: EarthPressure, depth_ft, *, live=True):
    """Service horizontal shear and moment on the stem ``depth_ft`` below the retained grade
    (the pressure on the stem itself), the static models' parts summed in order (``live`` =
    False leaves out the live surcharge and the strip loads)."""
    z = np.maximum(floats(depth_ft), 0.0)
    level = is_level(inputs)
    parts = []
    for m in in_use(inputs):
        parts += m.stem_loads(geom, inputs, pressure, z, level, live=live)
    return _sum_parts(parts)


def stem_seismic_shear_moment(geom, inputs, pressure: EarthPressure, depth_ft):
    """Nominal seismic shear and moment on the stem ``depth_ft`` below the retained grade
    (E at 1.0) of the seismic models in use."""
    parts = []
    for m in in_use(inputs, "seismic"):
        parts += m.stem_loads(geom, inputs, pressure, depth_ft, False, live=False)
    return _sum_parts(parts)


def seismic_increment_lb(geom, inputs, pressure: EarthPressure | None = None):
    """The nominal dynamic increment Delta P_AE (``models/seismic.py``)."""
    return seismic.increment_lb(geom, inputs, pressure or earth_pressure(inputs))


def conventions(inputs, pressure: EarthPressure) -> list[str]:
    """The stated conventions of the models in use (short for level backfill without
    [seismic]), the lines ``wallsched section`` prints."""
    plain = is_level(inputs) and inputs.loads.seismic is None
    lines = []
    used = in_use(inputs) + in_use(inputs, "seismic")
    for m in sorted(used, key=lambda m: m.order if m.text_order is None else m.text_order):
        lines += m.conventions(inputs, pressure, plain)
    return lines
