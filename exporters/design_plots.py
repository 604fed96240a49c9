"""Plots per designed wall (PNG, matplotlib Agg): elevation, utilisation with segment bands and
section marks along the station.

Per-check utilisation comes from ``design.station_checks`` (check name -> array per
station) when the engine provides it; the largest ratio per station (``station_utilization``) is
always drawn.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np

from ..cautions import CAUTIONS
from .dxf_elevation import _bottom_ft, _runs, _tw_ends
from .file_names import wall_file_stem
from .plots import figure, station_ticks


def elevation_series(design, vertical_exaggeration: float = 1.0) -> dict[str, list[np.ndarray]]:
    """The elevation's lines as drawn in the DXF (layer name -> list of (n, 2) arrays)."""
    st = design.stations
    s = np.asarray(st.station_ft, dtype=float)
    segs = [g for g in design.segments if g.section is not None] or list(design.segments)
    lo = min(min(_bottom_ft(g) for g in segs), float(np.nanmin(st.front_grade_ft)))
    ve = vertical_exaggeration

    def Y(e):
        return lo + (np.asarray(e, dtype=float) - lo) * ve

    out: dict[str, list[np.ndarray]] = {"C-GRAD-FRNT": [np.c_[s, Y(st.front_grade_ft)]],
                                        "C-GRAD-RETD": [np.c_[s, Y(st.retained_grade_ft)]],
                                        "C-WALL-OTLN": [], "C-WALL-FTNG": []}
    eg = np.asarray(st.existing_ground_ft, dtype=float)
    ok = np.isfinite(eg)
    if ok.sum() >= 2:
        out["C-GRAD-EXST"] = [np.c_[s[ok], Y(eg[ok])]]
    for run in _runs(segs):
        top, tf, bf = [], [], []
        for g in run:
            a, b = _tw_ends(g)
            top += [(g.station_start_ft, a), (g.station_end_ft, b)]
            tf += [(g.station_start_ft, g.top_of_footing_ft), (g.station_end_ft,
                                                               g.top_of_footing_ft)]
            bf += [(g.station_start_ft, g.bottom_of_footing_ft),
                   (g.station_end_ft, g.bottom_of_footing_ft)]
        outline = np.array(top + tf[::-1] + top[:1])
        footing = np.array(tf + bf[::-1] + tf[:1])
        out["C-WALL-OTLN"].append(np.c_[outline[:, 0], Y(outline[:, 1])])
        out["C-WALL-FTNG"].append(np.c_[footing[:, 0], Y(footing[:, 1])])
        for g in run:
            if g.section is not None and g.section.has_key:
                kb = g.bottom_of_footing_ft - g.section.key_depth_in / 12.0
                k = np.array([(g.station_start_ft, g.bottom_of_footing_ft),
                              (g.station_start_ft, kb), (g.station_end_ft, kb),
                              (g.station_end_ft, g.bottom_of_footing_ft)])
                out["C-WALL-FTNG"].append(np.c_[k[:, 0], Y(k[:, 1])])
    return out


def _caution_footer(fig) -> None:
    rest = [c for i, c in enumerate(CAUTIONS) if i not in (0, 2)]  # figure() prints 0 and 2
    fig.text(0.01, 0.022, " ".join(rest), fontsize=5.5, color="0.35", wrap=True)


def _bands(ax, design, label: bool) -> None:
    for i, g in enumerate(design.segments):
        ax.axvspan(g.station_start_ft, g.station_end_ft, color=("0.93" if i % 2 else "0.86"),
                   zorder=0, lw=0)
        if label:
            ax.text((g.station_start_ft + g.station_end_ft) / 2, 0.98, g.segment,
                    transform=ax.get_xaxis_transform(), ha="center", va="top", fontsize=7)


