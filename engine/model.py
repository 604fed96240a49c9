"""The engine's results as the exporters receive them: the site design, its walls, segments,
sections, joints, bar list, quantities, per-station results and the governing case of every
section mark.

Plain dataclasses; the engine fills them, the exporters draw and tabulate them as-is (this is
the one engine module the exporters import). Elevations in ft; section dimensions in the units
their names say.
"""

from __future__ import annotations

import math
import re
from collections.abc import Mapping
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Protocol

import numpy as np

from .bars import BarSpec
from .status import OK, Status, StatusCode  # noqa: F401 - StatusCode: for the exporters

if TYPE_CHECKING:
    import pandas as pd

    from .checks import SectionChecks
    from .pressure import Thrust
    from .section import DesignInputs, SectionGeometry, Weights


def natural_key(text: str) -> tuple:
    """Sort key of marks and ids: digit runs read as numbers, letter runs by length first
    (A ... Z, AA ...): ``W1-2 < W1-10``, ``Z < AA``."""
    parts = re.findall(r"\d+|[^\d]+", str(text))
    out = []
    for p in parts:
        if p.isdigit():
            out.append((0, int(p), ""))
        else:
            out.append((1, len(p) if p.isalpha() else 0, p))
    return tuple(out)


REBAR_COLUMNS = ["wall", "segment", "mark", "size", "spacing_in", "count", "length_ft", "shape",
                 "weight_lb"]


class StationSeries(Protocol):
    """The sampled stations of one wall as the engine reads them (``profile.WallStations``)."""

    wall: str
    station_ft: np.ndarray
    retained_grade_ft: np.ndarray
    front_grade_ft: np.ndarray
    existing_ground_ft: np.ndarray

    @property
    def retained_height_ft(self) -> np.ndarray: ...

    def __len__(self) -> int: ...


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
    heel_hooked: bool = False  # heel top bars hooked at the toe end (straight does not fit)
    toe_hooked: bool = False  # toe bottom bars hooked at the heel end

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
                str(self.horizontal_bars), str(self.footing_long_bars), self.heel_hooked,
                self.toe_hooked)


@dataclass(frozen=True)
class PreviousRun:
    """What a revision keeps of an earlier run (``--compare``): its section marks (letter ->
    section) and its segments as (wall, segment id, first station, last station, mark)."""

    marks: Mapping[str, SectionDims]
    segments: tuple[tuple[str, str, float, float, str], ...] = ()


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
    governing_check: str = ""  # the stability or strength check of the largest ratio
    governing_station_ft: float = math.nan
    governing_ratio: float = math.nan  # that check's ratio at the governing station
    detailing_at_limit: str = ""  # detailing rows at their limits, space-separated
    concrete_cy: float = math.nan
    steel_lb: float = math.nan
    formwork_sf: float = math.nan
    excavation_cy: float = math.nan
    backfill_cy: float = math.nan
    cost_usd: float = math.nan
    status: Status = OK  # prints "ok" when every check passes, else "code: reason"
    top_of_wall_start_ft: float = math.nan  # top of wall at the segment ends (for drawing)
    top_of_wall_end_ft: float = math.nan
    audited_station_ft: tuple[float, ...] = ()  # stations the scalar audit re-checked

    @property
    def length_ft(self) -> float:
        return self.station_end_ft - self.station_start_ft

    @property
    def ok(self) -> bool:
        return self.status == OK


@dataclass(frozen=True)
class WallDesign:
    """Everything designed for one wall."""

    wall: str
    name: str | None
    retained_side: str
    stations: StationSeries
    segments: tuple[Segment, ...]
    joints: tuple[Joint, ...]
    station_segment: np.ndarray  # index into segments per station, -1 where no wall is needed
    station_utilization: np.ndarray  # largest check ratio per station (NaN where no wall)
    station_governing: tuple[str, ...]  # governing check per station ("" where no wall)
    station_status: tuple[Status, ...]  # "ok", "no_wall: ...", or a failing code
    # check name -> ratio per station (NaN where the station has no checked section)
    station_checks: Mapping[str, np.ndarray] = field(default_factory=dict)
    bars: pd.DataFrame | None = None  # the bar list (REBAR_COLUMNS), one row per segment and mark
    quantities: pd.DataFrame | None = None  # one row per segment (engine.quantities)
    details: Mapping[str, SectionDetail] = field(default_factory=dict)  # per section mark
    bending: pd.DataFrame | None = None  # this wall's rows of the bending schedule (its counts)
    # the segments' objective ($: section cost per ft x length + steps) of the least-cost
    # segments with every section of the design table, and of the segments with its marks
    least_cost_usd: float = math.nan
    plan_cost_usd: float = math.nan

    @property
    def stations_checked(self) -> int:
        """Stations inside a segment (every one checked by the vectorized engine)."""
        return int(np.count_nonzero(np.asarray(self.station_segment) >= 0))

    @property
    def stations_audited(self) -> int:
        """Distinct stations the independent scalar audit re-checked (segment ends are shared)."""
        return len({st for s in self.segments for st in s.audited_station_ft})

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


@dataclass(frozen=True)
class BarDetail:
    """One set of bars as a drawing places it: the bars, their nominal diameter, the clear
    cover to a formed face for their size and the tail of their 90-degree standard hook."""

    bars: BarSpec
    diameter_in: float
    formed_cover_in: float
    hook_tail_in: float


@dataclass(frozen=True)
class SectionDetail:
    """The bars of one section mark with the covers that place them (engine/detailing.py)."""

    stem: BarDetail | None
    heel: BarDetail | None
    toe: BarDetail | None
    horizontal: BarDetail | None
    longitudinal: BarDetail | None
    earth_cover_in: float  # bottom of the footing, cast against earth
    top_cover_in: float  # top of the footing


@dataclass(frozen=True)
class GoverningCase:
    """One section mark checked at its governing station: the station of the largest check
    ratio of the most-utilised segment with this mark (a failing segment first), with every
    weight, thrust and check behind the numbers."""

    mark: str
    wall: str
    segment: Segment
    station_ft: float
    retained_grade_ft: float
    front_grade_ft: float
    top_of_wall_ft: float
    geometry: SectionGeometry  # scalar
    inputs: DesignInputs
    checks: SectionChecks  # scalar
    weights: Weights
    thrust: Thrust
    heel_load_psf: float  # factored downward load on the heel, level-backfill form
    segments: tuple[tuple[str, Segment], ...]  # every (wall id, segment) with this mark

    @property
    def result(self) -> dict:
        return self.checks.to_dict(())

    @property
    def passes(self) -> bool:
        return bool(self.checks.passes)


@dataclass
class SiteDesign:
    """Every wall designed, with the governing case of every section mark, the site's bar list
    and quantity totals, and the inputs behind them."""

    walls: tuple[WallDesign, ...]
    cases: Mapping[str, GoverningCase]  # section mark -> its case, marks in natural order
    inputs: Mapping[str, DesignInputs]  # wall id -> its inputs
    bars: pd.DataFrame  # every wall's bar list (REBAR_COLUMNS), possibly empty
    quantity_totals: pd.DataFrame | None  # per wall and the site; None without segments
    barlist: pd.DataFrame | None = None  # bending schedule, one row per bar mark (engine.bending)
    load_factors: tuple[str, ...] = ()
    warnings: list[str] = field(default_factory=list)
    audit_rule: str = ""  # which stations the scalar audit re-checked ("" when not audited)

    @property
    def ok(self) -> bool:
        return all(w.ok for w in self.walls) and all(
            not s.failing for w in self.walls for s in w.station_status)
