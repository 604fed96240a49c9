"""The pipeline: site file -> profile/ -> stations (-> engine/ -> exporters/ in later stages)."""

from __future__ import annotations

from pathlib import Path

from .profile.sampling import WallStations, sample_wall
from .profile.sources import read_alignment, read_grade
from .site import Site, WallSpec


def wall_stations(site: Site, wall: WallSpec) -> WallStations:
    """Read one wall's alignment and grades and sample them into stations."""
    alignment = read_alignment(wall.alignment, site.folder)
    kw = dict(alignment=alignment, start_station_ft=wall.start_station_ft,
              retained_side=wall.retained_side)
    retained = read_grade(wall.retained_grade, site.folder, **kw)
    front = read_grade(wall.front_grade, site.folder, **kw)
    existing = (read_grade(wall.existing_ground, site.folder, **kw)
                if wall.existing_ground is not None else None)
    c = wall.criteria
    return sample_wall(wall.id, alignment, wall.start_station_ft, retained, front, existing,
                       interval_ft=c["station_interval_ft"],
                       tolerance_ft=c["coverage_tolerance_ft"])


def site_stations(site: Site) -> list[WallStations]:
    """Every wall of the site, in site-file order."""
    return [wall_stations(site, w) for w in site.walls]


def write_stations(walls: list[WallStations], out: Path, *, plots: bool = True) -> list[Path]:
    """``stations.csv`` for the whole site and one profile PNG per wall, into ``out``."""
    import pandas as pd

    from .exporters.plots import plot_stations
    from .exporters.tables import write_csv

    frame = pd.concat([w.to_frame() for w in walls], ignore_index=True)
    written = [out / "stations.csv"]
    write_csv(frame, written[0])
    if plots:
        for w in walls:
            p = out / f"{safe_name(w.wall)}-profile.png"
            plot_stations(w, p)
            written.append(p)
    return written


def safe_name(wall_id: str) -> str:
    """A file-name-safe form of a wall id (never a path)."""
    keep = "".join(c if c.isalnum() or c in "-_." else "_" for c in wall_id)
    return keep.strip(".") or "wall"
