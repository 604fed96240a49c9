"""One DXF per wall for the drafter: model space at true scale, and a sheet set in paper space.

Drawing units are feet (``$INSUNITS`` = 2), DXF R2010. Model space holds the elevation
(x = station, y = elevation drawn at ``vertical_exaggeration``), the plan (true size, moved
clear of the elevation by a stated offset) and one typical section per mark at 1:1 on a grid.
Paper space (inches) holds the sheets (:mod:`.dxf_wall`): border, title block, the note block
with the cautions, viewports at standard scales, the wall schedule and the bending schedule.
Every text is placed by a collision-avoiding layout (:mod:`.label_layout`); every dimension
prints the length it measures.

Layers (discipline-major-minor; colour and linetype on the layer, entities BYLAYER):
see :data:`LAYERS`.

Output is deterministic: fixed header dates and GUIDs, handles in creation order.
"""

from __future__ import annotations

from fractions import Fraction
from pathlib import Path

from ..profile.stationing import format_station
from .dxf_elev_view import tw_ends
from .dxf_style import TEXT_STYLE
from .file_names import wall_file_stem

# name: (ACI colour, linetype, what it holds)
LAYERS: dict[str, tuple[int, str, str]] = {
    "C-WALL-OTLN": (7, "Continuous", "stem outline and section concrete"),
    "C-WALL-FTNG": (4, "DASHED2", "footing and key below grade (hidden)"),
    "C-WALL-BNDY": (8, "CENTER", "segment boundaries"),
    "C-WALL-JNTC": (3, "DASHED", "contraction joints"),
    "C-WALL-JNTE": (6, "PHANTOM", "expansion joints"),
    "C-WALL-ELEV": (2, "Continuous", "TW, BW, TF, BF callouts"),
    "C-WALL-TAGS": (1, "Continuous", "segment and section-mark tags"),
    "C-WALL-GRID": (9, "Continuous", "elevation grid, station ticks and labels"),
    "C-WALL-DIMS": (1, "Continuous", "dimensions"),
    "C-WALL-RBAR": (1, "Continuous", "reinforcing bars and bar marks"),
    "C-WALL-TABL": (7, "Continuous", "schedule and bar list tables"),
    "C-WALL-NOTE": (7, "Continuous", "notes, cautions, titles"),
    "C-GRAD-RETD": (30, "DASHDOT", "retained grade"),
    "C-GRAD-FRNT": (3, "Continuous", "front grade"),
    "C-GRAD-EXST": (8, "DOT", "existing ground"),
    "C-WALL-ALGN": (5, "Continuous", "plan: wall alignment, station ticks, retained-side ticks"),
    "C-ANNO-TTLB": (7, "Continuous", "sheet border and title block"),
    "C-ANNO-VPRT": (8, "Continuous", "viewport frames (not plotted)"),
}
# plotted lineweights by layer, 1/100 mm (others: the default)
LINEWEIGHTS = {"C-WALL-OTLN": 50, "C-WALL-FTNG": 35, "C-WALL-GRID": 13, "C-WALL-BNDY": 18,
               "C-WALL-ELEV": 13, "C-WALL-DIMS": 13, "C-WALL-TABL": 18, "C-WALL-RBAR": 35,
               "C-GRAD-RETD": 25, "C-GRAD-FRNT": 25, "C-GRAD-EXST": 18, "C-ANNO-TTLB": 50,
               "C-WALL-ALGN": 50}
# revision clouds and tags (drawn only when a comparison run gives changed station ranges)
REVISION_LAYER = "C-ANNO-REVS"
REVISION_LAYER_STYLE = (1, "Continuous", "revision clouds and revision tags")
POLYLINE_LAYERS = ("C-WALL-OTLN", "C-WALL-FTNG", "C-GRAD-RETD", "C-GRAD-FRNT", "C-GRAD-EXST")


def elevation_dxf_name(wall: str) -> str:
    """The file name of a wall's elevation written alone (the run names it by the stems of
    all its walls, :func:`~.file_names.wall_file_stems`)."""
    return f"{wall_file_stem(wall)}-elevation.dxf"


def format_ft_in(value_ft: float) -> str:
    """Feet as ft-in to the nearest 1/8 in: ``1.5 -> 1'-6"``, ``0.3125 -> 0'-3 3/4"``."""
    eighths = round(abs(value_ft) * 96)
    sign = "-" if value_ft < 0 and eighths else ""
    feet, rest = divmod(eighths, 96)
    inches = Fraction(rest, 8)
    whole = int(inches)
    frac = inches - whole
    text = f"{whole}" + (f" {frac.numerator}/{frac.denominator}" if frac else "")
    return f"{sign}{feet}'-{text}\""


def format_elev(value_ft: float) -> str:
    return f"{value_ft:.2f}"


