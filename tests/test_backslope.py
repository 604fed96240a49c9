"""Sloping backfill: Rankine Ka for a backslope, the virtual back H', the soil polygon over the
heel, the limit beta -> 0, the engine against the independent audit, files and sizing."""

import math
from pathlib import Path

import numpy as np
import pytest
from groundhog.excavations.basic import earthpressurecoefficients_rankine
from test_audit import _close, random_batch
from test_sizing import assert_matches_exhaustive, small_grid
from wallsched.engine.audit import audit_details
from wallsched.engine.checks import check_section
from wallsched.engine.pressure import (
    backslope_from_ratio,
    design_thrust,
    earth_pressure,
    rankine_ka_sloping,
    virtual_back_height_ft,
)
from wallsched.engine.section import (
    BarArrays,
    DesignInputs,
    Reinforcement,
    SectionGeometry,
    polygon_area_centroid,
    retained_soil_polygons,
    section_weights,
)

from wallsched.errors import InputError
from wallsched.section_file import load_section

DATA = Path(__file__).parent / "data" / "sections"

SOIL = dict(unit_weight_pcf=120.0, friction_coefficient=0.45, allowable_bearing_psf=4000.0,
            friction_angle_deg=32.0, passive_from_friction_angle=True, surcharge_psf=150.0)


def agree_with_audit(inp, n=120, seed=7):
    """Every check's demand, capacity and pass/fail, engine against audit, on random sections;
    returns the number of sections compared."""
    rng = np.random.default_rng(seed)
    geo, bars = random_batch(rng, n)
    res = check_section(SectionGeometry(**geo), inp,
                        Reinforcement(*(BarArrays(*bars[m]) for m in ("stem", "heel", "toe"))))
    bad = []
    for i in range(n):
        gi = {k: float(v[i]) for k, v in geo.items()}
        bi = {m: (int(bars[m][0][i]), float(bars[m][1][i])) for m in ("stem", "heel", "toe")}
        rows, vals = audit_details(inp, gi, bi)
        for r in res.rows:
            a = rows[r.name]
            dem = float(np.broadcast_to(r.demand, (n,))[i])
            cap = float(np.broadcast_to(r.capacity, (n,))[i])
            ratio = float(r.ratio[i])
            if not (_close(a.demand, dem) and _close(a.capacity, cap)):
                bad.append((i, r.name, a, dem, cap))
            elif abs(ratio - 1.0) > 1e-7 and a.passes != bool(r.passes[i]):
                bad.append((i, r.name, a, bool(r.passes[i])))
        for key, arr in (("m_overturning_lbft", res.stability.m_overturning_lbft),
                         ("h_driving_lb", res.stability.h_driving_lb),
                         ("q_max_psf", res.stability.q_max_psf)):
            if not _close(vals[key], float(arr[i])):
                bad.append((i, key, vals[key], float(arr[i])))
    assert not bad, bad[:5]
    return n


def test_rankine_backslope_against_formula_and_groundhog():
    # REFERENCES.md section 5 (McCormac & Brown 9th ed. 13.5): phi 30, beta 20 -> 0.4142
    assert float(rankine_ka_sloping(30.0, 20.0)) == pytest.approx(0.4142, abs=5e-5)
    for phi, beta in ((30, 20), (34, 26.565), (28, 10), (36, 33.69)):
        gh = earthpressurecoefficients_rankine(phi, 0.0, beta)["KaR [-]"]  # groundhog
        assert float(rankine_ka_sloping(phi, beta)) == pytest.approx(float(gh), rel=1e-9)
    # beta = 0 is tan^2(45 - phi/2) (Rankine 1857)
    assert float(rankine_ka_sloping(30.0, 0.0)) == pytest.approx(1.0 / 3.0, rel=1e-12)


def test_slope_ratio():
    # 2:1 (horizontal:vertical) is atan(1/2) = 26.565 deg (closed form)
    assert backslope_from_ratio("2:1") == pytest.approx(math.degrees(math.atan(0.5)))
    assert backslope_from_ratio("3 : 1") == pytest.approx(18.4349, abs=1e-4)
    for bad in ("2-1", "0:1", "a:b", "2:1:1"):
        with pytest.raises(ValueError):
            backslope_from_ratio(bad)


