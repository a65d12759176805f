"""The result workbook as an auditor reads it, printed or on screen: nothing cut off, every page
titled and numbered, key numbers shown as their worded text, whichever decimal mark was typed."""

import math
from datetime import datetime
from pathlib import Path

import pytest
from openpyxl import load_workbook
from openpyxl.utils import get_column_letter

from rankwise.readings import ReadingSheet, open_characteristics, open_readings
from rankwise.records import ResultRecord, write_record
from rankwise.records.readings_sheet import FIRST_ENTRY_ROW
from rankwise.records.sheet_cells import LINE_HEIGHT, key_number_cell
from rankwise.records.workbook import PROGRAM_SHEET
from rankwise.stats.analysis import Question, Settings
from rankwise.stats.service import run
from rankwise.wording import key_numbers
from rankwise.wording.verdict_types import KeyNumber

from record_builders import paired_record, plan_record, several_record, signoff

DEMO = Path(__file__).resolve().parents[2] / "demo_files"


def two_wheels_record():
    """The two-wheels demo file (invented readings, written with a decimal comma), one-sided, with
    an equivalence margin: the two-group verdict with the longest texts."""
    sheet = ReadingSheet.from_reading_set(open_readings(DEMO / "two_wheels_roughness.csv"))
    settings = Settings(alternative="b-less", margin=0.05, characteristic="Ra after finish grinding")
    analysis = sheet.to_analysis(Question.TWO_GROUPS, settings, groups=[0, 1])
    return ResultRecord.now(analysis, sheet.snapshot(), run(analysis), signoff())


BUILDERS = {"paired": paired_record, "several groups": several_record, "plan": plan_record,
            "two groups, decimal comma": two_wheels_record}
DATE_TIME_CHARACTERS = len("2026-11-30 14:05:09")
"""What a date and time in the records' format takes; a narrower column shows ### instead."""


@pytest.fixture(params=sorted(BUILDERS))
def written(request, tmp_path):
    record = BUILDERS[request.param]()
    path = tmp_path / "record.xlsx"
    write_record(path, record)
    return record, load_workbook(path)


def visible(book):
    return [sheet for sheet in book.worksheets if sheet.title != PROGRAM_SHEET]


def width_of(sheet, cell):
    """Characters of room for ``cell``: its column, or all columns of the merged range it starts."""
    for merged in sheet.merged_cells.ranges:
        if merged.min_row == cell.row and merged.min_col == cell.column:
            return sum(sheet.column_dimensions[get_column_letter(c)].width or 8.43
                       for c in range(merged.min_col, merged.max_col + 1))
    return sheet.column_dimensions[cell.column_letter].width or 8.43


def spills_into_empty_printed_cells(sheet, cell, room):
    """True when a text too long for its cell runs on over empty cells inside the printed columns."""
    column = cell.column
    while room <= len(cell.value):
        column += 1
        if column > sheet.max_column or sheet.cell(row=cell.row, column=column).value is not None:
            return False
        room += sheet.column_dimensions[get_column_letter(column)].width or 8.43
    return True


def test_every_visible_sheet_prints_to_the_page_width_with_its_name_and_page_numbers(written):
    _, book = written
    for sheet in visible(book):
        setup = sheet.page_setup
        assert sheet.sheet_properties.pageSetUpPr.fitToPage, sheet.title
        one_page = 1 if sheet.title == "Verdict" else 0  # the verdict sheet prints on one page
        assert (int(setup.fitToWidth), int(setup.fitToHeight)) == (1, one_page), sheet.title
        assert int(setup.paperSize) == int(sheet.PAPERSIZE_A4), sheet.title
        assert "&A" in sheet.oddFooter.center.text and "&P" in sheet.oddFooter.center.text, sheet.title
        assert sheet.protection.sheet, sheet.title


def test_long_tables_repeat_their_headings_on_every_printed_page(written):
    _, book = written
    readings = book["Readings as entered"]
    assert readings.print_title_rows == f"${FIRST_ENTRY_ROW - 1}:${FIRST_ENTRY_ROW - 1}"
    assert readings.cell(row=FIRST_ENTRY_ROW - 1, column=1).value == "Entry"
    table = book.worksheets[2]
    heading_row = int(table.print_title_rows.split(":")[0].lstrip("$"))
    assert all(table.cell(row=heading_row, column=c).font.bold for c in (1, 2, 3))


