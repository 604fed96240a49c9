"""Stability of cantilever sections under service loads (IBC 2021 section 1807.2.3).

Overturning about the toe at the bottom of footing; sliding with base friction plus passive
on the front; bearing by the kern rule (trapezoid) or the triangular block outside it, as the
envelope of the cases with and without the live surcharge weight. A resultant outside the base
is an overturning failure and has no bearing number (NaN).

Usable alone on geometry (no bars), so that sizing can screen candidates first::

    st = stability(geom, inputs)
    ok = st.passes        # overturning, sliding, bearing and resultant inside the base
"""

from __future__ import annotations

from dataclasses import dataclass, fields

import numpy as np

from .pressure import (
    EarthPressure,
    Thrust,
    design_thrust,
    earth_pressure,
    passive_resistance_lb,
    seismic_increment_lb,
    seismic_thrust,
    thrust_plane_x_ft,
)
from .section import DesignInputs, SectionGeometry, Weights, section_weights


@dataclass(frozen=True)
class BearingCase:
    """One vertical load case on the base: total V, eccentricity e = B/2 - xbar (positive
    toward the toe), and the pressures it gives."""

    sum_v_lb: np.ndarray
    eccentricity_ft: np.ndarray
    q_max_psf: np.ndarray  # NaN where the resultant falls outside the base
    q_min_psf: np.ndarray
    in_base: np.ndarray


def bearing_pressure(sum_v_lb, eccentricity_ft, width_ft) -> BearingCase:
    """Base pressure of a strip footing: q = V/B (1 +- 6e/B) for |e| <= B/6, else
    q_max = 2V/(3a) with a = B/2 - |e| (McCormac & Brown 9th ed. sections 12.12, 13.6).

    NaN q where the resultant lies outside the base (a <= 0).
    """
    V = np.asarray(sum_v_lb, dtype=float)
    e = np.abs(np.asarray(eccentricity_ft, dtype=float))
    B = np.asarray(width_ft, dtype=float)
    a = B / 2.0 - e
    inside = e <= B / 6.0
    with np.errstate(divide="ignore", invalid="ignore"):
        q_kern_max = V / B * (1.0 + 6.0 * e / B)
        q_kern_min = V / B * (1.0 - 6.0 * e / B)
        q_tri = 2.0 * V / (3.0 * a)
    in_base = (a > 0) & (V > 0)
    q_max = np.where(in_base, np.where(inside, q_kern_max, q_tri), np.nan)
    q_min = np.where(in_base, np.where(inside, q_kern_min, 0.0), np.nan)
    return BearingCase(V, np.asarray(eccentricity_ft, dtype=float), q_max, q_min, in_base)


@dataclass(frozen=True)
class SeismicStability:
    """The seismic case (IBC 2021 1807.2.3): static soil thrust without the live loads plus
    load_factor x (Delta P_AE and the concrete inertia); dead weights only; required FS from
    ``[seismic]``; bearing against the same allowable (no increase taken)."""

    delta_pae_lb: np.ndarray  # nominal increment (before the load factor)
    thrust: Thrust
    h_driving_lb: np.ndarray
    m_overturning_lbft: np.ndarray
    sum_v_lb: np.ndarray
    m_resisting_lbft: np.ndarray
    fs_overturning: np.ndarray
    h_resisting_lb: np.ndarray
    fs_sliding: np.ndarray
    q_max_psf: np.ndarray
    q_min_psf: np.ndarray
    eccentricity_ft: np.ndarray
    resultant_in_base: np.ndarray
    passes_overturning: np.ndarray
    passes_sliding: np.ndarray
    passes_bearing: np.ndarray
    case: BearingCase


