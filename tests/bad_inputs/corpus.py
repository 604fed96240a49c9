"""The bad-input corpus: broken sites, each with the message it must produce.

Every case starts from the small invented site of ``sitekit.make_site`` (one wall, CSV
profiles) and breaks one thing. ``expect`` is a fragment of the one error line, ``file`` the
file it must name and ``where`` the line or key it must name (None where the fault is the
whole file, e.g. an empty one).

A UTF-8 byte-order mark alone is legitimate spreadsheet output and is accepted (see
``test_bom_alone_is_accepted``); the BOM cases here are a BOM plus another fault (a semicolon
separator) and a UTF-16 file.
"""

from __future__ import annotations

import io
import os
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path

from sitekit import make_site

SMALL_GRID = """
[sizing]
toe_max_ft = 3
heel_max_ft = 6
footing_thickness_max_in = 18
stem_max_in = 12
"""


@dataclass(frozen=True)
class Case:
    name: str
    build: Callable[[Path], Path]  # writes the site into a folder, returns the site file
    expect: str
    file: str
    where: str | None


def site(folder: Path) -> Path:
    return make_site(folder, extra=SMALL_GRID)


def edit(old: str, new: str, *, count: int = 1):
    def build(folder: Path) -> Path:
        path = site(folder)
        text = path.read_text()
        assert old in text, old
        path.write_text(text.replace(old, new, count))
        return path
    return build


def file_text(name: str, text: str | bytes):
    def build(folder: Path) -> Path:
        path = site(folder)
        target = folder / name
        if isinstance(text, bytes):
            target.write_bytes(text)
        else:
            target.write_text(text)
        return path
    return build


def grade(*rows: str, header: str = "station,elevation") -> str:
    return header + "\n" + "".join(r + "\n" for r in rows)


def new_dxf(units: int = 2):
    import ezdxf

    doc = ezdxf.new()
    doc.header["$INSUNITS"] = units  # 2 = feet (DXF reference)
    return doc


def dxf_source(draw, *, key: str = "alignment", old: str = '"align.csv"',
               options: str = 'layer = "WALL"', units: int = 2):
    """The wall's ``key`` read from plan.dxf drawn by ``draw(modelspace)``."""
    def build(folder: Path) -> Path:
        path = site(folder)
        doc = new_dxf(units)
        draw(doc)
        doc.saveas(folder / "plan.dxf")
        text = path.read_text().replace(f"{key} = {old}",
                                        f'{key} = {{ dxf = "plan.dxf", {options} }}')
        path.write_text(text)
        return path
    return build


def dxf_bytes(data: bytes):
    def build(folder: Path) -> Path:
        path = site(folder)
        (folder / "plan.dxf").write_bytes(data)
        path.write_text(path.read_text().replace(
            'alignment = "align.csv"', 'alignment = { dxf = "plan.dxf", layer = "WALL" }'))
        return path
    return build


def huge_lwpolyline(folder: Path) -> Path:
    """An alignment of 10**6 vertices (written as text: ezdxf would take minutes)."""
    path = site(folder)
    doc = new_dxf()
    doc.modelspace().add_lwpolyline([(0.0, 0.0), (7777.0, 0.0)], dxfattribs={"layer": "WALL"})
    buf = io.StringIO()
    doc.write(buf)
    text = buf.getvalue()
    n = 1_000_000
    i = text.index(" 90\n2\n")
    a = text.index(" 10\n0.0\n", i)
    b = text.index(" 10\n7777.0\n 20\n0.0\n", a) + len(" 10\n7777.0\n 20\n0.0\n")
    body = "".join(f" 10\n{k * 0.01:.2f}\n 20\n0.0\n" for k in range(n))
    text = text[:i] + f" 90\n{n}\n" + text[i + len(" 90\n2\n"):a] + body + text[b:]
    (folder / "plan.dxf").write_text(text)
    path.write_text(path.read_text().replace(
        'alignment = "align.csv"', 'alignment = { dxf = "plan.dxf", layer = "WALL" }'))
    return path


def million_rows(folder: Path) -> Path:
    path = site(folder)
    rows = "".join(f"{k * 0.0001:.4f},100.0\n" for k in range(1_000_000))
    (folder / "top.csv").write_text("station,elevation\n" + rows)
    return path


