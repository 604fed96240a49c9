"""File names from wall ids: one safe, unique stem per wall for every per-wall file.

A wall id is free text (``"Wall A"``, ``"W-12/3"``, ``"Mauer Ä"``); a file name is not. Every
exporter that writes a file per wall names it ``<stem>-<what>.<ext>`` with the stem from
:func:`wall_file_stems`, which

- refuses an id that is empty or holds a control character (:func:`id_problem`);
- keeps the portable characters (POSIX portable file-name set: ASCII letters, digits, ``.``,
  ``_`` and ``-``), transliterates accented letters and maps everything else to ``_``, strips
  leading and trailing dots (no hidden files, no ``..``), so a stem is never a path;
- caps the stem at :data:`MAX_STEM` characters;
- gives two walls whose stems would be equal, ignoring case (case-insensitive file systems),
  a short hash of their id each, so two walls never share a file.

The id itself stays as written in every table and drawing; only file names use the stem.
"""

from __future__ import annotations

import hashlib
import re
import unicodedata
from collections import Counter
from collections.abc import Iterable

from ..errors import InputError

MAX_STEM = 64  # characters; a longer stem is cut and tagged with a hash of the id
_UNSAFE = re.compile(r"[^A-Za-z0-9._-]+")
_CONTROL = ("Cc", "Cf", "Zl", "Zp")  # control, format (e.g. bidi overrides), line separators


def id_problem(wall_id: object) -> str | None:
    """What is wrong with a wall id as a name (None when it is usable)."""
    if not isinstance(wall_id, str) or not wall_id.strip():
        return "wall id is empty; give every wall a short id such as \"A\" or \"W1\""
    bad = sorted({c for c in wall_id if unicodedata.category(c) in _CONTROL})
    if bad:
        codes = ", ".join(f"U+{ord(c):04X}" for c in bad)
        return (f"wall id {wall_id!r} holds a control character ({codes}); use letters, "
                "digits, spaces and - _ . only")
    return None


def _portable(wall_id: str) -> str:
    text = unicodedata.normalize("NFKD", wall_id).encode("ascii", "ignore").decode("ascii")
    text = _UNSAFE.sub("_", text).strip("._")
    return text or "wall"


def _tag(wall_id: str) -> str:
    return hashlib.sha256(wall_id.encode("utf-8")).hexdigest()[:8]


def wall_file_stems(ids: Iterable[str]) -> dict[str, str]:
    """The file stem of every wall id (site-file order), unique ignoring case.

    Raises InputError for an empty id or one with a control character."""
    ids = list(dict.fromkeys(ids))
    for wall_id in ids:
        problem = id_problem(wall_id)
        if problem:
            raise InputError(problem, where="wall id")
    base = {w: _portable(w) for w in ids}
    counts = Counter(b.casefold() for b in base.values())
    stems: dict[str, str] = {}
    for w in ids:
        b = base[w]
        if counts[b.casefold()] > 1 or len(b) > MAX_STEM:
            b = f"{b[:MAX_STEM - 9]}-{_tag(w)}"
        stems[w] = b
    seen: set[str] = set()
    for w in ids:  # a tagged stem may still equal another wall's plain one: number it
        stem, n = stems[w], 2
        while stem.casefold() in seen:
            stem, n = f"{stems[w]}-{n}", n + 1
        seen.add(stem.casefold())
        stems[w] = stem
    return stems


def wall_file_stem(wall_id: str) -> str:
    """The stem of one wall on its own (a wall written alone, e.g. by a test)."""
    return wall_file_stems([wall_id])[wall_id]
