"""Every key and default is declared once: the design inputs in the fields of their engine
dataclasses (engine/inputs.py, each field with its key), which the site and section files'
keys (wallsched/keys.py) collect; the cost and sizing defaults in engine/defaults.py, which
CostRates, SizingGrid and the keys read. No soil value has a default."""

from dataclasses import MISSING, fields

import numpy as np
from wallsched.engine import defaults
from wallsched.engine.inputs import (
    GROUPS,
    Criteria,
    DesignInputs,
    Loads,
    Materials,
    SeismicLoad,
    Soil,
    WaterTable,
)
from wallsched.engine.pressure.registry import ACTIVE_METHODS
from wallsched.engine.sizing import CostRates, SizingGrid

from wallsched import keys
from wallsched.schema import REQUIRED

INPUT_TABLES = {  # site-file table -> the engine dataclass that declares its keys
    "SOIL_KEYS": Soil, "LOADS_KEYS": Loads, "MATERIALS_KEYS": Materials,
    "CRITERIA_KEYS": Criteria, "SEISMIC_KEYS": SeismicLoad, "WATER_KEYS": WaterTable,
}
# keys of the files that are no field: the soil's source and its "H:V" backslope, and the
# criteria for the stations, segments and quantities along a wall (read by the pipeline)
NOT_FIELDS = {"SOIL_KEYS": {"source", "backslope"},
              "CRITERIA_KEYS": set(keys.ALONG_WALL_CRITERIA_KEYS)}


def _same(a, b) -> bool:
    if isinstance(a, list | tuple) or isinstance(b, list | tuple):
        return list(a) == list(b)
    return a == b and type(a) is type(b)


def test_every_input_field_is_its_declared_key_with_its_default():
    for table, cls in INPUT_TABLES.items():
        declared = getattr(keys, table)
        for f in fields(cls):
            assert "key" in f.metadata, (cls.__name__, f.name)  # no input without its key
            assert declared[f.name] is f.metadata["key"], (table, f.name)
            if f.default is MISSING:
                assert declared[f.name].default is REQUIRED, (table, f.name)
            else:
                assert _same(declared[f.name].default, f.default), (table, f.name)
        assert set(declared) - {f.name for f in fields(cls)} == NOT_FIELDS.get(table, set())


def test_keys_that_are_no_field_keep_their_place_in_the_table():
    # the order of the keys is the order of the starter site and the calc package's basis
    assert list(keys.SOIL_KEYS)[7:9] == ["source", "backslope"]
    crit = list(keys.CRITERIA_KEYS)
    at = crit.index("frost_depth_ft") + 1
    assert crit[at: at + len(keys.ALONG_WALL_CRITERIA_KEYS)] == list(
        keys.ALONG_WALL_CRITERIA_KEYS)


def test_a_file_table_reaches_every_field_by_its_key():
    # DesignInputs.from_tables takes each group's field from the key of the same name
    values = {"unit_weight_pcf": 118.0, "friction_coefficient": 0.41,
              "allowable_bearing_psf": 2600.0, "friction_angle_deg": 31.0,
              "passive_from_friction_angle": True, "active_method": "coulomb",
              "wall_friction_deg": 12.0, "coulomb_plane": "stem", "backslope_deg": 10.0}
    soil = {k: values.get(k) for k in keys.SOIL_KEYS}
    crit = {k: spec.default for k, spec in keys.CRITERIA_KEYS.items()} | {
        "fs_sliding": 1.6, "hook_psi_o": 1.25, "heel_upward_pressure": False}
    mat = {k: spec.default for k, spec in keys.MATERIALS_KEYS.items()} | {"fc_psi": 4500.0}
    loads = {"surcharge_psf": 120.0, "strip": [], "seismic": {"kh": 0.15, "method":
             "mononobe-okabe"}, "water": {"level_ft": 3.0}}
    inp = DesignInputs.from_tables(soil, loads, mat, crit)
    for k, v in values.items():
        assert getattr(inp.soil, k) == v, k
    assert (inp.criteria.fs_sliding, inp.criteria.hook_psi_o) == (1.6, 1.25)
    assert inp.criteria.heel_upward_pressure is False
    assert inp.materials.fc_psi == 4500.0 and inp.loads.surcharge_psf == 120.0
    assert inp.loads.seismic == SeismicLoad(0.15, "mononobe-okabe")
    assert inp.loads.water == WaterTable(3.0)
    assert {name for name, _ in GROUPS} == {"soil", "loads", "materials", "criteria"}


def test_the_active_method_choices_are_the_registered_models():
    assert keys.SOIL_KEYS["active_method"].choices == ACTIVE_METHODS


def test_soil_values_have_no_default():
    # never default a soil parameter silently (DESIGN.md section 8): of the soil table only
    # the choices of method have defaults
    for name, spec in keys.SOIL_KEYS.items():
        if spec.kind is float:
            assert spec.default is REQUIRED or spec.default is None, name
    for f in fields(Soil):
        if f.name in ("unit_weight_pcf", "friction_coefficient", "allowable_bearing_psf"):
            assert f.default is MISSING
        elif f.default is not MISSING and f.default is not None:
            assert not isinstance(f.default, float), f.name


def test_cost_and_sizing_defaults_are_read_from_their_declaration():
    for table, engine_defaults in (("COSTS_KEYS", defaults.COSTS),
                                   ("SIZING_KEYS", defaults.SIZING)):
        declared = getattr(keys, table)
        for name, value in engine_defaults.items():
            assert _same(declared[name].default, value), (table, name)
        for name, spec in declared.items():
            if spec.default is not REQUIRED and spec.default is not None:
                assert name in engine_defaults, (table, name)
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
