"""The open dialog: what the file looks like, how it was understood, what will be skipped, then load.

It also says when the file holds the same parts measured twice and how they are paired, and
proposes the question the readings suggest; the technician confirms it or chooses another.

The file is read with ``rankwise.readings.open_readings`` (automatic choices first); the dialog shows
the first rows, the worksheet, the layout (a column per group, or a value column with a group
column), the columns used and the decimal mark, and lets the user change each one. Every cell that
will not be used is listed with its reason before anything lands in the sheet. The file itself is
only read, never changed.
"""

from __future__ import annotations

import dataclasses
from pathlib import Path

from PySide6.QtCore import Qt
from PySide6.QtWidgets import (
    QAbstractItemView,
    QComboBox,
    QDialog,
    QDialogButtonBox,
    QFormLayout,
    QHBoxLayout,
    QLabel,
    QListWidget,
    QTableWidget,
    QTableWidgetItem,
    QVBoxLayout,
    QWidget,
)

from rankwise.readings import ReadingSet, ReadingsError
from rankwise.ui import window_files
from rankwise.ui.worker import run_aside
from rankwise.ui.screen_fit import fit_to_screen
from rankwise.stats.analysis import Question

PREVIEW_ROWS = 15
"""Rows of the file shown in the preview."""

PREVIEW_COLUMN_WIDTH = 240
"""Widest a preview column gets; longer texts (title lines) show whole in their tooltip."""

QUESTIONS = (
    (Question.PAIRED, "The same parts measured twice (before / after), paired by part"),
    (Question.TWO_GROUPS, "Two separate groups of parts"),
    (Question.SEVERAL, "Several groups (three or more)"),
)
"""The questions the dialog may propose, with their words."""
LAYOUTS = (("wide", "A column per group"), ("stacked", "A value column and a group column"))
DECIMALS = (("auto", "Decide from the file"), (".", "Point (0.42)"), (",", "Comma (0,42)"))


def _combo(name: str) -> QComboBox:
    box = QComboBox()
    box.setAccessibleName(name)
    box.setSizeAdjustPolicy(QComboBox.SizeAdjustPolicy.AdjustToMinimumContentsLengthWithIcon)
    box.setMinimumContentsLength(16)
    return box