def symlink_out(folder: Path) -> Path:
    path = site(folder)
    outside = folder.parent / f"{folder.name}-outside.csv"
    outside.write_text("x,y\n0,0\n100,0\n")
    os.symlink(outside, folder / "linked.csv")
    path.write_text(path.read_text().replace('alignment = "align.csv"',
                                             'alignment = "linked.csv"'))
    return path


def two_walls_same_id(folder: Path) -> Path:
    path = site(folder)
    text = path.read_text()
    wall = text[text.index("[[walls]]"):]
    path.write_text(text + "\n" + wall)
    return path


def soil_line(old: str, new: str):
    return edit(old, new)


ST = "site.toml"
W = "walls[1] (id 'A')"

CASES: list[Case] = [
    # ---- malformed CSV
    Case("csv_missing_column", file_text("top.csv", grade("0,100", "100,101",
                                                           header="station,height")),
         "no 'elevation' column", "top.csv", "line 1"),
    Case("csv_text_in_number", file_text("top.csv", grade("0,100", "50,abc", "100,101")),
         "'abc' is not a number", "top.csv", "line 3"),
    Case("csv_nan", file_text("top.csv", grade("0,100", "50,nan", "100,101")),
         "'nan' is not a finite number", "top.csv", "line 3"),
    Case("csv_inf", file_text("top.csv", grade("0,100", "50,-inf", "100,101")),
         "'-inf' is not a finite number", "top.csv", "line 3"),
    Case("csv_empty", file_text("top.csv", ""), "is empty", "top.csv", None),
    Case("csv_header_only", file_text("top.csv", grade()), "has 0 data row(s)", "top.csv",
         None),
    Case("csv_utf16", file_text("top.csv", grade("0,100", "100,101").encode("utf-16")),
         "is UTF-16 text", "top.csv", None),
    Case("csv_bom_and_semicolons",
         file_text("top.csv", b"\xef\xbb\xbf" + grade("0;100,0", "100;101,0",
                                                      header="station;elevation").encode()),
         "uses ';' between columns", "top.csv", "line 1"),
    Case("csv_semicolon", file_text("bottom.csv", grade("0;99", "100;99.5",
                                                        header="station;elevation")),
         "uses ';' between columns", "bottom.csv", "line 1"),
    Case("csv_decimal_comma", file_text("top.csv", grade("0,100,5", "100,101,25")),
         "decimal comma", "top.csv", "line 2"),
    Case("csv_short_row", file_text("top.csv", grade("0,100", "50", "100,101")),
         "has 1 value(s)", "top.csv", "line 3"),
    Case("csv_blank_value", file_text("top.csv", grade("0,100", "50,", "100,101")),
         "'' is not a number", "top.csv", "line 3"),
    Case("csv_unclosed_quote", file_text("top.csv", grade("0,100", '50,"101', "100,101")),
         "unclosed quote", "top.csv", "line 3"),
    Case("csv_binary", file_text("top.csv", b"station,elevation\n0,100\n\x00\x01\x02\n"),
         "binary content", "top.csv", "line 3"),
    Case("csv_giant_field", file_text("top.csv", grade("0,100", "50," + "1" * 200_000,
                                                       "100,101")),
         "characters long", "top.csv", "line 3"),
    Case("csv_alignment_text", file_text("align.csv", "x,y\n0,0\n100,north\n"),
         "'north' is not a number", "align.csv", "line 3"),
    # ---- stations
    Case("stations_duplicate", file_text("top.csv", grade("0,100", "50,101", "50,102",
                                                          "100,101")),
         "is given twice with different elevations", "top.csv", "line 4"),
    Case("stations_decreasing", file_text("top.csv", grade("0,100", "60,101", "40,102",
                                                           "100,101")),
         "comes after", "top.csv", "line 4"),
    Case("station_notation", file_text("top.csv", grade("0+00,100", "0+5x,101", "1+00,101")),
         "is not a station", "top.csv", "line 3"),
    # ---- coverage, side, plausibility
    Case("profile_short_of_wall", file_text("top.csv", grade("0,100", "80,104")),
         "uncovered 0+80.00 to 1+00.00", "top.csv", None),
    Case("profile_starts_late", file_text("bottom.csv", grade("20,99", "100,99.5")),
         "uncovered 0+00.00 to 0+20.00", "bottom.csv", None),
    Case("retained_side_swapped", edit('retained_grade = "top.csv"\nfront_grade = "bottom.csv"',
                                       'retained_grade = "bottom.csv"\n'
                                       'front_grade = "top.csv"'),
         "front grade is above the retained grade at every station", "bottom.csv", None),
    Case("one_elevation_in_metres", file_text("top.csv", grade("0,100", "40,32.31",
                                                               "100,103")),
         "the elevation jumps from 100 (line 2) to 32.31", "top.csv", "line 3"),
    Case("front_grade_in_metres", file_text("bottom.csv", grade("0,30.18", "100,30.33")),
         "more than the plausible 60 ft", "top.csv", None),
    Case("station_out_of_range", file_text("top.csv", grade("0,100", "99999999999,101")),
         "out of range", "top.csv", "line 3"),
    # ---- alignments
    Case("alignment_zero_length", file_text("align.csv", "x,y\n5,5\n5,5\n"), "zero length",
         "align.csv", None),
    Case("alignment_one_vertex", file_text("align.csv", "x,y\n5,5\n"), "zero length",
         "align.csv", None),
    Case("alignment_self_intersecting",
         file_text("align.csv", "x,y\n0,0\n60,0\n30,30\n30,-30\n"), "crosses itself",
         "align.csv", None),
    Case("alignment_coordinates_overflow", file_text("align.csv", "x,y\n0,0\n1e200,0\n"),
         "out of range", "align.csv", "line 3"),
    # ---- DXF
    Case("dxf_missing_layer", dxf_source(lambda d: d.modelspace().add_lwpolyline(
        [(0, 0), (100, 0)], dxfattribs={"layer": "OTHER"})),
         "layer 'WALL' is not in the drawing", "plan.dxf", "layer WALL"),
    Case("dxf_empty_layer", dxf_source(lambda d: d.layers.add("WALL")),
         "layer 'WALL' has no entities", "plan.dxf", "layer WALL"),
    Case("dxf_layer_only_text", dxf_source(lambda d: d.modelspace().add_text(
        "WALL A", dxfattribs={"layer": "WALL"})),
         "holds no LWPOLYLINE", "plan.dxf", "layer WALL"),
    Case("dxf_binary_garbage", dxf_bytes(bytes((k * 7919 + 13) % 256 for k in range(6000))),
         "is not a DXF drawing", "plan.dxf", None),
    Case("dxf_text_garbage", dxf_bytes(b"  0\nSECTION\n  2\nENTITIES\n  0\nLWPOLYLINE\n"
                                       b"  8\nWALL\n 10\nabc\n  0\nENDSEC\n  0\nEOF\n"),
         "is not a readable DXF drawing", "plan.dxf", None),
    Case("dxf_empty_file", dxf_bytes(b""), "is not a DXF drawing", "plan.dxf", None),
    Case("dxf_in_metres", dxf_source(lambda d: d.modelspace().add_lwpolyline(
        [(0, 0), (30.48, 0)], dxfattribs={"layer": "WALL"}), units=6),
         "units ($INSUNITS) are metres", "plan.dxf", None),
    Case("dxf_alignment_gap", dxf_source(lambda d: (
        d.modelspace().add_lwpolyline([(0, 0), (50, 0)], dxfattribs={"layer": "WALL"}),
        d.modelspace().add_lwpolyline([(52, 0), (100, 0)], dxfattribs={"layer": "WALL"}))),
         "does not join the alignment", "plan.dxf", "layer WALL"),
    Case("dxf_grade_gap", dxf_source(lambda d: (
        d.modelspace().add_polyline3d([(0, 1, 100), (40, 1, 106)],
                                      dxfattribs={"layer": "TOP"}),
        d.modelspace().add_polyline3d([(60, 1, 105), (100, 1, 103)],
                                      dxfattribs={"layer": "TOP"})),
        key="retained_grade", old='"top.csv"', options='layer = "TOP"'),
         "has a gap from station 40.00", "plan.dxf", "layer TOP"),
    Case("dxf_grade_in_metres_jump", dxf_source(lambda d: (
        d.modelspace().add_polyline3d([(0, 1, 100), (40, 1, 106), (41, 1, 31.2),
                                       (100, 1, 103)], dxfattribs={"layer": "TOP"})),
        key="retained_grade", old='"top.csv"', options='layer = "TOP"'),
         "the elevation jumps from 106.00", "plan.dxf", "layer TOP"),
    Case("dxf_million_vertices", huge_lwpolyline, "the limit is 500,000", "plan.dxf", None),
    # ---- site file: keys, types, ranges
    Case("unknown_key", soil_line("unit_weight_pcf", "unit_weigth_pcf"),
         "did you mean 'unit_weight_pcf'", ST, "[soil] unit_weigth_pcf"),
    Case("unknown_table", edit("[loads]", "[load]"), "unknown table or key 'load'", ST,
         "line 11"),
    Case("unknown_wall_key", edit('retained_side = "left"', 'retained_side = "left"\n'
                                                            'hieght = 3'),
         "unknown key 'hieght'", ST, "hieght"),
    Case("unknown_source_option", dxf_source(lambda d: None, options='layr = "WALL"'),
         "unknown option 'layr'", ST, f"{W}.alignment"),
    Case("wrong_type_number", edit("unit_weight_pcf = 120", 'unit_weight_pcf = "120"'),
         "must be a number", ST, "[soil] unit_weight_pcf"),
    Case("wrong_type_bool", edit("[loads]", "[criteria]\nuse_passive = \"yes\"\n[loads]"),
         "must be true or false", ST, "[criteria] use_passive"),
    Case("wrong_type_wall_table", edit('front_grade = "bottom.csv"',
                                       'front_grade = "bottom.csv"\nsoil = 3'),
         "must be a table of keys", ST, f"{W}.soil"),
    Case("wrong_type_walls", edit("[[walls]]", "[walls]"), "must be an array of tables", ST,
         "walls"),
    Case("wrong_choice_side", edit('retained_side = "left"', 'retained_side = "uphill"'),
         "'uphill' is not allowed", ST, "retained_side"),
    Case("zero_bearing", edit("allowable_bearing_psf = 2500", "allowable_bearing_psf = 0"),
         "out of range", ST, "[soil] allowable_bearing_psf"),
    Case("negative_friction", edit("friction_coefficient = 0.40",
                                   "friction_coefficient = -0.4"),
         "out of range", ST, "[soil] friction_coefficient"),
    Case("zero_station_interval", edit("[loads]", "[criteria]\nstation_interval_ft = 0\n"
                                                  "[loads]"),
         "out of range", ST, "[criteria] station_interval_ft"),
    Case("negative_toe", edit("toe_max_ft = 3", "toe_max_ft = -3"), "out of range", ST,
         "[sizing] toe_max_ft"),
    Case("negative_wall_override", edit('front_grade = "bottom.csv"',
                                        'front_grade = "bottom.csv"\nsurcharge_psf = -50'),
         "out of range", ST, f"{W}.surcharge_psf"),
    Case("efp_and_friction_angle", edit("active_efp_pcf = 35",
                                        "active_efp_pcf = 35\nfriction_angle_deg = 32"),
         "either active_efp_pcf or friction_angle_deg, not both", ST, "[soil]"),
    Case("no_active_pressure", edit("active_efp_pcf = 35\n", ""),
         "missing the active pressure", ST, "[soil]"),
    Case("missing_soil_key", edit("friction_coefficient = 0.40\n", ""),
         "missing required soil key 'friction_coefficient'", ST, "[soil]"),
    Case("toml_syntax", edit("surcharge_psf = 100", "surcharge_psf = = 100"),
         "not valid TOML", ST, "line 12"),
    Case("toml_nesting", lambda f: (site(f), (f / ST).write_text(
        "x = " + "[" * 50_000 + "]" * 50_000))[0], "nests arrays or tables too deeply", ST,
         None),
    Case("duplicate_wall_ids", two_walls_same_id, "wall id 'A' is used twice", ST,
         "walls[2].id"),
    # ---- paths
    Case("path_parent", edit('alignment = "align.csv"', 'alignment = "../align.csv"'),
         "leaves the site folder", ST, f"{W}.alignment"),
    Case("path_absolute", edit('alignment = "align.csv"', 'alignment = "/etc/hostname"'),
         "is an absolute path", ST, f"{W}.alignment"),
    Case("path_symlink_outside", symlink_out, "leaves the site folder", ST, f"{W}.alignment"),
    Case("path_missing", edit('front_grade = "bottom.csv"', 'front_grade = "botom.csv"'),
         "file 'botom.csv' not found", ST, f"{W}.front_grade"),
    Case("path_is_folder", lambda f: (site(f), (f / "dir.csv").mkdir(), (f / ST).write_text(
        (f / ST).read_text().replace('"bottom.csv"', '"dir.csv"')))[0], "is not a file", ST,
         f"{W}.front_grade"),
    # ---- size
    Case("million_row_profile", million_rows, "1,000,000 data rows; the limit is 100,000",
         "top.csv", None),
]