def write_elevation_dxf(design, path, *, input_hash: str, site_name: str,
                        vertical_exaggeration: float = 1.0, bars=None, quantities=None,
                        revisions=None, revision_tag: str = "1", sheet_size: str = "ARCH D",
                        label_interval_ft: float = 50.0, date: str = "",
                        revision: str = "") -> Path:
    """Write ``<wall>-elevation.dxf`` for one :class:`WallDesign`; returns the path written.

    ``path`` is a file path or a folder (then the file is named :func:`elevation_dxf_name`).
    ``bars`` is the wall's bar list and ``quantities`` its per-segment quantity frame, both
    the engine's (``design.bars`` and ``design.quantities`` when not given).
    ``revisions`` is a list of changed ``(station_start_ft, station_end_ft)`` ranges (e.g.
    ``RunDiff.changed_station_ranges(wall)``): each gets a revision cloud around that stretch
    of the elevation, with a revision tag (a triangle holding ``revision_tag``), on the layer
    :data:`REVISION_LAYER`. None or empty draws no revision layer.
    ``sheet_size`` is ``"ARCH D"`` or ``"ANSI D"``; ``label_interval_ft`` spaces the
    elevation labels between segment ends; ``date`` and ``revision`` go to the title block
    (the revision defaults to ``revision_tag`` with revisions, else ``0``).
    """
    import ezdxf

    if not vertical_exaggeration > 0:
        raise ValueError("vertical exaggeration must be positive")
    path = Path(path)
    if path.is_dir():
        path = path / elevation_dxf_name(design.wall)
    bars = design.bars if bars is None else bars
    quantities = design.quantities if quantities is None else quantities
    if bars is None or quantities is None:
        raise ValueError(f"wall {design.wall}: no bar list or quantities to draw (the engine's "
                         "design stage fills them)")
    bars = bars[bars["wall"] == design.wall].reset_index(drop=True)
    quantities = quantities[quantities["wall"] == design.wall].reset_index(drop=True)

    old = ezdxf.options.write_fixed_meta_data_for_testing
    ezdxf.options.write_fixed_meta_data_for_testing = True  # fixed dates, GUIDs and marker
    try:
        return _write(design, path, input_hash=input_hash, site_name=site_name,
                      ve=vertical_exaggeration, bars=bars, quantities=quantities,
                      revisions=list(revisions or ()), revision_tag=str(revision_tag),
                      sheet_size=sheet_size, label_interval_ft=float(label_interval_ft),
                      date=date, revision=revision)
    finally:
        ezdxf.options.write_fixed_meta_data_for_testing = old


def _write(design, path: Path, *, input_hash, site_name, ve, bars, quantities,
           revisions=(), revision_tag="1", sheet_size="ARCH D", label_interval_ft=50.0,
           date="", revision="") -> Path:
    import ezdxf

    from .dxf_sheets import VIEWPORT_LAYER
    from .dxf_style import setup_dimstyles
    from .dxf_wall import draw_wall

    doc = ezdxf.new("R2010", setup=["linetypes"], units=2)
    doc.header["$INSUNITS"] = 2  # feet
    doc.header["$MEASUREMENT"] = 0
    doc.header["$LUNITS"] = 2
    doc.header["$LTSCALE"] = 1.0
    doc.header["$PSLTSCALE"] = 1  # linetypes scaled by each viewport's scale
    doc.header["$TEXTSTYLE"] = TEXT_STYLE
    for name, (colour, ltype, desc) in LAYERS.items():
        layer = doc.layers.add(name, color=colour, linetype=ltype)
        layer.description = desc
        layer.dxf.lineweight = LINEWEIGHTS.get(name, 18)
    doc.layers.get(VIEWPORT_LAYER).dxf.plot = 0
    if revisions:
        colour, ltype, desc = REVISION_LAYER_STYLE
        doc.layers.add(REVISION_LAYER, color=colour, linetype=ltype).description = desc
    setup_dimstyles(doc)
    # the placing list names the bending schedule's marks (assigned site-wide by the engine;
    # for this wall alone when the caller gave none)
    bending = design.bending
    draw_wall(doc, design, bars=bars, site_name=site_name, ve=ve, sheet_size=sheet_size,
              label_interval_ft=label_interval_ft, revisions=revisions,
              revision_tag=revision_tag, date=date,
              revision=revision or (revision_tag if revisions else "0"),
              notes=_notes(ve, input_hash, site_name, quantities),
              schedule_headers=SCHEDULE_HEADERS,
              schedule_rows=_schedule_rows(design, quantities),
              bending_headers=BENDING_HEADERS,
              bending_rows=_bending_rows(bending) if bending is not None else [])
    path.parent.mkdir(parents=True, exist_ok=True)
    # ezdxf adds the CLASSES entries of the entity types in use from a set, whose order
    # changes with the process's hash seed: add them now, in a fixed order
    doc.classes.add_required_classes(doc.dxfversion)
    doc.classes.classes = dict(sorted(doc.classes.classes.items()))
    doc.saveas(path)
    return path


SCHEDULE_HEADERS = ["SEGMENT", "SECTION", "FROM STA", "TO STA", "LENGTH FT", "H MAX FT", "TW",
                    "TF", "BF", "STEM TOP/BASE IN", "FTG IN", "TOE", "HEEL", "WIDTH B",
                    "KEY W x D IN", "STEM BARS", "HEEL BARS", "TOE BARS", "HORIZ BARS",
                    "CONC CY", "STEEL LB", "EXCAV CY", "BACKFILL CY", "STATUS"]
