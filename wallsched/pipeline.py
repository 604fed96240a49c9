"""The pipeline: site file -> profile/ -> stations (-> engine/ -> exporters/ in later stages)."""

from __future__ import annotations

from pathlib import Path

from .profile.sampling import WallStations, sample_wall
from .profile.sources import read_alignment, read_grade
from .site import Site, WallSpec


def wall_stations(site: Site, wall: WallSpec) -> WallStations:
    """Read one wall's alignment and grades and sample them into stations."""
    alignment = read_alignment(wall.alignment, site.folder)
    start = wall.start_station_ft
    if start is None:  # the alignment's own start station (LandXML staStart), else 0
        start = getattr(alignment, "start_station_ft", None)
    start = 0.0 if start is None else float(start)
    kw = dict(alignment=alignment, start_station_ft=start,
              retained_side=wall.retained_side)
    retained = read_grade(wall.retained_grade, site.folder, **kw)
    front = read_grade(wall.front_grade, site.folder, **kw)
    existing = (read_grade(wall.existing_ground, site.folder, **kw)
                if wall.existing_ground is not None else None)
    c = wall.criteria
    return sample_wall(wall.id, alignment, start, retained, front, existing,
                       interval_ft=c["station_interval_ft"],
                       tolerance_ft=c["coverage_tolerance_ft"])


def site_stations(site: Site) -> list[WallStations]:
    """Every wall of the site, in site-file order."""
    return [wall_stations(site, w) for w in site.walls]


def write_stations(walls: list[WallStations], out: Path, *, plots: bool = True) -> list[Path]:
    """``stations.csv`` for the whole site and one profile PNG per wall, into ``out``."""
    import pandas as pd

    from .exporters.file_names import wall_file_stems
    from .exporters.plots import plot_stations
    from .exporters.tables import write_csv

    frame = pd.concat([w.to_frame() for w in walls], ignore_index=True)
    written = [out / "stations.csv"]
    write_csv(frame, written[0])
    if plots:
        stems = wall_file_stems(w.wall for w in walls)
        for w in walls:
            p = out / f"{stems[w.wall]}-profile.png"
            plot_stations(w, p)
            written.append(p)
    return written


class collect_warnings:  # noqa: N801 - used as a context manager
    """Collect the readers' warnings (e.g. labels off the wall) as text lines."""

    def __enter__(self) -> list[str]:
        import warnings

        self._cm = warnings.catch_warnings(record=True)
        self._rec = self._cm.__enter__()
        warnings.simplefilter("always")
        self.lines: list[str] = []
        return self.lines

    def __exit__(self, *exc) -> None:
        from .profile.core import ProfileWarning

        self._cm.__exit__(*exc)
        for w in self._rec:
            if issubclass(w.category, ProfileWarning):
                self.lines.append(" ".join(str(w.message).split()))
        return None


def wall_summary(w) -> str:
    """One line per designed wall: length, segments, max height, concrete, steel, cost."""
    import math

    segs = w.segments
    if not segs:
        return f"{w.wall}: no wall needed (retained height below the minimum everywhere)"
    length = sum(s.length_ft for s in segs)
    hmax = max(s.retained_height_max_ft for s in segs)
    cy = sum(s.concrete_cy for s in segs if math.isfinite(s.concrete_cy))
    lb = sum(s.steel_lb for s in segs if math.isfinite(s.steel_lb))
    usd = sum(s.cost_usd for s in segs if math.isfinite(s.cost_usd))
    bad = [s for s in segs if not s.ok]
    marks = sorted({s.mark for s in segs if s.mark}, key=lambda m: (len(m), m))
    text = (f"{w.wall}: {length:.1f} ft in {len(segs)} segments (marks {', '.join(marks)}), "
            f"max retained height {hmax:.2f} ft, {cy:.1f} CY concrete, {lb:,.0f} lb steel, "
            f"${usd:,.0f} (illustrative unit costs)")
    if bad:
        text += f"; {len(bad)} segment(s) FAIL: " + "; ".join(
            f"{s.segment} {s.status}" for s in bad[:3])
    return text


def profile_tasks(walls: list[WallStations], out: Path) -> list:
    """One task per wall writing its profile plot (``<stem>-profile.png``) into ``out``: they
    need only the sampled stations, so ``wallsched design`` runs them beside the design."""
    from .exporters.file_names import wall_file_stems
    from .exporters.plots import plot_stations
    from .parallel import Task

    stems = wall_file_stems(w.wall for w in walls)
    return [Task("profile plot", lambda w=w: plot_stations(w, out / f"{stems[w.wall]}-profile.png"))
            for w in walls]


def write_design(site, sd, out: Path, *, drawings: bool = True, compare_dir=None,
                 stages=None, profiles=None) -> list[str]:
    """Every output of ``wallsched design`` into ``out``; returns the summary lines.

    ``stages`` (a ``wallsched.stages.Stages``) times each output and shows the progress;
    ``profiles`` (a ``wallsched.parallel.Background`` running :func:`profile_tasks`), when
    given, writes the profile plots instead of the drawing tasks, and is waited for here."""
    from .basis import run_info
    from .parallel import Task, run_tasks
    from .stages import QUIET

    stages = stages or QUIET
    run = run_info(site)
    write_stations, write_tables, write_workbook = table_writers(run, sd, out)
    lines = [wall_summary(w) for w in sd.walls]
    d, tasks = None, []
    book_weight = 1.0 + len(sd.bars) / 1e3
    if compare_dir is not None:  # the comparison reads the tables back first
        with stages.stage("writing tables"):
            write_stations()
            schedule = write_tables()
        d = compare_runs(out, compare_dir, stages)
        lines += d.summary_lines()
        tasks.append(Task("workbook", lambda: write_workbook(schedule), weight=book_weight))
    else:  # the tables (the workbook with them) and the long stations table beside the drawings
        tasks.append(Task("writing tables", lambda: write_workbook(write_tables()),
                          weight=book_weight + 0.5))
        tasks.append(Task("stations table", write_stations,
                          weight=1.0 + sum(len(w.stations) for w in sd.walls) / 2e3))
    tasks += output_tasks(run, sd, out, diff=d, drawings=drawings,
                          drawing=getattr(site, "drawing", None),
                          profile_plots=profiles is None)
    with stages.items("drawings and calc package", len(tasks), "outputs") as tick:
        spent = run_tasks(tasks, progress=tick)
    if profiles is not None:
        spent.update(profiles.finish())
    for name, dt in spent.items():  # the time each kind of output took, summed over workers
        stages.times_s[name] = stages.times_s.get(name, 0.0) + dt
    return lines


