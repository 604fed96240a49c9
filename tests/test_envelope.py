"""The per-pixel envelope of a station series keeps every column's extremes and the gaps."""

from __future__ import annotations

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st
from wallsched.exporters.envelope import envelope, envelope_indices


def _columns(x, columns):
    span = float(x[-1] - x[0]) or 1.0
    return np.clip(((x - x[0]) / span * columns).astype(np.int64), 0, columns - 1)


def test_few_points_are_all_kept():
    x = np.arange(100.0)
    assert np.array_equal(envelope_indices(x, np.sin(x), columns=50), np.arange(100))


@settings(max_examples=40, deadline=None)
@given(n=st.integers(500, 20_000), columns=st.integers(20, 120), seed=st.integers(0, 2**16),
       nan_share=st.sampled_from([0.0, 0.01, 0.2]))
def test_every_column_keeps_its_first_last_lowest_and_highest(n, columns, seed, nan_share):
    rng = np.random.default_rng(seed)
    x = np.cumsum(rng.uniform(0.1, 2.0, n))
    y = np.cumsum(rng.normal(0, 1, n))
    y[rng.random(n) < nan_share] = np.nan
    i = envelope_indices(x, y, columns)
    assert np.all(np.diff(i) > 0) and i[0] == 0 and i[-1] == n - 1
    assert i.size <= 4 * columns + 3 * np.count_nonzero(np.isnan(y)) + 2
    col, kept = _columns(x, columns), np.zeros(n, bool)
    kept[i] = True
    for c in np.unique(col):
        m = col == c
        idx = np.flatnonzero(m)
        assert kept[idx[0]] and kept[idx[-1]]
        f = m & ~np.isnan(y)
        if f.any():
            assert np.nanmax(y[kept & f]) == np.nanmax(y[f])
            assert np.nanmin(y[kept & f]) == np.nanmin(y[f])
    # a gap stays a gap: each NaN run keeps its neighbours and one NaN of its own
    nan = np.isnan(y)
    for e in np.flatnonzero(nan[1:] != nan[:-1]):
        assert kept[e] and kept[e + 1]


def test_the_tallest_station_of_a_long_wall_stays_on_the_plot():
    x = np.arange(100_000.0)
    y = np.full(x.size, 8.0)
    y[61_234] = 16.25
    xs, ys = envelope(x, y)
    assert xs.size < 10_000 and ys.max() == 16.25 and xs[np.argmax(ys)] == 61_234.0
