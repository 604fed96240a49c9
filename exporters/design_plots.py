"""Plots per designed wall (PNG, matplotlib Agg): the elevation, and the utilisation of the
checks along the wall with the section marks.

The elevation is labelled by the DXF's rules (:func:`.dxf_elev_view.label_stations`: at the
segment ends, both sides of a step, and every ``label_interval_ft`` between them); the
segment-end labels come before the interval labels, and a label that would overlap another
text is left out (:mod:`.plots`). The utilisation plot groups the checks into at most six
lines (each the largest ratio of its group at every station) beside the largest ratio and
the limit: eight legend entries at most. Every station series is drawn from its per-pixel
envelope.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np

from ..engine.model import natural_key
from ..profile.stationing import format_station
from .dxf_elev_view import bottom_ft, label_stations, tw_ends, wall_runs
from .envelope import drafted_line, envelope
from .file_names import wall_file_stem
from .plots import finish, legend_outside, new_figure, optional_text, save, station_ticks

LABEL_INTERVAL_FT = 50.0  # as the [drawing] key's default
LABEL_PT = 6.0
TAG_PT = 7.0

# the utilisation plot's groups: (legend label, does a check name belong to it); a name goes
# to the first group that takes it, every name to one group
CHECK_GROUPS = (
    ("overturning", lambda n: "overturning" in n),
    ("sliding", lambda n: "sliding" in n),
    ("bearing", lambda n: "bearing" in n),
    ("stem strength", lambda n: n.startswith("stem_") and ("flexure" in n or "shear" in n)),
    ("heel and toe strength",
     lambda n: n.startswith(("heel_", "toe_")) and ("flexure" in n or "shear" in n)),
    ("shear key strength", lambda n: n.startswith("key_")),
    ("detailing and minimums", lambda n: True),
)


def elevation_series(design, vertical_exaggeration: float = 1.0) -> dict[str, list[np.ndarray]]:
    """The elevation's lines as drawn in the DXF (layer name -> list of (n, 2) arrays)."""
    st = design.stations
    s = np.asarray(st.station_ft, dtype=float)
    segs = [g for g in design.segments if g.section is not None] or list(design.segments)
    lo = min(min(bottom_ft(g) for g in segs), float(np.nanmin(st.front_grade_ft)))
    ve = vertical_exaggeration

    def Y(e):
        return lo + (np.asarray(e, dtype=float) - lo) * ve

    out: dict[str, list[np.ndarray]] = {"C-GRAD-FRNT": [drafted_line(s, Y(st.front_grade_ft))],
                                        "C-GRAD-RETD": [drafted_line(s, Y(st.retained_grade_ft))],
                                        "C-WALL-OTLN": [], "C-WALL-FTNG": []}
    eg = np.asarray(st.existing_ground_ft, dtype=float)
    ok = np.isfinite(eg)
    if ok.sum() >= 2:
        out["C-GRAD-EXST"] = [drafted_line(s[ok], Y(eg[ok]))]
    for run in wall_runs(segs):
        top, tf, bf = [], [], []
        for g in run:
            a, b = tw_ends(g)
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


def _bands(ax, design) -> None:
    """Alternating grey bands, one per segment (two collections)."""
    for parity, colour in ((0, "0.86"), (1, "0.93")):
        spans = [(g.station_start_ft, g.length_ft) for i, g in enumerate(design.segments)
                 if i % 2 == parity]
        if spans:
            ax.broken_barh(spans, (0, 1), transform=ax.get_xaxis_transform(), color=colour,
                           zorder=0, lw=0)


def _segment_ids(ax, design, y: float, priority: int) -> None:
    """Each segment's id over its middle, in two staggered rows (kept where it fits)."""
    for i, g in enumerate(design.segments):
        optional_text(ax, (g.station_start_ft + g.station_end_ft) / 2.0, y - 0.045 * (i % 2),
                      g.segment, xycoords=ax.get_xaxis_transform(), ha="center", va="top",
                      fontsize=TAG_PT, priority=priority)


