"""GIS alignments (GeoPackage, GeoJSON, Shapefile) written here with geopandas and read back."""

from __future__ import annotations

import geopandas as gpd
import numpy as np
import pandas as pd
import pytest
import shapely
from sitekit import SOIL, write
from wallsched.profile.gisread import read_alignment_gis, read_grade_gis

from wallsched.cli import main
from wallsched.errors import InputError, ProfileError

# EPSG:2229 NAD83 / California zone 5 (ftUS) - a projected CRS in US survey feet (EPSG registry)
# EPSG:32611 WGS 84 / UTM zone 11N - projected, metres;  EPSG:4326 WGS 84 - geographic
FT_CRS, M_CRS, GEO_CRS = "EPSG:2229", "EPSG:32611", "EPSG:4326"
US_FT_IN_FT = 1200 / 3937 / 0.3048  # US survey foot in international feet (exact definitions)
XY_A = [(6_400_000.0, 1_800_000.0), (6_400_120.0, 1_800_000.0), (6_400_150.0, 1_800_040.0)]


def walls_frame(crs=FT_CRS, coords=None):
    lines = [shapely.LineString(coords or XY_A),
             shapely.LineString([(6_401_000.0, 1_800_500.0), (6_401_000.0, 1_800_600.0)])]
    return gpd.GeoDataFrame({"wall_id": ["A", "B"], "num": [7, 8]}, geometry=lines, crs=crs)


def test_geopackage_by_field_value(tmp_path):
    path = tmp_path / "walls.gpkg"
    walls_frame().to_file(path, layer="walls", driver="GPKG")
    a = read_alignment_gis(path, {"field": "wall_id", "value": "A"}, "walls.gpkg")
    # coordinates are US survey feet; the alignment is in international feet
    np.testing.assert_allclose(np.asarray(a.line.coords), np.array(XY_A) * US_FT_IN_FT,
                               rtol=1e-12)
    assert a.length_ft == pytest.approx((120 + 50) * US_FT_IN_FT, abs=1e-6)
    b = read_alignment_gis(path, {"field": "num", "value": 8, "layer": "walls",
                                  "start": [6_401_000.0, 1_800_600.0]}, "walls.gpkg")
    assert np.asarray(b.line.coords)[0, 1] == pytest.approx(1_800_600.0 * US_FT_IN_FT)


def test_missing_value_and_field_are_named(tmp_path):
    path = tmp_path / "walls.gpkg"
    walls_frame().to_file(path, driver="GPKG")
    with pytest.raises(ProfileError, match="no feature has wall_id = 'C'.*A, B"):
        read_alignment_gis(path, {"field": "wall_id", "value": "C"}, "walls.gpkg")
    with pytest.raises(ProfileError, match="no field 'id'.*wall_id"):
        read_alignment_gis(path, {"field": "id", "value": "A"}, "walls.gpkg")
    with pytest.raises(ProfileError, match="holds 2 features"):
        read_alignment_gis(path, {}, "walls.gpkg")


def test_geographic_crs_is_refused_unless_reprojected(tmp_path):
    frame = walls_frame().to_crs(GEO_CRS)
    path = tmp_path / "walls.geojson"
    frame.to_file(path, driver="GeoJSON")
    with pytest.raises(ProfileError, match="geographic CRS.*degrees.*not lengths"):
        read_alignment_gis(path, {"field": "wall_id", "value": "A"}, "walls.geojson")
    a = read_alignment_gis(path, {"field": "wall_id", "value": "A", "to_crs": FT_CRS},
                           "walls.geojson")
    # the round trip through latitude/longitude by pyproj comes back within a thousandth
    assert a.length_ft == pytest.approx(170 * US_FT_IN_FT, abs=1e-3)


