"""Reading typed values: decimal marks, signs, exponents, units, notes, censored and unreadable entries.

Expected values are the numbers written in the text (common practice, no source): a typed "0,42"
with a decimal comma is 0.42.
"""

import math

import pytest

from rankwise.readings import CellKind, parse_reading
from rankwise.readings import parse as parse_module


@pytest.fixture
def point_machine(monkeypatch):
    """A machine whose locale writes a decimal point."""
    monkeypatch.setattr(parse_module, "machine_decimal", lambda: ".")


@pytest.fixture
def comma_machine(monkeypatch):
    """A machine whose locale writes a decimal comma."""
    monkeypatch.setattr(parse_module, "machine_decimal", lambda: ",")


@pytest.mark.parametrize(
    ("text", "value", "decimals"),
    [
        ("0.42", 0.42, 2),
        ("0,42", 0.42, 2),
        ("  12  ", 12.0, 0),
        ("\u22120,5", -0.5, 1),
        ("- 0.5", -0.5, 1),
        ("+3", 3.0, 0),
        (".5", 0.5, 1),
        ("1e-3", 0.001, 3),
        ("1,2E-3", 0.0012, 4),
        ("1.5e3", 1500.0, 0),
        ("1.234,5", 1234.5, 1),
        ("1,234.5", 1234.5, 1),
        ("1 234,5", 1234.5, 1),
        ("1\u00a0234.5", 1234.5, 1),
        ("1,234,567", 1234567.0, 0),
        ("0,123", 0.123, 3),
        ("0.420", 0.42, 3),
    ],
)
def test_numbers_are_read_with_their_typed_resolution(point_machine, text, value, decimals):
    """Unambiguous numbers read the same on any machine, and keep how many decimals were typed."""
    cell = parse_reading(text)
    assert cell.kind is CellKind.NUMBER
    assert cell.value == pytest.approx(value, rel=1e-15)
    assert cell.decimals == decimals
    assert cell.text == text
    assert cell.reason == ""


def test_a_number_that_reads_two_ways_is_read_with_the_machine_mark_or_flagged(point_machine):
    """On a decimal-point machine '1.234' is 1.234; '1,234' could be 1234 or 1.234: flagged, never
    read as 1234 (common practice, no source: the other mark changes the reading a thousandfold)."""
    assert parse_reading("1.234").value == pytest.approx(1.234)
    cell = parse_reading("1,234")
    assert cell.kind is CellKind.INVALID and cell.value is None
    assert "its comma could group thousands (1234) or mark decimals (1.234)" in cell.reason


def test_the_same_on_a_decimal_comma_machine(comma_machine):
    assert parse_reading("1,234").value == pytest.approx(1.234)
    assert parse_reading("1,234").decimals == 3
    cell = parse_reading("1.234")
    assert cell.kind is CellKind.INVALID and "(1234) or mark decimals (1,234)" in cell.reason


@pytest.mark.parametrize(
    ("text", "mark"),
    [("0,42", ","), ("0.42", "."), ("1,234.5", "."), ("1.234,5", ","), ("12,5", ","), ("<0,05", ","),
     ("1,234", None), ("1.234", None), ("12", None), ("1,234,567", None), ("scrap", None), ("0,42 µm", ",")],
)
def test_the_decimal_mark_a_number_shows(text, mark):
    assert parse_module.decimal_shown(text) == mark


def test_an_explicit_decimal_setting_decides_and_flags_the_other_mark():
    """With a decimal comma '1,234' is 1.234; '1.234' would be 1234 there but may mean 1.234: flagged."""
    assert parse_reading("1,234", decimal=",").value == pytest.approx(1.234)
    assert parse_reading("1.234", decimal=".").value == pytest.approx(1.234)
    point = parse_reading("1,002", decimal=".")
    assert point.kind is CellKind.INVALID
    assert "its comma would group thousands (1002), but it may mark decimals (1.002)" in point.reason
    comma = parse_reading("1.002", decimal=",")
    assert comma.kind is CellKind.INVALID
    assert "type 1002 or 1,002 to say which" in comma.reason
    assert parse_reading("1,234,567", decimal=".").value == 1234567.0  # two commas: only thousands
    assert parse_reading("1.234.567", decimal=",").value == 1234567.0


@pytest.mark.parametrize(
    ("text", "why"),
    [("2e-400", "too small"), ("1e-310", "too small"), ("-3E-330", "too small"), ("1e309", "too large"),
     ("inf", "not a finite number"), ("-Infinity", "not a finite number"), ("NaN", "not a finite number"),
     ("\u221e", "not a finite number"), ("0." + "0" * 400 + "1", "too long"), ("0." + "0" * 180 + "1e-200", "too small")],
)
@pytest.mark.parametrize("decimal", ["auto", ".", ","])
def test_numbers_a_float_cannot_hold_are_flagged_not_turned_into_zero_or_infinity(text, why, decimal):
    """A binary64 float holds magnitudes from about 2.2e-308 (normal) to 1.8e308 (IEEE 754; from memory)."""
    cell = parse_reading(text.replace(".", decimal) if decimal == "," else text, decimal=decimal)
    assert cell.kind is CellKind.INVALID and cell.value is None
    assert why in cell.reason


