"""Water behind the wall: hydrostatic pressure, buoyant soil, uplift; a level below the footing
is the drained result; the audit agrees; files."""

import numpy as np
import pytest
from test_backslope import DATA, SOIL, agree_with_audit, geom
from wallsched.engine.checks import check_section
from wallsched.engine.pressure import design_thrust, soil_profile, water_profile
from wallsched.engine.section import (
    BarArrays,
    DesignInputs,
    Reinforcement,
    WaterTable,
    section_weights,
)

from wallsched.errors import InputError
from wallsched.section_file import load_section

PHI30 = dict(SOIL, friction_angle_deg=30.0, unit_weight_pcf=125.0, surcharge_psf=0.0)


def test_hydrostatic_by_hand():
    # H = 10 ft, water 4 ft above the bottom of footing; Ka = 1/3 (Rankine); buoyant 125 - 62.4
    inp = DesignInputs.of(**PHI30, water=WaterTable(4.0))
    th = design_thrust(geom(stem_top_in=12.0), inp)
    ka, g, gb, gw = 1 / 3, 125.0, 125.0 - 62.4, 62.4
    soil = ka * (g * 6 ** 2 / 2 + g * 6 * 4 + gb * 4 ** 2 / 2)  # trapezoid + triangle, by hand
    water = gw * 4 ** 2 / 2
    assert float(th.horizontal_lb) == pytest.approx(soil + water, rel=1e-12)
    m = ka * (g * 36 / 2 * (4 + 2) + g * 6 * 4 * 2 + gb * 16 / 2 * 4 / 3) + water * 4 / 3
    assert float(th.moment_lbft) == pytest.approx(m, rel=1e-12)
    f, mm = water_profile(10.0, 4.0)
    assert (float(f), float(mm)) == pytest.approx((499.2, 499.2 * 4 / 3))
    # dry plane: the triangle K gamma H^2/2 at H/3 (McCormac & Brown 13.5)
    f, mm = soil_profile(ka, g, 10.0, 0.0)
    assert (float(f), float(mm)) == pytest.approx((ka * g * 50, ka * g * 50 * 10 / 3))


def test_one_free_body_total_soil_and_uplift_by_hand():
    # DESIGN.md 7 (water): the soil over the heel at its total unit weight with the full
    # uplift under it, never a buoyant weight as well (that counts the water twice)
    g = geom(stem_top_in=12.0)  # heel 5.5 ft, T = 1.25 ft, B = 9 ft, hs = 8.75 ft
    dry = section_weights(g, DesignInputs.of(**PHI30))
    wet = section_weights(g, DesignInputs.of(**PHI30, water=WaterTable(4.0)))
    assert float(wet.soil_heel.lb) == pytest.approx(float(dry.soil_heel.lb), rel=1e-12)
    # a saturated unit weight below the level: + (135 - 125) x the submerged soil
    sat = section_weights(g, DesignInputs.of(**PHI30, water=WaterTable(4.0, 135.0)))
    assert float(sat.soil_heel.lb) == pytest.approx(
        float(dry.soil_heel.lb) + 10.0 * 5.5 * (4.0 - 1.25), rel=1e-12)
    # uplift: 62.4 x 4 ft head at the heel edge falling to 0 at the toe: 62.4*4*9/2 at 6 ft
    assert float(wet.uplift.lb) == pytest.approx(-62.4 * 4 * 9 / 2, rel=1e-12)
    assert float(wet.uplift.arm_ft) == pytest.approx(6.0, rel=1e-12)


