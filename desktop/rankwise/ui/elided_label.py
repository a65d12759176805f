"""A one-line label that ends in "…" when it is too narrow for its text (the whole text in its tooltip)."""

from __future__ import annotations

from PySide6.QtCore import QSize, Qt
from PySide6.QtGui import QPainter
from PySide6.QtWidgets import QLabel


class ElidedLabel(QLabel):
    """Shows as much of its text as fits, ending in "…", never a word cut off at the edge.

    The whole text is the tooltip, so nothing is lost on a narrow shop-floor screen.
    """

    def setText(self, text: str) -> None:  # noqa: N802 - Qt API
        super().setText(text)
        self.setToolTip(text)

    def shown_text(self) -> str:
        """The text as drawn at the label's present width."""
        return self.fontMetrics().elidedText(self.text(), Qt.TextElideMode.ElideRight, self.contentsRect().width())

    def minimumSizeHint(self) -> QSize:  # noqa: N802 - Qt API
        return QSize(self.fontMetrics().horizontalAdvance("…") * 4, super().minimumSizeHint().height())

    def paintEvent(self, event) -> None:  # noqa: N802 - Qt API
        painter = QPainter(self)
        painter.setPen(self.palette().color(self.foregroundRole()))
        painter.drawText(self.contentsRect(), int(self.alignment()), self.shown_text())
