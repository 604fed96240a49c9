"""The shear key: its passive by hand (Rankine Kp), its plain-concrete strength by hand
(ACI 318-19 chapter 14), and a failing key failing the section."""

import math

import numpy as np
import pytest
from wallsched.engine.audit import audit_section
from wallsched.engine.checks import KEY_CHECK_NAMES, check_section
from wallsched.engine.key import key_strength
from wallsched.engine.pressure import earth_pressure
from wallsched.engine.section import BarArrays, DesignInputs, Reinforcement, SectionGeometry
from wallsched.engine.stability import stability

BARS = Reinforcement(BarArrays(6, 12.0), BarArrays(6, 12.0), BarArrays(5, 12.0))


def _inputs(**kw):
    base = dict(unit_weight_pcf=120.0, friction_angle_deg=30.0, passive_from_friction_angle=True,
                friction_coefficient=0.4, allowable_bearing_psf=4000.0, fc_psi=4000.0,
                passive_neglect_ft=1.0)
    return DesignInputs.of(**(base | kw))


def _geom(key_width_in=12.0, key_depth_in=18.0, **kw):
    base = dict(retained_height_ft=8.0, embedment_ft=2.0, footing_thickness_in=14.0,
                stem_top_in=12.0, stem_base_in=12.0, toe_ft=2.0, heel_ft=5.0,
                key_width_in=key_width_in, key_depth_in=key_depth_in)
    return SectionGeometry(**(base | kw))


def test_passive_on_the_key_by_hand_rankine_kp():
    """phi = 30 deg: Rankine Kp = tan^2(45 + 15) = 3.0 (Rankine 1857; any soil mechanics text),
    EFPp = 3.0 x 120 = 360 pcf. Footing bottom 2 ft below the front grade, top 1 ft neglected,
    key 18 in deep: the key adds 360 (3.5^2 - 2^2) / 2 = 1,485 lb of passive, taken in sliding
    to the bottom of the key (DESIGN.md section 7)."""
    inp = _inputs()
    assert earth_pressure(inp).passive_efp_pcf == pytest.approx(360.0)
    with_key = stability(_geom(), inp)
    without = stability(_geom(key_width_in=0.0, key_depth_in=0.0), inp)
    assert float(without.passive_lb) == pytest.approx(360.0 * (2.0**2 - 1.0**2) / 2)  # 540 lb
    assert float(with_key.passive_lb - without.passive_lb) == pytest.approx(1485.0)
    # the key as a cantilever from the footing's bottom: pressure 720 psf at its root and
    # 1,260 psf at its tip; M = 720 x 1.5^2 / 2 + 540 x 1.5^2 / 3 = 1,215 lb-ft; factored 1.6
    k = key_strength(_geom(), inp, earth_pressure(inp))
    assert float(k.passive_lb) == pytest.approx(1485.0)
    assert float(k.vu_lb) == pytest.approx(1.6 * 1485.0)
    assert float(k.mu_lbft) == pytest.approx(1.6 * 1215.0)


def test_passive_neglected_below_the_footing_leaves_only_the_lower_part_of_the_key():
    """passive_neglect_ft = 2.5 ft reaches 0.5 ft into the key: only 2.5 to 3.5 ft loads it:
    P = 360 (3.5^2 - 2.5^2) / 2 = 1,080 lb; M = int_2.5^3.5 360 z (z - 2) dz
    = 360 [z^3/3 - z^2] from 2.5 to 3.5 = 360 x 3.0833 = 1,110 lb-ft."""
    inp = _inputs(passive_neglect_ft=2.5)
    k = key_strength(_geom(), inp, earth_pressure(inp))
    assert float(k.passive_lb) == pytest.approx(1080.0)
    m = 360.0 * ((3.5**3 - 2.5**3) / 3 - (3.5**2 - 2.5**2))
    assert m == pytest.approx(1110.0)
    assert float(k.mu_lbft) == pytest.approx(1.6 * m)


def test_key_plain_concrete_strength_by_hand():
    """ACI 318-19 14.5.2.1(a): Mn = 5 lambda sqrt(f'c) Sm; 14.5.5.1(a): Vn = 4/3 lambda sqrt(f'c)
    b h; phi = 0.60 (Table 21.2.1); h = 12 - 2 = 10 in as cast against soil (14.5.1.7)
    (clauses from memory). f'c = 4,000 psi, b = 12 in: Sm = 12 x 10^2 / 6 = 200 in^3,
    phi Mn = 0.6 x 5 x 63.25 x 200 / 12 = 3,162 lb-ft; phi Vn = 0.6 x 4/3 x 63.25 x 120
    = 6,072 lb."""
    inp = _inputs()
    k = key_strength(_geom(), inp, earth_pressure(inp))
    assert float(k.h_in) == 10.0
    assert float(k.phi_mn_lbft) == pytest.approx(0.6 * 5 * math.sqrt(4000) * 200 / 12)
    assert float(k.phi_mn_lbft) == pytest.approx(3162.3, abs=0.1)
    assert float(k.phi_vn_lb) == pytest.approx(6071.6, abs=0.1)
    res = check_section(_geom(), inp, BARS)
    row = res.row("key_flexure")
    assert float(row.ratio) == pytest.approx(1.6 * 1215.0 / 3162.28, rel=1e-4)
    assert "14.5.2.1" in row.clause and "14.5.5.1" in res.row("key_shear").clause


def test_a_failing_key_fails_the_section_and_names_itself():
    """An 8-in key 30 in deep (h = 6 in: phi Mn = 0.6 x 5 x 63.25 x 72 / 12 = 1,138 lb-ft)
    against passive from 2 to 4.5 ft: M = 360 [z^3/3 - z^2] from 2 to 4.5 = 3,375 lb-ft,
    x 1.6 = 5,400 lb-ft: the key fails flexure, the section fails, the audit agrees."""
    inp = _inputs()
    geo = _geom(key_width_in=8.0, key_depth_in=30.0)
    res = check_section(geo, inp, BARS)
    row = res.row("key_flexure")
    assert float(row.demand) == pytest.approx(1.6 * 360 * ((4.5**3 - 8) / 3 - (4.5**2 - 4)))
    assert float(row.capacity) == pytest.approx(0.6 * 5 * math.sqrt(4000) * 72 / 12)
    assert not bool(row.passes) and not bool(res.passes)
    assert str(res.worst) in KEY_CHECK_NAMES
    g = {k: float(np.asarray(getattr(geo, k))) for k in (
        "retained_height_ft", "embedment_ft", "footing_thickness_in", "stem_top_in",
        "stem_base_in", "toe_ft", "heel_ft", "key_width_in", "key_depth_in", "key_offset_ft")}
    rows = audit_section(inp, g, {"stem": "#6@12", "heel": "#6@12", "toe": "#5@12"})
    assert not rows["key_flexure"].passes
    assert rows["key_flexure"].demand == pytest.approx(float(row.demand), rel=1e-9)


def test_sections_without_a_key_have_no_key_rows():
    res = check_section(_geom(key_width_in=0.0, key_depth_in=0.0), _inputs(), BARS)
    assert not set(KEY_CHECK_NAMES) & set(res.names)
