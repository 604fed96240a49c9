"""Atomic output folders.

Everything is written into a temporary folder beside the target and renamed into place only
when the whole run succeeded. An existing output folder is kept as ``DIR.prev`` (so a later
``diff`` has the last run) unless ``replace`` is asked for. An interrupted run (an exception,
Ctrl-C, SIGTERM, SIGHUP, a full disk) removes its temporary folder and leaves the target and
``DIR.prev`` as they were.

What counts as an earlier output: only a folder whose ``run.json`` carries the format marker
(``"format": RUN_FORMAT``) that every run writes; it also lists the files the run wrote, so
that files a person added later are told apart. The target must be a folder of its own: not
the current folder or one above it, not a folder holding the inputs, and not an existing
folder with other files in it. Files a person added to an output folder are named in a
warning and go with it into ``DIR.prev`` (and from an old ``DIR.prev`` into the new one);
``replace`` refuses a folder holding such files.

One run at a time per target: :func:`output_lock` holds an advisory lock on
``.DIR.lock`` beside the target for the whole run (a second run into the same ``--out`` is
refused; a POSIX record lock, so it ends with the process that took it, even when worker
processes forked from it live on), and on taking it finishes or removes what a killed
earlier run left behind (its temporary folder, and ``DIR``/``DIR.prev`` half-way through the
renames).
"""

from __future__ import annotations

import contextlib
import errno
import json
import os
import re
import shutil
import signal
import tempfile
from collections.abc import Callable, Iterable, Iterator
from pathlib import Path

from . import __version__
from .errors import InputError

RUN_FORMAT = "wallsched-run"  # the marker in run.json of every output folder
RUN_JSON = "run.json"
MAX_RUN_JSON_BYTES = 512 * 1024 * 1024

Warn = Callable[[str], None]
_HELD: dict[Path, int] = {}  # target (resolved) -> file descriptor of its lock, this process


class Stopped(BaseException):
    """SIGTERM or SIGHUP arrived: unwind like Ctrl-C (temporary folders removed)."""

    def __init__(self, signum: int):
        self.signum = signum
        super().__init__(signal.Signals(signum).name)


def _on_signal(signum, frame):  # noqa: ARG001 - the signal module's signature
    for s in _STOP_SIGNALS:  # a second signal must not interrupt the clean-up
        with contextlib.suppress(ValueError, OSError):
            signal.signal(s, signal.SIG_IGN)
    raise Stopped(signum)


_STOP_SIGNALS = tuple(getattr(signal, n) for n in ("SIGTERM", "SIGHUP") if hasattr(signal, n))


def install_signal_handlers() -> dict:
    """SIGTERM and SIGHUP raise :class:`Stopped` in the main thread (like SIGINT raises
    KeyboardInterrupt), so every ``finally`` and clean-up runs. Returns the handlers they
    replace, for :func:`restore_signal_handlers`."""
    old = {}
    for s in _STOP_SIGNALS:
        with contextlib.suppress(ValueError, OSError):  # not the main thread
            old[s] = signal.signal(s, _on_signal)
    return old


def restore_signal_handlers(old: dict) -> None:
    """Put back the handlers :func:`install_signal_handlers` replaced (the command is done)."""
    for s, handler in old.items():
        with contextlib.suppress(ValueError, OSError, TypeError):
            signal.signal(s, handler if handler is not None else signal.SIG_DFL)


def _umask() -> int:
    mask = os.umask(0)
    os.umask(mask)
    return mask


def _follow_umask(path: Path) -> None:
    """``mkdtemp`` makes owner-only folders; an output folder follows the user's umask."""
    with contextlib.suppress(OSError):
        os.chmod(path, 0o777 & ~_umask())


def _disk_error(exc: OSError, target: Path) -> InputError:
    what = exc.strerror or str(exc)
    hint = {errno.ENOSPC: "free some space", errno.EDQUOT: "free some space",
            errno.EACCES: "check the folder's permissions",
            errno.EROFS: "choose a writable folder"}.get(exc.errno, "check the disk")
    return InputError(f"cannot write the outputs ({what}); {hint} and run again - the output "
                      "folder and its .prev are as they were", file=target, where="--out")


