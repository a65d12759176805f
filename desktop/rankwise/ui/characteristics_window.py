"""The summary of many characteristics: one line each, compared on a worker with progress and Stop.

Opened from the main window when a file holds one row per part, a process column and a column per
characteristic. Selecting a line opens that characteristic in the main window, with its ranks and
charts, as a two-group comparison. The cautions note stays under the verdict.
"""

from __future__ import annotations

from pathlib import Path

from PySide6.QtCore import Qt
from PySide6.QtGui import QStandardItem, QStandardItemModel
from PySide6.QtWidgets import (
    QComboBox,
    QDialog,
    QHBoxLayout,
    QLabel,
    QProgressBar,
    QPushButton,
    QTableView,
    QVBoxLayout,
)

from rankwise.readings import GroupColumn, ReadingsError, ReadingSheet
from rankwise.readings.characteristics import CharacteristicsTable, is_characteristics_file, open_characteristics
from rankwise.records import ResultRecord, SignOff, write_record
from rankwise.records.errors import RecordError
from rankwise.stats.analysis import Settings
from rankwise.ui import dialogs
from rankwise.ui.characteristics_dialog import CharacteristicsChoice, CharacteristicsDialog
from rankwise.ui.screen_fit import fit_to_screen
from rankwise.ui.signoff_dialog import SignOffDialog
from rankwise.ui.worker import AnalysisRunner, run_aside
from rankwise.wording import CAUTION_SHORT, describe
from rankwise.wording.characteristics import BEYOND_LIMIT_MARK, COLUMNS, summary_lines

SORTS = ("As in the file", "By shift relative to the tolerance (largest first)")
"""The summary's orders."""


def offer_characteristics(window, path: Path) -> bool | None:
    """When ``path`` holds many characteristics: ask which, then show their summary. None when the
    file is not such a file; True when a summary was opened; False when the technician cancelled."""
    if not is_characteristics_file(path):
        return None
    try:
        table = open_characteristics(path)
    except ReadingsError as error:
        dialogs.show_problem(window, "Cannot open the file", str(error))
        return False
    choice = CharacteristicsDialog.ask(window, table)
    if choice is None:
        return False
    summary = CharacteristicsWindow(window, table, choice)
    window.characteristics_summaries = [*getattr(window, "characteristics_summaries", []), summary]
    summary.show()
    return True


FIRST_SEEN = ("Outcome", "Limit", "Adjusted p")
"""Columns shown right after the characteristic's name (the printed summary keeps ``COLUMNS`` order):
on a 1024 x 700 screen the answer is seen without scrolling sideways."""


