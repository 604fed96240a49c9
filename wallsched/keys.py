"""The declared keys of the site file and the section file (DESIGN.md section 4).

One place for every key, its type, range and source, shared by the site file, the section
file and the starter site. The design inputs' keys ([soil], [loads], [seismic], [water],
[materials], [criteria]) are declared with the fields of ``engine/inputs.py`` and collected
here; the cost and sizing keys take their defaults from ``engine/defaults.py``. Soil keys
have no defaults: a soil parameter is never defaulted silently.
"""

from __future__ import annotations

from .engine.defaults import COSTS, SIZING
from .engine.inputs import Criteria, Loads, Materials, SeismicLoad, Soil, WaterTable
from .engine.keyspec import REQUIRED, Key, keys_of

SITE_KEYS = {
    "name": Key(str, REQUIRED, doc="site or project name"),
    "engineer": Key(str, None, doc="engineer of record, for the report cover"),
    "notes": Key(str, None, doc="free text for the report cover"),
}

# [soil]: from the geotechnical report; never silently defaulted. Declared with the fields
# of engine/inputs.py's Soil, and two keys of the file that are no field of it.
SOIL_KEYS = keys_of(Soil, {
    "source": Key(str, None, doc="where these values come from (report, date)"),
    "backslope": Key(str, None, doc="slope of the retained ground above the wall, \"H:V\" "
                     "(horizontal:vertical), e.g. \"2:1\" (or backslope_deg)"),
}, after="allowable_bearing_psf")

# [loads] with its table-valued keys: [[loads.strip]] entries and the top-level [seismic]
# and [water] tables (the files' loaders fill these three; STRIP_KEYS, SEISMIC_KEYS,
# WATER_KEYS)
LOADS_KEYS = keys_of(Loads)

# [[loads.strip]]: a strip load near the wall (a road, a footing), live
STRIP_KEYS = {
    "offset_ft": Key(float, REQUIRED, lo=0, hi=1000,
                     doc="stem's back face (at the retained grade) to the strip's near edge, ft"),
    "width_ft": Key(float, REQUIRED, lo=0, hi=1000, lo_open=True, doc="strip width, ft"),
    "pressure_psf": Key(float, REQUIRED, lo=0, hi=20000, doc="strip pressure, psf"),
    "name": Key(str, None, doc="what the load is"),
}

# [seismic]: present only where the site or section file has the table
SEISMIC_KEYS = keys_of(SeismicLoad)

# [water]: an explicit option; without it the backfill is drained
WATER_KEYS = keys_of(WaterTable)

MATERIALS_KEYS = keys_of(Materials)

# [criteria]: the design rules of engine/inputs.py's Criteria (declared with its fields),
# and after frost_depth_ft the rules for the stations, segments and quantities along a
# wall, which the site pipeline reads from the wall's table (sources in each text)
ALONG_WALL_CRITERIA_KEYS = {
    "footing_width_max_ft": Key(float, None, lo=1, hi=100,
                                doc="widest footing the site has room for, ft (no limit)"),
    "footing_cover_ft": Key(float, 0.0, lo=0, hi=5,
                            doc="front grade to top of footing, least, ft (common practice: the "
                                "footing is buried)"),
    "station_interval_ft": Key(float, 5.0, lo=0.1, hi=500,
                               doc="station spacing, ft"),
    "coverage_tolerance_ft": Key(float, 0.01, lo=0, hi=5,
                                 doc="how far a profile may stop short of a wall end, ft"),
    "freeboard_ft": Key(float, 0.5, lo=0, hi=5,
                        doc="top of wall above retained grade, ft (common practice)"),
    "min_retained_height_ft": Key(float, 0.5, lo=0, hi=5,
                                  doc="below this no wall is needed, ft (common practice)"),
    "end_height_warn_ft": Key(float, 3.0, lo=0, hi=40,
                              doc="warn where a wall end still retains more than this, ft "
                                  "(common practice: a return wall or a turn-down there)"),
    "max_retained_height_ft": Key(float, 20.0, lo=1, hi=40,
                                  doc="cantilever range limit, ft (common practice)"),
    # constructible segments (engine/segments.py)
    "footing_step_max_ft": Key(float, 2.0, lo=0.1, hi=10,
                               doc="largest step between footings, ft (common practice)"),
    "elevation_step_ft": Key(float, 0.5, lo=0.05, hi=2,
                             doc="bottoms of footing (rounded down) and tops of wall (rounded "
                                 "up) on this elevation grid, ft (common practice)"),
    "step_min_in": Key(float, 6.0, lo=0, hi=48,
                       doc="a step in footing or top is 0 or at least this, in (common "
                           "practice: a step a crew can form)"),
    "top_of_wall": Key(str, "stepped", choices=("stepped", "follow_grade"),
                       doc="top of wall level per segment, or following the grade"),
    "segment_min_ft": Key(float, 20.0, lo=0, hi=500,
                          doc="shortest segment inside a wall, ft (common practice: a length "
                              "worth forming)"),
    "segment_max_ft": Key(float, 90.0, lo=5, hi=1000,
                          doc="longest segment, ft (common practice)"),
    "contraction_joint_max_ft": Key(float, 30.0, lo=5, hi=200,
                                    doc="contraction joint spacing limit, ft (common practice: "
                                        "at most 30 ft, concretenetwork.com, poured retaining "
                                        "walls, provisions)"),
    "expansion_joint_max_ft": Key(float, 90.0, lo=10, hi=1000,
                                  doc="expansion joint spacing limit, ft, and one at every "
                                      "footing step (common practice: up to 90 ft, "
                                      "concretenetwork.com, poured retaining walls)"),
    "design_height_increment_ft": Key(float, 1.0, lo=0.01, hi=5,
                                      doc="design heights rounded up to this, ft (common "
                                          "practice: walls tabulated by height)"),
    # excavation and backfill quantities (engine/quantities.py), with existing ground given
    "working_room_ft": Key(float, 2.0, lo=0, hi=20,
                           doc="trench floor beyond each footing edge, ft (common practice)"),
    "trench_side_slope_h_per_v": Key(float, 1.0, lo=0, hi=5,
                                     doc="trench sides, horizontal per 1 vertical (1.0: OSHA 29 "
                                         "CFR 1926 Subpart P App. B, Type B soil, from memory; "
                                         "0: vertical sides)"),
}

