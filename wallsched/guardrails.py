"""Engineering guard rails: warnings for inputs that are legal but suspicious.

Nothing here stops a run; each function returns plain warning lines (no prefix) that the
commands print with the other warnings. The limits are trade judgement, stated here once:

- a retained height that changes by more than ``HEIGHT_JUMP_FT`` between adjacent stations
  (a grading error, or a grade of another wall, is more likely than a wall that does that);
- a base friction coefficient above ``FRICTION_COEFFICIENT_HIGH`` (the highest presumptive
  value of IBC 2021 Table 1806.2, for crystalline bedrock);
- an allowable bearing above ``BEARING_HIGH_PSF`` without a ``[soil] source`` note (above the
  presumptive values of IBC 2021 Table 1806.2 for any soil class, 12,000 psf being the
  crystalline-bedrock value);
- a wall longer than ``WALL_LENGTH_LONG_FT`` (one mile; more likely two walls or a unit error);
- a wall needed over less than ``segment_min_ft`` of a longer alignment (a spike in the
  grades is more likely than a wall that short; it is designed as one segment that short);
- a front grade above the retained grade (the stations named: the retained side or the grades
  may be swapped there);
- a ``[soil] source`` that calls itself a placeholder (values not from a report);
- a wall end still retaining more than ``end_height_warn_ft`` (``[criteria]``; a return wall
  or a turn-down is needed where the alignment stops);
- a plain-concrete shear key on a wall with a ``[seismic]`` case: ACI 318-19 14.1.4 restricts
  plain concrete in Seismic Design Categories D, E and F (from memory), and the site file does
  not say the category, so the engineer confirms it or reinforces the key.
"""

from __future__ import annotations

from collections.abc import Iterable, Sequence

import numpy as np

from .profile.stationing import format_station

HEIGHT_JUMP_FT = 3.0
FRICTION_COEFFICIENT_HIGH = 0.7  # IBC 2021 Table 1806.2, class 1 (crystalline bedrock)
BEARING_HIGH_PSF = 12000.0  # IBC 2021 Table 1806.2, class 1 (crystalline bedrock)
WALL_LENGTH_LONG_FT = 5280.0  # one mile


def height_jumps(wall: str, station_ft: np.ndarray, retained_height_ft: np.ndarray,
                 limit_ft: float = HEIGHT_JUMP_FT) -> list[str]:
    """One line for a wall whose retained height jumps more than ``limit_ft`` between
    adjacent stations (the largest jump and how many there are)."""
    h = np.asarray(retained_height_ft, dtype=float)
    st = np.asarray(station_ft, dtype=float)
    if h.size < 2:
        return []
    dh = np.abs(np.diff(h))
    bad = np.nonzero(dh > limit_ft)[0]
    if not bad.size:
        return []
    k = int(bad[np.argmax(dh[bad])])
    more = f" ({bad.size} places)" if bad.size > 1 else ""
    return [f"wall {wall!r}: the retained height changes by {dh[k]:.2f} ft between stations "
            f"{format_station(st[k])} and {format_station(st[k + 1])}{more}, more than "
            f"{limit_ft:g} ft between adjacent stations; check the grades there"]


def soil_warnings(walls: Iterable[tuple[str, dict]]) -> list[str]:
    """Lines for suspicious soil values; ``walls`` holds (wall id, resolved [soil]) pairs.

    Walls sharing one message are named together on one line."""
    found: dict[str, list[str]] = {}
    for wall, soil in walls:
        mu = soil.get("friction_coefficient")
        if mu is not None and mu > FRICTION_COEFFICIENT_HIGH:
            found.setdefault(
                f"[soil] friction_coefficient {mu:g} is above {FRICTION_COEFFICIENT_HIGH:g}; "
                "confirm it with the geotechnical report", []).append(wall)
        q = soil.get("allowable_bearing_psf")
        if q is not None and q > BEARING_HIGH_PSF and not (soil.get("source") or "").strip():
            found.setdefault(
                f"[soil] allowable_bearing_psf {q:,.0f} is above {BEARING_HIGH_PSF:,.0f} psf "
                "with no [soil] source note; add source = \"...\" naming the report that "
                "gives it", []).append(wall)
    return [f"{_walls(ws)}: {text}" for text, ws in found.items()]


def length_warning(wall: str, length_ft: float,
                   limit_ft: float = WALL_LENGTH_LONG_FT) -> list[str]:
    """One line for a wall longer than ``limit_ft``."""
    if length_ft > limit_ft:
        return [f"wall {wall!r} is {length_ft:,.0f} ft long, more than a mile "
                f"({limit_ft:,.0f} ft); check the alignment's units, or split it into walls"]
    return []


def short_wall_warning(wall: str, station_ft: np.ndarray, retained_height_ft: np.ndarray,
                       min_retained_height_ft: float, segment_min_ft: float) -> list[str]:
    """One line for a wall needed (retained height at least ``min_retained_height_ft``) over
    less than ``segment_min_ft``, from the first to the last station that needs it (with one
    neighbour where only one station does, as the design takes it)."""
    st = np.asarray(station_ft, dtype=float)
    need = np.nonzero(np.asarray(retained_height_ft, dtype=float) >= min_retained_height_ft)[0]
    if need.size == 0 or st.size < 2:
        return []
    first, last = int(need[0]), int(need[-1])
    if first == last:
        first, last = (first - 1, last) if first > 0 else (first, last + 1)
    length = st[last] - st[first]
    if length >= segment_min_ft - 1e-9 or (first == 0 and last == st.size - 1):
        return []  # long enough, or a short wall drawn as such (its whole alignment)
    return [f"wall {wall!r} is needed over only {length:.2f} ft ({format_station(st[first])} "
            f"to {format_station(st[last])}), less than segment_min_ft {segment_min_ft:g}; it "
            "is designed as one segment that short: check the grades there, or extend the "
            "wall"]