BENDING_HEADERS = ["MARK", "SIZE", "COUNT", "CUT LENGTH", "SHAPE", "A", "G", "J", "BEND DIA",
                   "WEIGHT LB", "PLACED AS"]


def _bars_text(spec) -> str:
    return str(spec) if spec is not None else "-"


def _qty(q, seg, col, fmt) -> str:
    if q is None or seg not in q.index:
        return "-"
    v = q.loc[seg, col]
    return fmt.format(v) if v == v else "-"


def _schedule_rows(design, quantities) -> list[list[str]]:
    q = quantities.set_index("segment") if quantities is not None and len(quantities) else None
    rows = []
    for g in design.segments:
        a, b = tw_ends(g)
        tw = format_elev(a) if a == b else f"{format_elev(a)}-{format_elev(b)}"
        sec = g.section
        if sec is None:
            dims = ["-"] * 10
        else:
            dims = [f"{sec.stem_top_in:g}/{sec.stem_base_in:g}", f"{sec.footing_thickness_in:g}",
                    format_ft_in(sec.toe_ft), format_ft_in(sec.heel_ft),
                    format_ft_in(sec.footing_width_ft),
                    f"{sec.key_width_in:g} x {sec.key_depth_in:g}" if sec.has_key else "-",
                    _bars_text(sec.stem_bars), _bars_text(sec.heel_bars),
                    _bars_text(sec.toe_bars), _bars_text(sec.horizontal_bars)]
        status = g.status.upper()
        if len(status) > 40:
            status = status[:37] + "..."
        rows.append([g.segment, g.mark, format_station(g.station_start_ft),
                     format_station(g.station_end_ft), f"{g.length_ft:.2f}",
                     f"{g.retained_height_max_ft:.2f}", tw, format_elev(g.top_of_footing_ft),
                     format_elev(g.bottom_of_footing_ft), *dims,
                     _qty(q, g.segment, "concrete_cy", "{:.1f}"),
                     _qty(q, g.segment, "steel_lb", "{:.0f}"),
                     _qty(q, g.segment, "excavation_cy", "{:.1f}"),
                     _qty(q, g.segment, "backfill_cy", "{:.1f}"), status])
    if q is not None:
        def total(col, fmt):
            v = quantities[col].sum(min_count=1)
            return fmt.format(v) if v == v else "-"

        rows.append(["WALL TOTAL", "", "", "", f"{quantities['length_ft'].sum():.2f}", "", "",
                     "", "", "", "", "", "", "", "", "", "", "", "",
                     total("concrete_cy", "{:.1f}"), total("steel_lb", "{:.0f}"),
                     total("excavation_cy", "{:.1f}"), total("backfill_cy", "{:.1f}"), ""])
    return rows


def _inches(v) -> str:
    return "-" if v != v else format_ft_in(v / 12.0)


def _bending_rows(bending) -> list[list[str]]:
    rows = [[r.mark, f"#{r.size}", f"{r.count}", format_ft_in(r.length_ft), r.shape,
             _inches(r.a_in), _inches(r.g_in), _inches(r.j_in), _inches(r.bend_diameter_in),
             f"{r.weight_lb:.1f}", r.used_in if len(r.used_in) <= 48 else r.used_in[:45] + "..."]
            for r in bending.itertuples()]
    rows.append(["WALL TOTAL", "", f"{int(bending['count'].sum())}", "", "", "", "", "", "",
                 f"{bending['weight_lb'].sum():.1f}", "ASTM A615 GRADE 60"])
    return rows


def _notes(ve: float, input_hash: str, site_name: str, quantities=None) -> list[str]:
    blank = []
    if quantities is not None and "earthwork_note" in quantities.columns:
        blank = sorted({n for n in quantities["earthwork_note"] if n})
    earthwork = [f"EXCAV CY and BACKFILL CY blank: {n}." for n in blank]
    return [
        "Elevations in feet; stations in feet along the wall alignment (12+00 notation).",
        "TW top of wall, BW bottom of wall (finished grade at the front face), TF top of "
        "footing, BF bottom of footing.",
        f"Elevations drawn with vertical exaggeration {ve:g}:1; plan and typical sections at "
        "true scale.",
        "Bars ASTM A615 Grade 60. Standard hooks per ACI 318-19 Table 25.3.1; laps Class B "
        "per ACI 318-19 25.5.2. Cover 3\" cast against earth, 2\" formed (#6 and larger), "
        "1.5\" formed (#5 and smaller).",
        "Placing marks: S1 stem vertical (hooked), D1/S2 dowel and upper stem bar, F1 heel top, "
        "F2 toe bottom, L1/L2 footing longitudinal, H1/H2 stem horizontal; the bending "
        "schedule's mark in brackets. Bending legs out to out (A long leg, G hook, J 180-degree "
        "hook width).",
        "CJ contraction joint, EJ expansion joint.",
        *earthwork,
        f"Site: {site_name}. Made with wallsched. Inputs: {input_hash}",
    ]


