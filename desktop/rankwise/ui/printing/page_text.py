"""Text on the printed page: wrapped paragraphs measured for the device they are drawn on."""

from __future__ import annotations

from PySide6.QtCore import QPointF, Qt
from PySide6.QtGui import QFont, QFontMetricsF, QPaintDevice, QPainter, QTextLayout, QTextOption

ELLIPSIS = "…"


def page_font(points: float, *, bold: bool = False, italic: bool = False, mono: bool = False) -> QFont:
    """A page font of ``points`` size (sans serif; fixed pitch for fingerprints)."""
    font = QFont("DejaVu Sans Mono" if mono else "DejaVu Sans")
    font.setStyleHint(QFont.StyleHint.TypeWriter if mono else QFont.StyleHint.SansSerif)
    font.setPointSizeF(points)
    font.setBold(bold)
    font.setItalic(italic)
    return font


class Paragraph:
    """A block of text wrapped to a width (at word boundaries, or anywhere for very long words).

    ``max_lines`` cuts a longer text and ends its last line with an ellipsis; ``truncated``
    tells whether that happened. ``height`` is in device pixels.
    """

    def __init__(self, text: str, font: QFont, width: float, device: QPaintDevice, *,
                 max_lines: int | None = None, align=Qt.AlignmentFlag.AlignLeft) -> None:
        self.font = font
        self.width = width
        self.device = device
        self.align = align
        self.truncated = False
        self.layout, self.height = self._lay_out(text)
        if max_lines is not None and self.layout.lineCount() > max_lines:
            self.truncated = True
            self.layout, self.height = self._cut(text, max_lines)

    def _lay_out(self, text: str) -> tuple[QTextLayout, float]:
        """Break ``text`` into lines of at most ``width``."""
        layout = QTextLayout(text, self.font, self.device)
        option = QTextOption()
        option.setWrapMode(QTextOption.WrapMode.WrapAtWordBoundaryOrAnywhere)
        option.setAlignment(self.align)
        layout.setTextOption(option)
        leading = QFontMetricsF(self.font, self.device).leading()
        y = 0.0
        layout.beginLayout()
        while True:
            line = layout.createLine()
            if not line.isValid():
                break
            line.setLineWidth(self.width)
            line.setPosition(QPointF(0.0, y))
            y += line.height() + max(leading, 0.0)
        layout.endLayout()
        return layout, y

    def _cut(self, text: str, max_lines: int) -> tuple[QTextLayout, float]:
        """Keep ``max_lines`` lines, the last one ending in an ellipsis."""
        last = self.layout.lineAt(max_lines - 1)
        end = last.textStart() + last.textLength()
        while end > 0:
            layout, height = self._lay_out(text[:end].rstrip() + ELLIPSIS)
            if layout.lineCount() <= max_lines:
                return layout, height
            end -= max(1, (end - last.textStart()) // 8)
        return self._lay_out(ELLIPSIS)

    def draw(self, painter: QPainter, x: float, y: float) -> None:
        """Paint the paragraph with its top-left corner at (x, y)."""
        painter.setFont(self.font)
        self.layout.draw(painter, QPointF(x, y))


def one_line(text: str, font: QFont, width: float, device: QPaintDevice,
             mode=Qt.TextElideMode.ElideMiddle) -> str:
    """``text`` shortened with an ellipsis (in the middle by default) to fit ``width``."""
    return QFontMetricsF(font, device).elidedText(text, mode, width)


def line_height(font: QFont, device: QPaintDevice) -> float:
    """Height of one line of ``font`` on ``device``."""
    return QFontMetricsF(font, device).lineSpacing()


def text_width(text: str, font: QFont, device: QPaintDevice) -> float:
    """Width of ``text`` in ``font`` on ``device``."""
    return QFontMetricsF(font, device).horizontalAdvance(text)
