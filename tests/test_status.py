"""A status is a code with its reason, printed as the schedule's status text."""

from __future__ import annotations

import pickle
from dataclasses import replace

from designkit import make_design
from wallsched.engine.status import OK, Status, StatusCode


def test_text_is_code_then_reason():
    s = Status(StatusCode.FAILS, "sliding at station 12.00")
    assert s == "fails: sliding at station 12.00"
    assert s.code is StatusCode.FAILS and s.reason == "sliding at station 12.00"
    assert OK == "ok" and OK.ok and not OK.failing
    assert not s.ok and s.failing


def test_which_codes_fail():
    assert {c for c in StatusCode if c.failing} == {
        StatusCode.OVER_LIMIT, StatusCode.NO_SECTION, StatusCode.FAILS, StatusCode.GRADES_CROSS}
    assert not Status(StatusCode.NO_WALL, "retained height below min_retained_height_ft").failing


def test_survives_pickling_and_replace():
    s = Status(StatusCode.NO_SECTION, "nothing on the grid")
    back = pickle.loads(pickle.dumps(s))
    assert back == s and back.code is StatusCode.NO_SECTION and back.reason == s.reason
    seg = make_design().segments[0]
    assert seg.ok
    bad = replace(seg, status=Status(StatusCode.FAILS, "bearing at station 150.00"))
    assert not bad.ok and bad.status.code is StatusCode.FAILS
