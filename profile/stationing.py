"""Station notation: ``12+34.56`` is 1234.56 ft along the alignment (common practice)."""

from __future__ import annotations

import math
import re

import numpy as np

_PLUS = re.compile(
    r"^\s*(?:sta(?:tion)?\.?\s*)?([+-]?)\s*(\d+)\s*\+\s*(\d{2}(?:\.\d*)?)\s*$", re.IGNORECASE
)
_PLAIN = re.compile(r"^\s*(?:sta(?:tion)?\.?\s*)?([+-]?(?:\d+\.?\d*|\.\d+))\s*$", re.IGNORECASE)


def parse_station(text: str | float | int) -> float:
    """Parse ``12+34.56``, ``-0+50``, ``1234.56`` or ``STA 12+34.56`` into feet.

    Raises ValueError for anything else (the caller names the file and line).

    >>> parse_station("12+34.56")
    1234.56
    >>> parse_station("-0+50")
    -50.0
    """
    if isinstance(text, bool):
        raise ValueError(f"not a station: {text!r}")
    if isinstance(text, int | float):
        value = float(text)
    else:
        m = _PLUS.match(text)
        if m:
            sign, hundreds, rest = m.groups()
            value = int(hundreds) * 100.0 + float(rest)
            if sign == "-":
                value = -value
        else:
            m = _PLAIN.match(text)
            if not m:
                raise ValueError(f"not a station: {text!r} (use 12+34.56 or 1234.56)")
            value = float(m.group(1))
    if not math.isfinite(value):
        raise ValueError(f"not a finite station: {text!r}")
    return value + 0.0  # no negative zero


def format_station(value: float, decimals: int = 2) -> str:
    """Format feet as station notation, rounded to ``decimals`` (default 2).

    >>> format_station(1234.56)
    '12+34.56'
    >>> format_station(-50)
    '-0+50.00'
    """
    if not math.isfinite(value):
        raise ValueError(f"not a finite station: {value!r}")
    scale = 10**decimals
    units = round(abs(value) * scale)
    sign = "-" if value < 0 and units else ""
    hundreds, rest = divmod(units, 100 * scale)
    whole, frac = divmod(rest, scale)
    text = f"{sign}{hundreds}+{whole:02d}"
    if decimals:
        text += f".{frac:0{decimals}d}"
    return text


def format_stations(values) -> list[str]:
    """Vector form of :func:`format_station`."""
    return [format_station(float(v)) for v in np.asarray(values, dtype=float)]
