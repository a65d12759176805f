"""Numbers as people read them: resolution, p-values, percentages (formatting rules of our own)."""

import math

import pytest

from rankwise.wording.numbers import (
    MISSING,
    format_centre,
    format_count,
    format_level,
    format_p,
    format_percent,
    format_reading,
    format_setting,
    write_numbers,
)


def test_readings_are_shown_at_the_gauge_resolution():
    assert format_reading(0.4, 2) == "0.40"
    assert format_reading(12.0, 0) == "12"
    assert format_reading(-0.0001, 2) == "0.00"  # no "-0.00"
    assert format_reading(1234.5678, None) == "1234.57"
    assert format_reading(None, 2) == MISSING
    assert format_reading(math.nan, 2) == MISSING


def test_negative_decimals_are_refused_with_the_argument_named():
    with pytest.raises(ValueError, match="decimals"):
        format_reading(1.0, -1)


def test_medians_get_one_more_decimal_only_when_they_fall_between_gauge_steps():
    assert format_centre(1.68, 2) == "1.68"
    assert format_centre(0.425, 2) == "0.425"
    assert format_centre(-0.46, 3) == "-0.460"


def test_user_settings_are_never_rounded_away():
    assert format_setting(0.05, 1) == "0.05"
    assert format_setting(0.5, 2) == "0.50"
    assert format_setting(2.0, None) == "2"


@pytest.mark.parametrize(
    ("p", "shown"),
    [(0.00186, "0.00186"), (0.2544, "0.254"), (0.0373, "0.0373"), (0.00001, "< 0.0001"),
     (0.68, "0.680"), (1.0, "1.000")],
)
def test_p_values_are_shown_with_three_significant_digits_or_as_a_bound(p, shown):
    assert format_p(p) == shown


def test_a_p_value_just_above_alpha_never_looks_like_alpha():
    """0.05004 rounds to 0.0500, which would read as significant at 5 %; more digits are shown."""
    assert format_p(0.05004) == "0.0500"
    assert format_p(0.05004, alpha=0.05) == "0.05004"
    assert format_p(0.049996, alpha=0.05) == "0.0500"  # at or below alpha either way


def test_p_outside_zero_to_one_is_refused():
    with pytest.raises(ValueError, match="p must lie between 0 and 1"):
        format_p(1.5)


def test_levels_percentages_and_counts():
    assert format_level(0.05) == "5 %"
    assert format_level(0.025) == "2.5 %"
    assert format_percent(0.784) == "78 %"
    assert format_count(17.0) == "17"
    assert format_count(17.5) == "17.5"


def test_numbers_are_written_with_the_decimal_mark_the_technician_typed():
    assert format_reading(0.38, 2, mark=",") == "0,38"
    assert format_p(0.0325, mark=",") == "0,0325"
    assert format_p(0.00001, mark=",") == "< 0,0001"
    assert format_percent(0.125, 1, mark=",") == "12,5 %"
    assert format_count(2.5, mark=",") == "2,5"
    assert format_count(12, mark=",") == "12"
    with pytest.raises(ValueError, match="mark"):
        format_reading(0.38, 2, mark=";")


def test_a_worded_text_changes_its_numbers_only_never_a_typed_name_or_a_full_stop():
    text = "Die 1.5 reads 0.38 µm. Shift -0.08 (95 % interval 0.02 to 0.10)."
    assert write_numbers(text, ",", keep=["Die 1.5", "µm"]) == (
        "Die 1.5 reads 0,38 µm. Shift -0,08 (95 % interval 0,02 to 0,10).")
    assert write_numbers(text, ".", keep=["Die 1.5"]) == text
