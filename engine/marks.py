"""Section marks a contractor can build: at most ``marks_max`` sections for a wall (or for the
site), chosen from the design table, that grow with the design height.

The choice (exact, a dynamic programme over the sorted design heights)
---------------------------------------------------------------------
The rows of the design table are the design heights ``r``; the least-cost segments of the wall
put ``w[r]`` ft of wall at row ``r``. The candidates are the table's own sections; ``cost[c, r]``
is what candidate ``c`` costs per ft at row ``r``'s height (infinite where it does not pass every
check there). A choice assigns every weighted row to one candidate so that

- the assignment is monotone: a taller row never gets a candidate with a smaller footing width,
  footing thickness or stem thickness (:func:`chain_order`, a strict order on the candidates);
- at most ``marks_max`` distinct candidates are used;

and it minimises ``sum_r w[r] cost[c(r), r] + mark_usd * (number of marks)``. Because the order
is transitive, a monotone assignment is a partition of the sorted rows into consecutive
intervals, each with one candidate, the candidates increasing from interval to interval. With
``F_m[b, c]`` the least cost of rows ``lo..b`` in ``m`` intervals, the last one held by ``c``:

    F_1[b, c] = I[c, lo, b]
    F_m[b, c] = min over a <= b, c' < c of  F_{m-1}[a - 1, c'] + I[c, a, b]

where ``I[c, a, b]`` is the cost of rows ``a..b`` held by ``c`` (infinite if one of its weighted
rows is not held) plus ``mark_usd`` for its mark (the chain holds each candidate once). The
optimum is ``min over m <= marks_max, c of F_m[hi, c]``;
``tests/test_marks.py`` compares it with enumeration of every assignment.
"""

from __future__ import annotations

import numpy as np


def chain_order(dims: np.ndarray) -> np.ndarray:
    """``le[a, b]``: candidate ``a`` may come below ``b`` (every dimension of ``dims[a]`` at most
    that of ``dims[b]``; equal dimensions by index only, so the order has no cycle)."""
    d = np.asarray(dims, float)
    le = np.all(d[:, None, :] <= d[None, :, :] + 1e-9, axis=2)
    equal = np.all(np.abs(d[:, None, :] - d[None, :, :]) <= 1e-9, axis=2)
    idx = np.arange(d.shape[0])
    return le & (~equal | (idx[:, None] < idx[None, :]))


def choose_marks(cost: np.ndarray, weight: np.ndarray, le: np.ndarray, marks_max: int,
                 mark_usd):
    """The least-cost monotone assignment of the weighted rows (module docstring).

    Args:
        cost: [candidates, rows] $/ft, ``inf`` where the candidate does not hold the row.
        weight: [rows] ft of wall at each row (0: the row need not be held).
        le: [candidates, candidates] the order of :func:`chain_order`.
        mark_usd: $ per mark used, one number or one per candidate.

    Returns:
        (assignment [rows]: candidate per row, -1 outside the weighted range or where an
        unweighted row is not held by its interval's candidate; total $), or None when no
        assignment within ``marks_max`` holds every weighted row.
    """
    cost = np.asarray(cost, float)
    weight = np.asarray(weight, float)
    C, R = cost.shape
    rows = np.nonzero(weight > 0)[0]
    if rows.size == 0 or C == 0:
        return None
    lo, hi = int(rows[0]), int(rows[-1])
    n = hi - lo + 1
    c_w = cost[:, lo: hi + 1]
    w = weight[lo: hi + 1]
    I_ = _interval_costs(c_w, w, mark_usd)  # [c, a, b]
    pen = np.where(le, 0.0, np.inf)  # [c', c]
    M = max(1, int(marks_max))
    F = [I_[:, 0, :].T]  # F_1[b, c]
    arg_a: list = [None]
    arg_c: list = [None]
    for _ in range(1, M):
        prev = F[-1]  # [n, c']
        g_all = prev[:, :, None] + pen[None, :, :]  # [a', c', c]
        gc = np.argmin(g_all, axis=1)  # [a', c]
        G = np.take_along_axis(g_all, gc[:, None, :], axis=1)[:, 0, :]  # [a', c]
        # rows a..b in the new interval, a >= 1: G[a - 1, c] + I[c, a, b]
        tot = np.full((C, n, n), np.inf)
        tot[:, 1:, :] = G[:-1].T[:, :, None] + I_[:, 1:, :]
        aa = np.argmin(tot, axis=1)  # [c, b]
        F.append(np.take_along_axis(tot, aa[:, None, :], axis=1)[:, 0, :].T)  # [b, c]
        arg_a.append(aa.T)  # [b, c]
        arg_c.append(gc)  # [a', c]
    finals = np.array([f[n - 1] for f in F])  # [m, c]
    m, c = np.unravel_index(int(np.argmin(finals)), finals.shape)
    total = float(finals[m, c])
    if not np.isfinite(total):
        return None
    return _assignment(c_w, lo, R, m, c, arg_a, arg_c), total


