"""A 20 ft cantilever wall on phi = 30 deg backfill (issue 14: the grid once held no section
for it): gamma 125 pcf, 250 psf surcharge, 3,500 psf allowable, every station ok."""

import json
from pathlib import Path

from click.testing import CliRunner
from sitekit import make_site

from wallsched.cli import main

SOIL = """
[soil]
unit_weight_pcf = 125
friction_angle_deg = 30
passive_from_friction_angle = true
friction_coefficient = 0.40
allowable_bearing_psf = 3500
"""


def test_twenty_foot_wall_designs_everywhere(tmp_path: Path):
    site = make_site(tmp_path / "site", soil=SOIL, top=((0, 116.0), (50, 120.0), (100, 119.0)),
                     bottom=((0, 100.0), (100, 100.0)))
    site.write_text(site.read_text().replace("surcharge_psf = 100", "surcharge_psf = 250"))
    out = tmp_path / "out"
    res = CliRunner().invoke(main, ["design", str(site), "--out", str(out), "-q"])
    assert res.exit_code == 0, res.output  # 0: every segment passes (DESIGN.md 6)
    run = json.loads((out / "run.json").read_text())
    text = json.dumps(run)
    assert "no_section" not in text and "over_limit" not in text
    import pandas as pd

    sched = pd.read_csv(out / "schedule.csv")
    assert (sched["status"] == "ok").all()
    assert sched["retained_height_max_ft"].max() >= 19.99
    tall = sched.loc[sched["retained_height_max_ft"].idxmax()]
    # proportions: at least 0.4 H wide (sliding at mu 0.40 makes it wider than the 0.4-0.7 H
    # rule of thumb), thickness at least 12 in
    H = tall["top_of_wall_ft"] - 0.5 - tall["bottom_of_footing_ft"]
    assert tall["footing_width_ft"] >= 0.4 * H
    assert tall["footing_thickness_in"] >= 12
