"""The command line: ``wallsched stations|init ...`` (DESIGN.md section 6).

Exit codes: 0 done; 2 bad input or usage (one clear line, no traceback, nothing written);
3 outputs written but something could not be designed; 1 anything else (a bug).
"""

from __future__ import annotations

import sys
from pathlib import Path

import click

from . import __version__, allocator
from .cautions import EPILOG
from .errors import InputError
from .outdir import Stopped, install_signal_handlers, restore_signal_handlers


class WallGroup(click.Group):
    """Maps InputError (and a command's usage error) to one line on stderr and exit code 2."""

    def invoke(self, ctx):
        allocator.tune()
        handlers = install_signal_handlers()
        try:
            return super().invoke(ctx)
        except InputError as exc:
            click.echo(f"error: {exc.one_line()}", err=True)
            ctx.exit(2)
        except Stopped as exc:
            click.echo(f"error: stopped by {exc}; nothing was written (the output folder is "
                       "as it was)", err=True)
            ctx.exit(128 + exc.signum)
        except click.UsageError as exc:
            sub = exc.ctx.command_path if exc.ctx is not None else ctx.command_path
            text = " ".join(exc.format_message().split())
            click.echo(f"error: {text} (see '{sub} --help')", err=True)
            ctx.exit(2)
        finally:
            restore_signal_handlers(handlers)


@click.group(cls=WallGroup, epilog=EPILOG, context_settings={"help_option_names": ["-h", "--help"]})
@click.version_option(__version__, prog_name="wallsched")
def main():
    """Design cantilevered site retaining walls from grading profiles."""


def echo(text: str, quiet: bool) -> None:
    if not quiet:
        click.echo(text)


@main.command(epilog=EPILOG)
@click.argument("site_file", type=click.Path(dir_okay=False, path_type=Path))
@click.option("--out", "out_dir", required=True, type=click.Path(file_okay=False, path_type=Path),
              help="Output folder (written atomically; an old one is kept as DIR.prev).")
@click.option("--replace", is_flag=True, help="Replace the output folder instead of keeping .prev.")
@click.option("--no-plots", is_flag=True, help="Skip the PNG plots.")
@click.option("-q", "--quiet", is_flag=True, help="Print nothing but errors.")
@click.pass_context
def stations(ctx, site_file: Path, out_dir: Path, replace: bool, no_plots: bool, quiet: bool):
    """Sample every wall of SITE_FILE into stations: stations.csv and a plot per wall."""
    from .guardrails import site_warnings
    from .outdir import claim_output, staged_output
    from .pipeline import collect_warnings, site_stations, write_stations
    from .site import load_site

    site = load_site(site_file)
    claim_output(ctx, out_dir, protect=site.input_files(), replace=replace,
                 warn=lambda line: echo(f"warning: {line}", quiet))
    with collect_warnings() as warns:
        walls = site_stations(site)
    warns += site_warnings(site, walls)
    with staged_output(out_dir, replace=replace, protect=site.input_files(),
                       warn=lambda line: echo(f"warning: {line}", quiet)) as tmp:
        write_stations(walls, tmp, plots=not no_plots)
    for line in warns:
        echo(f"warning: {line}", quiet)
    for w in walls:
        echo(w.summary(), quiet)
    echo(f"wrote {out_dir}/stations.csv ({sum(len(w) for w in walls)} stations)", quiet)


@main.command(epilog=EPILOG)
@click.argument("folder", type=click.Path(file_okay=False, path_type=Path))
def init(folder: Path):
    """Write a small starter site (site file and CSV profiles) into FOLDER."""
    from importlib import resources

    try:
        folder.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        raise InputError(f"cannot create the folder ({exc.strerror}); choose another",
                         file=folder) from None
    files = [f for f in resources.files("wallsched").joinpath("starter").iterdir()
             if f.name.endswith((".toml", ".csv"))]
    clash = [f.name for f in files if (folder / f.name).exists()]
    if clash:
        raise InputError(f"already holds {', '.join(sorted(clash))}; choose an empty folder",
                         file=folder)
    written = []
    try:
        for f in sorted(files, key=lambda f: f.name):
            (folder / f.name).write_bytes(f.read_bytes())
            written.append(folder / f.name)
    except OSError as exc:
        for p in written:
            p.unlink(missing_ok=True)
        raise InputError(f"cannot write the starter files ({exc.strerror}); choose a "
                         "writable folder", file=folder) from None
    click.echo(f"wrote a starter site in {folder}: edit {folder}/site.toml (the soil values "
               "are placeholders that MUST be replaced from the geotechnical report), then run\n"
               f"  wallsched design {folder}/site.toml --out {folder}/out")


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())

from .cmd_diff import diff  # noqa: E402

main.add_command(diff)

from .cmd_section import section  # noqa: E402

main.add_command(section)

from .cmd_design import design  # noqa: E402

main.add_command(design)
