"""Which stations of a segment the scalar audit re-checks.

The vectorized engine checks every station; the independent scalar audit
(:mod:`.audit`) re-checks, on every segment,

- its first and last station (the ends, where the footing and the top of wall step);
- for every check, the station of that segment's largest ratio for that check and the first and
  the last station whose ratio is within ``near`` (5 %) of it — the stations that decide the
  design and the edges of the band around them (the ratios are smooth in the station's heights,
  so the band's inside lies between checked values; auditing every station of the band would
  audit nearly all of them, since most checks vary by less than 5 % along a segment); a check
  whose ratio does not vary along the segment is decided by every station alike and is covered
  by the ends;
- every station that fails any check, so that a failure is always confirmed;
- a deterministic sample of ``sample`` stations spread evenly along the segment (the same
  stations on every run), which catches a disagreement away from the extremes.

A disagreement anywhere is a bug (``DesignError``), as before; the calc package and
``run.json`` say how many stations were audited and by which rule.
"""

from __future__ import annotations

import numpy as np

NEAR_SHARE = 0.05  # within 5 % of the segment's largest ratio of a check
SAMPLE_PER_SEGMENT = 3  # evenly spaced stations audited on every segment besides the rule
AUDIT_RULE = (
    "the independent scalar audit re-checked, on every segment, its two end stations, every "
    "station failing a check, for every check the station of its largest ratio on the segment "
    "and the first and last station within 5 % of that ratio, and "
    f"{SAMPLE_PER_SEGMENT} stations spread evenly along it; the vectorized engine checked "
    "every station")


def audit_stations(ratios: np.ndarray, passes: np.ndarray, *, near: float = NEAR_SHARE,
                   sample: int = SAMPLE_PER_SEGMENT) -> np.ndarray:
    """Local indices (increasing) of a segment's stations to audit.

    ``ratios``: (checks, stations) demand/capacity of every check at every station of the
    segment (NaN where a check does not apply); ``passes``: (stations,) whether the station
    passes every check."""
    ratios = np.asarray(ratios, dtype=float)
    if ratios.ndim == 1:
        ratios = ratios[None, :]
    n = ratios.shape[1]
    pick = np.zeros(n, dtype=bool)
    if n == 0:
        return np.flatnonzero(pick)
    pick[[0, -1]] = True
    pick |= ~np.asarray(passes, dtype=bool).reshape(n)
    if sample > 0:
        pick[np.unique(np.round(np.linspace(0, n - 1, sample + 2)[1:-1]).astype(int))] = True
    finite = np.isfinite(ratios)
    pick |= (~finite & ~np.isnan(ratios)).any(axis=0)  # an infinite ratio: a failure
    r = np.where(finite, ratios, -np.inf)
    top = r.max(axis=1, keepdims=True)
    low = np.where(finite, ratios, np.inf).min(axis=1, keepdims=True)
    varies = ((top - low) > 1e-12 * np.maximum(np.abs(top), 1.0)) & np.isfinite(top)
    close = (r >= top - near * np.abs(top)) & varies
    rows = np.flatnonzero(varies[:, 0])
    if rows.size:
        pick[np.argmax(r[rows], axis=1)] = True  # the largest of each check
        band = close[rows]
        pick[np.argmax(band, axis=1)] = True  # the first station of each band
        pick[n - 1 - np.argmax(band[:, ::-1], axis=1)] = True  # and its last
    return np.flatnonzero(pick)
