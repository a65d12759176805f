"""Nothing lost: the unsaved entry is kept in a recovery file and offered back at the next start."""

from __future__ import annotations

from pathlib import Path

from rankwise.readings import ReadingSheet, ReadingsError, SheetSnapshot
from rankwise.ui import dialogs


class WindowRecovery:
    """Mixin of ``MainWindow``: writes and offers back the recovery copy of the entry."""

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
