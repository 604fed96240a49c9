"""Atomic output folders.

Everything is written into a temporary folder beside the target and renamed into place only
when the whole run succeeded. An existing output folder is kept as ``DIR.prev`` (so a later
``diff`` has the last run) unless ``replace`` is asked for.
"""

from __future__ import annotations

import contextlib
import os
import shutil
import tempfile
from collections.abc import Iterator
from pathlib import Path

from .errors import InputError


@contextlib.contextmanager
def staged_output(target: str | Path, *, replace: bool = False) -> Iterator[Path]:
    """Yield a temporary folder; on success it becomes ``target``, on failure it is removed."""
    target = Path(target)
    parent = target.parent if str(target.parent) else Path(".")
    if target.exists() and not target.is_dir():
        raise InputError("exists and is not a folder; choose another --out", file=target)
    if not parent.exists():
        raise InputError(f"the parent folder {parent} does not exist", file=target,
                         where="--out")
    tmp = Path(tempfile.mkdtemp(prefix=f".{target.name}.tmp-", dir=parent))
    try:
        yield tmp
    except BaseException:
        shutil.rmtree(tmp, ignore_errors=True)
        raise
    prev = target.with_name(target.name + ".prev")
    try:
        if target.exists():
            if replace:
                shutil.rmtree(target)
            else:
                if prev.exists():
                    shutil.rmtree(prev)
                os.replace(target, prev)
        os.replace(tmp, target)
    except BaseException:
        shutil.rmtree(tmp, ignore_errors=True)
        raise
