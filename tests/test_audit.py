"""The vectorized engine against the independent plain-float audit (engine/audit.py).

11,200 random sections (fixed seed) over every combination of the convention switches, then a
hypothesis search on single sections: every check's demand, capacity and pass/fail, and the
headline values of the JSON, must agree.
"""

import itertools
import math

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from wallsched.engine.audit import audit_details, audit_section
from wallsched.engine.checks import (
    CHECK_NAMES,
    KEY_CHECK_NAMES,
    OPTIONAL_CHECK_NAMES,
    check_section,
)
from wallsched.engine.section import (
    GEOMETRY_FIELDS,
    BarArrays,
    DesignInputs,
    Reinforcement,
    SectionGeometry,
)

SIZES = np.array([4, 5, 6, 7, 8, 9, 10, 11])


def random_inputs(rng, batter, resists, toe_soil, passive):
    by_phi = rng.random() < 0.5
    kw = dict(
        unit_weight_pcf=rng.uniform(95, 135), friction_coefficient=rng.uniform(0.25, 0.6),
        allowable_bearing_psf=rng.uniform(1500, 6000),
        surcharge_psf=float(rng.choice([0.0, rng.uniform(50, 500)])),
        fc_psi=float(rng.choice([3000.0, 4000.0, rng.uniform(2500, 8500)])),
        fy_psi=float(rng.choice([40000.0, 60000.0, 80000.0])),
        concrete_unit_weight_pcf=rng.uniform(140, 155),
        fs_overturning=rng.uniform(1.3, 2.0), fs_sliding=rng.uniform(1.3, 2.0),
        count_toe_soil=toe_soil, use_passive=passive, passive_neglect_ft=rng.uniform(0, 2),
        surcharge_resists=resists, batter_face=batter,
        min_embedment_ft=rng.uniform(0.5, 2.5),
        frost_depth_ft=float(rng.uniform(0, 3)) if rng.random() < 0.3 else None,
        cover_stem_in=float(rng.uniform(1.5, 3)) if rng.random() < 0.3 else None,
        cover_heel_in=float(rng.uniform(1.5, 3)) if rng.random() < 0.3 else None,
        cover_toe_in=float(rng.choice([3.0, rng.uniform(2, 4)])),
        footing_shear_size_effect=bool(rng.random() < 0.3),
        crack_control=bool(rng.random() < 0.7), hook_psi_o=float(rng.choice([1.0, 1.25])),
        heel_upward_pressure=bool(rng.random() < 0.75),
    )
    if by_phi:
        kw["friction_angle_deg"] = rng.uniform(24, 42)
        if passive and rng.random() < 0.5:
            kw["passive_from_friction_angle"] = True
        elif passive:
            kw["passive_efp_pcf"] = rng.uniform(150, 450)
    else:
        kw["active_efp_pcf"] = rng.uniform(25, 65)
        if passive:
            kw["passive_efp_pcf"] = rng.uniform(150, 450)
    return DesignInputs.of(**kw)


def random_batch(rng, n):
    h = rng.uniform(1.0, 20.0, n)
    D = rng.uniform(0.5, 5.0, n)
    T = np.minimum(rng.uniform(10.0, 36.0, n), 12 * (h + D) - 2)
    top = rng.uniform(8.0, 16.0, n)
    base = top + rng.choice([0.0, 1.0], n) * rng.uniform(0.0, 12.0, n)
    toe = rng.uniform(0.0, 8.0, n)
    heel = rng.uniform(0.0, 12.0, n)
    B = toe + base / 12 + heel
    has_key = rng.random(n) < 0.4
    kw_in = np.where(has_key, np.minimum(rng.uniform(10, 18, n), 12 * B), 0.0)
    kd_in = np.where(has_key, rng.uniform(6, 24, n), 0.0)
    ko = rng.uniform(0.0, 1.0, n) * np.maximum(B - kw_in / 12, 0.0)
    geo = dict(retained_height_ft=h, embedment_ft=D, footing_thickness_in=T, stem_top_in=top,
               stem_base_in=base, toe_ft=toe, heel_ft=heel, key_width_in=kw_in,
               key_depth_in=kd_in, key_offset_ft=ko, freeboard_ft=rng.uniform(0, 2, n))
    bars = {m: (rng.choice(SIZES, n), np.round(rng.uniform(4, 18, n), 1))
            for m in ("stem", "heel", "toe", "horizontal", "longitudinal")}
    return geo, bars