def assert_no_text_cut_off(sheet):
    """Every text fits its cell, runs on over empty printed cells, or wraps in a row tall enough."""
    for row in sheet.iter_rows():
        for cell in row:
            if not isinstance(cell.value, str):
                continue
            room = width_of(sheet, cell)
            if len(cell.value) < room:
                continue
            where = f"{sheet.title}!{cell.coordinate} ({cell.value[:40]}...)"
            if not cell.alignment.wrap_text:
                assert spills_into_empty_printed_cells(sheet, cell, room), where
                continue
            lines = math.ceil(len(cell.value) / (room - 1))
            assert (sheet.row_dimensions[cell.row].height or LINE_HEIGHT) >= LINE_HEIGHT * lines, where


def test_no_text_is_cut_off_a_long_text_wraps_in_a_row_tall_enough(written):
    _, book = written
    for sheet in visible(book):
        assert_no_text_cut_off(sheet)


def test_dates_and_key_numbers_fit_their_column_instead_of_showing_hashes(written):
    record, book = written
    verdict = book["Verdict"]
    for row in verdict.iter_rows():
        for cell in row:
            if isinstance(cell.value, datetime):
                assert width_of(verdict, cell) > DATE_TIME_CHARACTERS, cell.coordinate
    value_room = verdict.column_dimensions["B"].width
    for number in key_numbers(record.result, record.analysis):
        if number.value is not None:  # a worded value wraps (checked above); a number cannot
            assert len(number.text) < value_room, number.text


def key(text, value):
    return KeyNumber(key="k", label="k", text=text, tooltip="", value=value)


@pytest.mark.parametrize("text, value, expected", [
    # The number format code of a workbook always writes its decimal separator as a point, and the
    # spreadsheet program shows it with the reader's own mark (ECMA-376 Part 1, 18.8.30 numFmt).
    ("0,43 µm", 0.43, '0.00" µm"'),
    ("0.43 µm", 0.43, '0.00" µm"'),
    ("-4,202", -4.2024, "0.000"),
    ("8,5 %", 0.085, "0.0%"),
    ("< 0,0001", 3e-9, '[<0.0001]"< 0,0001";0.0000'),
    ("< 0.0001", 3e-9, '[<0.0001]"< 0.0001";0.0000'),
    ("18", 18.0, "0"),
])
def test_a_key_number_written_with_either_decimal_mark_keeps_its_resolution_and_unit(text, value, expected):
    assert key_number_cell(key(text, value)) == (value, expected)


def test_a_key_number_without_a_value_is_written_as_its_text():
    assert key_number_cell(key("—", None)) == ("—", None)


@pytest.mark.parametrize("margin_share", [None, 0.3])
def test_a_many_characteristics_record_shows_its_dates_and_cuts_off_no_text(tmp_path, margin_share):
    """The housing demo (invented readings) compared on every characteristic: the summary's sign-off
    dates have room in their column (they showed ### when printed), and no text is cut off; with a
    margin of 30 % of each tolerance the outcomes are the longest ("moved down, within the margin")."""
    table = open_characteristics(DEMO / "housing_two_dies.csv")
    analysis = table.to_analysis("old die", "new die", settings=Settings(), margin_share=margin_share)
    record = ResultRecord.now(analysis, table.snapshot("old die", "new die"), run(analysis), signoff())
    path = tmp_path / "characteristics.xlsx"
    write_record(path, record)
    book = load_workbook(path)
    dates = 0
    for sheet in visible(book):
        for row in sheet.iter_rows():
            for cell in row:
                if isinstance(cell.value, datetime):
                    dates += 1
                    assert width_of(sheet, cell) > DATE_TIME_CHARACTERS, f"{sheet.title}!{cell.coordinate}"
    assert dates >= 2  # signed at, record written at
    for sheet in visible(book):
        assert_no_text_cut_off(sheet)
