"""ACI 318-19 strength (engine/strength.py).

Sources: ACI 318-19 Table 22.2.2.4.3 (beta1), Table 21.2.2 (phi; tension-controlled at
eps_ty + 0.003), Table 22.5.5.1 and Eq. 22.5.5.1.3 (one-way shear, lambda_s), Table 20.5.1.3.1
(cover), 7.6.1.1 / 7.7.2.3 / 24.3.2 / 24.4.3 (detailing) as collected in REFERENCES.md section 3;
concreteproperties (general-purpose RC section library, test extra) for the ultimate moment by
strain compatibility with a rectangular stress block; a strain-compatibility solve written here.
"""

import math

import numpy as np
import pytest
from inputkit import efp_inputs
from wallsched.engine.concrete import (
    beta1,
    cover_in,
    crack_control_spacing_in,
    flexural_strength,
    max_flexural_spacing_in,
    min_flexural_steel_in2,
    one_way_shear_strength,
    phi_flexure,
    required_steel_in2,
    service_steel_stress_psi,
    shrinkage_spacing_in,
    shrinkage_steel_in2,
    size_effect_factor,
    wall_horizontal_min_in2,
)
from wallsched.engine.section import BarArrays, SectionGeometry
from wallsched.engine.strength import heel_strength, stem_strength, toe_strength


@pytest.mark.parametrize("fc,b1", [(2500, 0.85), (4000, 0.85), (5000, 0.80), (6000, 0.75),
                                   (7000, 0.70), (8000, 0.65), (10000, 0.65)])
def test_beta1_table_22_2_2_4_3(fc, b1):
    assert float(beta1(fc)) == pytest.approx(b1)


def test_phi_table_21_2_2_2019_limits():
    ety = 60000 / 29e6
    assert float(phi_flexure(ety, 60000)) == pytest.approx(0.65)
    assert float(phi_flexure(ety + 0.003, 60000)) == pytest.approx(0.90)
    # the 2019 change: 0.005 (the 318-14 limit) is no longer quite tension-controlled at Gr 60
    assert float(phi_flexure(0.005, 60000)) == pytest.approx(0.65 + 0.25 * (0.005 - ety) / 0.003)
    assert float(phi_flexure(0.00508, 60000)) == pytest.approx(0.90)
    assert float(phi_flexure(ety + 0.0015, 60000)) == pytest.approx(0.775)
    assert float(phi_flexure(0.001, 60000)) == pytest.approx(0.65)
    # Grade 80: the limit moves with eps_ty (0.00276 + 0.003)
    assert float(phi_flexure(0.005, 80000)) < 0.90


@pytest.mark.parametrize("d,ls", [(5.0, 1.0), (10.0, 1.0), (15.5, math.sqrt(2 / 2.55)),
                                  (30.0, math.sqrt(0.5))])
def test_size_effect_eq_22_5_5_1_3(d, ls):
    assert float(size_effect_factor(d)) == pytest.approx(ls)


def test_shear_row_c_reference_value():
    # REFERENCES.md 7 [calc]: McCormac Ex. 13.3 stem under 318-19: rho_w = 0.00844,
    # lambda_s = 0.886, phi Vc = 0.75 * 8 * lambda_s * rho^(1/3) * sqrt(3000) * 12 * 15.5
    assert float(one_way_shear_strength(1.57, 15.5, 3000.0)) == pytest.approx(11022, rel=2e-3)
    without = float(one_way_shear_strength(1.57, 15.5, 3000.0, size_effect=False))
    assert without == pytest.approx(11022 / math.sqrt(2 / 2.55), rel=2e-3)
    # the 5 lambda sqrt(f'c) b d cap
    big = float(one_way_shear_strength(50.0, 10.0, 4000.0))
    assert big == pytest.approx(0.75 * 5 * math.sqrt(4000) * 12 * 10)


def test_cover_table_20_5_1_3_1():
    np.testing.assert_array_equal(cover_in(np.array([3, 4, 5, 6, 8, 11])),
                                  [1.5, 1.5, 1.5, 2.0, 2.0, 2.0])
    np.testing.assert_array_equal(cover_in(np.array([5, 8]), 3.0), [3.0, 3.0])


