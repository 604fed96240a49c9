"""Bar list per segment: what the detailer cuts and bends, from the engine's section as-is.

Bar marks (one row per segment and bar type; the same mark letters in every segment):

====  =====================================================================================
mark  bar
====  =====================================================================================
S1    stem vertical, earth face, 90-degree hook into the footing (continuous from the
      bottom mat to the top of the stem when it fits the stock length)
S2    stem vertical, earth face, straight upper bar lapped on a dowel (only when S1 would
      exceed the stock length)
D1    dowel for S2: 90-degree hook in the footing, Class B lap above the top of footing
F1    heel top bars, transverse, top mat of the footing (full width less cover); a standard
      hook turned down at the toe end where the straight bar cannot be developed beyond the
      stem's back face (the section's ``heel_hooked``)
F2    toe bottom bars, transverse, bottom mat of the footing (full width less cover); hooked
      up at the heel end where the section's ``toe_hooked`` says so
L1    footing longitudinal bars, top mat
L2    footing longitudinal bars, bottom mat
H1    stem horizontal bars, earth (back) face
H2    stem horizontal bars, front (exposed) face
====  =====================================================================================

``size`` is the integer ASTM A615 bar number (6 for a #6 bar). ``length_ft`` is the cut length
(straight leg + bend + hook tail + laps), rounded up to the whole inch (common practice).
``weight_lb = count * length_ft * unit weight`` exactly (ASTM A615 unit weights, McCormac & Brown
9th ed. Table A.2), so an independent recomputation from ``rebar.csv`` agrees.

Counts: ``ceil(distribution length / spacing) + 1`` over the distribution length less the end
cover (common practice). Bars running along the wall that exceed ``bar_stock_ft`` are lapped:
``n`` equal pieces with ``n - 1`` Class B laps (ACI 318-19 section 25.5.2.1). On a segment with a
sloped top the stem bar lengths vary; the row gives the average length (the weight stays right).

Development length: ACI 318-19 Eq. 25.4.2.4a with Ktr = 0 (no transverse reinforcement), the
ratio (cb + Ktr)/db capped at 2.5 (section 25.4.2.4), sqrt(f'c) at most 100 psi (25.4.1.4) and
ld at least 12 in (25.4.2.1).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
import pandas as pd

from .bars import A615, BarSpec
from .model import (
    REBAR_COLUMNS,
    BarDetail,
    SectionDetail,
    SectionDims,
    Segment,
    WallDesign,
)

BAR_STOCK_FT = 40.0  # longest bar bought and handled without a lap (common practice)
COVER_EARTH_IN = 3.0  # cast against and permanently exposed to earth (ACI 318-19 Table 20.5.1.3.1)
END_COVER_IN = 3.0  # segment ends: bulkheads against the next pour (common practice)

# Shape codes (our own): the bar as drawn in the typical section
SHAPE_STRAIGHT = "STR"
SHAPE_HOOK90 = "HK90"  # one 90-degree standard hook
SHAPE_HOOK180 = "HK180"  # one 180-degree standard hook


# ---------------------------------------------------------------- ACI 318-19 bar geometry

def bar_db_in(size: int) -> float:
    return A615[int(size)][0]  # ASTM A615 nominal diameter (McCormac Table A.2)


def unit_weight_plf(size: int) -> float:
    return A615[int(size)][2]  # ASTM A615 unit weight (McCormac Table A.2)


def formed_cover_in(size: int) -> float:
    """Formed surface exposed to earth: 2 in for #6 and larger, 1.5 in for #5 and smaller."""
    return 2.0 if size >= 6 else 1.5  # ACI 318-19 Table 20.5.1.3.1


def bend_diameter_in(size: int) -> float:
    """Inside bend diameter of a standard hook."""
    db = bar_db_in(size)
    if size <= 8:
        return 6.0 * db  # ACI 318-19 Table 25.3.1: #3 through #8
    if size <= 11:
        return 8.0 * db  # ACI 318-19 Table 25.3.1: #9 through #11
    return 10.0 * db  # ACI 318-19 Table 25.3.1: #14 and #18


