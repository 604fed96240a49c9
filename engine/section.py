"""One cantilever cross-section as arrays: geometry, bars, and its weights (the site-wide
inputs they are checked with are ``engine/inputs.py``).

Every array field holds one element per section (any broadcastable shape; a scalar is one
section). Coordinates: ``x`` from the toe edge (x = 0) toward the heel edge (x = B), ``y`` up
from the bottom of the footing. Results are per foot of wall.

Words (DESIGN.md section 3): retained height h = retained grade - front grade; embedment
D = front grade - bottom of footing; design height H = h + D; the stem runs from the top of
the footing to the top of wall = retained grade + freeboard.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass, fields
from typing import Any

import numpy as np

from .bars import bar_area_in2, bar_diameter_in
from .inputs import SEISMIC_METHODS, DesignInputs, SeismicLoad, WaterTable

# the section's own names, and the inputs (engine/inputs.py) re-exported for the importers
__all__ = [
    "BarArrays", "DesignInputs", "GEOMETRY_FIELDS", "Reinforcement", "SEISMIC_METHODS",
    "SectionGeometry", "SeismicLoad", "WaterTable", "Weight", "Weights", "polygon_area_centroid",
    "retained_soil_polygons", "section_weights"
]

GEOMETRY_FIELDS = (
    "retained_height_ft", "embedment_ft", "footing_thickness_in", "stem_top_in", "stem_base_in",
    "toe_ft", "heel_ft", "key_width_in", "key_depth_in", "key_offset_ft", "freeboard_ft",
)


def _arr(v) -> np.ndarray:
    return np.asarray(v, dtype=float)


@dataclass(frozen=True)
class SectionGeometry:
    """Geometry of cantilever sections, float arrays (one element per section).

    Args:
        retained_height_ft: retained grade - front grade, ft.
        embedment_ft: front grade - bottom of footing, ft.
        footing_thickness_in: footing thickness T, in.
        stem_top_in, stem_base_in: stem thickness at the top of wall and at the top of footing.
        toe_ft: stem front face (at its base) to the toe edge, ft.
        heel_ft: stem back face (at its base) to the heel edge, ft.
        key_width_in, key_depth_in: shear key below the footing (0 = no key), in.
        key_offset_ft: toe edge to the key's front face, ft; ``None`` puts the key's front face
            below the stem's front face (``toe_ft``; common practice).
        freeboard_ft: top of wall above the retained grade, ft (DESIGN.md default 0.5).
    """

    retained_height_ft: Any
    embedment_ft: Any
    footing_thickness_in: Any
    stem_top_in: Any
    stem_base_in: Any
    toe_ft: Any
    heel_ft: Any
    key_width_in: Any = 0.0
    key_depth_in: Any = 0.0
    key_offset_ft: Any = None
    freeboard_ft: Any = 0.5

    def __post_init__(self):
        for f in fields(self):
            v = getattr(self, f.name)
            if f.name == "key_offset_ft" and v is None:
                v = self.toe_ft
            object.__setattr__(self, f.name, _arr(v))

    # ---- derived dimensions (ft unless named otherwise) -------------------------------
    @property
    def shape(self) -> tuple[int, ...]:
        return np.broadcast_shapes(*(getattr(self, n).shape for n in GEOMETRY_FIELDS))

    @property
    def design_height_ft(self) -> np.ndarray:
        """H = retained height + embedment (retained grade to bottom of footing)."""
        return self.retained_height_ft + self.embedment_ft

    @property
    def footing_thickness_ft(self) -> np.ndarray:
        return self.footing_thickness_in / 12.0

    @property
    def footing_width_ft(self) -> np.ndarray:
        """B = toe + stem base + heel."""
        return self.toe_ft + self.stem_base_in / 12.0 + self.heel_ft

    @property
    def stem_height_ft(self) -> np.ndarray:
        """Top of footing to top of wall (= retained grade + freeboard)."""
        return self.design_height_ft + self.freeboard_ft - self.footing_thickness_ft

    @property
    def soil_height_ft(self) -> np.ndarray:
        """Retained grade above the top of footing (h_s of the stem design), >= 0."""
        return np.maximum(self.design_height_ft - self.footing_thickness_ft, 0.0)

    @property
    def toe_soil_depth_ft(self) -> np.ndarray:
        """Front grade above the top of footing, >= 0 (soil over the toe)."""
        return np.maximum(self.embedment_ft - self.footing_thickness_ft, 0.0)

    @property
    def has_key(self) -> np.ndarray:
        return (self.key_width_in > 0) & (self.key_depth_in > 0)

    @property
    def valid(self) -> np.ndarray:
        """Where the numbers describe a buildable section (else checks fail, never pass)."""
        B = self.footing_width_ft
        ok = ((self.retained_height_ft > 0) & (self.embedment_ft >= 0)
              & (self.footing_thickness_in > 0) & (self.stem_top_in > 0)
              & (self.stem_base_in >= self.stem_top_in) & (self.toe_ft >= 0)
              & (self.heel_ft >= 0) & (self.freeboard_ft >= 0)
              & (self.key_width_in >= 0) & (self.key_depth_in >= 0)
              & (self.design_height_ft > self.footing_thickness_ft))
        key_in = (~self.has_key) | ((self.key_offset_ft >= -1e-9)
                                    & (self.key_offset_ft + self.key_width_in / 12.0 <= B + 1e-9))
        return ok & key_in

    def stem_thickness_in(self, y_ft) -> np.ndarray:
        """Stem thickness at ``y_ft`` above the top of footing (linear taper)."""
        with np.errstate(divide="ignore", invalid="ignore"):  # no stem: the base thickness
            frac = np.nan_to_num(np.clip(_arr(y_ft) / self.stem_height_ft, 0.0, 1.0))
        return self.stem_base_in - (self.stem_base_in - self.stem_top_in) * frac

    def broadcast(self) -> SectionGeometry:
        """The same geometry with every field broadcast to :attr:`shape` (copies)."""
        shp = self.shape
        return SectionGeometry(**{n: np.broadcast_to(getattr(self, n), shp).copy()
                                  for n in GEOMETRY_FIELDS})

    def to_frame(self):
        """One row per section (flattened in C order): the fields plus B, H, stem height."""
        import pandas as pd

        g = self.broadcast()
        cols = {n: getattr(g, n).reshape(-1) for n in GEOMETRY_FIELDS}
        cols["footing_width_ft"] = g.footing_width_ft.reshape(-1)
        cols["design_height_ft"] = g.design_height_ft.reshape(-1)
        cols["stem_height_ft"] = g.stem_height_ft.reshape(-1)
        return pd.DataFrame(cols)

    @classmethod
    def from_mapping(cls, data: Mapping[str, Any]) -> SectionGeometry:
        """From a ``[geometry]`` table (extra keys ignored)."""
        return cls(**{n: data[n] for n in GEOMETRY_FIELDS if n in data})


# ------------------------------------------------------------------------------------------
@dataclass(frozen=True)
class BarArrays:
    """One layer of bars per section: ASTM A615 ``size`` (int) at ``spacing_in`` centres."""

    size: Any
    spacing_in: Any

    def __post_init__(self):
        object.__setattr__(self, "size", np.asarray(self.size, dtype=int))
        object.__setattr__(self, "spacing_in", _arr(self.spacing_in))

    @property
    def diameter_in(self) -> np.ndarray:
        return bar_diameter_in(self.size)

    @property
    def area_in2_per_ft(self) -> np.ndarray:
        """Steel area per foot of wall, in^2/ft."""
        return bar_area_in2(self.size) * 12.0 / self.spacing_in

    @classmethod
    def parse(cls, text: str) -> BarArrays:
        """From the trade's ``#6@12`` notation."""
        from .bars import parse_bars

        b = parse_bars(text)
        return cls(b.size, b.spacing_in)


