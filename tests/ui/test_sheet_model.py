"""The grid's table model follows the readings sheet exactly and passes Qt's model checks."""

from __future__ import annotations

from PySide6.QtCore import Qt

from rankwise.readings import GroupColumn, ReadingSheet
from rankwise.ui.sheet_model import CELL_KIND_ROLE, FLAG_MARK, INVALID_MARK, MINIMUM_ROWS, SPARE_ROWS, SheetModel


def _sheet() -> ReadingSheet:
    return ReadingSheet([GroupColumn("Wheel A", unit="µm"), GroupColumn("Wheel B", unit="µm")])


def test_model_passes_qt_model_checks_through_edits(qtmodeltester):
    """qtmodeltester watches every signal while the sheet is typed in, pasted, undone and reshaped."""
    sheet = _sheet()
    model = SheetModel(sheet)
    qtmodeltester.check(model, force_py=True)
    sheet.set_text(0, 0, "0.42")
    sheet.paste_block(0, 1, [["0.40", "0.47"], ["0.45", "n/a"]] * 20)
    sheet.insert_rows(2, 3)
    sheet.delete_rows(0, 2)
    sheet.add_group("Wheel C")
    sheet.move_group(2, 0)
    sheet.undo()
    sheet.undo()
    sheet.redo()
    sheet.clear([(0, r) for r in range(sheet.row_count)])
    qtmodeltester.check(model, force_py=True)


def test_rows_and_columns_follow_the_sheet_with_spare_room():
    """Columns: every group plus one spare; rows: the longest column plus spare rows (at least a page)."""
    sheet = _sheet()
    model = SheetModel(sheet)
    assert model.columnCount() == 3
    assert model.rowCount() == MINIMUM_ROWS
    sheet.paste_block(0, 0, [["1"]] * 40)
    assert model.rowCount() == 40 + SPARE_ROWS
    sheet.undo()
    assert model.rowCount() == MINIMUM_ROWS


def test_headers_show_group_name_and_unit():
    """The column title carries the group's name and its unit; the spare column invites a new group."""
    model = SheetModel(_sheet())
    assert model.headerData(0, Qt.Orientation.Horizontal) == "Wheel A\nµm"
    assert model.headerData(2, Qt.Orientation.Horizontal) == "+ new\ngroup"
    assert model.headerData(4, Qt.Orientation.Vertical) == "5"


def test_rejected_cell_keeps_its_text_and_says_why_without_colour_alone():
    """An unreadable entry keeps the typed text for editing, shows a symbol, is struck through and explains itself."""
    sheet = _sheet()
    model = SheetModel(sheet)
    index = model.index(0, 1)
    assert model.setData(index, "12..5")
    assert model.data(index, Qt.ItemDataRole.EditRole) == "12..5"
    assert model.data(index, Qt.ItemDataRole.DisplayRole) == INVALID_MARK + "12..5"
    assert model.data(index, CELL_KIND_ROLE) == "invalid"
    font = model.data(index, Qt.ItemDataRole.FontRole)
    assert font.strikeOut() and font.italic()
    assert model.data(index, Qt.ItemDataRole.ToolTipRole).startswith("Not used: ")
    assert sheet.cell(1, 0).text == "12..5"


def test_note_is_skipped_in_italics_with_its_reason():
    """A text note such as "scrap" stays as typed, in italics, with the reason it is skipped."""
    sheet = _sheet()
    model = SheetModel(sheet)
    model.setData(model.index(3, 0), "scrap")
    assert model.data(model.index(3, 0), CELL_KIND_ROLE) == "note"
    assert model.data(model.index(3, 0), Qt.ItemDataRole.FontRole).italic()
    assert model.data(model.index(3, 0), Qt.ItemDataRole.ToolTipRole).startswith("Skipped: ")


def test_typing_into_the_spare_column_adds_a_group_in_one_step():
    """Typing right of the last group starts a new group; one undo removes it again."""
    sheet = _sheet()
    model = SheetModel(sheet)
    assert model.setData(model.index(2, 2), "7.5")
    assert len(sheet.groups) == 3 and sheet.cell(2, 2).value == 7.5
    assert model.columnCount() == 4
    sheet.undo()
    assert len(sheet.groups) == 2 and model.columnCount() == 3


def test_read_only_model_refuses_edits():
    """A signed analysis is read-only: cells are not editable and setData changes nothing."""
    sheet = _sheet()
    model = SheetModel(sheet)
    model.set_read_only(True)
    assert not model.flags(model.index(0, 0)) & Qt.ItemFlag.ItemIsEditable
    assert not model.setData(model.index(0, 0), "1.0")
    assert sheet.row_count == 0


def test_suspicious_reading_is_marked_by_a_symbol_and_explained():
    """A reading ten times the others (a likely slipped decimal point) is used as typed but marked and explained."""
    sheet = _sheet()
    model = SheetModel(sheet)
    sheet.paste_block(0, 0, [["0.42"], ["0.41"], ["0.43"], ["0.40"], ["0.44"], ["4.2"]])
    index = model.index(5, 0)
    assert model.data(index, CELL_KIND_ROLE) == "number"
    assert model.data(index, Qt.ItemDataRole.DisplayRole) == "4.2" + FLAG_MARK
    assert model.data(index, Qt.ItemDataRole.EditRole) == "4.2"
    assert model.data(index, Qt.ItemDataRole.FontRole).underline()
    assert model.data(index, Qt.ItemDataRole.ToolTipRole).startswith("Worth a second look (used as typed): ")
    assert model.data(model.index(0, 0), Qt.ItemDataRole.DisplayRole) == "0.42"


def test_a_large_groups_flags_show_at_once_and_follow_each_edit():
    """A 30,000-reading group: its marks come from the sheet's arrays, at the first paint; an edit's marks win."""
    sheet = _sheet()
    sheet.paste_block(0, 0, [[f"0.{40 + row % 5}"] for row in range(30_000)])
    sheet.set_text(0, 29_999, "4.2")
    model = SheetModel(sheet)
    slipped = model.index(29_999, 0)
    assert model.data(slipped, Qt.ItemDataRole.DisplayRole) == "4.2" + FLAG_MARK
    sheet.set_text(0, 29_999, "0.42")
    sheet.set_text(0, 4, "4.0")
    assert model.data(model.index(4, 0), Qt.ItemDataRole.DisplayRole) == "4.0" + FLAG_MARK
    assert model.data(slipped, Qt.ItemDataRole.DisplayRole) == "0.42"
