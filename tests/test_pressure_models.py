"""The pressure models behind one protocol: every model found, exactly one active model for
any inputs, the stem's formula text the models give agreeing with the loads they compute."""

from __future__ import annotations

import itertools

import numpy as np
import pytest
from test_backslope import SOIL, geom
from wallsched.engine.pressure import (
    MODELS,
    Model,
    earth_pressure,
    is_level,
    model,
    models_of,
    rankine_ka,
    rankine_ka_sloping,
    stem_shear_moment,
)
from wallsched.engine.pressure.registry import active_model
from wallsched.engine.section import DesignInputs, SeismicLoad, WaterTable

EFP_SOIL = {k: v for k, v in SOIL.items() if k not in ("friction_angle_deg",
                                                        "passive_from_friction_angle")}
EFP_SOIL.update(active_efp_pcf=40.0, passive_efp_pcf=300.0)


def test_every_model_module_is_a_member_of_the_enum():
    names = {m.name for m in MODELS}
    # the models of this version (a new model's module adds itself: no edit here)
    assert names >= {"efp", "rankine", "backslope", "coulomb", "water", "surcharge", "strip",
                     "seismic"}
    assert {k.value for k in Model} == names
    assert model(Model.COULOMB).method == "coulomb"
    assert [m.order for m in MODELS] == sorted(m.order for m in MODELS)


@pytest.mark.parametrize("efp,method,beta", list(itertools.product(
    (False, True), ("rankine", "coulomb"), (0.0, 15.0))))
def test_exactly_one_active_model_applies(efp, method, beta):
    if efp and method == "coulomb":
        with pytest.raises(ValueError, match="needs friction_angle_deg"):
            DesignInputs.of(**EFP_SOIL, active_method=method, backslope_deg=beta)
        return
    inp = DesignInputs.of(**(EFP_SOIL if efp else SOIL), active_method=method, backslope_deg=beta)
    active = [m for m in MODELS if m.active and m.applies(inp)]
    assert len(active) == 1
    expect = "efp" if efp else "coulomb" if method == "coulomb" else (
        "backslope" if beta else "rankine")
    assert active_model(inp).name == expect
    assert Model(expect) in models_of(inp)
    # level backfill: an EFP or Rankine on level ground, drained, no strip loads
    assert is_level(inp) == (expect in ("efp", "rankine") and not beta)


def test_level_formula_and_loads():
    # McCormac & Brown 9th ed. 13.5: V = EFP z^2/2 + Ka q z, M = EFP z^3/6 + Ka q z^2/2
    inp = DesignInputs.of(**SOIL)
    p = earth_pressure(inp)
    assert p.stem_moment_formula == "Mu = 1.6·(EFP·h_s³/6 + Ka·q·h_s²/2)"
    assert p.stem_shear_formula.startswith("Vu = 1.6·(EFP·z²/2 + Ka·q·z)")
    z = 6.0
    v, m = stem_shear_moment(geom(), inp, p, z)
    ka = float(rankine_ka(32.0))
    assert float(m) == pytest.approx(ka * 120 * z ** 3 / 6 + ka * 150 * z * z / 2, rel=1e-12)
    assert float(v) == pytest.approx(ka * 120 * z * z / 2 + ka * 150 * z, rel=1e-12)


def test_backslope_formula_names_the_horizontal_part():
    # McCormac & Brown 9th ed. 13.5: the Rankine pressure parallel to the slope; on the stem
    # its horizontal part Ka cos(beta) gamma z^3/6 (+ Ka q cos(beta) z^2/2)
    inp = DesignInputs.of(**SOIL, backslope_deg=18.0)
    p = earth_pressure(inp)
    assert p.stem_moment_formula == "Mu = 1.6·(Ka·cos β·γ·h_s³/6 + Ka·q·cos i·h_s²/2)"
    z = 5.0
    _, m = stem_shear_moment(geom(), inp, p, z)
    kc = float(rankine_ka_sloping(32.0, 18.0)) * np.cos(np.radians(18.0))
    assert float(m) == pytest.approx(kc * 120 * z ** 3 / 6 + kc * 150 * z * z / 2, rel=1e-12)


def test_water_and_seismic_terms_are_printed_where_they_load_the_stem():
    inp = DesignInputs.of(**SOIL, water=WaterTable(level_ft=3.0))
    p = earth_pressure(inp)
    assert "γw·hw³/6" in p.stem_moment_formula and "γw·hw²/2" in p.stem_shear_formula
    # hydrostatic below the level (common practice): at the stem's base, with the water 3 ft
    # above the bottom of footing, the water stands 3 ft - T above the cut
    g = geom()
    z = float(g.soil_height_ft)
    _, m_wet = stem_shear_moment(g, inp, p, z)
    dry = DesignInputs.of(**SOIL)
    _, m_dry = stem_shear_moment(g, dry, earth_pressure(dry), z)
    hw = 3.0 - float(g.footing_thickness_ft)
    ka = float(rankine_ka(32.0))
    # the effective-stress soil term loses Ka gw hw^3/6; the water adds gw hw^3/6
    assert float(m_wet - m_dry) == pytest.approx((1 - ka) * 62.4 * hw ** 3 / 6, rel=1e-9)
    sz = DesignInputs.of(**SOIL, seismic=SeismicLoad(kh=0.2))
    ps = earth_pressure(sz)
    assert "1.0·E" in ps.stem_moment_formula and "0.375·kh·γ·h_s²" in ps.stem_moment_formula
    assert "1.0·E" in ps.stem_shear_formula