def test_water_counted_once_the_issue_case():
    # issue 14: an 11 ft section with a 6.5 ft heel and the level 6 ft above the bottom of
    # footing; the double count was gamma_w x the submerged soil over the heel, 62.4 x 6.5 x
    # (6 - 1.5) = 1,825 lb per ft (the issue: 10,497 -> 12,322 lb of Sum V)
    g = geom(retained_height_ft=9.0, embedment_ft=2.0, footing_thickness_in=18.0,
             stem_top_in=12.0, stem_base_in=12.0, toe_ft=2.0, heel_ft=6.5)
    inp = DesignInputs.of(**PHI30, water=WaterTable(6.0))
    v, _ = section_weights(g, inp).dead()
    dry_v, _ = section_weights(g, DesignInputs.of(**PHI30)).dead()
    uplift = 62.4 * 6.0 * float(g.footing_width_ft) / 2
    assert float(v) == pytest.approx(float(dry_v) - uplift, rel=1e-12)
    buoyant_once = float(dry_v) - uplift - 62.4 * 6.5 * (6.0 - 1.5)
    assert float(v) - buoyant_once == pytest.approx(1825.2, abs=0.05)
    # the lateral side is effective stress (buoyant below the level) plus the water itself
    th = design_thrust(g, inp)
    gb = 125.0 - 62.4
    ka = 1 / 3
    soil = ka * (125 * 5 ** 2 / 2 + 125 * 5 * 6 + gb * 6 ** 2 / 2)
    assert float(th.horizontal_lb) == pytest.approx(soil + 62.4 * 36 / 2, rel=1e-12)
    # and with a saturated unit weight the effective stress below the level is 135 - 62.4
    th_sat = design_thrust(g, DesignInputs.of(**PHI30, water=WaterTable(6.0, 135.0)))
    soil_sat = ka * (125 * 5 ** 2 / 2 + 125 * 5 * 6 + (135 - 62.4) * 6 ** 2 / 2)
    assert float(th_sat.horizontal_lb) == pytest.approx(soil_sat + 62.4 * 36 / 2, rel=1e-12)


@pytest.mark.parametrize("level", [0.0, -2.0])
def test_level_below_footing_is_drained(level):
    g = geom(retained_height_ft=np.array([4.0, 9.0, 13.0]))
    bars = Reinforcement(BarArrays(6, 8.0), BarArrays(6, 10.0), BarArrays(5, 12.0))
    dry = check_section(g, DesignInputs.of(**SOIL), bars)
    wet = check_section(g, DesignInputs.of(**SOIL, water=WaterTable(level)), bars)
    for a, b in zip(dry.rows, wet.rows, strict=True):
        assert np.allclose(a.demand, b.demand, rtol=1e-12) and np.allclose(
            a.capacity, b.capacity, rtol=1e-12), a.name


def test_water_lowers_the_factors_of_safety():
    g = geom()
    bars = Reinforcement(BarArrays(6, 8.0), BarArrays(6, 10.0), BarArrays(5, 12.0))
    dry = check_section(g, DesignInputs.of(**SOIL), bars).stability
    wet = check_section(g, DesignInputs.of(**SOIL, water=WaterTable(6.0)), bars).stability
    assert float(wet.fs_overturning) < float(dry.fs_overturning)
    assert float(wet.fs_sliding) < float(dry.fs_sliding)


@pytest.mark.parametrize("kw", [dict(water=WaterTable(5.0)),
                                dict(water=WaterTable(30.0), batter_face="front"),
                                dict(water=WaterTable(3.0), backslope_deg=15.0,
                                     surcharge_resists=True),
                                dict(water=WaterTable(6.0, 132.0)),
                                dict(water=WaterTable(4.0, 128.0), backslope_deg=10.0)])
def test_engine_agrees_with_audit_water(kw):
    assert agree_with_audit(DesignInputs.of(**{**SOIL, **kw})) == 120


def test_water_table_in_section_file(tmp_path):
    text = (DATA / "passing.toml").read_text()
    f = tmp_path / "w.toml"
    f.write_text(text + "\n[water]\nlevel_ft = 3.5\n")
    assert load_section(f).design_inputs().water_level_ft == 3.5
    f.write_text(text + "\n[water]\nlevel = 3.5\n")
    with pytest.raises(InputError, match="level_ft"):
        load_section(f)
    f.write_text(text.replace("[loads]", "[loads.water]\nlevel_ft = 2\n[loads]"))
    with pytest.raises(InputError, match="own table"):
        load_section(f)
