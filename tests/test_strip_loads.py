"""Strip surcharges: the rigid-wall elastic strip solution, its closed-form resultant against
numerical integration, superposition, the audit, and the site and section files."""

import math

import pytest
from scipy.integrate import quad
from sitekit import make_site
from test_backslope import DATA, SOIL, agree_with_audit, geom
from wallsched.engine.pressure import design_thrust, strip_pressure_psf, strip_profile
from wallsched.engine.section import DesignInputs, SeismicLoad

from wallsched.design import wall_inputs
from wallsched.errors import InputError
from wallsched.section_file import load_section
from wallsched.site import load_site


def sigma_angles(q, a, b, z):
    """(2q/pi)(alpha - sin alpha cos 2 delta), alpha and delta from the geometry (AASHTO LRFD
    3.11.6.2 / NAVFAC DM-7.02 form for rigid walls; from memory)."""
    t1, t2 = math.atan2(a, z), math.atan2(a + b, z)
    alpha, d = t2 - t1, (t1 + t2) / 2
    return 2 * q / math.pi * (alpha - math.sin(alpha) * math.cos(2 * d))


@pytest.mark.parametrize("a,b,z", [(0.0, 3.0, 2.0), (2.0, 4.0, 5.0), (5.0, 1.0, 0.7)])
def test_pressure_formula(a, b, z):
    assert float(strip_pressure_psf(500.0, a, b, z)) == pytest.approx(
        sigma_angles(500.0, a, b, z), rel=1e-12)


def test_pressure_limits():
    # a strip reaching the wall: sigma = q at the surface (rigid wall, twice the elastic q/2)
    assert float(strip_pressure_psf(400.0, 0.0, 5.0, 0.0)) == pytest.approx(400.0)
    assert float(strip_pressure_psf(400.0, 3.0, 5.0, 0.0)) == 0.0
    # a narrow strip is a line load Q = q b: the elastic line-load solution 2 Q x^2 z /
    # (pi R^4) doubled for a rigid wall (Boussinesq; from memory)
    q, b, x, z = 400.0, 1e-3, 4.0, 3.0
    line = 4.0 * q * b * x * x * z / (math.pi * (x * x + z * z) ** 2)
    assert float(strip_pressure_psf(q, x - b / 2, b, z)) == pytest.approx(line, rel=1e-5)


@pytest.mark.parametrize("a,b,H", [(0.0, 3.0, 10.0), (2.0, 4.0, 12.0), (6.0, 2.0, 8.0)])
def test_resultant_against_integration(a, b, H):
    f, m = strip_profile(800.0, a, b, H)
    f_num = quad(lambda z: sigma_angles(800.0, a, b, z), 0, H, epsabs=1e-11)[0]  # scipy
    m_num = quad(lambda z: sigma_angles(800.0, a, b, z) * (H - z), 0, H, epsabs=1e-11)[0]
    assert float(f) == pytest.approx(f_num, rel=1e-9)
    assert float(m) == pytest.approx(m_num, rel=1e-9)
    # Jarquio (1981) resultant, degrees: P = q/90 [H (theta2 - theta1)] (from memory)
    th1, th2 = math.degrees(math.atan(a / H)), math.degrees(math.atan((a + b) / H))
    assert float(f) == pytest.approx(800.0 / 90.0 * H * (th2 - th1), rel=1e-12)


def test_superposition():
    f1, m1 = strip_profile(300.0, 1.0, 2.0, 9.0)
    f2, m2 = strip_profile(300.0, 3.0, 4.0, 9.0)
    f, m = strip_profile(300.0, 1.0, 6.0, 9.0)
    assert float(f1 + f2) == pytest.approx(float(f), rel=1e-12)
    assert float(m1 + m2) == pytest.approx(float(m), rel=1e-12)


def test_strip_in_thrust_and_seismic_case():
    g = geom()
    base = design_thrust(g, DesignInputs.of(**SOIL))
    inp = DesignInputs.of(**SOIL, strip=((2.0, 3.0, 600.0),))
    th = design_thrust(g, inp)
    f, m = strip_profile(600.0, 2.0, 3.0, 10.0)
    assert float(th.horizontal_lb - base.horizontal_lb) == pytest.approx(float(f), rel=1e-12)
    assert float(th.moment_lbft - base.moment_lbft) == pytest.approx(float(m), rel=1e-12)
    # live: left out of the seismic case like the surcharge
    assert float(design_thrust(g, inp, live=False).horizontal_lb) == pytest.approx(
        float(design_thrust(g, DesignInputs.of(**SOIL), live=False).horizontal_lb))


@pytest.mark.parametrize("kw", [dict(strip=((0.0, 3.0, 500.0),)),
                                dict(strip=((0.3, 2.0, 900.0), (5.0, 4.0, 300.0)),
                                     backslope_deg=10.0),
                                dict(strip=((1.0, 8.0, 250.0),), seismic=SeismicLoad(0.2))])
def test_engine_agrees_with_audit_strip(kw):
    assert agree_with_audit(DesignInputs.of(**{**SOIL, **kw})) == 120


def test_strip_in_section_file(tmp_path):
    text = (DATA / "passing.toml").read_text()
    f = tmp_path / "s.toml"
    f.write_text(text.replace("[materials]", "[[loads.strip]]\noffset_ft = 2\nwidth_ft = 4\n"
                              "pressure_psf = 500\nname = \"driveway\"\n\n[materials]"))
    assert load_section(f).design_inputs().loads.strip == ((2.0, 4.0, 500.0),)
    f.write_text(text.replace("[materials]", "[[loads.strip]]\noffset_ft = 2\n"
                              "pressure_psf = 500\n\n[materials]"))
    with pytest.raises(InputError, match="width_ft"):
        load_section(f)


def test_site_file_strip_seismic_water_per_wall(tmp_path):
    extra = ("\n[[loads.strip]]\noffset_ft = 3\nwidth_ft = 10\npressure_psf = 250\n"
             "\n[seismic]\nkh = 0.15\n\n[water]\nlevel_ft = 2.0\n")
    site = load_site(make_site(tmp_path / "a", extra=extra,
                               wall_extra="[walls.seismic]\nmethod = \"seed-whitman\"\n"
                                          "load_factor = 0.75\n"))
    inp = wall_inputs(site, site.walls[0])
    assert inp.loads.strip == ((3.0, 10.0, 250.0),)
    assert inp.loads.seismic == SeismicLoad(0.15, "seed-whitman", 0.75)
    assert inp.water_level_ft == 2.0
    site2 = load_site(make_site(tmp_path / "b", soil="""
[soil]
unit_weight_pcf = 120
friction_angle_deg = 32
passive_efp_pcf = 300
friction_coefficient = 0.40
allowable_bearing_psf = 2500
backslope = "3:1"
"""))
    inp2 = wall_inputs(site2, site2.walls[0])
    assert inp2.soil.backslope_deg == pytest.approx(math.degrees(math.atan(1 / 3)))
    assert inp2.loads.seismic is None and inp2.loads.water is None and inp2.loads.strip == ()
    with pytest.raises(InputError, match="own table"):
        load_site(make_site(tmp_path / "c", extra="\n[loads.seismic]\nkh = 0.1\n"))
    with pytest.raises(InputError, match="kh"):
        load_site(make_site(tmp_path / "d", wall_extra="[walls.seismic]\nmethod = "
                                                        "\"seed-whitman\"\n"))