def plot_design_elevation(design, path, *, vertical_exaggeration: float = 1.0) -> Path:
    """Grades, stepped wall and footing, key, joints and segment tags, as in the DXF."""
    path = Path(path)
    series = elevation_series(design, vertical_exaggeration)
    styles = {"C-GRAD-FRNT": ("tab:green", "-", "front grade"),
              "C-GRAD-RETD": ("tab:brown", "-.", "retained grade"),
              "C-GRAD-EXST": ("0.5", ":", "existing ground"),
              "C-WALL-OTLN": ("k", "-", "stem"),
              "C-WALL-FTNG": ("tab:blue", "--", "footing / key")}
    st = design.stations.station_ft
    with figure(path) as (fig, (ax,)):
        for layer, lines in series.items():
            colour, ls, label = styles[layer]
            for i, xy in enumerate(lines):
                ax.plot(xy[:, 0], xy[:, 1], color=colour, ls=ls, lw=1.3,
                        label=label if i == 0 else None)
        for j in design.joints:
            ax.axvline(j.station_ft, color="tab:purple" if j.kind == "expansion" else "tab:olive",
                       ls="-" if j.kind == "expansion" else ":", lw=0.8)
        ax.plot([], [], color="tab:olive", ls=":", lw=0.8, label="contraction joint")
        ax.plot([], [], color="tab:purple", lw=0.8, label="expansion joint")
        span = max(st[-1] - st[0], 1.0)
        for i, g in enumerate(design.segments):
            # the section mark on every segment; the segment number where there is room,
            # staggered in two rows so that short segments do not overprint
            wide = (g.station_end_ft - g.station_start_ft) / span > 0.06
            text = f"{g.segment}\n{g.mark}" if wide else g.mark
            ax.text((g.station_start_ft + g.station_end_ft) / 2, 0.985 - 0.05 * (i % 2),
                    text, transform=ax.get_xaxis_transform(), ha="center", va="top",
                    fontsize=7)
        ax.set_ylabel("elevation (ft)" + (f", vertical x{vertical_exaggeration:g}"
                                          if vertical_exaggeration != 1 else ""))
        ax.set_xlabel("station")
        ax.set_title(f"Wall {design.wall}: elevation (front view)")
        ax.grid(True, lw=0.3)
        ax.legend(loc="lower right", fontsize=7, ncol=2)
        station_ticks(ax, float(st[0]), float(st[-1]))
        fig.tight_layout(rect=(0, 0.05, 1, 1))
        _caution_footer(fig)
    return path


def plot_utilization(design, path) -> Path:
    """Utilisation of each check along the wall with segment bands, and the section marks."""
    path = Path(path)
    st = np.asarray(design.stations.station_ft, dtype=float)
    checks = dict(design.station_checks or {})
    with figure(path, nrows=2, gridspec_kw={"height_ratios": [3, 1]}) as (fig, (ax1, ax2)):
        _bands(ax1, design, label=True)
        for name, values in checks.items():
            ax1.plot(st, np.asarray(values, dtype=float), lw=1.0, label=name)
        ax1.plot(st, design.station_utilization, color="k", lw=1.8, label="largest ratio")
        ax1.axhline(1.0, color="tab:red", lw=1.0, ls="--", label="limit 1.0")
        ax1.set_ylabel("demand / capacity")
        ax1.set_ylim(0, max(1.1, float(np.nanmax(design.station_utilization)) * 1.1))
        ax1.set_title(f"Wall {design.wall}: utilisation of each check along the wall")
        ax1.grid(True, lw=0.3)
        ax1.legend(loc="lower right", fontsize=7, ncol=3)
        _bands(ax2, design, label=False)
        marks = sorted({g.mark for g in design.segments})
        level = {m: i for i, m in enumerate(marks)}
        for g in design.segments:
            y = level[g.mark]
            ax2.plot([g.station_start_ft, g.station_end_ft], [y, y], lw=6, solid_capstyle="butt",
                     color=f"C{y % 10}")
            ax2.text((g.station_start_ft + g.station_end_ft) / 2, y + 0.3, g.mark, ha="center",
                     fontsize=8)
        ax2.set_yticks(range(len(marks)), [f"section {m}" for m in marks])
        ax2.set_ylim(-0.7, len(marks) - 0.1 + 0.5)
        ax2.set_xlabel("station")
        station_ticks(ax2, float(st[0]), float(st[-1]))
        fig.tight_layout(rect=(0, 0.05, 1, 1))
        _caution_footer(fig)
    return path


def write_design_plots(design, folder, *, vertical_exaggeration: float = 1.0,
                       stem: str | None = None) -> list[Path]:
    """``<stem>-elevation.png`` and ``<stem>-utilization.png`` in ``folder`` (``stem``: the
    wall's file stem, :func:`~.file_names.wall_file_stems`; by default its id's alone)."""
    folder = Path(folder)
    folder.mkdir(parents=True, exist_ok=True)
    stem = stem or wall_file_stem(design.wall)
    return [plot_design_elevation(design, folder / f"{stem}-elevation.png",
                                  vertical_exaggeration=vertical_exaggeration),
            plot_utilization(design, folder / f"{stem}-utilization.png")]
