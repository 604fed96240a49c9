"""A station series thinned to what a plot can show: per pixel column, its first, last,
lowest and highest point.

A plot of 100,000 stations on a figure 1,200 pixels wide draws about 80 points into every
pixel column; the line it shows is fixed by the first, last, lowest and highest of them. Kept
in station order, those four per column draw the same picture at a fraction of the cost, and
every extreme (the tallest station, the largest ratio) stays on the plot. NaN gaps are kept
(the point before and after each gap and the first NaN of it), so a broken line stays broken.
"""

from __future__ import annotations

import numpy as np

PLOT_COLUMNS = 2400  # twice the pixel width of the widest figure (11 in at 110 dpi)


def envelope_indices(x, y, columns: int = PLOT_COLUMNS) -> np.ndarray:
    """Indices (increasing) of the points of ``y`` over increasing ``x`` that a plot
    ``columns`` pixels wide needs; every index when there are few points."""
    x = np.asarray(x, dtype=float)
    y = np.asarray(y, dtype=float)
    n = x.size
    if n <= 4 * columns:
        return np.arange(n)
    span = float(x[-1] - x[0]) or 1.0
    col = np.clip(((x - x[0]) / span * columns).astype(np.int64), 0, columns - 1)
    nan = np.isnan(y)
    keep = np.zeros(n, dtype=bool)
    keep[[0, -1]] = True
    # the edges of every NaN gap
    edge = np.flatnonzero(nan[1:] != nan[:-1])
    keep[edge] = True
    keep[edge + 1] = True
    # the first and last point of every column
    first = np.flatnonzero(np.r_[True, col[1:] != col[:-1]])
    keep[first] = True
    keep[np.r_[first[1:] - 1, n - 1]] = True
    # the lowest and highest finite point of every column: sorted by column, then value
    fin = np.flatnonzero(~nan)
    if fin.size:
        order = fin[np.lexsort((y[fin], col[fin]))]
        c = col[order]
        starts = np.flatnonzero(np.r_[True, c[1:] != c[:-1]])
        keep[order[starts]] = True
        keep[order[np.r_[starts[1:] - 1, order.size - 1]]] = True
    return np.flatnonzero(keep)


def envelope(x, y, columns: int = PLOT_COLUMNS) -> tuple[np.ndarray, np.ndarray]:
    """``x`` and ``y`` at :func:`envelope_indices`."""
    i = envelope_indices(x, y, columns)
    return np.asarray(x, dtype=float)[i], np.asarray(y, dtype=float)[i]


DRAFTING_TOLERANCE_FT = 0.001  # 1/83 in at full size: no drawing scale shows it


def drafted_line(x, y, tolerance_ft: float = DRAFTING_TOLERANCE_FT) -> np.ndarray:
    """The polyline through ``(x, y)`` without the vertices a drawing cannot show: every point
    of the original stays within ``tolerance_ft`` of the result (Douglas-Peucker, by
    shapely); both ends and every corner beyond the tolerance kept. Grades sampled at 1 ft
    along straight grade lines are nearly all collinear, so a 5,000 ft wall's grade is a
    few hundred vertices instead of 5,000. Returns an (n, 2) array."""
    import shapely

    xy = np.column_stack([np.asarray(x, dtype=float), np.asarray(y, dtype=float)])
    if len(xy) <= 2 or not np.isfinite(xy).all():
        return xy
    line = shapely.simplify(shapely.linestrings(xy), tolerance_ft, preserve_topology=False)
    out = shapely.get_coordinates(line)
    return out if len(out) >= 2 else xy[[0, -1]]