def _close(a, b, rtol=1e-7, atol=1e-6):
    if a is None or b is None or (isinstance(a, float) and math.isnan(a)):
        return (a is None or math.isnan(a)) and (b is None or math.isnan(b))
    if math.isinf(a) or math.isinf(b):
        return a == b
    return abs(a - b) <= atol + rtol * max(abs(a), abs(b))


def compare(inp, geo, bars, with_optional):
    g = SectionGeometry(**geo)
    reinf = Reinforcement(
        BarArrays(*bars["stem"]), BarArrays(*bars["heel"]), BarArrays(*bars["toe"]),
        horizontal=BarArrays(*bars["horizontal"]) if with_optional else None,
        longitudinal=BarArrays(*bars["longitudinal"]) if with_optional else None)
    res = check_section(g, inp, reinf)
    assert bool(np.all(g.valid))
    n = len(geo["retained_height_ft"])
    keyed = bool(np.any(g.has_key))
    names = (CHECK_NAMES + (KEY_CHECK_NAMES if keyed else ())
             + (OPTIONAL_CHECK_NAMES if with_optional else ()))
    assert res.names == names
    bad = []
    for i in range(n):
        gi = {k: float(v[i]) for k, v in geo.items()}
        bi = {k: (int(v[0][i]), float(v[1][i])) for k, v in bars.items()
              if with_optional or k in ("stem", "heel", "toe")}
        rows, vals = audit_details(inp, gi, bi)
        for r in res.rows:
            if r.name in KEY_CHECK_NAMES and not g.has_key[i]:
                assert float(r.ratio[i]) == 0.0  # no key: nothing to carry
            a = rows[r.name]
            ratio = float(r.ratio[i])
            ok = (_close(a.demand, float(r.demand[i]) if np.ndim(r.demand) else float(r.demand))
                  and _close(a.capacity, float(np.broadcast_to(r.capacity, (n,))[i])))
            boundary = abs(ratio - 1.0) < 1e-7
            if not ok or (not boundary and a.passes != bool(r.passes[i])):
                bad.append((i, r.name, a, float(np.broadcast_to(r.demand, (n,))[i]),
                            float(np.broadcast_to(r.capacity, (n,))[i]), bool(r.passes[i])))
        st = res.stability
        for key, arr in (("footing_width_ft", st.footing_width_ft),
                         ("m_overturning_lbft", st.m_overturning_lbft),
                         ("m_resisting_lbft", st.m_resisting_lbft),
                         ("h_driving_lb", st.h_driving_lb), ("h_resisting_lb", st.h_resisting_lb),
                         ("q_max_psf", st.q_max_psf), ("eccentricity_ft", st.eccentricity_ft),
                         ("toe_vu_lb", res.toe.vu_lb), ("stem_vu_lb", res.stem.vu_lb),
                         ("heel_vu_lb", res.heel.vu_lb), ("heel_mu_lbft", res.heel.mu_lbft),
                         ("toe_mu_lbft", res.toe.mu_lbft)):
            if not _close(vals[key], float(arr[i])):
                bad.append((i, key, vals[key], float(arr[i])))
    assert not bad, bad[:5]
    return n


def test_engine_agrees_with_audit_on_random_sections():
    rng = np.random.default_rng(20240601)
    total = 0
    combos = list(itertools.product(("back", "front"), (False, True), (False, True),
                                    (False, True)))
    for k, (batter, resists, toe_soil, passive) in enumerate(combos):
        for _ in range(2):
            inp = random_inputs(rng, batter, resists, toe_soil, passive)
            geo, bars = random_batch(rng, 350)
            total += compare(inp, geo, bars, with_optional=bool(k % 2))
    assert total >= 10_000


