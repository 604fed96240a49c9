"""From the validated site to the engine's design stage (``engine/site_design.py``): every
wall's inputs, criteria and stations as the engine takes them, the sizing grid and the costs."""

from __future__ import annotations

from collections.abc import Sequence
from pathlib import Path

from .engine.model import PreviousRun, SiteDesign
from .engine.section import DesignInputs
from .engine.site_design import design_site as design_walls
from .engine.sizing import CostRates, SizingGrid
from .engine.wall_design import WallToDesign
from .errors import InputError
from .profile.sampling import WallStations
from .site import Site, WallSpec


def wall_inputs(site: Site, wall: WallSpec) -> DesignInputs:
    try:
        return DesignInputs.from_tables(wall.soil, wall.loads, wall.materials, wall.criteria)
    except ValueError as exc:  # cross-key rules are checked at load time; this is a backstop
        raise InputError(str(exc), file=site.path.name, where=f"wall {wall.id!r}") from None


def walls_to_design(site: Site, walls_stations: Sequence[WallStations]) -> list[WallToDesign]:
    """Every wall of the site with its stations, as the design stage takes them."""
    return [WallToDesign(wall=w.id, name=w.name, retained_side=w.retained_side,
                         inputs=wall_inputs(site, w), criteria=w.criteria, stations=ws)
            for w, ws in zip(site.walls, walls_stations, strict=True)]


SECTION_COLUMNS = ("stem_top_in", "stem_base_in", "footing_thickness_in", "toe_ft", "heel_ft",
                   "key_width_in", "key_depth_in", "key_offset_ft")
BAR_COLUMNS = ("stem_bars", "heel_bars", "toe_bars", "horizontal_bars", "footing_long_bars")


def _hooked_footing_bars(path: Path) -> dict:
    """(wall, segment) -> (heel bars hooked, toe bars hooked), read from an earlier run's
    placing list (``rebar.csv``: marks F1 heel and F2 toe, shape other than straight), so that
    a kept section is the same section, anchorage included; empty without the file."""
    import pandas as pd

    try:
        bars = pd.read_csv(path, dtype={"wall": str, "segment": str, "mark": str,
                                        "shape": str})
    except (OSError, ValueError, pd.errors.ParserError):
        return {}
    if not {"wall", "segment", "mark", "shape"} <= set(bars.columns):
        return {}
    out: dict = {}
    for r in bars.itertuples(index=False):
        if r.mark not in ("F1", "F2"):
            continue
        heel, toe = out.get((r.wall, r.segment), (False, False))
        bent = str(r.shape).strip().upper() not in ("STR", "")
        out[(r.wall, r.segment)] = (heel or (r.mark == "F1" and bent),
                                    toe or (r.mark == "F2" and bent))
    return out


def previous_run(folder: Path) -> PreviousRun | None:
    """The section marks and segments of an earlier run folder (its ``schedule.csv``), for a
    revision that keeps them; None for a run without marks."""
    import math

    import pandas as pd

    from .engine.bars import parse_bars
    from .engine.model import SectionDims

    path = folder / "schedule.csv"
    try:
        frame = pd.read_csv(path, dtype={"mark": str, "segment": str, "wall": str})
    except (OSError, ValueError, pd.errors.ParserError) as exc:
        raise InputError(f"cannot be read as a schedule ({exc})", file=path,
                         where="--compare") from None
    need = {"wall", "segment", "mark", "station_start_ft", "station_end_ft", *SECTION_COLUMNS,
            *BAR_COLUMNS}
    if not need <= set(frame.columns):
        return None
    hooked = _hooked_footing_bars(folder / "rebar.csv")
    marks: dict = {}
    segments = []
    for r in frame.itertuples(index=False):
        if not isinstance(r.mark, str) or not r.mark.strip():
            continue
        try:
            dims = {c: float(getattr(r, c)) for c in SECTION_COLUMNS}
            bars = {c: parse_bars(str(getattr(r, c))) for c in BAR_COLUMNS}
        except ValueError:
            continue  # a segment without a section (failing): nothing to keep
        if not all(math.isfinite(v) for v in dims.values()):
            continue
        heel_h, toe_h = hooked.get((str(r.wall), str(r.segment)), (False, False))
        sec = SectionDims(**dims, footing_long_bars=bars.pop("footing_long_bars"), **bars,
                          heel_hooked=heel_h, toe_hooked=toe_h)
        marks.setdefault(r.mark, sec)
        segments.append((str(r.wall), str(r.segment), float(r.station_start_ft),
                         float(r.station_end_ft), r.mark))
    return PreviousRun(marks=marks, segments=tuple(segments)) if marks else None


def design_site(site: Site, walls_stations: Sequence[WallStations], *, audit: bool = True,
                progress=None, previous: PreviousRun | None = None) -> SiteDesign:
    """Design every wall of the site, groups of walls side by side in worker processes
    (``wallsched.parallel``; the result does not depend on how many); ``previous``: an
    earlier run this one revises."""
    from .parallel import fork_imap, worker_count

    walls = walls_to_design(site, walls_stations)
    workers = worker_count(len(walls))
    return design_walls(walls, SizingGrid.from_table(site.sizing),
                        CostRates.from_table(site.costs), audit=audit, progress=progress,
                        map_fn=lambda fn, groups: fork_imap(fn, groups, workers=workers),
                        chunks=1 if workers <= 1 else 2 * workers, previous=previous)
