"""The seismic case: Mononobe-Okabe and Seed-Whitman increments, the concrete inertia, the
IBC 2021 1807.2.3 stability case, the limit kh -> 0, section --json, the audit, sizing."""

import json

import pytest
from click.testing import CliRunner
from test_backslope import DATA, SOIL, agree_with_audit, geom
from test_sizing import assert_matches_exhaustive, small_grid
from wallsched.engine.audit import _wedge_k
from wallsched.engine.checks import SEISMIC_CHECK_NAMES, check_section
from wallsched.engine.pressure import (
    coulomb_ka,
    design_thrust,
    mononobe_okabe_kae,
    seismic_increment_lb,
    seismic_thrust,
)
from wallsched.engine.section import (
    BarArrays,
    DesignInputs,
    Reinforcement,
    SeismicLoad,
)
from wallsched.engine.sizing import CostRates, design_table

from wallsched.cli import main
from wallsched.errors import InputError
from wallsched.section_file import load_section


def test_mononobe_okabe_published_values():
    # REFERENCES.md section 5 (UFC 3-220-20 Eqs. 4-15, 4-16 form): phi 30, kh 0.2
    assert float(mononobe_okabe_kae(30.0, 0.0, 0.2)) == pytest.approx(0.4733, abs=5e-5)
    assert float(mononobe_okabe_kae(30.0, 15.0, 0.2)) == pytest.approx(0.4520, abs=5e-5)
    # the trial wedge with inertia (the audit's method) finds the same maximum
    assert _wedge_k(30.0, 15.0, 0.0, 0.2) == pytest.approx(
        float(mononobe_okabe_kae(30.0, 15.0, 0.2)), rel=1e-9)
    assert _wedge_k(32.0, 18.0, 10.0, 0.15) == pytest.approx(
        float(mononobe_okabe_kae(32.0, 18.0, 0.15, 10.0)), rel=1e-9)


def test_mononobe_okabe_at_kh_zero_is_coulomb():
    for phi, d, b in ((30, 0, 0), (34, 20, 10), (32, 15, 15)):
        assert float(mononobe_okabe_kae(phi, d, 0.0, b)) == pytest.approx(
            float(coulomb_ka(phi, d, b)), rel=1e-12)


def test_seed_whitman_increment_by_hand():
    inp = DesignInputs.of(**SOIL, seismic=SeismicLoad(0.2))
    # UFC 3-220-20 Eq. 4-17 form: 3/8 kh gamma H^2 at 0.6 H
    assert float(seismic_increment_lb(geom(), inp)) == pytest.approx(0.375 * 0.2 * 120 * 100)


def test_kh_zero_gives_static():
    for kw in (dict(), dict(backslope_deg=15.0), dict(active_method="coulomb",
                                                      wall_friction_deg=20.0)):
        for method in ("seed-whitman", "mononobe-okabe"):
            inp = DesignInputs.of(**SOIL, **kw, seismic=SeismicLoad(0.0, method))
            g = geom()
            se = seismic_thrust(g, inp)
            st = design_thrust(g, inp, live=False)
            for k in ("horizontal_lb", "moment_lbft", "vertical_lb"):
                assert float(getattr(se, k)) == pytest.approx(float(getattr(st, k)),
                                                              rel=1e-12), (kw, method, k)


def hand_case(soil_inertia=True):
    """Hand calculation of tests/data/sections/seismic_level.toml (IBC 2021 1807.2.3, 0.7 E;
    Seed-Whitman increment at 0.6 H; kh W of stem and footing at their centroids and, with
    ``soil_inertia`` (DESIGN.md 7: the soil over the heel moves with the wall), of the soil
    over the heel, 5 ft x 9 ft at 1 + 9/2 = 5.5 ft)."""
    kh, lf, gam, gc = 0.2, 0.7, 120.0, 150.0
    H, T, B = 10.0, 1.0, 8.0
    stem_w, stem_x, stem_y = gc * 1.0 * 9.5, 2.5, 1.0 + 9.5 / 2
    foot_w, foot_x, foot_y = gc * B * T, 4.0, 0.5
    heel_w, heel_x = gam * 5.0 * 9.0, 5.5
    toe_w, toe_x = gam * 2.0 * 1.0, 1.0
    V = stem_w + foot_w + heel_w + toe_w
    MR = stem_w * stem_x + foot_w * foot_x + heel_w * heel_x + toe_w * toe_x
    P, dP = 0.5 * 35 * H * H, 0.375 * kh * gam * H * H
    moving = [(stem_w, stem_y), (foot_w, foot_y)]
    if soil_inertia:
        moving.append((heel_w, 1.0 + 9.0 / 2))
    HE = P + lf * dP + lf * kh * sum(w for w, _ in moving)
    MO = P * H / 3 + lf * dP * 0.6 * H + lf * kh * sum(w * y for w, y in moving)
    pp = 0.5 * 300 * (2.0 ** 2 - 1.0 ** 2)
    xbar = (MR - MO) / V
    e = B / 2 - xbar
    assert abs(e) <= B / 6
    return {"delta_pae_lb": dP, "fs_overturning": MR / MO,
            "fs_sliding": (0.45 * V + pp) / HE, "q_max_psf": V / B * (1 + 6 * e / B)}


