"""``wallsched design SITE.toml --out DIR``: the main job."""

from __future__ import annotations

from pathlib import Path

import click

from .cautions import CAUTIONS, EPILOG


def _warn(quiet: bool):
    return lambda line: None if quiet else click.echo(f"warning: {line}")


@click.command(epilog=EPILOG)
@click.argument("site_file", type=click.Path(dir_okay=False, path_type=Path))
@click.option("--out", "out_dir", required=True, type=click.Path(file_okay=False, path_type=Path),
              help="Output folder (written atomically; an old one is kept as DIR.prev).")
@click.option("--compare", "compare_dir", type=click.Path(file_okay=False, path_type=Path),
              help="An earlier run folder: keep its sections, mark letters and segment ids "
                   "where they still serve, and write the diff against it.")
@click.option("--replace", is_flag=True, help="Replace the output folder instead of keeping .prev.")
@click.option("--no-drawings", is_flag=True, help="Skip the DXF drawings and the plots.")
@click.option("-q", "--quiet", is_flag=True, help="Print nothing but errors.")
@click.pass_context
def design(ctx, site_file: Path, out_dir: Path, compare_dir: Path | None, replace: bool,
           no_drawings: bool, quiet: bool):
    """Design every wall of SITE_FILE: schedule, stations, bar list, drawings, run record.

    Exit 0 when every segment passes every check, 3 when outputs were written but some
    stretch could not be designed within the limits (see the status column).
    """
    from .budget import check_budget
    from .design import design_site, previous_run
    from .guardrails import plain_key_warnings, site_warnings
    from .outdir import claim_output, staged_output
    from .parallel import Background
    from .pipeline import collect_warnings, profile_tasks, site_stations, write_design
    from .site import load_site
    from .stages import Stages, progress_wanted

    stages = Stages(show=progress_wanted(quiet))
    with stages.stage("reading"):
        site = load_site(site_file)
    claim_output(ctx, out_dir, protect=site.input_files(), replace=replace, warn=_warn(quiet))
    with stages.stage("sampling", f"{len(site.walls)} walls"), collect_warnings() as warns:
        walls = site_stations(site)
    check_budget(site, walls)  # refused before the design allocates what it cannot have
    if compare_dir is not None:
        from .errors import InputError

        if not (compare_dir / "schedule.csv").is_file():
            raise InputError("is not a wallsched run folder (no schedule.csv)", file=compare_dir,
                             where="--compare")
    previous = None if compare_dir is None else previous_run(compare_dir)
    n = sum(len(w) for w in walls)
    # the output folder is staged before the design, so that the profile plots (they need
    # only the stations) are drawn beside it; a failing design leaves nothing behind
    with staged_output(out_dir, replace=replace, protect=site.input_files(),
                       warn=_warn(quiet)) as tmp, \
            Background([] if no_drawings else profile_tasks(walls, tmp)) as profiles:
        with stages.items("designing", len(walls), f"walls ({n} stations)") as tick:
            sd = design_site(site, walls, progress=tick, previous=previous)
        sd.warnings.extend(warns)
        sd.warnings.extend(site_warnings(site, walls))
        sd.warnings.extend(plain_key_warnings(sd))
        summary = write_design(site, sd, tmp, drawings=not no_drawings, compare_dir=compare_dir,
                               stages=stages, profiles=None if no_drawings else profiles)
    stages.write_times()
    if not quiet:
        for line in sd.warnings:
            click.echo(f"warning: {line}")
        for line in summary:
            click.echo(line)
        click.echo(f"wrote {out_dir}/")
        click.echo("CAUTION: " + CAUTIONS[0] + " " + CAUTIONS[2])
    if not sd.ok:
        if not quiet:
            click.echo("some segments could not be designed within the limits: see the status "
                       "column of schedule.csv (exit 3)", err=True)
        ctx.exit(3)