def geom(**kw):
    base = dict(retained_height_ft=8.0, embedment_ft=2.0, footing_thickness_in=15.0,
                stem_top_in=10.0, stem_base_in=12.0, toe_ft=2.5, heel_ft=5.5, freeboard_ft=0.5)
    base.update(kw)
    return SectionGeometry(**base)


def test_virtual_back_and_thrust_by_hand():
    inp = DesignInputs.of(**SOIL, backslope_deg=20.0)
    g = geom()
    # grade meets the back face at x = 2.5 + 1.0 - (2/12)(8.75/9.25); H' = H + run tan(beta)
    x_gf = 3.5 - (2.0 / 12.0) * 8.75 / 9.25
    hv = 10.0 + (9.0 - x_gf) * math.tan(math.radians(20.0))
    assert float(virtual_back_height_ft(g, inp)) == pytest.approx(hv, rel=1e-12)
    ka = float(rankine_ka_sloping(32.0, 20.0))
    th = design_thrust(g, inp)
    pa = 0.5 * ka * 120.0 * hv * hv  # thrust parallel to the slope at H'/3 (McCormac 13.5)
    pq = ka * 150.0 * hv  # surcharge as extra soil height, at H'/2
    c, s = math.cos(math.radians(20.0)), math.sin(math.radians(20.0))
    assert float(th.horizontal_lb) == pytest.approx((pa + pq) * c, rel=1e-12)
    assert float(th.vertical_lb) == pytest.approx((pa + pq) * s, rel=1e-12)
    assert float(th.moment_lbft) == pytest.approx((pa * hv / 3 + pq * hv / 2) * c, rel=1e-12)


def test_polygon_equals_closed_form_level_and_battered():
    # level ground: the polygon over the heel and the battered face equals the rectangle and
    # triangle of the closed forms (engine/section.py section_weights, closed form)
    inp = DesignInputs.of(**SOIL)
    for top, base in ((10.0, 10.0), (8.0, 14.0)):
        g = geom(stem_top_in=top, stem_base_in=base)
        w = section_weights(g, inp)
        heel, bat = retained_soil_polygons(g, inp)
        ah, xh, _ = polygon_area_centroid(*heel)
        ab, xb, _ = polygon_area_centroid(*bat)
        assert float(120 * ah) == pytest.approx(float(w.soil_heel.lb), rel=1e-12)
        assert float(xh) == pytest.approx(float(w.soil_heel.arm_ft), rel=1e-12)
        assert float(120 * ab) == pytest.approx(float(w.soil_batter.lb), rel=1e-12, abs=1e-9)
        if base > top:
            assert float(xb) == pytest.approx(float(w.soil_batter.arm_ft), rel=1e-12)
        # hand: heel 5.5 ft x hs 8.75 ft (closed form)
        assert float(ah) == pytest.approx(5.5 * 8.75, rel=1e-12)


def test_polygon_with_slope_by_hand():
    inp = DesignInputs.of(**SOIL, backslope_deg=20.0)
    g = geom(stem_top_in=12.0)  # vertical back face: the grade meets it at x = 3.5
    w = section_weights(g, inp)
    t = math.tan(math.radians(20.0))
    # trapezoid over the heel: depths 8.75 at x = 3.5 and 8.75 + 5.5 t at x = 9.0
    d0, d1 = 8.75, 8.75 + 5.5 * t
    area = (d0 + d1) / 2 * 5.5
    x_c = 3.5 + 5.5 * (d0 + 2 * d1) / (3 * (d0 + d1))  # trapezoid centroid (closed form)
    assert float(w.soil_heel.lb) == pytest.approx(120 * area, rel=1e-12)
    assert float(w.soil_heel.arm_ft) == pytest.approx(x_c, rel=1e-12)
    assert float(w.soil_batter.lb) == pytest.approx(0.0, abs=1e-9)


