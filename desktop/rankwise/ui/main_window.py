"""The main window: the readings sheet, the question, the verdict, the ranks and the charts.

Data flow: every edit of the sheet (``rankwise.readings.ReadingSheet``) or of the question builds an
``Analysis``; the ``AnalysisRunner`` computes it off the GUI thread ~150 ms after the last edit; the
result is worded once (``rankwise.wording``) and shown in the results panel, the rank table and the
charts. The entry is kept in a recovery file while the user types.
"""

from __future__ import annotations

import math
from dataclasses import replace
from pathlib import Path

from PySide6.QtCore import Qt, QTimer
from PySide6.QtGui import QAction, QCloseEvent, QKeySequence
from PySide6.QtWidgets import (
    QLabel,
    QMainWindow,
    QSplitter,
    QTabWidget,
    QVBoxLayout,
    QWidget,
)

import rankwise
from rankwise.readings import GroupColumn, ReadingSheet, ReadingsError, SheetSnapshot
from rankwise.readings.censored import MixedLimitsError
from rankwise.readings.for_analysis import build_analysis as analysis_of_columns
from rankwise.stats.analysis import Analysis, Question
from rankwise.ui import dialogs
from rankwise.ui.chart_tab import ChartTab
from rankwise.ui.group_details_dialog import GroupDetails, GroupDetailsDialog
from rankwise.ui.question_panel import QuestionPanel
from rankwise.ui.rank_table import RankTable
from rankwise.ui.readings_grid import ReadingsGrid
from rankwise.ui.recent_files import forget_all, recent_files, remember_file
from rankwise.ui.record_actions import RecordActions
from rankwise.ui.recovery import RecoveryFile
from rankwise.ui.results_panel import ResultsPanel
from rankwise.ui.sheet_model import SheetModel
from rankwise.ui.worker import AnalysisRunner

DEMO_FILE_NAME = "two_wheels_roughness.csv"
"""The demo readings opened by ``rankwise --demo`` and the Help menu (invented data)."""

PROGRESS_DELAY_MS = 250
"""A calculation shows its progress strip only when it takes longer than this."""

RECOVERY_DELAY_MS = 300
"""The recovery file is written this long after the last edit."""


def demo_folder() -> Path:
    """The repository's demo_files folder (the package is installed editable from desktop/)."""
    return Path(rankwise.__file__).resolve().parents[2] / "demo_files"


def empty_sheet() -> ReadingSheet:
    """A new entry: two empty groups, A (the reference) and B (the changed process)."""
    return ReadingSheet([GroupColumn("A"), GroupColumn("B")])


def _style_sheet() -> str:
    path = Path(rankwise.__file__).resolve().parents[2] / "resources" / "style.qss"
    try:
        return path.read_text(encoding="utf-8")
    except OSError:
        return ""