# ---- hostile inputs and faults (issue 19): ids, numbers from every source, alignments that
# fold back, DXF geometry, ranges as sets, resources. ``DESIGN_ONLY`` cases are refused by
# ``design`` (the resource estimate) and run by ``stations``.

def wall_line(new: str):
    """Add ``new`` to the wall's keys."""
    return edit('front_grade = "bottom.csv"', 'front_grade = "bottom.csv"\n' + new)


def table(text: str):
    """Add a table before [loads] (an array of tables at the end); ``[sizing]`` keys go into
    the small grid's table, replacing its own."""
    def build(folder: Path) -> Path:
        import re

        path = site(folder)
        body = path.read_text()
        if text.startswith("[sizing]"):
            for line in text.splitlines()[1:]:
                key = line.split("=")[0].strip()
                body, n = re.subn(rf"(?m)^{key} = .*$", line, body)
                if not n:
                    body = body.replace("[sizing]\n", f"[sizing]\n{line}\n", 1)
        elif text.startswith("[["):
            body += "\n" + text + "\n"
        else:
            body = body.replace("[loads]", text + "\n[loads]", 1)
        path.write_text(body)
        return path
    return build


def profile_view(**opts):
    """The retained grade read from a DXF profile view with ``opts`` (TOML values as text)."""
    def draw(doc):
        doc.modelspace().add_lwpolyline([(0, 10), (40, 22), (100, 16)],
                                        dxfattribs={"layer": "TW"})
    base = {"view": '"profile"', "origin_station_ft": "0", "origin_elevation_ft": "95",
            "vertical_exaggeration": "2"}
    base.update(opts)
    inline = 'layer = "TW", ' + ", ".join(f"{k} = {v}" for k, v in base.items())
    return dxf_source(draw, key="retained_grade", old='"top.csv"', options=inline)


