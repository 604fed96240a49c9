"""Validation of TOML tables against declared keys.

A table is checked against a mapping of :class:`Key`; unknown keys are refused with a
did-you-mean hint, required keys must be present, numbers must lie in range, and every
message names the file, the key and (where it can be found) the line.
"""

from __future__ import annotations

import difflib
import math
import re
import tomllib
import unicodedata
from collections.abc import Mapping
from pathlib import Path
from typing import Any

from .engine.keyspec import REQUIRED, Key
from .errors import InputError

MAX_TOML_BYTES = 1024 * 1024  # a site or section file larger than this is refused unread
MAX_TEXT = 4000  # characters of one text value (a name, a note, a path)


class SourceText:
    """The raw text of a TOML file, to find the line of a key for messages."""

    def __init__(self, path: Path, text: str):
        self.path = path
        self.lines = text.splitlines()

    def line_of(self, table: str | None, key: str) -> int | None:
        """Best-effort line number (1-based) of ``key`` inside ``[table]`` (or anywhere)."""
        pat = re.compile(rf"^\s*{re.escape(key)}\s*=")
        header = None if not table else re.compile(
            rf"^\s*\[+\s*{re.escape(table.split('[')[0].strip())}\s*\]+"
        )
        inside = header is None
        table_head = re.compile(rf"^\s*\[+\s*{re.escape(key)}\s*\]+")
        for i, line in enumerate(self.lines, 1):
            if header is None and table_head.match(line):  # a top-level table [key]
                return i
            if header is not None and header.match(line):
                inside = True
                continue
            if inside and pat.match(line):
                return i
            # an inline table on one line: key = { ... name = ... }
            if inside and re.search(rf"[{{,]\s*{re.escape(key)}\s*=", line):
                return i
        return None


def load_toml(path: Path) -> tuple[dict, SourceText]:
    """Read a TOML file with ``tomllib`` only; a syntax error is an InputError with its line."""
    try:
        if path.exists() and not path.is_dir() and not path.is_file():
            raise InputError("is not a regular file (a device or pipe); give a TOML file",
                             file=path)
        if path.is_file() and path.stat().st_size > MAX_TOML_BYTES:
            raise InputError(f"is {path.stat().st_size:,} bytes; a site or section file is a "
                             f"few kB (the limit is {MAX_TOML_BYTES // 1024} KiB) - put "
                             "profiles in CSV files", file=path)
        raw = path.read_bytes()
    except FileNotFoundError:
        raise InputError("file not found; check the path", file=path) from None
    except IsADirectoryError:
        raise InputError("is a folder, not a TOML file", file=path) from None
    except OSError as exc:
        raise InputError(f"cannot be read ({exc.strerror})", file=path) from None
    if raw.startswith((b"\xff\xfe", b"\xfe\xff")) or b"\x00" in raw:
        raise InputError("is not UTF-8 text (UTF-16 or binary); save it as UTF-8 TOML",
                         file=path)
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError:
        raise InputError("is not UTF-8 text; save it as UTF-8 TOML", file=path) from None
    try:
        data = tomllib.loads(text)
    except RecursionError:
        raise InputError("nests arrays or tables too deeply to be a site file", file=path) \
            from None
    except tomllib.TOMLDecodeError as exc:
        msg = str(exc)
        m = re.search(r"\(at line (\d+), column (\d+)\)", msg)
        where = f"line {m.group(1)}" if m else None
        msg = re.sub(r"\s*\(at line \d+, column \d+\)", "", msg)
        raise InputError(f"not valid TOML: {msg}", file=path, where=where) from None
    except ValueError as exc:  # tomllib's own, e.g. an integer of thousands of digits
        long = re.search(r"\d{1000,}", text)
        where = f"line {text.count(chr(10), 0, long.start()) + 1}" if long else None
        msg = " ".join(str(exc).split())[:80]
        raise InputError(f"holds a value that cannot be read ({msg}); no key takes a number "
                         "that large", file=path, where=where) from None
    return data, SourceText(path, text)


def did_you_mean(name: str, allowed: Mapping[str, Any] | list[str]) -> str:
    close = difflib.get_close_matches(name, list(allowed), n=1, cutoff=0.6)
    if close:
        return f"did you mean '{close[0]}'?"
    return "allowed keys: " + ", ".join(sorted(allowed))


def where_text(src: SourceText | None, table: str | None, key: str) -> str:
    label = f"[{table}] {key}" if table else key
    if src is not None:
        line = src.line_of(table, key)
        if line:
            return f"line {line}: {label}"
    return label


def short_value(value: Any, limit: int = 60) -> str:
    """``repr(value)`` cut to ``limit`` characters (a huge value is named, not printed)."""
    if isinstance(value, int) and not isinstance(value, bool) and abs(value) >= 10 ** 15:
        return f"a {len(str(abs(value)))}-digit number"
    text = repr(value) if not isinstance(value, list | dict) or len(value) < 50 else (
        f"a {type(value).__name__} of {len(value)} items")
    return text if len(text) <= limit else text[:limit - 5] + "...'" + text[-1:]


