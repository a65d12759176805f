"""What the technician sees first is not cut off: the spare column's title and the notes under the verdict."""

from __future__ import annotations

from PySide6.QtGui import QTextDocument
from window_support import answers, wait_for_verdict, window  # noqa: F401

from rankwise.stats.results import PlanResult


def test_the_new_group_column_is_in_view_with_its_whole_title(qtbot, window):
    """With the two-wheel demo (two groups), the spare column sits inside the sheet and its title fits it."""
    window.open_demo()
    wait_for_verdict(qtbot, window)
    grid = window.grid
    header = grid.horizontalHeader()
    spare = grid.model().columnCount() - 1
    right_edge = header.sectionViewportPosition(spare) + header.sectionSize(spare)
    assert right_edge <= grid.viewport().width()
    title = grid.model().headerData(spare, header.orientation())
    widest = max(header.fontMetrics().horizontalAdvance(line) for line in title.splitlines())
    assert header.sectionSize(spare) >= widest


def test_the_notes_of_a_plan_follow_their_heading(qtbot, window):
    """The plan's notes are shown as a list right under "Notes:", not after an empty gap."""
    window.open_demo()
    wait_for_verdict(qtbot, window)
    window.question_panel.select_option("plan")
    window.question_panel.planned_shift.setValue(0.03)
    window.question_panel.planned_spread.setValue(0.04)
    qtbot.waitUntil(lambda: isinstance(window.last_result, PlanResult) and not window.runner.busy, timeout=60000)
    notes = window.results_panel.notes
    assert notes.isVisible() and notes.text().startswith("<b>Notes:</b>")
    document = QTextDocument()
    document.setDefaultFont(notes.font())
    document.setHtml(notes.text())
    document.setTextWidth(notes.width())
    layout = document.documentLayout()
    heading, first_note = document.firstBlock(), document.firstBlock().next()
    assert first_note.text().startswith("The test will be")
    gap = layout.blockBoundingRect(first_note).top() - layout.blockBoundingRect(heading).bottom()
    assert gap <= notes.fontMetrics().height() / 4
