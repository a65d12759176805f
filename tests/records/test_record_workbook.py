"""Writing and reading back the result workbook: layout, types, protection, safety of the write."""

import dataclasses
import zipfile
from datetime import datetime

import pytest
from openpyxl import Workbook, load_workbook

from rankwise.records import RecordError, read_record, write_record
from rankwise.records.readings_sheet import FIRST_ENTRY_ROW
from rankwise.records.workbook import PROGRAM_SHEET
from rankwise.wording import CAUTION_SHORT

from record_builders import paired_record, plan_record, several_record

FORMULA_LIKE = ["=HYPERLINK(\"http://example.invalid\")", "+1+1", "-2", "@SUM(A1)"]


def cells_of(sheet):
    return [cell for row in sheet.iter_rows() for cell in row if cell.value is not None]


def test_sheets_of_our_own_layout_with_the_program_sheet_very_hidden(tmp_path):
    path = tmp_path / "record.xlsx"
    write_record(path, paired_record())
    book = load_workbook(path)
    assert book.sheetnames == ["Verdict", "Readings as entered", "Ranks", "Details", PROGRAM_SHEET]
    assert book[PROGRAM_SHEET].sheet_state == "veryHidden"
    assert all(sheet.protection.sheet for sheet in book.worksheets)
    shown = [c.value for c in cells_of(book["Verdict"])]
    assert CAUTION_SHORT in shown
    assert "After cure reads lower than Before cure on the same parts." in shown


def test_readings_are_stored_as_numbers_at_their_resolution_and_notes_as_text(tmp_path):
    path = tmp_path / "record.xlsx"
    write_record(path, paired_record())
    sheet = load_workbook(path)["Readings as entered"]
    first = sheet.cell(row=FIRST_ENTRY_ROW, column=2)
    assert first.value == 1.83 and first.number_format == "[$-409]0.00"
    second = sheet.cell(row=FIRST_ENTRY_ROW, column=3)
    assert second.value == 0.878 and second.number_format == "[$-409]0.000"
    assert sheet.cell(row=FIRST_ENTRY_ROW + 9, column=2).value == "scrap"
    reasons = [c.value for c in cells_of(sheet) if isinstance(c.value, str) and "scrap" in c.value]
    assert len(reasons) >= 3  # in the column, in the list of entries not used, and its reason


def test_key_numbers_are_numbers_and_signing_times_are_dates(tmp_path):
    path = tmp_path / "record.xlsx"
    record = paired_record()
    write_record(path, record)
    sheet = load_workbook(path)["Verdict"]
    rows = {}
    for r in range(1, sheet.max_row + 1):  # the first row of each label (the preparer signs first)
        rows.setdefault(sheet.cell(row=r, column=1).value, sheet.cell(row=r, column=2))
    assert rows["p-value"].value == record.result.p_value
    assert rows["p-value"].number_format == "[$-409]0.0000"
    assert rows["Typical change per part, After cure minus Before cure"].number_format == '[$-409]0.000" µm"'
    assert isinstance(rows["Signed at"].value, datetime)
    assert rows["Signed at"].value == datetime(2026, 11, 30, 14, 5, 9)
    assert sheet.cell(row=rows["Signed at"].row, column=3).value == "UTC+01:00"


def test_text_that_looks_like_a_formula_is_written_as_text(tmp_path):
    path = tmp_path / "record.xlsx"
    record = paired_record(first_name=FORMULA_LIKE[0], second_name=FORMULA_LIKE[1])
    record = dataclasses.replace(record, signoff=dataclasses.replace(
        record.signoff, prepared=dataclasses.replace(record.signoff.prepared, name=FORMULA_LIKE[2],
                                                     comment=FORMULA_LIKE[3])))
    write_record(path, record)
    book = load_workbook(path)
    texts = {c.value: c for sheet in book.worksheets for c in cells_of(sheet) if isinstance(c.value, str)}
    for text in FORMULA_LIKE:
        assert texts[text].data_type == "s"
    with zipfile.ZipFile(path) as archive:
        sheets = [n for n in archive.namelist() if n.startswith("xl/worksheets/")]
        assert not any(b"<f>" in archive.read(n) or b"<f " in archive.read(n) for n in sheets)
    assert read_record(path).analysis.groups[0].name == FORMULA_LIKE[0]


@pytest.mark.parametrize("build", [paired_record, several_record, plan_record])
def test_reading_back_restores_the_whole_record(tmp_path, build):
    path = tmp_path / "record.xlsx"
    record = build()
    write_record(path, record)
    back = read_record(path)
    assert back.result == record.result
    assert back.snapshot == record.snapshot
    assert back.signoff == record.signoff
    assert back.analysis.settings == record.analysis.settings


def test_a_signed_record_is_not_overwritten_without_leave(tmp_path):
    path = tmp_path / "record.xlsx"
    write_record(path, paired_record())
    before = path.read_bytes()
    with pytest.raises(RecordError, match="is a signed record"):
        write_record(path, paired_record(signed=False))
    assert path.read_bytes() == before
    write_record(path, paired_record(signed=False), overwrite_signed=True)
    assert read_record(path).signoff is None
    write_record(path, paired_record())  # an unsigned draft may be replaced
    assert read_record(path).signoff is not None


def test_a_failure_in_the_middle_of_writing_leaves_the_old_file_intact(tmp_path, monkeypatch):
    path = tmp_path / "record.xlsx"
    write_record(path, paired_record(signed=False))
    before = path.read_bytes()

    def broken_save(self, filename):
        with open(filename, "wb") as handle:
            handle.write(b"PK\x03\x04 half a workbook")
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(Workbook, "save", broken_save)
    with pytest.raises(RecordError, match="could not be saved"):
        write_record(path, paired_record(signed=False))
    assert path.read_bytes() == before
    assert [p.name for p in tmp_path.iterdir()] == ["record.xlsx"]


def test_wrong_places_and_endings_are_refused_in_plain_words(tmp_path):
    with pytest.raises(RecordError, match=r"\.xlsx"):
        write_record(tmp_path / "record.csv", paired_record())
    with pytest.raises(RecordError, match="does not exist"):
        write_record(tmp_path / "missing" / "record.xlsx", paired_record())


def test_a_file_that_is_not_a_record_is_refused_on_reading(tmp_path):
    plain = tmp_path / "plain.xlsx"
    Workbook().save(plain)
    with pytest.raises(RecordError, match="not a Rankwise result record"):
        read_record(plain)
    text = tmp_path / "readings.xlsx"
    text.write_text("a,b\n1,2\n")
    with pytest.raises(RecordError, match="cannot be read as a workbook"):
        read_record(text)


def test_a_plan_record_shows_the_parts_needed_and_the_power_table(tmp_path):
    path = tmp_path / "plan.xlsx"
    write_record(path, plan_record())
    book = load_workbook(path)
    assert book.sheetnames[2] == "Power by group size"
    shown = [c.value for c in cells_of(book["Verdict"])]
    assert "Measure at least 44 parts of Wheel A and 44 parts of Wheel B." in shown
