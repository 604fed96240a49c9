"""Helpers that write small invented sites and files for tests."""

from __future__ import annotations

import textwrap
from pathlib import Path

# a small candidate grid, so that designs in tests run in a second or two
SMALL_GRID = """
[sizing]
toe_max_ft = 4.0
heel_max_ft = 8.0
footing_thickness_max_in = 24.0
stem_max_in = 14.0
"""

SOIL = """
[soil]
unit_weight_pcf = 120
active_efp_pcf = 35
passive_efp_pcf = 300
friction_coefficient = 0.40
allowable_bearing_psf = 2500
"""


def write(path: Path, text: str) -> Path:
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_text(textwrap.dedent(text).lstrip())
    return path


def make_site(folder: Path, *, extra: str = "", wall_extra: str = "", soil: str = SOIL,
              top=((0, 100.0), (40, 106.0), (100, 103.0)),
              bottom=((0, 99.0), (60, 98.5), (100, 99.5)),
              xy=((0.0, 0.0), (100.0, 0.0)), start: float = 0.0) -> Path:
    """An invented one-wall site; returns the site-file path."""
    write(folder / "align.csv", "x,y\n" + "".join(f"{x},{y}\n" for x, y in xy))
    write(folder / "top.csv", "station,elevation\n" + "".join(f"{s},{e}\n" for s, e in top))
    write(folder / "bottom.csv",
          "station,elevation\n" + "".join(f"{s},{e}\n" for s, e in bottom))
    text = f"""
[site]
name = "Test site"
{soil}
[loads]
surcharge_psf = 100
{extra}
[[walls]]
id = "A"
retained_side = "left"
start_station_ft = {start}
alignment = "align.csv"
retained_grade = "top.csv"
front_grade = "bottom.csv"
{wall_extra}
"""
    return write(folder / "site.toml", text)


