"""``rebar.csv`` (and a bar-list sheet for ``schedule.xlsx``) from the engine's bar list.

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

from ..engine.model import REBAR_COLUMNS, describe

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


def write_rebar_sheet(writer: pd.ExcelWriter, bars: pd.DataFrame,
                      sheet_name: str = "bar list") -> None:
    """Add the bar list (with a description column and totals per wall) to an open workbook."""
    frame = bars[REBAR_COLUMNS].copy()
    frame["description"] = [describe(m) for m in frame["mark"]]
    rows = [frame]
    for wall, g in bars.groupby("wall", sort=False):
        rows.append(pd.DataFrame([{"wall": wall, "segment": "TOTAL", "count": int(g["count"].sum()),
                                   "weight_lb": float(g["weight_lb"].sum())}]))
    rows.append(pd.DataFrame([{"wall": "SITE", "segment": "TOTAL",
                               "count": int(bars["count"].sum()),
                               "weight_lb": float(bars["weight_lb"].sum())}]))
    pd.concat(rows, ignore_index=True).to_excel(writer, sheet_name=sheet_name, index=False)