@dataclass(frozen=True)
class Reinforcement:
    """The bars of a section: stem (back face, vertical), heel (top), toe (bottom).

    ``heel_hooked`` / ``toe_hooked`` fix the anchorage of the footing bars beyond the stem
    face (True: a standard hook; None: hooked only where the straight bar does not fit).
    ``horizontal`` (stem horizontal bars, ``horizontal_layers`` faces) and ``longitudinal``
    (footing longitudinal bars, ``longitudinal_layers`` layers) are optional; when ``None``
    their checks are not made (the required areas are reported by the functions in
    ``strength.py``).
    """

    stem: BarArrays
    heel: BarArrays
    toe: BarArrays
    horizontal: BarArrays | None = None
    horizontal_layers: int = 2
    longitudinal: BarArrays | None = None
    longitudinal_layers: int = 2
    heel_hooked: object = None  # None: hooked where a straight bar does not fit; else bools
    toe_hooked: object = None


# ------------------------------------------------------------------------------------------
@dataclass(frozen=True)
class Weight:
    """A vertical force per foot of wall and its arm from the toe edge."""

    lb: np.ndarray
    arm_ft: np.ndarray

    @property
    def moment_lbft(self) -> np.ndarray:
        return self.lb * self.arm_ft


@dataclass(frozen=True)
class Weights:
    """The vertical loads of a section (service, per foot), each with its arm from the toe."""

    stem_rectangle: Weight
    stem_batter: Weight
    footing: Weight
    key: Weight
    soil_heel: Weight
    soil_batter: Weight
    soil_toe: Weight  # zero when count_toe_soil is false
    surcharge: Weight  # live: resists only with surcharge_resists
    uplift: Weight | None = None  # water pressure on the base (negative), with [water]

    DEAD = ("stem_rectangle", "stem_batter", "footing", "key", "soil_heel", "soil_batter",
            "soil_toe", "uplift")

    def dead(self) -> tuple[np.ndarray, np.ndarray]:
        """Sum of the permanent weights (less the uplift) and of their moments about the toe."""
        parts = [getattr(self, n) for n in self.DEAD if getattr(self, n) is not None]
        v = sum(w.lb for w in parts)
        m = sum(w.moment_lbft for w in parts)
        return v, m