class CharacteristicsWindow(QDialog):
    """One line per characteristic, the verdict on all of them, and the way into each one."""

    def __init__(self, main_window, table: CharacteristicsTable, choice: CharacteristicsChoice) -> None:
        super().__init__(main_window)
        self.main_window = main_window
        self.table = table
        self.choice = choice
        self.analysis = table.to_analysis(choice.group_a, choice.group_b, names=choice.names,
                                          settings=Settings(adjust=choice.adjust))
        self.result = None
        self.lines = ()
        self.last_record: ResultRecord | None = None
        self.setWindowTitle(f"Characteristics: {choice.group_b} against {choice.group_a} — {Path(table.path).name}")
        layout = QVBoxLayout(self)
        self.headline = QLabel("Comparing…")
        self.headline.setWordWrap(True)
        self.headline.setStyleSheet("font-weight: bold; font-size: 13pt;")
        self.sentences = QLabel("")
        self.sentences.setWordWrap(True)
        self.caution = QLabel("Please note: " + CAUTION_SHORT)
        self.caution.setWordWrap(True)
        self.caution.setObjectName("caution")
        for widget in (self.headline, self.sentences, self.caution):
            layout.addWidget(widget)
        progress_row = QHBoxLayout()
        self.progress = QProgressBar()
        self.progress.setRange(0, 1000)
        self.stop_button = QPushButton("&Stop")
        self.stop_button.clicked.connect(self.stop)
        self.again_button = QPushButton("Compare &again")
        self.again_button.clicked.connect(self.compare)
        for widget in (self.progress, self.stop_button, self.again_button):
            progress_row.addWidget(widget)
        layout.addLayout(progress_row)
        sort_row = QHBoxLayout()
        sort_row.addWidget(QLabel("&Order:"))
        self.sort = QComboBox()
        self.sort.addItems(SORTS)
        self.sort.currentIndexChanged.connect(self._fill)
        sort_row.itemAt(0).widget().setBuddy(self.sort)
        sort_row.addWidget(self.sort)
        sort_row.addStretch(1)
        self.save_button = QPushButton("Save signed &record…")
        self.save_button.clicked.connect(self.save_record)
        self.pdf_button = QPushButton("Save one-page summary as &PDF…")
        self.pdf_button.clicked.connect(self.save_pdf)
        sort_row.addWidget(self.save_button)
        sort_row.addWidget(self.pdf_button)
        layout.addLayout(sort_row)
        self.model = QStandardItemModel(0, len(COLUMNS), self)
        self.model.setHorizontalHeaderLabels(list(COLUMNS))
        self.view = QTableView()
        self.view.setModel(self.model)
        self.view.setSelectionBehavior(QTableView.SelectionBehavior.SelectRows)
        self.view.setSelectionMode(QTableView.SelectionMode.SingleSelection)
        self.view.setEditTriggers(QTableView.EditTrigger.NoEditTriggers)
        header = self.view.horizontalHeader()
        for place, title in enumerate(FIRST_SEEN, start=1):  # the outcome beside the name, on any screen
            header.moveSection(header.visualIndex(COLUMNS.index(title)), place)
        self.view.activated.connect(self._open_row)
        self.view.doubleClicked.connect(self._open_row)
        layout.addWidget(self.view, 1)
        hint = QLabel(f"Double-click a line (or press Enter) to open that characteristic with its ranks and charts. "
                      f"{BEYOND_LIMIT_MARK}: the changed process's centre may lie beyond LSL or USL.")
        hint.setWordWrap(True)
        layout.addWidget(hint)
        self.runner = AnalysisRunner(self)
        self.runner.progress.connect(lambda fraction: self.progress.setValue(int(1000 * fraction)))
        self.runner.result_ready.connect(self._show_result)
        self.runner.problem.connect(self._show_problem)
        self.runner.stopped.connect(self._stopped)
        fit_to_screen(self, 1400, 680)  # a 1024 x 700 shop-floor screen, or 200 % scaling, shows all of it
        self.compare()

    def resizeEvent(self, event) -> None:  # noqa: N802 - Qt's name
        super().resizeEvent(event)
        self._keep_texts_whole()

    def _keep_texts_whole(self) -> None:
        """The verdict's wrapped lines keep the height they need at the window's width; the table
        gives up rows instead (a layout gives a wrapped label too little height on a small screen)."""
        if not self.isVisible():  # laid out at its real width once shown (its resize comes here then)
            return
        for label in (self.headline, self.sentences, self.caution):
            label.setMinimumHeight(label.heightForWidth(max(label.width(), 1)))

    # ----- computing --------------------------------------------------------------------------
    def compare(self) -> None:
        """Start (again) on the worker; the window stays responsive and can be stopped."""
        self.progress.setValue(0)
        self.headline.setText(f"Comparing {len(self.analysis.characteristics)} characteristics…")
        self._keep_texts_whole()
        self._busy(True)
        self.runner.request_now(self.analysis)

    def stop(self) -> None:
        self.runner.cancel()

    def _busy(self, busy: bool) -> None:
        self.stop_button.setEnabled(busy)
        self.again_button.setEnabled(not busy and self.result is None)
        self.save_button.setEnabled(not busy and self.result is not None)
        self.pdf_button.setEnabled(not busy and self.result is not None)

    def _stopped(self) -> None:
        self.headline.setText("Stopped on request: nothing was compared. Compare again when ready.")
        self._keep_texts_whole()
        self._busy(False)

    def _show_problem(self, message: str) -> None:
        self.headline.setText(f"The characteristics could not be compared: {message}")
        self._keep_texts_whole()
        self._busy(False)

    def _show_result(self, result, analysis) -> None:
        self.result = result
        verdict = describe(result, analysis)
        self.headline.setText(verdict.headline)
        self.sentences.setText("\n".join([*verdict.sentences, *verdict.assumption_notes]))
        self._keep_texts_whole()
        self.lines = summary_lines(result, analysis)
        self.progress.setValue(1000)
        self._fill()
        self._busy(False)

    # ----- the table --------------------------------------------------------------------------
    def order(self) -> list[int]:
        """Indices of the lines in the chosen order."""
        positions = list(range(len(self.lines)))
        if self.sort.currentIndex() == 1:
            positions.sort(key=lambda index: self.lines[index].sort_key)
        return positions

    def _fill(self) -> None:
        self.model.setRowCount(0)
        for index in self.order():
            line = self.lines[index]
            items = []
            for column, text in enumerate(line.texts):
                item = QStandardItem(text)
                item.setData(self.result.rows[index].name, Qt.ItemDataRole.UserRole)
                if column not in (0, 1, 11, 12):
                    item.setTextAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
                if column == 11 and line.outcome.startswith("moved"):
                    font = item.font()
                    font.setBold(True)
                    item.setFont(font)
                items.append(item)
            self.model.appendRow(items)
        self.view.resizeColumnsToContents()

    def _open_row(self, index) -> None:
        """Open the chosen characteristic in the main window as a two-group comparison."""
        name = self.model.item(index.row(), 0).data(Qt.ItemDataRole.UserRole)
        position = [item.name for item in self.analysis.characteristics].index(name)
        snapshot = self.table.snapshot(self.choice.group_a, self.choice.group_b, names=[name])
        columns = [GroupColumn(process, group.unit, group.lsl, group.usl, group.nominal, list(group.cells))
                   for process, group in zip((self.choice.group_a, self.choice.group_b), snapshot.groups)]
        if not self.main_window._may_replace_sheet():
            return
        self.main_window.question_panel.select_option("differ")
        self.main_window.set_sheet(ReadingSheet(columns, decimal=snapshot.decimal))
        self.main_window.statusBar().showMessage(
            f"{name} ({position + 1} of {len(self.analysis.characteristics)}): {self.choice.group_b} against "
            f"{self.choice.group_a}. In the summary its p-value is adjusted for the number compared.", 15000)
        self.main_window.raise_()

    # ----- records ----------------------------------------------------------------------------
    def _record(self) -> ResultRecord | None:
        signature = SignOffDialog.ask(self)
        if signature is None:
            return None
        return ResultRecord.now(self.analysis, self.table.snapshot(self.choice.group_a, self.choice.group_b,
                                                                   names=[i.name for i in self.analysis.characteristics]),
                                self.result, SignOff(prepared=signature))

    def save_record(self) -> Path | None:
        path = dialogs.ask_save_path(self, "Save signed record", Path(self.table.path).stem + "-characteristics.xlsx",
                                     dialogs.RECORD_FILTER)
        record = self._record() if path is not None else None
        if record is None:
            return None
        try:
            run_aside(self, f"Saving the signed record {path.name}…", lambda: write_record(path, record))
        except RecordError as error:
            dialogs.show_problem(self, "The record was not saved", str(error))
            return None
        self.last_record = record
        return path

    def save_pdf(self) -> Path | None:
        from rankwise.ui.printing import write_verdict_pdf

        record = self.last_record or self._record()
        if record is None:
            return None
        path = dialogs.ask_save_path(self, "Save one-page summary", Path(self.table.path).stem + "-characteristics.pdf",
                                     dialogs.PDF_FILTER)
        if path is None:
            return None
        try:
            write_verdict_pdf(path, record)
        except (OSError, ValueError) as error:
            dialogs.show_problem(self, "The PDF was not saved", str(error))
            return None
        return path

    def closeEvent(self, event) -> None:  # noqa: N802 (Qt's name)
        self.runner.cancel()
        super().closeEvent(event)