@dataclass(frozen=True)
class StabilityResult:
    """Service-load stability of each section (arrays, per foot of wall).

    ``sum_v_lb`` and ``m_resisting_lbft`` are the resisting weights (with the surcharge weight
    only when ``surcharge_resists``); bearing fields are those of the governing case (larger
    q_max); ``case_dead`` / ``case_surcharge`` keep both cases for the toe design (they are the
    same case when ``surcharge_resists``).
    """

    footing_width_ft: np.ndarray
    design_height_ft: np.ndarray
    sum_v_lb: np.ndarray
    m_resisting_lbft: np.ndarray
    m_overturning_lbft: np.ndarray
    fs_overturning: np.ndarray
    h_driving_lb: np.ndarray
    passive_lb: np.ndarray
    h_resisting_lb: np.ndarray
    fs_sliding: np.ndarray
    q_max_psf: np.ndarray
    q_min_psf: np.ndarray
    eccentricity_ft: np.ndarray
    bearing_with_surcharge: np.ndarray  # the governing case carries the surcharge weight
    resultant_in_base: np.ndarray
    passes_overturning: np.ndarray
    passes_sliding: np.ndarray
    passes_bearing: np.ndarray
    passes: np.ndarray
    case_dead: BearingCase
    case_surcharge: BearingCase
    seismic: SeismicStability | None = None

    def to_frame(self):
        """One row per section, the array fields as columns."""
        import pandas as pd

        cols = {}
        skip = (BearingCase, SeismicStability, type(None))
        shape = np.broadcast_shapes(*(np.shape(getattr(self, f.name)) for f in fields(self)
                                      if not isinstance(getattr(self, f.name), skip)))
        for f in fields(self):
            v = getattr(self, f.name)
            if isinstance(v, skip):
                continue
            cols[f.name] = np.broadcast_to(v, shape).reshape(-1)
        return pd.DataFrame(cols)


def _passive_lb(geom, inputs, p):
    """Passive resistance from ``passive_neglect_ft`` below the front grade to the bottom of
    the footing or key (0 without ``use_passive``)."""
    if not inputs.criteria.use_passive:
        return np.zeros_like(geom.footing_width_ft)
    key_depth_ft = np.where(geom.has_key, geom.key_depth_in / 12.0, 0.0)
    return passive_resistance_lb(p.passive_efp_pcf, inputs.criteria.passive_neglect_ft,
                                 geom.embedment_ft + key_depth_ft)


def _governing_bearing(case0, case1):
    """(resultant in the base in both, q_max, q_min, e, case1 governs) of the two bearing
    cases: the larger q_max governs; where a resultant is outside the base, that case."""
    in_base = case0.in_base & case1.in_base
    pick1 = np.where(in_base, case1.q_max_psf > case0.q_max_psf,
                     ~case1.in_base & case0.in_base)
    q_max = np.maximum(case0.q_max_psf, case1.q_max_psf)  # NaN if either case is outside
    q_min = np.where(pick1, case1.q_min_psf, case0.q_min_psf)
    e = np.where(pick1, case1.eccentricity_ft, case0.eccentricity_ft)
    return in_base, q_max, q_min, e, pick1


