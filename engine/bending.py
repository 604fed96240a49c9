"""Bending schedule: one row per unique bar site-wide, with its shape and leg dimensions.

The placing list (``engine.detailing``: one row per segment and placing mark S1, F1, ...)
says where bars go; the fabricator and the estimator need each distinct bar once. Two bars
are the same bar mark when they have the same size, shape and dimensions (common practice).

Shapes (the codes of the placing list, ``detailing.SHAPE_*``) and their leg dimensions, in the
notation of the trade's typical bar bends (ACI 315-99 Fig. 10 and section 3.7.4.2: straight
portions out to out of the bar; a standard hook's detailing dimension ``G`` is the extra
length allowed for the hook, here its out-to-out size measured from the outside of the long
leg):

=======  =====================================  ==========================================
shape    bar                                     legs
=======  =====================================  ==========================================
STR      straight                                A = cut length
HK90     one 90-degree standard hook             A = long leg out to out; G = hook, out to
                                                 out: D/2 + db + 12db (ACI 318-19 Table
                                                 25.3.1 geometry)
HK180    one 180-degree standard hook            A = long leg out to out to the outside of
                                                 the bend; G = the tail (4db, at least
                                                 2.5 in); J = D + 2db, the hook's out-to-out
                                                 width
=======  =====================================  ==========================================

A shape the table does not know keeps its cut length and no legs (the mark still counts it).
Marks are the bar size followed by a serial number, e.g. ``4001`` (the first #4 bar): a size is
never the start of another size (3-11, 14, 18), so a mark reads back unambiguously.
"""

from __future__ import annotations

import math

import numpy as np
import pandas as pd

from .detailing import (
    SHAPE_HOOK90,
    SHAPE_HOOK180,
    SHAPE_STRAIGHT,
    bar_db_in,
    bend_diameter_in,
    hook_developed_in,
    hook_extension_in,
    unit_weight_plf,
)
from .model import natural_key

BARLIST_COLUMNS = ["mark", "size", "count", "length_ft", "shape", "weight_lb", "a_in", "g_in",
                   "j_in", "bend_diameter_in", "used_in"]
SHAPE_WORDS = {
    SHAPE_STRAIGHT: "straight",
    SHAPE_HOOK90: "one 90-degree standard hook",
    SHAPE_HOOK180: "one 180-degree standard hook",
}
LENGTH_KEY_IN = 1.0 / 8.0  # cut lengths equal to 1/8 in are the same bar (common practice)


def hook_out_to_out_in(size: int) -> float:
    """A 90-degree hook's detailing dimension G: outside of the long leg to the end of the
    tail, in."""
    db = bar_db_in(size)
    return bend_diameter_in(size) / 2.0 + db + hook_extension_in(size, 90)  # Table 25.3.1


def bar_legs_in(size: int, shape: str, length_in: float) -> dict[str, float]:
    """Leg dimensions (in) of one bar from its size, shape code and cut length.

    The cut length of a hooked bar is its straight part plus the hook's developed length
    (centreline arc + tail, ``detailing.hook_developed_in``), so
    ``A = cut - developed + (D/2 + db)`` for both hooks.

    >>> round(bar_legs_in(4, "STR", 29.0)["a_in"], 3)
    29.0
    """
    nan = math.nan
    if shape == SHAPE_STRAIGHT:
        return {"a_in": float(length_in), "g_in": nan, "j_in": nan, "bend_diameter_in": nan}
    angle = {SHAPE_HOOK90: 90, SHAPE_HOOK180: 180}.get(shape)
    if angle is None:
        return {"a_in": nan, "g_in": nan, "j_in": nan, "bend_diameter_in": nan}
    db, d = bar_db_in(size), bend_diameter_in(size)
    straight = length_in - hook_developed_in(size, angle)
    a = straight + d / 2.0 + db  # out to out of the long leg, to the outside of the bend
    if angle == 90:
        g = hook_out_to_out_in(size)
        return {"a_in": a, "g_in": g, "j_in": nan, "bend_diameter_in": d}
    g = hook_extension_in(size, 180)
    return {"a_in": a, "g_in": g, "j_in": d + 2.0 * db, "bend_diameter_in": d}


def _serial_marks(keys: list[tuple[int, str, float]]) -> dict[tuple, str]:
    """Marks per (size, shape, length key), numbered within each size by shape then length."""
    out: dict[tuple, str] = {}
    for size in sorted({k[0] for k in keys}):
        own = sorted(k for k in keys if k[0] == size)
        for n, k in enumerate(own, 1):
            out[k] = f"{size}{n:03d}"
    return out


def _length_key(length_ft) -> np.ndarray:
    return np.round(np.asarray(length_ft, dtype=float) * 12.0 / LENGTH_KEY_IN).astype(np.int64)


def bending_schedule(bars: pd.DataFrame) -> tuple[pd.DataFrame, pd.DataFrame]:
    """The placing list with each row's ``bar_mark``, and the bending schedule.

    Args:
        bars: the placing list (``detailing.REBAR_COLUMNS``), any number of walls.

    Returns:
        (placing list with a ``bar_mark`` column, bending schedule with
        :data:`BARLIST_COLUMNS`, one row per mark, in natural mark order). The schedule's
        weight is ``count * length_ft * unit weight`` and equals the placing list's weight.
    """
    placing = bars.reset_index(drop=True).copy()
    if not len(placing):
        placing["bar_mark"] = pd.Series(dtype=object)
        return placing, pd.DataFrame(columns=BARLIST_COLUMNS)
    lkey = _length_key(placing["length_ft"])
    keys = list(zip(placing["size"].astype(int), placing["shape"].astype(str), lkey.tolist(),
                    strict=True))
    marks = _serial_marks(sorted(set(keys)))
    placing["bar_mark"] = [marks[k] for k in keys]
    return placing, bending_rows_of(placing)


def bending_rows_of(placing: pd.DataFrame) -> pd.DataFrame:
    """The bending schedule of a part of the site (one wall's placing rows, each with its
    site-wide ``bar_mark``): the same marks, with this part's counts and weights."""
    if "bar_mark" not in placing.columns:
        return bending_schedule(placing)[1]
    rows = []
    for mark, g in placing.groupby("bar_mark", sort=False):
        size, shape = int(g["size"].iloc[0]), str(g["shape"].iloc[0])
        count = int(g["count"].sum())
        weight = float(g["weight_lb"].sum())
        length_ft = weight / (count * unit_weight_plf(size)) if count else float(
            g["length_ft"].iloc[0])
        used = sorted({f"{w} {m}" for w, m in zip(g["wall"], g["mark"], strict=True)},
                      key=natural_key)
        rows.append({"mark": mark, "size": size, "count": count, "length_ft": length_ft,
                     "shape": shape, "weight_lb": weight,
                     **bar_legs_in(size, shape, length_ft * 12.0), "used_in": ", ".join(used)})
    frame = pd.DataFrame(rows, columns=BARLIST_COLUMNS)
    return frame.iloc[sorted(range(len(frame)), key=lambda i: natural_key(frame["mark"].iloc[i]))
                      ].reset_index(drop=True)
