"""Readings below different detection limits: the window says so, offers the choice, and a verdict follows."""

from __future__ import annotations

from PySide6.QtCore import Qt

from window_support import answers, screenshot, wait_for_verdict, window  # noqa: F401 - pytest fixtures

from rankwise.readings import GroupColumn, ReadingSheet, parse_reading
from rankwise.stats.results import TwoGroupResult
from rankwise.wording import CAUTION_SHORT


def mixed_limits_sheet() -> ReadingSheet:
    """Invented readings: a few written below 0.05 or 0.10, the rest measured."""
    before = ["<0.05", "0.21", "0.18", "<0.10", "0.25", "0.19", "0.22"]
    after = ["0.31", "0.28", "<0.05", "0.35", "0.30", "0.33", "0.29"]
    return ReadingSheet(
        [GroupColumn(name, unit="mg", cells=[parse_reading(t, decimal=".") for t in texts])
         for name, texts in (("Before", before), ("After", after))],
        decimal=".",
    )


def caution_in_view(window) -> bool:
    caution = window.results_panel.caution
    return caution.isVisible() and CAUTION_SHORT in caution.text() and caution.visibleRegion().boundingRect().height() > 20


def test_the_offered_choice_gives_a_verdict_in_one_undo_step(qtbot, window):
    window.set_sheet(mixed_limits_sheet())
    panel = window.results_panel
    qtbot.waitUntil(lambda: panel.choice_button.isVisible(), timeout=60000)
    assert "different limits (0.05, 0.10)" in panel.sentences.text()
    assert panel.choice_button.text() == "Treat all as below the highest limit, <0.10"
    assert not window.below_highest_action.isChecked()
    assert caution_in_view(window)
    screenshot(window, "window-mixed-limits-offer")

    qtbot.mouseClick(panel.choice_button, Qt.MouseButton.LeftButton)
    wait_for_verdict(qtbot, window)
    assert isinstance(window.last_result, TwoGroupResult)
    assert (window.last_result.n_a, window.last_result.n_b) == (7, 7)
    assert not panel.choice_button.isVisible()
    assert window.sheet.mixed_limits == "below-highest"
    assert window.below_highest_action.isChecked()
    assert "as chosen, all are treated as below the highest limit 0.10" in panel.notes.text()
    assert caution_in_view(window)
    assert window.undo_action.text() == "Undo treating readings below different limits as below the highest"
    screenshot(window, "window-mixed-limits-chosen")

    window.undo()
    qtbot.waitUntil(lambda: panel.choice_button.isVisible(), timeout=60000)
    assert window.sheet.mixed_limits == "ask" and window.last_result is None
    assert not window.below_highest_action.isChecked()
    assert [group.cells[0].text for group in window.sheet.groups] == ["<0.05", "0.31"]


def test_the_edit_menu_holds_the_same_choice(qtbot, window):
    window.set_sheet(mixed_limits_sheet())
    qtbot.waitUntil(lambda: window.results_panel.choice_button.isVisible(), timeout=60000)
    window.below_highest_action.trigger()
    wait_for_verdict(qtbot, window)
    assert window.sheet.mixed_limits == "below-highest"
    window.below_highest_action.trigger()
    qtbot.waitUntil(lambda: window.results_panel.choice_button.isVisible(), timeout=60000)
    assert window.sheet.mixed_limits == "ask"
    assert not window.below_highest_action.isChecked()
