"""Section marks: the exact choice of at most ``marks_max`` sections (engine/marks.py) against
brute force on small cases, and the rules it keeps on a design table."""

import itertools

import numpy as np
import pytest
from wallsched.engine.marks import chain_order, choose_marks


def brute_force(cost, weight, le, marks_max, mark_usd):
    """Every assignment of the weighted rows to candidates: each row held (finite cost), the
    assignment monotone in the chain order (for rows r < r', the same candidate or le), at
    most ``marks_max`` distinct candidates; the least total."""
    C, R = cost.shape
    rows = [r for r in range(R) if weight[r] > 0]
    best = np.inf
    for assign in itertools.product(range(C), repeat=len(rows)):
        used = set(assign)
        if len(used) > marks_max:
            continue
        if any(a != b and not le[a, b] for i, a in enumerate(assign) for b in assign[i + 1:]):
            continue
        total = sum(weight[r] * cost[c, r] for r, c in zip(rows, assign, strict=True))
        best = min(best, total + sum(np.broadcast_to(mark_usd, (C,))[c] for c in used))
    return best


def random_case(rng, C, R):
    dims = rng.integers(0, 4, size=(C, 3)).astype(float)
    le = chain_order(dims)
    cost = rng.uniform(5, 50, size=(C, R))
    cost[rng.uniform(size=(C, R)) < 0.3] = np.inf  # candidates that do not hold a row
    weight = np.where(rng.uniform(size=R) < 0.2, 0.0, rng.uniform(1, 100, size=R))
    return cost, weight, le


@pytest.mark.parametrize("seed", range(40))
def test_the_programme_equals_brute_force(seed):
    # an exact dynamic programme is checked against enumeration of every assignment
    rng = np.random.default_rng(seed)
    C, R = int(rng.integers(2, 5)), int(rng.integers(2, 6))
    cost, weight, le = random_case(rng, C, R)
    marks_max = int(rng.integers(1, 4))
    mark_usd = float(rng.choice([0.0, 50.0, 400.0]))
    if seed % 3 == 0:  # one mark cost per candidate (a revision's old sections cost none)
        mark_usd = rng.choice([0.0, 50.0, 400.0], size=C)
    got = choose_marks(cost, weight, le, marks_max, mark_usd)
    want = brute_force(cost, weight, le, marks_max, mark_usd)
    if not np.isfinite(want):
        assert got is None
        return
    assert got is not None
    assign, total = got
    assert total == pytest.approx(want)
    # the assignment it returns is one that achieves the total and keeps the rules
    rows = np.nonzero(weight > 0)[0]
    used = [int(assign[r]) for r in rows]
    assert len(set(used)) <= marks_max
    assert all(a == b or le[a, b] for i, a in enumerate(used) for b in used[i + 1:])
    again = sum(weight[r] * cost[assign[r], r] for r in rows) + sum(
        np.broadcast_to(mark_usd, (C,))[c] for c in set(used))
    assert again == pytest.approx(total)


def test_chain_order_is_componentwise_and_acyclic():
    dims = np.array([[1.0, 1, 1], [2, 1, 1], [1, 2, 0], [1.0, 1, 1]])
    le = chain_order(dims)
    assert le[0, 1] and not le[1, 0]  # grows in the first component only
    assert not le[0, 2] and not le[2, 0]  # one grows, one shrinks: not comparable
    assert le[0, 3] != le[3, 0]  # equal dimensions: one way only (no cycle)
    assert not le.diagonal().any()


def test_one_mark_when_marks_are_dear():
    # closed form: with a mark cost above any saving, the one section holding every row wins
    cost = np.array([[10.0, np.inf], [12.0, 13.0]])
    weight = np.array([10.0, 10.0])
    le = chain_order(np.array([[1.0, 1, 1], [2, 2, 2]]))
    assign, total = choose_marks(cost, weight, le, 6, 1.0e6)
    assert list(assign) == [1, 1] and total == pytest.approx(250.0 + 1.0e6)
    assign, total = choose_marks(cost, weight, le, 6, 0.0)
    assert list(assign) == [0, 1] and total == pytest.approx(230.0)
