"""The grid's table model: a Qt view of the Qt-free ``ReadingSheet``.

Columns are the sheet's groups plus one spare column at the right (typing there adds a group);
rows are the sheet's rows plus spare empty rows below, so the technician can keep typing down.
The model follows the sheet's change notices (``SheetChange``) and announces inserts and removals
before they happen, as Qt requires. A rejected cell keeps its text exactly as typed; it is marked
by a symbol, a strike-through or italics and explains itself in a tooltip, never by colour alone.
"""

from __future__ import annotations

from PySide6.QtCore import QAbstractTableModel, QModelIndex, QObject, Qt
from PySide6.QtGui import QBrush, QColor, QFont

from rankwise.readings import CellKind, ReadingSheet
from rankwise.wording.entries import count_phrase

SPARE_ROWS = 12
"""Empty rows kept below the longest column."""

MINIMUM_ROWS = 30
"""The grid never shows fewer rows than this, so an empty sheet looks like a gauge sheet."""

CELL_KIND_ROLE = Qt.ItemDataRole.UserRole + 1
NEW_GROUP_TITLE = "+ new\ngroup"
"""Title of the spare column right of the last group, on two lines like a group's name and unit."""
"""Custom role: the cell's kind as a string ("number", "note", "censored", "invalid", "empty")."""

INVALID_MARK = "⚠ "
"""Shown before a cell that cannot be read as a reading (it is struck through as well)."""

FLAG_MARK = " ◆"
"""Shown after a reading worth a second look (slipped decimal point, beyond LSL/USL)."""

_INVALID_TINT = QColor("#fbe3cf")
_NOTE_TEXT = QColor("#4f4f49")
_FLAG_TINT = QColor("#fff3c4")


