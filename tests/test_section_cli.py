"""``wallsched section FILE.toml [--json]`` (wallsched/cmd_section.py, section_file.py)."""

import json
import subprocess
import sys
from pathlib import Path

import pytest
from click.testing import CliRunner
from wallsched.engine.audit import audit_details
from wallsched.engine.checks import CHECK_NAMES

from wallsched.cli import main
from wallsched.section_file import load_section

DATA = Path(__file__).parent / "data" / "sections"
ROOT = Path(__file__).parent.parent
SAMPLE = ROOT / "sample_site" / "sections" / "example-section.toml"
REQUIRED = {
    "overturning": ("fs", "m_overturning_lbft", "m_resisting_lbft"),
    "sliding": ("fs", "h_driving_lb", "h_resisting_lb"),
    "bearing": ("q_max_psf", "eccentricity_ft"),
    "stem": ("mu_lbft", "phi_mn_lbft", "vu_lb", "phi_vn_lb", "d_in"),
    "heel": ("mu_lbft", "phi_mn_lbft", "vu_lb", "phi_vn_lb", "d_in"),
    "toe": ("mu_lbft", "phi_mn_lbft", "vu_lb", "phi_vn_lb", "d_in"),
}


@pytest.fixture
def runner():
    return CliRunner()


def invoke(runner, *args):
    return runner.invoke(main, ["section", *map(str, args)])


def test_passing_section_exit_0_and_table(runner):
    r = invoke(runner, DATA / "passing.toml")
    assert r.exit_code == 0, r.output
    for word in ("overturning", "stem_shear", "heel_flexure", "toe_depth",
                 "IBC 2021 1807.2.3", "Table 22.5.5.1", "every check passes", "Load factors",
                 "1.6 on lateral earth pressure", "CAUTIONS", "licensed professional engineer"):
        assert word in r.output


def test_failing_section_exit_3(runner):
    r = invoke(runner, DATA / "sliding_fails.toml")
    assert r.exit_code == 3
    assert "FAIL" in r.output and "sliding" in r.output


@pytest.mark.parametrize("name", ["passing.toml", "sliding_fails.toml", "keyed_phi.toml",
                                  "mccormac_13_3.toml", "mccormac_13_1.toml"])
def test_json_is_one_object_with_the_keys(runner, name):
    r = invoke(runner, DATA / name, "--json")
    assert r.exit_code in (0, 3)
    data = json.loads(r.output)  # exactly one JSON object, nothing else on stdout
    assert isinstance(data, dict)
    assert isinstance(data["footing_width_ft"], float)
    for table, keys in REQUIRED.items():
        for k in keys:
            assert k in data[table], (table, k)
    assert isinstance(data["passes"], bool)
    assert (r.exit_code == 0) == data["passes"]
    names = [c["name"] for c in data["checks"]]
    assert names[:len(CHECK_NAMES)] == list(CHECK_NAMES)
    for c in data["checks"]:
        assert set(c) >= {"name", "demand", "capacity", "ratio", "passes", "clause"}
    assert data["load_factors"] and data["cautions"]


@pytest.mark.parametrize("name", ["passing.toml", "keyed_phi.toml", "mccormac_13_3.toml",
                                  "mccormac_13_1.toml", "sliding_fails.toml"])
def test_json_agrees_with_the_independent_audit(runner, name):
    data = json.loads(invoke(runner, DATA / name, "--json").output)
    sf = load_section(DATA / name)
    r = sf.reinforcement
    bars = {k: r[k] for k in ("stem", "heel", "toe", "horizontal", "longitudinal") if r.get(k)}
    bars.update(horizontal_layers=r["horizontal_layers"],
                longitudinal_layers=r["longitudinal_layers"])
    rows, vals = audit_details(sf.design_inputs(), dict(sf.geometry), bars)
    pairs = {
        "footing_width_ft": data["footing_width_ft"],
        "m_overturning_lbft": data["overturning"]["m_overturning_lbft"],
        "m_resisting_lbft": data["overturning"]["m_resisting_lbft"],
        "fs_overturning": data["overturning"]["fs"], "fs_sliding": data["sliding"]["fs"],
        "h_driving_lb": data["sliding"]["h_driving_lb"],
        "h_resisting_lb": data["sliding"]["h_resisting_lb"],
        "q_max_psf": data["bearing"]["q_max_psf"],
        "eccentricity_ft": data["bearing"]["eccentricity_ft"],
    }
    for m in ("stem", "heel", "toe"):
        for k in ("mu_lbft", "phi_mn_lbft", "vu_lb", "phi_vn_lb", "d_in"):
            pairs[f"{m}_{k}"] = data[m][k]
    for k, v in pairs.items():
        assert v == pytest.approx(vals[k], rel=1e-9, abs=1e-9), k
    for c in data["checks"]:
        assert c["passes"] == rows[c["name"]].passes, c["name"]


