"""The readings grid: a spreadsheet-like table for typing readings straight from a gauge sheet.

Enter moves down (typing a column of readings), Tab moves right; typing starts editing; Delete
clears; paste takes a block copied from any spreadsheet (tab-separated lines); copy gives one back.
Every edit goes through the sheet model, so each is one undoable step.
"""

from __future__ import annotations

from PySide6.QtCore import QItemSelection, QItemSelectionModel, Qt, Signal
from PySide6.QtGui import QGuiApplication, QKeyEvent, QKeySequence
from PySide6.QtWidgets import QAbstractItemDelegate, QAbstractItemView, QHeaderView, QTableView, QWidget

from rankwise.readings.paste_titles import split_title_row
from rankwise.ui.sheet_model import SheetModel


def block_from_text(text: str) -> list[list[str]]:
    """Rows of cell texts from spreadsheet clipboard text (tab between cells, a line per row).

    A trailing line break (spreadsheets add one) does not make an extra row; Windows line ends
    and a lone carriage return are accepted.
    """
    lines = text.replace("\r\n", "\n").replace("\r", "\n").split("\n")
    if lines and lines[-1] == "":
        lines.pop()
    return [line.split("\t") for line in lines]


def text_from_block(block: list[list[str]]) -> str:
    """Clipboard text for a block of cell texts, as spreadsheets expect it."""
    return "".join("\t".join(row) + "\n" for row in block)


MAXIMUM_COLUMN_WIDTH = 260
"""A column is never made wider than this to fit its title; the full title shows on hover."""