CRITERIA_KEYS = keys_of(Criteria, ALONG_WALL_CRITERIA_KEYS, after="frost_depth_ft")

# [costs]: the least-cost objective. ILLUSTRATIVE defaults, not market prices.
COSTS_KEYS = {
    "concrete_usd_per_cy": Key(float, COSTS["concrete_usd_per_cy"], lo=0, hi=10000,
                               doc="placed concrete, $/CY"),
    "steel_usd_per_lb": Key(float, COSTS["steel_usd_per_lb"], lo=0, hi=100,
                            doc="reinforcing steel in place, $/lb"),
    "excavation_usd_per_cy": Key(float, COSTS["excavation_usd_per_cy"], lo=0, hi=10000,
                                 doc="excavation, $/CY"),
    "formwork_usd_per_sf": Key(float, COSTS["formwork_usd_per_sf"], lo=0, hi=1000,
                               doc="formwork, $/SF of contact"),
    "step_usd": Key(float, COSTS["step_usd"], lo=0, hi=100000,
                    doc="one step in footing or top, $ each"),
    "mark_usd": Key(float, COSTS["mark_usd"], lo=0, hi=1000000,
                    doc="one more section mark (detailing, forms, checking), $ each"),
}

# [sizing]: the candidate grid of the least-cost search (common practice increments).
SIZING_KEYS = {
    "toe_min_ft": Key(float, SIZING["toe_min_ft"], lo=0, hi=30,
                      doc="smallest toe, ft (common practice: room for the toe bars and the "
                          "bearing; 0 for a wall on a property line)"),
    "toe_max_ft": Key(float, SIZING["toe_max_ft"], lo=0, hi=30, doc="largest toe, ft"),
    "heel_max_ft": Key(float, SIZING["heel_max_ft"], lo=0.5, hi=40, doc="largest heel, ft"),
    "toe_heel_step_in": Key(float, SIZING["toe_heel_step_in"], lo=1, hi=24,
                            doc="toe and heel increments, in"),
    "footing_thickness_min_in": Key(float, SIZING["footing_thickness_min_in"], lo=8, hi=60,
                                    doc="thinnest footing, in (IBC 2021 1809.4: 12 in width)"),
    "footing_thickness_max_in": Key(float, SIZING["footing_thickness_max_in"], lo=8, hi=96,
                                    doc="thickest footing, in"),
    "footing_thickness_step_in": Key(float, SIZING["footing_thickness_step_in"], lo=0.5, hi=12,
                                     doc="footing increments, in"),
    "stem_min_in": Key(float, SIZING["stem_min_in"], lo=6, hi=48,
                       doc="thinnest stem, in (common practice)"),
    "stem_max_in": Key(float, SIZING["stem_max_in"], lo=6, hi=72, doc="thickest stem base, in"),
    "stem_step_in": Key(float, SIZING["stem_step_in"], lo=0.5, hi=12, doc="stem increments, in"),
    "stem_batter": Key(bool, SIZING["stem_batter"],
                       doc="batter the back face: stem top at stem_min_in"),
    "bar_sizes": Key(str, SIZING["bar_sizes"],
                     doc="bar sizes to try, e.g. \"4-11\" (ASTM A615 numbers)"),
    "bar_spacings_in": Key(list, list(SIZING["bar_spacings_in"]), lo=2, hi=48,
                           doc="the bar spacings to use, in (common practice: the spacings a "
                               "detailer uses)"),
    "key_depths_in": Key(list, list(SIZING["key_depths_in"]), lo=0, hi=72,
                         doc="shear key depths below the footing to try, in (0: no key; "
                             "common practice: 1 to 2 ft); the key sits under the stem, its "
                             "front face under the stem's front face, cast against the soil "
                             "of its trench, and is checked as plain concrete"),
    "key_width_in": Key(float, SIZING["key_width_in"], lo=0, hi=60,
                        doc="shear key width, in (0: as wide as the stem's base, common "
                            "practice)"),
    "marks_max": Key(int, SIZING["marks_max"], lo=1, hi=100,
                     doc="most section marks per wall (or per site), chosen from the design "
                         "table (common practice: a few marks a crew can build)"),
    "marks_per": Key(str, SIZING["marks_per"], choices=("wall", "site"),
                     doc="marks_max counts the marks of each wall, or of the whole site"),
    "memory_budget_gb": Key(float, SIZING["memory_budget_gb"], lo=0.1, hi=4096,
                            doc="memory a design may need, GB: a run estimated to need more "
                                "is refused before it starts"),
}