# ---- what an output folder is

def read_manifest(folder: Path) -> list[str] | None:
    """The files a wallsched run wrote into ``folder`` (from its run.json), or None when
    ``folder`` is not a wallsched output folder."""
    p = folder / RUN_JSON
    try:
        if not p.is_file() or p.stat().st_size > MAX_RUN_JSON_BYTES:
            return None
        data = json.loads(p.read_text(encoding="utf-8"))
    except (OSError, UnicodeDecodeError, ValueError, RecursionError):
        return None
    if not isinstance(data, dict) or data.get("format") != RUN_FORMAT:
        return None
    files = data.get("files")
    if not isinstance(files, list) or not all(isinstance(f, str) for f in files):
        return [e.name for e in folder.iterdir()]  # marked, with no list: all of it is ours
    return files


def is_output(folder: Path) -> bool:
    return read_manifest(folder) is not None


def added_files(folder: Path) -> list[str]:
    """Top-level names in an output folder that its run did not write (a person added them)."""
    ours = set(read_manifest(folder) or ())
    return sorted(e.name for e in folder.iterdir() if e.name not in ours)


def _mark(tmp: Path) -> None:
    """Write the format marker and the list of files into ``tmp/run.json`` (the last write
    of a run: a temporary folder whose run.json has the list is complete)."""
    p = tmp / RUN_JSON
    data = {}
    if p.is_file():
        data = json.loads(p.read_text(encoding="utf-8"))
    files = sorted({e.name for e in tmp.iterdir()} | {RUN_JSON})
    data = {"format": RUN_FORMAT, **({} if "wallsched" in data.get("versions", {})
                                      else {"version": __version__}),
            **{k: v for k, v in data.items() if k not in ("format", "files")}, "files": files}
    text = json.dumps(data, indent=2, allow_nan=False) + "\n"
    part = tmp / (RUN_JSON + ".part")
    part.write_text(text, encoding="utf-8")
    os.replace(part, p)


def _names(words: list[str], most: int = 5) -> str:
    shown = ", ".join(words[:most])
    return shown + (f" and {len(words) - most} more" if len(words) > most else "")


def check_target(target: Path, protect: Iterable[str | Path] = (), *,
                 replace: bool = False) -> Path:
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
    if target.is_dir() and any(target.iterdir()) and not is_output(target):
        raise InputError("is a folder with other files in it, not an earlier output (no "
                         f"{RUN_JSON} written by wallsched); choose a new or empty folder",
                         file=target, where="--out")
    prev = target.with_name(target.name + ".prev")
    if prev.exists() and not prev.is_dir():
        raise InputError(f"{prev.name} exists and is not a folder; move it away", file=target,
                         where="--out")
    if prev.is_dir() and any(prev.iterdir()) and not is_output(prev) and not replace:
        raise InputError(f"{prev.name} is not an earlier output (no {RUN_JSON} written by "
                         "wallsched), and this run would replace it; move it away",
                         file=target, where="--out")
    if target.is_dir() and is_output(target):
        mine = added_files(target)
        if mine and replace:
            raise InputError(f"holds files wallsched did not write ({_names(mine)}) that "
                             "--replace would delete; move them away, or run without "
                             "--replace to keep them in " + prev.name, file=target,
                             where="--out")
        if mine and prev.is_dir() and is_output(prev):
            clash = sorted(set(added_files(prev)) & {e.name for e in target.iterdir()})
            if clash:
                raise InputError(f"{prev.name} holds files wallsched did not write "
                                 f"({_names(clash)}) whose names are also in {target.name}; "
                                 f"move them out of {prev.name}", file=target, where="--out")
    return full


# ---- one run at a time, and what a killed run left behind

def _lock_path(target: Path) -> Path:
    return target.with_name(f".{target.name}.lock")


