"""What a key of the site and section files is (``Key``), and how the engine's input
dataclasses declare their keys in their fields (``key``), so that each input is declared once:
its field, type, default, range and text together. ``wallsched/keys.py`` collects the tables
with :func:`keys_of`; ``wallsched/schema.py`` checks a file's tables against them.
"""

from __future__ import annotations

from dataclasses import dataclass, field, fields
from typing import Any

REQUIRED = object()  # sentinel: the key must be given


@dataclass(frozen=True)
class Key:
    """One allowed key of a table.

    Args:
        kind: ``float``, ``int``, ``bool`` or ``str`` (``float`` also takes integers).
        default: the value when absent; ``REQUIRED`` to demand it; ``None`` for optional.
        lo, hi: inclusive range for numbers (``lo_open``/``hi_open`` to exclude the end).
        choices: allowed strings.
        doc: one line for messages and the starter site.
    """

    kind: type
    default: Any = None
    lo: float | None = None
    hi: float | None = None
    lo_open: bool = False
    hi_open: bool = False
    choices: tuple[str, ...] | None = None
    doc: str = ""

    def range_text(self) -> str:
        if self.choices:
            return "one of " + ", ".join(repr(c) for c in self.choices)
        if self.lo is None and self.hi is None:
            return f"a {self.kind.__name__}"
        lo = "" if self.lo is None else f"{'>' if self.lo_open else '>='} {self.lo:g}"
        hi = "" if self.hi is None else f"{'<' if self.hi_open else '<='} {self.hi:g}"
        return "a number " + " and ".join(p for p in (lo, hi) if p)


def key(kind: type, default: Any = REQUIRED, **spec) -> Any:
    """A dataclass field that is also the file key of the same name: ``default`` is the
    field's default (``REQUIRED``: the field has none) and ``spec`` the key's range, choices
    and ``doc`` (:class:`Key`)."""
    meta = {"key": Key(kind, default, **spec)}
    if default is REQUIRED:
        return field(metadata=meta)
    return field(default=default, metadata=meta)


def keys_of(cls, extra: dict[str, Key] | None = None, *, after: str | None = None
            ) -> dict[str, Key]:
    """The keys declared in the fields of the dataclass ``cls``, in field order, with the
    keys ``extra`` (keys of the file that are no field) placed after the field ``after``
    (None: at the end)."""
    out: dict[str, Key] = {}
    for f in fields(cls):
        if "key" in f.metadata:
            out[f.name] = f.metadata["key"]
            if f.name == after:
                out.update(extra or {})
    if after is None:
        out.update(extra or {})
    elif extra and next(iter(extra)) not in out:
        raise KeyError(f"{cls.__name__} has no key field {after!r}")
    return out
