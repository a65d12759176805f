"""Groups: add, rename with unit and limits, move, remove; the question picker follows."""

from __future__ import annotations

from PySide6.QtCore import QPoint, Qt

from window_support import answers, screenshot, window  # noqa: F401 - pytest fixtures

from rankwise.ui.group_details_dialog import GroupDetails, GroupDetailsDialog


def test_header_double_click_edits_name_unit_and_limits(qtbot, window, monkeypatch):
    """Double-clicking a column title asks for its details; the header and the picker show the new name."""
    asked = []

    def ask(cls, parent, details):
        asked.append(details)
        return GroupDetails("Wheel B", "µm", 0.2, 0.8, 0.5)

    monkeypatch.setattr(GroupDetailsDialog, "ask", classmethod(ask))
    header = window.grid.horizontalHeader()
    qtbot.mouseDClick(header.viewport(), Qt.MouseButton.LeftButton,
                      pos=QPoint(header.sectionViewportPosition(1) + 10, 10))
    assert asked and asked[0].name == "B"
    group = window.sheet.groups[1]
    assert (group.name, group.unit, group.lsl, group.usl, group.nominal) == ("Wheel B", "µm", 0.2, 0.8, 0.5)
    assert window.sheet_model.headerData(1, Qt.Orientation.Horizontal) == "Wheel B\nµm"
    qtbot.waitUntil(lambda: window.question_panel.group_b.currentText() == "Wheel B", timeout=60000)


def test_lsl_above_usl_is_refused_in_plain_words(qtbot, window, answers, monkeypatch):
    """Limits the wrong way round are refused with the readings layer's message; nothing changes."""
    monkeypatch.setattr(GroupDetailsDialog, "ask", classmethod(lambda cls, parent, details: GroupDetails("A", "", 5.0, 1.0, None)))
    window.grid.move_to(0, 0)
    window.edit_group_details()
    assert answers.problems and "LSL" in answers.problems[0][1]
    assert window.sheet.groups[0].lsl is None


def test_margin_as_share_of_tolerance_uses_the_limits(qtbot, window, monkeypatch):
    """With LSL/USL set, a margin of 10 % of the tolerance width becomes 0.06 in the readings' unit."""
    monkeypatch.setattr(GroupDetailsDialog, "ask", classmethod(lambda cls, parent, details: GroupDetails("A", "µm", 0.2, 0.8, None)))
    window.grid.move_to(0, 0)
    window.edit_group_details()
    qtbot.waitUntil(lambda: window.question_panel.margin_unit.count() == 2, timeout=60000)
    window.question_panel.select_option("margin")
    window.question_panel.margin_unit.setCurrentIndex(window.question_panel.margin_unit.findData("tolerance"))
    window.question_panel.margin.setValue(10.0)
    choice = window.question_panel.choice()
    assert abs(choice.settings.margin - 0.06) < 1e-12
    screenshot(window.question_panel, "question-panel-margin")


def test_add_move_and_remove_groups_with_undo(qtbot, window, answers):
    """A group added at the right can be moved left and removed; undo brings it back."""
    window.add_group()
    assert window.sheet.group_names == ["A", "B", "C"]
    window.grid.move_to(0, 2)
    window.move_group(-1)
    assert window.sheet.group_names == ["A", "C", "B"]
    window.grid.move_to(0, 1)
    window.remove_group()
    assert window.sheet.group_names == ["A", "B"]
    window.undo()
    assert window.sheet.group_names == ["A", "C", "B"]
    qtbot.waitUntil(lambda: window.question_panel.group_a.count() == 3, timeout=60000)


def test_removing_a_group_with_readings_asks_first(qtbot, window, answers):
    """A group holding readings is removed only after the user agrees."""
    window.grid.paste_text("1.0\n2.0\n")
    window.grid.move_to(0, 0)
    answers.confirm = False
    window.remove_group()
    assert window.sheet.group_names == ["A", "B"]
    answers.confirm = True
    window.remove_group()
    assert window.sheet.group_names == ["B"]


def test_group_details_dialog_refuses_a_limit_that_is_not_a_number(qtbot, window):
    """Typing 'abc' as LSL keeps the dialog open with a plain message; a number is accepted (comma or point)."""
    dialog = GroupDetailsDialog(window, GroupDetails("A", "µm", None, None, None))
    qtbot.addWidget(dialog)
    dialog.show()
    dialog.lsl.setText("abc")
    dialog._check_and_accept()
    assert dialog.isVisible() and "LSL" in dialog.problem.text() and "abc" in dialog.problem.text()
    screenshot(dialog, "group-details-problem")
    dialog.lsl.setText("0,2")
    dialog._check_and_accept()
    assert dialog.result() == dialog.DialogCode.Accepted and dialog.details().lsl == 0.2