def plan_alignment(opt: str):
    """The alignment from two pieces 40 ft apart on a DXF layer, with the option ``opt``."""
    def draw(doc):
        doc.modelspace().add_lwpolyline([(0, 0), (50, 0)], dxfattribs={"layer": "WALL"})
        doc.modelspace().add_lwpolyline([(90, 0), (140, 0)], dxfattribs={"layer": "WALL"})
    return dxf_source(draw, options=f'layer = "WALL", {opt}')


def dxf_truncated(folder: Path) -> Path:
    path = site(folder)
    doc = new_dxf()
    doc.modelspace().add_lwpolyline([(0, 0), (100, 0)], dxfattribs={"layer": "WALL"})
    buf = io.StringIO()
    doc.write(buf)
    text = buf.getvalue()
    (folder / "plan.dxf").write_text(text[:text.index("ENTITIES")])  # cut before the lines
    path.write_text(path.read_text().replace(
        'alignment = "align.csv"', 'alignment = { dxf = "plan.dxf", layer = "WALL" }'))
    return path


def gis_grade(z: float, *, to_crs: str | None = None):
    """The retained grade from a GeoPackage line whose middle vertex has elevation ``z``."""
    def build(folder: Path) -> Path:
        import geopandas as gpd
        import shapely

        path = site(folder)
        line = shapely.LineString([(0, 1, 100.0), (40, 1, z), (100, 1, 103.0)])
        gpd.GeoDataFrame({"name": ["TW"]}, geometry=[line], crs="EPSG:2227").to_file(
            folder / "grade.gpkg", driver="GPKG")
        extra = f', to_crs = "{to_crs}"' if to_crs else ""
        path.write_text(path.read_text().replace(
            'retained_grade = "top.csv"', f'retained_grade = {{ gis = "grade.gpkg"{extra} }}'))
        return path
    return build


