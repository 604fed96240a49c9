"""The designed wall as the exporters receive it: sections, segments, joints, per-station results.

Plain frozen dataclasses; the engine fills them, the exporters draw and tabulate them as-is.
Elevations in ft; section dimensions in the units their names say.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from .bars import BarSpec


@dataclass(frozen=True)
class SectionDims:
    """One cantilever cross-section (DESIGN.md section 3 words)."""

    stem_top_in: float
    stem_base_in: float
    footing_thickness_in: float
    toe_ft: float
    heel_ft: float
    key_width_in: float = 0.0
    key_depth_in: float = 0.0
    key_offset_ft: float = 0.0  # toe edge to the key's front face
    batter_face: str = "back"
    stem_bars: BarSpec | None = None  # vertical, earth face, hooked into the footing
    heel_bars: BarSpec | None = None  # top of footing under the heel
    toe_bars: BarSpec | None = None  # bottom of footing under the toe
    horizontal_bars: BarSpec | None = None  # stem horizontal, each face
    footing_long_bars: BarSpec | None = None  # footing longitudinal (temperature), each mat

    @property
    def footing_width_ft(self) -> float:
        return self.toe_ft + self.stem_base_in / 12.0 + self.heel_ft

    @property
    def has_key(self) -> bool:
        return self.key_width_in > 0 and self.key_depth_in > 0

    def signature(self) -> tuple:
        """What makes two sections the same mark."""
        return (self.stem_top_in, self.stem_base_in, self.footing_thickness_in, self.toe_ft,
                self.heel_ft, self.key_width_in, self.key_depth_in, self.key_offset_ft,
                self.batter_face, str(self.stem_bars), str(self.heel_bars), str(self.toe_bars),
                str(self.horizontal_bars), str(self.footing_long_bars))


@dataclass(frozen=True)
class Joint:
    """A vertical joint in the wall at ``station_ft``: ``"contraction"`` or ``"expansion"``."""

    station_ft: float
    kind: str


@dataclass(frozen=True)
class Segment:
    """Consecutive stations sharing one section, one level footing and one top of wall."""

    wall: str
    segment: str  # id, e.g. "W1-03"
    mark: str  # section mark, e.g. "A"; shared by segments with the same section
    station_start_ft: float
    station_end_ft: float
    retained_height_max_ft: float
    top_of_wall_ft: float  # NaN when the top follows the grade
    top_of_footing_ft: float
    bottom_of_footing_ft: float
    section: SectionDims | None  # None where no section within the limits holds
    design_height_ft: float  # the envelope retained height the section was sized for
    fs_overturning: float = math.nan  # least over the segment's stations
    fs_sliding: float = math.nan
    q_max_psf: float = math.nan  # largest over the segment's stations
    utilization_max: float = math.nan
    governing_check: str = ""
    governing_station_ft: float = math.nan
    concrete_cy: float = math.nan
    steel_lb: float = math.nan
    formwork_sf: float = math.nan
    excavation_cy: float = math.nan
    backfill_cy: float = math.nan
    cost_usd: float = math.nan
    status: str = "ok"  # exactly "ok" when every check passes, else "code: reason"
    top_of_wall_start_ft: float = math.nan  # top of wall at the segment ends (for drawing)
    top_of_wall_end_ft: float = math.nan

    @property
    def length_ft(self) -> float:
        return self.station_end_ft - self.station_start_ft

    @property
    def ok(self) -> bool:
        return self.status == "ok"


@dataclass(frozen=True)
class WallDesign:
    """Everything designed for one wall."""

    wall: str
    name: str | None
    retained_side: str
    stations: object  # wallsched.profile.WallStations (kept untyped: engine knows no files)
    segments: tuple[Segment, ...]
    joints: tuple[Joint, ...]
    station_segment: np.ndarray  # index into segments per station, -1 where no wall is needed
    station_utilization: np.ndarray  # largest check ratio per station (NaN where no wall)
    station_governing: tuple[str, ...]  # governing check per station ("" where no wall)
    station_status: tuple[str, ...]  # "ok", "no_wall: ...", or a failing code
    extra: dict = field(default_factory=dict)

    @property
    def ok(self) -> bool:
        return all(s.ok for s in self.segments)

    def marks(self) -> dict[str, SectionDims]:
        """Section mark -> section, in first-use order."""
        out: dict[str, SectionDims] = {}
        for s in self.segments:
            if s.section is not None and s.mark not in out:
                out[s.mark] = s.section
        return out
