"""Checking a record: untouched is intact; any edit made with a spreadsheet library is found."""

import json
import re

import pytest
from openpyxl import load_workbook

from rankwise.records import write_record
from rankwise.records.canonical import canonical_bytes, sha256_hex
from rankwise.records.readings_sheet import FIRST_ENTRY_ROW
from rankwise.records.verify import verify_record
from rankwise.records.workbook import PROGRAM_SHEET

from record_builders import paired_record, several_record


@pytest.fixture(scope="module")
def written(tmp_path_factory):
    path = tmp_path_factory.mktemp("verify") / "record.xlsx"
    write_record(path, paired_record())
    return path


def edited_copy(source, tmp_path, edit):
    """A copy of the record with one edit made through openpyxl, as a person with a script would."""
    book = load_workbook(source)
    edit(book)
    target = tmp_path / "edited.xlsx"
    book.save(target)
    return target


def row_of(sheet, label):
    return next(r for r in range(1, sheet.max_row + 1) if sheet.cell(row=r, column=1).value == label)


def test_an_untouched_record_is_intact(written):
    verification = verify_record(written)
    assert verification.status == "intact", verification.differences
    assert verification.differences == ()
    assert len(verification.fingerprint) == 64


def test_a_record_opened_and_saved_without_edits_is_still_intact(written, tmp_path):
    assert verify_record(edited_copy(written, tmp_path, lambda book: None)).status == "intact"


def test_several_groups_record_is_intact(tmp_path):
    path = tmp_path / "ponds.xlsx"
    write_record(path, several_record())
    assert verify_record(path).status == "intact"


def change_reading(book):
    book["Readings as entered"].cell(row=FIRST_ENTRY_ROW + 3, column=2).value = 2.49


def change_group_name(book):
    book["Readings as entered"]["B3"].value = "Before curing"


def change_setting(book):
    sheet = book["Details"]
    sheet.cell(row=row_of(sheet, "Significance level"), column=2).value = 0.10


def change_signer(book):
    sheet = book["Verdict"]
    sheet.cell(row=row_of(sheet, "Prepared by"), column=2).value = "Someone Else"


def change_decision(book):
    sheet = book["Verdict"]
    sheet.cell(row=row_of(sheet, "Decision"), column=2).value = "do not accept the change"


def change_shown_p_value(book):
    sheet = book["Verdict"]
    sheet.cell(row=row_of(sheet, "p-value"), column=2).value = 0.01


def change_a_rank(book):
    book["Ranks"]["E4"].value = -7


def change_a_number_format(book):
    sheet = book["Verdict"]
    sheet.cell(row=row_of(sheet, "p-value"), column=2).number_format = "0.0"


def change_verdict_sentence(book):
    book["Verdict"]["B8"].value = "After cure reads the same as Before cure."


def add_a_note_cell(book):
    book["Details"]["H40"].value = "fine"


def rename_a_sheet(book):
    book["Ranks"].title = "Rank table"


@pytest.mark.parametrize("edit", [
    change_reading, change_group_name, change_setting, change_signer, change_decision,
    change_shown_p_value, change_a_rank, change_a_number_format, change_verdict_sentence,
    add_a_note_cell, rename_a_sheet,
])
def test_any_single_visible_edit_is_found(written, tmp_path, edit):
    verification = verify_record(edited_copy(written, tmp_path, edit))
    assert verification.status == "changed"
    assert verification.differences


def test_the_difference_names_sheet_cell_and_both_values(written, tmp_path):
    verification = verify_record(edited_copy(written, tmp_path, change_reading))
    assert any("Sheet 'Readings as entered', cell B15" in d and "2.48" in d and "2.49" in d
               for d in verification.differences), verification.differences


def edit_program_json(book, new_fingerprint=False):
    sheet = book[PROGRAM_SHEET]
    text = "".join(sheet.cell(row=r, column=1).value for r in range(4, 4 + sheet["A3"].value))
    data = json.loads(text)
    data["signoff"]["prepared"]["name"] = "Ann Leigh"
    edited = canonical_bytes(data).decode("utf-8")
    for r in range(4, 4 + sheet["A3"].value):
        sheet.cell(row=r, column=1).value = None
    sheet["A3"].value = 1
    sheet["A4"].value = edited
    if new_fingerprint:
        sheet["A2"].value = sha256_hex(data)


