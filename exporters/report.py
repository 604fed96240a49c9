"""The calc package for the reviewer: ``report.pdf`` (fpdf2, real extractable text).

Contents, in order: cover and design basis (site, date, version, input files with SHA-256, the
resolved soil, loads, materials and criteria per wall with where each value comes from, the
cautions); a site summary (walls, segments, heights, quantities, the most-utilised check per
wall, every segment with its factors of safety and status); one page or more per section mark,
worked at the mark's governing station (a dimensioned cross-section sketch, the station's
grades, every weight and lateral force with its arm, every check as formula -> numbers ->
result with its ratio and clause); the bar list; with a comparison run, the revision summary.
Page numbers and a contents list.

Nothing is computed here: the governing case of every section mark (its station, geometry,
weights, thrust, checks, heel load and stress blocks) is the engine's
(``SiteDesign.cases``, ``engine/governing.py``), the design basis rows and input hashes come
in the run information (``RunInfo``), and the numbers printed are theirs. A failing segment or
check is printed as failing.
"""

from __future__ import annotations

import datetime as _dt
import functools
from pathlib import Path

from . import report_chapters as ch
from .report_checks import CheckText, check_texts
from .report_pdf import Writer, make_pdf, render_toc, toc_pages

__all__ = ["CheckText", "check_texts", "write_report"]


def write_report(run, sd, path, *, diff=None, date: _dt.date | None = None) -> Path:
    """Write the calc package to ``path`` (``report.pdf``); returns the path.

    ``run`` is the :class:`~.run_info.RunInfo`, ``sd`` the engine's ``SiteDesign``; ``diff``
    is a :class:`~wallsched.exporters.diff.RunDiff` against an earlier run (its summary
    becomes the last chapter); ``date`` defaults to today.
    """
    path = Path(path)
    date = date or _dt.date.today()
    version = run.version
    pdf = make_pdf(run.site_name, version)
    pdf.set_title(f"{run.site_name} - retaining wall calculations")
    pdf.set_author("wallsched " + version)
    pdf.set_creator("wallsched " + version)
    pdf.set_creation_date(_dt.datetime(date.year, date.month, date.day,
                                       tzinfo=_dt.UTC))
    wr = Writer(pdf)
    ch.cover(wr, run, sd, date)
    # the contents: the outline holds three chapters and the revision, a chapter per section
    # mark, and three entries of the basis and one per wall of the summary
    pdf.add_page()
    n_entries = 6 + len(sd.walls) + len(sd.cases) + (1 if diff is not None else 0)
    pages = toc_pages(pdf, n_entries)
    pdf.insert_toc_placeholder(functools.partial(render_toc, pages=pages),
                               pages=pages)  # and a page break: the basis starts a page
    ch.basis(wr, run, sd)
    ch.site_summary(wr, sd)
    for mark, case in sd.cases.items():
        ch.section_mark(wr, mark, case)
    ch.bar_list(wr, sd)
    if diff is not None:
        ch.revision(wr, diff)
    path.parent.mkdir(parents=True, exist_ok=True)
    pdf.output(str(path))
    return path