def test_detailing_rules():
    assert float(min_flexural_steel_in2(12.0)) == pytest.approx(0.0018 * 144)
    assert float(max_flexural_spacing_in(4.0)) == 12.0
    assert float(max_flexural_spacing_in(12.0)) == 18.0
    assert float(shrinkage_steel_in2(18.0)) == pytest.approx(0.0018 * 12 * 18)
    assert float(shrinkage_spacing_in(3.0)) == 15.0
    assert float(shrinkage_spacing_in(12.0)) == 18.0
    # Table 11.6.1: 0.0020 for <= #5 at fy 60 ksi; 0.0025 otherwise
    assert float(wall_horizontal_min_in2(15.0, 4, 60000)) == pytest.approx(0.36)
    assert float(wall_horizontal_min_in2(15.0, 6, 60000)) == pytest.approx(0.45)  # McCormac
    assert float(wall_horizontal_min_in2(15.0, 4, 40000)) == pytest.approx(0.45)
    # 24.3.2 with fs = 2/3 fy = 40 ksi: 15 - 2.5 cc <= 12
    assert float(crack_control_spacing_in(40000.0, 2.0)) == pytest.approx(10.0)
    assert float(crack_control_spacing_in(40000.0, 1.0)) == pytest.approx(12.0)
    assert math.isinf(float(crack_control_spacing_in(0.0, 2.0)))


def _strain_compatibility_mn(As, d, fc, fy, b=12.0):
    """Nominal moment (lb-ft) by a fibre-free strain-compatibility solve: brentq-like bisection
    on c with steel stress min(fy, Es eps) and the Whitney block (written for this test)."""
    b1 = 0.85 if fc <= 4000 else max(0.65, 0.85 - 0.05 * (fc - 4000) / 1000)
    def resid(c):
        es = 0.003 * (d - c) / c
        return 0.85 * fc * b1 * c * b - As * min(fy, 29e6 * es)
    lo, hi = 1e-6, d
    for _ in range(300):
        mid = (lo + hi) / 2
        lo, hi = (lo, mid) if resid(mid) > 0 else (mid, hi)
    c = (lo + hi) / 2
    C = 0.85 * fc * b1 * c * b
    return C * (d - b1 * c / 2) / 12.0, 0.003 * (d - c) / c


CASES = [(0.31, 8.7, 4000, 60000), (0.44, 9.6, 3000, 60000), (1.58, 15.5, 3000, 60000),
         (0.79, 20.5, 5000, 60000), (3.0, 10.0, 4000, 60000), (6.0, 9.0, 3000, 60000),
         (1.2, 12.0, 7000, 80000)]


@pytest.mark.parametrize("As,d,fc,fy", CASES)
def test_flexure_against_strain_compatibility(As, d, fc, fy):
    mn, eps = _strain_compatibility_mn(As, d, fc, fy)
    f = flexural_strength(As, d, fc, fy)
    assert float(f.mn_lbft) == pytest.approx(mn, rel=1e-6)
    assert float(f.eps_t) == pytest.approx(eps, rel=1e-6)
    assert float(f.phi) == pytest.approx(float(phi_flexure(eps, fy)), rel=1e-9)


@pytest.mark.parametrize("As,d,h,fc", [(1.58, 15.5, 18.0, 3000.0), (0.31, 8.6875, 12.0, 4000.0),
                                       (0.88, 13.5, 16.0, 5000.0)])
def test_flexure_against_concreteproperties(As, d, h, fc):
    """Ultimate moment of a singly reinforced 12-in strip, within 1 % (bar area is subtracted
    from the concrete there, a small difference)."""
    from concreteproperties.concrete_section import ConcreteSection
    from concreteproperties.material import Concrete, SteelBar
    from concreteproperties.pre import add_bar
    from concreteproperties.stress_strain_profile import (
        ConcreteLinear,
        RectangularStressBlock,
        SteelElasticPlastic,
    )
    from sectionproperties.pre.library.primitive_sections import rectangular_section

    conc = Concrete(
        "concrete", density=0.0,
        stress_strain_profile=ConcreteLinear(elastic_modulus=57000 * math.sqrt(fc)),
        ultimate_stress_strain_profile=RectangularStressBlock(
            compressive_strength=fc, alpha=0.85, gamma=float(beta1(fc)), ultimate_strain=0.003),
        flexural_tensile_strength=0.0, colour="lightgrey")
    steel = SteelBar("steel", density=0.0, stress_strain_profile=SteelElasticPlastic(
        yield_strength=60000.0, elastic_modulus=29e6, fracture_strain=0.5), colour="grey")
    geo = rectangular_section(d=h, b=12.0, material=conc)
    geo = add_bar(geo, area=As, material=steel, x=6.0, y=h - d)
    m_ref = ConcreteSection(geo).ultimate_bending_capacity(theta=0, n=0).m_x / 12.0
    assert float(flexural_strength(As, d, fc, 60000.0).mn_lbft) == pytest.approx(m_ref, rel=0.01)


