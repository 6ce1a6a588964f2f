"""units.py: exact inch, parsing what people type, formatting to a resolution."""

from fractions import Fraction

import pytest
from hypothesis import given, strategies as st

from shopterm.errors import InvalidEntry
from shopterm.units import (MM_PER_INCH, decimals_for, format_length, from_mm, parse_length,
                            parse_number, round_to, split_unit, to_mm)


def test_inch_is_exactly_25_4_mm():
    assert MM_PER_INCH == 25.4  # NIST SP 811 / ISO 31-1: 1 in = 25.4 mm exactly (1959)
    assert to_mm(1, "in") == 25.4


@pytest.mark.parametrize("text, unit, mm", [
    ("0.2453", "in", 0.2453 * 25.4),
    (".2453", "in", 0.2453 * 25.4),
    ("0,2453", "in", 0.2453 * 25.4),
    ("6.23mm", "in", 6.23),          # an explicit suffix wins over the default unit
    ("6.23 mm", "in", 6.23),
    ("0.2453in", "mm", 0.2453 * 25.4),
    ('.2453"', "mm", 0.2453 * 25.4),
    ("3/8", "in", float(Fraction(3, 8)) * 25.4),
    ("1-1/2", "in", 1.5 * 25.4),
    ("1 1/2", "in", 1.5 * 25.4),
    ("6,23", "mm", 6.23),
    ("  12.5  ", "mm", 12.5),
])
def test_parse_length_accepts_what_people_type(text, unit, mm):
    assert parse_length(text, unit) == pytest.approx(mm, rel=1e-12)  # exact arithmetic, no source needed


@pytest.mark.parametrize("text", ["", "abc", "1..2", "1,2.3", "1/0", "5 ft", "mm", "--1", "1e999",
                                  "3/", "1-1/0", "½"])
def test_bad_entries_raise_invalid_entry_with_advice(text):
    with pytest.raises(InvalidEntry) as err:
        parse_length(text)
    assert str(err.value)  # a message for the user
    assert "ft" not in text or "not a unit" in str(err.value)


def test_split_unit():
    assert split_unit("6.23 mm") == ("6.23", "mm")
    assert split_unit('.2453"') == (".2453", "in")
    assert split_unit("12") == ("12", None)


@pytest.mark.parametrize("mm", [0.0, 1.0, 6.35, 25.4, 123.456789])
def test_round_trip_mm_in(mm):
    assert to_mm(from_mm(mm, "in"), "in") == pytest.approx(mm, abs=1e-12)


@pytest.mark.parametrize("res, d", [(0.001, 3), (0.0001, 4), (0.0005, 4), (0.01, 2), (1, 0),
                                    (0.02, 2)])
def test_decimals_for(res, d):
    assert decimals_for(res) == d


def test_format_length():
    assert format_length(25.4, "in") == "1.0000 in"
    assert format_length(9.0254, "mm", 0.01) == "9.03 mm"
    assert format_length(0.0127, "in", 0.0005) == "0.0005 in"
    assert format_length(-0.0001, "mm", suffix=False) == "0.000"
    assert round_to(0.0126, 0.005) == pytest.approx(0.015)


@given(st.text(max_size=30))
def test_no_input_crashes_the_parser(text):
    try:
        value = parse_length(text)
    except InvalidEntry as exc:
        assert str(exc)
    else:
        assert value == value  # a real float, never NaN


@given(st.floats(min_value=0, max_value=1e4, allow_nan=False))
def test_decimal_text_round_trips(x):
    assert parse_number(repr(x)) == x
