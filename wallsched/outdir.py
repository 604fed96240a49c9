"""Atomic output folders.

Everything is written into a temporary folder beside the target and renamed into place only
when the whole run succeeded. An existing output folder is kept as ``DIR.prev`` (so a later
``diff`` has the last run) unless ``replace`` is asked for. An interrupted run (an exception,
Ctrl-C) removes its temporary folder and leaves the target and ``DIR.prev`` as they were.

The target must be a folder of its own: not the current folder or one above it, not a folder
holding the inputs, and not an existing folder with other files in it (only an earlier output,
recognised by one of ``OUTPUT_MARKERS``, is moved aside or replaced).
"""

from __future__ import annotations

import contextlib
import os
import shutil
import tempfile
from collections.abc import Iterable, Iterator
from pathlib import Path

from .errors import InputError

OUTPUT_MARKERS = ("stations.csv", "run.json")  # files every run of ours writes


def _is_output(folder: Path) -> bool:
    return any((folder / m).is_file() for m in OUTPUT_MARKERS)


def check_target(target: Path, protect: Iterable[str | Path] = ()) -> Path:
    """Refuse an output folder that would move or delete something that is not ours."""
    if not target.name or target.name in (".", ".."):
        raise InputError("names no folder of its own; give a new folder, e.g. --out out",
                         file=target, where="--out")
    full = target.resolve()
    here = Path.cwd().resolve()
    if full == here or full in here.parents:
        raise InputError("is the current folder or one above it; give a new folder for the "
                         "outputs, e.g. --out out", file=target, where="--out")
    for p in protect:
        q = Path(p).resolve()
        if q == full or full in q.parents:
            raise InputError(f"holds the input {Path(p).name}; give a separate folder for the "
                             "outputs", file=target, where="--out")
    if target.exists() and not target.is_dir():
        raise InputError("exists and is not a folder; choose another --out", file=target,
                         where="--out")
    if target.is_dir() and any(target.iterdir()) and not _is_output(target):
        raise InputError("is a folder with other files in it, not an earlier output (no "
                         f"{' or '.join(OUTPUT_MARKERS)}); choose a new or empty folder",
                         file=target, where="--out")
    return full


@contextlib.contextmanager
def staged_output(target: str | Path, *, replace: bool = False,
                  protect: Iterable[str | Path] = ()) -> Iterator[Path]:
    """Yield a temporary folder; on success it becomes ``target``, on failure it is removed.

    Args:
        target: the output folder.
        replace: delete an existing output folder instead of keeping it as ``DIR.prev``.
        protect: input files that may not lie inside the target.
    """
    target = Path(target)
    check_target(target, protect)
    parent = target.parent if str(target.parent) else Path(".")
    if not parent.is_dir():
        raise InputError(f"the parent folder {parent} does not exist", file=target,
                         where="--out")
    prev = target.with_name(target.name + ".prev")
    if prev.exists() and not prev.is_dir():
        raise InputError(f"{prev.name} exists and is not a folder; move it away", file=target,
                         where="--out")
    try:
        tmp = Path(tempfile.mkdtemp(prefix=f".{target.name}.tmp-", dir=parent))
    except OSError as exc:
        raise InputError(f"cannot create a folder beside it ({exc.strerror})", file=target,
                         where="--out") from None
    try:
        yield tmp
    except BaseException:
        shutil.rmtree(tmp, ignore_errors=True)
        raise
    _swap_into_place(tmp, target, prev, replace=replace)


def _swap_into_place(tmp: Path, target: Path, prev: Path, *, replace: bool) -> None:
    """Rename ``tmp`` to ``target``; the old target becomes ``prev`` (or is deleted).

    Only renames happen before the new folder is in place; what is deleted (the old
    ``prev``, or the old target with ``replace``) is first renamed to a hidden trash name, so
    a failure part-way leaves either the old state or the new one, never a mixture.
    """
    trash = Path(tempfile.mkdtemp(prefix=f".{target.name}.old-", dir=tmp.parent))
    moved: list[tuple[Path, Path]] = []  # (from, to), to undo on failure
    try:
        if target.exists():
            if replace:
                os.replace(target, trash / "target")
                moved.append((target, trash / "target"))
            else:
                if prev.exists():
                    os.replace(prev, trash / "prev")
                    moved.append((prev, trash / "prev"))
                os.replace(target, prev)
                moved.append((target, prev))
        os.replace(tmp, target)
    except BaseException:
        for src, dst in reversed(moved):
            with contextlib.suppress(OSError):
                os.replace(dst, src)
        shutil.rmtree(tmp, ignore_errors=True)
        shutil.rmtree(trash, ignore_errors=True)
        raise
    shutil.rmtree(trash, ignore_errors=True)
