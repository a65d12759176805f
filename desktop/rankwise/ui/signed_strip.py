"""Above the readings of a signed analysis: who signed it, when, which revision, and a button that
starts the next revision (the signed record itself never changes)."""

from __future__ import annotations

from PySide6.QtCore import Qt, Signal
from PySide6.QtWidgets import QFrame, QHBoxLayout, QLabel, QPushButton, QSizePolicy, QWidget

from rankwise.wording.moments import written_moment


def signed_words(signoff) -> str:
    """One sentence on the sign-off: revision, signer and role, time with its offset, reviewer if any."""
    prepared = signoff.prepared
    words = (f"Signed, revision {signoff.revision}: {prepared.name} ({prepared.role}), "
             f"{written_moment(prepared.signed_at, seconds=False)}")
    if signoff.reviewed is not None:
        words += f"; reviewed by {signoff.reviewed.name} ({signoff.reviewed.role})"
    return words + ". The readings are read-only."


class SignedStrip(QFrame):
    """Shown only while the window holds a signed analysis.

    Signals:
        revision_requested(): the technician wants to change the readings in a new revision.
    """

    revision_requested = Signal()

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.setObjectName("signedStrip")
        self.words = QLabel()
        self.words.setObjectName("signedWords")
        self.words.setWordWrap(True)
        self.words.setAccessibleName("Sign-off of this analysis")
        self.words.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
        self.words.setSizePolicy(QSizePolicy.Policy.Expanding, QSizePolicy.Policy.Minimum)
        self.button = QPushButton()
        self.button.setObjectName("startRevision")
        self.button.setSizePolicy(QSizePolicy.Policy.Minimum, QSizePolicy.Policy.Fixed)
        self.button.clicked.connect(self.revision_requested)
        layout = QHBoxLayout(self)
        layout.setContentsMargins(8, 4, 8, 4)
        layout.addWidget(self.words, 1)
        layout.addWidget(self.button, 0, Qt.AlignmentFlag.AlignVCenter)
        self.hide()

    def show_signoff(self, signoff, next_revision: int) -> None:
        """Say who signed and offer the next revision; ``signoff`` None hides the strip."""
        if signoff is None:
            self.hide()
            return
        self.words.setText(signed_words(signoff))
        self.button.setText(f"Start rev&ision {next_revision}")
        self.button.setAccessibleName(f"Start revision {next_revision} to change the readings")
        self.button.setToolTip("A copy of these readings and settings that can be changed; the signed record stays as it is.")
        self.show()
