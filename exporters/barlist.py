"""``barlist.csv`` and the "bending schedule" sheet of ``schedule.xlsx``: the engine's bending
schedule (``SiteDesign.barlist``, engine/bending.py) as-is, one row per bar mark site-wide.

Columns: ``mark, size, count, length_ft, shape, weight_lb`` then the leg dimensions
``a_in, g_in, j_in, bend_diameter_in`` (blank where the shape has no such leg) and ``used_in``
(the walls and placing marks that use the bar). Its weight equals ``rebar.csv``'s.
"""

from __future__ import annotations

from pathlib import Path

import pandas as pd

FILE_NAME = "barlist.csv"


def write_barlist_csv(barlist: pd.DataFrame, path, *, float_format: str | None = None) -> Path:
    path = Path(path)
    if path.is_dir():
        path = path / FILE_NAME
    barlist.to_csv(path, index=False, lineterminator="\n", float_format=float_format)
    return path
