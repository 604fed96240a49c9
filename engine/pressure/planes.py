"""Where the active thrust acts: the water height, where the retained grade meets the stem's
back face, the virtual back through the heel edge (H') and the thrust plane.

Conventions: the active thrust acts on the virtual back, the vertical plane through the heel
edge, over H' = bottom of footing to the ground at the heel edge (H' = H for level ground);
the ground rises at the backslope angle from where the retained grade meets the stem's back
face; with ``coulomb_plane = "stem"`` it acts on the plane of the stem's back face instead.
"""

from __future__ import annotations

import numpy as np


def water_height_ft(geom, inputs):
    """The water level above the bottom of footing, at most the retained grade (H); 0 when
    drained."""
    if inputs.water_level_ft is None:
        return np.zeros(geom.shape)
    return np.clip(float(inputs.water_level_ft), 0.0, geom.design_height_ft)


def stem_face_x_at_grade(geom, inputs):
    tb, tt = geom.stem_base_in / 12.0, geom.stem_top_in / 12.0
    if inputs.criteria.batter_face == "back":
        with np.errstate(divide="ignore", invalid="ignore"):
            w = np.where(geom.stem_height_ft > 0,
                         (tb - tt) * geom.soil_height_ft / geom.stem_height_ft, 0.0)
        return geom.toe_ft + tb - w
    return geom.toe_ft + tb


def virtual_back_height_ft(geom, inputs):
    """H' = bottom of footing to the ground at the heel edge: H + (B - x_grade) tan(beta),
    x_grade where the retained grade meets the stem's back face."""
    beta = float(inputs.soil.backslope_deg or 0.0)
    H = geom.design_height_ft
    if beta <= 0.0:
        return H
    run = geom.footing_width_ft - stem_face_x_at_grade(geom, inputs)
    return H + np.maximum(run, 0.0) * np.tan(np.radians(beta))


def thrust_plane_x_ft(geom, inputs):
    """Where the active thrust acts, from the toe edge: the heel edge (B), or the stem's back
    face at its base with ``coulomb_plane = "stem"``; its vertical component acts there."""
    if inputs.stem_plane:
        return geom.toe_ft + geom.stem_base_in / 12.0
    return geom.footing_width_ft


def thrust_plane_height_ft(geom, inputs):
    """Height of the plane the active thrust acts on: bottom of footing to the ground over
    it (H' at the heel edge; at the stem's back face with ``coulomb_plane = "stem"``)."""
    if not inputs.stem_plane:
        return virtual_back_height_ft(geom, inputs)
    beta = float(inputs.soil.backslope_deg or 0.0)
    H = geom.design_height_ft
    if beta <= 0.0:
        return H + 0.0 * geom.toe_ft
    run = geom.toe_ft + geom.stem_base_in / 12.0 - stem_face_x_at_grade(geom, inputs)
    return H + np.maximum(run, 0.0) * np.tan(np.radians(beta))
