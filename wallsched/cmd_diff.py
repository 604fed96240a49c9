"""``wallsched diff OLD_DIR NEW_DIR``: which segments changed between two runs, and by how much.

The rules are in the docstring of ``wallsched.exporters.diff``. Exit 0; with
``--fail-on-change``, exit 4 when anything changed (for scripts). Bad input raises
InputError, which the command group turns into one line and exit 2.
"""

from __future__ import annotations

import math
from pathlib import Path

import click

from .cautions import EPILOG
from .errors import InputError

EXIT_CHANGED = 4


def diff_output_path(new_dir: Path, out: Path | None, old_dir: Path | None = None) -> Path:
    """Where ``diff.csv`` goes: ``--out`` as a file, or inside it if it is a folder.

    ``--out`` may not name a file inside either compared run (it would overwrite what it
    compares), except ``NEW_DIR/diff.csv``, the default."""
    default = Path(new_dir) / "diff.csv"
    if out is None:
        return default
    out = Path(out)
    if out.is_dir() or str(out).endswith(("/", "\\")):
        if not out.is_dir():
            raise InputError("folder does not exist", file=out, where="--out")
        target = out / "diff.csv"
    else:
        parent = out.parent if str(out.parent) else Path(".")
        if not parent.is_dir():
            raise InputError(f"the parent folder {parent} does not exist", file=out,
                             where="--out")
        target = out
    full = target.resolve()
    if full == default.resolve():
        return target
    for run in (old_dir, new_dir):
        if run is None:
            continue
        root = Path(run).resolve()
        if full == root or root in full.parents:
            raise InputError(f"is inside the compared run {run}; writing there would change "
                             "what is compared - give a file outside both runs (without "
                             "--out: NEW_DIR/diff.csv)", file=out, where="--out")
    return target


@click.command(epilog=EPILOG)
@click.argument("old_dir", type=click.Path(path_type=Path))
@click.argument("new_dir", type=click.Path(path_type=Path))
@click.option("--out", "out", type=click.Path(path_type=Path), default=None,
              help="File for diff.csv, or a folder to write diff.csv in "
                   "(default: NEW_DIR/diff.csv).")
@click.option("--height-tol", "height_tol_ft", type=float, default=0.05, show_default=True,
              help="Retained-height difference, ft, above which a station range is changed.")
@click.option("--fail-on-change", is_flag=True,
              help=f"Exit {EXIT_CHANGED} when anything changed (for scripts).")
@click.option("-q", "--quiet", is_flag=True, help="Print nothing but errors.")
@click.pass_context
def diff(ctx: click.Context, old_dir: Path, new_dir: Path, out: Path | None,
         height_tol_ft: float, fail_on_change: bool, quiet: bool):
    """Compare two run folders and write diff.csv: segments added, removed and changed."""
    from .exporters.diff import diff_runs, write_diff

    if not (math.isfinite(height_tol_ft) and height_tol_ft >= 0):
        raise InputError(f"must be a number >= 0, got {height_tol_ft:g}", where="--height-tol")
    target = diff_output_path(new_dir, out, old_dir)
    result = diff_runs(old_dir, new_dir, height_tol_ft=height_tol_ft)
    try:
        write_diff(result, target)
    except OSError as exc:
        raise InputError(f"cannot be written ({exc.strerror}); choose another --out",
                         file=target) from None
    if not quiet:
        for line in result.summary_lines(extra=[f"wrote {target} ({len(result.rows)} rows)"]):
            click.echo(line)
    if fail_on_change and result.changed:
        ctx.exit(EXIT_CHANGED)
