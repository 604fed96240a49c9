"""The one declaration of every default of the site and section files' tables that have
defaults: the engine's dataclasses read them here, and ``wallsched/keys.py`` (each key's type,
range and text) takes each key's default from here (tests/test_defaults.py holds the two
together). Soil keys have none: a soil parameter is never defaulted silently.
"""

from __future__ import annotations

SOIL_OPTIONS = {  # the soil table's choices of method (not soil values: those have none)
    "passive_from_friction_angle": False,
    "active_method": "rankine",
    "coulomb_plane": "heel",
}

LOADS = {
    "surcharge_psf": 0.0,
    "strip": (),  # no strip loads
}

MATERIALS = {
    "fc_psi": 4000.0,
    "fy_psi": 60000.0,
    "concrete_unit_weight_pcf": 150.0,  # common practice
}

SEISMIC = {
    "method": "seed-whitman",
    "load_factor": 0.7,  # IBC 2021 1807.2.3: 0.7 on nominal earthquake loads
    "fs_overturning": 1.1,  # IBC 2021 1807.2.3
    "fs_sliding": 1.1,  # IBC 2021 1807.2.3
    "soil_inertia": True,  # the soil over the heel moves with the wall (DESIGN.md 7)
}

CRITERIA = {
    # stability conventions (DESIGN.md section 7)
    "fs_overturning": 1.5,  # IBC 2021 1807.2.3
    "fs_sliding": 1.5,  # IBC 2021 1807.2.3
    "count_toe_soil": True,
    "use_passive": True,
    "passive_neglect_ft": 1.0,  # common practice
    "surcharge_resists": False,
    "batter_face": "back",
    "min_embedment_ft": 1.0,  # IBC 2021 1809.4 (12 in)
    "frost_depth_ft": None,
    "footing_width_max_ft": None,
    "footing_cover_ft": 0.0,
    # stations, heights and segments
    "station_interval_ft": 5.0,
    "coverage_tolerance_ft": 0.01,
    "freeboard_ft": 0.5,
    "min_retained_height_ft": 0.5,
    "end_height_warn_ft": 3.0,
    "max_retained_height_ft": 20.0,
    "footing_step_max_ft": 2.0,
    "elevation_step_ft": 0.5,
    "step_min_in": 6.0,
    "top_of_wall": "stepped",
    "segment_min_ft": 20.0,
    "segment_max_ft": 90.0,
    "contraction_joint_max_ft": 30.0,
    "expansion_joint_max_ft": 90.0,
    "design_height_increment_ft": 1.0,
    "working_room_ft": 2.0,
    "trench_side_slope_h_per_v": 1.0,
    # strength options (ACI 318-19)
    "cover_stem_in": None,  # None: Table 20.5.1.3.1 by bar size (2 / 1.5 in)
    "cover_heel_in": None,  # None: Table 20.5.1.3.1 by bar size (2 / 1.5 in)
    "cover_toe_in": 3.0,  # Table 20.5.1.3.1: cast against earth
    "footing_shear_size_effect": False,  # 13.2.6.2 permits neglecting lambda_s
    "crack_control": True,  # 24.3.2 on the stem
    "hook_psi_o": 1.0,  # Table 25.4.3.2 location factor (see development.py)
    "heel_upward_pressure": True,  # heel by the net factored pressure (DESIGN.md 7)
}

COSTS = {  # ILLUSTRATIVE, not market prices
    "concrete_usd_per_cy": 250.0,
    "steel_usd_per_lb": 1.25,
    "excavation_usd_per_cy": 30.0,
    "formwork_usd_per_sf": 12.0,
    "step_usd": 500.0,
    "mark_usd": 1000.0,
}

SIZING = {  # the candidate grid (common practice increments)
    "toe_min_ft": 1.0,
    "toe_max_ft": 8.0,
    "heel_max_ft": 14.0,
    "toe_heel_step_in": 3.0,
    "footing_thickness_min_in": 12.0,  # IBC 2021 1809.4
    "footing_thickness_max_in": 48.0,
    "footing_thickness_step_in": 1.0,
    "stem_min_in": 8.0,  # common practice
    "stem_max_in": 24.0,
    "stem_step_in": 1.0,
    "stem_batter": False,
    "bar_sizes": "4-11",
    "bar_spacings_in": (4.0, 6.0, 8.0, 9.0, 10.0, 12.0, 15.0, 16.0, 18.0),  # common practice
    "key_depths_in": (0.0, 12.0, 24.0),  # common practice: 1 to 2 ft
    "key_width_in": 0.0,  # 0: as wide as the stem's base
    "marks_max": 6,
    "marks_per": "wall",
    "memory_budget_gb": 2.0,
}