def test_section_json_seismic_by_hand():
    res = CliRunner().invoke(main, ["section", str(DATA / "seismic_level.toml"), "--json"])
    assert res.exit_code in (0, 3), res.output
    out = json.loads(res.output)
    hand = hand_case()
    for k, v in hand.items():
        assert out["seismic"][k] == pytest.approx(v, rel=1e-9), k
    assert out["seismic"]["fs_overturning_required"] == 1.1  # IBC 2021 1807.2.3
    names = [c["name"] for c in out["checks"]]
    assert all(n in names for n in SEISMIC_CHECK_NAMES)
    text = CliRunner().invoke(main, ["section", str(DATA / "seismic_level.toml")]).output
    assert "seismic: Delta P_AE" in text and "IBC 2021 1807.2.3" in text


def test_soil_inertia_off_keeps_the_concrete_only():

    from wallsched.engine.stability import stability

    sf = load_section(DATA / "seismic_level.toml")
    off = sf.design_inputs().but(seismic=SeismicLoad(0.2, soil_inertia=False))
    st = stability(sf.section_geometry(), off).seismic
    hand = hand_case(soil_inertia=False)
    assert float(st.fs_overturning) == pytest.approx(hand["fs_overturning"], rel=1e-9)
    assert float(st.fs_sliding) == pytest.approx(hand["fs_sliding"], rel=1e-9)
    # with the soil's inertia the sliding FS falls (the 16-ft case: 1.21 -> 1.01)
    assert hand_case()["fs_sliding"] < hand["fs_sliding"]


def test_no_seismic_table_no_seismic_rows():
    res = CliRunner().invoke(main, ["section", str(DATA / "passing.toml"), "--json"])
    out = json.loads(res.output)
    assert "seismic" not in out
    assert not any(c["name"].startswith("seismic") for c in out["checks"])


def test_surcharge_left_out_of_seismic_case():
    g = geom()
    a = seismic_thrust(g, DesignInputs.of(**SOIL, seismic=SeismicLoad(0.2)))
    b = seismic_thrust(g, DesignInputs.of(**dict(SOIL, surcharge_psf=0.0),
                                       seismic=SeismicLoad(0.2)))
    assert float(a.horizontal_lb) == pytest.approx(float(b.horizontal_lb), rel=1e-12)


def test_stem_seismic_demand_by_hand():
    # stem 12 in, hs = 9 ft, stem height 9.5 ft, EFP 35, no surcharge; E at 1.0 (ASCE 7 2.3.6):
    # Mu = 1.6 EFP hs^3/6 + 0.225 kh gamma hs^3 + kh gc t L^2/2 (resultant at 0.6 hs)
    inp = DesignInputs.of(**dict(SOIL, friction_angle_deg=None, passive_from_friction_angle=False,
                              passive_efp_pcf=300.0, active_efp_pcf=35.0, surcharge_psf=0.0),
                       seismic=SeismicLoad(0.2))
    g = geom(retained_height_ft=8.0, embedment_ft=2.0, footing_thickness_in=12.0,
             stem_top_in=12.0, stem_base_in=12.0, toe_ft=2.0, heel_ft=5.0)
    r = check_section(g, inp, Reinforcement(BarArrays(6, 10.0), BarArrays(6, 10.0),
                                            BarArrays(5, 12.0)))
    hs = 9.0
    mu = 1.6 * 35 * hs ** 3 / 6 + 0.375 * 0.2 * 120 * hs * hs * 0.6 * hs \
        + 0.2 * 150 * 1.0 * 9.5 ** 2 / 2
    assert float(r.stem.mu_lbft) == pytest.approx(mu, rel=1e-12)


@pytest.mark.parametrize("kw", [dict(seismic=SeismicLoad(0.2)),
                                dict(seismic=SeismicLoad(0.25, "mononobe-okabe", 0.7)),
                                dict(backslope_deg=12.0,
                                     seismic=SeismicLoad(0.15, "mononobe-okabe")),
                                dict(active_method="coulomb", wall_friction_deg=18.0,
                                     seismic=SeismicLoad(0.2, "seed-whitman", 1.0, 1.2, 1.05))])
def test_engine_agrees_with_audit_seismic(kw):
    assert agree_with_audit(DesignInputs.of(**{**SOIL, **kw})) == 120


def test_seismic_table_errors(tmp_path):
    text = (DATA / "seismic_level.toml").read_text()
    f = tmp_path / "s.toml"
    f.write_text(text.replace('method = "seed-whitman"', 'method = "mononobe-okabe"'))
    with pytest.raises(InputError, match="friction_angle_deg"):
        load_section(f)  # M-O needs phi
    f.write_text(text.replace("kh = 0.2", "kh = 1.5"))
    with pytest.raises(InputError, match="kh"):
        load_section(f)
    f.write_text(text.replace("kh = 0.2\n", ""))
    with pytest.raises(InputError, match="kh"):
        load_section(f)
    f.write_text(text.replace("[seismic]", "[seismik]"))
    with pytest.raises(InputError, match="seismic"):
        load_section(f)


def test_sizing_equals_exhaustive_with_seismic():
    inputs = DesignInputs.of(unit_weight_pcf=115.0, friction_coefficient=0.5,
                          allowable_bearing_psf=3500.0, active_efp_pcf=38.0,
                          passive_efp_pcf=300.0, surcharge_psf=100.0,
                          seismic=SeismicLoad(0.3))
    grid = small_grid(True)
    rates = CostRates()
    table = assert_matches_exhaustive(inputs, grid)
    # the seismic case costs at least as much as the static one at every height
    static = design_table(inputs.but(seismic=None), grid, rates,
                          max_height_ft=6.0, increment_ft=1.0, embedment_ft=1.0,
                          freeboard_ft=0.5)
    for a, b in zip(static.choices, table.choices, strict=True):
        if b.section is not None:
            assert b.cost_per_ft >= a.cost_per_ft - 1e-9