def hook_extension_in(size: int, angle_deg: int = 90) -> float:
    """Straight tail beyond the bend of a standard hook."""
    db = bar_db_in(size)
    if angle_deg == 90:
        return 12.0 * db  # ACI 318-19 Table 25.3.1: 90-degree hook, 12db
    if angle_deg == 180:
        return max(4.0 * db, 2.5)  # ACI 318-19 Table 25.3.1: 180-degree hook, 4db >= 2.5 in
    raise ValueError(f"standard hooks are 90 or 180 degrees, not {angle_deg}")


def hook_out_to_out_in(size: int) -> float:
    """From the outside face of a 90-degree hook's tail to the start of the bend: D/2 + db."""
    return bend_diameter_in(size) / 2.0 + bar_db_in(size)  # geometry of Table 25.3.1 bend


def hook_developed_in(size: int, angle_deg: int = 90) -> float:
    """Bar length in a standard hook beyond the start of the bend: centreline arc + tail."""
    d_in = bend_diameter_in(size)
    db = bar_db_in(size)
    arc = math.radians(angle_deg) * (d_in + db) / 2.0  # arc on the bar centreline
    return arc + hook_extension_in(size, angle_deg)


def development_length_in(size: int, *, fc_psi: float, fy_psi: float, cover_in: float,
                          spacing_in: float, psi_t: float = 1.0, psi_e: float = 1.0,
                          lam: float = 1.0) -> float:
    """Straight development length of a deformed bar in tension, ACI 318-19 Eq. 25.4.2.4a."""
    db = bar_db_in(size)
    psi_s = 0.8 if size <= 6 else 1.0  # ACI 318-19 Table 25.4.2.5: No. 6 and smaller
    psi_g = 1.0 if fy_psi <= 60000 else (1.15 if fy_psi <= 80000 else 1.3)  # Table 25.4.2.5
    psi_te = min(psi_t * psi_e, 1.7)  # ACI 318-19 25.4.2.5: psi_t * psi_e <= 1.7
    cb = min(cover_in + db / 2.0, spacing_in / 2.0)  # ACI 318-19 25.4.2.4 cb
    ratio = min(cb / db, 2.5)  # Ktr = 0; (cb + Ktr)/db <= 2.5 (25.4.2.4)
    root = min(math.sqrt(fc_psi), 100.0)  # ACI 318-19 25.4.1.4
    ld = 3.0 / 40.0 * fy_psi / (lam * root) * psi_te * psi_s * psi_g / ratio * db  # Eq. 25.4.2.4a
    return max(ld, 12.0)  # ACI 318-19 25.4.2.1(b)


def class_b_lap_in(size: int, **kw) -> float:
    """Class B tension lap splice: 1.3 ld, at least 12 in."""
    if size > 11:
        raise ValueError(f"#{size} bars may not be lap spliced (ACI 318-19 25.5.1.1)")
    return max(1.3 * development_length_in(size, **kw), 12.0)  # ACI 318-19 25.5.2.1


def lapped_pieces(run_in: float, lap_in: float, stock_in: float) -> tuple[int, float]:
    """Equal pieces covering ``run_in`` with Class B laps between them: (pieces, piece length);
    none where there is no run (a segment shorter than its end covers)."""
    if run_in <= 0:
        return 0, 0.0
    if run_in <= stock_in:
        return 1, run_in
    if lap_in >= stock_in:
        raise ValueError("the lap is longer than the stock bar")
    n = math.ceil((run_in - lap_in) / (stock_in - lap_in) - 1e-9)
    while (run_in + (n - 1) * lap_in) / n > stock_in + 1e-9:
        n += 1
    return n, (run_in + (n - 1) * lap_in) / n


def bar_count(run_in: float, spacing_in: float) -> int:
    """Bars spread over ``run_in`` at ``spacing_in``: ceil(run / spacing) + 1 (common practice)."""
    if run_in <= 0:
        return 0
    return math.ceil(run_in / spacing_in - 1e-9) + 1


def round_up_inch(length_in: float) -> float:
    """Cut lengths are ordered to the next whole inch (common practice)."""
    return float(math.ceil(length_in - 1e-6))


# ---------------------------------------------------------------- segment geometry