def elevation_figure(design, *, vertical_exaggeration: float = 1.0,
                     label_interval_ft: float = LABEL_INTERVAL_FT):
    """Grades, stepped wall and footing, key, joints, section marks and the elevation labels
    (station and top of wall), as in the DXF."""
    ve = vertical_exaggeration
    series = elevation_series(design, ve)
    styles = {"C-GRAD-FRNT": ("tab:green", "-", "front grade"),
              "C-GRAD-RETD": ("tab:brown", "-.", "retained grade"),
              "C-GRAD-EXST": ("0.5", ":", "existing ground"),
              "C-WALL-OTLN": ("k", "-", "stem"),
              "C-WALL-FTNG": ("tab:blue", "--", "footing / key")}
    st = design.stations
    s = np.asarray(st.station_ft, dtype=float)
    fig, (ax,) = new_figure()
    for layer, lines in series.items():
        colour, ls, label = styles[layer]
        for i, xy in enumerate(lines):
            x, y = envelope(xy[:, 0], xy[:, 1]) if len(xy) > 64 else (xy[:, 0], xy[:, 1])
            ax.plot(x, y, color=colour, ls=ls, lw=1.3, label=label if i == 0 else None)
    for kind, colour, ls, label in (("contraction", "tab:olive", ":", "contraction joint"),
                                    ("expansion", "tab:purple", "-", "expansion joint")):
        xs = [j.station_ft for j in design.joints if j.kind == kind]
        if xs:
            ax.vlines(xs, 0, 1, transform=ax.get_xaxis_transform(), color=colour, ls=ls,
                      lw=0.8, label=label)
    segs = [g for g in design.segments if g.section is not None] or list(design.segments)
    lo = min(min(bottom_ft(g) for g in segs), float(np.nanmin(st.front_grade_ft)))
    hi = max(max(max(tw_ends(g)) for g in segs), float(np.nanmax(st.retained_grade_ft)))

    def Y(e):
        return lo + (e - lo) * ve

    span = max((hi - lo) * ve, 1.0)
    # room for the labels above the wall and the section marks below it
    ax.set_ylim(lo - 0.14 * span, lo + span * 1.28)
    for i, g in enumerate(design.segments):
        optional_text(ax, (g.station_start_ft + g.station_end_ft) / 2.0,
                      0.012 + 0.05 * (i % 2), g.mark or g.segment,
                      xycoords=ax.get_xaxis_transform(), ha="center", va="bottom",
                      fontsize=TAG_PT, fontweight="bold", priority=0)
    fg = np.asarray(st.front_grade_ft, dtype=float)
    for q in label_stations(segs, s, fg, label_interval_ft):
        ha = {-1: "right", 0: "center", 1: "left"}[q.side]
        optional_text(ax, q.station_ft, Y(q.tw),
                      f"{format_station(q.station_ft)}  TW {q.tw:.2f}", xytext=(2 * q.side, 3),
                      textcoords="offset points", rotation=90, ha=ha, va="bottom",
                      fontsize=LABEL_PT, priority=1 if q.required else 2)
    ax.set_ylabel("elevation (ft)" + (f", vertical x{ve:g}" if ve != 1 else ""))
    ax.set_xlabel("station")
    ax.set_title(f"Wall {design.wall}: elevation (front view); labels at segment ends, steps "
                 f"and every {label_interval_ft:g} ft where they fit", fontsize=10)
    ax.grid(True, lw=0.3)
    legend_outside(ax)
    station_ticks(ax, float(s[0]), float(s[-1]))
    finish(fig)
    return fig


def check_groups(names) -> list[tuple[str, list[str]]]:
    """The checks by :data:`CHECK_GROUPS`, in their order, empty groups left out."""
    left = list(names)
    out = []
    for label, takes in CHECK_GROUPS:
        mine = [n for n in left if takes(n)]
        left = [n for n in left if n not in mine]
        if mine:
            out.append((label, mine))
    return out