@pytest.mark.parametrize("name,words", [
    ("bad_range.toml", ["friction_coefficient", "1.4", "<= 1"]),
    ("bad_unknown_key.toml", ["toe_feet", "toe_ft"]),
    ("bad_both_active.toml", ["active_efp_pcf", "friction_angle_deg"]),
    ("bad_bars.toml", ["stem", "#5 at 12", "#6@12"]),
    ("bad_taper.toml", ["stem_base_in", "8", ">= stem_top_in"]),
    ("bad_missing_soil.toml", ["allowable_bearing_psf"]),
])
def test_bad_file_exit_2_one_line(runner, name, words):
    r = invoke(runner, DATA / name)
    assert r.exit_code == 2
    err = r.stderr if hasattr(r, "stderr") else r.output
    lines = [x for x in err.splitlines() if x.strip()]
    assert len(lines) == 1 and "Traceback" not in err
    assert name in lines[0]
    for w in words:
        assert w in lines[0], (w, lines[0])


def test_missing_file_and_table(runner, tmp_path):
    assert invoke(runner, tmp_path / "nope.toml").exit_code == 2
    f = tmp_path / "s.toml"
    f.write_text((DATA / "passing.toml").read_text().replace("[reinforcement]", "[rebar]"))
    r = invoke(runner, f)
    assert r.exit_code == 2 and "rebar" in r.output + (r.stderr or "")


def test_key_and_freeboard_rules(runner, tmp_path):
    text = (DATA / "passing.toml").read_text()
    f = tmp_path / "k.toml"
    f.write_text(text.replace("heel_ft = 4.0", "heel_ft = 4.0\nkey_width_in = 12"))
    r = invoke(runner, f)
    assert r.exit_code == 2 and "key_depth_in" in (r.stderr or r.output)
    f.write_text(text.replace("[loads]", "[criteria]\nfreeboard_ft = 1.0\n[loads]"))
    r = invoke(runner, f)
    assert r.exit_code == 2 and "freeboard_ft" in (r.stderr or r.output)
    f.write_text(text.replace("heel_ft = 4.0", "heel_ft = 4.0\nkey_width_in = 12\n"
                              "key_depth_in = 12\nkey_offset_ft = 7.5"))
    r = invoke(runner, f)
    assert r.exit_code == 2 and "key_offset_ft" in (r.stderr or r.output)


def test_sample_section_passes_and_is_labelled_illustrative(runner):
    assert "ILLUSTRATIVE" in SAMPLE.read_text()
    r = invoke(runner, SAMPLE, "--json")
    assert r.exit_code == 0, r.output
    assert json.loads(r.output)["passes"] is True


def test_help_lists_section_and_stays_light():
    code = ("import sys, wallsched.cli as c; from click.testing import CliRunner; "
            "r = CliRunner().invoke(c.main, ['--help']); assert 'section' in r.output; "
            "heavy = [m for m in ('pandas', 'matplotlib', 'geopandas', 'wallsched.engine.checks')"
            " if m in sys.modules]; print(heavy)")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         cwd=ROOT / "tests", check=True).stdout
    assert "wallsched.engine.checks" not in out


def test_design_inputs_defaults_match_declared_keys():
    from dataclasses import MISSING, fields

    from wallsched.engine.inputs import GROUPS

    from wallsched.keys import CRITERIA_KEYS, LOADS_KEYS, MATERIALS_KEYS, SOIL_KEYS
    from wallsched.schema import REQUIRED as REQ

    declared = {**SOIL_KEYS, **LOADS_KEYS, **MATERIALS_KEYS, **CRITERIA_KEYS}
    for f in (f for _, group in GROUPS for f in fields(group)):
        assert f.name in declared, f.name
        spec = declared[f.name]
        if f.default is MISSING:
            assert spec.default is REQ, f.name
        else:
            assert f.default == spec.default, f.name
