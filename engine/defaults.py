"""The defaults of the ``[costs]`` and ``[sizing]`` tables, with their sources: the engine's
``CostRates`` and ``SizingGrid`` read them here and ``wallsched/keys.py`` takes each key's
default from here (tests/test_defaults.py holds the two together). The design inputs (soil,
loads, seismic, water, materials, criteria) declare their keys and defaults in their fields
(``engine/inputs.py``, ``engine/keyspec.py``).
"""

from __future__ import annotations

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