def table_writers(run, sd, out: Path):
    """(stations, tables, workbook): the writers of ``stations.csv``; of ``schedule.csv``,
    ``rebar.csv``, ``barlist.csv`` and ``run.json`` (returning the schedule as written); and of
    ``schedule.xlsx`` from that schedule."""
    from .exporters.barlist import write_barlist_csv
    from .exporters.rebar import write_rebar_csv
    from .exporters.schedule import (
        run_record,
        stations_frame,
        write_run_json,
        write_schedule,
        write_xlsx,
    )
    from .exporters.tables import FLOAT_FORMAT, write_csv

    def write_stations() -> None:
        write_csv(stations_frame(sd.walls), out / "stations.csv")

    def write_tables():
        schedule = write_schedule(sd.walls, out, sd.warnings)
        write_rebar_csv(sd.bars, out / "rebar.csv", float_format=FLOAT_FORMAT)
        if sd.barlist is not None:
            write_barlist_csv(sd.barlist, out / "barlist.csv", float_format=FLOAT_FORMAT)
        write_run_json(run_record(run, sd, schedule), out / "run.json")
        return schedule

    def write_workbook(schedule) -> None:
        write_xlsx(schedule, sd.bars, sd.quantity_totals, out / "schedule.xlsx", run.site_name,
                   barlist=sd.barlist)

    return write_stations, write_tables, write_workbook


def compare_runs(out: Path, compare_dir: Path, stages):
    """``diff.csv`` of the run written in ``out`` against the one in ``compare_dir``; returns
    the comparison (``exporters.compare.RunDiff``)."""
    from .exporters.diff import RunTables, diff_tables, read_run, write_diff

    with stages.stage("comparing"):
        # the new run as written (the same rounding as the earlier run's files), so that an
        # unchanged wall compares equal
        written = read_run(out)
        d = diff_tables(read_run(compare_dir), RunTables(written.schedule, written.stations,
                                                         None))
        write_diff(d, out / "diff.csv")
    return d


def output_tasks(run, sd, out: Path, *, diff=None, drawings: bool = True, drawing=None,
                 profile_plots: bool = True):
    """The outputs that do not depend on one another: the calc package and, with
    ``drawings``, each wall's drawings and plots (``wallsched.parallel`` runs them; the
    profile plots only with ``profile_plots``)."""
    from .exporters.report import write_report
    from .parallel import Task

    tasks = [Task("calc package", lambda: write_report(run, sd, out / "report.pdf", diff=diff),
                  weight=float(sum(len(w.segments) for w in sd.walls)) + 1.0)]
    if drawings:
        from .exporters.file_names import wall_file_stems

        stems = wall_file_stems(w.wall for w in sd.walls)
        for w in sd.walls:
            # a wall's DXF and its plots are two tasks: finer pieces leave less of a tail
            # where one worker finishes alone
            for part in WALL_DRAWING_PARTS:
                tasks.append(Task("drawing", lambda w=w, part=part: write_wall_drawings(
                    run, w, out, stems[w.wall], diff=diff, drawing=drawing,
                    profile=profile_plots, parts=(part,)),
                    weight=WALL_DRAWING_PARTS[part] * (1.0 + len(w.stations) / 1e3)))
    return tasks


WALL_DRAWING_PARTS = {"dxf": 1.0, "plots": 2.0}  # a part's rough cost against the other


def write_wall_drawings(run, w, out: Path, stem: str, *, diff=None, drawing=None,
                        profile: bool = True, parts=tuple(WALL_DRAWING_PARTS)) -> None:
    """One wall's DXF elevation (part ``"dxf"``) and its plots (part ``"plots"``: the profile
    plot with ``profile``, the design plots), into files named by ``stem`` (the wall's safe,
    unique file stem); with ``diff`` (a RunDiff against an earlier run) a changed wall's DXF
    gets a revision cloud around every changed range."""
    from .exporters.design_plots import write_design_plots
    from .exporters.dxf_elevation import write_elevation_dxf
    from .exporters.plots import plot_stations

    name = stem
    if profile and "plots" in parts:
        plot_stations(w.stations, out / f"{name}-profile.png")
    if not w.segments:
        return
    dr = dict(drawing or {})
    if "dxf" in parts:
        revisions = diff.changed_station_ranges(w.wall) if diff is not None else None
        write_elevation_dxf(w, out / f"{name}-elevation.dxf", input_hash=run.hash_text,
                            site_name=run.site_name, revisions=revisions,
                            vertical_exaggeration=dr.get("vertical_exaggeration") or 2.0,
                            sheet_size=dr.get("sheet_size") or "ARCH D",
                            label_interval_ft=dr.get("label_interval_ft") or 50.0,
                            date=dr.get("date") or "", revision=dr.get("revision") or "")
    if "plots" in parts:
        write_design_plots(w, out, stem=name,
                           label_interval_ft=dr.get("label_interval_ft") or 50.0)
