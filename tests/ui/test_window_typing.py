"""Every key a technician types lands in the sheet, in every kind of column, without touching the mouse.

Keys go to whichever widget has the keyboard (``window_support.press``), never straight to the model.
"""

from __future__ import annotations

from PySide6.QtCore import Qt
from PySide6.QtWidgets import QApplication

from window_support import answers, press, screenshot, window  # noqa: F401 - pytest fixtures

from rankwise.readings import CellKind

ENTER = Qt.Key.Key_Return
TAB = Qt.Key.Key_Tab
CTRL_UP = (Qt.Key.Key_Up, Qt.KeyboardModifier.ControlModifier)


def _texts(window, group: int, rows: int) -> list[str]:
    return [window.sheet.cell(group, row).text for row in range(rows)]


def test_typing_down_the_new_group_column_keeps_every_reading(qtbot, window):
    """Tab to the "+ new group" column, type 3,1 Enter 3,2 Enter 3,3 Enter: all three land in a
    new group named C (after A and B), and the keyboard stays in the sheet for the next one."""
    qtbot.waitUntil(lambda: window.grid.hasFocus(), timeout=60000)
    press(qtbot, TAB, TAB)
    assert window.grid.currentIndex().column() == 2
    press(qtbot, "3,1", ENTER, "3,2", ENTER, "3,3", ENTER)
    assert window.sheet.group_names == ["A", "B", "C"]
    assert _texts(window, 2, 3) == ["3,1", "3,2", "3,3"]
    assert (window.grid.currentIndex().row(), window.grid.currentIndex().column()) == (3, 2)
    assert QApplication.focusWidget() is window.grid
    press(qtbot, Qt.Key.Key_Up, "3,4", ENTER)  # arrows still move without the mouse
    assert _texts(window, 2, 3) == ["3,1", "3,2", "3,4"]
    screenshot(window, "window-new-group-typed")


def test_typing_every_kind_of_cell(qtbot, window):
    """Readings, a note, a value below a detection limit and a slip of the finger are all kept as typed,
    each read as its kind, typed with keys only; Tab moves right after a reading is typed."""
    press(qtbot, "0,42", ENTER, "scrap", ENTER, "<0,05", ENTER, "12..5", ENTER)
    assert _texts(window, 0, 4) == ["0,42", "scrap", "<0,05", "12..5"]
    kinds = [window.sheet.cell(0, row).kind for row in range(4)]
    assert kinds == [CellKind.NUMBER, CellKind.NOTE, CellKind.CENSORED, CellKind.INVALID]
    press(qtbot, CTRL_UP)  # from the empty cell under the readings: to the last one, as in any spreadsheet
    assert window.grid.currentIndex().row() == 3
    press(qtbot, CTRL_UP, TAB, "0,47", TAB, "0,50", ENTER)
    assert window.sheet.cell(1, 0).text == "0,47"
    assert window.sheet.group_names == ["A", "B", "C"] and window.sheet.cell(2, 0).text == "0,50"


def test_spreadsheet_moves(qtbot, window):
    """Ctrl+arrows jump to the ends of the readings, Ctrl+Home/End to the corners, Page Down moves
    a screenful, Ctrl+Shift+Down selects to the end of a column."""
    window.grid.paste_text("\n".join(f"0,{40 + row}\t0,{60 + row}" for row in range(25)))
    window.grid.move_to(0, 0)
    window.grid.setFocus()
    press(qtbot, (Qt.Key.Key_Down, Qt.KeyboardModifier.ControlModifier))
    assert window.grid.currentIndex().row() == 24
    press(qtbot, (Qt.Key.Key_Right, Qt.KeyboardModifier.ControlModifier))
    assert (window.grid.currentIndex().row(), window.grid.currentIndex().column()) == (24, 1)
    press(qtbot, (Qt.Key.Key_Home, Qt.KeyboardModifier.ControlModifier))
    assert (window.grid.currentIndex().row(), window.grid.currentIndex().column()) == (0, 0)
    press(qtbot, (Qt.Key.Key_End, Qt.KeyboardModifier.ControlModifier))
    assert (window.grid.currentIndex().row(), window.grid.currentIndex().column()) == (24, 1)
    press(qtbot, (Qt.Key.Key_Home, Qt.KeyboardModifier.ControlModifier), Qt.Key.Key_PageDown)
    assert window.grid.currentIndex().row() > 3
    press(qtbot, (Qt.Key.Key_Home, Qt.KeyboardModifier.ControlModifier),
          (Qt.Key.Key_Down, Qt.KeyboardModifier.ControlModifier | Qt.KeyboardModifier.ShiftModifier))
    assert window.grid.selected_block() == [[f"0,{40 + row}"] for row in range(25)]


def test_readings_keep_the_resolution_they_were_typed_with(qtbot, window):
    """25.010 typed from a 0.001 gauge stays 25.010 in the sheet, the rank table and the median
    (the median of 25.010, 25.010, 25.011, 25.012 is 25.0105: common practice, no source)."""
    from window_support import wait_for_verdict

    press(qtbot, "25.010", ENTER, "25.012", ENTER, "25.011", ENTER, "25.010", ENTER, (Qt.Key.Key_Home,
          Qt.KeyboardModifier.ControlModifier), TAB, "25.020", ENTER, "25.030", ENTER, "25.025", ENTER)
    wait_for_verdict(qtbot, window)
    model = window.rank_table.model
    readings = [model.index(row, 2).data() for row in range(model.rowCount())]
    assert readings[0] == "25.010" and "25.020" in readings and "25.030" in readings
    assert window.results_panel.number_text("median_a") == "25.0105"


def test_a_reading_half_typed_when_the_panes_fold_or_unfold_is_kept_and_typing_goes_on(qtbot, window):
    """The window crosses the width where the question and the sheet fold into tabs (a late fit to a
    small screen, or the technician resizing it) while a reading is half typed: the keyboard stays
    in that cell, so the rest of the reading and the next ones land."""
    window.resize(1500, 900)
    qtbot.waitUntil(lambda: window.width() == 1500 and window.grid.hasFocus(), timeout=60000)
    press(qtbot, "3,1")
    window.resize(1000, 700)
    qtbot.waitUntil(lambda: window.width() == 1000, timeout=60000)
    press(qtbot, "2", ENTER, "3,1")
    window.resize(1500, 900)
    qtbot.waitUntil(lambda: window.width() == 1500, timeout=60000)
    press(qtbot, "5", ENTER, "3,11", ENTER)
    assert _texts(window, 0, 3) == ["3,12", "3,15", "3,11"]
    assert QApplication.focusWidget() is window.grid
