"""Every edit that changes what a reader sees or can find is caught and named once, in plain words:
each single cell, hidden or unhidden rows, columns and sheets, text that cannot be read, removed
protection, and a row deleted or inserted (one line naming the row and its readings)."""

import argparse
from datetime import datetime, timedelta

import pytest
from openpyxl import load_workbook
from openpyxl.styles import Font, PatternFill

from rankwise.records import write_record
from rankwise.records.cli import add_record_commands, run_verify
from rankwise.records.readings_sheet import FIRST_ENTRY_ROW
from rankwise.records.sheet_listing import listing_differences
from rankwise.records.workbook import PROGRAM_SHEET, read_program_data, read_signed_listing

from record_builders import paired_record

READINGS = "Readings as entered"
FOURTH = FIRST_ENTRY_ROW + 3
"""Row of the fourth part: 2.48 and 2.05 in Hollander & Wolfe (1999), 2nd ed., p. 39."""


@pytest.fixture(scope="module")
def written(tmp_path_factory):
    path = tmp_path_factory.mktemp("edits") / "record.xlsx"
    write_record(path, paired_record())
    return path


def verify_exit(path, capsys):
    top = argparse.ArgumentParser(prog="rankwise")
    add_record_commands(top.add_subparsers(dest="command", required=True))
    capsys.readouterr()
    code = run_verify(top.parse_args(["verify", str(path)]))
    return code, [line[4:] for line in capsys.readouterr().out.splitlines() if line.startswith("  - ")]


def edited(source, tmp_path, edit):
    book = load_workbook(source)
    edit(book)
    target = tmp_path / "edited.xlsx"
    book.save(target)
    return target


def hide_row(book):
    book[READINGS].row_dimensions[FOURTH].hidden = True


def shrink_row_to_nothing(book):
    book[READINGS].row_dimensions[FOURTH].height = 0.5


def hide_column(book):
    book[READINGS].column_dimensions["C"].hidden = True


def hide_details_sheet(book):
    book["Details"].sheet_state = "hidden"


def unhide_program_sheet(book):
    book[PROGRAM_SHEET].sheet_state = "visible"


def white_text(book):
    book[READINGS][f"B{FOURTH}"].font = Font(color="FFFFFFFF")


def text_in_its_fill_colour(book):
    cell = book[READINGS][f"C{FOURTH}"]
    cell.font = Font(color="FFFFEB9C")
    cell.fill = PatternFill("solid", fgColor="FFFFEB9C")


def tiny_text(book):
    book[READINGS][f"B{FOURTH}"].font = Font(sz=1)


def invisible_format(book):
    book[READINGS][f"B{FOURTH}"].number_format = ";;;"


def remove_protection(book):
    book["Verdict"].protection.sheet = False


VISIBILITY_EDITS = [
    (hide_row, f"Row {FOURTH} of '{READINGS}' is hidden."),
    (shrink_row_to_nothing, f"Row {FOURTH} of '{READINGS}' is hidden."),
    (hide_column, f"Column C of '{READINGS}' is hidden."),
    (hide_details_sheet, "Sheet 'Details' is hidden."),
    (unhide_program_sheet, f"The sheet '{PROGRAM_SHEET}' is no longer hidden."),
    (white_text, f"Cell B{FOURTH} of '{READINGS}' cannot be read: its text is the colour of its background "
                 "or too small to see."),
    (text_in_its_fill_colour, f"Cell C{FOURTH} of '{READINGS}' cannot be read: its text is the colour of its "
                              "background or too small to see."),
    (tiny_text, f"Cell B{FOURTH} of '{READINGS}' cannot be read: its text is the colour of its background "
                "or too small to see."),
    (invisible_format, f"Sheet '{READINGS}', cell B{FOURTH}: the same value is now shown as nothing (format ';;;') "
                       "instead of 2.48 (format '[$-409]0.00')."),
    (remove_protection, "Sheet 'Verdict' is no longer protected against edits."),
]


