"""The window's status line, whose passing messages are read whole, never cut off at its edge."""

from __future__ import annotations

from PySide6.QtCore import QTimer
from PySide6.QtWidgets import QLabel, QStatusBar, QWidget

SPACING = 16
"""Pixels allowed around each item of the status line (its margins and the gap between items)."""


class StatusLine(QStatusBar):
    """A status bar where a passing message too long for the room beside the permanent labels is
    shown word-wrapped, on as many lines as it needs, in place of the normal widgets and for the same
    time; ``currentMessage``, ``clearMessage`` and ``messageChanged`` treat it like any message."""

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self._wrapped = QLabel()
        self._wrapped.setWordWrap(True)
        self._wrapped.setAccessibleName("Message")
        self._wrapped.hide()
        super().addWidget(self._wrapped, 1)
        self._normal: list[QWidget] = []
        self._permanent: list[QWidget] = []
        self._set_aside: list[QWidget] = []
        self._timer = QTimer(self)
        self._timer.setSingleShot(True)
        self._timer.timeout.connect(self.clearMessage)

    def addWidget(self, widget: QWidget, stretch: int = 0) -> None:  # noqa: N802 - Qt API
        super().addWidget(widget, stretch)
        self._normal.append(widget)

    def addPermanentWidget(self, widget: QWidget, stretch: int = 0) -> None:  # noqa: N802 - Qt API
        super().addPermanentWidget(widget, stretch)
        self._permanent.append(widget)

    def showMessage(self, text: str, timeout: int = 0) -> None:  # noqa: N802 - Qt API
        self._end_wrapped()
        if self.fontMetrics().horizontalAdvance(text) + SPACING <= self._room():
            super().showMessage(text, timeout)
            return
        super().clearMessage()
        self._set_aside = [widget for widget in self._normal if widget.isVisible()]
        for widget in self._set_aside:
            widget.hide()
        self._wrapped.setText(text)
        self._wrapped.show()
        if timeout > 0:
            self._timer.start(timeout)
        self.messageChanged.emit(text)

    def currentMessage(self) -> str:  # noqa: N802 - Qt API
        return self._wrapped.text() if self._wrapped.isVisibleTo(self) else super().currentMessage()

    def clearMessage(self) -> None:  # noqa: N802 - Qt API
        if self._end_wrapped():
            self.messageChanged.emit("")
        super().clearMessage()

    def _room(self) -> int:
        """Pixels left for a message beside the permanent labels that have something to say."""
        beside = sum(widget.sizeHint().width() + SPACING for widget in self._permanent
                     if widget.isVisibleTo(self) and widget.sizeHint().width() > 0)
        return self.width() - beside

    def _end_wrapped(self) -> bool:
        """Take a wrapped message away and bring the normal widgets back; False when none was shown."""
        if not self._wrapped.isVisibleTo(self):
            return False
        self._timer.stop()
        self._wrapped.hide()
        self._wrapped.clear()
        for widget in self._set_aside:
            widget.show()
        self._set_aside = []
        return True
