"""``rebar.csv`` from the engine's bar list (the workbook's "bar list" sheet is written by
exporters/schedule.py from the same frame).

Columns (DESIGN.md section 5): ``wall, segment, mark, size, spacing_in, count, length_ft, shape,
weight_lb``. ``mark`` is the bar mark (S1, D1, S2, F1, F2, L1, L2, H1, H2; see
wallsched.engine.detailing), ``size`` the integer ASTM A615 bar number, ``length_ft`` the cut
length, ``weight_lb = count * length_ft * unit weight``. Floats are written at full precision
(so that the weight recomputes exactly from the file) unless a ``float_format`` is given (the
run folder's tables use ``tables.FLOAT_FORMAT``).
"""

from __future__ import annotations

from pathlib import Path

import pandas as pd

from ..engine.model import REBAR_COLUMNS

FILE_NAME = "rebar.csv"


def rebar_frame(designs) -> pd.DataFrame:
    """The bar lists of designed walls (``WallDesign.bars``) as one ``rebar.csv`` frame."""
    frames = [d.bars[REBAR_COLUMNS] for d in designs if d.bars is not None and len(d.bars)]
    if not frames:
        return pd.DataFrame(columns=REBAR_COLUMNS)
    return pd.concat(frames, ignore_index=True)


def write_rebar_csv(bars_or_designs, path, *, float_format: str | None = None) -> pd.DataFrame:
    """Write ``rebar.csv`` from the engine's bar-list frame (``SiteDesign.bars``) or from
    designed walls; returns the frame written.

    ``path`` is a file or a folder (then ``rebar.csv`` inside it).
    """
    if isinstance(bars_or_designs, pd.DataFrame):
        # the placing list, naming the bending schedule's mark when the engine gave one
        cols = REBAR_COLUMNS + (["bar_mark"] if "bar_mark" in bars_or_designs.columns else [])
        bars = bars_or_designs[cols].reset_index(drop=True)
    else:
        bars = rebar_frame(bars_or_designs)
    path = Path(path)
    if path.is_dir():
        path = path / FILE_NAME
    bars.to_csv(path, index=False, lineterminator="\n", float_format=float_format)
    return bars