def _try_lock(fd: int) -> bool:
    try:
        import fcntl
    except ImportError:  # pragma: no cover - not POSIX
        import msvcrt

        try:
            msvcrt.locking(fd, msvcrt.LK_NBLCK, 1)
        except OSError:
            return False
        return True
    try:  # a POSIX record lock: held by this process alone, never by forked workers
        fcntl.lockf(fd, fcntl.LOCK_EX | fcntl.LOCK_NB)
    except OSError:
        return False
    return True


@contextlib.contextmanager
def output_lock(target: str | Path, *, warn: Warn | None = None) -> Iterator[None]:
    """Hold the lock of ``target`` for a whole run; a second run into it is refused (exit
    2). On taking it, finish or remove what a killed run into ``target`` left behind."""
    target = Path(target)
    key = target.resolve()
    if key in _HELD:  # already held by this process (the command's, around staged_output)
        yield
        return
    parent = target.parent if str(target.parent) else Path(".")
    if not parent.is_dir():
        raise InputError(f"the parent folder {parent} does not exist", file=target,
                         where="--out")
    lock = _lock_path(target)
    while True:
        try:
            fd = os.open(lock, os.O_RDWR | os.O_CREAT, 0o666)
        except OSError as exc:
            raise InputError(f"cannot create a file beside it ({exc.strerror}); choose a "
                             "writable folder", file=target, where="--out") from None
        if not _try_lock(fd):
            os.close(fd)
            raise InputError("another wallsched run is writing into this folder now; wait "
                             f"for it to finish (or remove {lock.name} if no run is going)",
                             file=target, where="--out")
        try:  # the lock file may have been removed by the run that held it: take it anew
            same = os.path.samestat(os.fstat(fd), os.stat(lock))
        except OSError:
            same = False
        if same:
            break
        os.close(fd)
    _HELD[key] = fd
    try:
        recover(target, warn=warn)
        yield
    finally:
        del _HELD[key]
        with contextlib.suppress(OSError):
            os.unlink(lock)
        os.close(fd)


def _stale(target: Path, kind: str) -> list[Path]:
    parent = target.parent if str(target.parent) else Path(".")
    pat = re.compile(rf"^\.{re.escape(target.name)}\.{kind}-[A-Za-z0-9_]{{8}}$")
    return sorted((p for p in parent.iterdir() if pat.match(p.name) and p.is_dir()),
                  key=lambda p: p.stat().st_mtime)


def _complete(tmp: Path) -> bool:
    files = read_manifest(tmp)
    try:
        data = json.loads((tmp / RUN_JSON).read_text(encoding="utf-8"))
    except (OSError, ValueError):
        return False
    return (files is not None and isinstance(data.get("files"), list)
            and all((tmp / f).exists() for f in files))


def recover(target: Path, *, warn: Warn | None = None) -> None:
    """Put right what a run killed part-way left beside ``target`` (call under its lock).

    Killed while writing: its temporary folder is removed. Killed between the renames: an
    old ``DIR.prev`` set aside is put back where ``DIR.prev`` is missing; a complete new
    output is moved into place where ``DIR`` is missing (else removed)."""
    tell = warn or (lambda line: None)
    target = Path(target)
    prev = target.with_name(target.name + ".prev")
    tmps, trashes = _stale(target, "tmp"), _stale(target, "old")
    if not tmps and not trashes:
        return
    if not target.exists():
        done = [t for t in tmps if _complete(t)]
        held = [t / "target" for t in trashes if (t / "target").is_dir()]
        if done:
            os.replace(done[-1], target)
            tell(f"{target}: finished the earlier run that was stopped while moving its "
                 "outputs into place")
        elif held:
            os.replace(held[-1], target)
            tell(f"{target}: put back the earlier output that a stopped run had set aside")
    if not prev.exists():
        held = [t / "prev" for t in trashes if (t / "prev").is_dir()]
        if held:
            os.replace(held[-1], prev)
            tell(f"{target}: put back {prev.name}, which a stopped run had set aside")
    left = [p for p in (*_stale(target, "tmp"), *_stale(target, "old"))]
    for p in left:
        shutil.rmtree(p, ignore_errors=True)
    if any(p.exists() for p in left):
        raise InputError(f"cannot remove {left[0].name}, left by an earlier stopped run; "
                         "remove it by hand", file=target, where="--out")
    if tmps:
        tell(f"{target}: removed {len(tmps)} unfinished temporary folder(s) of an earlier "
             "stopped run")