def long_wall(folder: Path, criteria: str = "station_interval_ft = 1.0") -> Path:
    """A 3,000 ft wall whose segments may be 1,000 ft long: the segments' recursion (over
    ends 2 ft apart) would need more than the 2 GB budget."""
    path = make_site(folder, extra=SMALL_GRID + f"\n[criteria]\n{criteria}\n"
                     "segment_max_ft = 1000\n", xy=((0.0, 0.0), (3000.0, 0.0)),
                     top=((0, 100.0), (1500, 106.0), (3000, 103.0)),
                     bottom=((0, 99.0), (3000, 99.5)))
    return path


def dense_points(folder: Path) -> Path:
    """The long wall with grade points 0.5 ft apart: a segment may span 500 ends."""
    path = long_wall(folder, "station_interval_ft = 5.0")
    rows = "".join(f"{k * 0.5:.1f},{104.0 + 0.01 * (k % 2):.2f}\n" for k in range(6001))
    (folder / "top.csv").write_text("station,elevation\n" + rows)
    return path


FINEST_GRID = ("[sizing]\ntoe_max_ft = 30\nheel_max_ft = 40\ntoe_heel_step_in = 1\n"
               "footing_thickness_min_in = 8\nfooting_thickness_max_in = 96\n"
               "footing_thickness_step_in = 0.5\nstem_min_in = 6\nstem_max_in = 72\n"
               "stem_step_in = 0.5")