def test_an_edit_of_the_program_data_is_found(written, tmp_path):
    verification = verify_record(edited_copy(written, tmp_path, edit_program_json))
    assert verification.status == "changed"
    assert any("fingerprint" in d for d in verification.differences)


def test_program_data_edited_with_a_matching_fingerprint_still_disagree_with_the_sheets(written, tmp_path):
    verification = verify_record(edited_copy(written, tmp_path, lambda b: edit_program_json(b, True)))
    assert verification.status == "changed"
    assert any("Ann Leigh" in d for d in verification.differences)


def test_program_data_that_no_longer_parse_are_a_change(written, tmp_path):
    def garble(book):
        book[PROGRAM_SHEET]["A4"].value = "{not json"
    assert verify_record(edited_copy(written, tmp_path, garble)).status == "changed"


def test_files_that_are_not_records_are_said_to_be_so(written, tmp_path):
    csv = tmp_path / "readings.csv"
    csv.write_text("Wheel A,Wheel B\n0.42,0.45\n")
    damaged = tmp_path / "damaged.xlsx"
    damaged.write_bytes(written.read_bytes()[:2000])
    plain = tmp_path / "plain.xlsx"
    book = load_workbook(written)
    del book[PROGRAM_SHEET]
    book.save(plain)
    for path in (csv, damaged, plain, tmp_path / "missing.xlsx"):
        verification = verify_record(path)
        assert verification.status == "not-a-record", path
        assert verification.summary


def test_a_change_to_any_shown_cell_is_found(written, tmp_path):
    """A seeded sample of every kind of shown cell (numbers, texts, dates) across all visible sheets."""
    import random
    from datetime import datetime, timedelta

    book = load_workbook(written)
    cells = [(sheet.title, cell.coordinate) for sheet in book.worksheets if sheet.title != PROGRAM_SHEET
             for row in sheet.iter_rows() for cell in row if cell.value is not None]
    for title, coordinate in random.Random(5).sample(cells, 24):
        def edit(book, title=title, coordinate=coordinate):
            cell = book[title][coordinate]
            if isinstance(cell.value, datetime):
                cell.value = cell.value + timedelta(days=1)
            elif isinstance(cell.value, str):
                cell.value = cell.value + " "
            else:
                cell.value = cell.value + 1
        verification = verify_record(edited_copy(written, tmp_path, edit))
        assert verification.status == "changed", (title, coordinate)
        assert any(coordinate in d for d in verification.differences), (title, coordinate)


def test_an_older_record_without_the_decimal_mark_or_paired_planning_reopens_intact(tmp_path):
    """Records written before Analysis.decimal_mark and Settings.plan_paired existed read as "." and False."""
    path = tmp_path / "older.xlsx"
    write_record(path, paired_record())

    def drop_later_fields(book):
        sheet = book[PROGRAM_SHEET]
        text = "".join(sheet.cell(row=r, column=1).value for r in range(4, 4 + sheet["A3"].value))
        data = json.loads(text)
        del data["analysis"]["decimal_mark"]
        del data["analysis"]["settings"]["plan_paired"]
        for r in range(4, 4 + sheet["A3"].value):
            sheet.cell(row=r, column=1).value = None
        sheet["A3"].value = 1
        sheet["A4"].value = canonical_bytes(data).decode("utf-8")
        shown = next(c for row in book["Verdict"].iter_rows() for c in row if c.value == sheet["A2"].value)
        sheet["A2"].value = shown.value = sha256_hex(data)  # an older record shows its own fingerprint

    verification = verify_record(edited_copy(path, tmp_path, drop_later_fields))
    assert verification.status == "intact", verification.differences
    assert verification.record.analysis.decimal_mark == "."
    assert verification.record.analysis.settings.plan_paired is False


def test_a_record_typed_with_decimal_commas_keeps_them_and_verifies(tmp_path):
    path = tmp_path / "comma.xlsx"
    record = paired_record(comma=True)
    assert record.analysis.decimal_mark == ","
    write_record(path, record)
    verification = verify_record(path)
    assert verification.status == "intact", verification.differences
    assert verification.record.analysis.decimal_mark == ","
    sentences = [c.value for row in load_workbook(path).worksheets[0].iter_rows() for c in row
                 if isinstance(c.value, str) and "p = " in c.value]
    assert any("p = 0,0" in text for text in sentences)  # Hollander & Wolfe p. 39: two-sided p = 0.039
    assert not any(re.search(r"\d\.\d", text) for text in sentences)
