"""Earth pressure (engine/pressure.py).

Sources: Rankine closed form (McCormac & Brown, Design of Reinforced Concrete, 9th ed., 13.5);
the handbook values below are tan^2(45 - phi/2) to four places, as printed in the usual
foundation-engineering Rankine tables; McCormac & Brown 9th ed. Ch. 13 problem answers
(phi = 30 deg, gamma = 100 pcf); groundhog (general-purpose geotechnical package, test extra)
for an independent coefficient implementation.
"""

import math

import numpy as np
import pytest
from inputkit import efp_inputs
from wallsched.engine.pressure import (
    cantilever_shear_moment,
    earth_pressure,
    level_backfill_thrust,
    passive_resistance_lb,
    rankine_ka,
    rankine_kp,
)

HANDBOOK_KA = {  # phi (deg): Rankine Ka, level backfill
    20: 0.4903, 25: 0.4059, 28: 0.3610, 30: 0.3333, 32: 0.3073, 34: 0.2827, 35: 0.2710,
    36: 0.2596, 38: 0.2379, 40: 0.2174, 45: 0.1716,
}


@pytest.mark.parametrize("phi,ka", sorted(HANDBOOK_KA.items()))
def test_rankine_ka_handbook_table(phi, ka):
    assert float(rankine_ka(phi)) == pytest.approx(ka, abs=6e-5)
    assert float(rankine_kp(phi)) == pytest.approx(1.0 / ka, rel=2e-4)


def test_rankine_closed_forms_agree():
    phi = np.linspace(1.0, 50.0, 99)
    s = np.sin(np.radians(phi))
    np.testing.assert_allclose(rankine_ka(phi), (1 - s) / (1 + s), rtol=1e-12)
    np.testing.assert_allclose(rankine_kp(phi) * rankine_ka(phi), 1.0, rtol=1e-12)


def test_rankine_against_groundhog():
    from groundhog.excavations import basic  # a general-purpose geotechnical library (test extra)

    for phi in (20.0, 25.0, 30.0, 32.5, 35.0, 40.0, 45.0, 50.0):
        ref = basic.earthpressurecoefficients_frictionangle(phi)
        assert float(rankine_ka(phi)) == pytest.approx(float(ref["Ka [-]"]), rel=1e-9)
        assert float(rankine_kp(phi)) == pytest.approx(float(ref["Kp [-]"]), rel=1e-9)
        chu = basic.earthpressurecoefficients_rankine(phi, 0.0, 0.0)  # vertical wall, level
        assert float(rankine_ka(phi)) == pytest.approx(float(chu["KaR [-]"]), rel=1e-9)


@pytest.mark.parametrize("h,ha,m", [(16.0, 4266.0, 22754.0), (24.0, 9600.0, 76800.0)])
def test_mccormac_problem_answers(h, ha, m):
    # McCormac & Brown 9th ed. Ch. 13 problems: phi 30, gamma 100, Rankine; answers as printed
    ka = float(rankine_ka(30.0))
    th = level_backfill_thrust(ka * 100.0, ka, 0.0, h)
    assert float(th.horizontal_lb) == pytest.approx(ha, rel=2e-4)
    assert float(th.moment_lbft) == pytest.approx(m, rel=2e-4)


def _inputs(**kw):
    return efp_inputs(**({"active_efp_pcf": 36.0} | kw))


def test_efp_basis_gives_ka_as_efp_over_gamma():
    p = earth_pressure(_inputs())
    assert p.ka == pytest.approx(36.0 / 120.0)
    assert p.surcharge_lateral_psf == pytest.approx(0.3 * 250.0)
    assert p.passive_efp_pcf == 300.0


def test_friction_angle_basis_and_rankine_passive():
    p = earth_pressure(_inputs(active_efp_pcf=None, friction_angle_deg=30.0,
                               passive_efp_pcf=None, passive_from_friction_angle=True))
    assert p.ka == pytest.approx(1 / 3)
    assert p.active_efp_pcf == pytest.approx(40.0)
    assert p.passive_efp_pcf == pytest.approx(360.0)
    assert earth_pressure(_inputs(use_passive=False)).passive_efp_pcf == 0.0


def test_both_or_neither_active_basis_refused():
    with pytest.raises(ValueError, match="exactly one"):
        _inputs(friction_angle_deg=30.0)
    with pytest.raises(ValueError, match="exactly one"):
        _inputs(active_efp_pcf=None)


def test_thrust_components_and_arms():
    th = level_backfill_thrust(35.0, 35.0 / 120.0, 250.0, 9.0)
    soil, sur = th.components
    assert float(soil.horizontal_lb) == pytest.approx(0.5 * 35 * 81)
    assert float(soil.arm_ft) == pytest.approx(3.0)
    assert float(sur.horizontal_lb) == pytest.approx(35 / 120 * 250 * 9)
    assert float(sur.arm_ft) == pytest.approx(4.5)
    assert float(th.vertical_lb) == 0.0


def test_passive_neglected_depth():
    assert float(passive_resistance_lb(300.0, 1.0, 3.0)) == pytest.approx(150.0 * (9 - 1))
    assert float(passive_resistance_lb(300.0, 4.0, 3.0)) == 0.0
    assert float(passive_resistance_lb(300.0, 0.0, 1.0)) == pytest.approx(150.0)


def test_cantilever_shear_moment_integrates_pressure():
    z = 7.3
    v, m = cantilever_shear_moment(35.0, 70.0, z)
    # numerical integration of p(y) = 35 y + 70 from the grade down
    y = np.linspace(0, z, 20001)
    p = 35.0 * y + 70.0
    assert float(v) == pytest.approx(np.trapezoid(p, y), rel=1e-8)
    assert float(m) == pytest.approx(np.trapezoid(p * (z - y), y), rel=1e-8)
    v0, m0 = cantilever_shear_moment(35.0, 70.0, -1.0)
    assert float(v0) == 0.0 and float(m0) == 0.0


def test_array_contract():
    phi = np.array([22.0, 30.0, 41.5])
    for f in (rankine_ka, rankine_kp):
        arr = f(phi)
        assert arr.shape == (3,)
        for i, x in enumerate(phi):
            assert float(f(x)) == pytest.approx(arr[i], rel=1e-14)
    assert math.isnan(float(rankine_ka(np.nan)))
    h = np.array([3.0, np.nan, 12.0])
    th = level_backfill_thrust(35.0, 0.3, 250.0, h)
    assert np.isnan(th.moment_lbft[1]) and np.isfinite(th.moment_lbft[[0, 2]]).all()
    assert float(level_backfill_thrust(35.0, 0.3, 250.0, 12.0).moment_lbft) == pytest.approx(
        th.moment_lbft[2], rel=1e-14)