def test_required_steel_round_trip():
    As = required_steel_in2(92472.0, 15.5, 3000.0, 60000.0)
    # McCormac & Brown 9th ed. Ex. 13.3: As = 1.46 in2/ft for Mu = 92,472 ft-lb
    assert float(As) == pytest.approx(1.46, abs=0.005)
    assert float(flexural_strength(As, 15.5, 3000.0, 60000.0).phi_mn_lbft) == pytest.approx(
        92472.0, rel=1e-9)
    assert np.isnan(required_steel_in2(1e7, 10.0, 3000.0, 60000.0))


def test_service_stress_cracked_section():
    # k = sqrt(2 rho n + (rho n)^2) - rho n; j = 1 - k/3
    As, d, fc, ms = 0.44, 9.6, 4000.0, 4000.0
    n = 29e6 / (57000 * math.sqrt(fc))
    rn = As / (12 * d) * n
    k = math.sqrt(2 * rn + rn * rn) - rn
    assert float(service_steel_stress_psi(ms, As, d, fc)) == pytest.approx(
        ms * 12 / (As * d * (1 - k / 3)))


_inp = efp_inputs


def test_effective_depth_from_bar_and_cover():
    g = SectionGeometry(8.0, 2.0, 16.0, 10.0, 12.0, 2.5, 5.0)
    st = stem_strength(g, _inp(), BarArrays(6, 12.0))
    assert float(st.d_in) == pytest.approx(12.0 - 2.0 - 0.375)
    st5 = stem_strength(g, _inp(), BarArrays(5, 12.0))
    assert float(st5.d_in) == pytest.approx(12.0 - 1.5 - 0.3125)
    heel = heel_strength(g, _inp(), BarArrays(5, 12.0))
    assert float(heel.d_in) == pytest.approx(16.0 - 1.5 - 0.3125)
    toe = toe_strength(g, _inp(), BarArrays(5, 12.0))
    assert float(toe.d_in) == pytest.approx(16.0 - 3.0 - 0.3125)
    opt = stem_strength(g, _inp(cover_stem_in=3.0), BarArrays(6, 12.0))
    assert float(opt.d_in) == pytest.approx(12.0 - 3.0 - 0.375)


def test_stem_demands_follow_design_md():
    g = SectionGeometry(8.0, 2.0, 16.0, 10.0, 12.0, 2.5, 5.0)
    inp = _inp()
    st = stem_strength(g, inp, BarArrays(6, 12.0))
    hs = 10.0 - 16 / 12
    ka_q = 35 / 120 * 250
    assert float(st.mu_lbft) == pytest.approx(1.6 * (35 * hs ** 3 / 6 + ka_q * hs ** 2 / 2))
    z = hs - float(st.d_in) / 12
    assert float(st.vu_lb) == pytest.approx(1.6 * (35 * z * z / 2 + ka_q * z))
    # hook: psi_r = 1.0 (s >= 6 db), psi_o = 1.0 (criteria default), psi_c = 4000/15000 + 0.6
    ldh = 60000 * (4000 / 15000 + 0.6) / (55 * math.sqrt(4000)) * 0.75 ** 1.5
    assert float(st.ldh_in) == pytest.approx(ldh)
    assert float(st.ldh_available_in) == pytest.approx(13.0)


