"""The window's panes: the question, the readings sheet, the verdict, and the ranks and charts tabs."""

from __future__ import annotations

from pathlib import Path

from PySide6.QtCore import Qt
from PySide6.QtWidgets import QLabel, QSplitter, QTabWidget, QVBoxLayout, QWidget

import rankwise
from rankwise.ui.chart_tab import ChartTab


def style_sheet() -> str:
    """The window's style sheet (resources/style.qss), or none when it is missing."""
    path = Path(rankwise.__file__).resolve().parents[2] / "resources" / "style.qss"
    try:
        return path.read_text(encoding="utf-8")
    except OSError:
        return ""


class WindowPanes:
    """Mixin of ``MainWindow``: sizes the window and lays out its panes and status line."""

    def _fit_to_screen(self) -> None:
        """Open at a comfortable size, never larger than the screen (small shop-floor screens too)."""
        screen = self.screen().availableGeometry() if self.screen() is not None else None
        width, height = 1440, 900
        if screen is not None and screen.width() > 0:
            width = min(width, int(screen.width() * 0.95))
            height = min(height, int(screen.height() * 0.92))
        self.resize(width, height)

    def _build_layout(self) -> None:
        self.dot_plot = ChartTab("ReadingsDotPlot")
        self.cumulative_plot = ChartTab("CumulativeSharePlot")
        self.null_plot = ChartTab("NullDistributionPlot")
        self.power_plot = ChartTab("PowerCurvePlot")
        self.charts = (self.dot_plot, self.cumulative_plot, self.null_plot, self.power_plot)

        sheet_box = QWidget()
        sheet_layout = QVBoxLayout(sheet_box)
        sheet_layout.setContentsMargins(4, 4, 4, 4)
        sheet_title = QLabel("Rea&dings: one column per group")
        sheet_title.setBuddy(self.grid)
        sheet_title.setObjectName("panelTitle")
        sheet_hint = QLabel("Enter moves down, Tab moves right, Ctrl+Tab leaves the sheet, F6 goes to the next pane. "
                            "Double-click a column title (or Ctrl+G) for its name, unit and limits.")
        sheet_hint.setWordWrap(True)
        sheet_hint.setObjectName("sheetHint")
        sheet_layout.addWidget(sheet_title)
        sheet_layout.addWidget(self.grid, 1)
        sheet_layout.addWidget(sheet_hint)

        self.tabs = QTabWidget()
        self.tabs.setAccessibleName("Why: ranks and charts")
        self.tabs.addTab(self.rank_table, "Ran&ks")
        self.tabs.addTab(self.dot_plot, "Do&ts")
        self.tabs.addTab(self.cumulative_plot, "Share at or bel&ow")
        self.tabs.addTab(self.null_plot, "If &nothing changed")
        self.tabs.addTab(self.power_plot, "&Parts needed")
        self.tabs.setTabToolTip(1, "Every reading as a dot, per group, with medians and specification limits.")
        self.tabs.setTabToolTip(2, "For each value, the share of each group's readings at or below it.")
        self.tabs.setTabToolTip(3, "How the result would be spread if the change did nothing, and where this one falls.")
        self.tabs.setTabToolTip(4, "The chance to find the shift, against the parts measured per group.")

        right = QSplitter(Qt.Orientation.Vertical)
        right.addWidget(self.results_panel)
        right.addWidget(self.tabs)
        right.setStretchFactor(0, 3)
        right.setStretchFactor(1, 2)
        right.setSizes([600, 300])
        right.setChildrenCollapsible(False)

        self.question_panel.setMinimumWidth(300)
        main = QSplitter(Qt.Orientation.Horizontal)
        main.addWidget(self.question_panel)
        main.addWidget(sheet_box)
        main.addWidget(right)
        main.setStretchFactor(0, 0)
        main.setStretchFactor(1, 2)
        main.setStretchFactor(2, 3)
        main.setSizes([310, 490, 640])
        main.setChildrenCollapsible(False)
        self.setCentralWidget(main)
        self.status_counts = QLabel()
        self.status_counts.setAccessibleName("Readings per group")
        self.status_state = QLabel()
        self.status_decimal = QLabel()
        self.status_decimal.setObjectName("decimalMarkStatus")
        self.status_decimal.setAccessibleName("Decimal mark the readings are read with")
        self.statusBar().addWidget(self.status_counts, 1)
        self.statusBar().addPermanentWidget(self.status_decimal)
        self.statusBar().addPermanentWidget(self.status_state)
