"""One decimal mark per sheet, decided once and said in plain words; a number that reads two ways is flagged.

Expected values are the numbers written in the text (common practice, no source): "1,002" in a
sheet whose readings show a decimal comma is 1.002.
"""

import pytest

from rankwise.readings import CellKind, GroupColumn, ReadingSheet
from rankwise.readings import parse as parse_module
from rankwise.stats.analysis import Question


@pytest.fixture(autouse=True)
def point_machine(monkeypatch):
    """A machine whose locale writes a decimal point (the case where '1,002' once became 1002)."""
    monkeypatch.setattr(parse_module, "machine_decimal", lambda: ".")


def typed(sheet, group, texts):
    for row, text in enumerate(texts):
        sheet.set_text(group, row, text)


def values(sheet, group):
    return [sheet.cell(group, row).value for row in range(len(sheet.groups[group].cells))]


def test_the_first_reading_decides_a_comma_for_the_whole_sheet():
    """Typing 0,998 / 1,002 / 1,010 on a decimal-point machine gives 0.998 / 1.002 / 1.010, not 1002 and 1010."""
    sheet = ReadingSheet([GroupColumn("A"), GroupColumn("B")])
    typed(sheet, 0, ["0,998", "1,002", "1,010"])
    assert values(sheet, 0) == [0.998, 1.002, 1.010]
    assert "decimal comma, as the first reading that shows one, '0,998' (A, row 1)" in sheet.decimal_status


def test_a_reading_typed_before_the_deciding_one_is_read_again():
    sheet = ReadingSheet([GroupColumn("A")])
    sheet.set_text(0, 0, "1,002")
    assert sheet.cell(0, 0).kind is CellKind.INVALID  # could be 1002 or 1.002: nothing shows the mark yet
    assert "could group thousands (1002) or mark decimals (1.002)" in sheet.cell(0, 0).reason
    assert "as this computer is set up, until a reading shows its decimal mark" in sheet.decimal_status
    sheet.set_text(0, 1, "0,998")
    assert values(sheet, 0) == [1.002, 0.998]
    sheet.undo()
    assert sheet.cell(0, 0).kind is CellKind.INVALID
    sheet.redo()
    assert values(sheet, 0) == [1.002, 0.998]


def test_once_decided_the_other_mark_is_flagged_never_multiplied():
    sheet = ReadingSheet([GroupColumn("A")])
    typed(sheet, 0, ["12.5", "1,002", "0,5", "13.25"])
    assert sheet.cell(0, 0).value == 12.5 and sheet.cell(0, 3).value == 13.25
    for row in (1, 2):
        assert sheet.cell(0, row).kind is CellKind.INVALID
        assert sheet.cell(0, row).value is None
    assert "its comma would group thousands (1002), but it may mark decimals (1.002)" in sheet.cell(0, 1).reason


def test_a_stated_mark_decides_and_is_said():
    sheet = ReadingSheet([GroupColumn("A")], decimal=",")
    typed(sheet, 0, ["1.002", "1,5"])
    assert sheet.cell(0, 0).kind is CellKind.INVALID and sheet.cell(0, 1).value == 1.5
    assert sheet.decimal_status == "Numbers are read with a decimal comma, as chosen."
    sheet.set_decimal("auto")
    assert sheet.cell(0, 1).value == 1.5 and sheet.cell(0, 0).kind is CellKind.INVALID  # "1,5" decides a comma


def test_clearing_the_deciding_reading_lets_the_next_one_decide():
    sheet = ReadingSheet([GroupColumn("A"), GroupColumn("B")])
    sheet.set_text(0, 0, "0,5")
    sheet.set_text(1, 0, "2.25")
    assert sheet.cell(1, 0).kind is CellKind.INVALID
    sheet.set_text(0, 0, "")
    assert sheet.cell(1, 0).value == 2.25
    assert "'2.25' (B, row 1)" in sheet.decimal_status


def test_the_analysis_uses_the_decided_mark():
    sheet = ReadingSheet([GroupColumn("A"), GroupColumn("B")])
    typed(sheet, 0, ["0,998", "1,002", "1,010", "1,004"])
    typed(sheet, 1, ["1,012", "1,020", "1,016", "1,011"])
    analysis = sheet.to_analysis(Question.TWO_GROUPS)
    assert analysis.decimal_mark == ","
    assert list(analysis.groups[1].values) == [1.012, 1.020, 1.016, 1.011]


def test_a_sheet_from_a_snapshot_keeps_its_decision():
    sheet = ReadingSheet([GroupColumn("A")])
    typed(sheet, 0, ["0,998", "1,002"])
    again = ReadingSheet.from_snapshot(sheet.snapshot())
    assert again.decimal_status == sheet.decimal_status
    again.set_text(0, 2, "1,010")
    assert again.cell(0, 2).value == 1.010
