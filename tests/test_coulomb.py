"""Coulomb active coefficient with wall friction: published table, groundhog, the trial-wedge
audit, and the section file."""

import numpy as np
import pytest
from groundhog.excavations.basic import earthpressurecoefficients_poncelet
from test_backslope import DATA, SOIL, agree_with_audit, geom
from wallsched.engine.audit import _wedge_k
from wallsched.engine.pressure import coulomb_ka, design_thrust, earth_pressure, rankine_ka_sloping
from wallsched.engine.section import DesignInputs

from wallsched.errors import InputError
from wallsched.section_file import load_section

# REFERENCES.md section 5, vertical wall, level backfill, phi = 30 deg (UFC 3-220-20 Eq. 4-10
# form; the Das "Principles of Foundation Engineering" table values from memory)
TABLE_PHI30 = {0: 0.3333, 5: 0.3189, 10: 0.3085, 15: 0.3014, 20: 0.2973, 25: 0.2959}


@pytest.mark.parametrize("delta", sorted(TABLE_PHI30))
def test_coulomb_table_phi30(delta):
    assert float(coulomb_ka(30.0, delta)) == pytest.approx(TABLE_PHI30[delta], abs=5e-5)


def test_coulomb_sloping_value():
    # REFERENCES.md section 5: delta 20, beta 10 -> 0.3400
    assert float(coulomb_ka(30.0, 20.0, 10.0)) == pytest.approx(0.3400, abs=5e-5)


@pytest.mark.parametrize("phi,delta,beta,theta", [(30, 20, 10, 0), (34, 0, 0, 0),
                                                  (32, 15, 18, 0), (36, 24, 5, 10)])
def test_coulomb_against_groundhog(phi, delta, beta, theta):
    gh = earthpressurecoefficients_poncelet(phi, delta, theta, beta, validate=False)["KaC [-]"]
    assert float(coulomb_ka(phi, delta, beta, theta)) == pytest.approx(float(gh), rel=1e-12)


@pytest.mark.parametrize("phi,delta,beta", [(30, 20, 10), (34, 0, 0), (32, 15, 18)])
def test_trial_wedge_equals_closed_form(phi, delta, beta):
    # Coulomb (1776): the closed form is the maximum over trial wedges
    assert _wedge_k(phi, delta, beta) == pytest.approx(float(coulomb_ka(phi, delta, beta)),
                                                      rel=1e-9)


def test_coulomb_delta_equal_beta_is_rankine():
    # vertical back, delta = beta: Coulomb equals Rankine's sloping Ka (Rankine 1857; Coulomb)
    assert float(coulomb_ka(30.0, 20.0, 20.0)) == pytest.approx(
        float(rankine_ka_sloping(30.0, 20.0)), rel=1e-12)


def test_thrust_inclined_at_wall_friction():
    # the report's wall friction applies only on concrete: the stem's back face
    inp = DesignInputs.of(**SOIL, active_method="coulomb", wall_friction_deg=20.0,
                       coulomb_plane="stem")
    p = earth_pressure(inp)
    assert p.inclination_deg == 20.0
    g = geom()
    th = design_thrust(g, inp)
    ka = float(coulomb_ka(32.0, 20.0))
    H = 10.0
    total = 0.5 * ka * 120 * H * H + ka * 150 * H
    assert float(th.horizontal_lb) == pytest.approx(total * np.cos(np.radians(20)), rel=1e-12)
    assert float(th.vertical_lb) == pytest.approx(total * np.sin(np.radians(20)), rel=1e-12)


def test_heel_plane_is_soil_against_soil():
    # DESIGN.md 7: on the plane through the heel edge the interface friction is the backslope
    # angle, never a wall friction; Coulomb with delta = beta on a vertical plane is Rankine
    # (level: Ka = tan^2(45 - phi/2), no vertical component, no relief)
    for beta in (0.0, 15.0):
        coul = DesignInputs.of(**SOIL, active_method="coulomb", wall_friction_deg=20.0,
                            backslope_deg=beta)
        rank = DesignInputs.of(**SOIL, backslope_deg=beta)
        g = geom()
        a, b = design_thrust(g, coul), design_thrust(g, rank)
        for k in ("horizontal_lb", "moment_lbft", "vertical_lb"):
            assert float(getattr(a, k)) == pytest.approx(float(getattr(b, k)), rel=1e-12)
        p = earth_pressure(coul)
        assert p.inclination_deg == beta
        assert "plane through the heel edge" in p.basis and "stem" in p.basis  # says which
    # the unconservative old way: delta 20 on the heel plane cut the horizontal thrust
    # (phi 32: Ka 0.3073 Rankine against Coulomb 0.2740 x cos 20 = 0.2575, 16 % lower)
    assert float(coulomb_ka(32.0, 20.0)) * np.cos(np.radians(20)) < 0.85 * float(
        rankine_ka_sloping(32.0, 0.0))


def test_stem_plane_takes_the_soil_over_the_heel_as_retained():
    from wallsched.engine.section import section_weights
    from wallsched.engine.stability import stability

    g = geom()
    inp = DesignInputs.of(**SOIL, active_method="coulomb", wall_friction_deg=20.0,
                       coulomb_plane="stem")
    w = section_weights(g, inp)
    assert float(w.soil_heel.lb) == 0.0 and float(w.surcharge.lb) == 0.0
    # overturning by hand: the vertical component at the stem's back face, x = toe + stem
    th = design_thrust(g, inp)
    v, m = w.dead()
    x_back = float(g.toe_ft + g.stem_base_in / 12)
    st = stability(g, inp)
    mr = float(m) + float(th.vertical_lb) * x_back
    assert float(st.fs_overturning) == pytest.approx(mr / float(th.moment_lbft), rel=1e-12)
    assert float(st.sum_v_lb) == pytest.approx(float(v) + float(th.vertical_lb), rel=1e-12)


@pytest.mark.parametrize("kw", [dict(wall_friction_deg=20.0),
                                dict(wall_friction_deg=12.0, backslope_deg=15.0),
                                dict(wall_friction_deg=0.0, batter_face="front"),
                                dict(wall_friction_deg=20.0, coulomb_plane="stem"),
                                dict(wall_friction_deg=15.0, backslope_deg=12.0,
                                     coulomb_plane="stem"),
                                dict(wall_friction_deg=18.0, coulomb_plane="stem",
                                     batter_face="front")])
def test_engine_agrees_with_audit_coulomb(kw):
    assert agree_with_audit(DesignInputs.of(**{**SOIL, "active_method": "coulomb", **kw})) == 120


def test_coulomb_needs_its_inputs(tmp_path):
    text = (DATA / "backslope_seismic.toml").read_text()
    f = tmp_path / "c.toml"
    f.write_text(text.replace('backslope = "2:1"',
                              'active_method = "coulomb"\ncoulomb_plane = "stem"'))
    with pytest.raises(InputError, match="wall_friction_deg"):
        load_section(f)
    f.write_text(text.replace('backslope = "2:1"',
                              'active_method = "coulomb"\nwall_friction_deg = 40'))
    with pytest.raises(InputError, match="between 0 and friction_angle_deg"):
        load_section(f)
    f.write_text(text.replace('backslope = "2:1"',
                              'active_method = "coulomb"\nwall_friction_deg = 22'))
    sf = load_section(f)
    assert sf.design_inputs().soil.wall_friction_deg == 22.0
