"""ASTM A615 deformed bars and the trade's ``#6@12`` notation.

Bar data: ASTM A615/A615M nominal dimensions, as tabulated in McCormac & Brown,
Design of Reinforced Concrete, 9th ed., App. A Table A.2.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

import numpy as np

# size: (nominal diameter in, area in^2, weight lb/ft)  # ASTM A615 (McCormac Table A.2)
A615 = {
    3: (0.375, 0.11, 0.376),
    4: (0.500, 0.20, 0.668),
    5: (0.625, 0.31, 1.043),
    6: (0.750, 0.44, 1.502),
    7: (0.875, 0.60, 2.044),
    8: (1.000, 0.79, 2.670),
    9: (1.128, 1.00, 3.400),
    10: (1.270, 1.27, 4.303),
    11: (1.410, 1.56, 5.313),
    14: (1.693, 2.25, 7.650),
    18: (2.257, 4.00, 13.600),
}
SIZES = np.array(sorted(A615))
_LOOKUP = np.zeros((SIZES.max() + 1, 3))
for _s, _v in A615.items():
    _LOOKUP[_s] = _v


def bar_diameter_in(size):
    """Nominal diameter (in) of bar ``size`` (array-friendly)."""
    return _LOOKUP[np.asarray(size, dtype=int), 0]


def bar_area_in2(size):
    """Nominal area (in^2) of bar ``size`` (array-friendly)."""
    return _LOOKUP[np.asarray(size, dtype=int), 1]


def bar_weight_plf(size):
    """Unit weight (lb/ft) of bar ``size`` (array-friendly)."""
    return _LOOKUP[np.asarray(size, dtype=int), 2]


@dataclass(frozen=True)
class BarSpec:
    """Bars of one ``size`` at ``spacing_in`` centres (one layer, per foot of wall)."""

    size: int
    spacing_in: float

    @property
    def area_per_ft_in2(self) -> float:
        return A615[self.size][1] * 12.0 / self.spacing_in

    def __str__(self) -> str:
        return f"#{self.size}@{self.spacing_in:g}"


_NOTATION = re.compile(r"^\s*#\s*(\d{1,2})\s*@\s*(\d+(?:\.\d+)?)\s*(?:in|\")?\s*$")


def parse_bars(text: str) -> BarSpec:
    """Parse ``#6@12`` (bar size @ spacing in inches). Raises ValueError with the rule.

    >>> str(parse_bars("#6@12"))
    '#6@12'
    """
    m = _NOTATION.match(text) if isinstance(text, str) else None
    if not m:
        raise ValueError(f"{text!r} is not bar notation; write it like \"#6@12\" "
                         "(bar size @ spacing in inches)")
    size, spacing = int(m.group(1)), float(m.group(2))
    if size not in A615:
        raise ValueError(f"#{size} is not an ASTM A615 bar size (use one of "
                         f"{', '.join('#' + str(s) for s in SIZES)})")
    if not 2.0 <= spacing <= 48.0:
        raise ValueError(f"spacing {spacing:g} in is outside 2 to 48 in")
    return BarSpec(size, spacing)
