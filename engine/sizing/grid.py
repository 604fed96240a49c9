"""The sizing grid: the candidate dimensions and bars (``[sizing]``), its geometries held per
column (:class:`Geometries`), and the grid as sections (broadcasting axes, gathered by index,
as a column against the bar options).
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass, field

import numpy as np

from ..bars import SIZES
from ..defaults import SIZING
from ..section import BarArrays, SectionGeometry

# bar spacings a detailer uses, in (common practice: 4-in steps to 12 in, 15, 16, 18)
STANDARD_SPACINGS_IN = tuple(SIZING["bar_spacings_in"])
# shear key depths below the footing, in (0 = no key; common practice: keys of 1 to 2 ft)
KEY_DEPTHS_DEFAULT_IN = np.array(SIZING["key_depths_in"])


def _steps(lo, hi, step):
    n = int(math.floor((hi - lo) / step + 1e-9))
    return lo + step * np.arange(n + 1)


def parse_sizes(text: str) -> np.ndarray:
    """``"4-9"`` or ``"4,5,6"`` -> bar sizes (ASTM A615 numbers). Raises ValueError."""
    out: list[int] = []
    for part in str(text).replace(" ", "").split(","):
        if "-" in part:
            a, b = part.split("-", 1)
            out += [s for s in SIZES if int(a) <= s <= int(b)]
        elif part:
            out.append(int(part))
    bad = [s for s in out if s not in SIZES]
    if not out or bad:
        raise ValueError(f"bar sizes {text!r}: use ASTM A615 numbers like \"4-9\"")
    return np.array(sorted(set(out)))


@dataclass(frozen=True)
class SizingGrid:
    """The candidate dimensions and bars (``[sizing]``)."""

    toe_ft: np.ndarray
    heel_ft: np.ndarray
    footing_thickness_in: np.ndarray
    stem_base_in: np.ndarray
    stem_top_min_in: float
    stem_batter: bool
    bar_sizes: np.ndarray
    bar_spacings_in: np.ndarray
    marks_max: int = 6  # sections per wall (or site) chosen from the design table
    marks_per: str = "wall"  # or "site"
    # the shear key below the stem (0 = no key; the site file's default is
    # KEY_DEPTHS_DEFAULT_IN); its width: the stem's base (0) or this width, in
    key_depth_in: np.ndarray = field(default_factory=lambda: np.zeros(1))
    key_width_in: float = 0.0

    @classmethod
    def from_table(cls, t: Mapping) -> SizingGrid:
        """From the validated ``[sizing]`` table; a key it does not give takes its default
        (``engine/defaults.py``)."""
        d = {**SIZING, **t}
        st = float(d["toe_heel_step_in"]) / 12.0
        smin = float(d["stem_min_in"])
        return cls(
            toe_ft=_steps(min(float(d["toe_min_ft"]), float(d["toe_max_ft"])),
                          float(d["toe_max_ft"]), st),
            heel_ft=_steps(st * 2, float(d["heel_max_ft"]), st),
            footing_thickness_in=_steps(float(d["footing_thickness_min_in"]),
                                        float(d["footing_thickness_max_in"]),
                                        float(d["footing_thickness_step_in"])),
            stem_base_in=_steps(smin, float(d["stem_max_in"]), float(d["stem_step_in"])),
            stem_top_min_in=smin,
            stem_batter=bool(d["stem_batter"]),
            bar_sizes=parse_sizes(d["bar_sizes"]),
            bar_spacings_in=np.array(sorted(set(float(x) for x in d["bar_spacings_in"]))),
            marks_max=int(d["marks_max"]),
            marks_per=str(d["marks_per"]),
            key_depth_in=np.array(sorted({float(x) for x in d["key_depths_in"]} | {0.0})),
            key_width_in=float(d["key_width_in"]),
        )

    def geometries(self) -> Geometries:
        """Every (toe, heel, footing, stem) combination (:class:`Geometries`)."""
        return Geometries(self)

    def bar_options(self) -> BarArrays:
        size, sp = np.meshgrid(self.bar_sizes, self.bar_spacings_in, indexing="ij")
        return BarArrays(size.ravel(), sp.ravel())


class Geometries:
    """The grid's geometries, flattened with the toe as the slowest axis: geometry
    ``i = toe_index * ncol + column``, a *column* being one (heel, footing, stem, key)
    combination. The key sits below the stem, its front face under the stem's front face
    (``key_offset_ft`` = the toe), as wide as the stem's base or ``key_width_in``.

    Only the toe varies along a column's flat indices, so every value but the toe is held once
    per column (``col``); :meth:`take` reads any value at flat indices. ``axes`` are the
    broadcasting axes of the grid.
    """

    def __init__(self, grid: SizingGrid):
        nt, nh = grid.toe_ft.size, grid.heel_ft.size
        nT, nS = grid.footing_thickness_in.size, grid.stem_base_in.size
        kd = np.asarray(grid.key_depth_in, float)
        nK = kd.size
        self.shape = (nt, nh, nT, nS, nK)
        self.ncol = nh * nT * nS * nK
        self.nt, self.size = nt, nt * self.ncol
        self.toe_axis = np.asarray(grid.toe_ft, float)
        self.spacings_in = np.asarray(grid.bar_spacings_in, float)  # for the fixed bars
        i_h, i_T, i_S, i_K = (a.ravel() for a in np.meshgrid(
            np.arange(nh), np.arange(nT), np.arange(nS), np.arange(nK), indexing="ij"))
        tb = grid.stem_base_in[i_S]
        self.col = {
            "heel_ft": grid.heel_ft[i_h], "footing_thickness_in": grid.footing_thickness_in[i_T],
            "stem_base_in": tb,
            "stem_top_in": np.full(tb.shape, grid.stem_top_min_in) if grid.stem_batter else tb,
            "key_depth_in": kd[i_K], "key_width_in": key_width(grid, tb, kd[i_K]),
            "stem_code": i_T * nS + i_S, "heel_code": i_h * nT + i_T, "T_index": i_T,
            "key_index": i_K,
        }
        tb_ax = grid.stem_base_in[None, None, None, :, None]
        kd_ax = kd[None, None, None, None, :]
        self.axes = {"toe_ft": self.toe_axis[:, None, None, None, None],
                     "heel_ft": grid.heel_ft[None, :, None, None, None],
                     "footing_thickness_in": grid.footing_thickness_in[None, None, :, None, None],
                     "stem_base_in": tb_ax,
                     "stem_top_in": (np.full((1, 1, 1, 1, 1), grid.stem_top_min_in)
                                     if grid.stem_batter else tb_ax),
                     "key_depth_in": kd_ax, "key_width_in": key_width(grid, tb_ax, kd_ax)}

    def copy(self) -> Geometries:
        out = object.__new__(Geometries)
        out.__dict__.update(self.__dict__)
        out.col, out.axes = dict(self.col), dict(self.axes)
        return out

    def __contains__(self, name) -> bool:
        return name == "toe_ft" or name in self.col

    def column_of(self, idx):
        return np.asarray(idx) % self.ncol

    def take(self, name: str, idx):
        """Values of ``name`` at flat indices ``idx`` (an array or an int)."""
        if name == "toe_ft":
            return self.toe_axis[np.asarray(idx) // self.ncol]
        return self.col[name][np.asarray(idx) % self.ncol]

    def toe_chunks(self, n_toes: int = 4):
        """(toe slice, flat slice) pieces covering the grid, ``n_toes`` toes at a time."""
        for a in range(0, self.nt, n_toes):
            b = min(a + n_toes, self.nt)
            yield slice(a, b), slice(a * self.ncol, b * self.ncol)


def key_width(grid: SizingGrid, stem_base_in, key_depth_in):
    """The key's width, in: ``grid.key_width_in``, or the stem's base where that is 0 (the
    key under the stem, as wide as it: common practice); 0 where there is no key."""
    w = grid.key_width_in if grid.key_width_in > 0 else stem_base_in
    return np.where(np.asarray(key_depth_in) > 0, w, 0.0)


def with_embedment(g: Geometries, embedment_ft: float, footing_cover_ft: float) -> Geometries:
    """Each geometry's embedment: at least ``embedment_ft``, and deep enough that the top of
    footing lies ``footing_cover_ft`` below the front grade (the footing stays buried)."""
    g = g.copy()
    g.col["embedment_ft"] = np.maximum(embedment_ft, g.col["footing_thickness_in"] / 12.0
                                       + footing_cover_ft)
    g.axes["embedment_ft"] = np.maximum(
        embedment_ft, g.axes["footing_thickness_in"] / 12.0 + footing_cover_ft)
    return g


def axes_geometry(g, h, emb, fb, toes=slice(None)) -> SectionGeometry:
    """The grid (or the toes ``toes`` of it) as broadcasting axes (toe, heel, footing, stem,
    key; the key's front face under the stem's front face):
    the engine's functions then compute each term on the axes it depends on (much less work
    than on every element)."""
    a = g.axes
    return SectionGeometry(
        retained_height_ft=h, embedment_ft=a.get("embedment_ft", emb),
        footing_thickness_in=a["footing_thickness_in"], stem_top_in=a["stem_top_in"],
        stem_base_in=a["stem_base_in"], toe_ft=a["toe_ft"][toes], heel_ft=a["heel_ft"],
        key_width_in=a["key_width_in"], key_depth_in=a["key_depth_in"], freeboard_ft=fb)


def flat_of(x, shape) -> np.ndarray:
    return np.broadcast_to(x, shape).reshape(-1)


def grid_geometry(g, idx, h, emb, fb) -> SectionGeometry:
    if "embedment_ft" in g:
        emb = g.take("embedment_ft", idx)
    return SectionGeometry(
        retained_height_ft=h, embedment_ft=emb,
        footing_thickness_in=g.take("footing_thickness_in", idx),
        stem_top_in=g.take("stem_top_in", idx), stem_base_in=g.take("stem_base_in", idx),
        toe_ft=g.take("toe_ft", idx), heel_ft=g.take("heel_ft", idx),
        key_width_in=g.take("key_width_in", idx), key_depth_in=g.take("key_depth_in", idx),
        freeboard_ft=fb)


def as_column(geo: SectionGeometry) -> SectionGeometry:
    """The same sections as a column (n, 1), to broadcast against bar options (1, n_b)."""
    return SectionGeometry(**{k: np.asarray(getattr(geo, k))[..., None] if np.ndim(
        getattr(geo, k)) else getattr(geo, k) for k in (
        "retained_height_ft", "embedment_ft", "footing_thickness_in", "stem_top_in",
        "stem_base_in", "toe_ft", "heel_ft", "key_width_in", "key_depth_in", "key_offset_ft",
        "freeboard_ft")})