def utilization_figure(design):
    """Utilisation of the checks along the wall (grouped) with segment bands, and the section
    marks in natural order (A ... Z, AA ...)."""
    st = np.asarray(design.stations.station_ft, dtype=float)
    checks = dict(design.station_checks or {})
    marks = sorted({g.mark for g in design.segments if g.mark}, key=natural_key)
    mark_h_in = max(1.1, 0.15 * len(marks) + 0.5)
    fig, (ax1, ax2) = new_figure(nrows=2, figsize=(11.0, 5.4 + mark_h_in),
                                 gridspec_kw={"height_ratios": [4.2, mark_h_in]})
    _bands(ax1, design)
    for k, (label, names) in enumerate(check_groups(checks)):
        ratio = np.full(st.shape, np.nan)
        for n in names:
            ratio = np.fmax(ratio, np.asarray(checks[n], dtype=float))
        text = label if len(names) == 1 and names[0] == label else f"{label} ({len(names)})"
        ax1.plot(*envelope(st, ratio), lw=1.0, color=f"C{k}", label=text)
    util = np.asarray(design.station_utilization, dtype=float)
    ax1.plot(*envelope(st, util), color="k", lw=1.8, label="largest ratio")
    ax1.axhline(1.0, color="tab:red", lw=1.0, ls="--", label="limit 1.0")
    ax1.set_ylabel("demand / capacity")
    top = float(np.nanmax(util)) if np.isfinite(util).any() else 1.0
    ax1.set_ylim(0, max(1.1, top * 1.1) * 1.08)
    ax1.set_title(f"Wall {design.wall}: utilisation of the checks along the wall "
                  "(each line the largest ratio of its group; checks in brackets)", fontsize=10)
    ax1.grid(True, lw=0.3)
    legend_outside(ax1)
    _segment_ids(ax1, design, 0.985, priority=1)
    _bands(ax2, design)
    level = {m: i for i, m in enumerate(marks)}
    for m in marks:
        spans = [(g.station_start_ft, g.length_ft) for g in design.segments if g.mark == m]
        y = level[m]
        ax2.broken_barh(spans, (y - 0.35, 0.7), color=f"C{y % 10}", lw=0)
    step = max(1, int(np.ceil(len(marks) / 60)))
    ax2.set_yticks(range(0, len(marks), step), marks[::step], fontsize=7)
    ax2.set_ylim(len(marks) - 0.5, -0.5)  # A at the top
    ax2.set_ylabel("section mark", fontsize=8)
    ax2.set_xlabel("station")
    station_ticks(ax2, float(st[0]), float(st[-1]))
    finish(fig)
    return fig


def plot_design_elevation(design, path, *, vertical_exaggeration: float = 1.0,
                          label_interval_ft: float = LABEL_INTERVAL_FT) -> Path:
    return save(elevation_figure(design, vertical_exaggeration=vertical_exaggeration,
                                 label_interval_ft=label_interval_ft), path)


def plot_utilization(design, path) -> Path:
    return save(utilization_figure(design), path)


def write_design_plots(design, folder, *, vertical_exaggeration: float = 1.0,
                       label_interval_ft: float = LABEL_INTERVAL_FT,
                       stem: str | None = None) -> list[Path]:
    """``<stem>-elevation.png`` and ``<stem>-utilization.png`` in ``folder`` (``stem``: the
    wall's file stem, :func:`~.file_names.wall_file_stems`; by default its id's alone)."""
    folder = Path(folder)
    folder.mkdir(parents=True, exist_ok=True)
    stem = stem or wall_file_stem(design.wall)
    return [plot_design_elevation(design, folder / f"{stem}-elevation.png",
                                  vertical_exaggeration=vertical_exaggeration,
                                  label_interval_ft=label_interval_ft),
            plot_utilization(design, folder / f"{stem}-utilization.png")]
