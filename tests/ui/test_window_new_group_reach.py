"""On a 1024 x 700 shop-floor screen the sheet is narrower than its groups, so the "+ new group"
column can scroll out of view; the "+ New group" button above the sheet (Alt+G) always shows where
to start another group and takes the keyboard there. Keys go to whichever widget has the keyboard."""

from __future__ import annotations

from PySide6.QtCore import Qt
from PySide6.QtWidgets import QApplication

from layout_checks import cut_off_texts
from window_support import PATIENCE_MS, answers, press, screenshot, wait_for_verdict, window  # noqa: F401

ENTER = Qt.Key.Key_Return
ALT_G = (Qt.Key.Key_G, Qt.KeyboardModifier.AltModifier)


def _spare_column_in_view(grid) -> bool:
    header = grid.horizontalHeader()
    spare = grid.model().columnCount() - 1
    left = header.sectionViewportPosition(spare)
    return left >= 0 and left + header.sectionSize(spare) <= grid.viewport().width()


def _shop_floor_window_with_groups_wider_than_the_sheet(qtbot, window):
    """The two-wheel demo at 1024 x 700 with the sheet scrolled to its first column, after two more
    groups have been typed in (Tab to the spare column, readings, Enter)."""
    window.resize(1024, 700)
    window.open_demo()
    wait_for_verdict(qtbot, window)
    qtbot.waitUntil(lambda: window.width() == 1024 and window.folded_panes.isVisible(), timeout=PATIENCE_MS)
    window.focus_pane("sheet")
    for _ in range(2):
        press(qtbot, (Qt.Key.Key_Home, Qt.KeyboardModifier.ControlModifier))
        while window.grid.currentIndex().column() < window.grid.model().columnCount() - 1:
            press(qtbot, Qt.Key.Key_Tab)
        press(qtbot, "0,4", ENTER)
    press(qtbot, (Qt.Key.Key_Home, Qt.KeyboardModifier.ControlModifier))
    assert len(window.sheet.groups) == 4
    qtbot.waitUntil(lambda: window.grid.horizontalScrollBar().value() == 0, timeout=PATIENCE_MS)


def test_the_new_group_button_shows_and_reaches_the_spare_column_at_1024_x_700(qtbot, window):
    """With the spare column scrolled out of view, the button shows whole; Alt+G takes the keyboard
    to the spare column's first cell, scrolled into view, and what is typed there starts group 5."""
    _shop_floor_window_with_groups_wider_than_the_sheet(qtbot, window)
    grid = window.grid
    assert not _spare_column_in_view(grid)
    button = window.new_group_button
    assert button.isVisible() and "&" in button.text()
    assert button.visibleRegion().boundingRect() == button.rect()  # nothing of it hidden
    assert cut_off_texts(window) == []
    window.focus_pane("verdict")  # from any pane
    press(qtbot, ALT_G)
    spare = grid.model().columnCount() - 1
    qtbot.waitUntil(lambda: QApplication.focusWidget() is grid and grid.currentIndex().column() == spare, timeout=PATIENCE_MS)
    assert grid.currentIndex().row() == 0
    qtbot.waitUntil(lambda: _spare_column_in_view(grid), timeout=PATIENCE_MS)
    press(qtbot, "0,45", ENTER, "0,47", ENTER)
    assert len(window.sheet.groups) == 5
    assert [window.sheet.cell(4, row).text for row in range(2)] == ["0,45", "0,47"]
    assert (grid.currentIndex().row(), grid.currentIndex().column()) == (2, 4)
    assert QApplication.focusWidget() is grid
    screenshot(window, "window-1024x700-new-group-button")


def test_the_new_group_button_leaves_tab_and_ctrl_tab_as_they_were(qtbot, window):
    """The button takes no place in the Tab order: Tab still walks the sheet's columns into the spare
    column, and Ctrl+Tab still leaves the sheet for the verdict."""
    _shop_floor_window_with_groups_wider_than_the_sheet(qtbot, window)
    grid = window.grid
    press(qtbot, Qt.Key.Key_Tab, Qt.Key.Key_Tab, Qt.Key.Key_Tab, Qt.Key.Key_Tab)
    assert grid.currentIndex().column() == grid.model().columnCount() - 1 and QApplication.focusWidget() is grid
    press(qtbot, (Qt.Key.Key_Tab, Qt.KeyboardModifier.ControlModifier))
    assert window.current_pane() == "verdict"


def test_a_signed_sheet_answers_the_button_as_it_answers_typing(qtbot, window):
    """While the sheet is read-only the button moves nothing and the window says why, as it does
    when a reading is typed into a signed analysis."""
    _shop_floor_window_with_groups_wider_than_the_sheet(qtbot, window)
    refused = []
    window.grid.read_only_edit.connect(refused.append)
    window.sheet_model.read_only = True
    try:
        press(qtbot, ALT_G)
        qtbot.waitUntil(lambda: refused == [""], timeout=PATIENCE_MS)
        assert window.grid.currentIndex().column() == 0
    finally:
        window.sheet_model.read_only = False