def _interval_costs(c_w: np.ndarray, w: np.ndarray, mark_usd) -> np.ndarray:
    """I[c, a, b]: $ of rows a..b held by candidate c with its mark; inf where c does
    not hold a weighted row among them or a > b."""
    C, n = c_w.shape
    weighted = w > 0
    held = np.isfinite(c_w)
    term = np.where(weighted & held, w * np.where(held, c_w, 0.0), 0.0)  # [C, n]
    bad = (weighted & ~held).astype(int)
    p_term = np.concatenate([np.zeros((C, 1)), np.cumsum(term, axis=1)], axis=1)
    p_bad = np.concatenate([np.zeros((C, 1), int), np.cumsum(bad, axis=1)], axis=1)
    a_idx = np.arange(n)[:, None]
    b_idx = np.arange(n)[None, :]
    # I[c, a, b]: rows a..b held by c
    I_ = p_term[:, None, 1:] - p_term[:, :n, None]
    I_ = np.where((p_bad[:, None, 1:] - p_bad[:, :n, None] > 0) | (a_idx > b_idx)[None],
                  np.inf, I_)
    mark = np.broadcast_to(np.asarray(mark_usd, float), (C,))
    I_ = I_ + mark[:, None, None]  # an interval pays for its mark (marks are distinct)
    return I_


def _assignment(c_w, lo, R, m, c, arg_a, arg_c) -> np.ndarray:
    """The candidate per row, traced back from the last interval (m, c)."""
    assign = np.full(R, -1, int)
    b = c_w.shape[1] - 1
    while True:
        a = 0 if m == 0 else int(arg_a[m][b, c])
        for r in range(a, b + 1):
            if np.isfinite(c_w[c, r]):
                assign[lo + r] = c
        if m == 0:
            break
        c = int(arg_c[m][a - 1, c])
        b = a - 1
        m -= 1
    return assign


def _pairs_checked(table, inputs, rates, sections):
    """cost[c, r] ($/ft of candidate c at row r's height, inf where it fails a check there)."""
    from .checks import check_section
    from .section import BarArrays, Reinforcement, SectionGeometry
    from .sizing import candidate_cost

    h = table.heights_ft
    C, R = len(sections), h.size
    col = {name: np.array([getattr(s, name) for s in sections], float)[:, None]
           for name in ("footing_thickness_in", "stem_top_in", "stem_base_in", "toe_ft",
                        "heel_ft", "key_width_in", "key_depth_in", "key_offset_ft")}
    has_key = (col["key_width_in"] > 0) & (col["key_depth_in"] > 0)
    emb = np.maximum(table.embedment_ft, col["footing_thickness_in"] / 12.0
                     + table.footing_cover_ft)
    geo = SectionGeometry(
        retained_height_ft=np.broadcast_to(h[None, :], (C, R)), embedment_ft=emb,
        footing_thickness_in=col["footing_thickness_in"], stem_top_in=col["stem_top_in"],
        stem_base_in=col["stem_base_in"], toe_ft=col["toe_ft"], heel_ft=col["heel_ft"],
        key_width_in=col["key_width_in"], key_depth_in=col["key_depth_in"],
        key_offset_ft=np.where(has_key, col["key_offset_ft"], col["toe_ft"]),
        freeboard_ft=table.freeboard_ft)

    def bars(name):
        return BarArrays(np.array([getattr(s, name).size for s in sections])[:, None],
                         np.array([getattr(s, name).spacing_in for s in sections],
                                  float)[:, None])

    def hooked(name):  # the anchorage each section's bar list shows (issue 14)
        return np.array([bool(getattr(s, name)) for s in sections])[:, None]

    reinf = Reinforcement(stem=bars("stem_bars"), heel=bars("heel_bars"), toe=bars("toe_bars"),
                          horizontal=bars("horizontal_bars"),
                          longitudinal=bars("footing_long_bars"),
                          heel_hooked=hooked("heel_hooked"), toe_hooked=hooked("toe_hooked"))
    res = check_section(geo, inputs, reinf)
    cost = candidate_cost(geo, inputs, rates, reinf.stem, reinf.heel, reinf.toe,
                          reinf.horizontal, reinf.longitudinal, res)
    return np.where(np.broadcast_to(res.passes, (C, R)), np.broadcast_to(cost, (C, R)), np.inf)