def _ranges(st: np.ndarray, idx: np.ndarray, most: int = 4) -> str:
    """Consecutive station indices as "a to b" ranges (the first ``most`` of them)."""
    runs: list[list[int]] = []
    for i in idx.tolist():
        if runs and i == runs[-1][1] + 1:
            runs[-1][1] = i
        else:
            runs.append([i, i])
    text = [format_station(st[a]) if a == b else
            f"{format_station(st[a])} to {format_station(st[b])}" for a, b in runs[:most]]
    more = f" and {len(runs) - most} more stretches" if len(runs) > most else ""
    return ", ".join(text) + more


def flipped_grade_warnings(wall: str, station_ft: np.ndarray,
                           retained_height_ft: np.ndarray) -> list[str]:
    """One line for a wall whose front grade lies above its retained grade somewhere, naming
    the stations."""
    st = np.asarray(station_ft, dtype=float)
    bad = np.nonzero(np.asarray(retained_height_ft, dtype=float) < 0)[0]
    if not bad.size:
        return []
    n = f"{bad.size} stations" if bad.size > 1 else "1 station"
    return [f"wall {wall!r}: the front grade is above the retained grade at {n} "
            f"({_ranges(st, bad)}); check retained_side and the two grades there"]


def placeholder_soil(walls: Iterable[tuple[str, dict]]) -> list[str]:
    """One line for the walls whose ``[soil] source`` says the values are a placeholder."""
    ids = [w for w, soil in walls if "placeholder" in str(soil.get("source") or "").lower()]
    if not ids:
        return []
    return [f"{_walls(ids)}: the [soil] source says the values are a placeholder; take them "
            "from the site's geotechnical report before this design is used"]


def end_height_warnings(wall: str, station_ft: np.ndarray, retained_height_ft: np.ndarray,
                        limit_ft: float) -> list[str]:
    """A line for each end of the wall still retaining more than ``limit_ft``."""
    st = np.asarray(station_ft, dtype=float)
    h = np.asarray(retained_height_ft, dtype=float)
    if st.size == 0:
        return []
    out = []
    for k, end in ((0, "starts"), (st.size - 1, "ends")):
        if k == 0 and st.size == 1 and end == "ends":
            continue
        if h[k] > limit_ft:
            out.append(f"wall {wall!r} {end} at {format_station(st[k])} still retaining "
                       f"{h[k]:.2f} ft, more than end_height_warn_ft {limit_ft:g}: a return "
                       "wall or a turn-down is needed there")
    return out


def _walls(ids: Sequence[str]) -> str:
    return ("wall " if len(ids) == 1 else "walls ") + ", ".join(repr(w) for w in ids)


def site_warnings(site, walls) -> list[str]:
    """Every guard-rail line for a loaded site and its sampled walls (``WallStations``,
    in site-file order)."""
    lines = soil_warnings((spec.id, dict(spec.soil)) for spec in site.walls)
    lines += placeholder_soil((spec.id, dict(spec.soil)) for spec in site.walls)
    for spec, ws in zip(site.walls, walls, strict=True):
        lines += length_warning(ws.wall, ws.length_ft)
        lines += flipped_grade_warnings(ws.wall, ws.station_ft, ws.retained_height_ft)
        lines += end_height_warnings(ws.wall, ws.station_ft, ws.retained_height_ft,
                                     spec.criteria["end_height_warn_ft"])
        lines += height_jumps(ws.wall, ws.station_ft, ws.retained_height_ft)
        c = spec.criteria
        lines += short_wall_warning(ws.wall, ws.station_ft, ws.retained_height_ft,
                                    c["min_retained_height_ft"], c["segment_min_ft"])
    return lines


def plain_key_warnings(sd) -> list[str]:
    """One line per wall with a ``[seismic]`` case whose segments have a shear key, which the
    engine checks as plain concrete (engine/key.py): ACI 318-19 14.1.4 restricts plain concrete
    in Seismic Design Categories D, E and F (from memory)."""
    lines = []
    for w in sd.walls:
        if sd.inputs[w.wall].loads.seismic is None:
            continue
        keyed = [s.segment for s in w.segments if s.section is not None and s.section.has_key]
        if keyed:
            lines.append(
                f"wall {w.wall!r}: {len(keyed)} segment(s) ({_first(keyed)}) have a "
                "plain-concrete shear key and the wall has a [seismic] case; ACI 318-19 14.1.4 "
                "restricts plain concrete in Seismic Design Categories D, E and F: confirm the "
                "category permits it, or reinforce the key")
    return lines


def _first(ids: Sequence[str], most: int = 4) -> str:
    more = f" and {len(ids) - most} more" if len(ids) > most else ""
    return ", ".join(ids[:most]) + more