class SheetModel(QAbstractTableModel):
    """Adapts a ``ReadingSheet`` to Qt's table views; edits go through the sheet (so undo works)."""

    def __init__(self, sheet: ReadingSheet, parent: QObject | None = None) -> None:
        super().__init__(parent)
        self._sheet = sheet
        self._rows = self._wanted_rows()
        self._columns = len(sheet.groups) + 1
        self._flags: dict[int, dict[int, tuple[str, ...]]] = {}
        """The readings worth a second look, per group painted since its last change (found from the
        sheet's arrays: milliseconds even for a large group)."""
        self.read_only = False
        self._appending = False
        sheet.subscribe(self._on_sheet_change, before=True)

    # -- the sheet -------------------------------------------------------------------------------
    @property
    def sheet(self) -> ReadingSheet:
        """The sheet shown."""
        return self._sheet

    def set_sheet(self, sheet: ReadingSheet) -> None:
        """Show another sheet (an opened file, a new entry)."""
        self.beginResetModel()
        self._sheet.unsubscribe(self._on_sheet_change)
        self._sheet = sheet
        sheet.subscribe(self._on_sheet_change, before=True)
        self._sync_sizes()
        self.endResetModel()

    def set_read_only(self, read_only: bool) -> None:
        """Lock or unlock editing (a signed analysis is read-only)."""
        self.read_only = read_only
        if self._rows and self._columns:
            self.dataChanged.emit(self.index(0, 0), self.index(self._rows - 1, self._columns - 1))

    def _wanted_rows(self) -> int:
        return max(self._sheet.row_count + SPARE_ROWS, MINIMUM_ROWS)

    def _sync_sizes(self) -> None:
        self._rows = self._wanted_rows()
        self._columns = len(self._sheet.groups) + 1
        self._flags.clear()

    def _on_sheet_change(self, change) -> None:
        if change.kind == "groups" and self._appends_groups(change):
            self._append_group_columns(change)
        elif change.kind in ("groups", "reset"):
            if change.before:
                self.beginResetModel()
            else:
                self._sync_sizes()
                self.endResetModel()
        elif change.kind in ("rows-inserted", "rows-removed"):
            inserted = change.kind == "rows-inserted"
            if change.before:
                begin = self.beginInsertRows if inserted else self.beginRemoveRows
                begin(QModelIndex(), change.first_row, change.last_row)
            else:
                count = change.last_row - change.first_row + 1
                self._rows += count if inserted else -count
                self._flags.clear()
                (self.endInsertRows if inserted else self.endRemoveRows)()
                self._fit_spare_rows()
        elif change.kind == "cells" and not change.before:
            for group in range(change.first_group, change.last_group + 1):  # only the groups changed
                self._flags.pop(group, None)
            self._fit_spare_rows()
            last_row = min(change.last_row, self._rows - 1)
            self.dataChanged.emit(self.index(change.first_row, change.first_group), self.index(last_row, change.last_group))

    def _appends_groups(self, change) -> bool:
        """True for groups added at the right end (typing or pasting into the spare column)."""
        if change.before:
            self._appending = change.first_group == len(self._sheet.groups) == self._columns - 1
        return self._appending

    def _append_group_columns(self, change) -> None:
        """The spare column becomes the first new group and new columns follow it, so that an editor
        open in the spare column (the technician typing there) stays where it is; no reset."""
        added = change.last_group - change.first_group + 1
        if change.before:
            self.beginInsertColumns(QModelIndex(), self._columns, self._columns + added - 1)
            return
        self._appending = False
        self._columns += added
        self._flags.clear()
        self.endInsertColumns()
        self.headerDataChanged.emit(Qt.Orientation.Horizontal, change.first_group, self._columns - 1)

    def _fit_spare_rows(self) -> None:
        """Keep ``SPARE_ROWS`` empty rows below the data (adding or removing rows at the end)."""
        wanted = self._wanted_rows()
        if wanted > self._rows:
            self.beginInsertRows(QModelIndex(), self._rows, wanted - 1)
            self._rows = wanted
            self.endInsertRows()
        elif wanted < self._rows:
            self.beginRemoveRows(QModelIndex(), wanted, self._rows - 1)
            self._rows = wanted
            self.endRemoveRows()

    def _group_flags(self, group: int) -> dict[int, tuple[str, ...]]:
        if group not in self._flags:
            self._flags[group] = self._sheet.flags(group)
        return self._flags[group]

    # -- Qt model API ----------------------------------------------------------------------------
    def rowCount(self, parent: QModelIndex = QModelIndex()) -> int:  # noqa: B008, N802 - Qt API
        return 0 if parent.isValid() else self._rows

    def columnCount(self, parent: QModelIndex = QModelIndex()) -> int:  # noqa: B008, N802 - Qt API
        return 0 if parent.isValid() else self._columns

    def flags(self, index: QModelIndex) -> Qt.ItemFlag:
        if not index.isValid():
            return Qt.ItemFlag.NoItemFlags
        base = Qt.ItemFlag.ItemIsEnabled | Qt.ItemFlag.ItemIsSelectable
        return base if self.read_only else base | Qt.ItemFlag.ItemIsEditable

    def headerData(self, section: int, orientation: Qt.Orientation, role: int = Qt.ItemDataRole.DisplayRole):  # noqa: N802
        if orientation == Qt.Orientation.Vertical:
            part = self._sheet.parts.id_of(section) if 0 <= section < self._rows else ""
            if role == Qt.ItemDataRole.DisplayRole and 0 <= section < self._rows:
                return f"{section + 1}  {part}" if part else str(section + 1)
            if role == Qt.ItemDataRole.ToolTipRole and part:
                return f"Row {section + 1}: part '{part}' (column '{self._sheet.parts.column}' of the file)"
            return None
        if not 0 <= section < self._columns:
            return None
        groups = self._sheet.groups
        if section >= len(groups):
            if role == Qt.ItemDataRole.DisplayRole:
                return NEW_GROUP_TITLE
            if role == Qt.ItemDataRole.ToolTipRole:
                return "Type or paste here to start another group."
            return None
        group = groups[section]
        if role == Qt.ItemDataRole.DisplayRole:
            return f"{group.name}\n{group.unit}" if group.unit else f"{group.name}\n "
        if role in (Qt.ItemDataRole.ToolTipRole, Qt.ItemDataRole.AccessibleDescriptionRole):
            return self._group_tooltip(section)
        return None

    def _group_tooltip(self, section: int) -> str:
        group = self._sheet.groups[section]
        counts = self._sheet.counts(section)
        lines = [f"{group.name}: {count_phrase(counts.used + counts.censored, counts.censored, counts.skipped)}"]
        for label, value in (("Unit", group.unit), ("LSL", group.lsl), ("USL", group.usl), ("Nominal", group.nominal)):
            if value not in (None, ""):
                lines.append(f"{label}: {value:g}" if isinstance(value, float) else f"{label}: {value}")
        lines.append("Double-click to change the name, unit and limits.")
        return "\n".join(lines)

    def data(self, index: QModelIndex, role: int = Qt.ItemDataRole.DisplayRole):
        if not index.isValid() or index.column() >= len(self._sheet.groups) or index.row() >= self._rows:
            return "" if role in (Qt.ItemDataRole.DisplayRole, Qt.ItemDataRole.EditRole) else None
        cell = self._sheet.cell(index.column(), index.row())
        kind = cell.kind
        if role == Qt.ItemDataRole.EditRole:
            return cell.text
        if role == CELL_KIND_ROLE:
            return kind.value
        remarks = self._group_flags(index.column()).get(index.row(), ()) if kind is CellKind.NUMBER else ()
        if role == Qt.ItemDataRole.DisplayRole:
            if kind is CellKind.INVALID:
                return INVALID_MARK + cell.text
            return cell.text + FLAG_MARK if remarks else cell.text
        if role in (Qt.ItemDataRole.ToolTipRole, Qt.ItemDataRole.AccessibleDescriptionRole):
            return self._cell_tooltip(cell, remarks)
        if role == Qt.ItemDataRole.FontRole and (kind is not CellKind.NUMBER or remarks):
            font = QFont()
            font.setItalic(kind in (CellKind.NOTE, CellKind.CENSORED, CellKind.INVALID))
            font.setStrikeOut(kind is CellKind.INVALID)
            font.setUnderline(bool(remarks))
            return font
        if role == Qt.ItemDataRole.BackgroundRole:
            if kind is CellKind.INVALID:
                return QBrush(_INVALID_TINT)
            if remarks:
                return QBrush(_FLAG_TINT)
            return None
        if role == Qt.ItemDataRole.ForegroundRole and kind is CellKind.NOTE:
            return QBrush(_NOTE_TEXT)
        if role == Qt.ItemDataRole.TextAlignmentRole:
            numeric = kind in (CellKind.NUMBER, CellKind.CENSORED)
            horizontal = Qt.AlignmentFlag.AlignRight if numeric else Qt.AlignmentFlag.AlignLeft
            return int(horizontal | Qt.AlignmentFlag.AlignVCenter)
        return None

    @staticmethod
    def _cell_tooltip(cell, remarks: tuple[str, ...]) -> str | None:
        if cell.kind is CellKind.INVALID:
            return f"Not used: {cell.reason} The text is kept as typed; correct it to use the reading."
        if cell.kind is CellKind.NOTE:
            return f"Skipped: {cell.reason}"
        if cell.kind is CellKind.CENSORED:
            return f"Below a detection limit: {cell.reason}" if cell.reason else "Below a detection limit."
        if remarks:
            return "Worth a second look (used as typed): " + " ".join(remarks)
        return None

    def setData(self, index: QModelIndex, value, role: int = Qt.ItemDataRole.EditRole) -> bool:  # noqa: N802
        if role != Qt.ItemDataRole.EditRole or not index.isValid() or self.read_only:
            return False
        text = "" if value is None else str(value)
        group, row = index.column(), index.row()
        if group >= len(self._sheet.groups):
            if not text.strip():
                return False
            self._sheet.paste_block(group, row, [[text]])
        else:
            self._sheet.set_text(group, row, text)
        return True