def test_a_written_zero_is_still_zero():
    assert parse_reading("0.000", decimal=".").value == 0.0
    assert parse_reading("0e-400", decimal=".").value == 0.0
    assert parse_reading("-0,0", decimal=",").value == 0.0


def test_a_comma_in_a_decimal_point_sheet_is_refused_with_advice():
    """'0,42' cannot be thousands; in a decimal-point sheet it is refused, not guessed."""
    cell = parse_reading("0,42", decimal=".")
    assert cell.kind is CellKind.INVALID
    assert "decimal" in cell.reason and cell.text == "0,42"


@pytest.mark.parametrize("text", ["0,4,2", "12..5", "1.2.3", "12 5", "1,2,3.4", "1e999"])
def test_broken_numbers_are_invalid_and_keep_their_text(point_machine, text):
    """A number attempt that cannot be read is marked invalid with a reason, never guessed."""
    cell = parse_reading(text)
    assert cell.kind is CellKind.INVALID
    assert cell.value is None
    assert cell.text == text
    assert text.strip()[:3] in cell.reason


@pytest.mark.parametrize("text", ["n/a", "scrap", "re-measure", "-", "\u2014", "re-measure 2", "information"])
def test_text_notes_are_kept_as_notes(text):
    """Words are notes: skipped with a reason, never turned into numbers."""
    cell = parse_reading(text)
    assert cell.kind is CellKind.NOTE
    assert cell.value is None
    assert text in cell.reason


@pytest.mark.parametrize("text", ["", "   ", "\t"])
def test_blanks_are_empty(text):
    cell = parse_reading(text)
    assert cell.kind is CellKind.EMPTY and cell.text == text


@pytest.mark.parametrize("text", ["0,42 µm", "0,42µm", "0,42 um", "0,42 \u03bcm"])
def test_the_groups_unit_may_follow_the_number(text):
    """The group's unit after the number is accepted; 'um' and the Greek mu count as the micro sign."""
    cell = parse_reading(text, unit="µm")
    assert cell.kind is CellKind.NUMBER and cell.value == pytest.approx(0.42)


def test_a_different_unit_is_refused():
    cell = parse_reading("0,42 mm", unit="µm")
    assert cell.kind is CellKind.INVALID
    assert "mm" in cell.reason and "µm" in cell.reason


def test_a_unit_on_a_group_without_unit_is_refused():
    cell = parse_reading("12 N")
    assert cell.kind is CellKind.INVALID and "no unit" in cell.reason


@pytest.mark.parametrize(("text", "limit", "decimals"), [("<0.05", 0.05, 2), ("< 0,05 µm", 0.05, 2), ("\u22643", 3.0, 0)])
def test_below_a_detection_limit_is_censored(text, limit, decimals):
    """'<0.05' is kept as censored with its limit; it is not dropped and not turned into 0.05."""
    cell = parse_reading(text, unit="µm")
    assert cell.kind is CellKind.CENSORED
    assert cell.value is None
    assert cell.limit == pytest.approx(limit)
    assert cell.decimals == decimals


@pytest.mark.parametrize("text", ["<", "<abc", ">5", "<0,4,2"])
def test_unreadable_limits_are_invalid(point_machine, text):
    assert parse_reading(text).kind is CellKind.INVALID


def test_a_huge_cell_is_not_a_reading():
    cell = parse_reading("1" * 5000)
    assert cell.kind is CellKind.INVALID and "too long" in cell.reason


def test_wrong_arguments_raise_value_error_naming_them():
    with pytest.raises(ValueError, match="decimal"):
        parse_reading("1", decimal=";")
    with pytest.raises(ValueError, match="text"):
        parse_reading(1.5)


def test_parsed_numbers_are_exactly_the_decimal_text():
    """A typed decimal gives the float nearest to it, so equal texts tie exactly (no float noise)."""
    assert parse_reading("0,3", decimal=",").value == 0.3
    assert parse_reading("2.675").value == float("2.675")
    assert not math.isnan(parse_reading("0").value)


def test_machine_decimal_follows_the_locale_variables(monkeypatch):
    """de_DE writes a decimal comma, en_US a point (common practice, no source)."""
    parse_module.machine_decimal.cache_clear()
    monkeypatch.setenv("LC_ALL", "de_DE.UTF-8")
    assert parse_module.machine_decimal() == ","
    parse_module.machine_decimal.cache_clear()
    monkeypatch.setenv("LC_ALL", "en_US.UTF-8")
    assert parse_module.machine_decimal() == "."
    parse_module.machine_decimal.cache_clear()
