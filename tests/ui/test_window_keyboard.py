"""The keyboard reaches every control: F6 walks the panes, Tab walks the controls and leaves the sheet
with Ctrl+Tab, labels carry Alt+letter mnemonics, every control has a name for screen readers."""

from __future__ import annotations

from PySide6.QtCore import Qt
from PySide6.QtGui import QAccessible
from PySide6.QtWidgets import QAbstractButton, QApplication, QLabel, QTabBar, QWidget

from window_support import PATIENCE_MS, answers, press, screenshot, wait_for_verdict, window  # noqa: F401 - pytest fixtures

F6 = Qt.Key.Key_F6
SHIFT_F6 = (Qt.Key.Key_F6, Qt.KeyboardModifier.ShiftModifier)


def _pane_walk(qtbot, window, key, steps: int) -> list[str]:
    seen = []
    for _ in range(steps):
        press(qtbot, key)
        seen.append(window.current_pane())
    return seen


def test_f6_walks_the_panes_both_ways(qtbot, window):
    """From the sheet, F6 goes to the verdict, the rank table, the charts, the question and back to the
    sheet; Shift+F6 walks the other way. Focus is on a control that shows it."""
    window.open_demo()
    wait_for_verdict(qtbot, window)
    window.grid.setFocus()
    assert _pane_walk(qtbot, window, F6, 5) == ["verdict", "ranks", "charts", "question", "sheet"]
    assert QApplication.focusWidget() is window.grid
    assert _pane_walk(qtbot, window, SHIFT_F6, 5) == ["question", "charts", "ranks", "verdict", "sheet"]
    press(qtbot, F6, F6, F6)
    assert isinstance(QApplication.focusWidget(), QTabBar) and window.tabs.currentWidget() is window.dot_plot
    press(qtbot, Qt.Key.Key_Right)  # arrows switch the charts once their tabs have the keyboard
    assert window.tabs.currentWidget() is window.cumulative_plot
    screenshot(window, "window-keyboard-charts-tab")


def test_ctrl_tab_leaves_the_sheet_and_tab_reaches_every_setting(qtbot, window):
    """Tab moves between cells inside the sheet; Ctrl+Tab goes on to the verdict, Shift+Tab comes back,
    Ctrl+Shift+Tab goes back to the question's settings; Tab from the
    question goes through the significance level and the group pickers."""
    window.grid.setFocus()
    press(qtbot, Qt.Key.Key_Tab)
    assert QApplication.focusWidget() is window.grid and window.grid.currentIndex().column() == 1
    press(qtbot, (Qt.Key.Key_Tab, Qt.KeyboardModifier.ControlModifier))
    assert window.current_pane() == "verdict"
    press(qtbot, (Qt.Key.Key_Backtab, Qt.KeyboardModifier.ShiftModifier))
    assert QApplication.focusWidget() is window.grid
    press(qtbot, (Qt.Key.Key_Backtab, Qt.KeyboardModifier.ControlModifier | Qt.KeyboardModifier.ShiftModifier))
    assert window.current_pane() == "question"
    window.focus_pane("question")
    reached = set()
    for _ in range(12):
        press(qtbot, Qt.Key.Key_Tab)
        reached.add(QApplication.focusWidget())
    panel = window.question_panel
    assert {panel.level, panel.group_a, panel.group_b, panel.method} <= reached


def test_alt_letters_reach_the_settings_and_the_sheet(qtbot, window):
    """Alt+S goes to the significance level, Alt+A and Alt+B to the group pickers, Alt+D back to the sheet."""
    window.grid.setFocus()
    for letter, expected in ((Qt.Key.Key_S, window.question_panel.level), (Qt.Key.Key_A, window.question_panel.group_a),
                             (Qt.Key.Key_B, window.question_panel.group_b), (Qt.Key.Key_D, window.grid)):
        press(qtbot, (letter, Qt.KeyboardModifier.AltModifier))
        assert QApplication.focusWidget() is expected, letter


def _focusable(widget: QWidget) -> bool:
    return widget.isVisible() and widget.isEnabled() and widget.focusPolicy() & Qt.FocusPolicy.TabFocus


def test_every_control_has_a_name_for_screen_readers(qtbot, window):
    """Every control the keyboard can reach tells assistive technology what it is."""
    window.open_demo()
    wait_for_verdict(qtbot, window)
    nameless = []
    for widget in window.findChildren(QWidget):
        if not _focusable(widget) or isinstance(widget, QLabel) and not widget.text():
            continue
        interface = QAccessible.queryAccessibleInterface(widget)
        name = interface.text(QAccessible.Text.Name) if interface is not None else ""
        if not (name or "").strip():
            nameless.append(f"{type(widget).__name__} {widget.objectName()!r}")
    assert nameless == []


def test_buttons_and_tabs_have_mnemonics_or_sit_in_the_tab_order(qtbot, window):
    """A control without an Alt+letter can still be reached with Tab (Qt's own helpers, such as the
    table's select-all corner, have keys of their own: Ctrl+A)."""
    for widget in window.findChildren(QAbstractButton):
        if widget.isVisible() and not widget.objectName().startswith("qt_"):
            assert "&" in widget.text() or widget.focusPolicy() & Qt.FocusPolicy.TabFocus, widget.text()
    tabs = window.tabs
    assert all("&" in tabs.tabText(i) for i in range(tabs.count()))


def test_a_button_that_cannot_be_pressed_looks_greyed(qtbot, window):
    """Under the window's style sheet a disabled button kept the dark text and border of one that can be
    pressed: a finished comparison's Stop looked as pressable as its neighbour. Disabled text is now grey."""
    from PySide6.QtGui import QColor
    from PySide6.QtWidgets import QPushButton

    def darkest(button):
        image = button.grab().toImage()
        return min(QColor(image.pixel(x, y)).lightness() for x in range(image.width()) for y in range(image.height()))

    pressable, not_now = QPushButton("Stop", window), QPushButton("Stop", window)
    not_now.setEnabled(False)
    for place, button in enumerate((pressable, not_now)):
        button.move(10 + 120 * place, 10)
        button.show()
    qtbot.waitUntil(lambda: pressable.isVisible() and not_now.isVisible(), timeout=PATIENCE_MS)
    assert darkest(not_now) >= darkest(pressable) + 60
