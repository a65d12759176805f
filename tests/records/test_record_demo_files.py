"""Every demo file (invented readings) is opened, analysed, written as a signed record, reopened and verified."""

from pathlib import Path

import pytest
from openpyxl import load_workbook

from rankwise.readings import ReadingSheet, open_readings
from rankwise.records import ResultRecord, read_record, verify_record, write_record
from rankwise.records.readings_sheet import FIRST_ENTRY_ROW
from rankwise.stats.analysis import Question, Settings
from rankwise.stats.service import run

from record_builders import signoff

DEMO = Path(__file__).resolve().parents[2] / "demo_files"
QUESTIONS = {
    "two_wheels_roughness.csv": Question.TWO_GROUPS,
    "push_out_force_three_presses.xlsx": Question.SEVERAL,
    "coating_before_after_cure.csv": Question.PAIRED,
    "long_export.csv": Question.TWO_GROUPS,
    "gauge_sheet_bore_diameter.xlsx": Question.TWO_GROUPS,
}


MANY_CHARACTERISTICS = {"housing_two_dies.csv"}
"""Opened by open_characteristics; written, reopened and verified in test_characteristics_record.py."""


def test_every_demo_file_is_covered():
    assert set(QUESTIONS) | MANY_CHARACTERISTICS == {p.name for p in DEMO.iterdir() if p.suffix in (".csv", ".xlsx")}


@pytest.mark.parametrize("name", sorted(QUESTIONS))
def test_demo_file_written_reopened_and_verified(tmp_path, name):
    source = DEMO / name
    original = source.read_bytes()
    sheet = ReadingSheet.from_reading_set(open_readings(source))
    analysis = sheet.to_analysis(QUESTIONS[name], Settings(characteristic=f"demo: {name}"))
    record = ResultRecord.now(analysis, sheet.snapshot(), run(analysis), signoff())
    path = tmp_path / "record.xlsx"
    write_record(path, record)

    back = read_record(path)
    assert back.result == record.result
    assert back.snapshot == record.snapshot
    verification = verify_record(path)
    assert verification.status == "intact", verification.differences

    book = load_workbook(path)
    cell = book["Readings as entered"].cell(row=FIRST_ENTRY_ROW, column=2)
    assert isinstance(cell.value, float)
    cell.value = cell.value + 1.0
    book.save(tmp_path / "edited.xlsx")
    assert verify_record(tmp_path / "edited.xlsx").status == "changed"
    assert source.read_bytes() == original  # an opened file is never changed
