"""A tab holding one chart, built the first time the tab is shown and brought up to date when seen.

Building each chart only when its tab is first opened keeps the window's start quick, and updating a
chart only while it is in view keeps typing quick. The chart modules themselves are imported before
the window appears (``start_up``).
"""

from __future__ import annotations

from PySide6.QtCore import QTimer
from PySide6.QtGui import QShowEvent
from PySide6.QtWidgets import QVBoxLayout, QWidget

class ChartTab(QWidget):
    """Holds the chart class ``chart_name`` of ``rankwise.ui.charts`` and the result it should show."""

    def __init__(self, chart_name: str, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.chart_name = chart_name
        self.chart = None
        self._shown: tuple[object, object] | None = None
        self._stale = False
        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)

    def show_result(self, result, analysis) -> None:
        """Show this result now when the tab is in view, else when it is next opened."""
        self._shown = (result, analysis)
        self._stale = True
        if self.isVisible():
            self._bring_up_to_date()

    def clear(self) -> None:
        """Show no result."""
        self._shown = None
        self._stale = True
        if self.isVisible():
            self._bring_up_to_date()

    def showEvent(self, event: QShowEvent) -> None:  # noqa: N802 - Qt API
        """Build the chart on first view and catch up with the newest result."""
        if self.chart is None:
            from rankwise.ui import charts

            self.chart = getattr(charts, self.chart_name)()
            self.layout().addWidget(self.chart)
            self._stale = True
        self._bring_up_to_date()
        super().showEvent(event)

    def _bring_up_to_date(self) -> None:
        if self.chart is None or not self._stale:
            return
        self._stale = False
        if self._shown is None:
            self.chart.clear()
        else:
            self.chart.use_decimal_mark(self._shown[1].decimal_mark)
            self.chart.show_result(*self._shown)
