"""Guard rails: legal but suspicious inputs give warnings, in the functions and on the CLI."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pandas as pd
from sitekit import SOIL, make_site

from wallsched.cli import main
from wallsched.guardrails import height_jumps, length_warning, short_wall_warning, soil_warnings


def test_height_jump_between_adjacent_stations():
    st = np.array([0.0, 5.0, 10.0, 15.0])
    assert height_jumps("A", st, np.array([2.0, 4.9, 7.8, 8.0])) == []  # 2.9 ft: below 3
    lines = height_jumps("A", st, np.array([2.0, 6.5, 6.0, 2.0]))
    assert len(lines) == 1
    assert "changes by 4.50 ft between stations 0+00.00 and 0+05.00 (2 places)" in lines[0]


def test_friction_and_bearing_limits():
    base = {"friction_coefficient": 0.7, "allowable_bearing_psf": 12000.0, "source": None}
    assert soil_warnings([("A", base)]) == []  # IBC 2021 Table 1806.2 class 1: 0.70, 12,000
    high = dict(base, friction_coefficient=0.75, allowable_bearing_psf=15000.0)
    lines = soil_warnings([("A", high), ("B", high)])
    assert len(lines) == 2 and all(ln.startswith("walls 'A', 'B': ") for ln in lines)
    assert "friction_coefficient 0.75 is above 0.7" in lines[0]
    assert "allowable_bearing_psf 15,000 is above 12,000 psf" in lines[1]
    noted = dict(high, source="geotechnical report, invented example")
    assert soil_warnings([("A", noted)]) == [lines[0].replace("walls 'A', 'B'", "wall 'A'")]


def test_wall_longer_than_a_mile():
    assert length_warning("A", 5280.0) == []  # 5,280 ft in a mile (exact definition)
    assert "more than a mile" in length_warning("A", 5280.5)[0]


def test_wall_needed_over_less_than_the_least_segment():
    st = np.array([0.0, 5.0, 5.2, 10.0, 15.0])
    h = np.array([0.2, 0.3, 3.0, 0.2, 0.1])  # one station needs a wall, its neighbour 0.2 ft
    lines = short_wall_warning("A", st, h, 0.5, 10.0)
    assert len(lines) == 1 and "needed over only 0.20 ft (0+05.00 to 0+05.20)" in lines[0]
    assert short_wall_warning("A", st, np.array([3.0, 3.0, 3.0, 3.0, 0.1]), 0.5, 10.0) == []
    assert short_wall_warning("A", st, np.zeros(5), 0.5, 10.0) == []  # no wall at all
    # a short wall drawn as such: needed over its whole (8 ft) alignment
    assert short_wall_warning("A", np.array([0.0, 4.0, 8.0]), np.full(3, 3.0), 0.5, 10.0) == []


def test_stations_prints_the_warnings(runner, tmp_path: Path):
    soil = SOIL.replace("friction_coefficient = 0.40", "friction_coefficient = 0.8")
    site = make_site(tmp_path, soil=soil, top=((0, 100.0), (40, 100.5), (45, 106.0),
                                               (100, 103.0)))
    res = runner.invoke(main, ["stations", str(site), "--out", str(tmp_path / "o"),
                               "--no-plots"])
    assert res.exit_code == 0, res.output
    warns = [ln for ln in res.stdout.splitlines() if ln.startswith("warning: ")]
    assert any("friction_coefficient 0.8 is above 0.7" in w for w in warns)
    assert any("retained height changes by" in w and "0+40.00 and 0+45.00" in w for w in warns)


def test_plain_key_with_a_seismic_case(runner, tmp_path: Path):
    # ACI 318-19 14.1.4 (from memory): plain concrete is restricted in Seismic Design
    # Categories D-F; the engine checks the key as plain concrete (engine/key.py), so a keyed
    # wall with a [seismic] case is flagged, and the same wall without one is not
    soil = SOIL.replace("friction_coefficient = 0.40", "friction_coefficient = 0.30")
    top = ((0, 100.0), (40, 110.0), (100, 108.0))  # about 11 ft retained: sliding governs
    lines = {}
    for name, extra in (("seismic", "\n[seismic]\nkh = 0.2\n"), ("static", "")):
        site = make_site(tmp_path / name, soil=soil, extra=extra, top=top)
        res = runner.invoke(main, ["design", str(site), "--out", str(tmp_path / name / "o"),
                                   "--no-drawings"])
        assert res.exit_code == 0, res.output
        sched = pd.read_csv(tmp_path / name / "o" / "schedule.csv")
        assert (sched["key_depth_in"] > 0).any()  # the sizing chose a key in both
        lines[name] = [ln for ln in res.stdout.splitlines() if "plain-concrete shear key" in ln]
    assert len(lines["seismic"]) == 1 and "wall 'A'" in lines["seismic"][0]
    assert "Seismic Design Categories D, E and F" in lines["seismic"][0]
    assert lines["static"] == []
