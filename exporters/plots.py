"""Plots per wall (matplotlib, Agg backend): PNG files a person looks at."""

from __future__ import annotations

import contextlib
from pathlib import Path

import numpy as np

from ..cautions import CAUTIONS
from ..profile.stationing import format_station
from .envelope import envelope, envelope_indices


@contextlib.contextmanager
def figure(path: Path, *, nrows: int = 1, figsize=(11, 6.5), sharex=True, **kw):
    """Create a figure, yield its axes, save it to ``path`` and close it."""
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    fig, axes = plt.subplots(nrows, 1, figsize=figsize, sharex=sharex, squeeze=False, **kw)
    try:
        yield fig, axes[:, 0]
        fig.text(0.01, 0.005, CAUTIONS[0] + " " + CAUTIONS[2], fontsize=6, color="0.35")
        fig.savefig(path, dpi=110, metadata={"Software": None})
    finally:
        plt.close(fig)


def station_ticks(ax, start: float, end: float) -> None:
    """Ticks in station notation at a round interval for the length."""
    from matplotlib.ticker import FuncFormatter, MultipleLocator

    length = max(end - start, 1.0)
    step = next(s for s in (10, 25, 50, 100, 200, 500, 1000, 5000) if length / s <= 12)
    ax.xaxis.set_major_locator(MultipleLocator(step))
    ax.xaxis.set_major_formatter(FuncFormatter(lambda v, _: format_station(v, 0)))


def plot_stations(ws, path: Path) -> None:
    """Both grades and the retained height against station for one wall."""
    st = np.asarray(ws.station_ft, dtype=float)
    with figure(path, nrows=2, gridspec_kw={"height_ratios": [2, 1]}) as (fig, (ax1, ax2)):
        # every line thinned to its per-pixel envelope: the same picture, whatever the count
        ax1.plot(*envelope(st, ws.retained_grade_ft), color="tab:brown", lw=1.6,
                 label="retained grade")
        ax1.plot(*envelope(st, ws.front_grade_ft), color="tab:green", lw=1.6,
                 label="front grade")
        if not np.isnan(ws.existing_ground_ft).all():
            ax1.plot(*envelope(st, ws.existing_ground_ft), color="0.5", lw=1, ls="--",
                     label="existing ground")
        breaks = np.unique(np.round(st[np.asarray(ws.is_break, dtype=bool)], 1))
        ax1.vlines(breaks, 0, 1, transform=ax1.get_xaxis_transform(), color="0.8", lw=0.5,
                   zorder=0, label="station at a grade break")
        ax1.set_ylabel("elevation (ft)")
        ax1.set_title(f"Wall {ws.wall}: grades along the wall")
        ax1.grid(True, lw=0.3)
        ax1.legend(loc="best", fontsize=8)
        h_all = np.asarray(ws.retained_height_ft, dtype=float)
        k = int(np.argmax(h_all))
        i = envelope_indices(st, h_all)
        x, h = st[i], h_all[i]
        ax2.fill_between(x, 0, h, where=h >= 0, color="tab:blue", alpha=0.3, lw=0)
        ax2.fill_between(x, 0, h, where=h < 0, color="tab:red", alpha=0.5, lw=0,
                         label="retained side flips")
        ax2.plot(x, h, color="tab:blue", lw=1.2)
        h = h_all
        ax2.annotate(f"max {h[k]:.2f} ft at {format_station(st[k])}", (st[k], h[k]),
                     textcoords="offset points", xytext=(5, -12), fontsize=8)
        ax2.axhline(0, color="k", lw=0.6)
        ax2.set_ylabel("retained height (ft)")
        ax2.set_xlabel("station")
        ax2.grid(True, lw=0.3)
        if (h < 0).any():
            ax2.legend(loc="best", fontsize=8)
        station_ticks(ax2, float(st[0]), float(st[-1]))
        fig.tight_layout(rect=(0, 0.02, 1, 1))