# [drawing]: the DXF sheet set (exporters/dxf_wall.py)
DRAWING_KEYS = {
    "sheet_size": Key(str, "ARCH D", choices=("ARCH D", "ANSI D"),
                      doc="sheet size: ARCH D (36 x 24 in) or ANSI D (34 x 22 in)"),
    "label_interval_ft": Key(float, 50.0, lo=5, hi=1000,
                             doc="elevation labels between segment ends every, ft"),
    "vertical_exaggeration": Key(float, 2.0, lo=1, hi=20,
                                 doc="vertical scale of the elevation over its horizontal "
                                     "scale (common practice for wall profiles: 2 to 10)"),
    "date": Key(str, None, doc="issue date for the title blocks (blank: not issued)"),
    "revision": Key(str, None, doc="revision for the title blocks (default 0, or 1 with "
                                   "--compare)"),
}

# [geometry] of a section file (DESIGN.md sections 3 and 4)
SECTION_GEOMETRY_KEYS = {
    "retained_height_ft": Key(float, REQUIRED, lo=0, hi=40, lo_open=True,
                              doc="retained grade - front grade, ft"),
    "embedment_ft": Key(float, REQUIRED, lo=0, hi=20,
                        doc="front grade - bottom of footing, ft"),
    "footing_thickness_in": Key(float, REQUIRED, lo=6, hi=72, doc="footing thickness, in"),
    "stem_top_in": Key(float, REQUIRED, lo=6, hi=72, doc="stem thickness at the top, in"),
    "stem_base_in": Key(float, REQUIRED, lo=6, hi=72,
                        doc="stem thickness at the top of footing, in (>= stem_top_in)"),
    "toe_ft": Key(float, REQUIRED, lo=0, hi=30, doc="stem front face to toe edge, ft"),
    "heel_ft": Key(float, REQUIRED, lo=0, hi=40, doc="stem back face to heel edge, ft"),
    "key_width_in": Key(float, 0.0, lo=0, hi=60, doc="shear key width, in (0: no key)"),
    "key_depth_in": Key(float, 0.0, lo=0, hi=72, doc="shear key depth below footing, in"),
    "key_offset_ft": Key(float, None, lo=0, hi=80,
                         doc="toe edge to the key's front face, ft (default: below the stem's "
                             "front face, common practice)"),
    "freeboard_ft": Key(float, None, lo=0, hi=5,
                        doc="top of wall above retained grade, ft (default [criteria] "
                            "freeboard_ft, 0.5)"),
}

# [reinforcement] of a section file: the trade's bar notation "#6@12"
REINFORCEMENT_KEYS = {
    "stem": Key(str, REQUIRED, doc="stem vertical bars at the back (earth) face, e.g. \"#6@12\""),
    "heel": Key(str, REQUIRED, doc="heel top bars, e.g. \"#5@12\""),
    "toe": Key(str, REQUIRED, doc="toe bottom bars, e.g. \"#5@12\""),
    "horizontal": Key(str, None, doc="stem horizontal bars in each layer (optional)"),
    "horizontal_layers": Key(int, 2, lo=1, hi=2, doc="layers of stem horizontal bars"),
    "longitudinal": Key(str, None, doc="footing longitudinal bars in each layer (optional)"),
    "longitudinal_layers": Key(int, 2, lo=1, hi=2, doc="layers of footing longitudinal bars"),
}

# [section]: optional labels of a section file
SECTION_META_KEYS = {
    "name": Key(str, None, doc="a name for the section"),
    "notes": Key(str, None, doc="free text"),
}