def test_heel_and_toe_loads():
    g = SectionGeometry(8.0, 3.0, 15.0, 10.0, 12.0, 2.5, 5.0)
    inp = _inp()
    # the textbook heel (heel_upward_pressure = false): McCormac & Brown 13.10
    heel = heel_strength(g, _inp(heel_upward_pressure=False), BarArrays(5, 12.0))
    wu = 1.2 * (120 * (11 - 1.25) + 150 * 1.25) + 1.6 * 250
    assert float(heel.vu_lb) == pytest.approx(wu * 5.0)
    assert float(heel.mu_lbft) == pytest.approx(wu * 12.5)
    # footing shear: lambda_s neglected by default (13.2.6.2), applied on request
    d = float(heel.d_in)
    assert float(heel.phi_vn_lb) == pytest.approx(float(one_way_shear_strength(
        0.31, d, 4000.0, size_effect=False)))
    heel_ls = heel_strength(g, _inp(footing_shear_size_effect=True, heel_upward_pressure=False),
                            BarArrays(5, 12.0))
    assert float(heel_ls.phi_vn_lb) <= float(heel.phi_vn_lb)
    # toe: 1.6 x bearing pressure over the toe - 0.9 x (footing + soil over the toe)
    from wallsched.engine.stability import stability

    st = stability(g, inp)
    B = 2.5 + 1.0 + 5.0
    # the governing bearing case (as reported): q_max and e of the stability result
    e, q_toe, q_heel = float(st.eccentricity_ft), float(st.q_max_psf), float(st.q_min_psf)
    assert e < B / 6
    q_face = q_toe + (q_heel - q_toe) * 2.5 / B
    w = 150 * 1.25 + 120 * (3.0 - 1.25)
    toe = toe_strength(g, inp, BarArrays(5, 12.0), st)
    # Vu at d from the stem's front face (7.4.3.2 by 13.2.7)
    lv = 2.5 - float(toe.d_in) / 12
    q_d = q_toe + (q_heel - q_toe) * lv / B
    assert float(toe.vu_lb) == pytest.approx(1.6 * (q_toe + q_d) / 2 * lv - 0.9 * w * lv)
    m_up = 2.5 ** 2 * (q_face / 2 + (q_toe - q_face) / 3)
    assert float(toe.mu_lbft) == pytest.approx(1.6 * m_up - 0.9 * w * 2.5 ** 2 / 2)


def test_tapered_stem_up_the_height():
    g = SectionGeometry(14.0, 2.0, 18.0, 8.0, 16.0, 3.0, 6.0)
    st = stem_strength(g, _inp(), BarArrays(5, 12.0))
    assert 0 < float(st.height_flexure_y_ft) < 14.5
    assert float(st.height_mu_lbft) < float(st.mu_lbft)


def test_array_contract_and_nan():
    n = 5
    rng = np.random.default_rng(3)
    g = SectionGeometry(rng.uniform(3, 14, n), 2.0, rng.uniform(12, 24, n), 10.0,
                        rng.uniform(10, 16, n), rng.uniform(1, 4, n), rng.uniform(2, 8, n))
    bars = BarArrays(rng.integers(4, 9, n), rng.uniform(6, 18, n))
    inp = _inp()
    arr = [stem_strength(g, inp, bars), heel_strength(g, inp, bars), toe_strength(g, inp, bars)]
    for i in range(n):
        gi = SectionGeometry(*(np.asarray(getattr(g, f))[()] if np.ndim(getattr(g, f)) == 0
                               else getattr(g, f)[i] for f in (
            "retained_height_ft", "embedment_ft", "footing_thickness_in", "stem_top_in",
            "stem_base_in", "toe_ft", "heel_ft")))
        bi = BarArrays(bars.size[i], bars.spacing_in[i])
        one = [stem_strength(gi, inp, bi), heel_strength(gi, inp, bi), toe_strength(gi, inp, bi)]
        for a, s in zip(arr, one, strict=True):
            for f in ("mu_lbft", "phi_mn_lbft", "vu_lb", "phi_vn_lb", "d_in"):
                assert float(getattr(s, f)) == pytest.approx(getattr(a, f)[i], rel=1e-12)
    gn = SectionGeometry(np.array([8.0, np.nan]), 2.0, 16.0, 10.0, 12.0, 2.5, 5.0)
    st = stem_strength(gn, inp, BarArrays(6, 12.0))
    assert np.isnan(st.mu_lbft[1]) and np.isfinite(st.mu_lbft[0])
    assert len(st.to_frame()) == 2
