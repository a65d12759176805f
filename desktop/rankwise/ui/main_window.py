"""The main window: the readings sheet, the question, the verdict, the ranks and the charts.

Data flow: every edit of the sheet (``rankwise.readings.ReadingSheet``) or of the question builds an
``Analysis``; the ``AnalysisRunner`` computes it off the GUI thread ~150 ms after the last edit; the
result is worded once (``rankwise.wording``) and shown in the results panel, the rank table and the
charts. The entry is kept in a recovery file while the user types.

The window is put together from mixins with one job each: ``window_panes`` (layout),
``window_menus`` (menus and shortcuts), ``window_keyboard`` (F6 between panes), ``window_sheet``
(the sheet shown, title, status, undo), ``window_groups`` (group and setting edits),
``window_analysis`` (requests and results), ``window_files`` (open, save, demo) and
``window_recovery`` (the recovery copy).
"""

from __future__ import annotations

from pathlib import Path

from PySide6.QtCore import QTimer
from PySide6.QtGui import QCloseEvent
from PySide6.QtWidgets import QMainWindow

from rankwise.readings.censored import MixedLimitsError
from rankwise.stats.analysis import Analysis
from rankwise.ui.question_panel import QuestionPanel
from rankwise.ui.rank_table import RankTable
from rankwise.ui.readings_grid import ReadingsGrid
from rankwise.ui.record_actions import RecordActions
from rankwise.ui.recovery import RecoveryFile, RecoveryKeeper
from rankwise.ui.results_panel import ResultsPanel
from rankwise.ui.sheet_model import SheetModel
from rankwise.ui.window_analysis import PROGRESS_DELAY_MS, WindowAnalysis
from rankwise.ui.window_files import WindowFiles, empty_sheet
from rankwise.ui.window_groups import WindowGroups
from rankwise.ui.window_keyboard import WindowKeyboard
from rankwise.ui.window_menus import WindowMenus
from rankwise.ui.window_panes import WindowPanes, style_sheet
from rankwise.ui.window_recovery import WindowRecovery
from rankwise.ui.window_sheet import WindowSheet
from rankwise.ui.worker import AnalysisRunner


class MainWindow(WindowPanes, WindowMenus, WindowKeyboard, WindowSheet, WindowGroups, WindowAnalysis, WindowFiles,
                 WindowRecovery, QMainWindow):
    """The Rankwise window. ``MainWindow()`` opens an empty sheet.

    Args:
        recovery: this window's recovery file (by default a file of its own in the recovery folder).
    """

    def __init__(self, recovery: RecoveryFile | None = None) -> None:
        super().__init__()
        self.setObjectName("rankwiseMainWindow")
        self.setWindowTitle("Rankwise")
        self.setStyleSheet(style_sheet())
        self._fit_to_screen()
        self.recovery = recovery if recovery is not None else RecoveryFile.for_new_window()
        self.source_path: Path | None = None
        self.restored_unsaved = False
        self.opening = None
        """The ``FileOpening`` of a large file being read, or None."""
        self.restored_windows: list[MainWindow] = []
        """Further windows opened at start for entries restored beyond the first."""
        self.last_result = None
        self.last_analysis: Analysis | None = None
        self.mixed_limits_problem: MixedLimitsError | None = None

        self.sheet = empty_sheet()
        self.sheet_model = SheetModel(self.sheet, self)
        self.grid = ReadingsGrid(self)
        self.grid.setModel(self.sheet_model)
        self.question_panel = QuestionPanel()
        self.results_panel = ResultsPanel()
        self.rank_table = RankTable()
        self.runner = AnalysisRunner(self)
        self.records = RecordActions(self)
        self.keeper = RecoveryKeeper(
            self.recovery, question=self.question_panel.to_dict, unsaved=self.has_unsaved_readings,
            source=lambda: str(self.source_path) if self.source_path else "", parent=self)
        self.keeper.problem.connect(self.recovery_problem)
        self._build_layout()
        self._build_menus()
        self._build_pane_keys()
        self._wire()
        self._progress_timer = QTimer(self, singleShot=True, interval=PROGRESS_DELAY_MS)
        self._progress_timer.timeout.connect(lambda: self.results_panel.show_working(self._progress))
        self._progress = 0.0
        self._edit_timer = QTimer(self, singleShot=True, interval=0)
        self._edit_timer.timeout.connect(lambda: self._refresh_after_edit(immediately=False))
        self._show_tabs_for_question()
        self._on_sheet_replaced()
        self.grid.setFocus()  # keyboard first: typing starts in the sheet

    def _wire(self) -> None:
        self.question_panel.changed.connect(self._on_question_changed)
        self.runner.started.connect(self._on_calculation_started)
        self.runner.progress.connect(self._on_calculation_progress)
        self.runner.result_ready.connect(self._on_result_ready)
        self.runner.problem.connect(self._on_calculation_problem)
        self.runner.stopped.connect(self._on_calculation_stopped)
        self.results_panel.stop_requested.connect(self.runner.cancel)
        self.results_panel.choice_taken.connect(lambda: self.set_mixed_limits("below-highest"))
        self.grid.problem.connect(lambda text: self.statusBar().showMessage(text, 8000))
        self.grid.notice.connect(lambda text: self.statusBar().showMessage(text, 15000))
        self.grid.read_only_edit.connect(self.offer_revision)
        self.signed_strip.revision_requested.connect(self.records.start_revision)
        self.grid.header_double_clicked.connect(self.edit_group_details)

    def closeEvent(self, event: QCloseEvent) -> None:  # noqa: N802 - Qt API
        """Ask before closing with unsaved readings; a normal close removes the recovery file."""
        if not self._may_replace_sheet():
            event.ignore()
            return
        self.stop_opening()
        self.runner.cancel()
        self.runner.wait_until_idle(3000)
        self.keeper.close()
        event.accept()
