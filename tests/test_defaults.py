"""Every default is declared once (engine/defaults.py): the engine's dataclasses and the
site file's keys (wallsched/keys.py) read it there, and no soil key has one."""

from dataclasses import MISSING, fields

import numpy as np
from wallsched.engine import defaults
from wallsched.engine.inputs import Criteria, Loads, Materials, SeismicLoad, Soil
from wallsched.engine.sizing import CostRates, SizingGrid

from wallsched import keys
from wallsched.schema import REQUIRED

TABLES = {  # site-file table -> its defaults in the engine
    "SOIL_KEYS": defaults.SOIL_OPTIONS,
    "LOADS_KEYS": defaults.LOADS, "MATERIALS_KEYS": defaults.MATERIALS,
    "CRITERIA_KEYS": defaults.CRITERIA, "SEISMIC_KEYS": defaults.SEISMIC,
    "COSTS_KEYS": defaults.COSTS, "SIZING_KEYS": defaults.SIZING,
}


def _same(a, b) -> bool:
    if isinstance(a, list | tuple) or isinstance(b, list | tuple):
        return list(a) == list(b)
    return a == b and type(a) is type(b)


def test_every_engine_default_is_a_declared_key_with_that_default():
    for table, engine_defaults in TABLES.items():
        declared = getattr(keys, table)
        for name, value in engine_defaults.items():
            assert name in declared, (table, name)
            assert _same(declared[name].default, value), (table, name)


def test_a_declared_key_with_a_default_has_it_from_the_engine():
    for table, engine_defaults in TABLES.items():
        for name, spec in getattr(keys, table).items():
            if spec.default is REQUIRED or spec.default is None or isinstance(
                    spec.default, dict):
                continue
            assert name in engine_defaults, (table, name)


def test_soil_values_have_no_default():
    # never default a soil parameter silently (DESIGN.md section 8): of the soil table only
    # the choices of method have defaults
    for name, spec in keys.SOIL_KEYS.items():
        if spec.kind is float:
            assert spec.default is REQUIRED or spec.default is None, name
    assert all(not isinstance(v, float) for v in defaults.SOIL_OPTIONS.values())
    for f in fields(Soil):
        if f.name in ("unit_weight_pcf", "friction_coefficient", "allowable_bearing_psf"):
            assert f.default is MISSING


def test_the_engine_dataclasses_read_the_declared_defaults():
    for group, table in ((Soil, defaults.SOIL_OPTIONS), (Loads, defaults.LOADS),
                         (Materials, defaults.MATERIALS), (Criteria, defaults.CRITERIA)):
        for f in fields(group):
            if f.name in table:
                assert _same(f.default, table[f.name]), f.name
            else:  # a soil value, or a table (seismic, water) that is absent by default
                assert f.default is MISSING or f.default is None, f.name
    for f in fields(SeismicLoad):
        if f.name != "kh":
            assert _same(f.default, defaults.SEISMIC[f.name]), f.name
    assert {f.name: f.default for f in fields(CostRates)} == defaults.COSTS
    g = SizingGrid.from_table({})
    s = defaults.SIZING
    assert g.toe_ft[0] == s["toe_min_ft"] and g.toe_ft[-1] == s["toe_max_ft"]
    assert g.footing_thickness_in[0] == s["footing_thickness_min_in"]
    assert g.footing_thickness_in[-1] == s["footing_thickness_max_in"]
    assert g.stem_base_in[0] == s["stem_min_in"] and g.stem_base_in[-1] == s["stem_max_in"]
    assert np.array_equal(g.bar_spacings_in, s["bar_spacings_in"])
    assert np.array_equal(g.key_depth_in, s["key_depths_in"])
    assert (g.marks_max, g.marks_per, g.key_width_in) == (
        s["marks_max"], s["marks_per"], s["key_width_in"])
