"""Windows and dialogs open no larger than the screen they open on (small shop-floor screens, 200 %
scaling), and within it."""

from __future__ import annotations

from PySide6.QtGui import QGuiApplication
from PySide6.QtWidgets import QWidget

SCREEN_SHARE_WIDE = 0.95
SCREEN_SHARE_HIGH = 0.92
"""A window takes at most this share of the screen's free width and height (room for its frame)."""


def fit_to_screen(widget: QWidget, width: int, height: int) -> None:
    """Resize ``widget`` to ``width`` x ``height``, or less to fit the screen of its parent (or its
    own, or the primary screen), and place it inside that screen."""
    parent = widget.parentWidget()
    screen = (parent.screen() if parent is not None else None) or widget.screen() or QGuiApplication.primaryScreen()
    if screen is None:
        widget.resize(width, height)
        return
    free = screen.availableGeometry()
    minimum = widget.minimumSizeHint()
    width = max(min(width, int(free.width() * SCREEN_SHARE_WIDE)), min(minimum.width(), free.width()))
    height = max(min(height, int(free.height() * SCREEN_SHARE_HIGH)), min(minimum.height(), free.height()))
    widget.resize(width, height)
    frame = widget.frameGeometry()
    left = min(max(frame.left(), free.left()), free.right() - width)
    top = min(max(frame.top(), free.top()), free.bottom() - height)
    if parent is not None:
        centre = parent.frameGeometry().center()
        left = min(max(centre.x() - width // 2, free.left()), free.left() + free.width() - width)
        top = min(max(centre.y() - height // 2, free.top()), free.top() + free.height() - height)
    widget.move(max(left, free.left()), max(top, free.top()))