class OpenReadingsDialog(QDialog):
    """Preview a file, check or change how it is read, and load it (``accept``) or cancel."""

    def __init__(self, parent: QWidget | None, path: Path, reading_set: ReadingSet) -> None:
        super().__init__(parent)
        self.path = Path(path)
        self.reading_set: ReadingSet | None = reading_set
        self.setWindowTitle(f"Open {self.path.name}")
        self._filling = False

        self.sheet_choice = _combo("Worksheet")
        self.layout_choice = _combo("Layout")
        self.value_column = _combo("Value column")
        self.group_column = _combo("Group column")
        self.decimal_choice = _combo("Decimal mark")
        for value, text in LAYOUTS:
            self.layout_choice.addItem(text, value)
        for value, text in DECIMALS:
            self.decimal_choice.addItem(text, value)
        self.sheet_label = QLabel("Worksheet")
        form = QFormLayout()
        form.addRow(self.sheet_label, self.sheet_choice)
        form.addRow("Layout", self.layout_choice)
        self.value_label = QLabel("Readings in column")
        self.group_label = QLabel("Group names in column")
        form.addRow(self.value_label, self.value_column)
        form.addRow(self.group_label, self.group_column)
        form.addRow("Decimal mark", self.decimal_choice)
        self.question_choice = _combo("Question to ask")
        self.question_choice.setToolTip("The question these readings suggest; choose another if it fits better.")
        form.addRow("Question to ask", self.question_choice)
        self.same_parts = QLabel()
        self.same_parts.setObjectName("openSameParts")
        self.same_parts.setWordWrap(True)
        self.same_parts.setAccessibleName("Same parts found")

        self.found = QLabel()
        self.found.setObjectName("openFound")
        self.found.setWordWrap(True)
        self.found.setTextFormat(Qt.TextFormat.RichText)
        self.found.setAccessibleName("How the file was understood")
        self.notes = QLabel()
        self.notes.setObjectName("openNotes")
        self.notes.setWordWrap(True)
        self.notes.setTextFormat(Qt.TextFormat.RichText)
        self.notes.setAccessibleName("Notes on reading the file")
        self.preview = QTableWidget()
        self.preview.setAccessibleName("The first rows of the file")
        self.preview.setEditTriggers(QAbstractItemView.EditTrigger.NoEditTriggers)
        self.groups_list = QListWidget()
        self.groups_list.setAccessibleName("Groups that will be loaded")
        self.skipped_list = QListWidget()
        self.skipped_list.setWordWrap(True)
        self.skipped_list.setAccessibleName("Cells that will be skipped, with the reason")
        self.problem = QLabel()
        self.problem.setObjectName("dialogProblem")
        self.problem.setWordWrap(True)

        lists = QHBoxLayout()
        for title, widget in (("Groups found", self.groups_list), ("Cells that will be skipped", self.skipped_list)):
            column = QVBoxLayout()
            label = QLabel(title)
            label.setObjectName("sectionTitle")
            column.addWidget(label)
            column.addWidget(widget)
            lists.addLayout(column, 1)

        self.buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Cancel)
        self.load_button = self.buttons.addButton("Load into the sheet", QDialogButtonBox.ButtonRole.AcceptRole)
        self.load_button.setDefault(True)
        self.buttons.accepted.connect(self.accept)
        self.buttons.rejected.connect(self.reject)

        preview_title = QLabel("The first rows of the file (nothing in the file is changed)")
        preview_title.setObjectName("sectionTitle")
        layout = QVBoxLayout(self)
        layout.addWidget(self.found)
        layout.addWidget(self.same_parts)
        layout.addWidget(self.notes)
        layout.addLayout(form)
        layout.addWidget(preview_title)
        layout.addWidget(self.preview, 2)
        layout.addLayout(lists, 1)
        layout.addWidget(self.problem)
        layout.addWidget(self.buttons)

        for box in (self.sheet_choice, self.layout_choice, self.value_column, self.group_column, self.decimal_choice):
            box.currentIndexChanged.connect(self._on_choice_changed)
        self._show(reading_set)
        fit_to_screen(self, 1000, 720)

    # -- showing ---------------------------------------------------------------------------------
    def _show(self, reading_set: ReadingSet) -> None:
        source = reading_set.source
        self._filling = True
        try:
            self.sheet_choice.clear()
            for name in source.sheet_names:
                self.sheet_choice.addItem(name, name)
            self.sheet_choice.setCurrentIndex(max(0, self.sheet_choice.findData(source.sheet)))
            for widget in (self.sheet_label, self.sheet_choice):
                widget.setVisible(bool(source.sheet_names))
            self.layout_choice.setCurrentIndex(max(0, self.layout_choice.findData(source.layout)))
            for box, chosen in ((self.value_column, source.value_column), (self.group_column, source.group_column)):
                box.clear()
                for name in source.columns:
                    box.addItem(name, name)
                box.setCurrentIndex(max(0, box.findData(chosen)))
            stacked = source.layout == "stacked"
            for widget in (self.value_label, self.value_column, self.group_label, self.group_column):
                widget.setVisible(stacked)
            if self.decimal_choice.currentData() != "auto":
                self.decimal_choice.setCurrentIndex(max(0, self.decimal_choice.findData(source.decimal)))
        finally:
            self._filling = False
        self._show_found(reading_set)
        self._show_question(reading_set)
        self._show_preview(source)
        self._show_groups(reading_set)

    def _show_found(self, reading_set: ReadingSet) -> None:
        source = reading_set.source
        if source.layout == "stacked":
            layout_words = (f"readings in column '{source.value_column}', group names in column "
                            f"'{source.group_column}'")
        else:
            layout_words = "a column per group"
        details = [f"{source.format.upper()} file", layout_words,
                   f"decimal {'comma' if source.decimal == ',' else 'point'}"]
        if source.delimiter:
            details.append("separator " + {"\t": "tab", ";": "semicolon", ",": "comma", "|": "bar"}.get(source.delimiter, repr(source.delimiter)))
        if source.header_row > 0:
            details.append(f"column titles on row {source.header_row + 1} (the rows above are a title block)")
        self.found.setText(f"<b>{_escape(self.path.name)}</b>: found " + _escape(", ".join(details)) + ".")
        self.notes.setText("".join(f"• {_escape(note)}<br>" for note in reading_set.notes))
        self.notes.setVisible(bool(reading_set.notes))

    def _show_question(self, reading_set: ReadingSet) -> None:
        """Propose the question the readings suggest, with the others that fit them."""
        fitting = [(question, words) for question, words in QUESTIONS
                   if (question is not Question.PAIRED or reading_set.pairing is not None)
                   and (question is not Question.SEVERAL or len(reading_set.groups) >= 3)]
        self._filling = True
        try:
            self.question_choice.clear()
            for question, words in fitting:
                self.question_choice.addItem(words, question)
            proposed = self.question_choice.findData(reading_set.suggested_question)
            if proposed < 0:  # a question the window does not ask: the groups' own
                from rankwise.readings.same_parts import suggest

                proposed = self.question_choice.findData(suggest(reading_set.groups, reading_set.pairing).question)
            self.question_choice.setCurrentIndex(max(0, proposed))
        finally:
            self._filling = False
        found = reading_set.found
        if reading_set.pairing is not None and reading_set.pairing.unpaired:
            from rankwise.wording.pairing import unpaired_parts

            found += " " + unpaired_parts(reading_set.pairing.unpaired, reading_set.pairing.noun)
        problem = reading_set.pairing_problem
        self.same_parts.setText(f"<b>{_escape(found)}</b>" if found else (f"⚠ {_escape(problem)}" if problem else ""))
        self.same_parts.setVisible(bool(found or problem))

    @property
    def question(self) -> Question:
        """The question chosen in the dialog."""
        return Question(self.question_choice.currentData())

    def accept(self) -> None:
        """Load: the readings carry the question chosen here as the one to start from."""
        if self.reading_set is not None and self.question_choice.count():
            self.reading_set = dataclasses.replace(self.reading_set, suggested_question=self.question)
        super().accept()

    def _show_preview(self, source) -> None:
        rows = source.preview[:PREVIEW_ROWS]
        width = max((len(row) for row in rows), default=0)
        self.preview.clear()
        self.preview.setRowCount(len(rows))
        self.preview.setColumnCount(width)
        self.preview.setVerticalHeaderLabels([str(number + 1) for number in range(len(rows))])
        for r, row in enumerate(rows):
            for c, text in enumerate(row):
                item = QTableWidgetItem(text)
                item.setToolTip(text)
                if r == source.header_row:
                    font = item.font()
                    font.setBold(True)
                    item.setFont(font)
                    item.setToolTip("Column titles")
                elif r < source.header_row:
                    item.setForeground(Qt.GlobalColor.darkGray)
                    item.setToolTip("Title block: not read as readings")
                self.preview.setItem(r, c, item)
        self.preview.resizeColumnsToContents()
        for column in range(width):
            self.preview.setColumnWidth(column, min(self.preview.columnWidth(column), PREVIEW_COLUMN_WIDTH))

    def _show_groups(self, reading_set: ReadingSet) -> None:
        self.groups_list.clear()
        self.skipped_list.clear()
        for group in reading_set.groups:
            skipped = len(group.skipped)
            self.groups_list.addItem(
                f"{group.name}: {len(group.values)} readings" + (f", {skipped} skipped" if skipped else ""))
            for cell in group.skipped:
                self.skipped_list.addItem(f"Row {cell.row}, column '{cell.column}': '{cell.text}' — {cell.reason}")
        if self.skipped_list.count() == 0:
            self.skipped_list.addItem("None: every cell with text is a reading.")
        self.load_button.setEnabled(bool(reading_set.groups))
        self.problem.setText("")

    # -- changing --------------------------------------------------------------------------------
    def choices(self) -> dict:
        """The reading options as the dialog shows them, for ``open_readings``."""
        layout = self.layout_choice.currentData()
        options = {"layout": layout, "decimal": self.decimal_choice.currentData()}
        if self.sheet_choice.count():
            options["sheet"] = self.sheet_choice.currentData()
        if layout == "stacked":
            options["value_column"] = self.value_column.currentData()
            options["group_column"] = self.group_column.currentData()
        return options

    def _on_choice_changed(self) -> None:
        if self._filling:
            return
        options = self.choices()
        if options["layout"] == "stacked" and options.get("value_column") == options.get("group_column"):
            options.pop("value_column")
            options.pop("group_column")
        try:
            reading_set = read_readings(self, self.path, options)
        except ReadingsError as error:
            self.reading_set = None
            self.load_button.setEnabled(False)
            self.problem.setText(f"⚠ {error}")
            return
        self.reading_set = reading_set
        self._show(reading_set)

    @classmethod
    def ask(cls, parent: QWidget | None, path: Path) -> ReadingSet | None:
        """Open ``path`` with automatic choices, show the dialog; the readings to load, or None.

        Raises ``ReadingsError`` when the file cannot be read at all.
        """
        dialog = cls(parent, path, read_readings(parent, path))
        return dialog.reading_set if dialog.exec() == QDialog.DialogCode.Accepted else None


def read_readings(parent: QWidget | None, path: Path, options: dict | None = None) -> ReadingSet:
    """``open_readings(path, **options)``; a file larger than ``LARGE_FILE_BYTES`` is read (and the file
    readers loaded) on a thread of its own while the window keeps answering (``run_aside``)."""

    def read() -> ReadingSet:
        from rankwise.readings.open import open_readings

        return open_readings(path, **(options or {}))

    if path.stat().st_size > window_files.LARGE_FILE_BYTES:
        return run_aside(parent, f"Reading {path.name}…", read)
    return read()


def _escape(text: str) -> str:
    return text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")
