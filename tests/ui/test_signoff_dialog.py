"""Signing a result: required entries are checked in plain words; the time comes from the clock."""

from __future__ import annotations

from datetime import datetime, timedelta, timezone
from pathlib import Path

import pytest
from PySide6.QtCore import Qt
from PySide6.QtWidgets import QApplication, QDialog

from rankwise.records.signoff import DECISIONS, Signature
from rankwise.ui.signoff_dialog import SignOffDialog, local_now

SCREENSHOTS = Path(__file__).resolve().parents[1] / "screenshots"
FIXED_CLOCK = datetime(2026, 11, 30, 7, 45, 12, tzinfo=timezone(timedelta(hours=-5)))


@pytest.fixture
def dialog(qtbot):
    widget = SignOffDialog(clock=lambda: FIXED_CLOCK)
    qtbot.addWidget(widget)
    widget.show()
    qtbot.waitExposed(widget)
    return widget


def save(widget, name: str) -> None:
    SCREENSHOTS.mkdir(exist_ok=True)
    assert widget.grab().save(str(SCREENSHOTS / f"signoff-{name}.png"))


def test_the_clock_gives_a_timezone_aware_time_with_its_utc_offset():
    now = local_now()
    assert now.tzinfo is not None and now.utcoffset() is not None
    assert abs((datetime.now(timezone.utc) - now).total_seconds()) < 5


def test_nothing_is_signed_while_required_entries_are_missing(dialog, qtbot):
    dialog.role_box.setCurrentText("")
    qtbot.mouseClick(dialog.sign_button, Qt.MouseButton.LeftButton)
    save(dialog, "missing-entries")
    assert dialog.signature is None and dialog.isVisible()
    message = dialog.problem_label.text()
    assert message.startswith("Not signed yet:")
    assert "printed name" in message and "role" in message and "decision" in message
    assert QApplication.focusWidget() is dialog.name_edit


def test_typing_name_role_decision_and_comment_signs_with_the_clocks_time(dialog, qtbot):
    assert QApplication.focusWidget() is dialog.name_edit  # keyboard first: the cursor starts in the name
    qtbot.keyClicks(dialog.name_edit, "  Dana Whitfield ")
    dialog.role_box.setFocus()
    dialog.role_box.lineEdit().selectAll()
    qtbot.keyClicks(dialog.role_box.lineEdit(), "setter, line 3")
    dialog.decision_box.setCurrentIndex(DECISIONS.index("collect more data"))
    qtbot.keyClicks(dialog.comment_edit, "Ten more parts from the night shift.")
    assert "30 Nov 2026, 07:45:12 (UTC-05:00)" in dialog.time_label.text()  # as people write it, not ISO 'T'
    assert "T07" not in dialog.time_label.text()
    save(dialog, "filled")
    qtbot.keyClick(dialog.name_edit, Qt.Key.Key_Return)
    assert dialog.result() == QDialog.DialogCode.Accepted
    assert dialog.signature == Signature("Dana Whitfield", "setter, line 3", "collect more data",
                                         "Ten more parts from the night shift.", FIXED_CLOCK)


def test_a_decision_in_own_words_is_accepted(dialog, qtbot):
    qtbot.keyClicks(dialog.name_edit, "Rui Castellanos")
    qtbot.keyClicks(dialog.decision_box.lineEdit(), "accept for cavity 1 only")
    dialog.accept()
    assert dialog.signature.decision == "accept for cavity 1 only"
    assert dialog.signature.comment == ""


def test_review_mode_names_the_preparer_and_asks_for_approval(qtbot):
    prepared = Signature("Dana Whitfield", "process technician", "accept the change", "", FIXED_CLOCK)
    widget = SignOffDialog(reviewing=True, prepared=prepared, clock=lambda: FIXED_CLOCK)
    qtbot.addWidget(widget)
    widget.show()
    save(widget, "review")
    assert widget.windowTitle() == "Review and approve the result"
    assert widget.sign_button.text().replace("&", "") == "Approve and sign"
    assert widget.role_box.currentText() == "quality engineer"
    assert "Dana Whitfield" in widget.intro_label.text() and "accept the change" in widget.intro_label.text()


def test_every_entry_has_an_accessible_name():
    dialog = SignOffDialog()
    for field in (dialog.name_edit, dialog.role_box, dialog.decision_box, dialog.comment_edit,
                  dialog.time_label, dialog.sign_button):
        assert field.accessibleName()
    assert dialog.comment_edit.tabChangesFocus()  # Tab leaves the comment box instead of typing a tab
    dialog.deleteLater()


def test_ask_returns_the_signature_or_none_when_cancelled(qtbot, monkeypatch):
    def sign(self):
        self.name_edit.setText("Dana Whitfield")
        self.decision_box.setCurrentIndex(0)
        self.accept()
        return QDialog.DialogCode.Accepted

    monkeypatch.setattr(SignOffDialog, "exec", sign)
    signature = SignOffDialog.ask(None)
    assert signature.name == "Dana Whitfield" and signature.decision == DECISIONS[0]
    assert signature.signed_at.utcoffset() is not None

    monkeypatch.setattr(SignOffDialog, "exec", lambda self: QDialog.DialogCode.Rejected)
    assert SignOffDialog.ask(None, reviewing=True) is None
