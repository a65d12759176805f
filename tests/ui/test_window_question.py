"""Each opened file starts from its own question: the open dialog proposes it, the technician confirms or
changes it, the status line says when the question changed and why; the window and `rankwise report`
give the same answer to every question on every demo file."""

from __future__ import annotations

import argparse
from datetime import datetime, timezone

import pytest
from PySide6.QtCore import Qt
from PySide6.QtWidgets import QLabel

from window_support import DEMO_FILES, PATIENCE_MS, answers, screenshot, wait_for_verdict, window  # noqa: F401

from rankwise.readings import open_readings
from rankwise.records import Signature, read_record, verify_record
from rankwise.records.cli import add_record_commands, run_report
from rankwise.stats.analysis import Question
from rankwise.ui.open_dialog import OpenReadingsDialog
from rankwise.ui.question_panel import OPTION_OF_QUESTION
from rankwise.ui.signoff_dialog import SignOffDialog

COATING = DEMO_FILES / "coating_before_after_cure.csv"
GROUP_DEMO_FILES = ("coating_before_after_cure.csv", "gauge_sheet_bore_diameter.xlsx", "long_export.csv",
                    "push_out_force_three_presses.xlsx", "two_wheels_roughness.csv")
"""The demo files of groups of readings (a file of many characteristics is opened another way)."""


def _dialog_driven_by(qtbot, seen: dict, act=None):
    """An ``ask`` that shows the real open dialog, lets the test work it with keys, then clicks Load."""

    def ask(cls, parent, path):
        dialog = cls(parent, path, open_readings(path))
        qtbot.addWidget(dialog)
        dialog.show()
        qtbot.waitExposed(dialog)
        seen["same_parts"] = dialog.same_parts.text()
        seen["proposed"] = dialog.question
        seen["offered"] = [dialog.question_choice.itemData(i) for i in range(dialog.question_choice.count())]
        if act is not None:
            act(dialog)
        screenshot(dialog, f"open-dialog-question-{path.stem}")
        qtbot.mouseClick(dialog.load_button, Qt.MouseButton.LeftButton)
        qtbot.waitUntil(lambda: not dialog.isVisible(), timeout=PATIENCE_MS)
        return dialog.reading_set

    return classmethod(ask)


def _open_through_the_dialog(qtbot, window, answers, monkeypatch, path, act=None) -> dict:
    seen: dict = {}
    monkeypatch.setattr(OpenReadingsDialog, "ask", _dialog_driven_by(qtbot, seen, act))
    answers.open_path = path
    window.ask_and_open()
    return seen


def test_the_dialog_proposes_the_same_parts_and_the_window_starts_from_it(qtbot, window, answers, monkeypatch):
    window.choose_question("b-higher")  # what the previous work asked
    seen = _open_through_the_dialog(qtbot, window, answers, monkeypatch, COATING)
    assert "14 parts measured twice, in 'Before cure' and in 'After cure'; paired by the column 'Part'." in seen["same_parts"]
    assert seen["proposed"] is Question.PAIRED
    assert seen["offered"] == [Question.PAIRED, Question.TWO_GROUPS]
    assert window.question_panel.option.key == "paired"
    status = window.statusBar().currentMessage()
    assert "The question was set to 'Same parts: before vs after?'" in status and "paired by the column 'Part'" in status
    wait_for_verdict(qtbot, window)
    assert window.last_analysis.question is Question.PAIRED
    assert "After cure reads lower than Before cure on the same parts." in window.results_panel.headline.text()
    assert "paired by the part identifier in the column" in window.results_panel.notes.text()
    assert window.sheet_model.headerData(0, Qt.Orientation.Vertical) == "1  C-01"
    screenshot(window, "window-same-parts-opened")


def test_the_technician_changes_the_proposed_question_with_the_keyboard(qtbot, window, answers, monkeypatch):
    def choose_two_groups(dialog):
        dialog.question_choice.setFocus()
        qtbot.keyClick(dialog.question_choice, Qt.Key.Key_Down)
        assert dialog.question is Question.TWO_GROUPS

    _open_through_the_dialog(qtbot, window, answers, monkeypatch, COATING, choose_two_groups)
    assert window.question_panel.option.key == "differ"
    wait_for_verdict(qtbot, window)
    assert window.last_analysis.question is Question.TWO_GROUPS
    assert "Caution: these readings are the same parts measured twice" in window.results_panel.notes.text()


def test_the_next_file_starts_from_its_own_question_and_the_status_line_says_why(qtbot, window, answers, monkeypatch):
    _open_through_the_dialog(qtbot, window, answers, monkeypatch, COATING)
    wait_for_verdict(qtbot, window)
    assert window.question_panel.option.key == "paired"
    seen = _open_through_the_dialog(qtbot, window, answers, monkeypatch, DEMO_FILES / "long_export.csv")
    assert seen["same_parts"] == "" and seen["offered"] == [Question.TWO_GROUPS]
    assert window.question_panel.option.key == "differ"
    status = window.statusBar().currentMessage()
    assert "The question was set to 'Do the two groups differ?': the file holds 2 groups of different parts." in status
    paired_button = window.question_panel.findChild(type(window.question_panel._buttons.button(0)), "question-paired")
    assert not paired_button.isEnabled() and "cannot be matched part by part" in paired_button.toolTip()
    wait_for_verdict(qtbot, window)
    assert window.last_analysis.question is Question.TWO_GROUPS
    _open_through_the_dialog(qtbot, window, answers, monkeypatch, DEMO_FILES / "push_out_force_three_presses.xlsx")
    assert window.question_panel.option.key == "several"
    assert "the file holds 3 groups." in window.statusBar().currentMessage()


