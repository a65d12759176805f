"""The window's panes: the question, the readings sheet, the verdict, and the ranks and charts tabs."""

from __future__ import annotations

from pathlib import Path

from PySide6.QtCore import Qt
from PySide6.QtWidgets import (
    QAbstractItemView,
    QFrame,
    QHBoxLayout,
    QLabel,
    QPushButton,
    QScrollArea,
    QSplitter,
    QStackedWidget,
    QTabWidget,
    QVBoxLayout,
    QWidget,
)

import rankwise
from rankwise.ui.chart_tab import ChartTab
from rankwise.ui.elided_label import ElidedLabel
from rankwise.ui.screen_fit import fit_to_screen
from rankwise.ui.signed_strip import SignedStrip
from rankwise.ui.status_line import StatusLine

NARROW_WIDTH = 1280
"""Below this window width (in Qt's scaled pixels) the question and the sheet fold into tabs."""

MINIMUM_RANK_ROWS = 5
"""The rank table never shrinks below this many rows in view."""


def style_sheet() -> str:
    """The window's style sheet (resources/style.qss), or none when it is missing."""
    path = Path(rankwise.__file__).resolve().parents[2] / "resources" / "style.qss"
    try:
        return path.read_text(encoding="utf-8")
    except OSError:
        return ""