def polygon_area_centroid(xs, ys):
    """Area (>= 0) and centroid (x, y) of simple polygons given by vertex arrays (shoelace);
    each vertex coordinate broadcasts over sections. Zero area gives centroid (0, 0)."""
    n = len(xs)
    a2 = cx = cy = 0.0
    for i in range(n):
        x1, y1, x2, y2 = _arr(xs[i]), _arr(ys[i]), _arr(xs[(i + 1) % n]), _arr(ys[(i + 1) % n])
        cr = x1 * y2 - x2 * y1
        a2 = a2 + cr
        cx = cx + (x1 + x2) * cr
        cy = cy + (y1 + y2) * cr
    ok = np.abs(a2) > 1e-14
    with np.errstate(divide="ignore", invalid="ignore"):
        xc = np.where(ok, cx / (3.0 * np.where(ok, a2, 1.0)), 0.0)
        yc = np.where(ok, cy / (3.0 * np.where(ok, a2, 1.0)), 0.0)
    return np.abs(a2) / 2.0, xc, yc


def retained_soil_polygons(geom: SectionGeometry, inputs: DesignInputs, top_y=None):
    """The soil over the heel as one region (stem back face, top of footing, heel plane,
    ground rising at the backslope from where the retained grade meets the stem's back face),
    split by the vertical through the stem's back face at its base into the part over the
    heel and the part over a battered back face. ``top_y`` cuts the region at that height
    (the submerged part below a water level); returns ((xs, ys) heel, (xs, ys) batter).
    """
    from .pressure import stem_face_x_at_grade, virtual_back_height_ft

    g = geom
    T, B, H = g.footing_thickness_ft, g.footing_width_ft, g.design_height_ft
    tt, tb = g.stem_top_in / 12.0, g.stem_base_in / 12.0
    x_back = g.toe_ft + tb
    x_gf = stem_face_x_at_grade(g, inputs)
    tanb = math.tan(math.radians(inputs.soil.backslope_deg or 0.0))
    y_back = H + (x_back - x_gf) * tanb  # ground above the stem's back face at its base
    Hv = virtual_back_height_ft(g, inputs)
    if top_y is None:
        heel = ([x_back, B, B, x_back], [T, T, Hv, y_back])
        batter = ([x_back, x_back, x_gf], [T, y_back, H])
        return heel, batter
    y = np.clip(top_y, T, H)
    if inputs.criteria.batter_face == "back":
        with np.errstate(divide="ignore", invalid="ignore"):
            x_y = x_back - np.where(g.stem_height_ft > 0,
                                    (tb - tt) * (y - T) / g.stem_height_ft, 0.0)
    else:
        x_y = x_back + 0.0 * y
    heel = ([x_back, B, B, x_back], [T, T, y, y])
    batter = ([x_back, x_back, x_y], [T, y, y])
    return heel, batter


