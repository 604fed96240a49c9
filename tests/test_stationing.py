"""Station notation: 12+34.56 means 1234.56 ft along the alignment (common practice)."""

import pytest
from hypothesis import given
from hypothesis import strategies as st
from wallsched.profile.stationing import format_station, parse_station

EXAMPLES = [  # (text, feet, formatted)  # common practice station notation
    ("12+34.56", 1234.56, "12+34.56"),
    ("0+00", 0.0, "0+00.00"),
    ("-0+50", -50.0, "-0+50.00"),
    ("-1+25.5", -125.5, "-1+25.50"),
    ("1234.56", 1234.56, "12+34.56"),
    ("STA 12+34.56", 1234.56, "12+34.56"),
    ("sta. 3+05", 305.0, "3+05.00"),
    ("105+00.004", 10500.004, "105+00.00"),
    ("7", 7.0, "0+07.00"),
]


@pytest.mark.parametrize(("text", "feet", "formatted"), EXAMPLES)
def test_examples(text, feet, formatted):
    assert parse_station(text) == pytest.approx(feet, abs=1e-9)
    assert format_station(feet) == formatted


@pytest.mark.parametrize("bad", ["12+3", "12+345", "abc", "", "1+2+3", "nan", "inf", "12 34"])
def test_refuses(bad):
    with pytest.raises(ValueError):
        parse_station(bad)


def test_rounding_carries_into_hundreds():
    assert format_station(99.999) == "1+00.00"
    assert format_station(-0.001) == "0+00.00"  # no "-0+00.00"


@given(st.integers(min_value=-10**9, max_value=10**9))
def test_round_trip_cents(cents):
    feet = cents / 100
    assert parse_station(format_station(feet)) == pytest.approx(feet, abs=1e-6)


@given(st.floats(min_value=-1e6, max_value=1e6, allow_nan=False))
def test_round_trip_any_float_to_cent(feet):
    back = parse_station(format_station(feet))
    assert abs(back - feet) <= 0.005 + 1e-9