@pytest.mark.parametrize(("edit", "said"), VISIBILITY_EDITS, ids=[edit.__name__ for edit, _ in VISIBILITY_EDITS])
def test_each_visibility_and_style_edit_is_caught_and_named_once(written, tmp_path, capsys, edit, said):
    code, differences = verify_exit(edited(written, tmp_path, edit), capsys)
    assert code == 1
    assert differences == [said]


def test_a_deleted_row_is_one_line_naming_the_row_and_its_readings(written, tmp_path, capsys):
    code, differences = verify_exit(edited(written, tmp_path, lambda book: book[READINGS].delete_rows(FOURTH)),
                                    capsys)
    assert code == 1
    assert differences == [f"Row {FOURTH} of '{READINGS}' was deleted; it showed Entry 4, Before cure 2.48, "
                           f"After cure 2.05."]


def test_an_inserted_row_is_one_line_naming_the_row_and_its_readings(written, tmp_path, capsys):
    def insert(book):
        sheet = book[READINGS]
        sheet.insert_rows(FOURTH)
        sheet[f"A{FOURTH}"], sheet[f"B{FOURTH}"], sheet[f"C{FOURTH}"] = 11, 1.75, 1.5
        sheet[f"B{FOURTH}"].number_format = "0.00"
    code, differences = verify_exit(edited(written, tmp_path, insert), capsys)
    assert code == 1
    assert differences == [f"A row was inserted as row {FOURTH} of '{READINGS}'; it shows Entry 11, "
                           f"Before cure 1.75, After cure 1.5."]


def test_a_changed_value_is_named_once_as_the_sheet_shows_it(written, tmp_path, capsys):
    def edit(book):
        sheet = book["Verdict"]
        row = next(r for r in range(1, sheet.max_row + 1) if sheet.cell(row=r, column=1).value == "p-value")
        sheet.cell(row=row, column=2).value = 3.50732090624653e-06
    code, differences = verify_exit(edited(written, tmp_path, edit), capsys)
    assert code == 1
    assert len(differences) == 1
    # Hollander & Wolfe (1999), p. 39: exact two-sided p = 0.039, shown with the sheet's four places.
    assert differences[0].endswith("showed 0.0391 when signed, now shows 0.0000.")


def changed_value(value):
    """A value a reader sees as different: numbers moved by more than any shown rounding, texts
    with a word added, dates a day later."""
    if isinstance(value, datetime):
        return value + timedelta(days=1)
    if isinstance(value, str):
        return value + " (edited)"
    if isinstance(value, bool):
        return not value
    return value * 1.5 + 1


def test_every_single_cell_edit_on_every_visible_sheet_is_caught_and_named_once(written):
    """Each shown cell changed on its own, each emptied, and text typed into empty cells next to
    them: exactly one difference, naming that cell. Each edit is checked against its own sheet's
    part of the listing (the comparison runs sheet by sheet, and the other sheets are untouched),
    and the whole workbook once at the end, so the run stays short."""
    book = load_workbook(written)
    listing = read_signed_listing(book)
    _, fingerprint = read_program_data(book)
    sheets = [sheet for sheet in book.worksheets if sheet.title != PROGRAM_SHEET]
    edits = 0
    for sheet in sheets:
        own_part = {**listing, "sheets": [entry for entry in listing["sheets"] if entry["title"] == sheet.title]}
        filled = [cell for row in sheet.iter_rows() for cell in row if cell.value is not None]
        empty = [sheet.cell(row=cell.row, column=sheet.max_column + 1) for cell in filled[::7]]
        for cell in filled + empty:
            before = cell.value
            for value in ((changed_value(before), None) if before is not None else ("added",)):
                cell.value = value
                found = list(listing_differences(own_part, [sheet], fingerprint))
                cell.value = before
                edits += 1
                assert len(found) == 1, (sheet.title, cell.coordinate, found)
                assert f"cell {cell.coordinate}:" in found[0], (sheet.title, cell.coordinate, found)
                assert f"Sheet '{sheet.title}'" in found[0]
    assert list(listing_differences(listing, sheets, fingerprint)) == []
    assert edits > 300
    print(f"single-cell edits checked: {edits}")
