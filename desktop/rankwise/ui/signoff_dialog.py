"""Sign a result: who, in which role, what was decided, a comment; the time comes from the clock."""

from __future__ import annotations

from collections.abc import Callable
from datetime import datetime

from PySide6.QtCore import QTimer
from PySide6.QtWidgets import (
    QComboBox,
    QDialog,
    QDialogButtonBox,
    QFormLayout,
    QLabel,
    QLineEdit,
    QPlainTextEdit,
    QVBoxLayout,
    QWidget,
)

from rankwise.records.signoff import DECISIONS, Signature
from rankwise.wording.moments import written_moment

ROLE_SUGGESTIONS = ("process technician", "quality technician", "quality engineer", "production supervisor")
"""Roles offered in the role box; any other role can be typed."""
NAME_LIMIT = 120
ROLE_LIMIT = 80


def local_now() -> datetime:
    """This computer's clock, timezone-aware (so the record carries the UTC offset)."""
    return datetime.now().astimezone()


class SignOffDialog(QDialog):
    """Collects one signature: the preparer's, or with ``reviewing=True`` the reviewer's approval.

    The date and time are read from the clock when the signature is given, never typed. Required
    fields (name, role, decision) are checked with a plain message and the cursor moves to the
    first one missing.
    """

    def __init__(self, parent: QWidget | None = None, *, reviewing: bool = False,
                 prepared: Signature | None = None, clock: Callable[[], datetime] = local_now) -> None:
        super().__init__(parent)
        self.reviewing = reviewing
        self._clock = clock
        self.signature: Signature | None = None
        self.setWindowTitle("Review and approve the result" if reviewing else "Sign the result")
        self.setAccessibleName(self.windowTitle())
        self.setMinimumWidth(520)

        self.intro_label = QLabel(self._intro_text(prepared))
        self.intro_label.setWordWrap(True)

        self.name_edit = QLineEdit()
        self.name_edit.setMaxLength(NAME_LIMIT)
        self.name_edit.setAccessibleName("Reviewer's printed name" if reviewing else "Printed name")
        self.name_edit.setToolTip("Your name as it should be printed on the record.")

        self.role_box = QComboBox()
        self.role_box.setEditable(True)
        self.role_box.addItems(("quality engineer", *[r for r in ROLE_SUGGESTIONS if r != "quality engineer"])
                               if reviewing else ROLE_SUGGESTIONS)
        self.role_box.lineEdit().setMaxLength(ROLE_LIMIT)
        self.role_box.setAccessibleName("Role")
        self.role_box.setToolTip("Your role; pick one or type your own.")

        self.decision_box = QComboBox()
        self.decision_box.setEditable(True)
        self.decision_box.addItems(DECISIONS)
        self.decision_box.setCurrentIndex(-1)
        self.decision_box.setAccessibleName("Decision")
        self.decision_box.setToolTip("What you decide about the change; pick one or write your own words.")
        self.decision_box.lineEdit().setPlaceholderText("choose or type the decision")

        self.comment_edit = QPlainTextEdit()
        self.comment_edit.setTabChangesFocus(True)
        self.comment_edit.setAccessibleName("Comment")
        self.comment_edit.setToolTip("Anything the record should say beside the decision (optional).")
        self.comment_edit.setFixedHeight(90)

        self.time_label = QLabel()
        self.time_label.setAccessibleName("Date and time of signing")
        self.time_label.setToolTip("Taken from this computer's clock when you sign; it cannot be typed.")

        self.problem_label = QLabel()
        self.problem_label.setWordWrap(True)
        self.problem_label.setAccessibleName("Problem with the entries")
        self.problem_label.setStyleSheet("font-weight: bold;")
        self.problem_label.hide()

        form = QFormLayout()
        form.addRow("&Printed name:", self.name_edit)
        form.addRow("&Role:", self.role_box)
        form.addRow("&Decision:", self.decision_box)
        form.addRow("&Comment:", self.comment_edit)
        form.addRow("Date and time:", self.time_label)

        self.buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Cancel)
        self.sign_button = self.buttons.addButton("&Approve and sign" if reviewing else "&Sign",
                                                  QDialogButtonBox.ButtonRole.AcceptRole)
        self.buttons.button(QDialogButtonBox.StandardButton.Cancel).setAutoDefault(False)
        self.sign_button.setAccessibleName(self.sign_button.text().replace("&", ""))
        self.buttons.accepted.connect(self.accept)
        self.buttons.rejected.connect(self.reject)

        layout = QVBoxLayout(self)
        layout.addWidget(self.intro_label)
        layout.addLayout(form)
        layout.addWidget(self.problem_label)
        layout.addWidget(self.buttons)

        self._ticker = QTimer(self)
        self._ticker.timeout.connect(self._show_time)
        self._ticker.start(1000)
        self._show_time()
        self.name_edit.setFocus()

    def showEvent(self, event) -> None:  # noqa: N802 (Qt's name)
        """Enter signs (the button box would otherwise make another button the default on showing)."""
        super().showEvent(event)
        self.sign_button.setDefault(True)

    @staticmethod
    def _intro_text(prepared: Signature | None) -> str:
        if prepared is None:
            return ("Sign this result: your printed name, your role and your decision go on the record "
                    "with the date and time from this computer's clock. After signing, the readings "
                    "and settings can no longer be changed; a new revision can be started from them.")
        return (f"Prepared by {prepared.name} ({prepared.role}), who decided: {prepared.decision}. "
                "As the reviewer, give your own name, role and decision.")

    def _show_time(self) -> None:
        """Show the clock's present time as it will be recorded."""
        self.time_label.setText(written_moment(self._clock()) + ", from this computer's clock")

    def problems(self) -> list[tuple[QWidget, str]]:
        """Missing required entries, each with its field and a plain message, in form order."""
        found = []
        if not self.name_edit.text().strip():
            found.append((self.name_edit, "Please type your printed name."))
        if not self.role_box.currentText().strip():
            found.append((self.role_box, "Please give your role (for example process technician)."))
        if not self.decision_box.currentText().strip():
            found.append((self.decision_box, "Please choose or type your decision."))
        return found

    def accept(self) -> None:
        """Sign when every required entry is there; otherwise say what is missing and stay open."""
        problems = self.problems()
        if problems:
            self.problem_label.setText("Not signed yet: " + " ".join(message for _, message in problems))
            self.problem_label.show()
            problems[0][0].setFocus()
            return
        self.signature = Signature(
            name=self.name_edit.text().strip(),
            role=self.role_box.currentText().strip(),
            decision=self.decision_box.currentText().strip(),
            comment=self.comment_edit.toPlainText().strip(),
            signed_at=self._clock(),
        )
        self._ticker.stop()
        super().accept()

    @classmethod
    def ask(cls, parent: QWidget | None = None, *, reviewing: bool = False,
            prepared: Signature | None = None) -> Signature | None:
        """Show the dialog and return the signature, or None when the user cancelled."""
        dialog = cls(parent, reviewing=reviewing, prepared=prepared)
        accepted = dialog.exec() == QDialog.DialogCode.Accepted
        return dialog.signature if accepted else None