def test_opening_a_file_that_keeps_the_question_says_nothing_about_it(qtbot, window, answers, monkeypatch):
    _open_through_the_dialog(qtbot, window, answers, monkeypatch, DEMO_FILES / "two_wheels_roughness.csv")
    assert window.question_panel.option.key == "differ"
    assert "question was set" not in window.statusBar().currentMessage()


def test_same_parts_in_a_typed_sheet_wait_for_one_row_per_part(qtbot, window, answers):
    window.grid.paste_text("5.1\t5.3\n5.0\t5.2\n4.9\n")
    qtbot.mouseClick(window.question_panel.findChild(type(window.question_panel._buttons.button(0)), "question-paired"),
                     Qt.MouseButton.LeftButton)
    assert window.question_panel.option.key == "paired"
    qtbot.waitUntil(lambda: "one row per part" in window.results_panel.headline.text()
                    + window.results_panel.sentences.text(), timeout=PATIENCE_MS)
    window.grid.move_to(2, 1)
    window.grid.paste_text("5.0\n")
    wait_for_verdict(qtbot, window)
    assert "Readings paired by row" in window.results_panel.notes.text()


def _report(path, out, question):
    top = argparse.ArgumentParser(prog="rankwise")
    add_record_commands(top.add_subparsers(dest="command", required=True))
    args = top.parse_args(["report", str(path), "--out", str(out), "--question", question.value,
                           "--signed-by", "T. Example", "--role", "process technician"])
    assert run_report(args) == 0
    assert verify_record(out).intact
    return read_record(out)


def _questions_for(name):
    opened = open_readings(DEMO_FILES / name)
    asked = [Question.TWO_GROUPS]
    if opened.pairing is not None:
        asked.append(Question.PAIRED)
    if len(opened.groups) >= 3:
        asked.append(Question.SEVERAL)
    return asked


@pytest.mark.parametrize(("name", "question"), [
    (name, question) for name in GROUP_DEMO_FILES for question in _questions_for(name)
])
def test_window_and_report_agree_and_both_records_verify(qtbot, window, answers, monkeypatch, tmp_path, name, question):
    path = DEMO_FILES / name
    assert window.open_path(path)
    qtbot.mouseClick(window.question_panel.findChild(type(window.question_panel._buttons.button(0)),
                                                     f"question-{OPTION_OF_QUESTION[question]}"),
                     Qt.MouseButton.LeftButton)
    qtbot.waitUntil(lambda: not window.runner.busy and window.last_analysis is not None
                    and window.last_analysis.question is question, timeout=PATIENCE_MS)
    wait_for_verdict(qtbot, window)
    monkeypatch.setattr(SignOffDialog, "ask", classmethod(lambda cls, parent=None, **kw: Signature(
        "T. Example", "process technician", "", "", datetime(2026, 3, 2, 9, 30, tzinfo=timezone.utc))))
    answers.save_path = tmp_path / "from-window.xlsx"
    answers.confirm = False
    assert window.records.sign_and_save()
    from_window = read_record(answers.save_path)
    assert verify_record(answers.save_path).intact
    from_report = _report(path, tmp_path / "from-report.xlsx", question)
    assert from_window.analysis.question is from_report.analysis.question is question
    assert [g.name for g in from_window.analysis.groups] == [g.name for g in from_report.analysis.groups]
    assert from_window.result.p_value == from_report.result.p_value
    assert from_window.analysis.notes == from_report.analysis.notes
    assert from_window.snapshot.parts == from_report.snapshot.parts


def test_on_a_small_screen_the_message_that_the_question_changed_is_read_whole(qtbot, window, answers, monkeypatch):
    """At 1024 x 700 the message naming the question a file was set to, and why, ran under the
    decimal-mark label and off the window's edge; it now wraps onto as many lines as it needs, and the
    readings' counts come back when it goes."""
    window.resize(1024, 700)
    qtbot.waitUntil(lambda: window.width() == 1024, timeout=PATIENCE_MS)
    _open_through_the_dialog(qtbot, window, answers, monkeypatch, COATING)
    bar = window.statusBar()
    message = bar.currentMessage()
    assert "The question was set to 'Same parts: before vs after?'" in message and message.endswith("'Part'.")
    shown = next(label for label in bar.findChildren(QLabel) if label.isVisible() and label.text() == message)
    qtbot.waitUntil(lambda: shown.height() >= shown.heightForWidth(shown.width()), timeout=PATIENCE_MS)
    permanent = [label for label in (window.status_decimal, window.status_state) if label.isVisible() and label.text()]
    assert shown.geometry().right() < min((label.x() for label in permanent), default=bar.width())
    assert not window.status_counts.isVisible()
    screenshot(window, "window-small-question-set-message")
    bar.clearMessage()
    assert bar.currentMessage() == "" and not shown.isVisible()
    qtbot.waitUntil(window.status_counts.isVisible, timeout=PATIENCE_MS)
