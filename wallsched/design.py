"""From the validated site to the engine's design stage (``engine/site_design.py``): every
wall's inputs, criteria and stations as the engine takes them, the sizing grid and the costs."""

from __future__ import annotations

from collections.abc import Sequence

from .engine.model import SiteDesign
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


def design_site(site: Site, walls_stations: Sequence[WallStations], *, audit: bool = True,
                progress=None) -> SiteDesign:
    """Design every wall of the site, groups of walls side by side in worker processes
    (``wallsched.parallel``; the result does not depend on how many)."""
    from .parallel import fork_imap, worker_count

    walls = walls_to_design(site, walls_stations)
    workers = worker_count(len(walls))
    return design_walls(walls, SizingGrid.from_table(site.sizing),
                        CostRates.from_table(site.costs), audit=audit, progress=progress,
                        map_fn=lambda fn, groups: fork_imap(fn, groups, workers=workers),
                        chunks=1 if workers <= 1 else 2 * workers)
