"""A record checked by a later Rankwise, whose wording differs on purpose, is judged by what was signed."""

import dataclasses
import hashlib
import json
from datetime import datetime
from pathlib import Path

import pytest
from openpyxl import Workbook, load_workbook

import rankwise
import rankwise.records.verdict_sheet as verdict_sheet
from rankwise.records import fingerprint, write_record
from rankwise.records.canonical import canonical_bytes, sha256_hex
from rankwise.records.readings_sheet import FIRST_ENTRY_ROW
from rankwise.records.sheet_listing import pack_listing, sheet_listing, unpack_listing
from rankwise.records.verify import verify_record
from rankwise.records.workbook import (
    PROGRAM_SHEET,
    VISIBLE_SHEETS_KEY,
    read_program_data,
    read_signed_listing,
)

from record_builders import paired_record

WRITTEN_BY = rankwise.__version__  # the version that writes the record in these tests, before a later one is simulated

LATER_HEADLINE = "A later release words this verdict differently."
READING = ("Readings as entered", f"B{FIRST_ENTRY_ROW + 3}")
"""The fourth reading of the first group: 2.48 in Hollander & Wolfe (1999), 2nd ed., p. 39."""


@pytest.fixture(scope="module")
def written(tmp_path_factory):
    path = tmp_path_factory.mktemp("versions") / "record.xlsx"
    write_record(path, paired_record())
    return path


def reword_the_verdict(monkeypatch):
    """Make today's verdict sheet say its headline differently, as a later release might."""
    real_describe = verdict_sheet.describe

    def reworded(result, analysis):
        return dataclasses.replace(real_describe(result, analysis), headline=LATER_HEADLINE)

    monkeypatch.setattr(verdict_sheet, "describe", reworded)


@pytest.fixture
def later_version(monkeypatch):
    """Checking as a later Rankwise would: another version number and another verdict sentence."""
    monkeypatch.setattr(rankwise, "__version__", "9.0.0")
    reword_the_verdict(monkeypatch)


def edited_copy(source, tmp_path, edit, name="edited.xlsx"):
    book = load_workbook(source)
    edit(book)
    target = tmp_path / name
    book.save(target)
    return target


def program_parts(sheet, column, count_row):
    first = count_row + 1
    return [sheet.cell(row=r, column=column).value for r in range(first, first + sheet.cell(count_row, column).value)]


def store_parts(sheet, column, count_row, parts):
    for row in range(count_row + 1, sheet.max_row + 1):
        sheet.cell(row=row, column=column).value = None
    sheet.cell(row=count_row, column=column).value = len(parts)
    for row, part in enumerate(parts, start=count_row + 1):
        sheet.cell(row=row, column=column).value = part


def edit_listed_reading(book, value):
    """Change the fourth reading inside the stored listing, leaving its SHA-256 in the data as it was."""
    program = book[PROGRAM_SHEET]
    listing = unpack_listing(program_parts(program, 2, 2))
    readings = next(entry for entry in listing["sheets"] if entry["title"] == READING[0])
    cell = next(cell for cell in readings["cells"] if cell[0] == READING[1])
    cell[2] = repr(value)
    store_parts(program, 2, 2, pack_listing(listing))
    return listing


def test_the_later_wording_really_differs_from_what_was_signed(written, later_version):
    """Without this, the tests below would not show that the stored listing is what saves the record."""
    shown = [c.value for row in load_workbook(written)["Verdict"].iter_rows() for c in row]
    assert LATER_HEADLINE not in shown
    assert verdict_sheet.describe(paired_record().result, paired_record().analysis).headline == LATER_HEADLINE


def test_an_untouched_record_checked_by_a_later_version_is_intact_with_a_note(written, later_version):
    verification = verify_record(written)
    assert verification.status == "intact", verification.differences
    assert any("Rankwise 9.0.0 checked the visible sheets" in note and f"Rankwise {WRITTEN_BY}" in note
               for note in verification.notes), verification.notes


