"""Limits and unit stated once in a file's title block reach every group (common practice, no source)."""

from pathlib import Path

from rankwise.readings import ReadingSheet, open_readings
from rankwise.readings.title_block import read_title_block

DEMO = Path(__file__).resolve().parents[2] / "demo_files"


def test_limits_and_nominal_beside_their_labels():
    rows = [["Bore diameter (mm)", "", ""], ["LSL", "25.000", ""], ["Upper limit:", "25.021"], ["Nominal", "25.010"]]
    details = read_title_block(rows, ".")
    assert (details.lsl, details.usl, details.nominal, details.unit) == (25.0, 25.021, 25.01, "mm")
    assert details.note == "From the title block, for every group: LSL 25, USL 25.021, nominal 25.01."


def test_decimal_comma_and_a_unit_after_the_number():
    details = read_title_block([["Ra (µm)"], ["USL", "0,80 µm"]], ",")
    assert (details.lsl, details.usl, details.unit) == (None, 0.8, "µm")


def test_limits_in_the_wrong_order_are_left_out_with_a_note():
    details = read_title_block([["LSL", "2"], ["USL", "1"]], ".")
    assert details.lsl is None and details.usl is None
    assert "LSL 2 above USL 1" in details.note


def test_unlabelled_numbers_and_prose_are_not_limits():
    details = read_title_block([["Operator", "12"], ["lsl checked by the supervisor"], ["Order 4711"]], ".")
    assert (details.lsl, details.usl, details.nominal, details.note) == (None, None, None, "")


def test_gauge_sheet_demo_carries_its_limits_into_the_sheet():
    reading_set = open_readings(DEMO / "gauge_sheet_bore_diameter.xlsx")
    assert [(g.unit, g.lsl, g.usl) for g in reading_set.groups] == [("mm", 25.0, 25.021)] * 2
    assert "From the title block, for every group: LSL 25, USL 25.021." in reading_set.notes
    sheet = ReadingSheet.from_reading_set(reading_set)
    assert [(g.lsl, g.usl) for g in sheet.groups] == [(25.0, 25.021)] * 2


def test_a_file_without_a_title_block_gets_no_limits():
    reading_set = open_readings(DEMO / "two_wheels_roughness.csv")
    assert all(g.lsl is None and g.usl is None for g in reading_set.groups)
