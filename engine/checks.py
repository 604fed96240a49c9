"""Every check of a cantilever section, as rows: name, demand, capacity, ratio, passes, clause.

Public API (all functions broadcast over sections; a scalar call equals the array element):

- inputs: :class:`~.section.SectionGeometry`, :class:`~.inputs.DesignInputs`
  (``DesignInputs.from_tables(soil, loads, materials, criteria)``),
  :class:`~.section.Reinforcement` of :class:`~.section.BarArrays`;
- :func:`~.stability.stability` (geometry only, for screening), :func:`~.strength.stem_strength`,
  :func:`~.strength.heel_strength`, :func:`~.strength.toe_strength` (geometry + bars);
- :func:`check_section` -> :class:`SectionChecks` with every :class:`CheckRow`, ``passes`` and
  ``utilization_max`` arrays, ``to_frame()``, ``rows_frame(i)`` and ``to_dict(i)`` (the JSON
  object of ``wallsched section --json``).

Ratio = demand / capacity, and a row passes when ratio <= 1 (so NaN never passes). For the
factor-of-safety rows the demand is the required FS and the capacity the FS provided; for
minimum-quantity rows (steel area, embedment, depth) the demand is the minimum and the capacity
what is provided. A resultant outside the base fails overturning and has no bearing number
(q_max NaN, bearing ratio inf). Invalid geometry (see ``SectionGeometry.valid``) never passes.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import cached_property

import numpy as np

from .key import key_strength
from .pressure import EarthPressure, earth_pressure
from .section import DesignInputs, Reinforcement, SectionGeometry, section_weights
from .stability import StabilityResult, stability
from .strength import (
    COMBINATIONS,
    FootingResult,
    StemResult,
    heel_strength,
    max_flexural_spacing_in,
    shrinkage_spacing_in,
    shrinkage_steel_in2,
    stem_strength,
    toe_strength,
    wall_horizontal_min_in2,
)

TOE_MIN_DEPTH_IN = 6.0  # 13.3.1.2: depth of footing above the bottom reinforcement

LOAD_FACTORS = (
    "Stability (overturning, sliding, bearing): service loads, all factors 1.0 "
    "(IBC 2021 1807.2.3; required FS from [criteria]).",
    "Stem: 1.6 on lateral earth pressure and on the lateral pressure of the live surcharge "
    "(ASCE 7 2.3, H and L).",
    "Heel (heel_upward_pressure = true): the largest of 1.2D + 1.6H + 1.6L, 1.2D + 1.6H and "
    "0.9D + 1.6H (ASCE 7-22 2.3.1), each the combination's load on the heel less its own "
    "factored bearing pressure under the heel (none where its resultant leaves the base).",
    "Toe: 1.6 on the service bearing pressure of the governing bearing case, less 0.9 on the "
    "weight of footing and soil over the toe (dead load that resists); Mu at the stem's "
    "front face, Vu at d from it.",
)
HEEL_TEXTBOOK_NOTE = (
    "Heel (heel_upward_pressure = false): 1.2 on the soil and concrete weight over it, 1.6 on "
    "the live surcharge; the upward soil pressure under the heel is neglected (McCormac & "
    "Brown 13.10).")


SEISMIC_LOAD_FACTOR_NOTE = (
    "Seismic case: stability with load_factor x E (IBC 2021 1807.2.3: 0.7) added to the "
    "static soil thrust, live surcharge and strip loads left out, required FS from [seismic]; "
    "stem strength also for 1.6 H + 1.0 E (ASCE 7 2.3.6); heel and toe also for 1.2D + 1.0E "
    "+ 1.6H with that combination's factored bearing pressure (E: Delta P_AE and kh W of the "
    "concrete and, with soil_inertia, of the soil over the heel).")


KEY_LOAD_FACTOR_NOTE = (
    "Shear key: 1.6 on the passive pressure over its depth (as on the stem's lateral earth "
    "pressure, ASCE 7 2.3 H; conservative for a resisting pressure), a plain-concrete "
    "cantilever from the bottom of footing (ACI 318-19 chapter 14, phi 0.60, h = width - 2 in "
    "cast against soil); the stem bars are not counted in it.")


# detailing rows: limits the choice of bars and dimensions meets (bar spacing limits, least
# steel, least embedment, depth over the bars). The search takes them to their limits by
# construction, so a ratio of 1.00 there says nothing of what the section carries: the
# governing check is the stability or strength row with the largest ratio, and the detailing
# rows at their limits are listed apart.
DETAILING_SUFFIXES = ("_spacing", "_min_steel")
DETAILING_NAMES = frozenset({"embedment", "toe_depth", "stem_horizontal_steel",
                             "footing_longitudinal_steel"})
AT_LIMIT_RATIO = 0.995  # a detailing row at or above this ratio is "at its limit"


def is_detailing(name: str) -> bool:
    """Whether check ``name`` is a detailing row (not stability or strength)."""
    return name in DETAILING_NAMES or name.endswith(DETAILING_SUFFIXES)


@dataclass(frozen=True)
class CheckRow:
    """One check over all sections: ``ratio = demand / capacity``, passes where ratio <= 1."""

    name: str
    title: str
    unit: str
    clause: str
    demand: np.ndarray
    capacity: np.ndarray
    ratio: np.ndarray
    passes: np.ndarray


def _row(name, title, unit, clause, demand, capacity, *, ratio=None, extra_ok=None, valid=None):
    demand, capacity = np.asarray(demand, dtype=float), np.asarray(capacity, dtype=float)
    if ratio is None:
        with np.errstate(divide="ignore", invalid="ignore"):
            ratio = demand / capacity
            # no capacity: fails when there is demand (never a negative "passing" ratio)
            ratio = np.where(capacity <= 0, np.where(demand <= 0, 0.0, np.inf), ratio)
    if valid is not None:
        ratio = np.where(valid, ratio, np.nan)
    ok = ratio <= 1.0
    if extra_ok is not None:
        ok = ok & extra_ok
    return CheckRow(name, title, unit, clause, demand, capacity, np.asarray(ratio, dtype=float),
                    np.asarray(ok))


@dataclass(frozen=True)
class SectionChecks:
    """All checks of a batch of sections, with the member results behind them."""

    rows: tuple[CheckRow, ...]
    stability: StabilityResult
    stem: StemResult
    heel: FootingResult
    toe: FootingResult
    pressure: EarthPressure
    valid: np.ndarray
    passes: np.ndarray
    utilization_max: np.ndarray
    heel_textbook: bool = False  # heel_upward_pressure = false

    @property
    def names(self) -> tuple[str, ...]:
        return tuple(r.name for r in self.rows)

    def row(self, name: str) -> CheckRow:
        for r in self.rows:
            if r.name == name:
                return r
        raise KeyError(f"no check named {name!r}; checks: {', '.join(self.names)}")

    @property
    def shape(self) -> tuple[int, ...]:
        return np.shape(self.passes)

    def _largest(self, rows) -> tuple[np.ndarray, np.ndarray]:
        stack = np.stack([np.broadcast_to(r.ratio, self.shape) for r in rows])
        stack = np.where(np.isnan(stack), np.inf, stack)
        k = np.argmax(stack, axis=0)
        names = np.asarray([r.name for r in rows], dtype=object)[k]
        return names, np.take_along_axis(stack, k[None], axis=0)[0]

    def _strength_rows(self):
        rows = [r for r in self.rows if not is_detailing(r.name)]
        return rows or list(self.rows)

    # the three below are computed once per result (cached_property writes the instance's
    # own dict, which the frozen dataclass allows; replace() makes a result without them)
    @cached_property
    def _governing(self) -> tuple[np.ndarray, np.ndarray]:
        return self._largest(self._strength_rows())

    @property
    def governing(self) -> np.ndarray:
        """Name of the stability or strength row with the largest ratio (NaN rows win: they
        fail); detailing rows (:func:`is_detailing`) never govern."""
        return self._governing[0]

    @property
    def governing_ratio(self) -> np.ndarray:
        """The ratio of the governing row (inf where it is NaN)."""
        return self._governing[1]

    @cached_property
    def worst(self) -> np.ndarray:
        """Name of the row with the largest ratio of all, detailing rows included (the
        reason a failing section gives)."""
        return self._largest(self.rows)[0]

    def detailing_at_limit(self, index=()) -> tuple[str, ...]:
        """The detailing rows at or above ``AT_LIMIT_RATIO`` for one section (``index``) or
        anywhere in the batch (``index=None``)."""
        out = []
        for r in self.rows:
            if is_detailing(r.name):
                v = np.broadcast_to(r.ratio, self.shape)
                v = v if index is None else v[index]
                if np.any(np.nan_to_num(v, nan=np.inf) >= AT_LIMIT_RATIO):
                    out.append(r.name)
        return tuple(out)

    def to_frame(self):
        """One row per section: key results, then ``<check>_ratio`` and ``<check>_passes``."""
        import pandas as pd

        shp = self.shape
        b = lambda v: np.broadcast_to(v, shp).reshape(-1)  # noqa: E731
        st = self.stability
        cols = {
            "footing_width_ft": st.footing_width_ft, "fs_overturning": st.fs_overturning,
            "fs_sliding": st.fs_sliding, "q_max_psf": st.q_max_psf,
            "eccentricity_ft": st.eccentricity_ft,
        }
        for m in ("stem", "heel", "toe"):
            r = getattr(self, m)
            for f in ("mu_lbft", "phi_mn_lbft", "vu_lb", "phi_vn_lb", "d_in"):
                cols[f"{m}_{f}"] = getattr(r, f)
        for r in self.rows:
            cols[f"{r.name}_ratio"] = r.ratio
            cols[f"{r.name}_passes"] = r.passes
        cols["utilization_max"] = self.utilization_max
        cols["governing"] = self.governing
        cols["passes"] = self.passes
        return pd.DataFrame({k: b(v) for k, v in cols.items()})

    def rows_frame(self, index=()):
        """The check rows of one section (``index`` into the batch; () for a scalar call)."""
        import pandas as pd

        return pd.DataFrame([{k: v for k, v in d.items()} for d in self._rows_at(index)])

    def _rows_at(self, index):
        out = []
        for r in self.rows:
            out.append({
                "name": r.name, "title": r.title, "demand": _val(r.demand, self.shape, index),
                "capacity": _val(r.capacity, self.shape, index), "unit": r.unit,
                "ratio": _val(r.ratio, self.shape, index),
                "passes": bool(np.broadcast_to(r.passes, self.shape)[index]),
                "clause": r.clause,
            })
        return out

    def to_dict(self, index=()) -> dict:
        """The result of one section as plain Python (the ``section --json`` object).

        Non-finite numbers become ``None``. Keys: ``footing_width_ft``, ``overturning``,
        ``sliding``, ``bearing``, ``stem``, ``heel``, ``toe``, ``checks``, ``passes``,
        ``utilization_max``, ``governing_check``, ``load_factors``.
        """
        shp = self.shape
        v = lambda a: _val(a, shp, index)  # noqa: E731
        out = self._stability_dict(index)
        out.update(self._members_dict(index))
        out["checks"] = self._rows_at(index)
        out["passes"] = bool(np.broadcast_to(self.passes, shp)[index])
        out["utilization_max"] = v(self.utilization_max)
        out["governing_check"] = str(np.broadcast_to(self.governing, shp)[index])
        out["governing_ratio"] = v(np.broadcast_to(self.governing_ratio, shp))
        out["detailing_at_limit"] = list(self.detailing_at_limit(index))
        out["load_factors"] = list(LOAD_FACTORS)
        if self.heel_textbook:
            out["load_factors"][2] = HEEL_TEXTBOOK_NOTE
        if self.stability.seismic is not None:
            out["seismic"] = self._seismic_dict(index)
            out["load_factors"].append(SEISMIC_LOAD_FACTOR_NOTE)
        if "key_flexure" in self.names:
            out["load_factors"].append(KEY_LOAD_FACTOR_NOTE)
        return out

    def _stability_dict(self, index) -> dict:
        shp = self.shape
        v = lambda a: _val(a, shp, index)  # noqa: E731
        st = self.stability
        ot, sl, br = self.row("overturning"), self.row("sliding"), self.row("bearing")
        return {
            "footing_width_ft": v(st.footing_width_ft),
            "design_height_ft": v(st.design_height_ft),
            "overturning": {
                "fs": v(st.fs_overturning), "fs_required": v(ot.demand),
                "m_overturning_lbft": v(st.m_overturning_lbft),
                "m_resisting_lbft": v(st.m_resisting_lbft),
                "resultant_in_base": bool(np.broadcast_to(st.resultant_in_base, shp)[index]),
                "passes": bool(np.broadcast_to(ot.passes, shp)[index]),
            },
            "sliding": {
                "fs": v(st.fs_sliding), "fs_required": v(sl.demand),
                "h_driving_lb": v(st.h_driving_lb), "h_resisting_lb": v(st.h_resisting_lb),
                "passive_lb": v(st.passive_lb),
                "friction_lb": v(st.h_resisting_lb - st.passive_lb),
                "sum_v_lb": v(st.sum_v_lb),
                "passes": bool(np.broadcast_to(sl.passes, shp)[index]),
            },
            "bearing": {
                "q_max_psf": v(st.q_max_psf), "q_min_psf": v(st.q_min_psf),
                "eccentricity_ft": v(st.eccentricity_ft), "allowable_psf": v(br.capacity),
                "case": ("with surcharge weight"
                         if bool(np.broadcast_to(st.bearing_with_surcharge, shp)[index])
                         else "without surcharge weight"),
                "passes": bool(np.broadcast_to(br.passes, shp)[index]),
            },
        }

    def _members_dict(self, index) -> dict:
        shp = self.shape
        v = lambda a: _val(a, shp, index)  # noqa: E731
        out = {}
        for m in ("stem", "heel", "toe"):
            r = getattr(self, m)
            out[m] = {f: v(getattr(r, f)) for f in
                      ("mu_lbft", "phi_mn_lbft", "vu_lb", "phi_vn_lb", "d_in", "thickness_in",
                       "as_in2", "as_min_in2", "spacing_in", "s_max_in", "cover_in", "phi",
                       "eps_t")}
        out["stem"].update(ldh_in=v(self.stem.ldh_in),
                           ldh_available_in=v(self.stem.ldh_available_in),
                           fs_service_psi=v(self.stem.fs_service_psi))
        for m in ("heel", "toe"):
            r = getattr(self, m)
            mc = int(np.broadcast_to(r.mu_combination, shp)[index])
            vc = int(np.broadcast_to(r.vu_combination, shp)[index])
            rf, rv = self.row(f"{m}_flexure"), self.row(f"{m}_shear")
            rat = [float(np.broadcast_to(x.ratio, shp)[index]) for x in (rf, rv)]
            hooked = bool(np.broadcast_to(r.hooked, shp)[index])
            out[m].update(
                combination=COMBINATIONS[vc if rat[1] >= rat[0] else mc],
                mu_combination=COMBINATIONS[mc], vu_combination=COMBINATIONS[vc],
                as_required_in2=v(r.as_required_in2),
                anchorage=(f"{int(np.broadcast_to(r.hook_angle_deg, shp)[index])}-degree hook"
                           if hooked else "straight"),
                ld_straight_in=v(r.ld_straight_in), ldh_in=v(r.ldh_in),
                ld_required_in=v(r.ld_required_in), ld_available_in=v(r.ld_available_in))
        return out

    def _seismic_dict(self, index) -> dict:
        shp = self.shape
        v = lambda a: _val(a, shp, index)  # noqa: E731
        sz = self.stability.seismic
        lf = sz.thrust.component("seismic increment")
        inertia = sum(c.horizontal_lb for c in sz.thrust.components
                      if c.name.startswith("inertia"))
        return {
            "delta_pae_lb": v(sz.delta_pae_lb),
            "delta_pae_design_lb": v(np.hypot(lf.horizontal_lb, lf.vertical_lb)),
            "inertia_lb": v(inertia),
            "fs_overturning": v(sz.fs_overturning),
            "fs_overturning_required": v(self.row("seismic_overturning").demand),
            "m_overturning_lbft": v(sz.m_overturning_lbft),
            "m_resisting_lbft": v(sz.m_resisting_lbft),
            "fs_sliding": v(sz.fs_sliding),
            "fs_sliding_required": v(self.row("seismic_sliding").demand),
            "h_driving_lb": v(sz.h_driving_lb), "h_resisting_lb": v(sz.h_resisting_lb),
            "sum_v_lb": v(sz.sum_v_lb),
            "q_max_psf": v(sz.q_max_psf), "q_min_psf": v(sz.q_min_psf),
            "eccentricity_ft": v(sz.eccentricity_ft),
            "resultant_in_base": bool(np.broadcast_to(sz.resultant_in_base, shp)[index]),
            "passes": all(bool(np.broadcast_to(self.row(n).passes, shp)[index]) for n in
                          ("seismic_overturning", "seismic_sliding", "seismic_bearing")),
        }


def _val(a, shape, index):
    x = float(np.broadcast_to(np.asarray(a, dtype=float), shape)[index])
    return x if math.isfinite(x) else None


def _footing_rows(name, face, mat, m, inputs, valid, shear_at="at"):
    """Flexure, shear, minimum steel and spacing of a footing cantilever (heel or toe)."""
    aci = "ACI 318-19"
    size_effect = inputs.criteria.footing_shear_size_effect
    shear = f"{aci} Table 22.5.5.1(c), " + ("lambda_s applied" if size_effect
                                           else "lambda_s neglected per 13.2.6.2")
    if shear_at != "at":
        shear += ", 7.4.3.2 by 13.2.7"
    title = name.capitalize()
    return (
        _row(f"{name}_flexure", f"{title} flexure at {face}", "lb-ft",
             f"{aci} 22.2, Table 21.2.2", m.mu_lbft, m.phi_mn_lbft, valid=valid),
        _row(f"{name}_shear", f"{title} shear {shear_at} {face}", "lb", shear, m.vu_lb,
             m.phi_vn_lb, valid=valid),
        _row(f"{name}_min_steel", f"{title} minimum steel ({mat})", "in2/ft",
             f"{aci} 7.6.1.1, 13.3.2.1", m.as_min_in2, m.as_in2, valid=valid),
        _row(f"{name}_spacing", f"{title} bar spacing", "in", f"{aci} 7.7.2.3", m.spacing_in,
             m.s_max_in, valid=valid),
    )


def _key_rows(k, valid):
    """The shear key as a plain-concrete cantilever below the footing (engine/key.py)."""
    aci = "ACI 318-19"
    return (
        _row("key_flexure", "Shear key flexure at the bottom of footing (plain concrete)",
             "lb-ft", f"{aci} 14.5.2.1, 14.5.1.7, Table 21.2.1", k.mu_lbft, k.phi_mn_lbft,
             valid=valid),
        _row("key_shear", "Shear key shear at the bottom of footing (plain concrete)", "lb",
             f"{aci} 14.5.5.1, 14.5.1.7, Table 21.2.1", k.vu_lb, k.phi_vn_lb, valid=valid),
    )


def check_section(geom: SectionGeometry, inputs: DesignInputs, bars: Reinforcement, *,
                  pressure: EarthPressure | None = None) -> SectionChecks:
    """Every check of every section: stability, stem, heel, toe, detailing.

    Args:
        geom: section geometry arrays; inputs: soil/loads/materials/criteria;
        bars: reinforcement (arrays broadcast against the geometry).
        pressure: a precomputed :func:`~.pressure.earth_pressure` (optional).

    Returns:
        SectionChecks (rows in a fixed order; the key rows only where a section of the
        batch has a key; the stem horizontal and footing longitudinal rows only when those
        bars are given).
    """
    p = pressure or earth_pressure(inputs)
    valid = geom.valid
    w = section_weights(geom, inputs)
    st = stability(geom, inputs, pressure=p, weights=w)
    stem = stem_strength(geom, inputs, bars.stem, pressure=p,
                         bottom_mat_in=bottom_mat_in(bars))
    heel = heel_strength(geom, inputs, bars.heel, st, pressure=p, weights=w,
                         hooked=bars.heel_hooked)
    toe = toe_strength(geom, inputs, bars.toe, st, pressure=p, weights=w,
                       hooked=bars.toe_hooked)
    rows = [*_stability_rows(geom, inputs, st, valid), *_stem_rows(stem, inputs, valid),
            *_footing_member_rows(heel, toe, inputs, valid)]
    if np.any(geom.has_key):
        rows.extend(_key_rows(key_strength(geom, inputs, p), valid))
    rows += _seismic_rows(st, inputs, valid) + _detailing_rows(geom, inputs, bars, valid)
    shape = np.broadcast_shapes(*(np.shape(r.ratio) for r in rows), geom.shape)
    passes = np.broadcast_to(valid, shape).copy()
    util = np.full(shape, -np.inf)
    for r in rows:
        passes &= r.passes
        util = np.maximum(util, r.ratio)  # NaN propagates
    return SectionChecks(tuple(rows), st, stem, heel, toe, p, np.asarray(valid), passes, util,
                         heel_textbook=not inputs.criteria.heel_upward_pressure)


_ACI = "ACI 318-19"


def _stability_rows(geom, inputs, st, valid) -> list:
    """Overturning, sliding, bearing and embedment (IBC 2021 1807.2.3, 1806.1, 1809.4)."""
    emb_req = max(inputs.criteria.min_embedment_ft, inputs.criteria.frost_depth_ft or 0.0)
    with np.errstate(divide="ignore", invalid="ignore"):
        ot_ratio = inputs.criteria.fs_overturning / st.fs_overturning
        br_ratio = np.where(st.resultant_in_base,
                            st.q_max_psf / inputs.soil.allowable_bearing_psf, np.inf)
    return [
        _row("overturning", "Overturning about the toe (FS)", "-", "IBC 2021 1807.2.3",
             inputs.criteria.fs_overturning, st.fs_overturning, ratio=ot_ratio,
             extra_ok=st.resultant_in_base, valid=valid),
        _row("sliding", "Sliding (FS)", "-", "IBC 2021 1807.2.3", inputs.criteria.fs_sliding,
             st.fs_sliding, valid=valid),
        _row("bearing", "Bearing pressure q_max", "psf",
             "IBC 2021 1806.1; allowable from the geotechnical report", st.q_max_psf,
             inputs.soil.allowable_bearing_psf, ratio=br_ratio, valid=valid),
        _row("embedment", "Embedment below front grade", "ft",
             "IBC 2021 1809.4, 1809.5 (frost)", emb_req, geom.embedment_ft, valid=valid),
    ]


def _stem_rows(stem, inputs, valid) -> list:
    """The stem's flexure and shear (at its base and up the height), steel, spacing, hook."""
    aci = _ACI
    return [
        _row("stem_flexure", "Stem flexure at top of footing", "lb-ft",
             f"{aci} 22.2, Table 21.2.2", stem.mu_lbft, stem.phi_mn_lbft, valid=valid),
        _row("stem_shear", "Stem shear at d above footing", "lb",
             f"{aci} Table 22.5.5.1(c) with lambda_s, 7.4.3.2", stem.vu_lb, stem.phi_vn_lb,
             valid=valid),
        _row("stem_flexure_height", "Stem flexure up the height", "lb-ft",
             f"{aci} 13.3.6.3, 22.2", stem.height_mu_lbft, stem.height_phi_mn_lbft, valid=valid),
        _row("stem_shear_height", "Stem shear up the height", "lb",
             f"{aci} 13.3.6.3, Table 22.5.5.1(c)", stem.height_vu_lb, stem.height_phi_vn_lb,
             valid=valid),
        _row("stem_min_steel", "Stem minimum vertical steel", "in2/ft", f"{aci} 7.6.1.1",
             stem.as_min_in2, stem.as_in2, valid=valid),
        _row("stem_spacing", "Stem bar spacing (3h, 18 in, crack control)", "in",
             f"{aci} 7.7.2.3, 24.3.2" if inputs.criteria.crack_control else f"{aci} 7.7.2.3",
             stem.spacing_in, stem.s_max_in, valid=valid),
        _row("stem_hook", "Stem bar hook development into footing (on the bottom mat)", "in",
             f"{aci} 25.4.3.1, Table 25.3.1", stem.ldh_in, stem.ldh_available_in, valid=valid),
    ]


