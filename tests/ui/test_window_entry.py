"""Typing, pasting, clearing and undoing in the real window's readings grid."""

from __future__ import annotations

from PySide6.QtCore import Qt
from PySide6.QtGui import QGuiApplication

from window_support import answers, screenshot, type_column, window  # noqa: F401 - pytest fixtures

from rankwise.readings import CellKind


def test_enter_moves_down_and_tab_moves_right(qtbot, window):
    """Typed readings land down the column; Tab after a reading goes to the next group."""
    grid = window.grid
    type_column(qtbot, grid, 0, ["0.42", "0,45"])
    assert [window.sheet.cell(0, r).text for r in range(2)] == ["0.42", "0,45"]
    assert grid.currentIndex().row() == 2 and grid.currentIndex().column() == 0
    qtbot.keyClick(grid, Qt.Key.Key_Tab)
    assert grid.currentIndex().column() == 1


def test_paste_a_block_from_a_spreadsheet(qtbot, window):
    """A tab-separated block lands with its top-left at the current cell; one undo removes it."""
    QGuiApplication.clipboard().setText("0.41\t0.47\n0.44\t0.52\n0.40\t0.50\n")
    window.grid.setFocus()
    window.grid.move_to(0, 0)
    qtbot.keyClick(window.grid, Qt.Key.Key_V, Qt.KeyboardModifier.ControlModifier)
    assert [window.sheet.cell(1, r).text for r in range(3)] == ["0.47", "0.52", "0.50"]
    assert window.sheet.counts(0).used == 3
    window.undo()
    assert window.sheet.row_count == 0


def test_invalid_cell_keeps_its_text_and_says_why(qtbot, window):
    """'12..5' is refused as a reading but kept exactly as typed, with the reason on hover."""
    type_column(qtbot, window.grid, 1, ["0.47", "12..5"])
    cell = window.sheet.cell(1, 1)
    assert cell.text == "12..5" and cell.kind is CellKind.INVALID and cell.reason
    index = window.sheet_model.index(1, 1)
    assert cell.reason in window.sheet_model.data(index, Qt.ItemDataRole.ToolTipRole)
    qtbot.waitUntil(lambda: "B: 1 reading, 1 not used" in window.status_counts.text(), timeout=60000)
    screenshot(window, "window-invalid-cell")


def test_delete_clears_and_undo_redo_restore(qtbot, window):
    """Delete empties the selected cells; undo brings them back, redo clears again."""
    window.grid.paste_text("1.2\n1.3\n1.4\n")
    window.grid.move_to(1, 0)
    window.grid.setFocus()
    qtbot.keyClick(window.grid, Qt.Key.Key_Delete)
    assert window.sheet.cell(0, 1).kind is CellKind.EMPTY
    qtbot.waitUntil(lambda: window.undo_action.text().startswith("Undo clearing"), timeout=60000)
    window.undo()
    assert window.sheet.cell(0, 1).text == "1.3"
    window.redo()
    assert window.sheet.cell(0, 1).kind is CellKind.EMPTY


def test_insert_and_delete_rows(qtbot, window):
    """Rows can be inserted above the current one and deleted again."""
    window.grid.paste_text("1\t5\n2\t6\n3\t7\n")
    window.grid.move_to(1, 0)
    window.grid.insert_rows_above()
    assert [window.sheet.cell(0, r).text for r in range(4)] == ["1", "", "2", "3"]
    window.grid.delete_selected_rows()
    assert [window.sheet.cell(1, r).text for r in range(3)] == ["5", "6", "7"]


def test_copy_gives_a_block_any_spreadsheet_takes(qtbot, window):
    """Copying a selection puts tab-separated lines on the clipboard, texts exactly as typed."""
    window.grid.paste_text("0,41\t0,47\nscrap\t0,52\n")
    QGuiApplication.clipboard().clear()
    window.grid.copy_selection()
    assert QGuiApplication.clipboard().text() == "0,41\t0,47\nscrap\t0,52\n"


def test_typing_starts_in_the_sheet(qtbot, window):
    """The sheet has the keyboard when the window opens, so a technician can type at once."""
    qtbot.waitUntil(lambda: window.grid.hasFocus(), timeout=60000)
    qtbot.keyClicks(window.grid, "7")
    qtbot.keyClick(window.focusWidget(), Qt.Key.Key_Return)
    qtbot.waitUntil(lambda: window.sheet.cell(0, 0).text == "7", timeout=60000)


def test_paste_with_a_title_row_names_the_groups(qtbot, window):
    """A block copied with its titles ("Before", "After") names A and B and fills them from row 1;
    the status line says so; one undo takes back the readings and the names together."""
    QGuiApplication.clipboard().setText("Before\tAfter\n0,41\t0,47\n0,44\t0,52\n")
    window.grid.setFocus()
    window.grid.move_to(0, 0)
    qtbot.keyClick(window.grid, Qt.Key.Key_V, Qt.KeyboardModifier.ControlModifier)
    assert window.sheet.group_names == ["Before", "After"]
    assert [window.sheet.cell(1, r).text for r in range(2)] == ["0,47", "0,52"]
    assert "named the groups Before, After" in window.statusBar().currentMessage()
    window.undo()
    assert window.sheet.group_names == ["A", "B"] and window.sheet.row_count == 0


def test_paste_with_a_title_row_into_the_new_group_column(qtbot, window):
    """Titles over readings pasted into the "+ new group" column make named groups."""
    QGuiApplication.clipboard().setText("Press 3\n12,1\n12,4\n")
    window.grid.setFocus()
    window.grid.move_to(0, 2)
    qtbot.keyClick(window.grid, Qt.Key.Key_V, Qt.KeyboardModifier.ControlModifier)
    assert window.sheet.group_names == ["A", "B", "Press 3"]
    assert window.sheet.cell(2, 0).text == "12,1"


def test_paste_without_a_title_row_keeps_the_names(qtbot, window):
    """A block whose first row holds a reading is all data: the names stay, nothing is said about titles."""
    QGuiApplication.clipboard().setText("0,41\tscrap\nn/a\t0,52\n")
    window.grid.setFocus()
    window.grid.move_to(0, 0)
    qtbot.keyClick(window.grid, Qt.Key.Key_V, Qt.KeyboardModifier.ControlModifier)
    assert window.sheet.group_names == ["A", "B"]
    assert [window.sheet.cell(0, r).text for r in range(2)] == ["0,41", "n/a"]
    assert "title" not in window.statusBar().currentMessage()