def top_of_wall_ends_ft(seg: Segment) -> tuple[float, float]:
    """Top of wall at the segment's start and end (the level value at both when level)."""
    if math.isfinite(seg.top_of_wall_ft):
        return seg.top_of_wall_ft, seg.top_of_wall_ft
    a, b = seg.top_of_wall_start_ft, seg.top_of_wall_end_ft
    if not (math.isfinite(a) and math.isfinite(b)):
        raise ValueError(f"segment {seg.segment}: no top of wall (level or at both ends)")
    return a, b


def stem_height_avg_ft(seg: Segment) -> float:
    """TW - TF, the average of the two ends on a sloped top."""
    a, b = top_of_wall_ends_ft(seg)
    return (a + b) / 2.0 - seg.top_of_footing_ft


@dataclass(frozen=True)
class BarRow:
    mark: str
    size: int
    spacing_in: float
    count: int
    length_in: float  # cut length, whole inches
    shape: str


@dataclass(frozen=True)
class _Run:
    """What every bar of one segment is cut from: the stock length, the run along the wall
    between end covers, the footing's thickness and width, the stem's mean height (in), and
    the concrete strengths for the laps."""

    stock_in: float
    run_along_in: float
    t_in: float
    width_in: float
    stem_h_in: float
    fc_psi: float
    fy_psi: float


BOTTOM_MAT_IN = COVER_EARTH_IN  # bottom of footing cast against earth
TOP_COVER_IN = 2.0  # top of footing, formed or exposed to earth (Table 20.5.1.3.1)


def _lap(r: _Run, spec: BarSpec, cover_in: float, concrete_below_in: float) -> float:
    # ACI 318-19 25.4.2.5: psi_t = 1.3 only for a horizontal top bar, one with more than
    # 12 in of fresh concrete cast below it in one pour (0: a vertical bar)
    psi_t = 1.3 if concrete_below_in > 12.0 else 1.0
    return class_b_lap_in(spec.size, cover_in=cover_in, spacing_in=spec.spacing_in,
                          psi_t=psi_t, fc_psi=r.fc_psi, fy_psi=r.fy_psi)


def _lapped_row(r: _Run, mark: str, spec: BarSpec, run_in: float, cover_in: float,
                below_in: float, n: int, shape: str = SHAPE_STRAIGHT) -> BarRow:
    """A bar row of ``n`` bars along ``run_in``, cut into lapped pieces of the stock length
    (the lap by the bar's cover and the fresh concrete ``below_in`` it)."""
    pieces, piece_in = lapped_pieces(run_in, _lap(r, spec, cover_in, below_in), r.stock_in)
    return BarRow(mark, spec.size, spec.spacing_in, n * pieces, round_up_inch(piece_in), shape)


def _rows_for_segment(seg: Segment, *, fc_psi: float, fy_psi: float,
                      bar_stock_ft: float) -> list[BarRow]:
    sec: SectionDims = seg.section
    if sec is None:
        return []
    r = _Run(bar_stock_ft * 12.0, seg.length_ft * 12.0 - 2 * END_COVER_IN,
             sec.footing_thickness_in, sec.footing_width_ft * 12.0,
             stem_height_avg_ft(seg) * 12.0, fc_psi, fy_psi)
    return (_stem_rows(r, sec) + _footing_rows(r, sec) + _longitudinal_rows(r, sec)
            + _horizontal_rows(r, sec))


def _stem_rows(r: _Run, sec: SectionDims) -> list[BarRow]:
    """S1 (one hooked bar), or D1 dowels and S2 lapped bars above them."""
    rows: list[BarRow] = []
    bottom_mat_in = BOTTOM_MAT_IN
    s = sec.stem_bars
    if s is not None:
        n = bar_count(r.run_along_in, s.spacing_in)
        # vertical leg, out to out: stem top less cover down to the bottom mat of the footing
        vertical_in = r.stem_h_in + r.t_in - formed_cover_in(s.size) - bottom_mat_in
        straight_in = vertical_in - hook_out_to_out_in(s.size)
        cut_in = straight_in + hook_developed_in(s.size, 90)
        if cut_in <= r.stock_in:
            rows.append(BarRow("S1", s.size, s.spacing_in, n, round_up_inch(cut_in),
                               SHAPE_HOOK90))
        else:
            lap_in = _lap(r, s, formed_cover_in(s.size), 0.0)
            dowel_straight = r.t_in - bottom_mat_in - hook_out_to_out_in(s.size) + lap_in
            dowel_in = dowel_straight + hook_developed_in(s.size, 90)
            upper_in = r.stem_h_in - formed_cover_in(s.size)
            rows.append(BarRow("D1", s.size, s.spacing_in, n, round_up_inch(dowel_in),
                               SHAPE_HOOK90))
            rows.append(_lapped_row(r, "S2", s, upper_in, formed_cover_in(s.size), 0.0, n))

    return rows