def _polygon_soil_weights(geom, inputs):
    """Soil over the heel and over a battered back face from the polygon at its total unit
    weight (``saturated_unit_weight_pcf`` below the water level when given); and the uplift on
    the base (triangular, full head at the heel edge to zero at the toe edge, no water in
    front). One free body (DESIGN.md section 7): total weights with the full uplift, never a
    buoyant weight as well, which would count the water twice."""
    from .pressure import WATER_PCF, water_height_ft

    gs = inputs.soil.unit_weight_pcf
    heel, batter = retained_soil_polygons(geom, inputs)
    ah, xh, _ = polygon_area_centroid(*heel)
    ab, xb, _ = polygon_area_centroid(*batter)
    wh, mh, wb, mb = gs * ah, gs * ah * xh, gs * ab, gs * ab * xb
    B = geom.footing_width_ft
    uplift = None
    if inputs.loads.water is not None:
        hw = water_height_ft(geom, inputs)
        sh, sb = retained_soil_polygons(geom, inputs, top_y=hw)
        a1, x1, _ = polygon_area_centroid(*sh)
        a2, x2, _ = polygon_area_centroid(*sb)
        extra = inputs.gamma_below_water_pcf - gs  # saturated less moist, below the level
        wh, mh = wh + extra * a1, mh + extra * a1 * x1
        wb, mb = wb + extra * a2, mb + extra * a2 * x2
        uplift = Weight(-WATER_PCF * hw * B / 2.0, 2.0 * B / 3.0 + 0.0 * hw)
    with np.errstate(divide="ignore", invalid="ignore"):
        heel_w = Weight(wh, np.where(wh != 0, mh / np.where(wh != 0, wh, 1.0), 0.0))
        bat_w = Weight(wb, np.where(wb != 0, mb / np.where(wb != 0, wb, 1.0), 0.0))
    return heel_w, bat_w, uplift


def section_weights(geom: SectionGeometry, inputs: DesignInputs) -> Weights:
    """Weights and arms of stem, footing, key, soil over heel / battered face / toe, surcharge.

    The stem is a rectangle of the top thickness plus a triangle of the batter, on the back
    face (``batter_face = "back"``) or the front face. The soil over a battered back face is the
    triangle between that face and the vertical through the stem's back face at its base, up to
    the retained grade. The surcharge weight acts over the heel: from the stem's back face at
    its base to the heel edge (q * heel_ft, the span ``heel_ft`` is measured over; DESIGN.md
    section 7). Soil over the toe spans the toe only, from the top of footing to the front grade
    (0 if the front grade is lower).

    With a backslope or a water level the soil over the heel and the battered face is the
    polygon of :func:`retained_soil_polygons` (total weights, saturated below the water when
    given), and the base carries the uplift (a negative dead weight, see
    :func:`_polygon_soil_weights`).
    """
    g, gc, gs = geom, inputs.materials.concrete_unit_weight_pcf, inputs.soil.unit_weight_pcf
    T = g.footing_thickness_ft
    B = g.footing_width_ft
    tt, tb = g.stem_top_in / 12.0, g.stem_base_in / 12.0
    bat = tb - tt
    hst = g.stem_height_ft
    hs = g.soil_height_ft
    toe = g.toe_ft
    x_back = toe + tb  # stem back face at its base
    rect_w = gc * tt * hst
    tri_w = gc * 0.5 * bat * hst
    if inputs.criteria.batter_face == "back":
        rect_x = toe + tt / 2.0
        tri_x = toe + tt + bat / 3.0
        # width of the soil wedge at the retained grade (the face slopes to x_back at the base)
        with np.errstate(divide="ignore", invalid="ignore"):
            w_top = bat * hs / hst
    else:
        rect_x = toe + bat + tt / 2.0
        tri_x = toe + 2.0 * bat / 3.0
        w_top = np.zeros_like(bat)
    soil_toe_w = gs * toe * g.toe_soil_depth_ft * (1.0 if inputs.criteria.count_toe_soil else 0.0)
    on_heel = 0.0 if inputs.stem_plane else 1.0  # retained soil with the stem plane
    q = inputs.loads.surcharge_psf
    if inputs.soil.backslope_deg or inputs.loads.water is not None:
        soil_heel, soil_batter, uplift = _polygon_soil_weights(g, inputs)
    else:  # level and drained: the closed forms (equal to the polygon; tested)
        soil_heel = Weight(gs * g.heel_ft * hs, B - g.heel_ft / 2.0)
        soil_batter = Weight(gs * 0.5 * w_top * hs, x_back - w_top / 3.0)
        uplift = None
    return Weights(
        stem_rectangle=Weight(rect_w, rect_x),
        stem_batter=Weight(tri_w, tri_x),
        footing=Weight(gc * B * T, B / 2.0),
        key=Weight(np.where(g.has_key, gc * g.key_width_in * g.key_depth_in / 144.0, 0.0),
                   g.key_offset_ft + g.key_width_in / 24.0),
        soil_heel=Weight(soil_heel.lb * on_heel, soil_heel.arm_ft),
        soil_batter=soil_batter,
        soil_toe=Weight(soil_toe_w, toe / 2.0),
        surcharge=Weight(q * g.heel_ft * on_heel, B - g.heel_ft / 2.0),
        uplift=uplift,
    )