# ---- the staged write

@contextlib.contextmanager
def staged_output(target: str | Path, *, replace: bool = False,
                  protect: Iterable[str | Path] = (), warn: Warn | None = None
                  ) -> Iterator[Path]:
    """Yield a temporary folder; on success it becomes ``target``, on failure it is removed.

    Args:
        target: the output folder.
        replace: delete an existing output folder instead of keeping it as ``DIR.prev``.
        protect: input files that may not lie inside the target.
        warn: called with a line for each thing the user should know (files they added to
            the old output, and where those went).
    """
    target = Path(target)
    check_target(target, protect, replace=replace)
    with output_lock(target, warn=warn):
        check_target(target, protect, replace=replace)  # as it is now, under the lock
        parent = target.parent if str(target.parent) else Path(".")
        prev = target.with_name(target.name + ".prev")
        try:
            tmp = Path(tempfile.mkdtemp(prefix=f".{target.name}.tmp-", dir=parent))
        except OSError as exc:
            raise InputError(f"cannot create a folder beside it ({exc.strerror})",
                             file=target, where="--out") from None
        try:
            _follow_umask(tmp)
            yield tmp
            _mark(tmp)
        except OSError as exc:
            shutil.rmtree(tmp, ignore_errors=True)
            raise _disk_error(exc, target) from None
        except BaseException:
            shutil.rmtree(tmp, ignore_errors=True)
            raise
        try:
            _swap_into_place(tmp, target, prev, replace=replace, warn=warn)
        except OSError as exc:
            raise _disk_error(exc, target) from None


def _carry_added(target: Path, prev: Path, warn: Warn | None) -> None:
    """Name the files a person added to ``target`` (they go with it into ``prev``) and move
    those of the old ``prev`` into ``target`` (so that they are not deleted with it)."""
    tell = warn or (lambda line: None)
    mine = added_files(target)
    if mine:
        tell(f"{target} holds files wallsched did not write ({_names(mine)}); they are kept "
             f"in {prev}")
    if prev.is_dir() and is_output(prev):
        old = added_files(prev)
        for name in old:
            os.replace(prev / name, target / name)
        if old:
            tell(f"{prev} holds files wallsched did not write ({_names(old)}); they are kept "
                 f"in the new {prev}")


def _swap_into_place(tmp: Path, target: Path, prev: Path, *, replace: bool,
                     warn: Warn | None = None) -> None:
    """Rename ``tmp`` to ``target``; the old target becomes ``prev`` (or is deleted).

    Only renames happen before the new folder is in place; what is deleted (the old
    ``prev``, or the old target with ``replace``) is first renamed to a hidden trash name, so
    a failure part-way leaves either the old state or the new one, never a mixture (and a
    kill part-way is put right by the next run, :func:`recover`).
    """
    trash = Path(tempfile.mkdtemp(prefix=f".{target.name}.old-", dir=tmp.parent))
    moved: list[tuple[Path, Path]] = []  # (from, to), to undo on failure
    try:
        if target.exists():
            if replace:
                os.replace(target, trash / "target")
                moved.append((target, trash / "target"))
            else:
                _carry_added(target, prev, warn)
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


def claim_output(ctx, target: str | Path, *, protect: Iterable[str | Path] = (),
                 replace: bool = False, warn: Warn | None = None) -> None:
    """At the start of a command: check ``target`` and hold its lock until the command ends
    (``ctx``: the click context, which releases it)."""
    check_target(Path(target), protect, replace=replace)
    ctx.with_resource(output_lock(target, warn=warn))
