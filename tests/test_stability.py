"""Stability (engine/section.py weights, engine/stability.py).

Reference: McCormac & Brown, Design of Reinforced Concrete, 9th ed., Ex. 13.2 weights and arms
(front-face batter; REFERENCES.md section 7), plus physical invariants.
"""

import numpy as np
import pytest
from inputkit import efp_inputs
from wallsched.engine.section import SectionGeometry, section_weights
from wallsched.engine.stability import bearing_pressure, stability

inputs = efp_inputs


def geom(**kw):
    base = dict(retained_height_ft=8.0, embedment_ft=2.0, footing_thickness_in=15.0,
                stem_top_in=10.0, stem_base_in=14.0, toe_ft=2.5, heel_ft=5.0)
    base.update(kw)
    return SectionGeometry(**base)


def test_mccormac_13_2_weights_and_arms():
    # McCormac & Brown 9th ed. Ex. 13.2: 2,588 @ 5.75; 731 @ 4.08; 2,925 @ 4.75; soil over the
    # heel 12,188 (+ surcharge 1,875 = 14,062) @ 8.37 (unrounded 8.375)
    inp = inputs(unit_weight_pcf=100.0, active_efp_pcf=32.0, surcharge_psf=300.0,
                 batter_face="front", use_passive=False, count_toe_soil=False)
    g = SectionGeometry(19.5, 1.5, 18.0, 12.0, 18.0, 3.75, 6.25, freeboard_ft=0.0)
    w = section_weights(g, inp)
    assert float(w.footing.lb) == pytest.approx(2587.5)
    assert float(w.footing.arm_ft) == pytest.approx(5.75)
    assert float(w.stem_batter.lb) == pytest.approx(731.25)
    assert float(w.stem_batter.arm_ft) == pytest.approx(4.0833, abs=1e-4)
    assert float(w.stem_rectangle.lb) == pytest.approx(2925.0)
    assert float(w.stem_rectangle.arm_ft) == pytest.approx(4.75)
    assert float(w.soil_heel.lb + w.surcharge.lb) == pytest.approx(14062.5)
    assert float(w.soil_heel.arm_ft) == pytest.approx(8.375)
    assert float(w.surcharge.arm_ft) == pytest.approx(8.375)
    assert float(w.soil_batter.lb) == 0.0 and float(w.soil_toe.lb) == 0.0


def test_back_batter_soil_wedge_and_surcharge_width():
    g = geom(freeboard_ft=0.0)  # back face meets the retained grade at the top of wall
    w = section_weights(g, inputs())
    hs = 10.0 - 15 / 12
    assert float(w.soil_batter.lb) == pytest.approx(120 * 0.5 * (4 / 12) * hs)
    B = 2.5 + 14 / 12 + 5.0
    # the surcharge weight acts over the heel (from the back face at the stem's base)
    assert float(w.surcharge.lb) == pytest.approx(250 * 5.0)
    assert float(w.surcharge.arm_ft) == pytest.approx(B - 2.5)
    # with freeboard the face meets the grade lower down: the wedge is narrower
    w2 = section_weights(geom(freeboard_ft=1.0), inputs())
    assert float(w2.soil_batter.lb) < float(w.soil_batter.lb)


def test_fs_overturning_falls_as_retained_height_rises():
    h = np.linspace(3.0, 16.0, 40)
    st = stability(geom(retained_height_ft=h), inputs())
    assert np.all(np.diff(st.fs_overturning) < 0)
    assert np.all(np.diff(st.fs_sliding) < 0)


def test_symmetric_load_case_has_zero_eccentricity():
    # no lateral load, toe = heel, uniform stem, soil to the same level on both sides
    inp = inputs(active_efp_pcf=1e-12, surcharge_psf=0.0, count_toe_soil=True)
    g = SectionGeometry(1e-9, 4.0, 12.0, 12.0, 12.0, 3.0, 3.0, freeboard_ft=0.5)
    st = stability(g, inp)
    assert float(st.eccentricity_ft) == pytest.approx(0.0, abs=1e-9)
    B = 7.0
    assert float(st.q_max_psf) == pytest.approx(float(st.sum_v_lb) / B, rel=1e-9)
    assert float(st.q_min_psf) == pytest.approx(float(st.sum_v_lb) / B, rel=1e-9)