class ReadingsGrid(QTableView):
    """The table view of the readings.

    Signals:
        problem(str): an edit was refused, in plain words (e.g. the sheet is signed).
        notice(str): an edit did something worth saying (a pasted title row named the groups).
        read_only_edit(str): the technician tried to change a signed analysis (with the text typed, if any).
        header_double_clicked(int): the user wants to edit that group's details.
    """

    problem = Signal(str)
    notice = Signal(str)
    read_only_edit = Signal(str)
    header_double_clicked = Signal(int)

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.setObjectName("readingsGrid")
        self.setAccessibleName("Readings sheet")
        self.setAccessibleDescription("One column per group. Enter moves down, Tab moves right.")
        self.setEditTriggers(
            QAbstractItemView.EditTrigger.AnyKeyPressed
            | QAbstractItemView.EditTrigger.DoubleClicked
            | QAbstractItemView.EditTrigger.EditKeyPressed
        )
        self.setSelectionMode(QAbstractItemView.SelectionMode.ContiguousSelection)
        self.setTabKeyNavigation(True)
        header = self.horizontalHeader()
        header.setSectionResizeMode(QHeaderView.ResizeMode.Interactive)
        header.setDefaultSectionSize(130)
        header.setMinimumSectionSize(90)
        header.sectionDoubleClicked.connect(self._on_header_double_clicked)
        self.verticalHeader().setDefaultSectionSize(30)
        self._restore_to: tuple[int, int] | None = None

    # -- model -----------------------------------------------------------------------------------
    def setModel(self, model: SheetModel) -> None:  # noqa: N802 - Qt API
        """Show ``model``; the current cell survives model resets (group edits, undo)."""
        super().setModel(model)
        model.modelAboutToBeReset.connect(self._remember_current)
        model.modelReset.connect(self._restore_current)
        model.modelReset.connect(self._fit_columns_to_titles)
        model.columnsInserted.connect(self._fit_columns_to_titles)
        self.setCurrentIndex(model.index(0, 0))
        self._fit_columns_to_titles()

    def sheet_model(self) -> SheetModel:
        """The sheet model shown."""
        return self.model()

    def _remember_current(self) -> None:
        current = self.currentIndex()
        self._restore_to = (current.row(), current.column()) if current.isValid() else None

    def _restore_current(self) -> None:
        model = self.model()
        if self._restore_to is None or model.rowCount() == 0:
            return
        row = min(self._restore_to[0], model.rowCount() - 1)
        column = min(self._restore_to[1], model.columnCount() - 1)
        self.setCurrentIndex(model.index(row, column))

    def _fit_columns_to_titles(self) -> None:
        """Each column is wide enough for its title (group name and unit), within reason."""
        header = self.horizontalHeader()
        groups = len(self.sheet_model().sheet.groups)
        for column in range(self.model().columnCount()):
            if column < groups:
                wanted = max(header.defaultSectionSize(), header.sectionSizeHint(column))
            else:  # the spare column only as wide as its short title, so it stays in view
                wanted = max(header.minimumSectionSize(), header.sectionSizeHint(column))
            header.resizeSection(column, min(wanted, MAXIMUM_COLUMN_WIDTH))
        self.updateGeometries()  # the row titles widen to show part identifiers

    def _on_header_double_clicked(self, section: int) -> None:
        if section < len(self.sheet_model().sheet.groups):
            self.header_double_clicked.emit(section)

    # -- moving ----------------------------------------------------------------------------------
    def move_to(self, row: int, column: int) -> None:
        """Make (row, column) the current cell, within the grid."""
        model = self.model()
        row = max(0, min(row, model.rowCount() - 1))
        column = max(0, min(column, model.columnCount() - 1))
        index = model.index(row, column)
        self.setCurrentIndex(index)
        self.scrollTo(index)

    def go_to_new_group(self) -> None:
        """Take the keyboard to the top of the spare column at the right, scrolled into view, where
        typing or pasting starts another group (the sheet may be wider than a small screen)."""
        if self._refuse_if_read_only():
            return
        self.move_to(0, self.model().columnCount() - 1)
        self.setFocus(Qt.FocusReason.ShortcutFocusReason)

    def closeEditor(self, editor: QWidget, hint: QAbstractItemDelegate.EndEditHint) -> None:  # noqa: N802
        """Enter while typing commits the reading and moves down, like a gauge sheet; the keyboard
        stays in the sheet for the next reading."""
        had_keyboard = editor is not None and editor.hasFocus()
        if hint == QAbstractItemDelegate.EndEditHint.SubmitModelCache:
            super().closeEditor(editor, QAbstractItemDelegate.EndEditHint.NoHint)
            current = self.currentIndex()
            self.move_to(current.row() + 1, current.column())
        else:
            super().closeEditor(editor, hint)
        if had_keyboard and not self.hasFocus():
            self.setFocus(Qt.FocusReason.OtherFocusReason)

    def _filled(self, row: int, column: int) -> bool:
        sheet = self.sheet_model().sheet
        return column < len(sheet.groups) and row < len(sheet.groups[column].cells) and bool(sheet.cell(column, row).text)

    def _jump(self, row: int, column: int, step_row: int, step_column: int) -> tuple[int, int]:
        """Where Ctrl+arrow goes, as in any spreadsheet: to the end of the run of filled cells, or
        over empty cells to the next filled one, or to the sheet's edge when there is none."""
        model = self.model()
        last_row, last_column = model.rowCount() - 1, model.columnCount() - 1

        def inside(r: int, c: int) -> bool:
            return 0 <= r <= last_row and 0 <= c <= last_column

        next_row, next_column = row + step_row, column + step_column
        if not inside(next_row, next_column):
            return row, column
        if self._filled(row, column) and self._filled(next_row, next_column):
            while inside(next_row + step_row, next_column + step_column) and self._filled(next_row + step_row, next_column + step_column):
                next_row, next_column = next_row + step_row, next_column + step_column
            return next_row, next_column
        while inside(next_row, next_column) and not self._filled(next_row, next_column):
            if not inside(next_row + step_row, next_column + step_column):
                return next_row, next_column
            next_row, next_column = next_row + step_row, next_column + step_column
        return next_row, next_column

    def _last_filled(self) -> tuple[int, int]:
        """The bottom-right corner of the readings (Ctrl+End)."""
        sheet = self.sheet_model().sheet
        return max(0, sheet.row_count - 1), max(0, len(sheet.groups) - 1)

    def _navigate(self, event: QKeyEvent) -> bool:
        """Ctrl+arrows, Ctrl+Home/End and Ctrl+Tab as in any spreadsheet; True when handled.
        Shift with them extends the selection from the current cell."""
        control = bool(event.modifiers() & Qt.KeyboardModifier.ControlModifier)
        shift = bool(event.modifiers() & Qt.KeyboardModifier.ShiftModifier)
        key = event.key()
        if control and key in (Qt.Key.Key_Tab, Qt.Key.Key_Backtab):
            self.leave(forward=key == Qt.Key.Key_Tab and not shift)
            return True
        current = self.currentIndex()
        row, column = max(0, current.row()), max(0, current.column())
        steps = {Qt.Key.Key_Up: (-1, 0), Qt.Key.Key_Down: (1, 0), Qt.Key.Key_Left: (0, -1), Qt.Key.Key_Right: (0, 1)}
        if control and key in steps:
            target = self._jump(row, column, *steps[key])
        elif control and key == Qt.Key.Key_Home:
            target = (0, 0)
        elif control and key == Qt.Key.Key_End:
            target = self._last_filled()
        else:
            return False
        if shift:
            start = self._selection_anchor(current)
            end = self.model().index(*target)
            self.selectionModel().setCurrentIndex(end, QItemSelectionModel.SelectionFlag.NoUpdate)
            self.selectionModel().select(QItemSelection(start, end), QItemSelectionModel.SelectionFlag.ClearAndSelect)
            self.scrollTo(end)
        else:
            self.move_to(*target)
        return True

    def _selection_anchor(self, current):
        """The fixed corner of the selection: the one opposite the current cell."""
        selection = self.selectionModel().selection()
        if not selection.count():
            return current
        block = selection[0]
        row = block.top() if current.row() == block.bottom() else block.bottom()
        column = block.left() if current.column() == block.right() else block.right()
        return self.model().index(row, column)

    def leave(self, forward: bool = True) -> None:
        """Give the keyboard to the next (or previous) control after the sheet (Ctrl+Tab, Ctrl+Shift+Tab)."""
        self.setTabKeyNavigation(False)
        try:
            self.focusNextPrevChild(forward)
        finally:
            self.setTabKeyNavigation(True)

    def keyPressEvent(self, event: QKeyEvent) -> None:  # noqa: N802 - Qt API
        """Enter moves down, Delete/Backspace clears, copy/cut/paste work on blocks, Ctrl+arrows jump."""
        if self.state() != QAbstractItemView.State.EditingState:
            if self._navigate(event):
                return
            typed = event.text()
            plain = not event.modifiers() & (Qt.KeyboardModifier.ControlModifier | Qt.KeyboardModifier.AltModifier)
            if plain and typed.isprintable() and typed.strip() and self._refuse_if_read_only(typed):
                return
            if event.key() in (Qt.Key.Key_Return, Qt.Key.Key_Enter):
                step = -1 if event.modifiers() & Qt.KeyboardModifier.ShiftModifier else 1
                current = self.currentIndex()
                self.move_to(current.row() + step, current.column())
                return
            if event.key() in (Qt.Key.Key_Delete, Qt.Key.Key_Backspace):
                self.clear_selected_cells()
                return
            if event.matches(QKeySequence.StandardKey.Copy):
                self.copy_selection()
                return
            if event.matches(QKeySequence.StandardKey.Cut):
                self.cut_selection()
                return
            if event.matches(QKeySequence.StandardKey.Paste):
                self.paste_from_clipboard()
                return
        super().keyPressEvent(event)

    # -- block edits -----------------------------------------------------------------------------
    def _selected_cells(self) -> list[tuple[int, int]]:
        """Selected (group, row) pairs within existing groups; the current cell when nothing is selected."""
        groups = len(self.sheet_model().sheet.groups)
        indexes = self.selectionModel().selectedIndexes() if self.selectionModel() else []
        if not indexes and self.currentIndex().isValid():
            indexes = [self.currentIndex()]
        return sorted({(i.column(), i.row()) for i in indexes if i.column() < groups})

    def _refuse_if_read_only(self, typed: str = "") -> bool:
        if self.sheet_model().read_only:
            self.read_only_edit.emit(typed)
            return True
        return False

    def type_into_current(self, text: str) -> None:
        """Open the current cell's editor with ``text`` typed in it (typing goes on from there)."""
        self.edit(self.currentIndex())
        editor = self.indexWidget(self.currentIndex()) or self.focusWidget()
        if hasattr(editor, "setText") and editor is not self:
            editor.setText(text)

    def clear_selected_cells(self) -> None:
        """Empty the selected cells (one undoable step)."""
        if self._refuse_if_read_only():
            return
        cells = self._selected_cells()
        if cells:
            self.sheet_model().sheet.clear(cells)

    def selected_block(self) -> list[list[str]]:
        """The texts of the selected rectangle, rows of cells, exactly as typed."""
        cells = self._selected_cells()
        if not cells:
            return []
        sheet = self.sheet_model().sheet
        groups = sorted({g for g, _ in cells})
        rows = sorted({r for _, r in cells})
        return [[sheet.cell(g, r).text for g in range(groups[0], groups[-1] + 1)] for r in range(rows[0], rows[-1] + 1)]

    def copy_selection(self) -> None:
        """Copy the selected cells as tab-separated text (pastes into any spreadsheet)."""
        block = self.selected_block()
        if block:
            QGuiApplication.clipboard().setText(text_from_block(block))

    def cut_selection(self) -> None:
        """Copy, then clear the selected cells."""
        if self._refuse_if_read_only():
            return
        self.copy_selection()
        self.clear_selected_cells()

    def paste_from_clipboard(self) -> None:
        """Paste the clipboard's text block with its top-left at the current cell."""
        self.paste_text(QGuiApplication.clipboard().text())

    def paste_text(self, text: str) -> None:
        """Paste a block of text (tab-separated cells, a line per row) at the current cell; a first
        row of words over readings names the groups instead (one undo step, and the window says so)."""
        if self._refuse_if_read_only():
            return
        sheet = self.sheet_model().sheet
        titles, block = split_title_row(block_from_text(text), sheet.decimal)
        if not block:
            return
        current = self.currentIndex()
        row = max(0, current.row())
        group = min(max(0, current.column()), len(sheet.groups))
        named = sheet.paste_block(group, row, block, titles)
        if named:
            self.notice.emit(f"The pasted title row named the group{'s' if len(named) > 1 else ''} "
                             f"{', '.join(named)}; Undo (Ctrl+Z) takes the paste and the names back.")
        height, width = len(block), max(len(line) for line in block)
        model = self.model()
        top_left = model.index(row, group)
        bottom_right = model.index(min(row + height, model.rowCount()) - 1, min(group + width, model.columnCount()) - 1)
        self.setCurrentIndex(top_left)
        self.selectionModel().select(QItemSelection(top_left, bottom_right), QItemSelectionModel.SelectionFlag.ClearAndSelect)

    def insert_rows_above(self) -> None:
        """Insert as many empty rows as are selected, above the selection."""
        if self._refuse_if_read_only():
            return
        rows = sorted({r for _, r in self._selected_cells()}) or [max(0, self.currentIndex().row())]
        column = max(0, self.currentIndex().column())
        self.sheet_model().sheet.insert_rows(rows[0], rows[-1] - rows[0] + 1)
        self.move_to(rows[0], column)

    def delete_selected_rows(self) -> None:
        """Delete the selected rows in every group (the rows below move up)."""
        if self._refuse_if_read_only():
            return
        rows = sorted({r for _, r in self._selected_cells()}) or [max(0, self.currentIndex().row())]
        self.sheet_model().sheet.delete_rows(rows[0], rows[-1] - rows[0] + 1)