def _footing_rows(r: _Run, sec: SectionDims) -> list[BarRow]:
    """F1 (heel, top) and F2 (toe, bottom) across the footing, hooked where the section says."""
    rows: list[BarRow] = []
    bottom_mat_in, top_cover_in = BOTTOM_MAT_IN, TOP_COVER_IN
    for mark, spec, hooked, top in (("F1", sec.heel_bars, sec.heel_hooked, True),
                                    ("F2", sec.toe_bars, sec.toe_hooked, False)):
        if spec is None:
            continue
        n = bar_count(r.run_along_in, spec.spacing_in)
        across_in = r.width_in - 2 * COVER_EARTH_IN  # footing edges cast against earth
        below_in = r.t_in - top_cover_in - bar_db_in(spec.size) if top else 0.0
        shape = SHAPE_STRAIGHT
        if hooked:
            # a standard hook at the far end from the heel edge (F1) or the toe edge (F2):
            # 90 degrees where its tail fits in the depth between the covers, else 180
            depth = r.t_in - (formed_cover_in(spec.size) if top else top_cover_in) - bottom_mat_in
            tail90 = bend_diameter_in(spec.size) / 2 + bar_db_in(spec.size) + hook_extension_in(
                spec.size, 90)
            angle = 90 if tail90 <= depth + 1e-9 else 180
            shape = SHAPE_HOOK90 if angle == 90 else SHAPE_HOOK180
            across_in = (across_in - hook_out_to_out_in(spec.size)
                         + hook_developed_in(spec.size, angle))
        rows.append(_lapped_row(r, mark, spec, across_in, COVER_EARTH_IN, below_in, n, shape))

    return rows


def _longitudinal_rows(r: _Run, sec: SectionDims) -> list[BarRow]:
    """L1 (top mat) and L2 (bottom mat) along the wall."""
    rows: list[BarRow] = []
    top_cover_in = TOP_COVER_IN
    f = sec.footing_long_bars
    if f is not None:
        across_in = r.width_in - 2 * COVER_EARTH_IN
        n = bar_count(across_in, f.spacing_in)
        # L1 is the top mat (fresh concrete below it), L2 the bottom mat (none)
        for mark, below_in in (("L1", r.t_in - top_cover_in - bar_db_in(f.size)), ("L2", 0.0)):
            rows.append(_lapped_row(r, mark, f, r.run_along_in, COVER_EARTH_IN, below_in, n))

    return rows


def _horizontal_rows(r: _Run, sec: SectionDims) -> list[BarRow]:
    """H1 and H2, the stem's horizontal bars on its two faces."""
    rows: list[BarRow] = []
    h = sec.horizontal_bars
    if h is not None:
        # spread from just above the top of footing to the top of the stem, less top cover
        n = bar_count(r.stem_h_in - 2 * formed_cover_in(h.size), h.spacing_in)
        # stem horizontal bars: the stem is cast in lifts; a bar in the lift with more than
        # 12 in of concrete below it is a top bar (conservative: psi_t = 1.3 above the first
        # foot of the stem, which is nearly all of them)
        for mark in ("H1", "H2"):
            rows.append(_lapped_row(r, mark, h, r.run_along_in, formed_cover_in(h.size),
                                    r.stem_h_in, n))
    return rows


def _records(seg: Segment, **kw) -> list[dict]:
    records = []
    for r in _rows_for_segment(seg, **kw):
        length_ft = r.length_in / 12.0
        records.append({
            "wall": seg.wall, "segment": seg.segment, "mark": r.mark, "size": int(r.size),
            "spacing_in": float(r.spacing_in), "count": int(r.count), "length_ft": length_ft,
            "shape": r.shape,
            "weight_lb": r.count * length_ft * unit_weight_plf(r.size),  # ASTM A615 unit weight
        })
    return records