def _finite(value: int | float, spec: Key, *, file, where: str) -> float:
    """A number as a finite float; NaN, infinity and integers past a float refused."""
    try:
        out = float(value)
    except OverflowError:
        out = math.inf
    if not math.isfinite(out):
        raise InputError(f"must be a finite number, got {short_value(value)}; allowed: "
                         f"{spec.range_text()}", file=file, where=where)
    return out


def check_value(value: Any, spec: Key, *, file, where: str) -> Any:
    """Check one value against its key; returns it converted (int -> float for floats)."""
    kind = spec.kind
    if kind is float:
        if isinstance(value, bool) or not isinstance(value, int | float):
            raise InputError(
                f"must be a number, got {short_value(value)}; allowed: {spec.range_text()}",
                file=file, where=where,
            )
        value = _finite(value, spec, file=file, where=where)
    elif kind is int:
        if isinstance(value, bool) or not isinstance(value, int):
            raise InputError(f"must be a whole number, got {short_value(value)}", file=file,
                             where=where)
        _finite(value, spec, file=file, where=where)
    elif kind is bool:
        if not isinstance(value, bool):
            raise InputError(f"must be true or false, got {short_value(value)}", file=file,
                             where=where)
        return value
    elif kind is str:
        return _check_text(value, spec, file=file, where=where)
    elif kind is list:
        return _check_list(value, spec, file=file, where=where)
    if kind in (float, int):
        bad = (
            (spec.lo is not None and (value < spec.lo or (spec.lo_open and value == spec.lo)))
            or (spec.hi is not None and (value > spec.hi or (spec.hi_open and value == spec.hi)))
        )
        if bad:
            raise InputError(
                f"{value:g} is out of range; allowed: {spec.range_text()}", file=file, where=where
            )
    return value


def _check_text(value: Any, spec: Key, *, file, where: str) -> str:
    """A text value: a string, not too long, no control characters, one of the choices."""
    if not isinstance(value, str):
        raise InputError(f"must be a text string, got {short_value(value)}", file=file,
                         where=where)
    if len(value) > MAX_TEXT:
        raise InputError(f"is {len(value):,} characters long; the limit is {MAX_TEXT:,} "
                         "(a name or a note, not a document)", file=file, where=where)
    bad = sorted({c for c in value if unicodedata.category(c) == "Cc"} - set("\t\n\r"))
    if bad:
        raise InputError("holds a control character ("
                         + ", ".join(f"U+{ord(c):04X}" for c in bad)
                         + "); remove it (tables and spreadsheets cannot hold it)",
                         file=file, where=where)
    if spec.choices and value not in spec.choices:
        hint = difflib.get_close_matches(value, spec.choices, n=1)
        extra = f" (did you mean {hint[0]!r}?)" if hint else ""
        raise InputError(
            f"{short_value(value)} is not allowed; use {spec.range_text()}{extra}",
            file=file, where=where,
        )
    return value


def _check_list(value: Any, spec: Key, *, file, where: str) -> list:
    """A list value; with a range, a non-empty list of numbers in it."""
    if not isinstance(value, list):
        raise InputError(f"must be a list, got {short_value(value)}", file=file,
                         where=where)
    if spec.lo is not None or spec.hi is not None:  # a list of numbers in range
        if not value:
            raise InputError("must list at least one number", file=file, where=where)
        num = Key(float, lo=spec.lo, hi=spec.hi, lo_open=spec.lo_open,
                  hi_open=spec.hi_open)
        return [check_value(v, num, file=file, where=where) for v in value]
    return value


def check_table(
    data: Any,
    keys: Mapping[str, Key],
    *,
    table: str,
    file,
    src: SourceText | None = None,
    extra_ok: tuple[str, ...] = (),
    fill_defaults: bool = True,
) -> dict[str, Any]:
    """Validate one table; returns a dict of every declared key (defaults filled in)."""
    if not isinstance(data, dict):
        raise InputError(f"[{table}] must be a table, got {type(data).__name__}", file=file,
                         where=f"[{table}]")
    for name in data:
        if name not in keys and name not in extra_ok:
            raise InputError(
                f"unknown key '{name}'; {did_you_mean(name, list(keys) + list(extra_ok))}",
                file=file, where=where_text(src, table, name),
            )
    out: dict[str, Any] = {}
    for name, spec in keys.items():
        if name in data:
            out[name] = check_value(data[name], spec, file=file,
                                    where=where_text(src, table, name))
        elif spec.default is REQUIRED:
            if not fill_defaults:
                continue
            raise InputError(
                f"missing required key '{name}' ({spec.doc or spec.range_text()}); "
                "it has no default and must be given",
                file=file, where=f"[{table}]",
            )
        elif fill_defaults:
            out[name] = spec.default
    return out