def _footing_member_rows(heel, toe, inputs, valid) -> list:
    """The heel and toe as members, the toe's depth and both bars' development."""
    aci = _ACI
    return [
        *_footing_rows("heel", "back face of stem", "top", heel, inputs, valid),
        *_footing_rows("toe", "front face of stem", "bottom", toe, inputs, valid,
                       shear_at="at d from"),
        _row("toe_depth", "Footing depth above bottom bars", "in", f"{aci} 13.3.1.2",
             TOE_MIN_DEPTH_IN, toe.d_in, valid=valid),
        _row("heel_development", "Heel top bars developed beyond the stem's back face", "in",
             f"{aci} 25.4.2.3 (straight) or 25.4.3.1 (hooked), 25.4.10.1",
             heel.ld_required_in, heel.ld_available_in, valid=valid),
        _row("toe_development", "Toe bottom bars developed beyond the stem's front face", "in",
             f"{aci} 25.4.2.3 (straight) or 25.4.3.1 (hooked), 25.4.10.1",
             toe.ld_required_in, toe.ld_available_in, valid=valid),
    ]


def _seismic_rows(st, inputs, valid) -> list:
    """The stability checks of the seismic case (none without [seismic])."""
    rows = []
    sz = st.seismic
    if sz is not None:
        si = inputs.loads.seismic
        with np.errstate(divide="ignore", invalid="ignore"):
            sot_ratio = si.fs_overturning / sz.fs_overturning
            sbr_ratio = np.where(sz.resultant_in_base,
                                 sz.q_max_psf / inputs.soil.allowable_bearing_psf, np.inf)
        clause = f"IBC 2021 1807.2.3 ({si.load_factor:g} E, {si.method})"
        rows.append(_row("seismic_overturning", "Overturning with seismic (FS)", "-", clause,
                         si.fs_overturning, sz.fs_overturning, ratio=sot_ratio,
                         extra_ok=sz.resultant_in_base, valid=valid))
        rows.append(_row("seismic_sliding", "Sliding with seismic (FS)", "-", clause,
                         si.fs_sliding, sz.fs_sliding, valid=valid))
        rows.append(_row("seismic_bearing", "Bearing pressure q_max with seismic", "psf",
                         clause + "; allowable not increased", sz.q_max_psf,
                         inputs.soil.allowable_bearing_psf, ratio=sbr_ratio, valid=valid))
    return rows


