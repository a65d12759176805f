"""Edits of the sheet's groups and settings from the menus: add, remove, move, details, decimal mark."""

from __future__ import annotations

from rankwise.readings import ReadingsError
from rankwise.ui import dialogs
from rankwise.ui.group_details_dialog import GroupDetails, GroupDetailsDialog


class WindowGroups:
    """Mixin of ``MainWindow``: group and sheet-setting edits, refused while the analysis is signed."""

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