def test_the_same_version_with_other_wording_still_rebuilds_the_sheets_and_finds_the_difference(
        written, monkeypatch):
    """Same program version: the sheets are rebuilt from the data as an extra check, so a wording
    change without a new version number is not passed over."""
    reword_the_verdict(monkeypatch)
    verification = verify_record(written)
    assert verification.status == "changed"
    assert any(LATER_HEADLINE in d for d in verification.differences)


def test_a_reading_edited_is_found_by_a_later_version_naming_the_cell(written, tmp_path, later_version):
    def edit(book):
        book[READING[0]][READING[1]].value = 2.49
    verification = verify_record(edited_copy(written, tmp_path, edit))
    assert verification.status == "changed"
    assert any(f"Sheet '{READING[0]}', cell {READING[1]}" in d and "2.48" in d and "2.49" in d
               for d in verification.differences), verification.differences


def test_a_renamed_sheet_is_found_by_a_later_version(written, tmp_path, later_version):
    def edit(book):
        book["Details"].title = "More"
    verification = verify_record(edited_copy(written, tmp_path, edit))
    assert verification.status == "changed"
    assert any("The sheets were changed" in d for d in verification.differences)


def test_an_edited_listing_is_found_even_when_the_sheet_was_edited_to_match(written, tmp_path, later_version):
    def edit(book):
        edit_listed_reading(book, 2.49)
        book[READING[0]][READING[1]].value = 2.49
    verification = verify_record(edited_copy(written, tmp_path, edit))
    assert verification.status == "changed"
    assert any("no longer matches its SHA-256" in d for d in verification.differences), verification.differences


def test_a_listing_with_its_digest_fixed_is_still_caught_by_the_fingerprint(written, tmp_path, later_version):
    def edit(book):
        listing = edit_listed_reading(book, 2.49)
        book[READING[0]][READING[1]].value = 2.49
        program = book[PROGRAM_SHEET]
        data = json.loads("".join(program_parts(program, 1, 3)))
        data[VISIBLE_SHEETS_KEY] = sha256_hex(listing)
        store_parts(program, 1, 3, [canonical_bytes(data).decode("utf-8")])
    verification = verify_record(edited_copy(written, tmp_path, edit))
    assert verification.status == "changed"
    assert any("fingerprint stored with them no longer matches" in d for d in verification.differences)


def test_a_removed_or_garbled_listing_is_a_change(written, tmp_path, later_version):
    def remove(book):
        book[PROGRAM_SHEET]["B2"].value = None

    def garble(book):
        book[PROGRAM_SHEET]["B3"].value = "not a packed listing"
    for edit in (remove, garble):
        verification = verify_record(edited_copy(written, tmp_path, edit))
        assert verification.status == "changed", edit.__name__
        assert any("missing or damaged" in d for d in verification.differences), edit.__name__


def test_an_older_record_without_a_listing_falls_back_to_rebuilding_the_sheets(written, tmp_path, monkeypatch):
    """A record written before listings were kept: checked as before, by rebuilding every sheet."""
    def drop_listing(book):
        program = book[PROGRAM_SHEET]
        data = json.loads("".join(program_parts(program, 1, 3)))
        del data[VISIBLE_SHEETS_KEY]
        store_parts(program, 1, 3, [canonical_bytes(data).decode("utf-8")])
        for row in range(1, program.max_row + 1):
            program.cell(row=row, column=2).value = None
        shown = next(c for row in book["Verdict"].iter_rows() for c in row if c.value == program["A2"].value)
        program["A2"].value = shown.value = sha256_hex(data)

    older = edited_copy(written, tmp_path, drop_listing, "older.xlsx")
    assert read_signed_listing(load_workbook(older)) is None
    assert verify_record(older).status == "intact", verify_record(older).differences
    monkeypatch.setattr(rankwise, "__version__", "9.0.0")
    reword_the_verdict(monkeypatch)
    verification = verify_record(older)
    assert verification.status == "changed"
    assert any(LATER_HEADLINE in d for d in verification.differences)