def _detailing_rows(geom, inputs, bars, valid) -> list:
    """The stem horizontal and footing longitudinal bars, when given."""
    aci = _ACI
    rows = []
    if bars.horizontal is not None:
        hb = bars.horizontal
        t_avg = (geom.stem_top_in + geom.stem_base_in) / 2.0
        rows.append(_row("stem_horizontal_steel", "Stem horizontal steel (average thickness)",
                         "in2/ft", f"{aci} 11.1.6, Table 11.6.1",
                         wall_horizontal_min_in2(t_avg, hb.size, inputs.materials.fy_psi),
                         bars.horizontal_layers * hb.area_in2_per_ft, valid=valid))
        rows.append(_row("stem_horizontal_spacing", "Stem horizontal bar spacing", "in",
                         f"{aci} 11.7.3.1", hb.spacing_in,
                         max_flexural_spacing_in(geom.stem_top_in), valid=valid))
    if bars.longitudinal is not None:
        lb = bars.longitudinal
        T = geom.footing_thickness_in
        rows.append(_row("footing_longitudinal_steel", "Footing longitudinal (S+T) steel",
                         "in2/ft", f"{aci} 24.4.3.2", shrinkage_steel_in2(T),
                         bars.longitudinal_layers * lb.area_in2_per_ft, valid=valid))
        rows.append(_row("footing_longitudinal_spacing", "Footing longitudinal bar spacing",
                         "in", f"{aci} 24.4.3.3", lb.spacing_in, shrinkage_spacing_in(T),
                         valid=valid))
    return rows


