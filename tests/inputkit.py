"""Design inputs for the engine's unit tests, built from key names.

``efp_inputs`` is an invented soil of the textbook kind (equivalent-fluid active pressure, a
fixed passive pressure, a 250 psf surcharge); each test overrides what it checks.
"""

from __future__ import annotations

from wallsched.engine.section import DesignInputs

EFP_SOIL = dict(unit_weight_pcf=120.0, friction_coefficient=0.4, allowable_bearing_psf=2500.0,
                active_efp_pcf=35.0, passive_efp_pcf=300.0, surcharge_psf=250.0)


def efp_inputs(**kw) -> DesignInputs:
    """DesignInputs of EFP_SOIL with the keys in ``kw`` changed."""
    return DesignInputs.of(**(EFP_SOIL | kw))