def section_dims(sec) -> tuple[float, float, float, float]:
    """What must grow with the design height: footing width, footing thickness, stem."""
    return (sec.footing_width_ft, sec.footing_thickness_in, sec.stem_base_in, sec.stem_top_in)


FALLBACK_USD_PER_FT = 1.0e4  # added to a row's own section outside the chosen marks


NEW_SECTION_USD_PER_FT = 1.0e3  # added to a section new to a revision (the old ones first)


def marked_table(table, inputs, rates, weight: np.ndarray, marks_max: int, mark_usd: float,
                 previous=()):
    """The design table restricted to at most ``marks_max`` sections, chosen for the rows'
    weights (ft of wall per row) by :func:`choose_marks`: every row held by a chosen section
    gets the chosen section of its interval (its cost at that row); a row outside the chosen
    intervals gets the least chosen section between its neighbours' that holds it, else its
    own section at its cost plus ``FALLBACK_USD_PER_FT`` (a further mark, which the segments
    avoid wherever they can). ``previous``: the sections of an earlier run (a revision); they
    are candidates too, with no mark cost, and a section new to the revision is taken only
    where it saves more than ``NEW_SECTION_USD_PER_FT`` per ft, so that an unchanged stretch
    keeps its sections. Returns (table, cost of the choice) or (the table, None) when nothing
    is weighted."""
    from dataclasses import replace

    from .sizing import Choice

    rows = [r for r, ch in enumerate(table.choices) if ch.section is not None]
    if not rows or not np.any(weight > 0):
        return table, None
    sigs: dict = {}
    uniq = []
    old = []
    for s in [*previous, *(table.choices[r].section for r in rows)]:  # distinct sections
        if s.signature() not in sigs:
            sigs[s.signature()] = len(uniq)
            uniq.append(s)
            old.append(len(uniq) <= len(previous))
    old = np.array(old)
    cost = _pairs_checked(table, inputs, rates, uniq)
    le = chain_order(np.array([section_dims(s) for s in uniq]))
    dp_cost = np.where(old[:, None], cost, cost + NEW_SECTION_USD_PER_FT) if previous else cost
    got = choose_marks(dp_cost, weight, le, marks_max, np.where(old, 0.0, mark_usd))
    if got is None:
        return table, None
    assign, total = got
    chosen = sorted({int(c) for c in assign if c >= 0},
                    key=lambda c: int(np.argmax(assign == c)))
    pos = {c: p for p, c in enumerate(chosen)}  # place in the chain
    choices = list(table.choices)
    for r, ch in enumerate(table.choices):
        c = int(assign[r])
        if c < 0:  # the least chosen section between its neighbours' that holds it
            below = [pos[int(x)] for x in assign[:r] if x >= 0]
            above = [pos[int(x)] for x in assign[r + 1:] if x >= 0]
            p_lo = below[-1] if below else 0
            p_hi = above[0] if above else len(chosen) - 1
            fits = [chosen[p] for p in range(p_lo, p_hi + 1) if np.isfinite(cost[chosen[p], r])]
            c = fits[0] if fits else -1
        if c >= 0:
            choices[r] = Choice(ch.design_height_ft, uniq[c], float(cost[c, r]))
        elif ch.section is not None:
            choices[r] = Choice(ch.design_height_ft, ch.section,
                                ch.cost_per_ft + FALLBACK_USD_PER_FT)
    return replace(table, choices=tuple(choices)), total
