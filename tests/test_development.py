"""Bars and development (engine/bars.py, engine/development.py).

Sources: ASTM A615 nominal bar data as tabulated in McCormac & Brown, Design of Reinforced
Concrete, 9th ed., App. A Table A.2; ACI 318-19 Eq. 25.4.2.4a, 25.4.3.1, Table 25.3.1 and
25.5.2 as collected in REFERENCES.md section 3 (toolbox worked case [S], [calc] values);
McCormac & Brown 9th ed. Ex. 13.3 development lengths (#8, f'c 3000, fy 60 ksi).
"""

import math

import numpy as np
import pytest
from wallsched.engine.bars import bar_area_in2, bar_diameter_in, bar_weight_plf
from wallsched.engine.development import (
    confinement_term,
    hook_bend_diameter_in,
    hook_extension_in,
    hook_length_in,
    hook_psi_c,
    hook_psi_r,
    hooked_development_in,
    lap_splice_in,
    psi_g,
    psi_s,
    psi_t,
    straight_development_in,
)

A615_TABLE = [  # size, d (in), A (in2), lb/ft   (ASTM A615; McCormac Table A.2)
    (3, 0.375, 0.11, 0.376), (4, 0.500, 0.20, 0.668), (5, 0.625, 0.31, 1.043),
    (6, 0.750, 0.44, 1.502), (7, 0.875, 0.60, 2.044), (8, 1.000, 0.79, 2.670),
    (9, 1.128, 1.00, 3.400), (10, 1.270, 1.27, 4.303), (11, 1.410, 1.56, 5.313),
    (14, 1.693, 2.25, 7.650), (18, 2.257, 4.00, 13.600),
]


@pytest.mark.parametrize("size,d,a,w", A615_TABLE)
def test_astm_a615_table(size, d, a, w):
    assert float(bar_diameter_in(size)) == d
    assert float(bar_area_in2(size)) == a
    assert float(bar_weight_plf(size)) == w
    # nominal weight = (pi d^2 / 4) x 490 pcf steel; area to the table's rounding
    assert w == pytest.approx(math.pi * d * d / 4 / 144 * 490, rel=0.005)
    assert a == pytest.approx(math.pi * d * d / 4, abs=0.006)


def test_modification_factors_table_25_4_2_5():
    np.testing.assert_array_equal(psi_s(np.array([3, 6, 7, 11])), [0.8, 0.8, 1.0, 1.0])
    np.testing.assert_array_equal(psi_g(np.array([40000, 60000, 80000, 100000])),
                                  [1.0, 1.0, 1.15, 1.3])
    np.testing.assert_array_equal(psi_t(np.array([True, False])), [1.3, 1.0])


def test_straight_development_toolbox_case():
    # REFERENCES.md 3 [S]: #3, fy 40 ksi, f'c 3000, psi_t psi_e = 1.7, psi_s 0.8, 2.5 -> 11.174 in
    raw = straight_development_in(3, 3000, 40000, psi_t=1.3, psi_e=1.5, psi_s=0.8,
                                  minimum_in=0.0)
    assert float(raw) == pytest.approx(11.174, abs=1e-3)
    assert float(straight_development_in(3, 3000, 40000, psi_t=1.3, psi_e=1.5)) == 12.0


def test_straight_development_mccormac_13_3():
    # McCormac & Brown Ex. 13.3: #8 heel top bars l_d = 43 in; toe bars 33 in (318-11 has the
    # same equation; (cb+Ktr)/db = 2.5, psi_s = 1.0 for #8)
    top = float(straight_development_in(8, 3000, 60000, psi_t=1.3))
    bottom = float(straight_development_in(8, 3000, 60000))
    assert math.ceil(top) == 43
    assert math.ceil(bottom) == 33
    # Class B lap of the dowels: 1.3 x 33 = 43 in
    assert math.ceil(float(lap_splice_in(8, 3000, 60000))) == 43
    assert float(lap_splice_in(8, 3000, 60000, splice_class="A")) == pytest.approx(bottom)


def test_confinement_term():
    # #6 at 12 in, 2 in cover: cb = min(2 + 0.375, 6) = 2.375 -> 3.17 -> capped 2.5
    assert float(confinement_term(6, 2.0, 12.0)) == 2.5
    # #8 at 3 in: cb = 1.5 -> 1.5
    assert float(confinement_term(8, 2.0, 3.0)) == pytest.approx(1.5)


def test_hooked_development_reference_values():
    # REFERENCES.md 3 [calc]: #5, fy 60 ksi, f'c 4000: 14.8 in (psi_r 1.6, psi_o 1.25), 7.4 in
    assert float(hooked_development_in(5, 4000, 60000)) == pytest.approx(14.77, abs=0.01)
    assert float(hooked_development_in(5, 4000, 60000, psi_r=1.0, psi_o=1.0)) == pytest.approx(
        7.386, abs=0.01)
    # toolbox [calc]: #3, fy 40 ksi, f'c 3000, psi_e 1.2, psi_r 1.6, psi_o 1.25, psi_c 0.8:
    # 5.85 in, so the 6 in minimum governs
    assert float(hooked_development_in(3, 3000, 40000, psi_e=1.2, psi_c=0.8)) == 6.0
    assert float(hook_psi_c(4000)) == pytest.approx(4000 / 15000 + 0.6)
    assert float(hook_psi_c(7000)) == 1.0
    # 8 db floor for a large bar at low stress
    assert float(hooked_development_in(11, 10000, 40000, psi_r=1.0, psi_o=1.0)) >= 8 * 1.41


def test_hook_psi_r():
    np.testing.assert_array_equal(hook_psi_r(np.array([6, 6, 14]), np.array([12.0, 4.0, 24.0])),
                                  [1.0, 1.6, 1.6])
    assert float(hook_psi_r(6, 4.0, confined=True)) == 1.0


@pytest.mark.parametrize("size,bend_db", [(3, 6), (5, 6), (8, 6), (9, 8), (11, 8), (14, 10),
                                          (18, 10)])
def test_hook_geometry_table_25_3_1(size, bend_db):
    db = float(bar_diameter_in(size))
    assert float(hook_bend_diameter_in(size)) == pytest.approx(bend_db * db)
    assert float(hook_extension_in(size, 90)) == pytest.approx(12 * db)
    assert float(hook_extension_in(size, 180)) == pytest.approx(max(4 * db, 2.5))


def test_hook_length_and_refusals():
    db = 0.75
    arc = math.pi / 2 * (6 * db / 2 + db / 2)
    assert float(hook_length_in(6)) == pytest.approx(arc + 12 * db)
    with pytest.raises(ValueError):
        hook_extension_in(6, 135)
    with pytest.raises(ValueError):
        lap_splice_in(6, 4000, 60000, splice_class="C")
    assert np.isnan(lap_splice_in(14, 4000, 60000))  # no laps of bars larger than #11


def test_vectorized_and_scalar_equal():
    sizes = np.array([4, 5, 6, 8, 11])
    ld = straight_development_in(sizes, 4000, 60000, psi_t=psi_t(sizes > 5))
    ldh = hooked_development_in(sizes, 4000, 60000, psi_r=hook_psi_r(sizes, 12.0), psi_o=1.0)
    for i, s in enumerate(sizes):
        assert float(straight_development_in(s, 4000, 60000, psi_t=psi_t(s > 5))) == ld[i]
        assert float(hooked_development_in(s, 4000, 60000, psi_r=hook_psi_r(s, 12.0),
                                           psi_o=1.0)) == ldh[i]
    assert np.isnan(straight_development_in(6, np.nan, 60000))
