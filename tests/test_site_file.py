"""Site-file validation: every message names the file and the key, with a hint."""

from pathlib import Path

import pytest
from sitekit import SOIL, make_site, write

from wallsched.errors import InputError
from wallsched.site import load_site


def test_loads_and_resolves_overrides(tmp_path: Path):
    site = load_site(make_site(tmp_path, wall_extra="surcharge_psf = 300\n[walls.criteria]\n"
                                                   "fs_sliding = 1.6\n"))
    w = site.walls[0]
    assert w.loads["surcharge_psf"] == 300 and site.loads["surcharge_psf"] == 100
    assert w.criteria["fs_sliding"] == 1.6 and w.criteria["fs_overturning"] == 1.5
    assert w.soil["unit_weight_pcf"] == 120
    assert set(site.input_hashes()) == {"site.toml", "align.csv", "top.csv", "bottom.csv"}


def _error(tmp_path: Path, **kw) -> str:
    with pytest.raises(InputError) as err:
        load_site(make_site(tmp_path, **kw))
    line = err.value.one_line()
    assert "\n" not in line
    assert "site.toml" in line
    return line


def test_unknown_key_gets_a_did_you_mean(tmp_path):
    line = _error(tmp_path, extra="[criteria]\nfs_overturnin = 1.5\n")
    assert "unknown key 'fs_overturnin'" in line and "did you mean 'fs_overturning'" in line
    assert "[criteria]" in line and "line " in line


def test_unknown_table(tmp_path):
    line = _error(tmp_path, extra="[soils]\nx = 1\n")
    assert "'soils'" in line and "did you mean 'soil'" in line


@pytest.mark.parametrize("missing", ["unit_weight_pcf", "friction_coefficient",
                                     "allowable_bearing_psf"])
def test_missing_soil_key_is_an_error_never_a_default(tmp_path, missing):
    soil = "\n".join(line for line in SOIL.splitlines() if not line.startswith(missing))
    line = _error(tmp_path, soil=soil)
    assert missing in line and "never" in line


def test_both_active_bases_refused(tmp_path):
    line = _error(tmp_path, soil=SOIL + "friction_angle_deg = 30\n")
    assert "either active_efp_pcf or friction_angle_deg" in line


def test_no_active_basis_refused(tmp_path):
    soil = SOIL.replace("active_efp_pcf = 35\n", "")
    assert "active_efp_pcf" in _error(tmp_path, soil=soil)


def test_passive_required_when_used(tmp_path):
    soil = SOIL.replace("passive_efp_pcf = 300\n", "")
    assert "passive_efp_pcf" in _error(tmp_path, soil=soil)
    site = load_site(make_site(tmp_path, soil=soil, extra="[criteria]\nuse_passive = false\n"))
    assert site.walls[0].soil["passive_efp_pcf"] is None


def test_wall_may_switch_active_basis(tmp_path):
    site = load_site(make_site(tmp_path, wall_extra="friction_angle_deg = 32\n"
                                                    "passive_from_friction_angle = true\n"))
    w = site.walls[0]
    assert w.soil["friction_angle_deg"] == 32 and w.soil["active_efp_pcf"] is None


@pytest.mark.parametrize(("extra", "pattern"), [
    ("[criteria]\nfs_sliding = 0.5\n", r"fs_sliding.*out of range.*>= 1"),
    ("[criteria]\nfs_sliding = \"high\"\n", r"fs_sliding.*must be a number"),
    ("[criteria]\nuse_passive = 1\n", r"use_passive.*true or false"),
    ("[criteria]\nbatter_face = \"side\"\n", r"batter_face.*'back', 'front'"),
])
def test_wrong_types_and_ranges(tmp_path, extra, pattern):
    import re

    assert re.search(pattern, _error(tmp_path, extra=extra))


def test_negative_soil_value(tmp_path):
    line = _error(tmp_path, soil=SOIL.replace("= 2500", "= -2500"))
    assert "allowable_bearing_psf" in line and "out of range" in line


def test_duplicate_wall_ids(tmp_path):
    p = make_site(tmp_path)
    text = p.read_text()
    wall = text[text.index("[[walls]]"):]
    p.write_text(text + "\n" + wall)
    with pytest.raises(InputError, match=r"wall id 'A' is used twice"):
        load_site(p)


@pytest.mark.parametrize(("value", "pattern"), [
    ('"../outside.csv"', "leaves the site folder"),
    ('"/etc/passwd"', "absolute path"),
    ('"nope.csv"', "not found"),
])
def test_paths_stay_inside_the_site_folder(tmp_path, value, pattern):
    inner = tmp_path / "site"
    write(tmp_path / "outside.csv", "station,elevation\n0,1\n100,1\n")
    p = make_site(inner)
    p.write_text(p.read_text().replace('"top.csv"', value))
    with pytest.raises(InputError, match=pattern) as err:
        load_site(p)
    assert "retained_grade" in err.value.one_line()


def test_symlink_leaving_the_folder_is_refused(tmp_path):
    inner = tmp_path / "site"
    write(tmp_path / "outside.csv", "station,elevation\n0,1\n100,1\n")
    p = make_site(inner)
    (inner / "link.csv").symlink_to(tmp_path / "outside.csv")
    p.write_text(p.read_text().replace('"top.csv"', '"link.csv"'))
    with pytest.raises(InputError, match="leaves the site folder"):
        load_site(p)


def test_toml_syntax_error_has_its_line(tmp_path):
    p = write(tmp_path / "site.toml", '[site]\nname = "x"\n[soil\n')
    with pytest.raises(InputError, match=r"site\.toml: line 3: not valid TOML"):
        load_site(p)


def test_missing_walls(tmp_path):
    p = write(tmp_path / "site.toml", '[site]\nname = "x"\n' + SOIL)
    with pytest.raises(InputError, match=r"no \[\[walls\]\]"):
        load_site(p)