def test_kern_and_triangle_agree_at_b_over_6():
    V, B = 10000.0, 9.0
    at = bearing_pressure(V, B / 6, B)
    assert float(at.q_max_psf) == pytest.approx(2 * V / B)  # V/B (1 + 1) = 2V/(3 (B/2 - B/6))
    assert float(at.q_min_psf) == pytest.approx(0.0, abs=1e-9)
    eps = 1e-7
    lo, hi = bearing_pressure(V, B / 6 - eps, B), bearing_pressure(V, B / 6 + eps, B)
    assert float(lo.q_max_psf) == pytest.approx(float(hi.q_max_psf), rel=1e-6)
    neg = bearing_pressure(V, -B / 4, B)  # toward the heel: same magnitude
    assert float(neg.q_max_psf) == pytest.approx(float(bearing_pressure(V, B / 4, B).q_max_psf))


def test_resultant_outside_base_is_overturning_failure_without_bearing_number():
    st = stability(geom(retained_height_ft=14.0, toe_ft=0.5, heel_ft=0.5), inputs())
    assert not bool(st.resultant_in_base)
    assert np.isnan(st.q_max_psf)
    assert not bool(st.passes_overturning) and not bool(st.passes_bearing)
    assert float(st.fs_overturning) < 1.0


def test_surcharge_resists_switch():
    g = geom()
    off, on = stability(g, inputs()), stability(g, inputs(surcharge_resists=True))
    w = section_weights(g, inputs())
    assert float(on.m_resisting_lbft - off.m_resisting_lbft) == pytest.approx(
        float(w.surcharge.moment_lbft))
    assert float(on.sum_v_lb - off.sum_v_lb) == pytest.approx(float(w.surcharge.lb))
    assert on.case_surcharge is on.case_dead
    # without: bearing is the larger of the two cases
    assert float(off.q_max_psf) == pytest.approx(max(float(off.case_dead.q_max_psf),
                                                     float(off.case_surcharge.q_max_psf)))
    assert float(off.m_overturning_lbft) == float(on.m_overturning_lbft)


def test_sliding_passive_with_neglect_and_key():
    inp = inputs(passive_neglect_ft=1.0)
    plain = stability(geom(), inp)
    assert float(plain.passive_lb) == pytest.approx(150.0 * (2.0 ** 2 - 1.0))
    keyed = stability(geom(key_width_in=12.0, key_depth_in=12.0), inp)
    assert float(keyed.passive_lb) == pytest.approx(150.0 * (3.0 ** 2 - 1.0))
    assert float(keyed.sum_v_lb - plain.sum_v_lb) == pytest.approx(150.0)
    none = stability(geom(), inputs(use_passive=False))
    assert float(none.passive_lb) == 0.0
    assert float(none.h_resisting_lb) == pytest.approx(0.4 * float(none.sum_v_lb))


def test_count_toe_soil_switch():
    g = geom(embedment_ft=3.0)
    on, off = stability(g, inputs()), stability(g, inputs(count_toe_soil=False))
    toe_soil = 120.0 * 2.5 * (3.0 - 15 / 12)
    assert float(on.sum_v_lb - off.sum_v_lb) == pytest.approx(toe_soil)
    assert float(on.m_resisting_lbft - off.m_resisting_lbft) == pytest.approx(toe_soil * 1.25)


def test_scalar_call_equals_array_element_and_nan_fails():
    h = np.array([4.0, 7.5, np.nan, 11.0])
    toe = np.array([1.5, 2.5, 2.5, 3.5])
    st = stability(geom(retained_height_ft=h, toe_ft=toe), inputs())
    for i in (0, 1, 3):
        s1 = stability(geom(retained_height_ft=h[i], toe_ft=toe[i]), inputs())
        for name in ("fs_overturning", "fs_sliding", "q_max_psf", "eccentricity_ft",
                     "m_resisting_lbft", "h_resisting_lb"):
            assert float(getattr(s1, name)) == pytest.approx(getattr(st, name)[i], rel=1e-12)
    assert np.isnan(st.fs_overturning[2]) and np.isnan(st.q_max_psf[2])
    assert not st.passes[2]
    frame = st.to_frame()
    assert len(frame) == 4 and "q_max_psf" in frame