def test_beta_to_zero_gives_level():
    g = geom(retained_height_ft=np.array([4.0, 9.0, 14.0]))
    bars = Reinforcement(BarArrays(6, 8.0), BarArrays(6, 10.0), BarArrays(5, 12.0))
    level = check_section(g, DesignInputs.of(**SOIL), bars)
    tiny = check_section(g, DesignInputs.of(**SOIL, backslope_deg=1e-7), bars)
    for a, b in zip(level.rows, tiny.rows, strict=True):
        assert np.allclose(a.demand, b.demand, rtol=1e-6) and np.allclose(
            a.capacity, b.capacity, rtol=1e-6), a.name


def test_steeper_slope_more_thrust():
    g = geom()
    hs = [float(design_thrust(g, DesignInputs.of(**SOIL, backslope_deg=b)).horizontal_lb)
          for b in (0.0, 10.0, 20.0, 30.0)]
    assert all(b > a for a, b in zip(hs, hs[1:], strict=False))


@pytest.mark.parametrize("kw", [dict(backslope_deg=18.0),
                                dict(backslope_deg=26.0, batter_face="front"),
                                dict(backslope_deg=12.0, surcharge_resists=True,
                                     count_toe_soil=False)])
def test_engine_agrees_with_audit_backslope(kw):
    assert agree_with_audit(DesignInputs.of(**{**SOIL, **kw})) == 120


def test_efp_with_backslope_acts_horizontally():
    soil = dict(SOIL, friction_angle_deg=None, passive_from_friction_angle=False,
                passive_efp_pcf=300.0, active_efp_pcf=45.0)
    inp = DesignInputs.of(**soil, backslope_deg=18.0)
    g = geom()
    hv = float(virtual_back_height_ft(g, inp))
    th = design_thrust(g, inp)
    # the report's EFP for the sloped condition, horizontal on H' (DESIGN.md section 7 rule)
    assert float(th.horizontal_lb) == pytest.approx(0.5 * 45 * hv * hv + 45 / 120 * 150 * hv)
    assert float(th.vertical_lb) == 0.0
    assert agree_with_audit(inp, n=60) == 60


def test_section_file_backslope(tmp_path):
    sf = load_section(DATA / "backslope_seismic.toml")
    inp = sf.design_inputs()
    assert inp.soil.backslope_deg == pytest.approx(math.degrees(math.atan(0.5)))
    p = earth_pressure(inp)
    assert p.inclination_deg == pytest.approx(inp.soil.backslope_deg)
    text = (DATA / "backslope_seismic.toml").read_text()
    bad = tmp_path / "bad.toml"
    bad.write_text(text.replace('backslope = "2:1"', 'backslope = "2-1"'))
    with pytest.raises(InputError, match="backslope"):
        load_section(bad)
    bad.write_text(text.replace('backslope = "2:1"', 'backslope = "2:1"\nbackslope_deg = 20'))
    with pytest.raises(InputError, match="not both"):
        load_section(bad)
    bad.write_text(text.replace('backslope = "2:1"', 'backslope = "1:1"'))  # 45 > phi 34
    with pytest.raises(InputError, match="steeper"):
        load_section(bad)


def test_sizing_equals_exhaustive_with_backslope():
    inputs = DesignInputs.of(unit_weight_pcf=115.0, friction_coefficient=0.5,
                          allowable_bearing_psf=3500.0, friction_angle_deg=32.0,
                          passive_efp_pcf=300.0, surcharge_psf=100.0, backslope_deg=18.0)
    assert_matches_exhaustive(inputs, small_grid(False))


def test_sizing_equals_exhaustive_with_backslope_and_battered_stem():
    inputs = DesignInputs.of(unit_weight_pcf=115.0, friction_coefficient=0.5,
                          allowable_bearing_psf=3500.0, friction_angle_deg=32.0,
                          passive_efp_pcf=300.0, surcharge_psf=100.0, backslope_deg=18.0)
    # back face battered: the heel's load depends on the stem
    assert_matches_exhaustive(inputs, small_grid(True))