@st.composite
def one_section(draw):
    seed = draw(st.integers(0, 2**32 - 1))
    rng = np.random.default_rng(seed)
    combo = (draw(st.sampled_from(["back", "front"])), draw(st.booleans()), draw(st.booleans()),
             draw(st.booleans()))
    inp = random_inputs(rng, *combo)
    geo, bars = random_batch(rng, 1)
    # hypothesis drives the geometry near the edges the random batch rarely reaches
    geo["toe_ft"] = np.array([draw(st.sampled_from([0.0, 0.25, float(geo["toe_ft"][0])]))])
    geo["heel_ft"] = np.array([draw(st.sampled_from([0.0, 0.5, float(geo["heel_ft"][0])]))])
    B = geo["toe_ft"] + geo["stem_base_in"] / 12 + geo["heel_ft"]
    geo["key_width_in"] = np.minimum(geo["key_width_in"], 12 * B)
    geo["key_offset_ft"] = np.clip(geo["key_offset_ft"], 0.0, B - geo["key_width_in"] / 12)
    return inp, geo, bars


@settings(max_examples=300, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(one_section())
def test_engine_agrees_with_audit_hypothesis(case):
    inp, geo, bars = case
    compare(inp, geo, bars, with_optional=True)
    # scalar engine call equals the batch element
    g1 = SectionGeometry(**{k: float(v[0]) for k, v in geo.items()})
    r1 = check_section(g1, inp, Reinforcement(*(BarArrays(int(bars[m][0][0]), bars[m][1][0])
                                                for m in ("stem", "heel", "toe"))))
    ga = SectionGeometry(**geo)
    ra = check_section(ga, inp, Reinforcement(*(BarArrays(*bars[m]) for m in
                                                ("stem", "heel", "toe"))))
    for a, b in zip(r1.rows, ra.rows, strict=True):
        assert _close(float(a.ratio), float(b.ratio[0]), rtol=1e-12, atol=1e-12)
    assert bool(r1.passes) == bool(ra.passes[0])


def test_audit_section_shape():
    inp = DesignInputs.of(unit_weight_pcf=120, friction_coefficient=0.4, allowable_bearing_psf=2500,
                       active_efp_pcf=35, passive_efp_pcf=300, surcharge_psf=250)
    geo = dict(retained_height_ft=6.0, embedment_ft=2.0, footing_thickness_in=14.0,
               stem_top_in=10.0, stem_base_in=10.0, toe_ft=2.0, heel_ft=4.0)
    rows = audit_section(inp, geo, {"stem": "#5@12", "heel": "#5@12", "toe": "#5@12"})
    assert tuple(rows) == CHECK_NAMES + KEY_CHECK_NAMES  # no key: its rows 0 / 0
    assert all(r.passes for r in rows.values())
    d, c, ok = rows["stem_flexure"]
    assert d < c and ok
    assert set(GEOMETRY_FIELDS) >= set(geo)
    # a resultant outside the base: overturning and bearing fail, no bearing number
    bad = audit_section(inp, dict(geo, retained_height_ft=14.0, toe_ft=0.5, heel_ft=0.5),
                        {"stem": "#5@12", "heel": "#5@12", "toe": "#5@12"})
    assert not bad["overturning"].passes and not bad["bearing"].passes
    assert math.isnan(bad["bearing"].demand)


@pytest.mark.parametrize("field", ["retained_height_ft", "heel_ft", "stem_spacing"])
def test_nan_never_passes(field):
    inp = DesignInputs.of(unit_weight_pcf=120, friction_coefficient=0.4, allowable_bearing_psf=2500,
                       active_efp_pcf=35, passive_efp_pcf=300, surcharge_psf=250)
    geo = dict(retained_height_ft=np.array([6.0, 6.0]), embedment_ft=2.0,
               footing_thickness_in=14.0, stem_top_in=10.0, stem_base_in=10.0, toe_ft=2.0,
               heel_ft=np.array([4.0, 4.0]))
    if field == "stem_spacing":
        bars = Reinforcement(BarArrays(5, np.array([12.0, np.nan])), BarArrays(5, 12.0),
                             BarArrays(5, 12.0))
    else:
        geo[field] = np.array([geo[field][0], np.nan])
        bars = Reinforcement(BarArrays(5, 12.0), BarArrays(5, 12.0), BarArrays(5, 12.0))
    res = check_section(SectionGeometry(**geo), inp, bars)
    assert bool(res.passes[0]) and not bool(res.passes[1])
    assert np.isnan(res.utilization_max[1]) or np.isinf(res.utilization_max[1])