class MainWindow(QMainWindow):
    """The Rankwise window. ``MainWindow()`` opens an empty sheet.

    Args:
        recovery: where the unsaved entry is kept (tests give each window its own file).
    """

    def __init__(self, recovery: RecoveryFile | None = None) -> None:
        super().__init__()
        self.setObjectName("rankwiseMainWindow")
        self.setWindowTitle("Rankwise")
        self.setStyleSheet(_style_sheet())
        self._fit_to_screen()
        self.recovery = recovery if recovery is not None else RecoveryFile()
        self.source_path: Path | None = None
        self.restored_unsaved = False
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
        self._build_layout()
        self._build_menus()
        self._wire()
        self._progress_timer = QTimer(self, singleShot=True, interval=PROGRESS_DELAY_MS)
        self._progress_timer.timeout.connect(lambda: self.results_panel.show_working(self._progress))
        self._progress = 0.0
        self._edit_timer = QTimer(self, singleShot=True, interval=0)
        self._edit_timer.timeout.connect(lambda: self._refresh_after_edit(immediately=False))
        self._recovery_timer = QTimer(self, singleShot=True, interval=RECOVERY_DELAY_MS)
        self._recovery_timer.timeout.connect(self.save_recovery)
        self._show_tabs_for_question()
        self._on_sheet_replaced()
        self.grid.setFocus()  # keyboard first: typing starts in the sheet

    # -- building --------------------------------------------------------------------------------
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
        sheet_title = QLabel("Readings: one column per group")
        sheet_title.setObjectName("panelTitle")
        sheet_hint = QLabel("Enter moves down, Tab moves right. Double-click a column title for its name, unit and limits.")
        sheet_hint.setWordWrap(True)
        sheet_hint.setObjectName("sheetHint")
        sheet_layout.addWidget(sheet_title)
        sheet_layout.addWidget(self.grid, 1)
        sheet_layout.addWidget(sheet_hint)

        self.tabs = QTabWidget()
        self.tabs.setAccessibleName("Why: ranks and charts")
        self.tabs.addTab(self.rank_table, "Ranks")
        self.tabs.addTab(self.dot_plot, "Dots")
        self.tabs.addTab(self.cumulative_plot, "Share at or below")
        self.tabs.addTab(self.null_plot, "If nothing changed")
        self.tabs.addTab(self.power_plot, "Parts needed")
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
        self.statusBar().addWidget(self.status_counts, 1)
        self.statusBar().addPermanentWidget(self.status_state)

    def make_action(self, text: str, handler, shortcut=None, tip: str = "") -> QAction:
        """A menu action calling ``handler()``, with an optional shortcut and a plain-words tip."""
        action = QAction(text, self)
        if shortcut is not None:
            action.setShortcut(QKeySequence(shortcut))
        if tip:
            action.setStatusTip(tip)
            action.setToolTip(tip)
        action.triggered.connect(lambda _checked=False: handler())
        return action

    def _build_menus(self) -> None:
        bar = self.menuBar()
        file_menu = bar.addMenu("&File")
        self.new_action = self.make_action("&New sheet", self.new_sheet, QKeySequence.StandardKey.New, "Start an empty sheet.")
        self.open_action = self.make_action("&Open readings…", self.ask_and_open, QKeySequence.StandardKey.Open,
                                        "Open a CSV or XLSX export, or a signed result workbook.")
        self.recent_menu = file_menu.addMenu("Open &recent")
        self.save_action = self.make_action("&Save readings as typed…", self.save_readings, QKeySequence.StandardKey.Save,
                                         "Save the readings exactly as typed (CSV or XLSX), to finish later.")
        self.quit_action = self.make_action("&Quit", self.close, QKeySequence.StandardKey.Quit)
        file_menu.insertAction(self.recent_menu.menuAction(), self.new_action)
        file_menu.insertAction(self.recent_menu.menuAction(), self.open_action)
        file_menu.addAction(self.save_action)
        file_menu.addSeparator()
        file_menu.addAction(self.records.print_preview_action)
        file_menu.addAction(self.records.print_action)
        file_menu.addAction(self.records.pdf_action)
        file_menu.addSeparator()
        file_menu.addAction(self.quit_action)
        self.recent_menu.aboutToShow.connect(self._fill_recent_menu)

        edit = bar.addMenu("&Edit")
        self.undo_action = self.make_action("&Undo", self.undo, QKeySequence.StandardKey.Undo)
        self.redo_action = self.make_action("&Redo", self.redo, QKeySequence.StandardKey.Redo)
        edit.addAction(self.undo_action)
        edit.addAction(self.redo_action)
        edit.addSeparator()
        for text, handler, shortcut, tip in (
            ("Cu&t", self.grid.cut_selection, QKeySequence.StandardKey.Cut, ""),
            ("&Copy", self.grid.copy_selection, QKeySequence.StandardKey.Copy, ""),
            ("&Paste", self.grid.paste_from_clipboard, QKeySequence.StandardKey.Paste, "Paste a block copied from any spreadsheet."),
            ("C&lear cells", self.grid.clear_selected_cells, QKeySequence.StandardKey.Delete, ""),
            ("&Insert rows above", self.grid.insert_rows_above, "Ctrl+Shift++", ""),
            ("&Delete rows", self.grid.delete_selected_rows, "Ctrl+-", ""),
        ):
            action = self.make_action(text, handler, shortcut, tip)
            action.setShortcutContext(Qt.ShortcutContext.WidgetShortcut)
            self.grid.addAction(action)
            edit.addAction(action)
            if text == "C&lear cells":
                edit.addSeparator()
        edit.addSeparator()
        edit.addAction(self.make_action("&Add a group", self.add_group, "Ctrl+Shift+N"))
        edit.addAction(self.make_action("Group &details (name, unit, limits)…", self.edit_group_details, "Ctrl+G"))
        edit.addAction(self.make_action("Move group &left", lambda: self.move_group(-1), "Ctrl+Shift+Left"))
        edit.addAction(self.make_action("Move group &right", lambda: self.move_group(+1), "Ctrl+Shift+Right"))
        edit.addAction(self.make_action("Re&move group", self.remove_group))
        decimal_menu = edit.addMenu("Decimal &separator")
        for text, separator in (("Decide from the readings", "auto"), ("Point (0.42)", "."), ("Comma (0,42)", ",")):
            decimal_menu.addAction(self.make_action(text, lambda s=separator: self.set_decimal(s)))
        self.below_highest_action = self.make_action(
            "Treat readings below different detection &limits as below the highest",
            lambda: self.set_mixed_limits("below-highest" if self.below_highest_action.isChecked() else "ask"),
            tip="When readings are written below different limits (<0.05, <0.10), count them all, and any "
                "measured reading under the highest limit, as below the highest limit.")
        self.below_highest_action.setCheckable(True)
        edit.addAction(self.below_highest_action)

        question_menu = bar.addMenu("&Question")
        from rankwise.ui.question_panel import QUESTION_OPTIONS

        for number, option in enumerate(QUESTION_OPTIONS, start=1):
            question_menu.addAction(self.make_action(option.text, lambda key=option.key: self.choose_question(key),
                                                     f"Ctrl+{number}"))
        question_menu.addSeparator()
        self.stop_action = self.make_action("&Stop the calculation", self.runner.cancel, "Esc")
        self.stop_action.setEnabled(False)
        question_menu.addAction(self.stop_action)

        record_menu = bar.addMenu("&Record")
        for action in self.records.menu_actions():
            record_menu.addAction(action) if action is not None else record_menu.addSeparator()

        help_menu = bar.addMenu("&Help")
        help_menu.addAction(self.make_action("Open the &demo readings", self.open_demo, None,
                                         "Surface roughness from two grinding wheels (invented data)."))
        help_menu.addAction(self.make_action("&About Rankwise", self._show_about))

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
        self.grid.header_double_clicked.connect(self.edit_group_details)

    # -- the sheet -------------------------------------------------------------------------------
    def set_sheet(self, sheet: ReadingSheet, source: Path | None = None) -> None:
        """Show ``sheet`` in the grid (a new entry, an opened file, or a restored one)."""
        self.sheet.unsubscribe(self._on_sheet_changed)
        self.sheet = sheet
        self.source_path = source
        self.sheet_model.set_sheet(sheet)
        self.records.forget_signature()
        self._on_sheet_replaced()

    def _on_sheet_replaced(self) -> None:
        self.restored_unsaved = False
        self.sheet.subscribe(self._on_sheet_changed)
        self.update_title()
        self._refresh_after_edit(immediately=True)

    def _on_sheet_changed(self, change) -> None:
        # The sheet sends its notices while an edit is under way (its undo history and saved state
        # are updated after them), so the window refreshes once the edit has finished.
        self._edit_timer.start()
        self._recovery_timer.start()

    def _refresh_after_edit(self, immediately: bool) -> None:
        self.question_panel.set_groups(
            [group.name for group in self.sheet.groups],
            [group.usl - group.lsl if group.usl is not None and group.lsl is not None else None for group in self.sheet.groups],
        )
        self._update_status()
        self.update_undo_actions()
        self.below_highest_action.setChecked(self.sheet.mixed_limits == "below-highest")
        self.update_title()
        self.request_analysis(immediately)

    def _update_status(self) -> None:
        parts = []
        for index, group in enumerate(self.sheet.groups):
            counts = self.sheet.counts(index)
            text = f"{group.name}: {counts.used} reading{'s' if counts.used != 1 else ''}"
            if counts.skipped:
                text += f", {counts.skipped} skipped"
            if counts.censored:
                text += f", {counts.censored} below a detection limit"
            parts.append(text)
        self.status_counts.setText("   ·   ".join(parts) if parts else "No readings yet: type or paste them into the sheet.")

    def update_undo_actions(self) -> None:
        """Undo and redo say what they would undo or redo, and are off when there is nothing or it is signed."""
        self.undo_action.setEnabled(self.sheet.can_undo and not self.sheet_model.read_only)
        self.redo_action.setEnabled(self.sheet.can_redo and not self.sheet_model.read_only)
        self.undo_action.setText(self.sheet.undo_label if self.sheet.can_undo else "&Undo")
        self.redo_action.setText(self.sheet.redo_label if self.sheet.can_redo else "&Redo")

    def update_title(self) -> None:
        """The title names the file and marks unsaved or signed work; the status line says the same in words."""
        name = self.source_path.name if self.source_path else "New sheet"
        marker = " •" if self.has_unsaved_readings() else ""
        signed = " (signed, read-only)" if self.sheet_model.read_only else ""
        self.setWindowTitle(f"{name}{marker}{signed} — Rankwise")
        record = self.records.signed_record
        if record is not None:
            self.status_state.setText(f"Signed record, revision {record.signoff.revision}: read-only")
        elif self.records.next_revision > 1:
            self.status_state.setText(f"Revision {self.records.next_revision}, not signed yet")
        else:
            self.status_state.setText("Unsaved readings" if self.has_unsaved_readings() else "")

    def undo(self) -> None:
        """Undo the last edit of the sheet."""
        if self.sheet.can_undo and not self.sheet_model.read_only:
            self.sheet.undo()

    def redo(self) -> None:
        """Redo the edit undone last."""
        if self.sheet.can_redo and not self.sheet_model.read_only:
            self.sheet.redo()

    def _current_group(self) -> int | None:
        column = self.grid.currentIndex().column()
        return column if 0 <= column < len(self.sheet.groups) else None

    def _guarded(self, edit) -> None:
        if self.sheet_model.read_only:
            self.statusBar().showMessage("This analysis is signed and read-only. Start a new revision to change it.", 8000)
            return
        try:
            edit()
        except ReadingsError as error:
            dialogs.show_problem(self, "Cannot change the groups", str(error))

    def add_group(self) -> None:
        """Add an empty group (column) at the right."""
        self._guarded(lambda: self.sheet.add_group())

    def remove_group(self) -> None:
        """Remove the group of the current cell, after asking when it holds readings."""
        index = self._current_group()
        if index is None:
            return
        name = self.sheet.groups[index].name
        if any(cell.text for cell in self.sheet.groups[index].cells) and not dialogs.confirm(
            self, "Remove a group", f"Remove {name} and its readings? (Undo brings it back.)", "Remove", "Keep it"
        ):
            return
        self._guarded(lambda: self.sheet.remove_group(index))

    def move_group(self, step: int) -> None:
        """Move the current group one place left (-1) or right (+1)."""
        index = self._current_group()
        if index is None or not 0 <= index + step < len(self.sheet.groups):
            return
        self._guarded(lambda: self.sheet.move_group(index, index + step))
        self.grid.setCurrentIndex(self.sheet_model.index(max(0, self.grid.currentIndex().row()), index + step))

    def edit_group_details(self, column: int | None = None) -> None:
        """Ask for the name, unit, limits and nominal of a group (the current one by default)."""
        index = self._current_group() if column is None else column
        if index is None or index >= len(self.sheet.groups):
            return
        group = self.sheet.groups[index]
        answer = GroupDetailsDialog.ask(self, GroupDetails(group.name, group.unit, group.lsl, group.usl, group.nominal))
        if answer is None:
            return

        def apply() -> None:
            if answer.name != group.name:
                self.sheet.rename_group(index, answer.name)
            self.sheet.set_group_details(index, unit=answer.unit, lsl=answer.lsl, usl=answer.usl, nominal=answer.nominal)

        self._guarded(apply)

    def choose_question(self, key: str) -> None:
        """Ask another question (menu and Ctrl+1..7); a signed analysis keeps its question."""
        self._guarded(lambda: self.question_panel.select_option(key))

    def set_decimal(self, separator: str) -> None:
        """Read typed readings with this decimal separator ("auto", "." or ",")."""
        self._guarded(lambda: self.sheet.set_decimal(separator))

    def set_mixed_limits(self, choice: str) -> None:
        """Treat readings below different detection limits as asked ("ask") or as below the highest
        limit ("below-highest"): one undoable step; a signed analysis keeps its setting."""
        self._guarded(lambda: self.sheet.set_mixed_limits(choice))
        self.below_highest_action.setChecked(self.sheet.mixed_limits == "below-highest")

    # -- analysis --------------------------------------------------------------------------------
    def build_analysis(self) -> tuple[Analysis | None, str]:
        """The analysis the sheet and the question ask for, or None with the reason in plain words.

        When the reason is readings below different detection limits, ``mixed_limits_problem`` holds it
        (else None), so that the choice can be offered with it."""
        self.mixed_limits_problem = None
        choice = self.question_panel.choice()
        if choice.problem:
            return None, choice.problem
        if choice.question is Question.PLAN and not choice.group_indices:
            return analysis_of_columns((), choice.question, choice.settings, decimal=self.sheet.decimal), ""
        try:
            analysis = self.sheet.to_analysis(choice.question, choice.settings, list(choice.group_indices))
        except MixedLimitsError as error:
            self.mixed_limits_problem = error
            return None, str(error)
        except ReadingsError as error:
            return None, str(error)
        if self.sheet.decimal != "auto":  # the sheet reads one stated mark: numbers are shown with it
            analysis = replace(analysis, decimal_mark=self.sheet.decimal)
        empty = [group.name for group in analysis.groups if not any(math.isfinite(v) for v in group.values)]
        if choice.question is not Question.PLAN and empty:
            if len(empty) == len(analysis.groups):
                return None, ("Type or paste the readings into the sheet, one column per group, "
                              "or open a file with File > Open readings (Ctrl+O).")
            return None, f"{empty[0]} has no readings yet: type or paste them into its column."
        return analysis, ""

    def request_analysis(self, immediately: bool = False) -> None:
        """Recompute after an edit (debounced) or at once (after opening or a question change)."""
        analysis, reason = self.build_analysis()
        if analysis is None:
            self.runner.discard_pending()
            self._calculation_ended()
            self.last_result = None
            self.last_analysis = None
            self.results_panel.show_waiting(reason)
            if self.mixed_limits_problem is not None and not self.sheet_model.read_only:
                highest = self.mixed_limits_problem.shown[-1]
                self.results_panel.offer_choice(
                    f"Treat all as below the highest limit, <{highest}",
                    f"Count every reading written below a limit, and any reading measured under {highest}, "
                    f"as below {highest}. Undo takes the choice back; the Edit menu holds it too.")
            self.rank_table.clear()
            for chart in self.charts:
                chart.clear()
            self.records.update_enabled()
            return
        self.question_panel.set_decimal_mark(analysis.decimal_mark)
        if immediately:
            self.runner.request_now(analysis)
        else:
            self.runner.request(analysis)

    def _on_question_changed(self) -> None:
        self._recovery_timer.start()
        self.request_analysis(immediately=True)
        self._show_tabs_for_question()

    def _show_tabs_for_question(self) -> None:
        planning = self.question_panel.option.question is Question.PLAN
        for widget in (self.rank_table, self.dot_plot, self.cumulative_plot, self.null_plot):
            self.tabs.setTabVisible(self.tabs.indexOf(widget), not planning)
        self.tabs.setTabVisible(self.tabs.indexOf(self.power_plot), planning)
        if planning or not self.tabs.isTabVisible(self.tabs.currentIndex()):
            self.tabs.setCurrentWidget(self.power_plot if planning else self.rank_table)

    def _on_calculation_started(self) -> None:
        self._progress = 0.0
        self._progress_timer.start()
        self.stop_action.setEnabled(True)

    def _calculation_ended(self) -> None:
        self._progress_timer.stop()
        self.stop_action.setEnabled(False)
        self.results_panel.show_busy(False)

    def _on_calculation_progress(self, fraction: float) -> None:
        self._progress = fraction
        if self.results_panel.busy_strip.isVisible():
            self.results_panel.show_busy(True, fraction)

    def _on_result_ready(self, result, analysis) -> None:
        from rankwise.wording import describe, key_numbers

        self._calculation_ended()
        self.last_result = result
        self.last_analysis = analysis
        self.results_panel.show_verdict(describe(result, analysis), key_numbers(result, analysis))
        self.rank_table.show_result(result, analysis)
        for chart in self.charts:
            chart.show_result(result, analysis)
        self.records.update_enabled()

    def _on_calculation_problem(self, message: str) -> None:
        self._calculation_ended()
        self.last_result = None
        self.results_panel.show_problem(message)
        self.rank_table.clear()
        self.records.update_enabled()

    def _on_calculation_stopped(self) -> None:
        self._calculation_ended()
        self.last_result = None
        self.results_panel.show_stopped()
        self.records.update_enabled()

    # -- files -----------------------------------------------------------------------------------
    def _may_replace_sheet(self) -> bool:
        """True when the current entry may be replaced (saved, empty, or the user agreed)."""
        if not self.has_unsaved_readings():
            return True
        answer = dialogs.ask_keep_changes(self, "The readings in the sheet are not saved. Save them before going on?")
        if answer == "save":
            return self.save_readings()
        return answer == "discard"

    def has_unsaved_readings(self) -> bool:
        """True when the sheet holds typed text that is not saved (a restored entry counts as unsaved)."""
        has_text = any(cell.text for group in self.sheet.groups for cell in group.cells)
        return has_text and (self.sheet.is_modified or self.restored_unsaved)

    def new_sheet(self) -> None:
        """Start an empty sheet (after asking about unsaved readings)."""
        if self._may_replace_sheet():
            self.set_sheet(empty_sheet())
            self.recovery.clear()

    def ask_and_open(self) -> None:
        """File > Open: ask for a file, then show the open dialog (or reopen a signed record)."""
        path = dialogs.ask_open_path(self, "Open readings or a signed result")
        if path is not None:
            self.open_path(path, show_dialog=True)

    def open_path(self, path: Path, show_dialog: bool = False) -> bool:
        """Open readings (CSV/XLSX) or a signed result workbook; True when something was loaded.

        With ``show_dialog`` the open dialog shows the preview and the layout found and lets the
        user change them; without it the dialog's automatic choices are used.
        """
        path = Path(path)
        if not path.is_file():
            dialogs.show_problem(self, "Cannot open the file", f"There is no file {path}. Check the name and the folder.")
            return False
        if not self._may_replace_sheet():
            return False
        if path.suffix.lower() in (".xlsx", ".xlsm") and self.records.try_reopen(path):
            remember_file(path)
            return True
        from rankwise.readings import open_readings
        from rankwise.ui.open_dialog import OpenReadingsDialog

        try:
            reading_set = OpenReadingsDialog.ask(self, path) if show_dialog else open_readings(path)
        except ReadingsError as error:
            dialogs.show_problem(self, "Cannot open the file", str(error))
            return False
        if reading_set is None:
            return False
        self.load_reading_set(reading_set, path)
        remember_file(path)
        return True

    def load_reading_set(self, reading_set, path: Path) -> None:
        """Put opened readings into the sheet and analyse them."""
        sheet = ReadingSheet.from_reading_set(reading_set)
        sheet.mark_saved()
        several = len(sheet.groups) >= 3
        if several != (self.question_panel.option.question is Question.SEVERAL):
            self.question_panel.select_option("several" if several else "differ")
        self.set_sheet(sheet, path)
        self.recovery.clear()
        used = sum(len(group.values) for group in reading_set.groups)
        skipped = sum(len(group.skipped) for group in reading_set.groups)
        self.statusBar().showMessage(
            f"Opened {path.name}: {used} readings in {len(reading_set.groups)} groups"
            + (f", {skipped} cell{'s' if skipped != 1 else ''} skipped (hover over them in the sheet to see why)."
               if skipped else "."), 15000)

    def open_demo(self) -> bool:
        """Open the demo readings (surface roughness from two grinding wheels; invented data)."""
        path = demo_folder() / DEMO_FILE_NAME
        if not path.is_file():
            dialogs.show_problem(
                self, "Demo readings not found",
                f"The demo readings ({DEMO_FILE_NAME}) are not next to this installation (looked in {path.parent}). "
                "They come with the Rankwise source folder; open any CSV or XLSX export instead.",
            )
            return False
        return self.open_path(path)

    def save_readings(self) -> bool:
        """Save the readings exactly as typed (CSV or XLSX); True when saved."""
        from rankwise.readings import save_sheet

        suggested = (self.source_path.stem if self.source_path else "readings") + ".csv"
        path = dialogs.ask_save_path(self, "Save readings as typed", suggested, dialogs.SAVE_READINGS_FILTER)
        if path is None:
            return False
        if path.suffix.lower() not in (".csv", ".xlsx"):
            path = path.with_suffix(".csv")
        try:
            save_sheet(self.sheet, path)
        except (ReadingsError, OSError) as error:
            dialogs.show_problem(self, "Cannot save the readings", str(error))
            return False
        self.sheet.mark_saved()
        self.restored_unsaved = False
        self.source_path = path
        remember_file(path)
        self.recovery.clear()
        self.update_title()
        return True

    def _fill_recent_menu(self) -> None:
        self.recent_menu.clear()
        files = recent_files()
        if not files:
            self.recent_menu.addAction("(no files opened yet)").setEnabled(False)
        for path in files:
            self.recent_menu.addAction(str(path), lambda p=path: self.open_path(p, show_dialog=True))
        if files:
            self.recent_menu.addSeparator()
            self.recent_menu.addAction("Clear this list", forget_all)

    # -- nothing lost ----------------------------------------------------------------------------
    def save_recovery(self) -> None:
        """Write the entry to the recovery file (or remove it when there is nothing unsaved)."""
        if not self.has_unsaved_readings():
            self.recovery.clear()
            return
        try:
            self.recovery.save(self.sheet.snapshot().to_dict(), self.question_panel.to_dict(),
                               str(self.source_path) if self.source_path else "")
        except OSError as error:
            self.statusBar().showMessage(f"The recovery copy could not be written ({error}); save the readings soon.", 10000)

    def offer_recovery(self) -> bool:
        """At start: offer back an entry left by a crash; True when it was restored."""
        stored = self.recovery.load()
        if stored is None:
            return False
        when = stored.get("saved_at", "")[:16].replace("T", " ")
        if not dialogs.confirm(
            self, "Restore unsaved readings?",
            f"Rankwise was closed without saving readings (last kept {when} UTC). Restore them?",
            "Restore them", "Discard them",
        ):
            self.recovery.clear()
            return False
        try:
            snapshot = SheetSnapshot.from_dict(stored["sheet"])
        except (ReadingsError, KeyError) as error:
            dialogs.show_problem(self, "Cannot restore", str(error))
            return False
        sheet = ReadingSheet.from_snapshot(snapshot)
        source = Path(stored["source"]) if stored.get("source") else None
        self.set_sheet(sheet, source)
        self.restored_unsaved = True
        self.question_panel.from_dict(stored.get("question", {}))
        self.update_title()
        return True

    def closeEvent(self, event: QCloseEvent) -> None:  # noqa: N802 - Qt API
        """Ask before closing with unsaved readings; a normal close removes the recovery file."""
        if not self._may_replace_sheet():
            event.ignore()
            return
        self._recovery_timer.stop()
        self.runner.cancel()
        self.runner.wait_until_idle(3000)
        self.recovery.clear()
        event.accept()

    def _show_about(self) -> None:
        dialogs.show_message(
            self, "About Rankwise",
            f"Rankwise {rankwise.__version__}: decide and record whether a production change moved a "
            "measured characteristic, with rank-based tests (Mann-Whitney U, Wilcoxon signed-rank, "
            "Kruskal-Wallis).",
        )
