"""The sheet shown in the window: replacing it, refreshing after each edit, title, status, undo."""

from __future__ import annotations

from pathlib import Path

from rankwise.readings import ReadingSheet
from rankwise.ui import dialogs
from rankwise.wording.entries import count_phrase


class WindowSheet:
    """Mixin of ``MainWindow``: keeps the window in step with the readings sheet it shows."""

    def set_sheet(self, sheet: ReadingSheet, source: Path | None = None) -> None:
        """Show ``sheet`` in the grid (a new entry, an opened file, or a restored one)."""
        self.stop_opening()  # a file still being read would replace this sheet when it arrived
        self.sheet.unsubscribe(self._on_sheet_changed)
        self.sheet = sheet
        self.source_path = source
        self.sheet_model.set_sheet(sheet)
        self.records.forget_signature()
        self._on_sheet_replaced()

    def _on_sheet_replaced(self) -> None:
        self.restored_unsaved = False
        self.sheet.subscribe(self._on_sheet_changed)
        self.keeper.follow(self.sheet)
        self.update_title()
        self._refresh_after_edit(immediately=True)

    def _on_sheet_changed(self, change) -> None:
        # The sheet sends its notices while an edit is under way (its undo history and saved state
        # are updated after them), so the window refreshes once the edit has finished. The recovery
        # keeper follows the sheet's notices itself: each edit reaches the recovery file at once.
        if self.opening_message and self.statusBar().currentMessage() == self.opening_message:
            self.statusBar().clearMessage()  # its counts describe the file as opened, not as edited
        self._edit_timer.start()

    def _refresh_after_edit(self, immediately: bool) -> None:
        self.question_panel.set_groups(
            [group.name for group in self.sheet.groups],
            [group.usl - group.lsl if group.usl is not None and group.lsl is not None else None for group in self.sheet.groups],
        )
        self.question_panel.set_plan_sheet(self.sheet)
        self.question_panel.set_same_parts_unavailable(self.sheet.parts.not_parts)
        self._update_status()
        self.update_undo_actions()
        self.below_highest_action.setChecked(self.sheet.mixed_limits == "below-highest")
        self.update_title()
        self.keeper.settle()
        self.request_analysis(immediately)

    def _update_status(self) -> None:
        parts = []
        for index, group in enumerate(self.sheet.groups):
            counts = self.sheet.counts(index)
            phrase = count_phrase(counts.used + counts.censored, counts.censored, counts.skipped, brief=True)
            parts.append(f"{group.name}: {phrase}")
        self.status_counts.setText("   ·   ".join(parts) if parts else "No readings yet: type or paste them into the sheet.")
        self.status_decimal.setText(self.sheet.decimal_label)
        self.status_decimal.setToolTip(f"{self.sheet.decimal_status} Change it in Edit > Decimal separator.")

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
        self.signed_strip.show_signoff(record.signoff if record is not None else None, self.records.next_revision)
        if record is not None:
            self.status_state.setText(f"Signed record, revision {record.signoff.revision}: read-only")
        elif self.records.next_revision > 1:
            self.status_state.setText(f"Revision {self.records.next_revision}, not signed yet")
        else:
            self.status_state.setText("Unsaved readings" if self.has_unsaved_readings() else "")

    def offer_revision(self, typed: str = "") -> None:
        """Typing into a signed analysis: explain that its readings cannot change, and start the next
        revision on request, carrying on with what was typed."""
        if self.records.signed_record is None:
            return
        revision = self.records.next_revision
        if not dialogs.confirm(
            self, "This analysis is signed",
            f"The readings of a signed analysis stay as they were signed. Start revision {revision}, a copy "
            "that can be changed and signed again? The signed record itself does not change.",
            f"Start revision {revision}", "Keep it as signed",
        ):
            self.grid.setFocus()
            return
        self.records.start_revision()
        self.grid.setFocus()
        if typed:
            self.grid.type_into_current(typed)

    def undo(self) -> None:
        """Undo the last edit of the sheet."""
        if self.sheet.can_undo and not self.sheet_model.read_only:
            self.sheet.undo()

    def redo(self) -> None:
        """Redo the edit undone last."""
        if self.sheet.can_redo and not self.sheet_model.read_only:
            self.sheet.redo()