def stability(geom: SectionGeometry, inputs: DesignInputs, *,
              pressure: EarthPressure | None = None, thrust: Thrust | None = None,
              weights: Weights | None = None) -> StabilityResult:
    """Overturning, sliding and bearing of every section of ``geom`` (IBC 2021 1807.2.3).

    Args:
        geom: section geometry arrays.
        inputs: soil, loads, materials and criteria.
        pressure, thrust, weights: precomputed parts (optional; computed when omitted).

    Returns:
        StabilityResult; FS_OT = M_R / M_O about the toe at the bottom of footing;
        FS_sliding = (mu * V + passive) / H; passive from ``passive_neglect_ft`` below the front
        grade to the bottom of the footing or key. Passing needs FS >= the criteria, q_max <=
        the allowable and the resultant inside the base.
    """
    p = pressure or earth_pressure(inputs)
    th = thrust or design_thrust(geom, inputs, p)
    w = weights or section_weights(geom, inputs)
    B = geom.footing_width_ft
    v_dead, m_dead, v_q, m_q = _vertical_loads(geom, inputs, th, w)
    m_o = th.moment_lbft
    if inputs.criteria.surcharge_resists:
        v_r, m_r = v_dead + v_q, m_dead + m_q
    else:
        v_r, m_r = v_dead, m_dead
    with np.errstate(divide="ignore", invalid="ignore"):
        fs_ot = m_r / m_o
        case0 = bearing_pressure(v_r, B / 2.0 - (m_r - m_o) / v_r, B)
        if inputs.criteria.surcharge_resists:
            case1 = case0
        else:
            v1, m1 = v_dead + v_q, m_dead + m_q
            case1 = bearing_pressure(v1, B / 2.0 - (m1 - m_o) / v1, B)
        pp = _passive_lb(geom, inputs, p)
        h_drive = th.horizontal_lb
        h_res = inputs.soil.friction_coefficient * v_r + pp
        fs_sl = h_res / h_drive
    in_base, q_max, q_min, e, pick1 = _governing_bearing(case0, case1)
    with_q = np.asarray(pick1 | inputs.criteria.surcharge_resists)
    ok_ot = (fs_ot >= inputs.criteria.fs_overturning) & in_base
    ok_sl = fs_sl >= inputs.criteria.fs_sliding
    ok_b = q_max <= inputs.soil.allowable_bearing_psf
    sz = None
    passes = ok_ot & ok_sl & ok_b & geom.valid
    if inputs.loads.seismic is not None:
        sz = seismic_stability(geom, inputs, p, w, pp)
        passes = passes & sz.passes_overturning & sz.passes_sliding & sz.passes_bearing
    return StabilityResult(
        footing_width_ft=B, design_height_ft=geom.design_height_ft,
        sum_v_lb=v_r, m_resisting_lbft=m_r, m_overturning_lbft=m_o, fs_overturning=fs_ot,
        h_driving_lb=h_drive, passive_lb=pp, h_resisting_lb=h_res, fs_sliding=fs_sl,
        q_max_psf=q_max, q_min_psf=q_min, eccentricity_ft=e,
        bearing_with_surcharge=with_q,
        resultant_in_base=in_base, passes_overturning=ok_ot, passes_sliding=ok_sl,
        passes_bearing=ok_b, passes=passes,
        case_dead=case0, case_surcharge=case1, seismic=sz,
    )


def _vertical_loads(geom: SectionGeometry, inputs: DesignInputs, th: Thrust, w: Weights):
    """(V, M about the toe) of the dead load with the thrust's vertical part; of the surcharge."""
    v_dead, m_dead = w.dead()
    v_q, m_q = w.surcharge.lb, w.surcharge.moment_lbft
    # vertical component of the thrust (0 for level backfill) acts on the heel plane, x = B
    v_th = th.vertical_lb
    v_dead = v_dead + v_th
    m_dead = m_dead + v_th * thrust_plane_x_ft(geom, inputs)
    return v_dead, m_dead, v_q, m_q


def seismic_stability(geom: SectionGeometry, inputs: DesignInputs, pressure: EarthPressure,
                      weights: Weights, passive_lb) -> SeismicStability:
    """Overturning, sliding and bearing of the seismic case (see :class:`SeismicStability`).

    The live surcharge (its weight and lateral pressure) and the strip loads are left out (IBC
    2021 1807.2.3 permits one variable load at zero); vertical components of the thrust act on
    the heel plane (x = B); passive resistance as in the static case.
    """
    sz = inputs.loads.seismic
    th = seismic_thrust(geom, inputs, pressure)
    B = geom.footing_width_ft
    v, m = weights.dead()
    v = v + th.vertical_lb
    m = m + th.vertical_lb * thrust_plane_x_ft(geom, inputs)
    m_o = th.moment_lbft
    h_d = th.horizontal_lb
    with np.errstate(divide="ignore", invalid="ignore"):
        fs_ot = m / m_o
        case = bearing_pressure(v, B / 2.0 - (m - m_o) / v, B)
        h_r = inputs.soil.friction_coefficient * v + passive_lb
        fs_sl = h_r / h_d
    return SeismicStability(
        delta_pae_lb=np.asarray(seismic_increment_lb(geom, inputs, pressure)), thrust=th,
        h_driving_lb=h_d, m_overturning_lbft=m_o, sum_v_lb=v, m_resisting_lbft=m,
        fs_overturning=fs_ot, h_resisting_lb=h_r, fs_sliding=fs_sl, q_max_psf=case.q_max_psf,
        q_min_psf=case.q_min_psf, eccentricity_ft=case.eccentricity_ft,
        resultant_in_base=case.in_base,
        passes_overturning=(fs_ot >= sz.fs_overturning) & case.in_base,
        passes_sliding=fs_sl >= sz.fs_sliding,
        passes_bearing=case.q_max_psf <= inputs.soil.allowable_bearing_psf, case=case)