HUGE = "9" * 400
WS = f"{W}.retained_grade"
WA = f"{W}.alignment"

HOSTILE: list[Case] = [
    # ---- wall ids and text
    Case("id_empty", edit('id = "A"', 'id = " "'), "wall id is empty", ST, "walls[1].id"),
    Case("id_bell", edit('id = "A"', 'id = "A\\u0007"'), "control character (U+0007)", ST,
         "[walls] id"),
    Case("id_nul", edit('id = "A"', 'id = "A\\u0000B"'), "control character (U+0000)", ST,
         "[walls] id"),
    Case("id_bidi_override", edit('id = "A"', 'id = "W\\u202e1"'), "control character (U+202E)",
         ST, "walls[1].id"),
    Case("site_name_escape", edit('name = "Test site"', 'name = "Test\\u001b[31m site"'),
         "control character (U+001B)", ST, "[site] name"),
    Case("notes_too_long", edit('name = "Test site"',
                                f'name = "Test site"\nnotes = "{"x" * 5000}"'),
         "5,000 characters long", ST, "[site] notes"),
    # ---- numbers in the site file
    Case("soil_nan", edit("unit_weight_pcf = 120", "unit_weight_pcf = nan"),
         "must be a finite number", ST, "[soil] unit_weight_pcf"),
    Case("bearing_inf", edit("allowable_bearing_psf = 2500", "allowable_bearing_psf = inf"),
         "must be a finite number", ST, "[soil] allowable_bearing_psf"),
    Case("surcharge_minus_inf", edit("surcharge_psf = 100", "surcharge_psf = -inf"),
         "must be a finite number", ST, "[loads] surcharge_psf"),
    Case("soil_400_digits", edit("unit_weight_pcf = 120", f"unit_weight_pcf = {HUGE}"),
         "a 400-digit number", ST, "[soil] unit_weight_pcf"),
    Case("toml_5000_digits", edit("surcharge_psf = 100", "surcharge_psf = " + "7" * 5000),
         "cannot be read", ST, "line 12"),
    Case("start_station_overflow", edit("start_station_ft = 0.0", "start_station_ft = 1e400"),
         "must be a finite number", ST, "start_station_ft"),
    Case("wall_override_nan", wall_line("surcharge_psf = nan"), "must be a finite number", ST,
         f"{W}.surcharge_psf"),
    Case("interval_huge_int", table(f"[criteria]\nstation_interval_ft = {'1' + '0' * 30}"),
         "out of range", ST, "[criteria] station_interval_ft"),
    Case("strip_offset_nan", table("[[loads.strip]]\noffset_ft = nan\nwidth_ft = 4\n"
                                   "pressure_psf = 250"),
         "must be a finite number", ST, "offset_ft"),
    Case("seismic_kh_inf", table("[seismic]\nkh = inf"), "must be a finite number", ST,
         "[seismic] kh"),
    Case("water_level_nan", table("[water]\nlevel_ft = nan"), "must be a finite number", ST,
         "[water] level_ft"),
    Case("budget_zero", table("[sizing]\nmemory_budget_gb = 0"), "out of range", ST,
         "[sizing] memory_budget_gb"),
    # ---- numbers in the options of an inline source
    Case("view_origin_nan", profile_view(origin_elevation_ft="nan"),
         "'origin_elevation_ft' must be a finite number", ST, f"{WS}.origin_elevation_ft"),
    Case("view_exaggeration_inf", profile_view(vertical_exaggeration="inf"),
         "'vertical_exaggeration' must be a finite number", ST, f"{WS}.vertical_exaggeration"),
    Case("view_exaggeration_huge", profile_view(vertical_exaggeration="1e6"),
         "'vertical_exaggeration' must be at most 100", ST, f"{WS}.vertical_exaggeration"),
    Case("view_station_400_digits", profile_view(origin_station_ft=HUGE),
         "a 400-digit number", ST, f"{WS}.origin_station_ft"),
    Case("view_origin_xy_inf", profile_view(origin_xy="[inf, 0]"),
         "'origin_xy' must be a point of finite coordinates", ST, f"{WS}.origin_xy"),
    Case("start_nan", plan_alignment("start = [nan, nan]"),
         "'start' must be a point of finite coordinates", ST, f"{WA}.start"),
    Case("gap_tolerance_inf", plan_alignment("gap_tolerance_ft = inf"),
         "'gap_tolerance_ft' must be a finite number", ST, f"{WA}.gap_tolerance_ft"),
    Case("gap_tolerance_40", plan_alignment("gap_tolerance_ft = 40"),
         "'gap_tolerance_ft' must be at most 10", ST, f"{WA}.gap_tolerance_ft"),
    Case("max_offset_huge", dxf_source(lambda d: None, key="retained_grade", old='"top.csv"',
                                       options='layer = "TW", max_offset_ft = 1e12'),
         "'max_offset_ft' must be", ST, f"{WS}.max_offset_ft"),
    # ---- GIS
    Case("gis_z_nan", gis_grade(float("nan")), "not a finite number", "grade.gpkg",
         "feature 1"),
    Case("gis_z_huge", gis_grade(1e15), "not a finite number of at most", "grade.gpkg",
         "feature 1"),
    Case("gis_unknown_crs", gis_grade(104.0, to_crs="EPSG:999999"), "cannot be used",
         "grade.gpkg", "to_crs"),
    # ---- DXF geometry, units, damage
    Case("dxf_arc_radius_1e11", dxf_source(lambda d: d.modelspace().add_arc(
        (0, 0), 1e11, 0, 1e-7, dxfattribs={"layer": "WALL"})),
         "beyond 1e+09 ft", "plan.dxf", "ARC handle"),
    Case("dxf_arc_points", dxf_source(lambda d: d.modelspace().add_arc(
        (0, 0), 5e8, 0, 350, dxfattribs={"layer": "WALL"})),
         "would be drawn with about", "plan.dxf", "ARC handle"),
    Case("dxf_vertex_far_away", dxf_source(lambda d: d.modelspace().add_lwpolyline(
        [(0, 0), (100, 0), (1e12, 0)], dxfattribs={"layer": "WALL"})),
         "beyond 1e+09 ft", "plan.dxf", "LWPOLYLINE handle"),
    Case("dxf_in_miles", dxf_source(lambda d: d.modelspace().add_lwpolyline(
        [(0, 0), (0.02, 0)], dxfattribs={"layer": "WALL"}), units=3),
         "are miles, which this reader does not convert", "plan.dxf", None),
    Case("dxf_truncated", dxf_truncated, "the file ends before its end-of-file marker",
         "plan.dxf", "layer WALL"),
    # ---- alignments and CSV numbers
    Case("alignment_hairpin", file_text("align.csv", "x,y\n0,0\n100,0\n100,0.001\n0,0.001\n"),
         "folds back on itself", "align.csv", None),
    Case("alignment_doubled_stretch",
         file_text("align.csv", "x,y\n0,0\n60,0\n60,0.2\n40,0.2\n40,10\n100,10\n"),
         "folds back on itself", "align.csv", None),
    Case("alignment_inf", file_text("align.csv", "x,y\n0,0\ninf,0\n"),
         "'inf' is not a finite number", "align.csv", "line 3"),
    Case("csv_underscore", file_text("top.csv", grade("0,100", "50,10_3.5", "100,101")),
         "'10_3.5' is not a number", "top.csv", "line 3"),
    Case("csv_exponent_overflow", file_text("top.csv", grade("0,100", "50,1e999", "100,101")),
         "'1e999' is not a finite number", "top.csv", "line 3"),
    # ---- ranges as sets
    Case("segment_min_over_max", table("[criteria]\nsegment_min_ft = 60\nsegment_max_ft = 40"),
         "segment_min_ft = 60 is more than segment_max_ft = 40", ST,
         "[criteria] segment_min_ft"),
    Case("joints_inverted", table("[criteria]\ncontraction_joint_max_ft = 100\n"
                                  "expansion_joint_max_ft = 50"),
         "contraction_joint_max_ft = 100 is more than", ST, "[criteria] contraction_joint_max_ft"),
    Case("heights_inverted", table("[criteria]\nmin_retained_height_ft = 4\n"
                                   "max_retained_height_ft = 2"),
         "min_retained_height_ft = 4 is more than", ST, "[criteria] min_retained_height_ft"),
    Case("wall_segment_min_over_max", wall_line("segment_min_ft = 95"),
         "segment_min_ft = 95 is more than segment_max_ft = 90", ST, W),
    Case("footing_min_over_max", table("[sizing]\nfooting_thickness_min_in = 30\n"
                                       "footing_thickness_max_in = 20"),
         "footing thickness range is empty", ST, "[sizing] footing_thickness_min_in"),
    Case("stem_min_over_max", table("[sizing]\nstem_min_in = 20"),
         "stem thickness range is empty", ST, "[sizing] stem_min_in"),
    Case("spacing_nan", table("[sizing]\nbar_spacings_in = [6, nan, 12]"),
         "must be a finite number", ST, "[sizing] bar_spacings_in"),
    Case("heel_below_two_steps", table("[sizing]\ntoe_heel_step_in = 24\nheel_max_ft = 2"),
         "smallest heel", ST, "[sizing] heel_max_ft"),
    Case("bar_sizes_backwards", table('[sizing]\nbar_sizes = "9-4"'),
         "runs downward; write it 4-9", ST, "[sizing] bar_sizes"),
    Case("bar_sizes_words", table('[sizing]\nbar_sizes = "#4 to #99"'), "cannot be read", ST,
         "[sizing] bar_sizes"),
    Case("bar_sizes_unknown", table('[sizing]\nbar_sizes = "4,99"'), "cannot be read", ST,
         "[sizing] bar_sizes"),
]

# refused by ``design`` before it allocates (``stations`` samples them fine)
DESIGN_ONLY: list[Case] = [
    Case("budget_fine_interval", long_wall,
         "planning its segments would need about", ST, "walls[1]"),
    Case("budget_dense_points", dense_points, "a segment may span", ST, "walls[1]"),
    Case("budget_finest_grid", lambda f: (site(f), (f / ST).write_text(
        (f / ST).read_text().replace(SMALL_GRID, "\n" + FINEST_GRID + "\n")))[0],
         "candidate geometries", ST, "[sizing]"),
    Case("budget_small_limit", table("[sizing]\nmemory_budget_gb = 0.1"),
         "the limit is [sizing] memory_budget_gb = 0.1", ST, "[sizing]"),
]
