"""Lateral earth pressure on a cantilever wall, one module per pressure model behind one
protocol (:class:`~.base.PressureModel`), chosen by the :class:`~.registry.Model` enum.

- ``base.py``: the shared types (``EarthPressure``, ``Thrust``, ``ThrustComponent``,
  ``Plane``) and the protocol;
- ``coefficients.py``: Rankine, Coulomb and Mononobe-Okabe coefficients;
- ``profiles.py``: force and moment of one pressure diagram on a vertical plane (the thrust
  plane in stability, the stem cut at any depth in strength);
- ``planes.py``: where the thrust acts (the virtual back H', the stem plane, the water);
- ``active.py``: the soil load every active model shares;
- ``models/``: the models: ``efp``, ``rankine``, ``backslope`` (Rankine on sloping
  backfill), ``coulomb`` (the active models: exactly one applies), ``water``,
  ``surcharge``, ``strip`` (static loads) and ``seismic`` (the seismic case); each gives
  its thrust components, its stem load, its conventions text and its term of the formula
  the calc package prints;
- ``registry.py``: which models there are and which are in use; ``thrust.py``: the dispatch
  points (``earth_pressure``, ``design_thrust``, ``seismic_thrust``, ``stem_shear_moment``,
  ``stem_seismic_shear_moment``, ``conventions``).

Conventions (each stated in the report): see each model's module. Units: pcf, psf, ft, lb
and lb-ft per foot of wall. All functions broadcast over arrays.
"""

from .base import WATER_PCF, EarthPressure, Plane, PressureModel, Thrust, ThrustComponent
from .coefficients import (
    backslope_from_ratio,
    coulomb_ka,
    mononobe_okabe_kae,
    rankine_ka,
    rankine_ka_sloping,
    rankine_kp,
)
from .models.seismic import SEISMIC_ARM_FRACTION
from .models.seismic import e_components as seismic_e_components
from .planes import (
    stem_face_x_at_grade,
    thrust_plane_height_ft,
    thrust_plane_x_ft,
    virtual_back_height_ft,
    water_height_ft,
)
from .profiles import (
    cantilever_shear_moment,
    passive_resistance_lb,
    seismic_profile,
    soil_profile,
    strip_pressure_psf,
    strip_profile,
    uniform_profile,
    water_profile,
)
from .registry import MODELS, Model, check_inputs, is_level, model, models_of
from .thrust import (
    conventions,
    design_thrust,
    earth_pressure,
    level_backfill_thrust,
    seismic_increment_lb,
    seismic_thrust,
    stem_seismic_shear_moment,
    stem_shear_moment,
)

__all__ = [
    "MODELS", "SEISMIC_ARM_FRACTION", "WATER_PCF", "EarthPressure", "Model", "Plane",
    "PressureModel", "Thrust", "ThrustComponent", "backslope_from_ratio",
    "cantilever_shear_moment", "check_inputs", "conventions", "coulomb_ka", "design_thrust",
    "earth_pressure", "is_level", "level_backfill_thrust", "model", "models_of",
    "mononobe_okabe_kae", "passive_resistance_lb", "rankine_ka", "rankine_ka_sloping",
    "rankine_kp", "seismic_e_components", "seismic_increment_lb", "seismic_profile",
    "seismic_thrust", "soil_profile", "stem_face_x_at_grade", "stem_seismic_shear_moment",
    "stem_shear_moment", "strip_pressure_psf", "strip_profile", "thrust_plane_height_ft",
    "thrust_plane_x_ft", "uniform_profile", "virtual_back_height_ft", "water_height_ft",
    "water_profile",
]