def bottom_mat_in(bars: Reinforcement):
    """Depth of the footing's bottom mat that the stem hooks rest on: the toe bars and, when
    given, the longitudinal bars over them (diameters, in)."""
    out = bars.toe.diameter_in
    if bars.longitudinal is not None:
        out = out + bars.longitudinal.diameter_in
    return out


# the names in order, for callers that want them without running a check
CHECK_NAMES = (
    "overturning", "sliding", "bearing", "embedment", "stem_flexure", "stem_shear",
    "stem_flexure_height", "stem_shear_height", "stem_min_steel", "stem_spacing", "stem_hook",
    "heel_flexure", "heel_shear", "heel_min_steel", "heel_spacing", "toe_flexure", "toe_shear",
    "toe_min_steel", "toe_spacing", "toe_depth", "heel_development", "toe_development",
)
OPTIONAL_CHECK_NAMES = ("stem_horizontal_steel", "stem_horizontal_spacing",
                        "footing_longitudinal_steel", "footing_longitudinal_spacing")
SEISMIC_CHECK_NAMES = ("seismic_overturning", "seismic_sliding", "seismic_bearing")
KEY_CHECK_NAMES = ("key_flexure", "key_shear")  # where a section of the batch has a key

__all__ = ["CHECK_NAMES", "KEY_CHECK_NAMES", "LOAD_FACTORS", "OPTIONAL_CHECK_NAMES",
           "SEISMIC_CHECK_NAMES",
           "CheckRow", "SectionChecks", "check_section", "DesignInputs", "Reinforcement",
           "SectionGeometry"]