def test_the_fingerprint_of_a_record_is_the_one_its_workbook_carries(written):
    """The printout and the command line show ``fingerprint(record)``; the workbook must agree."""
    data, stored = read_program_data(load_workbook(written))
    assert stored == hashlib.sha256(canonical_bytes(data)).hexdigest()  # hashlib, FIPS 180-4 SHA-256
    shown = [c.value for row in load_workbook(written)["Verdict"].iter_rows() for c in row]
    assert stored in shown
    record = verify_record(written).record
    assert fingerprint(record) == stored


def test_the_listing_holds_values_in_canonical_text_and_leaves_out_the_fingerprint_cell():
    book = Workbook()
    sheet = book.active
    sheet.title = "One"
    sheet["A1"] = 0.1
    sheet["A2"] = 3
    sheet["B1"] = datetime(2026, 11, 30, 14, 5, 9)
    sheet["B1"].number_format = "yyyy-mm-dd hh:mm:ss"
    sheet["C3"] = "µm, as typed"
    sheet["D4"] = "#" * 64
    listing = sheet_listing(book.worksheets, "#" * 64)
    # Python's float repr is the shortest text that reads back to the same double ("0.1", "3.0");
    # dates are ISO 8601 extended format, date and time joined by "T"; text is kept as is.
    assert listing["sheets"] == [{"title": "One", "cells": [
        ["A1", "number", "0.1", "General"],
        ["B1", "date", "2026-11-30T14:05:09", "yyyy-mm-dd hh:mm:ss"],
        ["A2", "number", "3.0", "General"],
        ["C3", "text", "µm, as typed", "General"],
    ], "look": {"state": "visible", "protected": False, "hidden_rows": [], "hidden_columns": [],
                "unreadable_cells": []}}]
    assert listing["fingerprint_cell"] == ["One", "D4"]
    assert unpack_listing(pack_listing(listing)) == listing
    form_1 = {**listing, "listing_format": 1, "sheets": [{"title": "One", "cells": listing["sheets"][0]["cells"]}]}
    assert unpack_listing(pack_listing(form_1)) == form_1  # records written before looks were listed
    for damaged in (["not base64!"], [""], pack_listing({"listing_format": 3, "sheets": []}),
                    pack_listing({**listing, "sheets": [{"title": "One", "cells": []}]})):
        assert unpack_listing(damaged) is None
    with pytest.raises(ValueError, match="fingerprint_stand_in must be in exactly one cell"):
        sheet_listing(book.worksheets, "no such text")


def test_a_record_read_back_by_a_later_version_prints_the_fingerprint_it_was_signed_with(written, later_version):
    """A reprint of a reopened record shows the workbook's fingerprint, not one rebuilt with today's layout."""
    from rankwise.records import read_record
    from rankwise.records.workbook import record_fingerprint

    _, stored = read_program_data(load_workbook(written))
    record = read_record(written)
    assert record_fingerprint(record) != stored  # today's rewording would give another fingerprint
    assert record.signed_fingerprint == stored and fingerprint(record) == stored
    fresh = dataclasses.replace(record, signed_fingerprint=None)
    assert fingerprint(fresh) == record_fingerprint(record)


WRITTEN_BEFORE_LOOKS = Path(__file__).parent / "data" / "record-listing-format-1.xlsx"
"""A record of the paired example written by Rankwise before the listing held each sheet's look
(listing form 1), kept as the file that version wrote."""


def test_a_record_written_before_looks_were_listed_is_intact_and_its_looks_still_checked(tmp_path, monkeypatch):
    monkeypatch.setattr(rankwise, "__version__", "9.0.0")  # checked by a later release, as in the field
    book = load_workbook(WRITTEN_BEFORE_LOOKS)
    assert read_signed_listing(book)["listing_format"] == 1
    verification = verify_record(WRITTEN_BEFORE_LOOKS)
    assert verification.status == "intact", verification.differences
    assert not any("saved again" in note for note in verification.notes)

    def hide_a_reading(book):
        book[READING[0]].row_dimensions[FIRST_ENTRY_ROW + 3].hidden = True
    verification = verify_record(edited_copy(WRITTEN_BEFORE_LOOKS, tmp_path, hide_a_reading))
    assert verification.differences == (f"Row {FIRST_ENTRY_ROW + 3} of '{READING[0]}' is hidden.",)