class WindowPanes:
    """Mixin of ``MainWindow``: sizes the window and lays out its panes and status line.

    From ``NARROW_WIDTH`` on, the question, the sheet and the results stand side by side; on a
    narrower window (a 1024 x 700 shop-floor screen, or 200 % scaling) the question and the sheet
    fold into two tabs beside the results, so the sheet, the verdict and the rank table stay wide
    enough to read.
    """

    def resizeEvent(self, event) -> None:  # noqa: N802 - Qt API
        super().resizeEvent(event)
        self._arrange_panes()

    def _arrange_panes(self) -> None:
        """Side by side, or the question and the sheet folded into tabs, as the width allows."""
        narrow = self.width() < NARROW_WIDTH
        if narrow == self._narrow:
            return
        self._narrow = narrow
        focused = self.focusWidget()  # the control to keep the keyboard, even while the window is inactive
        typing = self._text_being_typed(focused)  # moving the sheet closes its editor: typing goes on after
        width = max(self.width(), 800)
        if narrow:
            self.folded_panes.addTab(self.question_box, "Question")
            self.folded_panes.addTab(self.sheet_box, "Readings")
            self.folded_panes.setCurrentWidget(self.sheet_box)
            self.folded_panes.show()
            self._size_panes({self.folded_panes: (2, int(width * 0.44)), self.right_panes: (3, width - int(width * 0.44))})
        else:
            self.main_splitter.insertWidget(0, self.question_box)
            self.main_splitter.insertWidget(1, self.sheet_box)
            self.folded_panes.hide()
            self.question_box.show()  # a page taken from the tabs keeps the tabs' hiding
            self.sheet_box.show()
            self._size_panes({self.question_box: (0, 310), self.sheet_box: (2, 490),
                              self.right_panes: (3, max(640, width - 800))})
        self._set_tab_order()  # moving the panes moved them in the focus chain
        if typing is not None:
            self.reveal(self.grid)
            self.grid.setFocus()
            self.grid.type_into_current(typing)
        elif focused is not None:
            self.reveal(focused)
            focused.setFocus()

    def _text_being_typed(self, focused: QWidget | None) -> str | None:
        """The text in the sheet's open cell editor, when the keyboard is in it; else None."""
        if focused is None or focused is self.grid or not self.grid.isAncestorOf(focused):
            return None
        if self.grid.state() != QAbstractItemView.State.EditingState or not hasattr(focused, "text"):
            return None
        return focused.text()

    def _size_panes(self, wanted: dict[QWidget, tuple[int, int]]) -> None:
        """Stretch factor and width per pane; panes not named (hidden) get none."""
        splitter = self.main_splitter
        sizes = [0] * splitter.count()
        for pane, (stretch, width) in wanted.items():
            position = splitter.indexOf(pane)
            splitter.setStretchFactor(position, stretch)
            sizes[position] = width
        splitter.setSizes(sizes)

    def reveal(self, widget: QWidget) -> None:
        """Bring the tab holding ``widget`` to the front, wherever it sits (folded panes, result tabs)."""
        parent = widget
        while parent is not None:
            holder = parent.parentWidget()
            if isinstance(holder, QStackedWidget) and isinstance(holder.parentWidget(), QTabWidget):
                holder.parentWidget().setCurrentWidget(parent)
            parent = holder

    def _fit_to_screen(self) -> None:
        """Open at a comfortable size, never larger than the screen (small shop-floor screens too)."""
        fit_to_screen(self, 1440, 900)

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
        self.new_group_button = QPushButton("+ New &group")
        self.new_group_button.setObjectName("newGroupButton")
        self.new_group_button.setToolTip("Go to the spare column at the right of the sheet: type or paste there "
                                         "to start another group (Alt+G).")
        self.new_group_button.setFocusPolicy(Qt.FocusPolicy.NoFocus)  # Tab keeps its way through the window
        self.new_group_button.clicked.connect(self.grid.go_to_new_group)
        title_row = QHBoxLayout()
        title_row.setContentsMargins(0, 0, 0, 0)
        title_row.addWidget(sheet_title)
        title_row.addStretch(1)
        title_row.addWidget(self.new_group_button)
        sheet_hint = QLabel("Enter moves down, Tab moves right, Ctrl+Tab leaves the sheet, F6 goes to the next pane. "
                            "Double-click a column title (or Ctrl+G) for its name, unit and limits.")
        sheet_hint.setWordWrap(True)
        sheet_hint.setObjectName("sheetHint")
        self.signed_strip = SignedStrip()
        sheet_layout.addLayout(title_row)
        sheet_layout.addWidget(self.signed_strip)
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

        self.tabs.tabBar().setElideMode(Qt.TextElideMode.ElideNone)
        self.rank_table.keep_rows_in_view(MINIMUM_RANK_ROWS)

        self.right_panes = right = QSplitter(Qt.Orientation.Vertical)
        right.addWidget(self.results_panel)
        right.addWidget(self.tabs)
        right.setStretchFactor(0, 3)
        right.setStretchFactor(1, 2)
        right.setSizes([600, 300])
        right.setChildrenCollapsible(False)

        self.question_panel.setMinimumWidth(300)
        self.question_box = QScrollArea()
        self.question_box.setObjectName("questionBox")
        self.question_box.setWidget(self.question_panel)
        self.question_box.setWidgetResizable(True)
        self.question_box.setFrameShape(QFrame.Shape.NoFrame)
        self.question_box.setFocusPolicy(Qt.FocusPolicy.NoFocus)
        self.question_box.setHorizontalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAlwaysOff)
        self.question_box.setMinimumWidth(self.question_panel.minimumWidth() + 16)
        self.sheet_box = sheet_box
        self.folded_panes = QTabWidget()
        self.folded_panes.setObjectName("questionAndReadings")
        self.folded_panes.setAccessibleName("The question and the readings")
        self.main_splitter = QSplitter(Qt.Orientation.Horizontal)
        self.main_splitter.addWidget(self.folded_panes)
        self.main_splitter.addWidget(right)
        self.main_splitter.setChildrenCollapsible(False)
        self.setCentralWidget(self.main_splitter)
        self._narrow: bool | None = None
        self._arrange_panes()
        self.setStatusBar(StatusLine())
        self.status_counts = ElidedLabel()
        self.status_counts.setAccessibleName("Readings per group")
        self.status_state = QLabel()
        self.status_decimal = QLabel()
        self.status_decimal.setObjectName("decimalMarkStatus")
        self.status_decimal.setAccessibleName("Decimal mark the readings are read with")
        self.statusBar().addWidget(self.status_counts, 1)
        self.statusBar().addPermanentWidget(self.status_decimal)
        self.statusBar().addPermanentWidget(self.status_state)
