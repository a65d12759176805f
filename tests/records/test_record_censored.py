"""A record of readings below different detection limits, treated as below the highest limit as chosen."""

from dataclasses import replace

from openpyxl import load_workbook

from rankwise.readings import GroupColumn, ReadingSheet, parse_reading
from rankwise.records import ResultRecord, read_record, verify_record, write_record
from rankwise.stats.analysis import Question, Settings
from rankwise.stats.service import run

from record_builders import signoff

# Invented readings (mg), some written below 0.05 or 0.10, one measured under 0.10.
BEFORE = ["<0.05", "0.21", "0.18", "<0.10", "0.25", "0.08", "0.22"]
AFTER = ["0.31", "0.28", "<0.05", "0.35", "0.30", "0.33", "0.29"]


def mixed_limits_record():
    sheet = ReadingSheet(
        [GroupColumn(name, unit="mg", cells=[parse_reading(t, decimal=".") for t in texts])
         for name, texts in (("Before", BEFORE), ("After", AFTER))],
        decimal=".", mixed_limits="below-highest",
    )
    analysis = sheet.to_analysis(Question.TWO_GROUPS, Settings(characteristic="residue"))
    return ResultRecord.now(analysis, sheet.snapshot(), run(analysis), signoff())


def test_the_record_writes_reopens_and_verifies_intact(tmp_path):
    path = tmp_path / "mixed-limits.xlsx"
    record = mixed_limits_record()
    write_record(path, record)
    back = read_record(path)
    assert back.snapshot.mixed_limits == "below-highest"
    assert back.snapshot == record.snapshot and back.analysis == record.analysis
    assert ReadingSheet.from_snapshot(back.snapshot).mixed_limits == "below-highest"
    verification = verify_record(path)
    assert verification.status == "intact", verification.differences


def test_the_record_shows_what_was_done_with_the_readings(tmp_path):
    path = tmp_path / "mixed-limits.xlsx"
    write_record(path, mixed_limits_record())
    book = load_workbook(path)
    shown = [cell.value for sheet in book.worksheets if sheet.sheet_state == "visible"
             for row in sheet.iter_rows() for cell in row if isinstance(cell.value, str)]
    assert any("as chosen, all are treated as below the highest limit 0.10" in text for text in shown)
    assert any("1 reading measured below 0.10 (in Before)" in text for text in shown)


def test_a_record_whose_readings_no_longer_carry_the_choice_is_not_intact(tmp_path):
    """The readings as entered, read again with the stored setting, must give the analysed readings."""
    path = tmp_path / "asked.xlsx"
    record = mixed_limits_record()
    write_record(path, replace(record, snapshot=replace(record.snapshot, mixed_limits="ask")))
    verification = verify_record(path)
    assert verification.status == "changed"
    assert any("readings as entered" in difference for difference in verification.differences)