def test_metre_crs_needs_units_then_converts(tmp_path):
    coords = [(400_000.0, 3_700_000.0), (400_030.48, 3_700_000.0)]  # 30.48 m = 100 ft
    path = tmp_path / "walls_m.shp"
    walls_frame(M_CRS, coords).to_file(path)
    with pytest.raises(ProfileError, match=r"not feet; add units = \"m\""):
        read_alignment_gis(path, {"field": "wall_id", "value": "A"}, "walls_m.shp")
    with pytest.raises(ProfileError, match="says units"):
        read_alignment_gis(path, {"field": "wall_id", "value": "A", "units": "ft"},
                           "walls_m.shp")
    a = read_alignment_gis(path, {"field": "wall_id", "value": "A", "units": "m"},
                           "walls_m.shp")
    assert a.length_ft == pytest.approx(100.0, abs=1e-6)


def test_3d_line_feature_as_a_grade(tmp_path):
    a_xy = np.array(XY_A[:2])
    path = tmp_path / "grade.gpkg"
    z_line = shapely.LineString([(x, y + 2.0, z) for (x, y), z in zip(a_xy, (410.0, 416.0),
                                                                     strict=True)])
    gpd.GeoDataFrame({"name": ["top"]}, geometry=[z_line], crs=FT_CRS).to_file(path)
    al = read_alignment_gis(_one(tmp_path), {}, "w.gpkg")
    g = read_grade_gis(path, {}, "grade.gpkg", alignment=al, start_station_ft=0.0)
    np.testing.assert_allclose(g.station_ft, [0.0, 120 * US_FT_IN_FT], atol=1e-6)
    np.testing.assert_allclose(g.elevation_ft, np.array([410.0, 416.0]) * US_FT_IN_FT)


def _one(folder):
    path = folder / "w.gpkg"
    gpd.GeoDataFrame({"wall_id": ["A"]}, geometry=[shapely.LineString(XY_A[:2])],
                     crs=FT_CRS).to_file(path)
    return path


def test_cli_stations_with_a_gis_alignment(runner, tmp_path):
    walls_frame().to_file(tmp_path / "walls.gpkg", driver="GPKG")
    length = 170 * US_FT_IN_FT
    write(tmp_path / "top.csv", f"station,elevation\n0,100\n60,104\n{length:.4f},103\n")
    write(tmp_path / "bottom.csv", f"station,elevation\n0,99\n{length:.4f},99.5\n")
    site = write(tmp_path / "site.toml", f"""
        [site]
        name = "GIS site"
        {SOIL}
        [[walls]]
        id = "A"
        retained_side = "right"
        alignment = {{ gis = "walls.gpkg", field = "wall_id", value = "A" }}
        retained_grade = "top.csv"
        front_grade = "bottom.csv"
        """)
    out = tmp_path / "out"
    res = runner.invoke(main, ["stations", str(site), "--out", str(out), "--no-plots"])
    assert res.exit_code == 0, res.output
    frame = pd.read_csv(out / "stations.csv")
    assert frame.station_ft.iloc[-1] == pytest.approx(length, abs=1e-3)
    # x at station 60 lies on the first leg, 60 ft from its start
    row = frame[np.isclose(frame.station_ft, 60.0)].iloc[0]
    assert row.x == pytest.approx(XY_A[0][0] * US_FT_IN_FT + 60.0, abs=1e-3)


def test_site_file_refuses_half_a_selection(tmp_path):
    walls_frame().to_file(tmp_path / "walls.gpkg", driver="GPKG")
    write(tmp_path / "top.csv", "station,elevation\n0,100\n200,103\n")
    site = write(tmp_path / "site.toml", f"""
        [site]
        name = "GIS site"
        {SOIL}
        [[walls]]
        id = "A"
        retained_side = "right"
        alignment = {{ gis = "walls.gpkg", field = "wall_id" }}
        retained_grade = "top.csv"
        front_grade = "top.csv"
        """)
    from wallsched.site import load_site

    with pytest.raises(InputError, match="field and value together"):
        load_site(site)