def _frame(records: list[dict]) -> pd.DataFrame:
    return pd.DataFrame.from_records(records, columns=REBAR_COLUMNS).astype(
        {"size": int, "count": int, "spacing_in": float, "length_ft": float, "weight_lb": float})


def segment_bar_list(seg: Segment, *, fc_psi: float = 4000.0, fy_psi: float = 60000.0,
                     bar_stock_ft: float = BAR_STOCK_FT) -> pd.DataFrame:
    """The ``rebar.csv`` rows of one segment (columns :data:`REBAR_COLUMNS`).

    ``fc_psi``/``fy_psi`` default to 4000/60000 psi (common practice for site walls); the
    pipeline passes the site's ``[materials]``.
    """
    return _frame(_records(seg, fc_psi=fc_psi, fy_psi=fy_psi, bar_stock_ft=bar_stock_ft))


def wall_bar_list(design: WallDesign, *, fc_psi: float = 4000.0, fy_psi: float = 60000.0,
                  bar_stock_ft: float = BAR_STOCK_FT) -> pd.DataFrame:
    """Bar list of every segment of one wall, in segment order (one frame built once)."""
    records = [r for s in design.segments
               for r in _records(s, fc_psi=fc_psi, fy_psi=fy_psi, bar_stock_ft=bar_stock_ft)]
    return _frame(records)


def site_bar_list(designs, **kw) -> pd.DataFrame:
    """Bar list of every wall on the site."""
    frames = [wall_bar_list(d, **kw) for d in designs]
    frames = [f for f in frames if len(f)]
    if not frames:
        return pd.DataFrame(columns=REBAR_COLUMNS)
    return pd.concat(frames, ignore_index=True)


def steel_by_segment_lb(bars: pd.DataFrame) -> dict[str, float]:
    """Segment id -> total bar weight (lb)."""
    if not len(bars):
        return {}
    return {str(k): float(v) for k, v in bars.groupby("segment", sort=False)["weight_lb"].sum()
            .items()}


def bar_totals(bars: pd.DataFrame) -> pd.DataFrame:
    """Weight per wall and bar size, then per wall (``size`` 0 = all sizes), then the site
    (``wall="SITE"``)."""
    out = []
    for wall, g in bars.groupby("wall", sort=False):
        for size, gs in g.groupby("size"):
            out.append({"wall": wall, "size": int(size), "count": int(gs["count"].sum()),
                        "length_ft": float((gs["count"] * gs["length_ft"]).sum()),
                        "weight_lb": float(gs["weight_lb"].sum())})
        out.append({"wall": wall, "size": 0, "count": int(g["count"].sum()),
                    "length_ft": float((g["count"] * g["length_ft"]).sum()),
                    "weight_lb": float(g["weight_lb"].sum())})
    out.append({"wall": "SITE", "size": 0, "count": int(bars["count"].sum()) if len(bars) else 0,
                "length_ft": float((bars["count"] * bars["length_ft"]).sum()) if len(bars) else 0,
                "weight_lb": float(bars["weight_lb"].sum()) if len(bars) else 0.0})
    return pd.DataFrame(out, columns=["wall", "size", "count", "length_ft", "weight_lb"])


def total_weight_lb(bars: pd.DataFrame) -> float:
    return float(np.sum(bars["weight_lb"])) if len(bars) else 0.0


def bar_detail(bars: BarSpec | None) -> BarDetail | None:
    """The diameter, formed-face cover and hook tail that place ``bars`` in a drawing."""
    if bars is None:
        return None
    return BarDetail(bars=bars, diameter_in=bar_db_in(bars.size),
                     formed_cover_in=formed_cover_in(bars.size),
                     hook_tail_in=hook_extension_in(bars.size, 90))


def section_detail(sec: SectionDims) -> SectionDetail:
    """Every bar set of a section with its covers (Table 20.5.1.3.1: 3 in against earth below
    the footing, 2 in at its top face)."""
    return SectionDetail(
        stem=bar_detail(sec.stem_bars), heel=bar_detail(sec.heel_bars),
        toe=bar_detail(sec.toe_bars), horizontal=bar_detail(sec.horizontal_bars),
        longitudinal=bar_detail(sec.footing_long_bars), earth_cover_in=COVER_EARTH_IN,
        top_cover_in=2.0)
