"""Nothing lost: each window's unsaved entry is kept in its own recovery file and offered back at the next start."""

from __future__ import annotations

import os
from datetime import datetime
from pathlib import Path

from rankwise.readings import ReadingSheet, ReadingsError
from rankwise.ui import dialogs
from rankwise.ui.recovery import RecoveryFile, left_files


class WindowRecovery:
    """Mixin of ``MainWindow``: offers back the entries of windows that were closed without saving."""

    def offer_recovery(self) -> bool:
        """At start: offer back, one by one (oldest first), the entries of windows that are gone.

        The first entry restored comes into this window, each further one into a new window of its
        own (``restored_windows``). Files of running windows are never offered. True when any entry
        was restored.
        """
        restored_any = False
        for left in left_files(self.recovery.folder):
            try:
                entry = left.load()
            except (OSError, ReadingsError) as error:
                aside = left.path.with_name(left.path.name + ".damaged")
                os.replace(left.path, aside)
                left.release()
                dialogs.show_problem(self, "Cannot restore",
                                     f"{error} The kept file is left for a specialist to look at: {aside}")
                continue
            answer = dialogs.offer_restore(self, _offer_words(entry, left.path.stat().st_mtime))
            if answer == "discard":
                left.clear()
                left.release()
            elif answer == "later":
                left.release()
            elif not restored_any:
                self.restore_entry(entry, left)
                restored_any = True
            else:
                another = type(self)(recovery=RecoveryFile.for_new_window(self.recovery.folder))
                self.restored_windows.append(another)
                another.restore_entry(entry, left)
                another.show()
        return restored_any

    def restore_entry(self, entry, left: RecoveryFile) -> None:
        """Show a kept entry (``JournalEntry``) read from ``left``, whose file becomes this window's."""
        self.set_sheet(ReadingSheet.from_snapshot(entry.snapshot), Path(entry.source) if entry.source else None)
        self.restored_unsaved = True
        self.keeper.adopt(left)
        self.question_panel.from_dict(entry.question)
        self.update_title()

    def recovery_problem(self, reason: str) -> None:
        """The recovery file could not be written: say so where the readings are typed."""
        self.statusBar().showMessage(f"The recovery copy could not be written ({reason}); save the readings soon.", 10000)


def _offer_words(entry, last_kept: float) -> str:
    when = datetime.fromtimestamp(last_kept).astimezone()
    offset = when.strftime("%z")
    typed = entry.readings_typed
    source = f" from {Path(entry.source).name}" if entry.source else ""
    return (f"A Rankwise window was closed without saving its readings{source}: {typed} "
            f"cell{'s' if typed != 1 else ''} with entries, last kept {when:%d %b %Y, %H:%M} "
            f"(UTC{offset[:3]}:{offset[3:]}). Restore them?")
